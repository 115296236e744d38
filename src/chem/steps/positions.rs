//! What a step does to positions: the cis requirement of reductive elimination and migratory
//! insertion, cis or trans oxidative addition, and the product isomer that keeps the most of
//! the start's arrangement (Crabtree, The Organometallic Chemistry of the Transition Metals,
//! 6th ed., 2014, ch. 6-7; Hartwig, Organotransition Metal Chemistry, 2010, ch. 6-9).
//!
//! The product isomer is found by comparison, not by a rule per step: of the product's
//! isomers that meet the step's constraint, those whose trans pairs agree best with the
//! start's (a pair of like ligands trans counting double, since a trans-L2 axis is what
//! concerted additions keep) are the ones the step gives.

use std::collections::BTreeMap;

use super::{refuse, Step, StepError};
use crate::chem::complex::Complex;
use crate::chem::count::Report;
use crate::chem::geometry::{self, Placed};
use crate::chem::isomers::Isomer;
use crate::chem::trans::{new_weakened, trans_effect, weakened};

/// How A-B adds: both ends on neighbouring positions (concerted: H2, H-SiR3, C-H, Ar-X) or
/// on opposite ones (the SN2 path of alkyl halides).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Course {
    Cis,
    Trans,
}

impl std::fmt::Display for Course {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(match self {
            Course::Cis => "cis",
            Course::Trans => "trans",
        })
    }
}

/// A ligand kind as the comparison sees it: key and mode.
type Kind = (String, usize);

/// The empty position a ligand left, as the comparison sees it.
fn vacancy() -> Kind {
    ("vacant site".to_string(), usize::MAX)
}

/// The position opposite the empty one, in polyhedra that are an octahedron or a square
/// plane less one position: the apex of a square pyramid, the stem of a T.
fn opposite_vacancy(symbol: &str) -> Option<u8> {
    match symbol {
        "SPY-5" => Some(0),
        "TS-3" => Some(1),
        _ => None,
    }
}

fn kind_of(p: &Placed, letter: char) -> Option<Kind> {
    let d = p.frame.donor(letter)?;
    let b = p.frame.ligands.get(d.group)?;
    Some((b.ligand.key.clone(), b.mode))
}

fn kinds(c: &Complex) -> BTreeMap<Kind, u32> {
    let mut m = BTreeMap::new();
    for (_, b) in c.all_ligands() {
        *m.entry((b.ligand.key.clone(), b.mode)).or_insert(0) += b.count;
    }
    m
}

/// Positions of the monodentate copies of a kind in an isomer.
fn seats_of(p: &Placed, iso: &Isomer, k: &Kind) -> Vec<u8> {
    iso.seats
        .iter()
        .enumerate()
        .filter(|(_, s)| s.1.is_none() && kind_of(p, s.0).as_ref() == Some(k))
        .map(|(i, _)| i as u8)
        .collect()
}

/// Whether some copy of `a` and some other copy of `b` sit cis (not trans, not the same).
fn cis_pair(p: &Placed, iso: &Isomer, a: &Kind, b: &Kind) -> bool {
    let (sa, sb) = (seats_of(p, iso, a), seats_of(p, iso, b));
    sa.iter()
        .any(|&x| sb.iter().any(|&y| x != y && !p.frame.poly.is_trans(x, y)))
}

/// Trans pairs of an isomer as kind pairs, with `rename` applied to the kinds and the seats
/// in `empty` taken as vacant; a polyhedron less one position pairs its apex with the
/// vacancy.
fn trans_pairs(
    p: &Placed,
    iso: &Isomer,
    rename: &dyn Fn(Kind) -> Kind,
    relabel: &[(u8, Kind)],
) -> Vec<(Kind, Kind)> {
    let kind = |at: u8| -> Option<Kind> {
        if let Some((_, k)) = relabel.iter().find(|(p, _)| *p == at) {
            return Some(k.clone());
        }
        Some(rename(kind_of(p, iso.seats.get(at as usize)?.0)?))
    };
    let mut out: Vec<(Kind, Kind)> = p
        .frame
        .poly
        .trans
        .iter()
        .filter_map(|&(a, b)| {
            let (ka, kb) = (kind(a)?, kind(b)?);
            Some(if ka <= kb { (ka, kb) } else { (kb, ka) })
        })
        .collect();
    if let Some(apex) = opposite_vacancy(p.frame.poly.symbol) {
        if let Some(k) = kind(apex) {
            let v = vacancy();
            out.push(if k <= v { (k, v) } else { (v, k) });
        }
    }
    out
}

fn agreement(start: &[(Kind, Kind)], product: &[(Kind, Kind)]) -> u32 {
    let mut left: Vec<&(Kind, Kind)> = start.iter().collect();
    let mut score = 0;
    for pair in product {
        if let Some(i) = left.iter().position(|s| *s == pair) {
            score += if pair.0 == pair.1 { 2 } else { 1 };
            left.swap_remove(i);
        }
    }
    score
}

/// The kinds `a` holds more copies of than `b`, once per extra copy.
fn surplus(a: &BTreeMap<Kind, u32>, b: &BTreeMap<Kind, u32>) -> Vec<Kind> {
    a.iter()
        .flat_map(|(k, &n)| {
            let extra = n.saturating_sub(b.get(k).copied().unwrap_or(0));
            std::iter::repeat_n(k.clone(), extra as usize)
        })
        .collect()
}

/// The step's effect on positions: refuses a step whose groups are trans, and returns the
/// product's prefix (its descriptor, when one isomer results) with notes.
pub(super) fn follow(
    step: &Step,
    start: &Complex,
    before: &Report,
    product: &Complex,
    after: &Report,
    course: Option<Course>,
) -> Result<(Option<String>, Vec<String>), StepError> {
    let mut notes = Vec::new();
    let Ok(sp) = geometry::place(start, before) else {
        return Ok((None, notes));
    };
    let mut bare = product.clone();
    bare.stereo = None;
    let Ok(pp) = geometry::place(&bare, after) else {
        return Ok((None, notes));
    };
    let (ks, kp) = (kinds(start), kinds(product));
    let (removed, added) = (surplus(&ks, &kp), surplus(&kp, &ks));
    let mut starts: Vec<usize> = sp.chosen.clone();
    // the cis requirement of eliminations and insertions
    let needs_cis = matches!(
        step,
        Step::ReductiveElimination(..) | Step::MigratoryInsertion { .. }
    );
    if needs_cis && removed.len() == 2 {
        let (a, b) = (&removed[0], &removed[1]);
        let cis: Vec<usize> = starts
            .iter()
            .copied()
            .filter(|&i| cis_pair(&sp, &sp.isomers[i], a, b))
            .collect();
        if cis.is_empty() {
            let options: Vec<&str> = (0..sp.isomers.len())
                .filter(|&i| cis_pair(&sp, &sp.isomers[i], a, b))
                .map(|i| sp.descriptors[i].as_str())
                .take(3)
                .collect();
            let now = match starts.as_slice() {
                [i] => format!("in {}", sp.descriptors[*i]),
                _ => "in every isomer the prefix allows".to_string(),
            };
            let what = step.word();
            return refuse(if options.is_empty() {
                format!(
                    "{what} needs {} and {} cis; {now} they are trans and no isomer of this \
                     complex has them cis: dissociate a ligand first to open a path",
                    a.0, b.0
                )
            } else {
                format!(
                    "{what} needs {} and {} cis; {now} they are trans: take `isomerization {}` \
                     first, or a dissociation that opens a path",
                    a.0,
                    b.0,
                    options.join("` or `isomerization ")
                )
            });
        }
        if cis.len() < starts.len() {
            let names: Vec<&str> = cis.iter().map(|&i| sp.descriptors[i].as_str()).collect();
            notes.push(format!(
                "{} needs {} and {} cis: from {}",
                step.word(),
                a.0,
                b.0,
                names.join(" or ")
            ));
        }
        starts = cis;
    }
    // a ligand that comes in, alone, takes the empty position (substitution, association);
    // an inserting ligand becomes the new group where it sat
    let inserted: Option<(Kind, Kind)> = match (removed.as_slice(), added.as_slice()) {
        (rs, [a]) if matches!(step, Step::MigratoryInsertion { .. }) => rs
            .iter()
            .find(|r| {
                start
                    .all_ligands()
                    .any(|(_, b)| b.ligand.key == r.0 && b.mode == r.1 && b.mode().class.x == 0)
            })
            .map(|r| (r.clone(), a.clone())),
        _ => None,
    };
    let fills = matches!(added.as_slice(), [_]) && removed.len() <= 1 && inserted.is_none();
    let rename = |k: Kind| -> Kind {
        if fills && added.first() == Some(&k) {
            vacancy()
        } else {
            k
        }
    };
    // oxidative addition: the two new groups cis or trans
    let course = match step {
        Step::OxidativeAddition(..) if added.len() == 2 => {
            Some(course.unwrap_or_else(|| default_course(product, &added)))
        }
        _ => None,
    };
    let allowed: Vec<usize> = (0..pp.isomers.len())
        .filter(|&i| match course {
            None => true,
            Some(c) => {
                let iso = &pp.isomers[i];
                let (x, y) = (&added[0], &added[1]);
                let (sx, sy) = (seats_of(&pp, iso, x), seats_of(&pp, iso, y));
                sx.iter().any(|&p| {
                    sy.iter().any(|&q| {
                        p != q
                            && match c {
                                Course::Cis => !pp.frame.poly.is_trans(p, q),
                                Course::Trans => pp.frame.poly.is_trans(p, q),
                            }
                    })
                })
            }
        })
        .collect();
    if let Some(c) = course {
        if allowed.is_empty() {
            return refuse(format!(
                "no {} isomer of the product has the two new groups {c}",
                pp.frame.poly.symbol
            ));
        }
        notes.push(format!(
            "{c} addition: {} and {} {c}{}",
            added[0].0,
            added[1].0,
            match c {
                Course::Cis => " (concerted)",
                Course::Trans => " (SN2 path)",
            }
        ));
    }
    let mut result: Vec<usize> = Vec::new();
    let mut said: Vec<String> = Vec::new();
    for &s in &starts {
        let iso = &sp.isomers[s];
        let effect = |p: u8| -> i32 {
            sp.frame
                .poly
                .trans_to(p)
                .and_then(|q| sp.frame.donor(iso.seats[q as usize].0))
                .and_then(|d| sp.frame.ligands.get(d.group))
                .map_or(-1, |b| trans_effect(&b.ligand) as i32)
        };
        let across = |p: u8| -> Option<String> {
            let q = sp.frame.poly.trans_to(p)?;
            kind_of(&sp, iso.seats[q as usize].0).map(|k| k.0)
        };
        // which seats empty: the leaving ligands (an inserting one stays, as the new group)
        let leaving: Vec<&Kind> = removed
            .iter()
            .filter(|r| inserted.as_ref().is_none_or(|(i, _)| i != *r))
            .collect();
        let mut relabel: Vec<(u8, Kind)> = Vec::new();
        if needs_cis && leaving.len() == 2 {
            // the pair that leaves together sits cis
            let (a, b) = (leaving[0], leaving[1]);
            let pair = seats_of(&sp, iso, a)
                .into_iter()
                .flat_map(|x| seats_of(&sp, iso, b).into_iter().map(move |y| (x, y)))
                .filter(|&(x, y)| x != y && !sp.frame.poly.is_trans(x, y))
                .max_by_key(|&(x, y)| effect(x) + effect(y));
            if let Some((x, y)) = pair {
                relabel.push((x, vacancy()));
                relabel.push((y, vacancy()));
            }
        } else {
            for k in &leaving {
                let mut seats: Vec<u8> = seats_of(&sp, iso, k)
                    .into_iter()
                    .filter(|p| !relabel.iter().any(|(q, _)| q == p))
                    .collect();
                seats.sort_by_key(|&p| std::cmp::Reverse(effect(p)));
                let Some(&first) = seats.first() else {
                    continue;
                };
                if seats.len() > 1 && effect(first) > effect(seats[seats.len() - 1]) {
                    if let Some(t) = across(first) {
                        said.push(format!("the {} trans to {t} leaves (trans effect)", k.0));
                    }
                }
                if matches!(step, Step::Dissociation(_)) {
                    if let Some(t) = across(first) {
                        said.push(format!("the vacant site is trans to {t}"));
                    }
                }
                relabel.push((first, vacancy()));
            }
        }
        if let Some((from, to)) = &inserted {
            // the inserting ligand next to the group that migrates becomes the new group
            let gone: Vec<u8> = relabel.iter().map(|(p, _)| *p).collect();
            if let Some(p) = seats_of(&sp, iso, from).into_iter().find(|&p| {
                gone.iter()
                    .any(|&g| g != p && !sp.frame.poly.is_trans(g, p))
            }) {
                relabel.push((p, to.clone()));
            }
        }
        let sig = trans_pairs(&sp, iso, &|k| k, &relabel);
        let scored: Vec<(u32, usize)> = allowed
            .iter()
            .map(|&i| {
                (
                    agreement(&sig, &trans_pairs(&pp, &pp.isomers[i], &rename, &[])),
                    i,
                )
            })
            .collect();
        let best = scored.iter().map(|s| s.0).max().unwrap_or(0);
        for (sc, i) in scored {
            if sc == best && !result.contains(&i) {
                result.push(i);
            }
        }
    }
    result.sort_unstable();
    for n in said {
        if !notes.contains(&n) {
            notes.push(n);
        }
    }
    // three-coordinate fragments rearrange faster than they take a ligand (T to Y and back)
    let fluxional = matches!(step, Step::Association(_)) && sp.frame.poly.positions() <= 3;
    if fluxional && result.len() < pp.isomers.len() {
        notes.push(format!(
            "a three-coordinate fragment rearranges readily: the {} may take any site",
            added.first().map_or("ligand", |k| k.0.as_str())
        ));
        result = (0..pp.isomers.len()).collect();
    }
    let stereo = match result.as_slice() {
        // a composition with one arrangement needs no descriptor
        _ if pp.isomers.len() < 2 => None,
        [i] => Some(geometry::label(&pp, *i)),
        [] => None,
        _ if fluxional => None,
        many => {
            let base = |d: &str| {
                d.trim_end_matches(['C', 'A'])
                    .trim_end_matches("Δ")
                    .trim_end_matches("Λ")
                    .trim_end_matches('-')
                    .to_string()
            };
            let first = base(&pp.descriptors[many[0]]);
            if many.iter().all(|&i| base(&pp.descriptors[i]) == first) && many.len() == 2 {
                notes.push(format!("product: {first}, both enantiomers"));
                Some(first)
            } else {
                let names: Vec<&str> = many.iter().map(|&i| pp.descriptors[i].as_str()).collect();
                notes.push(format!(
                    "the product may be any of {}; fix one with a prefix or an isomerization",
                    names.join(", ")
                ));
                None
            }
        }
    };
    // a strong trans-influence ligand newly opposite a weak one, in every isomer the step may
    // give (an enantiomeric pair alike): that bond is long and labile
    let common = |p: &Placed, among: &[usize]| {
        let mut all = among.iter().map(|&i| weakened(p, &p.isomers[i]));
        let mut out = all.next().unwrap_or_default();
        for w in all {
            out.retain(|x| w.contains(x));
        }
        out
    };
    let metal = after.metals.first().map_or("M", |m| m.symbol);
    notes.extend(new_weakened(
        &common(&sp, &starts),
        &common(&pp, &result),
        metal,
    ));
    Ok((stereo, notes))
}

/// The isomer an edit leaves behind, when the start names one, with what the move does to
/// positions (which copy leaves, a ligand newly trans to a strong one): a swapped ligand
/// takes the old one's place, an added one the open site, and the rest stay where they were.
pub fn carry(
    start: &Complex,
    before: &Report,
    product: &Complex,
    after: &Report,
    kind: Carry,
) -> (Option<String>, Vec<String>) {
    if start.stereo.is_none() {
        return (None, Vec::new());
    }
    let step = match kind {
        Carry::Swap => Step::Substitution {
            leaving: String::new(),
            entering: String::new(),
        },
        Carry::Add => Step::Association(String::new()),
        Carry::Remove => Step::Dissociation(String::new()),
    };
    follow(&step, start, before, product, after, None).unwrap_or_default()
}

/// What an edit did to the ligand set, for `carry`.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Carry {
    Swap,
    Add,
    Remove,
}

/// Alkyl halides add trans by the SN2 path; everything else (H2, silanes, C-H, aryl and vinyl
/// halides) cis (Crabtree 2014, §6.3-6.4).
fn default_course(product: &Complex, added: &[Kind]) -> Course {
    let family = |k: &Kind| -> String {
        product
            .all_ligands()
            .find(|(_, b)| b.ligand.key == k.0)
            .map(|(_, b)| b.ligand.family.clone())
            .unwrap_or_default()
    };
    let f: Vec<String> = added.iter().map(family).collect();
    let alkyl = f.iter().any(|x| x == "alkyl");
    let halide = f.iter().any(|x| x == "halide" || x == "pseudohalide");
    if alkyl && halide {
        Course::Trans
    } else {
        Course::Cis
    }
}

/// `isomerization TARGET`: the same complex with another arrangement.
pub(super) fn isomerization(
    start: &Complex,
    before: &Report,
    target: &str,
) -> Result<Complex, StepError> {
    let placed = geometry::place(start, before).map_err(StepError::Refused)?;
    let mut product = start.clone();
    product.stereo = Some(target.trim().to_string());
    let to = geometry::place(&product, before).map_err(StepError::Refused)?;
    if to.chosen.len() == to.isomers.len() && to.isomers.len() > 1 {
        return refuse(format!(
            "'{target}' names no isomer of {}; its isomers are {}",
            before.formula,
            to.descriptors.join(", ")
        ));
    }
    if to.isomers.len() == 1 {
        return refuse(format!(
            "{} has one arrangement on its {} polyhedron; there is nothing to isomerize to",
            before.formula, to.frame.poly.symbol
        ));
    }
    if to.chosen == placed.chosen {
        return refuse(format!(
            "the complex is already {target}; name another isomer ({})",
            to.descriptors.join(", ")
        ));
    }
    if let [i] = to.chosen.as_slice() {
        product.stereo = Some(geometry::label(&to, *i));
    }
    Ok(product)
}

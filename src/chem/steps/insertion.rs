//! Insertions and eliminations worked out on structures: 1,1-insertion of CO, isocyanides and
//! SO2, 1,2-insertion of alkenes, alkynes and CO2, carbene insertion, deinsertion, and α- and
//! β-eliminations (Crabtree 2014, ch. 7; Hartwig 2010, ch. 9-10).

use super::ctx::{add, one_bond, remove, slot_in, structure, swap, x_mode, Ctx};
use super::ligands::hydride;
use super::redox::joined_name;
use super::{refuse, Regio, StepError};
use crate::chem::complex::Complex;
use crate::chem::frac::Frac;
use crate::chem::molecule::{Atom, Molecule, AROMATIC};
use crate::chem::periodic;
use crate::chem::reagent::join;
use crate::chem::species::Species;

/// The bond of an unsaturated ligand that inserts.
#[derive(Debug, Clone, Copy)]
pub enum Unsat {
    /// 1,1: the group and the metal both end on one atom (C of CO or CNR, S of SO2).
    OneOne(usize),
    /// 1,2 across a multiple bond a-b; `metal_end` is where the metal ends up by default.
    Across { a: usize, b: usize },
    /// An alkylidene's carbon (its bond to the metal becomes single).
    Carbene(usize),
}

/// How a free ligand inserts, read from its structure.
pub fn unsaturation(m: &Molecule) -> Option<Unsat> {
    if let [(c, 2)] = m.metal_bonds()[..] {
        return Some(Unsat::Carbene(c));
    }
    if m.star_count() > 0 {
        return None;
    }
    // CO and isocyanides: a carbon with one triple bond and a negative formal charge
    for (i, a) in m.atoms.iter().enumerate() {
        if a.z == periodic::C && a.charge < 0 && m.neighbors(i).any(|(_, o)| o == 3) {
            return Some(Unsat::OneOne(i));
        }
    }
    // SO2: sulfur with two S=O
    for (i, a) in m.atoms.iter().enumerate() {
        let oxo = m
            .neighbors(i)
            .filter(|&(j, o)| o == 2 && m.atoms[j].z == periodic::O)
            .count();
        if a.z == periodic::S && oxo == 2 && m.heavy_neighbors(i).len() == 2 {
            return Some(Unsat::OneOne(i));
        }
    }
    // C=C or C#C (not aromatic), else C=O as in CO2 and aldehydes
    let pick = |want: &dyn Fn(u8, u8) -> bool| {
        m.bonds
            .iter()
            .find(|b| (b.order == 2 || b.order == 3) && want(m.atoms[b.a].z, m.atoms[b.b].z))
    };
    if let Some(b) = pick(&|x, y| x == periodic::C && y == periodic::C) {
        return Some(Unsat::Across { a: b.a, b: b.b });
    }
    if let Some(b) =
        pick(&|x, y| x == periodic::C && y == periodic::O || x == periodic::O && y == periodic::C)
    {
        // the metal takes the oxygen: CO2 into M-H gives formate, into M-R a carboxylate
        let (c, o) = if m.atoms[b.a].z == periodic::C {
            (b.a, b.b)
        } else {
            (b.b, b.a)
        };
        return Some(Unsat::Across { a: c, b: o });
    }
    None
}

/// Heavy neighbours: how substituted an alkene carbon is.
fn degree(m: &Molecule, i: usize) -> usize {
    m.heavy_neighbors(i).len()
}

/// Lower the order of the bond between a and b by one, and clear the formal charges a CO or
/// isocyanide carries once it is no longer a triple bond.
fn loosen(m: &mut Molecule, a: usize, b: usize) {
    if let Some(k) = m.bond_between(a, b) {
        if m.bonds[k].order > 1 && m.bonds[k].order != AROMATIC {
            m.bonds[k].order -= 1;
        }
    }
    for i in [a, b] {
        m.atoms[i].charge = 0;
    }
}

/// The group R (with its `*`) bonded to atom `at` of `m`; returns the index R's atom got.
fn attach(m: &mut Molecule, at: usize, r: &Molecule) -> usize {
    let mut g = r.clone();
    let bound = g.strip_stars();
    let off = m.merge(&g);
    let ri = off + bound.first().map_or(0, |x| x.0);
    m.add_bond(at, ri, 1);
    ri
}

fn star(m: &mut Molecule, at: usize, order: u8) {
    let s = m.add_atom(Atom::star());
    m.add_bond(at, s, order);
}

/// Migratory insertion of an unsaturated ligand into an M-R bond: the group R moves onto the
/// ligand and the site R held is left open (Δe -2, CN -1).
pub fn migratory_insertion(
    cx: &mut Ctx,
    inserting: &str,
    into: &str,
    regio: Option<Regio>,
) -> Result<Complex, StepError> {
    let su = cx.slot(inserting)?;
    let bu = cx.group(su)?;
    let mu = structure(bu)?.clone();
    let Some(kind) = unsaturation(&mu) else {
        return refuse(format!(
            "{} has no bond to insert: insertion takes CO, isocyanides, SO2, CO2, alkenes, \
             alkynes and alkylidenes",
            bu.ligand.key
        ));
    };
    if bu.mode().class.x > 0 && !matches!(kind, Unsat::Carbene(_)) {
        return refuse(format!(
            "{} is an X group, not an unsaturated ligand",
            bu.ligand.key
        ));
    }
    let rest = remove(cx.c, su)?;
    let sr = slot_in(&rest, into, cx.lookup).map_err(|_| {
        StepError::Refused(format!(
            "{} has no {into} on the same metal to insert into",
            bu.ligand.key
        ))
    })?;
    let br = rest
        .group(sr)
        .ok_or_else(|| StepError::Refused("no such ligand".into()))?;
    let Some((mr, ra)) = one_bond(br) else {
        return refuse(format!(
            "{} inserts into an M-R σ bond (R = H, alkyl, aryl, silyl, boryl, amido, alkoxo); \
             {} is {}",
            bu.ligand.key,
            br.ligand.key,
            br.mode().class
        ));
    };
    let rz = mr.atoms[ra].z;
    if !matches!(rz, 1 | 5 | 6 | 7 | 8 | 14 | 16 | 32 | 50) {
        return refuse(format!("nothing inserts into M-{}", br.ligand.key));
    }
    let mut g = mu.clone();
    match kind {
        Unsat::OneOne(at) => {
            // CO: C triple bond to O becomes C=O; SO2 keeps its S=O bonds
            if g.atoms[at].z == periodic::C {
                let partner = g
                    .neighbors(at)
                    .find(|&(_, o)| o == 3)
                    .map(|(j, _)| j)
                    .unwrap_or(at);
                loosen(&mut g, at, partner);
            }
            attach(&mut g, at, &mr);
            star(&mut g, at, 1);
        }
        Unsat::Carbene(c) => {
            let s = g
                .bonds
                .iter()
                .position(|b| b.other(c).is_some_and(|x| g.atoms[x].is_star()))
                .unwrap_or(0);
            g.bonds[s].order = 1;
            attach(&mut g, c, &mr);
        }
        Unsat::Across { a, b } => {
            let carbonyl = g.atoms[b].z == periodic::O;
            let (metal_end, r_end) = if carbonyl {
                (b, a)
            } else {
                let aryl_like = mr.atoms[ra].z == periodic::C
                    && (mr.atoms[ra].aromatic || mr.neighbors(ra).any(|(_, o)| o == 2));
                let default = if aryl_like {
                    Regio::TwoOne
                } else {
                    Regio::OneTwo
                };
                let want = regio.unwrap_or(default);
                let (less, more) = if degree(&g, a) <= degree(&g, b) {
                    (a, b)
                } else {
                    (b, a)
                };
                if degree(&g, a) != degree(&g, b) {
                    let how = match want {
                        Regio::OneTwo => "1,2: the metal on the less substituted carbon",
                        Regio::TwoOne => "2,1: the metal on the more substituted carbon",
                    };
                    cx.note(format!(
                        "{how}{}",
                        if regio.is_none() {
                            " (the usual course for this group; give 1,2 or 2,1 to choose)"
                        } else {
                            ""
                        }
                    ));
                }
                match want {
                    Regio::OneTwo => (less, more),
                    Regio::TwoOne => (more, less),
                }
            };
            loosen(&mut g, a, b);
            attach(&mut g, r_end, &mr);
            star(&mut g, metal_end, 1);
        }
    }
    let new = cx.made(&g);
    let without = remove(&rest, sr)?;
    add(&without, &new, 0)
}

/// The reverse of a 1,1-insertion: an acyl gives back CO and the alkyl, an iminoacyl the
/// isocyanide, an S-sulfinate SO2 (needs an open site).
pub fn deinsertion(cx: &mut Ctx, token: &str) -> Result<Complex, StepError> {
    let slot = cx.slot(token)?;
    let b = cx.group(slot)?;
    let usage = || {
        StepError::Refused(format!(
            "deinsertion takes back a 1,1-insertion: the group must be an acyl, iminoacyl or \
             S-sulfinate (C(O)R, C(NR)R, S(O)2R); {} is not",
            b.ligand.key
        ))
    };
    let (m, at) = one_bond(b).ok_or_else(usage)?;
    let multiple: Vec<usize> = m
        .neighbors(at)
        .filter(|&(j, o)| o == 2 && matches!(m.atoms[j].z, 7 | 8))
        .map(|(j, _)| j)
        .collect();
    let singles: Vec<usize> = m
        .neighbors(at)
        .filter(|&(j, o)| o == 1 && !m.atoms[j].is_star())
        .map(|(j, _)| j)
        .collect();
    let z = m.atoms[at].z;
    let ok = match z {
        periodic::C => multiple.len() == 1 && singles.len() == 1,
        periodic::S => multiple.len() == 2 && singles.len() == 1,
        _ => false,
    };
    if !ok {
        return Err(usage());
    }
    cx.needs_open_site("deinsertion")?;
    let r_atom = singles[0];
    let k = m.bond_between(at, r_atom).ok_or_else(usage)?;
    let (x, y) = m.cut(k).ok_or_else(usage)?;
    let (mut unsat, r) = if m.bonds[k].a == at { (x, y) } else { (y, x) };
    // drop both stars from the unsaturated part: the one where R was, and the metal's
    unsat.strip_stars();
    if z == periodic::C {
        // C=O back to C#O (C- O+), C=NR to C#N+R
        let c = (0..unsat.atoms.len())
            .find(|&i| unsat.atoms[i].z == periodic::C && unsat.heavy_neighbors(i).len() == 1)
            .unwrap_or(0);
        let first = unsat.neighbors(c).next();
        if let Some((o, _)) = first {
            if let Some(kb) = unsat.bond_between(c, o) {
                unsat.bonds[kb].order = 3;
            }
            unsat.atoms[c].charge = -1;
            unsat.atoms[o].charge = 1;
        }
    }
    let lu = cx.made(&unsat);
    let lr = cx.made(&r);
    let once = swap(cx.c, slot, &lr, x_mode(&lr))?;
    add(&once, &lu, 0)
}

/// Which β-elimination.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Beta {
    Hydride,
    Alkyl,
    Heteroatom,
}

/// One way a group can β-eliminate: the alkene (or carbonyl) left, and the group that moves
/// to the metal.
struct Option_ {
    alkene: Molecule,
    moving: Molecule,
    /// The new double bond is to O or N (a ketone, aldehyde or imine): it leaves the metal.
    carbonyl: bool,
}

/// β-elimination: a hydrogen (or an alkyl, or a heteroatom group) on the β atom moves to the
/// metal and the α-β bond becomes double (Δe +2, CN +1; needs an open cis site).
pub fn beta_elimination(
    cx: &mut Ctx,
    token: &str,
    which: Option<&str>,
    kind: Beta,
) -> Result<Complex, StepError> {
    let slot = cx.slot(token)?;
    let b = cx.group(slot)?;
    let key = b.ligand.key.clone();
    let Some((m, alpha)) = one_bond(b) else {
        return refuse(format!(
            "β-elimination needs a σ-bound group (alkyl, alkoxo, amido); {} is {}",
            key,
            b.mode().class
        ));
    };
    let mut options: Vec<Option_> = Vec::new();
    for (beta, order) in m.neighbors(alpha).collect::<Vec<_>>() {
        if order != 1 || m.atoms[beta].is_star() || m.atoms[beta].aromatic && kind == Beta::Hydride
        {
            continue;
        }
        match kind {
            Beta::Hydride => {
                if m.atoms[beta].h == 0 {
                    continue;
                }
                let mut g = m.clone();
                g.strip_stars();
                let (a2, b2) = (
                    alpha - stars_before(&m, alpha),
                    beta - stars_before(&m, beta),
                );
                g.atoms[b2].h -= 1;
                if let Some(k) = g.bond_between(a2, b2) {
                    g.bonds[k].order = 2;
                }
                options.push(Option_ {
                    alkene: g,
                    moving: hydride(),
                    carbonyl: m.atoms[alpha].z != periodic::C || m.atoms[beta].z != periodic::C,
                });
            }
            Beta::Alkyl | Beta::Heteroatom => {
                for (gamma, o2) in m.neighbors(beta).collect::<Vec<_>>() {
                    if gamma == alpha || o2 != 1 || m.atoms[gamma].is_star() {
                        continue;
                    }
                    let z = m.atoms[gamma].z;
                    let fits = match kind {
                        Beta::Alkyl => z == periodic::C,
                        _ => !matches!(z, periodic::C | periodic::H),
                    };
                    if !fits {
                        continue;
                    }
                    let k = m.bond_between(beta, gamma).unwrap_or(0);
                    let Some((x, y)) = m.cut(k) else {
                        continue; // in a ring: the ring would open, not split
                    };
                    let (mut rest, moving) = if m.bonds[k].a == beta { (x, y) } else { (y, x) };
                    // rest holds α, β, the metal's star and the star where γ was
                    rest.strip_stars();
                    let map = |i: usize| {
                        let keep: Vec<usize> = m.side(beta, k);
                        keep.iter()
                            .filter(|&&x| !m.atoms[x].is_star())
                            .position(|&x| x == i)
                    };
                    if let (Some(a2), Some(b2)) = (map(alpha), map(beta)) {
                        if let Some(kk) = rest.bond_between(a2, b2) {
                            rest.bonds[kk].order = 2;
                        }
                    }
                    options.push(Option_ {
                        alkene: rest,
                        moving,
                        carbonyl: m.atoms[alpha].z != periodic::C || m.atoms[beta].z != periodic::C,
                    });
                }
            }
        }
    }
    let what = match kind {
        Beta::Hydride => "hydrogen",
        Beta::Alkyl => "alkyl group",
        Beta::Heteroatom => "heteroatom group (OR, NR2, halide)",
    };
    if options.is_empty() {
        return refuse(match kind {
            Beta::Hydride => {
                format!("{key} has no hydrogen on the β carbon, so it cannot β-eliminate")
            }
            _ => format!("{key} has no {what} on a β atom to eliminate"),
        });
    }
    // one option per distinct alkene
    let mut distinct: Vec<Option_> = Vec::new();
    for o in options {
        let c = o.alkene.canonical_smiles();
        if !distinct.iter().any(|d| d.alkene.canonical_smiles() == c) {
            distinct.push(o);
        }
    }
    cx.needs_open_site("β-elimination")?;
    let m0 = cx.metal()?;
    if m0.target == 16 && m0.electron_count >= Frac::int(16) {
        return refuse(
            "a 16-e square-planar complex has no cis site for the β atom's group: a ligand \
             must leave first (Whitesides; Crabtree 2014, ch. 7)",
        );
    }
    // the alkene ligands, made once: for the names of a choice and for the product
    let made: Vec<_> = distinct.iter().map(|o| cx.made(&o.alkene)).collect();
    let names: Vec<String> = made.iter().map(|l| l.key.clone()).collect();
    let pick = match which {
        Some(w) => {
            let want = cx
                .ligand(w)
                .ok()
                .and_then(|l| l.structure.as_ref().map(|s| s.canonical_smiles()));
            let by_index = w
                .parse::<usize>()
                .ok()
                .filter(|&i| i >= 1 && i <= names.len())
                .map(|i| i - 1);
            by_index
                .or_else(|| names.iter().position(|n| n == w))
                .or_else(|| {
                    want.and_then(|c| {
                        distinct
                            .iter()
                            .position(|o| o.alkene.canonical_smiles() == c)
                    })
                })
                .ok_or_else(|| {
                    StepError::Usage(format!(
                        "{key} gives {}; '{w}' is none of them",
                        names.join(" or ")
                    ))
                })?
        }
        None => {
            // the most substituted alkene (the thermodynamic one) unless told
            // a C=O or C=N before any alkene (the aldehyde of the Wacker step), then the most
            // substituted alkene
            let score = |o: &Option_| {
                let g = &o.alkene;
                let most = g
                    .bonds
                    .iter()
                    .filter(|b| b.order == 2)
                    .map(|b| degree(g, b.a) + degree(g, b.b))
                    .max()
                    .unwrap_or(0);
                (o.carbonyl, most)
            };
            let best = (0..distinct.len())
                .max_by_key(|&i| (score(&distinct[i]), std::cmp::Reverse(i)))
                .unwrap_or(0);
            if distinct.len() > 1 {
                let others: Vec<&String> = names
                    .iter()
                    .enumerate()
                    .filter(|(i, _)| *i != best)
                    .map(|(_, n)| n)
                    .collect();
                cx.note(format!(
                    "{key} can also give {}: add it after the group to choose",
                    others
                        .iter()
                        .map(|s| s.as_str())
                        .collect::<Vec<_>>()
                        .join(", ")
                ));
            }
            best
        }
    };
    let chosen = distinct.swap_remove(pick);
    let chosen_made = made[pick].clone();
    let moving = cx.made(&chosen.moving);
    let carbonyl = chosen.carbonyl;
    let once = swap(cx.c, slot, &moving, x_mode(&moving))?;
    if carbonyl {
        // a ketone, aldehyde or imine from an alkoxo or amido leaves the metal
        let name = crate::chem::reagent::name_species(&chosen.alkene, None, cx.lookup);
        cx.leaves(Species::new(name, chosen.alkene));
        return Ok(once);
    }
    let ene = chosen_made;
    add(&once, &ene, 0)
}

fn stars_before(m: &Molecule, i: usize) -> usize {
    (0..i).filter(|&k| m.atoms[k].is_star()).count()
}

/// α-hydride elimination: M-CH2R to M(=CHR)(H) (ΔOS +2 for an X2 alkylidene). At a d0
/// metal a second alkyl takes the hydrogen instead (α-abstraction): M(CH2R)2 -> M(=CHR) +
/// CH3R, as in Schrock's Ta(CH2tBu)5 (Crabtree 2014, ch. 11).
pub fn alpha_elimination(cx: &mut Ctx, token: &str) -> Result<Complex, StepError> {
    let slot = cx.slot(token)?;
    let b = cx.group(slot)?;
    let key = b.ligand.key.clone();
    let Some((m, alpha)) = one_bond(b) else {
        return refuse(format!(
            "α-elimination needs a σ-bound alkyl; {key} is {}",
            b.mode().class
        ));
    };
    if m.atoms[alpha].h == 0 || m.atoms[alpha].z != periodic::C {
        return refuse(format!("{key} has no hydrogen on its α carbon"));
    }
    if m.neighbors(alpha).any(|(_, o)| o != 1) {
        return refuse(format!(
            "{key}'s α carbon is already multiply bonded; α-elimination starts from an alkyl"
        ));
    }
    let mut ylidene = m.clone();
    ylidene.atoms[alpha].h -= 1;
    for bd in ylidene.bonds.iter_mut() {
        if bd.other(alpha).is_some_and(|x| m.atoms[x].is_star()) {
            bd.order = 2;
        }
    }
    let yl = cx.made(&ylidene);
    let mode = cx.carbene_mode(&yl);
    let d = cx.d()?;
    let without = remove(cx.c, slot)?;
    if d < Frac::int(2) {
        // α-abstraction: a second alkyl takes the hydrogen and leaves as an alkane
        let other = without.slots().into_iter().find(|s| {
            without
                .group(*s)
                .and_then(one_bond)
                .is_some_and(|(g, at)| g.atoms[at].z == periodic::C)
        });
        let Some(s2) = other else {
            return refuse(format!(
                "α-elimination raises the oxidation state by two and the metal is d{d}; \
                 α-abstraction needs a second alkyl to take the hydrogen"
            ));
        };
        let b2 = without
            .group(s2)
            .ok_or_else(|| StepError::Refused("no such ligand".into()))?;
        let (g2, _) = one_bond(b2).ok_or_else(|| StepError::Refused("no alkyl".into()))?;
        let alkane = join(&g2, &hydride());
        let name = joined_name(&alkane, &b2.ligand.key, "H", cx);
        cx.leaves(Species::new(name, alkane));
        cx.note("α-abstraction: the metal is d0, so a second alkyl takes the α-hydrogen");
        let twice = remove(&without, s2)?;
        return add(&twice, &yl, mode);
    }
    cx.needs_open_site("α-elimination")?;
    let h = cx.made(&hydride());
    let with_h = add(&without, &h, 0)?;
    add(&with_h, &yl, mode)
}

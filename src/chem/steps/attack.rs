//! Steps where a reagent from outside acts on the complex: nucleophilic and electrophilic
//! attack on ligands, transmetalation, and concerted metalation-deprotonation.

use super::ctx::{one_bond, recharge, structure, swap, x_mode, Ctx};
use super::{refuse, StepError};
use crate::chem::complex::Complex;
use crate::chem::molecule::{Atom, Molecule, AROMATIC};
use crate::chem::periodic;
use crate::chem::reagent::{electrophile, name_species};
use crate::chem::species::{ion_of, Species};

/// The nucleophile as a group (with `*` on the attacking atom), what enters, and what is
/// left over (a proton from H-Nu, a spectator cation).
struct Nucleophile {
    group: Molecule,
    enters: Species,
    leaves: Vec<Species>,
}

fn nucleophile(cx: &Ctx, token: &str) -> Result<Nucleophile, StepError> {
    // a catalogue group enters as its anion: OH-, OMe-, OAc-, CN-
    if let Some(l) = cx.lookup.exact(token) {
        if let Some(g) = crate::chem::condensed::substituent(l) {
            let ion = ion_of(g, -1);
            return Ok(Nucleophile {
                group: g.clone(),
                enters: Species::new(l.key.clone(), ion),
                leaves: Vec::new(),
            });
        }
    }
    let r = cx.reagent(token)?;
    let parts = r.species.structure.components();
    // an anion (with or without its cation): the negative atom attacks
    if let Some(i) = parts.iter().position(|p| p.charge() < 0) {
        let p = &parts[i];
        let at = (0..p.atoms.len())
            .find(|&a| p.atoms[a].charge < 0)
            .unwrap_or(0);
        let mut g = p.clone();
        g.atoms[at].charge = 0;
        let s = g.add_atom(Atom::star());
        g.add_bond(at, s, 1);
        let leaves = parts
            .iter()
            .enumerate()
            .filter(|(k, _)| *k != i)
            .map(|(_, x)| Species::new(name_species(x, None, cx.lookup), x.clone()))
            .collect();
        return Ok(Nucleophile {
            group: g,
            enters: r.species,
            leaves,
        });
    }
    // H-Nu: water, alcohols, amines attack through O, N or S and give up the proton
    if parts.len() == 1 {
        let p = &parts[0];
        for z in [periodic::O, periodic::N, periodic::S] {
            if let Some(at) = (0..p.atoms.len()).find(|&a| p.atoms[a].z == z && p.atoms[a].h > 0) {
                let mut g = p.clone();
                g.atoms[at].h -= 1;
                let s = g.add_atom(Atom::star());
                g.add_bond(at, s, 1);
                return Ok(Nucleophile {
                    group: g,
                    enters: r.species,
                    leaves: vec![super::redox::proton()],
                });
            }
        }
    }
    refuse(format!(
        "{} is not a nucleophile nonet can place: give an anion (OH, OMe, OAc, CN, a salt such \
         as NaOMe) or a molecule with an O-H, N-H or S-H (H2O, MeOH, HNEt2)",
        r.species.name
    ))
}

/// External attack of a nucleophile on a coordinated alkene, alkyne, CO, isocyanide, arene or
/// allyl: the ligand becomes an alkyl, vinyl, acyl-type, cyclohexadienyl or alkene
/// (Crabtree 2014, ch. 8; Hartwig 2010, ch. 11).
pub fn nucleophilic(cx: &mut Ctx, nu: &str, target: &str) -> Result<Complex, StepError> {
    let slot = cx.slot(target)?;
    let b = cx.group(slot)?;
    let key = b.ligand.key.clone();
    let m = structure(b)?.clone();
    let class = b.mode().class;
    let n = nucleophile(cx, nu)?;
    let mut g = m.clone();
    let radical = crate::chem::species::open_valence_atoms(&m);
    let hapto = b.mode().hapticity().unwrap_or(1);
    let (new_mode_note, product_group) = if class.x == 0 && m.star_count() == 0 {
        if let Some(c) = (0..g.atoms.len()).find(|&i| {
            g.atoms[i].z == periodic::C
                && g.atoms[i].charge < 0
                && g.neighbors(i).any(|(_, o)| o == 3)
        }) {
            // CO or CNR: Nu on carbon, M-C(=O)Nu
            let partner = g
                .neighbors(c)
                .find(|&(_, o)| o == 3)
                .map(|(j, _)| j)
                .unwrap_or(c);
            lower(&mut g, c, partner);
            put(&mut g, c, &n.group);
            star(&mut g, c);
            ("acyl-type group", g)
        } else if hapto >= 6 && g.atoms.iter().any(|a| a.aromatic) {
            // an arene: Nu adds exo to one ring carbon, leaving an η5-cyclohexadienyl
            if !g.kekulize() {
                return refuse(format!("{key}: nonet cannot place the ring's double bonds"));
            }
            let c = (0..g.atoms.len())
                .find(|&i| {
                    g.atoms[i].z == periodic::C
                        && g.atoms[i].h > 0
                        && g.neighbors(i).any(|(_, o)| o == 2)
                })
                .ok_or_else(|| {
                    StepError::Refused(format!("{key} has no C-H for the nucleophile"))
                })?;
            let partner = g
                .neighbors(c)
                .find(|&(_, o)| o == 2)
                .map(|(j, _)| j)
                .unwrap_or(c);
            lower(&mut g, c, partner);
            put(&mut g, c, &n.group);
            ("η5-cyclohexadienyl", g)
        } else if let Some(k) = g.bonds.iter().position(|bd| {
            hapto == 2
                && (bd.order == 2 || bd.order == 3)
                && g.atoms[bd.a].z == periodic::C
                && g.atoms[bd.b].z == periodic::C
        }) {
            // alkene or alkyne: Nu on the more substituted carbon, the metal on the other
            let (a, c) = (g.bonds[k].a, g.bonds[k].b);
            let (to_nu, to_m) = if g.heavy_neighbors(a).len() >= g.heavy_neighbors(c).len() {
                (a, c)
            } else {
                (c, a)
            };
            lower(&mut g, a, c);
            put(&mut g, to_nu, &n.group);
            star(&mut g, to_m);
            ("σ-alkyl", g)
        } else {
            return refuse(format!(
                "{key} has no multiple bond for the nucleophile; attack goes to coordinated \
                 alkenes, alkynes, CO, isocyanides, arenes and allyls"
            ));
        }
    } else if radical.len() == 1 && m.star_count() == 0 && class.x == 1 && hapto == 3 {
        // η3-allyl (or a dienyl): Nu at a terminus, leaving a neutral alkene; the metal is
        // reduced by two (Tsuji-Trost)
        let t1 = radical[0];
        let Some((c2, t3)) = g.heavy_neighbors(t1).into_iter().find_map(|c2| {
            g.neighbors(c2)
                .find(|&(x, o)| o == 2 && x != t1)
                .map(|(x, _)| (c2, x))
        }) else {
            return refuse(format!("{key} is not an allyl nonet can attack"));
        };
        // the less substituted terminus takes the nucleophile
        if g.heavy_neighbors(t3).len() < g.heavy_neighbors(t1).len() {
            if let Some(k) = g.bond_between(c2, t3) {
                g.bonds[k].order = 1;
            }
            if let Some(k) = g.bond_between(t1, c2) {
                g.bonds[k].order = 2;
            }
            put(&mut g, t3, &n.group);
        } else {
            put(&mut g, t1, &n.group);
        }
        ("alkene", g)
    } else {
        return refuse(format!(
            "nucleophiles attack coordinated π ligands (alkene, alkyne, CO, arene, allyl); {key} \
             is {}",
            class
        ));
    };
    let q_in = n.enters.charge();
    let q_out: i32 = n.leaves.iter().map(Species::charge).sum();
    cx.enters(n.enters);
    for s in n.leaves {
        cx.leaves(s);
    }
    let l = cx.made(&product_group);
    cx.note(format!("exo attack: {key} becomes a {new_mode_note}"));
    recharge(&swap(cx.c, slot, &l, 0)?, q_in - q_out)
}

fn lower(m: &mut Molecule, a: usize, b: usize) {
    if let Some(k) = m.bond_between(a, b) {
        if m.bonds[k].order > 1 && m.bonds[k].order != AROMATIC {
            m.bonds[k].order -= 1;
        }
    }
    m.atoms[a].charge = 0;
    m.atoms[b].charge = 0;
}

fn put(m: &mut Molecule, at: usize, group: &Molecule) {
    let mut g = group.clone();
    let bound = g.strip_stars();
    let off = m.merge(&g);
    m.add_bond(at, off + bound.first().map_or(0, |x| x.0), 1);
}

fn star(m: &mut Molecule, at: usize) {
    let s = m.add_atom(Atom::star());
    m.add_bond(at, s, 1);
}

/// An electrophile adds to a ligand: to the γ carbon of an η1-allyl (giving an η2-alkene),
/// the β carbon of a vinyl or alkynyl (giving a carbene or vinylidene), or the oxygen of an
/// acyl (giving a Fischer carbene). The complex's charge rises by one (Crabtree 2014, ch. 8).
pub fn electrophilic(cx: &mut Ctx, e: &str, target: &str) -> Result<Complex, StepError> {
    let slot = cx.slot(target)?;
    let b = cx.group(slot)?;
    let key = b.ligand.key.clone();
    let Some((m, alpha)) = one_bond(b) else {
        return refuse(format!(
            "electrophilic attack here goes to σ-bound allyl, vinyl, alkynyl or acyl groups; {key} \
             is {}",
            b.mode().class
        ));
    };
    let r = cx.reagent(e)?;
    let Some(el) = electrophile(&r.species.structure) else {
        return refuse(format!(
            "{} gives no electrophile nonet knows (a proton from an acid, a methyl from MeOTf, a \
             carbocation)",
            r.species.name
        ));
    };
    let mut g = m.clone();
    let star_bond = g
        .bonds
        .iter()
        .position(|bd| bd.other(alpha).is_some_and(|x| g.atoms[x].is_star()))
        .unwrap_or(0);
    let multiple = g
        .neighbors(alpha)
        .find(|&(j, o)| (o == 2 || o == 3) && !g.atoms[j].is_star());
    let carbene;
    if let Some((beta, o)) = multiple.filter(|&(j, _)| g.atoms[j].z == periodic::C) {
        // vinyl -> carbene, alkynyl -> vinylidene
        let _ = o;
        lower(&mut g, alpha, beta);
        put(&mut g, beta, &el.group);
        g.bonds[star_bond].order = 2;
        carbene = true;
    } else if let Some((o_atom, _)) = multiple.filter(|&(j, _)| g.atoms[j].z == periodic::O) {
        // acyl O-alkylation or protonation: a Fischer carbene
        lower(&mut g, alpha, o_atom);
        put(&mut g, o_atom, &el.group);
        g.bonds[star_bond].order = 2;
        carbene = true;
    } else {
        // η1-allyl: E to the γ carbon, the metal keeps an η2-alkene
        let found = g.heavy_neighbors(alpha).into_iter().find_map(|beta| {
            g.neighbors(beta)
                .find(|&(x, o)| o == 2 && x != alpha && g.atoms[x].z == periodic::C)
                .map(|(gamma, _)| (beta, gamma))
        });
        let Some((beta, gamma)) = found else {
            return refuse(format!(
                "{key} has no allyl, vinyl, alkynyl or acyl π bond for the electrophile"
            ));
        };
        lower(&mut g, beta, gamma);
        if let Some(k) = g.bond_between(alpha, beta) {
            g.bonds[k].order = 2;
        }
        put(&mut g, gamma, &el.group);
        g.strip_stars();
        carbene = false;
    }
    cx.enters(r.species.clone());
    for y in el.rest {
        let name = name_species(&y, None, cx.lookup);
        cx.leaves(Species::new(name, y));
    }
    let l = cx.made(&g);
    let mode = if carbene { cx.carbene_mode(&l) } else { 0 };
    recharge(&swap(cx.c, slot, &l, mode)?, 1)
}

/// How readily a group moves from a main-group metal: alkynyl > vinyl > aryl > allyl and
/// benzyl > alkyl (the order of Stille and Negishi couplings; Hartwig 2010, ch. 19).
fn aptitude(m: &Molecule, c: usize) -> u8 {
    if m.atoms[c].z != periodic::C {
        return 0;
    }
    if m.neighbors(c).any(|(_, o)| o == 3) {
        5
    } else if m.atoms[c].aromatic {
        3
    } else if m
        .neighbors(c)
        .any(|(j, o)| o == 2 && m.atoms[j].z == periodic::C)
    {
        4
    } else if m
        .heavy_neighbors(c)
        .iter()
        .any(|&j| m.atoms[j].aromatic || m.neighbors(j).any(|(_, o)| o == 2))
    {
        2
    } else {
        1
    }
}

/// Main-group and d10 metals that hand an organic group over.
fn transfers(z: u8) -> bool {
    matches!(
        z,
        3 | 5 | 11 | 12 | 13 | 14 | 19 | 29 | 30 | 31 | 32 | 47 | 48 | 49 | 50 | 80 | 82
    )
}

/// R moves from a main-group reagent to the metal and the metal's X goes back:
/// M-X + R-[E] -> M-R + X-[E] (Suzuki, Negishi, Stille, Kumada, Hiyama).
pub fn transmetalation(
    cx: &mut Ctx,
    reagent: &str,
    leaving: Option<&str>,
) -> Result<Complex, StepError> {
    let r = cx.reagent(reagent)?;
    let m = r.species.structure.clone();
    // the best (centre, carbon) pair
    let mut best: Option<(u8, usize, usize)> = None;
    for (k, bd) in m.bonds.iter().enumerate() {
        for (e, c) in [(bd.a, bd.b), (bd.b, bd.a)] {
            if bd.order == 1 && transfers(m.atoms[e].z) {
                let s = aptitude(&m, c);
                if s > 0 && best.is_none_or(|(b, _, _)| s > b) {
                    best = Some((s, k, e));
                }
            }
        }
    }
    let Some((_, k, centre)) = best else {
        return refuse(format!(
            "{} carries no organic group on B, Si, Sn, Zn, Mg, Li, Cu, Al or another main-group \
             metal to transfer",
            r.species.name
        ));
    };
    let (x, y) = m
        .cut(k)
        .ok_or_else(|| StepError::Refused("the group to transfer is in a ring".into()))?;
    let (residue, group) = if m.bonds[k].a == centre {
        (x, y)
    } else {
        (y, x)
    };
    // the metal's X: the one named, else a halide, pseudohalide, sulfonate or carboxylate
    let slot = match leaving {
        Some(t) => cx.slot(t)?,
        None => {
            let rank = |f: &str| match f {
                "halide" => 0,
                "pseudohalide" => 1,
                "carboxylate" | "alkoxide" => 2,
                _ => 3,
            };
            cx.c.slots()
                .into_iter()
                .filter(|s| {
                    cx.c.group(*s).is_some_and(|b| {
                        b.mode().class.x >= 1
                            && rank(&b.ligand.family) < 3
                            && b.ligand.structure.is_some()
                    })
                })
                .min_by_key(|s| cx.c.group(*s).map_or(9, |b| rank(&b.ligand.family)))
                .ok_or_else(|| {
                    StepError::Refused(
                        "transmetalation exchanges an anionic group (halide, triflate, acetate) \
                         on the metal; there is none: name the group to exchange"
                            .into(),
                    )
                })?
        }
    };
    let b = cx.group(slot)?;
    let x_key = b.ligand.key.clone();
    let xm = structure(b)?;
    let Some(&(_, 1)) = xm.metal_bonds().first() else {
        return refuse(format!("{x_key} is not bound by one σ bond"));
    };
    let byproduct = crate::chem::reagent::join(&residue, xm);
    let name = name_species(&byproduct, Some(&x_key), cx.lookup);
    let lr = cx.made(&group);
    cx.note(format!(
        "{} moves to the metal (alkynyl > vinyl > aryl > allyl, benzyl > alkyl)",
        lr.key
    ));
    cx.enters(r.species.clone());
    cx.leaves(Species::new(name, byproduct));
    swap(cx.c, slot, &lr, x_mode(&lr))
}

/// Concerted metalation-deprotonation: a bound carboxylate or carbonate takes the proton of a
/// C-H bond as the carbon binds the metal, and leaves as the acid (Lapointe & Fagnou,
/// Chem. Lett. 2010, 39, 1118; Gorelsky, Lapointe & Fagnou, JACS 2008, 130, 10848).
pub fn cmd(cx: &mut Ctx, substrate: &str, base: &str) -> Result<Complex, StepError> {
    let slot = cx.slot(base)?;
    let b = cx.group(slot)?;
    let bm = structure(b)?.clone();
    let bkey = b.ligand.key.clone();
    // the base's free oxygen: C=O next to the bound O (carboxylate, carbonate)
    let bound: Vec<usize> = bm.metal_bonds().iter().map(|x| x.0).collect();
    let acceptor = bound.iter().find_map(|&o| {
        bm.heavy_neighbors(o).into_iter().find_map(|c| {
            bm.neighbors(c)
                .find(|&(x, ord)| ord == 2 && bm.atoms[x].z == periodic::O && !bound.contains(&x))
                .map(|(x, _)| (o, x))
        })
    });
    let Some((o_bound, o_free)) = acceptor else {
        return refuse(format!(
            "{bkey} is not a carboxylate or carbonate: concerted metalation-deprotonation needs \
             a bound base with a free C=O to take the proton (OAc, OPiv, CO3)"
        ));
    };
    let r = cx.reagent(substrate)?;
    let sm = r.species.structure.clone();
    // which C-H: the written one (H-R), else the first aromatic C-H, else any C-H
    let group = match (&r.split(), r.split_written) {
        (Some((ga, gb)), true) => {
            let is_h = |g: &Molecule| {
                g.atoms.iter().filter(|a| !a.is_star()).count() == 1
                    && g.atoms.iter().any(|a| a.z == periodic::H)
            };
            if is_h(ga) {
                gb.clone()
            } else if is_h(gb) {
                ga.clone()
            } else {
                return refuse("write the substrate as H-R (the C-H bond that is broken)");
            }
        }
        _ => {
            let c = (0..sm.atoms.len())
                .filter(|&i| sm.atoms[i].z == periodic::C && sm.atoms[i].h > 0)
                .max_by_key(|&i| (sm.atoms[i].aromatic, std::cmp::Reverse(i)))
                .ok_or_else(|| StepError::Refused(format!("{} has no C-H bond", r.species.name)))?;
            let mut g = sm.clone();
            g.atoms[c].h -= 1;
            star(&mut g, c);
            g
        }
    };
    // the acid the base becomes: the metal's bond gone, the free O now O-H, C=O on the
    // formerly bound O
    let mut acid = bm.clone();
    let stars = acid.strip_stars();
    let shift = |i: usize| i - (0..i).filter(|&k| bm.atoms[k].is_star()).count();
    let (ob, of) = (shift(o_bound), shift(o_free));
    let c = acid
        .heavy_neighbors(ob)
        .into_iter()
        .find(|&c| acid.bond_between(c, of).is_some());
    if let Some(c) = c {
        if let Some(k) = acid.bond_between(c, of) {
            acid.bonds[k].order = 1;
        }
        if let Some(k) = acid.bond_between(c, ob) {
            acid.bonds[k].order = 2;
        }
    }
    acid.atoms[of].h += 1;
    // a second bond to the metal (κ2 carbonate) stays as an anionic O
    for (i, _) in stars.iter().skip(1) {
        acid.atoms[*i].charge -= 1;
    }
    let q = acid.charge();
    let name = name_species(&acid, None, cx.lookup);
    let l = cx.made(&group);
    cx.enters(r.species.clone());
    cx.leaves(Species::new(name, acid));
    recharge(&swap(cx.c, slot, &l, x_mode(&l))?, -q)
}

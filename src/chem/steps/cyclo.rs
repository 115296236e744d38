//! Metallacycles: [2+2] cycloaddition of an alkene or alkyne to M=C or M=N and its
//! reversal (the steps of alkene metathesis, Chauvin's mechanism: Hérisson & Chauvin,
//! Makromol. Chem. 1971, 141, 161), and oxidative coupling of two π ligands with its reverse
//! (Crabtree 2014, ch. 11-12; Hartwig 2010, ch. 21).

use super::ctx::{add, remove, slot_in, structure, Ctx};
use super::insertion::{unsaturation, Unsat};
use super::{refuse, Regio, StepError};
use crate::chem::complex::Complex;
use crate::chem::molecule::{Atom, Molecule, AROMATIC};
use crate::chem::periodic;
use crate::chem::species::Species;

/// The π bond of an alkene or alkyne (not aromatic, not a radical such as allyl).
fn pi_bond(m: &Molecule) -> Option<(usize, usize)> {
    if !crate::chem::species::open_valence_atoms(m).is_empty() {
        return None;
    }
    match unsaturation(m)? {
        Unsat::Across { a, b } if m.atoms[a].z == periodic::C && m.atoms[b].z == periodic::C => {
            Some((a, b))
        }
        _ => None,
    }
}

fn degree(m: &Molecule, i: usize) -> usize {
    m.heavy_neighbors(i).len()
}

fn lower(m: &mut Molecule, a: usize, b: usize) {
    if let Some(k) = m.bond_between(a, b) {
        if m.bonds[k].order > 1 && m.bonds[k].order != AROMATIC {
            m.bonds[k].order -= 1;
        }
    }
}

/// [2+2] of an alkene or alkyne (bound, or from outside) with an alkylidene or imido: the
/// metallacyclobutane (or azametallacycle). Unless told 1,2, the alkene's more substituted
/// carbon bonds to the metal (M=CH2 + RCH=CH2 on to M=CHR + C2H4); 1,2 bonds it next to the
/// ylidene's carbon (M=CHR + RCH=CH2 on to RCH=CHR + M=CH2, the other half of self-metathesis).
pub fn cycloaddition(
    cx: &mut Ctx,
    unsat: &str,
    ylidene: &str,
    regio: Option<Regio>,
) -> Result<Complex, StepError> {
    let sy = cx.slot(ylidene)?;
    let by = cx.group(sy)?;
    let my = structure(by)?.clone();
    let Some(&(c0, 2)) = my.metal_bonds().first() else {
        return refuse(format!(
            "{} is not bound by a double bond: [2+2] needs an alkylidene (M=CHR) or an imido \
             (M=NR)",
            by.ligand.key
        ));
    };
    let without = remove(cx.c, sy)?;
    // the alkene: on the metal, else from outside
    let (mut rest, ma) = match slot_in(&without, unsat, cx.lookup) {
        Ok(s) => {
            let b = without
                .group(s)
                .ok_or_else(|| StepError::Refused("no such ligand".into()))?;
            let m = structure(b)?.clone();
            (remove(&without, s)?, m)
        }
        Err(_) => {
            let l = cx.ligand(unsat)?;
            let m = l.structure.as_deref().cloned().ok_or_else(|| {
                StepError::Refused(format!("{} has no structure on record", l.key))
            })?;
            cx.enters(Species::new(l.key.clone(), m.clone()));
            (without, m)
        }
    };
    let Some((a, b)) = pi_bond(&ma) else {
        return refuse(format!("{unsat} has no C=C or C≡C for a [2+2]"));
    };
    // more substituted carbon to the metal, unless 1,2
    let (less, more) = if degree(&ma, a) <= degree(&ma, b) {
        (a, b)
    } else {
        (b, a)
    };
    let (to_c0, to_m) = match regio {
        Some(Regio::OneTwo) => (more, less),
        _ => (less, more),
    };
    let mut g = my.clone();
    for bd in g.bonds.iter_mut() {
        if bd.other(c0).is_some_and(|x| my.atoms[x].is_star()) {
            bd.order = 1;
        }
    }
    let off = g.merge(&ma);
    lower(&mut g, off + a, off + b);
    g.add_bond(c0, off + to_c0, 1);
    let s = g.add_atom(Atom::star());
    g.add_bond(off + to_m, s, 1);
    let cycle = cx.made(&g);
    rest = add(&rest, &cycle, 0)?;
    Ok(rest)
}

/// The metallacyclobutane splits the other way: an alkene leaves and a new alkylidene stays.
pub fn cycloreversion(cx: &mut Ctx, alkene: &str) -> Result<Complex, StepError> {
    // the four-membered ring on the metal
    let found = cx.c.slots().into_iter().find_map(|s| {
        let b = cx.c.group(s)?;
        let m = b.ligand.structure.as_deref()?;
        let ends = m.metal_bonds();
        if ends.len() != 2 {
            return None;
        }
        let (x, y) = (ends[0].0, ends[1].0);
        let mid = m
            .heavy_neighbors(x)
            .into_iter()
            .find(|&j| m.bond_between(j, y).is_some())?;
        Some((s, m.clone(), x, mid, y))
    });
    let Some((slot, m, x, mid, y)) = found else {
        return refuse(
            "cycloreversion needs a metallacyclobutane (a κ2 ring of three atoms on the metal); \
             form one with cycloaddition",
        );
    };
    // two ways apart: keep x (y=mid leaves) or keep y (x=mid leaves)
    let split = |keep: usize, go: usize| -> Option<(Molecule, Molecule)> {
        let mut g = m.clone();
        let k = g.bond_between(mid, keep)?;
        g.bonds.remove(k);
        // the star on the leaving end goes, the kept end's bond becomes double
        let star_go = g
            .bonds
            .iter()
            .position(|bd| bd.other(go).is_some_and(|z| g.atoms[z].is_star()))?;
        let sgo = g.bonds[star_go].other(go)?;
        g.bonds.remove(star_go);
        for bd in g.bonds.iter_mut() {
            if bd.other(keep).is_some_and(|z| g.atoms[z].is_star()) {
                bd.order = 2;
            }
        }
        let kb = g.bond_between(mid, go)?;
        g.bonds[kb].order += 1;
        g.remove_atom(sgo);
        let parts = g.components();
        let ylidene = parts.iter().find(|p| p.star_count() == 1)?.clone();
        let ene = parts.iter().find(|p| p.star_count() == 0)?.clone();
        Some((ylidene, ene))
    };
    let options: Vec<(Molecule, Molecule)> =
        [split(x, y), split(y, x)].into_iter().flatten().collect();
    let names: Vec<String> = options
        .iter()
        .map(|(_, e)| cx.made(e).key.clone())
        .collect();
    let want = cx
        .ligand(alkene)
        .ok()
        .and_then(|l| l.structure.as_ref().map(|s| s.canonical_smiles()));
    let pick = names
        .iter()
        .position(|n| n == alkene)
        .or_else(|| want.and_then(|c| options.iter().position(|(_, e)| e.canonical_smiles() == c)))
        .ok_or_else(|| {
            StepError::Usage(format!(
                "the metallacycle can give off {}; '{alkene}' is neither",
                names.join(" or ")
            ))
        })?;
    let (ylidene, ene) = options[pick].clone();
    let yl = cx.made(&ylidene);
    let mode = cx.carbene_mode(&yl);
    // the alkene as the chemist wrote it (PhCHCHPh), or as the catalogue knows it
    let name = if names[pick].starts_with('{') {
        alkene.to_string()
    } else {
        names[pick].clone()
    };
    let leaving = cx.known(Species::new(name, ene));
    cx.leaves(leaving);
    let without = remove(cx.c, slot)?;
    add(&without, &yl, mode)
}

/// Two π ligands on the metal join into a metallacyclopentane (or -pentadiene): a new C-C
/// bond, both ends σ-bound, the metal oxidized by two. The substituted carbons form the new
/// bond, which puts the substituents away from the metal (common practice).
pub fn oxidative_coupling(cx: &mut Ctx, a: &str, b: &str) -> Result<Complex, StepError> {
    cx.needs_two_d("oxidative coupling")?;
    let sa = cx.slot(a)?;
    let la = cx.group(sa)?;
    let ma = structure(la)?.clone();
    let once = remove(cx.c, sa)?;
    let sb = slot_in(&once, b, cx.lookup).map_err(|_| {
        StepError::Refused(format!(
            "oxidative coupling needs a second {b} on the metal"
        ))
    })?;
    let lb = once
        .group(sb)
        .ok_or_else(|| StepError::Refused("no such ligand".into()))?;
    let mb = structure(lb)?.clone();
    let (Some((a1, a2)), Some((b1, b2))) = (pi_bond(&ma), pi_bond(&mb)) else {
        return refuse("oxidative coupling joins two alkenes or alkynes");
    };
    let order = |m: &Molecule, x: usize, y: usize| {
        if degree(m, x) >= degree(m, y) {
            (x, y)
        } else {
            (y, x)
        }
    };
    let (ja, ma_end) = order(&ma, a1, a2);
    let (jb, mb_end) = order(&mb, b1, b2);
    let mut g = ma.clone();
    lower(&mut g, a1, a2);
    let off = g.merge(&mb);
    lower(&mut g, off + b1, off + b2);
    g.add_bond(ja, off + jb, 1);
    for at in [ma_end, off + mb_end] {
        let s = g.add_atom(Atom::star());
        g.add_bond(at, s, 1);
    }
    let cycle = cx.made(&g);
    let twice = remove(&once, sb)?;
    add(&twice, &cycle, 0)
}

/// The reverse of oxidative coupling: a metallacyclopentane gives back two π ligands.
pub fn reductive_decoupling(cx: &mut Ctx, token: &str) -> Result<Complex, StepError> {
    let slot = cx.slot(token)?;
    let b = cx.group(slot)?;
    let m = structure(b)?;
    let ends = m.metal_bonds();
    let path = (ends.len() == 2)
        .then(|| {
            let (x, y) = (ends[0].0, ends[1].0);
            let x2 = m.heavy_neighbors(x);
            let y2 = m.heavy_neighbors(y);
            x2.iter().find_map(|&p| {
                y2.iter()
                    .find(|&&q| m.bond_between(p, q).is_some())
                    .map(|&q| (x, p, q, y))
            })
        })
        .flatten();
    let Some((x, p, q, y)) = path else {
        return refuse(format!(
            "{} is not a metallacyclopentane (a κ2 ring of four atoms on the metal)",
            b.ligand.key
        ));
    };
    let mut g = m.clone();
    if let Some(k) = g.bond_between(p, q) {
        g.bonds.remove(k);
    }
    for (u, v) in [(x, p), (y, q)] {
        if let Some(k) = g.bond_between(u, v) {
            g.bonds[k].order += 1;
        }
    }
    g.strip_stars();
    let parts = g.components();
    if parts.len() != 2 {
        return refuse("the ring does not split into two π ligands");
    }
    let l1 = cx.made(&parts[0]);
    let l2 = cx.made(&parts[1]);
    let once = remove(cx.c, slot)?;
    let twice = add(&once, &l1, 0)?;
    add(&twice, &l2, 0)
}

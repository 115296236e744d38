//! Steps that change the oxidation state or move protons: oxidative addition, reductive
//! elimination, one-electron transfer, protonation and deprotonation at the metal,
//! protonolysis, σ-bond metathesis.

use super::ctx::{add, one_bond, recharge, remove, slot_in, structure, swap, x_mode, Ctx};
use super::ligands::hydride;
use super::{refuse, StepError};
use crate::chem::complex::Complex;
use crate::chem::frac::Frac;
use crate::chem::molecule::{Atom, Molecule};
use crate::chem::periodic;
use crate::chem::reagent::{electrophile, join, name_species};
use crate::chem::species::Species;

/// A-B adds across the metal as two X groups (Crabtree 2014, ch. 6).
pub fn oxidative_addition(cx: &mut Ctx, substrate: &str) -> Result<Complex, StepError> {
    let r = cx.reagent(substrate)?;
    let Some((ga, gb)) = r.split() else {
        return refuse(format!(
            "nonet finds no bond in {} that a metal adds across; write the two groups as A-B \
             (Me-I, H-SiEt3)",
            r.species.name
        ));
    };
    cx.needs_two_d("oxidative addition")?;
    cx.needs_open_site("oxidative addition")?;
    let la = cx.made(&ga);
    let lb = cx.made(&gb);
    cx.enters(r.species);
    let once = add(cx.c, &la, x_mode(&la))?;
    add(&once, &lb, x_mode(&lb))
}

/// Two X groups join and leave as one molecule (Crabtree 2014, ch. 6).
pub fn reductive_elimination(cx: &mut Ctx, a: &str, b: &str) -> Result<Complex, StepError> {
    let sa = cx.slot(a)?;
    let ba = cx.group(sa)?;
    let Some((ma, _)) = one_bond(ba) else {
        return refuse(format!(
            "reductive elimination joins two X-type groups; {} is {}",
            ba.ligand.key,
            ba.mode().class
        ));
    };
    let once = remove(cx.c, sa)?;
    let sb = slot_in(&once, b, cx.lookup).map_err(|_| {
        StepError::Refused(format!(
            "reductive elimination needs two X-type groups on the metal: there is no {}{}",
            if ba.ligand.key == b { "second " } else { "" },
            b
        ))
    })?;
    let bb = once
        .group(sb)
        .ok_or_else(|| StepError::Refused("no such ligand".into()))?;
    let Some((mb, _)) = one_bond(bb) else {
        return refuse(format!(
            "reductive elimination joins two X-type groups; {} is {}",
            bb.ligand.key,
            bb.mode().class
        ));
    };
    let product = join(&ma, &mb);
    let name = joined_name(&product, &ba.ligand.key, &bb.ligand.key, cx);
    cx.leaves(Species::new(name, product));
    remove(&once, sb)
}

/// The name of A-B made by joining two groups: the catalogue's, "H2", a hydrocarbon's
/// formula, else "A-B".
pub fn joined_name(m: &Molecule, a: &str, b: &str, cx: &Ctx) -> String {
    if let Some(def) = cx.lookup.substrate_like(m) {
        return def.key.clone();
    }
    let only_ch = m
        .atoms
        .iter()
        .all(|x| matches!(x.z, periodic::C | periodic::H))
        && !m.atoms.iter().any(|x| x.aromatic);
    if only_ch {
        return m.composition().to_string();
    }
    // a hydrogen joined to a group (an aldehyde, an amine): the molecule's condensed formula
    if a == "H" || b == "H" {
        if let Some(t) = crate::chem::condensed::print_group(m, cx.lookup) {
            return t;
        }
    }
    format!("{a}-{b}")
}

/// One electron leaves (oxidation, +1) or comes in (reduction, -1). With a reagent named, the
/// electron goes to the oxidant (CuCl2 -> CuCl + Cl-, Ag+ -> Ag) or comes from the reductant
/// (Na -> Na+), so that a cycle closed with it shows the terminal oxidant in its net reaction
/// (the Wacker process: Crabtree 2014, ch. 14).
pub fn electron_transfer(cx: &mut Ctx, delta: i32, by: Option<&str>) -> Result<Complex, StepError> {
    match by {
        None if delta > 0 => cx.leaves(Species::electron()),
        None => cx.enters(Species::electron()),
        Some(name) => {
            let r = cx.reagent(name)?;
            let after =
                if delta > 0 {
                    reduced(&r.species.structure)
                } else {
                    oxidized(&r.species.structure)
                }
                .ok_or_else(|| {
                    StepError::Refused(format!(
                    "nonet cannot tell what {} becomes when it {} an electron; name a metal salt \
                     or ion ({}), or leave the reagent out to show the electron alone",
                    r.species.name,
                    if delta > 0 { "takes" } else { "gives" },
                    if delta > 0 { "CuCl2, AgBF4, [Cu+2]" } else { "Na, K, Zn" },
                ))
                })?;
            cx.enters(r.species);
            for piece in after.components() {
                let name = name_species(&piece, None, cx.lookup);
                let s = cx.known(Species::new(name, piece));
                cx.leaves(s);
            }
        }
    }
    recharge(cx.c, delta)
}

/// A metal atom of a reagent: d or f block, or an alkali or alkaline-earth metal.
fn metal_atom(m: &Molecule) -> Option<usize> {
    m.atoms.iter().position(|a| {
        crate::chem::element::by_symbol(periodic::symbol(a.z)).is_some()
            || matches!(a.z, 3 | 4 | 11 | 12 | 19 | 20 | 37 | 38 | 55 | 56)
    })
}

/// The oxidant after it takes one electron: a metal cation drops one charge (Ag+ -> Ag,
/// Cu2+ -> Cu+); a neutral metal salt loses one halide or oxo-anion as an anion
/// (CuCl2 -> CuCl + Cl-).
fn reduced(m: &Molecule) -> Option<Molecule> {
    let i = metal_atom(m)?;
    let mut out = m.clone();
    if out.atoms[i].charge > 0 {
        out.atoms[i].charge -= 1;
        return Some(out);
    }
    let (k, j) = out.bonds.iter().enumerate().find_map(|(k, b)| {
        let j = b.other(i)?;
        (b.order == 1 && matches!(out.atoms[j].z, 8 | 9 | 17 | 35 | 53)).then_some((k, j))
    })?;
    out.bonds.remove(k);
    out.atoms[j].charge -= 1;
    Some(out)
}

/// The reductant after it gives one electron: its metal gains one charge (Na -> Na+).
fn oxidized(m: &Molecule) -> Option<Molecule> {
    let i = metal_atom(m)?;
    let mut out = m.clone();
    out.atoms[i].charge = out.atoms[i].charge.checked_add(1)?;
    Some(out)
}

/// A proton binds at the metal as a hydride: the metal is oxidized by two. With an acid
/// named, the acid gives the proton and its anion leaves.
pub fn protonation(cx: &mut Ctx, acid: Option<&str>) -> Result<Complex, StepError> {
    let d = cx.d()?;
    if d < Frac::int(2) {
        return refuse(format!(
            "protonation at the metal takes two d electrons; the metal is d{d}"
        ));
    }
    let h = cx.made(&hydride());
    match acid {
        None => cx.enters(proton()),
        Some(a) => {
            let r = cx.reagent(a)?;
            let e = electrophile(&r.species.structure)
                .filter(|e| e.is_proton())
                .ok_or_else(|| StepError::Refused(format!("{} gives no proton", r.species.name)))?;
            cx.enters(r.species.clone());
            for y in e.rest {
                for piece in y.components() {
                    let name = name_species(&piece, None, cx.lookup);
                    cx.leaves(Species::new(name, piece));
                }
            }
        }
    }
    recharge(&add(cx.c, &h, 0)?, 1)
}

/// A proton leaves: a hydride as H+ (the metal is reduced by two), or the N-H, O-H or S-H of
/// a bound amine, water or alcohol, which becomes an amido, hydroxo or alkoxo group (the
/// step of Buchwald-Hartwig amination after the amine binds; Hartwig 2010, ch. 19). A base
/// named takes the proton and leaves as its conjugate acid.
pub fn deprotonation(cx: &mut Ctx, token: &str, base: Option<&str>) -> Result<Complex, StepError> {
    let slot = cx.slot(token)?;
    let b = cx.group(slot)?;
    let m = structure(b)?;
    let is_h = m.atoms.iter().filter(|a| !a.is_star()).count() == 1
        && m.atoms.iter().any(|a| a.z == periodic::H);
    let product = if is_h {
        remove(cx.c, slot)?
    } else {
        // the donor atom's proton: N, O or S with a hydrogen, in a neutral donor
        if b.mode().class.x > 0 || m.star_count() > 0 {
            return refuse(format!(
                "deprotonation takes a hydride (H) from the metal, or the proton of a bound \
                 amine, water or alcohol; {} is {}",
                b.ligand.key,
                b.mode().class
            ));
        }
        let at = [periodic::N, periodic::O, periodic::S]
            .iter()
            .find_map(|&z| (0..m.atoms.len()).find(|&i| m.atoms[i].z == z && m.atoms[i].h > 0))
            .ok_or_else(|| {
                StepError::Refused(format!(
                    "{} is neither a hydride nor a donor with an N-H, O-H or S-H proton",
                    b.ligand.key
                ))
            })?;
        let mut g = m.clone();
        g.atoms[at].h -= 1;
        let s = g.add_atom(Atom::star());
        g.add_bond(at, s, 1);
        let l = cx.made(&g);
        swap(cx.c, slot, &l, x_mode(&l))?
    };
    match base {
        None => cx.leaves(proton()),
        Some(t) => {
            let r = cx.reagent(t)?;
            let parts = r.species.structure.components();
            // the base's most basic site: an anionic atom, then an amine or pyridine N, a
            // phosphine P, an ether or water O
            let rank = |p: &Molecule, i: usize| -> Option<u8> {
                let x = p.atoms[i];
                match (x.z, x.charge) {
                    (_, q) if q < 0 => Some(0),
                    (periodic::N, 0) if x.h == 0 || !x.aromatic => Some(1),
                    (15, 0) => Some(2),
                    (periodic::O, 0) => Some(3),
                    _ => None,
                }
            };
            let site = parts
                .iter()
                .enumerate()
                .flat_map(|(k, p)| {
                    (0..p.atoms.len()).filter_map(move |i| rank(p, i).map(|r| (r, k, i)))
                })
                .min()
                .map(|(_, k, i)| (k, i));
            let Some((k, i)) = site else {
                return refuse(format!(
                    "{} has no basic site to take the proton",
                    r.species.name
                ));
            };
            cx.enters(r.species.clone());
            for (j, p) in parts.into_iter().enumerate() {
                let mut p = p;
                if j == k {
                    p.atoms[i].h += 1;
                    p.atoms[i].charge += 1;
                }
                let name = name_species(&p, None, cx.lookup);
                cx.leaves(Species::new(name, p));
            }
        }
    }
    recharge(&product, -1)
}

pub fn proton() -> Species {
    let mut m = Molecule::default();
    let mut h = Atom::new(periodic::H, 0);
    h.charge = 1;
    m.add_atom(h);
    Species::new("H+", m)
}

/// An acid cleaves M-R: R-H leaves; the acid's anion binds the metal, or stays outside as a
/// counter-ion when it hardly coordinates (BF4-, BArF4-): M-R + H-Y -> M-Y + R-H.
pub fn protonolysis(cx: &mut Ctx, group: &str, acid: &str) -> Result<Complex, StepError> {
    let slot = cx.slot(group)?;
    let b = cx.group(slot)?;
    let Some((m, _)) = one_bond(b) else {
        return refuse(format!(
            "protonolysis cleaves an M-R bond of an X-type group; {} is {}",
            b.ligand.key,
            b.mode().class
        ));
    };
    let r = cx.reagent(acid)?;
    let Some(e) = electrophile(&r.species.structure) else {
        return refuse(format!("{} gives no proton", r.species.name));
    };
    if !e.is_proton() {
        return refuse(format!(
            "{} gives {} rather than a proton; use electrophilic-attack",
            r.species.name,
            e.name()
        ));
    }
    let alkane = join(&m, &hydride());
    let name = joined_name(&alkane, &b.ligand.key, "H", cx);
    cx.enters(r.species.clone());
    cx.leaves(Species::new(name, alkane));
    let mut product = remove(cx.c, slot)?;
    let mut bound_anion = false;
    for y in e.rest {
        if y.charge() < 0 && !bound_anion {
            if let Some(g) = coordinating(&y) {
                let l = cx.made(&g);
                product = add(&product, &l, x_mode(&l))?;
                bound_anion = true;
                continue;
            }
        }
        let name = name_species(&y, None, cx.lookup);
        cx.leaves(Species::new(name, y));
    }
    if !bound_anion {
        cx.note("the acid's anion hardly coordinates: it stays outside as the counter-ion");
        product = recharge(&product, 1)?;
    }
    Ok(product)
}

/// The group an anion forms at a metal, unless it is a weakly coordinating anion (the charge
/// on a central B, Al, P, As or Sb holding four or more groups).
fn coordinating(y: &Molecule) -> Option<Molecule> {
    if y.charge() != -1 {
        return None;
    }
    let at = (0..y.atoms.len()).find(|&i| y.atoms[i].charge < 0)?;
    let a = y.atoms[at];
    if matches!(a.z, 5 | 13 | 15 | 33 | 51) && y.heavy_neighbors(at).len() >= 4 {
        return None;
    }
    let mut g = y.clone();
    g.atoms[at].charge = 0;
    let s = g.add_atom(Atom::star());
    g.add_bond(at, s, 1);
    Some(g)
}

/// M-R + A-B -> M-A + R-B through a four-centre transition state, at d0 metals that cannot
/// add oxidatively (Crabtree 2014, ch. 6; Hartwig 2010, ch. 6).
pub fn sigma_bond_metathesis(
    cx: &mut Ctx,
    reagent: &str,
    group: &str,
) -> Result<Complex, StepError> {
    let slot = cx.slot(group)?;
    let b = cx.group(slot)?;
    let Some((m, _)) = one_bond(b) else {
        return refuse(format!(
            "σ-bond metathesis exchanges an X-type group; {} is {}",
            b.ligand.key,
            b.mode().class
        ));
    };
    let d = cx.d()?;
    if d != Frac::ZERO {
        return refuse(format!(
            "σ-bond metathesis is the path of d0 metals, which cannot add oxidatively; this \
             metal is d{d}: use oxidative-addition and reductive-elimination"
        ));
    }
    let r = cx.reagent(reagent)?;
    let Some((ga, gb)) = r.split() else {
        return refuse(format!(
            "nonet finds no σ bond in {} to exchange; write it as A-B with A the group that \
             goes to the metal",
            r.species.name
        ));
    };
    let is_h = |g: &Molecule| {
        g.atoms.iter().filter(|a| !a.is_star()).count() == 1
            && g.atoms.iter().any(|a| a.z == periodic::H)
    };
    // the hydrogen goes to the departing group (R-H forms); written A-B puts A on the metal
    let (to_metal, to_r) = if r.split_written || !is_h(&ga) || is_h(&gb) {
        (ga, gb)
    } else {
        (gb, ga)
    };
    let la = cx.made(&to_metal);
    let out = join(&m, &to_r);
    let kb = cx.made(&to_r).key.clone();
    let name = joined_name(&out, &b.ligand.key, &kb, cx);
    cx.enters(r.species);
    cx.leaves(Species::new(name, out));
    swap(cx.c, slot, &la, x_mode(&la))
}

//! Steps that take ligands on and off whole: dissociation, association, substitution,
//! homolysis, abstraction by an electrophile or Lewis acid, and ring slips.

use super::ctx::{add, entering, recharge, released, remove, structure, swap, Ctx};
use super::{refuse, StepError};
use crate::chem::complex::Complex;
use crate::chem::edit::{apply, Edit};
use crate::chem::molecule::Molecule;
use crate::chem::reagent::name_species;
use crate::chem::species::{ion_of, Species};

/// A ligand leaves: L as itself, X as its anion (heterolysis: the metal keeps its oxidation
/// state and the complex's charge rises).
pub fn dissociation(cx: &mut Ctx, token: &str) -> Result<Complex, StepError> {
    let slot = cx.slot(token)?;
    let b = cx.group(slot)?;
    let gone = cx.known(released(b, false)?);
    if gone.charge() != 0 {
        cx.note(format!(
            "{} leaves as {} (heterolysis): the metal keeps its oxidation state; `homolysis {}` \
             takes it off as a radical",
            b.ligand.key,
            gone.label(),
            b.ligand.key
        ));
    }
    let q = gone.charge();
    cx.leaves(gone);
    recharge(&remove(cx.c, slot)?, -q)
}

/// A ligand binds at an open site: L as itself, an anion lowering the charge.
pub fn association(cx: &mut Ctx, token: &str) -> Result<Complex, StepError> {
    if let Some((salt, l, cations)) = cx.salt(token) {
        cx.needs_open_site("association")?;
        let q = from_salt(cx, salt, cations);
        return recharge(&add(cx.c, &l, 0)?, q);
    }
    let l = cx.ligand(token)?;
    cx.needs_open_site("association")?;
    let mode = mode_named(token, &l);
    let comes = cx.known(entering(&l, mode)?);
    let q = comes.charge();
    cx.enters(comes);
    recharge(&add(cx.c, &l, mode)?, q)
}

/// The mode a token names with its prefix ("η2-C2H4"), else the default.
fn mode_named(token: &str, l: &crate::chem::ligand::LigandDef) -> usize {
    token
        .split_once('-')
        .and_then(|(label, _)| l.mode_index(label))
        .unwrap_or(0)
}

/// One ligand out, another in, each with its charge: Cl- out and C2H4 in makes
/// [PtCl4]2- into [PtCl3(C2H4)]-.
pub fn substitution(cx: &mut Ctx, leaving: &str, entering_: &str) -> Result<Complex, StepError> {
    let slot = cx.slot(leaving)?;
    let b = cx.group(slot)?;
    if let Some((salt, l, cations)) = cx.salt(entering_) {
        let gone = cx.known(released(b, false)?);
        let delta = -1 - gone.charge();
        cx.leaves(gone);
        from_salt(cx, salt, cations);
        return recharge(&swap(cx.c, slot, &l, 0)?, delta);
    }
    let l = cx.ligand(entering_)?;
    let mode = mode_named(entering_, &l);
    let gone = cx.known(released(b, false)?);
    let comes = cx.known(entering(&l, mode)?);
    let delta = comes.charge() - gone.charge();
    cx.leaves(gone);
    cx.enters(comes);
    recharge(&swap(cx.c, slot, &l, mode)?, delta)
}

/// A salt enters and its cations leave (K+ of KOAc): the anion is what binds. The charge
/// the anion brings.
fn from_salt(cx: &mut Ctx, salt: Species, cations: Vec<Molecule>) -> i32 {
    cx.note(format!(
        "{} gives its anion to the metal; its cation stays in solution",
        salt.name
    ));
    cx.enters(salt);
    for c in cations {
        let name = name_species(&c, None, cx.lookup);
        let s = cx.known(Species::new(name, c));
        cx.leaves(s);
    }
    -1
}

/// An X ligand leaves as a radical: the metal is reduced by one.
pub fn homolysis(cx: &mut Ctx, token: &str) -> Result<Complex, StepError> {
    let slot = cx.slot(token)?;
    let b = cx.group(slot)?;
    if b.mode().class.x == 0 {
        return refuse(format!(
            "{} is a neutral donor: it leaves by dissociation, not homolysis",
            b.ligand.key
        ));
    }
    cx.leaves(released(b, true)?);
    remove(cx.c, slot)
}

/// An electrophile or Lewis acid takes an anionic ligand: a cation (Ag+, Ph3C+) joins it and
/// leaves with it (AgCl, Ph3CH), its counter-anion goes too; a Lewis acid keeps it as an ate
/// anion ([MeB(C6F5)3]-). The complex is left a cation.
pub fn abstraction(cx: &mut Ctx, token: &str, by: &str) -> Result<Complex, StepError> {
    let slot = cx.slot(token)?;
    let b = cx.group(slot)?;
    let class = b.mode().class;
    if class.x == 0 {
        return refuse(format!(
            "{} is a neutral donor; abstraction takes an anionic (X) ligand such as a halide, \
             alkyl or hydride",
            b.ligand.key
        ));
    }
    let group = structure(b)?.clone();
    let key = b.ligand.key.clone();
    let single = match group.metal_bonds()[..] {
        [(_, 1)] => true,
        [] => crate::chem::species::open_valence_atoms(&group).len() == 1,
        _ => false,
    };
    if b.mode().ionic_charge != -1 || !single {
        return refuse(format!(
            "abstraction takes a singly bound anionic ligand (halide, alkyl, hydride, \
             carboxylate); {key} is {}",
            class
        ));
    }
    let reagent = cx.reagent(by)?;
    let parts = reagent.species.structure.components();
    let acceptor = taker(&parts).ok_or_else(|| {
        StepError::Refused(format!(
            "{} is neither a cation (AgBF4, [Ph3C]+, NaBArF4) nor a Lewis acid (B(C6F5)3, \
             BF3, AlCl3) that can take {key}",
            reagent.species.name
        ))
    })?;
    let q = ion_of(&group, b.mode().ionic_charge as i32).charge();
    cx.enters(reagent.species.clone());
    let mut rest: Vec<Molecule> = Vec::new();
    let (taker_part, at) = match acceptor {
        Taker::Cation(i, at) => {
            for (k, p) in parts.iter().enumerate() {
                if k != i {
                    rest.push(p.clone());
                }
            }
            (parts[i].clone(), at)
        }
        Taker::Acid(i, at) => (parts[i].clone(), at),
        Taker::Salt(i, metal) => {
            // a salt written as one molecule (AgOTf): the metal cation takes the group, the
            // anion stays behind
            let p = &parts[i];
            let k = p
                .bonds
                .iter()
                .position(|bd| bd.a == metal || bd.b == metal)
                .ok_or_else(|| StepError::Refused("no salt bond".into()))?;
            let bond = p.bonds[k];
            let (x, y) = p
                .cut(k)
                .ok_or_else(|| StepError::Refused("no salt bond".into()))?;
            let (mut cation, anion) = if bond.a == metal { (x, y) } else { (y, x) };
            cation.strip_stars();
            rest.push(ion_of(&anion, -1));
            let at = 0;
            if let Some(a) = cation.atoms.first_mut() {
                a.charge += 1;
            }
            (cation, at)
        }
    };
    // the group joins the taker's acceptor atom; the acceptor's charge drops by one
    let mut joined = taker_part.clone();
    let mut g = group.clone();
    let bound = g.strip_stars();
    let off = joined.merge(&g);
    if let Some(&(gi, _)) = bound.first() {
        joined.add_bond(at, off + gi, 1);
    }
    joined.atoms[at].charge -= 1;
    let name = name_species(&joined, Some(&key), cx.lookup);
    cx.leaves(Species::new(name, joined));
    for p in rest {
        let name = name_species(&p, None, cx.lookup);
        cx.leaves(Species::new(name, p));
    }
    recharge(&remove(cx.c, slot)?, -q)
}

enum Taker {
    /// A cation among the parts (part, acceptor atom).
    Cation(usize, usize),
    /// A neutral Lewis acid (part, acceptor atom).
    Acid(usize, usize),
    /// A salt drawn as one molecule (part, metal atom).
    Salt(usize, usize),
}

fn taker(parts: &[Molecule]) -> Option<Taker> {
    for (i, p) in parts.iter().enumerate() {
        if p.charge() > 0 {
            let at = (0..p.atoms.len()).find(|&a| p.atoms[a].charge > 0)?;
            return Some(Taker::Cation(i, at));
        }
    }
    if parts.len() != 1 {
        return None;
    }
    let p = &parts[0];
    for (a, atom) in p.atoms.iter().enumerate() {
        // B, Al, Ga with three bonds and no charge: an empty p orbital
        let acid = matches!(atom.z, 5 | 13 | 31)
            && atom.charge == 0
            && p.bond_valence(a) + atom.h == 3
            && !atom.aromatic;
        if acid {
            return Some(Taker::Acid(0, a));
        }
    }
    for (a, atom) in p.atoms.iter().enumerate() {
        let salt_metal = matches!(atom.z, 3 | 11 | 19 | 37 | 55 | 47 | 81 | 29)
            && p.heavy_neighbors(a).len() == 1;
        if salt_metal {
            return Some(Taker::Salt(0, a));
        }
    }
    None
}

/// A π ligand changes hapticity (η5 to η3 and back).
pub fn ring_slip(cx: &mut Ctx, ligand: &str, hapticity: u8) -> Result<Complex, StepError> {
    let slot = cx.slot(ligand)?;
    let b = cx.group(slot)?;
    let label = format!("η{hapticity}");
    let Some(mode) = b.ligand.mode_index(&label) else {
        return refuse(format!(
            "{} has no {label} mode; its modes are {}",
            b.ligand.key,
            b.ligand.mode_labels()
        ));
    };
    if mode == b.mode {
        return refuse(format!("{} is already {label}", b.ligand.key));
    }
    apply(cx.c, &Edit::ChangeMode { slot, mode })
        .map(|(c, _)| c)
        .map_err(|e| StepError::Refused(e.to_string()))
}

pub use crate::chem::reagent::hydrogen_group as hydride;

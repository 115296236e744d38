//! What every step needs: the complex and its count, finding the ligands a step names,
//! reading reagents, and the equation being written.

use std::sync::Arc;

use super::{refuse, StepError};
use crate::chem::complex::{BoundLigand, Complex};
use crate::chem::count::{MetalReport, Report};
use crate::chem::derived::{ligand_for, read_written};
use crate::chem::edit::{apply, Edit, Place, Slot};
use crate::chem::formula::LigandLookup;
use crate::chem::frac::Frac;
use crate::chem::ligand::LigandDef;
use crate::chem::molecule::Molecule;
use crate::chem::reagent::{self, Reagent};
use crate::chem::species::{ion_of, Equation, Species};

pub(crate) struct Ctx<'a> {
    pub c: &'a Complex,
    pub r: &'a Report,
    pub lookup: &'a dyn LigandLookup,
    eq: Equation,
    notes: Vec<String>,
}

impl<'a> Ctx<'a> {
    pub fn new(c: &'a Complex, r: &'a Report, lookup: &'a dyn LigandLookup) -> Ctx<'a> {
        Ctx {
            c,
            r,
            lookup,
            eq: Equation::default(),
            notes: Vec::new(),
        }
    }

    pub fn finish(self) -> (Equation, Vec<String>) {
        (self.eq, self.notes)
    }

    pub fn enters(&mut self, s: Species) {
        self.eq.enter(s);
    }

    pub fn leaves(&mut self, s: Species) {
        self.eq.leave(s);
    }

    pub fn note(&mut self, text: impl Into<String>) {
        self.notes.push(text.into());
    }

    pub fn metal(&self) -> Result<&'a MetalReport, StepError> {
        self.r
            .metals
            .first()
            .ok_or_else(|| StepError::Refused("the complex has no metal".into()))
    }

    pub fn count(&self) -> Result<Frac, StepError> {
        Ok(self.metal()?.electron_count)
    }

    pub fn d(&self) -> Result<Frac, StepError> {
        Ok(self.metal()?.d_electrons)
    }

    /// An open site: at most 16 e (Crabtree 2014, ch. 4).
    pub fn needs_open_site(&self, what: &str) -> Result<(), StepError> {
        let n = self.count()?;
        if n > Frac::int(16) {
            return refuse(format!(
                "{what} needs an open site, but the metal has {n} e; a ligand must leave first \
                 (dissociation)"
            ));
        }
        Ok(())
    }

    /// Oxidation by two: needs two d electrons.
    pub fn needs_two_d(&self, what: &str) -> Result<(), StepError> {
        let d = self.d()?;
        if d < Frac::int(2) {
            return refuse(format!(
                "{what} raises the oxidation state by two and needs at least two d electrons; \
                 the metal is d{d}"
            ));
        }
        Ok(())
    }

    /// A catalogue ligand, or a group written as a condensed formula or SMILES in braces
    /// (with an optional mode prefix, "η2-CH2CHCH2CH3").
    pub fn ligand(&self, token: &str) -> Result<Arc<LigandDef>, StepError> {
        if let Some(l) = self.lookup.exact(token) {
            return Ok(l.clone());
        }
        let (label, body) = match token.split_once('-') {
            Some((l, b)) if is_label(l) => (Some(l), b),
            _ => (None, token),
        };
        if let Some(l) = self.lookup.exact(body) {
            return Ok(l.clone());
        }
        // a substrate that binds as it is: an amine, an alkene the catalogue has as a reagent
        if let Some(def) = self.lookup.substrate(body) {
            if crate::chem::derived::free_ligand(&def.structure) {
                return Ok(ligand_for(&def.structure, self.lookup));
            }
        }
        read_written(body, label, self.lookup).map_err(|why| {
            let hint = self
                .lookup
                .suggest(token)
                .map(|s| format!("; did you mean '{s}'?"))
                .unwrap_or_default();
            StepError::Usage(format!("unknown ligand '{token}' ({why}){hint}"))
        })
    }

    /// A salt named as a ligand source (KOAc, NaCl, AgOTf): its anion binds, its cation
    /// leaves. Gives the salt, the anion's ligand and the cations, or None for anything else.
    pub fn salt(&self, token: &str) -> Option<(Species, Arc<LigandDef>, Vec<Molecule>)> {
        if self.lookup.exact(token).is_some() {
            return None;
        }
        let def = self.lookup.substrate(token)?;
        let parts = def.structure.components();
        let anions: Vec<&Molecule> = parts.iter().filter(|p| p.charge() == -1).collect();
        let [anion] = anions[..] else {
            return None;
        };
        let cations: Vec<Molecule> = parts.iter().filter(|p| p.charge() > 0).cloned().collect();
        if cations.is_empty() || parts.len() != cations.len() + 1 {
            return None;
        }
        let at = (0..anion.atoms.len()).find(|&i| anion.atoms[i].charge < 0)?;
        let mut g = anion.clone();
        g.atoms[at].charge = 0;
        let star = g.add_atom(crate::chem::molecule::Atom::star());
        g.add_bond(at, star, 1);
        Some((Species::of(def), ligand_for(&g, self.lookup), cations))
    }

    /// The ligand group a step names on the complex: by key, by a catalogue name for it, or
    /// by its structure written another way.
    pub fn slot(&self, token: &str) -> Result<Slot, StepError> {
        slot_in(self.c, token, self.lookup)
    }

    pub fn group(&self, slot: Slot) -> Result<&'a BoundLigand, StepError> {
        self.c
            .group(slot)
            .ok_or_else(|| StepError::Refused("no such ligand".into()))
    }

    pub fn reagent(&self, token: &str) -> Result<Reagent, StepError> {
        reagent::read(token, self.lookup).map_err(StepError::Usage)
    }

    /// A free species named as the catalogue names it: a ligand made from its structure that
    /// is also a known substrate (an amine, an alkene) takes the substrate's key and hazards.
    pub fn known(&self, s: Species) -> Species {
        if s.hazards.is_empty() || !s.name.chars().any(|c| c.is_ascii_lowercase()) {
            if let Some(def) = self.lookup.substrate_like(&s.structure) {
                let mut named = Species::of(def);
                named.structure = s.structure;
                return named;
            }
        }
        s
    }

    /// A ligand for a structure a step made: the catalogue's, else one made from it.
    pub fn made(&self, m: &Molecule) -> Arc<LigandDef> {
        ligand_for(m, self.lookup)
    }

    /// The mode an alkylidene takes here: one convention per metal, so that exchanging one
    /// alkylidene for another never changes the oxidation state. A carbene already on the
    /// metal sets it; else late metals (group 8 on) count carbenes as neutral L donors and
    /// early metals as X2 alkylidenes (Crabtree 2014, ch. 11).
    pub fn carbene_mode(&mut self, l: &LigandDef) -> usize {
        let existing = self
            .c
            .all_ligands()
            .map(|(_, b)| b)
            .find(|b| b.ligand.family == "alkylidene" || b.ligand.family == "carbene")
            .map(|b| b.mode().class);
        let late = self.c.sites.first().is_some_and(|s| s.element.group >= 8);
        let want_l = match existing {
            Some(class) => class.x == 0,
            None => late,
        };
        let pick = l.modes.iter().position(|m| {
            if want_l {
                m.class.l == 1 && m.class.x == 0
            } else {
                m.class.x == 2
            }
        });
        if let Some(i) = pick {
            let text = if want_l {
                "carbenes counted as neutral L donors on this metal (Fischer-type convention), \
                 as the others in this cycle"
            } else {
                "alkylidenes counted as X2 on this metal (Schrock-type convention), as the \
                 others in this cycle"
            };
            if !self.notes.iter().any(|n| n == text) {
                self.notes.push(text.to_string());
            }
            return i;
        }
        0
    }
}

fn is_label(l: &str) -> bool {
    let n = crate::chem::ligand::normalize_label(l);
    n.starts_with(['η', 'κ', 'μ'])
}

/// The slot of the group `token` names on complex `c`.
pub fn slot_in(c: &Complex, token: &str, lookup: &dyn LigandLookup) -> Result<Slot, StepError> {
    let slots = c.slots();
    let key_of = |s: &Slot| c.group(*s).map(|b| b.ligand.key.as_str());
    let token = token.trim_start_matches(['=', '≡']);
    if let Some(s) = slots.iter().find(|s| key_of(s) == Some(token)) {
        return Ok(*s);
    }
    let (label, body) = match token.split_once('-') {
        Some((l, b)) if is_label(l) => (Some(l), b),
        _ => (None, token),
    };
    if let Some(l) = lookup.exact(body) {
        if let Some(s) = slots.iter().find(|s| key_of(s) == Some(l.key.as_str())) {
            return Ok(*s);
        }
        return refuse(format!(
            "the complex has no {} ({}) to act on",
            l.key, l.name
        ));
    }
    if let Ok(l) = read_written(body, label, lookup) {
        if let Some(want) = l.structure.as_ref().map(|m| m.canonical_smiles()) {
            let hit = slots.iter().find(|s| {
                c.group(**s)
                    .and_then(|b| b.ligand.structure.as_ref())
                    .is_some_and(|m| m.canonical_smiles() == want)
            });
            if let Some(s) = hit {
                return Ok(*s);
            }
        }
        return refuse(format!("the complex has no {} to act on", l.key));
    }
    let present: Vec<&str> = slots.iter().filter_map(key_of).collect();
    refuse(format!(
        "the complex has no '{token}'; its ligands are {}",
        present.join(", ")
    ))
}

/// The structure of a bound ligand, which every balanced step needs.
pub fn structure(b: &BoundLigand) -> Result<&Molecule, StepError> {
    b.ligand.structure.as_deref().ok_or_else(|| {
        StepError::Refused(format!(
            "{} has no structure on record, so the step cannot be balanced; give it a smiles \
             field in its ligand set",
            b.ligand.key
        ))
    })
}

/// What a ligand becomes when it leaves the metal with its electron pair: a neutral L ligand
/// as itself, an X ligand as its anion (the charge it has in the ionic model), a radical
/// when `homolysis`.
pub fn released(b: &BoundLigand, homolysis: bool) -> Result<Species, StepError> {
    let m = structure(b)?;
    let q = if homolysis {
        0
    } else {
        b.mode().ionic_charge as i32
    };
    let ion = ion_of(m, q);
    let name = if homolysis {
        format!("{}·", b.ligand.key)
    } else {
        b.ligand.key.clone()
    };
    let mut s = Species::new(name, ion);
    s.hazards = b.ligand.hazards.clone();
    s.hazard_source = b.ligand.hazard_source.clone();
    Ok(s)
}

/// What a catalogue ligand is as a free species when it enters (its default mode).
pub fn entering(l: &LigandDef, mode: usize) -> Result<Species, StepError> {
    let b = BoundLigand::new(Arc::new(l.clone()), mode, 1);
    released(&b, false)
}

pub fn remove(c: &Complex, slot: Slot) -> Result<Complex, StepError> {
    edit(c, &Edit::Remove { slot })
}

pub fn add(c: &Complex, l: &Arc<LigandDef>, mode: usize) -> Result<Complex, StepError> {
    edit(
        c,
        &Edit::Add {
            place: Place::Site(0),
            ligand: l.clone(),
            mode,
        },
    )
}

pub fn swap(
    c: &Complex,
    slot: Slot,
    l: &Arc<LigandDef>,
    mode: usize,
) -> Result<Complex, StepError> {
    edit(
        c,
        &Edit::Swap {
            slot,
            ligand: l.clone(),
            mode,
        },
    )
}

pub fn recharge(c: &Complex, delta: i32) -> Result<Complex, StepError> {
    if delta == 0 {
        return Ok(c.clone());
    }
    edit(c, &Edit::Charge(delta))
}

fn edit(c: &Complex, e: &Edit) -> Result<Complex, StepError> {
    apply(c, e)
        .map(|(c, _)| c)
        .map_err(|e| StepError::Refused(e.to_string()))
}

/// The mode in which a ligand binds as a plain X group (κ1-OAc rather than κ2), else its
/// default: a group a step hands to the metal takes one site.
pub fn x_mode(l: &LigandDef) -> usize {
    l.modes
        .iter()
        .position(|m| m.class.x == 1 && m.class.l == 0 && m.class.z == 0 && m.bridges == 1)
        .unwrap_or(0)
}

/// A ligand with one single σ bond to the metal (an X group such as H, Me, Ph, Cl), with
/// its structure as bound: an η1-allyl or σ-benzyl gets its `*` on the atom the radical
/// form leaves short of a bond.
pub fn one_bond(b: &BoundLigand) -> Option<(Molecule, usize)> {
    let m = b.ligand.structure.as_deref()?;
    let class = b.mode().class;
    if class.x != 1 || class.l != 0 {
        return None;
    }
    match m.metal_bonds()[..] {
        [(at, 1)] => Some((m.clone(), at)),
        [] => {
            let open = crate::chem::species::open_valence_atoms(m);
            let [at] = open[..] else { return None };
            let mut g = m.clone();
            let s = g.add_atom(crate::chem::molecule::Atom::star());
            g.add_bond(at, s, 1);
            Some((g, at))
        }
        _ => None,
    }
}

//! Species that enter or leave a step (substrates, reagents, released ligands and ions), and
//! the equation a step writes with them.

use std::fmt;
use std::sync::Arc;

use serde::Serialize;

use super::complex::{charge_text, Complex};
use super::molecule::{Composition, Molecule};
use super::periodic;

/// A substrate or reagent as the catalogue defines it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SubstrateDef {
    pub key: String,
    pub name: String,
    pub formula: String,
    pub aliases: Vec<String>,
    pub smiles: String,
    pub hazards: Vec<String>,
    pub hazard_source: Option<String>,
    pub notes: Option<String>,
    pub origin: String,
    #[serde(skip)]
    pub structure: Arc<Molecule>,
}

/// A free molecule or ion: what it is called, its structure (formal charges included) and
/// the hazards on record for it.
#[derive(Debug, Clone, PartialEq)]
pub struct Species {
    pub name: String,
    pub structure: Molecule,
    /// Free electrons (1 for the e- of a one-electron oxidation; 0 for every molecule).
    pub electrons: i32,
    pub hazards: Vec<String>,
    pub hazard_source: Option<String>,
}

impl Species {
    pub fn new(name: impl Into<String>, mut structure: Molecule) -> Species {
        super::molecule::fold_hydrogens(&mut structure);
        Species {
            name: name.into(),
            structure,
            electrons: 0,
            hazards: Vec::new(),
            hazard_source: None,
        }
    }

    /// An electron, as a one-electron oxidation gives off or a reduction takes in.
    pub fn electron() -> Species {
        Species {
            electrons: 1,
            ..Species::new("e-", Molecule::default())
        }
    }

    /// The catalogue's record of this substrate.
    pub fn of(def: &SubstrateDef) -> Species {
        Species {
            name: def.key.clone(),
            structure: (*def.structure).clone(),
            electrons: 0,
            hazards: def.hazards.clone(),
            hazard_source: def.hazard_source.clone(),
        }
    }

    pub fn charge(&self) -> i32 {
        self.structure.charge() - self.electrons
    }

    pub fn composition(&self) -> Composition {
        self.structure.composition()
    }

    /// Hill formula.
    pub fn formula(&self) -> String {
        self.composition().to_string()
    }

    pub fn smiles(&self) -> String {
        self.structure.canonical_smiles()
    }

    /// The name with its charge: "Cl-", "BF4-", "MeI".
    pub fn label(&self) -> String {
        let q = self.charge();
        if q == 0 || self.name.ends_with(['+', '-']) {
            self.name.clone()
        } else {
            format!("{}{}", self.name, charge_text(q))
        }
    }

    /// Same species: same constitution and charge.
    pub fn same(&self, other: &Species) -> bool {
        self.charge() == other.charge()
            && self.composition() == other.composition()
            && self.smiles() == other.smiles()
    }
}

/// A species with its stoichiometric count.
#[derive(Debug, Clone, PartialEq)]
pub struct Term {
    pub species: Species,
    pub count: u32,
}

/// What a step takes from outside the complex and what it gives off.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Equation {
    pub enters: Vec<Term>,
    pub leaves: Vec<Term>,
}

impl Equation {
    pub fn enter(&mut self, s: Species) {
        push_term(&mut self.enters, s, 1);
    }

    pub fn leave(&mut self, s: Species) {
        push_term(&mut self.leaves, s, 1);
    }

    /// Atoms and charge of `start` plus what enters against `product` plus what leaves; an
    /// error names what does not match.
    pub fn check_balance(&self, start: &Complex, product: &Complex) -> Result<(), String> {
        let (Some(a), Some(b)) = (start.composition(), product.composition()) else {
            // a ligand without a structure: only the charge can be checked
            return self.check_charge(start, product);
        };
        let mut left = a;
        let mut right = b;
        for t in &self.enters {
            left.add_all(&t.species.composition(), t.count);
        }
        for t in &self.leaves {
            right.add_all(&t.species.composition(), t.count);
        }
        if left != right {
            let (more, less) = left.difference(&right);
            return Err(format!(
                "atoms do not balance: the left side has {} more and {} less",
                show(&more),
                show(&less)
            ));
        }
        self.check_charge(start, product)
    }

    fn check_charge(&self, start: &Complex, product: &Complex) -> Result<(), String> {
        let left = start.charge
            + self
                .enters
                .iter()
                .map(|t| t.species.charge() * t.count as i32)
                .sum::<i32>();
        let right = product.charge
            + self
                .leaves
                .iter()
                .map(|t| t.species.charge() * t.count as i32)
                .sum::<i32>();
        if left != right {
            return Err(format!(
                "charge does not balance: {left:+} on the left, {right:+} on the right"
            ));
        }
        Ok(())
    }

    /// "[PtCl4]2- + C2H4 -> [PtCl3(η2-C2H4)]- + Cl-"
    pub fn text(&self, start: &str, product: &str) -> String {
        let side = |first: &str, terms: &[Term]| {
            let mut parts = vec![first.to_string()];
            parts.extend(terms.iter().map(term_text));
            parts.join(" + ")
        };
        format!(
            "{} -> {}",
            side(start, &self.enters),
            side(product, &self.leaves)
        )
    }
}

pub fn term_text(t: &Term) -> String {
    if t.count == 1 {
        t.species.label()
    } else {
        format!("{} {}", t.count, t.species.label())
    }
}

fn push_term(list: &mut Vec<Term>, s: Species, n: u32) {
    if let Some(t) = list.iter_mut().find(|t| t.species.same(&s)) {
        t.count += n;
    } else {
        list.push(Term {
            species: s,
            count: n,
        });
    }
}

fn show(c: &Composition) -> String {
    if c.is_empty() {
        "nothing".into()
    } else {
        c.to_string()
    }
}

impl fmt::Display for Species {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}", self.label())
    }
}

/// The anion (or cation) a group becomes when it leaves with charge `q`: the metal's bonds go
/// and the charge sits on the atoms that held them (`*Cl` -> `[Cl-]`, `*C` -> `[CH3-]`), or,
/// for a π ligand with no marked bond, on the atom short of its valence (Cp -> Cp-).
pub fn ion_of(group: &Molecule, q: i32) -> Molecule {
    let mut m = group.clone();
    let mut bound: Vec<usize> = m.strip_stars().into_iter().map(|(i, _)| i).collect();
    if bound.is_empty() {
        bound = open_valence_atoms(&m);
    }
    if bound.is_empty() && !m.atoms.is_empty() {
        bound.push(0);
    }
    let mut left = q;
    let n = bound.len().max(1) as i32;
    for (k, &i) in bound.iter().enumerate() {
        // spread the charge over the bound atoms, the remainder on the first
        let share = q / n + if k == 0 { q % n } else { 0 };
        if let Some(a) = m.atoms.get_mut(i) {
            a.charge = a.charge.saturating_add(share as i8);
        }
        left -= share;
    }
    if left != 0 {
        if let Some(a) = m.atoms.first_mut() {
            a.charge = a.charge.saturating_add(left as i8);
        }
    }
    m
}

/// Atoms with fewer bonds and hydrogens than their lowest usual valence (radical centres).
pub fn open_valence_atoms(m: &Molecule) -> Vec<usize> {
    (0..m.atoms.len())
        .filter(|&i| {
            let a = m.atoms[i];
            if a.is_star() {
                return false;
            }
            let used = m.bond_valence(i) + a.h + u8::from(a.aromatic);
            periodic::valences_charged(a.z, a.charge)
                .first()
                .is_some_and(|&v| used < v)
        })
        .collect()
}

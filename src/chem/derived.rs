//! Ligands that no catalogue entry describes, made from their structure: a pentyl from two
//! insertions, the alkene a β-elimination leaves, a metallacycle from a [2+2] step, or a group
//! written as a condensed formula or SMILES in a formula. The catalogue entry with the same
//! structure wins whenever there is one, so a step that makes n-propyl gives `nPr`.

use std::sync::Arc;

use super::condensed::{print_group, read_group, Attach};
use super::formula::LigandLookup;
use super::ligand::{BindingMode, CbcClass, FamilyTraits, FieldClass, LigandDef};
use super::molecule::{Molecule, AROMATIC};
use super::periodic;

/// The ligand for `m`: the catalogue's, else one made from the structure.
pub fn ligand_for(m: &Molecule, lookup: &dyn LigandLookup) -> Arc<LigandDef> {
    let mut m = m.clone();
    super::molecule::fold_hydrogens(&mut m);
    if let Some(l) = lookup.ligand_like(&m) {
        return l.clone();
    }
    Arc::new(make(&m, lookup))
}

/// How a derived ligand is written: its condensed formula, or SMILES in braces when it has
/// rings the catalogue does not name.
pub fn key_of(m: &Molecule, lookup: &dyn LigandLookup) -> String {
    let smiles = || format!("{{{}}}", m.canonical_smiles());
    match print_group(m, lookup) {
        // a text the catalogue already uses for something else would read back as that
        Some(k) if lookup.exact(&k.replace('=', "")).is_some() => smiles(),
        Some(k) => k,
        None => smiles(),
    }
}

fn make(m: &Molecule, lookup: &dyn LigandLookup) -> LigandDef {
    let key = key_of(m, lookup);
    let bonds = m.metal_bonds();
    let (family, modes) = match bonds[..] {
        [(at, order)] => {
            let family = sigma_family(m, at, order);
            let class = CbcClass {
                l: 0,
                x: order.clamp(1, 3),
                z: 0,
            };
            let mut modes = vec![BindingMode::new("κ1", class)];
            if family == "alkylidene" {
                // the neutral-carbene count a late metal's alkylidene takes (Fischer type)
                let mut neutral = BindingMode::new("neutral", CbcClass { l: 1, x: 0, z: 0 });
                neutral.note = Some("neutral 2-e carbene, as on late metals".into());
                modes.push(neutral);
            }
            (family, modes)
        }
        [_, _] => {
            let mut mode = BindingMode::new("κ2", CbcClass { l: 0, x: 2, z: 0 });
            mode.note = Some("metallacycle: σ bonds at both ends".into());
            ("alkyl", vec![mode])
        }
        [] if !has_pi(m) && donor_atom(m).is_some() => {
            let family = match donor_atom(m).map(|i| m.atoms[i].z) {
                Some(15) => "phosphine",
                Some(periodic::N) => "amine",
                Some(periodic::S) => "thioether",
                _ => "ether",
            };
            (
                family,
                vec![BindingMode::new("κ1", CbcClass { l: 1, x: 0, z: 0 })],
            )
        }
        [] => pi_modes(m),
        _ => {
            let n = bonds.len() as u8;
            let label = format!("κ{n}");
            (
                "other",
                vec![BindingMode::new(&label, CbcClass { l: 0, x: n, z: 0 })],
            )
        }
    };
    let mut def = LigandDef {
        name: format!("{family} {}", m.composition()),
        formula: key.clone(),
        smiles: Some(m.canonical_smiles()),
        aliases: Vec::new(),
        family: family.to_string(),
        field: matches!(
            family,
            "alkyl" | "aryl" | "acyl" | "alkylidene" | "alkylidyne"
        )
        .then_some(FieldClass::Strong),
        pi_donor: false,
        cone_angle: None,
        tep: None,
        bite_angle: None,
        trans_effect: None,
        trans_influence: None,
        hazards: Vec::new(),
        hazard_source: None,
        notes: Some("made from its structure; not a catalogue entry".into()),
        counterpart: None,
        modes,
        origin: "derived".into(),
        structure: None,
        elements: None,
        derived: true,
        traits: FamilyTraits::of(family),
        key,
    };
    def.set_structure(m.clone());
    def
}

/// The family of a group held by one σ bond of order `order` at atom `at`.
fn sigma_family(m: &Molecule, at: usize, order: u8) -> &'static str {
    let a = m.atoms[at];
    match (a.z, order) {
        (periodic::C, 2) => "alkylidene",
        (periodic::C, 3) => "alkylidyne",
        (periodic::C, _) if a.aromatic => "aryl",
        (periodic::C, _) => {
            let acyl = m
                .neighbors(at)
                .any(|(j, o)| o == 2 && matches!(m.atoms[j].z, periodic::O | periodic::N));
            if acyl {
                "acyl"
            } else {
                "alkyl"
            }
        }
        (periodic::O, 1) => {
            let carboxylate = m.heavy_neighbors(at).iter().any(|&c| {
                m.atoms[c].z == periodic::C
                    && m.neighbors(c)
                        .any(|(j, o)| o == 2 && m.atoms[j].z == periodic::O)
            });
            if carboxylate {
                "carboxylate"
            } else {
                "alkoxide"
            }
        }
        (periodic::N, 1) => "amide",
        (periodic::N, _) => "imido",
        (periodic::O, _) => "oxo",
        (periodic::S, _) => "thiolate",
        (periodic::SI, _) => "silyl",
        (periodic::B, _) => "boryl",
        _ => "other",
    }
}

/// A closed-shell molecule with a C=C or C≡C, or with a lone pair to give (an amine,
/// phosphine, ether, water): something that binds as a neutral ligand.
pub fn free_ligand(m: &Molecule) -> bool {
    let every_valence_usual = (0..m.atoms.len()).all(|i| {
        let a = m.atoms[i];
        let used = m.bond_valence(i) + a.h + u8::from(a.aromatic);
        periodic::valences_charged(a.z, a.charge).contains(&used)
    });
    m.star_count() == 0
        && m.charge() == 0
        && every_valence_usual
        && (has_pi(m) || donor_atom(m).is_some())
}

/// A C=C or C≡C outside an aromatic ring (arenes bind η6 only when the formula says so).
fn has_pi(m: &Molecule) -> bool {
    m.bonds.iter().any(|b| {
        (b.order == 2 || b.order == 3)
            && m.atoms[b.a].z == periodic::C
            && m.atoms[b.b].z == periodic::C
    })
}

/// The atom a neutral donor binds through: P, then N, S, O (soft before hard, as
/// phosphines and amines bind), only atoms with a lone pair and no multiple bond.
fn donor_atom(m: &Molecule) -> Option<usize> {
    [15u8, periodic::N, periodic::S, periodic::O]
        .iter()
        .find_map(|&z| {
            (0..m.atoms.len()).find(|&i| {
                let a = m.atoms[i];
                a.z == z && a.charge == 0 && !a.aromatic && m.neighbors(i).all(|(_, o)| o == 1)
            })
        })
}

/// Modes of an η-bound ligand from the size of its π system: an alkene η2 (L), an allyl η3
/// (LX), a diene η4 (L2), a dienyl η5 (L2X), an arene η6 (L3) (Green 1995).
fn pi_modes(m: &Molecule) -> (&'static str, Vec<BindingMode>) {
    let pi: Vec<usize> = (0..m.atoms.len())
        .filter(|&i| {
            m.atoms[i].z == periodic::C
                && (m.atoms[i].aromatic
                    || m.neighbors(i).any(|(_, o)| o >= 2 && o != AROMATIC)
                    || super::species::open_valence_atoms(m).contains(&i))
        })
        .collect();
    let triple = m.bonds.iter().any(|b| b.order == 3);
    let n = pi.len().clamp(2, 8) as u8;
    let (family, n) = match (n, triple) {
        (_, true) => ("alkyne", 2),
        (2, _) => ("alkene", 2),
        (3, _) => ("allyl", 3),
        (4, _) => ("diene", 4),
        (6, _) if m.atoms.iter().any(|a| a.aromatic) => ("arene", 6),
        (n, _) => ("polyene", n),
    };
    let class = CbcClass {
        l: n / 2,
        x: n % 2,
        z: 0,
    };
    (family, vec![BindingMode::new(&format!("η{n}"), class)])
}

/// Read a group the catalogue does not hold, as a formula writes it: a condensed formula
/// (`CH2CH2CH2CH2CH3`) or SMILES in braces (`{*CC1CC1}`); `label` is its mode prefix, if any.
pub fn read_written(
    text: &str,
    label: Option<&str>,
    lookup: &dyn LigandLookup,
) -> Result<Arc<LigandDef>, String> {
    let attach = match label.map(super::ligand::normalize_label) {
        Some(l) if l.starts_with('η') => Attach::None,
        Some(l) if l.starts_with('κ') && l.len() > "κ".len() && !l.ends_with('1') => Attach::Two,
        _ => Attach::One,
    };
    if let Some(smiles) = text.strip_prefix('{').and_then(|t| t.strip_suffix('}')) {
        let m = Molecule::from_smiles(smiles).map_err(|e| e.to_string())?;
        if m.atoms.iter().all(|a| a.is_star()) {
            return Err("a group with no atoms".into());
        }
        return Ok(ligand_for(&m, lookup));
    }
    let read = read_group(text, lookup, attach);
    if label.is_some() {
        return read.map(|m| ligand_for(&m, lookup));
    }
    // without a mode prefix: a plain one-bond group (so that a slip such as (PPh) is not
    // taken for a phosphinidene), else a free molecule that binds as it is (an alkene, an
    // amine)
    let plain = |m: &Molecule| {
        matches!(m.metal_bonds()[..], [(at, 1)]
            if matches!(m.atoms[at].z, 5 | 6 | 7 | 8 | 14 | 16 | 32 | 50))
    };
    match read {
        Ok(m) if plain(&m) => Ok(ligand_for(&m, lookup)),
        first => {
            if let Ok(m) = read_group(text, lookup, Attach::None) {
                if free_ligand(&m) {
                    return Ok(ligand_for(&m, lookup));
                }
            }
            Err(match first {
                Ok(_) => format!(
                    "'{text}' would be a group bound by a multiple bond; write its mode \
                     (κ1-{text}) if that is meant"
                ),
                Err(why) => why,
            })
        }
    }
}

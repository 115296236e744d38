//! The catalogue's structures checked against an outside reference and against themselves:
//! every SMILES gives the molecular formula RDKit computes for it (Landrum et al., RDKit,
//! rdMolDescriptors.CalcMolFormula; the table in tests/data/reference_formulas.tsv and the
//! script that wrote it), the bonds to the metal agree with the CBC class of the default
//! mode, and a user ligand set can bring a new group and a new substrate that steps use.

mod common;

use common::cat;
use nonet::catalogue::Catalogue;
use nonet::chem::parse;
use nonet::chem::steps::{take, Step};

/// Element counts of a formula such as "C18H15P".
fn counts(f: &str) -> std::collections::BTreeMap<String, u32> {
    let mut out = std::collections::BTreeMap::new();
    let b = f.as_bytes();
    let mut i = 0;
    while i < b.len() {
        let mut sym = (b[i] as char).to_string();
        i += 1;
        while i < b.len() && b[i].is_ascii_lowercase() {
            sym.push(b[i] as char);
            i += 1;
        }
        let start = i;
        while i < b.len() && b[i].is_ascii_digit() {
            i += 1;
        }
        let n = f[start..i].parse().unwrap_or(1);
        *out.entry(sym).or_insert(0) += n;
    }
    out
}

#[test]
fn hill_formulas_match_rdkit() {
    let table = include_str!("data/reference_formulas.tsv");
    let mut checked = 0;
    for line in table
        .lines()
        .filter(|l| !l.starts_with('#') && !l.is_empty())
    {
        let f: Vec<&str> = line.split('\t').collect();
        let [kind, key, smiles, formula, charge] = f[..] else {
            panic!("bad row {line}");
        };
        let (ours, q) = match kind {
            "ligand" => {
                let l = cat()
                    .ligands()
                    .iter()
                    .find(|l| l.key == key)
                    .unwrap_or_else(|| panic!("no ligand {key}"));
                let m = l.structure.as_ref().expect("has a structure");
                (m.composition().to_string(), m.charge())
            }
            _ => {
                let d = cat()
                    .substrates()
                    .iter()
                    .find(|d| d.key == key)
                    .unwrap_or_else(|| panic!("no substrate {key}"));
                (d.structure.composition().to_string(), d.structure.charge())
            }
        };
        // RDKit writes carbon-free formulas with H first (H3B); Hill puts them all in
        // alphabetical order (BH3): compare the counts
        assert_eq!(
            counts(&ours),
            counts(formula),
            "{kind} {key}: {smiles}: {ours} vs {formula}"
        );
        assert_eq!(q.to_string(), charge, "{kind} {key}: {smiles}");
        checked += 1;
    }
    // every structure in the catalogue is in the table
    let with_structure = cat()
        .ligands()
        .iter()
        .filter(|l| l.structure.is_some())
        .count()
        + cat().substrates().len();
    assert_eq!(
        checked, with_structure,
        "regenerate tests/data/reference_formulas.tsv"
    );
}

/// The bonds a group's SMILES draws to the metal add up to the X functions of one of its
/// modes (Green's CBC, J. Organomet. Chem. 1995, 500, 127: an X ligand makes a one-electron
/// bond, so `*C` is X, `*=O` X2, `*#N` X3); free molecules are L or Z ligands, or π ligands.
#[test]
fn metal_bonds_agree_with_the_class() {
    let mut bad = Vec::new();
    for l in cat().ligands() {
        let Some(m) = &l.structure else { continue };
        let bonds: u8 = m.metal_bonds().iter().map(|&(_, o)| o).sum();
        if bonds == 0 {
            continue;
        }
        // a carbene's M=C is drawn double whether it is counted X2 (Schrock) or L (Fischer)
        let carbene = bonds == 2 && matches!(l.family.as_str(), "carbene" | "alkylidene");
        let fits = carbene || l.modes.iter().any(|md| md.class.x == bonds);
        if !fits {
            bad.push(format!(
                "{}: {} bonds to the metal, modes {}",
                l.key,
                bonds,
                l.mode_labels()
            ));
        }
    }
    assert!(bad.is_empty(), "{bad:#?}");
}

#[test]
fn every_ligand_and_substrate_has_a_structure() {
    let missing: Vec<&str> = cat()
        .ligands()
        .iter()
        .filter(|l| l.structure.is_none())
        .map(|l| l.key.as_str())
        .collect();
    assert!(missing.is_empty(), "no smiles: {missing:?}");
    assert!(cat().warnings.is_empty(), "{:?}", cat().warnings);
}

#[test]
fn a_user_set_brings_a_group_and_a_substrate() {
    let user = r#"
[[ligand]]
key = "CH2CF3"
name = "2,2,2-trifluoroethyl"
formula = "CH2CF3"
smiles = "*CC(F)(F)F"
family = "alkyl"
[[ligand.mode]]
label = "κ1"
class = "X"

[[substrate]]
key = "CF3CH2I"
name = "2,2,2-trifluoroethyl iodide"
formula = "C2H2F3I"
smiles = "FC(F)(F)CI"
hazards = ["H315"]
hazard_source = "test data"
"#;
    let c = Catalogue::from_sets(vec![], vec![("mine.toml".to_string(), user.to_string())]);
    assert!(c.warnings.is_empty(), "{:?}", c.warnings);
    // the bundled sets are left out here, so the complex is built from the user's group
    // alone plus what the parser needs; use the full catalogue with the user set merged
    let mut sets: Vec<(String, String)> = Vec::new();
    for entry in std::fs::read_dir(concat!(env!("CARGO_MANIFEST_DIR"), "/ligand_sets")).unwrap() {
        let p = entry.unwrap().path();
        if p.extension().is_some_and(|x| x == "toml") {
            sets.push((
                p.file_name().unwrap().to_string_lossy().to_string(),
                std::fs::read_to_string(&p).unwrap(),
            ));
        }
    }
    sets.sort();
    let full = Catalogue::from_sets(sets, vec![("mine.toml".to_string(), user.to_string())]);
    let vaska = parse("IrCl(CO)(PPh3)2", &full).unwrap();
    let o = take(
        &vaska,
        &Step::parse("oxidative-addition CF3CH2I").unwrap(),
        &full,
    )
    .unwrap();
    // the substrate's own key and hazards, and the group named by the user's key
    assert_eq!(o.equation.enters[0].species.name, "CF3CH2I");
    assert_eq!(
        o.equation.enters[0].species.hazards,
        vec!["H315".to_string()]
    );
    assert!(o.after.formula.contains("(CH2CF3)"), "{}", o.after.formula);
    // and the same group reached by a step that builds it is given the user's key
    assert!(o.product.composition().is_some());
}

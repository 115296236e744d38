//! Property tests of the steps: random sequences of allowed steps from textbook starting
//! complexes stay balanced in atoms and charge (conservation of mass and charge: common
//! practice), every product prints and reads back as itself, and a complex's composition is
//! its metal plus the sum of its ligands.

mod common;

use common::cat;
use nonet::chem::molecule::Composition;
use nonet::chem::steps::{take, Step, StepError};
use nonet::chem::{parse, Complex};
use proptest::prelude::*;

/// Starting points of textbook cycles and a few odd ones.
const STARTS: &[&str] = &[
    "RhCl(PPh3)3",
    "Pd(PPh3)2",
    "[Rh(CO)2I2]-",
    "RuCl2(PCy3)2(=CHPh)",
    "Cp2ZrMe+",
    "[PdCl4]2-",
    "HRh(CO)(PPh3)3",
    "Mo(NAr)(OtBu)2(=CHCMe2Ph)",
    "Pd(OAc)2(PPh3)",
    "IrCl(CO)(PPh3)2",
    "CpFe(CO)2Me",
    "Cp*2ScMe",
    "Ni(COD)2",
    "[Pd(η3-C3H5)(PPh3)2]+",
    "Mn(CO)5Me",
    "Cp2Zr(η2-C2H4)2",
];

const ENTERING: &[&str] = &[
    "CO", "C2H4", "PPh3", "Cl", "H2O", "CH2CHPh", "C2H2", "MeCN", "HNMe2",
];
const SUBSTRATES: &[&str] = &["H2", "MeI", "PhBr", "HSiEt3", "HBpin", "Me-Cl", "PhOTf"];
const TRANSFER: &[&str] = &["PhB(OH)2", "MeZnCl", "Bu3SnPh", "PhMgBr"];
const TAKERS: &[&str] = &["AgBF4", "B(C6F5)3", "[Ph3C]+", "NaBArF4"];
const ACIDS: &[&str] = &["HCl", "HBF4", "HOTf"];
const NUCLEOPHILES: &[&str] = &["OH", "MeOH", "NaOMe", "H2O", "OAc"];
const ELECTROPHILES: &[&str] = &["HBF4", "MeOTf"];

/// Every step that could apply to `c`, written as a chemist would type it.
fn candidates(c: &Complex) -> Vec<String> {
    let keys: Vec<String> = c.all_ligands().map(|(_, b)| b.ligand.key.clone()).collect();
    let mut out = vec![
        "oxidation".to_string(),
        "reduction".into(),
        "protonation".into(),
        "protonation HBF4".into(),
    ];
    for k in &keys {
        for w in [
            "dissociation",
            "homolysis",
            "beta-hydride-elimination",
            "beta-alkyl-elimination",
            "beta-heteroatom-elimination",
            "alpha-elimination",
            "deinsertion",
            "deprotonation",
            "reductive-decoupling",
        ] {
            out.push(format!("{w} {k}"));
        }
        for e in ENTERING {
            out.push(format!("substitution {k} {e}"));
        }
        for t in TAKERS {
            out.push(format!("abstraction {k} {t}"));
        }
        for a in ACIDS {
            out.push(format!("protonolysis {k} {a}"));
        }
        for n in NUCLEOPHILES {
            out.push(format!("nucleophilic-attack {n} {k}"));
        }
        for e in ELECTROPHILES {
            out.push(format!("electrophilic-attack {e} {k}"));
        }
        for s in ["H2", "CH4"] {
            out.push(format!("sigma-bond-metathesis {s} {k}"));
        }
        out.push(format!("concerted-metalation-deprotonation PhH {k}"));
        for base in ["NaOtBu", "Et3N", "Cs2CO3"] {
            out.push(format!("deprotonation {k} {base}"));
        }
        out.push(format!("cycloreversion {k}"));
        for k2 in &keys {
            out.push(format!("reductive-elimination {k} {k2}"));
            out.push(format!("migratory-insertion {k} {k2}"));
            out.push(format!("migratory-insertion {k} {k2} 2,1"));
            out.push(format!("oxidative-coupling {k} {k2}"));
            out.push(format!("cycloaddition {k} {k2}"));
        }
    }
    for e in ENTERING {
        out.push(format!("association {e}"));
        out.push(format!("cycloreversion {e}"));
    }
    for s in SUBSTRATES {
        out.push(format!("oxidative-addition {s}"));
    }
    for t in TRANSFER {
        out.push(format!("transmetalation {t}"));
    }
    out
}

/// Sum of the metals' and ligands' compositions, counted independently of the complex's own
/// method.
fn parts(c: &Complex) -> Composition {
    let mut total = Composition::default();
    for s in &c.sites {
        total.add(s.element.number, 1);
    }
    for (_, b) in c.all_ligands() {
        let m = b
            .ligand
            .structure
            .as_ref()
            .expect("every ligand has a structure");
        total.add_all(&m.composition(), b.count);
    }
    total
}

proptest! {
    #![proptest_config(ProptestConfig {
        cases: 150,
        failure_persistence: None,
        ..ProptestConfig::default()
    })]

    #[test]
    fn random_paths_balance_and_read_back(
        start in 0..STARTS.len(),
        picks in proptest::collection::vec(any::<u32>(), 1..10),
    ) {
        let mut c = parse(STARTS[start], cat()).unwrap();
        let mut path = vec![STARTS[start].to_string()];
        for p in picks {
            // the steps that go through from here
            let ok: Vec<(String, _)> = candidates(&c)
                .into_iter()
                .filter_map(|text| {
                    let step = Step::parse(&text).ok()?;
                    match take(&c, &step, cat()) {
                        Ok(o) => Some((text, o)),
                        Err(StepError::Unbalanced(why)) => {
                            panic!("unbalanced after {}: {text}: {why}", path.join(" / "))
                        }
                        Err(_) => None,
                    }
                })
                .collect();
            if ok.is_empty() {
                break;
            }
            let (text, o) = ok[p as usize % ok.len()].clone();
            path.push(text);
            let printed = o.product.formula(false);
            let back = parse(&printed, cat())
                .unwrap_or_else(|e| panic!("{}: {} does not read back: {}", path.join(" / "), printed, e.render()));
            prop_assert_eq!(back.formula(false), printed.clone(), "{}", path.join(" / "));
            prop_assert_eq!(back.composition(), o.product.composition(), "{}", path.join(" / "));
            prop_assert_eq!(o.product.composition(), Some(parts(&o.product)), "{}", path.join(" / "));
            c = o.product;
        }
    }
}

//! Elementary steps: bookkeeping checked against Crabtree, The Organometallic Chemistry of the
//! Transition Metals, 6th ed., Wiley 2014, ch. 4, 6 and 7 (changes in electron count, oxidation
//! state, d count and coordination number for each step type), and a refusal for each
//! precondition.

mod common;

use common::cat;
use nonet::chem::steps::{take, Step, StepError};
use nonet::chem::{parse, Frac};

/// (Δe, ΔOS, Δd, ΔCN) of taking `step` on `formula`.
fn deltas(formula: &str, step: &str) -> (i64, i64, i64, i64) {
    let c = parse(formula, cat()).unwrap_or_else(|e| panic!("{}", e.render()));
    let s = Step::parse(step).unwrap_or_else(|e| panic!("{step}: {e}"));
    let o = take(&c, &s, cat()).unwrap_or_else(|e| panic!("{formula} / {step}: {e}"));
    let (e, os, d, cn) = o.deltas();
    let i = |f: Frac| f.as_int().unwrap_or(-99);
    (i(e), i(os), i(d), i(cn))
}

fn refused(formula: &str, step: &str) -> String {
    let c = parse(formula, cat()).unwrap_or_else(|e| panic!("{}", e.render()));
    let s = Step::parse(step).unwrap_or_else(|e| panic!("{step}: {e}"));
    match take(&c, &s, cat()) {
        Ok(o) => panic!(
            "{formula} / {step} should be refused, gave {}",
            o.after.formula
        ),
        Err(StepError::Refused(why)) => why,
        Err(e) => panic!("{formula} / {step}: not a refusal but {e}"),
    }
}

fn product(formula: &str, steps: &[&str]) -> String {
    let mut c = parse(formula, cat()).unwrap_or_else(|e| panic!("{}", e.render()));
    for s in steps {
        let step = Step::parse(s).unwrap_or_else(|e| panic!("{s}: {e}"));
        c = take(&c, &step, cat())
            .unwrap_or_else(|e| panic!("{s}: {e}"))
            .product;
    }
    c.formula(false)
}

#[test]
fn ligand_dissociation_and_association() {
    // Crabtree 2014 ch. 4: L loss from 18 e: Δe -2, ΔOS 0, ΔCN -1; association the reverse
    assert_eq!(deltas("Ni(CO)4", "dissociation CO"), (-2, 0, 0, -1));
    assert_eq!(deltas("RhCl(PPh3)3", "dissociation PPh3"), (-2, 0, 0, -1));
    assert_eq!(deltas("IrCl(CO)(PPh3)2", "association C2H4"), (2, 0, 0, 1));
    // refusals: an X ligand does not dissociate; an 18-e complex has no site to associate
    assert!(refused("Ni(CO)4", "homolysis CO").contains("dissociation"));
    assert!(refused("Cr(CO)6", "association PMe3").contains("open site"));
    assert!(refused("Ni(CO)4", "dissociation PPh3").contains("no PPh3"));
}

#[test]
fn substitution_keeps_the_count_for_like_for_like() {
    // Crabtree 2014 ch. 4: substituting L for L changes neither count nor oxidation state
    assert_eq!(deltas("Ni(CO)4", "substitution CO PPh3"), (0, 0, 0, 0));
}

#[test]
fn oxidative_addition_and_reductive_elimination() {
    // Crabtree 2014 ch. 6: OA Δe +2, ΔOS +2, Δd -2, ΔCN +2 (Vaska's complex + H2, + CH3I)
    assert_eq!(
        deltas("IrCl(CO)(PPh3)2", "oxidative-addition H2"),
        (2, 2, -2, 2)
    );
    assert_eq!(
        deltas("IrCl(CO)(PPh3)2", "oxidative-addition CH3I"),
        (2, 2, -2, 2)
    );
    assert_eq!(
        deltas("Pd(PPh3)2", "oxidative-addition PhBr"),
        (2, 2, -2, 2)
    );
    assert_eq!(
        deltas("IrCl(CO)(PPh3)2", "oxidative-addition Me-I"),
        (2, 2, -2, 2)
    );
    assert_eq!(
        deltas("IrCl(CO)(PPh3)2", "oxidative-addition HSiEt3"),
        (2, 2, -2, 2)
    );
    // RE is the reverse: Δe -2, ΔOS -2, Δd +2, ΔCN -2
    assert_eq!(
        deltas("PtMe2H(PPh3)2Cl", "reductive-elimination H CH3"),
        (-2, -2, 2, -2)
    );
    assert_eq!(
        deltas("PdEt(H)(PPh3)2", "reductive-elimination H CH2CH3"),
        (-2, -2, 2, -2)
    );
    // refusals: no open site (18 e); d0 cannot oxidize further; RE needs two X groups
    assert!(refused("Cr(CO)6", "oxidative-addition H2").contains("open site"));
    assert!(refused("Cp2ZrCl2", "oxidative-addition H2").contains("d electrons"));
    assert!(refused("CpFe(CO)2Me", "reductive-elimination Me CO").contains("X-type"));
    assert!(refused("Pd(PPh3)2MeCl", "reductive-elimination Me H").contains("there is no H"));
}

#[test]
fn migratory_insertion_both_kinds() {
    // Crabtree 2014 ch. 7: 1,1-insertion of CO into M-Me (Δe -2, ΔOS 0, ΔCN -1) gives acetyl
    assert_eq!(
        deltas("Mn(CO)5Me", "migratory-insertion CO CH3"),
        (-2, 0, 0, -1)
    );
    assert!(product("Mn(CO)5Me", &["migratory-insertion CO CH3"]).contains("COMe"));
    // 1,2-insertion of ethylene into M-H gives ethyl
    assert_eq!(
        deltas("HRh(CO)(PPh3)2(C2H4)", "migratory-insertion C2H4 H"),
        (-2, 0, 0, -1)
    );
    // the Heck step: ethylene into M-Ph gives 2-phenylethyl, which β-eliminates styrene
    assert_eq!(
        deltas("PdPh(Br)(PPh3)(C2H4)", "migratory-insertion C2H4 Ph"),
        (-2, 0, 0, -1)
    );
    // the two groups must both be on the metal
    assert!(refused("Mn(CO)5Me", "migratory-insertion C2H4 Me").contains("no C2H4"));
}

#[test]
fn beta_and_alpha_elimination() {
    // Crabtree 2014 ch. 7: β-H elimination Δe +2, ΔOS 0, ΔCN +1; needs a β-H and an open site
    assert_eq!(
        deltas("PdEt(Cl)(PPh3)", "beta-hydride-elimination CH2CH3"),
        (2, 0, 0, 1)
    );
    assert!(product("PdEt(Cl)(PPh3)", &["beta-hydride-elimination Et"]).contains("C2H4"));
    assert!(refused("PdMe(Cl)(PPh3)", "beta-hydride-elimination Me").contains("β"));
    assert!(refused("Mn(CO)5Et", "beta-hydride-elimination Et").contains("open site"));
    // a 16-e square-planar alkyl must lose a ligand first (Whitesides; Crabtree 2014, ch. 7)
    assert!(refused("Pd(PPh3)2Br(nPr)", "beta-hydride-elimination nPr").contains("cis site"));
}

#[test]
fn alpha_elimination_needs_d_electrons() {
    // Ta(V) d0 cannot rise by two: α-abstraction, not α-elimination, makes Schrock's
    // neopentylidene (Schrock, J. Am. Chem. Soc. 1974, 96, 6796; from memory)
    assert!(refused("Ta(CH2tBu)Cl4", "alpha-elimination CH2tBu").contains("d0"));
    // with two alkyls a d0 metal abstracts instead: Ta(CH2tBu)5 -> Ta(=CHtBu)(CH2tBu)3 +
    // CMe4, no change in oxidation state, Δe 0, ΔCN -1 (Crabtree 2014, ch. 7)
    assert_eq!(
        deltas("Ta(CH2tBu)5", "alpha-elimination CH2tBu"),
        (0, 0, 0, -1)
    );
    // α-H elimination: alkyl (X) to alkylidene (X2) + H (X): Δe +2, ΔOS +2, Δd -2, ΔCN +1
    // (Crabtree 2014, ch. 7)
    assert_eq!(
        deltas("WMe(Cl)(PMe3)3", "alpha-elimination Me"),
        (2, 2, -2, 1)
    );
}

#[test]
fn ring_slip_charge_and_protons() {
    // Crabtree 2014 ch. 4: η5 to η3 slip Δe -2, opens one site (CN -1)
    assert_eq!(deltas("CpMn(CO)3", "ring-slip Cp 3"), (-2, 0, 0, -1));
    assert!(refused("CpMn(CO)3", "ring-slip Cp 4").contains("no η4"));
    // one-electron oxidation/reduction: Δe ∓1, ΔOS ±1
    assert_eq!(deltas("Cp2Fe", "oxidation"), (-1, 1, -1, 0));
    assert_eq!(deltas("Cp2Co", "reduction"), (1, -1, 1, 0));
    // protonation at M: Δe 0, ΔOS +2, Δd -2, ΔCN +1; deprotonation the reverse
    assert_eq!(deltas("Fe(CO)5", "protonation"), (0, 2, -2, 1));
    assert_eq!(deltas("[HFe(CO)5]+", "deprotonation H"), (0, -2, 2, -1));
    assert!(refused("TiCl4", "protonation").contains("d electrons"));
    assert!(refused("Fe(CO)5", "deprotonation CO").contains("hydride"));
}

#[test]
fn step_words_and_their_errors() {
    assert!(Step::parse("").is_err());
    assert!(matches!(
        Step::parse("teleportation H2"),
        Err(StepError::Usage(_))
    ));
    assert!(matches!(
        Step::parse("oxidative-addition"),
        Err(StepError::Usage(_))
    ));
    assert!(matches!(
        Step::parse("ring-slip Cp x"),
        Err(StepError::Usage(_))
    ));
    for text in [
        "dissociation PPh3",
        "association C2H4",
        "substitution CO PMe3",
        "oxidative-addition H2",
        "reductive-elimination H CH2CH3",
        "migratory-insertion CO CH3",
        "beta-hydride-elimination CH2CH3",
        "alpha-elimination CH2tBu",
        "ring-slip Cp 3",
        "oxidation",
        "reduction",
        "protonation",
        "deprotonation H",
    ] {
        let s = Step::parse(text).unwrap_or_else(|e| panic!("{text}: {e}"));
        assert_eq!(s.to_string(), text, "steps print back as typed");
    }
}

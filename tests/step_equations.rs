//! Every step type as a balanced equation, on worked examples from the textbooks: Crabtree, The
//! Organometallic Chemistry of the Transition Metals, 6th ed., Wiley 2014 (chapter named beside
//! each check); Hartwig, Organotransition Metal Chemistry, University Science Books 2010; and
//! the papers named. What enters and leaves is compared by Hill formula and charge, which the
//! structure decides; the product by its composition and the metal's count.

mod common;

use common::cat;
use nonet::chem::steps::{take, Outcome, Step, StepError};
use nonet::chem::{parse, Frac};

fn run(formula: &str, steps: &[&str]) -> Outcome {
    let mut c = parse(formula, cat()).unwrap_or_else(|e| panic!("{}", e.render()));
    let mut last = None;
    for s in steps {
        let step = Step::parse(s).unwrap_or_else(|e| panic!("{s}: {e}"));
        let o = take(&c, &step, cat()).unwrap_or_else(|e| panic!("{formula} / {s}: {e}"));
        c = o.product.clone();
        last = Some(o);
    }
    last.expect("at least one step")
}

/// (Hill formula with charge) of what enters and what leaves, in order.
fn sides(o: &Outcome) -> (Vec<String>, Vec<String>) {
    let show = |t: &nonet::chem::species::Term| {
        let q = t.species.charge();
        let f = t.species.formula();
        let base = if q == 0 {
            f
        } else {
            format!(
                "{f}{}{}",
                if q.abs() > 1 {
                    q.abs().to_string()
                } else {
                    String::new()
                },
                if q > 0 { '+' } else { '-' }
            )
        };
        if t.count > 1 {
            format!("{} {base}", t.count)
        } else {
            base
        }
    };
    (
        o.equation.enters.iter().map(show).collect(),
        o.equation.leaves.iter().map(show).collect(),
    )
}

fn refused(formula: &str, step: &str) -> String {
    let c = parse(formula, cat()).unwrap_or_else(|e| panic!("{}", e.render()));
    let s = Step::parse(step).unwrap_or_else(|e| panic!("{step}: {e}"));
    match take(&c, &s, cat()) {
        Ok(o) => panic!(
            "{formula} / {step} should be refused, gave {}",
            o.after.formula
        ),
        Err(StepError::Refused(why)) | Err(StepError::Usage(why)) => why,
        Err(e) => panic!("{formula} / {step}: {e}"),
    }
}

fn os(o: &Outcome) -> (i64, i64) {
    let f = |x: Frac| x.as_int().unwrap_or(-99);
    (
        f(o.before.metals[0].oxidation_state),
        f(o.after.metals[0].oxidation_state),
    )
}

fn electrons(o: &Outcome) -> (i64, i64) {
    let f = |x: Frac| x.as_int().unwrap_or(-99);
    (
        f(o.before.metals[0].electron_count),
        f(o.after.metals[0].electron_count),
    )
}

fn composition(o: &Outcome) -> String {
    o.after
        .composition
        .as_ref()
        .map(|c| c.to_string())
        .unwrap_or_default()
}

#[test]
fn charges_done_right_in_ligand_exchange() {
    // Zeise's salt from K2[PtCl4] and ethylene: [PtCl4]2- + C2H4 -> [PtCl3(C2H4)]- + Cl-; the
    // metal stays Pt(II) (Crabtree 2014, ch. 5; the issue's own Pd example is the same
    // bookkeeping)
    let o = run("[PtCl4]2-", &["substitution Cl C2H4"]);
    assert_eq!(sides(&o), (vec!["C2H4".into()], vec!["Cl-".into()]));
    assert_eq!(o.product.charge, -1);
    assert_eq!(os(&o), (2, 2));
    assert_eq!(composition(&o), "C2H4Cl3Pt");
    // heterolysis: a chloride leaves as Cl- and the cation keeps the oxidation state
    // (Crabtree 2014, ch. 4)
    let o = run("Cp*IrCl2(PMe3)", &["dissociation Cl"]);
    assert_eq!(sides(&o), (vec![], vec!["Cl-".into()]));
    assert_eq!(o.product.charge, 1);
    assert_eq!(os(&o), (3, 3));
    // association of an anion lowers the charge, same oxidation state
    let o = run("[Ir(CO)(PPh3)2]+", &["association Cl"]);
    assert_eq!(sides(&o), (vec!["Cl-".into()], vec![]));
    assert_eq!(o.product.charge, 0);
    // L for X the other way: [PtCl3(C2H4)]- + PPh3 is neutral-in, anion-out
    let o = run("[PtCl3(C2H4)]-", &["substitution Cl PPh3"]);
    assert_eq!(o.product.charge, 0);
    assert_eq!(os(&o), (2, 2));
    // homolysis takes a radical off and reduces the metal by one: Mn(CO)5Me -> Mn(CO)5 + CH3
    // (common practice)
    let o = run("Mn(CO)5Me", &["homolysis Me"]);
    assert_eq!(sides(&o), (vec![], vec!["CH3".into()]));
    assert_eq!(os(&o), (1, 0));
    assert!(refused("Ni(CO)4", "homolysis CO").contains("dissociation"));
}

#[test]
fn abstraction_by_cations_and_lewis_acids() {
    // Ag+ takes chloride: the cation and AgCl, BF4- stays as the counter-ion (Crabtree 2014,
    // ch. 4)
    let o = run("Cp*IrHCl(PMe3)", &["abstraction Cl AgBF4"]);
    assert_eq!(
        sides(&o),
        (vec!["AgBF4".into()], vec!["AgCl".into(), "BF4-".into()])
    );
    assert_eq!(o.product.charge, 1);
    // B(C6F5)3 takes a methyl from Cp2ZrMe2: [Cp2ZrMe]+ [MeB(C6F5)3]- (Yang, Stern & Marks,
    // J. Am. Chem. Soc. 1991, 113, 3623; from memory)
    let o = run("Cp2ZrMe2", &["abstraction Me B(C6F5)3"]);
    assert_eq!(
        sides(&o),
        (vec!["C18BF15".into()], vec!["C19H3BF15-".into()])
    );
    assert_eq!(o.equation.leaves[0].species.label(), "MeB(C6F5)3-");
    assert_eq!(os(&o), (4, 4));
    // trityl takes a hydride as Ph3CH (Crabtree 2014, ch. 8)
    let o = run("Cp*Ir(H)2(PMe3)", &["abstraction H [Ph3C]+"]);
    assert_eq!(sides(&o), (vec!["C19H15+".into()], vec!["C19H16".into()]));
    assert!(refused("Ni(CO)4", "abstraction CO AgBF4").contains("neutral donor"));
    assert!(refused("Cp2ZrMe2", "abstraction Me PPh3").contains("neither a cation"));
}

#[test]
fn oxidative_addition_and_reductive_elimination_balance() {
    // Vaska's complex: IrCl(CO)(PPh3)2 + H2 and + MeI give Ir(III); nothing leaves (Crabtree
    // 2014, ch. 6)
    let o = run("IrCl(CO)(PPh3)2", &["oxidative-addition H2"]);
    assert_eq!(sides(&o), (vec!["H2".into()], vec![]));
    assert_eq!(os(&o), (1, 3));
    let o = run("IrCl(CO)(PPh3)2", &["oxidative-addition MeI"]);
    assert_eq!(sides(&o), (vec!["CH3I".into()], vec![]));
    assert_eq!(composition(&o), "C38H33ClIIrOP2");
    // substrates written as papers write them
    for s in [
        "PhBr",
        "Ph-Br",
        "c1ccccc1Br",
        "TolBr",
        "HSiEt3",
        "HBpin",
        "PhOTf",
    ] {
        let o = run("Pd(PPh3)2", &[&format!("oxidative-addition {s}")]);
        assert_eq!(os(&o), (0, 2), "{s}");
    }
    // reductive elimination gives the organic product: H + nPr leave as propane (Hartwig 2010,
    // ch. 8)
    let o = run("Pt(PPh3)2(H)(nPr)Cl2", &["reductive-elimination H nPr"]);
    assert_eq!(sides(&o), (vec![], vec!["C3H8".into()]));
    let o = run("PdPh2(PPh3)2", &["reductive-elimination Ph Ph"]);
    assert_eq!(sides(&o), (vec![], vec!["C12H10".into()]));
    assert!(refused("Cr(CO)6", "oxidative-addition H2").contains("open site"));
    assert!(refused("Cp2ZrCl2", "oxidative-addition H2").contains("d electrons"));
    assert!(refused("Pd(PPh3)2", "oxidative-addition C2H4").contains("no bond"));
}

#[test]
fn transmetalation_from_each_main_group_metal() {
    // Suzuki: Ph from boron, bromide back to boron (Hartwig 2010, ch. 19)
    let o = run("PdBr(Ph)(PPh3)2", &["transmetalation TolB(OH)2"]);
    assert_eq!(sides(&o), (vec!["C7H9BO2".into()], vec!["BBrH2O2".into()]));
    assert_eq!(o.equation.leaves[0].species.name, "BrB(OH)2");
    // Negishi with the halide named; Stille moves phenyl, not butyl (transfer order alkynyl >
    // vinyl > aryl > alkyl: Hartwig 2010, ch. 19)
    let o = run("PdBr(Ph)(PPh3)2", &["transmetalation MeZnCl Br"]);
    assert_eq!(sides(&o), (vec!["CH3ClZn".into()], vec!["BrClZn".into()]));
    let o = run("PdBr(Me)(PPh3)2", &["transmetalation Bu3SnPh"]);
    assert!(o.after.formula.contains("Ph"), "{}", o.after.formula);
    assert_eq!(o.equation.leaves[0].species.formula(), "C12H27BrSn");
    for r in ["PhMgBr", "PhZnCl", "PhLi", "PhSi(OMe)3"] {
        let o = run("PdBr(Me)(PPh3)2", &[&format!("transmetalation {r}")]);
        assert!(o.after.formula.contains("Ph"), "{r}");
    }
    assert!(refused("PdMe2(PPh3)2", "transmetalation PhB(OH)2").contains("anionic group"));
    assert!(
        refused("PdBr(Me)(PPh3)2", "transmetalation B(C6F5)3F").contains("not a neutral molecule")
    );
    assert!(refused("PdBr(Me)(PPh3)2", "transmetalation Et3N").contains("no organic group"));
}

#[test]
fn insertions_build_real_groups() {
    // a second ethylene into M-nPr gives n-pentyl, chain growth (Cossee; Crabtree 2014, ch. 12)
    let o = run("Cp2Zr(nPr)(C2H4)+", &["migratory-insertion C2H4 nPr"]);
    assert!(
        o.after.formula.contains("CH2CH2CH2CH2CH3"),
        "{}",
        o.after.formula
    );
    // propene into M-H: n-propyl (1,2, the default) or isopropyl (2,1) (Hartwig 2010, ch. 9)
    let o = run("Cp2ZrH(C3H6)+", &["migratory-insertion C3H6 H"]);
    assert!(o.after.formula.contains("nPr"), "{}", o.after.formula);
    let o = run("Cp2ZrH(C3H6)+", &["migratory-insertion C3H6 H 2,1"]);
    assert!(o.after.formula.contains("iPr"), "{}", o.after.formula);
    // propene into M-Me (1,2): 2-methylpropyl... the metal on CH2, the methyl on CH:
    // isobutyl, CH2CH(CH3)2
    let o = run("Cp2ZrMe(C3H6)+", &["migratory-insertion C3H6 Me"]);
    assert!(
        o.after.formula.contains("CH2CH(CH3)2"),
        "{}",
        o.after.formula
    );
    // CO into M-R gives the acyl of that R: Mn(CO)5Et -> Mn(CO)4(COEt) (Crabtree 2014, ch. 7)
    let o = run("Mn(CO)5Et", &["migratory-insertion CO Et"]);
    assert!(o.after.formula.contains("COEt"), "{}", o.after.formula);
    let o = run("Mn(CO)5(nPr)", &["migratory-insertion CO nPr"]);
    assert!(
        o.after.formula.contains("C(O)CH2CH2CH3") || o.after.formula.contains("COPr"),
        "{}",
        o.after.formula
    );
    // Heck: styrene into Pd-Ph, aryl to the CH2 end (2,1 by default for aryl groups; Hartwig
    // 2010, ch. 19)
    let o = run(
        "PdBr(Ph)(PPh3)(CH2CHPh)",
        &["migratory-insertion CH2CHPh Ph"],
    );
    assert!(
        o.after.formula.contains("CH(Ph)CH2Ph"),
        "{}",
        o.after.formula
    );
    // CO2 into M-H gives formate, bound through O (Hartwig 2010, ch. 9)
    let o = run(
        "RuH2(PMe3)4",
        &[
            "dissociation PMe3",
            "association CO2",
            "migratory-insertion CO2 H",
        ],
    );
    assert!(composition(&o).contains("O2"));
    // SO2 into M-Me: the S-bound methylsulfinate (Crabtree 2014, ch. 7)
    let o = run(
        "CpFe(CO)2Me",
        &[
            "dissociation CO",
            "association SO2",
            "migratory-insertion SO2 Me",
        ],
    );
    assert!(
        o.after.formula.contains("S(O)2CH3") || o.after.formula.contains("SO2Me"),
        "{}",
        o.after.formula
    );
    // every insertion keeps Δe -2, ΔOS 0
    assert_eq!(electrons(&o), (18, 16));
    assert!(refused("Mn(CO)4(PMe3)Me", "migratory-insertion PMe3 Me").contains("no bond to insert"));
    assert!(refused("Mn(CO)5Me", "migratory-insertion CO CO").contains("σ bond"));
}

#[test]
fn deinsertion_and_the_eliminations_from_structure() {
    // acyl to alkyl and CO (the reverse of 1,1-insertion; Crabtree 2014, ch. 7)
    let o = run("Mn(CO)4(COMe)", &["deinsertion COMe"]);
    assert_eq!(o.after.formula, "[Mn(CO)5Me]");
    // β-H elimination from 2-butyl: 1-butene or 2-butene; the more substituted by default,
    // the other on request (Hartwig 2010, ch. 10)
    let o = run(
        "Pd(PPh3)Cl(CH(CH3)CH2CH3)",
        &["beta-hydride-elimination CH(CH3)CH2CH3"],
    );
    assert!(
        o.after.formula.contains("CH3CH=CHCH3"),
        "{}",
        o.after.formula
    );
    assert!(!o.notes.is_empty());
    let o = run(
        "Pd(PPh3)Cl(CH(CH3)CH2CH3)",
        &["beta-hydride-elimination CH(CH3)CH2CH3 C4H8"],
    );
    assert!(
        !o.after.formula.contains("CH3CH=CHCH3"),
        "{}",
        o.after.formula
    );
    // β-H elimination from an alkoxide gives a ketone that leaves (Hartwig 2010, ch. 10)
    let o = run("Pt(PEt3)Cl(OCH(CH3)2)", &["beta-hydride-elimination OiPr"]);
    assert_eq!(sides(&o), (vec![], vec!["C3H6O".into()]));
    // β-alkyl elimination (the reverse of alkene insertion into M-alkyl) at d0 Sc (Bercaw;
    // Hartwig 2010, ch. 10; from memory)
    let o = run(
        "Cp*2Sc(CH2CH(CH3)2)",
        &["beta-alkyl-elimination CH2CH(CH3)2"],
    );
    assert!(o.after.formula.contains("C3H6") && o.after.formula.contains("Me"));
    // β-acetoxy elimination (Hartwig 2010, ch. 10)
    let o = run(
        "Pd(PPh3)Cl(CH2CH2OAc)",
        &["beta-heteroatom-elimination CH2CH2OAc"],
    );
    assert!(o.after.formula.contains("C2H4") && o.after.formula.contains("OAc"));
    assert!(refused("PdMe(Cl)(PPh3)", "beta-hydride-elimination Me").contains("β"));
    assert!(refused("Pd(PPh3)2Br(nPr)", "beta-hydride-elimination nPr").contains("cis site"));
    assert!(refused("Pd(PPh3)Cl(Et)", "beta-alkyl-elimination Et").contains("alkyl group"));
    // α-abstraction at d0: Ta(CH2tBu)5 -> Ta(=CHtBu)(CH2tBu)3 + CMe4 (Schrock, J. Am. Chem.
    // Soc. 1974, 96, 6796; from memory)
    let o = run("Ta(CH2tBu)5", &["alpha-elimination CH2tBu"]);
    assert_eq!(sides(&o), (vec![], vec!["C5H12".into()]));
}

#[test]
fn attack_on_ligands() {
    // Wacker: water attacks coordinated ethylene, giving Pd-CH2CH2OH and a proton (Crabtree
    // 2014, ch. 9; Hartwig 2010, ch. 11)
    let o = run("PdCl2(H2O)(C2H4)", &["nucleophilic-attack H2O C2H4"]);
    assert_eq!(sides(&o), (vec!["H2O".into()], vec!["H+".into()]));
    assert!(o.after.formula.contains("CH2CH2OH"), "{}", o.after.formula);
    assert_eq!(o.product.charge, -1);
    assert_eq!(os(&o), (2, 2));
    let o = run("PdCl2(H2O)(C2H4)", &["nucleophilic-attack OH C2H4"]);
    assert_eq!(sides(&o), (vec!["HO-".into()], vec![]));
    // Tsuji-Trost: a nucleophile on the allyl end makes the Pd(0) alkene complex (Trost;
    // Hartwig 2010, ch. 20)
    let o = run("[Pd(η3-C3H5)(PPh3)2]+", &["nucleophilic-attack OMe C3H5"]);
    assert_eq!(os(&o), (2, 0));
    assert_eq!(o.product.charge, 0);
    // methoxide on CO gives a methoxycarbonyl (Crabtree 2014, ch. 8)
    let o = run("[Mn(CO)6]+", &["nucleophilic-attack OMe CO"]);
    assert_eq!(o.product.charge, 0);
    assert_eq!(composition(&o), "C7H3MnO7");
    // an arene becomes an η5-cyclohexadienyl (Crabtree 2014, ch. 8)
    let o = run("[Mn(η6-C6H6)(CO)3]+", &["nucleophilic-attack H C6H6"]);
    assert!(o.after.formula.contains("η5"), "{}", o.after.formula);
    // electrophiles: H+ on an η1-allyl gives the η2-propene cation (Green & Nagy, J. Chem.
    // Soc. 1963, 189; from memory); Me+ on an acyl O gives a Fischer carbene
    let o = run("CpFe(CO)2(η1-C3H5)", &["electrophilic-attack HBF4 C3H5"]);
    assert!(o.after.formula.contains("C3H6"), "{}", o.after.formula);
    assert_eq!(o.product.charge, 1);
    let o = run("CpFe(CO)2(C(O)Me)", &["electrophilic-attack MeOTf COMe"]);
    assert!(o.after.formula.contains("C(OMe)Me"), "{}", o.after.formula);
    assert!(refused("Ni(CO)3(PMe3)", "nucleophilic-attack OH PMe3").contains("no multiple bond"));
}

#[test]
fn d0_steps_sigma_bond_metathesis_protonolysis_and_cmd() {
    // Cp*2Sc-Me + H2 -> Cp*2Sc-H + CH4 (Thompson et al., J. Am. Chem. Soc. 1987, 109, 203;
    // from memory)
    let o = run("Cp*2ScMe", &["sigma-bond-metathesis H2 Me"]);
    assert_eq!(sides(&o), (vec!["H2".into()], vec!["CH4".into()]));
    // with n-propyl, propane leaves
    let o = run("Cp*2Sc(nPr)", &["sigma-bond-metathesis H2 nPr"]);
    assert_eq!(sides(&o), (vec!["H2".into()], vec!["C3H8".into()]));
    assert!(refused("PdMe(Cl)(PPh3)2", "sigma-bond-metathesis H2 Me").contains("d0"));
    // protonolysis: HCl cleaves M-Me, chloride binds, methane leaves (Crabtree 2014, ch. 6)
    let o = run("Cp2ZrMe2", &["protonolysis Me HCl"]);
    assert_eq!(sides(&o), (vec!["ClH".into()], vec!["CH4".into()]));
    assert_eq!(o.product.charge, 0);
    // HBF4 etherate: BF4- stays outside, the complex a cation
    let o = run("Cp2ZrMe2", &["protonolysis Me HBF4"]);
    assert_eq!(o.product.charge, 1);
    // CMD: acetate takes the proton of benzene as Pd-Ph forms; acetic acid leaves
    // (Gorelsky, Lapointe & Fagnou, J. Am. Chem. Soc. 2008, 130, 10848)
    let o = run(
        "Pd(OAc)2(PPh3)",
        &["concerted-metalation-deprotonation PhH OAc"],
    );
    assert_eq!(sides(&o), (vec!["C6H6".into()], vec!["C2H4O2".into()]));
    assert_eq!(os(&o), (2, 2));
    assert!(
        refused("PdCl2(PPh3)2", "concerted-metalation-deprotonation PhH Cl")
            .contains("carboxylate")
    );
}

#[test]
fn metallacycles_and_metathesis() {
    // Chauvin's mechanism on Grubbs' catalyst: [2+2] with ethylene, then styrene leaves and
    // Ru=CH2 stays; one carbene convention throughout, so Ru is +2 before and after
    // (Hérisson & Chauvin, Makromol. Chem. 1971, 141, 161; Crabtree 2014, ch. 11)
    let o = run(
        "RuCl2(PCy3)2(=CHPh)",
        &[
            "dissociation PCy3",
            "association C2H4",
            "cycloaddition C2H4 CHPh",
        ],
    );
    assert!(o.after.formula.contains("κ2"), "{}", o.after.formula);
    let o2 = run(
        "RuCl2(PCy3)2(=CHPh)",
        &[
            "dissociation PCy3",
            "association C2H4",
            "cycloaddition C2H4 CHPh",
            "cycloreversion CH2CHPh",
        ],
    );
    assert_eq!(sides(&o2), (vec![], vec!["C8H8".into()]));
    assert_eq!(os(&o2).1, 2);
    let start = run("RuCl2(PCy3)2(=CHPh)", &["dissociation PCy3"]);
    assert_eq!(
        os(&start).1,
        os(&o2).1,
        "an alkylidene exchange keeps the oxidation state"
    );
    // Schrock's Mo: X2 alkylidenes, Mo(VI) throughout
    let o = run(
        "Mo(NAr)(OtBu)2(=CHCMe2Ph)",
        &[
            "association C2H4",
            "cycloaddition C2H4 CHCMe2Ph",
            "cycloreversion CH2CHCMe2Ph",
        ],
    );
    assert_eq!(os(&o), (6, 6));
    // oxidative coupling of two ethylenes: a zirconacyclopentane, Zr(II) -> Zr(IV), and back
    // (Hartwig 2010, ch. 21)
    let o = run("Cp2Zr(C2H4)2", &["oxidative-coupling C2H4 C2H4"]);
    assert_eq!(os(&o), (2, 4));
    assert!(o.after.formula.contains("CH2CH2CH2CH2"));
    let o = run(
        "Cp2Zr(C2H4)2",
        &[
            "oxidative-coupling C2H4 C2H4",
            "reductive-decoupling CH2CH2CH2CH2",
        ],
    );
    assert_eq!(os(&o), (4, 2));
    assert!(refused("RuCl2(PCy3)2(=CHPh)", "cycloreversion C2H4").contains("metallacyclobutane"));
    assert!(refused("Cp2ZrCl2", "cycloaddition C2H4 Cl").contains("double bond"));
}

#[test]
fn protons_to_and_from_ligands_with_acids_and_bases() {
    // Buchwald-Hartwig: the bound amine loses its N-H proton to the base, giving the amido
    // that reductive elimination couples to the aryl (Hartwig 2010, ch. 19)
    let o = run("Pd(PPh3)Br(Ph)(HNMe2)", &["deprotonation HNMe2 NaOtBu"]);
    assert_eq!(o.product.charge, -1);
    assert_eq!(os(&o), (2, 2));
    assert!(o.after.formula.contains("NMe2"), "{}", o.after.formula);
    let (ins, outs) = sides(&o);
    assert_eq!(ins, vec!["C4H9NaO".to_string()]);
    assert!(outs.contains(&"C4H10O".to_string()) && outs.contains(&"Na+".to_string()));
    let o = run(
        "Pd(PPh3)Br(Ph)(HNMe2)",
        &["deprotonation HNMe2 Et3N", "reductive-elimination Ph NMe2"],
    );
    assert_eq!(sides(&o), (vec![], vec!["C8H11N".into()]));
    // coordinated water gives up a proton and becomes hydroxide (Wacker; Crabtree 2014, ch. 9)
    let o = run("[PdCl3(H2O)]-", &["deprotonation H2O"]);
    assert_eq!(sides(&o), (vec![], vec!["H+".into()]));
    assert!(o.after.formula.contains("OH"));
    // an acid gives the proton to the metal and its anion stays outside: Fe(CO)5 + HBF4
    // (etherate) -> [HFe(CO)5]+ + Et2O + BF4- (Crabtree 2014, ch. 6)
    let o = run("Fe(CO)5", &["protonation HBF4"]);
    assert_eq!(o.product.charge, 1);
    assert_eq!(sides(&o).1, vec!["C4H10O".to_string(), "BF4-".to_string()]);
    assert!(refused("Fe(CO)5", "protonation Et3N").contains("no proton"));
    assert!(refused("Fe(CO)5", "deprotonation CO").contains("neither a hydride"));
}

#[test]
fn electrons_leave_and_enter_as_e() {
    let o = run("Cp2Fe", &["oxidation"]);
    assert_eq!(o.equation.leaves[0].species.label(), "e-");
    assert_eq!(sides(&o).1, vec!["-".to_string()]);
    let o = run("Fe(CO)5", &["protonation"]);
    assert_eq!(sides(&o), (vec!["H+".into()], vec![]));
    // caesium is read as caesium (purr 0.9 displays Element::Cs as "Ac")
    let o = run("Pd(PPh3)Br(Ph)(HNMe2)", &["deprotonation HNMe2 Cs2CO3"]);
    assert!(
        sides(&o).1.contains(&"2 Cs+".to_string()),
        "{:?}",
        sides(&o)
    );
}

#[test]
fn substrates_carry_hazards_into_the_equation() {
    // methyl iodide: Regulation (EC) No 1272/2008 Annex VI lists H351 among its statements
    let o = run("IrCl(CO)(PPh3)2", &["oxidative-addition MeI"]);
    let h = &o.equation.enters[0].species.hazards;
    assert!(h.iter().any(|x| x == "H351"), "{h:?}");
    let o = run("IrCl(CO)(PPh3)2", &["oxidative-addition H2"]);
    assert!(o.equation.enters[0]
        .species
        .hazards
        .iter()
        .any(|x| x == "H220"));
}

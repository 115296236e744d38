//! Steps that respect positions, against worked textbook cases: Crabtree, The Organometallic
//! Chemistry of the Transition Metals, 6th ed., Wiley 2014, ch. 6-7 (oxidative addition and
//! reductive elimination, migratory insertion), and Hartwig, Organotransition Metal
//! Chemistry, University Science Books 2010, ch. 6-9.

use std::sync::OnceLock;

use nonet::catalogue::Catalogue;
use nonet::chem::geometry;
use nonet::chem::steps::{take, Step, StepError};
use nonet::chem::{self, Complex};

fn cat() -> &'static Catalogue {
    static CAT: OnceLock<Catalogue> = OnceLock::new();
    CAT.get_or_init(Catalogue::bundled)
}

fn parse(f: &str) -> Complex {
    chem::parse(f, cat()).unwrap_or_else(|e| panic!("{f}: {e}"))
}

fn step(f: &str, s: &str) -> Result<Complex, StepError> {
    let c = parse(f);
    let st = Step::parse(s).unwrap_or_else(|e| panic!("{s}: {e}"));
    take(&c, &st, cat()).map(|o| o.product)
}

/// The trans partners of each ligand in the product's fixed isomer: ("H", "Cl") etc.
fn trans_pairs(c: &Complex) -> Vec<(String, String)> {
    let r = chem::count(c);
    let p = geometry::place(c, &r).expect("placed");
    let iso = p
        .fixed()
        .unwrap_or_else(|| panic!("{}: isomer not fixed", c.formula(false)));
    let mut out: Vec<(String, String)> = p
        .frame
        .poly
        .trans
        .iter()
        .map(|&(a, b)| {
            let ka = p.frame.seat_label(&iso.seats[a as usize]);
            let kb = p.frame.seat_label(&iso.seats[b as usize]);
            if ka <= kb {
                (ka, kb)
            } else {
                (kb, ka)
            }
        })
        .collect();
    out.sort();
    out
}

fn pair(a: &str, b: &str) -> (String, String) {
    if a <= b {
        (a.into(), b.into())
    } else {
        (b.into(), a.into())
    }
}

#[test]
fn h2_adds_cis_to_vaskas_complex_with_the_phosphines_kept_trans() {
    // Crabtree 2014, ch. 6: concerted addition of H2 to trans-IrCl(CO)(PPh3)2 gives the cis
    // dihydride; the P-Ir-P axis stays, Cl and CO bend back, each now trans to H
    let p = step("trans-IrCl(CO)(PPh3)2", "oxidative-addition H2").expect("adds");
    let t = trans_pairs(&p);
    assert!(t.contains(&pair("PPh3", "PPh3")), "{t:?}");
    assert!(
        t.contains(&pair("Cl", "H")) && t.contains(&pair("CO", "H")),
        "{t:?}"
    );
}

#[test]
fn methyl_iodide_adds_trans_by_the_sn2_path() {
    // Crabtree 2014, ch. 6: MeI adds to Vaska's complex by the SN2 path, Me and I trans,
    // the square plane of the start kept
    let p = step("trans-IrCl(CO)(PPh3)2", "oxidative-addition MeI").expect("adds");
    let t = trans_pairs(&p);
    assert!(t.contains(&pair("I", "Me")), "{t:?}");
    assert!(
        t.contains(&pair("PPh3", "PPh3")) && t.contains(&pair("CO", "Cl")),
        "{t:?}"
    );
    // the chemist may ask for the other course; several cis products remain possible
    let o = take(
        &parse("trans-IrCl(CO)(PPh3)2"),
        &Step::parse("oxidative-addition MeI cis").expect("step"),
        cat(),
    )
    .expect("adds");
    assert!(
        o.notes.iter().any(|n| n.starts_with("cis addition")),
        "{:?}",
        o.notes
    );
    assert_eq!(o.step.to_string(), "oxidative-addition MeI cis");
}

#[test]
fn aryl_halides_add_cis_to_pd0() {
    // Hartwig 2010, ch. 6: ArX adds to PdL2 to give cis-[PdAr(X)L2] first
    let p = step("Pd(PPh3)2", "oxidative-addition PhBr").expect("adds");
    let t = trans_pairs(&p);
    assert!(
        t.contains(&pair("Br", "PPh3")) && t.contains(&pair("PPh3", "Ph")),
        "{t:?}"
    );
}

#[test]
fn reductive_elimination_needs_the_two_groups_cis() {
    // Crabtree 2014, ch. 6; Hartwig 2010, ch. 8 (trans-PdMe2L2 must isomerize before it
    // eliminates ethane): a trans pair is refused with the isomerization offered
    for metal in ["Pt", "Pd"] {
        let trans = format!("trans-{metal}Me2(PPh3)2");
        match step(&trans, "reductive-elimination Me Me") {
            Err(StepError::Refused(why)) => {
                assert!(
                    why.contains("cis") && why.contains("isomerization"),
                    "{why}"
                );
            }
            other => panic!("{trans}: {other:?}"),
        }
        let cis = format!("cis-{metal}Me2(PPh3)2");
        step(&cis, "reductive-elimination Me Me").expect("cis eliminates");
        // the offered step works
        let iso = step(&trans, "isomerization cis").expect("isomerizes");
        let again = take(
            &iso,
            &Step::parse("reductive-elimination Me Me").expect("step"),
            cat(),
        );
        assert!(again.is_ok(), "{again:?}");
    }
    // Pt(IV): fac-[PtIMe3(PMe3)2] loses ethane from two cis methyls (Crabtree 2014, ch. 6)
    let p = step("fac-PtMe3I(PMe3)2", "reductive-elimination Me Me").expect("eliminates");
    assert!(p.stereo.is_some(), "the product isomer is named");
}

#[test]
fn migratory_insertion_needs_cis_and_leaves_the_vacancy_where_the_alkyl_was() {
    // Crabtree 2014, ch. 7: CO and the migrating alkyl must be cis
    match step("trans-[PtMe(CO)(PPh3)2]+", "migratory-insertion CO Me") {
        Err(StepError::Refused(why)) => assert!(why.contains("cis"), "{why}"),
        other => panic!("{other:?}"),
    }
    // MeMn(CO)5: the acyl sits where the inserting CO was, cis to the empty site; the CO
    // trans to the old methyl becomes the apex of the square pyramid
    let p = step("Mn(CO)5Me", "migratory-insertion CO Me").expect("inserts");
    let r = chem::count(&p);
    let placed = geometry::place(&p, &r).expect("placed");
    let iso = placed.fixed().expect("one isomer");
    assert_eq!(placed.frame.poly.symbol, "SPY-5");
    assert_eq!(
        placed.frame.seat_label(&iso.seats[0]),
        "CO",
        "CO at the apex"
    );
}

#[test]
fn substitution_and_dissociation_keep_the_other_positions() {
    // the trans effect labilizes the CO trans to CO, not the one trans to the phosphine
    // (Miessler, Fischer & Tarr 2014, ch. 12), so the new phosphine comes in cis
    let p = step("Cr(CO)5(PPh3)", "substitution CO PMe3").expect("swaps");
    let t = trans_pairs(&p);
    assert!(!t.contains(&pair("PMe3", "PPh3")), "{t:?}");
    // a square-pyramidal fragment after dissociation, the phosphine in the base
    let p = step("Cr(CO)5(PPh3)", "dissociation CO").expect("dissociates");
    let r = chem::count(&p);
    let placed = geometry::place(&p, &r).expect("placed");
    let iso = placed.fixed().expect("one isomer");
    assert_eq!(placed.frame.seat_label(&iso.seats[0]), "CO");
}

#[test]
fn isomerization_names_a_real_isomer() {
    match step("cis-PtCl2(NH3)2", "isomerization fac") {
        Err(StepError::Refused(why)) => assert!(why.contains("names no isomer"), "{why}"),
        other => panic!("{other:?}"),
    }
    match step("cis-PtCl2(NH3)2", "isomerization cis") {
        Err(StepError::Refused(why)) => assert!(why.contains("already"), "{why}"),
        other => panic!("{other:?}"),
    }
    // SP-4-1 of [MA2B2] is the trans isomer, and the product carries the short name
    let p = step("cis-PtCl2(NH3)2", "isomerization SP-4-1").expect("isomerizes");
    assert_eq!(p.stereo.as_deref(), Some("trans"));
}

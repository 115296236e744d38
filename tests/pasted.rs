//! Formulas as they are pasted from papers and PDFs: Unicode normalized at the edge, isomer
//! and configuration prefixes kept, oxidation-state labels read as labels, salts with both ions
//! written, solvent after a dot; and the readings fixed on the way (T-shaped d8, Werner odd
//! counts, spin wording).

mod common;

use common::cat;
use nonet::chem::{count, parse, Frac, Report};

fn read(f: &str) -> (String, Report) {
    let c = parse(f, cat()).unwrap_or_else(|e| panic!("{f}: {}", e.render()));
    (c.formula(false), count(&c))
}

fn counts(f: &str) -> (i64, i64, i64) {
    let (_, r) = read(f);
    let m = &r.metals[0];
    let int = |x: Frac| x.as_int().unwrap_or(i64::MIN);
    (
        int(m.electron_count),
        int(m.oxidation_state),
        int(m.d_electrons),
    )
}

#[test]
fn pdf_unicode_reads_like_ascii() {
    // the same complexes written plainly and as a PDF renders them; counts: Crabtree, The
    // Organometallic Chemistry of the Transition Metals, 6th ed., Wiley 2014, ch. 2
    for (pasted, plain) in [
        ("(η⁶-C₆H₆)Cr(CO)₃", "(eta6-C6H6)Cr(CO)3"),
        ("[Co(NH₃)₆]³⁺", "[Co(NH3)6]3+"),
        ("Fe(CO)₄²⁻", "[Fe(CO)4]2-"),
        ("Ru₃(CO)₁₂", "Ru3(CO)12"),
        ("[Cp₂Co]\u{2212}", "[Cp2Co]-"),
        ("Ｆｅ(CO)5", "Fe(CO)5"),
        ("Fe(CO)\u{200b}5", "Fe(CO)5"),
        ("Cp\u{a0}Fe(CO)2Me", "CpFe(CO)2Me"),
        ("[Pd(κ²-N,N-bpy)Cl₂]", "[Pd(bpy)Cl2]"),
        ("(µ-Cl)2Rh2(CO)4", "(mu-Cl)2Rh2(CO)4"),
    ] {
        let (a, ra) = read(pasted);
        let (b, rb) = read(plain);
        assert_eq!(a, b, "{pasted} vs {plain}");
        assert_eq!(
            ra.metals[0].electron_count, rb.metals[0].electron_count,
            "{pasted}"
        );
    }
}

#[test]
fn the_caret_stays_under_what_was_typed() {
    // a pasted formula with an unknown ligand after Unicode: the column is the user's
    let e = parse("(η⁶-C₆H₆)Cr(CO)₂Xq", cat()).expect_err("unknown ligand");
    assert_eq!(e.column, 16, "{}", e.render()); // 0-based: the X
}

#[test]
fn isomer_and_configuration_prefixes_are_kept() {
    // IUPAC Recommendations 2005 (Red Book) IR-9.3 names isomers with such prefixes; the
    // count does not depend on them (common practice)
    for (f, printed) in [
        ("cis-PtCl2(NH3)2", "cis-[Pt(NH3)2Cl2]"),
        ("trans-PtCl2(NH3)2", "trans-[Pt(NH3)2Cl2]"),
        ("rac-Cp2ZrCl2", "rac-[Zr(η5-Cp)2Cl2]"),
        ("(R,R)-Ru(BINAP)Cl2", "(R,R)-[Ru(BINAP)Cl2]"),
        ("Δ-[Ru(bpy)3]2+", "Δ-[Ru(κ2-bpy)3]2+"),
        ("fac-Ir(CO)3Cl3", "fac-[Ir(CO)3Cl3]"),
    ] {
        let (got, _) = read(f);
        assert_eq!(got, printed);
        // and the printed form reads back to itself
        let (again, _) = read(&got);
        assert_eq!(again, got);
    }
}

#[test]
fn oxidation_state_labels_are_labels() {
    // Cu(I)Cl is copper(I) chloride, never copper with an iodide (common practice)
    let (f, r) = read("Cu(I)Cl");
    assert_eq!(f, "[CuCl]");
    assert!(
        r.notes.iter().any(|n| n.contains("agrees")),
        "{:?}",
        r.notes
    );
    assert_eq!(counts("[Ru(II)(bpy)₃]²⁺"), (18, 2, 6));
    let (_, r) = read("Fe(II)Cl3");
    assert!(
        r.notes.iter().any(|n| n.contains("label, but")),
        "a label that disagrees is said: {:?}",
        r.notes
    );
    // a multiplier after "(I)" keeps it an iodide as written
    assert_eq!(read("Pd(I)2").0, "[PdI2]");
}

#[test]
fn salts_as_papers_write_them() {
    // cobaltocenium 18 e Co(III) d6; ferrocenium 17 e; [Rh(nbd)2]+ 16 e Rh(I) d8 (Crabtree
    // 2014, ch. 2 and 5); [Co(CO)4]- 18 e Co(-I) (Hartwig 2010, ch. 1)
    assert_eq!(counts("[Cp₂Co][PF₆]"), (18, 3, 6));
    assert_eq!(counts("[Cp2Co]+[PF6]−"), (18, 3, 6));
    assert_eq!(counts("[Cp2Fe][PF6]"), (17, 3, 5));
    assert_eq!(counts("[Rh(nbd)₂][BArF₄]"), (16, 1, 8));
    assert_eq!(counts("[NBu4][AuCl4]"), (16, 3, 8));
    assert_eq!(counts("K(18-crown-6)[Co(CO)4]"), (18, -1, 10));
    assert_eq!(counts("[PPN][Co(CO)4]"), (18, -1, 10));
    assert_eq!(counts("[Fe(H2O)6](BF4)2"), (18, 2, 6));
    assert_eq!(counts("[Cu(MeCN)4][B(C6F5)4]"), (18, 1, 10));
    // a charge written on the complex ion that the counter-ions contradict is refused
    assert!(parse("[Cp2Co]2+[PF6]-", cat()).is_err());
}

#[test]
fn solvent_after_the_dot() {
    // PdCl2(PPh3)2 16 e; ZrCl4(THF)2 12 e Zr(IV); CrCl3(THF)3 15 e (common practice)
    assert_eq!(counts("PdCl2·2PPh3"), (16, 2, 8));
    assert_eq!(counts("ZrCl4·2THF"), (12, 4, 0));
    assert_eq!(counts("CrCl3 • 3THF"), (15, 3, 3));
    // the metal is already well served: the water stays in the lattice
    let (f, r) = read("K[PtCl3(C2H4)]·H2O");
    assert_eq!(f, "[Pt(η2-C2H4)Cl3]-");
    assert!(
        r.notes.iter().any(|n| n.contains("lattice")),
        "{:?}",
        r.notes
    );
    // an unknown count is lattice solvent
    let (f, _) = read("CuCl·xH2O");
    assert_eq!(f, "[CuCl]");
}

#[test]
fn three_coordinate_d8_is_t_shaped_and_aims_at_16() {
    // the 14-e RhCl(PPh3)2 of Wilkinson's cycle: T-shaped, 2 e short of 16 (Hartwig,
    // Organotransition Metal Chemistry, 2010, ch. 15)
    let (_, r) = read("Rh(PPh3)2Cl");
    let m = &r.metals[0];
    assert_eq!(m.target, 16);
    assert_eq!(m.electrons_short, Frac::int(2));
    assert_eq!(r.geometry, "T-shaped");
}

#[test]
fn werner_odd_counts_are_not_radicals_and_diamagnetic_centres_pair_every_electron() {
    // [Co(NH3)6]2+ (19 e) is a stable paramagnetic ion (common practice)
    let (_, r) = read("[Co(NH3)6]2+");
    assert!(
        !r.metals[0].notes.iter().any(|n| n.ends_with("a radical")),
        "{:?}",
        r.metals[0].notes
    );
    // an organometallic 17-e species still is one
    let (_, r) = read("[Cp2Fe]+");
    assert!(r.metals[0].notes.iter().any(|n| n.contains("radical")));
    let (_, r) = read("Rh(PPh3)2Cl");
    assert!(
        !r.spin_basis.0.contains("all but one"),
        "{}",
        r.spin_basis.0
    );
}

#[test]
fn brackets_labels_bonds_and_cations_as_papers_print_them() {
    // square brackets as parentheses around a ligand; Pd(PtBu3)2 14 e Pd(0) (Hartwig 2010,
    // ch. 2)
    assert_eq!(counts("Pd[P(t-Bu)₃]₂"), (14, 0, 10));
    // a configuration label before a ligand; a bond dash after the metal
    assert_eq!(counts("Ru(OAc)2[(R)-BINAP]"), (18, 2, 6));
    assert_eq!(counts("Cp∗₂Sc–CH₃"), (14, 3, 0));
    // a Roman numeral written flat against the symbol; FeI2 keeps its iodides
    assert_eq!(counts("[FeIII(CN)6]3−"), (17, 3, 5));
    assert_eq!(counts("FeI2").1, 2);
    // organic cations written the other way round (common practice)
    assert_eq!(counts("Et4N[Mn(CO)5]"), (18, -1, 8));
    assert_eq!(counts("(Et₄N)₂[NiCl₄]"), (16, 2, 8));
}

/// A printed formula the way a PDF renders it: multipliers as subscripts, the charge as
/// superscripts with U+207A/U+207B, label digits as superscripts (η⁵), hyphens as U+2010.
fn as_pdf(printed: &str) -> String {
    const SUB: [char; 10] = ['₀', '₁', '₂', '₃', '₄', '₅', '₆', '₇', '₈', '₉'];
    const SUP: [char; 10] = ['⁰', '¹', '²', '³', '⁴', '⁵', '⁶', '⁷', '⁸', '⁹'];
    // the charge after the last ']'
    let (body, charge) = match printed.rfind(']') {
        Some(i) if i + 1 < printed.len() => printed.split_at(i + 1),
        _ => (printed, ""),
    };
    let mut out = String::new();
    let mut braces = 0;
    let mut in_label = false;
    let mut prev = ' ';
    for c in body.chars() {
        match c {
            '{' => braces += 1,
            '}' => braces -= 1,
            _ => {}
        }
        let digit = c.to_digit(10);
        let mapped = if braces > 0 {
            c
        } else if let Some(d) = digit {
            if in_label {
                SUP[d as usize]
            } else if prev.is_alphabetic() || prev == ')' || prev == ']' || prev.is_ascii_digit() {
                SUB[d as usize]
            } else {
                c
            }
        } else if c == '-' {
            '\u{2010}'
        } else {
            c
        };
        in_label = matches!(c, 'η' | 'κ' | 'μ') || (in_label && digit.is_some());
        if digit.is_none() || !in_label {
            prev = c;
        }
        out.push(mapped);
    }
    for c in charge.chars() {
        out.push(match c {
            '+' => '⁺',
            '-' => '⁻',
            d => d.to_digit(10).map_or(d, |d| SUP[d as usize]),
        });
    }
    out
}

proptest::proptest! {
    #![proptest_config(proptest::prelude::ProptestConfig {
        cases: 300,
        failure_persistence: None,
        ..proptest::prelude::ProptestConfig::default()
    })]

    #[test]
    fn printed_formulas_read_back_from_pdf_unicode(c in common::arb_complex()) {
        use proptest::prelude::*;
        let first = parse(&c.formula(false), cat()).map_err(|e| TestCaseError::fail(e.render()))?;
        let printed = first.formula(false);
        let pdf = as_pdf(&printed);
        let back = parse(&pdf, cat())
            .map_err(|e| TestCaseError::fail(format!("{pdf}: {}", e.render())))?;
        prop_assert_eq!(&back, &first, "{} as {}", printed, pdf);
    }
}

#[test]
fn the_pdf_rendering_is_what_a_pdf_gives() {
    assert_eq!(as_pdf("[Fe(η5-Cp)2]+"), "[Fe(η⁵\u{2010}Cp)₂]⁺");
    assert_eq!(as_pdf("[Co(NH3)6]3+"), "[Co(NH₃)₆]³⁺");
}

#[test]
fn acids_and_charged_counter_ions() {
    // H[AuCl4] is tetrachloroauric acid, Au(III) d8 16 e; H2[PtCl6] Pt(IV) d6 (common
    // practice); HCo(CO)4 stays a hydride, Co(I) 18 e (Hartwig 2010, ch. 3)
    assert_eq!(counts("H[AuCl₄]"), (16, 3, 8));
    assert_eq!(counts("H₂[PtCl₆]"), (18, 4, 6));
    assert_eq!(counts("HCo(CO)4"), (18, 1, 8));
    // a charge printed on both ions of a salt
    assert_eq!(counts("[CpRu(NCCH₃)₃]⁺PF₆⁻"), (18, 2, 6));
    // a narrow space between a bracket and its count
    assert_eq!(counts("[Ir(cod)Cl]\u{202f}₂"), (16, 1, 8));
}

#[test]
fn salts_without_brackets_and_joined_prefixes() {
    // [Ru(bpy)3]Cl2 and [Co(NH3)6]Cl3 as often typed without brackets: 18 e each (common
    // practice); the anions would take the metal past 18 e, so they are counter-ions
    assert_eq!(counts("Ru(bpy)₃Cl₂"), (18, 2, 6));
    assert_eq!(counts("Co(NH3)6Cl3"), (18, 3, 6));
    assert_eq!(counts("Cu(MeCN)₄PF₆"), (18, 1, 10));
    let (_, r) = read("Ru(bpy)3Cl2");
    assert!(
        r.notes.iter().any(|n| n.contains("counter-ion")),
        "{:?}",
        r.notes
    );
    // a bound chloride that keeps the count at 18 stays bound
    assert_eq!(counts("CpFe(CO)2Cl"), (18, 2, 6));
    // several isomer descriptors joined by a comma
    assert_eq!(
        read("mer,trans-ReOCl₃(PPh₃)₂").0,
        "mer,trans-[Re(PPh3)2Cl3(κ1-O)]"
    );
}

#[test]
fn a_cubane_keeps_its_written_mu3_sulfides_and_terminal_thiolates() {
    // [Fe4S4(SR)4]2-: four μ3-S, four terminal thiolates, Fe2.5+ on average (Holm, Kennepohl
    // & Solomon, Chem. Rev. 1996, 96, 2239)
    let (f, r) = read("[Fe4(μ3-S)4(SMe)4]2-");
    assert_eq!(f, "[Fe4(SMe)4(μ3-S)4]2-");
    assert_eq!(r.metals[0].oxidation_state, Frac::new(5, 2));
}

#[test]
fn paddlewheel_carboxylates_bridge() {
    // M2(O2CR)4 paddlewheels: each carboxylate bridges the two metals κ1:κ1; Mo2(OAc)4 has a
    // quadruple bond, Rh2(OAc)4 a single one (Cotton, Murillo & Walton, Multiple Bonds between
    // Metal Atoms, 3rd ed., 2005)
    let (f, r) = read("Rh2(OAc)4");
    assert_eq!(f, "[Rh2(μ-OAc)4]");
    assert_eq!(r.metal_metal_bonds, Some(1));
    assert!(r.notes.iter().any(|n| n.contains("κ1:κ1")), "{:?}", r.notes);
    let (f, r) = read("Mo2(OAc)4");
    assert_eq!(f, "[Mo2(μ-OAc)4]");
    assert_eq!(r.metal_metal_bonds, Some(4));
}

#[test]
fn inline_charges_and_first_row_allyls() {
    // cobaltocenium hexafluorophosphate as a paper prints it, 18 e Co(III) (Crabtree 2014,
    // ch. 5)
    assert_eq!(counts("Cp₂Co⁺PF₆⁻"), (18, 3, 6));
    // (η3-allyl)Co(CO)3: 18 e Co(I); first-row Co(I) is not pushed down to square-planar 16 e
    // (Hartwig 2010, ch. 1)
    assert_eq!(counts("Co(C₃H₅)(CO)₃"), (18, 1, 8));
}

#[test]
fn pdf_spacing_labels_in_parentheses_and_ligand_first_adducts() {
    // spaces a PDF puts inside tokens; Wilkinson's catalyst 16 e, Pd(PPh3)4 18 e (common
    // practice); a space before a charge still marks the charge
    assert_eq!(counts("RhCl(PPh 3 ) 3"), (16, 1, 8));
    assert_eq!(counts("Pd(PPh 3 ) 4"), (18, 0, 10));
    assert_eq!(counts("Co(NH3)6 3+"), (18, 3, 6));
    // an enantiomer label inside the ligand's parentheses: oxaliplatin, Pt(II) 16 e
    assert_eq!(counts("[Pt((1R,2R)-dach)(ox)]"), (16, 2, 8));
    // the ligand written before the dot: (Me2S)AuCl, Au(I) 14 e (common practice)
    assert_eq!(counts("Me₂S·AuCl"), (14, 1, 10));
}

#[test]
fn an_adduct_with_no_metal_on_either_side_is_refused_not_looped() {
    // "AcO" is acetate, whose key spells actinium: no metal on either side of the dot
    for f in ["AcO·AcO", "AcO·Me2S", "Me2S·AcO", "THF·THF"] {
        assert!(parse(f, cat()).is_err(), "{f}");
    }
}

fn notes_of(f: &str) -> Vec<String> {
    read(f).1.notes
}

#[test]
fn halometallate_acids_are_acids_and_carbonyl_hydrides_stay_hydrides() {
    // H2PtCl6 is chloroplatinic acid, Pt(IV) d6; HAuCl4 is Au(III) d8; HCo(CO)4 is a Co(I)
    // hydride (Greenwood & Earnshaw, Chemistry of the Elements, 2nd ed., 1997, ch. 25-28)
    assert_eq!(counts("H2PtCl6"), (18, 4, 6));
    assert_eq!(counts("H₂PtCl₆·6H₂O"), (18, 4, 6));
    assert_eq!(counts("HAuCl4·3H2O"), (16, 3, 8));
    assert!(notes_of("H2PtCl6")
        .iter()
        .any(|n| n.contains("acid") && n.contains("H2[PtCl6]")));
    assert_eq!(counts("HCo(CO)4"), (18, 1, 8));
    assert!(!notes_of("HCo(CO)4").iter().any(|n| n.contains("acid")));
    // written after the metal, the hydrogens are hydrides as typed
    assert_eq!(counts("PtH2Cl6").1, 8);
}

#[test]
fn a_charge_split_by_a_pdf_is_one_charge() {
    // "]²⁺" copied as "]2 +": [Ru(bpy)3]2+, Ru(II) d6 (Juris et al., Coord. Chem. Rev. 1988,
    // 84, 85)
    assert_eq!(counts("[Ru(bpy)3]2 +"), (18, 2, 6));
    assert_eq!(counts("[Ru(bpy)3] 2+"), (18, 2, 6));
    // a bracketed dimer with no sign stays a dimer
    assert_eq!(read("[CpFe(CO)2]2").1.metals.len(), 2);
}

#[test]
fn two_complex_ions_take_usual_oxidation_states_and_leave_lattice_water_out() {
    use nonet::chem::parse_ions;
    // [Co(NH3)6][CuCl5]: Co(III) and a trigonal-bipyramidal Cu(II) pentachloride (Raymond,
    // Meek & Ibers, Inorg. Chem. 1968, 7, 1111; from memory)
    let ions = parse_ions("[Co(NH₃)₆][CuCl₅]", cat()).expect("two ions");
    let os: Vec<_> = ions
        .iter()
        .map(|c| count(c).metals[0].oxidation_state)
        .collect();
    assert_eq!(os, vec![Frac::int(3), Frac::int(2)]);
    // the same salt with lattice water after the dot (Raymond, Corfield & Ibers, Inorg.
    // Chem. 1968, 7, 1362; from memory): Cr(III) and [Ni(CN)5]3-
    let ions = parse_ions("[Cr(en)₃][Ni(CN)₅]·1.5H₂O", cat()).expect("two ions");
    assert_eq!(ions.len(), 2);
    let r = count(&ions[1]);
    assert_eq!(r.metals[0].oxidation_state, Frac::int(2));
    assert!(r.notes.iter().any(|n| n.contains("lattice solvent")));
}

#[test]
fn braces_group_fragments_but_keep_smiles() {
    // [{Rh(cod)}2(μ-Cl)2], Rh(I) d8 16 e (Crabtree, 6th ed., 2014, ch. 2)
    let (f, r) = read("[{Rh(cod)}₂(μ-Cl)₂]");
    assert_eq!(f, read("[Rh(cod)]2(μ-Cl)2").0);
    assert_eq!(r.metals[0].electron_count, Frac::int(16));
    // a ligand in braces is a group too (photoredox Ir(III), 18 e; Lowry et al., Chem. Mater.
    // 2005, 17, 5712; from memory)
    assert_eq!(counts("[Ir{dF(CF₃)ppy}₂(dtbbpy)]PF₆"), (18, 3, 6));
    // SMILES in braces is still SMILES: ethylene written as C=C
    let (f, _) = read("Ni(cod)({C=C})");
    assert!(f.contains("C2H4"), "{f}");
}

#[test]
fn isotope_labels_fragment_names_and_hyphenated_substituents() {
    // pertechnetate, Tc(VII) d0 (Greenwood & Earnshaw, 1997, ch. 24)
    assert_eq!(counts("Na[⁹⁹ᵐTcO₄]"), (16, 7, 0));
    assert!(notes_of("Na[⁹⁹ᵐTcO₄]")
        .iter()
        .any(|n| n.contains("⁹⁹ᵐTc") && n.contains("isotope")));
    // Fp = CpFe(CO)2: FpMe is Fe(II) d6, 18 e (Crabtree, 6th ed., 2014, ch. 2)
    assert_eq!(counts("FpMe"), (18, 2, 6));
    assert_eq!(read("FpMe").0, read("CpFe(CO)2Me").0);
    assert_eq!(read("Fp2").1.metals.len(), 2);
    // a hyphen between an atom and its substituents: Pd(PtBu3)2, Pd(0) 14 e (Hartwig,
    // Organotransition Metal Chemistry, 2010, ch. 1)
    assert_eq!(read("Pd(P‑tBu₃)₂").0, read("Pd(PtBu3)2").0);
    assert_eq!(
        read("[Me₂Si(C₅Me₄)(N-tBu)]TiCl₂").0,
        read("Me2Si(C5Me4)(NtBu)TiCl2").0
    );
}

#[test]
fn pincers_say_which_form_was_read() {
    // Milstein's PNP: the neutral pyridine pincer in Ru(H)Cl(CO)(PNP), Ru(II) 18 e; its
    // dearomatized form PNP* gives the 16-e Ru(H)(CO)(PNP*) (Gunanathan & Milstein, Chem.
    // Rev. 2014, 114, 12024; from memory)
    assert_eq!(counts("Ru(PNP)(CO)HCl"), (18, 2, 6));
    assert_eq!(counts("Ru(PNP*)(CO)H"), (16, 2, 6));
    let n = notes_of("Ru(PNP)(CO)HCl");
    assert!(
        n.iter()
            .any(|x| x.contains("neutral form") && x.contains("write PNP* for that")),
        "{n:?}"
    );
    let n = notes_of("Ru(PNP*)(CO)H");
    assert!(n.iter().any(|x| x.contains("anionic form")), "{n:?}");
}

#[test]
fn a_ligand_key_that_spells_an_element_reads_the_plausible_way() {
    // Ac is acetyl and Np neopentyl when the element would stand bare before the real metal:
    // MeC(O)Mn(CO)5, Mn(I) 18 e, the product of CO insertion into MeMn(CO)5 (Crabtree, The
    // Organometallic Chemistry of the Transition Metals, 6th ed., 2014, ch. 7)
    assert_eq!(read("AcMn(CO)5").0, read("Mn(CO)5(COMe)").0);
    assert_eq!(counts("AcMn(CO)5"), (18, 1, 6));
    assert_eq!(read("NpMn(CO)5").0, read("Mn(CO)5(CH2tBu)").0);
    assert_eq!(counts("AcPd(PPh3)2Cl"), (16, 2, 8));
    // alone, the symbol is the element: PrCl3 is Pr(III) (common practice)
    let (_, r) = read("PrCl3");
    assert_eq!(r.metals[0].symbol, "Pr");
    assert_eq!(r.metals[0].oxidation_state, Frac::int(3));
    // after a metal with nothing more to bind, the ligand (Cp2ZrPr2, Zr(IV) d0 16 e)
    assert_eq!(counts("Cp2ZrPr2"), (16, 4, 0));
    assert!(!notes_of("Cp2ZrPr2").iter().any(|n| n.contains("could be")));
    // both readings possible: the note says which was taken; where the ligand reading would
    // leave Zr(V) d-1, the element reading is taken instead
    let n = notes_of("Cp2ZrPrCl2");
    assert!(
        n.iter()
            .any(|x| x.contains("'Pr' could be") && x.contains("praseodymium")),
        "{n:?}"
    );
    assert!(read("Cp2ZrPrCl2").1.impossible().is_none());
}

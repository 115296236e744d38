//! Positions of real complexes: the polyhedron nonet chooses, the IUPAC descriptors of their
//! isomers (IUPAC, Nomenclature of Inorganic Chemistry, Recommendations 2005, IR-9.3, and
//! its worked examples), prefixes read and honoured, and every descriptor read back.

use std::sync::OnceLock;

use nonet::catalogue::Catalogue;
use nonet::chem::{self, geometry};

fn cat() -> &'static Catalogue {
    static CAT: OnceLock<Catalogue> = OnceLock::new();
    CAT.get_or_init(Catalogue::bundled)
}

fn placed(formula: &str) -> geometry::Placed {
    let c = chem::parse(formula, cat()).unwrap_or_else(|e| panic!("{formula}: {e}"));
    let r = chem::count(&c);
    geometry::place(&c, &r).unwrap_or_else(|e| panic!("{formula}: {e}"))
}

fn fixed(formula: &str) -> Option<String> {
    let c = chem::parse(formula, cat()).unwrap_or_else(|e| panic!("{formula}: {e}"));
    let r = geometry::counted(&c);
    r.metals[0].isomer.clone()
}

#[test]
fn polyhedra_follow_count_and_ligands() {
    // Miessler, Fischer & Tarr, 5th ed., 2014, ch. 9; Crabtree, 6th ed., 2014, ch. 1 and 5
    for (formula, symbol) in [
        ("Ni(CO)4", "T-4"),          // d10 tetrahedral
        ("PtCl2(NH3)2", "SP-4"),     // d8 square planar
        ("IrCl(CO)(PPh3)2", "SP-4"), // Vaska's complex
        ("Fe(CO)5", "TBPY-5"),       // d8 five-coordinate
        ("RuCl2(PPh3)3", "SPY-5"),   // d6 16 e square pyramid
        ("Cr(CO)6", "OC-6"),         // d6 octahedral
        ("CpMn(CO)3", "OC-6"),       // three-legged piano stool
        ("CpMo(CO)3Cl", "SPY-5"),    // four-legged piano stool
        ("Cp2ZrCl2", "T-4"),         // bent metallocene, pseudo-tetrahedral
        ("[Ru(bpy)3]2+", "OC-6"),    // tris-chelate
        ("[Ag(NH3)2]+", "L-2"),      // d10 linear
    ] {
        let p = placed(formula);
        assert_eq!(p.frame.poly.symbol, symbol, "{formula}");
    }
}

#[test]
fn iupac_worked_examples() {
    // IUPAC 2005, IR-9.3.3.4, examples 2 and 3: mer-[Co(NH3)3(NO2)3] is OC-6-21, fac is
    // OC-6-22; IR-2.2 example: fac-[CoCl3(NH3)3] is OC-6-22
    assert_eq!(fixed("mer-[Co(NH3)3(NO2)3]").as_deref(), Some("OC-6-21"));
    assert_eq!(fixed("fac-[Co(NH3)3(NO2)3]").as_deref(), Some("OC-6-22"));
    assert_eq!(fixed("fac-[CoCl3(NH3)3]").as_deref(), Some("OC-6-22"));
    // square planar: the digit trans to the ligand of priority 1 (IR-9.3.3.3); Cl before N
    assert_eq!(fixed("cis-[PtCl2(NH3)2]").as_deref(), Some("SP-4-2"));
    assert_eq!(fixed("trans-[PtCl2(NH3)2]").as_deref(), Some("SP-4-1"));
    // IR-9.3.4.8 example 5: [Ru(CO)ClH(PMe2Ph)3], Cl priority 1 trans to a phosphine, the
    // two phosphines in the plane trans to CO and to H: OC-6-24 (the digit trans to the
    // preferred in-plane phosphine is the larger, 4, by trans maximum difference); its two
    // enantiomers are C and A
    let p = placed("RuHCl(CO)(PMe2Ph)3");
    let mut d: Vec<&str> = p.descriptors.iter().map(String::as_str).collect();
    d.sort_unstable();
    assert!(
        d.contains(&"OC-6-24-A") && d.contains(&"OC-6-24-C"),
        "{d:?}"
    );
    assert_eq!(p.isomers.len(), 5);
}

#[test]
fn prefixes_fix_the_isomer_and_unknown_words_are_kept_aside() {
    // Vaska's complex as usually drawn: the phosphines trans, Cl trans to CO
    assert_eq!(
        fixed("trans-IrCl(CO)(PPh3)2").as_deref(),
        Some("SP-4-3"),
        "Cl (1) trans CO (3)"
    );
    assert_eq!(
        fixed("IrCl(CO)(PPh3)2"),
        None,
        "no prefix: both isomers stand"
    );
    // Δ and Λ pick the enantiomers of a tris-chelate
    let d = fixed("Δ-[Co(en)3]3+").expect("fixed");
    let l = fixed("Λ-[Co(en)3]3+").expect("fixed");
    assert_ne!(d, l);
    assert!(d.ends_with('Δ') && l.ends_with('Λ'), "{d} {l}");
    // fac and mer of a tris-cyclometalate: the three C donors on a face or a meridian
    assert_eq!(fixed("fac-Ir(ppy)3"), None, "fac leaves Δ and Λ");
    let p = placed("fac-Ir(ppy)3");
    assert_eq!(p.chosen.len(), 2);
    // a prefix that does not fit is set aside with a note, not an error
    let p = placed("trans-Mo(CO)3(PMe3)3");
    assert_eq!(p.chosen.len(), p.isomers.len());
    assert!(
        p.notes.iter().any(|n| n.contains("set aside")),
        "{:?}",
        p.notes
    );
}

#[test]
fn every_descriptor_reads_back_to_its_isomer() {
    // print each isomer's descriptor as a prefix, read the formula again, and get that one
    // isomer back (common practice: a descriptor names one configuration)
    for formula in [
        "PtCl2(NH3)2",
        "PtCl(NH3)(py)(MeCN)+",
        "Mo(CO)3(PMe3)3",
        "[Co(NH3)4Cl2]+",
        "RuHCl(CO)(PPh3)3",
        "RuCl2(CO)2(PPh3)2",
        "[Co(en)2Cl2]+",
        "Ir(ppy)3",
        "[Ru(bpy)2Cl2]",
        "Fe(CO)4(PPh3)",
        "RuCl2(PPh3)3",
        "Cp*Ir(ppy)Cl",
        "CpMo(CO)2(PPh3)Cl",
    ] {
        let p = placed(formula);
        for (i, d) in p.descriptors.iter().enumerate() {
            let again = placed(&format!("{d}-{formula}"));
            assert_eq!(
                again.chosen,
                vec![i],
                "{formula}: {d} (all: {:?})",
                p.descriptors
            );
        }
    }
}

#[test]
fn counts_report_positions_only_when_fixed() {
    let c = chem::parse("fac-Mo(CO)3(PMe3)3", cat()).expect("parses");
    let r = geometry::counted(&c);
    let m = &r.metals[0];
    assert_eq!(m.polyhedron, Some("OC-6"));
    assert_eq!(m.stereoisomers, Some(2));
    let mut all: Vec<u8> = Vec::new();
    for c in &m.contributions {
        let p = c.positions.as_ref().expect("fixed isomer has positions");
        assert_eq!(p.len(), 3, "three copies");
        all.extend(p.iter().flatten());
    }
    all.sort_unstable();
    assert_eq!(all, vec![1, 2, 3, 4, 5, 6]);
    let c = chem::parse("Mo(CO)3(PMe3)3", cat()).expect("parses");
    let r = geometry::counted(&c);
    assert!(r.metals[0].isomer.is_none());
    assert!(r.metals[0]
        .contributions
        .iter()
        .all(|c| c.positions.is_none()));
    // polynuclear: no polyhedron
    let c = chem::parse("Mn2(CO)10", cat()).expect("parses");
    assert_eq!(geometry::counted(&c).metals[0].polyhedron, None);
}

#[test]
fn a_chelate_spans_the_positions_its_bite_angle_reaches() {
    // [RhH(CO)2(diphosphine)] trigonal bipyramids: a diphosphine of bite near 90° (dppe, dppm)
    // spans an axial and an equatorial site, one near 120° (BISBI, βn about 113°) can span two
    // equatorial sites (Casey et al., J. Am. Chem. Soc. 1992, 114, 5535; from memory)
    let diequatorial = |f: &str| {
        let p = placed(f);
        assert_eq!(p.frame.poly.symbol, "TBPY-5", "{f}");
        p.isomers
            .iter()
            .filter(|iso| {
                (0..5u8).any(|a| {
                    (a + 1..5).any(|b| {
                        let (sa, sb) = (iso.seats[a as usize], iso.seats[b as usize]);
                        p.frame.poly.roles[a as usize] == "equatorial"
                            && p.frame.poly.roles[b as usize] == "equatorial"
                            && sa.1.is_some()
                            && sa.1 == sb.1
                    })
                })
            })
            .count()
    };
    assert_eq!(diequatorial("RhH(CO)2(dppe)"), 0);
    assert_eq!(diequatorial("RhH(CO)2(dppm)"), 0);
    assert!(diequatorial("RhH(CO)2(BISBI)") > 0);
    assert_eq!(placed("RhH(CO)2(dppe)").isomers.len(), 3);
    // no diphosphine of the catalogue reaches trans positions: Xantphos (βn about 111°, Kamer,
    // van Leeuwen & Reek, Acc. Chem. Res. 2001) stays cis in square-planar Pd(II)
    let p = placed("Pd(Xantphos)(Ph)Br");
    for iso in p.isomers.iter() {
        let ends: Vec<u8> = (0..4u8)
            .filter(|&i| iso.seats[i as usize].1.is_some())
            .collect();
        assert_eq!(ends.len(), 2);
        assert!(!p.frame.poly.is_trans(ends[0], ends[1]));
    }
}

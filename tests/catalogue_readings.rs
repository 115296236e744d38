//! The catalogue as the formula reader sees it: every ligand, in every binding mode, prints
//! and reads back as itself; the abbreviations chemists write find the right entry; and
//! complexes of the newer ligand classes (cyclometalated photocatalysts, ansa-metallocenes,
//! constrained-geometry ligands, corroles, bridging dicarboxylates, zwitterionic borates)
//! count as the literature counts them. Each count names its source.

mod common;

use common::cat;
use nonet::chem::element::ELEMENTS;
use nonet::chem::{count, parse, BoundLigand, Complex, MetalSite, Report};

fn report(f: &str) -> Report {
    let c = parse(f, cat()).unwrap_or_else(|e| panic!("{f}: {}", e.render()));
    count(&c)
}

/// Electron count, oxidation state and d count of the first metal.
fn first(f: &str) -> (i64, i64, i64) {
    let r = report(f);
    let m = &r.metals[0];
    (
        m.electron_count.as_int().unwrap_or(-99),
        m.oxidation_state.as_int().unwrap_or(-99),
        m.d_electrons.as_int().unwrap_or(-99),
    )
}

fn metal(symbol: &str) -> &'static nonet::chem::element::Element {
    ELEMENTS
        .iter()
        .find(|e| e.symbol == symbol)
        .unwrap_or_else(|| panic!("no element {symbol}"))
}

#[test]
fn every_ligand_in_every_mode_prints_and_reads_back() {
    // a key or alias that the reader splits differently (an element symbol, a shorter key, a
    // mode prefix) shows up here as a complex that reads back with another ligand or mode
    let mut bad = Vec::new();
    let mut checked = 0;
    for l in cat().ligands() {
        for (i, m) in l.modes.iter().enumerate() {
            let metals = usize::from(m.bridges.max(1));
            let mut b = BoundLigand::new(l.clone(), i, 1);
            b.pinned = true;
            let c = Complex {
                sites: (0..metals)
                    .map(|_| MetalSite {
                        element: metal("Pd"),
                        ligands: Vec::new(),
                    })
                    .collect(),
                shared: vec![b],
                charge: 0,
                notes: Vec::new(),
                stereo: None,
            };
            let mut c = c;
            c.canonicalize();
            let text = c.formula(false);
            match parse(&text, cat()) {
                Ok(back) => {
                    let found = back
                        .all_ligands()
                        .any(|(_, x)| x.ligand.key == l.key && x.mode().label == m.label);
                    if !found {
                        let got: Vec<String> = back
                            .all_ligands()
                            .map(|(_, x)| format!("{} {}", x.ligand.key, x.mode().label))
                            .collect();
                        bad.push(format!(
                            "{} {}: {text} reads back as {got:?}",
                            l.key, m.label
                        ));
                    }
                }
                Err(e) => bad.push(format!("{} {}: {text}: {}", l.key, m.label, e.message)),
            }
            checked += 1;
        }
    }
    assert!(checked > 600, "only {checked} modes");
    assert!(bad.is_empty(), "{bad:#?}");
}

#[test]
fn common_abbreviations_find_the_catalogue_entry() {
    // spellings used in papers for the same ligand (common practice)
    let table: &[(&str, &str)] = &[
        ("TFA", "O2CCF3"),
        ("tfa", "O2CCF3"),
        ("CF3CO2", "O2CCF3"),
        ("OAc", "OAc"),
        ("AcO", "OAc"),
        ("OTf", "OTf"),
        ("TfO", "OTf"),
        ("TsO", "OTs"),
        ("Tf2N", "NTf2"),
        ("BArF24", "BArF4"),
        ("dtbbpy", "dtbpy"),
        ("dmb", "dmbpy"),
        ("neocuproine", "dmphen"),
        ("dcype", "dcpe"),
        ("IDipp", "IPr"),
        ("tmhd", "thd"),
        ("dpm", "thd"),
        ("SL-J009-1", "CyPFtBu"),
        ("DM-SEGPHOS", "DMSEGPHOS"),
        ("tol-BINAP", "TolBINAP"),
        ("tBu-Xantphos", "tBuXantphos"),
        ("Me2Si(C5Me4)(NtBu)", "CGC"),
        ("C2H4(Ind)2", "EBI"),
    ];
    for &(name, key) in table {
        let l = cat()
            .get(name)
            .unwrap_or_else(|| panic!("'{name}' is not in the catalogue"));
        assert_eq!(l.key, key, "'{name}'");
    }
}

#[test]
fn cyclometalated_photocatalysts_are_ir3_d6_18e() {
    // ppy and its fluorinated forms are C^N LX ligands; fac-Ir(ppy)3 and the heteroleptic
    // [Ir(C^N)2(N^N)]+ photocatalysts are Ir(III), d6, 18 e (Prier, Rankic & MacMillan,
    // Chem. Rev. 2013, 113, 5322; Green, J. Organomet. Chem. 1995, 500, 127 for the classes)
    for f in [
        "Ir(ppy)3",
        "[Ir(ppy)2(bpy)]+",
        "[Ir(dF(CF3)ppy)2(dtbbpy)]+",
        "[Ir(dF(CF3)ppy)2(5,5'-dCF3bpy)]+",
        "Ir(dFppy)2(pic)",
        "Ir(piq)2(acac)",
    ] {
        assert_eq!(first(f), (18, 3, 6), "{f}");
    }
    // [Ru(bpz)3]2+ and [Ru(dmb)3]2+: Ru(II), d6, 18 e (Prier, Rankic & MacMillan 2013)
    for f in ["[Ru(bpz)3]2+", "[Ru(dmb)3]2+"] {
        assert_eq!(first(f), (18, 2, 6), "{f}");
    }
    // [Cu(dap)2]+ and [Cu(dmphen)2]+: tetrahedral Cu(I), d10, 18 e (common practice)
    for f in ["[Cu(dap)2]+", "[Cu(dmphen)2]+"] {
        assert_eq!(first(f), (18, 1, 10), "{f}");
    }
}

#[test]
fn ansa_and_constrained_geometry_ligands_count_like_their_open_relatives() {
    // a linked pair of η5 rings is L4X2, like Cp2: (ansa)ZrCl2 is Zr(IV), d0, 16 e like
    // Cp2ZrCl2 (Brintzinger, Fischer, Mülhaupt, Rieger & Waymouth, Angew. Chem. Int. Ed. Engl.
    // 1995, 34, 1143)
    for f in [
        "Cp2ZrCl2",
        "Me2Si(C5H4)2ZrCl2",
        "(EBI)ZrCl2",
        "Me2Si(Ind)2ZrCl2",
        "(Me2C(Cp)(Flu))ZrCl2",
    ] {
        assert_eq!(first(f), (16, 4, 0), "{f}");
    }
    let m = &report("(EBI)ZrCl2").metals[0];
    assert_eq!(m.cbc_class, "[ZrL4X4]");
    // the alkyl cation of metallocene polymerisation: 14 e Zr(IV)
    assert_eq!(first("[(EBI)ZrMe]+"), (14, 4, 0));
    // CGC: η5 ring (L2X) plus amide (X), L2X2; (CGC)TiCl2 is Ti(IV), d0, 12 e counting the
    // amide as X (McKnight & Waymouth, Chem. Rev. 1998, 98, 2587)
    assert_eq!(first("(CGC)TiCl2"), (12, 4, 0));
}

#[test]
fn corroles_are_trianionic() {
    // a corrolate is LX3: (tpfc)Mn(O) is Mn(V), d2, and (tpfc)Cr(O) Cr(V), d1 (Gross,
    // Golubkov, Simkhovich & Gray, Angew. Chem. Int. Ed. 2000, 39, 4045)
    assert_eq!(first("Mn(tpfc)(O)").1, 5);
    assert_eq!(first("Mn(tpfc)(O)").2, 2);
    assert_eq!(first("Cr(tpfc)(O)").1, 5);
    // porphyrinates stay dianionic: Fe(TMP)Cl is Fe(III), d5 (Green 1995)
    assert_eq!(first("Fe(TMP)Cl").1, 3);
}

#[test]
fn esp_bridges_the_dirhodium_core_like_four_acetates() {
    // Rh2(esp)2 is a paddlewheel like Rh2(OAc)4: Rh(II), d7, one Rh-Rh bond (Espino, Fiori,
    // Kim & Du Bois, J. Am. Chem. Soc. 2004, 126, 15378; Cotton & Walton, Multiple Bonds
    // between Metal Atoms, 2nd ed., 1993)
    for f in ["Rh2(esp)2", "Rh2(OAc)4", "Rh2(TFA)4", "Rh2(DOSP)4"] {
        let r = report(f);
        assert_eq!(r.metal_metal_bonds, Some(1), "{f}");
        let m = &r.metals[0];
        assert_eq!(m.oxidation_state.as_int(), Some(2), "{f}");
        assert_eq!(m.d_electrons.as_int(), Some(7), "{f}");
    }
}

#[test]
fn weakly_coordinating_anions_inside_and_outside_the_sphere() {
    // written after the bracket they stay counter-ions; written inside they are X ligands
    // (Krossing & Raabe, Angew. Chem. Int. Ed. 2004, 43, 2066)
    assert_eq!(report("[Cp2Fe]PF6").charge, 1);
    assert_eq!(report("[Ru(bpy)3](PF6)2").charge, 2);
    assert_eq!(report("[Rh(COD)(dppe)]BArF4").charge, 1);
    // Gagosz's catalyst Ph3PAu(NTf2): Au(I), d10
    let (_, os, d) = first("Au(PPh3)(NTf2)");
    assert_eq!((os, d), (1, 10));
    // the contact ion pair Cp2ZrMe(μ-Me)B(C6F5)3 read with the borate as an X ligand: Zr(IV)
    // (Yang, Stern & Marks, J. Am. Chem. Soc. 1994, 116, 10015)
    assert_eq!(first("Cp2ZrMe(MeB(C6F5)3)"), (16, 4, 0));
    // the zwitterion (cod)Rh(η6-C6H5BPh3): Rh(I), d8, 18 e (common practice)
    assert_eq!(first("Rh(cod)(BPh4)"), (18, 1, 8));
}

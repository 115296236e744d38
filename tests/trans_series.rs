//! The catalogue's trans effect and trans influence series against the published orders, and
//! the planner's note when a step or a swap puts a strong trans-influence ligand opposite a
//! weak one.

use std::sync::OnceLock;

use nonet::catalogue::Catalogue;
use nonet::chem::edit::Edit;
use nonet::chem::preview::preview;
use nonet::chem::steps::{take, Step};
use nonet::chem::trans::{trans_effect, trans_influence};
use nonet::chem::{self, Complex};

fn cat() -> &'static Catalogue {
    static CAT: OnceLock<Catalogue> = OnceLock::new();
    CAT.get_or_init(Catalogue::bundled)
}

fn parse(f: &str) -> Complex {
    chem::parse(f, cat()).unwrap_or_else(|e| panic!("{f}: {e}"))
}

fn te(key: &str) -> u8 {
    trans_effect(cat().get(key).unwrap_or_else(|| panic!("{key} missing")))
}

fn ti(key: &str) -> u8 {
    trans_influence(cat().get(key).unwrap_or_else(|| panic!("{key} missing")))
}

/// Each group is at or above the next; members of a group rank alike.
fn descending(series: &[&[&str]], rank: fn(&str) -> u8) {
    for w in series.windows(2) {
        for a in w[0] {
            for b in w[1] {
                assert!(
                    rank(a) > rank(b),
                    "{a} ({}) above {b} ({})",
                    rank(a),
                    rank(b)
                );
            }
        }
    }
    for group in series {
        let first = rank(group[0]);
        for k in *group {
            assert_eq!(rank(k), first, "{k} ranks with {}", group[0]);
        }
    }
}

#[test]
fn the_trans_effect_follows_the_kinetic_series() {
    // Pt(II) substitution: CN ≈ CO ≈ C2H4 ≈ NO > PR3 ≈ H > CH3 > C6H5 > NO2 > I ≈ SCN > Br >
    // Cl > py ≈ NH3 ≈ OH ≈ H2O (Basolo & Pearson, Mechanisms of Inorganic Reactions, 2nd ed.,
    // 1967, ch. 5; as in Miessler, Fischer & Tarr, Inorganic Chemistry, 5th ed., 2014; from
    // memory)
    descending(
        &[
            &["CN", "CO", "C2H4", "NO"],
            &["PEt3", "PPh3", "H"],
            &["Me"],
            &["Ph"],
            &["NO2"],
            &["I", "SCN"],
            &["Br"],
            &["Cl"],
            &["py", "NH3", "OH", "H2O"],
        ],
        te,
    );
}

#[test]
fn the_trans_influence_follows_the_ground_state_series() {
    // σ-bonded Si > H ≈ CH3 > PR3 > AsR3 > CO ≈ RNC ≈ C=C > Cl > NH3 > O donors (Appleton,
    // Clark & Manzer, Coord. Chem. Rev. 1973, 10, 335; order from memory)
    descending(
        &[
            &["SiMe3"],
            &["H", "Me"],
            &["PEt3", "PPh3"],
            &["AsPh3"],
            &["CO", "CNtBu", "C2H4"],
            &["Cl"],
            &["NH3", "py"],
            &["H2O"],
        ],
        ti,
    );
    // trans-[PtHCl(PiPr3)2] has its Pt-Cl bond 0.092 Å longer than trans-[PtCl2(PiPr3)2]
    // (Robertson, Tucker & Wickramasinghe, Aust. J. Chem. 1986, 39, 1495)
    assert!(ti("H") > ti("Cl"));
}

#[test]
fn every_place_in_a_series_names_its_source() {
    let mut placed = 0;
    for l in cat().ligands() {
        for r in [&l.trans_effect, &l.trans_influence].into_iter().flatten() {
            assert!(!r.source.trim().is_empty(), "{}", l.key);
            assert!((1..=10).contains(&r.rank), "{}", l.key);
            placed += 1;
        }
    }
    assert!(placed > 100, "{placed}");
}

fn notes(f: &str, s: &str) -> Vec<String> {
    let st = Step::parse(s).unwrap_or_else(|e| panic!("{s}: {e}"));
    take(&parse(f), &st, cat())
        .unwrap_or_else(|e| panic!("{f} + {s}: {e:?}"))
        .notes
}

#[test]
fn a_step_that_puts_hydride_opposite_chloride_says_so() {
    // H2 adds cis to trans-[IrCl(CO)(PPh3)2], one H trans to Cl and one trans to CO (Crabtree,
    // The Organometallic Chemistry of the Transition Metals, 6th ed., 2014, §6.3); Cl trans to
    // H is the labile one (Appleton, Clark & Manzer 1973)
    let n = notes("trans-IrCl(CO)(PPh3)2", "oxidative-addition H2");
    assert!(n.iter().any(|x| x.starts_with("Cl trans to H")), "{n:?}");
    assert!(!n.iter().any(|x| x.starts_with("CO trans to H")), "{n:?}");
    // MeI adds trans, and iodide lands opposite the methyl
    let n = notes("trans-IrCl(CO)(PPh3)2", "oxidative-addition MeI");
    assert!(n.iter().any(|x| x.starts_with("I trans to Me")), "{n:?}");
    // an enantiomeric pair of products has the pair alike: Pt(II) to Pt(IV) by the SN2 path
    // (Crabtree 2014, §6.4)
    let n = notes("cis-PtMeCl(PPh3)2", "oxidative-addition MeI");
    assert!(n.iter().any(|x| x.starts_with("I trans to Me")), "{n:?}");
    // aryl bromide on Pd(0): Br lands trans to PPh3, which ranks below the σ-carbon and
    // hydride head of the series (Appleton, Clark & Manzer 1973): no note
    let n = notes("Pd(PPh3)2", "oxidative-addition PhBr");
    assert!(!n.iter().any(|x| x.contains("trans influence")), "{n:?}");
    // the same pair already in the start is no news
    let n = notes("trans-PtHCl(PEt3)2", "association CO");
    assert!(!n.iter().any(|x| x.contains("trans influence")), "{n:?}");
}

#[test]
fn a_swap_that_puts_hydride_opposite_chloride_says_so() {
    let swap = |f: &str, to: &str| {
        let c = parse(f);
        let r = chem::count(&c);
        let slot = c
            .slots()
            .into_iter()
            .find(|s| c.group(*s).is_some_and(|b| b.ligand.key == "Cl"))
            .expect("a Cl");
        let ligand = cat().get(to).expect("in the catalogue").clone();
        let edit = Edit::Swap {
            slot,
            ligand,
            mode: 0,
        };
        preview(&c, &r, &edit).expect("previews").step_notes
    };
    // one Cl of trans-[PtCl2(PEt3)2] for H: the other Cl ends up trans to H
    let n = swap("trans-PtCl2(PEt3)2", "H");
    assert!(n.iter().any(|x| x.starts_with("Cl trans to H")), "{n:?}");
    // in the cis isomer the hydride lands trans to a phosphine: no weak ligand opposite
    let n = swap("cis-PtCl2(PEt3)2", "H");
    assert!(!n.iter().any(|x| x.contains("trans influence")), "{n:?}");
}

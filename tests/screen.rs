//! Ranked screening: constraints are honoured, pairs found by class grouping are exactly those
//! a brute-force count finds, shards partition the screen, and the CLI reports errors.

mod common;

use std::collections::BTreeSet;

use common::cat;
use nonet::chem::edit::{apply, Edit, Slot};
use nonet::chem::screen::{screen, Constraints, Rank, Shard};
use nonet::chem::{count, parse, Complex, Frac};

fn setup(f: &str, key: &str) -> (Complex, Slot) {
    let c = parse(f, cat()).unwrap_or_else(|e| panic!("{}", e.render()));
    let slot = c
        .slots()
        .into_iter()
        .find(|s| c.group(*s).is_some_and(|b| b.ligand.key == key))
        .expect("site");
    (c, slot)
}

#[test]
fn donor_ranking_puts_the_lowest_tolman_parameter_first() {
    // Vaska's complex, one PPh3 replaced by each phosphine; the TEPs are Tolman's (Chem. Rev.
    // 1977, 77, 313), the lowest (PtBu3, PCy3: 2056 cm-1) the strongest donors
    let (c, slot) = setup("IrCl(CO)(PPh3)2", "PPh3");
    let k = Constraints {
        families: vec!["phosphine".into()],
        tep: Some((2000.0, 2200.0)),
        ..Constraints::default()
    };
    let found = screen(&c, &[slot], cat().ligands(), &k, Rank::Donor, 100, None).expect("screen");
    assert!(found.len() >= 10);
    let teps: Vec<f64> = found
        .iter()
        .map(|x| x.ligands[0].tep.as_ref().map_or(f64::NAN, |t| t.value))
        .collect();
    assert!(teps.windows(2).all(|w| w[0] <= w[1]), "{teps:?}");
    assert!(teps[0] <= 2056.2);
    assert!(found.iter().all(|x| x.ligands[0].family == "phosphine"));
}

#[test]
fn constraints_are_honoured() {
    let (c, slot) = setup("IrCl(CO)(PPh3)2", "PPh3");
    let k = Constraints {
        electrons: Some((16, 16)),
        saturated: true,
        diamagnetic: true,
        cone: Some((120.0, 170.0)),
        no_hazardous: true,
        max_crowding: Some(1.2),
        ..Constraints::default()
    };
    let found =
        screen(&c, &[slot], cat().ligands(), &k, Rank::Crowding, 500, None).expect("screen");
    assert!(!found.is_empty());
    for x in &found {
        let m = &x.report.metals[0];
        assert_eq!(m.electron_count, Frac::int(16));
        assert_eq!(x.report.unpaired_electrons.first(), Some(&0));
        let cone = x.ligands[0].cone_angle.as_ref().expect("cone").value;
        assert!((120.0..=170.0).contains(&cone));
        assert!(x.ligands[0].hazards.is_empty());
        assert!(x.crowding <= 1.2);
    }
    let crowd: Vec<f64> = found.iter().map(|x| x.crowding).collect();
    assert!(crowd.windows(2).all(|w| w[0] <= w[1]));
}

/// Every pair meeting the electron target, by swapping and counting one by one.
fn brute_pairs(c: &Complex, slot: Slot, family: &str, e: i64) -> BTreeSet<(String, String)> {
    let ligs: Vec<_> = cat()
        .ligands()
        .iter()
        .filter(|l| l.family == family && l.modes[0].bridges == 1)
        .collect();
    let mut out = BTreeSet::new();
    for (i, a) in ligs.iter().enumerate() {
        for b in ligs.iter().skip(i) {
            let (one, _) = apply(
                c,
                &Edit::Swap {
                    slot,
                    ligand: (*a).clone(),
                    mode: 0,
                },
            )
            .expect("swap");
            let slot2 = one
                .slots()
                .into_iter()
                .find(|s| one.group(*s).is_some_and(|g| g.ligand.key == "PPh3"))
                .expect("second PPh3");
            let (two, _) = apply(
                &one,
                &Edit::Swap {
                    slot: slot2,
                    ligand: (*b).clone(),
                    mode: 0,
                },
            )
            .expect("swap");
            if count(&two).metals[0].electron_count == Frac::int(e) {
                let mut k = [a.key.clone(), b.key.clone()];
                k.sort();
                out.insert((k[0].clone(), k[1].clone()));
            }
        }
    }
    out
}

#[test]
fn pair_screening_finds_exactly_the_pairs_a_brute_force_count_finds() {
    let (c, slot) = setup("IrCl(CO)(PPh3)2", "PPh3");
    for (family, e) in [("halide", 14), ("amine", 16), ("alkyl", 14)] {
        let k = Constraints {
            electrons: Some((e, e)),
            families: vec![family.into()],
            ..Constraints::default()
        };
        let found = screen(
            &c,
            &[slot, slot],
            cat().ligands(),
            &k,
            Rank::Electrons,
            100_000,
            None,
        )
        .expect("screen");
        let got: BTreeSet<(String, String)> = found
            .iter()
            .map(|x| {
                let mut k = [x.ligands[0].key.clone(), x.ligands[1].key.clone()];
                k.sort();
                (k[0].clone(), k[1].clone())
            })
            .collect();
        assert_eq!(got.len(), found.len(), "{family}: a pair listed twice");
        assert_eq!(got, brute_pairs(&c, slot, family, e), "{family}");
    }
}

#[test]
fn shards_partition_the_screen() {
    let (c, slot) = setup("IrCl(CO)(PPh3)2", "PPh3");
    let k = Constraints {
        families: vec!["phosphine".into(), "phosphite".into()],
        ..Constraints::default()
    };
    let all = screen(
        &c,
        &[slot, slot],
        cat().ligands(),
        &k,
        Rank::Electrons,
        1_000_000,
        None,
    )
    .expect("screen");
    let keys = |v: &[nonet::chem::screen::Candidate]| -> Vec<Vec<String>> {
        v.iter()
            .map(|x| x.ligands.iter().map(|l| l.key.clone()).collect())
            .collect()
    };
    let mut merged = Vec::new();
    for k_ in 1..=3 {
        let part = screen(
            &c,
            &[slot, slot],
            cat().ligands(),
            &k,
            Rank::Electrons,
            1_000_000,
            Some(Shard { k: k_, n: 3 }),
        )
        .expect("shard");
        merged.extend(keys(&part));
    }
    let mut a = keys(&all);
    a.sort();
    merged.sort();
    assert_eq!(a, merged, "concatenated shards equal the whole screen");
    assert_eq!(Shard::parse("2/4"), Some(Shard { k: 2, n: 4 }));
    for bad in ["0/4", "5/4", "x/2", "3"] {
        assert_eq!(Shard::parse(bad), None, "{bad}");
    }
}

/// The JSON lines of a successful run.
fn json_lines(out: &std::process::Output) -> Vec<serde_json::Value> {
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    String::from_utf8_lossy(&out.stdout)
        .lines()
        .map(|l| serde_json::from_str(l).expect("json"))
        .collect()
}

fn nonet(args: &[&str]) -> std::process::Output {
    common::cli::Scratch::new("screen")
        .cmd()
        .args(args)
        .output()
        .expect("run nonet")
}

#[test]
fn the_cli_ranks_and_refuses_bad_requests() {
    let out = nonet(&[
        "screen",
        "IrCl(CO)(PPh3)2",
        "--site",
        "PPh3",
        "--family",
        "phosphine",
        "--rank",
        "donor",
        "--top",
        "3",
        "--json",
    ]);
    let lines = json_lines(&out);
    assert_eq!(lines.len(), 3);
    assert_eq!(lines[0]["rank"], 1);
    assert!(lines[0]["ligands"].is_array() && lines[0]["product"].is_string());
    // the text table writes oxidation states signed, as chemists do (Ir(I): +1)
    let text = nonet(&["screen", "IrCl(CO)(PPh3)2", "--site", "PPh3", "--top", "1"]);
    let row = String::from_utf8_lossy(&text.stdout)
        .lines()
        .nth(1)
        .map(String::from);
    assert!(
        row.as_deref().is_some_and(|r| r.contains(" +1 ")),
        "{row:?}"
    );
    for bad in [
        vec!["screen", "IrCl(CO)(PPh3)2", "--site", "PMe3"],
        vec![
            "screen",
            "IrCl(CO)(PPh3)2",
            "--site",
            "PPh3",
            "--electrons",
            "x",
        ],
        vec![
            "screen",
            "IrCl(CO)(PPh3)2",
            "--site",
            "PPh3",
            "--family",
            "nonsense",
        ],
        vec![
            "screen",
            "IrCl(CO)(PPh3)2",
            "--site",
            "PPh3",
            "--shard",
            "4/3",
        ],
        vec!["screen", "IrCl(CO)(PPh3)2", "--site", "CO", "--site", "CO"],
        vec!["screen", "Mn2(CO)10", "--site", "CO"],
        // reversed or empty windows and limits are mistakes, not empty answers
        vec![
            "screen",
            "IrCl(CO)(PPh3)2",
            "--site",
            "CO",
            "--electrons",
            "30-10",
        ],
        vec![
            "screen",
            "IrCl(CO)(PPh3)2",
            "--site",
            "CO",
            "--cone",
            "200-100",
        ],
        vec![
            "screen",
            "IrCl(CO)(PPh3)2",
            "--site",
            "CO",
            "--tep",
            "NaN-NaN",
        ],
        vec![
            "screen",
            "IrCl(CO)(PPh3)2",
            "--site",
            "CO",
            "--max-crowding",
            "-1",
        ],
        vec!["screen", "IrCl(CO)(PPh3)2", "--site", "CO", "--top", "0"],
    ] {
        let out = nonet(&bad);
        assert_eq!(out.status.code(), Some(2), "{bad:?}");
        assert!(!out.stderr.is_empty());
    }
}

#[test]
fn like_for_like_comes_first_and_no_swap_is_not_a_candidate() {
    // no --electrons: the starting count (Cp2ZrCl2, 16 e) is the target, so Cp* outranks
    // 17- and 18-e products; Cp itself is never offered back; the site may be written with
    // its hapticity as the output prints it
    let out = nonet(&[
        "screen", "Cp2ZrCl2", "--site", "η5-Cp", "--top", "5", "--json",
    ]);
    let lines = json_lines(&out);
    assert!(!lines.is_empty());
    assert!(lines.iter().all(|l| l["electron_count"] == 16), "{lines:?}");
    assert!(lines.iter().all(|l| l["ligands"][0] != "Cp"));
    assert!(lines.iter().any(|l| l["ligands"][0] == "Cp*"));
    assert!(lines.iter().all(|l| l["hazards_on_record"].is_boolean()));
    // Tp has no cone angle in the catalogue: its crowding is marked partial
    for l in &lines {
        let no_cone = l["cone_angles_deg"][0].is_null();
        assert_eq!(l["crowding_partial"], no_cone, "{l}");
    }
    // a window ranks every count inside it alike
    let out = nonet(&[
        "screen",
        "trans-RhCl(CO)(PPh3)2",
        "--site",
        "PPh3",
        "--electrons",
        "16-18",
        "--top",
        "3",
        "--json",
    ]);
    let first: serde_json::Value = serde_json::from_str(
        String::from_utf8_lossy(&out.stdout)
            .lines()
            .next()
            .unwrap_or("{}"),
    )
    .expect("json");
    assert_eq!(first["electron_count"], 16, "{first}");
}

#[test]
fn a_chelate_can_take_two_sites() {
    // Mo(CO)6 -> cis-Mo(CO)4(dppe) and PdCl2(PPh3)2 -> PdCl2(dppe), both textbook products
    // of swapping two monodentate ligands for one diphosphine (common practice)
    for (formula, site, product, e) in [
        ("Mo(CO)6", "CO", "[Mo(CO)4(κ2-dppe)]", 18),
        ("PdCl2(PPh3)2", "PPh3", "[Pd(κ2-dppe)Cl2]", 16),
    ] {
        let out = nonet(&[
            "screen",
            formula,
            "--site",
            site,
            "--site",
            site,
            "--family",
            "diphosphine",
            "--saturated",
            "--top",
            "50",
            "--json",
        ]);
        let found = json_lines(&out);
        let hit = found
            .iter()
            .find(|l| l["product"] == product)
            .unwrap_or_else(|| panic!("{formula}: no {product} in {found:?}"));
        assert_eq!(hit["electron_count"], e);
        assert_eq!(hit["ligands"], serde_json::json!(["dppe"]));
    }
}

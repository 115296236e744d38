//! `nonet sterics` on files: text and JSON, clear errors with line numbers, and storing a
//! ligand in a user set that counts then use at once.

mod common;

use std::path::{Path, PathBuf};

fn dir(tag: &str) -> PathBuf {
    common::cli::scratch_dir(tag)
}

fn nonet(d: &Path, args: &[&str]) -> std::process::Output {
    common::cli::command(&d.join("data"))
        .env("NONET_CONFIG_DIR", d.join("config"))
        .args(args)
        .output()
        .expect("run")
}

/// The three H lines of PH3 from standard geometry (P-H 1.42 Å, H-P-H 93.3°), P at the origin.
fn ph3_hydrogens() -> String {
    let b = (((93.3f64).to_radians().cos() + 0.5) / 1.5).sqrt().acos();
    let mut text = String::new();
    for k in 0..3 {
        let p = k as f64 * 2.0 * std::f64::consts::PI / 3.0;
        text.push_str(&format!(
            "H {:.4} {:.4} {:.4}\n",
            1.42 * b.sin() * p.cos(),
            1.42 * b.sin() * p.sin(),
            1.42 * b.cos()
        ));
    }
    text
}

/// PH3, no metal.
fn ph3(d: &Path) -> PathBuf {
    let f = d.join("ph3.xyz");
    std::fs::write(&f, format!("4\nphosphine\nP 0 0 0\n{}", ph3_hydrogens())).expect("write");
    f
}

#[test]
fn descriptors_as_json_and_text() {
    let d = dir("json");
    let f = ph3(&d);
    let out = nonet(
        &d,
        &["sterics", f.to_str().unwrap(), "--donor", "1", "--json"],
    );
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).expect("json");
    // Tolman's PH3 cone is 87° (Chem. Rev. 1977, 77, 313); idealized geometry, 3° tolerance
    let cone = v["exact_cone_angle_deg"].as_f64().expect("cone");
    assert!((cone - 87.0).abs() < 3.0, "{cone}");
    assert_eq!(v["metal"], "placed");
    assert!(v["buried_volume_percent"].as_f64().is_some_and(|x| x > 0.0));
    let out = nonet(
        &d,
        &["sterics", f.to_str().unwrap(), "--donor", "1", "--ascii"],
    );
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        text.is_ascii() && text.contains("exact cone angle"),
        "{text}"
    );
}

#[test]
fn errors_name_the_line_and_what_to_do() {
    let d = dir("errors");
    let bad = d.join("bad.xyz");
    std::fs::write(&bad, "2\nx\nP 0 0 0\nH 1 two 0\n").expect("write");
    let out = nonet(&d, &["sterics", bad.to_str().unwrap(), "--donor", "1"]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("line 4"));
    let f = ph3(&d);
    let out = nonet(&d, &["sterics", f.to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("--donor"));
    let out = nonet(&d, &["sterics", d.join("missing.xyz").to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(1));
}

#[test]
fn a_stored_ligand_is_counted_at_once() {
    let d = dir("store");
    let f = ph3(&d);
    let out = nonet(
        &d,
        &[
            "sterics",
            f.to_str().unwrap(),
            "--donor",
            "1",
            "--add-to",
            "computed",
            "--key",
            "PH3calc",
        ],
    );
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let out = nonet(&d, &["count", "--json", "Ni(PH3calc)4"]);
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).expect("json");
    assert_eq!(v["metals"][0]["electron_count"], 18);
    let out = nonet(&d, &["ligands", "PH3calc", "--json"]);
    let first = String::from_utf8_lossy(&out.stdout);
    let l: serde_json::Value =
        serde_json::from_str(first.lines().next().expect("a line")).expect("json");
    assert!(l["cone_angle_source"]
        .as_str()
        .is_some_and(|s| s.contains("computed by nonet")));
}

#[test]
fn a_bad_store_request_writes_nothing() {
    let d = dir("refuse");
    let f = ph3(&d);
    let set = d.join("config").join("ligand_sets").join("mine.toml");
    let store = |key: &str, extra: &[&str]| {
        let mut args = vec![
            "sterics",
            f.to_str().unwrap(),
            "--donor",
            "1",
            "--add-to",
            "mine",
            "--key",
            key,
        ];
        args.extend_from_slice(extra);
        nonet(&d, &args)
    };
    // a built-in key would silently change every count that uses it (Me as an L ligand)
    for (key, extra) in [
        ("Me", &[][..]),
        ("PPh3", &[][..]),
        ("x)", &[][..]),
        ("a b", &[][..]),
        ("Q3", &["--family", "made up"][..]),
        ("Q3", &["--class", "Y"][..]),
    ] {
        let out = store(key, extra);
        assert_eq!(out.status.code(), Some(2), "{key} {extra:?}");
        assert!(out.stdout.is_empty(), "refused before any output");
        assert!(!set.exists(), "{key} {extra:?}: nothing written");
    }
    assert_eq!(
        nonet(
            &d,
            &["sterics", f.to_str().unwrap(), "--donor", "1", "--key", "K"]
        )
        .status
        .code(),
        Some(2),
        "--key without --add-to"
    );
    // once stored, the same key is refused the second time
    assert!(store("PH3calc", &[]).status.success());
    let before = std::fs::read(&set).expect("set");
    assert_eq!(store("PH3calc", &[]).status.code(), Some(2));
    assert_eq!(std::fs::read(&set).expect("set"), before);
}

#[test]
fn the_source_note_gives_the_distance_used() {
    let d = dir("source");
    let f = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/bilbrey2013/NiPMe3.xyz");
    let out = nonet(
        &d,
        &[
            "sterics",
            f.to_str().unwrap(),
            "--add-to",
            "mine",
            "--key",
            "PMe3ni",
        ],
    );
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let set = std::fs::read_to_string(d.join("config").join("ligand_sets").join("mine.toml"))
        .expect("set");
    // the Ni-P distance of the file, not the 2.28 Å default
    assert!(set.contains("from the file, 2.04 Å"), "{set}");
    // --distance only places a metal; with one in the file it says it is unused
    let out = nonet(&d, &["sterics", f.to_str().unwrap(), "--distance", "3"]);
    assert!(out.status.success());
    assert!(String::from_utf8_lossy(&out.stderr).contains("--distance is not used"));
}

#[test]
fn malformed_files_are_explained() {
    let d = dir("malformed");
    let write = |name: &str, body: &[u8]| {
        let p = d.join(name);
        std::fs::write(&p, body).expect("write");
        p
    };
    let cases: Vec<(PathBuf, &str)> = vec![
        (write("empty.xyz", b""), "empty"),
        (
            write("junk.bin", &[0xff, 0xfe, 0x00, 0x81, 0x12]),
            "not a text file",
        ),
        (
            write("alien.xyz", b"2\nx\nP 0 0 0\nXx 1.4 0 0\n"),
            "'Xx' is not an element symbol",
        ),
        (
            write("short.xyz", b"1\nx\nP 0 0 0\nH 1.4 0 0\n"),
            "more atom lines follow",
        ),
    ];
    for (p, want) in cases {
        let out = nonet(&d, &["sterics", p.to_str().unwrap(), "--donor", "1"]);
        let err = String::from_utf8_lossy(&out.stderr);
        assert_eq!(out.status.code(), Some(2), "{}: {err}", p.display());
        assert!(err.contains(want), "{}: {err}", p.display());
    }
    // a molfile whose title is a database number is still a molfile
    let mol = "2244\n  test\n\n  2  1  0  0  0  0  0  0  0  0999 V2000\n    0.0000    0.0000    0.0000 P   0  0\n    1.4200    0.0000    0.0000 H   0  0\n  1  2  1  0\nM  END\n";
    let p = write("cid.mol", mol.as_bytes());
    let out = nonet(
        &d,
        &["sterics", p.to_str().unwrap(), "--donor", "1", "--json"],
    );
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
}

#[test]
fn a_donor_far_from_the_metal_is_not_bonded_to_it() {
    let d = dir("far");
    // PH3 with an iron atom 6 Å away on the far side: no bond, so without --donor it is an
    // error, and with --donor the metal is placed along the lone pair
    let text = format!("5\nfar metal\nFe 0 0 6\nP 0 0 0\n{}", ph3_hydrogens());
    let f = d.join("far.xyz");
    std::fs::write(&f, text).expect("write");
    let out = nonet(&d, &["sterics", f.to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("too far to be bonded"));
    let out = nonet(
        &d,
        &["sterics", f.to_str().unwrap(), "--donor", "2", "--json"],
    );
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).expect("json");
    assert_eq!(v["metal"], "placed");
    assert_eq!(v["donor_atom"], 2);
}

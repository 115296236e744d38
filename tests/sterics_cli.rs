//! `nonet sterics` on files: text and JSON, clear errors with line numbers, and storing a
//! ligand in a user set that counts then use at once.

use std::path::{Path, PathBuf};
use std::process::Command;

fn dir(tag: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("nonet-sterics-{tag}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).expect("dir");
    d
}

fn nonet(d: &Path, args: &[&str]) -> std::process::Output {
    Command::new(env!("CARGO_BIN_EXE_nonet"))
        .args(args)
        .env("NONET_CONFIG_DIR", d.join("config"))
        .env("NONET_DATA_DIR", d.join("data"))
        .output()
        .expect("run")
}

/// PH3 from standard geometry (P-H 1.42 Å, H-P-H 93.3°), no metal.
fn ph3(d: &Path) -> PathBuf {
    let b = (((93.3f64).to_radians().cos() + 0.5) / 1.5).sqrt().acos();
    let mut text = String::from("4\nphosphine\nP 0 0 0\n");
    for k in 0..3 {
        let p = k as f64 * 2.0 * std::f64::consts::PI / 3.0;
        text.push_str(&format!(
            "H {:.4} {:.4} {:.4}\n",
            1.42 * b.sin() * p.cos(),
            1.42 * b.sin() * p.sin(),
            1.42 * b.cos()
        ));
    }
    let f = d.join("ph3.xyz");
    std::fs::write(&f, text).expect("write");
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

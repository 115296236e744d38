//! Hostile and impossible input is refused with a reason, within bounded time and memory:
//! d counts no metal can have, structure files that promise absurd atom counts or stack atoms
//! on top of each other, and user ligand sets that hold special files, unknown fields or
//! numbers out of range.

mod common;

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

use common::cat;
use nonet::chem::{count, parse, Report};

fn report(f: &str) -> Report {
    let c = parse(f, cat()).unwrap_or_else(|e| panic!("{f}: {}", e.render()));
    count(&c)
}

/// A fresh scratch directory for one test.
fn scratch(tag: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("nonet-hostile-{tag}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).expect("scratch dir");
    d
}

/// Run the binary with config and data kept inside `d`.
fn nonet(d: &Path, args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_nonet"))
        .args(args)
        .env("NONET_CONFIG_DIR", d.join("config"))
        .env("NONET_DATA_DIR", d.join("data"))
        .output()
        .expect("run nonet")
}

fn stderr(o: &Output) -> String {
    String::from_utf8_lossy(&o.stderr).into_owned()
}

// ---------------------------------------------------------------------------------------------
// d counts
// ---------------------------------------------------------------------------------------------

#[test]
fn a_lone_metal_past_d10_is_refused() {
    // a d shell holds ten electrons; the most reduced carbonyl metallates known stop at d10
    // ([Cr(CO)4]4-, [Mn(CO)4]3-, [Fe(CO)4]2-: Ellis, Inorg. Chem. 2006, 45, 3167)
    for f in ["[Fe(CO)5]4-", "[Ni(CO)4]-", "Cu(CO)3", "[Fe(CO)5]20-"] {
        let why = report(f)
            .impossible()
            .unwrap_or_else(|| panic!("{f} must be refused"));
        assert!(why.contains("d shell holds 10"), "{f}: {why}");
        assert!(why.contains("check the charge"), "{f}: {why}");
    }
    for f in [
        "[Cr(CO)4]4-",
        "[Mn(CO)4]3-",
        "[Fe(CO)4]2-",
        "Ni(CO)4",
        "[Co(CO)4]-",
    ] {
        assert_eq!(report(f).impossible(), None, "{f} is d10 and real");
    }
}

#[test]
fn metals_that_pair_their_s_electron_stay_accepted() {
    // d10s1 metals bonded to each other: calomel Hg2Cl2 (Greenwood & Earnshaw, Chemistry of
    // the Elements, 2nd ed. 1997, ch. 30; from memory), decamethyldizincocene (Resa, Carmona
    // et al., Science 2004, 305, 1136; from memory), and a Chini platinum carbonyl cluster,
    // Pt(-1/3) (Calabrese, Dahl, Chini, Longoni & Martinengo, J. Am. Chem. Soc. 1974, 96,
    // 2614; from memory)
    for f in ["Hg2Cl2", "[Hg2]2+", "Cp*ZnZnCp*", "[Pt6(CO)12]2-"] {
        assert_eq!(report(f).impossible(), None, "{f}");
    }
    // two electrons past d10 are too many even with a partner
    assert!(report("[Fe2(CO)8]8-").impossible().is_some());
}

#[test]
fn count_refuses_d12_on_the_command_line() {
    let d = scratch("d12");
    let out = nonet(&d, &["count", "[Fe(CO)5]4-"]);
    assert_eq!(out.status.code(), Some(2), "{}", stderr(&out));
    let err = stderr(&out);
    assert!(err.contains("d12"), "{err}");
    assert!(err.contains("[Fe(CO)5]4-"), "names the formula: {err}");
    let _ = std::fs::remove_dir_all(&d);
}

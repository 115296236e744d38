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
    common::cli::scratch_dir(tag)
}

/// Run the binary with config and data kept inside `d`.
fn nonet(d: &Path, args: &[&str]) -> Output {
    common::cli::command(&d.join("data"))
        .env("NONET_CONFIG_DIR", d.join("config"))
        .args(args)
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

// ---------------------------------------------------------------------------------------------
// Structure files
// ---------------------------------------------------------------------------------------------

use nonet::chem::shape;
use nonet::chem::structure::{self, MAX_ATOMS};

#[test]
fn an_absurd_atom_count_is_refused_before_anything_is_allocated() {
    // usize::MAX wrapped the line check and asked for a vector of that many atoms
    for count in [
        "18446744073709551615",
        "99999999999999999999999",
        "1000000000000",
    ] {
        let text = format!("{count}\ncomment\nC 0 0 0\n");
        let e = structure::parse(&text).expect_err(count);
        assert_eq!(e.line, 1, "{count}: {e}");
        assert!(e.message.contains("at most 20,000"), "{count}: {e}");
        assert!(e.message.contains(count), "quotes the count: {e}");
    }
    let over = format!("{}\ncomment\nC 0 0 0\n", MAX_ATOMS + 1);
    assert!(structure::parse(&over).is_err());
    // a molfile counts line is checked the same way (it has three columns, so at most 999)
    let mol = "x\n  y\n\n  0  0  0  0  0  0  0  0  0  0999 V2000\n";
    assert!(structure::parse_molfile(mol)
        .expect_err("no atoms")
        .message
        .contains("no atoms"));
}

#[test]
fn sterics_refuses_an_absurd_count_with_the_limit_and_does_not_abort() {
    let d = scratch("count");
    let f = d.join("huge.xyz");
    std::fs::write(&f, "18446744073709551615\nx\nP 0 0 0\n").expect("write");
    let out = nonet(&d, &["sterics", f.to_str().expect("utf-8 path")]);
    assert_eq!(out.status.code(), Some(2), "{}", stderr(&out));
    let err = stderr(&out);
    assert!(err.contains("huge.xyz: line 1"), "where: {err}");
    assert!(err.contains("at most 20,000"), "the limit: {err}");
    assert!(!err.contains("panicked"), "{err}");
    let _ = std::fs::remove_dir_all(&d);
}

#[test]
fn sterics_reads_a_bounded_prefix_of_an_endless_file() {
    let d = scratch("zero");
    let out = nonet(&d, &["sterics", "/dev/zero"]);
    assert_eq!(out.status.code(), Some(2), "{}", stderr(&out));
    assert!(
        stderr(&out).contains("larger than 32 MiB"),
        "{}",
        stderr(&out)
    );
    let _ = std::fs::remove_dir_all(&d);
}

fn atoms(text: &str) -> Vec<structure::Atom> {
    structure::parse(text).unwrap_or_else(|e| panic!("{e}"))
}

#[test]
fn atoms_on_top_of_each_other_are_refused() {
    let a = atoms("4\nclash\nPd 0 0 0\nP 0 0 2.28\nH 1.2 0 3.0\nH 1.2 0.05 3.0\n");
    let e = shape::setup(&a, None, 2.28).expect_err("two H on one place");
    assert!(e.contains("atoms 3 (H) and 4 (H)"), "{e}");
    assert!(e.contains("on top of each other"), "{e}");
    assert!(e.contains("remove the duplicate"), "{e}");
    // with --donor as well
    assert!(shape::setup(&a, Some(2), 2.28).is_err());
}

#[test]
fn a_metal_on_the_donors_place_is_refused() {
    let a = atoms("4\nx\nPd 0 0 2.0\nP 0 0 2.28\nH 1.4 0 2.6\nH -1.4 0 2.6\n");
    for donor in [None, Some(2)] {
        let e = shape::setup(&a, donor, 2.28).expect_err("metal 0.28 Å from the donor");
        assert!(e.contains("Pd (atom 1)"), "{e}");
        assert!(e.contains("0.28 Å from the donor P (atom 2)"), "{e}");
    }
}

#[test]
fn a_second_metal_is_not_taken_for_the_donor() {
    let a = atoms("4\nx\nPd 0 0 0\nPd 0 0 2.2\nP 0 2.3 0\nH 0 3.7 0\n");
    let e = shape::setup(&a, None, 2.28).expect_err("the nearest atom is a metal");
    assert!(e.contains("another metal, Pd (atom 2)"), "{e}");
    assert!(e.contains("--donor N"), "{e}");
    // naming the ligand atom works
    let s = shape::setup(&a, Some(3), 2.28).expect("P binds");
    assert_eq!(s.donor_atom, 3);
}

#[test]
fn atoms_packed_closer_than_any_molecule_are_refused() {
    // a 13x13x13 block of hydrogens 0.35 Å apart: every atom "bonded" to dozens
    let mut text = String::from("2198\ndense\nPd 0 0 -2.2\n");
    for i in 0..13 {
        for j in 0..13 {
            for k in 0..13 {
                text.push_str(&format!(
                    "H {:.2} {:.2} {:.2}\n",
                    i as f64 * 0.35,
                    j as f64 * 0.35,
                    k as f64 * 0.35
                ));
            }
        }
    }
    let e = shape::setup(&atoms(&text), None, 2.28).expect_err("too dense");
    assert!(e.contains("packed closer than in any molecule"), "{e}");
}

/// A phosphorus donor 2.28 Å above a metal at the origin and below a block of `n` carbons
/// 1.54 Å apart, all bonded into one ligand: the worst case for all-pairs bond searches.
fn carbon_block(n: usize) -> String {
    let a = 1.54;
    let r = (n as f64 * a * a * a * 3.0 / (4.0 * std::f64::consts::PI)).cbrt();
    let centre = 3.9 + r;
    let k = (r / a) as i64 + 2;
    let mut lines = Vec::new();
    for i in -k..=k {
        for j in -k..=k {
            for l in 0..=2 * k + 1 {
                let p = [i as f64 * a, j as f64 * a, 3.9 + l as f64 * a];
                if p[0] * p[0] + p[1] * p[1] + (p[2] - centre).powi(2) <= r * r {
                    lines.push(format!("C {:.4} {:.4} {:.4}", p[0], p[1], p[2]));
                }
            }
        }
    }
    format!(
        "{}\ncarbon block\nPd 0 0 0\nP 0 0 2.28\n{}\n",
        lines.len() + 2,
        lines.join("\n")
    )
}

#[test]
fn a_large_ligand_gives_descriptors() {
    let d = scratch("block");
    let f = d.join("block.xyz");
    std::fs::write(&f, carbon_block(2_000)).expect("write");
    let start = std::time::Instant::now();
    let out = nonet(&d, &["sterics", f.to_str().expect("utf-8 path"), "--json"]);
    // all-pairs loops took half a minute here in a debug build; the cell list and the banded
    // lattice keep it near a second
    assert!(start.elapsed().as_secs() < 10, "took {:?}", start.elapsed());
    assert!(out.status.success(), "{}", stderr(&out));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).expect("json");
    assert!(v["ligand_atoms"].as_u64().unwrap_or(0) > 1_900, "{v}");
    let _ = std::fs::remove_dir_all(&d);
}

/// Times `nonet sterics` on a generated 10,000-atom ligand. Run with
/// `cargo test --release --test hostile_input -- --ignored --nocapture`; all-pairs searches
/// took 16 s here, the cell list and the banded lattice take about 0.15 s.
#[test]
#[ignore]
fn sterics_on_ten_thousand_atoms_takes_well_under_a_few_seconds() {
    let d = scratch("block10k");
    let f = d.join("block10k.xyz");
    std::fs::write(&f, carbon_block(10_000)).expect("write");
    let start = std::time::Instant::now();
    let out = nonet(&d, &["sterics", f.to_str().expect("utf-8 path"), "--json"]);
    let took = start.elapsed();
    assert!(out.status.success(), "{}", stderr(&out));
    println!("sterics on a 10,000-atom ligand: {took:?}");
    assert!(took.as_secs_f64() < 3.0, "took {took:?}");
    let _ = std::fs::remove_dir_all(&d);
}

// ---------------------------------------------------------------------------------------------
// User ligand sets
// ---------------------------------------------------------------------------------------------

use nonet::catalogue::{Catalogue, MAX_SET_BYTES};

/// One ligand entry with extra lines (fields) added at its end.
fn entry(key: &str, extra: &str) -> String {
    format!(
        "[[ligand]]\nkey = \"{key}\"\nname = \"test {key}\"\nformula = \"{key}f\"\n\
         family = \"phosphine\"\n{extra}\n[[ligand.mode]]\nlabel = \"κ1\"\nclass = \"L\"\n\n"
    )
}

fn user_set(text: &str) -> Catalogue {
    Catalogue::from_sets(Vec::new(), vec![("mine.toml".into(), text.into())])
}

#[test]
fn an_unknown_field_drops_only_its_entry_and_names_it() {
    let text = format!(
        "{}{}{}",
        entry("Qa1", ""),
        entry("Qa2", "colour = \"red\""),
        entry("Qa3", "")
    );
    let cat = user_set(&text);
    assert!(
        cat.get("Qa1").is_some() && cat.get("Qa3").is_some(),
        "the rest loads"
    );
    assert!(cat.get("Qa2").is_none());
    assert_eq!(cat.warnings.len(), 1, "{:?}", cat.warnings);
    let w = &cat.warnings[0];
    assert_eq!(w.key.as_deref(), Some("Qa2"));
    let line = text
        .lines()
        .position(|l| l.contains("colour"))
        .expect("line")
        + 1;
    assert_eq!(w.line, line, "{w}");
    assert!(w.message.contains("colour"), "names the field: {w}");
    assert!(w.message.contains("skipped"), "{w}");
    // an unknown top-level field is ignored, not fatal
    let cat = user_set(&format!("colour = 1\n{}", entry("Qa4", "")));
    assert!(cat.get("Qa4").is_some(), "{:?}", cat.warnings);
    assert!(cat.warnings[0].message.contains("'colour'"));
}

#[test]
fn numbers_out_of_range_or_not_finite_are_refused() {
    let src = "tep_source = \"test\"\ncone_angle_source = \"test\"";
    let cases = [
        ("Tn1", "tep = -inf", "tep = -inf"),
        ("Tn2", "tep = nan", "tep = NaN"),
        ("Tn3", "tep = inf", "tep = inf"),
        ("Tn4", "tep = 20561", "1950-2150"),
        ("Tn5", "cone_angle = 400.0", "30-360"),
        ("Tn6", "cone_angle = -inf", "cone_angle = -inf"),
        ("Tn7", "cone_angle = nan", "cone_angle = NaN"),
    ];
    let mut text = entry("Ok1", &format!("tep = 2056.1\ncone_angle = 182.0\n{src}"));
    for (key, field, _) in cases {
        text.push_str(&entry(key, &format!("{field}\n{src}")));
    }
    let cat = user_set(&text);
    assert!(cat.get("Ok1").is_some(), "{:?}", cat.warnings);
    for (key, field, shown) in cases {
        assert!(cat.get(key).is_none(), "{field} must be refused");
        let w = cat
            .warnings
            .iter()
            .find(|w| w.key.as_deref() == Some(key))
            .unwrap_or_else(|| panic!("no warning for {key}"));
        assert!(w.message.contains(shown), "{w}");
        let line = text
            .lines()
            .enumerate()
            .skip_while(|(_, l)| !l.contains(&format!("\"{key}\"")))
            .find(|(_, l)| *l == field)
            .expect("the field's line")
            .0
            + 1;
        assert_eq!(w.line, line, "points at the number: {w}");
    }
    // seven dropped: one more warning lists them
    let last = cat.warnings.last().expect("summary");
    assert!(last.message.starts_with("7 of 8 entries dropped"), "{last}");
    assert!(last.to_string().starts_with("mine.toml: "), "{last}");
    // nothing that is not a finite number reaches the catalogue (a TEP of -inf ranked first)
    assert!(cat
        .ligands()
        .iter()
        .all(|l| l.tep.as_ref().is_none_or(|t| t.value.is_finite())));
}

#[test]
fn mode_counts_out_of_range_are_refused() {
    let mode = |key: &str, label: &str, extra: &str| {
        format!(
            "[[ligand]]\nkey = \"{key}\"\nname = \"n\"\nformula = \"{key}f\"\nfamily = \"halide\"\n\
             [[ligand.mode]]\nlabel = \"{label}\"\nclass = \"X\"\n{extra}\n\n"
        )
    };
    let text = [
        mode("Mb1", "μ", ""),
        mode("Mb2", "μ9", ""),
        mode("Mb3", "κ1", "donors = 0"),
        mode("Mb4", "κ1", "ionic_charge = -100"),
        mode("Mb5", "η200", ""),
    ]
    .concat();
    let cat = user_set(&text);
    assert!(cat.get("Mb1").is_some(), "{:?}", cat.warnings);
    for (key, what) in [
        ("Mb2", "bridges = 9"),
        ("Mb3", "donors = 0"),
        ("Mb4", "ionic_charge = -100"),
        ("Mb5", "donors = 200"),
    ] {
        assert!(cat.get(key).is_none(), "{key}");
        let w = cat
            .warnings
            .iter()
            .find(|w| w.key.as_deref() == Some(key))
            .unwrap_or_else(|| panic!("no warning for {key}"));
        assert!(w.message.contains(what), "{w}");
    }
}

/// Runs `nonet count` with `config` as its config dir; fails the test (instead of hanging it)
/// if the command takes longer than 20 s.
fn count_within(config: &Path, d: &Path) -> Output {
    let mut child = Command::new(common::cli::BIN)
        .args(["count", "Fe(CO)5"])
        .env("NONET_CONFIG_DIR", config)
        .env("NONET_DATA_DIR", d.join("data"))
        .stdout(std::process::Stdio::piped())
        .stderr(std::process::Stdio::piped())
        .spawn()
        .expect("spawn");
    let start = std::time::Instant::now();
    while child.try_wait().expect("wait").is_none() {
        if start.elapsed().as_secs() > 20 {
            let _ = child.kill();
            panic!("nonet count hung on a user ligand set");
        }
        std::thread::sleep(std::time::Duration::from_millis(20));
    }
    child.wait_with_output().expect("output")
}

#[cfg(unix)]
#[test]
fn a_fifo_among_the_user_sets_is_skipped_not_waited_on() {
    let d = scratch("fifo");
    let sets = d.join("config").join("ligand_sets");
    std::fs::create_dir_all(&sets).expect("dir");
    let fifo = sets.join("pipe.toml");
    let made = Command::new("mkfifo").arg(&fifo).status().expect("mkfifo");
    assert!(made.success());
    std::fs::create_dir_all(sets.join("folder.toml")).expect("dir");
    std::fs::write(sets.join("good.toml"), entry("Qf1", "")).expect("write");
    let out = count_within(&d.join("config"), &d);
    assert!(out.status.success(), "{}", stderr(&out));
    let err = stderr(&out);
    assert!(err.contains("pipe.toml: a FIFO"), "{err}");
    assert!(err.contains("folder.toml: a directory"), "{err}");
    assert!(err.contains("regular files"), "{err}");
    // the regular file next to them loads
    let cat = Catalogue::with_user_dir(Some(&sets));
    assert!(cat.get("Qf1").is_some(), "{:?}", cat.warnings);
    let _ = std::fs::remove_dir_all(&d);
}

#[test]
fn an_oversized_user_set_is_refused_with_the_limit() {
    let d = scratch("big");
    let sets = d.join("ligand_sets");
    std::fs::create_dir_all(&sets).expect("dir");
    let mut text = entry("Qb1", "");
    text.push_str(&"# padding\n".repeat((MAX_SET_BYTES as usize) / 10 + 1));
    std::fs::write(sets.join("big.toml"), text).expect("write");
    std::fs::write(sets.join("small.toml"), entry("Qb2", "")).expect("write");
    let cat = Catalogue::with_user_dir(Some(&sets));
    assert!(cat.get("Qb1").is_none());
    assert!(cat.get("Qb2").is_some(), "the other set loads");
    assert_eq!(cat.warnings.len(), 1, "{:?}", cat.warnings);
    let w = cat.warnings[0].to_string();
    assert!(w.contains("big.toml"), "{w}");
    assert!(w.contains("at most 16 MiB"), "{w}");
    assert!(w.contains("split it"), "{w}");
    let _ = std::fs::remove_dir_all(&d);
}

#[test]
fn a_user_set_that_is_not_utf8_names_the_line() {
    let d = scratch("latin1");
    let sets = d.join("ligand_sets");
    std::fs::create_dir_all(&sets).expect("dir");
    std::fs::write(sets.join("latin.toml"), b"# ok\n# caf\xe9\n").expect("write");
    let cat = Catalogue::with_user_dir(Some(&sets));
    let w = cat.warnings[0].to_string();
    assert!(w.contains("line 2 is not UTF-8"), "{w}");
    let _ = std::fs::remove_dir_all(&d);
}

/// A user set of `n` distinct ligands.
fn many_ligands(n: usize) -> String {
    (0..n).map(|i| entry(&format!("Lg{i}"), "")).collect()
}

/// Times loading 100,000 user ligands. Run with
/// `cargo test --release --test hostile_input -- --ignored --nocapture`; the duplicate-key
/// check scanned every earlier ligand and took 46 s here, an index takes about 2 s.
#[test]
#[ignore]
fn a_hundred_thousand_user_ligands_load_in_seconds() {
    let text = many_ligands(100_000);
    let start = std::time::Instant::now();
    let cat = user_set(&text);
    let took = start.elapsed();
    assert!(cat.warnings.is_empty(), "{:?}", &cat.warnings[..1]);
    assert_eq!(cat.len(), 100_000);
    println!("100,000 user ligands loaded in {took:?}");
    assert!(took.as_secs_f64() < 10.0, "took {took:?}");
}

// ---------------------------------------------------------------------------------------------
// "Did you mean" suggestions
// ---------------------------------------------------------------------------------------------

use nonet::chem::LigandLookup;
use std::collections::BTreeSet;

/// The suggestion as it was first written: every token compared by edit distance, then the
/// whole catalogue searched with the fuzzy matcher. Kept here to check the fast one against.
fn suggest_by_scanning(cat: &Catalogue, token: &str) -> Option<String> {
    fn distance(a: &str, b: &str) -> usize {
        let b: Vec<char> = b.chars().collect();
        let mut prev: Vec<usize> = (0..=b.len()).collect();
        let mut cur = vec![0; b.len() + 1];
        for (i, ca) in a.chars().enumerate() {
            cur[0] = i + 1;
            for (j, cb) in b.iter().enumerate() {
                cur[j + 1] = (prev[j] + usize::from(ca != *cb))
                    .min(prev[j + 1] + 1)
                    .min(cur[j] + 1);
            }
            std::mem::swap(&mut prev, &mut cur);
        }
        prev[b.len()]
    }
    if token.is_empty() {
        return None;
    }
    let tokens = formula_tokens(cat);
    let lower = token.to_lowercase();
    if let Some(t) = tokens.iter().find(|t| t.to_lowercase() == lower) {
        return Some(t.clone());
    }
    let limit = (token.chars().count() / 3).clamp(1, 3);
    let mut best: Option<(usize, &String)> = None;
    for t in &tokens {
        let d = distance(&lower, &t.to_lowercase());
        if d <= limit && best.is_none_or(|(bd, _)| d < bd) {
            best = Some((d, t));
        }
    }
    if let Some((_, t)) = best {
        return Some(t.clone());
    }
    cat.search(token)
        .into_iter()
        .find(|h| h.score > 40)
        .map(|h| h.ligand.key.clone())
}

/// Every string that names a ligand in a formula, in byte order.
fn formula_tokens(cat: &Catalogue) -> BTreeSet<String> {
    cat.ligands()
        .iter()
        .flat_map(|l| {
            std::iter::once(l.key.clone())
                .chain(std::iter::once(l.formula.clone()))
                .chain(l.aliases.iter().cloned())
        })
        .filter(|t| !t.is_empty() && !t.chars().any(char::is_whitespace))
        .collect()
}

/// Slips a chemist makes: a letter dropped, doubled, swapped or changed, the case changed,
/// plus some noise.
fn typos(cat: &Catalogue) -> Vec<String> {
    let mut out = Vec::new();
    for (n, t) in formula_tokens(cat)
        .iter()
        .enumerate()
        .filter(|(n, _)| n % 7 == 0)
    {
        let c: Vec<char> = t.chars().collect();
        let k = n % c.len().max(1);
        let mut dropped = c.clone();
        dropped.remove(k);
        let mut doubled = c.clone();
        doubled.insert(k, c[k]);
        let mut changed = c.clone();
        changed[k] = if c[k] == 'x' { 'q' } else { 'x' };
        let mut swapped = c.clone();
        if c.len() > 1 {
            swapped.swap(k.min(c.len() - 2), k.min(c.len() - 2) + 1);
        }
        for v in [dropped, doubled, changed, swapped] {
            out.push(v.into_iter().collect());
        }
        out.push(t.to_uppercase());
    }
    out.extend(
        [
            "Xyzzy",
            "q",
            "zz",
            "bipyrydine",
            "tetramethylcyclopentadienylz",
            "PPh4",
            "Co",
            "tmeda9",
            "ÅÅ",
            "η",
            "((",
            "1234567890",
            "phosphinephosphine",
        ]
        .map(String::from),
    );
    out
}

#[test]
fn suggestions_are_those_of_the_full_scan() {
    for cat in [cat(), &user_set(&many_ligands(300))] {
        for t in typos(cat) {
            assert_eq!(
                cat.suggest(&t),
                suggest_by_scanning(cat, &t),
                "suggestion for '{t}'"
            );
        }
    }
}

#[test]
fn an_unknown_ligand_costs_a_few_good_lines() {
    // the full scan made an unknown line cost about 400 good ones
    let good = [
        "Pd(PPh3)4",
        "Fe(CO)5",
        "RhCl(PPh3)3",
        "Ni(CO)4",
        "[Co(NH3)6]3+",
    ];
    let bad = [
        "Pd(PPh4)4",
        "Fe(Xyzzy)5",
        "Ru(bipyrydine)3",
        "Ni(CQ)4",
        "Co(NH4)6",
    ];
    let _ = parse(bad[0], cat()); // builds the suggestion index once
    let time = |lines: &[&str]| {
        let start = std::time::Instant::now();
        for _ in 0..40 {
            for f in lines {
                std::hint::black_box(parse(f, cat()).is_ok());
            }
        }
        start.elapsed().as_secs_f64()
    };
    let (g, b) = (time(&good), time(&bad));
    println!("an unknown line costs {:.1} good lines", b / g);
    assert!(
        b < 40.0 * g,
        "unknown lines took {:.0}x good ones ({b:.4} s against {g:.4} s)",
        b / g
    );
}

// ---------------------------------------------------------------------------------------------
// Noise never panics
// ---------------------------------------------------------------------------------------------

mod noise {
    use super::*;
    use proptest::prelude::*;

    /// A small structure: element symbols (some metals) at coordinates that may coincide.
    fn arb_atoms() -> impl Strategy<Value = Vec<structure::Atom>> {
        let symbol = prop::sample::select(vec!["H", "C", "N", "P", "Cl", "Pd", "Fe", "Xe"]);
        let coord = prop_oneof![(-40i32..40).prop_map(|v| v as f64 * 0.25), -5.0f64..5.0];
        prop::collection::vec((symbol, coord.clone(), coord.clone(), coord), 1..12).prop_map(|v| {
            v.into_iter()
                .map(|(s, x, y, z)| structure::Atom {
                    symbol: s.to_string(),
                    pos: [x, y, z],
                })
                .collect()
        })
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(64))]

        #[test]
        fn structure_text_gives_atoms_or_an_error(s in "[0-9A-Za-z .\\-\\n]{0,80}") {
            let _ = structure::parse(&s);
            let _ = structure::parse(&format!("{s}\n  1  0  0  0  0  0  0  0  0  0999 V2000\n"));
        }

        #[test]
        fn any_geometry_gives_descriptors_or_a_reason(
            atoms in arb_atoms(),
            donor in prop::option::of(0usize..14),
        ) {
            if let Ok(s) = shape::setup(&atoms, donor, 2.28) {
                let _ = shape::exact_cone_angle(&s);
                let _ = shape::solid_angle(&s);
                let b = shape::buried_volume(&s, 3.5, 1.17, true, 5);
                prop_assert!(b.percent.is_finite());
            }
        }

        #[test]
        fn ligand_set_noise_loads_what_it_can(
            cut in 0usize..400,
            junk in "[a-z_ =\"\\[\\]0-9.\\n-]{0,30}",
        ) {
            let mut text = format!(
                "{}{}{}",
                entry("Np1", "tep = 2056.1\ntep_source = \"t\""),
                entry("Np2", ""),
                entry("Np3", "")
            );
            let at = text
                .char_indices()
                .map(|(i, _)| i)
                .nth(cut.min(text.chars().count()))
                .unwrap_or(text.len());
            text.insert_str(at, &junk);
            let cat = user_set(&text);
            for w in &cat.warnings {
                prop_assert!(w.line <= text.lines().count() + 1, "{}", w);
            }
        }
    }
}

//! Planning sessions on disk: the tree survives a reload, a torn record is reported and
//! skipped, nothing is rewritten, a process killed at any moment loses no committed change,
//! and sessions export to Markdown, JSON and CSV.

mod common;

use std::io::{BufRead, BufReader, Write};
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

use common::cat;
use nonet::chem::{count, parse};
use nonet::session::export::{self, Scope};
use nonet::session::Session;
use proptest::prelude::*;

fn temp_dir(tag: &str) -> PathBuf {
    common::cli::scratch_dir(tag)
}

const FORMULAS: &[&str] = &[
    "IrCl(CO)(PPh3)2",
    "IrH2Cl(CO)(PPh3)2",
    "CpFe(CO)2Me",
    "Cr(CO)6",
    "[Co(NH3)6]3+",
];

fn commit(s: &mut Session, parent: Option<u64>, action: &str, f: &str) -> u64 {
    let c = parse(f, cat()).expect("formula");
    let change = if parent.is_none() {
        nonet::session::Change::Start
    } else {
        nonet::session::Change::Edit
    };
    s.commit(parent, action, &c, &count(&c), change)
        .expect("commit")
}

proptest! {
    #![proptest_config(ProptestConfig {
        cases: 40,
        failure_persistence: None,
        ..ProptestConfig::default()
    })]

    /// Any sequence of commits (from any earlier variant, so with branches) and bookmarks,
    /// replayed from the log, rebuilds the same tree.
    #[test]
    fn replaying_the_log_rebuilds_the_same_tree(
        ops in proptest::collection::vec((0usize..100, 0usize..5, any::<bool>()), 1..30)
    ) {
        let dir = temp_dir("replay");
        let mut s = Session::open(&dir, "p").expect("open");
        for (i, (parent_pick, f, mark)) in ops.iter().enumerate() {
            let parent = if s.variants.is_empty() {
                None
            } else {
                Some(s.variants[parent_pick % s.variants.len()].id)
            };
            let id = commit(&mut s, parent, &format!("change {i}"), FORMULAS[*f]);
            if *mark {
                s.bookmark(id, &format!("mark {i}")).expect("bookmark");
            }
        }
        let back = Session::load(&dir.join("p.jsonl")).expect("load");
        prop_assert!(back.problems.is_empty());
        prop_assert_eq!(&back.variants, &s.variants);
        prop_assert_eq!(&back.bookmarks, &s.bookmarks);
        let ids = |x: &Session| x.tree().iter().map(|(d, v)| (*d, v.id)).collect::<Vec<_>>();
        prop_assert_eq!(ids(&back), ids(&s));
        let _ = std::fs::remove_dir_all(&dir);
    }
}

#[test]
fn going_back_and_committing_starts_a_branch() {
    let dir = temp_dir("branch");
    let mut s = Session::open(&dir, "b").expect("open");
    let root = commit(&mut s, None, "start", FORMULAS[0]);
    let a = commit(&mut s, Some(root), "oxidative-addition H2", FORMULAS[1]);
    let b = commit(&mut s, Some(root), "swap PPh3 for PMe3", FORMULAS[2]);
    assert_eq!(s.get(a).and_then(|v| v.parent), Some(root));
    assert_eq!(s.get(b).and_then(|v| v.parent), Some(root));
    let tree = s.tree();
    assert_eq!(
        tree.iter().map(|(d, _)| *d).collect::<Vec<_>>(),
        vec![0, 1, 1]
    );
    assert_eq!(s.path_to(b), vec![root, b]);
}

#[test]
fn a_torn_last_record_is_reported_skipped_and_never_rewritten() {
    let dir = temp_dir("torn");
    let path = dir.join("t.jsonl");
    {
        let mut s = Session::open(&dir, "t").expect("open");
        commit(&mut s, None, "start", FORMULAS[0]);
        commit(&mut s, Some(0), "next", FORMULAS[1]);
    }
    let intact = std::fs::read(&path).expect("read");
    // a process killed mid-write leaves half a record without its newline
    let mut f = std::fs::OpenOptions::new()
        .append(true)
        .open(&path)
        .expect("append");
    f.write_all(b"{\"kind\":\"variant\",\"nonet_ses")
        .expect("write");
    drop(f);
    let s = Session::load(&path).expect("load");
    assert_eq!(s.variants.len(), 2);
    assert_eq!(s.problems.len(), 1);
    assert!(
        s.problems[0].message.contains("cut off"),
        "{:?}",
        s.problems
    );
    // the next start appends on a fresh line; what was there stays byte for byte
    let mut s = Session::open(&dir, "t").expect("reopen");
    commit(&mut s, Some(1), "after the crash", FORMULAS[3]);
    let now = std::fs::read(&path).expect("read");
    assert!(now.starts_with(&intact), "earlier records were rewritten");
    let s = Session::load(&path).expect("load");
    assert_eq!(s.variants.len(), 3);
    assert_eq!(
        s.problems.len(),
        1,
        "the torn line is reported, not lost silently"
    );
}

#[test]
fn bad_session_names_are_refused() {
    let dir = temp_dir("names");
    for bad in ["", "../x", "a/b", ".hidden", "with space"] {
        assert!(Session::open(&dir, bad).is_err(), "{bad:?}");
    }
    assert!(Session::open_existing(&dir, "missing").is_err());
}

#[test]
fn exports_in_three_formats_whole_tree_and_one_path() {
    let dir = temp_dir("export");
    let mut s = Session::open(&dir, "e").expect("open");
    let root = commit(&mut s, None, "start", FORMULAS[0]);
    let a = commit(&mut s, Some(root), "oxidative-addition H2", FORMULAS[1]);
    commit(&mut s, Some(root), "a | pipe", FORMULAS[2]);
    s.bookmark(a, "dihydride").expect("bookmark");
    let md = export::markdown(&s, &Scope::Tree);
    assert!(md.contains("| # | parent | change |"));
    assert!(md.contains("dihydride"));
    assert!(md.contains("a \\| pipe"), "pipes escaped in Markdown cells");
    assert_eq!(md.lines().filter(|l| l.starts_with("| ")).count(), 4);
    let csv = export::csv(&s, &Scope::Path(a));
    assert_eq!(
        csv.lines().count(),
        3,
        "header and the two variants on the path"
    );
    assert!(csv.lines().nth(2).is_some_and(|l| l.contains(",18,")));
    let json: serde_json::Value =
        serde_json::from_str(&export::json(&s, &Scope::Tree)).expect("valid JSON");
    assert_eq!(json["variants"].as_array().map(|v| v.len()), Some(3));
    assert_eq!(json["variants"][1]["bookmark"], "dihydride");
}

fn nonet(data: &Path) -> Command {
    common::cli::command(data)
}

#[test]
fn the_cli_lists_and_exports_sessions_and_records_steps() {
    let data = temp_dir("cli");
    let out = nonet(&data)
        .args([
            "step",
            "--session",
            "vaska",
            "IrCl(CO)(PPh3)2",
            "oxidative-addition H2",
        ])
        .output()
        .expect("run");
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let out = nonet(&data)
        .args(["sessions", "--json"])
        .output()
        .expect("run");
    let line = String::from_utf8_lossy(&out.stdout);
    let v: serde_json::Value = serde_json::from_str(line.trim()).expect("json");
    assert_eq!(v["name"], "vaska");
    assert_eq!(v["variants"], 2);
    let out = nonet(&data)
        .args(["export", "vaska", "--format", "csv"])
        .output()
        .expect("run");
    let csv = String::from_utf8_lossy(&out.stdout);
    assert!(csv.contains("oxidative-addition H2"), "{csv}");
    let out = nonet(&data).args(["export", "nope"]).output().expect("run");
    assert_eq!(out.status.code(), Some(2));
    let out = nonet(&data)
        .args(["export", "vaska", "--format", "pdf"])
        .output()
        .expect("run");
    assert_eq!(out.status.code(), Some(2));
    let out = nonet(&data)
        .args(["export", "vaska", "--path", "nowhere"])
        .output()
        .expect("run");
    assert_eq!(out.status.code(), Some(2));
}

/// Two children commit steps to one session at once and are killed with SIGKILL at random
/// moments; every step either reported committed must be in the log, and the log must load.
#[test]
fn processes_killed_at_any_moment_lose_no_committed_change() {
    let steps: Vec<&str> = (0..3000)
        .map(|i| if i % 2 == 0 { "oxidation" } else { "reduction" })
        .collect();
    let mut seed = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map_or(7, |d| d.subsec_nanos() as u64)
        | 1;
    let mut next = move || {
        // xorshift: a kill time between 5 and 400 ms
        seed ^= seed << 13;
        seed ^= seed >> 7;
        seed ^= seed << 17;
        Duration::from_millis(5 + seed % 395)
    };
    let mut committed = [0usize; 2];
    // six rounds at least, more on a loaded machine until each writer was cut off mid-run
    for round in 0..40 {
        if round >= 6 && committed.iter().all(|&n| n > 0) {
            break;
        }
        let data = temp_dir("crash");
        let writers: Vec<_> = ["Cp2Fe", "Cp2Co"]
            .iter()
            .map(|formula| {
                let mut child = nonet(&data)
                    .args(["step", "--json", "--session", "crash", formula])
                    .args(&steps)
                    .stdout(Stdio::piped())
                    .stderr(Stdio::null())
                    .spawn()
                    .expect("spawn");
                let stdout = child.stdout.take().expect("stdout");
                let reader = std::thread::spawn(move || {
                    let mut ids = Vec::new();
                    for line in BufReader::new(stdout).lines() {
                        let Ok(line) = line else { break };
                        if let Ok(v) = serde_json::from_str::<serde_json::Value>(&line) {
                            if let Some(id) = v["variant"].as_u64() {
                                ids.push(id);
                            }
                        }
                    }
                    ids
                });
                (child, reader, next())
            })
            .collect();
        let start = Instant::now();
        let mut reported = Vec::new();
        for (w, (mut child, reader, wait)) in writers.into_iter().enumerate() {
            while start.elapsed() < wait {
                if child.try_wait().ok().flatten().is_some() {
                    break;
                }
                std::thread::sleep(Duration::from_millis(1));
            }
            let _ = child.kill(); // SIGKILL
            let _ = child.wait();
            let ids = reader.join().expect("reader");
            committed[w] += ids.len();
            reported.extend(ids);
        }
        let log = data.join("sessions").join("crash.jsonl");
        if !log.exists() {
            // killed before the session was created: then nothing may have been reported
            assert!(
                reported.is_empty(),
                "round {round}: reported commits but no log"
            );
            continue;
        }
        let s = Session::load(&log).expect("the log loads");
        for id in &reported {
            assert!(
                s.get(*id).is_some(),
                "round {round}: variant {id} was reported committed but is not in the log"
            );
        }
        let ids: std::collections::HashSet<u64> = reported.iter().copied().collect();
        assert_eq!(
            ids.len(),
            reported.len(),
            "round {round}: an id reported twice"
        );
        assert!(
            s.problems.iter().all(|p| p.message.contains("cut off")),
            "round {round}: only torn records may be skipped: {:?}",
            s.problems
        );
        // the session opens again and takes more commits
        let mut s = Session::open(&data.join("sessions"), "crash").expect("reopen");
        let parent = s.last().map(|v| v.id);
        commit(&mut s, parent, "after the kill", "Cp2Fe");
        let _ = std::fs::remove_dir_all(&data);
    }
    // the kills must land while changes are being committed, or the test proves nothing
    assert!(
        committed.iter().all(|&n| n > 0),
        "a writer committed nothing before the kills: {committed:?}"
    );
}

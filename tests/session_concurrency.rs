//! Several writers on one session at once (two logins, a script recording steps while the
//! planner is open): every commit any of them reports is in the log afterwards, under an id of
//! its own, with its parent link intact.

mod common;

use std::collections::{HashMap, HashSet};
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};

use common::cat;
use nonet::chem::{count, parse};
use nonet::session::{Change, LogFile, Made, Session};

fn temp_dir(tag: &str) -> PathBuf {
    common::cli::scratch_dir(tag)
}

fn nonet(data: &Path) -> Command {
    common::cli::command(data)
}

/// 8 processes record 25 steps each into one session at the same time: 200 step commits (and
/// a start record from each process that finds another complex last). Before ids were drawn
/// under the log's lock from a re-read tail, and duplicates kept on reload, about a fifth of
/// them vanished.
#[test]
fn concurrent_processes_lose_no_commit() {
    const PROCESSES: usize = 8;
    const STEPS: usize = 25;
    let data = temp_dir("concurrent");
    let steps: Vec<&str> = (0..STEPS)
        .map(|i| if i % 2 == 0 { "oxidation" } else { "reduction" })
        .collect();
    // a different complex per process, so each records its own start and chain
    let formulas = [
        "Cp2Fe", "Cp2Co", "Cp2Ru", "Cp2Os", "Cr(CO)6", "Mo(CO)6", "W(CO)6", "Ni(CO)4",
    ];
    let children: Vec<_> = (0..PROCESSES)
        .map(|p| {
            nonet(&data)
                .args(["step", "--json", "--session", "shared", formulas[p]])
                .args(&steps)
                .stdout(Stdio::piped())
                .stderr(Stdio::piped())
                .spawn()
                .expect("spawn")
        })
        .collect();
    let mut reported: Vec<(usize, u64)> = Vec::new();
    for (p, child) in children.into_iter().enumerate() {
        let out = child.wait_with_output().expect("wait");
        assert!(
            out.status.success(),
            "process {p}: {}",
            String::from_utf8_lossy(&out.stderr)
        );
        for line in String::from_utf8_lossy(&out.stdout).lines() {
            let v: serde_json::Value = serde_json::from_str(line).expect("a JSON line");
            if v.get("step").is_some() {
                reported.push((p, v["variant"].as_u64().expect("a recorded variant")));
            }
        }
    }
    assert_eq!(reported.len(), PROCESSES * STEPS);
    let log = data.join("sessions").join("shared.jsonl");
    let text = std::fs::read_to_string(&log).expect("the log");
    let written = text.lines().filter(|l| l.contains("\"variant\"")).count();
    let s = Session::load(&log).expect("the log loads");
    let ids: HashSet<u64> = s.variants.iter().map(|v| v.id).collect();
    let steps_in_log = s.variants.iter().filter(|v| v.made == Made::Step).count();
    eprintln!(
        "{} step commits reported, {} variant records written, {} variants loaded ({} of them \
         steps), {} distinct ids",
        reported.len(),
        written,
        s.variants.len(),
        steps_in_log,
        ids.len()
    );
    assert_eq!(
        steps_in_log,
        PROCESSES * STEPS,
        "step commits lost: {:?}",
        s.problems
    );
    assert_eq!(s.variants.len(), written, "every record written is loaded");
    assert_eq!(ids.len(), s.variants.len(), "ids are distinct");
    // every process's chain is whole: each reported variant hangs from the one reported before
    let mut last: HashMap<usize, u64> = HashMap::new();
    for (p, id) in reported {
        let v = s
            .get(id)
            .unwrap_or_else(|| panic!("reported variant {id} missing"));
        if let Some(prev) = last.insert(p, id) {
            assert_eq!(v.parent, Some(prev), "process {p}: variant {id}");
        }
    }
    let _ = std::fs::remove_dir_all(&data);
}

/// A log file whose advisory lock is never granted, as on a network file system without
/// working locks: ids must stay apart without it.
struct NoLock(std::fs::File);

impl LogFile for NoLock {
    fn size(&mut self) -> std::io::Result<u64> {
        self.0.size()
    }
    fn read_at(&mut self, offset: u64, buf: &mut [u8]) -> std::io::Result<usize> {
        self.0.read_at(offset, buf)
    }
    fn append(&mut self, bytes: &[u8]) -> std::io::Result<()> {
        self.0.append(bytes)
    }
    fn sync(&mut self) -> std::io::Result<()> {
        self.0.sync()
    }
}

/// Threads, each with a session of its own on one log (as separate processes have), commit
/// at once; with `locks` false the log's lock is never taken. Gives the uids each thread
/// committed, in order.
fn commit_from_threads(path: &Path, threads: usize, each: usize, locks: bool) -> Vec<Vec<String>> {
    let handles: Vec<_> = (0..threads)
        .map(|t| {
            let path = path.to_path_buf();
            std::thread::spawn(move || {
                let file = nonet::session::log::open_append(&path).expect("open");
                let file: Box<dyn LogFile + Send + Sync> = if locks {
                    Box::new(file)
                } else {
                    Box::new(NoLock(file))
                };
                let mut s = Session::with_log_file("shared", &path, file).expect("session");
                let c = parse(["Cp2Fe", "Cp2Co", "Cp2Ru", "Cr(CO)6"][t % 4], cat()).expect("f");
                let r = count(&c);
                let mut parent = None;
                let mut uids = Vec::new();
                for i in 0..each {
                    let change = if parent.is_none() {
                        Change::Start
                    } else {
                        Change::Edit
                    };
                    let id = s
                        .commit(parent, &format!("thread {t} change {i}"), &c, &r, change)
                        .expect("commit");
                    let v = s.get(id).expect("the committed variant");
                    assert_eq!(v.action, format!("thread {t} change {i}"));
                    uids.push(v.uid.clone().expect("a uid"));
                    parent = Some(id);
                }
                uids
            })
        })
        .collect();
    handles
        .into_iter()
        .map(|h| h.join().expect("thread"))
        .collect()
}

fn check_threads(path: &Path, committed: &[Vec<String>]) {
    let s = Session::load(path).expect("load");
    let total: usize = committed.iter().map(Vec::len).sum();
    assert_eq!(s.variants.len(), total, "{:?}", s.problems);
    let ids: HashSet<u64> = s.variants.iter().map(|v| v.id).collect();
    assert_eq!(ids.len(), total, "ids are distinct");
    for uids in committed {
        let mut parent = None;
        for u in uids {
            let v = s.by_uid(u).expect("every committed variant is in the log");
            assert_eq!(v.parent, parent, "the chain is intact");
            parent = Some(v.id);
        }
    }
}

#[test]
fn concurrent_sessions_in_threads_lose_no_commit() {
    let dir = temp_dir("threads");
    let path = dir.join("shared.jsonl");
    let committed = commit_from_threads(&path, 8, 25, true);
    check_threads(&path, &committed);
    let s = Session::load(&path).expect("load");
    assert!(s.problems.is_empty(), "{:?}", s.problems);
    let _ = std::fs::remove_dir_all(&dir);
}

/// Without the lock two writers can choose one id; both records load, the later under the
/// next free id, and every parent link still holds (it goes by uid).
#[test]
fn concurrent_sessions_without_locks_lose_no_commit() {
    let dir = temp_dir("nolock");
    let path = dir.join("shared.jsonl");
    let committed = commit_from_threads(&path, 8, 25, false);
    check_threads(&path, &committed);
    let s = Session::load(&path).expect("load");
    eprintln!(
        "without locks: {} duplicate ids re-keyed on load",
        s.problems
            .iter()
            .filter(|p| p.message.contains("already used"))
            .count()
    );
    let _ = std::fs::remove_dir_all(&dir);
}

/// A log where two writers chose the same ids (a lost lock): every record loads, later
/// duplicates get the next free ids (the same on every load), the problem is reported with
/// its line, and links follow uids rather than numbers.
#[test]
fn colliding_ids_are_all_kept_on_reload() {
    let dir = temp_dir("collide");
    let line = |id: u64, parent: Option<u64>, uid: &str, parent_uid: Option<&str>| {
        let mut v = serde_json::json!({
            "kind": "variant", "nonet_session": 1, "id": id, "parent": parent,
            "time": "2026-01-01T00:00:00Z", "action": format!("by {uid}"), "formula": "Cr(CO)6",
            "counts": {"electron_count": 18, "oxidation_state": 0, "d_electrons": 6,
                       "coordination_number": 6, "saturation": "saturated",
                       "unpaired_electrons": 0},
            "made_by": "edit", "uid": uid,
        });
        if let Some(p) = parent_uid {
            v["parent_uid"] = p.into();
        }
        v.to_string()
    };
    let lines = [
        line(0, None, "a0", None),
        line(1, Some(0), "a1", Some("a0")),
        line(1, Some(0), "b1", Some("a0")), // b chose 1 too
        line(2, Some(1), "b2", Some("b1")), // b's 2 hangs from b's 1
        line(2, Some(1), "a2", Some("a1")), // a's 2 hangs from a's 1
        r#"{"kind":"bookmark","nonet_session":1,"id":1,"name":"b's","time":"t","variant_uid":"b1"}"#
            .to_string(),
    ];
    let path = dir.join("c.jsonl");
    std::fs::write(&path, lines.join("\n") + "\n").expect("write");
    let s = Session::load(&path).expect("load");
    assert_eq!(s.variants.len(), 5);
    let id = |u: &str| s.by_uid(u).map(|v| v.id).expect("loaded");
    let parent = |u: &str| s.by_uid(u).and_then(|v| v.parent);
    assert_eq!(
        (id("a0"), id("a1"), id("b1"), id("b2"), id("a2")),
        (0, 1, 2, 3, 4)
    );
    assert_eq!(parent("b2"), Some(id("b1")));
    assert_eq!(parent("a2"), Some(id("a1")));
    assert_eq!(s.find("b's").map(|v| v.id), Some(id("b1")));
    let lines_noted: Vec<usize> = s.problems.iter().map(|p| p.line).collect();
    assert_eq!(lines_noted, vec![3, 4, 5], "{:?}", s.problems);
    // a writer opened on it carries on after the largest id
    let mut w = Session::open(&dir, "c").expect("open");
    let c = parse("Cr(CO)6", cat()).expect("formula");
    let n = w
        .commit(Some(id("b2")), "more", &c, &count(&c), Change::Edit)
        .expect("commit");
    assert_eq!(n, 5);
    let again = Session::load(&path).expect("load");
    assert_eq!(again.variants, w.variants, "the same numbers on every load");
    let _ = std::fs::remove_dir_all(&dir);
}

/// The planner notices what another process added: `refresh` gives the new variants once.
#[test]
fn refresh_reports_variants_other_processes_added() {
    let dir = temp_dir("refresh");
    let mut mine = Session::open(&dir, "r").expect("open");
    let c = parse("Cp2Fe", cat()).expect("formula");
    let r = count(&c);
    let root = mine
        .commit(None, "start", &c, &r, Change::Start)
        .expect("commit");
    assert!(
        mine.refresh().expect("refresh").is_empty(),
        "my own commit is not news"
    );
    let mut other = Session::open(&dir, "r").expect("open");
    let a = other
        .commit(Some(root), "theirs 1", &c, &r, Change::Edit)
        .expect("commit");
    let b = other
        .commit(Some(a), "theirs 2", &c, &r, Change::Edit)
        .expect("commit");
    assert_eq!(mine.refresh().expect("refresh"), vec![a, b]);
    assert!(mine.refresh().expect("refresh").is_empty(), "reported once");
    assert_eq!(mine.path_to(b), vec![root, a, b]);
    // met while writing, reported at the next refresh
    other
        .commit(Some(b), "theirs 3", &c, &r, Change::Edit)
        .expect("commit");
    let own = mine
        .commit(Some(root), "mine", &c, &r, Change::Edit)
        .expect("commit");
    assert_eq!(own, b + 2, "my id comes after theirs");
    assert_eq!(mine.refresh().expect("refresh"), vec![b + 1]);
    let mut memory = Session::in_memory("m");
    assert!(memory.refresh().expect("refresh").is_empty());
    let _ = std::fs::remove_dir_all(&dir);
}

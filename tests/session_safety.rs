//! Sessions lose nothing on odd input or hostile surroundings: a full disk mid-record, ids at
//! the integer limit, parent links that loop, bookmarks to nothing, records from a newer
//! nonet, logs that are links, a data directory that is a file, and trees deep enough to
//! make a careless export quadratic.

mod common;

use std::io::Write;
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};

use common::cat;
use nonet::chem::{count, parse};
use nonet::session::export::{self, Scope};
use nonet::session::{self as session, Change, Session, SessionError};

fn temp_dir(tag: &str) -> PathBuf {
    common::cli::scratch_dir(tag)
}

fn commit(s: &mut Session, parent: Option<u64>, action: &str, f: &str) -> u64 {
    let c = parse(f, cat()).expect("formula");
    let change = if parent.is_none() {
        Change::Start
    } else {
        Change::Edit
    };
    s.commit(parent, action, &c, &count(&c), change)
        .expect("commit")
}

/// A variant line as nonet writes it, with the id, parent and format given.
fn variant_line(format: u32, id: &str, parent: &str) -> String {
    format!(
        r#"{{"kind":"variant","nonet_session":{format},"id":{id},"parent":{parent},"time":"2026-01-01T00:00:00Z","action":"change {id}","formula":"Cr(CO)6","counts":{{"electron_count":18,"oxidation_state":0,"d_electrons":6,"coordination_number":6,"saturation":"saturated","unpaired_electrons":0}},"made_by":"edit"}}"#
    )
}

fn write_log(dir: &Path, name: &str, lines: &[String]) -> PathBuf {
    let path = dir.join(format!("{name}.jsonl"));
    let mut text = lines.join("\n");
    text.push('\n');
    std::fs::write(&path, text).expect("write log");
    path
}

fn problem_at(s: &Session, line: usize) -> String {
    s.problems
        .iter()
        .filter(|p| p.line == line)
        .map(|p| p.message.clone())
        .collect::<Vec<_>>()
        .join(" / ")
}

/// A process with a file-size limit (a full disk, a quota) stops in the middle of a record.
/// A planner that had the session open before that must not join its next record to the
/// torn line: the change it reports recorded is in the log.
#[test]
fn a_change_after_another_writer_hit_a_full_disk_is_not_lost() {
    let steps: Vec<&str> = (0..200)
        .map(|i| if i % 2 == 0 { "oxidation" } else { "reduction" })
        .collect();
    let mut torn = false;
    for extra_blocks in 0..4u64 {
        let data = temp_dir("fsize");
        let dir = data.join("sessions");
        let mut planner = Session::open(&dir, "full").expect("open");
        let root = commit(&mut planner, None, "start", "Cp2Fe");
        let log = dir.join("full.jsonl");
        let start = std::fs::metadata(&log).expect("log").len();
        // room for a few records, then the limit falls inside one (512-byte blocks in sh)
        let blocks = (start + 2000) / 512 + 1 + extra_blocks;
        let script = format!(
            "trap '' XFSZ; ulimit -f {blocks}; exec \"$0\" step --json --session full Cp2Fe {}",
            steps.join(" ")
        );
        // sh runs the script with the binary as $0
        let out = Command::new("sh")
            .arg("-c")
            .arg(&script)
            .arg(common::cli::BIN)
            .env("NONET_DATA_DIR", &data)
            .env("NONET_CONFIG_DIR", data.join("config"))
            .stdin(Stdio::null())
            .output()
            .expect("run under a file-size limit");
        assert!(!out.status.success(), "the limit must stop the writer");
        let reported: Vec<u64> = String::from_utf8_lossy(&out.stdout)
            .lines()
            .filter_map(|l| serde_json::from_str::<serde_json::Value>(l).ok())
            .filter_map(|v| v["variant"].as_u64())
            .collect();
        let bytes = std::fs::read(&log).expect("log");
        if bytes.ends_with(b"\n") {
            continue; // the limit fell between two records: try another size
        }
        torn = true;
        // the planner records a change after the other writer's torn record
        let id = commit(&mut planner, Some(root), "after the full disk", "Cp2Co");
        let back = Session::load(&log).expect("the log loads");
        let v = back
            .get(id)
            .expect("the change reported recorded is in the log");
        assert_eq!(v.action, "after the full disk");
        for r in &reported {
            assert!(back.get(*r).is_some(), "reported variant {r} is in the log");
        }
        assert!(
            back.problems.iter().all(|p| p.message.contains("cut off")),
            "{:?}",
            back.problems
        );
        assert_eq!(back.problems.len(), 1, "{:?}", back.problems);
        let _ = std::fs::remove_dir_all(&data);
        break;
    }
    assert!(torn, "the file-size limit never tore a record");
}

/// A log file that fails like a full disk from some byte on, under the real session.
struct Tight {
    file: std::fs::File,
    room: std::sync::Arc<std::sync::atomic::AtomicI64>,
    sync_fails: std::sync::Arc<std::sync::atomic::AtomicBool>,
}

impl session::LogFile for Tight {
    fn size(&mut self) -> std::io::Result<u64> {
        self.file.size()
    }
    fn read_at(&mut self, offset: u64, buf: &mut [u8]) -> std::io::Result<usize> {
        self.file.read_at(offset, buf)
    }
    fn append(&mut self, bytes: &[u8]) -> std::io::Result<()> {
        use std::sync::atomic::Ordering;
        let room = self.room.load(Ordering::SeqCst);
        if room >= 0 && (bytes.len() as i64) > room {
            let part = &bytes[..room as usize];
            self.file.write_all(part)?;
            self.room.store(0, Ordering::SeqCst);
            return Err(std::io::Error::new(
                std::io::ErrorKind::StorageFull,
                "No space left on device",
            ));
        }
        if room >= 0 {
            self.room.store(room - bytes.len() as i64, Ordering::SeqCst);
        }
        self.file.write_all(bytes)
    }
    fn sync(&mut self) -> std::io::Result<()> {
        if self.sync_fails.load(std::sync::atomic::Ordering::SeqCst) {
            return Err(std::io::Error::other("Input/output error"));
        }
        self.file.sync_data()
    }
}

/// The same inside one session: a commit fails half-way (no space left), space is freed, the
/// next commit is recorded and loads, and nothing claimed the failed one was recorded.
#[test]
fn the_commit_after_a_failed_one_is_recorded() {
    let dir = temp_dir("tight");
    let path = dir.join("t.jsonl");
    let room = std::sync::Arc::new(std::sync::atomic::AtomicI64::new(-1));
    let sync_fails = std::sync::Arc::new(std::sync::atomic::AtomicBool::new(false));
    let file = nonet::session::log::open_append(&path).expect("open");
    let mut s = Session::with_log_file(
        "t",
        &path,
        Box::new(Tight {
            file,
            room: room.clone(),
            sync_fails: sync_fails.clone(),
        }),
    )
    .expect("session");
    let root = commit(&mut s, None, "start", "Cp2Fe");
    room.store(100, std::sync::atomic::Ordering::SeqCst);
    let c = parse("Cp2Co", cat()).expect("formula");
    let failed = s.commit(Some(root), "on a full disk", &c, &count(&c), Change::Edit);
    assert!(failed.is_err(), "a commit on a full disk is an error");
    assert_eq!(s.variants.len(), 1, "the failed change is not in the tree");
    room.store(-1, std::sync::atomic::Ordering::SeqCst); // space freed
    let id = commit(&mut s, Some(root), "after freeing space", "Cp2Ru");
    let back = Session::load(&path).expect("load");
    assert_eq!(back.variants.len(), 2);
    assert_eq!(
        back.get(id).map(|v| v.action.as_str()),
        Some("after freeing space")
    );
    assert_eq!(back.variants, s.variants);
    assert_eq!(back.problems.len(), 1, "the torn record is reported");
    // a failed sync is an error too; if the bytes reach the log after all, they show up as
    // this session's own change, not as another process's
    sync_fails.store(true, std::sync::atomic::Ordering::SeqCst);
    let c = parse("Cp2Os", cat()).expect("formula");
    let unsure = s.commit(Some(id), "sync fails", &c, &count(&c), Change::Edit);
    assert!(unsure.is_err(), "a change is recorded only once durable");
    sync_fails.store(false, std::sync::atomic::Ordering::SeqCst);
    assert!(s.refresh().expect("refresh").is_empty());
    assert_eq!(s.last().map(|v| v.action.as_str()), Some("sync fails"));
    let _ = std::fs::remove_dir_all(&dir);
}

/// Ids at the top of u64: taking the next one does not overflow, and every variant keeps an
/// id of its own.
#[test]
fn ids_at_the_integer_limit_do_not_overflow() {
    let dir = temp_dir("maxid");
    write_log(
        &dir,
        "m",
        &[
            variant_line(1, "0", "null"),
            variant_line(1, &u64::MAX.to_string(), "0"),
        ],
    );
    let mut s = Session::open(&dir, "m").expect("open");
    let a = commit(&mut s, Some(u64::MAX), "past the limit", "Cp2Fe");
    let b = commit(&mut s, Some(a), "and again", "Cp2Co");
    assert!(a != u64::MAX && b != u64::MAX && a != b && a != 0 && b != 0);
    let back = Session::load(&dir.join("m.jsonl")).expect("load");
    assert_eq!(back.variants.len(), 4);
    assert_eq!(back.path_to(b), vec![0, u64::MAX, a, b]);
    assert!(back.problems.is_empty(), "{:?}", back.problems);
    // an in-memory session too
    let mut m = Session::in_memory("m");
    let c = parse("Cp2Fe", cat()).expect("formula");
    let record = m.prepare(None, "start", &c, &count(&c), Change::Start);
    assert_eq!(m.admit(record), 0);
    let _ = std::fs::remove_dir_all(&dir);
}

/// Parent links that loop (hand-edited or damaged logs) are reported with their lines and
/// broken; every variant still shows in the tree, and depth, paths and exports terminate.
#[test]
fn parent_loops_are_reported_and_broken() {
    let dir = temp_dir("loops");
    let path = write_log(
        &dir,
        "l",
        &[
            variant_line(1, "1", "2"),
            variant_line(1, "2", "1"),
            variant_line(1, "3", "3"),
            variant_line(1, "4", "2"),
        ],
    );
    let s = Session::load(&path).expect("load");
    assert_eq!(s.variants.len(), 4);
    assert_eq!(s.tree().len(), 4, "every variant is in the tree");
    assert!(
        problem_at(&s, 1).contains("not recorded before it"),
        "{:?}",
        s.problems
    );
    assert!(problem_at(&s, 3).contains("itself"), "{:?}", s.problems);
    assert_eq!(s.problems.len(), 2, "{:?}", s.problems);
    assert_eq!(s.path_to(4), vec![1, 2, 4]);
    assert_eq!(s.depth(4), 2);
    assert_eq!(s.depth(3), 0);
    let md = export::markdown(&s, &Scope::Tree);
    assert_eq!(md.lines().filter(|l| l.starts_with("| ")).count(), 5);
    // a session opened on it takes new commits
    let mut w = Session::open(&dir, "l").expect("open");
    let id = commit(&mut w, Some(3), "more", "Cp2Fe");
    assert_eq!(w.path_to(id), vec![3, id]);
    let _ = std::fs::remove_dir_all(&dir);
}

/// A bookmark naming a variant that is not in the log is reported with its line and ignored.
#[test]
fn bookmarks_to_missing_variants_are_reported() {
    let dir = temp_dir("marks");
    let path = write_log(
        &dir,
        "b",
        &[
            variant_line(1, "0", "null"),
            r#"{"kind":"bookmark","nonet_session":1,"id":0,"name":"here","time":"t"}"#.into(),
            r#"{"kind":"bookmark","nonet_session":1,"id":42,"name":"gone","time":"t"}"#.into(),
        ],
    );
    let s = Session::load(&path).expect("load");
    assert_eq!(s.bookmarks, vec![(0, "here".to_string())]);
    assert!(problem_at(&s, 3).contains("'gone'"), "{:?}", s.problems);
    assert!(s.find("gone").is_none());
    let _ = std::fs::remove_dir_all(&dir);
}

/// Records from a newer nonet are reported with the line of the first; what this version can
/// read of them loads, kinds it does not know are skipped, and the rest of the log loads.
#[test]
fn records_from_a_newer_format_are_reported_and_read_around() {
    let dir = temp_dir("future");
    let path = write_log(
        &dir,
        "f",
        &[
            variant_line(1, "0", "null"),
            variant_line(9, "1", "0"),
            r#"{"kind":"annotation","nonet_session":9,"id":1,"text":"hi"}"#.into(),
            variant_line(1, "2", "1"),
        ],
    );
    let s = Session::load(&path).expect("load");
    assert_eq!(s.variants.len(), 3);
    assert_eq!(s.path_to(2), vec![0, 1, 2]);
    assert!(
        problem_at(&s, 2).contains("newer nonet"),
        "{:?}",
        s.problems
    );
    assert!(
        problem_at(&s, 3).contains("newer nonet"),
        "{:?}",
        s.problems
    );
    let _ = std::fs::remove_dir_all(&dir);
}

/// Old logs (no uids) still load, and a session opened on one keeps writing the same fields.
#[test]
fn logs_without_uids_still_load() {
    let dir = temp_dir("old");
    write_log(
        &dir,
        "o",
        &[variant_line(1, "0", "null"), variant_line(1, "1", "0")],
    );
    let mut s = Session::open(&dir, "o").expect("open");
    assert!(s.problems.is_empty());
    let id = commit(&mut s, Some(1), "new", "Cp2Fe");
    assert_eq!(id, 2);
    let text = std::fs::read_to_string(dir.join("o.jsonl")).expect("read");
    let last: serde_json::Value =
        serde_json::from_str(text.lines().last().expect("a line")).expect("json");
    for field in [
        "kind",
        "nonet_session",
        "id",
        "parent",
        "time",
        "action",
        "formula",
        "counts",
        "uid",
    ] {
        assert!(last.get(field).is_some(), "{field} in {last}");
    }
    assert!(last.get("parent_uid").is_none(), "the parent has no uid");
    let _ = std::fs::remove_dir_all(&dir);
}

/// A session log that is a symbolic link is neither read nor written through; the listing
/// shows it with the reason instead of leaving it out.
#[cfg(unix)]
#[test]
fn session_logs_that_are_links_are_refused() {
    let data = temp_dir("links");
    let dir = data.join("sessions");
    std::fs::create_dir_all(&dir).expect("dir");
    let outside = data.join("precious.txt");
    std::fs::write(&outside, "not a session\n").expect("write");
    std::os::unix::fs::symlink(&outside, dir.join("evil.jsonl")).expect("link");
    std::os::unix::fs::symlink(data.join("nowhere"), dir.join("dangling.jsonl")).expect("link");
    for name in ["evil", "dangling"] {
        let e = Session::open(&dir, name).err().expect("refused");
        assert!(e.to_string().contains("symbolic link"), "{e}");
        assert!(Session::load(&dir.join(format!("{name}.jsonl"))).is_err());
    }
    assert_eq!(
        std::fs::read_to_string(&outside).expect("read"),
        "not a session\n"
    );
    assert!(
        !data.join("nowhere").exists(),
        "nothing created through a link"
    );
    let list = session::try_list(&dir).expect("list");
    assert_eq!(list.len(), 2);
    assert!(list.iter().all(|s| s.error.is_some() && s.problems > 0));
    let _ = std::fs::remove_dir_all(&data);
}

/// A FIFO under a log's name neither blocks the listing nor opens as a session.
#[cfg(unix)]
#[test]
fn a_fifo_named_like_a_log_does_not_block() {
    let dir = temp_dir("fifo");
    let fifo = dir.join("pipe.jsonl");
    let made = Command::new("mkfifo").arg(&fifo).status();
    if !made.is_ok_and(|s| s.success()) {
        return; // no mkfifo here
    }
    let list = session::try_list(&dir).expect("list");
    assert_eq!(list.len(), 1);
    assert!(list[0].error.is_some());
    assert!(Session::open(&dir, "pipe").is_err());
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn names_are_checked_in_one_place() {
    let long = "a".repeat(101);
    for bad in [
        "",
        "../x",
        "a/b",
        ".hidden",
        "with space",
        "x\0y",
        long.as_str(),
    ] {
        assert!(
            matches!(session::check_name(bad), Err(SessionError::BadName(_))),
            "{bad:?}"
        );
    }
    for good in ["plan-20261201-225001", "vaska", "a.b_c-d"] {
        assert!(session::check_name(good).is_ok(), "{good:?}");
    }
    let dir = temp_dir("names2");
    assert!(matches!(
        Session::load_existing(&dir, "../etc"),
        Err(SessionError::BadName(_))
    ));
    assert!(matches!(
        Session::load_existing(&dir, "missing"),
        Err(SessionError::NotFound(..))
    ));
    let _ = std::fs::remove_dir_all(&dir);
}

/// An export's output file is refused when it is, or leads to, a session log.
#[test]
fn exports_onto_session_logs_are_refused() {
    let data = temp_dir("target");
    let dir = data.join("sessions");
    let mut s = Session::open(&dir, "keep").expect("open");
    commit(&mut s, None, "start", "Cp2Fe");
    let log = dir.join("keep.jsonl");
    let dir_opt = Some(dir.as_path());
    assert!(session::is_session_log(dir_opt, &log));
    // through `..`, through a link, a hard link, a copy elsewhere, a new .jsonl in the dir
    assert!(session::is_session_log(
        dir_opt,
        &dir.join("..").join("sessions").join("keep.jsonl")
    ));
    assert!(session::is_session_log(dir_opt, &dir.join("new.jsonl")));
    #[cfg(unix)]
    {
        let link = data.join("link.md");
        std::os::unix::fs::symlink(&log, &link).expect("link");
        assert!(session::is_session_log(dir_opt, &link));
        let hard = data.join("hard.md");
        std::fs::hard_link(&log, &hard).expect("hard link");
        assert!(session::is_session_log(dir_opt, &hard));
    }
    let copy = data.join("backup.txt");
    std::fs::copy(&log, &copy).expect("copy");
    assert!(session::is_session_log(None, &copy));
    // ordinary outputs are fine
    let md = data.join("keep.md");
    assert!(!session::is_session_log(dir_opt, &md));
    std::fs::write(&md, "# notes\n").expect("write");
    assert!(!session::is_session_log(dir_opt, &md));
    assert!(!session::is_session_log(dir_opt, &dir.join("keep.md")));
    let e = session::check_export_target(dir_opt, &log).expect_err("refused");
    assert!(e.to_string().contains("session 'keep'"), "{e}");
    assert!(session::check_export_target(dir_opt, &md).is_ok());
    let _ = std::fs::remove_dir_all(&data);
}

/// A data directory that is a file is an error that says so, not an empty list.
#[test]
fn a_session_directory_that_is_a_file_is_an_error() {
    let data = temp_dir("dirfile");
    let dir = data.join("sessions");
    assert!(session::try_list(&dir)
        .expect("missing is empty")
        .is_empty());
    std::fs::File::create(&dir)
        .and_then(|mut f| f.write_all(b"x"))
        .expect("file");
    let e = session::try_list(&dir).expect_err("an error");
    assert!(matches!(e, SessionError::NotADirectory(_)), "{e}");
    assert!(e.to_string().contains("is a file"), "{e}");
    assert!(matches!(
        Session::open(&dir, "x"),
        Err(SessionError::NotADirectory(_))
    ));
    let _ = std::fs::remove_dir_all(&data);
}

fn chain(n: usize) -> Session {
    let mut s = Session::in_memory("deep");
    let made: Vec<_> = ["Cp2Fe", "Cp2Co", "Cp2Ru"]
        .iter()
        .map(|f| {
            let c = parse(f, cat()).expect("formula");
            let r = count(&c);
            (c, r)
        })
        .collect();
    let mut parent = None;
    for i in 0..n {
        let (c, r) = &made[i % made.len()];
        let change = if parent.is_none() {
            Change::Start
        } else {
            Change::Edit
        };
        parent = Some(s.commit(parent, "edit", c, r, change).expect("commit"));
    }
    s
}

/// A 100,000-deep chain exports to Markdown in size linear in its length (indentation by
/// depth made it about 15 GB), and quickly.
#[test]
fn markdown_export_is_linear_in_depth() {
    let n = 100_000;
    let s = chain(n);
    let start = std::time::Instant::now();
    let md = export::markdown(&s, &Scope::Tree);
    let elapsed = start.elapsed();
    let rows = md.lines().filter(|l| l.starts_with("| ")).count();
    assert_eq!(rows, n + 1);
    assert!(
        md.len() < n * 400,
        "{} bytes for {n} variants: not linear",
        md.len()
    );
    let half = export::markdown(&chain(n / 2), &Scope::Tree);
    let ratio = md.len() as f64 / half.len() as f64;
    assert!(
        (1.8..2.2).contains(&ratio),
        "size ratio {ratio} for twice the depth"
    );
    assert!(md.contains("·×99999 "), "deep rows show their depth");
    let path = export::markdown(&s, &Scope::Path(n as u64 - 1));
    assert!(path.len() < n * 400);
    let csv = export::csv(&s, &Scope::Tree);
    assert_eq!(csv.lines().count(), n + 1);
    eprintln!(
        "markdown of a {n}-deep chain: {} bytes in {elapsed:?}",
        md.len()
    );
    assert!(elapsed < std::time::Duration::from_secs(30));
}

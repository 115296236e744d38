//! The session log: one self-describing JSON object per line, appended and synced to disk as
//! each change is committed, never rewritten. A torn line (a killed process, a full disk, a
//! dropped link mid-write) is reported and skipped when the log is read, and the next record
//! always starts on a fresh line.

use std::fs::{File, OpenOptions};
use std::io::{self, Read, Seek, SeekFrom, Write};
use std::path::{Path, PathBuf};

use serde::{Deserialize, Serialize};

/// Format version written in every record.
pub const FORMAT: u32 = 1;

/// The counts a record keeps, so a log can be read (and exported) without recounting.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Counts {
    pub electron_count: serde_json::Value,
    pub oxidation_state: serde_json::Value,
    pub d_electrons: serde_json::Value,
    pub coordination_number: serde_json::Value,
    pub saturation: String,
    pub unpaired_electrons: Option<u8>,
}

/// A species that entered or left a step, as the log keeps it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SpeciesRecord {
    pub name: String,
    /// Hill formula.
    pub formula: String,
    pub smiles: String,
    pub charge: i32,
    pub count: u32,
}

/// One line of the log.
// records are read and written one at a time; boxing the variant would only add noise
#[allow(clippy::large_enum_variant)]
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum Record {
    /// A committed variant: the starting complex (no parent) or a change from its parent.
    Variant {
        nonet_session: u32,
        /// The number users see and type (`--path 7`); see `uid` for what makes it unique.
        id: u64,
        /// The parent's number as the writer saw it.
        parent: Option<u64>,
        time: String,
        /// What was done, in words ("swap CO for PMe3", "oxidative-addition H2").
        action: String,
        formula: String,
        counts: Counts,
        /// "start", "step" (chemistry, with what entered and left) or "edit" (a free what-if
        /// change); absent in logs written before it was recorded.
        #[serde(default, skip_serializing_if = "Option::is_none")]
        made_by: Option<String>,
        #[serde(default, skip_serializing_if = "Vec::is_empty")]
        enters: Vec<SpeciesRecord>,
        #[serde(default, skip_serializing_if = "Vec::is_empty")]
        leaves: Vec<SpeciesRecord>,
        /// 128 random bits in hex, unique across processes and hosts: two writers that chose
        /// the same `id` are still told apart. Absent in logs written before it was recorded.
        #[serde(default, skip_serializing_if = "Option::is_none")]
        uid: Option<String>,
        /// The parent's `uid`, when it has one: the link that holds even if numbers collided.
        #[serde(default, skip_serializing_if = "Option::is_none")]
        parent_uid: Option<String>,
    },
    /// A name given to a variant.
    Bookmark {
        nonet_session: u32,
        id: u64,
        name: String,
        time: String,
        /// The named variant's `uid`, when it has one.
        #[serde(default, skip_serializing_if = "Option::is_none")]
        variant_uid: Option<String>,
    },
}

impl Record {
    /// The session format the record was written in.
    pub fn format(&self) -> u32 {
        match self {
            Record::Variant { nonet_session, .. } | Record::Bookmark { nonet_session, .. } => {
                *nonet_session
            }
        }
    }
}

/// Something wrong found while reading a log; the rest of it still loads.
#[derive(Debug, Clone, PartialEq)]
pub struct LogProblem {
    pub line: usize,
    pub message: String,
}

/// Read every good record of a log, with the problems found on the way. A symbolic link is
/// refused (see `open_read`).
pub fn read(path: &Path) -> io::Result<(Vec<Record>, Vec<LogProblem>)> {
    let mut bytes = Vec::new();
    open_read(path)?.read_to_end(&mut bytes)?;
    Ok(parse(&bytes))
}

/// Parse log bytes: complete lines are records; a last line without its newline is torn.
pub fn parse(bytes: &[u8]) -> (Vec<Record>, Vec<LogProblem>) {
    let chunk = parse_chunk(bytes, 1);
    (
        chunk.records.into_iter().map(|(_, r)| r).collect(),
        chunk.problems,
    )
}

/// What a stretch of log bytes holds.
#[derive(Debug, Default)]
pub struct Chunk {
    /// Good records with their line numbers.
    pub records: Vec<(usize, Record)>,
    pub problems: Vec<LogProblem>,
    /// Bytes up to and including the last newline: where the next read starts (a torn last
    /// line is read again then, since another writer may have ended it by then).
    pub consumed: usize,
    /// Complete lines in `consumed`.
    pub lines: usize,
}

/// Parse log bytes whose first line is line `first_line` of the file.
pub fn parse_chunk(bytes: &[u8], first_line: usize) -> Chunk {
    let mut chunk = Chunk::default();
    let mut future: Option<(usize, u32, usize)> = None; // first line, newest format, how many
    let mut at = 0;
    let mut line = first_line;
    while at < bytes.len() {
        let (text, complete) = match bytes[at..].iter().position(|&b| b == b'\n') {
            Some(n) => (&bytes[at..at + n], true),
            None => (&bytes[at..], false),
        };
        if !complete {
            if !text.iter().all(u8::is_ascii_whitespace) {
                chunk.problems.push(LogProblem {
                    line,
                    message: "the last record was cut off while being written (the program was \
                              stopped or the disk was full); it is skipped"
                        .into(),
                });
            }
            break;
        }
        at += text.len() + 1;
        chunk.consumed = at;
        chunk.lines += 1;
        let this = line;
        line += 1;
        if text.iter().all(u8::is_ascii_whitespace) {
            continue;
        }
        match serde_json::from_slice::<Record>(text) {
            Ok(r) => {
                if r.format() > FORMAT {
                    let f = future.get_or_insert((this, r.format(), 0));
                    f.1 = f.1.max(r.format());
                    f.2 += 1;
                }
                chunk.records.push((this, r));
            }
            Err(e) => chunk.problems.push(LogProblem {
                line: this,
                message: unreadable(text, &e),
            }),
        }
    }
    if let Some((line, format, n)) = future {
        chunk.problems.push(LogProblem {
            line,
            message: format!(
                "written by a newer nonet (session format {format}; this one reads format \
                 {FORMAT}){}: read as far as this version understands it; update nonet to see \
                 everything",
                if n > 1 {
                    format!(", as are {} more records after it", n - 1)
                } else {
                    String::new()
                }
            ),
        });
    }
    chunk
}

/// Why a line is not a record, in words.
fn unreadable(text: &[u8], e: &serde_json::Error) -> String {
    #[derive(Deserialize)]
    struct Probe {
        nonet_session: Option<u32>,
        kind: Option<String>,
    }
    if e.is_eof() {
        return "a record was cut off while being written (a program was stopped or the disk \
                was full) and a later one starts on the next line; it is skipped"
            .into();
    }
    match serde_json::from_slice::<Probe>(text) {
        Ok(Probe {
            nonet_session: Some(f),
            kind,
        }) if f > FORMAT => format!(
            "a {} record written by a newer nonet (session format {f}; this one reads format \
             {FORMAT}); it is skipped: update nonet to read it",
            kind.as_deref().unwrap_or("kind of")
        ),
        _ => format!("not a readable record ({e}); it is skipped"),
    }
}

/// What the writer needs of a log file. A trait so that a test can put a failing file (a
/// full disk, a quota) under the real writer.
pub trait LogFile {
    /// The file's length now.
    fn size(&mut self) -> io::Result<u64>;
    /// Read at `offset` into `buf`; Ok(0) at the end.
    fn read_at(&mut self, offset: u64, buf: &mut [u8]) -> io::Result<usize>;
    /// Write `bytes` at the end of the file (one write call where the system allows, so whole
    /// lines of different processes do not interleave). On an error part of them may be
    /// written.
    fn append(&mut self, bytes: &[u8]) -> io::Result<()>;
    /// Make everything appended durable.
    fn sync(&mut self) -> io::Result<()>;
    /// Take the advisory lock that orders writers, waiting a little; false if it was not
    /// taken (then writing goes ahead: ids stay unique without it).
    fn lock(&mut self) -> bool {
        false
    }
    /// Release the advisory lock.
    fn unlock(&mut self) {}
}

impl LogFile for File {
    fn size(&mut self) -> io::Result<u64> {
        Ok(self.metadata()?.len())
    }

    fn read_at(&mut self, offset: u64, buf: &mut [u8]) -> io::Result<usize> {
        // appends go to the end whatever the position, so seeking to read is safe
        self.seek(SeekFrom::Start(offset))?;
        self.read(buf)
    }

    fn append(&mut self, bytes: &[u8]) -> io::Result<()> {
        self.write_all(bytes)
    }

    fn sync(&mut self) -> io::Result<()> {
        self.sync_data()
    }

    #[cfg(unix)]
    fn lock(&mut self) -> bool {
        use rustix::fs::{flock, FlockOperation};
        // a bounded wait: a writer stuck on a dead network mount must not hang this one
        let mut pause = std::time::Duration::from_millis(1);
        let give_up = std::time::Instant::now() + std::time::Duration::from_secs(2);
        loop {
            match flock(&*self, FlockOperation::NonBlockingLockExclusive) {
                Ok(()) => return true,
                Err(rustix::io::Errno::WOULDBLOCK) | Err(rustix::io::Errno::INTR) => {}
                Err(_) => return false, // no locks on this file system
            }
            if std::time::Instant::now() >= give_up {
                return false;
            }
            std::thread::sleep(pause);
            pause = (pause * 2).min(std::time::Duration::from_millis(50));
        }
    }

    #[cfg(unix)]
    fn unlock(&mut self) {
        let _ = rustix::fs::flock(&*self, rustix::fs::FlockOperation::Unlock);
    }
}

impl<F: LogFile + ?Sized> LogFile for Box<F> {
    fn size(&mut self) -> io::Result<u64> {
        (**self).size()
    }
    fn read_at(&mut self, offset: u64, buf: &mut [u8]) -> io::Result<usize> {
        (**self).read_at(offset, buf)
    }
    fn append(&mut self, bytes: &[u8]) -> io::Result<()> {
        (**self).append(bytes)
    }
    fn sync(&mut self) -> io::Result<()> {
        (**self).sync()
    }
    fn lock(&mut self) -> bool {
        (**self).lock()
    }
    fn unlock(&mut self) {
        (**self).unlock()
    }
}

/// Open flags that keep the data directory a boundary: a log that is a symbolic link is not
/// followed, and a FIFO planted under a log's name does not block the open.
#[cfg(unix)]
fn boundary(o: &mut OpenOptions) {
    use rustix::fs::OFlags;
    use std::os::unix::fs::OpenOptionsExt;
    o.custom_flags((OFlags::NOFOLLOW | OFlags::NONBLOCK).bits() as i32);
}

#[cfg(not(unix))]
fn boundary(_: &mut OpenOptions) {}

/// Refuse what is not a plain file before and after opening it.
fn plain_file(path: &Path, opened: Option<&File>) -> io::Result<()> {
    let meta = match opened {
        Some(f) => f.metadata()?,
        None => match std::fs::symlink_metadata(path) {
            Ok(m) => m,
            Err(e) if e.kind() == io::ErrorKind::NotFound => return Ok(()),
            Err(e) => return Err(e),
        },
    };
    if meta.file_type().is_symlink() {
        return Err(io::Error::other(
            "it is a symbolic link, and nonet does not follow links out of its data directory: \
             move the real file into the directory in its place",
        ));
    }
    if !meta.is_file() {
        return Err(io::Error::other(
            "it is not a plain file (a directory, a device or a pipe has its name): move it \
             aside",
        ));
    }
    Ok(())
}

/// Say in words why opening failed when the cause was a link (the system says "too many
/// levels of symbolic links").
fn explain_open(path: &Path, e: io::Error) -> io::Error {
    match std::fs::symlink_metadata(path) {
        Ok(m) if m.file_type().is_symlink() => plain_file(path, None).err().unwrap_or(e),
        _ => e,
    }
}

/// Open a log for reading, refusing symbolic links and anything but a plain file.
pub fn open_read(path: &Path) -> io::Result<File> {
    plain_file(path, None)?;
    let mut o = OpenOptions::new();
    o.read(true);
    boundary(&mut o);
    let f = o.open(path).map_err(|e| explain_open(path, e))?;
    plain_file(path, Some(&f))?;
    Ok(f)
}

/// Open (creating if needed) a log for appending and reading, refusing symbolic links and
/// anything but a plain file.
pub fn open_append(path: &Path) -> io::Result<File> {
    if let Some(dir) = path.parent() {
        std::fs::create_dir_all(dir)?;
    }
    plain_file(path, None)?;
    let existed = std::fs::symlink_metadata(path).is_ok();
    let mut o = OpenOptions::new();
    o.create(true).append(true).read(true);
    boundary(&mut o);
    let f = o.open(path).map_err(|e| explain_open(path, e))?;
    plain_file(path, Some(&f))?;
    if !existed {
        sync_dir(path);
    }
    Ok(f)
}

/// An open log for appending: each record goes on a line of its own, durable before `append`
/// returns.
pub struct Writer<F: LogFile = File> {
    file: F,
    pub path: PathBuf,
}

impl Writer<File> {
    /// Open (creating if needed) for appending; see `open_append`.
    pub fn open(path: &Path) -> io::Result<Writer<File>> {
        Ok(Writer {
            file: open_append(path)?,
            path: path.to_path_buf(),
        })
    }
}

impl<F: LogFile> Writer<F> {
    /// A writer on any log file (a test's failing one).
    pub fn new(file: F, path: &Path) -> Writer<F> {
        Writer {
            file,
            path: path.to_path_buf(),
        }
    }

    /// The log file under the writer.
    pub fn file(&mut self) -> &mut F {
        &mut self.file
    }

    /// Append one record on a line of its own and make it durable before returning Ok. If
    /// the file ends in a torn record (a writer stopped mid-line, an earlier append that
    /// failed), the record starts on a fresh line so it is never joined to it. On an error
    /// nothing is claimed: the caller must not report the change as recorded.
    pub fn append(&mut self, record: &Record) -> io::Result<()> {
        let mut line = serde_json::to_vec(record).map_err(io::Error::other)?;
        line.push(b'\n');
        self.append_line(line)
    }

    fn append_line(&mut self, mut line: Vec<u8>) -> io::Result<()> {
        if !self.ends_a_line()? {
            line.insert(0, b'\n');
        }
        if let Err(e) = self.file.append(&line) {
            // end the torn line now if the disk lets us; the next append checks again anyway
            if self.file.append(b"\n").is_ok() {
                let _ = self.file.sync();
            }
            return Err(e);
        }
        self.file.sync()
    }

    /// Whether the file is empty or ends with a newline.
    fn ends_a_line(&mut self) -> io::Result<bool> {
        let len = self.file.size()?;
        if len == 0 {
            return Ok(true);
        }
        let mut last = [0u8; 1];
        let n = self.file.read_at(len - 1, &mut last)?;
        Ok(n == 0 || last[0] == b'\n')
    }
}

/// Make a new file's directory entry durable too (best effort: not every file system allows it).
fn sync_dir(path: &Path) {
    if let Some(dir) = path.parent() {
        if let Ok(d) = File::open(dir) {
            let _ = d.sync_all();
        }
    }
}

/// A fresh identifier, unique across processes and hosts: 128 bits from SipHash keyed by the
/// standard library's per-process random keys (drawn from the operating system), over the
/// process id, the clock and a counter. Written as 32 hex digits.
pub fn unique_id() -> String {
    use std::hash::{BuildHasher, Hasher};
    use std::sync::atomic::{AtomicU64, Ordering};
    static COUNTER: AtomicU64 = AtomicU64::new(0);
    let n = COUNTER.fetch_add(1, Ordering::Relaxed);
    let nanos = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map_or(0, |d| d.as_nanos());
    let half = |k: u64| {
        // every RandomState has keys of its own, the first per thread from the OS
        let mut h = std::collections::hash_map::RandomState::new().build_hasher();
        h.write_u64(k);
        h.write_u128(nanos);
        h.write_u32(std::process::id());
        h.write_u64(n);
        h.finish()
    };
    format!("{:016x}{:016x}", half(0), half(1))
}

/// The current time as an RFC 3339 UTC timestamp ("2026-12-01T22:50:01Z").
pub fn now() -> String {
    let secs = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map_or(0, |d| d.as_secs() as i64);
    timestamp(secs)
}

/// Civil date and time of a Unix time (Howard Hinnant's days-from-civil, inverted).
pub fn timestamp(secs: i64) -> String {
    let days = secs.div_euclid(86_400);
    let rem = secs.rem_euclid(86_400);
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z - era * 146_097;
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let y = yoe + era * 400;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = if m <= 2 { y + 1 } else { y };
    format!(
        "{y:04}-{m:02}-{d:02}T{:02}:{:02}:{:02}Z",
        rem / 3600,
        rem % 3600 / 60,
        rem % 60
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn timestamps_are_rfc3339_utc() {
        assert_eq!(timestamp(0), "1970-01-01T00:00:00Z");
        // 2000-02-29 12:34:56 UTC = 951827696 (a leap day)
        assert_eq!(timestamp(951_827_696), "2000-02-29T12:34:56Z");
        assert_eq!(timestamp(1_798_761_600), "2027-01-01T00:00:00Z");
    }

    #[test]
    fn torn_and_damaged_lines_are_reported_and_skipped() {
        let good = r#"{"kind":"bookmark","nonet_session":1,"id":0,"name":"a","time":"t"}"#;
        let text = format!("{good}\nnot json\n{good}\n{{\"kind\":\"bookm");
        let (records, problems) = parse(text.as_bytes());
        assert_eq!(records.len(), 2);
        assert_eq!(problems.len(), 2);
        assert_eq!(problems[0].line, 2);
        assert!(problems[1].message.contains("cut off"));
    }

    /// A log file in memory that runs out of space after `room` more bytes, part-writing the
    /// append that crosses it (as a full disk or a quota does), and can fail its sync.
    struct Tight {
        bytes: Vec<u8>,
        room: Option<usize>,
        /// The next append alone writes only this many bytes and fails (a quota hit once).
        glitch: Option<usize>,
        fail_sync: bool,
    }

    impl LogFile for Tight {
        fn size(&mut self) -> io::Result<u64> {
            Ok(self.bytes.len() as u64)
        }
        fn read_at(&mut self, offset: u64, buf: &mut [u8]) -> io::Result<usize> {
            let from = (offset as usize).min(self.bytes.len());
            let n = buf.len().min(self.bytes.len() - from);
            buf[..n].copy_from_slice(&self.bytes[from..from + n]);
            Ok(n)
        }
        fn append(&mut self, bytes: &[u8]) -> io::Result<()> {
            if let Some(n) = self.glitch.take() {
                self.bytes.extend_from_slice(&bytes[..n.min(bytes.len())]);
                return Err(io::Error::other("Disk quota exceeded"));
            }
            let fits = self.room.map_or(bytes.len(), |r| r.min(bytes.len()));
            self.bytes.extend_from_slice(&bytes[..fits]);
            if let Some(r) = &mut self.room {
                *r -= fits;
            }
            if fits < bytes.len() {
                return Err(io::Error::new(
                    io::ErrorKind::StorageFull,
                    "No space left on device",
                ));
            }
            Ok(())
        }
        fn sync(&mut self) -> io::Result<()> {
            if self.fail_sync {
                return Err(io::Error::other("sync failed"));
            }
            Ok(())
        }
    }

    fn mark(name: &str) -> Record {
        Record::Bookmark {
            nonet_session: FORMAT,
            id: 0,
            name: name.into(),
            time: "t".into(),
            variant_uid: None,
        }
    }

    fn names(bytes: &[u8]) -> Vec<String> {
        parse(bytes)
            .0
            .into_iter()
            .filter_map(|r| match r {
                Record::Bookmark { name, .. } => Some(name),
                Record::Variant { .. } => None,
            })
            .collect()
    }

    /// After an append fails half-way (no space left), the next one is not joined to the torn
    /// line: once space is freed it is recorded and reads back.
    #[test]
    fn a_record_after_a_failed_append_is_not_lost() {
        let file = Tight {
            bytes: Vec::new(),
            room: None,
            glitch: None,
            fail_sync: false,
        };
        let mut w = Writer::new(file, Path::new("mem"));
        w.append(&mark("first")).expect("first");
        w.file().room = Some(20); // the disk fills up in the middle of the next record
        assert!(
            w.append(&mark("second")).is_err(),
            "a failed append is an error"
        );
        w.file().room = None; // space freed
        w.append(&mark("third")).expect("third");
        let bytes = w.file().bytes.clone();
        assert_eq!(names(&bytes), ["first", "third"]);
        let (_, problems) = parse(&bytes);
        assert_eq!(problems.len(), 1, "{problems:?}");
        assert!(problems[0].message.contains("cut off"), "{problems:?}");
    }

    /// A one-off failure (a quota hit once): the torn line is ended at once, and the next
    /// record goes on a line of its own.
    #[test]
    fn a_record_after_a_one_off_failure_is_not_lost() {
        let file = Tight {
            bytes: Vec::new(),
            room: None,
            glitch: None,
            fail_sync: false,
        };
        let mut w = Writer::new(file, Path::new("mem"));
        w.append(&mark("first")).expect("first");
        w.file().glitch = Some(30);
        assert!(w.append(&mark("second")).is_err());
        assert!(w.file().bytes.ends_with(b"\n"), "the torn line is ended");
        w.append(&mark("third")).expect("third");
        assert_eq!(names(&w.file().bytes.clone()), ["first", "third"]);
        assert_eq!(parse(&w.file().bytes.clone()).1.len(), 1);
    }

    /// A record is reported written only once it is durable: a failed sync is an error.
    #[test]
    fn a_failed_sync_is_an_error() {
        let file = Tight {
            bytes: Vec::new(),
            room: None,
            glitch: None,
            fail_sync: true,
        };
        let mut w = Writer::new(file, Path::new("mem"));
        assert!(w.append(&mark("first")).is_err());
    }

    #[test]
    fn future_formats_and_torn_middle_lines_are_named() {
        let good = r#"{"kind":"bookmark","nonet_session":1,"id":0,"name":"a","time":"t"}"#;
        let newer = r#"{"kind":"bookmark","nonet_session":7,"id":0,"name":"b","time":"t"}"#;
        let unknown = r#"{"kind":"note","nonet_session":7,"text":"x"}"#;
        let text = format!("{good}\n{{\"kind\":\"bookm\n{newer}\n{newer}\n{unknown}\n");
        let (records, problems) = parse(text.as_bytes());
        assert_eq!(records.len(), 3, "newer records are read as far as they go");
        let at = |l: usize| {
            problems
                .iter()
                .find(|p| p.line == l)
                .map(|p| p.message.clone())
                .unwrap_or_default()
        };
        assert!(at(2).contains("cut off"), "{problems:?}");
        assert!(
            at(3).contains("newer nonet") && at(3).contains("1 more"),
            "{problems:?}"
        );
        assert!(
            at(5).contains("newer nonet") && at(5).contains("skipped"),
            "{problems:?}"
        );
    }

    #[test]
    fn unique_ids_differ() {
        let ids: std::collections::HashSet<String> = (0..10_000).map(|_| unique_id()).collect();
        assert_eq!(ids.len(), 10_000);
        assert!(ids.iter().all(|i| i.len() == 32));
    }
}

//! Sessions on disk: opening and reading logs, appending records so that several processes
//! (on several hosts sharing a home directory) can write one session at once without losing
//! anything, noticing what the others wrote, and the data directory as a boundary (names
//! checked, logs that are links refused, exports kept off the logs).

use std::collections::HashSet;
use std::io::{self, Read, Seek, SeekFrom};
use std::path::{Path, PathBuf};

use super::log::{self, LogFile, Record};
use super::{Session, SessionError};

fn io_error(path: &Path, e: io::Error) -> SessionError {
    SessionError::Io(path.display().to_string(), e)
}

impl Session {
    /// Open a session for writing, creating its log if it does not exist yet.
    pub fn open(dir: &Path, name: &str) -> Result<Session, SessionError> {
        check_dir(dir)?;
        let path = log_file(dir, name)?;
        let file = log::open_append(&path).map_err(|e| io_error(&path, e))?;
        Session::with_log_file(name, &path, Box::new(file))
    }

    /// Open an existing session for writing.
    pub fn open_existing(dir: &Path, name: &str) -> Result<Session, SessionError> {
        check_dir(dir)?;
        let path = log_file(dir, name)?;
        if std::fs::symlink_metadata(&path).is_err() {
            return Err(SessionError::NotFound(
                name.into(),
                dir.display().to_string(),
            ));
        }
        Session::open(dir, name)
    }

    /// Read an existing session by name without opening it for writing (to export it): the
    /// name is checked, a missing session is `NotFound`, a log that is a link is refused.
    pub fn load_existing(dir: &Path, name: &str) -> Result<Session, SessionError> {
        check_dir(dir)?;
        let path = log_file(dir, name)?;
        if std::fs::symlink_metadata(&path).is_err() {
            return Err(SessionError::NotFound(
                name.into(),
                dir.display().to_string(),
            ));
        }
        Session::load(&path)
    }

    /// A session written to any log file (a test's failing one): what the file holds is read
    /// first.
    pub fn with_log_file(
        name: &str,
        path: &Path,
        file: Box<dyn LogFile + Send + Sync>,
    ) -> Result<Session, SessionError> {
        let mut s = Session::empty(name, path);
        s.writer = Some(log::Writer::new(file, path));
        s.read_new(None).map_err(|e| io_error(path, e))?;
        s.unseen.clear();
        Ok(s)
    }

    /// Read a session's log without opening it for writing. A log that is a symbolic link is
    /// refused.
    pub fn load(path: &Path) -> Result<Session, SessionError> {
        let name = path
            .file_stem()
            .and_then(|s| s.to_str())
            .unwrap_or("session")
            .to_string();
        let mut s = Session::empty(&name, path);
        s.read_new(None).map_err(|e| io_error(path, e))?;
        s.unseen.clear();
        Ok(s)
    }

    /// Read the records other processes appended since the log was last read, and give the
    /// ids of the variants they added since the last call (including those met while this
    /// session was writing). A session kept in memory has none.
    pub fn refresh(&mut self) -> io::Result<Vec<u64>> {
        if !self.memory || self.writer.is_some() {
            self.read_new(None)?;
        }
        Ok(std::mem::take(&mut self.unseen))
    }

    /// Append a record to the log, durable before this returns Ok.
    ///
    /// Under the log's advisory lock (when the file system grants it; nothing depends on it)
    /// the records other processes appended are read first, so a variant gets the id after
    /// theirs; the record carries a 128-bit uid, so even if the lock failed and two writers
    /// chose one id, both records load (the later under the next free id). After the write
    /// the record is read back; if it does not read (joined to a line another writer left
    /// torn) it is written once more. A variant record without a uid gets one here: pass
    /// records from `prepare`, whose uid lets `admit` find the variant written.
    pub fn write(&mut self, record: &Record) -> Result<(), SessionError> {
        let path = self.path.clone();
        let Some(w) = self.writer.as_mut() else {
            return if self.memory {
                Ok(())
            } else {
                Err(io_error(
                    &path,
                    io::Error::other("the session was opened read-only"),
                ))
            };
        };
        let locked = w.file().lock();
        let outcome = self.write_locked(record);
        if locked {
            if let Some(w) = self.writer.as_mut() {
                w.file().unlock();
            }
        }
        outcome.map_err(|e| io_error(&path, e))
    }

    fn write_locked(&mut self, record: &Record) -> io::Result<()> {
        self.read_new(None)?;
        for _ in 0..2 {
            let stamped = self.stamp(record);
            let uid = match &stamped {
                Record::Variant { uid, .. } => uid.clone(),
                Record::Bookmark { .. } => None,
            };
            let appended = match self.writer.as_mut() {
                Some(w) => w.append(&stamped),
                None => return Err(io::Error::other("the session was opened read-only")),
            };
            if let Err(e) = appended {
                // its bytes may still reach the log (a sync that failed): if they are read
                // later they are this process's, not another's
                if let Some(u) = uid {
                    self.failed.insert(u);
                }
                return Err(e);
            }
            // read it back, with whatever another writer slipped in before it
            if self.read_new(uid.as_deref()).is_err() {
                // durable but not readable now: take it as written
                if let Some(u) = &uid {
                    self.unread.insert(u.clone());
                }
                self.take(stamped, None);
                return Ok(());
            }
            match &uid {
                Some(u) if !self.uids.contains_key(u) => continue,
                _ => return Ok(()),
            }
        }
        Err(io::Error::other(
            "the record was written twice but neither copy reads back: the log may be damaged \
             (`nonet sessions` shows its problems)",
        ))
    }

    /// The record as it goes to disk: the next id after everything read, the uid links filled.
    fn stamp(&self, record: &Record) -> Record {
        let mut r = record.clone();
        match &mut r {
            Record::Variant {
                id,
                parent,
                uid,
                parent_uid,
                ..
            } => {
                *id = self.next_id();
                if uid.is_none() {
                    *uid = Some(log::unique_id());
                }
                if parent_uid.is_none() {
                    *parent_uid = parent.and_then(|p| self.get(p)).and_then(|v| v.uid.clone());
                }
            }
            Record::Bookmark {
                id, variant_uid, ..
            } => {
                if variant_uid.is_none() {
                    *variant_uid = self.get(*id).and_then(|v| v.uid.clone());
                }
            }
        }
        r
    }

    /// Read and admit what the log holds past what was read before. Variants that are not
    /// `mine` and were not in the tree are noted as added by another process.
    fn read_new(&mut self, mine: Option<&str>) -> io::Result<()> {
        let from = self.read_to;
        let shrunk = || {
            io::Error::other(
                "the log is shorter than when it was read: it was edited or replaced by \
                 another program; open the session again",
            )
        };
        let mut bytes = Vec::new();
        match self.writer.as_mut() {
            Some(w) => {
                let f = w.file();
                let size = f.size()?;
                if size < from {
                    return Err(shrunk());
                }
                bytes.resize((size - from) as usize, 0);
                let mut got = 0;
                while got < bytes.len() {
                    match f.read_at(from + got as u64, &mut bytes[got..])? {
                        0 => break,
                        n => got += n,
                    }
                }
                bytes.truncate(got);
            }
            None if self.memory => return Ok(()),
            None => {
                let mut f = log::open_read(&self.path)?;
                if f.metadata()?.len() < from {
                    return Err(shrunk());
                }
                f.seek(SeekFrom::Start(from))?;
                f.read_to_end(&mut bytes)?;
            }
        }
        let first = self.lines_read + 1;
        let chunk = log::parse_chunk(&bytes, first);
        self.read_to += chunk.consumed as u64;
        self.lines_read += chunk.lines;
        // a problem at or past `first` was about a torn tail, which is read again now
        self.problems.retain(|p| p.line < first);
        self.problems.extend(chunk.problems);
        for (line, record) in chunk.records {
            let (variant, uid) = match &record {
                Record::Variant { uid, .. } => (true, uid.clone()),
                Record::Bookmark { .. } => (false, None),
            };
            let known = uid.as_ref().is_some_and(|u| self.uids.contains_key(u));
            let line = match uid.as_ref() {
                // taken in before it was read back (see write_locked): no second copy
                Some(u) if known && self.unread.remove(u) => None,
                _ => Some(line),
            };
            let id = self.take(record, line);
            if let (true, false, Some(id)) = (variant, known, id) {
                let own = uid
                    .as_ref()
                    .is_some_and(|u| Some(u.as_str()) == mine || self.failed.contains(u));
                if !own {
                    self.unseen.push(id);
                }
            }
        }
        Ok(())
    }
}

/// Check a session name: up to 100 ASCII letters, digits, '.', '_' and '-', not starting with
/// '.', so it names a file inside the data directory and nothing else.
pub fn check_name(name: &str) -> Result<(), SessionError> {
    let ok = !name.is_empty()
        && name.len() <= 100
        && !name.starts_with('.')
        && name
            .chars()
            .all(|c| c.is_ascii_alphanumeric() || matches!(c, '.' | '_' | '-'));
    if ok {
        Ok(())
    } else {
        Err(SessionError::BadName(name.to_string()))
    }
}

/// The log of session `name` in `dir`, once the name is checked.
pub fn log_file(dir: &Path, name: &str) -> Result<PathBuf, SessionError> {
    check_name(name)?;
    Ok(dir.join(format!("{name}.jsonl")))
}

/// A session directory that exists must be a directory.
fn check_dir(dir: &Path) -> Result<(), SessionError> {
    match std::fs::metadata(dir) {
        Ok(m) if !m.is_dir() => Err(SessionError::NotADirectory(dir.display().to_string())),
        _ => Ok(()),
    }
}

/// Whether writing to `path` would write over a session log: a `.jsonl` file that is (or,
/// through links, resolves to) one in the session directory `dir`, a hard link to one, or
/// any file whose first line is a session record.
pub fn is_session_log(dir: Option<&Path>, path: &Path) -> bool {
    session_log_name(dir, path).is_some()
}

/// Refuse an export's output file that is a session log (see `is_session_log`), naming it.
pub fn check_export_target(dir: Option<&Path>, path: &Path) -> Result<(), SessionError> {
    match session_log_name(dir, path) {
        Some(name) => Err(SessionError::WouldOverwriteLog(
            path.display().to_string(),
            name,
        )),
        None => Ok(()),
    }
}

fn session_log_name(dir: Option<&Path>, path: &Path) -> Option<String> {
    let resolved = resolve(path);
    let stem = |p: &Path| {
        p.file_stem()
            .map(|s| s.to_string_lossy().into_owned())
            .unwrap_or_default()
    };
    if let Some(dir) = dir {
        let dir = std::fs::canonicalize(dir).unwrap_or_else(|_| dir.to_path_buf());
        if resolved.parent() == Some(dir.as_path())
            && resolved.extension().is_some_and(|x| x == "jsonl")
        {
            return Some(stem(&resolved));
        }
        if let Some(name) = hard_link_into(&dir, &resolved) {
            return Some(name);
        }
    }
    first_line_is_a_record(&resolved).then(|| stem(&resolved))
}

/// Where writing to `path` would land: links followed, also a link to a file not yet made.
fn resolve(path: &Path) -> PathBuf {
    let mut at = path.to_path_buf();
    for _ in 0..40 {
        if let Ok(real) = std::fs::canonicalize(&at) {
            return real;
        }
        match std::fs::read_link(&at) {
            Ok(target) => {
                at = match at.parent() {
                    Some(p) if target.is_relative() => p.join(target),
                    _ => target,
                };
            }
            Err(_) => break,
        }
    }
    // not there yet: its directory resolved, and its name
    let parent = match at.parent() {
        Some(p) if !p.as_os_str().is_empty() => p.to_path_buf(),
        _ => PathBuf::from("."),
    };
    match (std::fs::canonicalize(&parent), at.file_name()) {
        (Ok(p), Some(n)) => p.join(n),
        _ => at,
    }
}

#[cfg(unix)]
fn hard_link_into(dir: &Path, file: &Path) -> Option<String> {
    use std::os::unix::fs::MetadataExt;
    let m = std::fs::metadata(file).ok().filter(|m| m.is_file())?;
    std::fs::read_dir(dir)
        .ok()?
        .filter_map(Result::ok)
        .map(|e| e.path())
        .filter(|p| p.extension().is_some_and(|x| x == "jsonl"))
        .find(|p| {
            std::fs::symlink_metadata(p).is_ok_and(|o| o.dev() == m.dev() && o.ino() == m.ino())
        })
        .and_then(|p| p.file_stem().map(|s| s.to_string_lossy().into_owned()))
}

#[cfg(not(unix))]
fn hard_link_into(_: &Path, _: &Path) -> Option<String> {
    None
}

fn first_line_is_a_record(path: &Path) -> bool {
    let Ok(f) = log::open_read(path) else {
        return false;
    };
    let mut head = Vec::new();
    if f.take(64 * 1024).read_to_end(&mut head).is_err() {
        return false;
    }
    let line = head.split(|&b| b == b'\n').next().unwrap_or_default();
    serde_json::from_slice::<Record>(line).is_ok()
}

/// Where sessions live: `$NONET_DATA_DIR/sessions`, else the platform data directory.
pub fn session_dir(data_dir: Option<&Path>) -> Option<PathBuf> {
    let base = match data_dir {
        Some(d) => Some(d.to_path_buf()),
        None => match std::env::var_os("NONET_DATA_DIR") {
            Some(v) if !v.is_empty() => Some(PathBuf::from(v)),
            _ => {
                directories::ProjectDirs::from("", "", "nonet").map(|p| p.data_dir().to_path_buf())
            }
        },
    };
    base.map(|b| b.join("sessions"))
}

/// A line of `nonet sessions`.
#[derive(Debug, Clone, serde::Serialize)]
pub struct Summary {
    pub name: String,
    pub variants: usize,
    pub bookmarks: usize,
    pub modified: String,
    pub latest_formula: Option<String>,
    pub problems: usize,
    /// Why the log could not be read at all (a link, a bad name, no permission).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub error: Option<String>,
    #[serde(skip)]
    pub mtime: std::time::SystemTime,
}

/// Every session in `dir`, most recently changed first; an unreadable log is listed with its
/// error (and counted as a problem), not left out. A directory that does not exist holds no
/// sessions; one that is a file, or cannot be read, is an error.
pub fn try_list(dir: &Path) -> Result<Vec<Summary>, SessionError> {
    match std::fs::metadata(dir) {
        Err(e) if e.kind() == io::ErrorKind::NotFound => return Ok(Vec::new()),
        Err(e) if e.kind() == io::ErrorKind::NotADirectory => {
            // name the file that stands where a directory should be
            let file = dir
                .ancestors()
                .find(|a| std::fs::metadata(a).is_ok_and(|m| !m.is_dir()))
                .unwrap_or(dir);
            return Err(SessionError::NotADirectory(file.display().to_string()));
        }
        Err(e) => return Err(io_error(dir, e)),
        Ok(m) if !m.is_dir() => return Err(SessionError::NotADirectory(dir.display().to_string())),
        Ok(_) => {}
    }
    let entries = std::fs::read_dir(dir).map_err(|e| io_error(dir, e))?;
    let mut seen = HashSet::new();
    let mut out: Vec<Summary> = entries
        .filter_map(Result::ok)
        .map(|e| e.path())
        .filter(|p| p.extension().is_some_and(|x| x == "jsonl"))
        .filter(|p| seen.insert(p.clone()))
        .map(|p| {
            let name = p
                .file_stem()
                .map(|s| s.to_string_lossy().into_owned())
                .unwrap_or_default();
            let mtime = std::fs::symlink_metadata(&p)
                .and_then(|m| m.modified())
                .unwrap_or(std::time::UNIX_EPOCH);
            let secs = mtime
                .duration_since(std::time::UNIX_EPOCH)
                .map_or(0, |d| d.as_secs() as i64);
            let loaded = check_name(&name).and_then(|()| Session::load(&p));
            let mut summary = Summary {
                name,
                variants: 0,
                bookmarks: 0,
                modified: log::timestamp(secs),
                latest_formula: None,
                problems: 1,
                error: None,
                mtime,
            };
            match loaded {
                Ok(s) => {
                    summary.variants = s.variants.len();
                    summary.bookmarks = s.bookmarks.len();
                    summary.latest_formula = s.last().map(|v| v.formula.clone());
                    summary.problems = s.problems.len();
                }
                Err(e) => summary.error = Some(e.to_string()),
            }
            summary
        })
        .collect();
    out.sort_by(|a, b| b.mtime.cmp(&a.mtime).then(a.name.cmp(&b.name)));
    Ok(out)
}

/// Every session in `dir` (see `try_list`); empty when the directory cannot be listed, so
/// prefer `try_list`, which says why.
pub fn list(dir: &Path) -> Vec<Summary> {
    try_list(dir).unwrap_or_default()
}

/// A fresh session name from the clock: "plan-20261201-225001".
pub fn new_name() -> String {
    let t = log::now();
    let digits: String = t.chars().filter(|c| c.is_ascii_digit()).collect();
    format!(
        "plan-{}-{}",
        &digits[..8.min(digits.len())],
        &digits[8.min(digits.len())..]
    )
}

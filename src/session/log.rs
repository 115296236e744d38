//! The session log: one self-describing JSON object per line, appended and synced to disk as
//! each change is committed, never rewritten. A torn last line (a killed process, a dropped
//! link mid-write) is reported and skipped when the log is read.

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
        id: u64,
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
    },
    /// A name given to a variant.
    Bookmark {
        nonet_session: u32,
        id: u64,
        name: String,
        time: String,
    },
}

/// Something wrong found while reading a log; the rest of it still loads.
#[derive(Debug, Clone, PartialEq)]
pub struct LogProblem {
    pub line: usize,
    pub message: String,
}

/// Read every good record of a log, with the problems found on the way.
pub fn read(path: &Path) -> io::Result<(Vec<Record>, Vec<LogProblem>)> {
    let mut bytes = Vec::new();
    File::open(path)?.read_to_end(&mut bytes)?;
    Ok(parse(&bytes))
}

/// Parse log bytes: complete lines are records; a last line without its newline is torn.
pub fn parse(bytes: &[u8]) -> (Vec<Record>, Vec<LogProblem>) {
    let mut records = Vec::new();
    let mut problems = Vec::new();
    let complete = bytes.ends_with(b"\n");
    let lines: Vec<&[u8]> = bytes.split(|&b| b == b'\n').collect();
    let n = lines.len();
    for (i, line) in lines.into_iter().enumerate() {
        let last = i + 1 == n;
        if last && complete {
            break; // the empty piece after the final newline
        }
        if line.iter().all(u8::is_ascii_whitespace) {
            continue;
        }
        if last {
            problems.push(LogProblem {
                line: i + 1,
                message: "the last record was cut off while being written (the program was \
                          stopped); it is skipped"
                    .into(),
            });
            break;
        }
        match serde_json::from_slice::<Record>(line) {
            Ok(r) => records.push(r),
            Err(e) => problems.push(LogProblem {
                line: i + 1,
                message: format!("not a readable record ({e}); it is skipped"),
            }),
        }
    }
    (records, problems)
}

/// An open log file for appending.
pub struct Writer {
    file: File,
    pub path: PathBuf,
}

impl Writer {
    /// Open (creating if needed) for appending. If the file ends in a torn record, the next
    /// record starts on a fresh line, so nothing already written is lost or joined.
    pub fn open(path: &Path) -> io::Result<Writer> {
        if let Some(dir) = path.parent() {
            std::fs::create_dir_all(dir)?;
        }
        let existed = path.exists();
        let mut file = OpenOptions::new()
            .create(true)
            .append(true)
            .read(true)
            .open(path)?;
        let len = file.metadata()?.len();
        if len > 0 {
            let mut last = [0u8; 1];
            file.seek(SeekFrom::Start(len - 1))?;
            file.read_exact(&mut last)?;
            if last[0] != b'\n' {
                file.write_all(b"\n")?;
                file.sync_data()?;
            }
        }
        if !existed {
            sync_dir(path);
        }
        Ok(Writer {
            file,
            path: path.to_path_buf(),
        })
    }

    /// Append one record and sync it to disk before returning.
    pub fn append(&mut self, record: &Record) -> io::Result<()> {
        let mut line = serde_json::to_vec(record).map_err(io::Error::other)?;
        line.push(b'\n');
        // one write call per record: appends of a whole line are not interleaved
        self.file.write_all(&line)?;
        self.file.sync_data()
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
}

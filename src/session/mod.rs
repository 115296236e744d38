//! Planning sessions: a tree of committed variants kept in an append-only log on disk.
//!
//! Every committed swap or step adds a variant whose parent is the variant it was made from,
//! so going back and committing something else starts a branch and nothing is overwritten.
//! Plain files, no database: cluster home directories are often network file systems.

pub mod export;
pub mod figure;
pub mod log;

use std::io;
use std::path::{Path, PathBuf};

use crate::chem::cycle::{self, Net};
use crate::chem::molecule::Molecule;
use crate::chem::species::{Equation, Species, Term};
use crate::chem::{Complex, Report};
pub use log::{Counts, LogProblem, Record, SpeciesRecord};

/// How a variant came about.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Made {
    /// The complex a session (or a branch typed in) starts from.
    Start,
    /// An elementary step: chemistry, with its equation.
    Step,
    /// A free what-if change (a swap, an added or removed ligand): not chemistry that happened.
    Edit,
    /// Written before nonet recorded it.
    Unknown,
}

impl Made {
    pub fn word(self) -> &'static str {
        match self {
            Made::Start => "start",
            Made::Step => "step",
            Made::Edit => "edit",
            Made::Unknown => "unknown",
        }
    }

    fn read(word: Option<&str>, parent: Option<u64>, action: &str) -> Made {
        match word {
            Some("start") => Made::Start,
            Some("step") => Made::Step,
            Some("edit") => Made::Edit,
            _ if parent.is_none() || action.starts_with("start") => Made::Start,
            _ => Made::Unknown,
        }
    }
}

/// What is being committed.
pub enum Change<'a> {
    Start,
    Step(&'a Equation),
    Edit,
}

/// One committed state of the working complex.
#[derive(Debug, Clone, PartialEq)]
pub struct Variant {
    pub id: u64,
    pub parent: Option<u64>,
    pub time: String,
    pub action: String,
    pub formula: String,
    pub counts: Counts,
    pub made: Made,
    pub enters: Vec<SpeciesRecord>,
    pub leaves: Vec<SpeciesRecord>,
}

/// A session's tree, and the log it is written to.
pub struct Session {
    pub name: String,
    pub path: PathBuf,
    pub variants: Vec<Variant>,
    pub bookmarks: Vec<(u64, String)>,
    /// Problems met reading the log (a torn last record, a damaged line).
    pub problems: Vec<LogProblem>,
    writer: Option<log::Writer>,
    /// Kept in memory only: records are taken as written.
    memory: bool,
    /// Variant id -> position in `variants`, so a 10,000-variant session loads in linear time.
    index: std::collections::HashMap<u64, usize>,
}

/// Why a session cannot be used.
#[derive(Debug, thiserror::Error)]
pub enum SessionError {
    #[error("'{0}' is not a session name: use letters, digits, '.', '_' and '-'")]
    BadName(String),
    #[error("no session '{0}' in {1}; `nonet sessions` lists them")]
    NotFound(String, String),
    #[error("session log {0}: {1}")]
    Io(String, io::Error),
}

impl Session {
    /// Open a session for writing, creating its log if it does not exist yet.
    pub fn open(dir: &Path, name: &str) -> Result<Session, SessionError> {
        let path = log_path(dir, name)?;
        let mut s = if path.exists() {
            Session::load(&path)?
        } else {
            Session::empty(name, &path)
        };
        let writer = log::Writer::open(&path)
            .map_err(|e| SessionError::Io(path.display().to_string(), e))?;
        s.writer = Some(writer);
        Ok(s)
    }

    /// Open an existing session for writing.
    pub fn open_existing(dir: &Path, name: &str) -> Result<Session, SessionError> {
        let path = log_path(dir, name)?;
        if !path.exists() {
            return Err(SessionError::NotFound(
                name.into(),
                dir.display().to_string(),
            ));
        }
        Session::open(dir, name)
    }

    fn empty(name: &str, path: &Path) -> Session {
        Session {
            name: name.to_string(),
            path: path.to_path_buf(),
            variants: Vec::new(),
            bookmarks: Vec::new(),
            problems: Vec::new(),
            writer: None,
            memory: false,
            index: std::collections::HashMap::new(),
        }
    }

    /// Read a session's log without opening it for writing.
    pub fn load(path: &Path) -> Result<Session, SessionError> {
        let (records, problems) =
            log::read(path).map_err(|e| SessionError::Io(path.display().to_string(), e))?;
        let name = path
            .file_stem()
            .and_then(|s| s.to_str())
            .unwrap_or("session")
            .to_string();
        let mut s = Session::empty(&name, path);
        s.problems = problems;
        s.replay(records);
        Ok(s)
    }

    /// Rebuild the tree from records in log order.
    pub fn replay(&mut self, records: Vec<Record>) {
        for r in records {
            if let Record::Variant { id, .. } = &r {
                if self.get(*id).is_some() {
                    continue; // a duplicate id cannot come from this writer; keep the first
                }
            }
            self.admit(r);
        }
    }

    pub fn get(&self, id: u64) -> Option<&Variant> {
        self.index.get(&id).map(|&i| &self.variants[i])
    }

    /// The most recently committed variant.
    pub fn last(&self) -> Option<&Variant> {
        self.variants.last()
    }

    pub fn bookmark_of(&self, id: u64) -> Option<&str> {
        self.bookmarks
            .iter()
            .find(|(i, _)| *i == id)
            .map(|(_, n)| n.as_str())
    }

    /// A variant by id ("7") or by bookmark name.
    pub fn find(&self, what: &str) -> Option<&Variant> {
        what.parse::<u64>()
            .ok()
            .and_then(|id| self.get(id))
            .or_else(|| {
                self.bookmarks
                    .iter()
                    .find(|(_, n)| n == what)
                    .and_then(|(id, _)| self.get(*id))
            })
    }

    /// Record a committed change, synced to disk before this returns its id.
    pub fn commit(
        &mut self,
        parent: Option<u64>,
        action: &str,
        complex: &Complex,
        report: &Report,
        change: Change,
    ) -> Result<u64, SessionError> {
        let record = self.prepare(parent, action, complex, report, change);
        self.write(&record)?;
        Ok(self.admit(record))
    }

    /// The record a committed change will be, with the next free id; nothing is written and
    /// the tree is unchanged until `admit` (after the record is durable).
    pub fn prepare(
        &self,
        parent: Option<u64>,
        action: &str,
        complex: &Complex,
        report: &Report,
        change: Change,
    ) -> Record {
        let id = self.index.keys().map(|&v| v + 1).max().unwrap_or(0);
        let (made, enters, leaves) = match change {
            Change::Start => (Made::Start, Vec::new(), Vec::new()),
            Change::Edit => (Made::Edit, Vec::new(), Vec::new()),
            Change::Step(eq) => (Made::Step, records(&eq.enters), records(&eq.leaves)),
        };
        Record::Variant {
            nonet_session: log::FORMAT,
            id,
            parent,
            time: log::now(),
            action: action.to_string(),
            formula: complex.formula(false),
            counts: counts(report),
            made_by: Some(made.word().to_string()),
            enters,
            leaves,
        }
    }

    /// Take a record into the tree (a variant, or a bookmark); gives the variant's id. A
    /// variant with an id already in the tree replaces it.
    pub fn admit(&mut self, record: Record) -> u64 {
        match record {
            Record::Variant {
                id,
                parent,
                time,
                action,
                formula,
                counts,
                made_by,
                enters,
                leaves,
                ..
            } => {
                let variant = Variant {
                    made: Made::read(made_by.as_deref(), parent, &action),
                    id,
                    parent,
                    time,
                    action,
                    formula,
                    counts,
                    enters,
                    leaves,
                };
                match self.index.get(&id) {
                    Some(&at) => self.variants[at] = variant,
                    None => {
                        self.index.insert(id, self.variants.len());
                        self.variants.push(variant);
                    }
                }
                id
            }
            Record::Bookmark { id, name, .. } => {
                self.bookmarks.retain(|(i, _)| *i != id);
                self.bookmarks.push((id, name));
                id
            }
        }
    }

    /// Append a record to the log, synced to disk before this returns.
    pub fn write(&mut self, record: &Record) -> Result<(), SessionError> {
        let path = self.path.display().to_string();
        match &mut self.writer {
            None if self.memory => Ok(()),
            Some(w) => w.append(record).map_err(|e| SessionError::Io(path, e)),
            None => Err(SessionError::Io(
                path,
                io::Error::other("the session was opened read-only"),
            )),
        }
    }

    /// A session kept in memory only (the planner's tests, a planner without a log).
    pub fn in_memory(name: &str) -> Session {
        Session {
            memory: true,
            ..Session::empty(name, Path::new(name))
        }
    }

    /// Name a variant.
    pub fn bookmark(&mut self, id: u64, name: &str) -> Result<(), SessionError> {
        let record = Session::bookmark_record(id, name);
        self.write(&record)?;
        self.admit(record);
        Ok(())
    }

    /// The record that names a variant.
    pub fn bookmark_record(id: u64, name: &str) -> Record {
        Record::Bookmark {
            nonet_session: log::FORMAT,
            id,
            name: name.to_string(),
            time: log::now(),
        }
    }

    /// Depth of a variant in the tree (the root is 0).
    pub fn depth(&self, id: u64) -> usize {
        let mut depth = 0;
        let mut at = self.get(id).and_then(|v| v.parent);
        while let Some(p) = at {
            depth += 1;
            if depth > self.variants.len() {
                break; // a cycle cannot be written by nonet; do not loop on a hand-edited log
            }
            at = self.get(p).and_then(|v| v.parent);
        }
        depth
    }

    /// Ids from the root down to `id`.
    pub fn path_to(&self, id: u64) -> Vec<u64> {
        let mut path = vec![id];
        let mut at = self.get(id).and_then(|v| v.parent);
        while let Some(p) = at {
            if path.len() > self.variants.len() {
                break;
            }
            path.push(p);
            at = self.get(p).and_then(|v| v.parent);
        }
        path.reverse();
        path
    }

    /// The earlier variant on its path that `id` is the same species as (the cycle it
    /// closes), if any: the nearest one.
    pub fn closes(&self, id: u64) -> Option<u64> {
        let v = self.get(id)?;
        let path = self.path_to(id);
        path[..path.len().saturating_sub(1)]
            .iter()
            .rev()
            .find(|&&a| self.get(a).is_some_and(|x| x.formula == v.formula))
            .copied()
    }

    /// The net reaction of the steps from `from` (exclusive) down to `to` (inclusive) on one
    /// path, with the changes that were not steps.
    pub fn net(&self, from: u64, to: u64) -> PathNet {
        let path = self.path_to(to);
        let start = path.iter().position(|&i| i == from).map_or(0, |p| p + 1);
        let mut equations = Vec::new();
        let mut edits = 0;
        let mut unrecorded = 0;
        for &i in &path[start..] {
            let Some(v) = self.get(i) else { continue };
            match v.made {
                Made::Step => equations.push(Equation {
                    enters: terms(&v.enters),
                    leaves: terms(&v.leaves),
                }),
                Made::Edit => edits += 1,
                Made::Unknown => unrecorded += 1,
                Made::Start => {}
            }
        }
        PathNet {
            net: cycle::net(&equations),
            steps: equations.len(),
            edits,
            unrecorded,
        }
    }

    /// Every closed cycle in the session: (the variant it comes back to, the variant that
    /// closes it).
    pub fn cycles(&self) -> Vec<(u64, u64)> {
        self.variants
            .iter()
            .filter_map(|v| self.closes(v.id).map(|a| (a, v.id)))
            .collect()
    }

    /// Variants in tree order (each followed by its descendants), with their depth.
    pub fn tree(&self) -> Vec<(usize, &Variant)> {
        let mut out = Vec::with_capacity(self.variants.len());
        let mut stack: Vec<(usize, &Variant)> = self
            .variants
            .iter()
            .filter(|v| v.parent.is_none_or(|p| self.get(p).is_none()))
            .rev()
            .map(|v| (0, v))
            .collect();
        let mut children: std::collections::HashMap<u64, Vec<&Variant>> =
            std::collections::HashMap::new();
        for v in &self.variants {
            if let Some(p) = v.parent {
                children.entry(p).or_default().push(v);
            }
        }
        let mut seen = std::collections::HashSet::new();
        while let Some((depth, v)) = stack.pop() {
            if !seen.insert(v.id) {
                continue;
            }
            out.push((depth, v));
            if let Some(kids) = children.get(&v.id) {
                for k in kids.iter().rev() {
                    stack.push((depth + 1, k));
                }
            }
        }
        out
    }
}

/// The net reaction of part of a path, and what in it was not a step.
#[derive(Debug, Clone)]
pub struct PathNet {
    pub net: Net,
    pub steps: usize,
    /// Free edits on the way: the net is then not balanced by steps.
    pub edits: usize,
    /// Changes logged before nonet recorded equations.
    pub unrecorded: usize,
}

impl PathNet {
    /// The net equation, or why there is none.
    pub fn text(&self) -> String {
        if self.edits > 0 {
            format!(
                "not balanced by steps: {} free edit{} on the way ({})",
                self.edits,
                if self.edits == 1 { "" } else { "s" },
                self.net.text()
            )
        } else if self.unrecorded > 0 {
            "not known: some changes were logged before nonet recorded equations".to_string()
        } else {
            self.net.text()
        }
    }

    /// Whether the net is a reaction the steps account for.
    pub fn by_steps(&self) -> bool {
        self.edits == 0 && self.unrecorded == 0
    }
}

fn records(terms: &[Term]) -> Vec<SpeciesRecord> {
    terms
        .iter()
        .map(|t| SpeciesRecord {
            name: t.species.label(),
            formula: t.species.formula(),
            smiles: t.species.smiles(),
            charge: t.species.charge(),
            count: t.count,
        })
        .collect()
}

/// Species back from the log: the structure from its SMILES, an electron from an empty one.
fn terms(records: &[SpeciesRecord]) -> Vec<Term> {
    records
        .iter()
        .map(|r| {
            let structure = Molecule::from_smiles(&r.smiles).unwrap_or_default();
            let name = r.name.trim_end_matches(['+', '-']).to_string();
            let mut species = Species::new(
                if name.is_empty() {
                    r.name.clone()
                } else {
                    name
                },
                structure,
            );
            species.electrons = species.structure.charge() - r.charge;
            Term {
                species,
                count: r.count,
            }
        })
        .collect()
}

/// The counts a variant keeps: those of its first metal.
pub fn counts(r: &Report) -> Counts {
    let value = |f: crate::chem::Frac| serde_json::to_value(f).unwrap_or(serde_json::Value::Null);
    match r.metals.first() {
        Some(m) => Counts {
            electron_count: value(m.electron_count),
            oxidation_state: value(m.oxidation_state),
            d_electrons: value(m.d_electrons),
            coordination_number: value(m.coordination_number),
            saturation: m.saturation.code().to_string(),
            unpaired_electrons: r.unpaired_electrons.first().copied(),
        },
        None => Counts {
            electron_count: serde_json::Value::Null,
            oxidation_state: serde_json::Value::Null,
            d_electrons: serde_json::Value::Null,
            coordination_number: serde_json::Value::Null,
            saturation: "not_applicable".into(),
            unpaired_electrons: None,
        },
    }
}

fn log_path(dir: &Path, name: &str) -> Result<PathBuf, SessionError> {
    let ok = !name.is_empty()
        && name.len() <= 100
        && !name.starts_with('.')
        && name
            .chars()
            .all(|c| c.is_ascii_alphanumeric() || matches!(c, '.' | '_' | '-'));
    if !ok {
        return Err(SessionError::BadName(name.to_string()));
    }
    Ok(dir.join(format!("{name}.jsonl")))
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
    #[serde(skip)]
    pub mtime: std::time::SystemTime,
}

/// Every session in `dir`, most recently changed first.
pub fn list(dir: &Path) -> Vec<Summary> {
    let Ok(rd) = std::fs::read_dir(dir) else {
        return Vec::new();
    };
    let mut out: Vec<Summary> = rd
        .filter_map(Result::ok)
        .map(|e| e.path())
        .filter(|p| p.extension().is_some_and(|x| x == "jsonl"))
        .filter_map(|p| {
            let mtime = std::fs::metadata(&p).and_then(|m| m.modified()).ok()?;
            let s = Session::load(&p).ok()?;
            let secs = mtime
                .duration_since(std::time::UNIX_EPOCH)
                .map_or(0, |d| d.as_secs() as i64);
            Some(Summary {
                name: s.name.clone(),
                variants: s.variants.len(),
                bookmarks: s.bookmarks.len(),
                modified: log::timestamp(secs),
                latest_formula: s.last().map(|v| v.formula.clone()),
                problems: s.problems.len(),
                mtime,
            })
        })
        .collect();
    out.sort_by(|a, b| b.mtime.cmp(&a.mtime).then(a.name.cmp(&b.name)));
    out
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

//! Planning sessions: a tree of committed variants kept in an append-only log on disk.
//!
//! Every committed swap or step adds a variant whose parent is the variant it was made from,
//! so going back and committing something else starts a branch and nothing is overwritten.
//! Plain files, no database: cluster home directories are often network file systems.

pub mod export;
pub mod figure;
pub mod log;
mod store;

use std::collections::{HashMap, HashSet};
use std::io;
use std::path::{Path, PathBuf};
use std::sync::OnceLock;

use crate::chem::cycle::{self, Net};
use crate::chem::formula::split_stereo;
use crate::chem::molecule::Molecule;
use crate::chem::species::{Equation, Species, Term};
use crate::chem::{Complex, Report};
pub use log::{Counts, LogFile, LogProblem, Record, SpeciesRecord};
pub use store::{
    check_export_target, check_name, is_session_log, list, new_name, session_dir, try_list, Summary,
};

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
    /// The number users see and type: the stored id, unless an earlier record already had it
    /// (two writers at once), in which case the next free number (the same on every load,
    /// since the log only grows).
    pub id: u64,
    /// The parent's number; always a variant recorded before this one (a link that pointed
    /// elsewhere is dropped when the log is read, and reported).
    pub parent: Option<u64>,
    pub time: String,
    pub action: String,
    pub formula: String,
    pub counts: Counts,
    pub made: Made,
    pub enters: Vec<SpeciesRecord>,
    pub leaves: Vec<SpeciesRecord>,
    /// The record's unique identifier (none in logs written before it was recorded).
    pub uid: Option<String>,
}

/// A session's tree, and the log it is written to.
pub struct Session {
    pub name: String,
    pub path: PathBuf,
    pub variants: Vec<Variant>,
    pub bookmarks: Vec<(u64, String)>,
    /// Problems met reading the log (a torn record, a damaged line, a duplicate id, a parent
    /// link that goes nowhere, a newer format), each with its line.
    pub problems: Vec<LogProblem>,
    writer: Option<log::Writer<Box<dyn LogFile + Send + Sync>>>,
    /// Kept in memory only: records are taken as written.
    memory: bool,
    /// Variant id -> position in `variants`, so a 10,000-variant session loads in linear time.
    index: HashMap<u64, usize>,
    /// Variant uid -> position in `variants`.
    uids: HashMap<String, usize>,
    /// The largest id in the tree, and a point below which every id is taken (for choosing
    /// ids once the largest is u64::MAX).
    max_id: Option<u64>,
    free_from: u64,
    /// How much of the log has been read: bytes and complete lines.
    read_to: u64,
    lines_read: usize,
    /// Variants other processes added, read since `refresh` last reported them.
    unseen: Vec<u64>,
    /// Uids of this process's records taken in before they were read back from the log.
    unread: HashSet<String>,
    /// Uids of this process's records whose write failed (their bytes may still show up).
    failed: HashSet<String>,
    /// Variant -> the earlier variant on its path it is the same species as, for all at once.
    closes: OnceLock<HashMap<u64, u64>>,
}

/// Why a session cannot be used.
#[derive(Debug, thiserror::Error)]
pub enum SessionError {
    #[error(
        "'{0}' is not a session name: use up to 100 letters, digits, '.', '_' and '-', not \
         starting with '.'"
    )]
    BadName(String),
    #[error("no session '{0}' in {1}; `nonet sessions` lists them")]
    NotFound(String, String),
    #[error("session log {0}: {1}")]
    Io(String, io::Error),
    #[error(
        "the session directory {0} is a file, not a directory: move the file aside, or point \
         NONET_DATA_DIR (or --data-dir) somewhere else"
    )]
    NotADirectory(String),
    #[error(
        "{0} is the log of session '{1}': writing there would destroy it; choose another \
         output file"
    )]
    WouldOverwriteLog(String, String),
}

impl Session {
    fn empty(name: &str, path: &Path) -> Session {
        Session {
            name: name.to_string(),
            path: path.to_path_buf(),
            variants: Vec::new(),
            bookmarks: Vec::new(),
            problems: Vec::new(),
            writer: None,
            memory: false,
            index: HashMap::new(),
            uids: HashMap::new(),
            max_id: None,
            free_from: 0,
            read_to: 0,
            lines_read: 0,
            unseen: Vec::new(),
            unread: HashSet::new(),
            failed: HashSet::new(),
            closes: OnceLock::new(),
        }
    }

    /// A session kept in memory only (the planner's tests, a planner without a log).
    pub fn in_memory(name: &str) -> Session {
        Session {
            memory: true,
            ..Session::empty(name, Path::new(name))
        }
    }

    /// Rebuild the tree from records in log order.
    pub fn replay(&mut self, records: Vec<Record>) {
        for r in records {
            self.take(r, None);
        }
    }

    pub fn get(&self, id: u64) -> Option<&Variant> {
        self.index.get(&id).map(|&i| &self.variants[i])
    }

    /// The variant a record's uid names.
    pub fn by_uid(&self, uid: &str) -> Option<&Variant> {
        self.uids.get(uid).map(|&i| &self.variants[i])
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

    /// The record a committed change will be, with a fresh uid and the next free id as this
    /// process sees it (`write` draws the id again from the log's latest state); nothing is
    /// written and the tree is unchanged until `admit` (after the record is durable).
    pub fn prepare(
        &self,
        parent: Option<u64>,
        action: &str,
        complex: &Complex,
        report: &Report,
        change: Change,
    ) -> Record {
        let (made, enters, leaves) = match change {
            Change::Start => (Made::Start, Vec::new(), Vec::new()),
            Change::Edit => (Made::Edit, Vec::new(), Vec::new()),
            Change::Step(eq) => (Made::Step, records(&eq.enters), records(&eq.leaves)),
        };
        Record::Variant {
            nonet_session: log::FORMAT,
            id: self.next_id(),
            parent,
            time: log::now(),
            action: action.to_string(),
            formula: complex.formula(false),
            counts: counts(report),
            made_by: Some(made.word().to_string()),
            enters,
            leaves,
            uid: Some(log::unique_id()),
            parent_uid: parent.and_then(|p| self.get(p)).and_then(|v| v.uid.clone()),
        }
    }

    /// The id a new variant gets: one more than the largest, or (past u64::MAX) the smallest
    /// free one.
    fn next_id(&self) -> u64 {
        match self.max_id {
            None => 0,
            Some(m) => m.checked_add(1).unwrap_or_else(|| {
                let mut id = self.free_from;
                while self.index.contains_key(&id) {
                    id = id.wrapping_add(1);
                }
                id
            }),
        }
    }

    /// Take a record into the tree (a variant, or a bookmark); gives the variant's id. A
    /// variant already in the tree (the same uid) is not taken twice; one whose id is taken by
    /// another variant gets the next free id.
    pub fn admit(&mut self, record: Record) -> u64 {
        let asked = match &record {
            Record::Variant { id, .. } | Record::Bookmark { id, .. } => *id,
        };
        self.take(record, None).unwrap_or(asked)
    }

    /// Admit a record read from line `line` of the log (None: not from the log), reporting
    /// what had to be worked around. Gives the id of the variant it is or names.
    fn take(&mut self, record: Record, line: Option<usize>) -> Option<u64> {
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
                uid,
                parent_uid,
                ..
            } => {
                if let Some(&at) = uid.as_ref().and_then(|u| self.uids.get(u)) {
                    let known = self.variants[at].id;
                    self.note(line, || {
                        format!("a second copy of variant {known}; the copy is skipped")
                    });
                    return Some(known);
                }
                // the parent must be recorded before the child: then links cannot loop
                let by_uid = parent_uid
                    .as_ref()
                    .map(|u| self.uids.get(u).map(|&at| self.variants[at].id));
                let resolved = match (by_uid, parent) {
                    (Some(Some(p)), _) => Some(p),
                    (None, Some(p)) if self.index.contains_key(&p) => Some(p),
                    (_, None) => None,
                    (_, Some(p)) => {
                        self.note(line, || {
                            if p == id {
                                format!(
                                    "variant {id} names itself as its parent; it is shown as \
                                     a start of the tree"
                                )
                            } else {
                                format!(
                                    "variant {id} names parent {p}, which is not recorded \
                                     before it (a loop of parent links, or a damaged or \
                                     edited log); it is shown as a start of the tree"
                                )
                            }
                        });
                        None
                    }
                };
                let id = if self.index.contains_key(&id) {
                    let fresh = self.next_id();
                    self.note(line, || {
                        format!(
                            "variant id {id} is already used by an earlier record (two programs \
                             wrote at once, or the log was edited); this one is shown as \
                             variant {fresh}"
                        )
                    });
                    fresh
                } else {
                    id
                };
                let variant = Variant {
                    made: Made::read(made_by.as_deref(), parent, &action),
                    id,
                    parent: resolved,
                    time,
                    action,
                    formula,
                    counts,
                    enters,
                    leaves,
                    uid,
                };
                let at = self.variants.len();
                self.index.insert(id, at);
                if let Some(u) = &variant.uid {
                    self.uids.insert(u.clone(), at);
                }
                self.variants.push(variant);
                self.max_id = Some(self.max_id.map_or(id, |m| m.max(id)));
                while self.index.contains_key(&self.free_from) && self.free_from < u64::MAX {
                    self.free_from += 1;
                }
                self.closes = OnceLock::new();
                Some(id)
            }
            Record::Bookmark {
                id,
                name,
                variant_uid,
                ..
            } => {
                let target = match variant_uid.as_ref().and_then(|u| self.uids.get(u)) {
                    Some(&at) => Some(self.variants[at].id),
                    None => self.index.contains_key(&id).then_some(id),
                };
                match target {
                    Some(t) => {
                        self.bookmarks.retain(|(i, _)| *i != t);
                        self.bookmarks.push((t, name));
                    }
                    None => self.note(line, || {
                        format!(
                            "bookmark '{name}' names variant {id}, which is not recorded \
                             before it; the bookmark is ignored"
                        )
                    }),
                }
                target
            }
        }
    }

    /// Report a problem with line `line` of the log (nothing for records not from the log).
    fn note(&mut self, line: Option<usize>, message: impl FnOnce() -> String) {
        if let Some(line) = line {
            self.problems.push(LogProblem {
                line,
                message: message(),
            });
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
            variant_uid: None,
        }
    }

    /// Depth of a variant in the tree (the root is 0).
    pub fn depth(&self, id: u64) -> usize {
        let mut depth = 0;
        let mut at = self.get(id).and_then(|v| v.parent);
        while let Some(p) = at {
            depth += 1;
            if depth > self.variants.len() {
                break; // parents come before children, so this is only a guard
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

    /// Ids from `from` down to `to`, both included; empty if `from` is not on the path to
    /// `to`. Takes time in the length of that stretch, not the depth of `to`.
    pub fn path_between(&self, from: u64, to: u64) -> Vec<u64> {
        let mut path = vec![to];
        let mut at = to;
        while at != from {
            match self.get(at).and_then(|v| v.parent) {
                Some(p) if path.len() <= self.variants.len() => {
                    path.push(p);
                    at = p;
                }
                _ => return Vec::new(),
            }
        }
        path.reverse();
        path
    }

    /// The earlier variant on its path that `id` is the same species as (the cycle it
    /// closes), if any: the nearest one.
    pub fn closes(&self, id: u64) -> Option<u64> {
        self.closes
            .get_or_init(|| self.all_closures())
            .get(&id)
            .copied()
    }

    /// `closes` for every variant in one walk of the tree, keeping the variants on the current
    /// path by formula: linear in the size of the session, whatever its depth.
    fn all_closures(&self) -> HashMap<u64, u64> {
        let mut out = HashMap::new();
        let mut path: Vec<&Variant> = Vec::new();
        // keyed by the formula proper; the stereo prefix decides among those (see same_species)
        let mut on_path: HashMap<&str, Vec<(u64, Option<&str>)>> = HashMap::new();
        for (depth, v) in self.tree() {
            while path.len() > depth {
                if let Some(gone) = path.pop() {
                    let (_, proper) = split_stereo(&gone.formula);
                    if let Some(ids) = on_path.get_mut(proper) {
                        ids.pop();
                    }
                }
            }
            let (stereo, proper) = split_stereo(&v.formula);
            let earlier = on_path.get(proper).and_then(|ids| {
                ids.iter()
                    .rev()
                    .find(|(_, s)| stereo.is_none() || s.is_none() || *s == stereo)
            });
            if let Some(&(earlier, _)) = earlier {
                out.insert(v.id, earlier);
            }
            on_path.entry(proper).or_default().push((v.id, stereo));
            path.push(v);
        }
        out
    }

    /// The net reaction of the steps from `from` (exclusive) down to `to` (inclusive) on one
    /// path, with the changes that were not steps; the whole path to `to` if `from` is not on
    /// it.
    pub fn net(&self, from: u64, to: u64) -> PathNet {
        let mut ids = Vec::new();
        let mut at = Some(to);
        while let Some(i) = at {
            if i == from || ids.len() > self.variants.len() {
                break;
            }
            ids.push(i);
            at = self.get(i).and_then(|v| v.parent);
        }
        ids.reverse();
        let mut equations = Vec::new();
        let mut edits = 0;
        let mut unrecorded = 0;
        for i in ids {
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
        let mut children: HashMap<u64, Vec<&Variant>> = HashMap::new();
        for v in &self.variants {
            if let Some(p) = v.parent {
                children.entry(p).or_default().push(v);
            }
        }
        let mut seen = HashSet::new();
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

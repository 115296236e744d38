//! The TUI's whole state and how actions change it. No I/O here: keys come in as values,
//! drawing reads the state.

use std::sync::Arc;

use ratatui::crossterm::event::{KeyCode, KeyEvent, KeyEventKind, KeyModifiers};

use super::action::Action;
use super::keymap::{self, Context};
use crate::catalogue::{Catalogue, FAMILIES};
use crate::chem::edit::{Edit, Place, Slot};
use crate::chem::ligand::{CbcClass, LigandDef};
use crate::chem::preview::{preview, Preview};
use crate::chem::{count, parse, Complex, Report};

/// Which pane has the keyboard.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Focus {
    Complex,
    Catalogue,
}

/// What the keyboard is doing.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Mode {
    Normal,
    Search,
    Formula,
    Help,
}

/// The edit the preview pane shows; Enter commits it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Pending {
    /// The selected ligand for the selected catalogue entry.
    Swap,
    /// The selected catalogue entry bound at an open site.
    Add,
    /// The selected ligand taken off.
    Remove,
    /// The selected ligand in another binding mode.
    Mode(usize),
    /// One-electron oxidation (+1) or reduction (-1).
    Charge(i32),
}

/// A message under the panes: what just happened or what went wrong.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Notice {
    pub text: String,
    pub error: bool,
}

/// CBC classes offered by the class filter, most common first.
pub const CLASS_FILTERS: &[&str] = &["L", "X", "LX", "L2", "L2X", "L3", "X2", "Z", "L2X2", "X3"];

pub struct App {
    pub cat: Arc<Catalogue>,
    pub complex: Complex,
    pub report: Report,
    /// A title for the working complex (the demo scenario, or what was typed).
    pub title: String,
    undo: Vec<Complex>,
    redo: Vec<Complex>,
    pub focus: Focus,
    pub mode: Mode,
    /// Selected row of the working complex (index into `complex.slots()`).
    pub row: usize,
    pub query: String,
    /// Catalogue indices matching the query and filters, best first.
    pub hits: Vec<usize>,
    /// Selected hit.
    pub hit: usize,
    pub family: Option<&'static str>,
    pub class: Option<&'static str>,
    pub pending: Pending,
    pub preview: Option<Result<Preview, String>>,
    pub formula_input: String,
    pub notice: Option<Notice>,
    pub help_scroll: u16,
    pub ascii: bool,
    pub quit: bool,
    /// Set when the screen must be cleared and drawn in full (Ctrl-L).
    pub repaint: bool,
}

impl App {
    pub fn new(cat: Arc<Catalogue>, complex: Complex, title: String, ascii: bool) -> App {
        let report = count(&complex);
        let mut app = App {
            cat,
            complex,
            report,
            title,
            undo: Vec::new(),
            redo: Vec::new(),
            focus: Focus::Complex,
            mode: Mode::Normal,
            row: 0,
            query: String::new(),
            hits: Vec::new(),
            hit: 0,
            family: None,
            class: None,
            pending: Pending::Swap,
            preview: None,
            formula_input: String::new(),
            notice: None,
            help_scroll: 0,
            ascii,
            quit: false,
            repaint: false,
        };
        app.refilter(false);
        app.refresh_preview();
        app
    }

    /// The keymap context for the current focus and mode.
    pub fn context(&self) -> Context {
        match self.mode {
            Mode::Search => Context::Search,
            Mode::Formula => Context::Formula,
            Mode::Help => Context::Help,
            Mode::Normal => match self.focus {
                Focus::Complex => Context::Complex,
                Focus::Catalogue => Context::Catalogue,
            },
        }
    }

    /// Map a key to an action: the table first, then typed characters while a line is edited.
    pub fn handle_key(&self, ev: KeyEvent) -> Option<Action> {
        if ev.kind == KeyEventKind::Release {
            return None;
        }
        let ctx = self.context();
        if let Some(a) = keymap::lookup(&ev, ctx) {
            return Some(a);
        }
        match (ctx, ev.code) {
            (Context::Search | Context::Formula, KeyCode::Char(c))
                if !ev.modifiers.contains(KeyModifiers::CONTROL)
                    && !ev.modifiers.contains(KeyModifiers::ALT) =>
            {
                Some(Action::Input(c))
            }
            _ => None,
        }
    }

    pub fn slots(&self) -> Vec<Slot> {
        self.complex.slots()
    }

    pub fn selected_slot(&self) -> Option<Slot> {
        self.slots().get(self.row).copied()
    }

    pub fn selected_ligand(&self) -> Option<&Arc<LigandDef>> {
        self.hits.get(self.hit).map(|&i| &self.cat.ligands()[i])
    }

    /// Change the state for `action`.
    pub fn apply(&mut self, action: Action) {
        if !matches!(action, Action::Up | Action::Down) {
            self.notice = None;
        }
        match action {
            Action::Quit => self.quit = true,
            Action::Repaint => self.repaint = true,
            Action::Help => {
                self.mode = Mode::Help;
                self.help_scroll = 0;
            }
            Action::CloseHelp => self.mode = Mode::Normal,
            Action::Up => self.move_by(-1),
            Action::Down => self.move_by(1),
            Action::PageUp => self.move_by(-10),
            Action::PageDown => self.move_by(10),
            Action::FocusLeft => self.focus = Focus::Complex,
            Action::FocusRight => self.focus = Focus::Catalogue,
            Action::FocusNext => {
                self.focus = match self.focus {
                    Focus::Complex => Focus::Catalogue,
                    Focus::Catalogue => Focus::Complex,
                }
            }
            Action::StartSearch => {
                self.mode = Mode::Search;
                self.set_pending(Pending::Swap);
            }
            Action::Input(c) => match self.mode {
                Mode::Search => {
                    self.query.push(c);
                    self.refilter(true);
                }
                Mode::Formula => self.formula_input.push(c),
                _ => {}
            },
            Action::DeleteChar => match self.mode {
                Mode::Search => {
                    self.query.pop();
                    self.refilter(false);
                }
                Mode::Formula => {
                    self.formula_input.pop();
                }
                _ => {}
            },
            Action::ClearInput => match self.mode {
                Mode::Search => {
                    self.query.clear();
                    self.refilter(false);
                }
                Mode::Formula => self.formula_input.clear(),
                _ => {}
            },
            Action::LeaveInput => self.mode = Mode::Normal,
            Action::StartFormula => {
                self.mode = Mode::Formula;
                self.formula_input.clear();
            }
            Action::SubmitFormula => self.submit_formula(),
            Action::PendAdd => self.set_pending(Pending::Add),
            Action::PendRemove => self.set_pending(Pending::Remove),
            Action::PendMode => self.pend_next_mode(),
            Action::PendOxidize => self.set_pending(Pending::Charge(1)),
            Action::PendReduce => self.set_pending(Pending::Charge(-1)),
            Action::Cancel => self.set_pending(Pending::Swap),
            Action::Commit => self.commit(),
            Action::Undo => self.undo(),
            Action::Redo => self.redo(),
            Action::CycleFamily => {
                self.family = cycle(FAMILIES, self.family);
                self.refilter(false);
            }
            Action::CycleClass => {
                self.class = cycle(CLASS_FILTERS, self.class);
                self.refilter(false);
            }
            Action::ClearFilters => {
                self.family = None;
                self.class = None;
                self.refilter(false);
            }
        }
    }

    fn move_by(&mut self, delta: i32) {
        if self.mode == Mode::Help {
            self.help_scroll = (self.help_scroll as i32 + delta).max(0) as u16;
            return;
        }
        let on_catalogue = self.mode == Mode::Search || self.focus == Focus::Catalogue;
        let (pos, len) = if on_catalogue {
            (&mut self.hit, self.hits.len())
        } else {
            (&mut self.row, self.complex.slots().len())
        };
        if len == 0 {
            *pos = 0;
        } else {
            *pos = (*pos as i64 + delta as i64).clamp(0, len as i64 - 1) as usize;
        }
        if !on_catalogue {
            if let Pending::Mode(_) = self.pending {
                self.pending = Pending::Swap;
            }
        }
        self.refresh_preview();
    }

    fn set_pending(&mut self, p: Pending) {
        self.pending = p;
        self.refresh_preview();
    }

    /// Each press of the mode key steps to the next binding mode of the selected ligand.
    fn pend_next_mode(&mut self) {
        let Some(b) = self.selected_slot().and_then(|s| self.complex.group(s)) else {
            self.notice("select a ligand of the working complex first", true);
            return;
        };
        let n = b.ligand.modes.len();
        if n < 2 {
            self.notice(&format!("{} has only one binding mode", b.ligand.key), true);
            return;
        }
        let current = match self.pending {
            Pending::Mode(m) => m,
            _ => b.mode,
        };
        let next = (current + 1) % n;
        let next = if next == b.mode { (next + 1) % n } else { next };
        self.set_pending(Pending::Mode(next));
    }

    /// The edit the preview stands for, or why there is none.
    pub fn pending_edit(&self) -> Result<Edit, String> {
        let slot = self.selected_slot();
        let ligand = self.selected_ligand().cloned();
        match self.pending {
            Pending::Swap => match (slot, ligand) {
                (Some(slot), Some(ligand)) => Ok(Edit::Swap {
                    mode: 0,
                    slot,
                    ligand,
                }),
                (None, _) => Err("the complex has no ligand to swap; press a to add one".into()),
                (_, None) => Err("no catalogue entry selected: press / and type a ligand".into()),
            },
            Pending::Add => match ligand {
                Some(ligand) => Ok(Edit::Add {
                    place: slot.map_or(Place::Site(0), |s| s.place),
                    ligand,
                    mode: 0,
                }),
                None => Err("no catalogue entry selected".into()),
            },
            Pending::Remove => slot
                .map(|slot| Edit::Remove { slot })
                .ok_or_else(|| "no ligand selected".into()),
            Pending::Mode(mode) => slot
                .map(|slot| Edit::ChangeMode { slot, mode })
                .ok_or_else(|| "no ligand selected".into()),
            Pending::Charge(d) => Ok(Edit::Charge(d)),
        }
    }

    /// Recompute the preview for the current selection and pending edit.
    pub fn refresh_preview(&mut self) {
        self.preview = Some(
            self.pending_edit()
                .and_then(|e| preview(&self.complex, &self.report, &e).map_err(|e| e.to_string())),
        );
    }

    fn commit(&mut self) {
        let p = match &self.preview {
            Some(Ok(p)) => p.clone(),
            Some(Err(e)) => {
                let e = e.clone();
                self.notice(&e, true);
                return;
            }
            None => return,
        };
        let label = describe(&p.edit, &self.complex);
        self.undo.push(self.complex.clone());
        self.redo.clear();
        self.set_complex(p.after.clone());
        if let Some(slot) = p.focus {
            if let Some(i) = self.slots().iter().position(|s| *s == slot) {
                self.row = i;
            }
        }
        self.mode = Mode::Normal;
        self.pending = Pending::Swap;
        self.refresh_preview();
        self.notice(&format!("done: {label}"), false);
    }

    fn set_complex(&mut self, c: Complex) {
        self.report = count(&c);
        self.complex = c;
        let n = self.slots().len();
        if self.row >= n {
            self.row = n.saturating_sub(1);
        }
    }

    fn undo(&mut self) {
        match self.undo.pop() {
            Some(prev) => {
                let now = std::mem::replace(&mut self.complex, prev.clone());
                self.redo.push(now);
                self.set_complex(prev);
                self.pending = Pending::Swap;
                self.refresh_preview();
                self.notice("undone", false);
            }
            None => self.notice("nothing to undo", true),
        }
    }

    fn redo(&mut self) {
        match self.redo.pop() {
            Some(next) => {
                self.undo.push(self.complex.clone());
                self.set_complex(next);
                self.pending = Pending::Swap;
                self.refresh_preview();
                self.notice("redone", false);
            }
            None => self.notice("nothing to redo", true),
        }
    }

    fn submit_formula(&mut self) {
        let text = self.formula_input.trim().to_string();
        if text.is_empty() {
            self.mode = Mode::Normal;
            return;
        }
        match parse(&text, self.cat.as_ref()) {
            Ok(c) if count(&c).impossible().is_some() => {
                let why = count(&c).impossible().unwrap_or_default();
                self.notice(&why, true);
            }
            Ok(c) => {
                self.undo.push(self.complex.clone());
                self.redo.clear();
                self.set_complex(c);
                self.row = 0;
                self.title = text.clone();
                self.mode = Mode::Normal;
                self.pending = Pending::Swap;
                self.refresh_preview();
                self.notice(&format!("now working on {text}"), false);
            }
            // stay in the formula line so the text can be mended
            Err(e) => self.notice(&e.to_string(), true),
        }
    }

    /// Filter the catalogue for the query and filters; `narrow` reuses the previous hits when
    /// the query only grew.
    fn refilter(&mut self, narrow: bool) {
        let selected = self.hits.get(self.hit).copied();
        let family = self.family;
        let class = self.class.and_then(|c| CbcClass::parse(c).ok());
        let keep = |l: &LigandDef| {
            family.is_none_or(|f| l.family == f)
                && class.is_none_or(|c| l.modes.iter().any(|m| m.class == c))
        };
        let previous = std::mem::take(&mut self.hits);
        let within = narrow.then_some(previous.as_slice());
        self.hits = self
            .cat
            .filter(&self.query, keep, within)
            .into_iter()
            .map(|(i, _)| i)
            .collect();
        // keep the same entry selected if it is still there, else the best hit
        self.hit = selected
            .and_then(|s| self.hits.iter().position(|&h| h == s))
            .filter(|_| self.query.is_empty())
            .unwrap_or(0);
        self.refresh_preview();
    }

    fn notice(&mut self, text: &str, error: bool) {
        self.notice = Some(Notice {
            text: text.to_string(),
            error,
        });
    }
}

fn cycle(list: &'static [&'static str], current: Option<&'static str>) -> Option<&'static str> {
    match current {
        None => list.first().copied(),
        Some(c) => {
            let i = list.iter().position(|x| *x == c)?;
            list.get(i + 1).copied()
        }
    }
}

/// A few words for what an edit would do, for the preview's first line.
pub fn propose(edit: &Edit, before: &Complex) -> String {
    let key = |slot: &Slot| {
        before
            .group(*slot)
            .map_or("?".to_string(), |b| b.ligand.key.clone())
    };
    match edit {
        Edit::Swap { slot, ligand, .. } => format!("swap {} for {}", key(slot), ligand.key),
        Edit::Add { ligand, .. } => format!("add {}", ligand.key),
        Edit::Remove { slot } => format!("take {} off", key(slot)),
        Edit::ChangeMode { slot, mode } => {
            let label = before
                .group(*slot)
                .and_then(|b| b.ligand.modes.get(*mode))
                .map_or("?".to_string(), |m| m.label.clone());
            format!("bind {} {label}", key(slot))
        }
        Edit::Charge(d) if *d > 0 => "remove one electron (oxidation)".into(),
        Edit::Charge(_) => "add one electron (reduction)".into(),
    }
}

/// A few words for what an edit did, for the notice line.
pub fn describe(edit: &Edit, before: &Complex) -> String {
    let key = |slot: &Slot| {
        before
            .group(*slot)
            .map_or("?".to_string(), |b| b.ligand.key.clone())
    };
    match edit {
        Edit::Swap { slot, ligand, .. } => format!("{} swapped for {}", key(slot), ligand.key),
        Edit::Add { ligand, .. } => format!("{} added", ligand.key),
        Edit::Remove { slot } => format!("{} removed", key(slot)),
        Edit::ChangeMode { slot, mode } => {
            let label = before
                .group(*slot)
                .and_then(|b| b.ligand.modes.get(*mode))
                .map_or("?".to_string(), |m| m.label.clone());
            format!("{} now bound {label}", key(slot))
        }
        Edit::Charge(d) if *d > 0 => "one-electron oxidation".into(),
        Edit::Charge(_) => "one-electron reduction".into(),
    }
}

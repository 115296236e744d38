//! The TUI's whole state and how actions change it. No I/O here: keys come in as values,
//! drawing reads the state.

use std::sync::Arc;

use ratatui::crossterm::event::{KeyCode, KeyEvent, KeyEventKind, KeyModifiers};

use super::action::Action;
use super::effect::{Done, Effect};
use super::keymap::{self, Context};
use crate::catalogue::{Catalogue, FAMILIES};
use crate::chem::edit::{Edit, Place, Slot};
use crate::chem::ligand::{CbcClass, LigandDef};
use crate::chem::preview::{self, Change, Preview};
use crate::chem::screen::{self, Rank};
use crate::chem::steps::{self, Step};
use crate::chem::{count, parse, Complex, Report};
use crate::session::Session;

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
    /// Typing a line: a new formula, a bookmark name or a substrate.
    Line(LineKind),
    Help,
    /// The session's tree of variants.
    Tree,
    /// Two variants side by side.
    Compare,
    /// Ranked swaps for the selected ligand.
    Screen,
    /// The current path drawn as a cycle.
    Cycle,
}

/// What a typed line is for.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum LineKind {
    Formula,
    Bookmark,
    /// A ligand, reagent or step for a step being set up.
    Ask(Ask),
}

/// What a step asks for before it can be previewed.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Ask {
    Substrate,
    Ligand,
    Transmetalating,
    Abstractor,
    Acid,
    Nucleophile,
    Electrophile,
    SigmaReagent,
    CHSubstrate,
    Base,
    Step,
}

impl Ask {
    /// Whether the answer is a ligand (searched in the catalogue) rather than a reagent.
    pub fn is_ligand(self) -> bool {
        self == Ask::Ligand
    }
}

impl LineKind {
    pub fn prompt(self) -> &'static str {
        match self {
            LineKind::Formula => "formula",
            LineKind::Bookmark => "bookmark name",
            LineKind::Ask(a) => match a {
                Ask::Substrate => "substrate to add (H2, MeI, PhBr, A-B, SMILES)",
                Ask::Ligand => "ligand to bind",
                Ask::Transmetalating => "reagent that brings R (PhB(OH)2, MeZnCl, Bu3SnPh)",
                Ask::Abstractor => "taken by (AgBF4, B(C6F5)3, [Ph3C]+)",
                Ask::Acid => "acid (HCl, HBF4, HOTf)",
                Ask::Nucleophile => "nucleophile (OH, MeOH, H2O, NaOMe)",
                Ask::Electrophile => "electrophile (HBF4, MeOTf)",
                Ask::SigmaReagent => "reagent A-B (H2, CH4, HSiPh3)",
                Ask::CHSubstrate => "C-H substrate (PhH, H-C6F5)",
                Ask::Base => "base (Et3N, NaOtBu), or Enter for none",
                Ask::Step => "step, as the command line writes it",
            },
        }
    }
}

/// The edit the preview pane shows; Enter commits it.
#[derive(Debug, Clone, PartialEq, Eq)]
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
    /// An elementary step with its preconditions.
    Step(Step),
}

/// A message under the panes: what just happened or what went wrong.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Notice {
    pub text: String,
    pub error: bool,
}

/// The screening view's state.
#[derive(Debug, Clone)]
pub struct ScreenView {
    pub constraints: screen::Constraints,
    /// Electron target, if any (16 or 18).
    pub electrons: Option<i64>,
    pub rank: Rank,
    pub found: Vec<screen::Candidate>,
    pub row: usize,
    pub problem: Option<String>,
}

impl Default for ScreenView {
    fn default() -> ScreenView {
        ScreenView {
            constraints: screen::Constraints::default(),
            electrons: None,
            rank: Rank::Electrons,
            found: Vec::new(),
            row: 0,
            problem: None,
        }
    }
}

/// CBC classes offered by the class filter, most common first.
pub const CLASS_FILTERS: &[&str] = &["L", "X", "LX", "L2", "L2X", "L3", "X2", "Z", "L2X2", "X3"];

/// The working complex and how it got here: what the left pane shows and the preview acts on.
pub struct Editor {
    pub complex: Complex,
    pub report: Report,
    /// A title for the working complex (the demo scenario, or what was typed).
    pub title: String,
    undo: Vec<(Complex, Option<u64>)>,
    redo: Vec<(Complex, Option<u64>)>,
    /// Selected row of the working complex (index into `complex.slots()`).
    pub row: usize,
    pub pending: Pending,
    pub preview: Option<Result<Preview, String>>,
    /// Other ways the step in the preview could go (partners, alkenes), and which is shown.
    pub choices: Vec<Step>,
    pub choice: usize,
    /// Keys of ligands that left by dissociation on the path, most recent first.
    departed: Vec<String>,
    /// The step that made the working complex, if it was one.
    last_step: Option<Step>,
    /// Ligand keys of the complex the planner started from: only these are expected back.
    start_keys: Vec<String>,
}

/// The catalogue pane: the search, its filters and the hits.
#[derive(Default)]
pub struct CatalogueView {
    pub query: String,
    /// Catalogue indices matching the query and filters, best first.
    pub hits: Vec<usize>,
    /// Selected hit.
    pub hit: usize,
    pub family: Option<&'static str>,
    pub class: Option<&'static str>,
}

/// The session: its log, where the working complex sits in it, and the tree and cycle views.
#[derive(Default)]
pub struct SessionView {
    /// The session log every commit goes to, if the planner has one.
    pub session: Option<Session>,
    /// The variant of the session the working complex is.
    pub variant: Option<u64>,
    /// Selected row of the tree view.
    pub row: usize,
    /// The variant compared with the working one.
    pub compare: Option<u64>,
    /// Scroll position of the cycle view.
    pub cycle_scroll: u16,
}

/// The line at the bottom: a formula, a bookmark name, or the answer to a step's question.
#[derive(Default)]
pub struct PromptView {
    pub input: String,
    /// Catalogue ligands or substrates matching what is typed at a step's question, and the
    /// one picked with the arrows (None: the text as typed).
    pub hits: Vec<String>,
    pub pick: Option<usize>,
    /// The step a question is for, and the ligand it was asked about.
    asking_for: Option<(Ask, Option<String>)>,
}

/// The planner's whole state, grouped by view; it does no I/O (see `effect`).
pub struct App {
    pub cat: Arc<Catalogue>,
    pub editor: Editor,
    pub catalogue: CatalogueView,
    pub log: SessionView,
    /// The screening view: its constraints, ranking, candidates and cursor.
    pub screen: ScreenView,
    pub prompt: PromptView,
    pub focus: Focus,
    pub mode: Mode,
    pub notice: Option<Notice>,
    pub help_scroll: u16,
    pub ascii: bool,
    pub quit: bool,
    /// Set when the screen must be cleared and drawn in full (Ctrl-L).
    pub repaint: bool,
    /// I/O asked for by the action being applied, handed to the event loop.
    effects: Vec<Effect>,
}

impl App {
    pub fn new(cat: Arc<Catalogue>, complex: Complex, title: String, ascii: bool) -> App {
        let report = count(&complex);
        let mut app = App {
            cat,
            editor: Editor {
                complex,
                report,
                title,
                undo: Vec::new(),
                redo: Vec::new(),
                row: 0,
                pending: Pending::Swap,
                preview: None,
                choices: Vec::new(),
                choice: 0,
                departed: Vec::new(),
                last_step: None,
                start_keys: Vec::new(),
            },
            catalogue: CatalogueView::default(),
            log: SessionView::default(),
            screen: ScreenView::default(),
            prompt: PromptView::default(),
            focus: Focus::Complex,
            mode: Mode::Normal,
            notice: None,
            help_scroll: 0,
            ascii,
            quit: false,
            repaint: false,
            effects: Vec::new(),
        };
        app.editor.start_keys = app
            .editor
            .complex
            .all_ligands()
            .map(|(_, b)| b.ligand.key.clone())
            .collect();
        app.refilter(false);
        app.refresh_preview();
        app
    }

    /// The keymap context for the current focus and mode.
    pub fn context(&self) -> Context {
        match self.mode {
            Mode::Search => Context::Search,
            Mode::Line(_) => Context::Formula,
            Mode::Help => Context::Help,
            Mode::Tree => Context::Tree,
            Mode::Compare => Context::Compare,
            Mode::Screen => Context::Screen,
            Mode::Cycle => Context::Help,
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
        self.editor.complex.slots()
    }

    pub fn selected_slot(&self) -> Option<Slot> {
        self.slots().get(self.editor.row).copied()
    }

    pub fn selected_ligand(&self) -> Option<&Arc<LigandDef>> {
        self.catalogue
            .hits
            .get(self.catalogue.hit)
            .map(|&i| &self.cat.ligands()[i])
    }

    /// Change the state for `action`.
    /// Change the planner's state for an action; the I/O it needs comes back as effects for
    /// the event loop to carry out (`effect::run`), whose outcomes go to `settle`.
    #[must_use = "the effects must be carried out (effect::run) or settled"]
    pub fn apply(&mut self, action: Action) -> Vec<Effect> {
        self.act(action);
        std::mem::take(&mut self.effects)
    }

    /// Learn how an effect went: a recorded variant becomes the working one, a failed write
    /// is reported and nothing claims it was saved.
    pub fn settle(&mut self, effect: Effect, outcome: Result<Done, String>) -> Vec<Effect> {
        match (effect, outcome) {
            (Effect::Record { record, label }, Ok(_)) => {
                if let Some(s) = self.log.session.as_mut() {
                    let id = s.admit(record);
                    self.log.variant = Some(id);
                    // a cycle that has come back round is said at once, with its net
                    match s.closes(id) {
                        Some(from) => {
                            let net = s.net(from, id).text();
                            self.notice(
                                &format!("#{id} closes the cycle from #{from}: {net} (y)"),
                                false,
                            )
                        }
                        None => self.notice(&format!("done: {label} (variant {id})"), false),
                    }
                    // another process may have written meanwhile
                    self.effects.push(Effect::Refresh);
                }
            }
            (Effect::Refresh, Ok(Done::Refreshed(ids))) => {
                if !ids.is_empty() {
                    let others = format!(
                        "{} variant{} added by another process",
                        ids.len(),
                        if ids.len() == 1 { "" } else { "s" }
                    );
                    let text = match &self.notice {
                        Some(n) if !n.error => format!("{}; {others}", n.text),
                        _ => others,
                    };
                    self.notice(&text, false);
                }
            }
            (Effect::Refresh, Ok(Done::Written)) => {}
            (Effect::Refresh, Err(e)) => self.notice(&e, true),
            (Effect::Record { label, .. }, Err(e)) => {
                self.notice(&format!("{label} done here, but not recorded: {e}"), true)
            }
            (Effect::Bookmark { record }, Ok(_)) => {
                if let Some(s) = self.log.session.as_mut() {
                    let id = s.admit(record);
                    let name = s.bookmark_of(id).unwrap_or_default().to_string();
                    self.notice(&format!("variant {id} bookmarked as '{name}'"), false);
                }
            }
            (Effect::Bookmark { .. }, Err(e)) => {
                self.notice(&format!("bookmark not recorded: {e}"), true)
            }
            (Effect::Write { done, .. }, Ok(_)) => self.notice(&done, false),
            (Effect::Write { .. }, Err(e)) => self.notice(&e, true),
        }
        std::mem::take(&mut self.effects)
    }

    fn act(&mut self, action: Action) {
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
            Action::CloseHelp => {
                self.mode = match self.mode {
                    Mode::Compare => Mode::Tree,
                    _ => Mode::Normal,
                }
            }
            Action::OpenCycle => {
                self.log.cycle_scroll = 0;
                self.mode = Mode::Cycle;
            }
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
                // each search starts afresh, as in a pager or an editor
                self.mode = Mode::Search;
                self.catalogue.query.clear();
                self.editor.pending = Pending::Swap;
                self.refilter(false);
            }
            Action::Input(c) => match self.mode {
                Mode::Search => {
                    self.catalogue.query.push(c);
                    self.refilter(true);
                }
                Mode::Line(_) => {
                    self.prompt.input.push(c);
                    self.refresh_hits();
                }
                _ => {}
            },
            Action::DeleteChar => match self.mode {
                Mode::Search => {
                    self.catalogue.query.pop();
                    self.refilter(false);
                }
                Mode::Line(_) => {
                    self.prompt.input.pop();
                    self.refresh_hits();
                }
                _ => {}
            },
            Action::ClearInput => match self.mode {
                Mode::Search => {
                    self.catalogue.query.clear();
                    self.refilter(false);
                }
                Mode::Line(_) => {
                    self.prompt.input.clear();
                    self.refresh_hits();
                }
                _ => {}
            },
            Action::LeaveInput => {
                self.mode = match self.mode {
                    Mode::Line(LineKind::Bookmark) => Mode::Tree,
                    _ => Mode::Normal,
                }
            }
            Action::StartFormula => self.start_line(LineKind::Formula),
            Action::SubmitFormula => match self.mode {
                Mode::Line(LineKind::Bookmark) => self.submit_bookmark(),
                Mode::Line(LineKind::Ask(a)) => self.submit_answer(a),
                _ => self.submit_formula(),
            },
            Action::StepOxidativeAddition => self.ask(Ask::Substrate, false),
            Action::StepAssociation => self.ask(Ask::Ligand, false),
            Action::StepTransmetalation => self.ask(Ask::Transmetalating, false),
            Action::StepAbstraction => self.ask(Ask::Abstractor, true),
            Action::StepNucleophilic => self.ask(Ask::Nucleophile, true),
            Action::StepElectrophilic => self.ask(Ask::Electrophile, true),
            Action::StepSigmaBond => self.ask(Ask::SigmaReagent, true),
            Action::StepProtonolysis => self.ask(Ask::Acid, true),
            Action::StepMetalation => self.ask(Ask::CHSubstrate, true),
            Action::StepTyped => self.ask(Ask::Step, false),
            Action::StepIsomerization => self.pend_choices(Step::Isomerization(String::new())),
            Action::StepDissociation => self.pend_on_selected(Step::Dissociation),
            Action::StepCycloaddition => self.pend_with_choices(|k| Step::Cycloaddition {
                unsaturated: String::new(),
                ligand: k,
                regio: None,
            }),
            Action::StepCoupling => {
                self.pend_with_choices(|k| Step::OxidativeCoupling(k, String::new()))
            }
            Action::StepCycloreversion => {
                let seed = Step::Cycloreversion(String::new());
                self.pend_choices(seed);
            }
            Action::NextChoice => self.next_choice(),
            Action::StepReductiveElimination => {
                self.pend_with_choices(|k| Step::ReductiveElimination(k, String::new()))
            }
            Action::StepInsertion => self.pend_with_choices(|k| Step::MigratoryInsertion {
                inserting: k,
                into: String::new(),
                regio: None,
            }),
            Action::StepBetaElimination => self.pend_with_choices(Step::beta_hydride),
            Action::StepAlphaElimination => self.pend_on_selected(Step::AlphaElimination),
            Action::StepProtonation => {
                self.set_pending(Pending::Step(Step::Protonation { acid: None }))
            }
            Action::StepDeprotonation => self.ask(Ask::Base, true),
            Action::OpenTree => self.open_tree(),
            Action::JumpToVariant => self.jump_to_variant(),
            Action::StartBookmark => {
                if self.log.session.is_some() {
                    self.start_line(LineKind::Bookmark);
                }
            }
            Action::CompareVariant => self.open_compare(),
            Action::Export => self.export(),
            Action::OpenScreen => {
                self.mode = Mode::Screen;
                self.screen.row = 0;
                self.rescreen();
            }
            Action::ScreenElectrons => {
                self.screen.electrons = match self.screen.electrons {
                    None => Some(16),
                    Some(16) => Some(18),
                    _ => None,
                };
                self.rescreen();
            }
            Action::ScreenSaturated => {
                self.screen.constraints.saturated ^= true;
                self.rescreen();
            }
            Action::ScreenCrowding => {
                self.screen.constraints.max_crowding = match self.screen.constraints.max_crowding {
                    None => Some(crate::chem::sterics::CROWDED),
                    Some(x) if x < crate::chem::sterics::OVERFULL => {
                        Some(crate::chem::sterics::OVERFULL)
                    }
                    _ => None,
                };
                self.rescreen();
            }
            Action::ScreenDiamagnetic => {
                self.screen.constraints.diamagnetic ^= true;
                self.rescreen();
            }
            Action::ScreenNoHazards => {
                self.screen.constraints.no_hazardous ^= true;
                self.rescreen();
            }
            Action::ScreenRank => {
                self.screen.rank = match self.screen.rank {
                    Rank::Electrons => Rank::Crowding,
                    Rank::Crowding => Rank::Donor,
                    Rank::Donor => Rank::Cone,
                    Rank::Cone => Rank::Electrons,
                };
                self.rescreen();
            }
            Action::ScreenPick => self.screen_pick(),
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
                self.catalogue.family = cycle(FAMILIES, self.catalogue.family);
                self.refilter(false);
            }
            Action::CycleClass => {
                self.catalogue.class = cycle(CLASS_FILTERS, self.catalogue.class);
                self.refilter(false);
            }
            Action::ClearFilters => {
                self.catalogue.family = None;
                self.catalogue.class = None;
                self.refilter(false);
            }
        }
    }

    fn move_by(&mut self, delta: i32) {
        if let Mode::Line(_) = self.mode {
            let n = self.prompt.hits.len();
            if n > 0 {
                let at = self.prompt.pick.map_or(-1, |i| i as i64) + delta as i64;
                self.prompt.pick = Some(at.clamp(0, n as i64 - 1) as usize);
            }
            return;
        }
        if self.mode == Mode::Cycle {
            self.log.cycle_scroll = (self.log.cycle_scroll as i32 + delta).max(0) as u16;
            return;
        }
        if self.mode == Mode::Help {
            self.help_scroll = (self.help_scroll as i32 + delta).max(0) as u16;
            return;
        }
        if self.mode == Mode::Screen {
            let n = self.screen.found.len();
            self.screen.row =
                (self.screen.row as i64 + delta as i64).clamp(0, n.max(1) as i64 - 1) as usize;
            return;
        }
        if self.mode == Mode::Tree {
            let n = self.log.session.as_ref().map_or(0, |s| s.variants.len());
            self.log.row =
                (self.log.row as i64 + delta as i64).clamp(0, n.max(1) as i64 - 1) as usize;
            return;
        }
        let on_catalogue = self.mode == Mode::Search || self.focus == Focus::Catalogue;
        let (pos, len) = if on_catalogue {
            (&mut self.catalogue.hit, self.catalogue.hits.len())
        } else {
            (&mut self.editor.row, self.editor.complex.slots().len())
        };
        if len == 0 {
            *pos = 0;
        } else {
            *pos = (*pos as i64 + delta as i64).clamp(0, len as i64 - 1) as usize;
        }
        if !on_catalogue {
            if let Pending::Mode(_) = self.editor.pending {
                self.editor.pending = Pending::Swap;
            }
        }
        self.refresh_preview();
    }

    fn set_pending(&mut self, p: Pending) {
        self.editor.pending = p;
        self.editor.choices.clear();
        self.editor.choice = 0;
        self.refresh_preview();
    }

    /// Each press of the mode key steps to the next binding mode of the selected ligand.
    fn pend_next_mode(&mut self) {
        let Some(b) = self
            .selected_slot()
            .and_then(|s| self.editor.complex.group(s))
        else {
            self.notice("select a ligand of the working complex first", true);
            return;
        };
        let n = b.ligand.modes.len();
        if n < 2 {
            self.notice(&format!("{} has only one binding mode", b.ligand.key), true);
            return;
        }
        let current = match &self.editor.pending {
            Pending::Mode(m) => *m,
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
        match &self.editor.pending {
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
                .map(|slot| Edit::ChangeMode { slot, mode: *mode })
                .ok_or_else(|| "no ligand selected".into()),
            Pending::Charge(d) => Ok(Edit::Charge(*d)),
            Pending::Step(_) => Err("a step, not an edit".into()),
        }
    }

    /// Recompute the preview for the current selection and pending edit or step.
    pub fn refresh_preview(&mut self) {
        self.editor.preview = Some(match &self.editor.pending {
            Pending::Step(step) => steps::take(&self.editor.complex, step, self.cat.as_ref())
                .map(|o| preview::from_step(&self.editor.complex, &o))
                .map_err(|e| e.to_string()),
            _ => self.pending_edit().and_then(|e| {
                preview::preview(&self.editor.complex, &self.editor.report, &e)
                    .map_err(|e| e.to_string())
            }),
        });
    }

    fn commit(&mut self) {
        let p = match &self.editor.preview {
            Some(Ok(p)) => p.clone(),
            Some(Err(e)) => {
                let e = e.clone();
                self.notice(&e, true);
                return;
            }
            None => return,
        };
        let label = match &p.change {
            Change::Edit(e) => describe(e, &self.editor.complex),
            Change::Step(s) => s.to_string(),
        };
        let change = match &p.equation {
            Some(eq) => crate::session::Change::Step(eq),
            None => crate::session::Change::Edit,
        };
        let before = self.editor.complex.clone();
        self.advance(p.after.clone(), &label, change);
        if let Some(slot) = p.focus {
            if let Some(i) = self.slots().iter().position(|s| *s == slot) {
                self.editor.row = i;
            }
        }
        self.mode = Mode::Normal;
        let step = match &p.change {
            Change::Step(s) => Some(s.clone()),
            Change::Edit(_) => None,
        };
        self.after_commit(&before, step);
    }

    /// After a change: select what it brought in, remember what left, and preview the step a
    /// chemist would take next (or a swap when there is none).
    fn after_commit(&mut self, before: &Complex, step: Option<Step>) {
        let keys = |c: &Complex| -> Vec<(String, u32)> {
            let mut v: Vec<(String, u32)> = Vec::new();
            for (_, b) in c.all_ligands() {
                match v.iter_mut().find(|(k, _)| *k == b.ligand.key) {
                    Some(e) => e.1 += b.count,
                    None => v.push((b.ligand.key.clone(), b.count)),
                }
            }
            v
        };
        let (old, new) = (keys(before), keys(&self.editor.complex));
        let have =
            |list: &[(String, u32)], k: &str| list.iter().find(|(x, _)| x == k).map_or(0, |e| e.1);
        // the first ligand the change brought in (or added one more of)
        if step.is_some() {
            if let Some((k, _)) = new.iter().find(|(k, n)| *n > have(&old, k)) {
                if let Some(i) = self.slots().iter().position(|s| {
                    self.editor
                        .complex
                        .group(*s)
                        .is_some_and(|b| b.ligand.key == *k)
                }) {
                    self.editor.row = i;
                }
            }
        }
        match &step {
            Some(Step::Dissociation(_)) => {
                // a catalyst's own ligand that left is expected back; a product is not
                for (k, n) in &old {
                    if *n > have(&new, k) && self.editor.start_keys.contains(k) {
                        self.editor.departed.insert(0, k.clone());
                    }
                }
            }
            Some(Step::Association(_)) => {
                for (k, n) in &new {
                    if *n > have(&old, k) {
                        if let Some(i) = self.editor.departed.iter().position(|d| d == k) {
                            self.editor.departed.remove(i);
                        }
                    }
                }
            }
            _ => {}
        }
        self.editor.last_step = step;
        let next = crate::chem::steps::suggest(
            &self.editor.complex,
            self.selected_slot(),
            self.editor.last_step.as_ref(),
            &self.editor.departed,
            self.cat.as_ref(),
        );
        match next {
            Some(s) => self.pend_choices(s),
            None => {
                self.editor.choices.clear();
                self.set_pending(Pending::Swap);
            }
        }
    }

    /// Make `next` the working complex as a committed change: undo can step back, and the
    /// session log gets a new variant whose parent is the current one.
    fn advance(&mut self, next: Complex, label: &str, change: crate::session::Change) {
        self.editor
            .undo
            .push((self.editor.complex.clone(), self.log.variant));
        self.editor.redo.clear();
        self.set_complex(next);
        match self.log.session.as_ref() {
            Some(s) => {
                let record = s.prepare(
                    self.log.variant,
                    label,
                    &self.editor.complex,
                    &self.editor.report,
                    change,
                );
                self.effects.push(Effect::Record {
                    record,
                    label: label.to_string(),
                });
            }
            None => self.notice(&format!("done: {label}"), false),
        }
    }

    fn set_complex(&mut self, c: Complex) {
        self.editor.report = count(&c);
        self.editor.complex = c;
        let n = self.slots().len();
        if self.editor.row >= n {
            self.editor.row = n.saturating_sub(1);
        }
    }

    fn undo(&mut self) {
        match self.editor.undo.pop() {
            Some((prev, variant)) => {
                self.editor
                    .redo
                    .push((self.editor.complex.clone(), self.log.variant));
                self.set_complex(prev);
                self.log.variant = variant;
                self.editor.pending = Pending::Swap;
                self.refresh_preview();
                self.notice(
                    "undone (the session keeps both; a new change branches here)",
                    false,
                );
            }
            None => self.notice("nothing to undo", true),
        }
    }

    fn redo(&mut self) {
        match self.editor.redo.pop() {
            Some((next, variant)) => {
                self.editor
                    .undo
                    .push((self.editor.complex.clone(), self.log.variant));
                self.set_complex(next);
                self.log.variant = variant;
                self.editor.pending = Pending::Swap;
                self.refresh_preview();
                self.notice("redone", false);
            }
            None => self.notice("nothing to redo", true),
        }
    }

    fn start_line(&mut self, kind: LineKind) {
        self.mode = Mode::Line(kind);
        self.prompt.input.clear();
    }

    /// Preview a step on the selected ligand.
    fn pend_on_selected(&mut self, make: fn(String) -> Step) {
        match self
            .selected_slot()
            .and_then(|s| self.editor.complex.group(s))
        {
            Some(b) => {
                let key = b.ligand.key.clone();
                self.set_pending(Pending::Step(make(key)));
            }
            None => self.notice("select a ligand of the working complex first", true),
        }
    }

    /// Ask for what a step needs (a substrate, a ligand, a reagent); `on_selected` steps act
    /// on the selected ligand, which must be there.
    fn ask(&mut self, what: Ask, on_selected: bool) {
        let selected = self
            .selected_slot()
            .and_then(|s| self.editor.complex.group(s))
            .map(|b| b.ligand.key.clone());
        if on_selected && selected.is_none() {
            self.notice("select a ligand of the working complex first", true);
            return;
        }
        self.prompt.asking_for = Some((what, selected));
        self.start_line(LineKind::Ask(what));
        self.refresh_hits();
    }

    /// The catalogue ligands or substrates that match what is typed so far.
    fn refresh_hits(&mut self) {
        self.prompt.pick = None;
        self.prompt.hits.clear();
        let Mode::Line(LineKind::Ask(what)) = self.mode else {
            return;
        };
        let q = self.prompt.input.trim().to_lowercase();
        if what == Ask::Step {
            self.prompt.hits = crate::chem::steps::STEP_WORDS
                .iter()
                .filter(|(w, _, _)| {
                    q.is_empty() || w.starts_with(q.split(' ').next().unwrap_or(""))
                })
                .map(|(_, _, e)| e.to_string())
                .take(8)
                .collect();
            return;
        }
        if q.is_empty() {
            return;
        }
        if what.is_ligand() {
            self.prompt.hits = self
                .cat
                .search(&self.prompt.input)
                .into_iter()
                .take(8)
                .map(|h| h.ligand.key.clone())
                .collect();
            return;
        }
        use crate::chem::reagent::{suits, Role};
        let role = match what {
            Ask::Substrate | Ask::SigmaReagent | Ask::Ligand | Ask::Step => Role::Adds,
            Ask::Transmetalating => Role::Transmetalates,
            Ask::Abstractor => Role::Abstracts,
            Ask::Acid | Ask::Electrophile => Role::Electrophile,
            Ask::Nucleophile => Role::Nucleophile,
            Ask::Base => Role::Base,
            Ask::CHSubstrate => Role::CH,
        };
        // reagents that fit the question first, then the earliest match, then the shortest
        let mut hits: Vec<(bool, usize, String)> = self
            .cat
            .substrates()
            .iter()
            .filter_map(|d| {
                std::iter::once(&d.key)
                    .chain([&d.name, &d.formula])
                    .chain(&d.aliases)
                    .filter_map(|t| t.to_lowercase().find(&q))
                    .min()
                    .map(|at| (!suits(&d.structure, role), at, d.key.clone()))
            })
            .collect();
        hits.sort_by(|a, b| {
            (a.0, a.1)
                .cmp(&(b.0, b.1))
                .then(a.2.len().cmp(&b.2.len()))
                .then(a.2.cmp(&b.2))
        });
        let hits: Vec<(usize, String)> = hits.into_iter().map(|(_, at, k)| (at, k)).collect();
        self.prompt.hits = hits.into_iter().take(8).map(|(_, k)| k).collect();
    }

    /// The answer to a step's question: the match picked with the arrows, else the text as
    /// typed when it reads, else the best match.
    fn answer(&self, what: Ask) -> String {
        let typed = self.prompt.input.trim().to_string();
        if let Some(i) = self.prompt.pick {
            if let Some(h) = self.prompt.hits.get(i) {
                return h.clone();
            }
        }
        let reads = match what {
            Ask::Step => crate::chem::steps::Step::parse(&typed).is_ok(),
            Ask::Ligand => self.cat.get(&typed).is_some(),
            _ => crate::chem::reagent::read(&typed, self.cat.as_ref()).is_ok(),
        };
        if reads || typed.is_empty() {
            return typed;
        }
        self.prompt.hits.first().cloned().unwrap_or(typed)
    }

    fn submit_answer(&mut self, what: Ask) {
        let text = self.answer(what);
        let on = self
            .prompt
            .asking_for
            .take()
            .and_then(|(_, s)| s)
            .unwrap_or_default();
        self.mode = Mode::Normal;
        self.prompt.hits.clear();
        if text.is_empty() && what != Ask::Base {
            return;
        }
        let step = match what {
            Ask::Substrate => match Step::parse(&format!("oxidative-addition {text}")) {
                Ok(s) => s,
                Err(_) => Step::OxidativeAddition(text, None),
            },
            Ask::Ligand => Step::Association(text),
            Ask::Transmetalating => {
                // onto the selected X group if one is selected, else the usual halide
                let leaving = self
                    .selected_slot()
                    .and_then(|s| self.editor.complex.group(s))
                    .filter(|b| b.mode().class.x == 1)
                    .map(|b| b.ligand.key.clone());
                Step::Transmetalation {
                    reagent: text,
                    leaving,
                }
            }
            Ask::Abstractor => Step::Abstraction {
                group: on,
                by: text,
            },
            Ask::Acid => Step::Protonolysis {
                group: on,
                acid: text,
            },
            Ask::Nucleophile => Step::NucleophilicAttack {
                nucleophile: text,
                target: on,
            },
            Ask::Electrophile => Step::ElectrophilicAttack {
                electrophile: text,
                target: on,
            },
            Ask::SigmaReagent => Step::SigmaBondMetathesis {
                reagent: text,
                group: on,
            },
            Ask::CHSubstrate => Step::ConcertedMetalationDeprotonation {
                substrate: text,
                base: on,
            },
            Ask::Base => Step::Deprotonation {
                group: on,
                base: (!text.is_empty()).then_some(text),
            },
            Ask::Step => match Step::parse(&text) {
                Ok(s) => s,
                Err(e) => {
                    self.notice(&e.to_string(), true);
                    return;
                }
            },
        };
        self.pend_choices(step);
    }

    /// Preview `seed` with the other ways it could go ready for `n`.
    fn pend_choices(&mut self, seed: Step) {
        let found = crate::chem::steps::choices(&self.editor.complex, &seed, self.cat.as_ref());
        let first = found.first().cloned();
        self.set_pending(Pending::Step(first.unwrap_or(seed)));
        self.editor.choices = found;
    }

    /// A step on the selected ligand, with its choices.
    fn pend_with_choices(&mut self, make: impl Fn(String) -> Step) {
        match self
            .selected_slot()
            .and_then(|s| self.editor.complex.group(s))
        {
            Some(b) => {
                let key = b.ligand.key.clone();
                self.pend_choices(make(key));
            }
            None => self.notice("select a ligand of the working complex first", true),
        }
    }

    /// Show the next way the step in the preview could go.
    fn next_choice(&mut self) {
        if self.editor.choices.len() < 2 {
            self.notice("this step has no other partner or product here", true);
            return;
        }
        let next = (self.editor.choice + 1) % self.editor.choices.len();
        let step = self.editor.choices[next].clone();
        self.editor.pending = Pending::Step(step);
        self.editor.choice = next;
        self.refresh_preview();
    }

    /// Run the screen again for the selected ligand under the current constraints.
    fn rescreen(&mut self) {
        self.screen.constraints.electrons = self.screen.electrons.map(|e| (e, e));
        self.screen.found.clear();
        self.screen.problem = None;
        let Some(slot) = self.selected_slot() else {
            self.screen.problem = Some("select a ligand of the working complex first".into());
            return;
        };
        match screen::screen(
            &self.editor.complex,
            &[slot],
            self.cat.ligands(),
            &self.screen.constraints,
            self.screen.rank,
            50,
            None,
        ) {
            Ok(found) => self.screen.found = found,
            Err(e) => self.screen.problem = Some(e.to_string()),
        }
        let n = self.screen.found.len();
        if self.screen.row >= n {
            self.screen.row = n.saturating_sub(1);
        }
    }

    /// Put the highlighted candidate in the catalogue selection: the normal preview shows it.
    fn screen_pick(&mut self) {
        let Some(key) = self
            .screen
            .found
            .get(self.screen.row)
            .and_then(|c| c.ligands.first())
            .map(|l| l.key.clone())
        else {
            return;
        };
        self.catalogue.query.clear();
        self.catalogue.family = None;
        self.catalogue.class = None;
        self.refilter(false);
        if let Some(i) = self
            .catalogue
            .hits
            .iter()
            .position(|&h| self.cat.ligands()[h].key == key)
        {
            self.catalogue.hit = i;
        }
        self.mode = Mode::Normal;
        self.editor.pending = Pending::Swap;
        self.refresh_preview();
    }

    fn open_tree(&mut self) {
        let Some(s) = self.log.session.as_ref() else {
            self.notice("this planner keeps no session (no data directory)", true);
            return;
        };
        let tree = s.tree();
        self.log.row = self
            .log
            .variant
            .and_then(|v| tree.iter().position(|(_, x)| x.id == v))
            .unwrap_or(0);
        self.mode = Mode::Tree;
        self.effects.push(Effect::Refresh);
    }

    /// The variant under the tree cursor.
    pub fn tree_selection(&self) -> Option<u64> {
        let s = self.log.session.as_ref()?;
        s.tree().get(self.log.row).map(|(_, v)| v.id)
    }

    fn jump_to_variant(&mut self) {
        let Some(id) = self.tree_selection() else {
            return;
        };
        let Some(formula) = self
            .log
            .session
            .as_ref()
            .and_then(|s| s.get(id))
            .map(|v| v.formula.clone())
        else {
            return;
        };
        match parse(&formula, self.cat.as_ref()) {
            Ok(c) => {
                self.editor
                    .undo
                    .push((self.editor.complex.clone(), self.log.variant));
                self.editor.redo.clear();
                self.set_complex(c);
                self.log.variant = Some(id);
                self.mode = Mode::Normal;
                self.editor.pending = Pending::Swap;
                self.refresh_preview();
                self.notice(
                    &format!("at variant {id}; a change committed now starts a branch from it"),
                    false,
                );
            }
            Err(e) => self.notice(&format!("variant {id} cannot be read now: {e}"), true),
        }
    }

    fn submit_bookmark(&mut self) {
        let name = self.prompt.input.trim().to_string();
        self.mode = Mode::Tree;
        let Some(id) = self.tree_selection() else {
            return;
        };
        if name.is_empty() {
            return;
        }
        if self.log.session.is_some() {
            self.effects.push(Effect::Bookmark {
                record: crate::session::Session::bookmark_record(id, &name),
            });
        }
    }

    fn open_compare(&mut self) {
        match self.tree_selection() {
            Some(id) => {
                self.log.compare = Some(id);
                self.mode = Mode::Compare;
            }
            None => self.notice("no variant selected", true),
        }
    }

    /// Write the session as a Markdown table next to the session logs.
    fn export(&mut self) {
        let Some(s) = &self.log.session else {
            self.notice("this planner keeps no session to export", true);
            return;
        };
        let text = crate::session::export::markdown(s, &crate::session::export::Scope::Tree);
        let path = s.path.with_extension("md");
        // the cycle the working variant is on (or its path), as a figure beside the table
        let figure = self
            .log
            .variant
            .map(|v| crate::session::figure::svg(s, &crate::session::figure::cycle_ids(s, v)));
        let svg_path = s.path.with_extension("svg");
        let done = format!(
            "session written to {}{}",
            path.display(),
            if figure.is_some() {
                format!(" and its cycle to {}", svg_path.display())
            } else {
                String::new()
            }
        );
        let mut files = vec![(path, text)];
        if let Some(f) = figure {
            files.push((svg_path, f));
        }
        self.effects.push(Effect::Write { files, done });
    }

    fn submit_formula(&mut self) {
        let text = self.prompt.input.trim().to_string();
        if text.is_empty() {
            self.mode = Mode::Normal;
            return;
        }
        match parse(&text, self.cat.as_ref()) {
            Ok(c) if count(&c).impossible().is_some() => {
                let why = count(&c).impossible().unwrap_or_default();
                self.notice(&why, true);
            }
            Ok(mut c) => {
                crate::chem::geometry::settle(&mut c);
                self.editor.row = 0;
                self.editor.title = text.clone();
                self.mode = Mode::Normal;
                self.editor.pending = Pending::Swap;
                self.advance(c, &format!("typed {text}"), crate::session::Change::Edit);
                self.refresh_preview();
            }
            // stay in the formula line so the text can be mended
            Err(e) => self.notice(&e.to_string(), true),
        }
    }

    /// Filter the catalogue for the query and filters; `narrow` reuses the previous hits when
    /// the query only grew.
    fn refilter(&mut self, narrow: bool) {
        let selected = self.catalogue.hits.get(self.catalogue.hit).copied();
        let family = self.catalogue.family;
        let class = self.catalogue.class.and_then(|c| CbcClass::parse(c).ok());
        let keep = |l: &LigandDef| {
            family.is_none_or(|f| l.family == f)
                && class.is_none_or(|c| l.modes.iter().any(|m| m.class == c))
        };
        let previous = std::mem::take(&mut self.catalogue.hits);
        let within = narrow.then_some(previous.as_slice());
        self.catalogue.hits = self
            .cat
            .filter(&self.catalogue.query, keep, within)
            .into_iter()
            .map(|(i, _)| i)
            .collect();
        // keep the same entry selected if it is still there, else the best hit
        self.catalogue.hit = selected
            .and_then(|s| self.catalogue.hits.iter().position(|&h| h == s))
            .filter(|_| self.catalogue.query.is_empty())
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

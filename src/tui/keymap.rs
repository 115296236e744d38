//! The one table of keys: it drives dispatch, the footer hint line and the help overlay, so a
//! label is written once and never disagrees with what the key does.

use ratatui::crossterm::event::{KeyCode, KeyEvent, KeyModifiers};

use super::action::Action;

/// Where a binding applies.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Context {
    /// Anywhere outside text entry.
    Global,
    /// The working complex pane has focus.
    Complex,
    /// The catalogue pane has focus (not typing).
    Catalogue,
    /// Typing a catalogue search.
    Search,
    /// Typing a new formula.
    Formula,
    /// The help overlay is open.
    Help,
    /// The session tree is open.
    Tree,
    /// Two variants side by side.
    Compare,
    /// Ranked swaps for the selected ligand.
    Screen,
}

impl Context {
    pub fn title(self) -> &'static str {
        match self {
            Context::Global => "Anywhere",
            Context::Complex => "Working complex",
            Context::Catalogue => "Ligand catalogue",
            Context::Search => "While searching",
            Context::Formula => "While typing a formula, name or substrate",
            Context::Help => "This help and the cycle view",
            Context::Tree => "Session tree",
            Context::Compare => "Comparing variants",
            Context::Screen => "Screening swaps",
        }
    }
}

/// A key as the table writes it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Key {
    pub code: KeyCode,
    pub ctrl: bool,
}

impl Key {
    const fn plain(code: KeyCode) -> Key {
        Key { code, ctrl: false }
    }

    const fn ch(c: char) -> Key {
        Key::plain(KeyCode::Char(c))
    }

    const fn ctrl(c: char) -> Key {
        Key {
            code: KeyCode::Char(c),
            ctrl: true,
        }
    }

    fn matches(&self, ev: &KeyEvent) -> bool {
        let ctrl = ev.modifiers.contains(KeyModifiers::CONTROL);
        if ctrl != self.ctrl {
            return false;
        }
        match (self.code, ev.code) {
            // terminals disagree on whether '?' or '+' arrive with SHIFT; the character decides
            (KeyCode::Char(a), KeyCode::Char(b)) => a == b,
            (a, b) => a == b,
        }
    }
}

/// One row of the table.
#[derive(Debug, Clone, Copy)]
pub struct Binding {
    pub keys: &'static [Key],
    /// How the keys are written in the footer and help ("j ↓").
    pub shown: &'static str,
    pub action: Action,
    pub label: &'static str,
    /// The footer's word for it ("" when not in the footer).
    pub short: &'static str,
    pub context: Context,
}

use KeyCode::*;

const fn b(
    keys: &'static [Key],
    shown: &'static str,
    action: Action,
    label: &'static str,
    short: &'static str,
    context: Context,
) -> Binding {
    Binding {
        keys,
        shown,
        action,
        label,
        short,
        context,
    }
}

/// Every key nonet knows. None needs Alt, Shift+Enter, Ctrl-A or Ctrl-B.
pub static BINDINGS: &[Binding] = &[
    // moving around
    b(
        &[Key::ch('k'), Key::plain(Up)],
        "k/↑",
        Action::Up,
        "move up",
        "",
        Context::Global,
    ),
    b(
        &[Key::ch('j'), Key::plain(Down)],
        "j/↓",
        Action::Down,
        "move down",
        "",
        Context::Global,
    ),
    b(
        &[Key::ch('h'), Key::plain(Left)],
        "h/←",
        Action::FocusLeft,
        "pane to the left",
        "",
        Context::Global,
    ),
    b(
        &[Key::ch('l'), Key::plain(Right)],
        "l/→",
        Action::FocusRight,
        "pane to the right",
        "",
        Context::Global,
    ),
    b(
        &[Key::plain(Tab)],
        "Tab",
        Action::FocusNext,
        "next pane",
        "",
        Context::Global,
    ),
    b(
        &[Key::plain(PageUp)],
        "PgUp",
        Action::PageUp,
        "page up",
        "",
        Context::Global,
    ),
    b(
        &[Key::plain(PageDown)],
        "PgDn",
        Action::PageDown,
        "page down",
        "",
        Context::Global,
    ),
    // what to preview and commit
    b(
        &[Key::plain(Enter)],
        "Enter",
        Action::Commit,
        "commit the preview",
        "commit",
        Context::Global,
    ),
    b(
        &[Key::ch('/')],
        "/",
        Action::StartSearch,
        "search ligands",
        "search",
        Context::Global,
    ),
    b(
        &[Key::ch('a')],
        "a",
        Action::PendAdd,
        "add ligand to an open site (a free edit, not a step)",
        "",
        Context::Global,
    ),
    b(
        &[Key::ch('x')],
        "x",
        Action::PendRemove,
        "remove selected ligand (a free edit, not a step)",
        "",
        Context::Complex,
    ),
    b(
        &[Key::ch('m')],
        "m",
        Action::PendMode,
        "change hapticity/mode",
        "",
        Context::Complex,
    ),
    b(
        &[Key::ch('o')],
        "o",
        Action::PendOxidize,
        "oxidize (1 e)",
        "",
        Context::Global,
    ),
    b(
        &[Key::ch('r')],
        "r",
        Action::PendReduce,
        "reduce (1 e)",
        "",
        Context::Global,
    ),
    b(
        &[Key::plain(Esc)],
        "Esc",
        Action::Cancel,
        "back to the swap preview",
        "",
        Context::Global,
    ),
    b(
        &[Key::ch('e')],
        "e",
        Action::StartFormula,
        "type a new formula",
        "formula",
        Context::Global,
    ),
    b(
        &[Key::ch('u')],
        "u",
        Action::Undo,
        "undo",
        "undo",
        Context::Global,
    ),
    b(
        &[Key::ctrl('r'), Key::ch('U')],
        "^R/U",
        Action::Redo,
        "redo",
        "",
        Context::Global,
    ),
    // elementary steps, previewed before Enter commits them
    b(
        &[Key::ch('O')],
        "O",
        Action::StepOxidativeAddition,
        "oxidative addition (asks the substrate)",
        "OA",
        Context::Global,
    ),
    b(
        &[Key::ch('R')],
        "R",
        Action::StepReductiveElimination,
        "reductive elimination of the selected group",
        "",
        Context::Complex,
    ),
    b(
        &[Key::ch('i')],
        "i",
        Action::StepInsertion,
        "migratory insertion of the selected CO or alkene",
        "",
        Context::Complex,
    ),
    b(
        &[Key::ch('d')],
        "d",
        Action::StepBetaElimination,
        "β-hydride elimination of the selected alkyl",
        "",
        Context::Complex,
    ),
    b(
        &[Key::ch('A')],
        "A",
        Action::StepAlphaElimination,
        "α-elimination of the selected alkyl",
        "",
        Context::Complex,
    ),
    b(
        &[Key::ch('p')],
        "p",
        Action::StepProtonation,
        "protonation at the metal",
        "",
        Context::Global,
    ),
    b(
        &[Key::ch('P')],
        "P",
        Action::StepDeprotonation,
        "deprotonation of the selected H",
        "",
        Context::Complex,
    ),
    b(
        &[Key::ch('-')],
        "-",
        Action::StepDissociation,
        "dissociation of the selected ligand (an anion leaves as one)",
        "",
        Context::Complex,
    ),
    b(
        &[Key::ch('+')],
        "+",
        Action::StepAssociation,
        "association of a ligand (asks which)",
        "",
        Context::Global,
    ),
    b(
        &[Key::ch('T')],
        "T",
        Action::StepTransmetalation,
        "transmetalation onto the selected X group (asks the reagent)",
        "",
        Context::Global,
    ),
    b(
        &[Key::ch('B')],
        "B",
        Action::StepAbstraction,
        "abstraction of the selected group (asks by what)",
        "",
        Context::Complex,
    ),
    b(
        &[Key::ch('N')],
        "N",
        Action::StepNucleophilic,
        "nucleophilic attack on the selected ligand (asks the nucleophile)",
        "",
        Context::Complex,
    ),
    b(
        &[Key::ch('E')],
        "E",
        Action::StepElectrophilic,
        "electrophilic attack on the selected ligand (asks the electrophile)",
        "",
        Context::Complex,
    ),
    b(
        &[Key::ch('M')],
        "M",
        Action::StepSigmaBond,
        "σ-bond metathesis of the selected group (asks the reagent)",
        "",
        Context::Complex,
    ),
    b(
        &[Key::ch('H')],
        "H",
        Action::StepProtonolysis,
        "protonolysis of the selected group (asks the acid)",
        "",
        Context::Complex,
    ),
    b(
        &[Key::ch('K')],
        "K",
        Action::StepMetalation,
        "C-H activation by the selected carboxylate (CMD; asks the substrate)",
        "",
        Context::Complex,
    ),
    b(
        &[Key::ch('C')],
        "C",
        Action::StepCycloaddition,
        "[2+2] of the selected alkylidene or imido with an alkene",
        "",
        Context::Complex,
    ),
    b(
        &[Key::ch('V')],
        "V",
        Action::StepCycloreversion,
        "cycloreversion of the metallacyclobutane",
        "",
        Context::Global,
    ),
    b(
        &[Key::ch('G')],
        "G",
        Action::StepCoupling,
        "oxidative coupling of the selected π ligand with another",
        "",
        Context::Complex,
    ),
    b(
        &[Key::ch('I')],
        "I",
        Action::StepIsomerization,
        "isomerization to another arrangement (n shows the next)",
        "",
        Context::Global,
    ),
    b(
        &[Key::ch(':')],
        ":",
        Action::StepTyped,
        "type any step as the command line writes it",
        "",
        Context::Global,
    ),
    b(
        &[Key::ch('n')],
        "n",
        Action::NextChoice,
        "next partner, alkene or regiochemistry for the step shown",
        "",
        Context::Global,
    ),
    // the session
    b(
        &[Key::ch('y')],
        "y",
        Action::OpenCycle,
        "the current path as a cycle: counts, steps, net reaction",
        "cycle",
        Context::Global,
    ),
    b(
        &[Key::ch('t')],
        "t",
        Action::OpenTree,
        "session tree: go back, branch, bookmark, compare",
        "tree",
        Context::Global,
    ),
    b(
        &[Key::ch('w')],
        "w",
        Action::Export,
        "write the session as Markdown",
        "",
        Context::Global,
    ),
    b(
        &[Key::ch('f')],
        "f",
        Action::CycleFamily,
        "filter by family",
        "family",
        Context::Catalogue,
    ),
    b(
        &[Key::ch('c')],
        "c",
        Action::CycleClass,
        "filter by class",
        "class",
        Context::Catalogue,
    ),
    b(
        &[Key::ch('0')],
        "0",
        Action::ClearFilters,
        "clear filters",
        "",
        Context::Catalogue,
    ),
    b(
        &[Key::ch('?')],
        "?",
        Action::Help,
        "all keys",
        "keys",
        Context::Global,
    ),
    b(
        &[Key::ctrl('l')],
        "^L",
        Action::Repaint,
        "repaint the screen",
        "",
        Context::Global,
    ),
    b(
        &[Key::ch('q')],
        "q",
        Action::Quit,
        "quit",
        "quit",
        Context::Global,
    ),
    b(
        &[Key::ctrl('c')],
        "^C",
        Action::Quit,
        "quit",
        "",
        Context::Global,
    ),
    // typing a search
    b(
        &[Key::plain(Enter)],
        "Enter",
        Action::Commit,
        "commit the swap",
        "swap",
        Context::Search,
    ),
    b(
        &[Key::plain(Up)],
        "↑",
        Action::Up,
        "previous hit",
        "up",
        Context::Search,
    ),
    b(
        &[Key::plain(Down)],
        "↓",
        Action::Down,
        "next hit",
        "down",
        Context::Search,
    ),
    b(
        &[Key::plain(Backspace)],
        "Bksp",
        Action::DeleteChar,
        "delete",
        "",
        Context::Search,
    ),
    b(
        &[Key::ctrl('u')],
        "^U",
        Action::ClearInput,
        "clear the query",
        "",
        Context::Search,
    ),
    b(
        &[Key::plain(Esc)],
        "Esc",
        Action::LeaveInput,
        "stop searching",
        "done",
        Context::Search,
    ),
    b(
        &[Key::ctrl('c')],
        "^C",
        Action::Quit,
        "quit",
        "",
        Context::Search,
    ),
    // typing a formula
    b(
        &[Key::plain(Enter)],
        "Enter",
        Action::SubmitFormula,
        "use this formula",
        "use",
        Context::Formula,
    ),
    b(
        &[Key::plain(Backspace)],
        "Bksp",
        Action::DeleteChar,
        "delete",
        "",
        Context::Formula,
    ),
    b(
        &[Key::plain(Up)],
        "↑",
        Action::Up,
        "pick the match above (at a step's question)",
        "",
        Context::Formula,
    ),
    b(
        &[Key::plain(Down)],
        "↓",
        Action::Down,
        "pick the match below (at a step's question)",
        "",
        Context::Formula,
    ),
    b(
        &[Key::ctrl('u')],
        "^U",
        Action::ClearInput,
        "clear",
        "",
        Context::Formula,
    ),
    b(
        &[Key::plain(Esc)],
        "Esc",
        Action::LeaveInput,
        "cancel",
        "cancel",
        Context::Formula,
    ),
    b(
        &[Key::ctrl('c')],
        "^C",
        Action::Quit,
        "quit",
        "",
        Context::Formula,
    ),
    // screening swaps for the selected ligand
    b(
        &[Key::ch('S')],
        "S",
        Action::OpenScreen,
        "screen every catalogue ligand in place of the selected one",
        "screen",
        Context::Complex,
    ),
    b(
        &[Key::ch('k'), Key::plain(Up)],
        "k/↑",
        Action::Up,
        "previous candidate",
        "",
        Context::Screen,
    ),
    b(
        &[Key::ch('j'), Key::plain(Down)],
        "j/↓",
        Action::Down,
        "next candidate",
        "",
        Context::Screen,
    ),
    b(
        &[Key::plain(Enter)],
        "Enter",
        Action::ScreenPick,
        "preview this swap",
        "preview",
        Context::Screen,
    ),
    b(
        &[Key::ch('e')],
        "e",
        Action::ScreenElectrons,
        "electron target: any, 16, 18",
        "target",
        Context::Screen,
    ),
    b(
        &[Key::ch('s')],
        "s",
        Action::ScreenSaturated,
        "saturated products only",
        "sat",
        Context::Screen,
    ),
    b(
        &[Key::ch('g')],
        "g",
        Action::ScreenCrowding,
        "crowding limit: none, 1.15, 1.35",
        "crowd",
        Context::Screen,
    ),
    b(
        &[Key::ch('m')],
        "m",
        Action::ScreenDiamagnetic,
        "diamagnetic products only",
        "dia",
        Context::Screen,
    ),
    b(
        &[Key::ch('h')],
        "h",
        Action::ScreenNoHazards,
        "no hazardous free ligands",
        "safe",
        Context::Screen,
    ),
    b(
        &[Key::ch('r')],
        "r",
        Action::ScreenRank,
        "rank by electrons, crowding, donor, cone",
        "rank",
        Context::Screen,
    ),
    b(
        &[Key::plain(Esc), Key::ch('q')],
        "Esc",
        Action::CloseHelp,
        "close",
        "close",
        Context::Screen,
    ),
    b(
        &[Key::ctrl('c')],
        "^C",
        Action::Quit,
        "quit",
        "",
        Context::Screen,
    ),
    // the session tree
    b(
        &[Key::ch('k'), Key::plain(Up)],
        "k/↑",
        Action::Up,
        "previous variant",
        "",
        Context::Tree,
    ),
    b(
        &[Key::ch('j'), Key::plain(Down)],
        "j/↓",
        Action::Down,
        "next variant",
        "",
        Context::Tree,
    ),
    b(
        &[Key::plain(Enter)],
        "Enter",
        Action::JumpToVariant,
        "work on this variant",
        "go",
        Context::Tree,
    ),
    b(
        &[Key::ch('b')],
        "b",
        Action::StartBookmark,
        "bookmark it",
        "bookmark",
        Context::Tree,
    ),
    b(
        &[Key::ch('c')],
        "c",
        Action::CompareVariant,
        "compare it with the working complex",
        "compare",
        Context::Tree,
    ),
    b(
        &[Key::ch('w')],
        "w",
        Action::Export,
        "write the session as Markdown",
        "export",
        Context::Tree,
    ),
    b(
        &[Key::plain(Esc), Key::ch('t'), Key::ch('q')],
        "Esc",
        Action::CloseHelp,
        "close",
        "close",
        Context::Tree,
    ),
    b(
        &[Key::plain(Esc), Key::ch('c'), Key::ch('q')],
        "Esc",
        Action::CloseHelp,
        "back to the tree",
        "back",
        Context::Compare,
    ),
    b(
        &[Key::ctrl('c')],
        "^C",
        Action::Quit,
        "quit",
        "",
        Context::Tree,
    ),
    // help
    b(
        &[Key::ch('?'), Key::plain(Esc), Key::ch('q')],
        "?/Esc/q",
        Action::CloseHelp,
        "close help",
        "close",
        Context::Help,
    ),
    b(
        &[Key::ch('k'), Key::plain(Up)],
        "k/↑",
        Action::Up,
        "scroll up",
        "",
        Context::Help,
    ),
    b(
        &[Key::ch('j'), Key::plain(Down)],
        "j/↓",
        Action::Down,
        "scroll down",
        "",
        Context::Help,
    ),
    b(
        &[Key::ctrl('c')],
        "^C",
        Action::Quit,
        "quit",
        "",
        Context::Help,
    ),
];

/// The action for `ev` in `context`: bindings of the context first, then global ones (global
/// bindings do not apply while typing or in help).
pub fn lookup(ev: &KeyEvent, context: Context) -> Option<Action> {
    let typing = matches!(
        context,
        Context::Search
            | Context::Formula
            | Context::Help
            | Context::Tree
            | Context::Compare
            | Context::Screen
    );
    BINDINGS
        .iter()
        .filter(|b| b.context == context || (!typing && b.context == Context::Global))
        .find(|b| b.keys.iter().any(|k| k.matches(ev)))
        .map(|b| b.action)
}

/// The bindings shown in the footer for `context`.
pub fn footer(context: Context) -> impl Iterator<Item = &'static Binding> {
    let typing = matches!(
        context,
        Context::Search
            | Context::Formula
            | Context::Help
            | Context::Tree
            | Context::Compare
            | Context::Screen
    );
    BINDINGS.iter().filter(move |b| {
        !b.short.is_empty() && (b.context == context || (!typing && b.context == Context::Global))
    })
}

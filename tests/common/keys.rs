//! Driving the planner with keys written as text: "/PMe3<enter>", "<down><esc>".

use std::sync::Arc;

use nonet::catalogue::Catalogue;
use nonet::chem::parse;
use nonet::session::Session;
use nonet::tui::App;
use ratatui::crossterm::event::{KeyCode, KeyEvent};

/// The key events `keys` stands for.
pub fn events(keys: &str) -> Vec<KeyCode> {
    let mut out = Vec::new();
    let mut rest = keys;
    while !rest.is_empty() {
        let named = [
            ("<enter>", KeyCode::Enter),
            ("<esc>", KeyCode::Esc),
            ("<down>", KeyCode::Down),
            ("<up>", KeyCode::Up),
        ]
        .into_iter()
        .find_map(|(name, code)| {
            rest.strip_prefix(name)
                .map(|r| (code, rest.len() - r.len()))
        });
        let (code, used) = named.unwrap_or_else(|| {
            let c = rest.chars().next().expect("char");
            (KeyCode::Char(c), c.len_utf8())
        });
        out.push(code);
        rest = &rest[used..];
    }
    out
}

/// Press `keys`; returns how many keys that was.
pub fn press(app: &mut App, keys: &str) -> usize {
    let list = events(keys);
    for code in &list {
        if let Some(a) = app.handle_key(KeyEvent::from(*code)) {
            let effects = app.apply(a);
            nonet::tui::effect::run(app, effects);
        }
    }
    list.len()
}

/// The planner on `formula` with a fresh session in a temporary directory.
pub fn planner(formula: &str, tag: &str) -> (App, std::path::PathBuf) {
    let dir = std::env::temp_dir().join(format!("nonet-tui-{tag}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    let s = Session::open(&dir, "t").expect("session");
    (started(formula, s), dir)
}

/// The planner on `formula` with a session kept in memory: nothing touches a disk.
pub fn planner_in_memory(formula: &str) -> App {
    started(formula, Session::in_memory("t"))
}

/// The planner on `formula`, its start recorded as the root of `s`.
fn started(formula: &str, mut s: Session) -> App {
    let cat = Arc::new(Catalogue::bundled());
    let c = parse(formula, cat.as_ref()).expect("formula");
    let root = s
        .commit(
            None,
            "start",
            &c,
            &nonet::chem::count(&c),
            nonet::session::Change::Start,
        )
        .expect("root");
    let mut app = App::new(cat, c, "test".into(), false);
    app.log.session = Some(s);
    app.log.variant = Some(root);
    app
}

/// The row of the working complex that holds `key`.
pub fn row_of(app: &App, key: &str) -> usize {
    app.slots()
        .iter()
        .position(|s| {
            app.editor
                .complex
                .group(*s)
                .is_some_and(|b| b.ligand.key == key)
        })
        .unwrap_or_else(|| panic!("no {key} row in {}", app.editor.complex.formula(false)))
}

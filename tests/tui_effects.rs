//! The planner's state is separate from its I/O: an action returns the effects it needs
//! (record a variant, write an export) and the App learns how each went. Checked in memory,
//! with no disk, including a write that fails.

mod common;

use common::keys::{events, planner_in_memory};
use nonet::session::Record;
use nonet::tui::effect::{Done, Effect};
use nonet::tui::App;
use ratatui::crossterm::event::KeyEvent;

/// Press keys and collect every effect, settling each with `outcome`.
fn press_collect(app: &mut App, keys: &str, outcome: Result<(), String>) -> Vec<Effect> {
    let mut all = Vec::new();
    for code in events(keys) {
        if let Some(a) = app.handle_key(KeyEvent::from(code)) {
            for e in app.apply(a) {
                all.push(e.clone());
                let done = match e {
                    Effect::Refresh => Ok(Done::Refreshed(Vec::new())),
                    _ => outcome.clone().map(|()| Done::Written),
                };
                // what the App asks for next (a refresh after a record) goes well
                for next in app.settle(e, done) {
                    assert_eq!(next, Effect::Refresh);
                    let _ = app.settle(next, Ok(Done::Refreshed(Vec::new())));
                }
            }
        }
    }
    all
}

#[test]
fn a_step_asks_for_a_record_with_its_equation() {
    let mut app = planner_in_memory("RhCl(PPh3)3");
    let start = app.log.variant;
    let effects = press_collect(&mut app, "-<enter>", Ok(()));
    let [Effect::Record { record, label }] = &effects[..] else {
        panic!("one record expected: {effects:?}");
    };
    assert_eq!(label, "dissociation PPh3");
    let Record::Variant {
        made_by,
        leaves,
        parent,
        ..
    } = record
    else {
        panic!("a variant record: {record:?}");
    };
    assert_eq!(made_by.as_deref(), Some("step"));
    assert_eq!(*parent, start);
    assert_eq!(leaves.len(), 1, "PPh3 leaves: {leaves:?}");
    // settled as written: the working variant moved to it
    assert_ne!(app.log.variant, start);
    assert!(app.notice.as_ref().is_some_and(|n| !n.error));
}

#[test]
fn a_failed_record_is_not_claimed_saved() {
    let mut app = planner_in_memory("RhCl(PPh3)3");
    let start = app.log.variant;
    let n = app.log.session.as_ref().map(|s| s.variants.len());
    press_collect(
        &mut app,
        "-<enter>",
        Err("No space left on device".to_string()),
    );
    let notice = app.notice.clone().expect("a notice");
    assert!(notice.error, "{}", notice.text);
    assert!(notice.text.contains("not recorded"), "{}", notice.text);
    assert!(notice.text.contains("No space left"), "{}", notice.text);
    // the tree has no variant for it and the working variant did not move
    assert_eq!(app.log.session.as_ref().map(|s| s.variants.len()), n);
    assert_eq!(app.log.variant, start);
}

#[test]
fn export_asks_for_the_table_and_the_figure() {
    let mut app = planner_in_memory("RhCl(PPh3)3");
    press_collect(
        &mut app,
        "-<enter>OH2<enter><enter>+C2H4<enter><enter><enter><enter>",
        Ok(()),
    );
    let effects = press_collect(&mut app, "tw", Ok(()));
    // opening the tree reads what other processes added; `w` writes
    let [Effect::Refresh, Effect::Write { files, .. }] = &effects[..] else {
        panic!("a refresh and one write expected: {effects:?}");
    };
    let names: Vec<String> = files
        .iter()
        .map(|(p, _)| {
            p.extension()
                .and_then(|e| e.to_str())
                .unwrap_or("")
                .to_string()
        })
        .collect();
    assert_eq!(names, ["md", "svg"]);
    let (_, md) = &files[0];
    assert!(
        md.contains("C2H4 + H2 -> C2H6") || md.contains("H2 + C2H4 -> C2H6"),
        "{md}"
    );
    let (_, svg) = &files[1];
    let doc = roxmltree::Document::parse(svg).expect("the figure is XML");
    assert_eq!(doc.root_element().tag_name().name(), "svg");
}

#[test]
fn variants_from_another_process_are_announced() {
    let mut app = planner_in_memory("RhCl(PPh3)3");
    let follow = app.settle(Effect::Refresh, Ok(Done::Refreshed(vec![7, 8])));
    assert!(follow.is_empty());
    let n = app.notice.clone().expect("a notice");
    assert!(
        n.text.contains("2 variants added by another process"),
        "{}",
        n.text
    );
}

#[test]
fn a_bookmark_is_an_effect_too() {
    let mut app = planner_in_memory("IrCl(CO)(PPh3)2");
    let effects = press_collect(&mut app, "tbVaska start<enter>", Ok(()));
    assert!(
        matches!(&effects[..], [Effect::Refresh, Effect::Bookmark { .. }]),
        "{effects:?}"
    );
    let s = app.log.session.as_ref().expect("session");
    assert_eq!(s.bookmark_of(0), Some("Vaska start"));
}

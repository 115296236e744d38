//! The planner with a session: every commit recorded, branches from earlier variants,
//! bookmarks, comparison, export, and elementary steps previewed before they are committed.

mod common;

use nonet::session::Session;
use nonet::tui::{Mode, Pending};

use common::keys::{planner, press, row_of};

#[test]
fn commits_are_recorded_and_going_back_branches() {
    let (mut app, dir) = planner("IrCl(CO)(PPh3)2", "branch");
    press(&mut app, "/PMe3<enter>");
    assert_eq!(app.log.variant, Some(1));
    press(&mut app, "u/PCy3<enter>");
    let s = app.log.session.as_ref().expect("session");
    assert_eq!(s.variants.len(), 3);
    assert_eq!(s.get(1).and_then(|v| v.parent), Some(0));
    assert_eq!(
        s.get(2).and_then(|v| v.parent),
        Some(0),
        "a branch from the start"
    );
    // the log on disk has the same tree
    let back = Session::load(&dir.join("t.jsonl")).expect("load");
    assert_eq!(back.variants, s.variants);
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn the_tree_jumps_bookmarks_compares_and_exports() {
    let (mut app, dir) = planner("IrCl(CO)(PPh3)2", "tree");
    press(&mut app, "/PMe3<enter>");
    press(&mut app, "t");
    assert_eq!(app.mode, Mode::Tree);
    press(&mut app, "k<enter>");
    assert_eq!(app.log.variant, Some(0));
    assert!(app.editor.complex.formula(false).contains("PPh3)2"));
    press(&mut app, "tbVaska start<enter>");
    let s = app.log.session.as_ref().expect("session");
    assert_eq!(s.bookmark_of(0), Some("Vaska start"));
    press(&mut app, "jc");
    assert_eq!(app.mode, Mode::Compare);
    assert_eq!(app.log.compare, Some(1));
    press(&mut app, "<esc>w");
    assert!(dir.join("t.md").exists(), "export written next to the log");
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn steps_are_previewed_then_committed_and_refusals_explained() {
    let (mut app, dir) = planner("IrCl(CO)(PPh3)2", "steps");
    let before = app.editor.complex.formula(false);
    press(&mut app, "OH2<enter>");
    assert!(matches!(app.editor.pending, Pending::Step(_)));
    let p = app
        .editor
        .preview
        .clone()
        .expect("preview")
        .expect("the step is allowed");
    assert_eq!(p.after_report.metals[0].electron_count.as_int(), Some(18));
    assert_eq!(
        app.editor.complex.formula(false),
        before,
        "nothing changes before Enter"
    );
    press(&mut app, "<enter>");
    assert_eq!(
        app.editor.report.metals[0].oxidation_state.as_int(),
        Some(3)
    );
    // now 18 e: a second oxidative addition is refused, with the reason in the preview
    press(&mut app, "OH2<enter>");
    let why = app
        .editor
        .preview
        .clone()
        .expect("preview")
        .expect_err("refused");
    assert!(why.contains("open site"), "{why}");
    press(&mut app, "<enter>");
    assert_eq!(
        app.editor.report.metals[0].oxidation_state.as_int(),
        Some(3)
    );
    // reductive elimination of the selected H with its partner H
    app.editor.row = row_of(&app, "H");
    press(&mut app, "<esc>R<enter>");
    assert_eq!(
        app.editor.report.metals[0].oxidation_state.as_int(),
        Some(1)
    );
    let s = app.log.session.as_ref().expect("session");
    assert!(s
        .variants
        .iter()
        .any(|v| v.action == "oxidative-addition H2"));
    assert!(s
        .variants
        .iter()
        .any(|v| v.action.starts_with("reductive-elimination H")));
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn insertion_and_elimination_keys_act_on_the_selected_ligand() {
    let (mut app, dir) = planner("Mn(CO)5Me", "insert");
    app.editor.row = row_of(&app, "CO");
    press(&mut app, "i<enter>");
    assert!(
        app.editor.complex.formula(false).contains("COMe"),
        "{}",
        app.editor.complex.formula(false)
    );
    let _ = std::fs::remove_dir_all(&dir);

    let (mut app, dir) = planner("PdEt(Cl)(PPh3)", "beta");
    app.editor.row = row_of(&app, "Et");
    press(&mut app, "d<enter>");
    assert!(app.editor.complex.formula(false).contains("C2H4"));
    app.editor.row = row_of(&app, "H");
    // P asks for a base; Enter with none lets the proton go free, Enter again commits
    press(&mut app, "P<enter><enter>");
    assert_eq!(app.editor.complex.charge, -1);
    press(&mut app, "p<enter>");
    assert_eq!(app.editor.complex.charge, 0);
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn the_screening_view_ranks_swaps_and_opens_the_preview() {
    let (mut app, dir) = planner("IrCl(CO)(PPh3)2", "screen");
    app.editor.row = row_of(&app, "PPh3");
    press(&mut app, "S");
    assert_eq!(app.mode, Mode::Screen);
    assert!(!app.screen.found.is_empty());
    // an electron target of 16 and a crowding limit keep only fitting ligands
    press(&mut app, "eg");
    assert!(app
        .screen
        .found
        .iter()
        .all(|c| c.electrons.as_int() == Some(16) && c.crowding <= 1.15));
    // at 80x24 the constraints read in words and fit the view
    let mut t = ratatui::Terminal::new(ratatui::backend::TestBackend::new(80, 24)).expect("term");
    t.draw(|f| nonet::tui::draw(f, &app, &nonet::tui::Theme { color: false }))
        .expect("draw");
    let shown: String = t
        .backend()
        .buffer()
        .content()
        .iter()
        .map(|c| c.symbol())
        .collect();
    assert!(shown.contains("electrons 16"), "{shown}");
    assert!(shown.contains("ranked by electron count"), "{shown}");
    let first = app.screen.found[0].ligands[0].key.clone();
    press(&mut app, "<enter>");
    assert_eq!(app.mode, Mode::Normal);
    assert_eq!(app.selected_ligand().map(|l| l.key.clone()), Some(first));
    let p = app
        .editor
        .preview
        .clone()
        .expect("preview")
        .expect("a swap");
    assert_eq!(p.after_report.metals[0].electron_count.as_int(), Some(16));
    let _ = std::fs::remove_dir_all(&dir);
}

/// Another process (a script recording steps) adds variants while the planner is open: the
/// planner says so when the tree opens and after its own next commit, and shows them.
#[test]
fn the_planner_notices_variants_another_process_added() {
    let (mut app, dir) = planner("IrCl(CO)(PPh3)2", "others");
    let c = nonet::chem::parse("Cp2Fe", app.cat.as_ref()).expect("formula");
    let r = nonet::chem::count(&c);
    let mut other = Session::open(&dir, "t").expect("a second session on the log");
    let mut parent = Some(0);
    for i in 0..2 {
        parent = Some(
            other
                .commit(
                    parent,
                    &format!("script {i}"),
                    &c,
                    &r,
                    nonet::session::Change::Edit,
                )
                .expect("commit"),
        );
    }
    press(&mut app, "t");
    assert_eq!(app.mode, Mode::Tree);
    let notice = app
        .notice
        .as_ref()
        .map(|n| n.text.clone())
        .unwrap_or_default();
    assert!(
        notice.contains("2 variants added by another process"),
        "{notice}"
    );
    let s = app.log.session.as_ref().expect("session");
    assert_eq!(s.tree().len(), 3, "the tree shows them");
    press(&mut app, "<esc>");
    // one more from the script, then a commit here: the id follows theirs, and it is said
    other
        .commit(parent, "script 2", &c, &r, nonet::session::Change::Edit)
        .expect("commit");
    press(&mut app, "/PMe3<enter>");
    let notice = app
        .notice
        .as_ref()
        .map(|n| n.text.clone())
        .unwrap_or_default();
    assert!(
        notice.contains("(variant 4); 1 variant added by another process"),
        "{notice}"
    );
    assert_eq!(app.log.variant, Some(4));
    let back = Session::load(&dir.join("t.jsonl")).expect("load");
    assert_eq!(back.variants.len(), 5);
    assert_eq!(back.get(4).and_then(|v| v.parent), Some(0));
    let _ = std::fs::remove_dir_all(&dir);
}

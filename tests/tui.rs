//! The planner driven from the keyboard and drawn into a test terminal: key-driven behaviour,
//! and whole-screen snapshots at 80x24 and 120x40 (insta; review with `cargo insta review`).

mod common;

use std::sync::Arc;

use nonet::catalogue::Catalogue;
use nonet::chem::parse;
use nonet::tui::{App, Focus, Mode, Theme};
use ratatui::backend::TestBackend;
use ratatui::crossterm::event::{KeyCode, KeyEvent, KeyModifiers};
use ratatui::style::Modifier;
use ratatui::Terminal;

fn app_for(formula: &str, ascii: bool) -> App {
    let cat = Arc::new(Catalogue::bundled());
    let c = parse(formula, cat.as_ref()).unwrap_or_else(|e| panic!("{}", e.render()));
    App::new(cat, c, "test: planning session".into(), ascii)
}

fn demo() -> App {
    app_for(nonet::tui::DEMO_FORMULA, false)
}

/// Feed keys written as text: plain characters, and <enter>, <esc>, <up>, <down>, <left>,
/// <right>, <tab>, <bs>, <c-r>, <c-l>, <c-u>.
fn press(app: &mut App, keys: &str) {
    let mut rest = keys;
    while !rest.is_empty() {
        let (ev, used) = if rest.starts_with('<') {
            let end = rest.find('>').expect("closing >");
            let name = &rest[1..end];
            let ev = match name {
                "enter" => KeyEvent::from(KeyCode::Enter),
                "esc" => KeyEvent::from(KeyCode::Esc),
                "up" => KeyEvent::from(KeyCode::Up),
                "down" => KeyEvent::from(KeyCode::Down),
                "left" => KeyEvent::from(KeyCode::Left),
                "right" => KeyEvent::from(KeyCode::Right),
                "tab" => KeyEvent::from(KeyCode::Tab),
                "bs" => KeyEvent::from(KeyCode::Backspace),
                "lt" => KeyEvent::from(KeyCode::Char('<')),
                c if c.starts_with("c-") => KeyEvent::new(
                    KeyCode::Char(c.chars().nth(2).expect("ctrl key")),
                    KeyModifiers::CONTROL,
                ),
                other => panic!("unknown key <{other}>"),
            };
            (ev, end + 1)
        } else {
            let c = rest.chars().next().expect("a char");
            (KeyEvent::from(KeyCode::Char(c)), c.len_utf8())
        };
        if let Some(a) = app.handle_key(ev) {
            let effects = app.apply(a);
            nonet::tui::effect::run(app, effects);
        }
        rest = &rest[used..];
    }
}

fn screen(app: &App, w: u16, h: u16, theme: Theme) -> Terminal<TestBackend> {
    let mut t = Terminal::new(TestBackend::new(w, h)).expect("test terminal");
    t.draw(|f| nonet::tui::draw(f, app, &theme)).expect("draw");
    t
}

fn text(t: &Terminal<TestBackend>) -> String {
    let buf = t.backend().buffer();
    let mut s = String::new();
    for y in 0..buf.area.height {
        for x in 0..buf.area.width {
            s.push_str(buf[(x, y)].symbol());
        }
        s.push('\n');
    }
    s
}

const COLOR: Theme = Theme { color: true };

// ---------------------------------------------------------------- behaviour

#[test]
fn search_select_and_enter_commits_the_swap_then_undo_restores() {
    let mut app = demo();
    let before = app.editor.complex.formula(false);
    // the first row of the demo complex is CO; swap it for PMe3 straight from the search box
    press(&mut app, "/PMe3");
    assert_eq!(app.mode, Mode::Search);
    let picked = app.selected_ligand().map(|l| l.key.clone());
    assert_eq!(picked.as_deref(), Some("PMe3"));
    press(&mut app, "<enter>");
    assert_eq!(app.mode, Mode::Normal);
    let after = app.editor.complex.formula(false);
    assert_ne!(after, before);
    assert!(after.contains("PMe3") && !after.contains("(CO)"), "{after}");
    press(&mut app, "u");
    assert_eq!(app.editor.complex.formula(false), before);
    press(&mut app, "<c-r>");
    assert_eq!(app.editor.complex.formula(false), after);
}

#[test]
fn typing_q_in_the_search_types_it_and_esc_leaves() {
    let mut app = demo();
    press(&mut app, "/q");
    assert!(!app.quit);
    assert_eq!(app.catalogue.query, "q");
    press(&mut app, "<bs><esc>");
    assert_eq!(app.mode, Mode::Normal);
    assert_eq!(app.catalogue.query, "");
    press(&mut app, "q");
    assert!(app.quit);
}

#[test]
fn arrows_and_hjkl_move_alike() {
    let mut a = demo();
    let mut b = demo();
    press(&mut a, "jj");
    press(&mut b, "<down><down>");
    assert_eq!(a.editor.row, b.editor.row);
    assert_eq!(a.editor.row, 2);
    press(&mut a, "l");
    press(&mut b, "<right>");
    assert_eq!(a.focus, Focus::Catalogue);
    assert_eq!(a.focus, b.focus);
    press(&mut a, "jjk");
    assert_eq!(a.catalogue.hit, 1);
    press(&mut a, "h");
    assert_eq!(a.focus, Focus::Complex);
}

#[test]
fn add_remove_mode_and_charge_are_previewed_then_committed() {
    let mut app = app_for("CpMn(CO)3", false);
    let count = |app: &App| app.editor.report.metals[0].electron_count.as_int();
    assert_eq!(count(&app), Some(18));
    // ring slip of the selected Cp: preview first, Enter commits
    let cp_row = common::keys::row_of(&app, "Cp");
    app.editor.row = cp_row;
    press(&mut app, "m");
    let preview = app
        .editor
        .preview
        .clone()
        .expect("a preview")
        .expect("a valid edit");
    assert_eq!(
        preview.after_report.metals[0].electron_count.as_int(),
        Some(16)
    );
    assert_eq!(count(&app), Some(18), "nothing changes before Enter");
    press(&mut app, "<enter>");
    assert_eq!(count(&app), Some(16));
    // the slipped ring opened a site: add PMe3 there
    press(&mut app, "/PMe3<esc>a<enter>");
    assert_eq!(count(&app), Some(18));
    // take a CO off, then oxidize by one electron
    let co_row = common::keys::row_of(&app, "CO");
    app.editor.row = co_row;
    press(&mut app, "x<enter>");
    assert_eq!(count(&app), Some(16));
    press(&mut app, "o<enter>");
    assert_eq!(app.editor.complex.charge, 1);
    // Esc turns a pending edit back into the swap preview
    press(&mut app, "r<esc>");
    assert_eq!(app.editor.pending, nonet::tui::Pending::Swap);
}

#[test]
fn a_new_formula_from_a_paper_replaces_the_complex_and_bad_ones_are_explained() {
    let mut app = demo();
    press(&mut app, "eIrCl(CO)(PPh3)2<enter>");
    assert_eq!(app.mode, Mode::Normal);
    assert_eq!(app.editor.report.metals[0].symbol, "Ir");
    press(&mut app, "eFe(XyZ)3<enter>");
    assert_eq!(
        app.mode,
        Mode::Line(nonet::tui::LineKind::Formula),
        "stays open to mend the text"
    );
    let notice = app.notice.clone().expect("an error notice");
    assert!(notice.error && notice.text.contains("XyZ"), "{notice:?}");
    press(&mut app, "<esc>u");
    assert_eq!(app.editor.report.metals[0].symbol, "Rh");
}

#[test]
fn filters_by_family_and_class_from_the_keyboard() {
    let mut app = demo();
    let all = app.catalogue.hits.len();
    press(&mut app, "lf");
    assert!(app.catalogue.family.is_some());
    assert!(app.catalogue.hits.len() < all);
    press(&mut app, "0c");
    assert_eq!(app.catalogue.class, Some("L"));
    assert!(app.catalogue.hits.iter().all(|&i| app.cat.ligands()[i]
        .modes
        .iter()
        .any(|m| m.class.to_string() == "L")));
    press(&mut app, "0");
    assert_eq!(app.catalogue.hits.len(), all);
}

#[test]
fn help_lists_every_key_of_the_table() {
    let mut app = demo();
    press(&mut app, "?");
    assert_eq!(app.mode, Mode::Help);
    let lines = nonet::tui::help_text(&app);
    for b in nonet::tui::BINDINGS {
        assert!(
            lines.iter().any(|l| l.contains(b.label)),
            "help misses '{}'",
            b.label
        );
    }
    press(&mut app, "<esc>");
    assert_eq!(app.mode, Mode::Normal);
}

#[test]
fn no_binding_needs_alt_or_the_multiplexer_prefixes() {
    for b in nonet::tui::BINDINGS {
        for k in b.keys {
            let clash = k.ctrl && matches!(k.code, KeyCode::Char('a') | KeyCode::Char('b'));
            assert!(!clash, "{} uses Ctrl-A/B", b.label);
        }
    }
}

#[test]
fn the_selection_is_marked_without_colour() {
    let app = demo();
    let t = screen(&app, 80, 24, Theme { color: false });
    let buf = t.backend().buffer();
    // the selected complex row carries reversed colours even with NO_COLOR
    let marked = (0..buf.area.height)
        .any(|y| (0..buf.area.width).any(|x| buf[(x, y)].modifier.contains(Modifier::REVERSED)));
    assert!(marked);
    let colored = (0..buf.area.height)
        .any(|y| (0..buf.area.width).any(|x| buf[(x, y)].fg != ratatui::style::Color::Reset));
    assert!(!colored, "NO_COLOR draws no colour");
}

#[test]
fn any_size_draws_without_panicking() {
    let app = demo();
    for w in [1u16, 2, 10, 40, 59, 60, 79, 80, 119, 120, 200] {
        for h in [1u16, 2, 5, 15, 16, 23, 24, 40, 60] {
            let _ = screen(&app, w, h, COLOR);
        }
    }
}

// ---------------------------------------------------------------- snapshots

#[test]
fn snapshot_start_80x24() {
    insta::assert_snapshot!("start_80x24", text(&screen(&demo(), 80, 24, COLOR)));
}

#[test]
fn snapshot_start_120x40() {
    insta::assert_snapshot!("start_120x40", text(&screen(&demo(), 120, 40, COLOR)));
}

#[test]
fn snapshot_search_with_hits() {
    let mut app = demo();
    press(&mut app, "/phos");
    insta::assert_snapshot!("search_hits_80x24", text(&screen(&app, 80, 24, COLOR)));
    insta::assert_snapshot!("search_hits_120x40", text(&screen(&app, 120, 40, COLOR)));
}

#[test]
fn snapshot_swap_that_changes_saturation() {
    // Vaska's complex: PPh3 for Cl takes Ir(I) 16 e to a cation ... choose a swap that
    // changes the count: the 16-e square-planar complex gains 2 e when Cl (X) goes for an
    // η3-allyl (LX)
    let mut app = app_for("IrCl(CO)(PPh3)2", false);
    let cl = common::keys::row_of(&app, "Cl");
    app.editor.row = cl;
    press(&mut app, "/allyl");
    insta::assert_snapshot!("swap_saturation_80x24", text(&screen(&app, 80, 24, COLOR)));
    insta::assert_snapshot!(
        "swap_saturation_120x40",
        text(&screen(&app, 120, 40, COLOR))
    );
}

#[test]
fn snapshot_help_overlay() {
    let mut app = demo();
    press(&mut app, "?");
    insta::assert_snapshot!("help_80x24", text(&screen(&app, 80, 24, COLOR)));
    insta::assert_snapshot!("help_120x40", text(&screen(&app, 120, 40, COLOR)));
}

#[test]
fn snapshot_too_small() {
    insta::assert_snapshot!("too_small_50x12", text(&screen(&demo(), 50, 12, COLOR)));
}

#[test]
fn snapshot_ascii_mode() {
    let app = app_for(nonet::tui::DEMO_FORMULA, true);
    let s = text(&screen(&app, 80, 24, COLOR));
    assert!(s.is_ascii(), "ASCII mode draws only ASCII:\n{s}");
    insta::assert_snapshot!("ascii_80x24", s);
    let s = text(&screen(&app, 120, 40, COLOR));
    assert!(s.is_ascii());
    insta::assert_snapshot!("ascii_120x40", s);
}

#[test]
fn snapshot_cycle_view() {
    // Wilkinson hydrogenation planned from the keys, closed, then the cycle view (`y`)
    let mut app = common::keys::planner_in_memory("RhCl(PPh3)3");
    common::keys::press(
        &mut app,
        "-<enter>OH2<enter><enter>+C2H4<enter><enter><enter><enter>",
    );
    press(&mut app, "y");
    assert_eq!(app.mode, Mode::Cycle);
    let small = text(&screen(&app, 80, 24, COLOR));
    // the words that mark the dips, not colour alone
    assert!(small.contains("14 e"), "{small}");
    insta::assert_snapshot!("cycle_80x24", small);
    insta::assert_snapshot!("cycle_120x40", text(&screen(&app, 120, 40, COLOR)));
}

// ---------------------------------------------------------------- positions

#[test]
fn the_working_pane_draws_where_each_ligand_sits_at_80x24() {
    // trans-[PdMe(Ph)(PPh3)2]: the phosphines trans, Me trans to Ph (common practice)
    let mut app = app_for("trans-PdMePh(PPh3)2", false);
    let s = text(&screen(&app, 80, 24, COLOR));
    assert!(s.contains("SP-4-1 trans"), "{s}");
    assert!(s.contains("PPh3—Pd—PPh3") && s.contains("Ph—Pd—Me"), "{s}");
    // the same in ASCII, and every row of the pane fits the small window
    let ascii = app_for("trans-PdMePh(PPh3)2", true);
    let a = text(&screen(&ascii, 80, 24, COLOR));
    assert!(a.is_ascii() && a.contains("PPh3-Pd-PPh3"), "{a}");
    // an octahedron with three different axes, and room to draw them row by row
    let oc = app_for("OC-6-34-RuClH(CO)(PMe2Ph)3", false);
    let big = text(&screen(&oc, 120, 40, COLOR));
    assert!(
        big.contains("Cl — Ru — CO") && big.contains("PMe2Ph — Ru — PMe2Ph"),
        "{big}"
    );
    // reductive elimination of two trans groups is refused with the way out named; the
    // isomerization key previews it, Enter commits, and then the elimination goes
    press(&mut app, "jR");
    let s = text(&screen(&app, 80, 24, COLOR));
    assert!(
        s.contains("cis") && s.contains("isomerization SP-4-3"),
        "{s}"
    );
    press(&mut app, "I");
    let s = text(&screen(&app, 80, 24, COLOR));
    assert!(s.contains("SP-4-3 cis: PPh3—Pd—Ph · PPh3—Pd—Me"), "{s}");
    press(&mut app, "<enter>");
    assert!(app.editor.complex.formula(false).starts_with("cis-["));
    press(&mut app, "R<enter>");
    assert_eq!(app.editor.complex.formula(false), "[Pd(PPh3)2]");
}

#[test]
fn a_swap_keeps_the_other_ligands_in_place() {
    // trans-[PtCl2(PEt3)2] with one Cl swapped for Me: the phosphines stay trans, so the
    // product is trans-[PtClMe(PEt3)2] (common practice)
    let mut app = app_for("trans-PtCl2(PEt3)2", false);
    let row = common::keys::row_of(&app, "Cl");
    press(&mut app, &"j".repeat(row));
    press(&mut app, "/Me<enter><enter>");
    let f = app.editor.complex.formula(false);
    assert!(f.contains("Me") && f.starts_with("trans-["), "{f}");
    let s = text(&screen(&app, 80, 24, COLOR));
    assert!(s.contains("PEt3—Pt—PEt3"), "{s}");
}

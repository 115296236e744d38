//! Whole catalytic cycles planned from the keyboard, replayed key by key from the start
//! complex: each ends closed in the session with the net reaction the textbooks give, within
//! the keystrokes a chemist should need (Wilkinson hydrogenation at most 22, Heck at most 32,
//! Suzuki at most 24).

mod common;

use common::keys::{planner_in_memory, press};
use nonet::tui::App;

/// The session's closed cycle at the working variant, and its net reaction.
fn closed_net(app: &App) -> String {
    let s = app.log.session.as_ref().expect("session");
    let v = app.log.variant.expect("variant");
    let from = s
        .closes(v)
        .unwrap_or_else(|| panic!("no cycle closed at {}", app.editor.complex.formula(false)));
    let net = s.net(from, v);
    assert!(net.by_steps(), "{}", net.text());
    assert!(net.net.check_balance().is_ok(), "{}", net.text());
    net.text()
}

#[test]
fn wilkinson_hydrogenation_of_ethylene() {
    // Osborn, Jardine, Young & Wilkinson, J. Chem. Soc. A 1966, 1711; the cycle as Crabtree
    // 2014, ch. 9 draws it: PPh3 off, H2 adds, the alkene binds and inserts, ethane leaves
    let mut app = planner_in_memory("RhCl(PPh3)3");
    let mut keys = 0;
    keys += press(&mut app, "-<enter>"); // PPh3 leaves (the first row)
    keys += press(&mut app, "OH2<enter><enter>");
    keys += press(&mut app, "+C2H4<enter><enter>");
    keys += press(&mut app, "<enter>"); // insertion into Rh-H, suggested
    keys += press(&mut app, "<enter>"); // ethane leaves, suggested
    assert!(keys <= 22, "{keys} keys");
    assert_eq!(closed_net(&app), "H2 + C2H4 -> C2H6");
    // the commit that closes the cycle says so, with its net, in the notice line
    let notice = app.notice.clone().map(|n| n.text).unwrap_or_default();
    assert!(
        notice.contains("closes the cycle from #1: H2 + C2H4 -> C2H6"),
        "{notice}"
    );
}

#[test]
fn heck_coupling_with_a_base() {
    // Heck: ArX + CH2=CH2 + base -> ArCH=CH2 + base-H+ X- (Hartwig 2010, ch. 19)
    let mut app = planner_in_memory("Pd(PPh3)2");
    let mut keys = 0;
    keys += press(&mut app, "OPhBr<enter><enter>");
    keys += press(&mut app, "k-<enter>"); // up to PPh3; it leaves
    keys += press(&mut app, "+C2H4<enter><enter>");
    keys += press(&mut app, "<enter><enter><enter><enter>"); // insert, β-H, styrene off, PPh3 on
    keys += press(&mut app, "jj"); // down to the hydride
    keys += press(&mut app, "Pet3<enter><enter>"); // Et3N takes it as a proton
    keys += press(&mut app, "<enter>"); // bromide leaves, suggested
    assert!(keys <= 32, "{keys} keys");
    assert_eq!(
        closed_net(&app),
        "PhBr + C2H4 + Et3N -> styrene + [NHEt3]Br"
    );
}

#[test]
fn suzuki_coupling() {
    // Suzuki: ArBr + Ar'B(OH)2 -> Ar-Ar' + BrB(OH)2 (Hartwig 2010, ch. 19)
    let mut app = planner_in_memory("Pd(PPh3)2");
    let mut keys = 0;
    keys += press(&mut app, "OPhBr<enter><enter>");
    keys += press(&mut app, "Tphb<enter><enter>"); // the search box finds PhB(OH)2
    keys += press(&mut app, "<enter>"); // reductive elimination, suggested
    assert!(keys <= 24, "{keys} keys");
    assert_eq!(closed_net(&app), "PhBr + PhB(OH)2 -> BrB(OH)2 + Ph-Ph");
}

#[test]
fn partners_and_alkenes_cycle_with_n() {
    // two groups on the metal: the alkene inserts into the hydride first, then into the methyl
    let mut app = planner_in_memory("Pd(PPh3)(C2H4)(H)Me");
    let row = common::keys::row_of(&app, "C2H4");
    app.editor.row = row;
    press(&mut app, "i");
    let shown = |app: &App| match &app.editor.pending {
        nonet::tui::Pending::Step(s) => s.to_string(),
        other => format!("{other:?}"),
    };
    assert_eq!(shown(&app), "migratory-insertion C2H4 H");
    press(&mut app, "n");
    assert_eq!(shown(&app), "migratory-insertion C2H4 Me");
    press(&mut app, "n");
    assert_eq!(shown(&app), "migratory-insertion C2H4 H");
    // β-elimination from sec-butyl offers both butenes
    let mut app2 = planner_in_memory("Pd(PPh3)Cl(CH(CH3)CH2CH3)");
    app2.editor.row = common::keys::row_of(&app2, "CH(CH3)CH2CH3");
    press(&mut app2, "d");
    let first = shown(&app2);
    press(&mut app2, "n");
    assert_ne!(shown(&app2), first);
}

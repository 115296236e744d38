//! What the pending edit would do, before it is committed: electrons under both models,
//! oxidation state and d count, saturation and open sites, cone angles and crowding, donor
//! strength, spin, hazards of an entering ligand and the likely substitution mechanism.

use ratatui::layout::Rect;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Paragraph, Wrap};
use ratatui::Frame;

use super::app::{App, Pending};
use super::theme::Theme;
use super::ui::{block, plain, plain_lines};
use crate::chem::count::{MetalReport, Saturation};
use crate::chem::preview::Preview;
use crate::chem::spin::spin_only_moment;
use crate::chem::sterics::{CROWDED, OVERFULL};

pub fn title(app: &App) -> &'static str {
    match &app.editor.pending {
        Pending::Step(_) => "If this step happens",
        Pending::Swap => "If you swap",
        Pending::Add => "If you add",
        Pending::Remove => "If you remove",
        Pending::Mode(_) => "If the mode changes",
        Pending::Charge(d) if *d > 0 => "If oxidized by 1 e",
        Pending::Charge(_) => "If reduced by 1 e",
    }
}

pub fn render(f: &mut Frame, app: &App, area: Rect, t: &Theme) {
    if let crate::tui::Mode::Line(super::app::LineKind::Ask(what)) = app.mode {
        render_matches(f, app, area, t, what);
        return;
    }
    let b = block(app, title(app), false, t);
    let inner = b.inner(area);
    f.render_widget(b, area);
    let lines = match &app.editor.preview {
        None => vec![Line::styled("nothing to preview", t.dim())],
        Some(Err(why)) => {
            let mut l = vec![Line::styled(plain(app, why), t.warn())];
            if why.contains("`isomerization ") {
                l.push(Line::styled(
                    "I previews an isomerization (n shows the next isomer), Enter commits it",
                    t.dim(),
                ));
            }
            if app.editor.pending == Pending::Swap {
                l.push(Line::raw(""));
                l.push(Line::styled(
                    "pick a ligand on the left and one in the catalogue",
                    t.dim(),
                ));
            }
            l
        }
        Some(Ok(p)) => lines(app, p, t),
    };
    let lines = plain_lines(app, lines);
    f.render_widget(Paragraph::new(lines).wrap(Wrap { trim: false }), inner);
}

/// While a step asks for a ligand or reagent: what matches the text typed so far.
fn render_matches(f: &mut Frame, app: &App, area: Rect, t: &Theme, what: super::app::Ask) {
    let b = block(app, "Matches", false, t);
    let inner = b.inner(area);
    f.render_widget(b, area);
    let mut lines = vec![Line::styled(
        "↑/↓ picks one; Enter takes the text as typed when it reads, else the first match",
        t.dim(),
    )];
    if app.prompt.hits.is_empty() {
        lines.push(Line::styled(
            if app.prompt.input.trim().is_empty() {
                "type a name, a formula or SMILES"
            } else {
                "nothing in the catalogue matches; the text is read as it stands"
            },
            t.dim(),
        ));
    }
    for (i, key) in app.prompt.hits.iter().enumerate() {
        let selected = app.prompt.pick == Some(i);
        let detail = if what.is_ligand() {
            app.cat.get(key).map(|l| l.name.clone()).unwrap_or_default()
        } else {
            app.cat
                .substrates()
                .iter()
                .find(|d| d.key == *key)
                .map(|d| d.name.clone())
                .unwrap_or_default()
        };
        lines.push(Line::styled(
            format!("{} {key:<16} {detail}", super::ui::marker(app, selected)),
            if selected { t.selected(true) } else { t.text() },
        ));
    }
    f.render_widget(
        Paragraph::new(plain_lines(app, lines)).wrap(Wrap { trim: true }),
        inner,
    );
}

/// "18" when nothing changes, "18 → 16" when it does.
fn arrow<T: std::fmt::Display>(a: T, b: T) -> String {
    let (a, b) = (a.to_string(), b.to_string());
    if a == b {
        a
    } else {
        format!("{a} → {b}")
    }
}

fn row<'a>(name: &str, value: String, style: ratatui::style::Style, t: &Theme) -> Line<'a> {
    Line::from(vec![
        Span::styled(format!("{name:<11}"), t.heading()),
        Span::styled(value, style),
    ])
}

fn sat_word(m: &MetalReport) -> String {
    match m.saturation {
        Saturation::Saturated => format!("saturated {}", m.target),
        Saturation::Unsaturated => format!("{} e short", m.electrons_short),
        Saturation::Above18 => "above 18".into(),
        Saturation::NotApplicable => "n/a".into(),
    }
}

fn lines<'a>(app: &App, p: &Preview, t: &Theme) -> Vec<Line<'a>> {
    let mut out = Vec::new();
    let what = match &p.change {
        crate::chem::preview::Change::Edit(e) => super::app::propose(e, &app.editor.complex),
        crate::chem::preview::Change::Step(s) => s.to_string(),
    };
    let (Some(a), Some(b)) = (
        p.before_report.metals.first(),
        p.after_report.metals.first(),
    ) else {
        out.push(Line::styled(what, t.title()));
        return out;
    };
    // the count change first: it is what the chemist asked
    let changed = a.electron_count != b.electron_count;
    out.push(Line::from(vec![
        Span::styled(format!("{what}: "), t.title()),
        Span::styled(
            format!(
                "{} e neutral, {} e ionic",
                arrow(a.electron_count, b.electron_count),
                arrow(a.ionic_electron_count, b.ionic_electron_count),
            ),
            if changed { t.warn() } else { t.title() },
        ),
    ]));
    if let Some(eq) = &p.equation_text {
        out.push(row("equation", eq.clone(), t.text(), t));
    }
    for (name, codes) in &p.entering_hazards {
        out.push(row(
            "caution",
            format!(
                "! {name}: {}; consult the safety data sheet and local rules",
                codes.join(" ")
            ),
            t.warn(),
            t,
        ));
    }
    let sat_style = match b.saturation {
        Saturation::Saturated => t.good(),
        Saturation::Above18 => t.bad(),
        _ => t.warn(),
    };
    out.push(row(
        "ox. state",
        format!(
            "{} · {} · {} · open sites {}",
            arrow(a.oxidation_state.signed(), b.oxidation_state.signed()),
            arrow(format!("d{}", a.d_electrons), format!("d{}", b.d_electrons)),
            arrow(sat_word(a), sat_word(b)),
            arrow(a.open_sites, b.open_sites)
        ),
        sat_style,
        t,
    ));
    let unpaired = p.product_unpaired();
    let before = p.before_report.unpaired_electrons.first().copied();
    let (spin_text, spin_style) = match unpaired.first() {
        None => ("not estimated".to_string(), t.dim()),
        Some(0) => (
            format!("{} unpaired: diamagnetic", arrow(before.unwrap_or(0), 0)),
            t.text(),
        ),
        Some(&n) => (
            format!(
                "! paramagnetic product: {} unpaired, {:.2} μB spin-only{}",
                arrow(before.unwrap_or(0), n),
                spin_only_moment(n),
                if p.after_report.spin_ambiguous {
                    " (ambiguous)"
                } else {
                    ""
                }
            ),
            t.warn(),
        ),
    };
    out.push(row("spin", spin_text, spin_style, t));
    // where the ligands end up, and what the step needed or chose about positions
    if p.after.metal_count() == 1 {
        if let Ok(placed) = crate::chem::geometry::place(&p.after, &p.after_report) {
            let s = crate::chem::geometry::sketch(&placed, p.after.sites[0].element.symbol);
            let text = if s.rows.is_empty() || !s.fixed {
                s.head
            } else {
                format!("{}: {}", s.head, s.joined())
            };
            out.push(row("positions", text, t.text(), t));
        }
    }
    for n in &p.step_notes {
        out.push(row("note", n.clone(), t.dim(), t));
    }
    // safety before sterics and mechanism: on a small screen it must not be the line cut off
    if let Some(l) = &p.entering {
        if !l.hazards.is_empty() {
            out.push(row(
                "caution",
                format!(
                    "! {}: {}; consult the safety data sheet and local rules",
                    l.key,
                    l.hazards.join(" ")
                ),
                t.warn(),
                t,
            ));
        }
    }
    // sterics: cone angles in and out, and the crowding of the whole sphere
    let cone = |l: &Option<std::sync::Arc<crate::chem::LigandDef>>| {
        l.as_ref().and_then(|l| {
            l.cone_angle
                .as_ref()
                .map(|c| format!("{} {:.0}°", l.key, c.value))
        })
    };
    let cones = match (cone(&p.leaving), cone(&p.entering)) {
        (Some(o), Some(i)) => format!("{o} out, {i} in; "),
        (None, Some(i)) => format!("{i} in; "),
        (Some(o), None) => format!("{o} out; "),
        (None, None) => String::new(),
    };
    let (cb, ca) = (p.crowd_before.total, p.crowd_after.total);
    let crowd_style = if ca >= OVERFULL {
        t.bad()
    } else if ca >= CROWDED {
        t.warn()
    } else {
        t.text()
    };
    let mut crowd = format!("{cones}sphere {cb:.2} → {ca:.2}: {}", p.crowd_after.level());
    if ca >= CROWDED {
        let from = if ca >= OVERFULL { OVERFULL } else { CROWDED };
        crowd.push_str(&format!(" (≥ {from:.2}, Tolman NiL4)"));
    }
    if !p.crowd_after.unknown.is_empty() {
        crowd.push_str(&format!(
            "; no cone angle for {}",
            p.crowd_after.unknown.join(", ")
        ));
    }
    out.push(row("sterics", crowd, crowd_style, t));
    if let Some(d) = &p.donor {
        let text = match (d.leaving, d.entering, d.delta()) {
            (Some(l), Some(e), Some(delta)) => {
                let word = if delta < -0.5 {
                    "stronger net donor"
                } else if delta > 0.5 {
                    "weaker net donor"
                } else {
                    "about the same donor"
                };
                format!("{word}: TEP {l:.1} → {e:.1} cm⁻¹ ({delta:+.1})")
            }
            (l, _, _) => {
                let missing = if l.is_none() { &p.leaving } else { &p.entering };
                let key = missing.as_ref().map_or("?", |l| l.key.as_str());
                format!("no electronic parameter (TEP) for {key}")
            }
        };
        out.push(row("donor", text, t.text(), t));
    }
    if let Some(m) = p.mechanism {
        out.push(row("mechanism", m.text().to_string(), t.text(), t));
    }
    out
}

//! The working complex: formula, one row per ligand group with mode, class and its electrons
//! under both models, then the totals, oxidation state, d count, saturation and spin.

use ratatui::layout::Rect;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Paragraph};
use ratatui::Frame;

use super::app::{App, Focus, Mode};
use super::ui::{block, marker, plain, plain_lines};
use crate::chem::count::{MetalReport, Saturation};
use crate::chem::edit::Place;
use crate::chem::geometry;

pub fn render(f: &mut Frame, app: &App, area: Rect, theme: &super::theme::Theme) {
    let focused = app.focus == Focus::Complex && app.mode == Mode::Normal;
    let b: Block = block(app, "Working complex", focused, theme);
    let inner = b.inner(area);
    f.render_widget(b, area);
    if inner.height == 0 {
        return;
    }
    let t = theme;
    let sketch = sketch_of(app);
    let slots = app.slots();
    let height = inner.height as usize;
    let base = 2 + slots.len().max(1);
    // the positions as rows when they fit, merging the count lines if that makes room; else
    // fixed positions as one tight line, and a list of possible isomers not at all
    let fits = |summary: &Vec<Line>, rows: usize| base + summary.len() + rows <= height;
    let wide = summary_lines(app, t, sketch.as_ref(), false);
    let tight = summary_lines(app, t, sketch.as_ref(), true);
    let (summary, positions): (Vec<Line>, Vec<String>) = match &sketch {
        Some(s) if fits(&wide, s.rows.len()) => (wide, s.rows.clone()),
        Some(s) if fits(&tight, s.rows.len()) => (tight, s.rows.clone()),
        Some(s) if s.fixed && !s.rows.is_empty() => (tight, vec![s.joined()]),
        _ => (wide, Vec::new()),
    };
    let tail: Vec<Line> = positions
        .iter()
        .map(|r| Line::styled(plain(app, &format!("  {r}")), t.text()))
        .collect();
    let needed = base + summary.len() + tail.len();
    let mut top: Vec<Line> = Vec::new();
    // the current complex first; what the session started from below it, when there is room
    top.push(Line::styled(
        plain(app, &app.editor.complex.formula(app.ascii)),
        t.title(),
    ));
    if height > needed {
        top.push(Line::styled(
            plain(app, &format!("from {}", app.editor.title)),
            t.dim(),
        ));
    }
    top.push(Line::styled(
        format!(
            "  {:<11}{:<7}{:<6}{:>4}{:>6}",
            "ligand", "mode", "class", "neut", "ionic"
        ),
        t.heading(),
    ));
    // rows get what the header, the summary and the positions leave
    let room = height
        .saturating_sub(top.len() + summary.len() + tail.len())
        .max(1);
    let many = app.editor.complex.metal_count() > 1;
    let first = app.editor.row.saturating_sub(room.saturating_sub(1));
    for (i, slot) in slots.iter().enumerate().skip(first).take(room) {
        let Some(group) = app.editor.complex.group(*slot) else {
            continue;
        };
        let (metal, pos) = match slot.place {
            Place::Site(m) => (m, slot.index),
            Place::Shared => (0, own_len(app, 0) + slot.index),
        };
        let contribution = app
            .editor
            .report
            .metals
            .get(metal)
            .and_then(|m| m.contributions.get(pos));
        let mode = &group.mode().label;
        let mut name = group.ligand.key.clone();
        if group.count > 1 {
            name.push_str(&format!(" x{}", group.count));
        }
        if many {
            let tag = match slot.place {
                Place::Site(m) => {
                    format!("{}{} ", app.editor.complex.sites[m].element.symbol, m + 1)
                }
                Place::Shared => "all ".to_string(),
            };
            name = tag + &name;
        }
        let (neutral, ionic) = contribution.map_or((String::new(), String::new()), |c| {
            (c.neutral.to_string(), c.ionic.to_string())
        });
        let marker = marker(app, i == app.editor.row);
        let text = format!(
            "{marker} {:<11}{:<7}{:<6}{:>4}{:>6}",
            truncate(&name, 11),
            plain(app, mode),
            group.mode().class.to_string(),
            neutral,
            ionic
        );
        let style = if i == app.editor.row {
            t.selected(focused)
        } else {
            t.text()
        };
        top.push(Line::styled(text, style));
    }
    if slots.is_empty() {
        top.push(Line::styled("  (no ligands: press a to add one)", t.dim()));
    }
    top.extend(summary);
    top.extend(tail);
    f.render_widget(Paragraph::new(top), inner);
}

/// Where the ligands of the working complex sit, when nonet can lay it out.
fn sketch_of(app: &App) -> Option<geometry::Sketch> {
    let c = &app.editor.complex;
    if c.metal_count() != 1 {
        return None;
    }
    let placed = geometry::place(c, &app.editor.report).ok()?;
    Some(geometry::sketch(&placed, c.sites[0].element.symbol))
}

fn own_len(app: &App, metal: usize) -> usize {
    app.editor
        .complex
        .sites
        .get(metal)
        .map_or(0, |s| s.ligands.len())
}

fn truncate(s: &str, n: usize) -> String {
    if s.chars().count() <= n {
        s.to_string()
    } else {
        let mut t: String = s.chars().take(n.saturating_sub(1)).collect();
        t.push('~');
        t
    }
}

/// Totals, oxidation state, d count, saturation, spin and shape of the first metal (and the
/// cluster); `tight` puts the count and the oxidation state on one line.
fn summary_lines<'a>(
    app: &App,
    t: &super::theme::Theme,
    sketch: Option<&geometry::Sketch>,
    tight: bool,
) -> Vec<Line<'a>> {
    let r = &app.editor.report;
    let mut out = Vec::new();
    let Some(m) = r.metals.first() else {
        return out;
    };
    let each = if r.metals.len() > 1 { " (1)" } else { "" };
    if tight {
        out.push(Line::from(vec![
            Span::styled(format!("{}{each} ", m.symbol), t.title()),
            Span::raw(format!(
                "{} e = {} e ionic · {} · d{} · CN {}",
                m.electron_count,
                m.ionic_electron_count,
                signed(m),
                m.d_electrons,
                m.coordination_number
            )),
        ]));
    } else {
        out.push(Line::from(vec![
            Span::styled(format!("{}{each} ", m.symbol), t.title()),
            Span::raw(format!(
                "{} e neutral = {} e ionic",
                m.electron_count, m.ionic_electron_count
            )),
        ]));
        out.push(Line::raw(format!(
            "ox. state {} · d{} · CN {}",
            signed(m),
            m.d_electrons,
            m.coordination_number
        )));
    }
    let mut sat = saturation_line(m, t);
    sat.spans.push(Span::raw(plain(
        app,
        &format!(" · {}", m.equivalent_neutral_class),
    )));
    out.push(sat);
    if r.metals.len() > 1 {
        let bonds = r
            .metal_metal_bonds
            .map_or("n/a".to_string(), |b| b.to_string());
        out.push(Line::raw(format!(
            "cluster {} e · M-M bonds {}",
            r.cluster_valence_electrons, bonds
        )));
    }
    let spin = match r.unpaired_electrons.first() {
        None => "spin not estimated".to_string(),
        Some(0) => "0 unpaired (diamagnetic)".to_string(),
        Some(n) => format!("! {n} unpaired (paramagnetic)"),
    };
    let amb = if r.spin_ambiguous {
        " or more/less?"
    } else {
        ""
    };
    out.push(Line::styled(
        format!("{spin}{amb}"),
        if r.unpaired_electrons.first().is_some_and(|&n| n > 0) {
            t.warn()
        } else {
            t.text()
        },
    ));
    let shape = match sketch {
        Some(s) => format!("{} · {}", s.head, r.geometry),
        None => r.geometry.to_string(),
    };
    out.push(Line::styled(shape, t.dim()));
    plain_lines(app, out)
}

fn signed(m: &MetalReport) -> String {
    let os = m.oxidation_state;
    if os > crate::chem::Frac::ZERO {
        format!("+{os}")
    } else {
        os.to_string()
    }
}

pub fn saturation_line<'a>(m: &MetalReport, t: &super::theme::Theme) -> Line<'a> {
    let (text, style) = match m.saturation {
        Saturation::Saturated => (format!("saturated ({} e)", m.target), t.good()),
        Saturation::Unsaturated => (
            format!(
                "unsaturated: {} e short of {}, {} open site{}",
                m.electrons_short,
                m.target,
                m.open_sites,
                if m.open_sites == 1 { "" } else { "s" }
            ),
            t.warn(),
        ),
        Saturation::Above18 => ("above 18 e!".to_string(), t.bad()),
        Saturation::NotApplicable => ("18-e rule not applicable".to_string(), t.dim()),
    };
    Line::styled(text, style)
}

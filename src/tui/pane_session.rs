//! The session tree (variants with their parents, bookmarks and counts) and the side-by-side
//! comparison of two variants.

use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::text::Line;
use ratatui::widgets::{Clear, Paragraph, Wrap};
use ratatui::Frame;

use super::app::App;
use super::theme::Theme;
use super::ui::{block, marker, plain, plain_lines};
use crate::chem::{count, parse, Report};

fn popup(area: Rect) -> Rect {
    let w = area.width.saturating_sub(4).max(1);
    let h = area.height.saturating_sub(3).max(1);
    Rect {
        x: area.x + area.width.saturating_sub(w) / 2,
        y: area.y + 1,
        width: w,
        height: h,
    }
}

pub fn render_tree(f: &mut Frame, app: &App, area: Rect, t: &Theme) {
    let area = popup(area);
    f.render_widget(Clear, area);
    let Some(s) = &app.log.session else {
        return;
    };
    let title = format!("Session {} ({} variants)", s.name, s.variants.len());
    let b = block(app, &title, true, t);
    let inner = b.inner(area);
    f.render_widget(b, area);
    let rows = tree_rows(s, app.ascii);
    let room = inner.height as usize;
    let width = inner.width as usize;
    let first = app.log.row.saturating_sub(room.saturating_sub(1));
    let mut lines = Vec::new();
    for (i, (prefix, v)) in rows.iter().enumerate().skip(first).take(room) {
        let selected = i == app.log.row;
        let working = app.log.variant == Some(v.id);
        let c = &v.counts;
        let os = match c.oxidation_state.as_f64() {
            Some(x) if x > 0.0 => format!("+{}", c.oxidation_state),
            _ => c.oxidation_state.to_string(),
        };
        let mut text = format!(
            "{} {:>3} {prefix}{}{} -> {}  {} e · {} · d{}",
            marker(app, selected),
            v.id,
            v.action,
            if v.made == crate::session::Made::Edit {
                " (edit)"
            } else {
                ""
            },
            v.formula,
            c.electron_count,
            os,
            c.d_electrons,
        );
        if let Some(from) = s.closes(v.id) {
            text.push_str(&format!("  ↺ closes the cycle from {from}"));
        }
        if let Some(name) = s.bookmark_of(v.id) {
            text.push_str(&format!("  [{name}]"));
        }
        if working {
            text.push_str("  <- working");
        }
        let text = plain(app, &text);
        // nothing is cut without saying so
        let text = if text.chars().count() > width {
            let mut cut: String = text.chars().take(width.saturating_sub(1)).collect();
            cut.push(if app.ascii { '~' } else { '…' });
            cut
        } else {
            text
        };
        let style = if selected {
            t.selected(true)
        } else if working {
            t.title()
        } else {
            t.text()
        };
        lines.push(Line::styled(text, style));
    }
    f.render_widget(Paragraph::new(lines), inner);
}

/// The tree's rows with their branch lines: a run of single steps stays in one column, and
/// only where a variant has several children do they branch, each sibling with `├─` or `└─`
/// and the lines beside them with `│`.
pub fn tree_rows(
    s: &crate::session::Session,
    ascii: bool,
) -> Vec<(String, &crate::session::Variant)> {
    let (tee, elbow, bar) = if ascii {
        ("|- ", "`- ", "|  ")
    } else {
        ("├─ ", "└─ ", "│  ")
    };
    let mut children: std::collections::HashMap<u64, Vec<u64>> = std::collections::HashMap::new();
    for v in &s.variants {
        if let Some(p) = v.parent.filter(|p| s.get(*p).is_some()) {
            children.entry(p).or_default().push(v.id);
        }
    }
    let mut out = Vec::new();
    // (variant, the indent of its column)
    let mut stack: Vec<(u64, String, &'static str)> = s
        .variants
        .iter()
        .filter(|v| v.parent.is_none_or(|p| s.get(p).is_none()))
        .rev()
        .map(|v| (v.id, String::new(), ""))
        .collect();
    let mut seen = std::collections::HashSet::new();
    while let Some((id, indent, connector)) = stack.pop() {
        if !seen.insert(id) {
            continue;
        }
        let Some(v) = s.get(id) else { continue };
        out.push((format!("{indent}{connector}"), v));
        let kids = children.get(&id).map_or(&[][..], Vec::as_slice);
        if kids.len() == 1 {
            // a single step: same column
            let keep = if connector.is_empty() {
                indent.clone()
            } else if connector == elbow {
                format!("{indent}   ")
            } else {
                format!("{indent}{bar}")
            };
            stack.push((kids[0], keep, ""));
        } else {
            let base = if connector.is_empty() {
                indent.clone()
            } else if connector == elbow {
                format!("{indent}   ")
            } else {
                format!("{indent}{bar}")
            };
            for (k, &kid) in kids.iter().enumerate().rev() {
                let last = k + 1 == kids.len();
                stack.push((kid, base.clone(), if last { elbow } else { tee }));
            }
        }
    }
    out
}

fn summary<'a>(label: String, formula: &str, r: Option<&Report>, t: &Theme) -> Vec<Line<'a>> {
    let mut out = vec![
        Line::styled(label, t.heading()),
        Line::styled(formula.to_string(), t.title()),
    ];
    let Some(r) = r else {
        out.push(Line::styled(
            "(cannot be read with this catalogue)",
            t.warn(),
        ));
        return out;
    };
    if let Some(m) = r.metals.first() {
        out.push(Line::raw(format!(
            "{} e neutral = {} e ionic",
            m.electron_count, m.ionic_electron_count
        )));
        let os = m.oxidation_state;
        let os = if os > crate::chem::Frac::ZERO {
            format!("+{os}")
        } else {
            os.to_string()
        };
        out.push(Line::raw(format!(
            "ox. state {os} · d{} · CN {}",
            m.d_electrons, m.coordination_number
        )));
        out.push(Line::raw(format!(
            "{} · {}",
            m.saturation.word(),
            m.equivalent_neutral_class
        )));
        for c in &m.contributions {
            out.push(Line::raw(format!(
                "  {} x{} {} {}: {} / {} e",
                c.ligand.key,
                c.count,
                c.mode().label,
                c.mode().class_text(),
                c.neutral,
                c.ionic
            )));
        }
    }
    out.push(Line::raw(match r.unpaired_electrons.first() {
        Some(0) => "diamagnetic".to_string(),
        Some(n) => format!("{n} unpaired"),
        None => "spin not estimated".to_string(),
    }));
    out
}

pub fn render_compare(f: &mut Frame, app: &App, area: Rect, t: &Theme) {
    let area = popup(area);
    f.render_widget(Clear, area);
    let (Some(s), Some(id)) = (&app.log.session, app.log.compare) else {
        return;
    };
    let b = block(app, "Two variants side by side (Esc: back)", true, t);
    let inner = b.inner(area);
    f.render_widget(b, area);
    let [left, right] =
        Layout::horizontal([Constraint::Percentage(50), Constraint::Percentage(50)]).areas(inner);
    let other = s.get(id);
    let other_report = other
        .and_then(|v| parse(&v.formula, app.cat.as_ref()).ok())
        .map(|c| count(&c));
    let label = other.map_or(format!("variant {id}"), |v| {
        format!("variant {id}: {}", v.action)
    });
    let formula = other.map_or(String::new(), |v| v.formula.clone());
    let left_lines = summary(label, &formula, other_report.as_ref(), t);
    let here = app.log.variant.map_or("working complex".to_string(), |v| {
        format!("working complex (variant {v})")
    });
    let right_lines = summary(
        here,
        &app.editor.complex.formula(app.ascii),
        Some(&app.editor.report),
        t,
    );
    f.render_widget(
        Paragraph::new(plain_lines(app, left_lines)).wrap(Wrap { trim: false }),
        left,
    );
    f.render_widget(
        Paragraph::new(plain_lines(app, right_lines)).wrap(Wrap { trim: false }),
        right,
    );
}

/// The ranked swaps for the selected ligand, with the constraints in force.
pub fn render_screen(f: &mut Frame, app: &App, area: Rect, t: &Theme) {
    let area = popup(area);
    f.render_widget(Clear, area);
    let leaving = app
        .selected_slot()
        .and_then(|s| app.editor.complex.group(s))
        .map_or("?".to_string(), |b| b.ligand.key.clone());
    let title = format!("Swaps for {leaving}, best first");
    let b = block(app, &title, true, t);
    let inner = b.inner(area);
    f.render_widget(b, area);
    let v = &app.screen;
    let k = &v.constraints;
    let only = |x: bool| if x { "only" } else { "any" };
    let rank = match v.rank {
        crate::chem::screen::Rank::Electrons => "electron count",
        crate::chem::screen::Rank::Crowding => "least crowding",
        crate::chem::screen::Rank::Donor => "strongest donor",
        crate::chem::screen::Rank::Cone => "smallest cone",
    };
    let mut lines = vec![
        Line::styled(
            format!(
                "electrons {} · saturated {} · crowding {} · ranked by {rank}",
                v.electrons.map_or("any".to_string(), |e| e.to_string()),
                only(k.saturated),
                k.max_crowding
                    .map_or("any".to_string(), |c| format!("<= {c:.2}")),
            ),
            t.dim(),
        ),
        Line::styled(
            format!(
                "diamagnetic {} · {}",
                only(k.diamagnetic),
                if k.no_hazardous {
                    "ligands with GHS hazards left out; no record is not safe"
                } else {
                    "hazardous ligands kept"
                },
            ),
            t.dim(),
        ),
        Line::styled(
            format!(
                "  {:<4}{:<14}{:>5}{:>5}{:>5}  {:<12}{:>7}{:>6}{:>7}{:>4}",
                "#", "ligand", "e", "OS", "d", "saturation", "crowd", "cone", "TEP", "unp"
            ),
            t.heading(),
        ),
    ];
    if let Some(p) = &v.problem {
        lines.push(Line::styled(p.clone(), t.warn()));
    } else if v.found.is_empty() {
        lines.push(Line::styled("no ligand meets these constraints", t.warn()));
    }
    let room = (inner.height as usize).saturating_sub(lines.len());
    let first = v.row.saturating_sub(room.saturating_sub(1));
    for (i, c) in v.found.iter().enumerate().skip(first).take(room) {
        let l = &c.ligands[0];
        let m = c.report.metals.first();
        let text = format!(
            "{} {:<4}{:<14}{:>5}{:>5}{:>5}  {:<12}{:>7}{:>6}{:>7}{:>4}",
            marker(app, i == v.row),
            i + 1,
            l.key,
            c.electrons.to_string(),
            c.oxidation_state.signed(),
            c.d_electrons.to_string(),
            m.map_or("?", |m| m.saturation.code()),
            // '?': the entering ligand has no cone angle, so its bulk is not in the sum
            format!(
                "{:.2}{}",
                c.crowding,
                if l.cone_angle.is_none() { "?" } else { "" }
            ),
            l.cone_angle
                .as_ref()
                .map_or("-".to_string(), |x| format!("{:.0}", x.value)),
            l.tep
                .as_ref()
                .map_or("-".to_string(), |x| format!("{:.0}", x.value)),
            c.report
                .unpaired_electrons
                .first()
                .map_or("?".to_string(), |u| u.to_string()),
        );
        let style = if i == v.row {
            t.selected(true)
        } else {
            t.text()
        };
        lines.push(Line::styled(plain(app, &text), style));
    }
    f.render_widget(Paragraph::new(plain_lines(app, lines)), inner);
}

/// The current path as a cycle: each intermediate with its counts, each step with what
/// entered and left, the lowest count and odd counts named, the net reaction at the end.
pub fn render_cycle(f: &mut Frame, app: &App, area: Rect, t: &Theme) {
    let area = popup(area);
    f.render_widget(Clear, area);
    let (Some(s), Some(end)) = (&app.log.session, app.log.variant) else {
        let b = block(app, "Cycle (? or Esc closes)", true, t);
        f.render_widget(
            Paragraph::new("this planner keeps no session, so it has no path to draw").block(b),
            area,
        );
        return;
    };
    let ids = crate::session::figure::cycle_ids(s, end);
    let closes = s.closes(end);
    let title = match closes {
        Some(from) => format!("Cycle #{from} -> #{end}, closed (j/k scroll, Esc closes)"),
        None => format!("Path to #{end}, open (j/k scroll, Esc closes)"),
    };
    let b = block(app, &title, true, t);
    let inner = b.inner(area);
    f.render_widget(b, area);
    let variants: Vec<&crate::session::Variant> = ids.iter().filter_map(|&i| s.get(i)).collect();
    let lowest = variants
        .iter()
        .filter_map(|v| v.counts.electron_count.as_f64())
        .fold(f64::INFINITY, f64::min);
    let width = inner.width as usize;
    let fit = |text: String| -> String {
        if text.chars().count() > width {
            let mut t: String = text.chars().take(width.saturating_sub(1)).collect();
            t.push('…');
            t
        } else {
            text
        }
    };
    let mut lines: Vec<Line> = Vec::new();
    for (k, v) in variants.iter().enumerate() {
        if k > 0 {
            let mut arrow = format!("   ↓ {}", v.action);
            if v.made == crate::session::Made::Edit {
                arrow.push_str(" (a free edit, not a step)");
            }
            for r in &v.enters {
                arrow.push_str(&format!("  + {}", r.name));
            }
            for r in &v.leaves {
                arrow.push_str(&format!("  − {}", r.name));
            }
            lines.push(Line::styled(fit(plain(app, &arrow)), t.dim()));
        }
        let c = &v.counts;
        let e = c.electron_count.as_f64();
        let mut marks = Vec::new();
        if e == Some(lowest) && variants.len() > 1 {
            marks.push("lowest count");
        }
        if e.is_some_and(|e| e.fract() == 0.0 && (e as i64) % 2 != 0) {
            marks.push("odd electron");
        }
        let os = match c.oxidation_state.as_f64() {
            Some(x) if x > 0.0 => format!("+{}", c.oxidation_state),
            _ => c.oxidation_state.to_string(),
        };
        let text = format!(
            "#{:<3} {}  {} e · OS {} · d{}{}",
            v.id,
            v.formula,
            c.electron_count,
            os,
            c.d_electrons,
            if marks.is_empty() {
                String::new()
            } else {
                format!("  [{}]", marks.join(", "))
            }
        );
        let style = if marks.is_empty() { t.text() } else { t.warn() };
        lines.push(Line::styled(fit(plain(app, &text)), style));
    }
    lines.push(Line::raw(""));
    if let (Some(first), Some(last)) = (ids.first(), ids.last()) {
        let net = s.net(*first, *last);
        let head = if closes.is_some() {
            "net"
        } else {
            "net so far"
        };
        lines.push(Line::styled(
            plain(app, &format!("{head}: {}", net.text())),
            t.title(),
        ));
    }
    let scroll = app
        .log
        .cycle_scroll
        .min((lines.len() as u16).saturating_sub(1));
    f.render_widget(
        Paragraph::new(plain_lines(app, lines))
            .wrap(Wrap { trim: false })
            .scroll((scroll, 0)),
        inner,
    );
}

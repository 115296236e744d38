//! The ligand catalogue: the search line, the filters, and the hits with their class, cone
//! angle and electronic parameter; matched letters are highlighted.

use ratatui::layout::Rect;
use ratatui::text::{Line, Span};
use ratatui::widgets::Paragraph;
use ratatui::Frame;

use super::app::{App, Focus, Mode};
use super::theme::Theme;
use super::ui::{block, marker, plain};

pub fn render(f: &mut Frame, app: &App, area: Rect, t: &Theme) {
    let focused =
        app.mode == Mode::Search || (app.focus == Focus::Catalogue && app.mode == Mode::Normal);
    let b = block(app, "Ligand catalogue", focused, t);
    let inner = b.inner(area);
    f.render_widget(b, area);
    if inner.height == 0 {
        return;
    }
    let mut lines: Vec<Line> = Vec::new();
    let searching = app.mode == Mode::Search;
    let query_line = if searching {
        Line::from(vec![
            Span::styled("/ ", t.key()),
            Span::raw(app.catalogue.query.clone()),
            Span::styled("_", t.key()),
        ])
    } else if app.catalogue.query.is_empty() {
        Line::styled("/ to search names, formulas, aliases", t.dim())
    } else {
        Line::from(vec![
            Span::styled("/ ", t.key()),
            Span::raw(app.catalogue.query.clone()),
        ])
    };
    lines.push(query_line);
    lines.push(Line::styled(
        plain(
            app,
            &format!(
                "family {} · class {} · {} of {}",
                app.catalogue.family.unwrap_or("all"),
                app.catalogue.class.unwrap_or("all"),
                app.catalogue.hits.len(),
                app.cat.len()
            ),
        ),
        t.dim(),
    ));
    let room = (inner.height as usize).saturating_sub(lines.len());
    let first = app.catalogue.hit.saturating_sub(room.saturating_sub(1));
    let width = inner.width as usize;
    for (i, &idx) in app.catalogue.hits.iter().enumerate().skip(first).take(room) {
        let l = &app.cat.ligands()[idx];
        let selected = i == app.catalogue.hit;
        let base = if selected {
            t.selected(focused)
        } else {
            t.text()
        };
        let mode = &l.modes[0];
        let cone = l.cone_angle.as_ref().map_or(String::new(), |c| {
            format!("{:.0}{}", c.value, if app.ascii { "d" } else { "°" })
        });
        let tep = l
            .tep
            .as_ref()
            .map_or(String::new(), |c| format!("{:.0}", c.value));
        let marker = marker(app, selected);
        let mut spans = vec![Span::styled(format!("{marker} "), base)];
        // the key with its matched letters marked
        let key = plain(app, &l.key);
        let hits = if app.catalogue.query.is_empty() {
            Vec::new()
        } else {
            app.cat.match_positions(&key, &app.catalogue.query)
        };
        let mut key_len = 0;
        for (ci, ch) in key.chars().enumerate() {
            key_len += 1;
            let style = if hits.contains(&ci) {
                base.patch(t.matched())
            } else {
                base
            };
            spans.push(Span::styled(ch.to_string(), style));
        }
        let pad = 10usize.saturating_sub(key_len);
        let numbers = format!(
            "{} {:<5}{:>5} {:>5}",
            " ".repeat(pad),
            mode.class_text(),
            cone,
            tep
        );
        let used = 2 + key_len.max(10) + numbers.chars().count() - pad;
        let room = width.saturating_sub(used + 2);
        // the numbers always show; the name only where a useful part of it fits
        let name = plain(app, &l.name);
        let name: String = if room >= 8 {
            name.chars().take(room).collect()
        } else {
            String::new()
        };
        let rest = format!("{numbers}  {name}");
        spans.push(Span::styled(rest, base));
        lines.push(Line::from(spans));
    }
    if app.catalogue.hits.is_empty() {
        lines.push(Line::styled(
            "  nothing matches: Bksp or 0 clears",
            t.warn(),
        ));
    }
    f.render_widget(Paragraph::new(lines), inner);
}

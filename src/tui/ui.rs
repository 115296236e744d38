//! Laying out the screen: three panes (side by side when wide, preview below when narrow), the
//! notice and footer lines, the help overlay and the too-small notice. Drawing only reads `App`.

use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::symbols::border;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Borders, Clear, Paragraph, Wrap};
use ratatui::Frame;

use super::app::{App, Mode};
use super::keymap::{self, Context, BINDINGS};
use super::theme::Theme;
use super::{pane_catalogue, pane_complex, pane_preview};

/// Below this the panes cannot show what they must.
pub const MIN_WIDTH: u16 = 60;
pub const MIN_HEIGHT: u16 = 16;
/// From this width the three panes stand side by side.
const WIDE: u16 = 120;

const ASCII_BORDER: border::Set = border::Set {
    top_left: "+",
    top_right: "+",
    bottom_left: "+",
    bottom_right: "+",
    vertical_left: "|",
    vertical_right: "|",
    horizontal_top: "-",
    horizontal_bottom: "-",
};

/// Text as the terminal can show it: unchanged, or in plain ASCII.
pub fn plain(app: &App, s: &str) -> String {
    if app.ascii {
        crate::plain::ascii_text(s)
    } else {
        s.to_string()
    }
}

/// The mark before the selected row of a list.
pub fn marker(app: &App, selected: bool) -> &'static str {
    match (selected, app.ascii) {
        (false, _) => " ",
        (true, true) => ">",
        (true, false) => "▸",
    }
}

/// Lines made plain ASCII span by span (keeping their styles) when the terminal needs it.
pub fn plain_lines<'a>(app: &App, lines: Vec<Line<'a>>) -> Vec<Line<'a>> {
    if !app.ascii {
        return lines;
    }
    lines
        .into_iter()
        .map(|l| {
            Line::from(
                l.spans
                    .into_iter()
                    .map(|s| Span::styled(plain(app, &s.content), s.style))
                    .collect::<Vec<_>>(),
            )
            .style(l.style)
        })
        .collect()
}

/// A pane's frame; the focused one is bold and says so in its title.
pub fn block<'a>(app: &App, title: &'a str, focused: bool, t: &Theme) -> Block<'a> {
    let mark = if focused { " *" } else { "" };
    Block::default()
        .borders(Borders::ALL)
        .border_set(if app.ascii {
            ASCII_BORDER
        } else {
            border::PLAIN
        })
        .border_style(t.border(focused))
        .title(Span::styled(format!(" {title}{mark} "), t.title()))
}

pub fn render(f: &mut Frame, app: &App, t: &Theme) {
    let area = f.area();
    if area.width < MIN_WIDTH || area.height < MIN_HEIGHT {
        too_small(f, app, area, t);
        return;
    }
    let [main, notice, footer] = Layout::vertical([
        Constraint::Min(1),
        Constraint::Length(1),
        Constraint::Length(1),
    ])
    .areas(area);
    if area.width >= WIDE {
        let [left, mid, right] = Layout::horizontal([
            Constraint::Percentage(34),
            Constraint::Percentage(28),
            Constraint::Percentage(38),
        ])
        .areas(main);
        pane_complex::render(f, app, left, t);
        pane_catalogue::render(f, app, mid, t);
        pane_preview::render(f, app, right, t);
    } else {
        let preview_height = (main.height * 45 / 100).max(10);
        let [top, bottom] =
            Layout::vertical([Constraint::Min(1), Constraint::Length(preview_height)]).areas(main);
        let [left, right] =
            Layout::horizontal([Constraint::Percentage(52), Constraint::Percentage(48)]).areas(top);
        pane_complex::render(f, app, left, t);
        pane_catalogue::render(f, app, right, t);
        pane_preview::render(f, app, bottom, t);
    }
    render_notice(f, app, notice, t);
    render_footer(f, app, footer, t);
    match app.mode {
        Mode::Help => help(f, app, area, t),
        Mode::Tree => super::pane_session::render_tree(f, app, area, t),
        Mode::Compare => super::pane_session::render_compare(f, app, area, t),
        Mode::Screen => super::pane_session::render_screen(f, app, area, t),
        Mode::Cycle => super::pane_session::render_cycle(f, app, area, t),
        Mode::Line(super::app::LineKind::Bookmark) => {
            super::pane_session::render_tree(f, app, area, t)
        }
        _ => {}
    }
}

fn render_notice(f: &mut Frame, app: &App, area: Rect, t: &Theme) {
    let line = if let Mode::Line(kind) = app.mode {
        Line::from(vec![
            Span::styled(format!("{}: ", kind.prompt()), t.key()),
            Span::raw(plain(app, &app.prompt.input)),
            Span::styled("_", t.key()),
            Span::styled(
                app.notice
                    .as_ref()
                    .filter(|n| n.error)
                    .map(|n| format!("   ! {}", plain(app, &n.text)))
                    .unwrap_or_default(),
                t.bad(),
            ),
        ])
    } else {
        // a notice wider than the window ends in an ellipsis, never cut off silently
        let fit = |text: String| -> String {
            let width = area.width as usize;
            if text.chars().count() > width && width > 1 {
                let mut t: String = text.chars().take(width - 1).collect();
                t.push(if app.ascii { '~' } else { '…' });
                t
            } else {
                text
            }
        };
        match &app.notice {
            Some(n) if n.error => Line::styled(fit(format!("! {}", plain(app, &n.text))), t.bad()),
            Some(n) => Line::styled(fit(plain(app, &n.text)), t.good()),
            None => Line::raw(""),
        }
    };
    f.render_widget(Paragraph::new(line), area);
}

fn render_footer(f: &mut Frame, app: &App, area: Rect, t: &Theme) {
    let mut spans = Vec::new();
    for b in keymap::footer(app.context()) {
        spans.push(Span::styled(plain(app, b.shown), t.key()));
        spans.push(Span::raw(format!(" {}  ", b.short)));
    }
    f.render_widget(Paragraph::new(Line::from(spans)), area);
}

/// Every key, grouped by where it applies, from the same table that dispatches them.
pub fn help_lines(app: &App, t: &Theme) -> Vec<Line<'static>> {
    let mut lines = Vec::new();
    for ctx in [
        Context::Global,
        Context::Complex,
        Context::Catalogue,
        Context::Search,
        Context::Formula,
        Context::Tree,
        Context::Compare,
        Context::Screen,
        Context::Help,
    ] {
        lines.push(Line::styled(ctx.title().to_string(), t.heading()));
        for b in BINDINGS.iter().filter(|b| b.context == ctx) {
            lines.push(Line::from(vec![
                Span::styled(format!("  {:<9}", plain(app, b.shown)), t.key()),
                Span::raw(b.label.to_string()),
            ]));
        }
    }
    lines.push(Line::raw(""));
    lines.push(Line::styled(
        "Mouse capture stays off so the terminal can select and copy text.".to_string(),
        t.dim(),
    ));
    lines
}

fn help(f: &mut Frame, app: &App, area: Rect, t: &Theme) {
    let w = area.width.saturating_sub(4).min(64);
    let h = area.height.saturating_sub(2);
    let popup = Rect {
        x: area.x + (area.width.saturating_sub(w)) / 2,
        y: area.y + 1,
        width: w,
        height: h,
    };
    f.render_widget(Clear, popup);
    let b = block(app, "Keys (? or Esc closes)", true, t);
    let lines = help_lines(app, t);
    let max_scroll = (lines.len() as u16).saturating_sub(h.saturating_sub(2));
    f.render_widget(
        Paragraph::new(lines)
            .block(b)
            .scroll((app.help_scroll.min(max_scroll), 0)),
        popup,
    );
}

fn too_small(f: &mut Frame, app: &App, area: Rect, t: &Theme) {
    let text = format!(
        "Terminal too small: nonet needs {MIN_WIDTH}x{MIN_HEIGHT}, this is {}x{}. Enlarge the \
         window, or press q to quit.",
        area.width, area.height
    );
    f.render_widget(
        Paragraph::new(plain(app, &text))
            .style(t.warn())
            .wrap(Wrap { trim: true }),
        area,
    );
}

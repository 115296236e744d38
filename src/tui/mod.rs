//! The planning TUI: the working complex, the ligand catalogue and a preview of each edit.
//!
//! ratatui owns the terminal (raw mode, alternate screen, panic hook); on top of that nonet
//! restores the terminal on SIGTERM, SIGHUP and SIGINT and leaves when the terminal goes away.

mod action;
mod app;
pub mod effect;
mod keymap;
mod pane_catalogue;
mod pane_complex;
mod pane_preview;
mod pane_session;
mod theme;
mod ui;

use std::io::{self, Write};
use std::sync::Arc;
use std::time::Duration;

use anyhow::Context as _;
use ratatui::crossterm::event::{self, Event};
use ratatui::crossterm::{cursor, execute, terminal};
use ratatui::Terminal;

pub use action::Action;
pub use app::{App, Focus, LineKind, Mode, Pending};
pub use keymap::{Context, BINDINGS};
pub use theme::Theme;

use crate::catalogue::Catalogue;
use crate::chem::Complex;

/// The demo: an invented group's planning session.
pub const DEMO_FORMULA: &str = "HRh(CO)(PPh3)3";
pub const DEMO_TITLE: &str = "demo (invented): Larkspur Row lab, hydroformylation catalyst tuning";

/// The help overlay's lines as plain text (for tests and the docs).
pub fn help_text(app: &App) -> Vec<String> {
    ui::help_lines(app, &Theme { color: false })
        .into_iter()
        .map(|l| l.spans.iter().map(|s| s.content.as_ref()).collect())
        .collect()
}

/// Draw the whole screen for `app` (also used by snapshot tests and benchmarks).
pub fn draw(f: &mut ratatui::Frame, app: &App, theme: &Theme) {
    ui::render(f, app, theme);
}

/// Run the TUI until the user quits; returns the exit status. SIGTERM, SIGHUP, SIGINT and
/// SIGQUIT restore the terminal and end the process with 128 + n.
pub fn run(
    cat: Arc<Catalogue>,
    complex: Complex,
    title: String,
    ascii: bool,
    session: Option<crate::session::Session>,
    variant: Option<u64>,
) -> anyhow::Result<u8> {
    let theme = Theme::from_env();
    let mut app = App::new(cat, complex, title, ascii);
    app.log.session = session;
    app.log.variant = variant;
    watchdogs().context("installing signal handlers")?;
    let mut term = ratatui::try_init()
        .context("nonet's planner needs a terminal; for scripts use `nonet count` (see --help)")?;
    let result = event_loop(&mut term, &mut app, &theme);
    restore();
    result
}

fn restore() {
    ratatui::restore();
    let _ = execute!(io::stdout(), cursor::Show);
    let _ = io::stdout().flush();
}

/// Two threads that end the process when the terminal is gone. They are needed because once
/// the tty hangs up crossterm's reader spins on end-of-file inside its own loop and never
/// hands control back, so the event loop cannot notice anything itself.
fn watchdogs() -> io::Result<()> {
    use signal_hook::consts::{SIGHUP, SIGINT, SIGQUIT, SIGTERM};
    let mut signals = signal_hook::iterator::Signals::new([SIGTERM, SIGHUP, SIGINT, SIGQUIT])?;
    std::thread::spawn(move || {
        if let Some(sig) = signals.forever().next() {
            restore();
            std::process::exit(128 + sig);
        }
    });
    // a dropped link may send no signal at all: look for the terminal now and then
    std::thread::spawn(|| loop {
        std::thread::sleep(Duration::from_millis(500));
        match terminal::size() {
            Ok((w, h)) if w > 0 && h > 0 => {}
            _ => {
                restore();
                std::process::exit(129);
            }
        }
    });
    Ok(())
}

fn event_loop(
    term: &mut ratatui::DefaultTerminal,
    app: &mut App,
    theme: &Theme,
) -> anyhow::Result<u8> {
    let mut dirty = true;
    loop {
        if app.quit {
            return Ok(0);
        }
        if app.repaint {
            app.repaint = false;
            repaint(term)?;
            dirty = true;
        }
        if dirty {
            term.draw(|f| draw(f, app, theme))?;
            dirty = false;
        }
        // block until something happens: nothing is drawn while the user is idle
        match event::read() {
            Ok(Event::Key(k)) => {
                if is_suspend(&k) {
                    suspend(term)?;
                    dirty = true;
                    continue;
                }
                if let Some(a) = app.handle_key(k) {
                    let effects = app.apply(a);
                    effect::run(app, effects);
                    dirty = true;
                }
            }
            Ok(Event::Resize(..)) => dirty = true,
            Ok(_) => {}
            // the terminal went away: leave instead of spinning
            Err(_) => return Ok(129),
        }
    }
}

fn is_suspend(k: &event::KeyEvent) -> bool {
    k.code == event::KeyCode::Char('z') && k.modifiers.contains(event::KeyModifiers::CONTROL)
}

/// Ctrl-Z: give the terminal back, stop, and take it again on `fg`.
fn suspend<B: ratatui::backend::Backend>(term: &mut Terminal<B>) -> anyhow::Result<()> {
    restore();
    signal_hook::low_level::raise(signal_hook::consts::SIGTSTP)?;
    terminal::enable_raw_mode()?;
    execute!(io::stdout(), terminal::EnterAlternateScreen)?;
    repaint(term)
}

/// Clear the screen and draw everything on the next frame, from the size the terminal reports
/// by ioctl. Never asks the terminal where its cursor is: over a slow link or a key flood the
/// answer can come late or be eaten, and `Terminal::clear` would end the planner waiting.
fn repaint<B: ratatui::backend::Backend>(term: &mut Terminal<B>) -> anyhow::Result<()> {
    let (w, h) = terminal::size()?;
    term.resize(ratatui::layout::Rect::new(0, 0, w, h))
        .map_err(|e| anyhow::anyhow!("{e:?}"))
}

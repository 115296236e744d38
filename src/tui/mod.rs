//! The planning TUI: the working complex, the ligand catalogue and a preview of each edit.
//!
//! ratatui owns the terminal (raw mode, alternate screen, panic hook); on top of that nonet
//! restores the terminal on SIGTERM, SIGHUP and SIGINT and leaves when the terminal goes away.

mod action;
mod app;
mod keymap;
mod pane_catalogue;
mod pane_complex;
mod pane_preview;
mod theme;
mod ui;

use std::io::{self, Write};
use std::sync::atomic::{AtomicUsize, Ordering};
use std::sync::Arc;
use std::time::Duration;

use anyhow::Context as _;
use ratatui::crossterm::event::{self, Event};
use ratatui::crossterm::{cursor, execute, terminal};
use ratatui::Terminal;

pub use action::Action;
pub use app::{App, Focus, Mode, Pending};
pub use keymap::{Context, BINDINGS};
pub use theme::Theme;

use crate::catalogue::Catalogue;
use crate::chem::Complex;

/// The demo: an invented group's planning session.
pub const DEMO_FORMULA: &str = "HRh(CO)(PPh3)3";
pub const DEMO_TITLE: &str = "demo (invented): Lindqvist group, hydroformylation catalyst tuning";

/// Draw the whole screen for `app` (also used by snapshot tests and benchmarks).
pub fn draw(f: &mut ratatui::Frame, app: &App, theme: &Theme) {
    ui::render(f, app, theme);
}

/// Run the TUI until the user quits; returns the exit status (128 + n after signal n).
pub fn run(
    cat: Arc<Catalogue>,
    complex: Complex,
    title: String,
    ascii: bool,
) -> anyhow::Result<u8> {
    let signal = Arc::new(AtomicUsize::new(0));
    for sig in [
        signal_hook::consts::SIGTERM,
        signal_hook::consts::SIGHUP,
        signal_hook::consts::SIGINT,
        signal_hook::consts::SIGQUIT,
    ] {
        signal_hook::flag::register_usize(sig, Arc::clone(&signal), sig as usize)
            .context("installing signal handlers")?;
    }
    let theme = Theme::from_env();
    let mut app = App::new(cat, complex, title, ascii);
    let mut term = ratatui::try_init()
        .context("nonet's planner needs a terminal; for scripts use `nonet count` (see --help)")?;
    let result = event_loop(&mut term, &mut app, &theme, &signal);
    restore();
    result
}

fn restore() {
    ratatui::restore();
    let _ = execute!(io::stdout(), cursor::Show);
    let _ = io::stdout().flush();
}

fn event_loop(
    term: &mut ratatui::DefaultTerminal,
    app: &mut App,
    theme: &Theme,
    signal: &AtomicUsize,
) -> anyhow::Result<u8> {
    let mut dirty = true;
    loop {
        let sig = signal.load(Ordering::Relaxed);
        if sig != 0 {
            return Ok(128u8.saturating_add(sig as u8));
        }
        if app.quit {
            return Ok(0);
        }
        if app.repaint {
            app.repaint = false;
            term.clear()?;
            dirty = true;
        }
        if dirty {
            term.draw(|f| draw(f, app, theme))?;
            dirty = false;
        }
        // wake now and then to notice signals; nothing is drawn unless something changed
        match event::poll(Duration::from_millis(250)) {
            Ok(false) => continue,
            Ok(true) => {}
            // the terminal went away (dropped link): leave instead of spinning
            Err(_) => return Ok(129),
        }
        match event::read() {
            Ok(Event::Key(k)) => {
                if is_suspend(&k) {
                    suspend(term)?;
                    dirty = true;
                    continue;
                }
                if let Some(a) = app.handle_key(k) {
                    app.apply(a);
                    dirty = true;
                }
            }
            Ok(Event::Resize(..)) => dirty = true,
            Ok(_) => {}
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
    term.clear().map_err(|e| anyhow::anyhow!("{e:?}"))?;
    Ok(())
}

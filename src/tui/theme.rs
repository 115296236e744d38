//! Styles from the 16 named ANSI colours (they follow the user's palette, so they read on light
//! and dark backgrounds), or none at all under NO_COLOR. Selection and focus are also marked by
//! bold and reversed colours, and every status has a word or glyph, so nothing relies on colour.

use ratatui::style::{Color, Modifier, Style};

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Theme {
    pub color: bool,
}

impl Theme {
    /// Colour unless NO_COLOR is set to anything non-empty (no-color.org).
    pub fn from_env() -> Theme {
        let no_color = std::env::var_os("NO_COLOR").is_some_and(|v| !v.is_empty());
        Theme { color: !no_color }
    }

    fn fg(&self, c: Color) -> Style {
        if self.color {
            Style::default().fg(c)
        } else {
            Style::default()
        }
    }

    pub fn text(&self) -> Style {
        Style::default()
    }

    pub fn dim(&self) -> Style {
        if self.color {
            Style::default().add_modifier(Modifier::DIM)
        } else {
            Style::default()
        }
    }

    pub fn title(&self) -> Style {
        Style::default().add_modifier(Modifier::BOLD)
    }

    pub fn border(&self, focused: bool) -> Style {
        if focused {
            self.fg(Color::Cyan).add_modifier(Modifier::BOLD)
        } else {
            self.dim()
        }
    }

    pub fn selected(&self, focused: bool) -> Style {
        if focused {
            Style::default().add_modifier(Modifier::REVERSED | Modifier::BOLD)
        } else {
            Style::default().add_modifier(Modifier::BOLD | Modifier::UNDERLINED)
        }
    }

    pub fn matched(&self) -> Style {
        self.fg(Color::Cyan)
            .add_modifier(Modifier::BOLD | Modifier::UNDERLINED)
    }

    pub fn good(&self) -> Style {
        self.fg(Color::Green)
    }

    pub fn warn(&self) -> Style {
        self.fg(Color::Magenta).add_modifier(Modifier::BOLD)
    }

    pub fn bad(&self) -> Style {
        self.fg(Color::Red).add_modifier(Modifier::BOLD)
    }

    pub fn key(&self) -> Style {
        self.fg(Color::Blue).add_modifier(Modifier::BOLD)
    }

    pub fn heading(&self) -> Style {
        self.fg(Color::Blue).add_modifier(Modifier::BOLD)
    }
}

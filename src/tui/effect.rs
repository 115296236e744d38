//! What the planner asks the outside world to do: the state changes in `App::apply`, and the
//! event loop carries out the effects it returns (appending to the session log, writing an
//! export), then tells the App how each went. The App itself never touches a disk, so every
//! view can be driven and checked in memory.

use std::path::PathBuf;

use crate::session::{Record, Session};

/// One piece of I/O the planner needs.
#[derive(Debug, Clone, PartialEq)]
pub enum Effect {
    /// Append a variant record to the session log. The change counts as recorded (and the
    /// working variant moves to it) only once its bytes are durable.
    Record { record: Record, label: String },
    /// Append a bookmark record.
    Bookmark { record: Record },
    /// Write files (an export's table and figure); `done` is the message when all are written.
    Write {
        files: Vec<(PathBuf, String)>,
        done: String,
    },
}

/// Carry out one effect; the error, in words, if it failed.
pub fn perform(session: Option<&mut Session>, effect: &Effect) -> Result<(), String> {
    match effect {
        Effect::Record { record, .. } | Effect::Bookmark { record } => match session {
            Some(s) => s.write(record).map_err(|e| e.to_string()),
            None => Err("this planner keeps no session".into()),
        },
        Effect::Write { files, .. } => {
            for (path, text) in files {
                std::fs::write(path, text)
                    .map_err(|e| format!("cannot write {}: {e}", path.display()))?;
            }
            Ok(())
        }
    }
}

/// Carry out the effects of one action in order and report each outcome to the App.
pub fn run(app: &mut super::App, effects: Vec<Effect>) {
    for e in effects {
        let outcome = perform(app.log.session.as_mut(), &e);
        app.settle(e, outcome);
    }
}

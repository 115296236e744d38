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
    /// Read what other processes appended to the session's log since it was last read.
    Refresh,
}

/// How an effect went, when it went well.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Done {
    Written,
    /// Variants another process added, now in the tree.
    Refreshed(Vec<u64>),
}

/// Carry out one effect; the error, in words, if it failed.
pub fn perform(session: Option<&mut Session>, effect: &Effect) -> Result<Done, String> {
    match effect {
        Effect::Record { record, .. } | Effect::Bookmark { record } => match session {
            Some(s) => s
                .write(record)
                .map(|()| Done::Written)
                .map_err(|e| e.to_string()),
            None => Err("this planner keeps no session".into()),
        },
        Effect::Write { files, .. } => {
            for (path, text) in files {
                std::fs::write(path, text)
                    .map_err(|e| format!("cannot write {}: {e}", path.display()))?;
            }
            Ok(Done::Written)
        }
        Effect::Refresh => match session {
            Some(s) => s
                .refresh()
                .map(Done::Refreshed)
                .map_err(|e| format!("the session log could not be read again: {e}")),
            None => Ok(Done::Refreshed(Vec::new())),
        },
    }
}

/// Carry out the effects of one action in order and report each outcome to the App (which may
/// ask for more, such as a refresh after a record).
pub fn run(app: &mut super::App, effects: Vec<Effect>) {
    let mut queue: std::collections::VecDeque<Effect> = effects.into();
    while let Some(e) = queue.pop_front() {
        let outcome = perform(app.log.session.as_mut(), &e);
        queue.extend(app.settle(e, outcome));
    }
}

//! The layers stay apart: `src/chem` is pure chemistry. It uses nothing from the layers built
//! on it (catalogue, session, cli, tui), no terminal or argument crates, and no file system,
//! environment, clock or process, so every answer it gives depends on its inputs alone
//! (common practice for a testable core; see DEVELOPERS.md).

use std::path::{Path, PathBuf};

/// What the core may not name, with why.
const FORBIDDEN: &[(&str, &str)] = &[
    ("crate::catalogue", "a layer above"),
    ("crate::session", "a layer above"),
    ("crate::cli", "a layer above"),
    ("crate::tui", "a layer above"),
    (
        "crate::plain",
        "terminal spelling belongs to the front ends",
    ),
    ("ratatui", "a terminal crate"),
    ("crossterm", "a terminal crate"),
    ("clap", "an argument crate"),
    ("directories", "platform paths"),
    ("std::fs", "the file system"),
    ("std::env", "the environment"),
    ("std::process", "processes"),
    ("std::net", "the network"),
    ("SystemTime", "the clock"),
    ("Instant", "the clock"),
    ("println!", "printing"),
    ("eprintln!", "printing"),
    (
        "include_str!",
        "files read at build time belong to the catalogue",
    ),
];

fn rust_files(dir: &Path, out: &mut Vec<PathBuf>) {
    for entry in std::fs::read_dir(dir).expect("read src/chem") {
        let p = entry.expect("dir entry").path();
        if p.is_dir() {
            rust_files(&p, out);
        } else if p.extension().is_some_and(|e| e == "rs") {
            out.push(p);
        }
    }
}

#[test]
fn the_chemistry_core_is_pure() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("src/chem");
    let mut files = Vec::new();
    rust_files(&root, &mut files);
    assert!(files.len() > 20, "src/chem has its modules");
    let mut found = Vec::new();
    for f in &files {
        let text = std::fs::read_to_string(f).expect("read source");
        for (n, line) in text.lines().enumerate() {
            let code = line.split("//").next().unwrap_or("");
            for (word, why) in FORBIDDEN {
                if code.contains(word) {
                    found.push(format!("{}:{}: {word} ({why})", f.display(), n + 1));
                }
            }
        }
    }
    assert!(
        found.is_empty(),
        "src/chem reaches outside itself:\n{}",
        found.join("\n")
    );
}

#[test]
fn the_check_would_see_a_violation() {
    // the scan itself works: a line that names the file system is caught
    let line = "    let t = std::fs::read_to_string(p);";
    assert!(FORBIDDEN.iter().any(|(w, _)| line.contains(w)));
}

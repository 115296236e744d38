//! `nonet plan` outside a terminal: a clear error pointing to the scriptable command, and bad
//! formulas refused before the screen changes.

mod common;

use std::process::Stdio;

use common::cli::Scratch;

fn nonet(args: &[&str]) -> std::process::Output {
    Scratch::new("plan")
        .cmd()
        .args(args)
        .stdin(Stdio::null())
        .output()
        .expect("run nonet")
}

#[test]
fn planner_without_a_terminal_says_what_to_use_instead() {
    let out = nonet(&["plan", "Fe(CO)5"]);
    assert_eq!(out.status.code(), Some(1));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("needs a terminal") && err.contains("nonet count"),
        "{err}"
    );
}

#[test]
fn planner_refuses_a_bad_formula_before_opening() {
    let out = nonet(&["plan", "Fe(XX)5"]);
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("unknown ligand 'XX'") && err.contains('^'),
        "{err}"
    );
}

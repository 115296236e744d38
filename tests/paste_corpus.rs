//! The paste corpus: formulas exactly as chemists copy them out of papers, PDFs, supporting
//! information and web pages (`tests/data/paste_corpus.tsv`, whose header explains the
//! columns), each with the reading a chemist expects and its source.
//!
//! Every line is read through the library (`nonet::chem::parse` with the bundled catalogue,
//! then `nonet::chem::count`). An `ok` line passes when it is read and the first metal has the
//! expected electron count, oxidation state and d count; a `fail` line passes when it is
//! refused, by the parser or as an impossible count (`Report::impossible`), with a message
//! that is not empty.
//!
//! The reader is still learning pasted text, so not every `ok` line passes yet. The test
//! prints a table of the lines that do not read as expected (formula, expected, got) and
//! asserts only that:
//!
//! - the corpus has at least [`MIN_LINES`] data lines, each with a source;
//! - at least [`MIN_PASSING`] lines pass, so reading that works today cannot silently break;
//! - every `fail` line is still refused.
//!
//! Run with `cargo test --test paste_corpus -- --nocapture` to see the table.

mod common;

use common::cat;
use nonet::chem::{count, parse_ions, Frac};
use std::collections::BTreeMap;
use std::panic::{catch_unwind, AssertUnwindSafe};

/// The number of corpus lines (`ok` and `fail` together) that pass on the current reader.
///
/// It rises as the reader learns to accept pasted text: when a change makes more lines pass,
/// raise it to the new number (the test prints it). It must never be lowered: a lower count
/// means text that used to be read correctly no longer is.
const MIN_PASSING: usize = 554;

/// The fewest data lines the corpus may have.
const MIN_LINES: usize = 250;

const CORPUS: &str = include_str!("data/paste_corpus.tsv");

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
struct Reading {
    electrons: i64,
    oxidation_state: i64,
    d_count: i64,
}

impl std::fmt::Display for Reading {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(
            f,
            "{} e, OS {:+}, d{}",
            self.electrons, self.oxidation_state, self.d_count
        )
    }
}

#[derive(Debug)]
enum Expect {
    Ok(Reading),
    Fail,
}

#[derive(Debug)]
struct Line {
    number: usize,
    formula: String,
    expect: Expect,
    source: String,
    note: String,
}

/// What the library made of a formula.
enum Got {
    /// Read and counted: the first metal's electron count, oxidation state and d count.
    Read { e: Frac, os: Frac, d: Frac },
    /// Refused, by the parser or as an impossible count, with this message.
    Refused(String),
    /// The parser or the counter panicked.
    Panicked(String),
}

impl std::fmt::Display for Got {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            Got::Read { e, os, d } => {
                let sign = if *os > Frac::ZERO { "+" } else { "" };
                write!(f, "{e} e, OS {sign}{os}, d{d}")
            }
            Got::Refused(m) => write!(f, "refused: {}", one_line(m, 90)),
            Got::Panicked(m) => write!(f, "PANIC: {}", one_line(m, 90)),
        }
    }
}

fn one_line(s: &str, max: usize) -> String {
    let flat: String = s
        .chars()
        .map(|c| if c.is_control() { ' ' } else { c })
        .collect();
    if flat.chars().count() > max {
        format!("{}...", flat.chars().take(max).collect::<String>())
    } else {
        flat
    }
}

fn int(field: &str, what: &str, number: usize) -> i64 {
    field
        .trim()
        .parse()
        .unwrap_or_else(|_| panic!("line {number}: {what} '{field}' is not an integer"))
}

/// The data lines of the corpus: every line that is neither blank nor a `#` comment. A line
/// that does not have the documented columns is a mistake in the data and fails the test.
fn corpus() -> Vec<Line> {
    let mut out = Vec::new();
    for (i, raw) in CORPUS.lines().enumerate() {
        let number = i + 1;
        if raw.trim().is_empty() || raw.starts_with('#') {
            continue;
        }
        let cols: Vec<&str> = raw.split('\t').collect();
        assert!(
            cols.len() == 6 || cols.len() == 7,
            "line {number}: {} columns, expected 6 or 7 (formula, electrons, oxidation_state, \
             d_count, expect, source[, note]): {raw:?}",
            cols.len()
        );
        let expect = match cols[4].trim() {
            "ok" => Expect::Ok(Reading {
                electrons: int(cols[1], "electrons", number),
                oxidation_state: int(cols[2], "oxidation_state", number),
                d_count: int(cols[3], "d_count", number),
            }),
            "fail" => Expect::Fail,
            other => panic!("line {number}: expect is '{other}', not ok or fail"),
        };
        out.push(Line {
            number,
            // the formula is kept byte for byte: stray spaces and invisible characters are
            // part of what is being tested
            formula: cols[0].to_string(),
            expect,
            source: cols[5].trim().to_string(),
            note: cols
                .get(6)
                .map(|s| s.trim().to_string())
                .unwrap_or_default(),
        });
    }
    out
}

/// The reading `nonet count` gives: of a salt of two complex ions, the cation's (the first
/// ion with a positive charge, as the corpus records it). A line whose note holds
/// `label-disagrees` must also carry the note that its oxidation-state label disagrees.
fn read(formula: &str, note: &str) -> Got {
    let attempt = catch_unwind(AssertUnwindSafe(|| match parse_ions(formula, cat()) {
        Err(e) => Got::Refused(e.to_string()),
        Ok(ions) => {
            let Some(complex) = ions.iter().find(|c| c.charge > 0).or(ions.first()) else {
                return Got::Refused(String::new());
            };
            let report = count(complex);
            if let Some(why) = report.impossible() {
                return Got::Refused(why);
            }
            if note.split_whitespace().any(|t| t == "label-disagrees")
                && !report.notes.iter().any(|n| n.contains("label, but"))
            {
                return Got::Refused(String::new());
            }
            match report.metals.first() {
                Some(m) => Got::Read {
                    e: m.electron_count,
                    os: m.oxidation_state,
                    d: m.d_electrons,
                },
                None => Got::Refused(String::new()),
            }
        }
    }));
    attempt.unwrap_or_else(|p| {
        let msg = p
            .downcast_ref::<String>()
            .cloned()
            .or_else(|| p.downcast_ref::<&str>().map(|s| s.to_string()))
            .unwrap_or_default();
        Got::Panicked(msg)
    })
}

fn passes(line: &Line, got: &Got) -> bool {
    match (&line.expect, got) {
        (Expect::Ok(r), Got::Read { e, os, d }) => {
            *e == Frac::int(r.electrons)
                && *os == Frac::int(r.oxidation_state)
                && *d == Frac::int(r.d_count)
        }
        (Expect::Fail, Got::Refused(m)) => !m.trim().is_empty(),
        _ => false,
    }
}

/// An error message with its quoted parts blanked and its column and suggestion cut off, so
/// that messages of one kind group together: "unknown ligand '…'".
fn message_shape(m: &str) -> String {
    let mut out = String::new();
    let mut quoted = false;
    for c in m.chars() {
        if c == '\'' {
            if !quoted {
                out.push_str("'…'");
            }
            quoted = !quoted;
        } else if !quoted {
            out.push(c);
        }
    }
    let cut = [" (column", ";", ":"]
        .iter()
        .filter_map(|p| out.find(p))
        .min()
        .unwrap_or(out.len());
    out[..cut].trim().to_string()
}

/// A short name for why a line did not pass, to group the failures.
fn reason(line: &Line, got: &Got) -> String {
    match (&line.expect, got) {
        (_, Got::Panicked(_)) => "panicked".to_string(),
        (Expect::Ok(_), Got::Read { .. }) => "misread: read with other values".to_string(),
        (Expect::Ok(_), Got::Refused(m)) => format!("refused: {}", message_shape(m)),
        (Expect::Fail, Got::Read { .. }) => "accepted text that must be refused".to_string(),
        (Expect::Fail, Got::Refused(_)) => "refused with an empty message".to_string(),
    }
}

#[test]
fn paste_corpus() {
    let lines = corpus();
    let mut passing = 0usize;
    let mut failures: Vec<(&Line, Got)> = Vec::new();
    let mut not_refused: Vec<String> = Vec::new();
    let mut groups: BTreeMap<String, usize> = BTreeMap::new();
    let mut two_ions = (0usize, 0usize);

    for line in &lines {
        let got = read(&line.formula, &line.note);
        let ok = passes(line, &got);
        if line.note.split_whitespace().any(|t| t == "two-ions") {
            two_ions.0 += 1;
            two_ions.1 += usize::from(ok);
        }
        if ok {
            passing += 1;
            continue;
        }
        *groups.entry(reason(line, &got)).or_default() += 1;
        if matches!(line.expect, Expect::Fail) {
            not_refused.push(format!(
                "line {}: {:?} gave {got}",
                line.number, line.formula
            ));
        }
        failures.push((line, got));
    }

    let oks = lines
        .iter()
        .filter(|l| matches!(l.expect, Expect::Ok(_)))
        .count();
    println!(
        "paste corpus: {} lines ({} ok, {} fail), {} pass, {} do not (MIN_PASSING = {})",
        lines.len(),
        oks,
        lines.len() - oks,
        passing,
        failures.len(),
        MIN_PASSING
    );
    println!(
        "salts of two complex ions: {} of {} read as the cation",
        two_ions.1, two_ions.0
    );
    if !failures.is_empty() {
        println!("\n{:>5}  {:<44} {:<24} got", "line", "formula", "expected");
        for (line, got) in &failures {
            let expected = match &line.expect {
                Expect::Ok(r) => r.to_string(),
                Expect::Fail => "refused".to_string(),
            };
            // Debug formatting shows invisible characters as escapes
            let shown = format!("{:?}", line.formula);
            println!("{:>5}  {:<44} {:<24} {got}", line.number, shown, expected);
        }
        println!("\nwhy lines do not pass:");
        let mut by_count: Vec<_> = groups.iter().collect();
        by_count.sort_by(|a, b| b.1.cmp(a.1).then(a.0.cmp(b.0)));
        for (why, n) in by_count {
            println!("{n:>5}  {why}");
        }
    }
    if passing > MIN_PASSING {
        println!("\n{passing} lines pass: raise MIN_PASSING from {MIN_PASSING} to {passing}");
    }

    // (a) enough lines, each with a source
    assert!(
        lines.len() >= MIN_LINES,
        "the paste corpus has {} data lines; it must keep at least {MIN_LINES}",
        lines.len()
    );
    let unsourced: Vec<usize> = lines
        .iter()
        .filter(|l| l.source.is_empty())
        .map(|l| l.number)
        .collect();
    assert!(
        unsourced.is_empty(),
        "lines without a source: {unsourced:?}"
    );
    // (b) no regression in reading
    assert!(
        passing >= MIN_PASSING,
        "only {passing} corpus lines pass, fewer than MIN_PASSING = {MIN_PASSING}: reading of \
         pasted formulas regressed (see the table above)"
    );
    // (c) text that must be refused is still refused
    assert!(
        not_refused.is_empty(),
        "text that must be refused was not refused with a message:\n{}",
        not_refused.join("\n")
    );
}

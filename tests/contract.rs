//! The CLI's words and JSON fields are a contract with users' scripts. Snapshots of the
//! README's text reports, and of the shape (every field path and its type) of one JSON line
//! per kind, so renaming or dropping a field fails here; plus the error channel's promises:
//! ASCII spelling with the caret in place, control characters escaped, an unwritable stderr,
//! TERM=dumb, bounded batch lines, --fields and input order.

mod common;

use common::cli::Scratch;
use serde_json::Value;

/// Every field path of a JSON value with its type: "metals[].electron_count: number".
fn shape(v: &Value) -> String {
    fn walk(v: &Value, path: &str, out: &mut Vec<String>) {
        match v {
            Value::Object(m) => {
                if !path.is_empty() {
                    out.push(format!("{path}: object"));
                }
                for (k, x) in m {
                    let p = if path.is_empty() {
                        k.clone()
                    } else {
                        format!("{path}.{k}")
                    };
                    walk(x, &p, out);
                }
            }
            Value::Array(a) => {
                out.push(format!("{path}: array"));
                // the fields of every element, once
                for x in a {
                    walk(x, &format!("{path}[]"), out);
                }
            }
            Value::Null => out.push(format!("{path}: null")),
            Value::Bool(_) => out.push(format!("{path}: bool")),
            Value::Number(_) => out.push(format!("{path}: number")),
            Value::String(_) => out.push(format!("{path}: string")),
        }
    }
    let mut out = Vec::new();
    walk(v, "", &mut out);
    out.sort();
    out.dedup();
    out.join("\n")
}

fn first_json(s: &Scratch, args: &[&str]) -> Value {
    let r = s.run(args);
    r.json_lines()
        .into_iter()
        .next()
        .unwrap_or_else(|| panic!("no JSON line\n{}", r.show()))
}

#[test]
fn json_shapes_per_kind() {
    let s = Scratch::new("shapes");
    let count = first_json(&s, &["count", "--json", "CpFe(CO)2Me"]);
    insta::assert_snapshot!("json_count", shape(&count));
    let error = first_json(&s, &["count", "--json", "CpFe(CO)2Xq"]);
    insta::assert_snapshot!("json_count_error", shape(&error));
    let r = s.run(&[
        "step",
        "--json",
        "Pd(PPh3)2",
        "oxidative-addition PhBr",
        "transmetalation PhB(OH)2",
        "reductive-elimination Ph Ph",
    ]);
    let lines = r.json_lines();
    insta::assert_snapshot!("json_step", shape(&lines[0]));
    insta::assert_snapshot!("json_step_closing", shape(&lines[3]));
    let refused = first_json(
        &s,
        &["step", "--json", "Pd(PPh3)2", "reductive-elimination Ph Ph"],
    );
    insta::assert_snapshot!("json_step_error", shape(&refused));
    let screen = first_json(
        &s,
        &[
            "screen",
            "--json",
            "IrCl(CO)(PPh3)2",
            "--site",
            "PPh3",
            "--top",
            "1",
        ],
    );
    insta::assert_snapshot!("json_screen", shape(&screen));
    let ligand = first_json(&s, &["ligands", "--json", "PCy3"]);
    insta::assert_snapshot!("json_ligands", shape(&ligand));
    let substrate = first_json(&s, &["ligands", "--substrates", "--json", "MeI"]);
    insta::assert_snapshot!("json_substrates", shape(&substrate));
    let r = s.run(&["step", "--session", "shapes", "Fe(CO)5", "dissociation CO"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    let session = first_json(&s, &["sessions", "--json"]);
    insta::assert_snapshot!("json_sessions", shape(&session));
}

#[test]
fn readme_text_reports() {
    let s = Scratch::new("readme");
    let r = s.run(&["count", "CpFe(CO)2Me"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    insta::assert_snapshot!("text_count", r.stdout);
    let r = s.run(&["step", "IrCl(CO)(PPh3)2", "oxidative-addition MeI"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    insta::assert_snapshot!("text_step", r.stdout);
    let r = s.run(&[
        "screen",
        "IrCl(CO)(PPh3)2",
        "--site",
        "PPh3",
        "--family",
        "phosphine",
        "--rank",
        "donor",
        "--top",
        "10",
    ]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    insta::assert_snapshot!("text_screen", r.stdout);
}

#[test]
fn ascii_errors_keep_the_caret_under_the_mistake() {
    let s = Scratch::new("caret");
    let r = s.run(&["--ascii", "count", "Fe(η5-Cp)2Xq"]);
    assert_eq!(r.code, Some(2));
    assert!(r.stderr.is_ascii(), "{}", r.stderr);
    let lines: Vec<&str> = r.stderr.lines().collect();
    let shown = lines
        .iter()
        .position(|l| l.contains("Fe(eta5-Cp)2Xq"))
        .expect("input line");
    let at = lines[shown].find("Xq").expect("Xq");
    assert_eq!(lines[shown + 1].find('^'), Some(at), "{}", r.stderr);
    // the step and screen commands' errors are spelled in ASCII too
    let r = s.run(&["--ascii", "step", "Fe(η5-Cp)2", "dissociation Xq"]);
    assert_eq!(r.code, Some(2));
    assert!(r.stderr.is_ascii(), "{}", r.stderr);
    let r = s.run(&["--ascii", "screen", "Fe(η5-Cp)(CO)2Me", "--site", "Xq"]);
    assert_eq!(r.code, Some(2));
    assert!(r.stderr.is_ascii(), "{}", r.stderr);
}

#[test]
fn control_characters_from_input_are_escaped() {
    let s = Scratch::new("controls");
    let evil = "Fe\u{1b}]0;owned\u{7}(CO)5";
    for args in [
        vec!["count", evil],
        vec!["step", "Fe(CO)5", "dissociation \u{1b}[2J"],
        vec!["ligands", "\u{1b}[31m"],
    ] {
        let r = s.run(&args);
        assert!(
            !r.stderr.contains('\u{1b}'),
            "raw ESC in stderr: {:?}",
            r.stderr
        );
        assert!(
            !r.stdout.contains('\u{1b}'),
            "raw ESC in stdout: {:?}",
            r.stdout
        );
        assert!(r.stderr.contains("\\x1b"), "{:?}", r.stderr);
    }
    // a batch line with a bell and a carriage return
    let file = s.write("evil.txt", b"Cr(CO)6\x07\rXX\n");
    let r = s.run(&["count", "--batch", file.to_str().expect("path")]);
    assert!(
        !r.stderr.contains('\u{7}') && !r.stderr.contains('\r'),
        "{:?}",
        r.stderr
    );
}

#[test]
fn an_unwritable_stderr_does_not_change_the_exit_status() {
    let s = Scratch::new("stderr");
    let full = std::fs::OpenOptions::new().write(true).open("/dev/full");
    let Ok(full) = full else {
        return; // no /dev/full here
    };
    let out = s
        .cmd()
        .args(["count", "Xq(CO)5"])
        .stderr(full)
        .output()
        .expect("run");
    assert_eq!(out.status.code(), Some(2));
    let out = s
        .cmd()
        .args(["count", "Cr(CO)6"])
        .stderr(std::process::Stdio::null())
        .output()
        .expect("run");
    assert_eq!(out.status.code(), Some(0));
}

#[test]
fn a_dumb_terminal_is_pointed_to_the_cli() {
    let s = Scratch::new("dumb");
    let out = s
        .cmd()
        .env("TERM", "dumb")
        .args(["plan"])
        .output()
        .expect("run");
    assert_eq!(out.status.code(), Some(1));
    assert!(out.stdout.is_empty(), "nothing drawn");
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("TERM=dumb") && err.contains("nonet count"),
        "{err}"
    );
}

#[test]
fn a_huge_batch_line_is_refused_and_the_rest_counted() {
    let s = Scratch::new("long");
    let mut text = b"Cr(CO)6\n".to_vec();
    text.extend(std::iter::repeat_n(b'x', 5_000_000));
    text.extend_from_slice(b"\nFe(CO)5\n");
    let r = s.run_stdin(&["count", "--json", "--batch", "-"], &text);
    assert_eq!(r.code, Some(2), "{}", r.stderr);
    let lines = r.json_lines();
    assert_eq!(lines.len(), 3);
    assert_eq!(lines[0]["formula"], "[Cr(CO)6]");
    assert!(lines[1]["error"]
        .as_str()
        .is_some_and(|e| e.contains("longer than")));
    // the message quotes a bounded excerpt, not the line
    assert!(r.stderr.len() < 1000, "{} bytes of stderr", r.stderr.len());
    assert_eq!(lines[2]["formula"], "[Fe(CO)5]");
}

#[test]
fn fields_keep_only_what_is_named() {
    let s = Scratch::new("fields");
    let r = s.run(&[
        "count",
        "--json",
        "--fields",
        "input,charge,metals",
        "Cr(CO)6",
    ]);
    let v = &r.json_lines()[0];
    let mut keys: Vec<&String> = v.as_object().expect("object").keys().collect();
    keys.sort();
    assert_eq!(keys, ["charge", "input", "metals"]);
    assert_eq!(v["metals"][0]["electron_count"], 18);
    let r = s.run(&["count", "--json", "--fields", "electron_count", "Cr(CO)6"]);
    assert_eq!(r.code, Some(2));
    assert!(r.stderr.contains("the fields are"), "{}", r.stderr);
}

#[test]
fn a_parallel_batch_keeps_input_order() {
    // more lines than one chunk, with refusals sprinkled in: output follows the input
    let s = Scratch::new("order");
    let metals = [
        "Cr(CO)6", "Fe(CO)5", "Ni(CO)4", "Xq(CO)3", "Mo(CO)6", "W(CO)6",
    ];
    let mut text = String::new();
    let mut want = Vec::new();
    for i in 0..10_000 {
        let f = metals[(i * 7 + i / 3) % metals.len()];
        text.push_str(f);
        text.push('\n');
        want.push(f);
    }
    let r = s.run_stdin(
        &["count", "--json", "--fields", "input", "--batch", "-"],
        text.as_bytes(),
    );
    let got: Vec<String> = r
        .json_lines()
        .iter()
        .map(|v| v["input"].as_str().unwrap_or("?").to_string())
        .collect();
    assert_eq!(got, want);
    // stderr names the refused lines in order too
    let numbers: Vec<usize> = r
        .stderr
        .lines()
        .filter_map(|l| l.strip_prefix("error: line "))
        .filter_map(|l| l.split(':').next()?.parse().ok())
        .collect();
    let mut sorted = numbers.clone();
    sorted.sort_unstable();
    assert_eq!(numbers, sorted);
    assert_eq!(
        numbers.len(),
        want.iter().filter(|f| f.starts_with("Xq")).count()
    );
}

#[test]
fn ligand_set_text_is_escaped_on_stdout() {
    // a user ligand set whose name carries an escape sequence is listed with it escaped
    let s = Scratch::new("evilset");
    s.user_set(
        "evil.toml",
        r#"
[[ligand]]
key = "Qvv"
name = "quiet ligand \u001b]0;title\u0007 with a bell"
formula = "P(CH3)3"
family = "phosphine"

[[ligand.mode]]
label = "κ1"
class = "L"
"#,
    );
    let r = s.run(&["ligands", "Qvv"]);
    assert!(
        r.stdout.contains("quiet ligand \\x1b]0;title\\x07"),
        "{:?}",
        r.stdout
    );
    assert!(
        !r.stdout.contains('\u{1b}') && !r.stdout.contains('\u{7}'),
        "{:?}",
        r.stdout
    );
    assert!(!r.stderr.contains('\u{1b}'), "{:?}", r.stderr);
    let r = s.run(&["count", "Pd(Qvv)2Cl2"]);
    assert!(!r.stdout.contains('\u{1b}'), "{:?}", r.stdout);
}

#[test]
fn the_data_directory_is_a_boundary() {
    let s = Scratch::new("boundary");
    let r = s.run(&["step", "--session", "mine", "Fe(CO)5", "dissociation CO"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    let log = s.data().join("sessions").join("mine.jsonl");
    assert!(log.exists());
    let before = std::fs::read(&log).expect("log");
    // export onto the session's own log is refused and the log is untouched
    let target = log.to_str().expect("path");
    let r = s.run(&["export", "mine", "-o", target]);
    assert_eq!(r.code, Some(2), "{}", r.show());
    assert!(r.stderr.contains("would destroy it"), "{}", r.stderr);
    assert_eq!(std::fs::read(&log).expect("log"), before);
    // names are checked like the other commands check them
    for bad in ["../mine", ".hidden", "a/b"] {
        let r = s.run(&["export", bad]);
        assert_eq!(r.code, Some(2), "{bad}: {}", r.show());
        assert!(r.stderr.contains("not a session name"), "{}", r.stderr);
    }
    // a data directory that is a file is an error, not "no sessions yet"
    let file = s.write("not-a-dir", b"x");
    let r = s
        .cmd()
        .env("NONET_DATA_DIR", &file)
        .args(["sessions"])
        .output()
        .expect("run");
    assert_eq!(r.status.code(), Some(1));
    let err = String::from_utf8_lossy(&r.stderr);
    assert!(
        err.contains("not a directory") || err.contains("is a file"),
        "{err}"
    );
}

#[test]
fn formula_and_charge_alone_read_the_same_as_the_full_count() {
    // `--fields` naming only input, formula and charge skips the count; every line must come
    // out as the full report trimmed to those fields, refusals and salts of two ions included
    let s = Scratch::new("parse-only");
    let corpus = include_str!("data/paste_corpus.tsv");
    let mut text = String::new();
    for line in corpus
        .lines()
        .filter(|l| !l.starts_with('#') && !l.is_empty())
    {
        let f = line.split('\t').next().unwrap_or_default();
        text.push_str(f);
        text.push('\n');
        // the same complex with charges it cannot carry (d counts beyond 0-10)
        text.push_str(&format!("[{f}]6-\n[{f}]7+\n"));
    }
    let fields = "schema,input,formula,charge";
    let light = s.run_stdin(
        &["count", "--json", "--fields", fields, "--batch", "-"],
        text.as_bytes(),
    );
    let full = s.run_stdin(&["count", "--json", "--batch", "-"], text.as_bytes());
    assert_eq!(light.code, full.code);
    assert_eq!(light.stderr, full.stderr);
    let keep = |v: &serde_json::Value| {
        let o = v.as_object().expect("object");
        if o.contains_key("error") {
            return v.clone();
        }
        let kept: serde_json::Map<_, _> = o
            .iter()
            .filter(|(k, _)| fields.split(',').any(|f| f == k.as_str()) || *k == "ion")
            .map(|(k, v)| (k.clone(), v.clone()))
            .collect();
        serde_json::Value::Object(kept)
    };
    let (a, b) = (light.json_lines(), full.json_lines());
    assert_eq!(a.len(), b.len());
    assert!(a.len() > 1500, "{} lines", a.len());
    for (x, y) in a.iter().zip(&b) {
        assert_eq!(*x, keep(y));
    }
}

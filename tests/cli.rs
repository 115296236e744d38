//! Black-box tests of the `nonet` binary: text and JSON output, batches, exit statuses, error
//! messages, ASCII mode, closed pipes and user ligand sets.
//!
//! Every run gets a fresh NONET_CONFIG_DIR under the system temp dir (so no real user sets are
//! read), LANG=C.UTF-8 unless the test says otherwise, and no LC_ALL / LC_CTYPE.

mod common;

use std::io::{BufRead, BufReader, Read};
use std::process::Stdio;

use common::cli::{Run, Scratch};
use serde_json::Value;

fn has(v: &Value, key: &str) -> bool {
    v.as_object().is_some_and(|o| o.contains_key(key))
}

fn non_ascii(s: &[u8]) -> Vec<String> {
    String::from_utf8_lossy(s)
        .lines()
        .filter(|l| !l.is_ascii())
        .map(str::to_string)
        .collect()
}

// ---------------------------------------------------------------------------------------------
// count: text
// ---------------------------------------------------------------------------------------------

#[test]
fn count_text_report_for_cpfe_co2me() {
    let s = Scratch::new("text");
    let r = s.run(&["count", "CpFe(CO)2Me"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    for want in ["18 e", "saturated", "oxidation state +2", "d6", "[FeL4X2]"] {
        assert!(r.stdout.contains(want), "missing {want:?}\n{}", r.show());
    }
    assert!(r.stdout.contains("CpFe(CO)2Me"), "echoes the input");
    assert!(!r.stderr.contains("warning"), "{}", r.show());
}

// ---------------------------------------------------------------------------------------------
// count: JSON
// ---------------------------------------------------------------------------------------------

const REPORT_FIELDS: &[&str] = &[
    "schema",
    "input",
    "formula",
    "charge",
    "metals",
    "metal_metal_bonds",
    "cluster_valence_electrons",
    "polyhedron",
    "geometry",
    "unpaired_electrons",
    "spin_only_moment_bm",
    "spin_ambiguous",
    "cautions",
    "notes",
];

const METAL_FIELDS: &[&str] = &[
    "symbol",
    "electron_count",
    "ionic_electron_count",
    "oxidation_state",
    "d_electrons",
    "coordination_number",
    "cbc_class",
    "equivalent_neutral_class",
    "valence_number",
    "ligand_bond_number",
    "saturation",
    "electrons_short",
    "open_sites",
    "contributions",
    "notes",
];

/// Fields a step's JSON line adds to the product's report.
const STEP_FIELDS: &[&str] = &[
    "step",
    "product",
    "changes",
    "equation",
    "equation_text",
    "step_notes",
    "composition",
];

const SPECIES_FIELDS: &[&str] = &["name", "formula", "smiles", "charge", "count"];

const ERROR_FIELDS: &[&str] = &["schema", "input", "error", "column", "suggestion"];

fn check_report(v: &Value, input: &str) {
    for f in REPORT_FIELDS {
        assert!(has(v, f), "report lacks {f:?}: {v}");
    }
    assert_eq!(v["schema"], 1, "{v}");
    assert_eq!(v["input"], input, "{v}");
    let metals = v["metals"].as_array().expect("metals is an array");
    assert!(!metals.is_empty());
    for m in metals {
        for f in METAL_FIELDS {
            assert!(has(m, f), "metal lacks {f:?}: {m}");
        }
        let sat = m["saturation"].as_str().expect("saturation is a string");
        assert!(
            ["saturated", "unsaturated", "above_18", "not_applicable"].contains(&sat),
            "saturation {sat:?}"
        );
        assert!(m["contributions"].is_array());
        assert!(m["notes"].is_array());
    }
    assert!(v["unpaired_electrons"].is_array());
    assert!(v["spin_only_moment_bm"].is_array());
    assert!(v["spin_ambiguous"].is_boolean());
    assert!(v["cautions"].is_array());
    assert!(v["notes"].is_array());
}

fn check_error(v: &Value, input: &str) {
    for f in ERROR_FIELDS {
        assert!(has(v, f), "error line lacks {f:?}: {v}");
    }
    assert_eq!(v["schema"], 1, "{v}");
    assert_eq!(v["input"], input, "{v}");
    assert!(v["error"].as_str().is_some_and(|e| !e.is_empty()), "{v}");
    assert!(v["column"].as_u64().is_some_and(|c| c >= 1), "{v}");
}

#[test]
fn count_json_two_formulas_two_lines() {
    let s = Scratch::new("json2");
    let r = s.run(&["count", "--json", "Mn2(CO)10", "[PtCl4]2-"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    assert_eq!(r.stdout.lines().count(), 2, "{}", r.show());
    let lines = r.json_lines();
    check_report(&lines[0], "Mn2(CO)10");
    check_report(&lines[1], "[PtCl4]2-");
    assert_eq!(lines[0]["metals"].as_array().unwrap().len(), 2);
    assert_eq!(lines[1]["charge"], -2);
    assert_eq!(lines[1]["metals"][0]["electron_count"], 16);
    assert_eq!(lines[1]["metals"][0]["saturation"], "saturated");
    assert!(r.stdout.contains("\"schema\":1"));
}

#[test]
fn count_json_failed_formula_gives_error_object() {
    let s = Scratch::new("jsonerr");
    let r = s.run(&["count", "--json", "Fe(CO)5", "Fe(CO)4Xyz"]);
    assert_eq!(r.code, Some(2), "{}", r.show());
    let lines = r.json_lines();
    assert_eq!(lines.len(), 2, "{}", r.show());
    check_report(&lines[0], "Fe(CO)5");
    check_error(&lines[1], "Fe(CO)4Xyz");
}

// ---------------------------------------------------------------------------------------------
// ligands: JSON
// ---------------------------------------------------------------------------------------------

const LIGAND_FIELDS: &[&str] = &[
    "schema",
    "key",
    "name",
    "formula",
    "aliases",
    "family",
    "cone_angle_deg",
    "cone_angle_source",
    "tep_cm1",
    "tep_source",
    "modes",
    "hazards",
    "hazard_source",
    "notes",
    "origin",
];

#[test]
fn ligands_pme3_json() {
    let s = Scratch::new("pme3");
    let r = s.run(&["ligands", "PMe3", "--json"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    let lines = r.json_lines();
    let first = &lines[0];
    assert_eq!(first["schema"], 1);
    assert_eq!(first["key"], "PMe3");
    // Tolman, Chem. Rev. 1977, 77, 313: cone angle 118°, TEP 2064.1 cm-1
    assert_eq!(first["cone_angle_deg"].as_f64(), Some(118.0));
    assert_eq!(first["tep_cm1"].as_f64(), Some(2064.1));
    assert!(first["aliases"].is_array(), "{first}");
    assert!(first["cone_angle_source"].as_str().is_some());
}

#[test]
fn ligands_json_lines_have_documented_fields_with_nulls() {
    let s = Scratch::new("ligjson");
    let r = s.run(&["ligands", "--json"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    let lines = r.json_lines();
    assert!(lines.len() >= 150, "only {} ligands", lines.len());
    let mut null_cone = 0;
    let mut null_tep = 0;
    for v in &lines {
        for f in LIGAND_FIELDS {
            assert!(has(v, f), "ligand line lacks {f:?}: {v}");
        }
        assert_eq!(v["schema"], 1);
        assert!(v["key"].as_str().is_some_and(|k| !k.is_empty()), "{v}");
        assert!(v["aliases"].is_array(), "{v}");
        assert!(v["modes"].as_array().is_some_and(|m| !m.is_empty()), "{v}");
        assert!(v["hazards"].is_array(), "{v}");
        for (value, source) in [
            ("cone_angle_deg", "cone_angle_source"),
            ("tep_cm1", "tep_source"),
        ] {
            match (&v[value], &v[source]) {
                (Value::Null, Value::Null) => {}
                (Value::Number(_), Value::String(src)) if !src.is_empty() => {}
                (a, b) => panic!("{}: {value} = {a}, {source} = {b}", v["key"]),
            }
        }
        null_cone += usize::from(v["cone_angle_deg"].is_null());
        null_tep += usize::from(v["tep_cm1"].is_null());
    }
    assert!(null_cone > 0, "unknown cone angles are written as null");
    assert!(null_tep > 0, "unknown TEPs are written as null");
}

// ---------------------------------------------------------------------------------------------
// Batches
// ---------------------------------------------------------------------------------------------

/// Good lines 1, 6, 8; blank lines 2, 5; comments 3, 9; bad lines 4, 7.
const BATCH: &str =
    "Fe(CO)5\n\n# a comment\nFe(CO)4Xyz\n   \nNi(CO)4\n)(\n[Co(NH3)6]3+\n  # indented comment\n";

#[test]
fn batch_json_counts_good_lines_and_reports_bad_ones() {
    let s = Scratch::new("batch");
    let file = s.write("batch.txt", BATCH.as_bytes());
    let r = s.run(&["count", "--json", "--batch", file.to_str().unwrap()]);
    assert_eq!(r.code, Some(2), "{}", r.show());
    let lines = r.json_lines();
    assert_eq!(lines.len(), 5, "3 results and 2 errors\n{}", r.show());
    check_report(&lines[0], "Fe(CO)5");
    check_error(&lines[1], "Fe(CO)4Xyz");
    check_report(&lines[2], "Ni(CO)4");
    check_error(&lines[3], ")(");
    check_report(&lines[4], "[Co(NH3)6]3+");
    assert!(r.stderr.contains("line 4"), "{}", r.show());
    assert!(r.stderr.contains("line 7"), "{}", r.show());
    assert!(
        !r.stderr.contains("line 3"),
        "comments are skipped\n{}",
        r.show()
    );
}

#[test]
fn batch_text_counts_good_lines() {
    let s = Scratch::new("batchtext");
    let file = s.write("batch.txt", BATCH.as_bytes());
    let r = s.run(&["count", "--batch", file.to_str().unwrap()]);
    assert_eq!(r.code, Some(2), "{}", r.show());
    assert_eq!(r.stdout.matches("(as typed: ").count(), 3, "{}", r.show());
    assert!(r.stderr.contains("line 4"), "{}", r.show());
    assert!(r.stderr.contains("line 7"), "{}", r.show());
}

#[test]
fn batch_of_good_lines_exits_zero() {
    let s = Scratch::new("batchok");
    let file = s.write("ok.txt", b"# header\nFe(CO)5\n\nNi(CO)4\n");
    let r = s.run(&["count", "--json", "--batch", file.to_str().unwrap()]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    assert_eq!(r.json_lines().len(), 2);
    assert!(r.stderr.is_empty(), "{}", r.show());
}

#[test]
fn batch_from_stdin() {
    let s = Scratch::new("stdin");
    // no newline after the last line
    let r = s.run_stdin(
        &["count", "--json", "--batch", "-"],
        b"Fe(CO)5\n# comment\n\nNi(CO)4",
    );
    assert_eq!(r.code, Some(0), "{}", r.show());
    let lines = r.json_lines();
    assert_eq!(lines.len(), 2, "{}", r.show());
    check_report(&lines[0], "Fe(CO)5");
    check_report(&lines[1], "Ni(CO)4");
}

#[test]
fn batch_from_stdin_with_bad_line() {
    let s = Scratch::new("stdinbad");
    let r = s.run_stdin(&["count", "--batch", "-"], b"Fe(CO)5\nFe(CO)4Xyz\n");
    assert_eq!(r.code, Some(2), "{}", r.show());
    assert!(r.stderr.contains("line 2"), "{}", r.show());
    assert_eq!(r.stdout.matches("(as typed: ").count(), 1, "{}", r.show());
}

#[test]
fn missing_batch_file_exits_one_naming_the_path() {
    let s = Scratch::new("missing");
    let path = s.path().join("no-such-dir").join("formulas.txt");
    let p = path.to_str().unwrap();
    let r = s.run(&["count", "--batch", p]);
    assert_eq!(r.code, Some(1), "{}", r.show());
    assert!(
        r.stderr.contains(p),
        "the error names the path\n{}",
        r.show()
    );
    assert!(r.stdout.is_empty(), "{}", r.show());
}

const NOT_UTF8_BATCH: &[u8] = b"Fe(CO)5\nFe(CO)\xff\xfe4\nNi(CO)4\n";

#[test]
fn batch_line_with_non_utf8_bytes_is_an_error_and_others_count() {
    let s = Scratch::new("utf8");
    let file = s.write("latin1.txt", NOT_UTF8_BATCH);
    let r = s.run(&["count", "--batch", file.to_str().unwrap()]);
    assert_eq!(r.code, Some(2), "{}", r.show());
    assert!(r.stderr.contains("line 2"), "{}", r.show());
    assert_eq!(r.stdout.matches("(as typed: ").count(), 2, "{}", r.show());
    assert!(r.stdout.contains("Fe(CO)5") && r.stdout.contains("Ni(CO)4"));
}

#[test]
fn batch_line_with_non_utf8_bytes_gets_a_json_error_object() {
    // README: "A formula that fails gives {"schema", "input", "error", "column", "suggestion"}";
    // a script pairing output lines with input lines needs one line per formula.
    let s = Scratch::new("utf8json");
    let file = s.write("latin1.txt", NOT_UTF8_BATCH);
    let r = s.run(&["count", "--json", "--batch", file.to_str().unwrap()]);
    assert_eq!(r.code, Some(2), "{}", r.show());
    let lines = r.json_lines();
    assert_eq!(
        lines.len(),
        3,
        "two results and one error object expected\n{}",
        r.show()
    );
    check_report(&lines[0], "Fe(CO)5");
    assert!(has(&lines[1], "error"), "{}", lines[1]);
    check_report(&lines[2], "Ni(CO)4");
}

#[test]
fn batch_file_with_crlf_line_endings() {
    let s = Scratch::new("crlf");
    let file = s.write("dos.txt", b"Fe(CO)5\r\n# comment\r\n\r\nNi(CO)4\r\n");
    let r = s.run(&["count", "--json", "--batch", file.to_str().unwrap()]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    let lines = r.json_lines();
    assert_eq!(lines.len(), 2, "{}", r.show());
    check_report(&lines[0], "Fe(CO)5");
    check_report(&lines[1], "Ni(CO)4");
}

#[test]
fn batch_file_starting_with_a_utf8_byte_order_mark() {
    // Editors and spreadsheets on Windows save "UTF-8" text with a leading BOM (EF BB BF); the
    // first formula should still count.
    let s = Scratch::new("bom");
    let file = s.write("bom.txt", b"\xef\xbb\xbfFe(CO)5\nNi(CO)4\n");
    let r = s.run(&["count", "--json", "--batch", file.to_str().unwrap()]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    let lines = r.json_lines();
    assert_eq!(lines.len(), 2, "{}", r.show());
    check_report(&lines[0], "Fe(CO)5");
}

// ---------------------------------------------------------------------------------------------
// Usage errors
// ---------------------------------------------------------------------------------------------

#[test]
fn count_without_formula_exits_two_with_a_hint() {
    let s = Scratch::new("noformula");
    let r = s.run(&["count"]);
    assert_eq!(r.code, Some(2), "{}", r.show());
    assert!(r.stderr.contains("no formula"), "{}", r.show());
    assert!(r.stderr.contains("nonet count"), "a hint\n{}", r.show());
    assert!(r.stdout.is_empty());
}

#[test]
fn unknown_subcommand_exits_two() {
    let s = Scratch::new("badcmd");
    let r = s.run(&["frobnicate"]);
    assert_eq!(r.code, Some(2), "{}", r.show());
    assert!(r.stderr.contains("frobnicate"), "{}", r.show());
}

#[test]
fn unknown_flag_exits_two() {
    let s = Scratch::new("badflag");
    for args in [
        &["--frobnicate", "count", "Fe(CO)5"][..],
        &["ligands", "--frobnicate"][..],
        &["count", "--frobnicate", "Fe(CO)5"][..],
    ] {
        let r = s.run(args);
        assert_eq!(r.code, Some(2), "{args:?}\n{}", r.show());
        assert!(r.stderr.contains("--frobnicate"), "{args:?}\n{}", r.show());
    }
}

#[test]
fn unknown_count_flag_is_reported_as_a_flag_not_counted_as_a_formula() {
    // `nonet count --jsn X` is a typo for --json: it should be refused as an unknown option
    // (like every other unknown flag), not read as a formula while X is counted as text.
    let s = Scratch::new("badcountflag");
    let r = s.run(&["count", "--jsn", "Fe(CO)5"]);
    assert_eq!(r.code, Some(2), "{}", r.show());
    assert!(
        r.stdout.is_empty(),
        "nothing is counted after a usage error\n{}",
        r.show()
    );
    assert!(
        !r.stderr.contains("unexpected character '-'"),
        "the flag is reported as a formula\n{}",
        r.show()
    );
}

#[test]
fn count_options_after_formulas_are_options() {
    // `nonet count 'Fe(CO)5' --json` is ordinary command-line order; the flag must not be
    // taken for a second formula.
    let s = Scratch::new("flagorder");
    let r = s.run(&["count", "Fe(CO)5", "--json"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    let lines = r.json_lines();
    assert_eq!(lines.len(), 1, "{}", r.show());
    check_report(&lines[0], "Fe(CO)5");

    let r = s.run_stdin(
        &["count", "--json", "Ni(CO)4", "--batch", "-"],
        b"Fe(CO)5\n",
    );
    assert_eq!(r.code, Some(0), "{}", r.show());
    let lines = r.json_lines();
    assert_eq!(lines.len(), 2, "{}", r.show());
    check_report(&lines[0], "Ni(CO)4");
    check_report(&lines[1], "Fe(CO)5");
}

#[test]
fn unknown_ligand_error_shows_formula_and_caret() {
    let s = Scratch::new("caret");
    let formula = "Fe(CO)4Xyz";
    let r = s.run(&["count", formula]);
    assert_eq!(r.code, Some(2), "{}", r.show());
    let lines: Vec<&str> = r.stderr.lines().collect();
    let i = lines
        .iter()
        .position(|l| l.trim_end().ends_with(formula) && !l.contains("error"))
        .unwrap_or_else(|| panic!("the formula is not echoed on its own line\n{}", r.show()));
    let formula_line = lines[i];
    let caret_line = lines
        .get(i + 1)
        .unwrap_or_else(|| panic!("no line under the formula\n{}", r.show()));
    let token_col = formula_line.find("Xyz").unwrap();
    let caret_col = caret_line
        .find('^')
        .unwrap_or_else(|| panic!("no caret\n{}", r.show()));
    assert_eq!(
        caret_col,
        token_col,
        "the caret is not under 'Xyz'\n{}",
        r.show()
    );
    assert_eq!(caret_line.trim().chars().filter(|&c| c == '^').count(), 3);
    assert!(r.stderr.contains("Xyz"));
}

// ---------------------------------------------------------------------------------------------
// ASCII output
// ---------------------------------------------------------------------------------------------

#[test]
fn ascii_flag_prints_only_ascii() {
    let s = Scratch::new("ascii");
    let r = s.run(&["--ascii", "count", "(η5-C5H5)2Fe"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    assert!(r.stdout.contains("eta5"), "{}", r.show());
    let bad = non_ascii(&r.raw_stdout);
    assert!(
        bad.is_empty(),
        "non-ASCII lines with --ascii:\n{}",
        bad.join("\n")
    );
}

#[test]
fn ascii_flag_with_ascii_input_prints_only_ascii() {
    let s = Scratch::new("ascii2");
    let r = s.run(&["--ascii", "count", "(eta5-C5H5)2Fe", "CpFe(CO)2Me"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    assert!(r.stdout.contains("eta5"), "{}", r.show());
    let bad = non_ascii(&r.raw_stdout);
    assert!(
        bad.is_empty(),
        "non-ASCII lines with --ascii:\n{}",
        bad.join("\n")
    );
}

#[test]
fn non_utf8_locale_prints_only_ascii() {
    let s = Scratch::new("langc");
    for lang in [Some("C"), None] {
        let out = s
            .cmd_lang(lang)
            .args(["count", "(eta5-C5H5)2Fe"])
            .output()
            .expect("run nonet");
        let r = Run::from(out);
        assert_eq!(r.code, Some(0), "LANG={lang:?}\n{}", r.show());
        assert!(
            r.stdout.contains("eta5"),
            "LANG={lang:?}: eta spelled out\n{}",
            r.show()
        );
        assert!(!r.stdout.contains('η'), "LANG={lang:?}\n{}", r.show());
        let bad = non_ascii(&r.raw_stdout);
        assert!(
            bad.is_empty(),
            "LANG={lang:?}: non-ASCII lines:\n{}",
            bad.join("\n")
        );
    }
}

#[test]
fn ascii_flag_ligands_prints_only_ascii() {
    // `--ascii`: "Use ASCII only" (nonet --help); ligand notes carry Greek letters and symbols.
    let s = Scratch::new("asciilig");
    let r = s.run(&["--ascii", "ligands"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    let bad = non_ascii(&r.raw_stdout);
    assert!(
        bad.is_empty(),
        "{} non-ASCII lines with --ascii, e.g.:\n{}",
        bad.len(),
        bad.iter().take(5).cloned().collect::<Vec<_>>().join("\n")
    );
}

#[test]
fn utf8_locale_prints_greek() {
    let s = Scratch::new("utf8lang");
    let r = s.run(&["count", "(eta5-C5H5)2Fe"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    assert!(r.stdout.contains("η5"), "{}", r.show());
}

// ---------------------------------------------------------------------------------------------
// Closed pipes
// ---------------------------------------------------------------------------------------------

fn closed_pipe(json: bool) {
    let s = Scratch::new("pipe");
    let text = "CpFe(CO)2Me\n".repeat(5000);
    let file = s.write("many.txt", text.as_bytes());
    let mut args = vec!["count"];
    if json {
        args.push("--json");
    }
    args.extend(["--batch", file.to_str().unwrap()]);
    let mut child = s
        .cmd()
        .args(&args)
        .stdin(Stdio::null())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("spawn nonet");
    let mut stderr = child.stderr.take().unwrap();
    let err_reader = std::thread::spawn(move || {
        let mut s = String::new();
        let _ = stderr.read_to_string(&mut s);
        s
    });
    {
        let mut out = BufReader::new(child.stdout.take().unwrap());
        let mut first = String::new();
        out.read_line(&mut first).expect("read the first line");
        assert!(first.contains("CpFe(CO)2Me"), "{first:?}");
        // dropping the reader closes the pipe
    }
    let status = child.wait().expect("wait for nonet");
    let err = err_reader.join().unwrap();
    assert_eq!(
        status.code(),
        Some(0),
        "closing the pipe early is not an error (json {json}); stderr:\n{err}"
    );
    let lower = err.to_lowercase();
    assert!(
        !lower.contains("broken pipe") && !lower.contains("os error 32"),
        "stderr mentions the broken pipe:\n{err}"
    );
    assert!(err.is_empty(), "stderr should be empty:\n{err}");
}

#[test]
fn closed_pipe_is_not_an_error_text() {
    closed_pipe(false);
}

#[test]
fn closed_pipe_is_not_an_error_json() {
    closed_pipe(true);
}

// ---------------------------------------------------------------------------------------------
// User ligand sets
// ---------------------------------------------------------------------------------------------

const USER_SET: &str = r#"
[[ligand]]
key = "Qzl"
name = "test amine"
formula = "Qzl"
family = "amine"
field = "medium"

[[ligand.mode]]
label = "κ1"
class = "L"
"#;

#[test]
fn user_ligand_set_is_used_by_count() {
    let s = Scratch::new("userset");
    s.user_set("mine.toml", USER_SET);
    let r = s.run(&["count", "--json", "[Co(Qzl)6]3+"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    assert!(r.stderr.is_empty(), "{}", r.show());
    let v = &r.json_lines()[0];
    check_report(v, "[Co(Qzl)6]3+");
    let m = &v["metals"][0];
    assert_eq!(m["electron_count"], 18, "{v}");
    assert_eq!(m["oxidation_state"], 3, "{v}");
    assert_eq!(m["contributions"][0]["ligand"], "Qzl", "{v}");

    // and the catalogue lists it
    let r = s.run(&["ligands", "Qzl", "--json"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    assert_eq!(r.json_lines()[0]["key"], "Qzl");

    // without the user set the ligand is unknown
    let bare = Scratch::new("nouserset");
    let r = bare.run(&["count", "[Co(Qzl)6]3+"]);
    assert_eq!(r.code, Some(2), "{}", r.show());
}

#[test]
fn user_set_replaces_bundled_entry_in_cli() {
    let s = Scratch::new("userreplace");
    s.user_set(
        "pme3.toml",
        r#"
[[ligand]]
key = "PMe3"
name = "my own trimethylphosphine"
formula = "P(CH3)3"
family = "phosphine"

[[ligand.mode]]
label = "κ1"
class = "L"
"#,
    );
    let r = s.run(&["ligands", "PMe3", "--json"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    let v = &r.json_lines()[0];
    assert_eq!(v["key"], "PMe3");
    assert_eq!(v["name"], "my own trimethylphosphine");
    assert!(v["cone_angle_deg"].is_null());
}

#[test]
fn malformed_user_set_warns_with_location_and_count_still_works() {
    let s = Scratch::new("badset");
    let bad = s.user_set("broken.toml", "[[ligand]]\nkey = \"Bad\"\nname = oops\n");
    s.user_set("mine.toml", USER_SET);
    let r = s.run(&["count", "Fe(CO)5"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    assert!(r.stdout.contains("18 e"), "{}", r.show());
    let prefix = format!("warning: {}:3:", bad.display());
    let line = r
        .stderr
        .lines()
        .find(|l| l.starts_with(&prefix))
        .unwrap_or_else(|| panic!("no line starting {prefix:?}\n{}", r.show()));
    // warning: <path>:<line>:<col>: message
    let col: String = line[prefix.len()..]
        .chars()
        .take_while(char::is_ascii_digit)
        .collect();
    assert!(!col.is_empty(), "no column in {line:?}");
    assert!(
        line[prefix.len() + col.len()..].starts_with(':'),
        "{line:?}"
    );

    // the good user set next to it still loads
    let r = s.run(&["count", "[Co(Qzl)6]3+"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
}

#[test]
fn user_set_with_bad_class_names_key_and_line() {
    let s = Scratch::new("badclass");
    let text = format!("{USER_SET}\n[[ligand]]\nkey = \"Qzb\"\nname = \"bad\"\nformula = \"Qzb\"\nfamily = \"amine\"\n\n[[ligand.mode]]\nlabel = \"κ1\"\nclass = \"LQ\"\n");
    let class_line = text.lines().position(|l| l.contains("\"LQ\"")).unwrap() + 1;
    let path = s.user_set("mixed.toml", &text);
    let r = s.run(&["count", "[Co(Qzl)6]3+"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    let prefix = format!("warning: {}:{class_line}:", path.display());
    let line = r
        .stderr
        .lines()
        .find(|l| l.starts_with(&prefix))
        .unwrap_or_else(|| panic!("no line starting {prefix:?}\n{}", r.show()));
    assert!(line.contains("Qzb"), "{line}");
}

#[test]
fn ligands_paths_shows_the_config_dir() {
    let s = Scratch::new("paths");
    let r = s.run(&["ligands", "--paths"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    let want = s.config().join("ligand_sets");
    assert!(
        r.stdout.contains(&want.display().to_string()),
        "{}",
        r.show()
    );
}

#[test]
fn count_json_gives_the_composition() {
    // Wilkinson's catalyst is C54H45ClP3Rh (Hill formula; e.g. the supplier catalogues'
    // listing of chlorotris(triphenylphosphine)rhodium(I), common practice)
    let s = Scratch::new("composition");
    let r = s.run(&["count", "--json", "RhCl(PPh3)3", "[Co(NH3)6]Cl3"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    let lines = r.json_lines();
    assert_eq!(lines[0]["composition"], "C54H45ClP3Rh");
    // counter-ions are not part of the complex ion
    assert_eq!(lines[1]["composition"], "CoH18N6");
}

#[test]
fn step_json_lines_carry_the_equation() {
    let s = Scratch::new("stepjson");
    let r = s.run(&[
        "step",
        "--json",
        "[PdCl4]2-",
        "substitution Cl C2H4",
        "dissociation Cl",
    ]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    let lines = r.json_lines();
    // one line per step, then the path's closing line
    assert_eq!(lines.len(), 3, "{}", r.show());
    let closing = &lines[2];
    for f in [
        "schema",
        "input",
        "path",
        "closed",
        "closed_at",
        "net",
        "net_text",
    ] {
        assert!(has(closing, f), "closing line lacks {f:?}: {closing}");
    }
    assert_eq!(closing["closed"], false);
    assert_eq!(closing["path"].as_array().map(Vec::len), Some(3));
    for v in &lines[..2] {
        for f in STEP_FIELDS {
            assert!(has(v, f), "step line lacks {f:?}: {v}");
        }
        for side in ["enters", "leaves"] {
            for sp in v["equation"][side].as_array().expect("a list") {
                for f in SPECIES_FIELDS {
                    assert!(has(sp, f), "species lacks {f:?}: {sp}");
                }
            }
        }
    }
    let first = &lines[0];
    assert_eq!(first["equation"]["enters"][0]["formula"], "C2H4");
    assert_eq!(first["equation"]["leaves"][0]["formula"], "Cl");
    assert_eq!(first["equation"]["leaves"][0]["charge"], -1);
    assert_eq!(first["equation"]["leaves"][0]["smiles"], "[Cl-]");
    assert_eq!(first["charge"], -1);
    assert_eq!(first["composition"], "C2H4Cl3Pd");
    assert_eq!(first["metals"][0]["oxidation_state"], 2);
    // the readable report prints the equation in one line
    let r = s.run(&["step", "[PdCl4]2-", "substitution Cl C2H4"]);
    assert!(
        r.stdout
            .contains("[PdCl4]2- + C2H4 -> [Pd(η2-C2H4)Cl3]- + Cl-"),
        "{}",
        r.show()
    );
}

#[test]
fn step_cautions_name_what_enters_and_defer_to_the_sds() {
    let s = Scratch::new("stephaz");
    let r = s.run(&["step", "IrCl(CO)(PPh3)2", "oxidative-addition MeI"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    assert!(r.stdout.contains("MeI entering: H301"), "{}", r.show());
    assert!(r.stdout.contains("safety data sheet"), "{}", r.show());
    let r = s.run(&[
        "step",
        "--json",
        "IrCl(CO)(PPh3)2",
        "oxidative-addition MeI",
    ]);
    let v = &r.json_lines()[0];
    assert!(v["equation"]["enters"][0]["ghs"]
        .as_array()
        .is_some_and(|a| a.iter().any(|x| x == "H351")));
}

#[test]
fn unreadable_reagents_are_refused_with_the_ways_to_write_them() {
    let s = Scratch::new("badreagent");
    let r = s.run(&["step", "Pd(PPh3)2", "oxidative-addition Qx7"]);
    assert_eq!(r.code, Some(2), "{}", r.show());
    assert!(
        r.stderr.contains("A-B") && r.stderr.contains("SMILES"),
        "{}",
        r.show()
    );
    let r = s.run(&["ligands", "--substrates", "boronic"]);
    assert_eq!(r.code, Some(0), "{}", r.show());
    assert!(r.stdout.contains("PhB(OH)2"), "{}", r.show());
}

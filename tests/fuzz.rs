//! The fuzz campaign, run before an issue is closed (ignored in the normal test run; see
//! `benches/fuzz_campaign.sh`): NONET_FUZZ_N generated inputs per CLI verb (default 10^6),
//! mutated from a corpus of real formulas, steps and queries with pasted-PDF Unicode, control
//! characters, deep nesting and long runs. Each verb's work goes through the same library calls
//! the CLI makes; `count` also runs whole through `nonet count --batch`. It reports panics (with
//! the input), the slowest input of each verb (a hang shows as seconds), and the peak memory.

mod common;

use std::panic::{catch_unwind, AssertUnwindSafe};
use std::time::{Duration, Instant};

use nonet::chem::screen::{screen, Constraints, Rank};
use nonet::chem::steps::{self, Step};
use nonet::chem::{count, parse};

/// xorshift64*: reproducible inputs from a seed.
struct Rng(u64);

impl Rng {
    fn next(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545_f491_4f6c_dd1d)
    }
    fn below(&mut self, n: usize) -> usize {
        (self.next() % n.max(1) as u64) as usize
    }
    fn pick<'a, T>(&mut self, items: &'a [T]) -> &'a T {
        &items[self.below(items.len())]
    }
}

/// Characters a paste or a hostile file brings.
const ODD: &[&str] = &[
    "(",
    ")",
    "[",
    "]",
    "{",
    "}",
    "-",
    "+",
    "2",
    "3",
    "10",
    "999999999999",
    "η",
    "κ",
    "μ",
    "µ",
    "η⁵",
    "κ²",
    "μ₃",
    "²⁺",
    "⁻",
    "₂",
    "\u{2212}",
    "\u{2013}",
    "·",
    "•",
    "\u{a0}",
    "\u{200b}",
    "\u{1b}[2J",
    "\u{7}",
    "\r",
    "\t",
    "\u{0}",
    "\u{feff}",
    "𝜂",
    "中",
    "🧪",
    " ",
    ",",
    ";",
    "=",
    "#",
    "*",
    "/",
    "\\",
    "'",
    "\"",
    "cis-",
    "trans-",
    "fac-",
    "(R,R)-",
    "Δ-",
    "·THF",
    "(BF4)2",
    "Cu(I)",
    "Fe(III)",
    "{C=C}",
    "{[Na+].[Cl-]}",
    "x",
    "H",
    "Me",
    "Ph",
    "Cl",
    "CO",
    "PPh3",
];

fn mutate(rng: &mut Rng, seeds: &[String]) -> String {
    let mut s: Vec<char> = rng.pick(seeds).chars().collect();
    for _ in 0..=rng.below(4) {
        let at = rng.below(s.len() + 1);
        match rng.below(7) {
            0 | 1 => {
                let ins: Vec<char> = rng.pick(ODD).chars().collect();
                s.splice(at..at, ins);
            }
            2 if !s.is_empty() => {
                let end = (at + 1 + rng.below(4)).min(s.len());
                s.drain(at.min(end)..end);
            }
            3 => {
                let other: Vec<char> = rng.pick(seeds).chars().collect();
                let cut = rng.below(other.len() + 1);
                s.splice(at..at, other[..cut].iter().copied());
            }
            4 => {
                // nesting and repetition
                let n = 1 + rng.below(200);
                let wrap = rng.below(2) == 0;
                let body: String = s.iter().collect();
                s = if wrap {
                    format!("{}{body}{}", "(".repeat(n), ")".repeat(n))
                } else {
                    body.repeat(n.min(40))
                }
                .chars()
                .collect();
            }
            5 => {
                let n = rng.below(6);
                let digits = rng
                    .pick(&["0", "1", "9", "99", "4294967296", "-1"])
                    .to_string();
                for _ in 0..n {
                    let p = rng.below(s.len() + 1);
                    s.splice(p..p, digits.chars());
                }
            }
            _ => s.reverse(),
        }
        if s.len() > 4000 {
            s.truncate(4000);
        }
    }
    s.into_iter().collect()
}

/// What one verb did over the campaign.
#[derive(Default)]
struct Tally {
    runs: usize,
    panics: Vec<String>,
    slowest: (Duration, String),
}

impl Tally {
    fn run(&mut self, input: &str, f: impl FnOnce()) {
        let t = Instant::now();
        let r = catch_unwind(AssertUnwindSafe(f));
        let dt = t.elapsed();
        self.runs += 1;
        if r.is_err() && self.panics.len() < 20 {
            self.panics.push(input.to_string());
        }
        if dt > self.slowest.0 {
            self.slowest = (dt, input.chars().take(120).collect());
        }
    }

    fn report(&self, verb: &str) -> String {
        format!(
            "{verb:<8} {:>9} inputs  {:>3} panics  slowest {:>8.3} ms: {:?}",
            self.runs,
            self.panics.len(),
            self.slowest.0.as_secs_f64() * 1e3,
            self.slowest.1
        )
    }
}

/// The whole `nonet count --json --batch` on the generated lines: no crash (exit 0 or 2), one
/// JSON line per formula line, and its wall time and peak memory.
fn count_through_the_binary(formulas: &[String]) -> String {
    let s = common::cli::Scratch::new("fuzz");
    let mut text = String::new();
    let mut expected = 0usize;
    for f in formulas {
        let one = f.replace('\n', " ");
        let t = one.trim();
        if !t.is_empty() && !t.starts_with('#') {
            expected += 1;
        }
        text.push_str(&one);
        text.push('\n');
    }
    let file = s.write("fuzz.txt", text.as_bytes());
    let timer = Instant::now();
    let mut cmd = if std::path::Path::new("/usr/bin/time").exists() {
        let mut c = std::process::Command::new("/usr/bin/time");
        c.args(["-f", "peak %M KiB"]).arg(common::cli::BIN);
        c
    } else {
        std::process::Command::new(common::cli::BIN)
    };
    let out = cmd
        .env("NONET_CONFIG_DIR", s.config())
        .args(["count", "--json", "--batch"])
        .arg(&file)
        .output()
        .expect("run nonet");
    let wall = timer.elapsed();
    let code = out.status.code();
    assert!(
        matches!(code, Some(0) | Some(2)),
        "nonet count --batch ended with {code:?}"
    );
    // one JSON line per formula line, or two for a salt of two complex ions (each with "ion")
    let lines: Vec<&[u8]> = out
        .stdout
        .split(|&b| b == b'\n')
        .filter(|l| !l.is_empty())
        .collect();
    let ions = lines
        .iter()
        .filter(|l| l.windows(6).any(|w| w == b"\"ion\":"))
        .count();
    assert_eq!(ions % 2, 0, "the ions of a salt come in pairs");
    assert_eq!(
        lines.len() - ions / 2,
        expected,
        "one JSON line per formula line"
    );
    // asking for the formula and charge alone skips the count: the same lines, the same
    // refusals in the same words
    let light = std::process::Command::new(common::cli::BIN)
        .env("NONET_CONFIG_DIR", s.config())
        .args([
            "count",
            "--json",
            "--fields",
            "input,formula,charge",
            "--batch",
        ])
        .arg(&file)
        .output()
        .expect("run nonet");
    assert_eq!(light.status.code(), code, "--fields input,formula,charge");
    let light_lines = light
        .stdout
        .split(|&b| b == b'\n')
        .filter(|l| !l.is_empty());
    assert_eq!(
        light_lines.count(),
        lines.len(),
        "--fields: one line per line"
    );
    let stderr = String::from_utf8_lossy(&out.stderr);
    // (what /usr/bin/time adds is left out)
    let timed = stderr
        .lines()
        .filter(|l| !l.starts_with("peak ") && !l.starts_with("Command exited with"))
        .collect::<Vec<_>>();
    let light_err = String::from_utf8_lossy(&light.stderr);
    let first_difference = timed
        .iter()
        .copied()
        .zip(light_err.lines())
        .find(|(a, b)| a != b);
    assert!(
        first_difference.is_none() && timed.len() == light_err.lines().count(),
        "--fields input,formula,charge refuses other lines than the full count: {first_difference:?}"
    );
    let peak = stderr
        .lines()
        .rev()
        .find(|l| l.starts_with("peak "))
        .unwrap_or("peak unknown");
    format!(
        "count --batch (the binary) {} lines in {:.2} s, exit {code:?}, {peak}",
        formulas.len(),
        wall.as_secs_f64()
    )
}

fn peak_memory_kib() -> Option<u64> {
    let status = std::fs::read_to_string("/proc/self/status").ok()?;
    status
        .lines()
        .find_map(|l| l.strip_prefix("VmHWM:"))
        .and_then(|v| v.split_whitespace().next()?.parse().ok())
}

fn inputs() -> usize {
    std::env::var("NONET_FUZZ_N")
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(1_000_000)
}

fn corpus() -> Vec<String> {
    let cat = common::cat();
    // the literature sample the benchmarks use, and more shapes
    let mut seeds: Vec<String> = include_str!("../benches/sample_formulas.txt")
        .lines()
        .chain([
            "[Cp2Co][PF6]",
            "Ni(cod)2",
            "Cp*2Sc(nPr)",
            "Pd(PPh3)2Br(Ph)",
            "[Cp2ZrMe]+",
            "Fe(CO)5",
            "Pd(OAc)2",
            "[Cu(NCMe)4]BF4",
        ])
        .map(|s| s.to_string())
        .collect();
    seeds.extend(
        cat.ligands()
            .iter()
            .take(120)
            .map(|l| format!("Pd({})2Cl2", l.key)),
    );
    seeds
}

#[test]
#[ignore = "the fuzz campaign: benches/fuzz_campaign.sh"]
fn fuzz_campaign() {
    let n = inputs();
    let cat = common::cat();
    let seeds = corpus();
    let mut rng = Rng(0x9e37_79b9_7f4a_7c15);
    let mut lines = Vec::new();

    // count: the parse and count every `nonet count` makes
    let mut t = Tally::default();
    let mut formulas = Vec::with_capacity(n.min(1 << 20));
    for _ in 0..n {
        let f = mutate(&mut rng, &seeds);
        t.run(&f, || {
            if let Ok(c) = parse(&f, cat) {
                let r = count(&c);
                let _ = serde_json::to_string(&r);
                let _ = c.formula(true);
            }
        });
        if formulas.len() < 1 << 20 {
            formulas.push(f);
        }
    }
    lines.push(t.report("count"));
    let count_panics = t.panics;
    lines.push(count_through_the_binary(&formulas));

    // step: a step word with ligand, group and reagent arguments on a parsed start
    let words: Vec<&str> = steps::STEP_WORDS.iter().map(|(w, _, _)| *w).collect();
    let args: Vec<String> = cat
        .ligands()
        .iter()
        .take(80)
        .map(|l| l.key.clone())
        .chain(cat.substrates().iter().map(|s| s.key.clone()))
        .chain(["1,2", "2,1", "3", "H", "Me", "Ph", "Cl"].map(String::from))
        .collect();
    let starts: Vec<_> = seeds.iter().filter_map(|s| parse(s, cat).ok()).collect();
    let mut t = Tally::default();
    for _ in 0..n {
        let mut text = rng.pick(&words).to_string();
        for _ in 0..rng.below(4) {
            text.push(' ');
            let a: &String = rng.pick(&args);
            text.push_str(a);
        }
        if rng.below(4) == 0 {
            text = mutate(&mut rng, &[text]);
        }
        let start = rng.pick(&starts);
        t.run(&text, || {
            if let Ok(step) = Step::parse(&text) {
                if let Ok(o) = steps::take(start, &step, cat) {
                    let _ = o.equation_text();
                }
            }
        });
    }
    lines.push(t.report("step"));
    let step_panics = t.panics;

    // screen: a formula and sites (most mutated formulas are refused early; valid ones rank
    // the catalogue)
    let mut t = Tally::default();
    let screens = (n / 100).max(1000);
    for _ in 0..screens {
        let f = if rng.below(3) == 0 {
            rng.pick(&seeds).clone()
        } else {
            mutate(&mut rng, &seeds)
        };
        t.run(&f, || {
            if let Ok(c) = parse(&f, cat) {
                let slots = c.slots();
                if let Some(&s) = slots.first() {
                    let _ = screen(
                        &c,
                        &[s],
                        cat.ligands(),
                        &Constraints::default(),
                        Rank::Electrons,
                        3,
                        None,
                    );
                }
            }
        });
    }
    lines.push(t.report("screen"));
    let screen_panics = t.panics;

    // ligands: the catalogue search and suggestions every `nonet ligands QUERY` runs
    let mut t = Tally::default();
    for _ in 0..n {
        let q = mutate(&mut rng, &args);
        t.run(&q, || {
            let _ = cat.search(&q);
        });
    }
    lines.push(t.report("ligands"));
    let ligand_panics = t.panics;

    let peak = peak_memory_kib().map_or("unknown".into(), |k| format!("{} MiB", k / 1024));
    println!("fuzz campaign: {n} inputs per verb (screen: {screens}); peak memory {peak}");
    for l in &lines {
        println!("  {l}");
    }
    for (verb, p) in [
        ("count", &count_panics),
        ("step", &step_panics),
        ("screen", &screen_panics),
        ("ligands", &ligand_panics),
    ] {
        assert!(p.is_empty(), "{verb} panicked on: {p:?}");
    }
}

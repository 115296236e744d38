//! The command line: clap definitions at the edge, plain requests inside, text and JSON writers.

mod json;
mod jsonw;
mod text;

use std::io::{self, BufRead, BufWriter, Write};
use std::path::PathBuf;

use anyhow::Context;
use clap::{Parser, Subcommand};

use crate::catalogue::{self, Catalogue};
use crate::chem;

/// Exit statuses, part of the contract with scripts.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Status {
    /// Everything was read and counted.
    Ok,
    /// Something failed that is not the input's fault (I/O, a file that cannot be read).
    Failure,
    /// Some input was rejected; its errors are on stderr, the rest of the results on stdout.
    Rejected,
    /// The planner was ended by signal n - 128 (SIGTERM: 143, SIGHUP: 129, SIGINT: 130).
    Signal(u8),
}

impl Status {
    pub fn code(self) -> u8 {
        match self {
            Status::Ok => 0,
            Status::Failure => 1,
            Status::Rejected => 2,
            Status::Signal(n) => n,
        }
    }
}

#[derive(Debug, Parser)]
#[command(
    name = "nonet",
    version,
    about = "Electron counts, oxidation states and ligand what-ifs for transition-metal complexes",
    after_help = "Formulas are written as in papers: CpFe(CO)2Me, [Co(NH3)6]3+, Rh2(μ-Cl)2(CO)4, \
                  Pd(PtBu3)2. Quote them in the shell."
)]
pub struct Cli {
    /// Use ASCII only: spell out eta, kappa and mu.
    #[arg(long, global = true)]
    pub ascii: bool,

    #[command(subcommand)]
    pub command: Option<Command>,
}

#[derive(Debug, Subcommand)]
pub enum Command {
    /// Open the planner on FORMULA (or on the demo complex): the working complex, the ligand
    /// catalogue and a preview of each swap or edit before it is committed.
    Plan {
        /// The complex to start from, e.g. 'IrCl(CO)(PPh3)2'.
        #[arg(value_name = "FORMULA")]
        formula: Option<String>,
    },
    /// Count electrons under both models, with oxidation state, d count, CBC class, saturation
    /// and spin.
    Count {
        /// One JSON object per formula per line (schema 1).
        #[arg(long)]
        json: bool,
        /// Read formulas from FILE, one per line ('-' for standard input; '#' starts a comment).
        #[arg(long, value_name = "FILE")]
        batch: Option<PathBuf>,
        /// Formulas to count.
        #[arg(value_name = "FORMULA")]
        formulas: Vec<String>,
    },
    /// Take elementary steps from FORMULA, one after another, and report each product.
    Step {
        /// One JSON object per step per line (the count's fields plus step, product, changes).
        #[arg(long)]
        json: bool,
        /// The complex to start from.
        #[arg(value_name = "FORMULA")]
        formula: String,
        /// Steps such as "oxidative-addition H2", "migratory-insertion CO CH3",
        /// "ring-slip Cp 3", "oxidation" (one quoted argument each).
        #[arg(value_name = "STEP", required = true)]
        steps: Vec<String>,
    },
    /// List the ligand catalogue, or search it when QUERY is given.
    Ligands {
        /// Words to match against keys, names, formulas and aliases.
        #[arg(value_name = "QUERY")]
        query: Vec<String>,
        /// One JSON object per ligand per line.
        #[arg(long)]
        json: bool,
        /// Print where user ligand sets are read from, and stop.
        #[arg(long)]
        paths: bool,
    },
}

/// What `count` was asked to do, free of clap types.
pub struct CountRequest {
    pub json: bool,
    pub ascii: bool,
    pub batch: Option<PathBuf>,
    pub formulas: Vec<String>,
}

/// Parse arguments and run; returns the exit status.
pub fn run<I, T>(args: I) -> anyhow::Result<Status>
where
    I: IntoIterator<Item = T>,
    T: Into<std::ffi::OsString> + Clone,
{
    let cli = match Cli::try_parse_from(args) {
        Ok(c) => c,
        Err(e) => {
            let code = e.exit_code();
            e.print().context("writing the usage message")?;
            return Ok(if code == 0 {
                Status::Ok
            } else {
                Status::Rejected
            });
        }
    };
    let ascii = cli.ascii || !utf8_locale();
    match cli.command {
        None => plan(None, ascii),
        Some(Command::Plan { formula }) => plan(formula, ascii),
        Some(Command::Count {
            json,
            batch,
            formulas,
        }) => count(CountRequest {
            json,
            ascii,
            batch,
            formulas,
        }),
        Some(Command::Step {
            json,
            formula,
            steps,
        }) => step(&formula, &steps, json, ascii),
        Some(Command::Ligands { query, json, paths }) => {
            if paths {
                return print_paths();
            }
            ligands(&query.join(" "), json, ascii)
        }
    }
}

/// Open the planner; a formula that does not parse is reported before the screen changes.
fn plan(formula: Option<String>, ascii: bool) -> anyhow::Result<Status> {
    let cat = load_catalogue();
    let (text, title) = match &formula {
        Some(f) => (f.as_str(), f.clone()),
        None => (crate::tui::DEMO_FORMULA, crate::tui::DEMO_TITLE.to_string()),
    };
    let complex = match chem::parse(text, &cat) {
        Ok(c) => c,
        Err(e) => {
            eprintln!("error: {}", e.render());
            return Ok(Status::Rejected);
        }
    };
    let code = crate::tui::run(std::sync::Arc::new(cat), complex, title, ascii)?;
    Ok(match code {
        0 => Status::Ok,
        n => Status::Signal(n),
    })
}

fn load_catalogue() -> Catalogue {
    let cat = Catalogue::with_user_dir(catalogue::user_set_dir().as_deref());
    for w in &cat.warnings {
        eprintln!("warning: {w}");
    }
    cat
}

/// Count formulas from the arguments and/or a batch file.
pub fn count(req: CountRequest) -> anyhow::Result<Status> {
    if req.formulas.is_empty() && req.batch.is_none() {
        eprintln!("error: no formula given\n  try: nonet count 'CpFe(CO)2Me'  or  nonet count --batch FILE");
        return Ok(Status::Rejected);
    }
    let cat = load_catalogue();
    let stdout = io::stdout();
    let mut out = BufWriter::with_capacity(1 << 16, stdout.lock());
    let mut rejected = false;
    let mut counter = Counter {
        cat: &cat,
        json: req.json,
        ascii: req.ascii,
        buf: Vec::with_capacity(1 << 17),
    };
    for f in &req.formulas {
        rejected |= !counter.one(f, None, &mut out)?;
    }
    if let Some(path) = &req.batch {
        let reader: Box<dyn BufRead> = if path.as_os_str() == "-" {
            Box::new(io::BufReader::new(io::stdin().lock()))
        } else {
            let file = std::fs::File::open(path)
                .with_context(|| format!("cannot open batch file {}", path.display()))?;
            Box::new(io::BufReader::with_capacity(1 << 16, file))
        };
        let mut raw: Vec<u8> = Vec::new();
        let mut reader = reader;
        let mut number = 0usize;
        loop {
            raw.clear();
            let n = reader
                .read_until(b'\n', &mut raw)
                .context("reading the batch input")?;
            if n == 0 {
                break;
            }
            number += 1;
            let mut bytes = raw.as_slice();
            if number == 1 {
                // a byte-order mark from a Windows editor or spreadsheet export
                bytes = bytes.strip_prefix(b"\xef\xbb\xbf").unwrap_or(bytes);
            }
            let text = match std::str::from_utf8(bytes) {
                Ok(t) => t,
                Err(_) => {
                    let lossy = String::from_utf8_lossy(bytes);
                    let shown = lossy.trim();
                    eprintln!("error: line {number}: not UTF-8 text: {shown}");
                    if counter.json {
                        counter.flush(&mut out)?;
                        json::write_message(&mut out, shown, "not UTF-8 text")?;
                    }
                    rejected = true;
                    continue;
                }
            };
            let f = text.trim();
            if f.is_empty() || f.starts_with('#') {
                continue;
            }
            rejected |= !counter.one(f, Some(number), &mut out)?;
        }
    }
    counter.flush(&mut out).context("writing results")?;
    out.flush().context("writing results")?;
    Ok(if rejected {
        Status::Rejected
    } else {
        Status::Ok
    })
}

struct Counter<'a> {
    cat: &'a Catalogue,
    json: bool,
    ascii: bool,
    buf: Vec<u8>,
}

impl Counter<'_> {
    /// Write out JSON lines gathered so far (records are batched to save a copy each).
    fn flush(&mut self, out: &mut impl Write) -> io::Result<()> {
        out.write_all(&self.buf)?;
        self.buf.clear();
        Ok(())
    }

    /// Count one formula and write it; false when it was rejected.
    fn one(&mut self, input: &str, line: Option<usize>, out: &mut impl Write) -> io::Result<bool> {
        match chem::parse(input, self.cat) {
            Ok(complex) => {
                let report = chem::count(&complex);
                if let Some(why) = report.impossible() {
                    let place = line.map(|n| format!("line {n}: ")).unwrap_or_default();
                    eprintln!("error: {place}{input}: {why}");
                    if self.json {
                        self.flush(out)?;
                        json::write_message(out, input, &why)?;
                    }
                    return Ok(false);
                }
                if self.json {
                    json::append_report(&mut self.buf, input, &report);
                    if self.buf.len() >= 1 << 16 {
                        out.write_all(&self.buf)?;
                        self.buf.clear();
                    }
                } else {
                    text::write_report(out, input, &report, self.ascii)?;
                }
                Ok(true)
            }
            Err(e) => {
                let place = line.map(|n| format!("line {n}: ")).unwrap_or_default();
                let msg = format!("error: {place}{}", e.render());
                if self.ascii {
                    eprintln!("{}", text::ascii_text(&msg));
                } else {
                    eprintln!("{msg}");
                }
                if self.json {
                    self.flush(out)?;
                    json::write_error(out, input, &e)?;
                }
                Ok(false)
            }
        }
    }
}

/// Apply steps one after another; a refused step stops the run with exit status 2.
fn step(formula: &str, steps: &[String], json_out: bool, ascii: bool) -> anyhow::Result<Status> {
    let cat = load_catalogue();
    let mut complex = match chem::parse(formula, &cat) {
        Ok(c) => c,
        Err(e) => {
            eprintln!("error: {}", e.render());
            return Ok(Status::Rejected);
        }
    };
    let stdout = io::stdout();
    let mut out = BufWriter::new(stdout.lock());
    let mut buf = Vec::new();
    let mut input = formula.to_string();
    for text in steps {
        let outcome =
            chem::steps::Step::parse(text).and_then(|s| chem::steps::take(&complex, &s, &cat));
        match outcome {
            Ok(o) => {
                if json_out {
                    buf.clear();
                    json::append_step(&mut buf, &input, &o);
                    out.write_all(&buf)?;
                } else {
                    text::write_step(&mut out, &o, ascii)?;
                }
                input = o.after.formula.clone();
                complex = o.product;
            }
            Err(e) => {
                out.flush()?;
                eprintln!("error: step '{text}' refused: {e}");
                if json_out {
                    json::write_step_error(&mut out, &input, text, &e.to_string())?;
                }
                out.flush()?;
                return Ok(Status::Rejected);
            }
        }
    }
    out.flush()?;
    Ok(Status::Ok)
}

fn ligands(query: &str, json: bool, ascii: bool) -> anyhow::Result<Status> {
    let cat = load_catalogue();
    let hits = cat.search(query);
    let stdout = io::stdout();
    let mut out = BufWriter::new(stdout.lock());
    if hits.is_empty() {
        eprintln!("no ligand matches '{query}'");
        return Ok(Status::Rejected);
    }
    for h in &hits {
        if json {
            json::write_ligand(&mut out, &h.ligand)?;
        } else {
            text::write_ligand(&mut out, &h.ligand, ascii)?;
        }
    }
    out.flush()?;
    Ok(Status::Ok)
}

fn print_paths() -> anyhow::Result<Status> {
    let config = catalogue::config_dir();
    let sets = catalogue::user_set_dir();
    let show = |p: Option<PathBuf>| {
        p.map_or("(no home directory found)".to_string(), |p| {
            p.display().to_string()
        })
    };
    println!("config directory:  {}", show(config));
    println!("user ligand sets:  {}", show(sets));
    println!("(set NONET_CONFIG_DIR to use another directory)");
    Ok(Status::Ok)
}

/// Whether the locale promises UTF-8 output.
fn utf8_locale() -> bool {
    for var in ["LC_ALL", "LC_CTYPE", "LANG"] {
        if let Ok(v) = std::env::var(var) {
            if !v.is_empty() {
                let v = v.to_lowercase();
                return v.contains("utf-8") || v.contains("utf8");
            }
        }
    }
    false
}

#[cfg(test)]
mod tests {
    use super::*;
    use clap::CommandFactory;

    #[test]
    fn cli_definition_is_consistent() {
        Cli::command().debug_assert();
    }
}

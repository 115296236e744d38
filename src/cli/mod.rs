//! The command line: clap definitions at the edge, plain requests inside, text and JSON writers.

mod json;
mod jsonw;
mod screen;
mod sterics;
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

    /// Keep sessions under DIR instead of $NONET_DATA_DIR or the platform data directory.
    #[arg(long, global = true, value_name = "DIR")]
    pub data_dir: Option<PathBuf>,

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
        /// Open (or, with FORMULA, create) this session instead of starting a new one.
        #[arg(long, value_name = "NAME")]
        session: Option<String>,
    },
    /// List the planning sessions, most recent first.
    Sessions {
        /// One JSON object per session per line.
        #[arg(long)]
        json: bool,
    },
    /// Write a session out as a Markdown table, JSON or CSV (to standard output).
    Export {
        /// The session's name (see `nonet sessions`).
        #[arg(value_name = "SESSION")]
        session: String,
        /// md, json, csv, or svg (the catalytic cycle as a figure: the last closed cycle, or
        /// the one --path closes).
        #[arg(long, default_value = "md", value_name = "FORMAT")]
        format: String,
        /// Only the path from the start to this variant (an id or a bookmark name).
        #[arg(long, value_name = "VARIANT")]
        path: Option<String>,
        /// Write to FILE instead of standard output.
        #[arg(long, short, value_name = "FILE")]
        output: Option<PathBuf>,
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
        /// Record every step, as it is taken, in this session (created if needed).
        #[arg(long, value_name = "NAME")]
        session: Option<String>,
    },
    /// Rank every catalogue ligand (or pair of ligands) in place of one or two ligands of
    /// FORMULA, under constraints.
    Screen {
        /// The complex to start from.
        #[arg(value_name = "FORMULA")]
        formula: String,
        /// A ligand of the complex to replace; give two for pairs (the same twice for two
        /// units of one group).
        #[arg(long = "site", value_name = "LIGAND", required = true)]
        sites: Vec<String>,
        /// Electron count at the metal: N or LO-HI.
        #[arg(long, value_name = "N|LO-HI")]
        electrons: Option<String>,
        /// Only products at their target count (18, or 16 for square-planar d8).
        #[arg(long)]
        saturated: bool,
        /// Highest crowding (sum of cone sphere fractions; 1.15 crowded, 1.35 overfull).
        #[arg(long, value_name = "F")]
        max_crowding: Option<f64>,
        /// Cone angle window for entering ligands, degrees: LO-HI.
        #[arg(long, value_name = "LO-HI")]
        cone: Option<String>,
        /// Tolman electronic parameter window, cm-1: LO-HI.
        #[arg(long, value_name = "LO-HI")]
        tep: Option<String>,
        /// Only products predicted diamagnetic.
        #[arg(long)]
        diamagnetic: bool,
        /// Only ligands of this family (repeatable).
        #[arg(long = "family", value_name = "FAMILY")]
        families: Vec<String>,
        /// Leave out this family (repeatable).
        #[arg(long = "exclude-family", value_name = "FAMILY")]
        exclude_families: Vec<String>,
        /// Leave out ligands with GHS hazard statements in the catalogue; ligands with no
        /// hazard record stay in and are flagged.
        #[arg(long)]
        no_hazardous: bool,
        /// electrons (nearest --electrons, else the starting count), crowding, donor (lowest
        /// TEP) or cone.
        #[arg(long, default_value = "electrons", value_name = "KEY")]
        rank: String,
        /// How many candidates to show.
        #[arg(long, default_value_t = 20, value_name = "N")]
        top: usize,
        /// Run part K of N of the screen (for array jobs); outputs merge by concatenation
        /// (ranks are per shard: sort merged JSON lines by "score").
        #[arg(long, value_name = "K/N")]
        shard: Option<String>,
        /// One JSON object per candidate per line.
        #[arg(long)]
        json: bool,
    },
    /// Steric descriptors of a ligand from its structure (XYZ or MDL molfile/SDF V2000).
    Sterics {
        /// The structure file, in ångström.
        #[arg(value_name = "FILE")]
        file: PathBuf,
        /// The donor atom's number in the file (needed when the file has no metal).
        #[arg(long, value_name = "N")]
        donor: Option<usize>,
        /// Metal-donor distance for a placed metal, Å [default: 2.28, as Tolman used for
        /// phosphines; 2.00 is usual for carbenes]. A metal in the file is used as it is.
        #[arg(long, value_name = "Å")]
        distance: Option<f64>,
        /// Leave hydrogens out of the buried volume.
        #[arg(long)]
        no_hydrogens: bool,
        /// One JSON object.
        #[arg(long)]
        json: bool,
        /// Store the ligand, with its computed cone angle, in this user ligand set.
        #[arg(long, value_name = "SET")]
        add_to: Option<String>,
        /// The key for --add-to (as it will be written in formulas).
        #[arg(long, value_name = "KEY")]
        key: Option<String>,
        /// A name for --add-to.
        #[arg(long, value_name = "NAME")]
        name: Option<String>,
        /// The CBC class of the stored ligand's binding mode.
        #[arg(long, default_value = "L", value_name = "CLASS")]
        class: String,
        /// The family of the stored ligand.
        #[arg(long, default_value = "phosphine", value_name = "FAMILY")]
        family: String,
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
        /// List the substrates and reagents steps take and give (MeI, PhB(OH)2, AgBF4, ...)
        /// instead of ligands.
        #[arg(long)]
        substrates: bool,
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
        None => plan(None, None, ascii, cli.data_dir.as_deref()),
        Some(Command::Plan { formula, session }) => {
            plan(formula, session, ascii, cli.data_dir.as_deref())
        }
        Some(Command::Sessions { json }) => sessions(json, cli.data_dir.as_deref()),
        Some(Command::Export {
            session,
            format,
            path,
            output,
        }) => export(
            &session,
            &format,
            path.as_deref(),
            output,
            cli.data_dir.as_deref(),
        ),
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
            session,
        }) => step(
            &formula,
            &steps,
            json,
            ascii,
            session.as_deref(),
            cli.data_dir.as_deref(),
        ),
        Some(Command::Screen {
            formula,
            sites,
            electrons,
            saturated,
            max_crowding,
            cone,
            tep,
            diamagnetic,
            families,
            exclude_families,
            no_hazardous,
            rank,
            top,
            shard,
            json,
        }) => screen::run(screen::ScreenRequest {
            formula,
            sites,
            electrons,
            saturated,
            max_crowding,
            cone,
            tep,
            diamagnetic,
            families,
            exclude_families,
            no_hazardous,
            rank,
            top,
            shard,
            json,
        }),
        Some(Command::Sterics {
            file,
            donor,
            distance,
            no_hydrogens,
            json,
            add_to,
            key,
            name,
            class,
            family,
        }) => sterics::run(sterics::StericsRequest {
            file,
            donor,
            distance,
            hydrogens: !no_hydrogens,
            json,
            add_to,
            key,
            name,
            class,
            family,
            ascii,
        }),
        Some(Command::Ligands {
            query,
            json,
            paths,
            substrates: list_substrates,
        }) => {
            if paths {
                return print_paths();
            }
            if list_substrates {
                return substrates(&query.join(" "), json);
            }
            ligands(&query.join(" "), json, ascii)
        }
    }
}

/// Open the planner. With no formula and no session it resumes the latest session (or starts
/// one on the demo complex); a formula starts a new session; `--session` opens a named one.
fn plan(
    formula: Option<String>,
    session: Option<String>,
    ascii: bool,
    data_dir: Option<&std::path::Path>,
) -> anyhow::Result<Status> {
    use crate::session::Session;
    use std::io::IsTerminal;
    let cat = load_catalogue();
    // a formula that does not parse is reported first, then the terminal is checked, so that
    // no session is created for a planner that cannot open
    if let Some(f) = &formula {
        if let Err(e) = chem::parse(f, &cat) {
            eprintln!("error: {}", e.render());
            return Ok(Status::Rejected);
        }
    }
    if !io::stdout().is_terminal() || !io::stdin().is_terminal() {
        eprintln!(
            "error: nonet's planner needs a terminal; for scripts use `nonet count` or \
             `nonet step` (see --help)"
        );
        return Ok(Status::Failure);
    }
    let dir = crate::session::session_dir(data_dir);
    // a formula that does not parse is reported before the screen changes
    let typed = match &formula {
        Some(f) => match chem::parse(f, &cat) {
            Ok(c) => Some((c, f.clone())),
            Err(e) => {
                eprintln!("error: {}", e.render());
                return Ok(Status::Rejected);
            }
        },
        None => None,
    };
    let name = match (&session, &typed, &dir) {
        (Some(n), _, _) => Some(n.clone()),
        (None, None, Some(d)) => crate::session::list(d).first().map(|s| s.name.clone()),
        _ => None,
    }
    .unwrap_or_else(crate::session::new_name);
    let mut log = match &dir {
        Some(d) => match (&session, &typed) {
            (Some(n), None) => match Session::open_existing(d, n) {
                Ok(s) => Some(s),
                Err(e) => {
                    eprintln!("error: {e}");
                    return Ok(Status::Rejected);
                }
            },
            _ => match Session::open(d, &name) {
                Ok(s) => Some(s),
                Err(e) => {
                    eprintln!("warning: {e}; this session will not be recorded");
                    None
                }
            },
        },
        None => {
            eprintln!("warning: no data directory (set NONET_DATA_DIR); this session will not be recorded");
            None
        }
    };
    for p in log.iter().flat_map(|s| &s.problems) {
        eprintln!("warning: {}: line {}: {}", name, p.line, p.message);
    }
    // the complex to show: what was typed, else where the session left off, else the demo
    let resumed = log.as_ref().and_then(|s| s.last()).and_then(|v| {
        chem::parse(&v.formula, &cat)
            .ok()
            .map(|c| (c, v.id, v.formula.clone()))
    });
    let (complex, title, current) = match (typed, resumed) {
        (Some((c, text)), _) => (c, text, None),
        (None, Some((c, id, f))) => (c, format!("session {name}: {f}"), Some(id)),
        (None, None) => {
            let c = chem::parse(crate::tui::DEMO_FORMULA, &cat)
                .map_err(|e| anyhow::anyhow!("the demo formula: {}", e.render()))?;
            (c, crate::tui::DEMO_TITLE.to_string(), None)
        }
    };
    let mut current = current;
    if current.is_none() {
        if let Some(s) = log.as_mut() {
            let parent = s.last().map(|v| v.id);
            let r = chem::count(&complex);
            match s.commit(
                parent,
                &format!("start: {title}"),
                &complex,
                &r,
                crate::session::Change::Start,
            ) {
                Ok(id) => current = Some(id),
                Err(e) => eprintln!("warning: {e}"),
            }
        }
    }
    let code = crate::tui::run(
        std::sync::Arc::new(cat),
        complex,
        title,
        ascii,
        log,
        current,
    )?;
    Ok(match code {
        0 => Status::Ok,
        n => Status::Signal(n),
    })
}

fn sessions(json_out: bool, data_dir: Option<&std::path::Path>) -> anyhow::Result<Status> {
    let Some(dir) = crate::session::session_dir(data_dir) else {
        eprintln!("error: no data directory: set NONET_DATA_DIR or use --data-dir");
        return Ok(Status::Failure);
    };
    let list = crate::session::list(&dir);
    let stdout = io::stdout();
    let mut out = BufWriter::new(stdout.lock());
    if list.is_empty() && !json_out {
        writeln!(out, "no sessions yet in {}", dir.display())?;
    }
    for s in &list {
        if json_out {
            serde_json::to_writer(&mut out, s)?;
            writeln!(out)?;
        } else {
            writeln!(
                out,
                "{:<28} {:>5} variants  {:>3} bookmarks  {}  {}{}",
                s.name,
                s.variants,
                s.bookmarks,
                s.modified,
                s.latest_formula.as_deref().unwrap_or("-"),
                if s.problems > 0 {
                    "  (damaged lines skipped)"
                } else {
                    ""
                }
            )?;
        }
    }
    out.flush()?;
    Ok(Status::Ok)
}

fn export(
    name: &str,
    format: &str,
    path: Option<&str>,
    output: Option<PathBuf>,
    data_dir: Option<&std::path::Path>,
) -> anyhow::Result<Status> {
    use crate::session::export::{self, Scope};
    let Some(dir) = crate::session::session_dir(data_dir) else {
        eprintln!("error: no data directory: set NONET_DATA_DIR or use --data-dir");
        return Ok(Status::Failure);
    };
    let file = dir.join(format!("{name}.jsonl"));
    if !file.exists() {
        eprintln!(
            "error: no session '{name}' in {}; `nonet sessions` lists them",
            dir.display()
        );
        return Ok(Status::Rejected);
    }
    let s = crate::session::Session::load(&file)?;
    for p in &s.problems {
        eprintln!("warning: {name}: line {}: {}", p.line, p.message);
    }
    let scope = match path {
        None => Scope::Tree,
        Some(v) => match s.find(v) {
            Some(variant) => Scope::Path(variant.id),
            None => {
                eprintln!("error: session '{name}' has no variant or bookmark '{v}'");
                return Ok(Status::Rejected);
            }
        },
    };
    let text = match format {
        "md" | "markdown" => export::markdown(&s, &scope),
        "json" => export::json(&s, &scope),
        "csv" => export::csv(&s, &scope),
        "svg" => {
            use crate::session::figure;
            let end = match &scope {
                Scope::Path(id) => Some(*id),
                Scope::Tree => figure::default_end(&s),
            };
            let Some(end) = end else {
                eprintln!("error: session '{name}' has no variants to draw");
                return Ok(Status::Rejected);
            };
            figure::svg(&s, &figure::cycle_ids(&s, end))
        }
        other => {
            eprintln!("error: unknown export format '{other}': use md, json, csv or svg");
            return Ok(Status::Rejected);
        }
    };
    match output {
        Some(p) => std::fs::write(&p, text).with_context(|| format!("writing {}", p.display()))?,
        None => {
            let mut out = io::stdout().lock();
            out.write_all(text.as_bytes())?;
            out.flush()?;
        }
    }
    Ok(Status::Ok)
}

pub(crate) fn load_catalogue() -> Catalogue {
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

/// Apply steps one after another; a refused step stops the run with exit status 2. With a
/// session, each step is written to its log (and synced) before its result is printed.
fn step(
    formula: &str,
    steps: &[String],
    json_out: bool,
    ascii: bool,
    session: Option<&str>,
    data_dir: Option<&std::path::Path>,
) -> anyhow::Result<Status> {
    let cat = load_catalogue();
    let mut complex = match chem::parse(formula, &cat) {
        Ok(c) => c,
        Err(e) => {
            eprintln!("error: {}", e.render());
            return Ok(Status::Rejected);
        }
    };
    let mut log = match session {
        None => None,
        Some(name) => {
            let Some(dir) = crate::session::session_dir(data_dir) else {
                eprintln!("error: no data directory: set NONET_DATA_DIR or use --data-dir");
                return Ok(Status::Failure);
            };
            let mut s = match crate::session::Session::open(&dir, name) {
                Ok(s) => s,
                Err(e) => {
                    eprintln!("error: {e}");
                    return Ok(Status::Failure);
                }
            };
            // continue from the last variant when it is this complex, else record the start
            let canonical = complex.formula(false);
            let parent = match s.last() {
                Some(v) if v.formula == canonical => v.id,
                last => {
                    let parent = last.map(|v| v.id);
                    s.commit(
                        parent,
                        &format!("start: {formula}"),
                        &complex,
                        &chem::count(&complex),
                        crate::session::Change::Start,
                    )?
                }
            };
            Some((s, parent))
        }
    };
    let stdout = io::stdout();
    let mut out = BufWriter::new(stdout.lock());
    let mut buf = Vec::new();
    let mut input = formula.to_string();
    // the path: intermediates (start first) and the equation of each step
    let mut path = vec![complex.formula(false)];
    let mut equations = Vec::new();
    for text in steps {
        let outcome =
            chem::steps::Step::parse(text).and_then(|s| chem::steps::take(&complex, &s, &cat));
        match outcome {
            Ok(o) => {
                let mut variant = None;
                if let Some((s, parent)) = log.as_mut() {
                    let id = s.commit(
                        Some(*parent),
                        &o.step.to_string(),
                        &o.product,
                        &o.after,
                        crate::session::Change::Step(&o.equation),
                    )?;
                    *parent = id;
                    variant = Some((s.name.clone(), id));
                }
                if json_out {
                    buf.clear();
                    json::append_step(&mut buf, &input, &o, variant.as_ref());
                    out.write_all(&buf)?;
                } else {
                    text::write_step(&mut out, &o, ascii)?;
                    if let Some((name, id)) = &variant {
                        writeln!(out, "  recorded as variant {id} of session {name}\n")?;
                    }
                }
                // a recorded step is reported only once it is on disk; flush so a reader
                // sees it at once
                out.flush()?;
                input = o.after.formula.clone();
                path.push(o.after.formula.clone());
                equations.push(o.equation);
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
    // the path's end: where it closed, and what it consumed and formed
    let closed = chem::cycle::closure(&path);
    let (from, to) = closed.unwrap_or((0, equations.len()));
    let net = chem::cycle::net(&equations[from..to]);
    if json_out {
        json::write_path(&mut out, formula, &path, closed, &net)?;
    } else {
        text::write_path(&mut out, &net, closed, ascii)?;
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

/// The substrates and reagents whose key, name, formula or alias contains the query.
fn substrates(query: &str, json: bool) -> anyhow::Result<Status> {
    let cat = load_catalogue();
    let q = query.to_lowercase();
    let hits: Vec<_> = cat
        .substrates()
        .iter()
        .filter(|d| {
            q.is_empty()
                || std::iter::once(&d.key)
                    .chain([&d.name, &d.formula])
                    .chain(&d.aliases)
                    .any(|t| t.to_lowercase().contains(&q))
        })
        .collect();
    if hits.is_empty() {
        eprintln!("no substrate matches '{query}'");
        return Ok(Status::Rejected);
    }
    let stdout = io::stdout();
    let mut out = BufWriter::new(stdout.lock());
    for d in hits {
        if json {
            json::write_substrate(&mut out, d)?;
        } else {
            text::write_substrate(&mut out, d)?;
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

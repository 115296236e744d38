//! The command line: clap definitions at the edge, plain requests inside, text and JSON writers.

mod batch;
mod diag;
mod isomers;
mod json;
mod jsonw;
mod screen;
mod sterics;
mod text;

use std::io::{self, BufWriter, Write};
use std::path::PathBuf;

use anyhow::Context;
use clap::{Args, Parser, Subcommand, ValueEnum};

use crate::catalogue::{self, Catalogue};
use crate::chem;
use crate::chem::screen::{Rank, Shard};

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

    /// Keep sessions under DIR instead of the platform data directory.
    #[arg(long, global = true, value_name = "DIR", env = "NONET_DATA_DIR")]
    pub data_dir: Option<PathBuf>,

    #[command(subcommand)]
    pub command: Option<Command>,
}

#[derive(Debug, Subcommand)]
pub enum Command {
    /// Open the planner on FORMULA (or on the demo complex): the working complex, the ligand
    /// catalogue and a preview of each swap or edit before it is committed.
    Plan(PlanArgs),
    /// List the planning sessions, most recent first.
    Sessions {
        /// One JSON object per session per line.
        #[arg(long)]
        json: bool,
    },
    /// Write a session out as a Markdown table, JSON, CSV or an SVG figure of its cycle.
    Export(ExportArgs),
    /// Count electrons under both models, with oxidation state, d count, CBC class, saturation
    /// and spin.
    Count(CountArgs),
    /// Take elementary steps from FORMULA, one after another, and report each product.
    Step(StepArgs),
    /// Rank every catalogue ligand (or pair of ligands) in place of one or two ligands of
    /// FORMULA, under constraints.
    Screen(ScreenArgs),
    /// Steric descriptors of a ligand from its structure (XYZ or MDL molfile/SDF V2000).
    Sterics(StericsArgs),
    /// List the ligand catalogue, or search it when QUERY is given.
    Ligands(LigandsArgs),
    /// List the stereoisomers of FORMULA (or of a textbook composition such as Ma2b2c2 or
    /// M(AA)2b2) on its coordination polyhedron, with IUPAC descriptors.
    Isomers(IsomersArgs),
}

#[derive(Debug, Args)]
pub struct IsomersArgs {
    /// A complex ('cis-PtCl2(NH3)2', 'Mo(CO)3(PMe3)3') or a composition ('Ma3b3', 'M(AB)2cd').
    #[arg(value_name = "FORMULA")]
    pub formula: String,
    /// The polyhedron for a composition (L-2, TP-3, TS-3, T-4, SP-4, TBPY-5, SPY-5, OC-6,
    /// PBPY-7); by default the one its donor count suggests.
    #[arg(long, value_name = "SYMBOL")]
    pub polyhedron: Option<String>,
    /// One JSON object.
    #[arg(long)]
    pub json: bool,
}

#[derive(Debug, Args)]
pub struct PlanArgs {
    /// The complex to start from, e.g. 'IrCl(CO)(PPh3)2'.
    #[arg(value_name = "FORMULA")]
    pub formula: Option<String>,
    /// Open (or, with FORMULA, create) this session instead of starting a new one.
    #[arg(long, value_name = "NAME", value_parser = parse::session_name)]
    pub session: Option<String>,
}

/// What `export` writes.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum ExportFormat {
    /// A Markdown table of the tree (or the path), with closed cycles.
    #[value(alias = "markdown")]
    Md,
    Json,
    Csv,
    /// The catalytic cycle as a figure: the first closed cycle, or the one --path closes.
    Svg,
}

#[derive(Debug, Args)]
pub struct ExportArgs {
    /// The session's name (see `nonet sessions`).
    #[arg(value_name = "SESSION", value_parser = parse::session_name)]
    pub session: String,
    #[arg(long, value_enum, default_value = "md", value_name = "FORMAT")]
    pub format: ExportFormat,
    /// Only the path from the start to this variant (an id or a bookmark name).
    #[arg(long, value_name = "VARIANT")]
    pub path: Option<String>,
    /// Write to FILE instead of standard output.
    #[arg(long, short, value_name = "FILE")]
    pub output: Option<PathBuf>,
}

#[derive(Debug, Args)]
pub struct CountArgs {
    /// One JSON object per formula per line (schema 1).
    #[arg(long)]
    pub json: bool,
    /// Read formulas from FILE, one per line ('-' for standard input; '#' starts a comment).
    #[arg(long, value_name = "FILE")]
    pub batch: Option<PathBuf>,
    /// With --json, keep only these top-level fields (comma-separated, e.g.
    /// input,electron_count,oxidation_state).
    #[arg(long, value_delimiter = ',', value_name = "A,B,...", requires = "json")]
    pub fields: Vec<String>,
    /// Formulas to count.
    #[arg(value_name = "FORMULA")]
    pub formulas: Vec<String>,
}

#[derive(Debug, Args)]
pub struct StepArgs {
    /// One JSON object per step per line (the count's fields plus step, product, changes),
    /// then one closing line for the path.
    #[arg(long)]
    pub json: bool,
    /// The complex to start from.
    #[arg(value_name = "FORMULA")]
    pub formula: String,
    /// Steps such as "oxidative-addition H2", "migratory-insertion CO CH3",
    /// "ring-slip Cp 3", "oxidation" (one quoted argument each).
    #[arg(value_name = "STEP", required = true)]
    pub steps: Vec<String>,
    /// Record every step, as it is taken, in this session (created if needed).
    #[arg(long, value_name = "NAME", value_parser = parse::session_name)]
    pub session: Option<String>,
}

/// How `screen` ranks its candidates.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum RankArg {
    /// Nearest --electrons (else the starting count), then least crowded, then strongest donor.
    Electrons,
    /// Least crowded first.
    Crowding,
    /// Strongest net donor (lowest TEP) first.
    Donor,
    /// Smallest cone angle first.
    Cone,
}

impl From<RankArg> for Rank {
    fn from(r: RankArg) -> Rank {
        match r {
            RankArg::Electrons => Rank::Electrons,
            RankArg::Crowding => Rank::Crowding,
            RankArg::Donor => Rank::Donor,
            RankArg::Cone => Rank::Cone,
        }
    }
}

#[derive(Debug, Args)]
pub struct ScreenArgs {
    /// The complex to start from.
    #[arg(value_name = "FORMULA")]
    pub formula: String,
    /// A ligand of the complex to replace; give two for pairs (the same twice for two
    /// units of one group).
    #[arg(long = "site", value_name = "LIGAND", required = true, num_args = 1)]
    pub sites: Vec<String>,
    /// Electron count at the metal: N or LO-HI.
    #[arg(long, value_name = "N|LO-HI", value_parser = parse::electrons)]
    pub electrons: Option<(i64, i64)>,
    /// Only products at their target count (18, or 16 for square-planar d8).
    #[arg(long)]
    pub saturated: bool,
    /// Highest crowding (sum of cone sphere fractions; 1.15 crowded, 1.35 overfull).
    #[arg(long, value_name = "F", value_parser = parse::positive)]
    pub max_crowding: Option<f64>,
    /// Cone angle window for entering ligands, degrees: LO-HI.
    #[arg(long, value_name = "LO-HI", value_parser = parse::window)]
    pub cone: Option<(f64, f64)>,
    /// Tolman electronic parameter window, cm-1: LO-HI.
    #[arg(long, value_name = "LO-HI", value_parser = parse::window)]
    pub tep: Option<(f64, f64)>,
    /// Only products predicted diamagnetic.
    #[arg(long)]
    pub diamagnetic: bool,
    /// Only ligands of this family (repeatable).
    #[arg(long = "family", value_name = "FAMILY", value_parser = parse::family())]
    pub families: Vec<String>,
    /// Leave out this family (repeatable).
    #[arg(long = "exclude-family", value_name = "FAMILY", value_parser = parse::family())]
    pub exclude_families: Vec<String>,
    /// Leave out ligands with GHS hazard statements in the catalogue; ligands with no
    /// hazard record stay in and are flagged.
    #[arg(long)]
    pub no_hazardous: bool,
    #[arg(long, value_enum, default_value = "electrons", value_name = "KEY")]
    pub rank: RankArg,
    /// How many candidates to show.
    #[arg(long, default_value_t = 20, value_name = "N",
          value_parser = clap::value_parser!(u32).range(1..))]
    pub top: u32,
    /// Run part K of N of the screen (for array jobs); outputs merge by concatenation
    /// (ranks are per shard: sort merged JSON lines by "score").
    #[arg(long, value_name = "K/N", value_parser = parse::shard)]
    pub shard: Option<Shard>,
    /// One JSON object per candidate per line.
    #[arg(long)]
    pub json: bool,
}

#[derive(Debug, Args)]
pub struct StericsArgs {
    /// The structure file, in ångström.
    #[arg(value_name = "FILE")]
    pub file: PathBuf,
    /// The donor atom's number in the file (needed when the file has no metal).
    #[arg(long, value_name = "N")]
    pub donor: Option<usize>,
    /// Metal-donor distance for a placed metal, Å [default: 2.28, as Tolman used for
    /// phosphines; 2.00 is usual for carbenes]. A metal in the file is used as it is.
    #[arg(long, value_name = "Å")]
    pub distance: Option<f64>,
    /// Leave hydrogens out of the buried volume.
    #[arg(long)]
    pub no_hydrogens: bool,
    /// One JSON object.
    #[arg(long)]
    pub json: bool,
    /// Store the ligand, with its computed cone angle, in this user ligand set.
    #[arg(long, value_name = "SET")]
    pub add_to: Option<String>,
    /// The key for --add-to (as it will be written in formulas).
    #[arg(long, value_name = "KEY")]
    pub key: Option<String>,
    /// A name for --add-to.
    #[arg(long, value_name = "NAME")]
    pub name: Option<String>,
    /// The CBC class of the stored ligand's binding mode.
    #[arg(long, default_value = "L", value_name = "CLASS")]
    pub class: String,
    /// The family of the stored ligand.
    #[arg(long, default_value = "phosphine", value_name = "FAMILY", value_parser = parse::family())]
    pub family: String,
}

#[derive(Debug, Args)]
pub struct LigandsArgs {
    /// Words to match against keys, names, formulas and aliases.
    #[arg(value_name = "QUERY")]
    pub query: Vec<String>,
    /// One JSON object per ligand per line.
    #[arg(long)]
    pub json: bool,
    /// Print where user ligand sets are read from, and stop.
    #[arg(long)]
    pub paths: bool,
    /// List the substrates and reagents steps take and give (MeI, PhB(OH)2, AgBF4, ...)
    /// instead of ligands.
    #[arg(long)]
    pub substrates: bool,
}

/// Value parsers for the typed arguments: each says what it takes when the value is wrong.
mod parse {
    use crate::chem::screen::Shard;

    /// "16" or "16-18" as an inclusive range, low end first; NaN is no number.
    fn range<T: std::str::FromStr + Copy + PartialOrd>(text: &str) -> Option<(T, T)> {
        let (lo, hi) = match text.split_once('-') {
            Some((a, b)) => (a.trim().parse().ok()?, b.trim().parse().ok()?),
            None => {
                let v = text.trim().parse().ok()?;
                (v, v)
            }
        };
        // `lo <= hi` is false for NaN too
        (lo <= hi).then_some((lo, hi))
    }

    pub fn electrons(text: &str) -> Result<(i64, i64), String> {
        range(text).ok_or_else(|| "takes N or LO-HI with LO <= HI, e.g. 16-18".to_string())
    }

    pub fn window(text: &str) -> Result<(f64, f64), String> {
        range::<f64>(text)
            .filter(|(lo, hi)| lo.is_finite() && hi.is_finite())
            .ok_or_else(|| "takes LO-HI with LO <= HI, e.g. 120-160".to_string())
    }

    pub fn positive(text: &str) -> Result<f64, String> {
        text.trim()
            .parse::<f64>()
            .ok()
            .filter(|v| v.is_finite() && *v > 0.0)
            .ok_or_else(|| "takes a positive number (1.15 crowded, 1.35 overfull)".to_string())
    }

    pub fn shard(text: &str) -> Result<Shard, String> {
        Shard::parse(text).ok_or_else(|| "takes K/N with 1 <= K <= N, e.g. 2/8".to_string())
    }

    pub fn session_name(text: &str) -> Result<String, String> {
        crate::session::check_name(text)
            .map(|()| text.to_string())
            .map_err(|e| e.to_string())
    }

    pub fn family() -> clap::builder::PossibleValuesParser {
        clap::builder::PossibleValuesParser::new(crate::catalogue::FAMILIES)
    }
}

/// How a command failed: its input was refused (exit status 2), or something that is not the
/// input's fault went wrong (exit status 1).
#[derive(Debug, thiserror::Error)]
pub enum CliError {
    #[error("{0}")]
    Rejected(String),
    #[error("{0:#}")]
    Failure(anyhow::Error),
}

impl From<anyhow::Error> for CliError {
    fn from(e: anyhow::Error) -> CliError {
        CliError::Failure(e)
    }
}

impl From<io::Error> for CliError {
    fn from(e: io::Error) -> CliError {
        CliError::Failure(e.into())
    }
}

impl From<serde_json::Error> for CliError {
    fn from(e: serde_json::Error) -> CliError {
        CliError::Failure(e.into())
    }
}

impl From<crate::session::SessionError> for CliError {
    fn from(e: crate::session::SessionError) -> CliError {
        CliError::Failure(e.into())
    }
}

/// What a command returns: its status, or the one error `main` prints.
pub type Outcome = Result<Status, CliError>;

fn rejected<T>(msg: impl Into<String>) -> Result<T, CliError> {
    Err(CliError::Rejected(msg.into()))
}

fn failed<T>(msg: impl Into<String>) -> Result<T, CliError> {
    Err(CliError::Failure(anyhow::anyhow!(msg.into())))
}

/// Parse arguments, run, and print a command's error once, through `diag`; returns the exit
/// status.
pub fn main<I, T>(args: I) -> Status
where
    I: IntoIterator<Item = T>,
    T: Into<std::ffi::OsString> + Clone,
{
    let cli = match Cli::try_parse_from(args) {
        Ok(c) => c,
        Err(e) => {
            let code = e.exit_code();
            // help and version go to stdout; a closed stdout or stderr is no reason to abort
            let _ = e.print();
            return if code == 0 {
                Status::Ok
            } else {
                Status::Rejected
            };
        }
    };
    diag::set_ascii(cli.ascii || !utf8_locale());
    match run(cli) {
        Ok(s) => s,
        Err(CliError::Rejected(msg)) => {
            diag::error(&msg);
            Status::Rejected
        }
        Err(CliError::Failure(e)) => {
            // `nonet ... | head` closes the pipe early: that is not an error
            if e.chain().any(|c| {
                c.downcast_ref::<io::Error>()
                    .is_some_and(|io| io.kind() == io::ErrorKind::BrokenPipe)
            }) {
                return Status::Ok;
            }
            diag::error(&format!("{e:#}"));
            Status::Failure
        }
    }
}

/// Run a parsed command line.
pub fn run(cli: Cli) -> Outcome {
    let ascii = diag::ascii();
    let data_dir = cli.data_dir.as_deref();
    match cli.command {
        None => plan(
            &PlanArgs {
                formula: None,
                session: None,
            },
            ascii,
            data_dir,
        ),
        Some(Command::Plan(a)) => plan(&a, ascii, data_dir),
        Some(Command::Sessions { json }) => sessions(json, data_dir),
        Some(Command::Export(a)) => export(&a, data_dir),
        Some(Command::Count(a)) => batch::count(&a, ascii),
        Some(Command::Step(a)) => step(&a, ascii, data_dir),
        Some(Command::Screen(a)) => screen::run(&a),
        Some(Command::Sterics(a)) => sterics::run(&a, ascii),
        Some(Command::Isomers(a)) => isomers::run(&a, ascii),
        Some(Command::Ligands(a)) => {
            if a.paths {
                return print_paths();
            }
            if a.substrates {
                return substrates(&a.query.join(" "), a.json);
            }
            ligands(&a.query.join(" "), a.json, ascii)
        }
    }
}

/// Open the planner. With no formula and no session it resumes the latest session (or starts
/// one on the demo complex); a formula starts a new session; `--session` opens a named one.
fn plan(args: &PlanArgs, ascii: bool, data_dir: Option<&std::path::Path>) -> Outcome {
    use crate::session::Session;
    use std::io::IsTerminal;
    let (formula, session) = (&args.formula, &args.session);
    let cat = load_catalogue();
    // a formula that does not parse is reported first, then the terminal is checked, so that
    // no session is created for a planner that cannot open
    let typed = match formula {
        Some(f) => match chem::parse(f, &cat) {
            Ok(mut c) => {
                chem::geometry::settle(&mut c);
                Some((c, f.clone()))
            }
            Err(e) => return rejected(diag::parse_error(&e)),
        },
        None => None,
    };
    if std::env::var("TERM").is_ok_and(|t| t == "dumb") {
        return failed(
            "TERM=dumb: this terminal cannot draw nonet's planner; use `nonet count`, \
             `nonet step` or `nonet screen` here (see --help), or run in a terminal emulator",
        );
    }
    if !io::stdout().is_terminal() || !io::stdin().is_terminal() {
        return failed(
            "nonet's planner needs a terminal; for scripts use `nonet count` or `nonet step` \
             (see --help)",
        );
    }
    let dir = crate::session::session_dir(data_dir);
    let name = match (session, &typed, &dir) {
        (Some(n), _, _) => Some(n.clone()),
        (None, None, Some(d)) => crate::session::try_list(d)
            .map_err(|e| CliError::Failure(e.into()))?
            .into_iter()
            .find(|s| s.error.is_none())
            .map(|s| s.name),
        _ => None,
    }
    .unwrap_or_else(crate::session::new_name);
    let mut log = match &dir {
        Some(d) => match (session, &typed) {
            (Some(n), None) => match Session::open_existing(d, n) {
                Ok(s) => Some(s),
                Err(e) => return rejected(e.to_string()),
            },
            _ => match Session::open(d, &name) {
                Ok(s) => Some(s),
                Err(e) => {
                    diag::warning(&format!("{e}; this session will not be recorded"));
                    None
                }
            },
        },
        None => {
            diag::warning(
                "no data directory (set NONET_DATA_DIR); this session will not be recorded",
            );
            None
        }
    };
    for p in log.iter().flat_map(|s| &s.problems) {
        diag::warning(&format!("{}: line {}: {}", name, p.line, p.message));
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
                Err(e) => diag::warning(&e.to_string()),
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

fn sessions(json_out: bool, data_dir: Option<&std::path::Path>) -> Outcome {
    let Some(dir) = crate::session::session_dir(data_dir) else {
        return failed("no data directory: set NONET_DATA_DIR or use --data-dir");
    };
    let list = crate::session::try_list(&dir).map_err(|e| CliError::Failure(e.into()))?;
    let stdout = io::stdout();
    let mut out = BufWriter::new(stdout.lock());
    if list.is_empty() && !json_out {
        writeln!(
            out,
            "no sessions yet in {}",
            diag::escape_controls(&dir.display().to_string())
        )?;
    }
    for s in &list {
        if json_out {
            serde_json::to_writer(&mut out, s)?;
            writeln!(out)?;
        } else {
            writeln!(
                out,
                "{:<28} {:>5} variants  {:>3} bookmarks  {}  {}{}",
                diag::escape_controls(&s.name),
                s.variants,
                s.bookmarks,
                s.modified,
                diag::escape_controls(s.latest_formula.as_deref().unwrap_or("-")),
                match (&s.error, s.problems > 0) {
                    (Some(e), _) => format!("  (cannot be read: {})", diag::escape_controls(e)),
                    (None, true) => "  (damaged lines skipped)".to_string(),
                    (None, false) => String::new(),
                }
            )?;
        }
    }
    out.flush()?;
    Ok(Status::Ok)
}

fn export(args: &ExportArgs, data_dir: Option<&std::path::Path>) -> Outcome {
    use crate::session::export::{self, Scope};
    let name = args.session.as_str();
    let Some(dir) = crate::session::session_dir(data_dir) else {
        return failed("no data directory: set NONET_DATA_DIR or use --data-dir");
    };
    if let Some(p) = &args.output {
        // an export onto a session's log would destroy it
        if let Err(e) = crate::session::check_export_target(Some(&dir), p) {
            return rejected(e.to_string());
        }
    }
    let s = match crate::session::Session::load_existing(&dir, name) {
        Ok(s) => s,
        Err(
            e @ (crate::session::SessionError::BadName(_)
            | crate::session::SessionError::NotFound(..)),
        ) => return rejected(e.to_string()),
        Err(e) => return Err(e.into()),
    };
    for p in &s.problems {
        diag::warning(&format!("{name}: line {}: {}", p.line, p.message));
    }
    let scope = match &args.path {
        None => Scope::Tree,
        Some(v) => match s.find(v) {
            Some(variant) => Scope::Path(variant.id),
            None => return rejected(format!("session '{name}' has no variant or bookmark '{v}'")),
        },
    };
    let text = match args.format {
        ExportFormat::Md => export::markdown(&s, &scope),
        ExportFormat::Json => export::json(&s, &scope),
        ExportFormat::Csv => export::csv(&s, &scope),
        ExportFormat::Svg => {
            use crate::session::figure;
            let end = match &scope {
                Scope::Path(id) => Some(*id),
                Scope::Tree => figure::default_end(&s),
            };
            let Some(end) = end else {
                return rejected(format!("session '{name}' has no variants to draw"));
            };
            figure::svg(&s, &figure::cycle_ids(&s, end))
        }
    };
    match &args.output {
        Some(p) => std::fs::write(p, text).with_context(|| format!("writing {}", p.display()))?,
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
        diag::warning(&w.to_string());
    }
    cat
}

/// Apply steps one after another; a refused step stops the run with exit status 2. With a
/// session, each step is written to its log (and synced) before its result is printed.
fn step(args: &StepArgs, ascii: bool, data_dir: Option<&std::path::Path>) -> Outcome {
    let (formula, steps, json_out) = (args.formula.as_str(), &args.steps, args.json);
    let cat = load_catalogue();
    let mut complex = match chem::parse(formula, &cat) {
        Ok(c) => c,
        Err(e) => return rejected(diag::parse_error(&e)),
    };
    chem::geometry::settle(&mut complex);
    let mut log = match &args.session {
        None => None,
        Some(name) => {
            let Some(dir) = crate::session::session_dir(data_dir) else {
                return failed("no data directory: set NONET_DATA_DIR or use --data-dir");
            };
            let mut s = crate::session::Session::open(&dir, name)?;
            for p in &s.problems {
                diag::warning(&format!("{name}: line {}: {}", p.line, p.message));
            }
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
                    let mut t = Vec::new();
                    text::write_step(&mut t, &o, ascii)?;
                    diag::write_clean(&mut out, &t)?;
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
                if json_out {
                    json::write_step_error(&mut out, &input, text, &e.to_string())?;
                }
                out.flush()?;
                return rejected(format!("step '{}' refused: {e}", diag::quote(text)));
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

fn ligands(query: &str, json: bool, ascii: bool) -> Outcome {
    let cat = load_catalogue();
    let hits = cat.search(query);
    let stdout = io::stdout();
    let mut out = BufWriter::new(stdout.lock());
    if hits.is_empty() {
        return rejected(format!("no ligand matches '{}'", diag::quote(query)));
    }
    for h in &hits {
        if json {
            json::write_ligand(&mut out, &h.ligand)?;
        } else {
            let mut t = Vec::new();
            text::write_ligand(&mut t, &h.ligand, ascii)?;
            diag::write_clean(&mut out, &t)?;
        }
    }
    out.flush()?;
    Ok(Status::Ok)
}

/// The substrates and reagents whose key, name, formula or alias contains the query.
fn substrates(query: &str, json: bool) -> Outcome {
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
        return rejected(format!("no substrate matches '{}'", diag::quote(query)));
    }
    let stdout = io::stdout();
    let mut out = BufWriter::new(stdout.lock());
    for d in hits {
        if json {
            json::write_substrate(&mut out, d)?;
        } else {
            let mut t = Vec::new();
            text::write_substrate(&mut t, d)?;
            diag::write_clean(&mut out, &t)?;
        }
    }
    out.flush()?;
    Ok(Status::Ok)
}

fn print_paths() -> Outcome {
    let config = catalogue::config_dir();
    let sets = catalogue::user_set_dir();
    let show = |p: Option<PathBuf>| {
        p.map_or("(no home directory found)".to_string(), |p| {
            p.display().to_string()
        })
    };
    let mut out = io::stdout().lock();
    writeln!(out, "config directory:  {}", show(config))?;
    writeln!(out, "user ligand sets:  {}", show(sets))?;
    writeln!(out, "(set NONET_CONFIG_DIR to use another directory)")?;
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

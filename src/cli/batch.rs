//! `nonet count`: formulas from the arguments and from a batch file, counted on every core
//! with the output in input order. Lines are read with a bound, so a hostile file cannot make
//! nonet hold a 300 MB line in memory, and `--fields` trims the JSON to what a script needs.

use std::io::{self, BufRead, BufWriter, Write};

use anyhow::Context;

use super::{diag, json, load_catalogue, rejected, text, CliError, CountArgs, Outcome, Status};
use crate::catalogue::Catalogue;
use crate::chem;

/// Longest batch line counted; a longer one is refused and skipped without being held whole.
pub const MAX_LINE: usize = 64 * 1024;

/// Lines handed to the workers at a time: large enough to keep the threads busy, small
/// enough that the output streams.
const CHUNK: usize = 1024;

/// How much of a refused line a message quotes.
const EXCERPT: usize = 80;

/// One line read from the batch input.
enum Line {
    /// A formula: its byte range in its chunk's text (one buffer per chunk, not one per line).
    Text(std::ops::Range<usize>),
    /// Not UTF-8: the lossy text for the message.
    NotUtf8(String),
    /// Over `MAX_LINE` bytes: its length and its first bytes.
    TooLong(usize, String),
}

/// Read one line of at most `max` bytes into `buf` (without its newline); a longer line is
/// consumed to its end but only its first bytes are kept. None at end of input.
fn read_bounded(
    r: &mut (impl BufRead + ?Sized),
    buf: &mut Vec<u8>,
    max: usize,
) -> io::Result<Option<usize>> {
    buf.clear();
    let mut total = 0usize;
    let mut any = false;
    loop {
        let chunk = match r.fill_buf() {
            Ok(c) => c,
            Err(e) if e.kind() == io::ErrorKind::Interrupted => continue,
            Err(e) => return Err(e),
        };
        if chunk.is_empty() {
            return Ok(any.then_some(total));
        }
        any = true;
        let (part, done) = match chunk.iter().position(|&b| b == b'\n') {
            Some(i) => (&chunk[..i], Some(i + 1)),
            None => (chunk, None),
        };
        let room = (max + 1).saturating_sub(buf.len());
        buf.extend_from_slice(&part[..part.len().min(room)]);
        total += part.len();
        let used = done.unwrap_or(part.len());
        r.consume(used);
        if done.is_some() {
            return Ok(Some(total));
        }
    }
}

/// The top-level JSON fields `--fields` keeps, checked against a real report's fields.
struct Fields(Vec<String>);

/// Fields the parsed complex gives without a count: when `--fields` names only these, a line
/// is parsed and checked (`count::impossible`) but not counted.
const PARSE_ONLY: &[&str] = &["schema", "input", "formula", "charge"];

impl Fields {
    fn parse_only(&self) -> bool {
        self.0.iter().all(|f| PARSE_ONLY.contains(&f.as_str()))
    }

    /// Whether a field that carries positions (the metals, or the notes a prefix may add)
    /// is asked for.
    fn wants_positions(&self) -> bool {
        self.0.iter().any(|f| f == "metals" || f == "notes")
    }
}

impl Fields {
    fn new(names: &[String], cat: &Catalogue) -> Result<Option<Fields>, CliError> {
        if names.is_empty() {
            return Ok(None);
        }
        let known = match chem::parse("Cr(CO)6", cat) {
            Ok(c) => {
                let mut buf = Vec::new();
                json::append_report(&mut buf, "Cr(CO)6", &chem::count(&c));
                top_level(&buf)
                    .into_iter()
                    .map(|(k, _)| String::from_utf8_lossy(k).into_owned())
                    .collect::<Vec<_>>()
            }
            Err(_) => Vec::new(),
        };
        for n in names {
            if !known.is_empty() && !known.contains(n) {
                return rejected(format!(
                    "--fields: no field '{}' in a count's JSON; the fields are: {}",
                    diag::quote(n),
                    known.join(", ")
                ));
            }
        }
        Ok(Some(Fields(names.to_vec())))
    }
}

/// The top-level (key, value) byte ranges of a JSON object nonet wrote (keys need no
/// unescaping: they are plain identifiers).
fn top_level(line: &[u8]) -> Vec<(&[u8], &[u8])> {
    let mut out = Vec::new();
    let mut i = match line.iter().position(|&b| b == b'{') {
        Some(p) => p + 1,
        None => return out,
    };
    let n = line.len();
    while i < n {
        // key
        while i < n && line[i] != b'"' {
            if line[i] == b'}' {
                return out;
            }
            i += 1;
        }
        let ks = i + 1;
        let mut j = ks;
        while j < n && line[j] != b'"' {
            j += 1;
        }
        let key = &line[ks.min(n)..j.min(n)];
        i = j + 1;
        while i < n && line[i] != b':' {
            i += 1;
        }
        i += 1;
        // value: up to the comma or brace that ends it at depth 0
        let vs = i;
        let mut depth = 0i32;
        let mut in_str = false;
        while i < n {
            let b = line[i];
            if in_str {
                if b == b'\\' {
                    i += 1;
                } else if b == b'"' {
                    in_str = false;
                }
            } else {
                match b {
                    b'"' => in_str = true,
                    b'{' | b'[' => depth += 1,
                    b'}' | b']' if depth > 0 => depth -= 1,
                    b',' | b'}' if depth == 0 => break,
                    _ => {}
                }
            }
            i += 1;
        }
        out.push((key, &line[vs.min(n)..i.min(n)]));
        if i < n && line[i] == b'}' {
            break;
        }
        i += 1;
    }
    out
}

/// What counting a line gave: output bytes (in order), messages for stderr, and whether the
/// input was refused.
#[derive(Default)]
struct Done {
    out: Vec<u8>,
    errors: Vec<String>,
    rejected: bool,
}

struct Counter<'a> {
    cat: &'a Catalogue,
    json: bool,
    ascii: bool,
    fields: Option<&'a Fields>,
}

impl Counter<'_> {
    fn line(&self, text: &str, line: &Line, number: Option<usize>, done: &mut Done) {
        let place = || number.map(|n| format!("line {n}: ")).unwrap_or_default();
        match line {
            Line::Text(r) => self.one(text.get(r.clone()).unwrap_or_default(), number, done),
            Line::NotUtf8(lossy) => {
                let shown = excerpt(lossy.trim());
                done.errors.push(format!(
                    "{}not UTF-8 text: {}",
                    place(),
                    diag::quote(&shown)
                ));
                if self.json {
                    let _ = json::write_message(&mut done.out, &shown, "not UTF-8 text");
                }
                done.rejected = true;
            }
            Line::TooLong(len, start) => {
                let why = format!(
                    "line of {len} bytes is longer than {MAX_LINE} (no formula is that long); \
                     it starts: {}",
                    diag::quote(start)
                );
                done.errors.push(format!("{}{why}", place()));
                if self.json {
                    let _ = json::write_message(&mut done.out, start, &why);
                }
                done.rejected = true;
            }
        }
    }

    fn one(&self, input: &str, number: Option<usize>, done: &mut Done) {
        // only the formula and the charge asked for: no count beyond the check that the
        // complex can exist (a salt of two complex ions takes the full path below)
        if let (true, Some(f)) = (self.json, self.fields.filter(|f| f.parse_only())) {
            match chem::parse(input, self.cat) {
                Ok(c) => {
                    match chem::count::impossible(&c) {
                        Some(why) => self.impossible(input, &why, number, done),
                        None => json::append_parsed_fields(&mut done.out, input, &c, &f.0),
                    }
                    return;
                }
                Err(e) if e.is_two_ions() => {}
                Err(e) => return self.unreadable(input, &e, number, done),
            }
        }
        // one complex, as nearly every line is; a salt of two complex ions goes through
        // `parse_ions`, which reads each ion
        let parsed = match chem::parse(input, self.cat) {
            Ok(c) => {
                let mut r = chem::count(&c);
                if self.fields.is_none_or(|f| f.wants_positions()) {
                    chem::geometry::annotate(&c, &mut r);
                }
                Ok(smallvec::smallvec![r])
            }
            Err(e) if e.is_two_ions() => {
                chem::parse_ions(input, self.cat).map(|ions| ions.iter().map(chem::count).collect())
            }
            Err(e) => Err(e),
        };
        match parsed {
            Ok(reports) => {
                let reports: smallvec::SmallVec<[chem::count::Report; 1]> = reports;
                if let Some(why) = reports.iter().find_map(|r| r.impossible()) {
                    return self.impossible(input, &why, number, done);
                }
                let several = reports.len() > 1;
                for report in &reports {
                    if self.json {
                        let at = done.out.len();
                        match self.fields {
                            None => json::append_report(&mut done.out, input, report),
                            Some(f) => {
                                json::append_report_fields(&mut done.out, input, report, &f.0)
                            }
                        }
                        if several {
                            // a salt of two complex ions: one line per ion, named
                            let role = match report.charge {
                                q if q > 0 => "cation",
                                q if q < 0 => "anion",
                                _ => "neutral",
                            };
                            let field = format!("\"ion\":\"{role}\",");
                            let open = at + 1;
                            done.out.splice(open..open, field.bytes());
                        }
                    } else {
                        let mut t = Vec::with_capacity(1024);
                        let _ = text::write_report(&mut t, input, report, self.ascii);
                        let _ = diag::write_clean(&mut done.out, &t);
                    }
                }
            }
            Err(e) => self.unreadable(input, &e, number, done),
        }
    }

    /// A formula read but describing no real complex (`why`): refused, with its line.
    fn impossible(&self, input: &str, why: &str, number: Option<usize>, done: &mut Done) {
        let place = number.map(|n| format!("line {n}: ")).unwrap_or_default();
        done.errors
            .push(format!("{place}{}: {why}", diag::quote(input)));
        if self.json {
            let _ = json::write_message(&mut done.out, input, why);
        }
        done.rejected = true;
    }

    /// A formula that could not be read: refused, with its line.
    fn unreadable(
        &self,
        input: &str,
        e: &chem::ParseError,
        number: Option<usize>,
        done: &mut Done,
    ) {
        let place = number.map(|n| format!("line {n}: ")).unwrap_or_default();
        done.errors.push(format!("{place}{}", diag::parse_error(e)));
        if self.json {
            let _ = json::write_error(&mut done.out, input, e);
        }
        done.rejected = true;
    }

    fn run(&self, chunk: &Chunk) -> Done {
        let mut done = Done::default();
        for (n, l) in &chunk.lines {
            self.line(&chunk.text, l, Some(*n), &mut done);
        }
        done
    }
}

fn excerpt(text: &str) -> String {
    let mut t: String = text.chars().take(EXCERPT).collect();
    if t.len() < text.len() {
        t.push('…');
    }
    t
}

/// Write a result: its output, then its messages.
fn emit(done: Done, out: &mut impl Write) -> Result<bool, CliError> {
    if !done.errors.is_empty() {
        // what came before the error reaches stdout first
        out.write_all(&done.out).context("writing results")?;
        out.flush().context("writing results")?;
        diag::errors(&done.errors);
    } else {
        out.write_all(&done.out).context("writing results")?;
    }
    Ok(done.rejected)
}

/// Read, count and write at once: this thread reads chunks of lines, `threads` workers count
/// them, and a writer puts the results out in input order as they come.
fn pipeline(
    counter: &Counter,
    reader: &mut (dyn BufRead + Send),
    threads: usize,
    out: &mut impl Write,
) -> Result<bool, CliError> {
    use std::sync::mpsc;
    use std::sync::Mutex;
    let (work_tx, work_rx) = mpsc::sync_channel::<(usize, Chunk)>(threads * 2);
    let (done_tx, done_rx) = mpsc::sync_channel::<(usize, Done)>(threads * 2);
    let work_rx = Mutex::new(work_rx);
    // set when the output fails (a closed pipe): the reader stops, the workers run dry
    let stop = std::sync::atomic::AtomicBool::new(false);
    std::thread::scope(|s| -> Result<bool, CliError> {
        for _ in 0..threads.max(1) {
            let done_tx = done_tx.clone();
            let work_rx = &work_rx;
            s.spawn(move || loop {
                let next = match work_rx.lock() {
                    Ok(rx) => rx.recv(),
                    Err(_) => return,
                };
                let Ok((seq, lines)) = next else {
                    return;
                };
                if done_tx.send((seq, counter.run(&lines))).is_err() {
                    return;
                }
            });
        }
        drop(done_tx);
        let stop = &stop;
        let reading = s.spawn(move || {
            let r = read_chunks(reader, |seq, lines| {
                !stop.load(std::sync::atomic::Ordering::Relaxed)
                    && work_tx.send((seq, lines)).is_ok()
            });
            drop(work_tx);
            r
        });
        // this thread writes: results in sequence order, whatever order the workers finish in
        let mut waiting = std::collections::BTreeMap::new();
        let mut next = 0usize;
        let mut any = false;
        let mut wrote: Result<(), CliError> = Ok(());
        for (seq, done) in done_rx {
            if wrote.is_err() {
                continue; // drain what is in flight so no worker waits on a full channel
            }
            waiting.insert(seq, done);
            while let Some(d) = waiting.remove(&next) {
                next += 1;
                match emit(d, out) {
                    Ok(r) => any |= r,
                    Err(e) => {
                        stop.store(true, std::sync::atomic::Ordering::Relaxed);
                        wrote = Err(e);
                        waiting.clear();
                        break;
                    }
                }
            }
        }
        let read = reading
            .join()
            .unwrap_or_else(|_| Err(CliError::Failure(anyhow::anyhow!("the reader stopped"))));
        wrote?;
        read?;
        Ok(any)
    })
}

/// Numbered lines handed to a worker, with the text of their formulas in one buffer.
#[derive(Default)]
struct Chunk {
    text: String,
    lines: Vec<(usize, Line)>,
}

impl Chunk {
    fn new() -> Chunk {
        Chunk {
            text: String::with_capacity(CHUNK * 32),
            lines: Vec::with_capacity(CHUNK),
        }
    }
}

/// Read the batch input into numbered chunks of lines and hand each to `send` (false: stop).
fn read_chunks(
    reader: &mut (dyn BufRead + Send),
    mut send: impl FnMut(usize, Chunk) -> bool,
) -> Result<(), CliError> {
    let mut raw = Vec::with_capacity(256);
    let mut number = 0usize;
    let mut seq = 0usize;
    let mut chunk = Chunk::new();
    loop {
        let got = read_bounded(reader, &mut raw, MAX_LINE).context("reading the batch input")?;
        let end = got.is_none();
        if let Some(len) = got {
            number += 1;
            let mut bytes = raw.as_slice();
            if number == 1 {
                // a byte-order mark from a Windows editor or spreadsheet export
                bytes = bytes.strip_prefix(b"\xef\xbb\xbf").unwrap_or(bytes);
            }
            let line = if len > MAX_LINE {
                let head = &bytes[..bytes.len().min(EXCERPT)];
                Some(Line::TooLong(len, excerpt(&String::from_utf8_lossy(head))))
            } else {
                match std::str::from_utf8(bytes) {
                    Ok(t) => {
                        let f = t.trim();
                        (!f.is_empty() && !f.starts_with('#')).then(|| {
                            let at = chunk.text.len();
                            chunk.text.push_str(f);
                            Line::Text(at..chunk.text.len())
                        })
                    }
                    Err(_) => Some(Line::NotUtf8(String::from_utf8_lossy(bytes).into_owned())),
                }
            };
            if let Some(l) = line {
                chunk.lines.push((number, l));
            }
        }
        if chunk.lines.len() >= CHUNK || (end && !chunk.lines.is_empty()) {
            if !send(seq, std::mem::replace(&mut chunk, Chunk::new())) {
                return Ok(());
            }
            seq += 1;
        }
        if end {
            return Ok(());
        }
    }
}

/// Count formulas from the arguments and/or a batch file.
pub fn count(args: &CountArgs, ascii: bool) -> Outcome {
    if args.formulas.is_empty() && args.batch.is_none() {
        return rejected(
            "no formula given\n  try: nonet count 'CpFe(CO)2Me'  or  nonet count --batch FILE",
        );
    }
    let cat = load_catalogue();
    let fields = Fields::new(&args.fields, &cat)?;
    let counter = Counter {
        cat: &cat,
        json: args.json,
        ascii,
        fields: fields.as_ref(),
    };
    let stdout = io::stdout();
    let mut out = BufWriter::with_capacity(1 << 16, stdout.lock());
    let mut any_rejected = false;
    for f in &args.formulas {
        let mut done = Done::default();
        counter.line(f, &Line::Text(0..f.len()), None, &mut done);
        any_rejected |= emit(done, &mut out)?;
    }
    if let Some(path) = &args.batch {
        let mut reader: Box<dyn BufRead + Send> = if path.as_os_str() == "-" {
            Box::new(io::BufReader::with_capacity(1 << 16, io::stdin()))
        } else {
            let meta = std::fs::metadata(path)
                .with_context(|| format!("cannot open batch file {}", path.display()))?;
            if meta.is_dir() {
                return rejected(format!(
                    "batch file {} is a directory; give a file of formulas, one per line",
                    diag::quote(&path.display().to_string())
                ));
            }
            let file = std::fs::File::open(path)
                .with_context(|| format!("cannot open batch file {}", path.display()))?;
            Box::new(io::BufReader::with_capacity(1 << 16, file))
        };
        let threads = std::thread::available_parallelism().map_or(1, |n| n.get());
        any_rejected |= pipeline(&counter, reader.as_mut(), threads, &mut out)?;
    }
    out.flush().context("writing results")?;
    Ok(if any_rejected {
        Status::Rejected
    } else {
        Status::Ok
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_long_line_is_cut_but_consumed() {
        let text = format!("{}\nCr(CO)6\n", "x".repeat(1000));
        let mut r = io::BufReader::with_capacity(16, text.as_bytes());
        let mut buf = Vec::new();
        assert_eq!(
            read_bounded(&mut r, &mut buf, 100).ok().flatten(),
            Some(1000)
        );
        assert!(buf.len() <= 101);
        assert_eq!(read_bounded(&mut r, &mut buf, 100).ok().flatten(), Some(7));
        assert_eq!(buf, b"Cr(CO)6");
        assert_eq!(read_bounded(&mut r, &mut buf, 100).ok().flatten(), None);
    }

    #[test]
    fn fields_are_split_at_the_top_level() {
        let line = br#"{"a":1,"b":{"c":[1,2,{"d":"x,}"}]},"e":"q\"r","f":[]}"#;
        let keys: Vec<String> = top_level(line)
            .iter()
            .map(|(k, v)| {
                format!(
                    "{}={}",
                    String::from_utf8_lossy(k),
                    String::from_utf8_lossy(v)
                )
            })
            .collect();
        assert_eq!(
            keys,
            [
                r#"a=1"#,
                r#"b={"c":[1,2,{"d":"x,}"}]}"#,
                r#"e="q\"r""#,
                "f=[]"
            ]
        );
    }
}

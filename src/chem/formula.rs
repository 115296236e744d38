//! The formula parser for the notation chemists write in papers, and its error type.
//!
//! Accepted: metal first or ligands first (`CpFe(CO)2Me`, `[Fe(CO)2(η5-C5H5)(CH3)]`), square
//! brackets with a trailing charge (`[Co(NH3)6]3+`), multipliers on any group, several metals
//! (`Os3(CO)12`), single-metal fragments (`[CpFe(CO)2]2`), mode prefixes in Greek or ASCII
//! (`η5-`, `eta5-`, `κ2-`, `μ-`, `mu3-`, or a word such as `bent-`). Ligand names come from the
//! catalogue through [`LigandLookup`]; inside parentheses a whole catalogue entry wins over
//! element symbols, so `Pd(PtBu3)2` is palladium with two tri-tert-butylphosphines.

use std::borrow::Cow;
use std::fmt;
use std::sync::Arc;

use super::complex::{BoundLigand, Complex, MetalSite};
use super::element::{self, is_symbol_shaped, Element};
use super::frac::Frac;
use super::ligand::{normalize_label, LigandDef};
use super::molecule::Molecule;
use super::species::SubstrateDef;

/// Where the parser finds ligands. The catalogue implements it; tests may use a small map.
pub trait LigandLookup {
    /// The ligand whose key, formula or alias is exactly `token`.
    fn exact(&self, token: &str) -> Option<&Arc<LigandDef>>;
    /// The ligand with the longest formula token that `text` starts with and whose length (in
    /// bytes) `accept` allows, and that length.
    fn longest_prefix(
        &self,
        text: &str,
        accept: &dyn Fn(usize) -> bool,
    ) -> Option<(&Arc<LigandDef>, usize)>;
    /// The nearest known token to an unknown one, for "did you mean".
    fn suggest(&self, token: &str) -> Option<String>;
    /// The substrate or reagent whose key, formula or alias is exactly `token`.
    fn substrate(&self, _token: &str) -> Option<&Arc<SubstrateDef>> {
        None
    }
    /// The catalogue ligand with this structure (free species, or group with its `*`).
    fn ligand_like(&self, _m: &Molecule) -> Option<&Arc<LigandDef>> {
        None
    }
    /// The substrate with this structure.
    fn substrate_like(&self, _m: &Molecule) -> Option<&Arc<SubstrateDef>> {
        None
    }
}

/// A formula that could not be read: what is wrong and where.
#[derive(Debug, Clone, PartialEq)]
pub struct ParseError {
    pub input: String,
    pub message: String,
    /// 0-based column (in characters) of the offending text in `input`.
    pub column: usize,
    pub width: usize,
    pub suggestion: Option<String>,
    pub hint: Option<String>,
}

impl ParseError {
    /// The error with the input underneath and a caret under the problem.
    pub fn render(&self) -> String {
        self.render_with(|t| t.to_string())
    }

    /// The message with the input shown through `show` (an ASCII spelling, escaped control
    /// characters) and the caret under the same characters of the shown text.
    pub fn render_with(&self, show: impl Fn(&str) -> String) -> String {
        let chars: Vec<char> = self.input.chars().collect();
        let cut = |n: usize| -> String { chars[..n.min(chars.len())].iter().collect() };
        let before = show(&cut(self.column)).chars().count();
        let through = show(&cut(self.column + self.width.max(1))).chars().count();
        let mut out = format!(
            "{} (column {})\n  {}\n  ",
            show(&self.message),
            self.column + 1,
            show(&self.input)
        );
        out.push_str(&" ".repeat(before));
        out.push_str(&"^".repeat(through.saturating_sub(before).max(1)));
        if let Some(s) = &self.suggestion {
            out.push_str(&format!("\n  did you mean '{}'?", show(s)));
        }
        if let Some(h) = &self.hint {
            out.push_str(&format!("\n  {}", show(h)));
        }
        out
    }
}

impl fmt::Display for ParseError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{} (column {})", self.message, self.column + 1)?;
        if let Some(s) = &self.suggestion {
            write!(f, "; did you mean '{s}'?")?;
        }
        Ok(())
    }
}

impl std::error::Error for ParseError {}

/// The text with braces that group rather than hold SMILES turned into square brackets: a
/// metal fragment ("{Rh(cod)}2", "{Cp*IrCl}") or a catalogue ligand ("{dF(CF3)ppy}2"). None
/// when no brace is such a group. Brackets are one byte either way, so columns keep.
fn curly_groups(text: &str, lookup: &dyn LigandLookup) -> Option<String> {
    if !text.contains('{') {
        return None;
    }
    let mut out = text.as_bytes().to_vec();
    let mut changed = false;
    let mut from = 0;
    while let Some(open) = text[from..].find('{').map(|i| i + from) {
        let Some(close) = text[open..].find('}').map(|i| i + open) else {
            break;
        };
        let inner = &text[open + 1..close];
        // a metal fragment has a metal's symbol and none of SMILES' bond or atom marks
        let groups = lookup.exact(inner).is_some()
            || (has_metal_token(inner) && !inner.contains(['=', '#', '@', '[', '/', '\\']));
        if groups && !inner.contains('{') {
            out[open] = b'[';
            out[close] = b']';
            changed = true;
        }
        from = close + 1;
    }
    if !changed {
        return None;
    }
    String::from_utf8(out).ok()
}

/// Metal fragments the trade writes by a short name (common practice): Fp for CpFe(CO)2 and
/// Fp* with Cp*.
const FRAGMENTS: &[(&str, &str)] = &[("Fp*", "[Cp*Fe(CO)2]"), ("Fp", "[CpFe(CO)2]")];

/// The text with each fragment's short name written out, the column of every character of the
/// result, and the names expanded; None when there is none. A name counts only as a whole
/// token: at the start or after a bracket or space, and not followed by a small letter.
#[allow(clippy::type_complexity)]
fn expand_fragments(
    text: &str,
    cols: Option<&[usize]>,
) -> Option<(String, Vec<usize>, Vec<(&'static str, &'static str)>)> {
    if !text.contains("Fp") {
        return None;
    }
    let mut out = String::with_capacity(text.len() + 16);
    let mut out_cols = Vec::with_capacity(text.len() + 16);
    let mut names = Vec::new();
    let col_of = |i: usize| cols.and_then(|c| c.get(i).copied()).unwrap_or(i);
    let mut prev: Option<char> = None;
    let mut chars = text.char_indices().enumerate().peekable();
    while let Some((ci, (bi, c))) = chars.next() {
        let at_token = prev.is_none_or(|p| matches!(p, '[' | '(' | ' ' | '{' | '·'));
        let hit = at_token
            .then(|| {
                FRAGMENTS.iter().find(|(short, _)| {
                    text[bi..].starts_with(short)
                        && !text[bi + short.len()..].starts_with(|x: char| x.is_ascii_lowercase())
                })
            })
            .flatten();
        if let Some(&(short, long)) = hit {
            out.push_str(long);
            out_cols.extend(std::iter::repeat_n(col_of(ci), long.chars().count()));
            if !names.contains(&(short, long)) {
                names.push((short, long));
            }
            // skip the rest of the short name
            for _ in 1..short.chars().count() {
                chars.next();
            }
            prev = short.chars().last();
            continue;
        }
        out.push(c);
        out_cols.push(col_of(ci));
        prev = Some(c);
    }
    if names.is_empty() {
        return None;
    }
    Some((out, out_cols, names))
}

/// "neutral" or "anionic": how a ligand with `x` X functions is charged in the ionic model.
fn charge_word(x: u8) -> &'static str {
    match x {
        0 => "neutral",
        1 => "anionic",
        _ => "dianionic",
    }
}

/// Where lattice water or solvent starts: the first centred or plain dot outside SMILES
/// braces (a dot inside braces is a bond).
fn top_level_dot(text: &str) -> Option<usize> {
    let mut depth = 0i32;
    text.char_indices().find_map(|(i, c)| {
        match c {
            '{' => depth += 1,
            '}' => depth -= 1,
            '·' | '.' if depth == 0 => return Some(i),
            _ => {}
        }
        None
    })
}

/// Two-letter main-group metals: typed as the central atom they split into a one-letter
/// symbol and a stray letter ("Na" as N + a).
const MAIN_GROUP_METALS: &[&str] = &[
    "Li", "Na", "Mg", "Al", "Ca", "Ga", "Rb", "Sr", "In", "Sn", "Sb", "Cs", "Ba", "Tl", "Pb", "Bi",
    "Be", "Ge", "Po", "Fr", "Ra",
];

const MAX_MULTIPLIER: u32 = 999;
const MAX_METALS: usize = 64;
const MAX_DEPTH: usize = 16;
const MAX_LIGANDS: u32 = 9_999;

/// Longest formula read, in characters: a complex fits in far fewer, and the bound keeps the
/// parser's time small on any input.
const MAX_INPUT: usize = 1_000;

/// Most ligand units one metal can carry: coordination numbers stop near 12 (f block, with
/// bidentate ligands); twice that still admits every real formula.
const MAX_PER_METAL: u32 = 24;

/// Parse a formula into a canonical [`Complex`].
pub fn parse(input: &str, lookup: &dyn LigandLookup) -> Result<Complex, ParseError> {
    let whole = |message: String, hint: &str| ParseError {
        input: input.chars().take(80).collect(),
        message,
        column: 0,
        width: 1,
        suggestion: None,
        hint: Some(hint.to_string()),
    };
    let length = input.chars().count();
    if length > MAX_INPUT {
        return Err(whole(
            format!("the formula is {length} characters long"),
            "a formula holds at most 1000 characters; check for pasted text",
        ));
    }
    let (text, cols) = normalize(input);
    // braces a paper uses as a third kind of bracket ("[{Rh(cod)}2(μ-Cl)2]")
    let (text, braces) = match curly_groups(&text, lookup) {
        Some(t) => (Cow::Owned(t), true),
        None => (text, false),
    };
    // the trade's names for metal fragments ("FpMe" is CpFe(CO)2Me)
    let (text, cols, fragments) = match expand_fragments(&text, cols.as_deref()) {
        Some((t, c, names)) => (Cow::Owned(t), Some(c), names),
        None => (text, cols, Vec::new()),
    };
    // lattice water or solvent after a centred or plain dot ("K[PtCl3(C2H4)]·H2O") is not
    // part of the complex, unless the metal needs it; a dot inside SMILES braces is a bond
    let dot = top_level_dot(&text);
    let (body, solvent) = match dot {
        Some(i) => (
            &text[..i],
            Some(text[i..].trim_start_matches(['·', '.']).trim()),
        ),
        None => (&text[..], None),
    };
    let column_of = |byte: usize| -> usize {
        let idx = text[..byte].chars().count();
        match &cols {
            Some(c) => c.get(idx).copied().unwrap_or(length),
            None => idx,
        }
    };
    if let Some(s) = solvent {
        let named = s.chars().any(|c| c.is_alphabetic());
        if !s.is_empty() && !named {
            return Err(ParseError {
                input: input.to_string(),
                message: format!("'{s}' after the dot is neither a multiplier nor a solvent"),
                column: column_of(body.len()),
                width: 1,
                suggestion: None,
                hint: Some(
                    "multipliers are whole numbers; lattice solvent goes after the dot \
                     (·2H2O)"
                        .into(),
                ),
            });
        }
    }
    let body_cols = cols
        .as_ref()
        .map(|c| &c[..body.chars().count().min(c.len())]);
    let mut complex = match parse_body(body, body_cols, input, lookup, false) {
        // a ligand written before the dot and the metal after it ("Me2S·AuCl"): the adduct
        // of the two
        Err(e) if e.message == "no metal in the formula" => match solvent {
            // (once: the swapped text has its metal token first, so it never swaps back)
            Some(s)
                if !s.is_empty()
                    && !body.trim().is_empty()
                    && has_metal_token(s)
                    && !has_metal_token(body) =>
            {
                return parse(&format!("{s}·{}", body.trim()), lookup)
            }
            _ => return Err(e),
        },
        other => other?,
    };
    // a token read as a ligand where it could be an element, or the other way round, when
    // that reading gives an impossible count: the other reading, if it counts
    if complex
        .notes
        .iter()
        .any(|n| n.contains("' could be the ligand"))
        && super::count::count(&complex).impossible().is_some()
    {
        if let Ok(other) = parse_body(body, body_cols, input, lookup, true) {
            if super::count::count(&other).impossible().is_none() {
                complex = other;
            }
        }
    }
    // a salt written without brackets ("Ru(bpy)3Cl2", "Cu(MeCN)4PF6"): anions at the end that
    // would take a metal past 18 e are counter-ions
    if let Some(better) = unbracketed_salt(body, &complex, lookup) {
        complex = better;
    }
    if let Some(acid) = unbracketed_acid(body, &complex, lookup) {
        complex = acid;
    }
    for site in &complex.sites {
        let units: u32 = site.ligands.iter().map(|b| b.count).sum();
        if units > MAX_PER_METAL {
            return Err(whole(
                format!("{} carries {units} ligands", site.element.symbol),
                "no metal holds more than 24 ligands; check the multipliers",
            ));
        }
    }
    if let Some(s) = solvent.filter(|s| !s.is_empty()) {
        solvate(&mut complex, s, lookup);
    }
    for (short, long) in fragments {
        complex.notes.push(format!(
            "{short} is the fragment {long}, read as written out"
        ));
    }
    for r in isotope_labels(input) {
        let mass: String = input.chars().skip(r.start).take(r.len()).collect();
        let mut symbol = input.chars().skip(r.end);
        let element: String = symbol
            .next()
            .into_iter()
            .chain(symbol.next().filter(char::is_ascii_lowercase))
            .collect();
        complex.notes.push(format!(
            "{mass}{element}: {mass} is a mass number, an isotope label; counted as {element}"
        ));
    }
    if braces {
        complex.notes.push(
            "braces around a metal fragment or a catalogue ligand read as brackets; SMILES in \
             braces is read as SMILES"
                .into(),
        );
    }
    Ok(complex)
}

/// `flip`: read a token that could be a ligand or an element the other way from the rule (see
/// `Parser::bare`), where both readings are possible.
fn parse_body(
    text: &str,
    cols: Option<&[usize]>,
    input: &str,
    lookup: &dyn LigandLookup,
    flip: bool,
) -> Result<Complex, ParseError> {
    let mut p = Parser {
        input,
        text,
        cols,
        lookup,
        metals: 0,
        labels: Vec::new(),
        readings: Vec::new(),
        flip,
    };
    let mut notes = Vec::new();
    let (start, stereo) = p.isomer_prefix(&mut notes);
    let (start, body_end, written_charge, counter) = match p.salt(start, &mut notes)? {
        Some((open, end, written, counter)) => (open, end, written, counter),
        None => {
            let (body_end, written_charge) = p.split_charge(start)?;
            let (start, body_end, counter) = p.counter_ions(start, body_end, &mut notes)?;
            (start, body_end, written_charge, counter)
        }
    };
    let charge = match (written_charge, counter) {
        (Some(w), Some(c)) if w != c => {
            return Err(p
                .error(
                    start,
                    body_end - start,
                    format!("the written charge {w:+} disagrees with the counter-ions ({c:+})"),
                )
                .with_hint("give the charge or the counter-ions, not both"))
        }
        (Some(w), _) => w,
        (None, Some(c)) => c,
        (None, None) => 0,
    };
    let mut pos = start;
    let root = p.sequence(&mut pos, body_end, None, 0)?;
    if pos < body_end {
        return Err(p.error(pos, 1, "unexpected text".into()));
    }
    if root.metal_total() == 0 {
        return Err(ParseError {
            input: input.to_string(),
            message: "no metal in the formula".into(),
            column: 0,
            width: input.chars().count().max(1),
            suggestion: None,
            hint: Some("write the metal's symbol, e.g. Fe(CO)5 or [Co(NH3)6]3+".into()),
        });
    }
    notes.append(&mut p.readings);
    let mut complex = Complex {
        sites: Vec::new(),
        shared: Vec::new(),
        charge,
        notes,
        stereo,
    };
    flatten(root, &mut complex);
    complex.canonicalize();
    let n = complex.metal_count();
    // a bridge written without its mode spans as many metals as there are, up to its own
    // reach: C in Fe5C(CO)15 is μ5
    let mut reset = false;
    for b in complex
        .sites
        .iter_mut()
        .flat_map(|s| s.ligands.iter_mut())
        .chain(complex.shared.iter_mut())
    {
        if !b.pinned && b.mode().bridges as usize > n {
            if let Some(i) = (0..b.ligand.modes.len())
                .filter(|&i| b.ligand.modes[i].bridges as usize <= n)
                .max_by_key(|&i| b.ligand.modes[i].bridges)
            {
                b.mode = i;
                reset = true;
            }
        }
    }
    if reset {
        complex.canonicalize();
    }
    for (_, b) in complex.all_ligands() {
        let m = b.mode();
        if m.bridges as usize > n {
            return Err(ParseError {
                input: input.to_string(),
                message: format!(
                    "{}-{} bridges {} metals but the formula has {}",
                    m.label, b.ligand.key, m.bridges, n
                ),
                column: 0,
                width: input.chars().count().max(1),
                suggestion: None,
                hint: Some("write the terminal form, or add the other metals".into()),
            });
        }
    }
    super::fit::fit_modes(&mut complex);
    if !p.labels.is_empty() {
        let report = super::count::count(&complex);
        for (m, state) in &p.labels {
            let roman = roman(*state);
            match report.metals.iter().find(|r| r.symbol == m.symbol) {
                Some(r) if r.oxidation_state == super::frac::Frac::int(*state as i64) => {
                    complex.notes.push(format!(
                        "{}({roman}) is a label; it agrees with the oxidation state counted",
                        m.symbol
                    ))
                }
                Some(r) => complex.notes.push(format!(
                    "{}({roman}) is a label, but the formula counts {} as {}: check the charge \
                     or the ligands",
                    m.symbol,
                    m.symbol,
                    r.oxidation_state.signed()
                )),
                None => {}
            }
        }
    }
    let mut read = Vec::new();
    for (_, b) in complex.all_ligands() {
        if b.ligand.derived && !read.contains(&b.ligand.key) {
            read.push(b.ligand.key.clone());
        }
    }
    for key in read {
        complex.notes.push(format!(
            "{key} is not in the catalogue: read from its formula as written"
        ));
    }
    // a pincer papers write in two protonation forms: which one was read, and the other's name
    let mut told: Vec<&str> = Vec::new();
    let mut forms = Vec::new();
    for (_, b) in complex.all_ligands() {
        let Some(other) = b.ligand.counterpart.as_deref() else {
            continue;
        };
        if told.contains(&b.ligand.key.as_str()) {
            continue;
        }
        told.push(&b.ligand.key);
        let Some((o, other_mode)) = p
            .lookup
            .exact(other)
            .and_then(|o| Some((o, o.modes.first()?)))
        else {
            continue;
        };
        let (this_class, other_class) = (b.mode().class, other_mode.class);
        forms.push(format!(
            "{} read as the {} form ({this_class}); {} is its {} form ({other_class}): write {} \
             for that",
            b.ligand.key,
            charge_word(this_class.x),
            o.key,
            charge_word(other_class.x),
            o.key
        ));
    }
    complex.notes.extend(forms);
    Ok(complex)
}

/// One ion of a salt as written: its span, the text inside its brackets (or a counter-ion's
/// name), and its charge (as written, or a counter-ion's own times its count).
struct SaltUnit<'t> {
    start: usize,
    end: usize,
    inner: &'t str,
    bracketed: bool,
    charge: Option<i32>,
}

/// The ions of a salt written side by side from `start` ("[Cp2Co]+[PF6]-", "K2[PtCl4]",
/// "[Fe(H2O)6](BF4)2", "[Cp2Fe][PF6]2"); None when the text is not such a row.
fn salt_units(t: &str, start: usize) -> Option<Vec<SaltUnit<'_>>> {
    let b = t.as_bytes();
    let mut units = Vec::new();
    let mut pos = start;
    while pos < t.len() {
        if b[pos] == b' ' {
            pos += 1;
            continue;
        }
        if b[pos] == b'[' {
            let mut depth = 0usize;
            let close = (pos..b.len()).find(|&i| {
                match b[i] {
                    b'[' => depth += 1,
                    b']' => depth = depth.saturating_sub(1),
                    _ => return false,
                }
                depth == 0
            })?;
            let inner = &t[pos + 1..close];
            // a charge right after the bracket: "+", "2-", "^3+"
            let mut q = close + 1;
            if b.get(q) == Some(&b'^') {
                q += 1;
            }
            let digits = b[q.min(b.len())..]
                .iter()
                .take_while(|c| c.is_ascii_digit())
                .count();
            let charge = match b.get(q + digits) {
                Some(&(s @ b'+' | s @ b'-')) => {
                    let n: i32 = if digits == 0 {
                        1
                    } else {
                        t[q..q + digits].parse().unwrap_or(99)
                    };
                    q += digits + 1;
                    Some(if s == b'+' { n } else { -n })
                }
                // a count on a bracketed counter-ion ("[PF6]2"); on anything else a multiplier
                // of a dimer ("[CpFe(CO)2]2"), not a salt
                _ if digits > 0 => {
                    let k = known_ion_charge(inner)?;
                    let n: i32 = t[q..q + digits].parse().unwrap_or(1);
                    q += digits;
                    Some(k * n)
                }
                _ => {
                    q = close + 1;
                    None
                }
            };
            units.push(SaltUnit {
                start: pos,
                end: close + 1,
                inner,
                bracketed: true,
                charge,
            });
            pos = q;
            continue;
        }
        // a known counter-ion without brackets, with a count: "K2", "(BF4)2", "Cl3"
        let rest = &t[pos..];
        // no name starts with '(': a parenthesized one is looked up by what follows it
        let named = rest.strip_prefix('(').unwrap_or(rest);
        let (name, q) = ions_starting(named, IonTable::Both).find(|(n, _)| {
            opens_with(rest, n)
                || rest
                    .strip_prefix('(')
                    .is_some_and(|r| opens_with(r, n) && r[n.len()..].starts_with(')'))
        })?;
        let paren = rest.starts_with('(');
        let len = name.len() + if paren { 2 } else { 0 };
        // "K" must not be the start of a longer symbol or ligand ("Kr", "Cl" in "Cl2Pd")
        if !paren && rest[len..].starts_with(|c: char| c.is_ascii_lowercase()) {
            return None;
        }
        let digits = rest[len..].bytes().take_while(u8::is_ascii_digit).count();
        let n: i32 = rest[len..len + digits].parse().unwrap_or(1);
        // its charge written after it ("PF6^-", "PF6-"): the table knows it already
        let mut used = len + digits;
        let tail = &rest[used..];
        let sign_at = usize::from(tail.starts_with('^'));
        let signs = tail[sign_at..]
            .bytes()
            .take_while(u8::is_ascii_digit)
            .count();
        if tail[sign_at + signs..].starts_with(['+', '-']) {
            used += sign_at + signs + 1;
        }
        units.push(SaltUnit {
            start: pos,
            end: pos + used,
            inner: name,
            bracketed: false,
            charge: Some(q * n),
        });
        pos += used;
    }
    Some(units)
}

/// Re-read a formula whose trailing anions would put its single metal above 18 e as a
/// bracketed ion with those anions outside; None when that does not help.
fn unbracketed_salt(body: &str, complex: &Complex, lookup: &dyn LigandLookup) -> Option<Complex> {
    // an ion already in brackets says where the counter-ions are; brackets around a ligand
    // ("Ir[dF(CF3)ppy]2(dtbbpy)PF6") do not
    if complex.metal_count() != 1 || body.trim_start().starts_with('[') {
        return None;
    }
    // only when the text ends with a counter-anion's name: the count below is not free
    let tail = body
        .trim_end()
        .trim_end_matches(|c: char| c.is_ascii_digit())
        .trim_end_matches(')');
    if !ANIONS
        .iter()
        .any(|(n, _)| tail.as_bytes().last() == n.as_bytes().last() && tail.ends_with(n))
    {
        return None;
    }
    let report = super::count::count(complex);
    let m = report.metals.first()?;
    if m.electron_count <= Frac::int(18) {
        return None;
    }
    let b = body.trim_end();
    // split points after a ')' or a digit, longest anion run first
    (1..b.len())
        .filter(|&i| b.is_char_boundary(i))
        .find_map(|i| {
            let (head, tail) = b.split_at(i);
            if !head.ends_with(|c: char| c == ')' || c.is_ascii_digit()) {
                return None;
            }
            let ions = ion_list(tail, ANIONS).filter(|l| !l.is_empty())?;
            let text = format!("[{head}]{tail}");
            let mut c = parse(&text, lookup).ok()?;
            let r = super::count::count(&c);
            let n = r.metals.first()?;
            (n.electron_count <= Frac::int(18) && r.impossible().is_none()).then(|| {
                let names: Vec<&str> = ions.iter().map(|(n, _)| n.as_str()).collect();
                c.notes.push(format!(
                    "{} read as counter-ion{}: bound, the metal would have {} e; write \
                 [{head}]{tail} to say so",
                    names.join(", "),
                    if names.len() == 1 { "" } else { "s" },
                    m.electron_count
                ));
                c.stereo = complex.stereo.clone();
                c
            })
        })
}

/// Anions that make a halometallate or oxometallate acid when protons are written before the
/// metal: with only these on the metal, "H2PtCl6" is chloroplatinic acid, not a
/// dihydride (common practice; a metal hydride carries soft or π-acceptor ligands, as in
/// HCo(CO)4 and HMn(CO)5).
const ACID_ANIONS: &[&str] = &["F", "Cl", "Br", "I", "O", "OH", "CN", "NCS", "SCN", "N3"];

/// Re-read "H2PtCl6", "HAuCl4", "H2IrCl6" as acids, H2[PtCl6]: the hydrogens written before a
/// metal that carries nothing but halide, oxo, hydroxo or pseudohalide ligands are protons.
/// None when the formula is not such an acid.
fn unbracketed_acid(body: &str, complex: &Complex, lookup: &dyn LigandLookup) -> Option<Complex> {
    let t = body.trim();
    let after_h = t.strip_prefix('H')?;
    let digits = after_h.bytes().take_while(u8::is_ascii_digit).count();
    let rest = &after_h[digits..];
    if complex.metal_count() != 1 || element::symbol_prefix(rest).is_none() {
        return None;
    }
    let mut hydrides = 0;
    for (_, b) in complex.all_ligands() {
        match b.ligand.key.as_str() {
            "H" => hydrides += b.count,
            k if ACID_ANIONS.contains(&k) => {}
            _ => return None,
        }
    }
    let protons: u32 = if digits == 0 {
        1
    } else {
        after_h[..digits].parse().ok()?
    };
    // every hydride must be one of those written in front
    if hydrides != protons {
        return None;
    }
    let text = format!("H{}[{rest}]", &after_h[..digits]);
    let mut c = parse(&text, lookup).ok()?;
    let r = super::count::count(&c);
    if r.impossible().is_some() {
        return None;
    }
    c.notes.push(format!(
        "the H{} before the metal read as the acid's proton{}: {text}; write the hydride{} \
         after the metal for a hydride complex",
        &after_h[..digits],
        if protons == 1 { "" } else { "s" },
        if protons == 1 { "" } else { "s" },
    ));
    c.stereo = complex.stereo.clone();
    Some(c)
}

/// The ions of a formula: one complex, or both complex ions of a salt where each holds a
/// metal ("[Pt(NH3)4][PtCl4]", Magnus's green salt; "[Cp2Co][Co(CO)4]"), each with its charge.
/// Charges come from what is written; when neither ion's charge is written, the split that
/// gives both metals the same oxidation state is taken and the notes say so.
pub fn parse_ions(input: &str, lookup: &dyn LigandLookup) -> Result<Vec<Complex>, ParseError> {
    let e = match parse(input, lookup) {
        Ok(c) => return Ok(vec![c]),
        Err(e) if e.is_two_ions() => e,
        Err(e) => return Err(e),
    };
    let (text, _) = normalize(input);
    // lattice solvent after a dot ("·1.5H2O") stays out of both ions
    let (t, solvent) = match top_level_dot(&text) {
        Some(i) => (
            text[..i].trim(),
            Some(text[i..].trim_start_matches(['·', '.']).trim()),
        ),
        None => (text.trim(), None),
    };
    // the ions side by side, and what the known counter-ions among them give
    let Some(units) = salt_units(t, 0) else {
        return Err(e);
    };
    let mut ions: Vec<(&str, Option<i32>)> = Vec::new();
    let mut counter = 0;
    for u in &units {
        match known_ion_charge(u.inner) {
            Some(k) => counter += u.charge.unwrap_or(k),
            None => ions.push((u.inner, u.charge)),
        }
    }
    let [(a, qa), (b_ion, qb)] = ions[..] else {
        return Err(e);
    };
    let text_of = |inner: &str, q: i32| {
        let sign = if q < 0 { '-' } else { '+' };
        match q {
            0 => format!("[{inner}]"),
            1 | -1 => format!("[{inner}]{sign}"),
            _ => format!("[{inner}]{}{sign}", q.abs()),
        }
    };
    let read_pair = |q1: i32, q2: i32| -> Option<(Complex, Complex)> {
        let c1 = parse(&text_of(a, q1), lookup).ok()?;
        let c2 = parse(&text_of(b_ion, q2), lookup).ok()?;
        Some((c1, c2))
    };
    let (mut c1, mut c2, guessed) = match (qa, qb) {
        (Some(x), Some(y)) if x + y + counter == 0 => match read_pair(x, y) {
            Some((c1, c2)) => (c1, c2, false),
            None => return Err(e),
        },
        (Some(_), Some(_)) => {
            return Err(ParseError {
                message: "the ions' written charges do not add up to a neutral salt".into(),
                hint: Some("check the charges on each bracket".into()),
                ..e
            })
        }
        (Some(x), None) => match read_pair(x, -x - counter) {
            Some((c1, c2)) => (c1, c2, false),
            None => return Err(e),
        },
        (None, Some(y)) => match read_pair(-y - counter, y) {
            Some((c1, c2)) => (c1, c2, false),
            None => return Err(e),
        },
        (None, None) => {
            // the split a chemist would assume: each metal nearest its electron target
            // (cobaltocenium tetracarbonylcobaltate, 18 e each), then the same oxidation
            // state for both (Magnus's green salt, Pt(II) twice)
            let same = [1, 2, 3, 4, -1, -2, -3, -4]
                .into_iter()
                .filter_map(|q| {
                    let (c1, c2) = read_pair(q, -q - counter)?;
                    let (r1, r2) = (super::count::count(&c1), super::count::count(&c2));
                    if r1.impossible().is_some() || r2.impossible().is_some() {
                        return None;
                    }
                    let (m1, m2) = (r1.metals.first()?, r2.metals.first()?);
                    let off = |m: &super::count::MetalReport| {
                        (m.electron_count - Frac::int(m.target as i64))
                            .to_f64()
                            .abs()
                    };
                    // a metal outside its usual oxidation states ([CuCl5]2- as Cu(III)) is
                    // the less likely reading
                    let unusual = |m: &super::count::MetalReport| {
                        let usual = element::common_oxidation_states(m.symbol);
                        match m.oxidation_state.as_int() {
                            Some(os) if usual.iter().any(|&u| i64::from(u) == os) => 0.0,
                            _ if usual.is_empty() => 0.0,
                            _ => 0.75,
                        }
                    };
                    let score = off(m1)
                        + off(m2)
                        + unusual(m1)
                        + unusual(m2)
                        + if m1.oxidation_state == m2.oxidation_state {
                            0.0
                        } else {
                            0.5
                        };
                    Some((score, c1, c2))
                })
                .min_by(|a, b| a.0.partial_cmp(&b.0).unwrap_or(std::cmp::Ordering::Equal))
                .map(|(_, c1, c2)| (c1, c2));
            match same {
                Some((c1, c2)) => (c1, c2, true),
                None => {
                    return Err(ParseError {
                        hint: Some("write each ion's charge, e.g. [Pt(NH3)4]2+[PtCl4]2-".into()),
                        ..e
                    })
                }
            }
        }
    };
    for c in [&mut c1, &mut c2] {
        let role = match c.charge {
            q if q > 0 => "cation",
            q if q < 0 => "anion",
            _ => "neutral part",
        };
        c.notes.push(format!(
            "the {role} of a salt of two complex ions, counted on its own"
        ));
        if let Some(sol) = solvent.filter(|s| !s.is_empty()) {
            c.notes
                .push(format!("'{sol}' after the dot: lattice solvent, left out"));
        }
        if guessed {
            c.notes.push(
                "charges not written: taken so that each metal is nearest its electron target \
                 and in a usual oxidation state (then the same state for both); write them \
                 ([A]+[B]-) to choose another split"
                    .into(),
            );
        }
    }
    Ok(vec![c1, c2])
}

/// What follows the dot: lattice solvent (left out, with a note), or solvent the metal binds
/// when without it the metal would be implausibly low-coordinate (at most 14 e, and binding
/// keeps it within 18 e): "PdCl2·2PPh3" is PdCl2(PPh3)2, "ZrCl4·2THF" is ZrCl4(THF)2, while
/// "K[PtCl3(C2H4)]·H2O" keeps its water in the lattice. Counts as "2THF", "2 THF", "(MeCN)2";
/// "x" or "n" (an unknown count) is always lattice solvent. The note says how to flip it.
fn solvate(complex: &mut Complex, s: &str, lookup: &dyn LigandLookup) {
    let lattice = |complex: &mut Complex, why: &str| {
        complex.notes.push(format!(
            "{s} after the dot is lattice solvent, left out of the count{why}"
        ))
    };
    // "(MeCN)2", "2THF", "2 THF", "THF"
    let t = s.trim();
    let (token, n) = if let Some(inner) = t.strip_prefix('(') {
        match inner.split_once(')') {
            Some((tok, count)) => (
                tok.trim(),
                count
                    .trim()
                    .parse::<u32>()
                    .ok()
                    .or(Some(1).filter(|_| count.trim().is_empty())),
            ),
            None => (t, None),
        }
    } else {
        let digits = t.bytes().take_while(u8::is_ascii_digit).count();
        let count = if digits == 0 {
            Some(1).filter(|_| !t.starts_with(['x', 'n']) || lookup.exact(t).is_some())
        } else {
            t[..digits].parse::<u32>().ok()
        };
        let tok = if digits == 0 && count.is_none() {
            &t[1..]
        } else {
            &t[digits..]
        };
        (tok.trim(), count)
    };
    let Some(n) = n.filter(|&n| (1..=6).contains(&n)) else {
        return lattice(complex, "");
    };
    let Some(l) = lookup.exact(token) else {
        return lattice(complex, "");
    };
    if complex.metal_count() != 1 || l.modes.first().is_none_or(|m| m.class.x != 0) {
        return lattice(complex, "");
    }
    let before = super::count::count(complex);
    let Some(m) = before.metals.first() else {
        return lattice(complex, "");
    };
    let gain = Frac::int(2 * n as i64) * Frac::int(l.modes[0].class.l as i64);
    if m.electron_count > Frac::int(14) || m.electron_count + gain > Frac::int(18) {
        return lattice(
            complex,
            &format!(
                " (the metal already has {} e); to bind it, write it in the formula",
                m.electron_count
            ),
        );
    }
    let mut bound = complex.clone();
    for _ in 0..n {
        match super::edit::apply(
            &bound,
            &super::edit::Edit::Add {
                place: super::edit::Place::Site(0),
                ligand: l.clone(),
                mode: 0,
            },
        ) {
            Ok((c, _)) => bound = c,
            Err(_) => return lattice(complex, ""),
        }
    }
    bound.notes = std::mem::take(&mut complex.notes);
    bound.stereo = complex.stereo.take();
    bound.notes.push(format!(
        "{s} after the dot is bound to the metal: without it the metal would have only {} e; \
         to count it as lattice solvent, leave it out of the formula",
        m.electron_count
    ));
    *complex = bound;
}

/// Counter-cations written before a bracketed complex ion (`K3[Fe(CN)6]`), with their charges.
const CATIONS: &[(&str, i32)] = &[
    ("K(18-crown-6)", 1),
    ("K(15-crown-5)2", 1),
    ("K(15-c-5)2", 1),
    ("Na(15-crown-5)", 1),
    ("K(18-c-6)", 1),
    ("K(crypt-222)", 1),
    ("K(2.2.2-crypt)", 1),
    ("Na(15-crown-5)", 1),
    ("Na(18-crown-6)", 1),
    ("Li(12-crown-4)", 1),
    ("Li(THF)4", 1),
    ("Li(THF)3", 1),
    ("Li(THF)2", 1),
    ("Li(THF)x", 1),
    ("Na(THF)x", 1),
    ("Na(THF)n", 1),
    ("K(THF)x", 1),
    ("Li(TMEDA)", 1),
    ("Li(tmeda)", 1),
    ("HNEt3", 1),
    ("NHEt3", 1),
    ("HNiPr2Et", 1),
    ("n-Bu4N", 1),
    ("nBu4N", 1),
    ("NBu4", 1),
    ("Bu4N", 1),
    ("NEt4", 1),
    ("Et4N", 1),
    ("Me4N", 1),
    ("Ph4P", 1),
    ("Ph4As", 1),
    ("Et3NH", 1),
    ("NMe4", 1),
    ("NPr4", 1),
    ("PPh4", 1),
    ("AsPh4", 1),
    ("PPN", 1),
    ("NH4", 1),
    ("Li", 1),
    ("Na", 1),
    ("K", 1),
    ("Rb", 1),
    ("Cs", 1),
    ("Mg", 2),
    ("Ca", 2),
    ("Sr", 2),
    ("Ba", 2),
    ("Tl", 1),
    // the proton of an acid before a bracketed anion ("H[AuCl4]", "H2[PtCl6]"); never read
    // before an unbracketed metal, where H is a hydride ("HCo(CO)4")
    ("H", 1),
];

/// Counter-anions written after a bracketed complex ion (`[Co(NH3)6]Cl3`, `[Cp2Fe]PF6`).
const ANIONS: &[(&str, i32)] = &[
    ("B(C6F5)4", -1),
    ("MeB(C6F5)3", -1),
    ("Al(OC(CF3)3)4", -1),
    ("NTf2", -1),
    ("TfO", -1),
    ("OTs", -1),
    ("TsO", -1),
    ("AcO", -1),
    ("TFA", -1),
    ("CF3CO2", -1),
    ("HSO4", -1),
    ("I3", -1),
    ("BArF24", -1),
    ("BArF4", -1),
    ("BArF", -1),
    ("BPh4", -1),
    ("BF4", -1),
    ("PF6", -1),
    ("SbF6", -1),
    ("AsF6", -1),
    ("AlCl4", -1),
    ("ClO4", -1),
    ("CF3SO3", -1),
    ("OTf", -1),
    ("NO3", -1),
    ("SO4", -2),
    ("CO3", -2),
    ("PO4", -3),
    ("OAc", -1),
    ("Cl", -1),
    ("Br", -1),
    ("I", -1),
    ("F", -1),
];

/// Isomer and stereo descriptors chemists put in front of a formula; they do not change the
/// count, and the canonical print keeps them.
const ISOMER_PREFIXES: &[&str] = &[
    "trans-", "cis-", "fac-", "mer-", "syn-", "anti-", "rac-", "meso-", "exo-", "endo-", "Δ-",
    "Λ-", "delta-", "lambda-",
];

/// The isomer and stereo prefixes at the start of `text` ("cis-", "(R,R)-", "OC-6-22-", several
/// in a row): where the formula proper starts, and each prefix as written.
fn prefixes(text: &str) -> (usize, Vec<&str>) {
    let mut at = text.len() - text.trim_start().len();
    let mut found: Vec<&str> = Vec::new();
    loop {
        let rest = &text[at..];
        // several joined by commas: "mer,trans-"
        let joined = rest.find('-').filter(|&i| {
            let head = &rest[..i];
            head.contains(',')
                && head.split(',').all(|w| {
                    ISOMER_PREFIXES
                        .iter()
                        .any(|p| p.trim_end_matches('-').eq_ignore_ascii_case(w.trim()))
                })
        });
        let len = joined
            .map(|i| i + 1)
            .filter(|&n| rest.len() > n)
            .or_else(|| {
                ISOMER_PREFIXES
                    .iter()
                    .find(|p| {
                        rest.len() > p.len()
                            && rest.as_bytes()[0].eq_ignore_ascii_case(&p.as_bytes()[0])
                            && rest
                                .get(..p.len())
                                .is_some_and(|h| h.eq_ignore_ascii_case(p))
                    })
                    .map(|p| p.len())
            })
            .or_else(|| configuration_label(rest).filter(|&n| rest.len() > n))
            .or_else(|| polyhedral_label(rest).filter(|&n| rest.len() > n));
        match len {
            Some(n) => {
                found.push(&rest[..n]);
                at += n;
            }
            None => break,
        }
    }
    (at, found)
}

/// A formula's stereo prefix (without its final '-') and the formula proper: the same species
/// with or without a named isomer share the formula proper.
pub fn split_stereo(formula: &str) -> (Option<&str>, &str) {
    let (at, found) = prefixes(formula);
    if found.is_empty() {
        (None, formula.trim_start())
    } else {
        (
            Some(formula[..at].trim().trim_end_matches('-')),
            &formula[at..],
        )
    }
}

/// A parenthesized configuration label before a formula: "(R,R)-", "(S)-", "(±)-", "(+)-".
fn configuration_label(text: &str) -> Option<usize> {
    let rest = text.strip_prefix('(')?;
    let close = rest.find(')')?;
    let inside = &rest[..close];
    let ok = !inside.is_empty()
        && inside.chars().all(|c| {
            matches!(
                c,
                'R' | 'S' | 'P' | 'M' | '+' | '-' | '±' | ',' | ' ' | '\''
            ) || c.is_ascii_digit()
        })
        && inside
            .chars()
            .any(|c| matches!(c, 'R' | 'S' | 'P' | 'M' | '+' | '-' | '±'));
    (ok && rest[close + 1..].starts_with('-')).then_some(close + 3)
}

/// Map what a paste from a paper or PDF brings onto the characters the grammar uses,
/// remembering each character's column in the original text (None: plain ASCII, columns
/// unchanged): superscript charges, subscript digits, the minus sign and every dash
/// (U+2010-U+2015, U+2212), the micro sign, non-breaking and zero-width spaces, middle dots
/// and bullets before solvates; anything else goes through Unicode compatibility
/// normalization (NFKC: fullwidth letters, mathematical italic η).
fn normalize(input: &str) -> (Cow<'_, str>, Option<Vec<usize>>) {
    if input
        .bytes()
        .all(|b| b.is_ascii() && b != b'\t' && b != b'=' && b != b'{' && b != b' ')
    {
        return (Cow::Borrowed(input), None);
    }
    use unicode_normalization::UnicodeNormalization;
    let mut text = String::with_capacity(input.len());
    let mut cols = Vec::with_capacity(input.len());
    let mut in_super = false;
    let mut in_smiles = false;
    let mut label_run = false;
    let isotopes = isotope_labels(input);
    for (col, c) in input.chars().enumerate() {
        // a mass number written before an element ("⁹⁹ᵐTc") labels the isotope
        if isotopes.iter().any(|r| r.contains(&col)) {
            continue;
        }
        // SMILES in braces is copied as it is: its '=' and '#' are bonds
        if c == '{' || c == '}' || in_smiles {
            in_smiles = (in_smiles || c == '{') && c != '}';
            // SMILES has no subscripts: braces a paper uses as brackets may hold them
            match subscript_digit(c) {
                Some(d) => text.push(char::from(b'0' + d)),
                None => text.push(c),
            }
            cols.push(col);
            continue;
        }
        // bonds drawn in a formula ("(CO)5W=C(OMe)Ph", "PhC≡CPh") add nothing to read;
        // zero-width spaces and joiners are invisible in the paper
        // thin and narrow spaces are typesetting between a bracket and its count
        if matches!(
            c,
            '=' | '≡'
                | '\u{200b}'
                | '\u{200c}'
                | '\u{200d}'
                | '\u{2060}'
                | '\u{feff}'
                | '\u{ad}'
                | '\u{2009}'
                | '\u{200a}'
                | '\u{202f}'
        ) {
            continue;
        }
        // most of a pasted formula is plain ASCII: copied as it is
        if c.is_ascii() && c != '\t' {
            label_run = label_run && c.is_ascii_digit();
            in_super = false;
            text.push(c);
            cols.push(col);
            continue;
        }
        let sup = superscript_digit(c);
        let small = sup.or_else(|| subscript_digit(c));
        // superscript and subscript digits right after η, κ or μ are the prefix's number
        // ("η⁶-C₆H₆", "κ²-N,N", "μ₃-CO")
        let label_digit = small.is_some() && label_run;
        // the run of a label's digits: η, κ or μ, then digits
        label_run = matches!(c, 'η' | 'κ' | 'μ' | 'µ') || (label_run && label_digit);
        if let (true, Some(i)) = (label_digit, small) {
            text.push(char::from(b'0' + i));
            cols.push(col);
            continue;
        }
        // superscripts are a charge ("Fe(CO)₄²⁻"): they become "^2-", which cannot be read as a
        // multiplier
        let superscript = c == '⁺' || c == '⁻' || sup.is_some();
        if superscript && !in_super {
            text.push('^');
            cols.push(col);
        }
        in_super = superscript;
        let mapped = match c {
            'µ' => 'μ',
            '\u{2010}'..='\u{2015}' | '\u{2212}' | '\u{fe63}' | '\u{ff0d}' | '⁻' | '₋' => '-',
            '⁺' | '₊' => '+',
            '′' | '’' | '‘' => '\'',
            '•' | '∙' | '⋅' | '・' | '‧' => '·',
            '∗' | '⁎' | '﹡' | '＊' => '*',
            '\t' | '\u{a0}' | '\u{2000}'..='\u{2008}' | '\u{205f}' | '\u{3000}' => ' ',
            c => {
                if let Some(i) = small {
                    char::from(b'0' + i)
                } else if c.is_ascii() || matches!(c, 'η' | 'κ' | 'μ' | 'σ' | 'π' | 'Δ' | 'Λ' | '·')
                {
                    c
                } else {
                    // compatibility forms: one character may become several
                    for n in std::iter::once(c).nfkc() {
                        text.push(n);
                        cols.push(col);
                    }
                    continue;
                }
            }
        };
        text.push(mapped);
        cols.push(col);
    }
    // spaces a PDF puts inside tokens ("Pd(PPh 3 ) 4"): after an opening bracket, before a
    // closing one, and before a count that is not a charge ("Co(NH3)6 3+" keeps its space)
    if text.contains(' ') {
        let chars: Vec<char> = text.chars().collect();
        let mut kept = String::with_capacity(text.len());
        let mut kept_cols = Vec::with_capacity(cols.len());
        for (i, &c) in chars.iter().enumerate() {
            if c == ' ' {
                let prev = chars[..i].iter().rev().find(|x| **x != ' ').copied();
                let next_at = (i + 1..chars.len()).find(|&j| chars[j] != ' ');
                let next = next_at.map(|j| chars[j]);
                let count_follows = next.is_some_and(|n| n.is_ascii_digit()) && {
                    let j = next_at.unwrap_or(i);
                    let after = chars[j..]
                        .iter()
                        .skip_while(|x| x.is_ascii_digit())
                        .find(|x| **x != ' ');
                    !matches!(after, Some('+' | '-'))
                };
                let inside = matches!(prev, Some('(' | '['))
                    || matches!(next, Some(')' | ']'))
                    || (prev.is_some_and(|p| p.is_ascii_alphabetic() || p == ')') && count_follows);
                if inside {
                    continue;
                }
            }
            kept.push(c);
            kept_cols.push(cols.get(i).copied().unwrap_or(i));
        }
        return (Cow::Owned(kept), Some(kept_cols));
    }
    (Cow::Owned(text), Some(cols))
}

/// Mass numbers written as superscripts before an element symbol ("⁹⁹ᵐTc", "¹³CO", "[¹⁸⁶Re]"):
/// the character ranges of each label, a run of superscript digits (with ᵐ for a metastable
/// state) at the start of a token and right before a capital letter.
fn isotope_labels(input: &str) -> Vec<std::ops::Range<usize>> {
    if input.is_ascii() || !input.chars().any(|c| superscript_digit(c).is_some()) {
        return Vec::new();
    }
    let chars: Vec<char> = input.chars().collect();
    let mut out = Vec::new();
    let mut i = 0;
    while i < chars.len() {
        let starts_token = i == 0
            || matches!(
                chars[i - 1],
                '[' | '(' | ' ' | '-' | '{' | '·' | '\u{2010}'..='\u{2015}'
            );
        if starts_token && superscript_digit(chars[i]).is_some() {
            let mut j = i;
            while j < chars.len() && superscript_digit(chars[j]).is_some() {
                j += 1;
            }
            if chars.get(j) == Some(&'ᵐ') {
                j += 1;
            }
            if chars.get(j).is_some_and(char::is_ascii_uppercase) {
                out.push(i..j);
                i = j;
                continue;
            }
        }
        i += 1;
    }
    out
}

/// The digit a superscript digit stands for.
fn superscript_digit(c: char) -> Option<u8> {
    match c {
        '⁰' => Some(0),
        '¹' => Some(1),
        '²' => Some(2),
        '³' => Some(3),
        '⁴'..='⁹' => Some((c as u32 - 0x2070) as u8),
        _ => None,
    }
}

/// The digit a subscript digit stands for.
fn subscript_digit(c: char) -> Option<u8> {
    match c {
        '₀'..='₉' => Some((c as u32 - '₀' as u32) as u8),
        _ => None,
    }
}

/// A parsed group before the metals and ligands are laid out.
#[derive(Debug, Clone, Default)]
struct Group {
    metals: Vec<&'static Element>,
    ligands: Vec<BoundLigand>,
    children: Vec<Group>,
}

impl Group {
    fn metal_total(&self) -> usize {
        self.metals.len() + self.children.iter().map(Group::metal_total).sum::<usize>()
    }

    fn first_metal(&self) -> Option<&'static Element> {
        self.metals
            .first()
            .copied()
            .or_else(|| self.children.iter().find_map(Group::first_metal))
    }

    fn drain_ligands(self, out: &mut Vec<BoundLigand>) {
        out.extend(self.ligands);
        for c in self.children {
            c.drain_ligands(out);
        }
    }
}

/// Lay a group tree out as sites and shared ligands: a group holding exactly one metal is that
/// metal's fragment; bridging ligands are always shared.
fn flatten(group: Group, complex: &mut Complex) {
    if group.metal_total() == 1 {
        if let Some(element) = group.first_metal() {
            let mut own = Vec::with_capacity(8);
            group.drain_ligands(&mut own);
            if own.iter().any(|b| b.mode().bridges > 1) {
                let (bridges, terminal): (Vec<_>, Vec<_>) =
                    own.into_iter().partition(|b| b.mode().bridges > 1);
                complex.shared.extend(bridges);
                own = terminal;
            }
            complex.sites.push(MetalSite {
                element,
                ligands: own,
            });
        }
        return;
    }
    for m in group.metals {
        complex.sites.push(MetalSite {
            element: m,
            ligands: Vec::new(),
        });
    }
    complex.shared.extend(group.ligands);
    for c in group.children {
        if c.metal_total() == 0 {
            c.drain_ligands(&mut complex.shared);
        } else {
            flatten(c, complex);
        }
    }
}

struct Parser<'a> {
    input: &'a str,
    text: &'a str,
    cols: Option<&'a [usize]>,
    lookup: &'a dyn LigandLookup,
    metals: usize,
    /// Oxidation-state labels written after a metal ("Cu(I)", "Ru(II)"), as (metal, state).
    labels: Vec<(&'static Element, i32)>,
    /// Notes on tokens read one way where another reading was also possible.
    readings: Vec<String>,
    /// Take the other reading where a token could be a ligand or an element.
    flip: bool,
}

impl<'a> Parser<'a> {
    fn column(&self, byte: usize) -> usize {
        let idx = self.text[..byte.min(self.text.len())].chars().count();
        match self.cols {
            None => idx,
            Some(cols) => cols
                .get(idx)
                .copied()
                .unwrap_or_else(|| self.input.chars().count()),
        }
    }

    fn error(&self, byte: usize, width_bytes: usize, message: String) -> ParseError {
        let end = (byte + width_bytes).min(self.text.len());
        let end = (end..=self.text.len())
            .find(|&e| self.text.is_char_boundary(e))
            .unwrap_or(self.text.len());
        let column = self.column(byte);
        let width = self.column(end).saturating_sub(column).max(1);
        ParseError {
            input: self.input.to_string(),
            message,
            column,
            width,
            suggestion: None,
            hint: None,
        }
    }

    /// Skip a stereo descriptor such as "trans-" or "fac-" (noted, not counted).
    /// Isomer and stereo prefixes at the start ("cis-", "rac-", "(R,R)-", "Δ-", several in a
    /// row): where the formula proper starts, and the prefixes as written.
    fn isomer_prefix(&self, notes: &mut Vec<String>) -> (usize, Option<String>) {
        let (at, found) = prefixes(self.text);
        if found.is_empty() {
            return (at, None);
        }
        let written: String = found.concat();
        notes.push(format!(
            "'{}' names an isomer or configuration; the count does not depend on it",
            written.trim_end_matches('-')
        ));
        (at, Some(written.trim_end_matches('-').to_string()))
    }

    /// Find a trailing charge: "3+", "2-", "+2" after a closing bracket or a space; "^3+",
    /// "(3+)" or a superscript anywhere at the end; a bare sign right after a letter or ')'
    /// ("Cp2ZrMe+"). Digits before a sign with nothing to separate them are refused, since
    /// "Co(NH3)63+" could mean several things.
    fn split_charge(&self, from: usize) -> Result<(usize, Option<i32>), ParseError> {
        let t = self.text.trim_end();
        if t.len() <= from {
            return Err(ParseError {
                input: self.input.to_string(),
                message: "empty formula".into(),
                column: 0,
                width: 1,
                suggestion: None,
                hint: Some("write a complex, e.g. Fe(CO)5".into()),
            });
        }
        let bytes = t.as_bytes();
        let last = bytes[bytes.len() - 1];
        // "(3+)" at the end
        if last == b')' {
            if let Some(open) = t.rfind('(') {
                if let Some(q) = charge_value(&t[open + 1..t.len() - 1]) {
                    if open > from {
                        return Ok((open, Some(q)));
                    }
                }
            }
        }
        // "^3+" or a superscript at the end
        if let Some(caret) = t.rfind('^') {
            if caret >= from {
                return match charge_value(&t[caret + 1..]) {
                    Some(q) => Ok((caret, Some(q))),
                    None => Err(self
                        .error(
                            caret,
                            t.len() - caret,
                            "a charge must be like ^3+ or ^2-".into(),
                        )
                        .with_hint("write e.g. [Co(NH3)6]^3+ or [Co(NH3)6]3+")),
                };
            }
        }
        let (start, sign, digits) = if last == b'+' || last == b'-' {
            let d = bytes[from..bytes.len() - 1]
                .iter()
                .rev()
                .take_while(|b| b.is_ascii_digit())
                .count();
            let start = bytes.len() - 1 - d;
            (start, last, &t[start..bytes.len() - 1])
        } else if last.is_ascii_digit() {
            let d = bytes[from..]
                .iter()
                .rev()
                .take_while(|b| b.is_ascii_digit())
                .count();
            let s = bytes.len() - d;
            match s.checked_sub(1).filter(|&i| i >= from).map(|i| bytes[i]) {
                Some(sign @ (b'+' | b'-')) => (s - 1, sign, &t[s..]),
                _ => return Ok((t.len(), None)),
            }
        } else {
            return Ok((t.len(), None));
        };
        if start <= from {
            return Err(self.error(from, 1, "a formula cannot start with its charge".into()));
        }
        let mut before = t[..start].trim_end();
        let spaced = before.len() < start;
        // a PDF splits "]²⁺" into "]2 +": the digits after the bracket are the charge's
        let mut digits = digits;
        if digits.is_empty() && spaced {
            let run = before.bytes().rev().take_while(u8::is_ascii_digit).count();
            let head = &before[..before.len() - run];
            if run > 0 && head.ends_with(']') && head.len() > from {
                digits = &before[head.len()..];
                before = head;
            }
        }
        let after_word = digits.is_empty()
            && before
                .chars()
                .last()
                .is_some_and(|c| c.is_alphabetic() || c == ')' || c == '*');
        if !(before.ends_with(']') || spaced || after_word) {
            return Err(self
                .error(
                    start,
                    t.len() - start,
                    "a charge must follow a closing bracket or a space".into(),
                )
                .with_hint("write e.g. [Co(NH3)6]3+ or Co(NH3)6 3+"));
        }
        let magnitude: i32 = if digits.is_empty() {
            1
        } else {
            digits
                .parse()
                .ok()
                .filter(|&m| m <= 99)
                .ok_or_else(|| self.error(start, t.len() - start, "charge too large".into()))?
        };
        let charge = if sign == b'+' { magnitude } else { -magnitude };
        Ok((before.len(), Some(charge)))
    }

    /// A salt written as ions side by side, each bracketed or a known counter-ion, charges
    /// written on any of them: "[Cp2Co][PF6]", "[Cp2Co]+[PF6]-", "[NBu4][AuCl4]",
    /// "[Rh(nbd)2][BArF4]". Gives the complex ion's span, its written charge and the charge
    /// the counter-ions give it; None when the text is not such a row of ions.
    #[allow(clippy::type_complexity)]
    fn salt(
        &self,
        start: usize,
        notes: &mut Vec<String>,
    ) -> Result<Option<(usize, usize, Option<i32>, Option<i32>)>, ParseError> {
        let t = self.text.trim_end();
        // an unbracketed complex ion with its charge printed inline, then its counter-ions
        // ("Cp2Co⁺PF6⁻" as a paper prints it)
        if let Some(caret) = t[start.min(t.len())..].find('^').map(|i| i + start) {
            let after = &t[caret + 1..];
            let digits = after.bytes().take_while(u8::is_ascii_digit).count();
            if let Some(sign @ (b'+' | b'-')) = after.as_bytes().get(digits).copied() {
                let rest = after[digits + 1..].trim();
                // the counter-ions, each perhaps with its own printed charge
                let plain: String = rest
                    .split('^')
                    .map(|p| p.trim_start_matches(['+', '-']))
                    .collect();
                let plain = plain.trim_end_matches(['+', '-']);
                if !rest.is_empty() && !t[start..caret].contains('[') {
                    let table = if sign == b'+' { ANIONS } else { CATIONS };
                    if let Some(ions) = ion_list(plain, table).filter(|l| !l.is_empty()) {
                        let n: i32 = if digits == 0 {
                            1
                        } else {
                            after[..digits].parse().unwrap_or(1)
                        };
                        let q = if sign == b'+' { n } else { -n };
                        let counter: i32 = ions.iter().map(|(_, c)| c).sum();
                        let names: Vec<String> = ions.into_iter().map(|(n, _)| n).collect();
                        notes.push(format!(
                            "{} taken as counter-ion{} outside the coordination sphere",
                            names.join(", "),
                            if names.len() == 1 { "" } else { "s" }
                        ));
                        return Ok(Some((start, caret, Some(q), Some(-counter))));
                    }
                }
            }
        }
        // a salt has at least one bracketed ion
        if !t[start.min(t.len())..].contains('[') {
            return Ok(None);
        }
        let Some(units) = salt_units(t, start) else {
            return Ok(None);
        };
        if units.len() < 2 || !units.iter().any(|u| u.bracketed) {
            return Ok(None);
        }
        let mut complex_ions = Vec::new();
        let mut counter = 0;
        let mut names = Vec::new();
        for u in &units {
            match known_ion_charge(u.inner) {
                Some(q) => {
                    counter += u.charge.unwrap_or(q);
                    names.push(if u.bracketed {
                        u.inner.to_string()
                    } else {
                        t[u.start..u.end].to_string()
                    });
                }
                None if u.bracketed && has_metal_token(u.inner) => {
                    complex_ions.push((u.start, u.end, u.charge))
                }
                None => return Ok(None),
            }
        }
        match complex_ions[..] {
            [] => Ok(None),
            [(s, e, written)] => {
                notes.push(format!(
                    "{} taken as counter-ion{} outside the coordination sphere",
                    names.join(", "),
                    if names.len() == 1 { "" } else { "s" }
                ));
                Ok(Some((s, e, written, Some(-counter))))
            }
            _ => Err(self
                .error(
                    start,
                    t.len() - start,
                    format!(
                        "{} complex ions side by side: `nonet count` reports each; steps and \
                         the planner take one complex at a time",
                        complex_ions.len()
                    ),
                )
                .with_hint(
                    "count each ion with its charge, e.g. '[Pt(NH3)4]2+' '[PtCl4]2-'; to join \
                     two metal fragments by an M-M bond write [[CpFe(CO)2][Mn(CO)5]]",
                )),
        }
    }

    /// Counter-ions around a bracketed complex ion: cations before it (`K3[Fe(CN)6]`), anions
    /// after it (`[Co(NH3)6]Cl3`). Returns the span of the complex ion and the charge the
    /// counter-ions give it. Anything else leaves the text as it is.
    fn counter_ions(
        &self,
        start: usize,
        end: usize,
        notes: &mut Vec<String>,
    ) -> Result<(usize, usize, Option<i32>), ParseError> {
        let t = &self.text[..end];
        let Some(open) = t[start..].find('[').map(|i| i + start) else {
            // "Na2Fe(CO)4", "K2PtCl4": counter-cations before the metal without brackets
            return Ok(self.bare_cations(start, end, notes));
        };
        let Ok(close) = self.matching(open, end) else {
            return Ok((start, end, None));
        };
        let before = &t[start..open];
        let after = &t[close + 1..];
        if has_metal_token(before) && ion_list(before, CATIONS).is_none() {
            // square brackets used as parentheses around a ligand ("Pd[P(tBu)3]2",
            // "Ru(OAc)2[(R)-BINAP]"): no metal inside, so they group a ligand
            if !has_metal_token(&t[open + 1..close]) {
                return Ok((start, end, None));
            }
            return Err(self
                .error(
                    start,
                    open - start,
                    "a metal outside the brackets is a counter-ion, not part of the complex".into(),
                )
                .with_hint("count the complex ion with its charge, e.g. '[Co(SCN)4]2-'"));
        }
        if after.starts_with(|c: char| c.is_ascii_digit()) {
            // a multiplier: `[CpFe(CO)2]2` is a dimer, not a salt
            return Ok((start, end, None));
        }
        if after.contains('[') {
            return Err(self
                .error(
                    start,
                    end - start,
                    "two complex ions side by side: nonet counts one complex at a time".into(),
                )
                .with_hint(
                    "count each ion with its charge, e.g. '[Pt(NH3)4]2+' '[PtCl4]2-'; to join \
                     two metal fragments by an M-M bond write [[CpFe(CO)2][Mn(CO)5]]",
                ));
        }
        let (Some(cations), Some(anions)) = (ion_list(before, CATIONS), ion_list(after, ANIONS))
        else {
            return Ok((start, end, None));
        };
        if cations.is_empty() && anions.is_empty() {
            return Ok((start, end, None));
        }
        let outside: i32 = cations.iter().chain(&anions).map(|(_, q)| q).sum();
        let names: Vec<String> = cations
            .iter()
            .chain(&anions)
            .map(|(n, _)| n.clone())
            .collect();
        notes.push(format!(
            "{} taken as counter-ion{} outside the coordination sphere",
            names.join(", "),
            if names.len() == 1 { "" } else { "s" }
        ));
        Ok((open, close + 1, Some(-outside)))
    }

    /// Counter-cations written before an unbracketed complex anion: "Na2Fe(CO)4" is
    /// Na+ twice and [Fe(CO)4]2-.
    fn bare_cations(
        &self,
        start: usize,
        end: usize,
        notes: &mut Vec<String>,
    ) -> (usize, usize, Option<i32>) {
        let t = &self.text[start..end];
        let mut at = 0;
        let mut names = Vec::new();
        let mut charge = 0;
        while let Some((name, q)) = ions_starting(&t[at..], IonTable::Cations)
            .filter(|(n, _)| *n != "H")
            .find(|(n, _)| opens_with(&t[at..], n))
        {
            let after = at + name.len();
            // "K" must not be the start of a longer metal symbol or ligand ("Ir", "Kr")
            if t[after..].starts_with(|c: char| c.is_ascii_lowercase()) {
                break;
            }
            let digits = t[after..].bytes().take_while(u8::is_ascii_digit).count();
            let n: i32 = t[after..after + digits].parse().unwrap_or(1);
            names.push(if n > 1 {
                format!("{name}{n}")
            } else {
                name.to_string()
            });
            charge += q * n;
            at = after + digits;
        }
        if names.is_empty() || element::symbol_prefix(&t[at..]).is_none() {
            return (start, end, None);
        }
        notes.push(format!(
            "{} taken as counter-ion{} outside the coordination sphere",
            names.join(", "),
            if names.len() == 1 { "" } else { "s" }
        ));
        (start + at, end, Some(-charge))
    }

    /// Read items until `end` or the closing character.
    fn sequence(
        &mut self,
        pos: &mut usize,
        end: usize,
        close: Option<u8>,
        depth: usize,
    ) -> Result<Group, ParseError> {
        if depth > MAX_DEPTH {
            return Err(self.error(*pos, 1, "brackets nested too deeply".into()));
        }
        let mut group = Group::default();
        while *pos < end {
            let rest = &self.text[*pos..end];
            let c = rest.as_bytes()[0];
            // a configuration label before a ligand ("(R)-BINAP", "(S,S)-TsDPEN") names its
            // enantiomer; the count does not depend on it
            if c == b'(' {
                if let Some(n) = configuration_label(rest) {
                    if self.lookup.longest_prefix(&rest[n..], &|_| true).is_some() {
                        *pos += n;
                        continue;
                    }
                }
            }
            // a bond drawn after a metal ("Cp*2Sc–CH3", "(CO)5Mn–Me"): nothing to read
            if c == b'-'
                && group.metals.last().is_some()
                && rest[1..].starts_with(|x: char| x.is_ascii_uppercase() || x == '(')
            {
                *pos += 1;
                continue;
            }
            match c {
                b' ' => *pos += 1,
                b'[' | b'(' => {
                    let open = *pos;
                    let close_at = self.matching(open, end)?;
                    let inner_start = open + 1;
                    let inner = self.text[inner_start..close_at].trim();
                    let child = if c == b'(' {
                        self.paren_group(inner_start, close_at, depth)?
                    } else if let Some(l) = self.dehyphenated(inner) {
                        // a linked ligand in brackets, written with a hyphen a paper adds
                        // ("[Me2Si(C5Me4)(N-tBu)]")
                        Item::Ligand(BoundLigand::new(l.clone(), 0, 1))
                    } else {
                        let mut p = inner_start;
                        let g = self.sequence(&mut p, close_at, Some(b']'), depth + 1)?;
                        Item::Group(g)
                    };
                    *pos = close_at + 1;
                    let n = self.multiplier(pos, end)?;
                    self.push(&mut group, child, n, open)?;
                }
                b')' | b']' => {
                    if close == Some(c) {
                        return Ok(group);
                    }
                    return Err(self.error(*pos, 1, format!("unmatched '{}'", c as char)));
                }
                b'0'..=b'9' => {
                    return Err(self.error(
                        *pos,
                        1,
                        "a number must follow a metal, a ligand or a bracket".into(),
                    ))
                }
                _ => {
                    let start = *pos;
                    let (item, len) = self.bare(start, end)?;
                    *pos = start + len;
                    let n = self.multiplier(pos, end)?;
                    self.push(&mut group, item, n, start)?;
                }
            }
        }
        Ok(group)
    }

    fn push(&mut self, group: &mut Group, item: Item, n: u32, at: usize) -> Result<(), ParseError> {
        match item {
            Item::Metal(e) => {
                self.metals += n as usize;
                self.check_metals(at)?;
                group.metals.extend(std::iter::repeat_n(e, n as usize));
            }
            Item::Ligand(mut b) => {
                b.count = self.scaled(b.count, n, at)?;
                group.ligands.push(b);
            }
            Item::Group(mut g) if g.metal_total() == 0 => {
                self.scale(&mut g, n, at)?;
                group.children.push(g);
            }
            Item::Group(g) => {
                let inner = g.metal_total();
                if n > 1 && inner > 0 {
                    self.metals += inner * (n as usize - 1);
                    self.check_metals(at)?;
                }
                for _ in 1..n {
                    group.children.push(g.clone());
                }
                group.children.push(g);
            }
        }
        Ok(())
    }

    fn scaled(&self, count: u32, n: u32, at: usize) -> Result<u32, ParseError> {
        count
            .checked_mul(n)
            .filter(|&c| c <= MAX_LIGANDS)
            .ok_or_else(|| self.error(at, 1, format!("more than {MAX_LIGANDS} of one ligand")))
    }

    /// Multiply every ligand count in a metal-free group (`[(CO)2]3` is six CO).
    fn scale(&self, g: &mut Group, n: u32, at: usize) -> Result<(), ParseError> {
        for b in &mut g.ligands {
            b.count = self.scaled(b.count, n, at)?;
        }
        for c in &mut g.children {
            self.scale(c, n, at)?;
        }
        Ok(())
    }

    fn check_metals(&self, at: usize) -> Result<(), ParseError> {
        if self.metals > MAX_METALS {
            Err(self.error(
                at,
                1,
                format!("more than {MAX_METALS} metals; nonet counts molecular complexes"),
            ))
        } else {
            Ok(())
        }
    }

    /// Index of the bracket closing the one at `open`.
    fn matching(&self, open: usize, end: usize) -> Result<usize, ParseError> {
        let mut stack: smallvec::SmallVec<[u8; 24]> = smallvec::SmallVec::new();
        for (i, &b) in self.text.as_bytes()[open..end].iter().enumerate() {
            match b {
                b'(' | b'[' => stack.push(b),
                b')' | b']' => {
                    let want = if b == b')' { b'(' } else { b'[' };
                    if stack.pop() != Some(want) {
                        return Err(self.error(open + i, 1, format!("unmatched '{}'", b as char)));
                    }
                    if stack.is_empty() {
                        return Ok(open + i);
                    }
                }
                _ => {}
            }
        }
        let opener = self.text.as_bytes()[open] as char;
        let closer = if opener == '(' { ')' } else { ']' };
        Err(self
            .error(open, 1, format!("'{opener}' is never closed"))
            .with_hint(&format!("add the missing '{closer}'")))
    }

    fn multiplier(&self, pos: &mut usize, end: usize) -> Result<u32, ParseError> {
        let digits = self.text[*pos..end]
            .bytes()
            .take_while(u8::is_ascii_digit)
            .count();
        if digits == 0 {
            return Ok(1);
        }
        let start = *pos;
        *pos += digits;
        match self.text[start..*pos].parse::<u32>() {
            Ok(0) => Err(self.error(start, digits, "a multiplier of 0".into())),
            Ok(n) if n <= MAX_MULTIPLIER => Ok(n),
            _ => Err(self.error(
                start,
                digits,
                format!("multiplier larger than {MAX_MULTIPLIER}"),
            )),
        }
    }

    /// The contents of a parenthesised group: a catalogue entry (possibly with mode prefixes
    /// and bond marks: `(η5-C5H5)`, `(μ-η2:η2-PhCCPh)`, `(=CHPh)`), or else a fragment with its
    /// own metal.
    /// The catalogue ligand a token names once the hyphens a paper puts between an atom and
    /// its substituent are dropped ("P-tBu3" is PtBu3, "N-tBu" in a linked ligand); None
    /// without a hyphen or without such a ligand.
    fn dehyphenated(&self, token: &str) -> Option<&'a Arc<LigandDef>> {
        if !token.contains('-') || token.contains(['μ', 'η', 'κ']) {
            return None;
        }
        let joined: String = token.chars().filter(|&c| c != '-').collect();
        self.lookup.exact(&joined)
    }

    fn paren_group(&mut self, start: usize, end: usize, depth: usize) -> Result<Item, ParseError> {
        let raw = &self.text[start..end];
        let mut at = start + (raw.len() - raw.trim_start().len());
        let mut content = raw.trim();
        // a bond drawn in the formula ("=CHPh", "≡CR") says nothing the ligand does not
        for mark in ['=', '≡'] {
            if let Some(c) = content.strip_prefix(mark) {
                at += mark.len_utf8();
                content = c;
            }
        }
        if content.is_empty() {
            return Err(self.error(start.saturating_sub(1), 2, "empty parentheses".into()));
        }
        // an enantiomer's label before the ligand: "((1R,2R)-dach)", "((S)-BINAP)"
        if let Some(n) = configuration_label(content) {
            if self.lookup.exact(&content[n..]).is_some() {
                at += n;
                content = &content[n..];
            }
        }
        if let Some(l) = self
            .lookup
            .exact(content)
            .or_else(|| self.dehyphenated(content))
        {
            return Ok(Item::Ligand(BoundLigand::new(l.clone(), 0, 1)));
        }
        // one or more mode prefixes: "μ-Cl", "η5-C5H5", "μ-η2:η2-PhCCPh"
        let mut labels: Vec<(&str, usize)> = Vec::new();
        let mut rest = content;
        let mut rest_at = at;
        while let Some((label, tail)) = rest.split_once('-') {
            labels.push((label, rest_at));
            rest_at += label.len() + 1;
            rest = tail;
            if let Some(l) = self.lookup.exact(rest.trim()) {
                return self.with_labels(l, &labels).map(Item::Ligand);
            }
            if !(looks_like_label(label) || label.contains(':')) {
                break;
            }
        }
        if let Some(&(label, _)) = labels.first() {
            if looks_like_label(label) && !rest.is_empty() {
                // a group the catalogue does not hold, by its condensed formula or SMILES
                return match super::derived::read_written(rest.trim(), Some(label), self.lookup) {
                    Ok(l) => self.with_labels(&l, &labels).map(Item::Ligand),
                    Err(why) => {
                        let mut e = self.unknown(rest_at, rest);
                        if rest.starts_with('{') || why.contains("does not add up") {
                            e.hint = Some(why);
                        }
                        Err(e)
                    }
                };
            }
        }
        // a word mode on a group the catalogue does not hold ("neutral-CHCH2CH3")
        if let Some((word, body)) = content.split_once('-') {
            if !word.is_empty() && word.chars().all(|c| c.is_ascii_lowercase()) {
                if let Ok(l) = super::derived::read_written(body.trim(), Some(word), self.lookup) {
                    return self.with_labels(&l, &[(word, at)]).map(Item::Ligand);
                }
            }
        }
        if content.starts_with('{')
            || !content.starts_with('[') && element::symbol_prefix(content).is_none()
        {
            match super::derived::read_written(content, None, self.lookup) {
                Ok(l) => return Ok(Item::Ligand(BoundLigand::new(l, 0, 1))),
                Err(why) if content.starts_with('{') => {
                    return Err(self.error(at, content.len(), why))
                }
                Err(_) => {}
            }
        }
        // a fragment in parentheses starts with its metal, "(CpFe(CO)2)": "(OPr)" is an
        // unknown ligand, not an oxo on praseodymium
        let starts_with_metal =
            content.starts_with('[') || element::symbol_prefix(content).is_some();
        if !starts_with_metal {
            return Err(self.unknown(at, content));
        }
        let has_metal = has_metal_token(content);
        let mut p = at;
        match self.sequence(&mut p, end, None, depth + 1) {
            Ok(g) if g.metal_total() > 0 => {
                if g.ligands.is_empty() && g.children.is_empty() {
                    // "(Co)5" is far more often a slip for (CO)5 than a metal in parentheses
                    let mut e = self.error(
                        at,
                        content.len(),
                        format!("'{content}' in parentheses is a metal, not a ligand"),
                    );
                    e.suggestion = self.lookup.suggest(content);
                    e.hint = Some("ligands are case-sensitive: CO is carbonyl, Co cobalt".into());
                    return Err(e);
                }
                Ok(Item::Group(g))
            }
            Err(e) if has_metal => Err(e),
            _ => Err(self.unknown(at, content)),
        }
    }

    /// Pick the mode that a run of prefixes names: a bridging label wins (`μ-η2:η2-`), "η" with
    /// no number means the ligand's highest hapticity.
    fn with_labels(
        &self,
        ligand: &Arc<LigandDef>,
        labels: &[(&str, usize)],
    ) -> Result<BoundLigand, ParseError> {
        let normalized: Vec<String> = labels
            .iter()
            .map(|(l, _)| normalize_label(l.split(':').next().unwrap_or(l)))
            .collect();
        let pick = normalized
            .iter()
            .find(|l| l.starts_with('μ'))
            .or_else(|| normalized.first());
        let Some(label) = pick else {
            return Ok(BoundLigand::new(ligand.clone(), 0, 1));
        };
        let index = if label == "η" {
            ligand
                .modes
                .iter()
                .enumerate()
                .filter(|(_, m)| m.bridges == 1)
                .max_by_key(|(_, m)| m.hapticity().unwrap_or(0))
                .map(|(i, _)| i)
        } else {
            ligand.mode_index(label)
        };
        let (raw, label_at) = labels[normalized.iter().position(|l| l == label).unwrap_or(0)];
        match index {
            Some(i) => {
                let mut b = BoundLigand::new(ligand.clone(), i, 1);
                b.pinned = true;
                Ok(b)
            }
            None => Err(self
                .error(
                    label_at,
                    raw.len(),
                    format!("{} has no '{}' binding mode", ligand.key, label),
                )
                .with_hint(&format!("its modes are: {}", ligand.mode_labels()))),
        }
    }

    /// The mode one prefix names (`η3-` in a bare token).
    fn with_mode(
        &self,
        ligand: &Arc<LigandDef>,
        label: &str,
        label_at: usize,
    ) -> Result<BoundLigand, ParseError> {
        self.with_labels(ligand, &[(label, label_at)])
    }

    fn unknown(&self, at: usize, token: &str) -> ParseError {
        // "Na(CO)3" splits as N + a: name the main-group metal the chemist typed instead
        let before = self.text[..at].chars().next_back();
        let joined: Option<String> = before
            .filter(char::is_ascii_uppercase)
            .zip(token.chars().next().filter(char::is_ascii_lowercase))
            .map(|(a, b)| format!("{a}{b}"));
        let own = MAIN_GROUP_METALS
            .contains(&token)
            .then(|| (token.to_string(), at));
        let split = joined
            .filter(|s| MAIN_GROUP_METALS.contains(&s.as_str()))
            .map(|s| (s, at.saturating_sub(1)));
        if let Some((sym, from)) = own.or(split) {
            let mut e = self.error(from, 2, format!("{sym} is not a transition metal"));
            e.hint = Some(
                "nonet counts d- and f-block complexes; as a counter-cation write it before \
                 the complex in brackets, e.g. Na[Co(CO)4]"
                    .into(),
            );
            return e;
        }
        let mut e = self.error(at, token.len(), format!("unknown ligand '{token}'"));
        e.suggestion = self.lookup.suggest(token);
        e.hint = Some("`nonet ligands QUERY` searches the catalogue".into());
        e
    }

    /// A metal symbol or catalogue token outside parentheses, with an optional mode prefix.
    fn bare(&mut self, start: usize, end: usize) -> Result<(Item, usize), ParseError> {
        let rest = &self.text[start..end];
        if let Some(dash) = label_prefix(rest) {
            let label = &rest[..dash];
            let after = &rest[dash + 1..];
            if let Some((l, len)) = self.ligand_token(after) {
                let b = self.with_mode(l, label, start)?;
                return Ok((Item::Ligand(b), dash + 1 + len));
            }
            let word = word_at(after);
            return Err(self.unknown(start + dash + 1, if word.is_empty() { after } else { word }));
        }
        let ligand = self.ligand_token(rest);
        let metal = element::symbol_prefix(rest);
        let metal_len = metal.map_or(0, |m| m.symbol.len());
        // a tie ("Pr": propyl or praseodymium) goes to the ligand once a metal has been read,
        // and to the metal while the formula has none yet ("PrCl3", "Cp2ZrPr2")
        let mut tie_to_ligand = self.metals > 0;
        // a ligand key that spells a metal ("Ac" acetyl or actinium, "Np" neopentyl or
        // neptunium): the element reading needs something to bind after it
        let tie = match (ligand, metal) {
            (Some((l, len)), Some(m)) if len == metal_len => Some((l, m)),
            _ => None,
        };
        if let Some((l, m)) = tie {
            let after = rest[metal_len..].trim_start_matches(|c: char| c.is_ascii_digit());
            let bare_metal = after.is_empty()
                || after.starts_with([')', ']', '+', '-', '^', ' ', '·', '.'])
                || element::symbol_prefix(after).is_some();
            let metal_later = has_metal_token(after);
            if bare_metal {
                // a metal with nothing written to bind: the catalogue's ligand
                tie_to_ligand = true;
            } else if self.metals > 0 || metal_later {
                tie_to_ligand = (self.metals > 0) != self.flip;
                let taken = if tie_to_ligand {
                    format!("the ligand {} ({})", l.key, l.name)
                } else {
                    format!("the element {}", m.name)
                };
                self.readings.push(format!(
                    "'{}' could be the ligand {} ({}) or the element {}; read as {taken}",
                    m.symbol, l.key, l.name, m.name
                ));
            }
        }
        let ligand_wins = |len: usize| len > metal_len || (len == metal_len && tie_to_ligand);
        match ligand {
            Some((l, len)) if metal.is_none() || ligand_wins(len) => {
                Ok((Item::Ligand(BoundLigand::new(l.clone(), 0, 1)), len))
            }
            _ => match metal {
                Some(m) => {
                    // an oxidation-state label right after the metal is not a ligand
                    match roman_label(&rest[metal_len..]) {
                        Some((state, len)) => {
                            self.labels.push((m, state));
                            Ok((Item::Metal(m), metal_len + len))
                        }
                        None => Ok((Item::Metal(m), metal_len)),
                    }
                }
                None => {
                    let word = word_at(rest);
                    let first = rest.chars().next().map_or(0, char::len_utf8);
                    let word = if word.is_empty() {
                        &rest[..first]
                    } else {
                        word
                    };
                    if word.chars().all(|c| c.is_alphanumeric() || c == '*') {
                        Err(self.unknown(start, word))
                    } else {
                        let ch = rest.chars().next().unwrap_or(' ');
                        Err(self.error(
                            start,
                            ch.len_utf8(),
                            format!("unexpected character '{ch}'"),
                        ))
                    }
                }
            },
        }
    }

    /// The longest catalogue token at the start of `text`, preferring "H" + multiplier over a
    /// token such as "H2" (so IrH2Cl is a dihydride; dihydrogen is written `(η2-H2)`).
    fn ligand_token(&self, text: &str) -> Option<(&'a Arc<LigandDef>, usize)> {
        // a token may not end inside a metal symbol: in "H2Os(CO)4" the water token "H2O"
        // would swallow the O of osmium
        let accept = |len: usize| {
            let b = text.as_bytes();
            !(len >= 1
                && len < b.len()
                && b[len - 1].is_ascii_uppercase()
                && b[len].is_ascii_lowercase()
                && element::by_symbol(&text[len - 1..len + 1]).is_some())
        };
        let (l, len) = self.lookup.longest_prefix(text, &accept)?;
        let matched = &text[..len];
        let head = matched.trim_end_matches(|c: char| c.is_ascii_digit());
        if head.len() < matched.len() && is_symbol_shaped(head) {
            if let Some(h) = self.lookup.exact(head) {
                return Some((h, head.len()));
            }
        }
        Some((l, len))
    }
}

impl ParseError {
    /// `parse` refused a salt of two complex ions, which `parse_ions` reads.
    pub fn is_two_ions(&self) -> bool {
        self.message.starts_with("2 complex ions")
    }

    fn with_hint(mut self, hint: &str) -> ParseError {
        self.hint = Some(hint.to_string());
        self
    }
}

enum Item {
    Metal(&'static Element),
    Ligand(BoundLigand),
    Group(Group),
}

/// Whether a mode prefix such as "η5", "eta5", "κ2", "mu3", "μ" begins `text` and ends in '-';
/// returns the byte index of that '-'.
/// An oxidation-state label after a metal symbol: "(I)" to "(VIII)", "(0)", "(-I)", "(−II)";
/// not when a multiplier follows ("Pd(I)2" is palladium diiodide as written). Gives the state
/// and the label's length in bytes.
fn roman_label(text: &str) -> Option<(i32, usize)> {
    // written flat against the symbol, two numerals or more ("FeIII(CN)6"; "FeI2" stays an
    // iodide)
    let flat = text
        .bytes()
        .take_while(|b| matches!(b, b'I' | b'V' | b'X'))
        .count();
    if flat >= 2
        && !text[flat..].starts_with(|c: char| c.is_ascii_lowercase() || c.is_ascii_digit())
    {
        let value = match &text[..flat] {
            "II" => 2,
            "III" => 3,
            "IV" => 4,
            "VI" => 6,
            "VII" => 7,
            "VIII" => 8,
            _ => return None,
        };
        return Some((value, flat));
    }
    let rest = text.strip_prefix('(')?;
    let close = rest.find(')')?;
    let inside = &rest[..close];
    let (sign, numeral) = match inside.strip_prefix('-') {
        Some(n) => (-1, n),
        None => (1, inside.strip_prefix('+').unwrap_or(inside)),
    };
    let value = match numeral {
        "0" => 0,
        "I" => 1,
        "II" => 2,
        "III" => 3,
        "IV" => 4,
        "V" => 5,
        "VI" => 6,
        "VII" => 7,
        "VIII" => 8,
        _ => return None,
    };
    let after = &rest[close + 1..];
    if after.starts_with(|c: char| c.is_ascii_digit()) {
        return None;
    }
    Some((sign * value, close + 2))
}

fn roman(state: i32) -> String {
    const R: [&str; 9] = ["0", "I", "II", "III", "IV", "V", "VI", "VII", "VIII"];
    let r = R.get(state.unsigned_abs() as usize).copied().unwrap_or("?");
    if state < 0 {
        format!("-{r}")
    } else {
        r.to_string()
    }
}

fn label_prefix(text: &str) -> Option<usize> {
    let dash = text.find('-')?;
    looks_like_label(&text[..dash]).then_some(dash)
}

fn looks_like_label(label: &str) -> bool {
    let norm = normalize_label(label);
    let mut chars = norm.chars();
    matches!(chars.next(), Some('η' | 'κ' | 'μ')) && chars.all(|c| c.is_ascii_digit())
}

fn has_metal_token(text: &str) -> bool {
    text.char_indices()
        .any(|(i, c)| c.is_ascii_uppercase() && element::symbol_prefix(&text[i..]).is_some())
}

/// "3+", "2-", "+", "-", "+3" as a signed number.
pub(crate) fn charge_value(text: &str) -> Option<i32> {
    let t = text.trim();
    let (digits, sign) = if let Some(d) = t.strip_suffix('+') {
        (d, 1)
    } else if let Some(d) = t.strip_suffix('-') {
        (d, -1)
    } else if let Some(d) = t.strip_prefix('+') {
        (d, 1)
    } else if let Some(d) = t.strip_prefix('-') {
        (d, -1)
    } else {
        return None;
    };
    let n: i32 = if digits.is_empty() {
        1
    } else if digits.bytes().all(|b| b.is_ascii_digit()) && digits.len() <= 2 {
        digits.parse().ok()?
    } else {
        return None;
    };
    Some(sign * n)
}

/// Read `text` as a run of counter-ions from `table`, each optionally in parentheses and with a
/// count: "Cl3", "(PF6)2", "K3", "NBu4". None when anything else is in the way.
/// The charge of a counter-ion the tables know by exactly this name.
fn known_ion_charge(name: &str) -> Option<i32> {
    CATIONS
        .iter()
        .chain(ANIONS)
        .find(|(n, _)| *n == name)
        .map(|(_, q)| *q)
}

/// Which counter-ion table `ions_starting` looks in.
#[derive(Clone, Copy)]
enum IonTable {
    Cations,
    /// Cations, then anions.
    Both,
}

/// The counter-ions whose names start with `text`'s first byte, in table order (cations first):
/// every formula is checked against the tables, so they are indexed by first byte once.
fn ions_starting(
    text: &str,
    table: IonTable,
) -> impl Iterator<Item = &'static (&'static str, i32)> {
    static INDEX: std::sync::OnceLock<[Vec<(u8, bool)>; 128]> = std::sync::OnceLock::new();
    let index = INDEX.get_or_init(|| {
        let mut by_first: [Vec<(u8, bool)>; 128] = std::array::from_fn(|_| Vec::new());
        for (i, (n, _)) in CATIONS.iter().enumerate() {
            if let Some(&b) = n.as_bytes().first().filter(|b| b.is_ascii()) {
                by_first[b as usize].push((i as u8, true));
            }
        }
        for (i, (n, _)) in ANIONS.iter().enumerate() {
            if let Some(&b) = n.as_bytes().first().filter(|b| b.is_ascii()) {
                by_first[b as usize].push((i as u8, false));
            }
        }
        by_first
    });
    let list: &[(u8, bool)] = match text.as_bytes().first() {
        Some(&b) if b.is_ascii() => &index[b as usize],
        _ => &[],
    };
    list.iter()
        .filter_map(move |&(i, cation)| match (cation, table) {
            (true, _) => CATIONS.get(i as usize),
            (false, IonTable::Both) => ANIONS.get(i as usize),
            (false, IonTable::Cations) => None,
        })
}

/// `text.starts_with(name)`, looking at the first byte before comparing the rest: the ion
/// tables are scanned for every formula.
fn opens_with(text: &str, name: &str) -> bool {
    text.as_bytes().first() == name.as_bytes().first() && text.starts_with(name)
}

fn ion_list(text: &str, table: &[(&str, i32)]) -> Option<Vec<(String, i32)>> {
    let mut out = Vec::new();
    let mut rest = text.trim();
    while !rest.is_empty() {
        let (inner, after) = if let Some(r) = rest.strip_prefix('(') {
            let close = r.find(')')?;
            (&r[..close], &r[close + 1..])
        } else {
            let (name, _) = table.iter().find(|(n, _)| opens_with(rest, n))?;
            (&rest[..name.len()], &rest[name.len()..])
        };
        let (name, q) = table.iter().find(|(n, _)| *n == inner)?;
        let digits = after.bytes().take_while(u8::is_ascii_digit).count();
        let count: i32 = if digits == 0 {
            1
        } else {
            after[..digits].parse().ok().filter(|&c: &i32| c <= 12)?
        };
        out.push((
            if count == 1 {
                name.to_string()
            } else {
                format!("{name}{count}")
            },
            q * count,
        ));
        rest = after[digits..].trim_start();
    }
    Some(out)
}

fn word_at(text: &str) -> &str {
    let end = text
        .char_indices()
        .find(|&(_, c)| !(c.is_alphanumeric() || c == '*' || c == '\''))
        .map_or(text.len(), |(i, _)| i);
    &text[..end]
}

/// An IUPAC polyhedral descriptor in front of a formula, with its hyphen: "OC-6-22-",
/// "(OC-6-24-A)-", "SP-4-2-" (IUPAC 2005, IR-9.3.2-4). Its length in bytes.
fn polyhedral_label(rest: &str) -> Option<usize> {
    const SYMBOLS: [&str; 11] = [
        "TBPY-5", "PBPY-7", "TPR-6", "SPY-5", "OC-6", "SP-4", "SS-4", "TP-3", "TS-3", "T-4", "L-2",
    ];
    let (open, s) = match rest.strip_prefix('(') {
        Some(s) => (1, s),
        None => (0, rest),
    };
    let sym = SYMBOLS.iter().find(|p| s.starts_with(*p))?;
    let mut i = sym.len();
    // segments: digits, or a chirality letter, each after a hyphen
    while let Some(after) = s[i..].strip_prefix('-') {
        let seg: usize = if let Some(n) = after
            .char_indices()
            .take_while(|(_, c)| c.is_ascii_digit())
            .last()
            .map(|(j, c)| j + c.len_utf8())
        {
            n
        } else if let Some(c) = after.chars().next().filter(|c| "CAΔΛ".contains(*c)) {
            c.len_utf8()
        } else {
            break;
        };
        let next = after[seg..].chars().next();
        if !matches!(next, Some('-') | Some(')')) {
            break;
        }
        i += 1 + seg;
    }
    if open == 1 {
        let close = s[i..].strip_prefix(')')?;
        close.strip_prefix('-')?;
        Some(open + i + 2)
    } else {
        s[i..].strip_prefix('-')?;
        Some(i + 1)
    }
}

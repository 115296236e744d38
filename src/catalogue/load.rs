//! Reading ligand sets from TOML and checking them, with errors that name file, line, column
//! and ligand key.

use std::fmt;
use std::ops::Range;

use serde::Deserialize;
use toml::de::{DeTable, DeValue, ValueDeserializer};
use toml::Spanned;

use crate::chem::ligand::{BindingMode, CbcClass, FieldClass, LigandDef, Ranked, Sourced};
use crate::chem::molecule::Molecule;
use crate::chem::species::SubstrateDef;

/// A problem in a ligand set: where it is and what to do.
#[derive(Debug, Clone, PartialEq)]
pub struct SetError {
    pub file: String,
    pub line: usize,
    pub column: usize,
    pub key: Option<String>,
    pub message: String,
}

impl fmt::Display for SetError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if self.line == 0 {
            write!(f, "{}: ", self.file)?;
        } else {
            write!(f, "{}:{}:{}: ", self.file, self.line, self.column)?;
        }
        if let Some(k) = &self.key {
            write!(f, "ligand '{k}': ")?;
        }
        write!(f, "{}", self.message)
    }
}

/// A reagent or substrate that steps bring in or release (MeI, PhB(OH)2, AgBF4, H2).
#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawSubstrate {
    key: Spanned<String>,
    name: String,
    formula: String,
    #[serde(default)]
    aliases: Vec<String>,
    smiles: String,
    #[serde(default)]
    hazards: Vec<String>,
    #[serde(default)]
    hazard_source: Option<String>,
    #[serde(default)]
    notes: Option<String>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawLigand {
    key: Spanned<String>,
    name: String,
    formula: String,
    #[serde(default)]
    smiles: Option<String>,
    #[serde(default)]
    aliases: Vec<String>,
    family: String,
    #[serde(default)]
    field: Option<FieldClass>,
    #[serde(default)]
    pi_donor: bool,
    #[serde(default)]
    cone_angle: Option<Spanned<f64>>,
    #[serde(default)]
    cone_angle_source: Option<String>,
    #[serde(default)]
    tep: Option<Spanned<f64>>,
    #[serde(default)]
    tep_source: Option<String>,
    #[serde(default)]
    bite_angle: Option<Spanned<f64>>,
    #[serde(default)]
    bite_angle_source: Option<String>,
    #[serde(default)]
    trans_effect: Option<Spanned<i64>>,
    #[serde(default)]
    trans_effect_source: Option<String>,
    #[serde(default)]
    trans_influence: Option<Spanned<i64>>,
    #[serde(default)]
    trans_influence_source: Option<String>,
    #[serde(default)]
    hazards: Vec<String>,
    #[serde(default)]
    hazard_source: Option<String>,
    #[serde(default)]
    notes: Option<String>,
    #[serde(default)]
    counterpart: Option<String>,
    #[serde(default)]
    mode: Vec<Spanned<RawMode>>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawMode {
    label: String,
    class: Spanned<String>,
    #[serde(default)]
    donors: Option<u8>,
    #[serde(default)]
    sites: Option<u8>,
    #[serde(default)]
    bridges: Option<u8>,
    #[serde(default)]
    ionic_charge: Option<i8>,
    #[serde(default)]
    three_centre: bool,
    #[serde(default)]
    note: Option<String>,
}

/// The families a ligand may belong to; see DEVELOPERS.md.
pub const FAMILIES: &[&str] = &[
    "hydride",
    "halide",
    "pseudohalide",
    "alkyl",
    "aryl",
    "acyl",
    "silyl",
    "boryl",
    "alkoxide",
    "amide",
    "thiolate",
    "carbonyl",
    "nitrosyl",
    "small-molecule",
    "isocyanide",
    "phosphine",
    "phosphite",
    "arsine",
    "diphosphine",
    "amine",
    "diamine",
    "pyridine",
    "diimine",
    "nitrile",
    "ether",
    "water",
    "thioether",
    "alkene",
    "alkyne",
    "diene",
    "allyl",
    "cyclopentadienyl",
    "arene",
    "polyene",
    "carboxylate",
    "diketonate",
    "carbene",
    "alkylidene",
    "alkylidyne",
    "oxo",
    "imido",
    "nitrido",
    "peroxo",
    "macrocycle",
    "scorpionate",
    "pincer",
    "lewis-acid",
    "other",
];

/// What one set file holds.
#[derive(Default)]
pub struct Set {
    pub ligands: Vec<LigandDef>,
    pub substrates: Vec<SubstrateDef>,
    pub errors: Vec<SetError>,
}

/// Parse one set. A syntax error rejects the file; a bad entry is skipped and reported while
/// the rest of the file loads.
pub fn parse_set(file: &str, text: &str, origin: &str) -> (Vec<LigandDef>, Vec<SetError>) {
    let set = parse_set_all(file, text, origin);
    (set.ligands, set.errors)
}

/// Parse one set with its substrates. Each `[[ligand]]` and `[[substrate]]` is read on its
/// own: an unknown field or a bad value drops that entry, names it and where it is, and the
/// rest of the file loads. Only a TOML syntax error drops the whole file.
pub fn parse_set_all(file: &str, text: &str, origin: &str) -> Set {
    let at = |span: Option<Range<usize>>, key: Option<String>, message: String| {
        let (line, column) = line_col(text, span.map_or(0, |s| s.start));
        SetError {
            file: file.to_string(),
            line,
            column,
            key,
            message,
        }
    };
    let root = match DeTable::parse(text) {
        Ok(r) => r.into_inner(),
        Err(e) => {
            let msg = e.message().trim().to_string();
            return Set {
                errors: vec![at(e.span(), None, msg)],
                ..Set::default()
            };
        }
    };
    let mut errors = Vec::new();
    let mut raw_ligands = Vec::new();
    let mut raw_substrates = Vec::new();
    for (name, value) in root {
        let span = name.span();
        let items = match name.get_ref().as_ref() {
            "set" => continue,
            "ligand" => &mut raw_ligands,
            "substrate" => &mut raw_substrates,
            other => {
                errors.push(at(
                    Some(span),
                    None,
                    format!(
                        "unknown field '{other}' ignored: a set holds [[ligand]] and \
                         [[substrate]] tables (and an optional set = \"name\")"
                    ),
                ));
                continue;
            }
        };
        let what = name.get_ref().to_string();
        let value_span = value.span();
        match value.into_inner() {
            DeValue::Array(a) => items.extend(a),
            _ => errors.push(at(
                Some(value_span),
                None,
                format!("'{what}' must be written as [[{what}]] tables; it was ignored"),
            )),
        }
    }
    let entries = raw_ligands.len() + raw_substrates.len();
    let ligands = convert_all(raw_ligands, &mut errors, &at, |r| convert(r, origin));
    let substrates = convert_all(raw_substrates, &mut errors, &at, |r| {
        convert_substrate(r, origin)
    });
    let dropped = entries - ligands.len() - substrates.len();
    if dropped > 1 {
        errors.push(summary(file, &errors, dropped, entries));
    }
    Set {
        ligands,
        substrates,
        errors,
    }
}

/// One line listing the entries a file lost, after the warnings about each.
fn summary(file: &str, errors: &[SetError], dropped: usize, entries: usize) -> SetError {
    const SHOWN: usize = 8;
    let mut names: Vec<String> = errors
        .iter()
        .filter(|e| e.message.ends_with("this entry is skipped"))
        .take(SHOWN)
        .map(|e| match &e.key {
            Some(k) => format!("'{k}'"),
            None => format!("the entry at line {}", e.line),
        })
        .collect();
    if dropped > SHOWN {
        names.push(format!("and {} more", dropped - SHOWN));
    }
    SetError {
        file: file.to_string(),
        line: 0,
        column: 0,
        key: None,
        message: format!(
            "{dropped} of {entries} entries dropped ({}); the other {} loaded; fix the entries \
             named above",
            names.join(", "),
            entries - dropped
        ),
    }
}

/// The entry's key, which must be one word as it is typed in `place`.
fn one_word(key: Spanned<String>, place: &str) -> Result<(String, Range<usize>), Problem> {
    let span = key.span();
    let key = key.into_inner();
    if key.is_empty() || key.chars().any(char::is_whitespace) {
        return Err((
            format!("the key must be one word with no spaces, as written in {place}"),
            Some(span),
        ));
    }
    Ok((key, span))
}

fn convert_substrate(raw: RawSubstrate, origin: &str) -> Result<SubstrateDef, Problem> {
    let (key, key_span) = one_word(raw.key, "steps")?;
    if !raw.hazards.is_empty() && raw.hazard_source.as_deref().is_none_or(str::is_empty) {
        return Err((
            "hazards need hazard_source (regulation, safety data sheet or \"from memory\")".into(),
            Some(key_span),
        ));
    }
    let structure =
        Molecule::from_smiles(&raw.smiles).map_err(|e| (e.to_string(), Some(key_span.clone())))?;
    if structure.star_count() > 0 {
        return Err((
            "a substrate is a free species: its SMILES has no '*'".into(),
            Some(key_span),
        ));
    }
    Ok(SubstrateDef {
        key,
        name: raw.name,
        formula: raw.formula,
        aliases: raw.aliases,
        smiles: raw.smiles,
        hazards: raw.hazards,
        hazard_source: raw.hazard_source,
        notes: raw.notes,
        origin: origin.to_string(),
        structure: std::sync::Arc::new(structure),
    })
}

type Problem = (String, Option<Range<usize>>);

/// Read every entry of one kind; a bad entry is reported with its key and where it is, and
/// skipped.
fn convert_all<'i, R: Deserialize<'i>, T>(
    raw: Vec<Spanned<DeValue<'i>>>,
    errors: &mut Vec<SetError>,
    at: &dyn Fn(Option<Range<usize>>, Option<String>, String) -> SetError,
    convert: impl Fn(R) -> Result<T, Problem>,
) -> Vec<T> {
    let mut out = Vec::with_capacity(raw.len());
    for item in raw {
        let span = item.span();
        let key = match item.get_ref() {
            DeValue::Table(t) => t
                .get("key")
                .and_then(|k| k.get_ref().as_str())
                .map(str::to_string),
            _ => None,
        };
        let result = R::deserialize(ValueDeserializer::from(item))
            .map_err(|e| {
                let what = e.message().trim().to_string();
                let fix = "fix or remove that field (the format is in DEVELOPERS.md)";
                (format!("{what}: {fix}"), e.span())
            })
            .and_then(&convert);
        match result {
            Ok(x) => out.push(x),
            Err((msg, sub)) => errors.push(at(
                Some(sub.unwrap_or(span)),
                key,
                format!("{msg}; this entry is skipped"),
            )),
        }
    }
    out
}

/// A published number must be finite and within `range`; the message says the unit and the
/// usual values.
fn in_range(
    value: f64,
    range: std::ops::RangeInclusive<f64>,
    what: &str,
    unit: &str,
    usual: &str,
) -> Result<(), String> {
    if value.is_finite() && range.contains(&value) {
        Ok(())
    } else {
        Err(format!(
            "{what} = {value} is outside {}-{} {unit} ({usual}); correct the number or leave \
             the field out",
            range.start(),
            range.end()
        ))
    }
}

/// Tolman electronic parameters (A1 ν(CO) of Ni(CO)3L) lie near 2040-2111 cm-1 for common
/// ligands (Tolman, Chem. Rev. 1977, 77, 313); free CO is 2143. This window leaves room and
/// catches typing slips and non-numbers.
pub const TEP_RANGE: std::ops::RangeInclusive<f64> = 1950.0..=2150.0;

/// Cone angles, degrees: hydride's 75° is about the smallest; a cone is at most the sphere.
/// Natural bite angles of chelates, degrees.
pub const BITE_RANGE: std::ops::RangeInclusive<f64> = 50.0..=180.0;
/// Places in the trans effect and trans influence series.
pub const RANK_RANGE: std::ops::RangeInclusive<u8> = 1..=10;
pub const CONE_RANGE: std::ops::RangeInclusive<f64> = 30.0..=360.0;

/// Mode counts that keep counting arithmetic within reason (η8-COT has 8 donors; μ6 bridges
/// are the widest; ions beyond ±6 are not ligands).
const MAX_DONORS: u8 = 12;
const MAX_SITES: u8 = 12;
const MAX_BRIDGES: u8 = 6;
const MAX_IONIC_CHARGE: i8 = 6;

fn convert(raw: RawLigand, origin: &str) -> Result<LigandDef, Problem> {
    let (key, key_span) = one_word(raw.key, "formulas")?;
    if !FAMILIES.contains(&raw.family.as_str()) {
        return Err((
            format!(
                "unknown family '{}'; use one of: {}",
                raw.family,
                FAMILIES.join(", ")
            ),
            Some(key_span),
        ));
    }
    if raw.mode.is_empty() {
        return Err((
            "no binding mode: add a [[ligand.mode]] with label and class".into(),
            Some(key_span),
        ));
    }
    // a published number: in range, and with its source
    let sourced = |value: Option<Spanned<f64>>,
                   source: Option<String>,
                   what: &str,
                   range: std::ops::RangeInclusive<f64>,
                   unit: &str,
                   usual: &str| {
        let Some(value) = value else {
            return Ok(None);
        };
        let span = value.span();
        let v = *value.get_ref();
        in_range(v, range, what, unit, usual).map_err(|m| (m, Some(span.clone())))?;
        match source {
            Some(s) if !s.trim().is_empty() => Ok(Some(Sourced {
                value: v,
                source: s,
            })),
            _ => Err((
                format!("{what} needs {what}_source (the published work, or \"from memory\")"),
                Some(span),
            )),
        }
    };
    let cone_angle = sourced(
        raw.cone_angle,
        raw.cone_angle_source,
        "cone_angle",
        CONE_RANGE,
        "degrees",
        "Tolman cones run from 75 for H to about 210",
    )?;
    let tep = sourced(
        raw.tep,
        raw.tep_source,
        "tep",
        TEP_RANGE,
        "cm-1",
        "Tolman's values run from about 2040 to 2111",
    )?;
    let bite_angle = sourced(
        raw.bite_angle,
        raw.bite_angle_source,
        "bite_angle",
        BITE_RANGE,
        "degrees",
        "natural bite angles run from about 70 (dppm) to about 120, trans-spanning ones near 180",
    )?;
    let trans_effect = ranked(raw.trans_effect, raw.trans_effect_source, "trans_effect")?;
    let trans_influence = ranked(
        raw.trans_influence,
        raw.trans_influence_source,
        "trans_influence",
    )?;
    if !raw.hazards.is_empty() && raw.hazard_source.as_deref().is_none_or(str::is_empty) {
        return Err((
            "hazards need hazard_source (regulation, safety data sheet or \"from memory\")".into(),
            Some(key_span),
        ));
    }
    let mut modes: Vec<BindingMode> = Vec::new();
    for m in raw.mode {
        let span = m.span();
        let m = m.into_inner();
        let class = CbcClass::parse(m.class.get_ref())
            .map_err(|e| (e.to_string(), Some(m.class.span())))?;
        let mut mode = BindingMode::new(&m.label, class);
        if modes.iter().any(|x| x.label == mode.label) {
            return Err((
                format!("mode label '{}' appears twice", mode.label),
                Some(span),
            ));
        }
        if let Some(d) = m.donors {
            mode.donors = d;
        }
        if let Some(s) = m.sites {
            mode.sites = s;
        }
        if let Some(b) = m.bridges {
            mode.bridges = b.max(1);
        }
        if let Some(q) = m.ionic_charge {
            mode.ionic_charge = q;
        }
        mode.three_centre = m.three_centre;
        mode.note = m.note;
        let bad = |what: &str, value: i64, lo: i64, hi: i64| {
            (!(lo..=hi).contains(&value)).then(|| {
                (
                    format!(
                        "mode '{}': {what} = {value} is outside {lo}-{hi}; give it in the \
                         mode or fix the label",
                        mode.label
                    ),
                    Some(span.clone()),
                )
            })
        };
        let problem = bad("donors", mode.donors.into(), 1, MAX_DONORS.into())
            .or_else(|| bad("sites", mode.sites.into(), 1, MAX_SITES.into()))
            .or_else(|| bad("bridges", mode.bridges.into(), 1, MAX_BRIDGES.into()))
            .or_else(|| {
                let q = i64::from(MAX_IONIC_CHARGE);
                bad("ionic_charge", mode.ionic_charge.into(), -q, q)
            });
        if let Some(p) = problem {
            return Err(p);
        }
        modes.push(mode);
    }
    if bite_angle.is_some() && !modes.iter().any(|m| m.sites == 2) {
        return Err((
            "bite_angle is for chelates: give the ligand a mode that holds two sites (κ2)".into(),
            Some(key_span),
        ));
    }
    let structure = match &raw.smiles {
        None => None,
        Some(text) => {
            Some(Molecule::from_smiles(text).map_err(|e| (e.to_string(), Some(key_span.clone())))?)
        }
    };
    let mut def = LigandDef {
        structure: None,
        elements: None,
        derived: false,
        key,
        name: raw.name,
        formula: raw.formula,
        smiles: raw.smiles,
        aliases: raw.aliases,
        family: raw.family.clone(),
        field: raw.field,
        pi_donor: raw.pi_donor,
        cone_angle,
        tep,
        bite_angle,
        trans_effect,
        trans_influence,
        hazards: raw.hazards,
        hazard_source: raw.hazard_source,
        notes: raw.notes,
        counterpart: raw.counterpart,
        modes,
        origin: origin.to_string(),
        traits: crate::chem::ligand::FamilyTraits::of(&raw.family),
    };
    if let Some(m) = structure {
        def.set_structure(m);
    }
    Ok(def)
}

/// A place in an ordinal series (1-10, higher stronger), which needs its source.
fn ranked(
    value: Option<Spanned<i64>>,
    source: Option<String>,
    what: &str,
) -> Result<Option<Ranked>, Problem> {
    let Some(value) = value else {
        return Ok(None);
    };
    let span = value.span();
    let v = *value.get_ref();
    let rank = u8::try_from(v)
        .ok()
        .filter(|r| RANK_RANGE.contains(r))
        .ok_or_else(|| {
            (
                format!(
                    "{what} = {v} is outside {}-{}; give the ligand's place in the series, \
                     higher meaning stronger",
                    RANK_RANGE.start(),
                    RANK_RANGE.end()
                ),
                Some(span.clone()),
            )
        })?;
    match source {
        Some(s) if !s.trim().is_empty() => Ok(Some(Ranked { rank, source: s })),
        _ => Err((
            format!("{what} needs {what}_source (the published work, or \"from memory\")"),
            Some(span),
        )),
    }
}

/// 1-based line and column of a byte offset.
fn line_col(text: &str, offset: usize) -> (usize, usize) {
    let offset = offset.min(text.len());
    let before = &text[..offset];
    let line = before.matches('\n').count() + 1;
    let col = before.rsplit('\n').next().map_or(0, |l| l.chars().count()) + 1;
    (line, col)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn syntax_error_names_line_and_column() {
        let text = "[[ligand]]\nkey = \"X1\"\nname = oops\n";
        let (ligs, errs) = parse_set("bad.toml", text, "test");
        assert!(ligs.is_empty());
        assert_eq!(errs.len(), 1);
        assert_eq!((errs[0].line, errs[0].file.as_str()), (3, "bad.toml"));
        assert!(errs[0].to_string().starts_with("bad.toml:3:"));
    }

    #[test]
    fn bad_ligand_is_skipped_and_named_others_load() {
        let text = r#"
[[ligand]]
key = "Good"
name = "good"
formula = "Gd1"
family = "amine"
[[ligand.mode]]
label = "κ1"
class = "L"

[[ligand]]
key = "Bad"
name = "bad"
formula = "Bd1"
family = "amine"
[[ligand.mode]]
label = "κ1"
class = "LQ"
"#;
        let (ligs, errs) = parse_set("mixed.toml", text, "test");
        assert_eq!(ligs.len(), 1);
        assert_eq!(errs.len(), 1);
        assert_eq!(errs[0].key.as_deref(), Some("Bad"));
        assert_eq!(errs[0].line, 18);
        assert!(errs[0].message.contains("CBC class"));
    }

    #[test]
    fn numbers_without_source_are_refused() {
        let text = r#"
[[ligand]]
key = "Q"
name = "q"
formula = "Q"
family = "phosphine"
cone_angle = 120.0
[[ligand.mode]]
label = "κ1"
class = "L"
"#;
        let (_, errs) = parse_set("s.toml", text, "test");
        assert!(errs[0].message.contains("cone_angle_source"));
    }

    #[test]
    fn a_place_in_the_trans_series_needs_its_source_and_range() {
        let entry = |extra: &str| {
            format!(
                "[[ligand]]\nkey = \"Q\"\nname = \"q\"\nformula = \"Q\"\nfamily = \"phosphine\"\n\
                 {extra}\n[[ligand.mode]]\nlabel = \"κ1\"\nclass = \"L\"\n"
            )
        };
        let (_, errs) = parse_set("s.toml", &entry("trans_influence = 7"), "test");
        assert!(
            errs[0].message.contains("trans_influence_source"),
            "{errs:?}"
        );
        assert_eq!(errs[0].line, 6);
        let (_, errs) = parse_set(
            "s.toml",
            &entry("trans_effect = 11\ntrans_effect_source = \"x\""),
            "test",
        );
        assert!(errs[0].message.contains("outside 1-10"), "{errs:?}");
        let (ligs, errs) = parse_set(
            "s.toml",
            &entry("trans_effect = 9\ntrans_effect_source = \"from memory\""),
            "test",
        );
        assert!(errs.is_empty(), "{errs:?}");
        assert_eq!(ligs[0].trans_effect.as_ref().map(|r| r.rank), Some(9));
        // a bite angle belongs to a chelate
        let (_, errs) = parse_set(
            "s.toml",
            &entry("bite_angle = 85.0\nbite_angle_source = \"x\""),
            "test",
        );
        assert!(errs[0].message.contains("chelates"), "{errs:?}");
    }
}

//! JSON lines for scripts. Schema 1: the field names are a contract; add fields, never rename.

use std::io::{self, Write};

use serde::Serialize;

use super::jsonw;
use crate::chem::ligand::LigandDef;
use crate::chem::{Complex, ParseError, Report};

/// Version of the JSON shape written by `count` and `ligands`.
pub const SCHEMA: u32 = 1;
const _: () = assert!(
    SCHEMA == 1,
    "append_report writes the schema number literally"
);

/// Append `{"schema":1,"input":...,` with the report's own fields, one line.
pub fn append_report(buf: &mut Vec<u8>, input: &str, report: &Report) {
    buf.extend_from_slice(b"{\"schema\":1,\"input\":");
    jsonw::string(buf, input);
    jsonw::report_fields(buf, report);
    buf.push(b'\n');
}

/// A count line with only the named top-level fields (`count --fields`).
pub fn append_report_fields(buf: &mut Vec<u8>, input: &str, report: &Report, keep: &[String]) {
    let wants = |k: &str| keep.iter().any(|x| x == k);
    buf.push(b'{');
    let mut first = true;
    if wants("schema") {
        buf.extend_from_slice(b"\"schema\":1");
        first = false;
    }
    if wants("input") {
        if !first {
            buf.push(b',');
        }
        buf.extend_from_slice(b"\"input\":");
        jsonw::string(buf, input);
        first = false;
    }
    jsonw::report_fields_only(buf, report, Some(keep), first);
    buf.push(b'\n');
}

/// A count line for `--fields` naming only schema, input, formula and charge: written from
/// the parsed complex, with the same keys in the same order as `append_report_fields`.
pub fn append_parsed_fields(buf: &mut Vec<u8>, input: &str, c: &Complex, keep: &[String]) {
    let wants = |k: &str| keep.iter().any(|x| x == k);
    buf.push(b'{');
    let mut first = true;
    let mut comma = |buf: &mut Vec<u8>| {
        if !first {
            buf.push(b',');
        }
        first = false;
    };
    if wants("schema") {
        comma(buf);
        buf.extend_from_slice(b"\"schema\":1");
    }
    if wants("input") {
        comma(buf);
        buf.extend_from_slice(b"\"input\":");
        jsonw::string(buf, input);
    }
    if wants("formula") {
        comma(buf);
        buf.extend_from_slice(b"\"formula\":");
        jsonw::string(buf, &c.formula(false));
    }
    if wants("charge") {
        comma(buf);
        buf.extend_from_slice(b"\"charge\":");
        buf.extend_from_slice(c.charge.to_string().as_bytes());
    }
    buf.push(b'}');
    buf.push(b'\n');
}

#[derive(Serialize)]
struct ErrorLine<'a> {
    schema: u32,
    input: &'a str,
    error: String,
    column: usize,
    suggestion: Option<&'a str>,
}

pub fn write_error(out: &mut impl Write, input: &str, e: &ParseError) -> io::Result<()> {
    let line = ErrorLine {
        schema: SCHEMA,
        input,
        error: e.to_string(),
        column: e.column + 1,
        suggestion: e.suggestion.as_deref(),
    };
    serde_json::to_writer(&mut *out, &line)?;
    out.write_all(b"\n")
}

/// A step's product: `{"schema":1,"input":...,"step":...,"product":...,"changes":{...},` then
/// the product's count fields.
pub fn append_step(
    buf: &mut Vec<u8>,
    input: &str,
    o: &crate::chem::steps::Outcome,
    recorded: Option<&(String, u64)>,
) {
    let (e, os, d, cn) = o.deltas();
    buf.extend_from_slice(b"{\"schema\":1,\"input\":");
    jsonw::string(buf, input);
    buf.extend_from_slice(b",\"step\":");
    jsonw::string(buf, &o.step.to_string());
    buf.extend_from_slice(b",\"product\":");
    jsonw::string(buf, &o.after.formula);
    if let Some((session, id)) = recorded {
        buf.extend_from_slice(b",\"session\":");
        jsonw::string(buf, session);
        let _ = write!(buf, ",\"variant\":{id}");
    }
    let _ = write!(
        buf,
        ",\"changes\":{{\"electrons\":{},\"oxidation_state\":{},\"d_electrons\":{},\"coordination_number\":{}}}",
        json_num(e),
        json_num(os),
        json_num(d),
        json_num(cn)
    );
    buf.extend_from_slice(b",\"equation\":");
    equation(buf, &o.equation);
    buf.extend_from_slice(b",\"equation_text\":");
    jsonw::string(buf, &o.equation_text());
    buf.extend_from_slice(b",\"step_notes\":");
    let _ = serde_json::to_writer(&mut *buf, &o.notes);
    jsonw::report_fields(buf, &o.after);
    buf.push(b'\n');
}

/// `{"enters": [species], "leaves": [species]}`.
pub fn equation(buf: &mut Vec<u8>, eq: &crate::chem::species::Equation) {
    buf.extend_from_slice(b"{\"enters\":");
    terms(buf, &eq.enters);
    buf.extend_from_slice(b",\"leaves\":");
    terms(buf, &eq.leaves);
    buf.push(b'}');
}

/// Species as `{"name","formula","smiles","charge","count"}`, with GHS statements when any.
pub fn terms(buf: &mut Vec<u8>, list: &[crate::chem::species::Term]) {
    #[derive(Serialize)]
    struct S<'a> {
        name: String,
        formula: String,
        smiles: String,
        charge: i32,
        count: u32,
        #[serde(skip_serializing_if = "<[String]>::is_empty")]
        ghs: &'a [String],
    }
    let items: Vec<S> = list
        .iter()
        .map(|t| S {
            name: t.species.label(),
            formula: t.species.formula(),
            smiles: t.species.smiles(),
            charge: t.species.charge(),
            count: t.count,
            ghs: &t.species.hazards,
        })
        .collect();
    let _ = serde_json::to_writer(&mut *buf, &items);
}

fn json_num(f: crate::chem::Frac) -> String {
    serde_json::to_string(&f).unwrap_or_else(|_| "null".into())
}

/// `{"schema":1,"input":...,"step":...,"error":...}` for a refused step.
pub fn write_step_error(
    out: &mut impl Write,
    input: &str,
    step: &str,
    error: &str,
) -> io::Result<()> {
    #[derive(Serialize)]
    struct Line<'a> {
        schema: u32,
        input: &'a str,
        step: &'a str,
        error: &'a str,
    }
    serde_json::to_writer(
        &mut *out,
        &Line {
            schema: SCHEMA,
            input,
            step,
            error,
        },
    )?;
    out.write_all(b"\n")
}

/// `{"schema":1,"input":...,"error":...}` for input rejected before parsing.
pub fn write_message(out: &mut impl Write, input: &str, error: &str) -> io::Result<()> {
    #[derive(Serialize)]
    struct Line<'a> {
        schema: u32,
        input: &'a str,
        error: &'a str,
    }
    serde_json::to_writer(
        &mut *out,
        &Line {
            schema: SCHEMA,
            input,
            error,
        },
    )?;
    out.write_all(b"\n")
}

#[derive(Serialize)]
struct ModeLine<'a> {
    label: &'a str,
    class: String,
    neutral_electrons: i64,
    ionic_electrons: i64,
    ionic_charge: i8,
    donors: u8,
    sites: u8,
    bridges: u8,
    three_centre: bool,
    note: Option<&'a str>,
}

#[derive(Serialize)]
struct LigandLine<'a> {
    schema: u32,
    key: &'a str,
    name: &'a str,
    formula: &'a str,
    aliases: &'a [String],
    family: &'a str,
    cone_angle_deg: Option<f64>,
    cone_angle_source: Option<&'a str>,
    tep_cm1: Option<f64>,
    tep_source: Option<&'a str>,
    /// Natural bite angle of a chelate, degrees.
    bite_angle_deg: Option<f64>,
    bite_angle_source: Option<&'a str>,
    /// Places in the trans effect and trans influence series (1-10), when the catalogue
    /// gives them.
    trans_effect: Option<u8>,
    trans_effect_source: Option<&'a str>,
    trans_influence: Option<u8>,
    trans_influence_source: Option<&'a str>,
    field: Option<&'a str>,
    pi_donor: bool,
    modes: Vec<ModeLine<'a>>,
    hazards: &'a [String],
    hazard_source: Option<&'a str>,
    notes: Option<&'a str>,
    /// The key of the other protonation form (pincers), if the catalogue names one.
    counterpart: Option<&'a str>,
    origin: &'a str,
}

pub fn write_ligand(out: &mut impl Write, l: &LigandDef) -> io::Result<()> {
    let line = LigandLine {
        schema: SCHEMA,
        key: &l.key,
        name: &l.name,
        formula: &l.formula,
        aliases: &l.aliases,
        family: &l.family,
        cone_angle_deg: l.cone_angle.as_ref().map(|c| c.value),
        cone_angle_source: l.cone_angle.as_ref().map(|c| c.source.as_str()),
        tep_cm1: l.tep.as_ref().map(|c| c.value),
        tep_source: l.tep.as_ref().map(|c| c.source.as_str()),
        bite_angle_deg: l.bite_angle.as_ref().map(|b| b.value),
        bite_angle_source: l.bite_angle.as_ref().map(|b| b.source.as_str()),
        trans_effect: l.trans_effect.as_ref().map(|r| r.rank),
        trans_effect_source: l.trans_effect.as_ref().map(|r| r.source.as_str()),
        trans_influence: l.trans_influence.as_ref().map(|r| r.rank),
        trans_influence_source: l.trans_influence.as_ref().map(|r| r.source.as_str()),
        field: l.field.map(|f| f.word()),
        pi_donor: l.pi_donor,
        modes: l
            .modes
            .iter()
            .map(|m| ModeLine {
                label: &m.label,
                class: m.class.to_string(),
                neutral_electrons: m.neutral_electrons(),
                ionic_electrons: m.ionic_electrons(),
                ionic_charge: m.ionic_charge,
                donors: m.donors,
                sites: m.sites,
                bridges: m.bridges,
                three_centre: m.three_centre,
                note: m.note.as_deref(),
            })
            .collect(),
        hazards: &l.hazards,
        hazard_source: l.hazard_source.as_deref(),
        notes: l.notes.as_deref(),
        counterpart: l.counterpart.as_deref(),
        origin: &l.origin,
    };
    serde_json::to_writer(&mut *out, &line)?;
    out.write_all(b"\n")
}

/// One substrate: `{"key","name","formula","hill","smiles","charge","aliases","hazards",
/// "hazard_source","notes","origin"}`.
pub fn write_substrate(
    out: &mut impl Write,
    d: &crate::chem::species::SubstrateDef,
) -> io::Result<()> {
    #[derive(Serialize)]
    struct Line<'a> {
        key: &'a str,
        name: &'a str,
        formula: &'a str,
        hill: String,
        smiles: &'a str,
        charge: i32,
        aliases: &'a [String],
        hazards: &'a [String],
        hazard_source: Option<&'a str>,
        notes: Option<&'a str>,
        origin: &'a str,
    }
    serde_json::to_writer(
        &mut *out,
        &Line {
            key: &d.key,
            name: &d.name,
            formula: &d.formula,
            hill: d.structure.composition().to_string(),
            smiles: &d.smiles,
            charge: d.structure.charge(),
            aliases: &d.aliases,
            hazards: &d.hazards,
            hazard_source: d.hazard_source.as_deref(),
            notes: d.notes.as_deref(),
            origin: &d.origin,
        },
    )?;
    out.write_all(b"\n")
}

/// The closing line of `nonet step --json`: `{"schema","input","path","closed","closed_at",
/// "net":{"consumed","formed"}}`; `closed_at` is the step that came back to an earlier
/// intermediate (null when the path is open).
pub fn write_path(
    out: &mut impl Write,
    input: &str,
    path: &[String],
    closed: Option<(usize, usize)>,
    net: &crate::chem::cycle::Net,
) -> io::Result<()> {
    let mut buf = Vec::new();
    buf.extend_from_slice(b"{\"schema\":1,\"input\":");
    jsonw::string(&mut buf, input);
    buf.extend_from_slice(b",\"path\":");
    let _ = serde_json::to_writer(&mut buf, path);
    let _ = write!(
        buf,
        ",\"closed\":{},\"closed_at\":{}",
        closed.is_some(),
        closed.map_or("null".to_string(), |(_, j)| j.to_string())
    );
    buf.extend_from_slice(b",\"net\":{\"consumed\":");
    terms(&mut buf, &net.consumed);
    buf.extend_from_slice(b",\"formed\":");
    terms(&mut buf, &net.formed);
    buf.extend_from_slice(b"},\"net_text\":");
    jsonw::string(&mut buf, &net.text());
    buf.extend_from_slice(b"}\n");
    out.write_all(&buf)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::catalogue::Catalogue;
    use crate::chem::{count, parse};

    /// The hand-written writer must give exactly what serde would: same keys, same values.
    #[test]
    fn hand_written_json_equals_serde_rendering() {
        let cat = Catalogue::bundled();
        for f in [
            "CpFe(CO)2Me",
            "Rh6(CO)16",
            "[Cr2(μ-H)(CO)10]-",
            "Pd(PtBu3)2",
            "[Co(NH3)6]3+",
            "Fe2(CO)9",
            "UCp3Cl",
            "[Fe(H2O)6]2+",
        ] {
            let c = parse(f, &cat).unwrap_or_else(|e| panic!("{}", e.render()));
            let r = count(&c);
            let mut line = Vec::new();
            append_report(&mut line, f, &r);
            let ours: serde_json::Value = serde_json::from_slice(&line).unwrap();
            let mut theirs = serde_json::to_value(&r).unwrap();
            let obj = theirs.as_object_mut().unwrap();
            obj.insert("schema".into(), SCHEMA.into());
            obj.insert("input".into(), f.into());
            assert_eq!(ours, theirs, "{f}");
        }
    }
}

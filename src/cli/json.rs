//! JSON lines for scripts. Schema 1: the field names are a contract; add fields, never rename.

use std::io::{self, Write};

use serde::Serialize;

use crate::chem::ligand::LigandDef;
use crate::chem::{ParseError, Report};

/// Version of the JSON shape written by `count` and `ligands`.
pub const SCHEMA: u32 = 1;

/// `{"schema":1,"input":...,` followed by the report's own fields.
pub fn write_report(
    out: &mut impl Write,
    input: &str,
    report: &Report,
    buf: &mut Vec<u8>,
) -> io::Result<()> {
    buf.clear();
    write!(buf, "{{\"schema\":{SCHEMA},\"input\":")?;
    serde_json::to_writer(&mut *buf, input)?;
    buf.push(b',');
    let start = buf.len();
    serde_json::to_writer(&mut *buf, report)?;
    // drop the report's opening brace: its fields continue the object begun above
    buf.remove(start);
    buf.push(b'\n');
    out.write_all(buf)
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
    field: Option<&'a str>,
    pi_donor: bool,
    modes: Vec<ModeLine<'a>>,
    hazards: &'a [String],
    hazard_source: Option<&'a str>,
    notes: Option<&'a str>,
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
        origin: &l.origin,
    };
    serde_json::to_writer(&mut *out, &line)?;
    out.write_all(b"\n")
}

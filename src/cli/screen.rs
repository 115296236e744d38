//! `nonet screen`: ranked swaps under constraints, as a table or JSON lines.

use std::io::{self, BufWriter, Write};

use serde_json::json;

use super::{load_catalogue, Status};
use crate::chem::screen::{self, Constraints, Rank, Shard};
use crate::chem::{self, Frac};

/// What `screen` was asked to do, free of clap types.
pub struct ScreenRequest {
    pub formula: String,
    pub sites: Vec<String>,
    pub electrons: Option<String>,
    pub saturated: bool,
    pub max_crowding: Option<f64>,
    pub cone: Option<String>,
    pub tep: Option<String>,
    pub diamagnetic: bool,
    pub families: Vec<String>,
    pub exclude_families: Vec<String>,
    pub no_hazardous: bool,
    pub rank: String,
    pub top: usize,
    pub shard: Option<String>,
    pub json: bool,
}

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

fn reject(msg: String) -> anyhow::Result<Status> {
    eprintln!("error: {msg}");
    Ok(Status::Rejected)
}

pub fn run(req: ScreenRequest) -> anyhow::Result<Status> {
    let cat = load_catalogue();
    let complex = match chem::parse(&req.formula, &cat) {
        Ok(c) => c,
        Err(e) => return reject(e.render()),
    };
    let mut constraints = Constraints {
        saturated: req.saturated,
        max_crowding: req.max_crowding,
        diamagnetic: req.diamagnetic,
        families: req.families.clone(),
        exclude_families: req.exclude_families.clone(),
        no_hazardous: req.no_hazardous,
        ..Constraints::default()
    };
    if let Some(e) = &req.electrons {
        match range::<i64>(e) {
            Some(r) => constraints.electrons = Some(r),
            None => {
                return reject(format!(
                    "--electrons takes N or LO-HI with LO <= HI (e.g. 16-18), not '{e}'"
                ))
            }
        }
    }
    if let Some(c) = &req.cone {
        match range::<f64>(c) {
            Some(r) => constraints.cone = Some(r),
            None => {
                return reject(format!(
                    "--cone takes LO-HI in degrees with LO <= HI (e.g. 120-160), not '{c}'"
                ))
            }
        }
    }
    if let Some(t) = &req.tep {
        match range::<f64>(t) {
            Some(r) => constraints.tep = Some(r),
            None => {
                return reject(format!(
                    "--tep takes LO-HI in cm-1 with LO <= HI (e.g. 2050-2070), not '{t}'"
                ))
            }
        }
    }
    for f in constraints
        .families
        .iter()
        .chain(&constraints.exclude_families)
    {
        if !crate::catalogue::FAMILIES.contains(&f.as_str()) {
            return reject(format!(
                "unknown family '{f}'; the families are: {}",
                crate::catalogue::FAMILIES.join(", ")
            ));
        }
    }
    if let Some(m) = req.max_crowding {
        if !(m.is_finite() && m > 0.0) {
            return reject(format!(
                "--max-crowding takes a positive number (1.15 crowded, 1.35 overfull), not {m}"
            ));
        }
    }
    if req.top == 0 {
        return reject("--top takes at least 1".into());
    }
    let rank = match req.rank.as_str() {
        "electrons" => Rank::Electrons,
        "crowding" => Rank::Crowding,
        "donor" => Rank::Donor,
        "cone" => Rank::Cone,
        other => {
            return reject(format!(
                "unknown ranking '{other}': use electrons, crowding, donor or cone"
            ))
        }
    };
    let shard = match &req.shard {
        None => None,
        Some(s) => match Shard::parse(s) {
            Some(sh) => Some(sh),
            None => return reject(format!("--shard takes K/N with 1 <= K <= N, not '{s}'")),
        },
    };
    // sites: the slots of the named ligands; the same name twice means two units of it
    let mut slots = Vec::new();
    let present: Vec<String> = complex
        .slots()
        .into_iter()
        .filter_map(|s| complex.group(s).map(|b| b.ligand.key.clone()))
        .collect();
    for name in &req.sites {
        // a mode or bridge prefix as the complex is printed (η5-Cp, κ2-acac, μ-Cl) names the
        // same ligand
        let bare = name
            .split_once('-')
            .filter(|(p, _)| p.starts_with(['η', 'κ', 'μ', 'h', 'k', 'm']) && p.len() <= 4)
            .map_or(name.as_str(), |(_, rest)| rest);
        let Some(l) = crate::chem::LigandLookup::exact(&cat, name)
            .or_else(|| crate::chem::LigandLookup::exact(&cat, bare))
        else {
            return reject(format!(
                "unknown ligand '{name}' for --site; this complex has: {}",
                present.join(", ")
            ));
        };
        let Some(slot) = complex
            .slots()
            .into_iter()
            .find(|s| complex.group(*s).is_some_and(|b| b.ligand.key == l.key))
        else {
            return reject(format!(
                "{} has no {} to replace; it has: {}",
                req.formula,
                l.key,
                present.join(", ")
            ));
        };
        let units = complex.group(slot).map_or(0, |b| b.count);
        let wanted = slots.iter().filter(|s| **s == slot).count() as u32 + 1;
        if wanted > units {
            return reject(format!("{} has only {units} {}", req.formula, l.key));
        }
        slots.push(slot);
    }
    let found = match screen::screen(
        &complex,
        &slots,
        cat.ligands(),
        &constraints,
        rank,
        req.top,
        shard,
    ) {
        Ok(f) => f,
        Err(e) => return reject(e.to_string()),
    };
    let stdout = io::stdout();
    let mut out = BufWriter::new(stdout.lock());
    let n = |f: Frac| serde_json::to_value(f).unwrap_or(serde_json::Value::Null);
    if !req.json {
        writeln!(
            out,
            "{:>4}  {:<22} {:>4} {:>4} {:>4}  {:<12} {:>6} {:>8} {:>8} {:>3}  product",
            "rank", "entering", "e", "OS", "d", "saturation", "crowd", "cone", "TEP", "unp"
        )?;
    }
    let mut no_record = std::collections::BTreeSet::new();
    let mut any_partial = false;
    for (i, c) in found.iter().enumerate() {
        let keys: Vec<&str> = c.ligands.iter().map(|l| l.key.as_str()).collect();
        let cones: Vec<Option<f64>> = c
            .ligands
            .iter()
            .map(|l| l.cone_angle.as_ref().map(|x| x.value))
            .collect();
        let teps: Vec<Option<f64>> = c
            .ligands
            .iter()
            .map(|l| l.tep.as_ref().map(|x| x.value))
            .collect();
        let m = c.report.metals.first();
        let saturation = m.map_or("?", |m| m.saturation.code());
        let unpaired = c.report.unpaired_electrons.first().copied();
        let unrecorded: Vec<&str> = c
            .ligands
            .iter()
            .filter(|l| l.hazards.is_empty() && l.hazard_source.is_none())
            .map(|l| l.key.as_str())
            .collect();
        no_record.extend(unrecorded.iter().map(|k| k.to_string()));
        // an entering ligand without a cone angle adds crowding nobody measured
        let partial = cones.iter().any(Option::is_none);
        any_partial |= partial;
        if req.json {
            let line = json!({
                "schema": 1,
                "input": req.formula,
                "sites": req.sites,
                "rank": i + 1,
                "ligands": keys,
                "electron_count": n(c.electrons),
                "oxidation_state": n(c.oxidation_state),
                "d_electrons": n(c.d_electrons),
                "saturation": saturation,
                "crowding": (c.crowding * 1000.0).round() / 1000.0,
                "cone_angles_deg": cones,
                "tep_cm1": teps,
                "unpaired_electrons": unpaired,
                "score": c.score,
                "product": c.report.formula,
                "hazards_on_record": unrecorded.is_empty(),
                "crowding_partial": partial,
            });
            serde_json::to_writer(&mut out, &line)?;
            writeln!(out)?;
        } else {
            let show = |v: &[Option<f64>]| {
                v.iter()
                    .map(|x| x.map_or("-".to_string(), |x| format!("{x:.0}")))
                    .collect::<Vec<_>>()
                    .join("/")
            };
            writeln!(
                out,
                "{:>4}  {:<22} {:>4} {:>4} {:>4}  {:<12} {:>6} {:>8} {:>8} {:>3}  {}",
                i + 1,
                keys.join(" + "),
                c.electrons.to_string(),
                c.oxidation_state.signed(),
                c.d_electrons.to_string(),
                saturation,
                format!("{:.2}{}", c.crowding, if partial { "?" } else { "" }),
                show(&cones),
                show(&teps),
                unpaired.map_or("?".to_string(), |u| u.to_string()),
                c.report.formula
            )?;
        }
    }
    if found.is_empty() {
        eprintln!("no candidate meets the constraints");
    }
    if any_partial && !req.json {
        eprintln!("note: '?' after crowding: an entering ligand has no cone angle, so its bulk is not in the sum");
    }
    if req.no_hazardous && !no_record.is_empty() && !req.json {
        eprintln!(
            "note: no hazard record in the catalogue for {}; unknown is not safe: consult the \
             supplier's safety data sheet",
            no_record.into_iter().collect::<Vec<_>>().join(", ")
        );
    }
    out.flush()?;
    Ok(Status::Ok)
}

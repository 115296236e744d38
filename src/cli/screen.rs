//! `nonet screen`: ranked swaps under constraints, as a table or JSON lines.

use std::io::{self, BufWriter, Write};

use serde_json::json;

use super::{diag, load_catalogue, rejected, Outcome, ScreenArgs, Status};
use crate::chem::screen::{self, Constraints, Rank, Shard};
use crate::chem::{self, Frac};

pub fn run(req: &ScreenArgs) -> Outcome {
    let cat = load_catalogue();
    let complex = match chem::parse(&req.formula, &cat) {
        Ok(c) => c,
        Err(e) => return rejected(diag::parse_error(&e)),
    };
    let constraints = Constraints {
        saturated: req.saturated,
        max_crowding: req.max_crowding,
        diamagnetic: req.diamagnetic,
        families: req.families.clone(),
        exclude_families: req.exclude_families.clone(),
        no_hazardous: req.no_hazardous,
        electrons: req.electrons,
        cone: req.cone,
        tep: req.tep,
    };
    let rank = Rank::from(req.rank);
    let shard: Option<Shard> = req.shard;
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
            return rejected(format!(
                "unknown ligand '{name}' for --site; this complex has: {}",
                present.join(", ")
            ));
        };
        let Some(slot) = complex
            .slots()
            .into_iter()
            .find(|s| complex.group(*s).is_some_and(|b| b.ligand.key == l.key))
        else {
            return rejected(format!(
                "{} has no {} to replace; it has: {}",
                req.formula,
                l.key,
                present.join(", ")
            ));
        };
        let units = complex.group(slot).map_or(0, |b| b.count);
        let wanted = slots.iter().filter(|s| **s == slot).count() as u32 + 1;
        if wanted > units {
            return rejected(format!("{} has only {units} {}", req.formula, l.key));
        }
        slots.push(slot);
    }
    let found = match screen::screen(
        &complex,
        &slots,
        cat.ligands(),
        &constraints,
        rank,
        req.top as usize,
        shard,
    ) {
        Ok(f) => f,
        Err(e) => return rejected(e.to_string()),
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
        diag::line("no candidate meets the constraints");
    }
    if any_partial && !req.json {
        diag::line("note: '?' after crowding: an entering ligand has no cone angle, so its bulk is not in the sum");
    }
    if req.no_hazardous && !no_record.is_empty() && !req.json {
        diag::line(&format!(
            "note: no hazard record in the catalogue for {}; unknown is not safe: consult the \
             supplier's safety data sheet",
            no_record.into_iter().collect::<Vec<_>>().join(", ")
        ));
    }
    out.flush()?;
    Ok(Status::Ok)
}

//! Which step a chemist would take next, and the choices a step leaves open: the partner an
//! unsaturated ligand inserts into, the alkene a β-elimination gives, the alkene a
//! metallacyclobutane gives off. Every suggestion is a step that goes through.

use super::ctx::one_bond;
use super::{take, Regio, Step};
use crate::chem::complex::{BoundLigand, Complex};
use crate::chem::edit::Slot;
use crate::chem::formula::LigandLookup;
use crate::chem::frac::Frac;

/// How much a chemist would expect a group to insert or couple first: H, then alkyls, then
/// aryl and vinyl, then silyl and boryl, then amido and alkoxo (common practice).
fn preference(b: &BoundLigand) -> u8 {
    let Some((m, at)) = one_bond(b) else {
        return 9;
    };
    let a = m.atoms[at];
    match a.z {
        1 => 0,
        6 if !a.aromatic && m.neighbors(at).all(|(_, o)| o == 1) => 1,
        6 => 2,
        14 | 5 => 3,
        7 | 8 => 4,
        _ => 9,
    }
}

/// Whether a ligand is an X group a step can move (not a halide or other leaving group).
fn movable(b: &BoundLigand) -> bool {
    preference(b) < 9
}

/// The keys of the groups on the metal other than the one at `skip`, best partner first.
fn partners(c: &Complex, skip: Slot) -> Vec<String> {
    let mut list: Vec<(u8, String)> = c
        .slots()
        .into_iter()
        .filter_map(|s| {
            let b = c.group(s)?;
            let same_unit = s == skip && b.count < 2;
            (!same_unit && movable(b)).then(|| (preference(b), b.ligand.key.clone()))
        })
        .collect();
    list.sort();
    list.dedup();
    list.into_iter().map(|(_, k)| k).collect()
}

/// The ways the step `seed` could go, the chemist's default first: for an insertion, the
/// partners on the metal (and the other regiochemistry); for reductive elimination, the
/// partners; for a β-elimination, each alkene; for cycloreversion and oxidative coupling, each
/// possibility. Only steps that go through are listed.
pub fn choices(c: &Complex, seed: &Step, lookup: &dyn LigandLookup) -> Vec<Step> {
    let slot_of = |key: &str| {
        c.slots()
            .into_iter()
            .find(|s| c.group(*s).is_some_and(|b| b.ligand.key == key))
    };
    let mut out: Vec<Step> = Vec::new();
    match seed {
        Step::MigratoryInsertion { inserting, .. } => {
            if let Some(s) = slot_of(inserting) {
                for p in partners(c, s) {
                    for regio in [None, Some(Regio::TwoOne), Some(Regio::OneTwo)] {
                        out.push(Step::MigratoryInsertion {
                            inserting: inserting.clone(),
                            into: p.clone(),
                            regio,
                        });
                    }
                }
            }
        }
        Step::ReductiveElimination(a, _) => {
            if let Some(s) = slot_of(a) {
                for p in partners(c, s) {
                    out.push(Step::ReductiveElimination(a.clone(), p));
                }
                // a halide partner last (H-X or C-X reductive elimination)
                for s2 in c.slots() {
                    if let Some(b) = c.group(s2) {
                        if b.mode().class.x == 1 && !movable(b) {
                            out.push(Step::ReductiveElimination(a.clone(), b.ligand.key.clone()));
                        }
                    }
                }
            }
        }
        Step::OxidativeCoupling(a, _) | Step::Cycloaddition { ligand: a, .. } => {
            for s in c.slots() {
                if let Some(b) = c.group(s) {
                    if b.mode().class.x == 0 {
                        out.push(match seed {
                            Step::OxidativeCoupling(..) => {
                                Step::OxidativeCoupling(a.clone(), b.ligand.key.clone())
                            }
                            _ => Step::Cycloaddition {
                                unsaturated: b.ligand.key.clone(),
                                ligand: a.clone(),
                                regio: None,
                            },
                        });
                        if matches!(seed, Step::Cycloaddition { .. }) {
                            out.push(Step::Cycloaddition {
                                unsaturated: b.ligand.key.clone(),
                                ligand: a.clone(),
                                regio: Some(Regio::OneTwo),
                            });
                        }
                    }
                }
            }
        }
        Step::BetaHydrideElimination { group, .. } => {
            out.push(Step::beta_hydride(group.clone()));
            for i in 1..=6 {
                out.push(Step::BetaHydrideElimination {
                    group: group.clone(),
                    which: Some(i.to_string()),
                });
            }
        }
        Step::Cycloreversion(_) => {
            // the two alkenes a metallacyclobutane can give off, found by trying each ligand
            // a step would name: the products are distinct, the keys are read from them
            let probe = Step::Cycloreversion("?".into());
            if let Err(super::StepError::Usage(why)) = take(c, &probe, lookup) {
                if let Some(list) = why
                    .split_once("give off ")
                    .and_then(|(_, r)| r.split_once(';'))
                    .map(|(l, _)| l)
                {
                    for alkene in list.split(" or ") {
                        out.push(Step::Cycloreversion(alkene.trim().to_string()));
                    }
                }
            }
        }
        Step::Isomerization(_) => {
            // every other arrangement of the same ligands, by configuration index
            let report = crate::chem::geometry::counted(c);
            if let Ok(p) = crate::chem::geometry::place(c, &report) {
                let now: &[usize] = if p.chosen.len() == 1 { &p.chosen } else { &[] };
                for (i, d) in p.descriptors.iter().enumerate() {
                    if !now.contains(&i) {
                        out.push(Step::Isomerization(d.clone()));
                    }
                }
            }
        }
        other => out.push(other.clone()),
    }
    // keep those that go through, once each by product; when none does, the first refused
    // one stays, so the preview can say why (two groups trans, and the isomer that would do)
    let mut seen: Vec<String> = Vec::new();
    let first = out.first().cloned();
    let through: Vec<Step> = out
        .into_iter()
        .filter(|s| match take(c, s, lookup) {
            Ok(o) => {
                let key = o.after.formula.clone() + &o.equation_text();
                if seen.contains(&key) {
                    false
                } else {
                    seen.push(key);
                    true
                }
            }
            Err(_) => false,
        })
        .collect();
    match first {
        Some(f)
            if through.is_empty()
                && matches!(
                    seed,
                    Step::ReductiveElimination(..) | Step::MigratoryInsertion { .. }
                ) =>
        {
            vec![f]
        }
        _ => through,
    }
}

/// The step a chemist would most likely take next on the ligand at `slot` (or, with none,
/// anywhere on the complex): an unsaturated ligand inserts into the best partner; an alkyl or
/// acyl with a hydride beside it eliminates with it, or β-eliminates; two carbon groups
/// couple; an alkene just made leaves; a ligand that left earlier on the path comes back
/// when the metal is short of 16 e; an 18-e complex loses a neutral ligand. `last` is the
/// step that made the complex; `departed` are the keys of ligands that left the metal earlier
/// on the path, most recent first.
pub fn suggest(
    c: &Complex,
    slot: Option<Slot>,
    last: Option<&Step>,
    departed: &[String],
    lookup: &dyn LigandLookup,
) -> Option<Step> {
    let ok = |s: Step| take(c, &s, lookup).is_ok().then_some(s);
    let count = |c: &Complex| {
        super::super::count::count(c)
            .metals
            .first()
            .map(|m| m.electron_count)
    };
    // the alkene a β-elimination just made leaves the metal
    if matches!(
        last,
        Some(
            Step::BetaHydrideElimination { .. }
                | Step::BetaAlkylElimination { .. }
                | Step::BetaHeteroatomElimination { .. }
        )
    ) {
        let made = slot.and_then(|s| c.group(s)).filter(|b| {
            b.mode().class.x == 0 && matches!(b.ligand.family.as_str(), "alkene" | "alkyne")
        });
        let any = c
            .all_ligands()
            .map(|(_, b)| b)
            .find(|b| b.mode().class.x == 0 && b.ligand.family == "alkene");
        if let Some(b) = made.or(any) {
            if let Some(s) = ok(Step::Dissociation(b.ligand.key.clone())) {
                return Some(s);
            }
        }
    }
    let try_slot = |s: Slot| -> Option<Step> {
        let b = c.group(s)?;
        let key = b.ligand.key.clone();
        let class = b.mode().class;
        let family = b.ligand.family.as_str();
        // an unsaturated ligand inserts into the best partner
        let unsaturated = class.x == 0
            && matches!(
                family,
                "carbonyl"
                    | "isocyanide"
                    | "alkene"
                    | "alkyne"
                    | "small-molecule"
                    | "other"
                    | "alkylidene"
            );
        if unsaturated {
            let seed = Step::MigratoryInsertion {
                inserting: key.clone(),
                into: String::new(),
                regio: None,
            };
            if let Some(first) = choices(c, &seed, lookup)
                .into_iter()
                .find(|s| take(c, s, lookup).is_ok())
            {
                return Some(first);
            }
        }
        if movable(b) {
            let pref = preference(b);
            // beside a hydride: reductive elimination of R-H (hydrogenation, hydroformylation)
            if pref > 0 {
                let has_h = c.all_ligands().any(|(_, x)| preference(x) == 0);
                if has_h {
                    if let Some(s) = ok(Step::ReductiveElimination(key.clone(), "H".into())) {
                        return Some(s);
                    }
                }
            }
            // a σ-alkyl with a β-hydrogen and room: β-elimination
            if pref == 1 {
                if let Some(s) = ok(Step::beta_hydride(key.clone())) {
                    return Some(s);
                }
            }
            // two carbon or heteroatom groups: reductive elimination couples them
            if (1..=4).contains(&pref) {
                for p in partners(c, s) {
                    if p == "H" {
                        continue;
                    }
                    if let Some(st) = ok(Step::ReductiveElimination(key.clone(), p)) {
                        return Some(st);
                    }
                }
            }
        }
        None
    };
    if let Some(s) = slot.and_then(try_slot) {
        return Some(s);
    }
    for s in c.slots() {
        if let Some(step) = try_slot(s) {
            return Some(step);
        }
    }
    // an anionic complex gives up a halide (after a base took the hydride, as in the Heck
    // cycle's last step)
    if c.charge < 0 {
        for s in c.slots() {
            if let Some(b) = c.group(s) {
                if b.ligand.family == "halide" {
                    if let Some(st) = ok(Step::Dissociation(b.ligand.key.clone())) {
                        return Some(st);
                    }
                }
            }
        }
    }
    // a ligand that left earlier comes back to a metal short of 16 e
    if count(c).is_some_and(|n| n < Frac::int(16)) {
        for key in departed {
            if let Some(s) = ok(Step::Association(key.clone())) {
                return Some(s);
            }
        }
    }
    // an 18-e complex opens a site by losing a neutral ligand
    if count(c).is_some_and(|n| n >= Frac::int(18)) {
        for s in c.slots() {
            if let Some(b) = c.group(s) {
                if b.mode().class.x == 0 && b.mode().class.z == 0 && b.mode().hapticity().is_none()
                {
                    if let Some(st) = ok(Step::Dissociation(b.ligand.key.clone())) {
                        return Some(st);
                    }
                }
            }
        }
    }
    None
}

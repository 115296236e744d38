//! Ranked screening of ligand swaps: every catalogue ligand (or every pair, and every κ2
//! chelate in place of both, for two sites) in place of chosen ligands of a complex, filtered
//! by constraints and ranked.
//!
//! Counting is incremental: a swap changes the neutral count by the entering minus the leaving
//! ligand's electrons and the oxidation state by their ionic charges, so candidates are judged
//! on these numbers first. For two sites the ligands are grouped by counting class (electrons,
//! ionic charge), and only class pairs that can meet the electron target are expanded. Full
//! reports (saturation, spin) are computed only for candidates that pass everything else.

use std::cmp::Ordering;
use std::collections::{BinaryHeap, HashMap};
use std::sync::Arc;

use super::complex::Complex;
use super::count::{count, Report, Saturation};
use super::edit::{apply, Edit, Slot};
use super::frac::Frac;
use super::ligand::LigandDef;
use super::sterics::{crowding, sphere_fraction};

/// What a candidate must satisfy. `None` means no limit.
#[derive(Debug, Clone, Default)]
pub struct Constraints {
    /// Inclusive electron count range at the metal.
    pub electrons: Option<(i64, i64)>,
    /// Only candidates at their metal's target (18, or 16 for square-planar d8).
    pub saturated: bool,
    /// Highest sum of cone sphere fractions (see `sterics`).
    pub max_crowding: Option<f64>,
    /// Inclusive cone angle window (degrees) for every entering ligand; ligands without a
    /// cone angle fail a window.
    pub cone: Option<(f64, f64)>,
    /// Inclusive Tolman electronic parameter window (cm-1); ligands without one fail it.
    pub tep: Option<(f64, f64)>,
    pub diamagnetic: bool,
    /// Families to keep (empty: all).
    pub families: Vec<String>,
    pub exclude_families: Vec<String>,
    /// Leave out ligands whose free form carries GHS hazard statements in the catalogue.
    /// Ligands with no hazard record stay in; the CLI flags them, since unknown is not safe.
    pub no_hazardous: bool,
}

/// How candidates are ordered, best first.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Rank {
    /// Nearest the electron window (or the starting count: like for like first), then least
    /// crowded, then strongest donor.
    Electrons,
    /// Least crowded first.
    Crowding,
    /// Strongest net donor (lowest TEP) first.
    Donor,
    /// Smallest cone angle first.
    Cone,
}

/// A ranked candidate.
#[derive(Debug, Clone)]
pub struct Candidate {
    /// Entering ligands, one per site in site order; a single κ2 chelate when it takes both.
    pub ligands: Vec<Arc<LigandDef>>,
    pub electrons: Frac,
    pub oxidation_state: Frac,
    pub d_electrons: Frac,
    pub crowding: f64,
    /// Lower is better; the ranking key.
    pub score: f64,
    /// The full count of the product (computed for candidates that are kept).
    pub report: Report,
    pub product: Complex,
}

/// A candidate before its full count: ordered by score, then by catalogue order, so the
/// ranking is deterministic.
#[derive(Debug, Clone, Copy)]
struct Scored {
    score: f64,
    chosen: [usize; 2],
    n: usize,
    /// One κ2 ligand in place of both sites.
    chelate: bool,
    e: Frac,
    os: Frac,
    crowd: f64,
}

impl PartialEq for Scored {
    fn eq(&self, other: &Scored) -> bool {
        self.cmp(other) == Ordering::Equal
    }
}

impl Eq for Scored {}

impl PartialOrd for Scored {
    fn partial_cmp(&self, other: &Scored) -> Option<Ordering> {
        Some(self.cmp(other))
    }
}

impl Ord for Scored {
    fn cmp(&self, other: &Scored) -> Ordering {
        self.score
            .total_cmp(&other.score)
            .then_with(|| self.chosen[..self.n].cmp(&other.chosen[..other.n]))
            .then_with(|| self.chelate.cmp(&other.chelate))
    }
}

/// A deterministic part of a screen: shard `k` (1-based) of `n`.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Shard {
    pub k: u32,
    pub n: u32,
}

impl Shard {
    pub fn parse(text: &str) -> Option<Shard> {
        let (k, n) = text.split_once('/')?;
        let (k, n): (u32, u32) = (k.trim().parse().ok()?, n.trim().parse().ok()?);
        (n >= 1 && (1..=n).contains(&k)).then_some(Shard { k, n })
    }

    fn takes(self, index: usize) -> bool {
        index % self.n as usize == (self.k - 1) as usize
    }
}

/// Why a screen cannot run.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum ScreenError {
    #[error("screening works on one metal; this complex has {0}")]
    NotMononuclear(usize),
    #[error("choose one or two sites to screen, not {0}")]
    Sites(usize),
    #[error("the complex has no {0} to replace")]
    NoSuchSite(String),
}

/// The electrons, ionic charge and cone fraction a ligand brings in its default mode.
#[derive(Debug, Clone, Copy)]
struct Terms {
    neutral: i64,
    charge: i64,
    fraction: Option<f64>,
}

fn terms(l: &LigandDef, mode: usize) -> Terms {
    let m = &l.modes[mode.min(l.modes.len() - 1)];
    let cones = if m.label.starts_with('κ') {
        m.sites.max(1) as f64
    } else {
        1.0
    };
    Terms {
        neutral: m.neutral_electrons(),
        charge: m.ionic_charge as i64,
        fraction: l
            .cone_angle
            .as_ref()
            .map(|c| sphere_fraction(c.value) * cones),
    }
}

fn passes_ligand(l: &LigandDef, c: &Constraints) -> bool {
    if l.modes.is_empty() || l.modes[0].bridges > 1 {
        return false;
    }
    if !c.families.is_empty() && !c.families.contains(&l.family) {
        return false;
    }
    if c.exclude_families.contains(&l.family) {
        return false;
    }
    if c.no_hazardous && !l.hazards.is_empty() {
        return false;
    }
    if let Some((lo, hi)) = c.cone {
        match &l.cone_angle {
            Some(a) if (lo..=hi).contains(&a.value) => {}
            _ => return false,
        }
    }
    if let Some((lo, hi)) = c.tep {
        match &l.tep {
            Some(t) if (lo..=hi).contains(&t.value) => {}
            _ => return false,
        }
    }
    true
}

/// Screen `complex` with catalogue `ligands` in place of one unit of each ligand at `sites`
/// (slots of the complex); returns the best `limit` candidates, ranked.
pub fn screen(
    complex: &Complex,
    sites: &[Slot],
    ligands: &[Arc<LigandDef>],
    constraints: &Constraints,
    rank: Rank,
    limit: usize,
    shard: Option<Shard>,
) -> Result<Vec<Candidate>, ScreenError> {
    if complex.metal_count() != 1 {
        return Err(ScreenError::NotMononuclear(complex.metal_count()));
    }
    if sites.is_empty() || sites.len() > 2 {
        return Err(ScreenError::Sites(sites.len()));
    }
    let base = count(complex);
    let Some(m) = base.metals.first() else {
        return Ok(Vec::new());
    };
    let leaving: Vec<_> = sites
        .iter()
        .map(|s| {
            complex
                .group(*s)
                .ok_or_else(|| ScreenError::NoSuchSite(format!("{s:?}")))
        })
        .collect::<Result<_, _>>()?;
    let out_terms: Vec<Terms> = leaving.iter().map(|b| terms(&b.ligand, b.mode)).collect();
    let base_crowd = crowding(complex).total;
    let base_e = m.electron_count;
    let base_os = m.oxidation_state;
    let valence = m.valence_electrons as i64;
    // distance from the wanted counts: the window, or else the count the complex has now
    let (want_lo, want_hi) = constraints
        .electrons
        .map_or((base_e.to_f64(), base_e.to_f64()), |(lo, hi)| {
            (lo as f64, hi as f64)
        });
    let off_target = |e: f64| (want_lo - e).max(e - want_hi).max(0.0);

    let pool: Vec<usize> = (0..ligands.len())
        .filter(|&i| passes_ligand(&ligands[i], constraints))
        .collect();
    let t: Vec<Terms> = ligands.iter().map(|l| terms(l, 0)).collect();
    // the catalogue entries of the leaving ligands: putting them all back is no swap
    let same: Vec<Option<usize>> = leaving
        .iter()
        .map(|b| ligands.iter().position(|l| l.key == b.ligand.key))
        .collect();

    // the numbers of one candidate, before any full count
    let judge = |chosen: &[usize]| -> Option<(Frac, Frac, f64, f64)> {
        if chosen.len() == same.len() && chosen.iter().zip(&same).all(|(&i, s)| Some(i) == *s) {
            return None;
        }
        let mut e = base_e;
        let mut os = base_os;
        let mut crowd = base_crowd;
        let mut unknown = 0;
        // every leaving ligand goes, whether one ligand per site or one chelate for both
        for &i in chosen {
            e = e + t[i].neutral;
            os = os - t[i].charge;
            crowd += t[i].fraction.unwrap_or(0.0);
            unknown += usize::from(t[i].fraction.is_none());
        }
        for tout in &out_terms {
            e = e - tout.neutral;
            os = os + tout.charge;
            crowd -= tout.fraction.unwrap_or(0.0);
        }
        // a ligand without a cone angle cannot be shown to fit: it fails a crowding limit and
        // ranks after every ligand whose size is known
        if unknown > 0 && constraints.max_crowding.is_some() {
            return None;
        }
        let unknown_penalty = unknown as f64;
        if let Some((lo, hi)) = constraints.electrons {
            if e < Frac::int(lo) || e > Frac::int(hi) {
                return None;
            }
        }
        if constraints.max_crowding.is_some_and(|max| crowd > max) {
            return None;
        }
        let d = -os + valence;
        if d < Frac::ZERO {
            return None;
        }
        let donor: f64 = chosen
            .iter()
            .map(|&i| ligands[i].tep.as_ref().map_or(2100.0, |x| x.value))
            .sum::<f64>()
            / chosen.len() as f64;
        let cone: f64 = chosen
            .iter()
            .map(|&i| ligands[i].cone_angle.as_ref().map_or(360.0, |x| x.value))
            .sum();
        let score = match rank {
            Rank::Electrons => {
                off_target(e.to_f64()) * 1000.0
                    + (crowd + unknown_penalty) * 10.0
                    + (donor - 2000.0) / 1000.0
            }
            Rank::Crowding => crowd + unknown_penalty * 100.0,
            Rank::Donor => donor,
            Rank::Cone => cone,
        };
        Some((e, os, crowd, score))
    };

    // keep only the best few while enumerating: a 10,000-ligand pair screen has 10^8 pairs
    // and must fit in memory; saturation and spin are then checked on these in order
    let keep = limit.saturating_mul(8).max(64);
    let mut best: BinaryHeap<Scored> = BinaryHeap::with_capacity(keep + 1);
    let offer = |chosen: [usize; 2], n: usize, best: &mut BinaryHeap<Scored>| {
        if let Some((e, os, crowd, score)) = judge(&chosen[..n]) {
            let cand = Scored {
                score,
                chosen,
                n,
                chelate: n < sites.len(),
                e,
                os,
                crowd,
            };
            if best.len() < keep {
                best.push(cand);
            } else if best.peek().is_some_and(|worst| cand < *worst) {
                best.pop();
                best.push(cand);
            }
        }
    };
    if sites.len() == 1 {
        for (index, &i) in pool.iter().enumerate() {
            if shard.is_some_and(|s| !s.takes(index)) {
                continue;
            }
            offer([i, 0], 1, &mut best);
        }
    } else {
        // group by counting class; expand only the class pairs that can meet the electron
        // target
        let same_group = sites[0] == sites[1];
        let mut classes: HashMap<(i64, i64), Vec<usize>> = HashMap::new();
        for &i in &pool {
            classes
                .entry((t[i].neutral, t[i].charge))
                .or_default()
                .push(i);
        }
        let mut keys: Vec<(i64, i64)> = classes.keys().copied().collect();
        keys.sort_unstable();
        let out_e: i64 = out_terms.iter().map(|x| x.neutral).sum();
        let mut index = 0usize;
        for &ka in &keys {
            for &kb in &keys {
                let e = base_e + (ka.0 + kb.0 - out_e);
                if let Some((lo, hi)) = constraints.electrons {
                    if e < Frac::int(lo) || e > Frac::int(hi) {
                        continue;
                    }
                }
                for &a in &classes[&ka] {
                    for &b in &classes[&kb] {
                        // two units of one group: (a, b) and (b, a) are the same swap
                        if same_group && b < a {
                            continue;
                        }
                        let this = index;
                        index += 1;
                        if shard.is_some_and(|s| !s.takes(this)) {
                            continue;
                        }
                        offer([a, b], 2, &mut best);
                    }
                }
            }
        }
        // one chelating ligand in place of both (two PPh3 for dppe)
        for &i in &pool {
            let m = &ligands[i].modes[0];
            if m.sites != 2 || !m.label.starts_with('κ') || m.bridges > 1 {
                continue;
            }
            let this = index;
            index += 1;
            if shard.is_some_and(|s| !s.takes(this)) {
                continue;
            }
            offer([i, 0], 1, &mut best);
        }
    }
    let scored = best.into_sorted_vec().into_iter().map(|c| {
        (
            c.score,
            c.chosen[..c.n].to_vec(),
            c.chelate,
            c.e,
            c.os,
            c.crowd,
        )
    });

    // full counts, in ranking order, until enough candidates pass what only they can tell
    let mut out = Vec::new();
    for (score, chosen, chelate, e, os, crowd) in scored {
        if out.len() >= limit {
            break;
        }
        let mut product = complex.clone();
        let mut ok = true;
        // swap the later site first so the earlier slot index stays valid
        let mut order: Vec<usize> = (0..sites.len()).collect();
        order.sort_by(|&x, &y| sites[y].index.cmp(&sites[x].index));
        for k in order {
            let slot = product.slots().into_iter().find(|s| {
                product.group(*s).is_some_and(|g| {
                    g.ligand.key == leaving[k].ligand.key && g.mode == leaving[k].mode
                })
            });
            let Some(slot) = slot else {
                ok = false;
                break;
            };
            // a chelate takes the first site; the other leaving ligand simply goes
            let edit = if chelate && k > 0 {
                Edit::Remove { slot }
            } else {
                Edit::Swap {
                    slot,
                    ligand: ligands[chosen[if chelate { 0 } else { k }]].clone(),
                    mode: 0,
                }
            };
            match apply(&product, &edit) {
                Ok((p, _)) => product = p,
                Err(_) => {
                    ok = false;
                    break;
                }
            }
        }
        if !ok {
            continue;
        }
        let report = count(&product);
        if report.impossible().is_some() {
            continue;
        }
        let Some(pm) = report.metals.first() else {
            continue;
        };
        if constraints.saturated && pm.saturation != Saturation::Saturated {
            continue;
        }
        if constraints.diamagnetic && report.unpaired_electrons.first() != Some(&0) {
            continue;
        }
        out.push(Candidate {
            ligands: chosen.iter().map(|&i| ligands[i].clone()).collect(),
            electrons: e,
            oxidation_state: os,
            d_electrons: pm.d_electrons,
            crowding: crowd,
            score,
            report,
            product,
        });
    }
    Ok(out)
}

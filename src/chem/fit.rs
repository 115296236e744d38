//! Choosing binding modes the formula leaves open, the way a chemist reads a formula:
//! a flexible ligand takes the hapticity or denticity that keeps the metal at 18 e (16 e for
//! square-planar d8) rather than push it past, so Fe(CO)3(COT) has η4-COT and Pd(OAc)2(PPh3)2
//! κ1-acetates (Crabtree, The Organometallic Chemistry of the Transition Metals, 6th ed., 2014,
//! ch. 2 and 5); and a carbene on a late metal (group 8 and beyond) is counted as a neutral L
//! donor (Fischer type), on an early metal as an X2 alkylidene (Schrock type).
//!
//! Modes written in the formula (`(η8-COT)`) are never changed. Cp and other ligands that hold
//! their hapticity are left alone, so 19- and 20-e metallocenes stay what they are.

use super::complex::{BoundLigand, Complex};
use super::count::count;
use super::element::Block;
use super::frac::Frac;

/// Families whose ligands shift hapticity or denticity readily.
const FLEXIBLE: &[&str] = &[
    "polyene",
    "allyl",
    "carboxylate",
    "imido",
    "nitrosyl",
    "arene",
];

/// Settle the modes the formula left open, noting what was chosen in `c.notes`.
pub fn fit_modes(c: &mut Complex) {
    if c.metal_count() != 1 {
        fit_paddlewheel(c);
        fit_bridges(c);
        return;
    }
    if c.sites[0].element.block == Block::F {
        return;
    }
    // most formulas have nothing to settle: say so without counting
    let flexible = c.sites[0]
        .ligands
        .iter()
        .any(|b| !b.pinned && FLEXIBLE.contains(&b.ligand.family.as_str()));
    let carbene = c.sites[0]
        .ligands
        .iter()
        .any(|b| !b.pinned && b.ligand.family == "alkylidene");
    let rings = c.sites[0]
        .ligands
        .iter()
        .filter(|b| !b.pinned && b.ligand.family == "cyclopentadienyl")
        .map(|b| b.count)
        .sum::<u32>();
    // Cp rings only slip past 20 e (three or more rings), or past 18 e when other ligands
    // crowd two rings; a bare metallocene keeps both (at most 20 e). The neutral count is
    // summed cheaply here, and only for two rings
    let two_crowded = || {
        let site = &c.sites[0];
        let others = site
            .ligands
            .iter()
            .any(|b| b.ligand.family != "cyclopentadienyl");
        let rough = site.element.group as i64 - c.charge as i64
            + site
                .ligands
                .iter()
                .map(|b| b.count as i64 * b.mode().neutral_electrons())
                .sum::<i64>();
        others && rough > 18
    };
    let may_slip = rings >= 3 || (rings == 2 && two_crowded());
    if !flexible && !carbene && !may_slip {
        return;
    }
    if carbene {
        carbene_type(c);
    }
    lower_modes(c, None);
    if !flexible {
        return;
    }
    // a d8 metal of groups 9-11 that settled at 18 e may rather be a 16-e square-planar
    // complex with its flexible ligands further down (Pd(κ1-OAc)2(PPh3)2)
    let r = count(c);
    if let Some(m) = r.metals.first() {
        // Co(I) is not square planar with its flexible ligands down: (η3-allyl)Co(CO)3 is
        // 18 e (Hartwig 2010, ch. 1); the heavier group 9 metals and groups 10-11 are
        let first_row_co = c.sites[0].element.is_first_row() && m.group == Some(9);
        let d8 = m.d_electrons == Frac::int(8)
            && m.group.is_some_and(|g| (9..=11).contains(&g))
            && !first_row_co;
        if d8 && m.electron_count == Frac::int(18) {
            let mut trial = c.clone();
            lower_modes(&mut trial, Some(16));
            let t = count(&trial);
            if t.metals.first().is_some_and(|m| {
                m.target == 16 && m.saturation == super::count::Saturation::Saturated
            }) {
                *c = trial;
            }
        }
    }
}

/// Step flexible ligands down to modes with fewer electrons until the metal is at its target
/// (or `target` when given).
fn lower_modes(c: &mut Complex, target: Option<i64>) {
    for _ in 0..256 {
        let r = count(c);
        let Some(m) = r.metals.first() else {
            return;
        };
        let Some(current) = m.electron_count.as_int() else {
            return;
        };
        let goal = target.unwrap_or(m.target as i64);
        let excess = current - goal;
        // bare metallocenes keep their rings up to 20 e (cobaltocene 19, nickelocene 20); past
        // that a Cp slips (Cp4Zr is (η5-Cp)3(η1-Cp)Zr, 20 e). With other ligands a ring slips
        // as soon as the count passes 18: CpFe(CO)2(η1-Cp), (η5-Cp)(η3-Cp)W(CO)2 (Crabtree
        // 2014, ch. 5)
        let others = c.sites[0]
            .ligands
            .iter()
            .any(|b| b.ligand.family != "cyclopentadienyl");
        let rings_may_slip = current > 20 || (others && current > 18);
        if excess <= 0 {
            return;
        }
        // the single step (one ligand to a mode with fewer electrons) that best removes the
        // excess without overshooting
        let mut best: Option<(usize, usize, i64)> = None;
        for (gi, b) in c.sites[0].ligands.iter().enumerate() {
            let flexible = FLEXIBLE.contains(&b.ligand.family.as_str())
                || (rings_may_slip && b.ligand.family == "cyclopentadienyl");
            if b.pinned || !flexible {
                continue;
            }
            let now = b.mode().neutral_electrons();
            for (mi, alt) in b.ligand.modes.iter().enumerate() {
                let drop = now - alt.neutral_electrons();
                if alt.bridges > 1 || drop <= 0 || drop > excess {
                    continue;
                }
                if best.is_none_or(|(_, _, d)| drop > d) {
                    best = Some((gi, mi, drop));
                }
            }
        }
        let Some((gi, mi, _)) = best else {
            return;
        };
        let list = &mut c.sites[0].ligands;
        let from = list[gi].mode().label.clone();
        let mut moved = BoundLigand::new(list[gi].ligand.clone(), mi, 1);
        moved.pinned = false;
        let key = list[gi].ligand.key.clone();
        let to = moved.mode().label.clone();
        if list[gi].count > 1 {
            list[gi].count -= 1;
        } else {
            list.remove(gi);
        }
        list.push(moved);
        c.canonicalize();
        note(
            c,
            format!(
                "{key} read as {to} (not {from}) to stay within {} e",
                m.target
            ),
        );
    }
}

/// Carbenes: neutral L on late metals, X2 on early ones, unless the formula says.
fn carbene_type(c: &mut Complex) {
    let late = c.sites[0].element.group >= 8;
    let mut changed = Vec::new();
    for b in &mut c.sites[0].ligands {
        if b.pinned || b.ligand.family != "alkylidene" {
            continue;
        }
        let want = b.ligand.modes.iter().position(|m| {
            if late {
                m.class.l == 1 && m.class.x == 0
            } else {
                m.class.x == 2 && m.class.l == 0
            }
        });
        if let Some(i) = want {
            if i != b.mode {
                b.mode = i;
                changed.push(b.ligand.key.clone());
            }
        }
    }
    if !changed.is_empty() {
        c.canonicalize();
        let kind = if late {
            "a neutral L carbene on a late metal"
        } else {
            "an X2 alkylidene on an early metal"
        };
        note(c, format!("{} counted as {kind}", changed.join(", ")));
    }
}

fn note(c: &mut Complex, text: String) {
    if !c.notes.contains(&text) {
        c.notes.push(text);
    }
}

/// Families whose terminal X ligands bridge two metals with a lone pair (μ-Cl: X to one metal,
/// L to the other).
const BRIDGING: &[&str] = &[
    "halide",
    "alkoxide",
    "thiolate",
    "amide",
    "pseudohalide",
    "alkyne",
    // dienones such as dba span two metals with their two C=C (Pd2(dba)3: 16 e per Pd(0))
    "alkene",
];

/// Carboxylates written without a mode on a dimer (Rh2(OAc)4, Cu2(OAc)4(H2O)2, Mo2(OAc)4)
/// bridge the two metals κ1:κ1, one O on each, as in every paddlewheel (Cotton, Murillo &
/// Walton, Multiple Bonds between Metal Atoms, 3rd ed., Springer 2005); the count is the same
/// as with chelates, the structure is not.
fn fit_paddlewheel(c: &mut Complex) {
    if c.metal_count() != 2 {
        return;
    }
    let mut changed = Vec::new();
    for b in c
        .sites
        .iter_mut()
        .flat_map(|s| s.ligands.iter_mut())
        .chain(c.shared.iter_mut())
    {
        if b.pinned || b.ligand.family != "carboxylate" || b.mode().bridges >= 2 {
            continue;
        }
        if let Some(i) = b
            .ligand
            .modes
            .iter()
            .position(|m| m.bridges == 2 && m.donors == 2)
        {
            b.mode = i;
            if !changed.contains(&b.ligand.key) {
                changed.push(b.ligand.key.clone());
            }
        }
    }
    if !changed.is_empty() {
        // bridging ligands belong to both metals
        let mut moved = Vec::new();
        for s in &mut c.sites {
            let (bridging, terminal): (Vec<_>, Vec<_>) =
                s.ligands.drain(..).partition(|b| b.mode().bridges >= 2);
            s.ligands = terminal;
            moved.extend(bridging);
        }
        c.shared.extend(moved);
        c.canonicalize();
        let text = format!(
            "{} read as bridging both metals κ1:κ1 (a paddlewheel), not chelating",
            changed.join(", ")
        );
        if !c.notes.contains(&text) {
            c.notes.push(text);
        }
    }
}

/// In a polynuclear complex written without μ marks (`[Rh(COD)Cl]2`, `[Cp*IrCl2]2`), let halide
/// and alkoxide lone pairs bridge before any M-M bond is inferred, as textbooks draw these
/// dimers, wherever a metal short of electrons forms no M-M bond or has six or more d
/// electrons (d6-d8 dimers bridge; d1-d5 ones such as [Re2Cl8]2- bond).
fn fit_bridges(c: &mut Complex) {
    use super::count::{bond_refusal, is_werner};
    let werner = is_werner(c);
    let n = c.metal_count();
    let open = c.all_ligands().any(|(_, b)| {
        !b.pinned && b.mode().bridges == 1 && BRIDGING.contains(&b.ligand.family.as_str())
    });
    if !open {
        return;
    }
    // a core already held by written μ3 or higher bridges (the Fe4(μ3-S)4 cubane) keeps its
    // other ligands terminal, as [Fe4S4(SR)4]2- is drawn (Holm, Kennepohl & Solomon, Chem.
    // Rev. 1996, 96, 2239)
    let caged = c
        .all_ligands()
        .any(|(_, b)| b.pinned && b.mode().bridges >= 3);
    if caged {
        return;
    }
    // each pass bridges one ligand; the bound only guards against a loop
    for _ in 0..256 {
        let r = count(c);
        let short: bool = r.metals.iter().zip(&c.sites).any(|(m, s)| {
            let before_bonds = m.electron_count - m.metal_metal_bonds;
            let lacking = Frac::int(m.target as i64) - before_bonds >= Frac::int(1);
            let bridges_first = m.d_electrons >= Frac::int(5)
                || bond_refusal(
                    s.element,
                    m.oxidation_state,
                    m.d_electrons,
                    m.target,
                    werner,
                )
                .is_some();
            lacking && bridges_first
        });
        if !short {
            return;
        }
        // one terminal bridging-capable ligand: from the metal with the highest count first,
        // so a symmetric dimer gets symmetric bridges
        let mut candidates: Vec<(Option<usize>, usize, usize, Frac)> = c
            .sites
            .iter()
            .enumerate()
            .flat_map(|(si, s)| {
                s.ligands
                    .iter()
                    .enumerate()
                    .map(move |(gi, b)| (Some(si), gi, b))
            })
            .chain(c.shared.iter().enumerate().map(|(gi, b)| (None, gi, b)))
            .filter_map(|(si, gi, b)| {
                let m = b.mode();
                // the widest bridge the metals allow that gives more electrons (μ3-I in a
                // cubane, μ-Cl in a dimer, a 4-e μ-alkyne over a Co2 edge)
                let mu = (0..b.ligand.modes.len())
                    .filter(|&i| {
                        let x = &b.ligand.modes[i];
                        x.bridges > 1
                            && x.bridges as usize <= n
                            && x.neutral_electrons() > m.neutral_electrons()
                            && !x.three_centre
                    })
                    .max_by_key(|&i| b.ligand.modes[i].bridges)?;
                let terminal_x = m.bridges == 1;
                let owner_count = si
                    .and_then(|i| r.metals.get(i))
                    .map_or(Frac::ZERO, |m| m.electron_count);
                (!b.pinned && terminal_x && BRIDGING.contains(&b.ligand.family.as_str()))
                    .then_some((si, gi, mu, owner_count))
            })
            .collect();
        candidates.sort_by_key(|c| std::cmp::Reverse(c.3));
        let pick = candidates.first().map(|&(si, gi, mu, _)| (si, gi, mu));
        let Some((si, gi, mu)) = pick else {
            return;
        };
        let ligand = match si {
            Some(i) => c.sites[i].ligands[gi].ligand.clone(),
            None => c.shared[gi].ligand.clone(),
        };
        let mut trial = c.clone();
        let list = match si {
            Some(i) => &mut trial.sites[i].ligands,
            None => &mut trial.shared,
        };
        if list[gi].count > 1 {
            list[gi].count -= 1;
        } else {
            list.remove(gi);
        }
        trial.shared.push(BoundLigand::new(ligand.clone(), mu, 1));
        trial.canonicalize();
        // a bridge that pushes a metal past its target is not the reading
        let t = count(&trial);
        if t.metals
            .iter()
            .any(|m| m.electron_count - m.metal_metal_bonds > Frac::int(m.target as i64))
        {
            return;
        }
        *c = trial;
        note(
            c,
            format!(
                "{} read as bridging ({}-{}) before any M-M bond, as such complexes are drawn",
                ligand.key, ligand.modes[mu].label, ligand.key
            ),
        );
    }
}

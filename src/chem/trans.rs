//! The trans effect and the trans influence: what a ligand does to the one opposite it.
//!
//! The trans effect is kinetic, how much a ligand speeds the substitution of the ligand trans
//! to it in square-planar Pt(II) (Basolo & Pearson, Mechanisms of Inorganic Reactions, 2nd ed.,
//! 1967, ch. 5): CN⁻ ≈ CO ≈ C2H4 ≈ NO > PR3 ≈ H⁻ > CH3⁻ ≈ SC(NH2)2 > C6H5⁻ > NO2⁻ > I⁻ ≈ SCN⁻ >
//! Br⁻ > Cl⁻ > py, NH3 ≈ OH⁻ ≈ H2O. The trans influence is the ground-state lengthening of the
//! bond opposite (Appleton, Clark & Manzer, Coord. Chem. Rev. 1973, 10, 335): σ-bonded Si, B
//! and C and H⁻ at the top, then PR3 > AsR3 > CO ≈ RNC ≈ C=C > halides > N and O donors.
//!
//! Each catalogue entry can carry its place in both series (1-10, with the source); a ligand
//! without one takes its family's usual place (common practice), and families the series do
//! not reach take 0.

use super::geometry::Placed;
use super::isomers::Isomer;
use super::ligand::LigandDef;

/// From this trans influence up a ligand weakens the bond opposite markedly: the σ-bonded Si,
/// B, C and H at the head of the series, and carbenes. Phosphines (7) sit just below, so the
/// ubiquitous phosphine trans to halide raises no note.
pub const STRONG_INFLUENCE: u8 = 8;
/// Up to this trans influence a ligand is held weakly opposite a strong one (halides, N and O
/// donors, weakly bound anions and solvents).
pub const WEAK_INFLUENCE: u8 = 4;

/// Place in the kinetic trans effect series, higher labilizes more; 0 when the series does
/// not reach the ligand.
pub fn trans_effect(l: &LigandDef) -> u8 {
    if let Some(r) = &l.trans_effect {
        return r.rank;
    }
    match l.family.as_str() {
        "carbonyl" | "isocyanide" | "nitrosyl" | "alkene" | "alkyne" => 10,
        "silyl" | "hydride" | "boryl" => 9,
        "phosphine" | "diphosphine" | "phosphite" | "arsine" | "carbene" => 9,
        "alkyl" | "acyl" => 8,
        "aryl" => 7,
        "thioether" | "thiolate" => 4,
        "halide" => 2,
        "amine" | "pyridine" | "water" | "ether" | "nitrile" | "alkoxide" | "carboxylate" => 1,
        _ => 0,
    }
}

/// Place in the trans influence series, higher lengthens the bond opposite more; 0 when the
/// series does not reach the ligand.
pub fn trans_influence(l: &LigandDef) -> u8 {
    if let Some(r) = &l.trans_influence {
        return r.rank;
    }
    match l.family.as_str() {
        "silyl" | "boryl" => 10,
        "hydride" | "alkyl" => 9,
        "aryl" | "acyl" | "carbene" => 8,
        "phosphine" | "diphosphine" => 7,
        "phosphite" | "arsine" => 6,
        "carbonyl" | "isocyanide" | "alkene" | "alkyne" | "thiolate" => 5,
        "thioether" => 4,
        "halide" => 3,
        "amine" | "pyridine" | "nitrile" | "diimine" | "diamine" => 2,
        "water" | "ether" | "alkoxide" | "carboxylate" => 1,
        _ => 0,
    }
}

/// A ligand held weakly because a strong trans-influence ligand sits opposite.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Weakened {
    /// The strong ligand's key.
    pub by: String,
    /// The weakly held ligand's key.
    pub held: String,
}

/// The trans pairs of an isomer in which a strong trans-influence ligand sits opposite a
/// weak one; the weak one's bond is long and it is the one likely to leave.
pub fn weakened(placed: &Placed, iso: &Isomer) -> Vec<Weakened> {
    let f = &placed.frame;
    let ligand = |p: u8| {
        let seat = iso.seats.get(p as usize)?;
        let d = f.donor(seat.0)?;
        f.ligands.get(d.group).map(|b| &b.ligand)
    };
    let mut out = Vec::new();
    for &(a, b) in &f.poly.trans {
        let (Some(la), Some(lb)) = (ligand(a), ligand(b)) else {
            continue;
        };
        let (ta, tb) = (trans_influence(la), trans_influence(lb));
        for (strong, weak, ts, tw) in [(la, lb, ta, tb), (lb, la, tb, ta)] {
            if ts >= STRONG_INFLUENCE && tw > 0 && tw <= WEAK_INFLUENCE {
                let w = Weakened {
                    by: strong.key.clone(),
                    held: weak.key.clone(),
                };
                if !out.contains(&w) {
                    out.push(w);
                }
            }
        }
    }
    out
}

/// The weakened pairs `after` has and `before` had not, as preview notes ("Cl trans to H: a
/// long, labile Pt-Cl bond (trans influence)").
pub fn new_weakened(before: &[Weakened], after: &[Weakened], metal: &str) -> Vec<String> {
    after
        .iter()
        .filter(|w| !before.contains(w))
        .map(|w| {
            format!(
                "{} trans to {}: a long, labile {metal}-{} bond (trans influence)",
                w.held, w.by, w.held
            )
        })
        .collect()
}

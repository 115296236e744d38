//! Steric crowding from Tolman cone angles.
//!
//! A cone of apex angle θ at the metal covers the fraction f = (1 - cos(θ/2))/2 of the sphere
//! around it (its solid angle 2π(1 - cos(θ/2)) over 4π; Tolman, Chem. Rev. 1977, 77, 313 for the
//! cone; Guzei & Wendt, Dalton Trans. 2006, 3991 for ligand shadows as fractions of the sphere).
//! Summing f over the ligands estimates how much of the coordination sphere they claim. The sum
//! can pass 1 only if cones overlap, which real ligands manage by meshing, so the thresholds
//! below flag crowding; they do not forbid it.

use super::complex::Complex;
use super::edit::Place;

/// From this sum of sphere fractions the ligand sphere is called crowded.
pub const CROWDED: f64 = 0.8;
/// Past this sum the cones would cover more than the whole sphere (4π sr): the ligands must mesh
/// or one must leave.
pub const OVERFULL: f64 = 1.0;

/// Fraction of the sphere covered by a cone of apex angle `theta_deg`.
pub fn sphere_fraction(theta_deg: f64) -> f64 {
    let half = (theta_deg / 2.0).to_radians();
    (1.0 - half.cos()) / 2.0
}

/// How crowded a metal's ligand sphere is.
#[derive(Debug, Clone, PartialEq)]
pub struct Crowding {
    /// Sum of sphere fractions over ligands with a known cone angle.
    pub total: f64,
    /// Ligands without a cone angle (the total is then a lower bound).
    pub unknown: Vec<String>,
}

impl Crowding {
    pub fn level(&self) -> &'static str {
        if self.total > OVERFULL {
            "overfull"
        } else if self.total >= CROWDED {
            "crowded"
        } else {
            "open"
        }
    }
}

/// Crowding at the first metal of `complex` (its own ligands plus its share of shared ones).
/// A κn chelate counts one cone per donor, as Tolman gives chelating diphosphines per phosphorus.
pub fn crowding(complex: &Complex) -> Crowding {
    let n = complex.metal_count().max(1) as f64;
    let mut total = 0.0;
    let mut unknown: Vec<String> = Vec::new();
    let own = complex
        .sites
        .first()
        .map(|s| s.ligands.as_slice())
        .unwrap_or(&[]);
    let groups = own
        .iter()
        .map(|b| (Place::Site(0), b))
        .chain(complex.shared.iter().map(|b| (Place::Shared, b)));
    for (place, b) in groups {
        let share = if place == Place::Shared { 1.0 / n } else { 1.0 };
        let m = b.mode();
        let cones = if m.label.starts_with('κ') {
            m.sites.max(1) as f64
        } else {
            1.0
        };
        match &b.ligand.cone_angle {
            Some(c) => total += sphere_fraction(c.value) * cones * b.count as f64 * share,
            None => {
                if !unknown.contains(&b.ligand.key) {
                    unknown.push(b.ligand.key.clone());
                }
            }
        }
    }
    Crowding { total, unknown }
}

#[cfg(test)]
mod tests {
    use super::*;

    // Fractions from f = (1 - cos(θ/2))/2: 118° (PMe3) 0.242, 145° (PPh3) 0.350, 182° (PtBu3)
    // 0.509 (cone angles: Tolman, Chem. Rev. 1977, 77, 313).
    #[test]
    fn cone_fractions() {
        for (theta, f) in [(118.0, 0.242), (145.0, 0.350), (182.0, 0.509), (180.0, 0.5)] {
            assert!((sphere_fraction(theta) - f).abs() < 0.001, "{theta}");
        }
    }
}

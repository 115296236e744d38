//! Steric crowding from Tolman cone angles.
//!
//! A cone of apex angle θ at the metal covers the fraction f = (1 - cos(θ/2))/2 of the sphere
//! around it (its solid angle 2π(1 - cos(θ/2)) over 4π; Tolman, Chem. Rev. 1977, 77, 313 for the
//! cone; Guzei & Wendt, Dalton Trans. 2006, 3991 for ligand shadows as fractions of the sphere).
//! Summing f over the ligands estimates how much of the coordination sphere they claim. Cones
//! overlap when substituents mesh, so the sum passes 1 in stable complexes; the thresholds come
//! from Tolman's NiL4 equilibria instead (Tolman, Seidel & Gosser, J. Am. Chem. Soc. 1974, 96,
//! 53, summarised in Tolman 1977): NiL4 starts to lose L at θ about 130-132° (PEt3, Kd ~ 1e-2 M),
//! a sum of 4 f(132°) = 1.19, and is mostly NiL3 at 145° (PPh3), a sum of 1.40. nonet calls a
//! sphere crowded from 1.15 (ligand loss likely) and overfull from 1.35, just below those two
//! sums. These are rules of thumb derived from that data, not limits.

use super::complex::Complex;
use super::edit::Place;

/// From this sum of sphere fractions a ligand is likely to dissociate (NiL4, L = PEt3).
pub const CROWDED: f64 = 1.15;
/// From this sum the complex is expected to shed a ligand (NiL4, L = PPh3: mostly NiL3).
pub const OVERFULL: f64 = 1.35;

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
        if self.total >= OVERFULL {
            "overfull"
        } else if self.total >= CROWDED {
            "crowded"
        } else {
            "room to spare"
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
    // Tolman's NiL4 series: Ni(PMe3)4 (118°) keeps all four ligands, Ni(PPh3)4 (145°) sheds one.
    #[test]
    fn thresholds_follow_the_nickel_series() {
        assert!(4.0 * sphere_fraction(118.0) < CROWDED);
        assert!(4.0 * sphere_fraction(132.0) >= CROWDED);
        assert!(4.0 * sphere_fraction(132.0) < OVERFULL);
        assert!(4.0 * sphere_fraction(145.0) >= OVERFULL);
    }

    #[test]
    fn cone_fractions() {
        for (theta, f) in [(118.0, 0.242), (145.0, 0.350), (182.0, 0.509), (180.0, 0.5)] {
            assert!((sphere_fraction(theta) - f).abs() < 0.001, "{theta}");
        }
    }
}

//! Likely geometry and number of unpaired electrons of one metal centre.
//!
//! Crystal-field reasoning as in Miessler, Fischer & Tarr, Inorganic Chemistry, 5th ed., 2014,
//! ch. 10-11: octahedral d4-d7 choose between high and low spin by ligand field strength and
//! metal ion; 4d and 5d metals are low spin; tetrahedral complexes are high spin; square-planar
//! d8 is diamagnetic; metallocenes fill a1g/e2g then e1g* (19 e cobaltocene 1, 20 e nickelocene 2).

use serde::Serialize;

/// What the spin guess needs to know about a metal centre.
#[derive(Debug, Clone, PartialEq)]
pub struct SpinInput {
    pub d: i64,
    /// Electron count at the metal (neutral model); -1 when not whole.
    pub electrons: i64,
    pub symbol: &'static str,
    pub group: u8,
    pub oxidation_state: i64,
    pub first_row: bool,
    pub f_block: bool,
    /// Coordination positions taken (η5-Cp counts three).
    pub sites: i64,
    /// Ring ligands bound η5 or higher.
    pub rings: u32,
    /// Mean spectrochemical score of the ligands (see `FieldClass::score`).
    pub field: f64,
    /// A planar tetradentate ligand (porphyrinate, salen, phthalocyaninate) holds the metal
    /// square planar whatever its d count.
    pub planar_ligand: bool,
    /// A π-acceptor ligand (CO, isocyanide, NO, alkene, alkyne) is bound.
    pub pi_acceptor: bool,
    /// A multiply bonded oxo, imido or nitrido ligand is bound.
    pub multiple_bond: bool,
}

/// The likely geometry and spin of a metal centre.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SpinGuess {
    pub geometry: &'static str,
    /// Candidate numbers of unpaired electrons, most likely first.
    pub unpaired: Vec<u8>,
    pub ambiguous: bool,
    pub basis: Basis,
}

/// Why a spin guess was made: the splitting pattern and, where it mattered, the field regime.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Basis(pub &'static str, pub Option<&'static str>);

impl std::fmt::Display for Basis {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self.1 {
            Some(r) => write!(f, "{}; {r}", self.0),
            None => f.write_str(self.0),
        }
    }
}

impl Serialize for Basis {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.collect_str(self)
    }
}

/// Spin-only magnetic moment in Bohr magnetons: sqrt(n(n+2)).
pub fn spin_only_moment(n: u8) -> f64 {
    let n = n as f64;
    (n * (n + 2.0)).sqrt()
}

/// Position of a 3d metal ion in the spectrochemical series of metal ions (Shriver & Atkins,
/// Inorganic Chemistry, 3rd ed., 2001: Mn2+ < Ni2+ < Co2+ < Fe2+ < V2+ < Fe3+ < Cr3+ < V3+ <
/// Co3+); the spacing is nonet's own heuristic.
fn metal_ion_score(symbol: &str, os: i64) -> f64 {
    match (symbol, os) {
        ("Mn", 2) => 0.0,
        ("Ni", 2) => 0.1,
        ("Co", 2) => 0.2,
        ("Fe", 2) => 0.3,
        ("Cr", 2) => 0.35,
        ("V", 2) => 0.4,
        ("Fe", 3) => 0.6,
        ("Cr", 3) => 0.7,
        ("Mn", 3) | ("V", 3) => 0.8,
        ("Co", 3) => 1.45,
        (_, os) if os <= 2 => 0.3,
        (_, 3) => 0.8,
        _ => 1.2,
    }
}

const HIGH_SPIN_OCT: [u8; 11] = [0, 1, 2, 3, 4, 5, 4, 3, 2, 1, 0];
const LOW_SPIN_OCT: [u8; 11] = [0, 1, 2, 3, 2, 1, 0, 1, 2, 1, 0];
/// Metallocene order: a1g and e2g (three near-degenerate levels), then e1g* (two).
const SANDWICH: [u8; 11] = [0, 1, 2, 3, 2, 1, 0, 1, 2, 1, 0];

/// Guess geometry and unpaired electrons.
pub fn guess(input: &SpinInput) -> SpinGuess {
    let d = input.d;
    let geometry = geometry(input);
    if input.f_block {
        return SpinGuess {
            geometry,
            unpaired: Vec::new(),
            ambiguous: false,
            basis: Basis(
                "f-block metal: spin follows the f count and spin-orbit coupling; not estimated",
                None,
            ),
        };
    }
    if !(0..=10).contains(&d) {
        return SpinGuess {
            geometry,
            unpaired: Vec::new(),
            ambiguous: false,
            basis: Basis("d count outside 0-10: check the oxidation state", None),
        };
    }
    if d == 0 || d == 10 {
        return SpinGuess {
            geometry,
            unpaired: vec![0],
            ambiguous: false,
            basis: Basis("d0 or d10: no unpaired d electrons", None),
        };
    }
    let du = d as usize;
    let strength = if input.first_row {
        input.field + metal_ion_score(input.symbol, input.oxidation_state)
    } else {
        10.0
    };
    // four-coordinate 3d d8 between the field regimes: NiCl2(PPh3)2 is tetrahedral and
    // paramagnetic, NiCl2(PEt3)2 square planar and diamagnetic (Greenwood & Earnshaw, 2nd ed.,
    // 1997, ch. 27); the field alone cannot tell them apart
    if input.sites == 4
        && d == 8
        && input.first_row
        && (9..=11).contains(&input.group)
        && !input.planar_ligand
        && (1.0..1.9).contains(&strength)
    {
        let planar_first = strength >= 1.45;
        return SpinGuess {
            geometry: "square planar or tetrahedral",
            unpaired: if planar_first { vec![0, 2] } else { vec![2, 0] },
            ambiguous: true,
            basis: Basis(
                "four-coordinate 3d d8: square planar (0) or tetrahedral (2)",
                Some(if planar_first {
                    "stronger field: planar more likely"
                } else {
                    "weaker field: tetrahedral more likely"
                }),
            ),
        };
    }
    let (hs, ls, basis): (u8, u8, &str) = match geometry {
        "sandwich" | "bent sandwich" => (
            HIGH_SPIN_OCT[du],
            SANDWICH[du],
            "metallocene levels a1g, e2g below e1g*",
        ),
        "tetrahedral" => (
            tetrahedral(du),
            tetrahedral(du),
            "tetrahedral field is small: high spin",
        ),
        "square planar" => (
            square_planar(du),
            square_planar(du),
            "square-planar splitting leaves dx2-y2 empty",
        ),
        "octahedral" | "piano stool" => (
            HIGH_SPIN_OCT[du],
            LOW_SPIN_OCT[du],
            "octahedral t2g/eg filling",
        ),
        _ => (
            HIGH_SPIN_OCT[du].min(if du <= 5 { du as u8 } else { 10 - du as u8 }),
            (d % 2) as u8,
            if d % 2 == 0 {
                "no clear splitting pattern: low spin pairs every electron"
            } else {
                "no clear splitting pattern: low spin pairs all but one electron"
            },
        ),
    };
    // An 18-electron centre with strong-field ligands (or a 4d/5d metal) fills every bonding
    // and nonbonding level: diamagnetic whatever the idealized geometry (CpMo(CO)3Me, d4).
    let filled =
        input.electrons == 18 && (input.field >= 1.6 || !input.first_row || input.pi_acceptor);
    let special = special_cases(input, geometry, strength);
    let (unpaired, ambiguous, why) = if let Some(found) = special {
        found
    } else if filled {
        (
            vec![0],
            false,
            Basis(
                "18 e with strong-field or π-acceptor ligands: all bonding and nonbonding \
                 levels filled",
                None,
            ),
        )
    } else if hs == ls {
        (vec![ls], false, Basis(basis, None))
    } else if matches!(geometry, "sandwich" | "bent sandwich") && strength < 2.1 {
        // Mn(II) metallocenes sit at the crossover: Cp2Mn is high spin, Cp*2Mn low spin
        (
            vec![hs, ls],
            true,
            Basis(
                basis,
                Some("weak-field metal ion: high and low spin both known"),
            ),
        )
    } else if strength >= 1.9 {
        (
            vec![ls],
            false,
            Basis(basis, Some("strong field or 4d/5d metal: low spin")),
        )
    } else if strength <= 1.3 {
        (
            vec![hs],
            false,
            Basis(basis, Some("weak field at a 3d metal: high spin")),
        )
    } else if strength >= 1.6 && !(d == 7 && strength < 2.1) {
        (
            vec![ls, hs],
            true,
            Basis(basis, Some("intermediate field: low spin more likely")),
        )
    } else {
        (
            vec![hs, ls],
            true,
            Basis(basis, Some("intermediate field: high spin more likely")),
        )
    };
    SpinGuess {
        geometry,
        unpaired,
        ambiguous,
        basis: why,
    }
}

type Found = (Vec<u8>, bool, Basis);

/// Cases the splitting tables get wrong, each a known pattern.
fn special_cases(input: &SpinInput, geometry: &str, strength: f64) -> Option<Found> {
    let d = input.d;
    // d2 with an oxo, imido or nitrido: both electrons pair in the dxy orbital that the
    // multiple bond leaves nonbonding (ReOCl3(PPh3)2; Miessler, Fischer & Tarr 2014, ch. 11)
    if d == 2 && input.multiple_bond {
        return Some((
            vec![0],
            false,
            Basis(
                "d2 with a metal-ligand multiple bond: the pair sits in dxy",
                None,
            ),
        ));
    }
    // bent metallocene d2: with two σ ligands (18 e, Cp2MoH2, Cp2WCl2, Cp2Ti(PMe3)2) the pair
    // fills the one frontier orbital left nonbonding (Lauher & Hoffmann, J. Am. Chem. Soc.
    // 1976, 98, 1729); at 16 e a π acceptor takes one level down and the pair goes there
    // (Cp2Ti(C2H4)), while with σ ligands alone the two electrons stay apart (Cp2VCl)
    if geometry == "bent sandwich" && d == 2 {
        let paired = input.pi_acceptor || input.electrons >= 18;
        return Some((
            vec![if paired { 0 } else { 2 }],
            false,
            Basis(
                if input.electrons >= 18 {
                    "bent metallocene d2 at 18 e: the pair fills the nonbonding a1 orbital"
                } else {
                    "bent metallocene d2 below 18 e: a π acceptor pairs the electrons, σ \
                     ligands alone do not"
                },
                None,
            ),
        ));
    }
    // half-sandwich 4d/5d fragments with an even count are singlets (CpRh(CO), Cp*Ir(PMe3))
    if geometry == "piano stool" && !input.first_row && input.electrons % 2 == 0 {
        return Some((
            vec![0],
            false,
            Basis("4d/5d half-sandwich: low spin, electrons paired", None),
        ));
    }
    // planar macrocycles (porphyrinate, salen) with at most one axial ligand: iron(III) and
    // manganese(III) are high spin, iron(II) intermediate spin S = 1 (Fe(TPP)), d7 and d8
    // low spin (Co(salen), Ni(salen); Scheidt & Reed, Chem. Rev. 1981, 81, 543)
    if input.planar_ligand && input.sites <= 5 && input.first_row && strength < 2.5 {
        let found = match d {
            4 | 5 => Some(vec![d as u8]),
            6 if input.sites == 4 => Some(vec![2]),
            7 | 9 => Some(vec![1]),
            8 => Some(vec![0]),
            _ => None,
        };
        if let Some(n) = found {
            return Some((
                n,
                false,
                Basis(
                    "metal in a planar macrocycle with at most one axial ligand",
                    None,
                ),
            ));
        }
    }
    None
}

fn tetrahedral(d: usize) -> u8 {
    // e below t2: high-spin filling over five orbitals
    HIGH_SPIN_OCT[d]
}

fn square_planar(d: usize) -> u8 {
    match d {
        8 | 10 | 0 => 0,
        7 | 9 => 1,
        d => LOW_SPIN_OCT[d],
    }
}

/// Whether a four-coordinate d8 centre is square planar rather than tetrahedral: always for
/// 4d/5d metals (Pd(II), Pt(II), Rh(I), Ir(I), Au(III)); for 3d metals only with a strong enough
/// field ([Ni(CN)4]2- is planar, [NiCl4]2- tetrahedral; Miessler, Fischer & Tarr 2014).
///
/// Only groups 9-11 qualify: a group 8 d8 centre is M(0) (Fe(CO)4 is a bent triplet fragment,
/// and Fe, Ru, Os carbonyls go on to 18 e).
pub fn square_planar_d8(
    symbol: &str,
    group: u8,
    first_row: bool,
    oxidation_state: i64,
    field: f64,
) -> bool {
    (9..=11).contains(&group)
        && (!first_row || field + metal_ion_score(symbol, oxidation_state) >= 1.45)
}

/// A geometry name from the number of positions, rings, d count and field.
fn geometry(input: &SpinInput) -> &'static str {
    if input.rings >= 2 {
        return if input.sites > 6 {
            "bent sandwich"
        } else {
            "sandwich"
        };
    }
    if input.rings == 1 {
        return "piano stool";
    }
    if input.planar_ligand && input.sites >= 4 {
        return match input.sites {
            4 => "square planar",
            5 => "square pyramidal",
            _ => "octahedral",
        };
    }
    match input.sites {
        2 => "linear",
        3 if input.d == 8
            && !input.f_block
            && square_planar_d8(
                input.symbol,
                input.group,
                input.first_row,
                input.oxidation_state,
                input.field,
            ) =>
        {
            "T-shaped"
        }
        3 => "trigonal planar",
        4 => match input.d {
            8 if square_planar_d8(
                input.symbol,
                input.group,
                input.first_row,
                input.oxidation_state,
                input.field,
            ) =>
            {
                "square planar"
            }
            9 if input.symbol == "Cu" => "square planar",
            // heavier d7 and d9 centres (Rh(II), Pt(III), Au(II)) are square planar and low
            // spin like their d8 neighbours (common practice)
            7 | 9 if !input.first_row => "square planar",
            _ => "tetrahedral",
        },
        5 => "trigonal bipyramidal or square pyramidal",
        6 => "octahedral",
        7 => "seven-coordinate",
        n if n >= 8 => "high coordination",
        _ => "low coordination",
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn centre(symbol: &'static str, d: i64, os: i64, sites: i64, field: f64) -> SpinInput {
        SpinInput {
            d,
            electrons: 18,
            symbol,
            group: 9,
            planar_ligand: false,
            pi_acceptor: false,
            multiple_bond: false,
            oxidation_state: os,
            first_row: true,
            f_block: false,
            sites,
            rings: 0,
            field,
        }
    }

    // Spin-only formula and values: Miessler, Fischer & Tarr, Inorganic Chemistry, 5th ed., 2014.
    #[test]
    fn spin_only_moments() {
        let want = [0.0, 1.73, 2.83, 3.87, 4.90, 5.92];
        for (n, w) in want.iter().enumerate() {
            assert!((spin_only_moment(n as u8) - w).abs() < 0.01, "n = {n}");
        }
    }

    #[test]
    fn intermediate_fields_are_flagged() {
        // d5 Fe(III) with an N-donor set sits between the two regimes
        let g = guess(&centre("Fe", 5, 3, 6, 1.0));
        assert!(g.ambiguous);
        assert_eq!(g.unpaired, vec![1, 5]);
    }

    #[test]
    fn heavier_four_coordinate_d7_is_planar_low_spin() {
        // common practice: Rh(II) and Ir(II) monomers are square planar, S = 1/2; a 3d d7
        // four-coordinate centre (Co(II)) stays tetrahedral, S = 3/2
        let mut rh = centre("Rh", 7, 2, 4, 1.5);
        rh.first_row = false;
        rh.electrons = 15;
        let g = guess(&rh);
        assert_eq!(g.geometry, "square planar");
        assert_eq!(g.unpaired, vec![1]);
        let mut co = centre("Co", 7, 2, 4, 0.5);
        co.electrons = 15;
        let g = guess(&co);
        assert_eq!(g.geometry, "tetrahedral");
        assert_eq!(g.unpaired, vec![3]);
    }
}

//! Polynuclear complexes: metal-metal bonds from the 18-electron rule and the polyhedral
//! skeletal electron pair (Wade-Mingos) expectations for clusters.

use super::frac::Frac;

/// A cluster shape with its expected cluster valence electron count (Mingos, Acc. Chem. Res.
/// 1984, 17, 311; Mingos & Wales, Introduction to Cluster Chemistry, 1990).
#[derive(Debug, PartialEq, Eq)]
pub struct Polyhedron {
    pub metals: usize,
    pub cve: i64,
    pub name: &'static str,
    pub edges: u32,
}

/// Common metal polyhedra and their characteristic counts.
pub static POLYHEDRA: &[Polyhedron] = &[
    Polyhedron {
        metals: 3,
        cve: 48,
        name: "triangle",
        edges: 3,
    },
    Polyhedron {
        metals: 3,
        cve: 50,
        name: "open triangle (bent chain)",
        edges: 2,
    },
    Polyhedron {
        metals: 4,
        cve: 60,
        name: "tetrahedron",
        edges: 6,
    },
    Polyhedron {
        metals: 4,
        cve: 62,
        name: "butterfly",
        edges: 5,
    },
    Polyhedron {
        metals: 4,
        cve: 64,
        name: "square",
        edges: 4,
    },
    Polyhedron {
        metals: 5,
        cve: 72,
        name: "trigonal bipyramid (closo)",
        edges: 9,
    },
    Polyhedron {
        metals: 5,
        cve: 74,
        name: "square pyramid (nido)",
        edges: 8,
    },
    Polyhedron {
        metals: 6,
        cve: 84,
        name: "capped trigonal bipyramid",
        edges: 12,
    },
    Polyhedron {
        metals: 6,
        cve: 86,
        name: "octahedron (closo)",
        edges: 12,
    },
    Polyhedron {
        metals: 6,
        cve: 90,
        name: "trigonal prism",
        edges: 9,
    },
    Polyhedron {
        metals: 8,
        cve: 120,
        name: "cube",
        edges: 12,
    },
];

/// What the counting rules expect of a polynuclear complex.
#[derive(Debug, Clone, PartialEq)]
pub struct ClusterView {
    /// Total M-M bonds (bond order for a dimer) from the 18-electron rule; None where that rule
    /// does not fit the count (delocalized clusters).
    pub bonds: Option<u32>,
    pub polyhedron: Option<&'static Polyhedron>,
    pub notes: Vec<String>,
}

/// Infer the M-M bonding of `n` metals from their counts before any M-M bond.
///
/// `need[i]` is how many electrons metal i lacks from its target (18, or 16 for square-planar
/// d8); `d[i]` its d count, which caps the bonds it can form; `cve` the total cluster valence
/// electron count; `refused` is set when some metal forms no M-M bond at all; `werner` when no
/// π-acceptor ligand is present, where a dimer's bond order follows the filling of its
/// σ, π, δ, δ*, π*, σ* levels (Cotton: d4-d4 quadruple, d7-d7 single, as in Rh2(O2CMe)4);
/// `bridges3c` counts 3c-2e M-H-M bridges, each standing for one M-M bond.
pub fn metal_bonds(
    need: &[Frac],
    d: &[Frac],
    cve: Frac,
    refused: bool,
    werner: bool,
    bridges3c: u32,
) -> ClusterView {
    let n = need.len();
    let mut notes = Vec::new();
    let deficit: Frac = need.iter().copied().sum();
    let raw = if deficit > Frac::ZERO {
        (deficit / 2).floor().max(0)
    } else {
        0
    };
    if let Some(c) = cve.as_int() {
        if c % 2 != 0 {
            notes.push("odd cluster valence electron count: the cluster is a radical".into());
        }
    }
    if refused {
        return ClusterView {
            bonds: Some(0),
            polyhedron: None,
            notes,
        };
    }
    let d_min = d.iter().map(|x| x.floor().max(0)).min().unwrap_or(0);
    let per_metal = if n == 2 {
        if werner {
            // bond order from the d-d levels of a dimer
            if d_min <= 4 {
                d_min
            } else {
                (8 - d_min).max(0)
            }
        } else {
            d_min.min(4)
        }
    } else {
        d_min.min(n as i64 - 1)
    };
    let edges = if n == 2 { 4 } else { (n * (n - 1) / 2) as i64 };
    // 3c-2e bridges sit on edges too, so they add to what the edges can hold
    let cap = (per_metal * n as i64 / 2).min(edges) + bridges3c as i64;
    let mut bonds = raw.min(cap).max(0) as u32;
    let mut polyhedron = None;
    if n >= 3 {
        if let Some(c) = cve.as_int() {
            polyhedron = POLYHEDRA.iter().find(|p| p.metals == n && p.cve == c);
        }
        match polyhedron {
            Some(p) if p.edges + bridges3c == bonds => {}
            Some(p) => {
                notes.push(format!(
                    "the 18-electron rule gives {} M-M bonds but a {} has {} edges: count this \
                     cluster by Wade-Mingos rules ({} e)",
                    raw, p.name, p.edges, p.cve
                ));
                return ClusterView {
                    bonds: None,
                    polyhedron,
                    notes,
                };
            }
            None if n >= 5 => {
                notes.push(
                    "clusters of five or more metals are better counted by Wade-Mingos rules; \
                     the M-M bond count from the 18-electron rule is a rough guide"
                        .into(),
                );
            }
            None => {}
        }
    }
    if (raw as u32) > bonds {
        notes.push(format!(
            "the 18-electron rule asks for {raw} M-M bonds but the d electrons allow {bonds}"
        ));
        bonds = bonds.min(raw as u32);
    }
    ClusterView {
        bonds: Some(bonds),
        polyhedron,
        notes,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn f(n: i64) -> Frac {
        Frac::int(n)
    }

    // Greenwood & Earnshaw, Chemistry of the Elements, 2nd ed., 1997: Os3(CO)12 has an Os3
    // triangle (48 e), each Os 16 e before M-M bonds.
    #[test]
    fn triangle_from_three_sixteen_electron_metals() {
        let v = metal_bonds(&[f(2), f(2), f(2)], &[f(8); 3], f(48), false, false, 0);
        assert_eq!(v.bonds, Some(3));
        assert_eq!(v.polyhedron.map(|p| p.name), Some("triangle"));
    }

    // Mingos, Acc. Chem. Res. 1984, 17, 311: an M6 octahedron has 86 e, not 18n - 2*12.
    #[test]
    fn octahedron_defeats_the_18_electron_rule() {
        let need = vec![Frac::new(11, 3); 6];
        let v = metal_bonds(&need, &[f(9); 6], f(86), false, false, 0);
        assert_eq!(v.bonds, None);
        assert!(v.polyhedron.unwrap().name.starts_with("octahedron"));
    }

    #[test]
    fn d_count_caps_bond_order() {
        // two d4 metals short of 6 electrons each: quadruple bond, not sextuple ([Re2Cl8]2-)
        let v = metal_bonds(&[f(6), f(6)], &[f(4), f(4)], f(24), false, true, 0);
        assert_eq!(v.bonds, Some(4));
        // d7-d7 without π acceptors (Rh2(O2CMe)4): a single bond (Cotton & Walton, Multiple
        // Bonds between Metal Atoms, 2nd ed., 1993)
        let v = metal_bonds(&[f(3), f(3)], &[f(7), f(7)], f(30), false, true, 0);
        assert_eq!(v.bonds, Some(1));
    }
}

//! Coordination polyhedra as sets of numbered positions, with the rotations that carry the
//! polyhedron onto itself and one improper operation (a reflection or the inversion), so that
//! arrangements of ligands can be compared up to rotation (stereoisomers, enantiomers apart)
//! and up to reflection (enantiomers together). Symbols are the IUPAC polyhedral symbols
//! (IUPAC, Nomenclature of Inorganic Chemistry, Recommendations 2005, IR-9.3.2).

/// A permutation of positions: `p[i]` is where position `i` goes.
pub type Perm = Vec<u8>;

/// A coordination polyhedron.
#[derive(Debug, Clone)]
pub struct Polyhedron {
    /// IUPAC polyhedral symbol: "OC-6", "SP-4", "T-4", "TBPY-5", "SPY-5".
    pub symbol: &'static str,
    pub name: &'static str,
    /// What each position is called ("axial", "equatorial", "apical", "basal", "vertex").
    pub roles: Vec<&'static str>,
    /// Every proper rotation, the identity first.
    pub rotations: Vec<Perm>,
    /// One improper operation; with the rotations it gives the full point group.
    pub improper: Perm,
    /// Pairs of positions a chelate can span (a bite of about 90-120°, not trans).
    pub spans: Vec<(u8, u8)>,
    /// Pairs of positions opposite each other through the metal.
    pub trans: Vec<(u8, u8)>,
    /// Unit vectors from the metal to each position, in a right-handed frame; the rotations
    /// and the improper operation map these onto each other.
    pub coords: Vec<[f64; 3]>,
}

impl Polyhedron {
    pub fn positions(&self) -> usize {
        self.roles.len()
    }

    /// Whether a chelate can span positions `a` and `b`.
    pub fn spannable(&self, a: u8, b: u8) -> bool {
        self.spans.contains(&(a.min(b), a.max(b)))
    }

    /// Whether positions `a` and `b` are trans.
    pub fn is_trans(&self, a: u8, b: u8) -> bool {
        self.trans.contains(&(a.min(b), a.max(b)))
    }

    /// Octahedron: ±x (0, 1), ±y (2, 3), ±z (4, 5).
    pub fn octahedron() -> Polyhedron {
        // C4 about z: +x→+y→−x→−y; C4 about x: +y→+z→−y→−z
        let rotations = closure(&[vec![2, 3, 1, 0, 4, 5], vec![0, 1, 4, 5, 3, 2]], 6);
        let trans = vec![(0, 1), (2, 3), (4, 5)];
        let spans = all_pairs(6)
            .into_iter()
            .filter(|p| !trans.contains(p))
            .collect();
        Polyhedron {
            symbol: "OC-6",
            name: "octahedral",
            roles: vec!["vertex"; 6],
            rotations,
            improper: vec![1, 0, 3, 2, 5, 4], // the inversion
            spans,
            trans,
            coords: vec![
                [1.0, 0.0, 0.0],
                [-1.0, 0.0, 0.0],
                [0.0, 1.0, 0.0],
                [0.0, -1.0, 0.0],
                [0.0, 0.0, 1.0],
                [0.0, 0.0, -1.0],
            ],
        }
    }

    /// Square plane: 0, 1, 2, 3 around the ring (0 trans to 2, 1 trans to 3).
    pub fn square_plane() -> Polyhedron {
        // C4 about the normal, and a C2 through positions 0 and 2
        let rotations = closure(&[vec![1, 2, 3, 0], vec![0, 3, 2, 1]], 4);
        Polyhedron {
            symbol: "SP-4",
            name: "square planar",
            roles: vec!["vertex"; 4],
            rotations,
            improper: vec![0, 1, 2, 3], // the molecular plane is a mirror
            spans: vec![(0, 1), (1, 2), (2, 3), (0, 3)],
            trans: vec![(0, 2), (1, 3)],
            coords: vec![
                [1.0, 0.0, 0.0],
                [0.0, 1.0, 0.0],
                [-1.0, 0.0, 0.0],
                [0.0, -1.0, 0.0],
            ],
        }
    }

    /// Tetrahedron: four equivalent vertices.
    pub fn tetrahedron() -> Polyhedron {
        // C3 about vertex 0, and a C2 swapping 0↔1 and 2↔3
        let rotations = closure(&[vec![0, 2, 3, 1], vec![1, 0, 3, 2]], 4);
        Polyhedron {
            symbol: "T-4",
            name: "tetrahedral",
            roles: vec!["vertex"; 4],
            rotations,
            improper: vec![1, 0, 2, 3], // a mirror through vertices 2 and 3
            spans: all_pairs(4),
            trans: Vec::new(),
            coords: {
                let k = 1.0 / 3f64.sqrt();
                vec![[k, k, k], [k, -k, -k], [-k, k, -k], [-k, -k, k]]
            },
        }
    }

    /// Trigonal bipyramid: axial 0 and 1, equatorial 2, 3, 4.
    pub fn trigonal_bipyramid() -> Polyhedron {
        // C3 about the axis, and a C2 through equatorial 2 (swapping the axial pair)
        let rotations = closure(&[vec![0, 1, 3, 4, 2], vec![1, 0, 2, 4, 3]], 5);
        let spans = all_pairs(5).into_iter().filter(|&p| p != (0, 1)).collect();
        Polyhedron {
            symbol: "TBPY-5",
            name: "trigonal bipyramidal",
            roles: vec!["axial", "axial", "equatorial", "equatorial", "equatorial"],
            rotations,
            improper: vec![1, 0, 2, 3, 4], // the equatorial mirror
            spans,
            trans: vec![(0, 1)],
            coords: {
                let (c, s) = (-0.5, 3f64.sqrt() / 2.0);
                vec![
                    [0.0, 0.0, 1.0],
                    [0.0, 0.0, -1.0],
                    [1.0, 0.0, 0.0],
                    [c, s, 0.0],
                    [c, -s, 0.0],
                ]
            },
        }
    }

    /// Square pyramid: apical 0, basal 1, 2, 3, 4 around the base.
    pub fn square_pyramid() -> Polyhedron {
        let rotations = closure(&[vec![0, 2, 3, 4, 1]], 5);
        Polyhedron {
            symbol: "SPY-5",
            name: "square pyramidal",
            roles: vec!["apical", "basal", "basal", "basal", "basal"],
            rotations,
            improper: vec![0, 1, 4, 3, 2], // a mirror through the apex and positions 1 and 3
            spans: vec![
                (0, 1),
                (0, 2),
                (0, 3),
                (0, 4),
                (1, 2),
                (2, 3),
                (3, 4),
                (1, 4),
            ],
            trans: vec![(1, 3), (2, 4)],
            coords: vec![
                [0.0, 0.0, 1.0],
                [1.0, 0.0, 0.0],
                [0.0, 1.0, 0.0],
                [-1.0, 0.0, 0.0],
                [0.0, -1.0, 0.0],
            ],
        }
    }
}

/// Every pair (a, b), a < b, of `n` positions.
fn all_pairs(n: u8) -> Vec<(u8, u8)> {
    (0..n)
        .flat_map(|a| (a + 1..n).map(move |b| (a, b)))
        .collect()
}

/// The group the generators make: every product of them, the identity first.
fn closure(generators: &[Perm], n: u8) -> Vec<Perm> {
    let identity: Perm = (0..n).collect();
    let mut group = vec![identity];
    let mut i = 0;
    while i < group.len() {
        for g in generators {
            // g after group[i]
            let next: Perm = group[i].iter().map(|&p| g[p as usize]).collect();
            if !group.contains(&next) {
                group.push(next);
            }
        }
        i += 1;
    }
    group
}

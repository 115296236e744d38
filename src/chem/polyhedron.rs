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

    /// The position trans to `a`, if there is one.
    pub fn trans_to(&self, a: u8) -> Option<u8> {
        self.trans.iter().find_map(|&(p, q)| {
            if p == a {
                Some(q)
            } else if q == a {
                Some(p)
            } else {
                None
            }
        })
    }

    /// Meridional triads (first, middle, last): the ends trans, the middle cis to both, as a
    /// pincer holds them.
    pub fn mer_triads(&self) -> Vec<[u8; 3]> {
        let mut out = Vec::new();
        for &(a, c) in &self.trans {
            for b in 0..self.positions() as u8 {
                if b != a && b != c && self.spannable(a, b) && self.spannable(b, c) {
                    out.push([a, b, c]);
                }
            }
        }
        out
    }

    /// Facial triads: three positions each pair of which a chelate could span (a face of the
    /// polyhedron), as a tripodal ligand or an η5 ring holds them.
    pub fn fac_triads(&self) -> Vec<[u8; 3]> {
        let n = self.positions() as u8;
        let mut out = Vec::new();
        for a in 0..n {
            for b in a + 1..n {
                for c in b + 1..n {
                    if self.spannable(a, b) && self.spannable(b, c) && self.spannable(a, c) {
                        out.push([a, b, c]);
                    }
                }
            }
        }
        out
    }

    /// Four positions in a square, in order around it, as a planar macrocycle holds them.
    pub fn squares(&self) -> Vec<[u8; 4]> {
        let mut out = Vec::new();
        for (i, &(a, c)) in self.trans.iter().enumerate() {
            for &(b, d) in &self.trans[i + 1..] {
                if self.spannable(a, b) && self.spannable(b, c) && self.spannable(c, d) {
                    out.push([a, b, c, d]);
                }
            }
        }
        out
    }

    /// The polyhedron with this IUPAC symbol, among those nonet models.
    pub fn by_symbol(symbol: &str) -> Option<Polyhedron> {
        Some(match symbol.trim().to_ascii_uppercase().as_str() {
            "L-2" => Polyhedron::linear(),
            "TP-3" => Polyhedron::trigonal_plane(),
            "TS-3" => Polyhedron::t_shape(),
            "T-4" => Polyhedron::tetrahedron(),
            "SP-4" => Polyhedron::square_plane(),
            "TBPY-5" => Polyhedron::trigonal_bipyramid(),
            "SPY-5" => Polyhedron::square_pyramid(),
            "OC-6" => Polyhedron::octahedron(),
            "PBPY-7" => Polyhedron::pentagonal_bipyramid(),
            _ => return None,
        })
    }

    /// Every polyhedron nonet models, by rising coordination number, built once.
    pub fn all() -> &'static [Polyhedron] {
        static ALL: std::sync::OnceLock<Vec<Polyhedron>> = std::sync::OnceLock::new();
        ALL.get_or_init(|| {
            [
                "L-2", "TP-3", "TS-3", "T-4", "SP-4", "TBPY-5", "SPY-5", "OC-6", "PBPY-7",
            ]
            .iter()
            .filter_map(|s| Polyhedron::by_symbol(s))
            .collect()
        })
    }

    /// The shared copy of the polyhedron with this symbol (see `all`).
    pub fn shared(symbol: &str) -> Option<&'static Polyhedron> {
        let symbol = symbol.trim().to_ascii_uppercase();
        Polyhedron::all().iter().find(|p| p.symbol == symbol)
    }

    /// Linear: 0 and 1 opposite.
    pub fn linear() -> Polyhedron {
        Polyhedron {
            symbol: "L-2",
            name: "linear",
            roles: vec!["axial"; 2],
            rotations: closure(&[vec![1, 0]], 2),
            improper: vec![0, 1], // a mirror containing the axis
            spans: Vec::new(),
            trans: vec![(0, 1)],
            coords: vec![[0.0, 0.0, 1.0], [0.0, 0.0, -1.0]],
        }
    }

    /// Trigonal plane: three equivalent positions 120° apart.
    pub fn trigonal_plane() -> Polyhedron {
        let (c, s) = (-0.5, 3f64.sqrt() / 2.0);
        Polyhedron {
            symbol: "TP-3",
            name: "trigonal planar",
            roles: vec!["vertex"; 3],
            rotations: closure(&[vec![1, 2, 0], vec![0, 2, 1]], 3),
            improper: vec![0, 1, 2], // the molecular plane
            spans: all_pairs(3),
            trans: Vec::new(),
            coords: vec![[1.0, 0.0, 0.0], [c, s, 0.0], [c, -s, 0.0]],
        }
    }

    /// T-shape: the crosspiece 0 and 2 (trans), the stem 1 between them; a square plane with
    /// one position empty (the one trans to the stem).
    pub fn t_shape() -> Polyhedron {
        Polyhedron {
            symbol: "TS-3",
            name: "T-shaped",
            roles: vec!["crosspiece", "stem", "crosspiece"],
            rotations: closure(&[vec![2, 1, 0]], 3),
            improper: vec![0, 1, 2], // the molecular plane
            spans: vec![(0, 1), (1, 2)],
            trans: vec![(0, 2)],
            coords: vec![[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [-1.0, 0.0, 0.0]],
        }
    }

    /// Pentagonal bipyramid: axial 0 and 1, equatorial 2-6 in order around the pentagon.
    pub fn pentagonal_bipyramid() -> Polyhedron {
        // C5 about the axis, and a C2 through equatorial 2 (swapping the axial pair)
        let rotations = closure(&[vec![0, 1, 3, 4, 5, 6, 2], vec![1, 0, 2, 6, 5, 4, 3]], 7);
        let mut spans: Vec<(u8, u8)> = (2..7).flat_map(|e| [(0, e), (1, e)]).collect();
        spans.extend((2..7).map(|e| if e == 6 { (2, 6) } else { (e, e + 1) }));
        spans.sort_unstable();
        Polyhedron {
            symbol: "PBPY-7",
            name: "pentagonal bipyramidal",
            roles: vec![
                "axial",
                "axial",
                "equatorial",
                "equatorial",
                "equatorial",
                "equatorial",
                "equatorial",
            ],
            rotations,
            improper: vec![1, 0, 2, 3, 4, 5, 6], // the equatorial mirror
            spans,
            trans: vec![(0, 1)],
            coords: {
                let mut c = vec![[0.0, 0.0, 1.0], [0.0, 0.0, -1.0]];
                for k in 0..5 {
                    let t = 2.0 * std::f64::consts::PI * k as f64 / 5.0;
                    c.push([t.cos(), t.sin(), 0.0]);
                }
                c
            },
        }
    }

    /// The other positions in order around the axis through `from` as seen from `from`
    /// looking at the metal, clockwise; positions on the axis are left out.
    pub fn clockwise_around(&self, from: u8, among: &[u8]) -> Vec<u8> {
        let Some(&v) = self.coords.get(from as usize) else {
            return Vec::new();
        };
        let dot = |a: [f64; 3], b: [f64; 3]| a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
        let cross = |a: [f64; 3], b: [f64; 3]| {
            [
                a[1] * b[2] - a[2] * b[1],
                a[2] * b[0] - a[0] * b[2],
                a[0] * b[1] - a[1] * b[0],
            ]
        };
        // a basis of the plane perpendicular to v
        let seed = if v[0].abs() < 0.9 {
            [1.0, 0.0, 0.0]
        } else {
            [0.0, 1.0, 0.0]
        };
        let e1 = cross(v, seed);
        let e2 = cross(v, e1);
        let mut around: Vec<(f64, u8)> = among
            .iter()
            .filter_map(|&p| {
                let c = *self.coords.get(p as usize)?;
                let off = dot(c, v);
                if (off.abs() - 1.0).abs() < 1e-6 {
                    return None;
                }
                Some((dot(c, e2).atan2(dot(c, e1)), p))
            })
            .collect();
        // seen from +v, a rising angle about +v runs anticlockwise
        around.sort_by(|a, b| b.0.total_cmp(&a.0));
        around.into_iter().map(|(_, p)| p).collect()
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

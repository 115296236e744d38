//! Stereoisomers of a set of donors on a coordination polyhedron: every way to place the
//! donors, classed up to rotation of the polyhedron (so enantiomers count apart) and paired
//! with their mirror images. Donors are written as in the textbook tables: monodentate
//! ligands as small letters with counts (`Ma2b2c2`), chelates as two capitals in parentheses,
//! the same letter twice for a symmetric one (`M(AA)3`, `M(AB)2cd`).

use std::collections::BTreeMap;

use super::polyhedron::Polyhedron;

/// One ligand of the composition.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Part {
    /// A monodentate donor.
    Mono(char),
    /// A chelate with its two donor ends (the same letter twice when symmetric).
    Chelate(char, char),
    /// A chelate of known natural bite angle (degrees): it spans the pairs of positions whose
    /// angle at the metal lies within `BITE_WINDOW` of it, so a narrow bite (dppe) keeps to
    /// 90° pairs and a trans-spanning one reaches 180°.
    Bite(char, char, u8),
    /// A tridentate ligand on a meridian (a pincer: ends, middle, end).
    Mer(char, char, char),
    /// A tridentate ligand on a face (a tripod, a scorpionate, an η5 or η6 ring).
    Fac(char, char, char),
    /// A planar tetradentate ligand on four positions in a square (a porphyrinate).
    Square(char),
}

impl Part {
    fn denticity(self) -> usize {
        match self {
            Part::Mono(_) => 1,
            Part::Chelate(..) | Part::Bite(..) => 2,
            Part::Mer(..) | Part::Fac(..) => 3,
            Part::Square(_) => 4,
        }
    }

    /// Every way to put this ligand on free positions of `poly`, as (position, letter) lists.
    fn placements(self, poly: &Polyhedron) -> Vec<Vec<(u8, char)>> {
        let mut out: Vec<Vec<(u8, char)>> = Vec::new();
        let mut push = |v: Vec<(u8, char)>| {
            let mut key = v.clone();
            key.sort_unstable();
            if !out.iter().any(|o| {
                let mut k = o.clone();
                k.sort_unstable();
                k == key
            }) {
                out.push(v);
            }
        };
        match self {
            Part::Mono(c) => (0..poly.positions() as u8).for_each(|p| push(vec![(p, c)])),
            Part::Chelate(a, b) => {
                for &(p, q) in &poly.spans {
                    push(vec![(p, a), (q, b)]);
                    push(vec![(q, a), (p, b)]);
                }
            }
            Part::Bite(a, b, angle) => {
                for (p, q) in bite_spans(poly, angle) {
                    push(vec![(p, a), (q, b)]);
                    push(vec![(q, a), (p, b)]);
                }
            }
            Part::Mer(a, m, b) => {
                for [p, q, r] in poly.mer_triads() {
                    push(vec![(p, a), (q, m), (r, b)]);
                    push(vec![(r, a), (q, m), (p, b)]);
                }
            }
            Part::Fac(a, b, c) => {
                for [p, q, r] in poly.fac_triads() {
                    for [x, y, z] in [
                        [p, q, r],
                        [p, r, q],
                        [q, p, r],
                        [q, r, p],
                        [r, p, q],
                        [r, q, p],
                    ] {
                        push(vec![(x, a), (y, b), (z, c)]);
                    }
                }
            }
            Part::Square(c) => {
                for sq in poly.squares() {
                    push(sq.iter().map(|&p| (p, c)).collect());
                }
            }
        }
        out
    }
}

/// How far from its natural bite angle a chelate is taken to flex, in degrees: the
/// flexibility ranges of common diphosphines span some 20-40° about βn (Dierkes & van
/// Leeuwen, J. Chem. Soc., Dalton Trans. 1999, 1519; from memory).
pub const BITE_WINDOW: f64 = 30.0;

/// The pairs of positions a chelate of natural bite angle `angle` spans; the polyhedron's
/// usual pairs when none is within reach (a three-coordinate fragment).
pub fn bite_spans(poly: &Polyhedron, angle: u8) -> Vec<(u8, u8)> {
    let n = poly.positions() as u8;
    let mut out = Vec::new();
    for p in 0..n {
        for q in p + 1..n {
            let (u, v) = (poly.coords[p as usize], poly.coords[q as usize]);
            let dot: f64 = (0..3).map(|i| u[i] * v[i]).sum();
            let at = dot.clamp(-1.0, 1.0).acos().to_degrees();
            if (at - f64::from(angle)).abs() <= BITE_WINDOW {
                out.push((p, q));
            }
        }
    }
    if out.is_empty() {
        poly.spans.clone()
    } else {
        out
    }
}

/// What a position holds: the donor's letter and, for an end of a polydentate ligand, the
/// lowest position that ligand holds (its other ends share it).
pub type Seat = (char, Option<u8>);

/// One stereoisomer: what sits at each position of the polyhedron.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Isomer {
    pub seats: Vec<Seat>,
    /// Not superimposable on its mirror image (its enantiomer is listed too).
    pub chiral: bool,
}

/// Why a composition cannot be placed.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum IsomerError {
    #[error("'{0}' is not a composition: write M, then small letters with counts and chelates as two capitals in parentheses, e.g. Ma2b2c2 or M(AA)2b2 (three capitals for a meridional pincer, e.g. M(ABA)c3)")]
    Notation(String),
    #[error("the donors fill {donors} positions but a {name} centre has {positions}")]
    Positions {
        donors: usize,
        positions: usize,
        name: &'static str,
    },
}

/// Read the textbook notation: `Ma2b2c2`, `Mabcdef`, `M(AA)3`, `M(AB)(CD)ef`.
pub fn parse_parts(text: &str) -> Result<Vec<Part>, IsomerError> {
    let bad = || IsomerError::Notation(text.to_string());
    let body = text.trim().strip_prefix('M').ok_or_else(bad)?;
    let chars: Vec<char> = body.chars().collect();
    let mut parts = Vec::new();
    let mut i = 0;
    while i < chars.len() {
        let part = match chars[i] {
            c if c.is_ascii_lowercase() => {
                i += 1;
                Part::Mono(c)
            }
            '(' => match (chars.get(i + 1..i + 4), chars.get(i + 1..i + 5)) {
                (Some(&[a, b, ')']), _) if a.is_ascii_uppercase() && b.is_ascii_uppercase() => {
                    i += 4;
                    Part::Chelate(a, b)
                }
                (_, Some(&[a, b, c, ')'])) if [a, b, c].iter().all(char::is_ascii_uppercase) => {
                    i += 5;
                    Part::Mer(a, b, c)
                }
                _ => return Err(bad()),
            },
            _ => return Err(bad()),
        };
        let digits: String = chars[i..]
            .iter()
            .take_while(|c| c.is_ascii_digit())
            .collect();
        i += digits.len();
        let n: usize = if digits.is_empty() {
            1
        } else {
            digits.parse().map_err(|_| bad())?
        };
        if n == 0 || n > 12 {
            return Err(bad());
        }
        parts.extend(std::iter::repeat_n(part, n));
    }
    if parts.is_empty() {
        return Err(bad());
    }
    Ok(parts)
}

/// Every stereoisomer of `parts` on `poly`, enantiomers listed apart, in a fixed order.
pub fn enumerate(poly: &Polyhedron, parts: &[Part]) -> Result<Vec<Isomer>, IsomerError> {
    let donors: usize = parts.iter().map(|p| p.denticity()).sum();
    if donors != poly.positions() {
        return Err(IsomerError::Positions {
            donors,
            positions: poly.positions(),
            name: poly.name,
        });
    }
    let mut groups: Vec<Part> = Vec::new();
    let mut monos: BTreeMap<char, usize> = BTreeMap::new();
    for p in parts {
        match *p {
            Part::Mono(c) => *monos.entry(c).or_insert(0) += 1,
            other => groups.push(other),
        }
    }
    // the largest ligands first (fewer ways to place them), identical ones together
    groups.sort_by_key(|g| (std::cmp::Reverse(g.denticity()), format!("{g:?}")));
    let mut seen: BTreeMap<Vec<u16>, Vec<Seat>> = BTreeMap::new();
    let mut seats: Vec<Option<Seat>> = vec![None; poly.positions()];
    let groups: Vec<Ways> = groups
        .into_iter()
        .map(|g| (g, g.placements(poly)))
        .collect();
    place_groups(poly, &groups, &mut monos, &mut seats, &mut seen, None);
    let keys: Vec<Vec<u16>> = seen.keys().cloned().collect();
    Ok(seen
        .into_iter()
        .map(|(key, seats)| {
            let mirror = canonical(poly, &apply(&poly.improper, &seats));
            let chiral = mirror != key;
            debug_assert!(keys.contains(&mirror));
            Isomer { seats, chiral }
        })
        .collect())
}

/// How many stereoisomers (enantiomers apart) and how many enantiomeric pairs among them.
pub fn tally(isomers: &[Isomer]) -> (usize, usize) {
    let chiral = isomers.iter().filter(|i| i.chiral).count();
    (isomers.len(), chiral / 2)
}

/// A ligand with every way to place it.
type Ways = (Part, Vec<Vec<(u8, char)>>);

fn place_groups(
    poly: &Polyhedron,
    groups: &[Ways],
    monos: &mut BTreeMap<char, usize>,
    seats: &mut Vec<Option<Seat>>,
    seen: &mut BTreeMap<Vec<u16>, Vec<Seat>>,
    // where the previous group went, when it was the same ligand as this one: identical
    // ligands are placed in rising order, so no arrangement is built once per ordering
    from: Option<(Part, usize)>,
) {
    let Some(((part, ways), rest)) = groups.split_first() else {
        place_monos(poly, monos, seats, seen);
        return;
    };
    let part = *part;
    let start = match from {
        Some((prev, k)) if prev == part => k + 1,
        _ => 0,
    };
    for (k, placement) in ways.iter().enumerate().skip(start) {
        if placement.iter().any(|&(p, _)| seats[p as usize].is_some()) {
            continue;
        }
        let low = placement.iter().map(|&(p, _)| p).min();
        for &(p, c) in placement {
            seats[p as usize] = Some((c, low));
        }
        place_groups(poly, rest, monos, seats, seen, Some((part, k)));
        for &(p, _) in placement {
            seats[p as usize] = None;
        }
    }
}

fn place_monos(
    poly: &Polyhedron,
    monos: &mut BTreeMap<char, usize>,
    seats: &mut Vec<Option<Seat>>,
    seen: &mut BTreeMap<Vec<u16>, Vec<Seat>>,
) {
    let Some(free) = seats.iter().position(Option::is_none) else {
        let full: Vec<Seat> = seats.iter().map(|s| s.unwrap_or((' ', None))).collect();
        let key = canonical(poly, &full);
        seen.entry(key).or_insert(full);
        return;
    };
    let letters: Vec<char> = monos
        .iter()
        .filter(|(_, &n)| n > 0)
        .map(|(&c, _)| c)
        .collect();
    for c in letters {
        if let Some(n) = monos.get_mut(&c) {
            *n -= 1;
        }
        seats[free] = Some((c, None));
        place_monos(poly, monos, seats, seen);
        seats[free] = None;
        if let Some(n) = monos.get_mut(&c) {
            *n += 1;
        }
    }
}

/// The arrangement after moving every position `i` to `g[i]`.
pub fn apply(g: &[u8], seats: &[Seat]) -> Vec<Seat> {
    let mut out = vec![(' ', None); seats.len()];
    for (i, &(c, group)) in seats.iter().enumerate() {
        out[g[i] as usize] = (c, group.map(|q| moved_group(g, seats, q)));
    }
    out
}

/// Where the group whose lowest position was `q` has its lowest position after `g`.
fn moved_group(g: &[u8], seats: &[Seat], q: u8) -> u8 {
    seats
        .iter()
        .enumerate()
        .filter(|(_, s)| s.1 == Some(q))
        .map(|(j, _)| g[j])
        .min()
        .unwrap_or(q)
}

/// The smallest encoding of the arrangement over every rotation: equal for two arrangements
/// exactly when a rotation carries one onto the other.
pub fn canonical(poly: &Polyhedron, seats: &[Seat]) -> Vec<u16> {
    let mut best: Option<Vec<u16>> = None;
    let mut code = vec![0u16; seats.len()];
    let grouped = seats.iter().any(|s| s.1.is_some());
    for g in &poly.rotations {
        for (i, &(c, group)) in seats.iter().enumerate() {
            let at = g[i] as usize;
            let p = match group {
                Some(q) if grouped => u16::from(moved_group(g, seats, q)),
                _ => 255,
            };
            code[at] = ((c as u16 & 0xff) << 8) | p;
        }
        if best.as_ref().is_none_or(|b| code < *b) {
            best = Some(code.clone());
        }
    }
    best.unwrap_or_default()
}

impl Isomer {
    /// The donors opposite each other, as letter pairs in alphabetical order ("a-b"), sorted;
    /// chelate ends spanning cis positions never appear together.
    pub fn trans_pairs(&self, poly: &Polyhedron) -> Vec<(char, char)> {
        let mut pairs: Vec<(char, char)> = poly
            .trans
            .iter()
            .filter_map(|&(i, j)| {
                let a = self.seats.get(i as usize)?.0;
                let b = self.seats.get(j as usize)?.0;
                Some((a.min(b), a.max(b)))
            })
            .collect();
        pairs.sort_unstable();
        pairs
    }

    /// The trade's short name where one applies (IUPAC 2005, IR-9.3.3.3-4): `cis`/`trans` for
    /// a pair of like monodentate donors in a square plane or an octahedron whose other
    /// donors are all alike, `fac`/`mer` for three like donors on an octahedron whose other
    /// three are alike. None for compositions those words do not settle.
    pub fn short_name(&self, poly: &Polyhedron) -> Option<&'static str> {
        if self.seats.iter().any(|s| s.1.is_some()) {
            return None;
        }
        let mut kinds: BTreeMap<char, Vec<u8>> = BTreeMap::new();
        for (i, s) in self.seats.iter().enumerate() {
            kinds.entry(s.0).or_default().push(i as u8);
        }
        if kinds.len() != 2 {
            return None;
        }
        let smaller = kinds.values().min_by_key(|v| v.len())?;
        match (poly.symbol, smaller.len()) {
            ("SP-4" | "OC-6", 2) => Some(if poly.is_trans(smaller[0], smaller[1]) {
                "trans"
            } else {
                "cis"
            }),
            ("OC-6", 3) => {
                // mer: two of the three are trans; fac: none are
                let trans = smaller
                    .iter()
                    .enumerate()
                    .any(|(k, &a)| smaller[k + 1..].iter().any(|&b| poly.is_trans(a, b)));
                Some(if trans { "mer" } else { "fac" })
            }
            _ => None,
        }
    }
}

/// The helix two skew lines define, by the skew-lines convention (IUPAC 2005, IR-9.3.4.11,
/// Figure IR-9.1): line A (through `a0` and `a1`) is the axis, line B (through `b0` and `b1`)
/// the tangent where their common normal meets it. True for a right-handed helix (Δ), false
/// for a left-handed one (Λ); None when the lines meet, are parallel or are orthogonal.
pub fn helicity(a0: [f64; 3], a1: [f64; 3], b0: [f64; 3], b1: [f64; 3]) -> Option<bool> {
    let sub = |p: [f64; 3], q: [f64; 3]| [p[0] - q[0], p[1] - q[1], p[2] - q[2]];
    let dot = |p: [f64; 3], q: [f64; 3]| p[0] * q[0] + p[1] * q[1] + p[2] * q[2];
    let cross = |p: [f64; 3], q: [f64; 3]| {
        [
            p[1] * q[2] - p[2] * q[1],
            p[2] * q[0] - p[0] * q[2],
            p[0] * q[1] - p[1] * q[0],
        ]
    };
    let (a, b) = (sub(a1, a0), sub(b1, b0));
    let axb = cross(a, b);
    // the common normal, from A to B, is along a x b with this sign
    let normal = dot(sub(b0, a0), axb);
    let along = dot(a, b);
    const EPS: f64 = 1e-9;
    if normal.abs() < EPS || along.abs() < EPS {
        return None;
    }
    // B's direction splits into a turn about A, along a x n, and a climb along a: the helix is
    // right-handed when the two have the same sign; with n along +(a x b) scaled by `normal`,
    // b.(a x n) has the sign of -normal
    Some(-normal * along > 0.0)
}

impl Isomer {
    /// Δ or Λ for an octahedral isomer with two or more chelates that is chiral, from the
    /// first two chelates by the skew-lines convention (IUPAC 2005, IR-9.3.4.12-13); None
    /// otherwise.
    pub fn configuration(&self, poly: &Polyhedron) -> Option<&'static str> {
        if poly.symbol != "OC-6" || !self.chiral {
            return None;
        }
        let ends = |low: u8| -> Vec<usize> {
            (0..self.seats.len())
                .filter(|&i| self.seats[i].1 == Some(low))
                .collect()
        };
        let mut lines = self
            .seats
            .iter()
            .enumerate()
            .filter(|&(i, s)| s.1 == Some(i as u8))
            .map(|(i, _)| ends(i as u8))
            .filter(|e| e.len() == 2)
            .map(|e| (e[0], e[1]));
        let (p, q) = lines.next()?;
        let (r, s) = lines.next()?;
        let c = &poly.coords;
        let right = helicity(*c.get(p)?, *c.get(q)?, *c.get(r)?, *c.get(s)?)?;
        Some(if right { "Δ" } else { "Λ" })
    }
}

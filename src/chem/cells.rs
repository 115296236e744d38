//! Spatial indexes that keep steric descriptors near-linear in the number of atoms: a cell list
//! for neighbours in space (bonds, atoms on top of each other) and a banded Fibonacci lattice
//! for directions inside a cone (shadows on the sphere around the metal).

use std::collections::HashMap;

/// Points binned into cubes of side `size`: the neighbours of a point within `size` are in the
/// 27 cubes around its own.
pub struct Cells {
    size: f64,
    bins: HashMap<[i64; 3], Vec<usize>>,
}

impl Cells {
    pub fn new(points: &[[f64; 3]], size: f64) -> Cells {
        let mut bins: HashMap<[i64; 3], Vec<usize>> = HashMap::new();
        for (i, p) in points.iter().enumerate() {
            bins.entry(cell(*p, size)).or_default().push(i);
        }
        Cells { size, bins }
    }

    /// Indices of the points that may lie within `size` of `p` (a superset; callers measure).
    pub fn near(&self, p: [f64; 3]) -> impl Iterator<Item = usize> + '_ {
        let [x, y, z] = cell(p, self.size);
        (-1i64..=1).flat_map(move |dx| {
            (-1i64..=1).flat_map(move |dy| {
                (-1i64..=1).flat_map(move |dz| {
                    let key = [
                        x.saturating_add(dx),
                        y.saturating_add(dy),
                        z.saturating_add(dz),
                    ];
                    self.bins.get(&key).into_iter().flatten().copied()
                })
            })
        })
    }
}

/// The cube holding `p`; coordinates are bounded by the structure reader, and `as` saturates
/// in any case.
fn cell(p: [f64; 3], size: f64) -> [i64; 3] {
    p.map(|c| (c / size).floor() as i64)
}

/// `n` directions spread evenly over the sphere (a Fibonacci lattice), cut into bands of equal
/// z and sorted by longitude within each band, so the directions inside a narrow cone are found
/// without visiting the rest.
pub struct Lattice {
    pub points: Vec<[f64; 3]>,
    /// Per band: (longitude, point index), sorted by longitude.
    bands: Vec<Vec<(f64, usize)>>,
}

/// Points per band: about the number inside a cone of a few degrees.
const PER_BAND: usize = 400;

impl Lattice {
    pub fn new(n: usize) -> Lattice {
        let golden = std::f64::consts::PI * (3.0 - 5f64.sqrt());
        let points: Vec<[f64; 3]> = (0..n)
            .map(|i| {
                let z = 1.0 - 2.0 * (i as f64 + 0.5) / n as f64;
                let r = (1.0 - z * z).sqrt();
                let phi = golden * i as f64;
                [r * phi.cos(), r * phi.sin(), z]
            })
            .collect();
        let bands = points
            .chunks(PER_BAND)
            .enumerate()
            .map(|(b, chunk)| {
                let mut band: Vec<(f64, usize)> = chunk
                    .iter()
                    .enumerate()
                    .map(|(k, p)| (p[1].atan2(p[0]), b * PER_BAND + k))
                    .collect();
                band.sort_by(|a, b| a.0.total_cmp(&b.0));
                band
            })
            .collect();
        Lattice { points, bands }
    }

    /// Calls `visit` with the index of every point that may lie within the cone of half-angle
    /// `half` (radians) about the unit vector `axis` (a superset; callers test each point).
    pub fn candidates(&self, axis: [f64; 3], half: f64, mut visit: impl FnMut(usize)) {
        use std::f64::consts::PI;
        let n = self.points.len();
        if n == 0 {
            return;
        }
        // the cone's colatitudes, and the indices whose z can fall in them (z falls with i)
        let theta = axis[2].clamp(-1.0, 1.0).acos();
        let (lo, hi) = (theta - half, theta + half);
        let z_max = if lo <= 0.0 { 1.0 } else { lo.cos() };
        let z_min = if hi >= PI { -1.0 } else { hi.cos() };
        let index = |z: f64| (1.0 - z) * n as f64 / 2.0 - 0.5;
        let first = (index(z_max).floor() - 2.0).max(0.0) as usize;
        let last = ((index(z_min).ceil() + 2.0).max(0.0) as usize).min(n - 1);
        // the widest longitude a cap reaches from its centre, unless it holds a pole
        let sin_theta = theta.sin();
        let dphi = if lo <= 0.0 || hi >= PI || half.sin() >= sin_theta {
            None
        } else {
            Some((half.sin() / sin_theta).asin() + 1e-6)
        };
        let centre = axis[1].atan2(axis[0]);
        let ranges = match dphi {
            None => wrapped(-PI, PI),
            Some(w) => wrapped(centre - w, centre + w),
        };
        let top = self.bands.len() - 1;
        let from = (first / PER_BAND).min(top);
        let to = (last / PER_BAND).clamp(from, top);
        for band in &self.bands[from..=to] {
            for &(from, to) in ranges.iter().flatten() {
                let start = band.partition_point(|&(p, _)| p < from);
                band[start..]
                    .iter()
                    .take_while(|&&(p, _)| p <= to)
                    .for_each(|&(_, i)| visit(i));
            }
        }
    }
}

/// A longitude interval as at most two intervals within [-π, π].
fn wrapped(from: f64, to: f64) -> [Option<(f64, f64)>; 2] {
    use std::f64::consts::PI;
    if to - from >= 2.0 * PI {
        [Some((-PI, PI)), None]
    } else if from < -PI {
        [Some((from + 2.0 * PI, PI)), Some((-PI, to))]
    } else if to > PI {
        [Some((from, PI)), Some((-PI, to - 2.0 * PI))]
    } else {
        [Some((from, to)), None]
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn lattice_candidates_hold_every_point_inside_the_cone() {
        let lattice = Lattice::new(20_000);
        let axes = [
            [0.0, 0.0, 1.0],
            [0.0, 0.0, -1.0],
            [1.0, 0.0, 0.0],
            [-1.0, 1e-9, 0.0],
            [0.6, -0.48, 0.64],
            [-0.36, -0.48, -0.8],
        ];
        for axis in axes {
            for half in [0.01, 0.05, 0.3, 1.0, 2.0, 3.1] {
                let mut seen = vec![false; lattice.points.len()];
                lattice.candidates(axis, half, |i| seen[i] = true);
                for (i, p) in lattice.points.iter().enumerate() {
                    let inside = p[0] * axis[0] + p[1] * axis[1] + p[2] * axis[2] >= half.cos();
                    assert!(!inside || seen[i], "axis {axis:?}, half {half}: point {i}");
                }
            }
        }
    }

    #[test]
    fn cells_find_every_close_pair() {
        let pts: Vec<[f64; 3]> = (0..500)
            .map(|i| {
                let t = i as f64;
                [
                    (t * 0.37).sin() * 6.0,
                    (t * 0.73).cos() * 6.0,
                    (t * 0.11) % 5.0,
                ]
            })
            .collect();
        let cells = Cells::new(&pts, 1.5);
        for (i, p) in pts.iter().enumerate() {
            let near: Vec<usize> = cells.near(*p).collect();
            for (j, q) in pts.iter().enumerate() {
                let d =
                    ((p[0] - q[0]).powi(2) + (p[1] - q[1]).powi(2) + (p[2] - q[2]).powi(2)).sqrt();
                assert!(d > 1.5 || near.contains(&j), "{i} {j} at {d}");
            }
        }
    }
}

//! Steric descriptors of a ligand from its 3-D structure, seen from the metal:
//! the exact cone angle (Bilbrey, Kazez, Locklin & Allen, J. Comput. Chem. 2013, 34, 1189:
//! the smallest cone from the metal that contains every atom's van der Waals sphere), the
//! solid angle and G parameter (Guzei & Wendt, Dalton Trans. 2006, 3991: the share of the
//! sphere around the metal the ligand shades), the percent buried volume (Hillier et al.,
//! Organometallics 2003, 22, 4322; Clavier & Nolan, Chem. Commun. 2010, 46, 841: the share of a
//! 3.5 Å sphere around the metal inside the ligand's atoms, Bondi radii scaled by 1.17), and a
//! steric map seen down the metal-donor axis.

use super::cells::{Cells, Lattice};
use super::element;
use super::structure::Atom;

/// Bondi's van der Waals radii (J. Phys. Chem. 1964, 68, 441), Å; boron from Mantina et al.,
/// J. Phys. Chem. A 2009, 113, 5806. Unknown elements get 2.0 Å.
pub fn vdw_radius(symbol: &str) -> f64 {
    match symbol {
        "H" => 1.20,
        "B" => 1.92,
        "C" => 1.70,
        "N" => 1.55,
        "O" => 1.52,
        "F" => 1.47,
        "Si" => 2.10,
        "P" => 1.80,
        "S" => 1.80,
        "Cl" => 1.75,
        "As" => 1.85,
        "Se" => 1.90,
        "Br" => 1.85,
        "Sn" => 2.17,
        "Te" => 2.06,
        "I" => 1.98,
        _ => 2.0,
    }
}

/// Covalent radii for finding bonds (Cordero et al., Dalton Trans. 2008, 2832), Å.
fn covalent_radius(symbol: &str) -> f64 {
    match symbol {
        "H" => 0.31,
        "B" => 0.84,
        "C" => 0.76,
        "N" => 0.71,
        "O" => 0.66,
        "F" => 0.57,
        "Si" => 1.11,
        "P" => 1.07,
        "S" => 1.05,
        "Cl" => 1.02,
        "As" => 1.19,
        "Se" => 1.20,
        "Br" => 1.20,
        "I" => 1.39,
        _ => 1.40,
    }
}

fn sub(a: [f64; 3], b: [f64; 3]) -> [f64; 3] {
    [a[0] - b[0], a[1] - b[1], a[2] - b[2]]
}
fn dot(a: [f64; 3], b: [f64; 3]) -> f64 {
    a[0] * b[0] + a[1] * b[1] + a[2] * b[2]
}
fn norm(a: [f64; 3]) -> f64 {
    dot(a, a).sqrt()
}
fn scale(a: [f64; 3], s: f64) -> [f64; 3] {
    [a[0] * s, a[1] * s, a[2] * s]
}
fn unit(a: [f64; 3]) -> [f64; 3] {
    let n = norm(a);
    if n > 0.0 {
        scale(a, 1.0 / n)
    } else {
        [0.0, 0.0, 1.0]
    }
}
fn cross(a: [f64; 3], b: [f64; 3]) -> [f64; 3] {
    [
        a[1] * b[2] - a[2] * b[1],
        a[2] * b[0] - a[0] * b[2],
        a[0] * b[1] - a[1] * b[0],
    ]
}

/// The ligand as the metal sees it.
#[derive(Debug, Clone)]
pub struct Setup {
    pub metal: [f64; 3],
    /// Index of the donor atom in `atoms`.
    pub donor: usize,
    /// The ligand's atoms (the metal left out).
    pub atoms: Vec<Atom>,
    /// Whether the metal was placed by nonet (no metal in the file).
    pub dummy: bool,
    /// Metal-donor distance, Å.
    pub distance: f64,
    /// Atoms of the file not bonded to the donor's ligand (other ligands of a complex).
    pub left_out: usize,
    /// The donor's 1-based atom number in the file.
    pub donor_atom: usize,
}

/// Whether two atoms are bonded: closer than their covalent radii with 20% slack.
fn bonded(a: &Atom, b: &Atom) -> bool {
    norm(sub(a.pos, b.pos)) < bond_cutoff(a, b)
}

fn bond_cutoff(a: &Atom, b: &Atom) -> f64 {
    1.2 * (covalent_radius(&a.symbol) + covalent_radius(&b.symbol))
}

/// The longest bond `bonded` accepts (two atoms of the largest covalent radius), Å: the cell
/// size for finding bonds.
const LONGEST_BOND: f64 = 1.2 * 2.0 * 1.40;

/// Atoms closer than this are the same atom written twice (or a broken file), Å.
pub const CLASH: f64 = 0.1;

/// Shortest metal-donor distance taken as a bond, Å (as for --distance).
pub const SHORTEST_BOND: f64 = 1.0;

/// Most atoms one atom may be bonded to: a metal in a close-packed cluster has 12 metal
/// neighbours and a few ligands. More means atoms are packed closer than any molecule packs
/// them, and the bond graph would grow with the square of the atoms.
pub const MAX_NEIGHBOURS: usize = 24;

/// Each atom's bonded neighbours in file order, found through a cell list so the work grows
/// with the number of atoms, not its square. Atoms on top of each other are refused.
fn bond_graph(atoms: &[Atom]) -> Result<Vec<Vec<usize>>, String> {
    let pos: Vec<[f64; 3]> = atoms.iter().map(|a| a.pos).collect();
    let cells = Cells::new(&pos, LONGEST_BOND);
    let mut graph = vec![Vec::new(); atoms.len()];
    for (i, a) in atoms.iter().enumerate() {
        let mut near: Vec<usize> = cells.near(a.pos).filter(|&j| j != i).collect();
        near.sort_unstable();
        for j in near {
            let d = norm(sub(a.pos, atoms[j].pos));
            if d < CLASH {
                let (first, second) = (i.min(j), i.max(j));
                return Err(format!(
                    "atoms {} ({}) and {} ({}) are {d:.3} Å apart, on top of each other: the \
                     file holds an atom twice or is damaged; remove the duplicate",
                    first + 1,
                    atoms[first].symbol,
                    second + 1,
                    atoms[second].symbol
                ));
            }
            if d < bond_cutoff(a, &atoms[j]) {
                graph[i].push(j);
            }
        }
        if graph[i].len() > MAX_NEIGHBOURS {
            return Err(format!(
                "atom {} ({}) is within bonding distance of {} atoms (at most {MAX_NEIGHBOURS} \
                 make sense): atoms are packed closer than in any molecule; check the units \
                 (ångström) and the coordinates",
                i + 1,
                a.symbol,
                graph[i].len()
            ));
        }
    }
    Ok(graph)
}

/// Which atoms are joined to `start` by bonds, never passing through atom `barrier`.
fn bonded_to(graph: &[Vec<usize>], start: usize, barrier: usize) -> Vec<bool> {
    let mut seen = vec![false; graph.len()];
    seen[start] = true;
    let mut stack = vec![start];
    while let Some(i) = stack.pop() {
        for &j in &graph[i] {
            if !seen[j] && j != barrier {
                seen[j] = true;
                stack.push(j);
            }
        }
    }
    seen
}

/// Farthest a donor may sit from the metal in the file and still be bonded to it, Å (the
/// longest common M-L bonds, to heavy donors, are near 2.9 Å; common practice).
const BONDED: f64 = 3.2;

/// Find (or place) the metal and the donor. `donor` is a 1-based atom number of the file.
///
/// With `--donor`: the metal nearest the donor is used if it is bonded to it; otherwise the
/// ligand is free (it may hold a metal of its own, as a ferrocenylphosphine does) and a dummy
/// metal goes `distance` Å from the donor along its lone pair (opposite the mean of its
/// bonds). Without it, the first metal of the file binds the atom nearest to it. Only the
/// atoms bonded to the donor, not through the metal, form the ligand.
///
/// Refused: atoms on top of each other, a metal (nearly) on the donor's place, and a second
/// metal taken for the donor.
pub fn setup(atoms: &[Atom], donor: Option<usize>, distance: f64) -> Result<Setup, String> {
    if atoms.is_empty() {
        return Err("the structure has no atoms".into());
    }
    let graph = bond_graph(atoms)?;
    let is_metal: Vec<bool> = atoms
        .iter()
        .map(|a| element::by_symbol(&a.symbol).is_some())
        .collect();
    let far = |i: usize, j: usize| norm(sub(atoms[i].pos, atoms[j].pos));
    let (d, metal_at) = match donor {
        Some(d) => {
            if d == 0 || d > atoms.len() {
                return Err(format!(
                    "--donor {d}: the file has atoms 1 to {}",
                    atoms.len()
                ));
            }
            let d = d - 1;
            if is_metal[d] {
                return Err(format!(
                    "--donor {} is a metal ({}); give the ligand atom bonded to it",
                    d + 1,
                    atoms[d].symbol
                ));
            }
            let nearest = (0..atoms.len())
                .filter(|&m| is_metal[m])
                .min_by(|&a, &b| far(a, d).total_cmp(&far(b, d)));
            (d, nearest.filter(|&m| far(m, d) <= BONDED))
        }
        None => {
            let Some(m) = is_metal.iter().position(|&x| x) else {
                return Err("no metal in the file: say which atom binds with --donor N".into());
            };
            let d = (0..atoms.len())
                .filter(|&i| i != m)
                .min_by(|&a, &b| far(a, m).total_cmp(&far(b, m)))
                .ok_or("the structure has only the metal")?;
            if far(d, m) > BONDED {
                return Err(format!(
                    "the atom nearest the {} (atom {}, {}) is {:.2} Å away, too far to be \
                     bonded; say which atom binds with --donor N",
                    atoms[m].symbol,
                    d + 1,
                    atoms[d].symbol,
                    far(d, m)
                ));
            }
            if is_metal[d] {
                return Err(format!(
                    "the atom nearest the {} (atom {}) is another metal, {} (atom {}), {:.2} Å \
                     away: nonet measures a ligand, not a metal; say which ligand atom binds \
                     with --donor N",
                    atoms[m].symbol,
                    m + 1,
                    atoms[d].symbol,
                    d + 1,
                    far(d, m)
                ));
            }
            (d, Some(m))
        }
    };
    if let Some(m) = metal_at {
        if far(d, m) < SHORTEST_BOND {
            return Err(format!(
                "the {} (atom {}) sits {:.2} Å from the donor {} (atom {}), nearly on its \
                 place; a metal-donor bond is at least {SHORTEST_BOND} Å: check the coordinates",
                atoms[m].symbol,
                m + 1,
                far(d, m),
                atoms[d].symbol,
                d + 1
            ));
        }
    }
    // the ligand is what the donor holds without passing through the metal: other ligands of
    // a whole complex stay out of every descriptor
    let keep = bonded_to(&graph, d, metal_at.unwrap_or(usize::MAX));
    let ligand: Vec<Atom> = (0..atoms.len())
        .filter(|&i| keep[i])
        .map(|i| atoms[i].clone())
        .collect();
    let donor_in_ligand = (0..d).filter(|&i| keep[i]).count();
    let left_out = atoms.len() - ligand.len() - usize::from(metal_at.is_some());
    if let Some(m) = metal_at {
        return Ok(Setup {
            metal: atoms[m].pos,
            donor: donor_in_ligand,
            distance: far(d, m),
            atoms: ligand,
            dummy: false,
            left_out,
            donor_atom: d + 1,
        });
    }
    let p = atoms[d].pos;
    // the donor's neighbours, in file order (all of them are in the ligand)
    let bonds: Vec<[f64; 3]> = graph[d]
        .iter()
        .map(|&j| unit(sub(atoms[j].pos, p)))
        .collect();
    if bonds.is_empty() {
        return Err(format!(
            "atom {} has no bonded neighbours to point its lone pair away from",
            d + 1
        ));
    }
    let mean = bonds
        .iter()
        .fold([0.0; 3], |s, b| [s[0] + b[0], s[1] + b[1], s[2] + b[2]]);
    if norm(mean) < 1e-6 {
        return Err(format!(
            "atom {}'s bonds cancel out: its lone pair has no direction",
            d + 1
        ));
    }
    let lone_pair = scale(unit(mean), -1.0);
    Ok(Setup {
        metal: [
            p[0] + lone_pair[0] * distance,
            p[1] + lone_pair[1] * distance,
            p[2] + lone_pair[2] * distance,
        ],
        donor: donor_in_ligand,
        atoms: ligand,
        dummy: true,
        distance,
        left_out,
        donor_atom: d + 1,
    })
}

/// Each atom's direction from the metal and the half-angle its sphere fills. The donor atom
/// is left out: it touches the metal, and the cone is drawn around the substituents beyond it,
/// as Tolman drew his.
fn cones(s: &Setup, radius: &dyn Fn(&str) -> f64) -> Result<Vec<([f64; 3], f64)>, String> {
    s.atoms
        .iter()
        .enumerate()
        .filter(|(i, _)| *i != s.donor)
        .map(|(_, a)| {
            let v = sub(a.pos, s.metal);
            let d = norm(v);
            let r = radius(&a.symbol);
            if d <= r {
                return Err(format!(
                    "the metal lies inside the van der Waals sphere of a {} atom {:.2} Å away: \
                     is the donor (atom {}) the atom that binds? Choose it with --donor N",
                    a.symbol, d, s.donor_atom
                ));
            }
            Ok((unit(v), (r / d).asin()))
        })
        .collect()
}

/// Half-angle of the narrowest cone about `axis` that holds every atom sphere.
fn spread(axis: [f64; 3], cones: &[([f64; 3], f64)]) -> f64 {
    cones
        .iter()
        .map(|(u, a)| dot(axis, *u).clamp(-1.0, 1.0).acos() + a)
        .fold(0.0, f64::max)
}

/// The exact cone angle in degrees: the smallest cone with its apex at the metal that holds
/// all atoms' van der Waals spheres (Bondi radii), found by minimising the widest atom angle
/// over cone axes (Nelder-Mead on the tangent plane, from the metal-donor axis and a few
/// other starts).
pub fn exact_cone_angle(s: &Setup) -> Result<f64, String> {
    let cones = cones(s, &vdw_radius)?;
    let base = unit(sub(s.atoms[s.donor].pos, s.metal));
    let helper = if base[0].abs() < 0.9 {
        [1.0, 0.0, 0.0]
    } else {
        [0.0, 1.0, 0.0]
    };
    let e1 = unit(cross(base, helper));
    let e2 = cross(base, e1);
    let axis = |p: [f64; 2]| {
        unit([
            base[0] + p[0] * e1[0] + p[1] * e2[0],
            base[1] + p[0] * e1[1] + p[1] * e2[1],
            base[2] + p[0] * e1[2] + p[1] * e2[2],
        ])
    };
    let f = |p: [f64; 2]| spread(axis(p), &cones);
    let mut best = f([0.0, 0.0]);
    for start in [[0.0, 0.0], [0.3, 0.0], [-0.3, 0.0], [0.0, 0.3], [0.0, -0.3]] {
        best = best.min(nelder_mead(&f, start, 0.2));
    }
    Ok((2.0 * best).to_degrees())
}

/// Minimise f over the plane; returns the least value found.
fn nelder_mead(f: &dyn Fn([f64; 2]) -> f64, start: [f64; 2], step: f64) -> f64 {
    let mut pts = [
        start,
        [start[0] + step, start[1]],
        [start[0], start[1] + step],
    ];
    let mut vals = pts.map(f);
    for _ in 0..2000 {
        let mut idx = [0usize, 1, 2];
        idx.sort_by(|&a, &b| vals[a].total_cmp(&vals[b]));
        let (b, m, w) = (idx[0], idx[1], idx[2]);
        if (vals[w] - vals[b]).abs() < 1e-12 {
            break;
        }
        let c = [(pts[b][0] + pts[m][0]) / 2.0, (pts[b][1] + pts[m][1]) / 2.0];
        let refl = [2.0 * c[0] - pts[w][0], 2.0 * c[1] - pts[w][1]];
        let fr = f(refl);
        if fr < vals[b] {
            let exp = [3.0 * c[0] - 2.0 * pts[w][0], 3.0 * c[1] - 2.0 * pts[w][1]];
            let fe = f(exp);
            if fe < fr {
                pts[w] = exp;
                vals[w] = fe;
            } else {
                pts[w] = refl;
                vals[w] = fr;
            }
        } else if fr < vals[m] {
            pts[w] = refl;
            vals[w] = fr;
        } else {
            let con = [(c[0] + pts[w][0]) / 2.0, (c[1] + pts[w][1]) / 2.0];
            let fc = f(con);
            if fc < vals[w] {
                pts[w] = con;
                vals[w] = fc;
            } else {
                for i in [m, w] {
                    pts[i] = [(pts[i][0] + pts[b][0]) / 2.0, (pts[i][1] + pts[b][1]) / 2.0];
                    vals[i] = f(pts[i]);
                }
            }
        }
    }
    vals.iter().copied().fold(f64::INFINITY, f64::min)
}

/// Solid angle of the ligand's shadow on a sphere around the metal (steradians) and the G
/// parameter, 100 Ω/4π, from 200,000 evenly spread directions; overlapping shadows count once.
/// Each atom visits only the directions near its own cone, so the work grows with the atoms'
/// shadows, not with atoms times directions.
pub fn solid_angle(s: &Setup) -> Result<(f64, f64), String> {
    let cones = cones(s, &vdw_radius)?;
    let lattice = Lattice::new(200_000);
    let mut shaded = vec![false; lattice.points.len()];
    for (u, a) in &cones {
        let cos_a = a.cos();
        lattice.candidates(*u, *a, |i| {
            if !shaded[i] && dot(lattice.points[i], *u) >= cos_a {
                shaded[i] = true;
            }
        });
    }
    let hit = shaded.iter().filter(|&&x| x).count();
    let fraction = hit as f64 / lattice.points.len() as f64;
    Ok((4.0 * std::f64::consts::PI * fraction, 100.0 * fraction))
}

/// Percent buried volume and the steric map.
#[derive(Debug, Clone)]
pub struct Buried {
    pub percent: f64,
    /// Buried percentage of each quadrant seen down the metal-donor axis: (+x,+y), (-x,+y),
    /// (-x,-y), (+x,-y).
    pub quadrants: [f64; 4],
    /// Rows of the map (top to bottom): the buried share of each column of the sphere, 0 to 1,
    /// or None outside the sphere's outline.
    pub map: Vec<Vec<Option<f64>>>,
}

/// The map's +x axis: toward the first atom bonded to the donor (in file order), seen down the
/// metal-donor axis `z`, so quadrants do not depend on how the file is oriented.
fn frame_x(s: &Setup, z: [f64; 3]) -> [f64; 3] {
    let donor = &s.atoms[s.donor];
    let p = donor.pos;
    s.atoms
        .iter()
        .enumerate()
        .filter(|(i, a)| *i != s.donor && bonded(a, donor))
        .map(|(_, a)| {
            let v = sub(a.pos, p);
            sub(v, scale(z, dot(v, z)))
        })
        .find(|v| norm(*v) > 0.1)
        .map_or_else(
            || {
                let helper = if z[0].abs() < 0.9 {
                    [1.0, 0.0, 0.0]
                } else {
                    [0.0, 1.0, 0.0]
                };
                unit(cross(helper, z))
            },
            unit,
        )
}

/// %Vbur in a sphere of `radius` Å around the metal, atoms at `scale` times their Bondi radius,
/// hydrogens included or not; grid spacing 0.1 Å.
pub fn buried_volume(
    s: &Setup,
    radius: f64,
    scale_radii: f64,
    hydrogens: bool,
    map_size: usize,
) -> Buried {
    let z = unit(sub(s.atoms[s.donor].pos, s.metal));
    let x = frame_x(s, z);
    let y = cross(z, x);
    // only atoms whose sphere reaches into the metal's sphere can bury a grid point
    let spheres: Vec<([f64; 3], f64)> = s
        .atoms
        .iter()
        .filter(|a| hydrogens || a.symbol != "H")
        .filter_map(|a| {
            let v = sub(a.pos, s.metal);
            let r = vdw_radius(&a.symbol) * scale_radii;
            (norm(v) <= radius + r + 1e-9).then(|| ([dot(v, x), dot(v, y), dot(v, z)], r * r))
        })
        .collect();
    let step = 0.1;
    let n = (radius / step).ceil() as i64;
    let cells = map_size.max(1);
    let mut col_total = vec![vec![0u32; cells]; cells];
    let mut col_buried = vec![vec![0u32; cells]; cells];
    let (mut total, mut buried) = (0u64, 0u64);
    let mut quad = [(0u64, 0u64); 4];
    for i in -n..=n {
        for j in -n..=n {
            for k in -n..=n {
                let p = [i as f64 * step, j as f64 * step, k as f64 * step];
                if dot(p, p) > radius * radius {
                    continue;
                }
                let inside = spheres.iter().any(|(c, r2)| {
                    let d = sub(p, *c);
                    dot(d, d) <= *r2
                });
                total += 1;
                buried += inside as u64;
                let q = match (p[0] >= 0.0, p[1] >= 0.0) {
                    (true, true) => 0,
                    (false, true) => 1,
                    (false, false) => 2,
                    (true, false) => 3,
                };
                quad[q].0 += 1;
                quad[q].1 += inside as u64;
                let cx = (((p[0] + radius) / (2.0 * radius)) * cells as f64).floor() as usize;
                let cy = (((radius - p[1]) / (2.0 * radius)) * cells as f64).floor() as usize;
                if cx < cells && cy < cells {
                    col_total[cy][cx] += 1;
                    col_buried[cy][cx] += inside as u32;
                }
            }
        }
    }
    let pct = |b: u64, t: u64| {
        if t == 0 {
            0.0
        } else {
            100.0 * b as f64 / t as f64
        }
    };
    Buried {
        percent: pct(buried, total),
        quadrants: quad.map(|(t, b)| pct(b, t)),
        map: (0..cells)
            .map(|r| {
                (0..cells)
                    .map(|c| {
                        (col_total[r][c] > 0)
                            .then(|| col_buried[r][c] as f64 / col_total[r][c] as f64)
                    })
                    .collect()
            })
            .collect(),
    }
}

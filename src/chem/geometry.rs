//! Where each ligand of a mononuclear complex sits: the coordination polyhedron chosen from
//! the coordination number, the d count and the ligand types, the complex's stereoisomers on
//! it, and which of them a written prefix (`cis-`, `mer-`, `Δ-`, `OC-6-24-A`) fixes.
//!
//! Choices (Miessler, Fischer & Tarr, Inorganic Chemistry, 5th ed., 2014, ch. 9-10; Crabtree,
//! The Organometallic Chemistry of the Transition Metals, 6th ed., 2014, ch. 1-5):
//! four-coordinate d8 square planar where the spin guess says so, else tetrahedral; five-
//! coordinate d6 (16 e) square pyramidal, other five-coordinate trigonal bipyramidal; six
//! octahedral; seven pentagonal bipyramidal. A half-sandwich ring holds three facial positions
//! of an octahedron (the three-legged piano stool) or the apex of a square pyramid (four legs);
//! two rings are taken at their centroids (linear sandwich, bent metallocene pseudo-
//! tetrahedral). Pincers span meridional positions, tripods and scorpionates facial ones,
//! planar macrocycles a square.
//!
//! Priorities for the IUPAC descriptors approximate the CIP rules: the donor atom's atomic
//! number, then its substituents' atomic numbers, then the ligand's size; two different
//! ligands never share a priority number.

use super::complex::{BoundLigand, Complex};
use super::count::Report;
use super::descriptor;
use super::isomers::{enumerate, Isomer, Part, Seat};
use super::periodic;
use super::polyhedron::Polyhedron;

/// One kind of donor end in the frame: a letter of the isomer notation.
#[derive(Debug, Clone, PartialEq)]
pub struct Donor {
    pub letter: char,
    /// Index of the ligand group in `Frame::ligands`.
    pub group: usize,
    /// The donor atom's symbol ("P", "Cl", "C").
    pub atom: &'static str,
    /// IUPAC priority number, 1 the most preferred.
    pub priority: u8,
}

/// A mononuclear complex laid out for its isomers.
#[derive(Debug, Clone)]
pub struct Frame {
    pub poly: &'static Polyhedron,
    /// How a pseudo-polyhedron stands in for a ring, when one does.
    pub pseudo: Option<&'static str>,
    pub parts: Vec<Part>,
    /// The ligand groups, as in the complex.
    pub ligands: Vec<BoundLigand>,
    pub donors: Vec<Donor>,
}

/// A complex's isomers and which of them its prefix fixes.
#[derive(Debug, Clone)]
pub struct Placed {
    pub frame: Frame,
    pub isomers: std::sync::Arc<Vec<Isomer>>,
    /// Each isomer's IUPAC descriptor, in the same order.
    pub descriptors: std::sync::Arc<Vec<String>>,
    /// Indices into `isomers` the written prefix allows (all of them when there is none).
    pub chosen: Vec<usize>,
    pub notes: Vec<String>,
}

impl Placed {
    /// The one isomer the prefix fixes, if it fixes one.
    pub fn fixed(&self) -> Option<&Isomer> {
        match self.chosen.as_slice() {
            [i] => self.isomers.get(*i),
            _ => None,
        }
    }
}

/// Lay out the complex; Err says why it has no polyhedron in nonet (polynuclear, a ligand of
/// a shape nonet does not place, a coordination number without a model).
pub fn frame(complex: &Complex, report: &Report) -> Result<Frame, String> {
    if complex.metal_count() != 1 {
        return Err("positions are worked out for mononuclear complexes only".into());
    }
    let ligands: Vec<BoundLigand> = complex.all_ligands().map(|(_, b)| b.clone()).collect();
    if ligands.iter().any(|b| b.mode().bridges > 1) {
        return Err("a bridging ligand on one metal has no position model".into());
    }
    let rings: u32 = ligands.iter().filter(|b| is_ring(b)).map(|b| b.count).sum();
    let legs: usize = ligands
        .iter()
        .filter(|b| !is_ring(b))
        .map(|b| b.mode().sites as usize * b.count as usize)
        .sum();
    let (poly, pseudo, ring_as_face) = match rings {
        0 => (plain_polyhedron(legs, report)?, None, false),
        1 => match legs {
            3 => (
                poly("OC-6"),
                Some("pseudo-octahedral: the ring holds three facial positions (a three-legged piano stool)"),
                true,
            ),
            4 => (
                poly("SPY-5"),
                Some("pseudo-square-pyramidal: the ring centroid at the apex (a four-legged piano stool)"),
                false,
            ),
            2 => (
                poly("TP-3"),
                Some("pseudo-trigonal: the ring centroid and two legs"),
                false,
            ),
            1 => (
                poly("L-2"),
                Some("pseudo-linear: the ring centroid opposite one leg"),
                false,
            ),
            n => return Err(format!("a half-sandwich with {n} legs has no position model")),
        },
        2 => match legs {
            0 => (
                poly("L-2"),
                Some("sandwich: the two ring centroids opposite each other"),
                false,
            ),
            1 => (
                poly("TP-3"),
                Some("bent sandwich: two ring centroids and one ligand"),
                false,
            ),
            2 => (
                poly("T-4"),
                Some("bent metallocene: pseudo-tetrahedral, the ring centroids at two vertices"),
                false,
            ),
            n => return Err(format!("a bent metallocene with {n} ligands in the wedge has no position model")),
        },
        _ => return Err("three or more rings have no position model".into()),
    };
    // one entry per ligand copy: (group, shape, donor atoms by end)
    let mut units: Vec<(usize, Shape, Vec<DonorKey>)> = Vec::new();
    for (g, b) in ligands.iter().enumerate() {
        let shape = if is_ring(b) {
            if ring_as_face {
                Shape::Fac
            } else {
                Shape::Mono
            }
        } else {
            match b.mode().sites {
                1 => Shape::Mono,
                2 => Shape::Chelate,
                3 if b.ligand.family == "pincer" => Shape::Mer,
                3 => Shape::Fac,
                4 if b.ligand.traits.macrocycle => Shape::Square,
                n => {
                    return Err(format!(
                        "{} binding {} positions has no position model",
                        b.ligand.key, n
                    ))
                }
            }
        };
        let ends = donor_keys(b, shape);
        for _ in 0..b.count {
            units.push((g, shape, ends.clone()));
        }
    }
    // letters by priority: every distinct (group, donor) is one kind of donor
    let mut kinds: Vec<(DonorKey, usize)> = Vec::new();
    for (g, _, ends) in &units {
        for e in ends {
            if !kinds.iter().any(|(k, kg)| k == e && kg == g) {
                kinds.push((e.clone(), *g));
            }
        }
    }
    kinds.sort_by(|a, b| {
        a.0.rank(&b.0)
            .then_with(|| ligands[a.1].ligand.key.cmp(&ligands[b.1].ligand.key))
            .then_with(|| a.1.cmp(&b.1))
    });
    if kinds.len() > 26 {
        return Err("more than 26 kinds of donor".into());
    }
    let donors: Vec<Donor> = kinds
        .iter()
        .enumerate()
        .map(|(i, (k, g))| Donor {
            letter: char::from(b'a' + i as u8),
            group: *g,
            atom: periodic::symbol(k.z),
            priority: i as u8 + 1,
        })
        .collect();
    let letter = |g: usize, k: &DonorKey| -> char {
        kinds
            .iter()
            .position(|(kk, kg)| kk == k && *kg == g)
            .map_or('?', |i| char::from(b'a' + i as u8))
    };
    let parts: Vec<Part> = units
        .iter()
        .map(|(g, shape, ends)| {
            let l: Vec<char> = ends.iter().map(|e| letter(*g, e)).collect();
            let at = |i: usize| l.get(i).copied().unwrap_or('?');
            match shape {
                Shape::Mono => Part::Mono(at(0)),
                Shape::Chelate => match ligands[*g].ligand.bite_angle.as_ref() {
                    Some(b) => Part::Bite(at(0), at(1), b.value.round().clamp(1.0, 180.0) as u8),
                    None => Part::Chelate(at(0), at(1)),
                },
                Shape::Mer => Part::Mer(at(0), at(1), at(2)),
                Shape::Fac => Part::Fac(at(0), at(1), at(2)),
                Shape::Square => Part::Square(at(0)),
            }
        })
        .collect();
    Ok(Frame {
        poly,
        pseudo,
        parts,
        ligands,
        donors,
    })
}

/// A polyhedron nonet models, by symbol.
fn poly(symbol: &str) -> &'static Polyhedron {
    match Polyhedron::shared(symbol) {
        Some(p) => p,
        // every symbol named in this module is in `Polyhedron::all`
        None => &Polyhedron::all()[0],
    }
}

fn is_ring(b: &BoundLigand) -> bool {
    b.mode().hapticity().is_some_and(|h| h >= 5)
}

#[derive(Debug, Clone, Copy, PartialEq)]
enum Shape {
    Mono,
    Chelate,
    Mer,
    Fac,
    Square,
}

/// The polyhedron of a complex without rings, from its positions and the spin guess's
/// geometry (which already weighs d count, metal and ligand field for four-coordination).
fn plain_polyhedron(positions: usize, report: &Report) -> Result<&'static Polyhedron, String> {
    let d = report.metals.first().and_then(|m| m.d_electrons.as_int());
    Ok(match positions {
        2 => poly("L-2"),
        3 if report.geometry == "T-shaped" => poly("TS-3"),
        3 => poly("TP-3"),
        4 if report.geometry == "square planar" => poly("SP-4"),
        4 => poly("T-4"),
        // five-coordinate d6 (16 e) is square pyramidal, as is a macrocycle with one axial
        // ligand; the rest trigonal bipyramidal (common practice)
        5 if d == Some(6) || report.geometry == "square pyramidal" => poly("SPY-5"),
        5 => poly("TBPY-5"),
        6 => poly("OC-6"),
        7 => poly("PBPY-7"),
        n => {
            return Err(format!(
                "coordination number {n} has no position model in nonet"
            ))
        }
    })
}

/// What ranks a donor end: its atomic number, its substituents' atomic numbers (highest
/// first, a double bond counting its partner twice), the ligand's size.
#[derive(Debug, Clone, PartialEq, Eq)]
struct DonorKey {
    z: u8,
    sphere: Vec<u8>,
    size: u32,
}

impl DonorKey {
    /// Most preferred first.
    fn rank(&self, other: &DonorKey) -> std::cmp::Ordering {
        other
            .z
            .cmp(&self.z)
            .then_with(|| other.sphere.cmp(&self.sphere))
            .then_with(|| other.size.cmp(&self.size))
    }
}

/// The donor atoms of one copy of the ligand, one per end: [end] for a monodentate ligand or
/// a ring, [end, end] for a chelate, [end, middle, end] for a pincer.
fn donor_keys(b: &BoundLigand, shape: Shape) -> Vec<DonorKey> {
    let n = match shape {
        Shape::Mono => 1,
        Shape::Chelate => 2,
        Shape::Mer | Shape::Fac => 3,
        Shape::Square => 1,
    };
    let Some(m) = b.ligand.structure.as_deref() else {
        let z = super::element::symbol_prefix(&b.ligand.key)
            .map(|e| e.number)
            .unwrap_or(periodic::C);
        return vec![
            DonorKey {
                z,
                sphere: Vec::new(),
                size: 0
            };
            n
        ];
    };
    let size: u32 = m
        .atoms
        .iter()
        .filter(|a| !a.is_star())
        .map(|a| u32::from(a.z) + u32::from(a.h))
        .sum();
    let key = |i: usize| -> DonorKey {
        let mut sphere: Vec<u8> = Vec::new();
        for (j, order) in m.neighbors(i) {
            let a = m.atoms[j];
            if a.is_star() {
                continue;
            }
            let times = if (2..=3).contains(&order) { order } else { 1 };
            sphere.extend(std::iter::repeat_n(a.z, times as usize));
        }
        sphere.extend(std::iter::repeat_n(1u8, m.atoms[i].h as usize));
        sphere.sort_unstable_by(|a, b| b.cmp(a));
        DonorKey {
            z: m.atoms[i].z,
            sphere,
            size,
        }
    };
    let hapto = b.mode().hapticity().is_some();
    let mut chosen: Vec<usize> = if hapto {
        Vec::new()
    } else {
        m.metal_bonds().into_iter().map(|(i, _)| i).collect()
    };
    chosen.dedup();
    if !hapto {
        // lone-pair donors for the other ends, soft before hard as they bind
        for z in [15u8, 33, periodic::N, periodic::S, 34, periodic::O] {
            for i in 0..m.atoms.len() {
                if chosen.len() >= n {
                    break;
                }
                let a = m.atoms[i];
                if a.z == z && a.charge <= 0 && !chosen.contains(&i) && lone_pair(m, i) {
                    chosen.push(i);
                }
            }
        }
    }
    if chosen.is_empty() && !hapto {
        // a carbon donor not marked in the SMILES (CO, an isocyanide, a carbene): the carbon
        // with a lone pair, i.e. the one short of four bonds or carrying a negative charge
        let open = |i: usize| -> i32 {
            let a = m.atoms[i];
            let used: i32 = m
                .neighbors(i)
                .map(|(_, o)| i32::from(o.min(3)))
                .sum::<i32>()
                + i32::from(a.h);
            4 - used - i32::from(a.charge) * 2
        };
        if let Some(i) = (0..m.atoms.len())
            .filter(|&i| m.atoms[i].z == periodic::C && !m.atoms[i].aromatic)
            .max_by_key(|&i| (open(i), std::cmp::Reverse(i)))
            .filter(|&i| open(i) > 0)
        {
            chosen.push(i);
        }
    }
    let mut keys: Vec<DonorKey> = chosen.into_iter().take(n).map(key).collect();
    if keys.is_empty() {
        // a π ligand or a carbon donor without a marked atom: a carbon end
        keys.push(DonorKey {
            z: periodic::C,
            sphere: Vec::new(),
            size,
        });
    }
    while keys.len() < n {
        let last = keys[keys.len() - 1].clone();
        keys.push(last);
    }
    // ends of one ligand on the same element count as alike (the two O of acac, the two N
    // of bpy): their difference is a resonance form or a remote substituent, not a donor
    for i in 1..keys.len() {
        if let Some(j) = (0..i).find(|&j| keys[j].z == keys[i].z) {
            keys[i] = keys[j].clone();
        }
    }
    if shape == Shape::Mer {
        // the odd one out sits in the middle (the N of PNP, the C of PCP)
        if keys[0] == keys[2] && keys[1] != keys[0] {
        } else if keys[0] == keys[1] && keys[2] != keys[0] {
            keys.swap(1, 2);
        } else if keys[1] == keys[2] && keys[0] != keys[1] {
            keys.swap(0, 1);
        }
    }
    keys
}

/// An atom that can give a lone pair: not bonded by a multiple bond to carbon (nitriles and
/// imines count), not already four-bonded.
fn lone_pair(m: &super::molecule::Molecule, i: usize) -> bool {
    let a = m.atoms[i];
    let bonds: u8 = m.neighbors(i).map(|(_, o)| o.min(3)).sum::<u8>() + a.h;
    match a.z {
        15 | 33 => bonds <= 3,
        7 => bonds <= 3 || a.aromatic,
        _ => true,
    }
}

impl Frame {
    /// The priority number of a letter.
    pub fn priority(&self, letter: char) -> u8 {
        self.donors
            .iter()
            .find(|d| d.letter == letter)
            .map_or(9, |d| d.priority)
    }

    pub fn donor(&self, letter: char) -> Option<&Donor> {
        self.donors.iter().find(|d| d.letter == letter)
    }

    /// The IUPAC descriptor of an isomer ("OC-6-24-A").
    pub fn descriptor(&self, iso: &Isomer) -> String {
        let mut d = descriptor::descriptor(self.poly, &iso.seats, &|c| self.priority(c));
        // chelates alike at every end leave C/A silent: the skew-lines symbol tells the
        // enantiomers apart (IR-9.3.4.11)
        if iso.chiral && !d.ends_with("-C") && !d.ends_with("-A") {
            if let Some(h) = iso.configuration(self.poly) {
                d.push('-');
                d.push_str(h);
            }
        }
        d
    }

    /// The trade's words for the isomer: cis or trans for the pair of like monodentate
    /// donors of highest priority, fac or mer for three, Δ or Λ for chiral chelate
    /// complexes.
    pub fn short_names(&self, iso: &Isomer) -> Vec<&'static str> {
        let mut names = Vec::new();
        let poly = &self.poly;
        let groups = self.mono_groups(iso);
        if matches!(poly.symbol, "SP-4" | "OC-6" | "TBPY-5" | "SPY-5" | "PBPY-7") {
            if let Some(pair) = groups.iter().find(|g| g.len() == 2) {
                names.push(if poly.is_trans(pair[0], pair[1]) {
                    "trans"
                } else {
                    "cis"
                });
            }
        }
        if poly.symbol == "OC-6" {
            if let Some(three) = groups.iter().find(|g| g.len() == 3) {
                let mer = three
                    .iter()
                    .enumerate()
                    .any(|(k, &a)| three[k + 1..].iter().any(|&b| poly.is_trans(a, b)));
                names.push(if mer { "mer" } else { "fac" });
            }
        }
        if let Some(h) = iso.configuration(poly) {
            names.push(h);
        }
        names
    }

    /// Positions of each kind of like donor, in priority order: monodentate donors first,
    /// then like ends of separate polydentate ligands (the three C of fac-Ir(ppy)3); ends
    /// that belong to one ligand are not a set the trade names.
    fn mono_groups(&self, iso: &Isomer) -> Vec<Vec<u8>> {
        let mut mono: Vec<Vec<u8>> = Vec::new();
        let mut ends: Vec<Vec<u8>> = Vec::new();
        for d in &self.donors {
            let at: Vec<u8> = iso
                .seats
                .iter()
                .enumerate()
                .filter(|(_, s)| s.0 == d.letter)
                .map(|(i, _)| i as u8)
                .collect();
            if at.is_empty() {
                continue;
            }
            let groups: Vec<Option<u8>> = at.iter().map(|&p| iso.seats[p as usize].1).collect();
            if groups.iter().all(Option::is_none) {
                mono.push(at);
            } else if groups.iter().all(Option::is_some)
                && (1..groups.len()).all(|k| !groups[..k].contains(&groups[k]))
            {
                ends.push(at);
            }
        }
        mono.extend(ends);
        mono
    }

    /// The positions each ligand group holds in an isomer: per copy, its positions.
    pub fn positions(&self, iso: &Isomer) -> Vec<Vec<Vec<u8>>> {
        let mut out: Vec<Vec<Vec<u8>>> = vec![Vec::new(); self.ligands.len()];
        let mut done = vec![false; iso.seats.len()];
        for (i, &(c, group)) in iso.seats.iter().enumerate() {
            if done[i] {
                continue;
            }
            let Some(d) = self.donor(c) else { continue };
            let copy: Vec<u8> = match group {
                None => vec![i as u8],
                Some(low) => (0..iso.seats.len())
                    .filter(|&j| iso.seats[j].1 == Some(low))
                    .map(|j| j as u8)
                    .collect(),
            };
            for &p in &copy {
                done[p as usize] = true;
            }
            out[d.group].push(copy);
        }
        out
    }

    /// What sits at a position, as the ligand key with its donor atom when the ligand has
    /// more than one ("PNP:N").
    pub fn seat_label(&self, seat: &Seat) -> String {
        let Some(d) = self.donor(seat.0) else {
            return "?".into();
        };
        let b = &self.ligands[d.group];
        let ends = self.donors.iter().filter(|o| o.group == d.group).count();
        if ends > 1 {
            format!("{}:{}", b.ligand.key, d.atom)
        } else {
            b.ligand.key.clone()
        }
    }

    /// Whether a written token names this isomer: a descriptor (or its leading part), or
    /// one of the trade's words.
    pub fn matches(&self, iso: &Isomer, descriptor: &str, token: &str) -> Option<bool> {
        let t = descriptor::normalize(token);
        let word = token.trim().to_lowercase();
        let word = match word.as_str() {
            "delta" | "Δ" | "δ" => "Δ",
            "lambda" | "Λ" | "λ" => "Λ",
            w => w,
        };
        if matches!(word, "cis" | "trans" | "fac" | "mer" | "Δ" | "Λ") {
            return Some(self.short_names(iso).contains(&word));
        }
        if Polyhedron::all()
            .iter()
            .any(|p| t == p.symbol || t.starts_with(&format!("{}-", p.symbol)))
        {
            let d = descriptor;
            return Some(d == t || d.starts_with(&format!("{t}-")));
        }
        None
    }
}

thread_local! {
    /// Isomers by polyhedron and composition in letters: a batch of formulas repeats few
    /// compositions (Ma4b2, M(AA)3), so each is enumerated once.
    static ISOMERS: std::cell::RefCell<std::collections::HashMap<(&'static str, Vec<Part>), Listing>> =
        std::cell::RefCell::new(std::collections::HashMap::new());
}

/// Isomers with their descriptors. Letters are given in priority order (a is 1), so the
/// descriptors depend on the letters alone and are kept with the isomers.
type Listing = (std::sync::Arc<Vec<Isomer>>, std::sync::Arc<Vec<String>>);

fn enumerate_cached(frame: &Frame) -> Result<Listing, String> {
    let key = (frame.poly.symbol, frame.parts.clone());
    if let Some(hit) = ISOMERS.with(|c| c.borrow().get(&key).cloned()) {
        return Ok(hit);
    }
    let isomers = enumerate(frame.poly, &frame.parts).map_err(|e| e.to_string())?;
    let names: Vec<String> = isomers.iter().map(|i| frame.descriptor(i)).collect();
    let list: Listing = (std::sync::Arc::new(isomers), std::sync::Arc::new(names));
    ISOMERS.with(|c| {
        let mut c = c.borrow_mut();
        if c.len() >= 4096 {
            c.clear();
        }
        c.insert(key, list.clone());
    });
    Ok(list)
}

/// Lay out the complex and read its prefix. Words of the prefix nonet does not place (rac,
/// (R,R), a ligand's own configuration) are left as written, with a note.
pub fn place(complex: &Complex, report: &Report) -> Result<Placed, String> {
    let frame = frame(complex, report)?;
    let (isomers, descriptors) = enumerate_cached(&frame)?;
    let mut chosen: Vec<usize> = (0..isomers.len()).collect();
    let mut notes = Vec::new();
    if let Some(stereo) = &complex.stereo {
        for token in stereo
            .split([',', ' ', ';'])
            .map(str::trim)
            .filter(|t| !t.is_empty())
        {
            let hits: Vec<Option<bool>> = isomers
                .iter()
                .zip(descriptors.iter())
                .map(|(i, d)| frame.matches(i, d, token))
                .collect();
            if hits.iter().all(Option::is_none) {
                notes.push(format!(
                    "'{token}' does not fix positions; every isomer is kept"
                ));
                continue;
            }
            let keep: Vec<usize> = chosen
                .iter()
                .copied()
                .filter(|&i| hits[i] == Some(true))
                .collect();
            if keep.is_empty() {
                notes.push(format!(
                    "no {} isomer of this complex is '{token}'; the prefix is set aside",
                    frame.poly.symbol
                ));
            } else {
                chosen = keep;
            }
        }
    }
    if let Some(p) = frame.pseudo {
        notes.push(p.to_string());
    }
    Ok(Placed {
        frame,
        isomers,
        descriptors,
        chosen,
        notes,
    })
}

/// The name a fixed isomer is written with: the trade's short names when they single it out
/// among all its isomers ("trans", "mer,trans", "fac"), else the IUPAC descriptor, so that
/// the same isomer is always written the same way.
pub fn label(placed: &Placed, i: usize) -> String {
    let short = |k: usize| -> Vec<&'static str> {
        let mut n = placed.frame.short_names(&placed.isomers[k]);
        // fac/mer first, as the trade writes "mer,trans"
        n.sort_by_key(|w| match *w {
            "fac" | "mer" => 0,
            "cis" | "trans" => 1,
            _ => 2,
        });
        n
    };
    let mine = short(i);
    if !mine.is_empty()
        && (0..placed.isomers.len())
            .filter(|&k| short(k) == mine)
            .count()
            == 1
    {
        return mine.join(",");
    }
    placed.descriptors.get(i).cloned().unwrap_or_default()
}

/// Write a prefix that fixes one isomer the one way `label` writes it ("SP-4-1-" and
/// "trans-" are the same isomer of [PtCl2(NH3)2]); a prefix that fixes none or several is
/// kept as typed.
pub fn settle(complex: &mut Complex) {
    if complex.stereo.is_none() || complex.metal_count() != 1 {
        return;
    }
    let report = super::count::count(complex);
    if let Ok(p) = place(complex, &report) {
        if let [i] = p.chosen.as_slice() {
            if p.isomers.len() > 1 && p.notes.iter().all(|n| !n.contains("does not fix")) {
                complex.stereo = Some(label(&p, *i));
            }
        }
    }
}

/// The count with the polyhedron and, where fixed, the isomer and positions filled in.
pub fn counted(complex: &Complex) -> Report {
    let mut r = super::count::count(complex);
    annotate(complex, &mut r);
    r
}

/// Fill in the count's polyhedron, the number of stereoisomers, and, when the prefix or the
/// composition fixes the isomer, its descriptor and each ligand's positions; a prefix that
/// fixes nothing leaves a note.
pub fn annotate(complex: &Complex, report: &mut Report) {
    if complex.metal_count() != 1 {
        return;
    }
    let Ok(placed) = place(complex, report) else {
        return;
    };
    let f = &placed.frame;
    for n in &placed.notes {
        if !n.starts_with("pseudo") && !n.contains("sandwich") && !n.contains("metallocene") {
            report.notes.push(n.clone());
        }
    }
    let Some(m) = report.metals.first_mut() else {
        return;
    };
    m.polyhedron = Some(f.poly.symbol);
    m.stereoisomers = Some(placed.isomers.len() as u32);
    let Some(iso) = placed.fixed() else {
        return;
    };
    m.isomer = placed.descriptors.get(placed.chosen[0]).cloned();
    let positions = f.positions(iso);
    for c in &mut m.contributions {
        let Some(g) = f
            .ligands
            .iter()
            .position(|b| b.ligand.key == c.ligand.key && b.mode == c.mode)
        else {
            continue;
        };
        c.positions = positions.get(g).map(|copies| {
            copies
                .iter()
                .map(|p| p.iter().map(|&x| x + 1).collect())
                .collect()
        });
    }
}

/// Where each ligand sits, in a few short rows: the trans pairs as axes through the metal
/// ("Cl — Pt — PEt3"), the rest by the polyhedron's own words (apical, equatorial). Rows that
/// repeat are written once with a count, so a ring over three positions takes one row.
#[derive(Debug, Clone, PartialEq)]
pub struct Sketch {
    /// The isomer ("OC-6-22 fac"), the polyhedron when it has one arrangement ("T-4"), or
    /// how many isomers the formula leaves open.
    pub head: String,
    /// Whether one arrangement is fixed (the rows are positions, not a list of isomers).
    pub fixed: bool,
    pub rows: Vec<String>,
}

impl Sketch {
    /// The rows in one line, tight: "Cl—Ir—CO · PPh3—Ir—PPh3".
    pub fn joined(&self) -> String {
        self.rows
            .iter()
            .map(|r| r.replace(" — ", "—"))
            .collect::<Vec<_>>()
            .join(" · ")
            .replace(" · or ", ", ")
    }
}

/// The sketch of a placed complex: the fixed isomer's positions, else the isomers it may be.
pub fn sketch(placed: &Placed, metal: &str) -> Sketch {
    let f = &placed.frame;
    let poly = f.poly;
    let Some(iso) = placed.fixed() else {
        let names: Vec<String> = placed
            .chosen
            .iter()
            .map(|&i| {
                let d = &placed.descriptors[i];
                let short = f.short_names(&placed.isomers[i]).join(",");
                if short.is_empty() {
                    d.clone()
                } else {
                    format!("{d} {short}")
                }
            })
            .collect();
        let (n, all) = (placed.chosen.len(), placed.isomers.len());
        let mut rows: Vec<String> = names.iter().take(6).map(|n| format!("or {n}")).collect();
        if let Some(first) = rows.first_mut() {
            *first = format!("one of {}", &first[3..]);
        }
        if n > 6 {
            rows.push(format!("and {} more", n - 6));
        }
        return Sketch {
            fixed: false,
            head: if n == all {
                format!("{}: {n} isomers, none named", poly.symbol)
            } else {
                format!("{}: {n} of {all} isomers", poly.symbol)
            },
            rows,
        };
    };
    let label = |p: u8| f.seat_label(&iso.seats[p as usize]);
    let d = &placed.descriptors[placed.chosen[0]];
    let short = f.short_names(iso).join(",");
    let head = if placed.isomers.len() < 2 {
        poly.symbol.to_string()
    } else if short.is_empty() {
        d.clone()
    } else {
        format!("{d} {short}")
    };
    Sketch {
        head,
        fixed: true,
        rows: axes(poly, metal, &label),
    }
}

/// The sketch of a counted complex from its report: the isomer and each ligand's positions
/// (see `annotate`), or None when the report fixes no arrangement.
pub fn sketch_of_report(m: &super::count::MetalReport) -> Option<Sketch> {
    let poly = Polyhedron::shared(m.polyhedron?)?;
    let mut at: Vec<String> = vec![String::new(); poly.positions()];
    for c in &m.contributions {
        for copy in c.positions.iter().flatten() {
            for &p in copy {
                let slot = at.get_mut(usize::from(p).checked_sub(1)?)?;
                *slot = c.ligand.key.clone();
            }
        }
    }
    if at.iter().any(String::is_empty) {
        return None;
    }
    let head = match (&m.isomer, m.stereoisomers) {
        (Some(i), Some(n)) if n > 1 => format!("{i} (one of {n} isomers)"),
        _ => poly.symbol.to_string(),
    };
    Some(Sketch {
        head,
        fixed: true,
        rows: axes(poly, m.symbol, &|p| at[p as usize].clone()),
    })
}

/// Rows that say what sits where: trans pairs as axes, the rest by the polyhedron's words.
fn axes(poly: &Polyhedron, metal: &str, label: &dyn Fn(u8) -> String) -> Vec<String> {
    let axis = |a: u8, b: u8| format!("{} — {metal} — {}", label(a), label(b));
    let mut rows: Vec<String> = Vec::new();
    let mut on_axis = vec![false; poly.positions()];
    match poly.symbol {
        "TBPY-5" | "PBPY-7" => {
            rows.push(format!("axial {}", axis(0, 1)));
            let ring: Vec<String> = (2..poly.positions() as u8).map(label).collect();
            rows.push(format!("equatorial {}", ring.join(", ")));
            return rows;
        }
        "T-4" | "TP-3" => {
            let all: Vec<String> = (0..poly.positions() as u8).map(label).collect();
            rows.push(format!("around {metal}: {}", all.join(", ")));
            return rows;
        }
        _ => {}
    }
    for &(a, b) in &poly.trans {
        on_axis[a as usize] = true;
        on_axis[b as usize] = true;
        rows.push(axis(a, b));
    }
    // positions with nothing trans: the apex of a square pyramid, the stem of a T
    for p in 0..poly.positions() as u8 {
        if !on_axis[p as usize] {
            rows.push(format!(
                "{} {} — {metal} — (open)",
                poly.roles[p as usize],
                label(p)
            ));
        }
    }
    let mut counted: Vec<(String, usize)> = Vec::new();
    for r in rows {
        match counted.iter_mut().find(|(s, _)| *s == r) {
            Some(e) => e.1 += 1,
            None => counted.push((r, 1)),
        }
    }
    counted
        .into_iter()
        .map(|(r, n)| if n > 1 { format!("{r} (x{n})") } else { r })
        .collect()
}

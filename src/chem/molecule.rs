//! Molecules as graphs: the structure behind every ligand, group and reagent, with its
//! composition (Hill formula), SMILES in and out, and a canonical form for identity.
//!
//! Hydrogens on heavy atoms are counts on those atoms; a hydrogen stands as an atom of its own
//! only where nothing heavier holds it (H2, a hydride, H+). A bond to the metal is a bond to a
//! `*` atom (atomic number 0), as OpenSMILES writes an unspecified atom, so `*C` is a methyl
//! group and `*=O` an oxo.

use std::fmt;

use super::periodic::{self, symbol};

/// One atom: element, hydrogens it carries, formal charge and aromaticity.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub struct Atom {
    /// Atomic number; 0 for `*`, the metal.
    pub z: u8,
    pub h: u8,
    pub charge: i8,
    pub aromatic: bool,
}

impl Atom {
    pub fn new(z: u8, h: u8) -> Atom {
        Atom {
            z,
            h,
            charge: 0,
            aromatic: false,
        }
    }

    pub fn star() -> Atom {
        Atom::new(0, 0)
    }

    pub fn is_star(&self) -> bool {
        self.z == 0
    }
}

/// Bond orders; an aromatic bond is written without a symbol and counts as one in valences.
pub const AROMATIC: u8 = 5;

#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct Bond {
    pub a: usize,
    pub b: usize,
    pub order: u8,
}

impl Bond {
    pub fn other(&self, i: usize) -> Option<usize> {
        if self.a == i {
            Some(self.b)
        } else if self.b == i {
            Some(self.a)
        } else {
            None
        }
    }

    /// The order as it counts toward valence: aromatic bonds count one.
    pub fn valence(&self) -> u8 {
        if self.order == AROMATIC {
            1
        } else {
            self.order
        }
    }
}

/// Neighbours of every atom with the bond to each, as one flat table (built once for a
/// walk over the graph).
pub struct Adjacency {
    start: Vec<usize>,
    items: Vec<(usize, usize)>,
}

impl std::ops::Index<usize> for Adjacency {
    type Output = [(usize, usize)];

    fn index(&self, i: usize) -> &[(usize, usize)] {
        match (self.start.get(i), self.start.get(i + 1)) {
            (Some(&a), Some(&b)) => &self.items[a..b],
            _ => &[],
        }
    }
}

/// A molecule or group: atoms and bonds, possibly in several pieces (a salt).
#[derive(Debug, Clone, Default, PartialEq, Eq)]
pub struct Molecule {
    pub atoms: Vec<Atom>,
    pub bonds: Vec<Bond>,
}

/// Why a SMILES string could not be read.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum SmilesError {
    #[error("'{text}' is not SMILES: {why} at character {at}")]
    Syntax {
        text: String,
        at: usize,
        why: &'static str,
    },
    #[error("the SMILES is empty")]
    Empty,
    #[error("SMILES longer than {0} characters")]
    TooLong(usize),
}

/// Longest SMILES read: a ligand fits in far fewer.
pub const MAX_SMILES: usize = 2_000;

impl Molecule {
    pub fn add_atom(&mut self, a: Atom) -> usize {
        self.atoms.push(a);
        self.atoms.len() - 1
    }

    pub fn add_bond(&mut self, a: usize, b: usize, order: u8) {
        self.bonds.push(Bond { a, b, order });
    }

    /// The bond between two atoms, if any.
    pub fn bond_between(&self, a: usize, b: usize) -> Option<usize> {
        self.bonds
            .iter()
            .position(|x| (x.a == a && x.b == b) || (x.a == b && x.b == a))
    }

    /// Neighbours of atom `i` with the order of the bond to each.
    pub fn neighbors(&self, i: usize) -> impl Iterator<Item = (usize, u8)> + '_ {
        self.bonds
            .iter()
            .filter_map(move |b| b.other(i).map(|j| (j, b.order)))
    }

    /// Sum of bond orders at `i` (aromatic bonds count one), not counting hydrogens.
    pub fn bond_valence(&self, i: usize) -> u8 {
        self.bonds
            .iter()
            .filter(|b| b.a == i || b.b == i)
            .map(Bond::valence)
            .sum()
    }

    /// Heavy (non-star) neighbours of `i`.
    pub fn heavy_neighbors(&self, i: usize) -> Vec<usize> {
        self.neighbors(i)
            .map(|(j, _)| j)
            .filter(|&j| !self.atoms[j].is_star())
            .collect()
    }

    /// The atoms bonded to the metal, with the order of that bond (`*C` -> [(1, 1)]).
    pub fn metal_bonds(&self) -> Vec<(usize, u8)> {
        let mut out = Vec::new();
        for b in &self.bonds {
            let (sa, sb) = (self.atoms[b.a].is_star(), self.atoms[b.b].is_star());
            if sa && !sb {
                out.push((b.b, b.order));
            } else if sb && !sa {
                out.push((b.a, b.order));
            }
        }
        out
    }

    pub fn star_count(&self) -> usize {
        self.atoms.iter().filter(|a| a.is_star()).count()
    }

    /// Sum of formal charges.
    pub fn charge(&self) -> i32 {
        self.atoms.iter().map(|a| a.charge as i32).sum()
    }

    /// Element counts, hydrogens included, `*` left out.
    pub fn composition(&self) -> Composition {
        let mut c = Composition::default();
        for a in &self.atoms {
            if !a.is_star() {
                c.add(a.z, 1);
            }
            if a.h > 0 {
                c.add(periodic::H, a.h as u32);
            }
        }
        c
    }

    /// Remove atom `i` and its bonds; later atoms move down by one.
    pub fn remove_atom(&mut self, i: usize) {
        if i >= self.atoms.len() {
            return;
        }
        self.atoms.remove(i);
        self.bonds.retain(|b| b.a != i && b.b != i);
        for b in &mut self.bonds {
            if b.a > i {
                b.a -= 1;
            }
            if b.b > i {
                b.b -= 1;
            }
        }
    }

    /// Remove several atoms at once.
    pub fn remove_atoms(&mut self, mut which: Vec<usize>) {
        which.sort_unstable();
        which.dedup();
        for i in which.into_iter().rev() {
            self.remove_atom(i);
        }
    }

    /// Copy `other` in; returns the index its first atom got.
    pub fn merge(&mut self, other: &Molecule) -> usize {
        let off = self.atoms.len();
        self.atoms.extend_from_slice(&other.atoms);
        for b in &other.bonds {
            self.add_bond(b.a + off, b.b + off, b.order);
        }
        off
    }

    /// Replace every `*` with a bond to nothing: the metal's bonds go, the attached atoms keep
    /// their hydrogens. Returns the atoms that were bonded to a star, with the bond orders.
    pub fn strip_stars(&mut self) -> Vec<(usize, u8)> {
        let bound = self.metal_bonds();
        let stars: Vec<usize> = (0..self.atoms.len())
            .filter(|&i| self.atoms[i].is_star())
            .collect();
        // map the old index of each bound atom to its new one
        let shift = |i: usize| i - stars.iter().filter(|&&s| s < i).count();
        let out = bound.iter().map(|&(i, o)| (shift(i), o)).collect();
        self.remove_atoms(stars);
        out
    }

    /// The connected pieces (a salt gives two).
    pub fn components(&self) -> Vec<Molecule> {
        let n = self.atoms.len();
        let adj = self.adjacency();
        let mut piece = vec![usize::MAX; n];
        let mut count = 0;
        for start in 0..n {
            if piece[start] != usize::MAX {
                continue;
            }
            let mut stack = vec![start];
            piece[start] = count;
            while let Some(i) = stack.pop() {
                for &(j, _) in &adj[i] {
                    if piece[j] == usize::MAX {
                        piece[j] = count;
                        stack.push(j);
                    }
                }
            }
            count += 1;
        }
        if count <= 1 {
            return vec![self.clone()];
        }
        (0..count)
            .map(|p| {
                let keep: Vec<usize> = (0..n).filter(|&i| piece[i] == p).collect();
                self.fragment(&keep, &[])
            })
            .collect()
    }

    /// Whether the molecule is one piece (no salt, no separate ions).
    pub fn is_connected(&self) -> bool {
        let n = self.atoms.len();
        if n == 0 {
            return true;
        }
        let adj = self.adjacency();
        let mut seen = vec![false; n];
        let mut stack = vec![0];
        seen[0] = true;
        let mut reached = 1;
        while let Some(i) = stack.pop() {
            for &(j, _) in &adj[i] {
                if !seen[j] {
                    seen[j] = true;
                    reached += 1;
                    stack.push(j);
                }
            }
        }
        reached == n
    }

    /// Each atom's (neighbour, bond index) pairs, in one flat table.
    pub fn adjacency(&self) -> Adjacency {
        let n = self.atoms.len();
        let mut start = vec![0usize; n + 1];
        for b in &self.bonds {
            if b.a < n && b.b < n {
                start[b.a + 1] += 1;
                start[b.b + 1] += 1;
            }
        }
        for i in 0..n {
            start[i + 1] += start[i];
        }
        let mut fill = start.clone();
        let mut items = vec![(0usize, 0usize); start[n]];
        for (k, b) in self.bonds.iter().enumerate() {
            if b.a < n && b.b < n {
                items[fill[b.a]] = (b.b, k);
                fill[b.a] += 1;
                items[fill[b.b]] = (b.a, k);
                fill[b.b] += 1;
            }
        }
        Adjacency { start, items }
    }

    /// The atoms reachable from `from` without crossing bond `k`.
    pub fn side(&self, from: usize, k: usize) -> Vec<usize> {
        let adj = self.adjacency();
        let mut seen = vec![false; self.atoms.len()];
        let mut stack = vec![from];
        seen[from] = true;
        let mut out = vec![from];
        while let Some(i) = stack.pop() {
            for &(j, bi) in &adj[i] {
                if bi != k && !seen[j] {
                    seen[j] = true;
                    out.push(j);
                    stack.push(j);
                }
            }
        }
        out.sort_unstable();
        out
    }

    /// The atoms in `keep` as a molecule of their own, with a `*` bonded to each atom listed
    /// in `stars` (with the given order).
    pub fn fragment(&self, keep: &[usize], stars: &[(usize, u8)]) -> Molecule {
        let mut index = vec![usize::MAX; self.atoms.len()];
        let mut m = Molecule::default();
        for &i in keep {
            if i < self.atoms.len() && index[i] == usize::MAX {
                index[i] = m.add_atom(self.atoms[i]);
            }
        }
        for b in &self.bonds {
            if index[b.a] != usize::MAX && index[b.b] != usize::MAX {
                m.add_bond(index[b.a], index[b.b], b.order);
            }
        }
        for &(i, order) in stars {
            if index.get(i).is_some_and(|&x| x != usize::MAX) {
                let s = m.add_atom(Atom::star());
                m.add_bond(index[i], s, order);
            }
        }
        m
    }

    /// Break bond `k`: the two groups it leaves, each with a `*` where the bond was (the side
    /// of the bond's first atom first); None when the bond is in a ring.
    pub fn cut(&self, k: usize) -> Option<(Molecule, Molecule)> {
        let b = *self.bonds.get(k)?;
        let a_side = self.side(b.a, k);
        if a_side.binary_search(&b.b).is_ok() {
            return None;
        }
        let b_side = self.side(b.b, k);
        Some((
            self.fragment(&a_side, &[(b.a, b.order)]),
            self.fragment(&b_side, &[(b.b, b.order)]),
        ))
    }

    /// Give aromatic bonds single and double orders (a Kekulé structure), so that a step can
    /// break the ring's π system; false when no such assignment exists.
    pub fn kekulize(&mut self) -> bool {
        let n = self.atoms.len();
        // atoms that need one double bond inside the aromatic system
        let need: Vec<bool> = (0..n)
            .map(|i| {
                let a = self.atoms[i];
                if !a.aromatic {
                    return false;
                }
                let exo_double = self.neighbors(i).any(|(_, o)| o == 2 || o == 3);
                let used = self.bond_valence(i) + a.h;
                let target = periodic::valences_charged(a.z, a.charge)
                    .into_iter()
                    .find(|&v| v > used)
                    .unwrap_or(used);
                !exo_double && target == used + 1
            })
            .collect();
        let aromatic: Vec<usize> = (0..self.bonds.len())
            .filter(|&k| self.bonds[k].order == AROMATIC)
            .collect();
        let mut matched = vec![false; n];
        let mut double = vec![false; self.bonds.len()];
        fn solve(
            m: &Molecule,
            need: &[bool],
            aromatic: &[usize],
            matched: &mut Vec<bool>,
            double: &mut Vec<bool>,
            budget: &mut u32,
        ) -> bool {
            *budget = budget.saturating_sub(1);
            if *budget == 0 {
                return false;
            }
            let Some(i) = (0..need.len()).find(|&i| need[i] && !matched[i]) else {
                return true;
            };
            for &k in aromatic {
                let Some(j) = m.bonds[k].other(i) else {
                    continue;
                };
                if need[j] && !matched[j] {
                    matched[i] = true;
                    matched[j] = true;
                    double[k] = true;
                    if solve(m, need, aromatic, matched, double, budget) {
                        return true;
                    }
                    matched[i] = false;
                    matched[j] = false;
                    double[k] = false;
                }
            }
            false
        }
        let mut budget = 100_000;
        if !solve(
            self,
            &need,
            &aromatic,
            &mut matched,
            &mut double,
            &mut budget,
        ) {
            return false;
        }
        for &k in &aromatic {
            self.bonds[k].order = if double[k] { 2 } else { 1 };
        }
        for a in &mut self.atoms {
            a.aromatic = false;
        }
        true
    }

    /// Read OpenSMILES. Stereo marks are read and dropped (nonet needs the constitution only);
    /// explicit hydrogens on heavy atoms become counts.
    pub fn from_smiles(text: &str) -> Result<Molecule, SmilesError> {
        let text = text.trim();
        if text.is_empty() {
            return Err(SmilesError::Empty);
        }
        if text.chars().count() > MAX_SMILES {
            return Err(SmilesError::TooLong(MAX_SMILES));
        }
        if let Some((at, c)) = text
            .char_indices()
            .find(|(_, c)| !c.is_ascii() || c.is_ascii_control() || *c == ' ')
        {
            return Err(SmilesError::Syntax {
                text: text.to_string(),
                at: text[..at].chars().count(),
                why: if c == ' ' {
                    "a space"
                } else {
                    "a character SMILES does not use"
                },
            });
        }
        let cleaned = strip_stereo(text);
        let mut builder = purr::graph::Builder::new();
        let syntax = |at: usize, why| SmilesError::Syntax {
            text: text.to_string(),
            at,
            why,
        };
        purr::read::read(&cleaned, &mut builder, None).map_err(|e| match e {
            purr::read::Error::EndOfLine => syntax(text.len(), "it ends too early"),
            purr::read::Error::Character(i) => syntax(i, "unexpected character"),
        })?;
        let graph = builder.build().map_err(|e| match e {
            purr::graph::Error::Join(a, _) => syntax(a, "a ring bond that does not match"),
            purr::graph::Error::Rnum(a) => syntax(a, "a ring bond left open"),
        })?;
        Ok(from_purr(&graph))
    }

    /// SMILES in a canonical form: equal strings mean the same constitution.
    pub fn canonical_smiles(&self) -> String {
        if self.atoms.iter().any(|a| a.z == periodic::H) {
            let mut m = self.clone();
            fold_hydrogens(&mut m);
            return super::canon::canonical_smiles(&m);
        }
        super::canon::canonical_smiles(self)
    }

    /// SMILES as written from the atom order (not canonical), for messages.
    pub fn smiles(&self) -> String {
        let order: Vec<usize> = (0..self.atoms.len()).collect();
        super::canon::write_smiles(self, &order)
    }
}

/// Drop `@`, `@@`, `@TH1`, `@OH12`, ... inside brackets: purr does not read every class of
/// configuration, and the constitution is all nonet uses.
fn strip_stereo(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    let mut in_bracket = false;
    let mut chars = text.chars().peekable();
    while let Some(c) = chars.next() {
        match c {
            '[' => in_bracket = true,
            ']' => in_bracket = false,
            '@' if in_bracket => {
                if chars.peek() == Some(&'@') {
                    chars.next();
                }
                let rest: String = chars.clone().take(3).collect();
                let class = ["TH", "AL", "SP", "TB", "OH"].iter().any(|c| {
                    rest.starts_with(c) && rest[2..].starts_with(|d: char| d.is_ascii_digit())
                });
                if class {
                    chars.next();
                    chars.next();
                    while chars.next_if(char::is_ascii_digit).is_some() {}
                }
                continue;
            }
            _ => {}
        }
        out.push(c);
    }
    out
}

fn from_purr(graph: &[purr::graph::Atom]) -> Molecule {
    use purr::feature::{AtomKind, BondKind, BracketSymbol};
    let mut m = Molecule::default();
    for a in graph {
        let (sym, aromatic, charge) = match &a.kind {
            AtomKind::Star => ("*".to_string(), false, 0i8),
            AtomKind::Aliphatic(x) => (x.to_string(), false, 0),
            AtomKind::Aromatic(x) => (upper_first(&x.to_string()), true, 0),
            AtomKind::Bracket { symbol, charge, .. } => {
                let q: i8 = charge.as_ref().map_or(0, |c| c.into());
                match symbol {
                    BracketSymbol::Star => ("*".to_string(), false, q),
                    // the variant's name, not its Display: purr 0.9 displays Cs as "Ac"
                    BracketSymbol::Element(e) => (format!("{e:?}"), false, q),
                    BracketSymbol::Aromatic(e) => (upper_first(&e.to_string()), true, q),
                }
            }
        };
        let z = periodic::number(&sym).unwrap_or(0);
        m.add_atom(Atom {
            z,
            h: a.suppressed_hydrogens(),
            charge,
            aromatic,
        });
    }
    for (i, a) in graph.iter().enumerate() {
        for b in &a.bonds {
            if b.tid > i {
                let order = match b.kind {
                    BondKind::Aromatic => AROMATIC,
                    BondKind::Elided if a.is_aromatic() && graph[b.tid].is_aromatic() => AROMATIC,
                    _ => b.order(),
                };
                m.add_bond(i, b.tid, order);
            }
        }
    }
    fold_hydrogens(&mut m);
    m
}

/// Neutral hydrogen atoms bonded to one heavy atom become that atom's hydrogen count.
pub fn fold_hydrogens(m: &mut Molecule) {
    let mut gone = Vec::new();
    for i in 0..m.atoms.len() {
        let a = m.atoms[i];
        if a.z != periodic::H || a.charge != 0 {
            continue;
        }
        let nb: Vec<(usize, u8)> = m.neighbors(i).collect();
        if let [(j, 1)] = nb[..] {
            let host = m.atoms[j];
            if host.z > periodic::H {
                m.atoms[j].h = host.h.saturating_add(1 + a.h);
                gone.push(i);
            }
        }
    }
    m.remove_atoms(gone);
}

fn upper_first(s: &str) -> String {
    let mut c = s.chars();
    match c.next() {
        Some(f) => f.to_ascii_uppercase().to_string() + c.as_str(),
        None => String::new(),
    }
}

/// Element counts of a species, sorted by atomic number (a few entries: a sorted vector
/// beats a map here, and every count and step sums them).
#[derive(Debug, Clone, Default, PartialEq, Eq, Hash)]
pub struct Composition(Vec<(u8, u32)>);

impl Composition {
    /// Room for `n` elements without growing (a complex rarely holds more than eight).
    pub fn with_capacity(n: usize) -> Composition {
        Composition(Vec::with_capacity(n))
    }

    pub fn add(&mut self, z: u8, n: u32) {
        if n == 0 {
            return;
        }
        match self.0.binary_search_by_key(&z, |e| e.0) {
            Ok(i) => self.0[i].1 = self.0[i].1.saturating_add(n),
            Err(i) => self.0.insert(i, (z, n)),
        }
    }

    pub fn add_all(&mut self, other: &Composition, times: u32) {
        for &(z, n) in &other.0 {
            self.add(z, n.saturating_mul(times));
        }
    }

    pub fn count(&self, z: u8) -> u32 {
        self.0
            .binary_search_by_key(&z, |e| e.0)
            .map_or(0, |i| self.0[i].1)
    }

    pub fn is_empty(&self) -> bool {
        self.0.is_empty()
    }

    /// Counts by symbol, for reports.
    pub fn elements(&self) -> impl Iterator<Item = (&'static str, u32)> + '_ {
        self.0.iter().map(|&(z, n)| (symbol(z), n))
    }

    /// What `self` has beyond `other`, and what `other` has beyond `self`.
    pub fn difference(&self, other: &Composition) -> (Composition, Composition) {
        let mut more = Composition::default();
        let mut less = Composition::default();
        for &(z, _) in self.0.iter().chain(&other.0) {
            let (a, b) = (self.count(z), other.count(z));
            if a > b && more.count(z) == 0 {
                more.add(z, a - b);
            } else if b > a && less.count(z) == 0 {
                less.add(z, b - a);
            }
        }
        (more, less)
    }
}

/// Serialized as its Hill formula.
impl serde::Serialize for Composition {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.collect_str(self)
    }
}

/// The Hill formula: C then H, then the other elements alphabetically; without carbon, all
/// alphabetically (Hill, J. Am. Chem. Soc. 1900, 22, 478).
impl fmt::Display for Composition {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let carbon = self.count(periodic::C) > 0;
        let rank = |z: u8| -> (u8, &'static str) {
            match (carbon, z) {
                (true, periodic::C) => (0, ""),
                (true, periodic::H) => (1, ""),
                _ => (2, symbol(z)),
            }
        };
        // a handful of elements, sorted on the stack (on the heap past 24)
        let mut stack: [(u8, u32); 24] = [(0, 0); 24];
        let mut heap: Vec<(u8, u32)> = Vec::new();
        let items: &mut [(u8, u32)] = if self.0.len() <= stack.len() {
            let n = self.0.len();
            stack[..n].copy_from_slice(&self.0);
            &mut stack[..n]
        } else {
            heap.extend_from_slice(&self.0);
            &mut heap
        };
        items.sort_unstable_by(|a, b| rank(a.0).cmp(&rank(b.0)));
        for &(z, count) in items.iter() {
            f.write_str(symbol(z))?;
            if count != 1 {
                write!(f, "{count}")?;
            }
        }
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn hill(s: &str) -> String {
        Molecule::from_smiles(s).unwrap().composition().to_string()
    }

    // Hill order: C, H, then alphabetical; without C everything alphabetical (Hill 1900)
    #[test]
    fn hill_formulas() {
        assert_eq!(hill("CCO"), "C2H6O");
        assert_eq!(hill("*C"), "CH3");
        assert_eq!(hill("*[H]"), "H");
        assert_eq!(hill("[H][H]"), "H2");
        assert_eq!(hill("c1ccccc1"), "C6H6");
        assert_eq!(hill("P(c1ccccc1)(c1ccccc1)c1ccccc1"), "C18H15P");
        assert_eq!(hill("[CH]1C=CC=C1"), "C5H5");
        assert_eq!(hill("O"), "H2O");
        assert_eq!(hill("Cl[Pt](Cl)"), "Cl2Pt");
        assert_eq!(hill("[Ag+].F[B-](F)(F)F"), "AgBF4");
        assert_eq!(hill("[2H]C"), "CH4");
        assert_eq!(hill("[Cs+].[Cs+].[O-]C([O-])=O"), "CCs2O3");
    }

    #[test]
    fn stars_are_metal_bonds() {
        let m = Molecule::from_smiles("*=CC(C)(C)C").unwrap();
        assert_eq!(m.metal_bonds().len(), 1);
        assert_eq!(m.metal_bonds()[0].1, 2);
        assert_eq!(m.composition().to_string(), "C5H10");
    }

    #[test]
    fn stereo_is_dropped_and_never_panics() {
        for s in [
            "C[C@H](N)O",
            "[C@TB1H](F)(Cl)Br",
            "[C@OH12H2]",
            "F/C=C/F",
            "[C@SP2H]",
        ] {
            let _ = Molecule::from_smiles(s);
        }
        assert_eq!(hill("C[C@@H](N)O"), "C2H7NO");
    }

    #[test]
    fn bad_smiles_say_where() {
        assert!(Molecule::from_smiles("C1CC").is_err());
        assert!(Molecule::from_smiles("C(").is_err());
        assert!(Molecule::from_smiles("").is_err());
        assert!(Molecule::from_smiles("C C").is_err());
    }
}

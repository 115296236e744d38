//! Condensed formulas of groups, as chemists write them in a complex: `CH2CH2CH2CH2CH3`,
//! `CH2CH(CH3)2`, `C(O)CH2Ph`, `(CH2)4CH3`, `CH=CHPh`, `Me3SiCH2`. Reading builds the
//! structure (bond orders follow from the valences, which is unique for a chain or a tree);
//! printing writes a structure back in one canonical way, so that reading what was printed
//! gives the same group again.
//!
//! A group's first atom holds the metal (`Me3SiCH2` and `PhCH2`, written group first, hold it
//! on their last); a κ2 group holds it on its first and last atom; an η-bound group on none.
//! Rings come only from catalogue groups (`Ph`, `Cy`, `Bpin`); a structure whose rings are
//! not in the catalogue has no condensed form, and is written as SMILES in braces instead.

use std::sync::Arc;

use super::formula::LigandLookup;
use super::ligand::LigandDef;
use super::molecule::{Atom, Molecule};
use super::periodic::{self, symbol};

/// How many of the group's atoms the metal holds, and which.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Attach {
    /// η-bound (alkene, allyl, dienyl): no σ bond to the metal.
    None,
    /// One σ bond at the group's first atom (or last, when written group first).
    One,
    /// A metallacycle: σ bonds at the first and the last atom of the chain.
    Two,
}

/// Longest condensed formula read (a group fits in far fewer).
const MAX_TEXT: usize = 200;

/// Elements a condensed formula may name: the non-metals and the main-group metals that
/// reagents carry.
fn main_group(z: u8) -> bool {
    matches!(
        z,
        1 | 3
            | 4
            | 5
            | 6
            | 7
            | 8
            | 9
            | 11
            | 12
            | 13
            | 14
            | 15
            | 16
            | 17
            | 19
            | 29
            | 30
            | 31
            | 32
            | 33
            | 34
            | 35
            | 47
            | 48
            | 49
            | 50
            | 51
            | 52
            | 53
            | 55
            | 80
            | 81
            | 82
            | 83
    )
}

#[derive(Debug, Clone)]
enum Unit {
    Atom { z: u8, h: u8, times: u32 },
    Group { ligand: Arc<LigandDef>, times: u32 },
    Hydrogen(u8),
    Paren { inner: Vec<Unit>, times: u32 },
}

/// A catalogue entry usable as a substituent: a group with one single bond to the metal.
pub fn substituent(l: &LigandDef) -> Option<&Molecule> {
    let m = l.structure.as_deref()?;
    match m.metal_bonds()[..] {
        [(_, 1)] if m.star_count() == 1 => Some(m),
        _ => None,
    }
}

/// Whether `t` is written as main-group atoms with hydrogen counts only ("CHO", "CH2CH3").
fn atom_like(t: &str) -> bool {
    let b = t.as_bytes();
    let mut i = 0;
    while i < b.len() {
        let two = t
            .get(i..i + 2)
            .filter(|s| s.as_bytes()[1].is_ascii_lowercase())
            .and_then(periodic::number);
        let z = match two {
            Some(z) => {
                i += 2;
                z
            }
            None => match t.get(i..i + 1).and_then(periodic::number) {
                Some(z) => {
                    i += 1;
                    z
                }
                None => return false,
            },
        };
        if !main_group(z) {
            return false;
        }
        if b.get(i) == Some(&b'H') && b.get(i + 1).is_none_or(|c| !c.is_ascii_lowercase()) {
            i += 1;
        }
        while i < b.len() && b[i].is_ascii_digit() {
            i += 1;
        }
    }
    true
}

struct Reader<'a> {
    text: &'a str,
    lookup: &'a dyn LigandLookup,
}

impl Reader<'_> {
    fn err<T>(&self, at: usize, what: &str) -> Result<T, String> {
        Err(format!("{what} at character {} of '{}'", at + 1, self.text))
    }

    fn units(&self, pos: &mut usize, close: bool, depth: usize) -> Result<Vec<Unit>, String> {
        if depth > 8 {
            return self.err(*pos, "parentheses nested too deeply");
        }
        let b = self.text.as_bytes();
        let mut out = Vec::new();
        while *pos < b.len() {
            let c = b[*pos];
            match c {
                b'=' | b'#' | b'-' => *pos += 1,
                b'(' => {
                    *pos += 1;
                    let inner = self.units(pos, true, depth + 1)?;
                    if inner.is_empty() {
                        return self.err(*pos, "empty parentheses");
                    }
                    let times = self.digits(pos)?.unwrap_or(1);
                    out.push(Unit::Paren { inner, times });
                }
                b')' => {
                    if close {
                        *pos += 1;
                        return Ok(out);
                    }
                    return self.err(*pos, "unmatched ')'");
                }
                // an element, or a catalogue group (nPr, iPr and tBu start in lower case)
                b'A'..=b'Z' | b'a'..=b'z' => out.push(self.unit(pos)?),
                _ => return self.err(*pos, "unexpected character"),
            }
        }
        if close {
            return self.err(*pos, "'(' is never closed");
        }
        Ok(out)
    }

    fn digits(&self, pos: &mut usize) -> Result<Option<u32>, String> {
        let b = self.text.as_bytes();
        let start = *pos;
        while *pos < b.len() && b[*pos].is_ascii_digit() {
            *pos += 1;
        }
        if *pos == start {
            return Ok(None);
        }
        match self.text[start..*pos].parse::<u32>() {
            Ok(n) if (1..=24).contains(&n) => Ok(Some(n)),
            _ => self.err(start, "a count outside 1-24"),
        }
    }

    /// An element with its hydrogens, a catalogue group, or a lone H.
    fn unit(&self, pos: &mut usize) -> Result<Unit, String> {
        let rest = &self.text[*pos..];
        if rest.starts_with('H') && !rest[1..].starts_with(|c: char| c.is_ascii_lowercase()) {
            *pos += 1;
            let h = self.digits(pos)?.unwrap_or(1);
            return Ok(Unit::Hydrogen(h.min(24) as u8));
        }
        // a catalogue group, longest first, unless an element with hydrogens reads the same
        // text (CH2 is a chain link here, not methylidene)
        let max = rest.len().min(32);
        for len in (2..=max).rev() {
            let Some(t) = rest.get(..len) else { continue };
            let Some(l) = self.lookup.exact(t).filter(|l| substituent(l).is_some()) else {
                continue;
            };
            // a token spelled as atoms with their hydrogens (CHO, CH3, OH) is read atom by
            // atom, which gives the same group and never swallows the next atom's H
            if atom_like(t) {
                continue;
            }
            {
                // a group may not stop inside a count ("Me2" is Me twice, not M + e2)
                let l = l.clone();
                *pos += len;
                let times = self.digits(pos)?.unwrap_or(1);
                return Ok(Unit::Group { ligand: l, times });
            }
        }
        let two = rest
            .get(..2)
            .and_then(periodic::number)
            .filter(|&z| main_group(z) && rest.as_bytes()[1].is_ascii_lowercase());
        let (z, len) = match two {
            Some(z) => (z, 2),
            None => match rest.get(..1).and_then(periodic::number) {
                Some(z) if main_group(z) => (z, 1),
                _ => {
                    let word: String = rest
                        .chars()
                        .take_while(|c| c.is_ascii_alphanumeric())
                        .collect();
                    return self.err(*pos, &format!("'{word}' is neither an element nor a group"));
                }
            },
        };
        *pos += len;
        let mut h = 0u8;
        if self.text[*pos..].starts_with('H')
            && !self.text[*pos + 1..].starts_with(|c: char| c.is_ascii_lowercase())
        {
            *pos += 1;
            h = self.digits(pos)?.unwrap_or(1).min(24) as u8;
        }
        let times = self.digits(pos)?.unwrap_or(1);
        Ok(Unit::Atom { z, h, times })
    }
}

/// Builds the graph while reading units: the chain grows from the last chain atom.
struct Builder {
    m: Molecule,
    /// Atoms made from element symbols, whose bonds are to be settled.
    free: Vec<bool>,
    chain: Vec<usize>,
    /// Groups written before the first chain atom (`Me3Si` in `Me3SiCH2`).
    waiting: Vec<(Arc<LigandDef>, u32)>,
    group_first: bool,
    /// Hydrogens written before the first atom.
    leading_h: u8,
}

impl Builder {
    fn atom(&mut self, z: u8, h: u8) -> usize {
        self.free.push(true);
        self.m.add_atom(Atom::new(z, h))
    }

    /// Copy a catalogue group in, bonded to `to`.
    fn group(&mut self, l: &LigandDef, to: usize) -> Result<(), String> {
        let g = substituent(l).ok_or_else(|| format!("{} is not a one-bond group", l.key))?;
        let mut g = g.clone();
        let bound = g.strip_stars();
        let off = self.m.merge(&g);
        self.free.extend(std::iter::repeat_n(false, g.atoms.len()));
        if let Some(&(i, _)) = bound.first() {
            self.m.add_bond(to, off + i, 1);
        }
        Ok(())
    }

    fn current(&self) -> Option<usize> {
        self.chain.last().copied()
    }

    fn add_units(&mut self, units: &[Unit], top: bool) -> Result<(), String> {
        for u in units {
            match u {
                Unit::Hydrogen(n) => match self.current() {
                    Some(c) => self.m.atoms[c].h = self.m.atoms[c].h.saturating_add(*n),
                    // "HNMe2", "H2NCH2": the hydrogens of the atom that comes next
                    None if top => self.leading_h = self.leading_h.saturating_add(*n),
                    None => return Err("a hydrogen before any atom".into()),
                },
                Unit::Group { ligand, times } => match self.current() {
                    Some(c) => {
                        for _ in 0..*times {
                            self.group(ligand, c)?;
                        }
                    }
                    None if top => {
                        self.group_first = true;
                        self.waiting.push((ligand.clone(), *times));
                    }
                    None => return Err(format!("{} has nothing to hold it", ligand.key)),
                },
                Unit::Atom { z, h, times } => {
                    let monovalent = periodic::valences(*z).first() == Some(&1) && *h == 0;
                    match self.current() {
                        Some(c) if monovalent => {
                            for _ in 0..*times {
                                let a = self.atom(*z, 0);
                                self.m.add_bond(c, a, 1);
                            }
                        }
                        _ => {
                            // CO2Me: all but the last of a repeated atom are branches
                            let prev = self.current();
                            for k in 0..*times {
                                let lead = if prev.is_none() && k == 0 {
                                    std::mem::take(&mut self.leading_h)
                                } else {
                                    0
                                };
                                let a = self.atom(*z, h.saturating_add(lead));
                                if let Some(p) = prev {
                                    self.m.add_bond(p, a, 1);
                                } else if k > 0 {
                                    return Err(format!(
                                        "{}{} cannot start a group",
                                        symbol(*z),
                                        times
                                    ));
                                }
                                if k + 1 == *times {
                                    self.chain.push(a);
                                }
                            }
                            if prev.is_none() {
                                for (l, n) in std::mem::take(&mut self.waiting) {
                                    let c = self.chain[self.chain.len() - 1];
                                    for _ in 0..n {
                                        self.group(&l, c)?;
                                    }
                                }
                            }
                        }
                    }
                }
                Unit::Paren { inner, times } => {
                    let Some(c) = self.current() else {
                        // "(CH2)4CH3": a repeated chain segment
                        for _ in 0..*times {
                            self.add_units(inner, top)?;
                        }
                        continue;
                    };
                    if *times > 1 && self.is_link(inner) {
                        for _ in 0..*times {
                            self.add_units(inner, false)?;
                        }
                        continue;
                    }
                    for _ in 0..*times {
                        // a branch: its own chain, bonded to c, leaving c current
                        let saved = std::mem::take(&mut self.chain);
                        self.chain.push(c);
                        self.add_units(inner, false)?;
                        self.chain = saved;
                    }
                }
            }
        }
        Ok(())
    }

    /// Whether a parenthesised run repeats the chain ("(CH2)3") rather than branching off it
    /// ("(CH3)2"): its first atom keeps two free valences.
    fn is_link(&self, inner: &[Unit]) -> bool {
        match inner.first() {
            Some(Unit::Atom { z, h, times: 1 }) => {
                let branches: u8 = inner[1..]
                    .iter()
                    .map(|u| match u {
                        Unit::Group { times, .. } => *times as u8,
                        Unit::Atom { times, .. } => *times as u8,
                        Unit::Paren { times, .. } => *times as u8,
                        Unit::Hydrogen(_) => 0,
                    })
                    .sum();
                let v = periodic::valences(*z).first().copied().unwrap_or(0);
                *h + branches > 0 && v.saturating_sub(*h + branches) >= 2
            }
            _ => false,
        }
    }
}

/// Read a condensed formula into a group whose metal bonds are `*` atoms.
pub fn read_group(
    text: &str,
    lookup: &dyn LigandLookup,
    attach: Attach,
) -> Result<Molecule, String> {
    let text = text.trim();
    if text.is_empty() {
        return Err("an empty group".into());
    }
    if text.len() > MAX_TEXT || !text.is_ascii() {
        return Err(format!(
            "'{}' is not a condensed formula (ASCII, at most {MAX_TEXT} characters)",
            text.chars().take(40).collect::<String>()
        ));
    }
    let r = Reader { text, lookup };
    let mut pos = 0;
    let units = r.units(&mut pos, false, 0)?;
    let mut b = Builder {
        m: Molecule::default(),
        free: Vec::new(),
        chain: Vec::new(),
        waiting: Vec::new(),
        group_first: false,
        leading_h: 0,
    };
    b.add_units(&units, true)?;
    // "HNMe2", "HOAc": a hydrogen and one catalogue group make a molecule
    if b.chain.is_empty() && b.leading_h > 0 && attach == Attach::None {
        if let [(l, 1)] = &b.waiting[..] {
            if let Some(g) = substituent(l) {
                let mut m = g.clone();
                let bound = m.strip_stars();
                if let Some(&(at, 1)) = bound.first() {
                    m.atoms[at].h = m.atoms[at].h.saturating_add(b.leading_h);
                    return Ok(m);
                }
            }
        }
    }
    if !b.waiting.is_empty() || b.chain.is_empty() {
        return Err(format!(
            "'{text}' has no atom of its own to bond to the metal"
        ));
    }
    // the atoms that hold the metal: the ends of the main chain
    let main = main_chain(&b);
    let ends: Vec<usize> = match attach {
        Attach::None => Vec::new(),
        Attach::One if b.group_first => vec![*main.last().unwrap_or(&0)],
        Attach::One => vec![main[0]],
        Attach::Two => {
            if main.len() < 2 {
                return Err(format!("'{text}' needs two atoms to hold the metal twice"));
            }
            vec![main[0], main[main.len() - 1]]
        }
    };
    let mut m = b.m.clone();
    match settle_bonds(&mut m, &b.free, &ends) {
        Ok(()) => Ok(m),
        // "CH3CH2", "CH3OCH2": written from the far end
        Err(_) if attach == Attach::One && main.len() > 1 && !b.group_first => {
            let mut m = b.m;
            let last = [main[main.len() - 1]];
            settle_bonds(&mut m, &b.free, &last)
                .map_err(|why| format!("'{text}' does not add up: {why}"))?;
            Ok(m)
        }
        Err(why) => Err(format!("'{text}' does not add up: {why}")),
    }
}

/// The atoms along the chain as written (first to last chain atom at the top level).
fn main_chain(b: &Builder) -> Vec<usize> {
    // the top-level chain is every atom pushed at depth 0; `chain` holds them in order
    b.chain.clone()
}

/// Raise bond orders so every atom read from a symbol reaches a usual valence; what the ends
/// that hold the metal have left over is the order of their bond to it (one at least). The
/// bonds of a tree follow from its leaves inward, so the answer is unique.
fn settle_bonds(m: &mut Molecule, free: &[bool], ends: &[usize]) -> Result<(), String> {
    let n = m.atoms.len();
    let mut valence: Vec<u8> = Vec::with_capacity(n);
    for (i, &is_free) in free.iter().enumerate().take(n) {
        let a = m.atoms[i];
        let used = m.bond_valence(i) + a.h + u8::from(ends.contains(&i));
        if !is_free {
            valence.push(used);
            continue;
        }
        match periodic::valences(a.z).iter().copied().find(|&v| v >= used) {
            Some(v) => valence.push(v),
            None => return Err(format!("{} has too many bonds", symbol(a.z))),
        }
    }
    let used = |m: &Molecule, i: usize| m.bond_valence(i) + m.atoms[i].h;
    let mut deficit: Vec<i16> = (0..n)
        .map(|i| {
            if !free[i] {
                return 0;
            }
            valence[i] as i16 - used(m, i) as i16 - i16::from(ends.contains(&i))
        })
        .collect();
    // bonds between two settling atoms are the ones that may rise
    let mut open: Vec<bool> = m.bonds.iter().map(|b| free[b.a] && free[b.b]).collect();
    let open_at = |open: &[bool], m: &Molecule, i: usize| -> Vec<usize> {
        (0..m.bonds.len())
            .filter(|&k| open[k] && (m.bonds[k].a == i || m.bonds[k].b == i))
            .collect()
    };
    for pass in 0..2 {
        loop {
            // a leaf: one open bond left (metal-holding ends only on the second pass)
            let leaf = (0..n).find(|&i| {
                free[i] && (pass == 1 || !ends.contains(&i)) && open_at(&open, m, i).len() == 1
            });
            let Some(i) = leaf else { break };
            let k = open_at(&open, m, i)[0];
            open[k] = false;
            let d = deficit[i];
            if d < 0 {
                return Err(format!("{} has too many bonds", symbol(m.atoms[i].z)));
            }
            if d == 0 {
                continue;
            }
            let j = m.bonds[k].other(i).unwrap_or(i);
            m.bonds[k].order += d as u8;
            deficit[i] = 0;
            deficit[j] -= d;
            while deficit[j] < 0 {
                // P, S, N can take a higher valence (S(O)2R, P(O)R3)
                let next = periodic::valences(m.atoms[j].z)
                    .iter()
                    .copied()
                    .find(|&v| v > valence[j]);
                match next {
                    Some(v) => {
                        deficit[j] += (v - valence[j]) as i16;
                        valence[j] = v;
                    }
                    None => {
                        return Err(format!(
                            "{} cannot take a multiple bond there",
                            symbol(m.atoms[j].z)
                        ))
                    }
                }
            }
        }
    }
    if open.iter().any(|&o| o) {
        return Err(
            "a ring of atoms written one by one; use a catalogue group or SMILES in braces".into(),
        );
    }
    let radicals: i16 = (0..n)
        .filter(|i| !ends.contains(i))
        .map(|i| deficit[i].max(0))
        .sum();
    if !ends.is_empty() && radicals > 0 {
        return Err("an atom is left short of bonds".into());
    }
    if ends.is_empty() && radicals > 1 {
        return Err("more than one atom is left short of bonds".into());
    }
    for &e in ends {
        let order = 1 + deficit[e].max(0) as u8;
        let s = m.add_atom(Atom::star());
        m.add_bond(e, s, order.min(3));
    }
    Ok(())
}

/// Print a group (with its `*` bonds) or an η-bound or free molecule in canonical condensed
/// form; None when it has rings that are not catalogue groups, or several pieces.
pub fn print_group(m: &Molecule, lookup: &dyn LigandLookup) -> Option<String> {
    let heavy: Vec<usize> = (0..m.atoms.len())
        .filter(|&i| !m.atoms[i].is_star())
        .collect();
    if heavy.is_empty() {
        return None;
    }
    let bound = m.metal_bonds();
    let p = Printer { m, lookup };
    let radical = bound.is_empty() && !super::species::open_valence_atoms(m).is_empty();
    match bound.len() {
        1 => p.tree(bound[0].0, None, None, radical),
        2 => {
            let (a, b) = (bound[0].0, bound[1].0);
            let path = p.path(a, b)?;
            let forward = p.tree(a, None, Some(&path), radical)?;
            let rev: Vec<usize> = path.iter().rev().copied().collect();
            let backward = p.tree(b, None, Some(&rev), radical)?;
            Some(forward.min(backward))
        }
        0 => {
            // start from a chain end; the smallest text wins
            let ends: Vec<usize> = heavy
                .iter()
                .copied()
                .filter(|&i| m.heavy_neighbors(i).len() <= 1)
                .collect();
            let mut texts: Vec<String> = ends
                .iter()
                .filter_map(|&i| p.tree(i, None, None, radical))
                .collect();
            texts.sort_by(|a, b| a.len().cmp(&b.len()).then(a.cmp(b)));
            texts.dedup();
            // the shortest text that reads back as this molecule
            let want = std::cell::OnceCell::new();
            texts.into_iter().find(|t| {
                radical
                    || read_group(t, lookup, Attach::None).is_ok_and(|r| {
                        r.canonical_smiles() == *want.get_or_init(|| m.canonical_smiles())
                    })
            })
        }
        _ => None,
    }
}

struct Printer<'a> {
    m: &'a Molecule,
    lookup: &'a dyn LigandLookup,
}

impl Printer<'_> {
    /// Atoms on the path from a to b (both included).
    fn path(&self, a: usize, b: usize) -> Option<Vec<usize>> {
        let n = self.m.atoms.len();
        let mut prev = vec![usize::MAX; n];
        let mut queue = std::collections::VecDeque::from([a]);
        prev[a] = a;
        while let Some(i) = queue.pop_front() {
            if i == b {
                let mut out = vec![b];
                let mut x = b;
                while x != a {
                    x = prev[x];
                    out.push(x);
                }
                out.reverse();
                return Some(out);
            }
            for j in self.m.heavy_neighbors(i) {
                if prev[j] == usize::MAX {
                    prev[j] = i;
                    queue.push_back(j);
                }
            }
        }
        None
    }

    /// Whether atom c lies on a ring (two of its neighbours other than `parent` meet
    /// without passing through c).
    fn in_ring(&self, c: usize, parent: usize) -> bool {
        let nbrs: Vec<usize> = self
            .m
            .heavy_neighbors(c)
            .into_iter()
            .filter(|&j| j != parent)
            .collect();
        for (k, &start) in nbrs.iter().enumerate() {
            let mut seen = vec![false; self.m.atoms.len()];
            seen[c] = true;
            seen[start] = true;
            let mut stack = vec![start];
            while let Some(x) = stack.pop() {
                for y in self.m.heavy_neighbors(x) {
                    if x != start && nbrs[..k].contains(&y) || nbrs[k + 1..].contains(&y) {
                        return true;
                    }
                    if !seen[y] {
                        seen[y] = true;
                        stack.push(y);
                    }
                }
            }
        }
        false
    }

    /// The atoms beyond the bond parent-c, whether they hold a ring, and whether a ring
    /// leads back to the parent (then they are not a group of their own).
    fn subtree(&self, c: usize, parent: usize) -> (Vec<usize>, bool, bool) {
        let mut seen = vec![c];
        let mut stack = vec![c];
        let mut back = false;
        while let Some(x) = stack.pop() {
            for y in self.m.heavy_neighbors(x) {
                if y == parent {
                    back |= x != c;
                    continue;
                }
                if !seen.contains(&y) {
                    seen.push(y);
                    stack.push(y);
                }
            }
        }
        let edges = self
            .m
            .bonds
            .iter()
            .filter(|b| seen.contains(&b.a) && seen.contains(&b.b))
            .count();
        (seen.clone(), edges >= seen.len(), back)
    }

    /// The catalogue key of the group beyond the bond parent-i, if one matches.
    fn key_of(&self, i: usize, parent: usize, atoms: &[usize]) -> Option<String> {
        let mut frag = Molecule::default();
        let mut index = vec![usize::MAX; self.m.atoms.len()];
        for &a in atoms {
            index[a] = frag.add_atom(self.m.atoms[a]);
        }
        for b in &self.m.bonds {
            if index[b.a] != usize::MAX && index[b.b] != usize::MAX {
                frag.add_bond(index[b.a], index[b.b], b.order);
            }
        }
        let order = self
            .m
            .bond_between(i, parent)
            .map_or(1, |k| self.m.bonds[k].order);
        if order != 1 {
            return None;
        }
        let s = frag.add_atom(Atom::star());
        frag.add_bond(index[i], s, 1);
        let l = self.lookup.ligand_like(&frag)?;
        // the key must read back as a one-bond group
        substituent(l)?;
        Some(l.key.clone())
    }

    fn tree(
        &self,
        i: usize,
        parent: Option<usize>,
        main: Option<&[usize]>,
        radical: bool,
    ) -> Option<String> {
        let a = self.m.atoms[i];
        if a.charge != 0 || !main_group(a.z) {
            return None;
        }
        let mut out = symbol(a.z).to_string();
        if a.h > 0 {
            out.push('H');
            if a.h > 1 {
                out.push_str(&a.h.to_string());
            }
        }
        let kids: Vec<usize> = self
            .m
            .heavy_neighbors(i)
            .into_iter()
            .filter(|&j| Some(j) != parent)
            .collect();
        // each child as text, with its size
        let mut texts: Vec<(usize, String, usize)> = Vec::new();
        let on_main = main.and_then(|p| p.iter().position(|&x| x == i));
        let next_on_main = on_main.and_then(|at| main.and_then(|p| p.get(at + 1).copied()));
        // the last atom of a given path has branches only
        let path_end = on_main.is_some() && next_on_main.is_none();
        for &c in &kids {
            let (atoms, ring, back) = self.subtree(c, i);
            if back {
                return None;
            }
            let plain = atoms
                .iter()
                .all(|&x| matches!(self.m.atoms[x].z, 1 | 6 | 9 | 17 | 35 | 53));
            let text = if Some(c) == next_on_main {
                self.tree(c, Some(i), main, radical)?
            } else if ring && self.in_ring(c, i) {
                self.key_of(c, i, &atoms)?
            } else if ring {
                match self.key_of(c, i, &atoms) {
                    Some(k) => k,
                    None => self.tree(c, Some(i), None, radical)?,
                }
            } else if plain {
                self.tree(c, Some(i), None, radical)?
            } else {
                match self.key_of(c, i, &atoms) {
                    Some(k) => k,
                    None => self.tree(c, Some(i), None, radical)?,
                }
            };
            texts.push((c, text, atoms.len()));
        }
        if texts.is_empty() {
            return Some(out);
        }
        // the main child: the next atom of a given path, else the largest subtree
        let main_child = match next_on_main {
            Some(c) => Some(texts.iter().position(|t| t.0 == c)?),
            None if path_end => None,
            None => {
                // the largest child whose text is not repeated: CH(CH3)2 keeps its twins
                // together as branches
                let once = |k: usize| texts.iter().filter(|t| t.1 == texts[k].1).count() == 1;
                let mut best: Option<usize> = None;
                for k in (0..texts.len()).filter(|&k| once(k)) {
                    let better = best.is_none_or(|b| {
                        let (a, b) = (&texts[k], &texts[b]);
                        a.2 > b.2 || (a.2 == b.2 && a.1 < b.1)
                    });
                    if better {
                        best = Some(k);
                    }
                }
                best
            }
        };
        let main_text = main_child.map(|k| texts.remove(k));
        texts.sort_by(|a, b| a.1.cmp(&b.1));
        let mut k = 0;
        while k < texts.len() {
            let mut j = k + 1;
            while j < texts.len() && texts[j].1 == texts[k].1 {
                j += 1;
            }
            let t = &texts[k].1;
            let lone_halogen = periodic::number(t).is_some_and(|z| matches!(z, 9 | 17 | 35 | 53));
            if lone_halogen {
                out.push_str(t);
            } else {
                out.push('(');
                out.push_str(t);
                out.push(')');
            }
            if j - k > 1 {
                out.push_str(&(j - k).to_string());
            }
            k = j;
        }
        if let Some((mc, mtext, _)) = main_text {
            let order = self
                .m
                .bond_between(i, mc)
                .map_or(1, |b| self.m.bonds[b].order);
            if order == 2 && !radical {
                out.push('=');
            }
            out.push_str(&mtext);
        }
        Some(out)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A lookup with no catalogue: only element symbols.
    struct Bare;
    impl LigandLookup for Bare {
        fn exact(&self, _: &str) -> Option<&Arc<LigandDef>> {
            None
        }
        fn longest_prefix(
            &self,
            _: &str,
            _: &dyn Fn(usize) -> bool,
        ) -> Option<(&Arc<LigandDef>, usize)> {
            None
        }
        fn suggest(&self, _: &str) -> Option<String> {
            None
        }
    }

    fn smiles(text: &str, attach: Attach) -> String {
        read_group(text, &Bare, attach)
            .unwrap_or_else(|e| panic!("{text}: {e}"))
            .canonical_smiles()
    }

    fn same(_: &str, b: &str) -> String {
        Molecule::from_smiles(b).unwrap().canonical_smiles()
    }

    #[test]
    fn chains_and_branches_read_as_chemists_mean() {
        assert_eq!(smiles("CH2CH2CH2CH2CH3", Attach::One), same("", "*CCCCC"));
        assert_eq!(smiles("(CH2)4CH3", Attach::One), same("", "*CCCCC"));
        assert_eq!(smiles("CH2CH(CH3)2", Attach::One), same("", "*CC(C)C"));
        assert_eq!(smiles("CH(CH3)CH2CH3", Attach::One), same("", "*C(C)CC"));
        assert_eq!(smiles("C(O)CH3", Attach::One), same("", "*C(C)=O"));
        assert_eq!(smiles("CHCH2", Attach::One), same("", "*C=C"));
        assert_eq!(smiles("CH=CH2", Attach::One), same("", "*C=C"));
        assert_eq!(smiles("CH2", Attach::One), same("", "*=C"));
        assert_eq!(smiles("CF3", Attach::One), same("", "*C(F)(F)F"));
        assert_eq!(smiles("CH2CH2OH", Attach::One), same("", "*CCO"));
        assert_eq!(smiles("C(O)OCH3", Attach::One), same("", "*C(=O)OC"));
        assert_eq!(smiles("CO2CH3", Attach::One), same("", "*C(=O)OC"));
        assert_eq!(smiles("CH2CH2CH2", Attach::Two), same("", "*CCC*"));
        assert_eq!(smiles("CH2CHCH3", Attach::None), same("", "C=CC"));
        assert_eq!(
            smiles("CH3CH2", Attach::One).len(),
            smiles("CH2CH3", Attach::One).len()
        );
        assert_eq!(smiles("S(O)2CH3", Attach::One), same("", "*S(=O)(=O)C"));
        assert_eq!(smiles("CCH", Attach::One), same("", "*C#C"));
    }

    #[test]
    fn what_does_not_add_up_is_refused() {
        assert!(read_group("CH2CH2CH2", &Bare, Attach::One).is_err());
        assert!(read_group("CH3CH3CH3", &Bare, Attach::One).is_err());
        assert!(read_group("Xy", &Bare, Attach::One).is_err());
        assert!(read_group("(CH2", &Bare, Attach::One).is_err());
        assert!(read_group("", &Bare, Attach::One).is_err());
    }

    #[test]
    fn printing_reads_back() {
        for (s, attach) in [
            ("*CCCCC", Attach::One),
            ("*CC(C)C", Attach::One),
            ("*C(C)CC", Attach::One),
            ("*C(=O)CCC", Attach::One),
            ("*C=C", Attach::One),
            ("*CCO", Attach::One),
            ("*CCC*", Attach::Two),
            ("*C(C)C(C)*", Attach::Two),
            ("C=CCCC", Attach::None),
            ("CC=CCC", Attach::None),
            ("*C(F)(F)F", Attach::One),
            ("*C(C)(C)CC(C)(C)C", Attach::One),
        ] {
            let m = Molecule::from_smiles(s).unwrap();
            let text = print_group(&m, &Bare).unwrap_or_else(|| panic!("{s} not printed"));
            let back =
                read_group(&text, &Bare, attach).unwrap_or_else(|e| panic!("{s} -> {text}: {e}"));
            assert_eq!(
                back.canonical_smiles(),
                m.canonical_smiles(),
                "{s} -> {text}"
            );
        }
    }
}

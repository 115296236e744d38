//! Substrates and reagents as papers write them: a catalogue name (`MeI`, `AgBF4`, `H2`),
//! catalogue groups joined (`PhBr`, `TolB(OH)2`, `Bu3SnPh`, `HSiEt3`, `B(C6F5)3`), `A-B`,
//! an ion in brackets (`[Ph3C]+`), or SMILES. Each becomes a [`Species`] with a structure.

use std::sync::Arc;

use super::condensed::{read_group, substituent, Attach};
use super::derived::ligand_for;
use super::formula::LigandLookup;
use super::ligand::LigandDef;
use super::molecule::{Atom, Molecule};
use super::periodic::{self, symbol};
use super::species::{ion_of, Species};

/// A reagent read from text: the species, and the two groups it was written as (`A-B`,
/// `PhBr`), if it was.
#[derive(Debug, Clone)]
pub struct Reagent {
    pub species: Species,
    written: Option<(Molecule, Molecule)>,
    /// The split was written by the chemist as `A-B`: keep its order.
    pub split_written: bool,
}

impl Reagent {
    /// The two groups it splits into: as written, else at the one bond a metal readily
    /// breaks (H-H, C-I, Si-H, ...; see `split_bond`).
    pub fn split(&self) -> Option<(Molecule, Molecule)> {
        self.written
            .clone()
            .or_else(|| split_bond(&self.species.structure))
    }
}

/// Longest reagent text read.
const MAX_TEXT: usize = 300;

pub fn read(text: &str, lookup: &dyn LigandLookup) -> Result<Reagent, String> {
    let text = normalize(text);
    let text = text.trim();
    if text.is_empty() {
        return Err("no reagent given".into());
    }
    if text.chars().count() > MAX_TEXT {
        return Err(format!("a reagent of at most {MAX_TEXT} characters"));
    }
    if let Some(def) = lookup.substrate(text) {
        return Ok(Reagent {
            species: Species::of(def),
            written: None,
            split_written: false,
        });
    }
    // A-B: two groups named on either side of one dash
    if let Some((a, b)) = text.split_once('-') {
        if !a.is_empty() && !b.is_empty() && !b.contains('-') && !a.contains('[') {
            if let (Ok(ga), Ok(gb)) = (group(a, lookup), group(b, lookup)) {
                let m = join(&ga, &gb);
                return Ok(Reagent {
                    species: named(m, &format!("{a}-{b}"), lookup),
                    written: Some((ga, gb)),
                    split_written: true,
                });
            }
        }
    }
    let mut errors = Vec::new();
    match assemble(text, lookup, None) {
        Ok((m, split)) => {
            return Ok(Reagent {
                species: named(m, text, lookup),
                written: split,
                split_written: false,
            })
        }
        Err(e) => errors.push(e),
    }
    match Molecule::from_smiles(text) {
        Ok(m) if m.star_count() == 0 => {
            return Ok(Reagent {
                species: named(m, text, lookup),
                written: None,
                split_written: false,
            });
        }
        Ok(_) => errors.push("a reagent is a free species: no '*' in its SMILES".into()),
        Err(_) => {}
    }
    Err(format!(
        "cannot read the reagent '{text}': {}; write a catalogue name (nonet ligands --substrates), \
         groups joined as in PhBr or Bu3SnPh, A-B, or SMILES",
        errors.join("; ")
    ))
}

/// Dashes, minus signs and superscripts from pasted text, brought to ASCII.
fn normalize(text: &str) -> String {
    text.chars()
        .filter_map(|c| match c {
            '\u{2010}'..='\u{2015}' | '\u{2212}' => Some('-'),
            '⁺' => Some('+'),
            '⁻' => Some('-'),
            '=' | '≡' | '\u{200b}' => None,
            '\u{a0}' => Some(' '),
            c => {
                const SUB: &str = "₀₁₂₃₄₅₆₇₈₉";
                const SUP: &str = "⁰¹²³⁴⁵⁶⁷⁸⁹";
                SUB.chars()
                    .position(|s| s == c)
                    .or_else(|| SUP.chars().position(|s| s == c))
                    .map(|i| char::from(b'0' + i as u8))
                    .or(Some(c))
            }
        })
        .collect()
}

/// One group, with its `*`: a catalogue key or a condensed formula.
pub fn group(text: &str, lookup: &dyn LigandLookup) -> Result<Molecule, String> {
    if let Some(l) = lookup.exact(text) {
        if let Some(m) = substituent(l) {
            return Ok(m.clone());
        }
        return Err(format!("{} is not a group with one bond", l.key));
    }
    read_group(text, lookup, Attach::One).and_then(|m| match m.metal_bonds()[..] {
        [(_, 1)] => Ok(m),
        _ => Err(format!("'{text}' is not a group with one bond")),
    })
}

/// Two groups joined by a bond at their metal-holding atoms: Me + I -> MeI.
pub fn join(a: &Molecule, b: &Molecule) -> Molecule {
    let mut m = a.clone();
    let ia = m.strip_stars().first().map_or(0, |x| x.0);
    let mut g = b.clone();
    let ib = g.strip_stars().first().map_or(0, |x| x.0);
    let off = m.merge(&g);
    m.add_bond(ia, off + ib, 1);
    m
}

/// The species with the catalogue's name and hazards when it is a known substrate.
fn named(m: Molecule, written: &str, lookup: &dyn LigandLookup) -> Species {
    if let Some(def) = lookup.substrate_like(&m) {
        let mut s = Species::of(def);
        s.structure = m;
        return s;
    }
    Species::new(written, m)
}

/// Read "PhBr", "TolB(OH)2", "Bu3SnPh", "[Ph3C]+", "AgBF4", "[Ph3C][B(C6F5)4]": groups from
/// the catalogue around at most one central atom per ion.
fn assemble(
    text: &str,
    lookup: &dyn LigandLookup,
    given: Option<i32>,
) -> Result<(Molecule, Option<(Molecule, Molecule)>), String> {
    // bracketed ions side by side: "[Ph3C]+", "[Ph3C][B(C6F5)4]" (cation first)
    if text.starts_with('[') {
        let mut ions: Vec<(&str, Option<i32>)> = Vec::new();
        let mut rest = text;
        while let Some(r) = rest.strip_prefix('[') {
            let close = matching(r).ok_or("a '[' is never closed")?;
            let inner = &r[..close];
            let after = &r[close + 1..];
            let end = after.find('[').unwrap_or(after.len());
            let charge_text = after[..end].trim();
            let charge = if charge_text.is_empty() {
                None
            } else {
                Some(charge_of(charge_text).ok_or(format!("'{charge_text}' is not a charge"))?)
            };
            ions.push((inner, charge));
            rest = &after[end..];
        }
        if !rest.trim().is_empty() {
            return Err(format!("'{rest}' after the ions"));
        }
        let n = ions.len();
        let mut m = Molecule::default();
        for (k, (inner, charge)) in ions.into_iter().enumerate() {
            let implied = match (charge, n) {
                (Some(q), _) => Some(q),
                (None, 2) => Some(if k == 0 { 1 } else { -1 }),
                (None, _) => None,
            };
            let (ion, _) = assemble(inner, lookup, implied)?;
            m.merge(&ion);
        }
        return Ok((m, None));
    }
    let (body, charge) = match text.rfind(['+', '-']) {
        Some(i) if i > 0 && text[i + 1..].chars().all(|c| c.is_ascii_digit()) => {
            match charge_of(&text[i..]) {
                Some(q) => (&text[..i], Some(q)),
                None => (text, given),
            }
        }
        _ => (text, given),
    };
    let units = tokens(body, lookup)?;
    let groups: Vec<&Token> = units
        .iter()
        .filter(|u| matches!(u, Token::Group(..)))
        .collect();
    let centres: Vec<&Token> = units
        .iter()
        .filter(|u| matches!(u, Token::Element(..)))
        .collect();
    let mut m = Molecule::default();
    let mut split = None;
    match centres.len() {
        0 => {
            // two groups: PhBr, MeI, HSiEt3 (H is a group here)
            let all: Vec<(Arc<LigandDef>, u32)> = groups
                .iter()
                .filter_map(|g| match g {
                    Token::Group(l, n) => Some((l.clone(), *n)),
                    _ => None,
                })
                .collect();
            let flat: Vec<&Arc<LigandDef>> = all
                .iter()
                .flat_map(|(l, n)| std::iter::repeat_n(l, *n as usize))
                .collect();
            match flat[..] {
                [a, b] => {
                    let (ga, gb) = (
                        substituent(a).ok_or("not a group")?.clone(),
                        substituent(b).ok_or("not a group")?.clone(),
                    );
                    m = join(&ga, &gb);
                    split = Some((ga, gb));
                }
                [a] => {
                    // one group alone with a charge: [Ph3C]+ read as a group is not this
                    let ga = substituent(a).ok_or("not a group")?.clone();
                    m = ion_of(&ga, 0);
                }
                _ => {
                    return Err(format!(
                        "'{body}' names {} groups and no central atom",
                        flat.len()
                    ))
                }
            }
        }
        1 => {
            let Token::Element(z, h) = centres[0] else {
                return Err("no central atom".into());
            };
            let c = m.add_atom(Atom::new(*z, *h));
            for u in &units {
                if let Token::Group(l, n) = u {
                    let g = substituent(l).ok_or("not a group")?;
                    for _ in 0..*n {
                        let mut g = g.clone();
                        let at = g.strip_stars().first().map_or(0, |x| x.0);
                        let off = m.merge(&g);
                        m.add_bond(c, off + at, 1);
                    }
                }
            }
            let used = m.bond_valence(c) + *h;
            let fits = periodic::valences_charged(*z, charge.unwrap_or(0) as i8).contains(&used);
            if !fits {
                return Err(match charge {
                    Some(q) => format!("{} with {used} bonds does not carry a charge of {q:+}", symbol(*z)),
                    None => format!(
                        "{} with {used} bonds is not a neutral molecule; give its charge, e.g. [Ph3C]+",
                        symbol(*z)
                    ),
                });
            }
            if let Some(q) = charge {
                m.atoms[c].charge = q as i8;
            }
            return Ok((m, None));
        }
        _ => {
            return Err(format!(
                "'{body}' has {} central atoms; write it as SMILES",
                centres.len()
            ))
        }
    }
    if let Some(q) = charge {
        m = set_charge(m, q);
    }
    Ok((m, split))
}

/// Put a charge on an ion read without one: on its central or first atom.
fn set_charge(mut m: Molecule, q: i32) -> Molecule {
    let have = m.charge();
    if have == q {
        return m;
    }
    // the atom with most bonds carries it (C of Ph3C+, B of a borate)
    let at = (0..m.atoms.len()).max_by_key(|&i| m.heavy_neighbors(i).len());
    if let Some(i) = at {
        m.atoms[i].charge = m.atoms[i].charge.saturating_add((q - have) as i8);
    }
    m
}

fn charge_of(text: &str) -> Option<i32> {
    super::formula::charge_value(text)
}

fn matching(text: &str) -> Option<usize> {
    let mut depth = 1;
    for (i, c) in text.char_indices() {
        match c {
            '[' => depth += 1,
            ']' => {
                depth -= 1;
                if depth == 0 {
                    return Some(i);
                }
            }
            _ => {}
        }
    }
    None
}

enum Token {
    Group(Arc<LigandDef>, u32),
    Element(u8, u8),
}

/// Split "Bu3SnPh" into Bu x3, Sn, Ph: catalogue groups (longest first) and element symbols.
fn tokens(text: &str, lookup: &dyn LigandLookup) -> Result<Vec<Token>, String> {
    let mut out = Vec::new();
    let b = text.as_bytes();
    let mut pos = 0;
    while pos < b.len() {
        let rest = &text[pos..];
        if let Some(inner) = rest.strip_prefix('(') {
            let close = inner.find(')').ok_or("a '(' is never closed")?;
            let name = &inner[..close];
            let l = lookup
                .exact(name)
                .filter(|l| substituent(l).is_some())
                .cloned()
                .or_else(|| {
                    read_group(name, lookup, Attach::One)
                        .ok()
                        .map(|m| ligand_for(&m, lookup))
                })
                .ok_or(format!("'{name}' is not a group"))?;
            pos += close + 2;
            let n = count(text, &mut pos);
            out.push(Token::Group(l, n));
            continue;
        }
        // the longest catalogue group here
        let mut found = None;
        for len in (1..=rest.len().min(24)).rev() {
            let Some(t) = rest.get(..len) else { continue };
            if let Some(l) = lookup.exact(t).filter(|l| substituent(l).is_some()) {
                // an element symbol that is also a longer word's start ("Sn" in "SnBu3") is
                // the element; a group must not end inside a two-letter symbol
                let splits_symbol = rest.len() > len
                    && b[pos + len].is_ascii_lowercase()
                    && rest[len - 1..]
                        .get(..2)
                        .and_then(periodic::number)
                        .is_some();
                if !splits_symbol {
                    found = Some((l.clone(), len));
                    break;
                }
            }
        }
        let two = rest
            .get(..2)
            .filter(|s| s.as_bytes()[1].is_ascii_lowercase())
            .and_then(periodic::number);
        let one = rest.get(..1).and_then(periodic::number);
        match (found, two, one) {
            (Some((l, len)), two, _) if !(two.is_some() && len < 2) => {
                pos += len;
                let n = count(text, &mut pos);
                out.push(Token::Group(l, n));
            }
            (_, Some(z), _) | (None, None, Some(z)) => {
                pos += symbol(z).len();
                let mut h = 0;
                if text[pos..].starts_with('H')
                    && !text[pos + 1..].starts_with(|c: char| c.is_ascii_lowercase())
                {
                    pos += 1;
                    h = count(text, &mut pos).min(8) as u8;
                }
                let n = count(text, &mut pos);
                if n > 1 {
                    return Err(format!("{}{n}: several central atoms", symbol(z)));
                }
                out.push(Token::Element(z, h));
            }
            _ => {
                return Err(format!(
                    "'{}' is neither a catalogue group nor an element",
                    rest.chars().take(8).collect::<String>()
                ))
            }
        }
    }
    Ok(out)
}

fn count(text: &str, pos: &mut usize) -> u32 {
    let start = *pos;
    while *pos < text.len() && text.as_bytes()[*pos].is_ascii_digit() {
        *pos += 1;
    }
    text[start..*pos].parse().unwrap_or(1).clamp(1, 12)
}

/// The bond a metal breaks in an oxidative addition of this molecule, as two groups: to a
/// halogen or sulfonate first (C-I, C-Br, C-OTf, C-Cl), then H-H and H-main group (Si, B, Sn,
/// Ge), then B-B, Si-Si, Sn-Sn, then C-H (aryl before alkyl): common practice.
pub fn split_bond(m: &Molecule) -> Option<(Molecule, Molecule)> {
    if m.components().len() != 1 || m.charge() != 0 {
        return None;
    }
    let mut best: Option<(u8, usize)> = None;
    // hydrogens as atoms, so H-X bonds can be cut like any other
    let full = explicit_h(m);
    for (k, b) in full.bonds.iter().enumerate() {
        if b.order != 1 {
            continue;
        }
        let (x, y) = (full.atoms[b.a], full.atoms[b.b]);
        let score = bond_score(&full, b.a, b.b, x, y);
        if score > 0 && best.is_none_or(|(s, _)| score > s) && full.cut(k).is_some() {
            best = Some((score, k));
        }
    }
    let (_, k) = best?;
    let (mut pa, mut pb) = full.cut(k)?;
    super::molecule::fold_hydrogens(&mut pa);
    super::molecule::fold_hydrogens(&mut pb);
    Some((pa, pb))
}

fn bond_score(m: &Molecule, a: usize, b: usize, x: Atom, y: Atom) -> u8 {
    let halogen = |z: u8| match z {
        53 => 90,
        35 => 85,
        17 => 70,
        _ => 0,
    };
    let sulfonate_o = |i: usize| {
        m.atoms[i].z == periodic::O
            && m.heavy_neighbors(i)
                .iter()
                .any(|&s| m.atoms[s].z == periodic::S)
    };
    let (zx, zy) = (x.z, y.z);
    let pair = |p: u8, q: u8| (zx == p && zy == q) || (zx == q && zy == p);
    if halogen(zx) > 0 || halogen(zy) > 0 {
        return halogen(zx).max(halogen(zy));
    }
    if (zx == periodic::C && sulfonate_o(b)) || (zy == periodic::C && sulfonate_o(a)) {
        return 80;
    }
    if pair(1, 1) {
        return 75;
    }
    for (z, s) in [(14u8, 65u8), (5, 64), (50, 63), (32, 62)] {
        if pair(1, z) {
            return s;
        }
        if zx == z && zy == z {
            return s - 10;
        }
    }
    if pair(1, periodic::C) {
        // C-H of arenes and alkanes; an alkene or alkyne binds through its π bond instead
        let ci = if zx == periodic::C { a } else { b };
        let c = m.atoms[ci];
        let unsaturated = m.bonds.iter().any(|bd| bd.order == 2 || bd.order == 3);
        return if c.aromatic {
            40
        } else if unsaturated {
            0
        } else {
            30
        };
    }
    0
}

/// The molecule with every hydrogen as an atom of its own.
fn explicit_h(m: &Molecule) -> Molecule {
    let mut out = m.clone();
    for i in 0..m.atoms.len() {
        let n = out.atoms[i].h;
        out.atoms[i].h = 0;
        for _ in 0..n {
            let h = out.add_atom(Atom::new(periodic::H, 0));
            out.add_bond(i, h, 1);
        }
    }
    out
}

/// A name for a species a step makes: the catalogue's key when it is a known substrate or
/// free ligand, else the central atom with its groups (`B(OH)2Br`, `AgCl`, `CHPh3`), with
/// `first` (the group that just joined) written ahead of a non-metal centre (`BrB(OH)2`,
/// `MeB(C6F5)3`); else the Hill formula.
pub fn name_species(m: &Molecule, first: Option<&str>, lookup: &dyn LigandLookup) -> String {
    if let Some(def) = lookup.substrate_like(m) {
        return def.key.clone();
    }
    let neutral = strip_charges(m);
    if m.star_count() == 0 {
        if let Some(l) = lookup.ligand_like(&neutral) {
            if l.structure.as_ref().is_some_and(|s| s.star_count() == 0) {
                return l.key.clone();
            }
        }
    }
    // an anion named as the group it is on a metal: OTf-, OAc-, Cl-
    if m.charge() == -1 && m.is_connected() {
        if let Some(at) = (0..m.atoms.len()).find(|&i| m.atoms[i].charge < 0) {
            let mut g = m.clone();
            g.atoms[at].charge = 0;
            let s = g.add_atom(Atom::star());
            g.add_bond(at, s, 1);
            if let Some(l) = lookup.ligand_like(&g) {
                return l.key.clone();
            }
        }
    }
    central_name(m, first, lookup).unwrap_or_else(|| m.composition().to_string())
}

fn strip_charges(m: &Molecule) -> Molecule {
    let mut n = m.clone();
    for a in &mut n.atoms {
        a.charge = 0;
    }
    n
}

/// "B(OH)2Br": the atom whose bonds all lead to catalogue groups or single atoms.
fn central_name(m: &Molecule, first: Option<&str>, lookup: &dyn LigandLookup) -> Option<String> {
    if m.atoms.is_empty() {
        return None;
    }
    if m.atoms.len() == 1 {
        let a = m.atoms[0];
        let mut s = symbol(a.z).to_string();
        if a.h > 0 {
            s.push('H');
            if a.h > 1 {
                s.push_str(&a.h.to_string());
            }
        }
        return Some(s);
    }
    let adj = m.adjacency();
    let degree = |i: usize| adj[i].len();
    // centres worth trying: non-carbon atoms, and carbons with three or more neighbours
    // outside a ring system; most bonds first
    let mut centres: Vec<usize> = (0..m.atoms.len())
        .filter(|&c| {
            let a = m.atoms[c];
            !a.is_star()
                && degree(c) >= 1
                && (a.z != periodic::C || (degree(c) >= 3 && !a.aromatic))
        })
        .collect();
    centres.sort_by_key(|&c| std::cmp::Reverse(degree(c)));
    let mut best: Option<(usize, Vec<String>)> = None;
    let mut seen = vec![usize::MAX; m.atoms.len()];
    'centre: for c in centres {
        let mut names = Vec::new();
        let mut reached = 1;
        for (t, &(start, k)) in adj[c].iter().enumerate() {
            if m.bonds[k].order != 1 {
                continue 'centre;
            }
            // the atoms beyond this bond, not passing through the centre
            let mut keep = vec![start];
            seen[start] = c * 64 + t;
            let mut stack = vec![start];
            while let Some(i) = stack.pop() {
                for &(j, _) in &adj[i] {
                    if j == c {
                        if i != start {
                            continue 'centre; // a ring through the centre
                        }
                        continue;
                    }
                    if seen[j] != c * 64 + t {
                        seen[j] = c * 64 + t;
                        keep.push(j);
                        stack.push(j);
                    }
                }
            }
            reached += keep.len();
            keep.sort_unstable();
            let mut g = m.fragment(&keep, &[(start, 1)]);
            for a in &mut g.atoms {
                a.charge = 0;
            }
            let name = if g.atoms.len() == 2 && g.atoms[0].h == 0 {
                // a single atom: F, Cl, H
                Some(symbol(g.atoms[0].z).to_string())
            } else {
                lookup
                    .ligand_like(&g)
                    .filter(|l| substituent(l).is_some())
                    .map(|l| l.key.clone())
            };
            match name {
                Some(n) => names.push(n),
                None => continue 'centre,
            }
        }
        // one piece: every atom is the centre or beyond one of its bonds
        if reached == m.atoms.len() && !names.is_empty() {
            best = Some((c, names));
            break;
        }
    }
    let (c, mut names) = best?;
    let a = m.atoms[c];
    let mut centre = symbol(a.z).to_string();
    if a.h > 0 {
        centre.push('H');
        if a.h > 1 {
            centre.push_str(&a.h.to_string());
        }
    }
    let metal_centre = matches!(
        a.z,
        3 | 11 | 12 | 13 | 19 | 29 | 30 | 37 | 47 | 55 | 80 | 81
    );
    let mut lead = String::new();
    if let Some(f) = first {
        if let Some(i) = names.iter().position(|n| n == f) {
            if !metal_centre {
                lead = bracket(&names.remove(i), 1);
            }
        }
    }
    names.sort_by_key(|n| (first != Some(n.as_str()), n.clone()));
    let mut out = lead + &centre;
    let mut k = 0;
    while k < names.len() {
        let mut j = k + 1;
        while j < names.len() && names[j] == names[k] {
            j += 1;
        }
        out.push_str(&bracket(&names[k], j - k));
        k = j;
    }
    Some(out)
}

/// "Bu3", "(OH)2", "(C6F5)3", "Cl": a group with its count, in parentheses when its name
/// has digits or more than one capital.
fn bracket(name: &str, n: usize) -> String {
    let capitals = name.chars().filter(char::is_ascii_uppercase).count();
    let plain = capitals <= 1
        && !name.chars().any(|c| c.is_ascii_digit())
        && name.starts_with(|c: char| c.is_ascii_uppercase());
    let mut s =
        if plain || n == 1 && capitals <= 1 && name.starts_with(|c: char| c.is_ascii_uppercase()) {
            name.to_string()
        } else {
            format!("({name})")
        };
    if n > 1 {
        s.push_str(&n.to_string());
    }
    s
}

/// What an electrophile gives: the group that bonds (with its `*`), and what is left of the
/// reagent (the acid's anion, the ether of an oxonium, a counter-anion).
#[derive(Debug, Clone)]
pub struct Electrophile {
    pub group: Molecule,
    pub rest: Vec<Molecule>,
}

impl Electrophile {
    pub fn is_proton(&self) -> bool {
        let heavy: Vec<&Atom> = self.group.atoms.iter().filter(|a| !a.is_star()).collect();
        matches!(heavy[..], [a] if a.z == periodic::H)
    }

    pub fn name(&self) -> String {
        if self.is_proton() {
            "H+".into()
        } else {
            format!("{}+", self.group.composition())
        }
    }
}

/// The electrophile a reagent delivers: a carbocation (Ph3C+), the proton of an acid or
/// oxonium (HCl, HOTf, [H(OEt2)2]+), the alkyl of an alkylating agent (MeOTf, MeI, Me3O+).
pub fn electrophile(m: &Molecule) -> Option<Electrophile> {
    let parts = m.components();
    if let Some(i) = parts.iter().position(|p| p.charge() > 0) {
        let p = &parts[i];
        let mut rest: Vec<Molecule> = parts
            .iter()
            .enumerate()
            .filter(|(k, _)| *k != i)
            .map(|(_, x)| x.clone())
            .collect();
        let at = (0..p.atoms.len()).find(|&a| p.atoms[a].charge > 0)?;
        let a = p.atoms[at];
        if a.z == periodic::H && p.atoms.len() == 1 {
            return Some(Electrophile {
                group: hydrogen_group(),
                rest,
            });
        }
        if a.z == periodic::C {
            let mut g = p.clone();
            g.atoms[at].charge = 0;
            let s = g.add_atom(Atom::star());
            g.add_bond(at, s, 1);
            return Some(Electrophile { group: g, rest });
        }
        if matches!(a.z, 7 | 8 | 16) {
            if a.h > 0 {
                let mut left = p.clone();
                left.atoms[at].h -= 1;
                left.atoms[at].charge -= 1;
                rest.insert(0, left);
                return Some(Electrophile {
                    group: hydrogen_group(),
                    rest,
                });
            }
            // Me3O+: a methyl on the onium atom goes
            let k = p.bonds.iter().position(|b| {
                b.other(at)
                    .is_some_and(|c| p.atoms[c].z == periodic::C && !p.atoms[c].aromatic)
            })?;
            let (x, y) = p.cut(k)?;
            let (mut onium, alkyl) = if p.bonds[k].a == at { (x, y) } else { (y, x) };
            onium.strip_stars();
            if let Some(o) = onium.atoms.iter_mut().find(|o| o.charge > 0) {
                o.charge -= 1;
            }
            rest.insert(0, onium);
            return Some(Electrophile { group: alkyl, rest });
        }
        return None;
    }
    if parts.len() != 1 {
        return None;
    }
    let p = &parts[0];
    // an acid: H on a halogen, O, S or N
    for z in [9u8, 17, 35, 53, 8, 16, 7] {
        if let Some(at) = (0..p.atoms.len()).find(|&i| p.atoms[i].z == z && p.atoms[i].h > 0) {
            let mut base = p.clone();
            base.atoms[at].h -= 1;
            base.atoms[at].charge -= 1;
            return Some(Electrophile {
                group: hydrogen_group(),
                rest: vec![base],
            });
        }
    }
    // an alkylating agent: an sp3 carbon on iodide, bromide, chloride or a sulfonate oxygen
    for (k, b) in p.bonds.iter().enumerate() {
        for (c, x) in [(b.a, b.b), (b.b, b.a)] {
            let carbon = p.atoms[c].z == periodic::C && !p.atoms[c].aromatic;
            let leaves = match p.atoms[x].z {
                53 | 35 | 17 => true,
                8 => p
                    .heavy_neighbors(x)
                    .iter()
                    .any(|&s| p.atoms[s].z == periodic::S),
                _ => false,
            };
            if carbon && leaves && b.order == 1 {
                let (first, second) = p.cut(k)?;
                let (alkyl, mut leaving) = if b.a == c {
                    (first, second)
                } else {
                    (second, first)
                };
                let bound = leaving.strip_stars();
                if let Some(&(i, _)) = bound.first() {
                    leaving.atoms[i].charge -= 1;
                }
                return Some(Electrophile {
                    group: alkyl,
                    rest: vec![leaving],
                });
            }
        }
    }
    None
}

/// A hydrogen atom as a group, `*[H]`.
pub fn hydrogen_group() -> Molecule {
    let mut m = Molecule::default();
    let h = m.add_atom(Atom::new(periodic::H, 0));
    let s = m.add_atom(Atom::star());
    m.add_bond(h, s, 1);
    m
}

/// What a step asks a reagent to do.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Role {
    /// Add across the metal (has a bond to split).
    Adds,
    /// Bring an organic group on a main-group metal (B, Zn, Sn, Mg, Si, Cu, Li, Al).
    Transmetalates,
    /// Take an anionic ligand: a cation or a Lewis acid.
    Abstracts,
    /// Give a proton or an alkyl.
    Electrophile,
    /// Give an anion or attack through an O-H, N-H, S-H.
    Nucleophile,
    /// Take a proton.
    Base,
    /// Offer a C-H bond.
    CH,
}

/// Whether a substrate fits a role (used to rank what a step's question offers).
pub fn suits(m: &Molecule, role: Role) -> bool {
    let parts = m.components();
    let has = |z: &[u8]| m.atoms.iter().any(|a| z.contains(&a.z));
    match role {
        Role::Adds => split_bond(m).is_some(),
        Role::Transmetalates => {
            has(&[3, 5, 12, 13, 14, 29, 30, 50])
                && m.bonds.iter().any(|b| {
                    let (x, y) = (m.atoms[b.a].z, m.atoms[b.b].z);
                    (x == periodic::C) != (y == periodic::C)
                        && [x, y]
                            .iter()
                            .any(|z| [3, 5, 12, 13, 14, 29, 30, 50].contains(z))
                })
        }
        Role::Abstracts => {
            parts.iter().any(|p| p.charge() > 0)
                || (0..m.atoms.len()).any(|i| {
                    let a = m.atoms[i];
                    matches!(a.z, 5 | 13) && a.charge == 0 && m.bond_valence(i) + a.h == 3
                })
        }
        Role::Electrophile => electrophile(m).is_some(),
        Role::Nucleophile => {
            parts.iter().any(|p| p.charge() < 0)
                || m.atoms
                    .iter()
                    .any(|a| matches!(a.z, periodic::O | periodic::N | periodic::S) && a.h > 0)
        }
        Role::Base => {
            parts.iter().any(|p| p.charge() < 0)
                || m.atoms
                    .iter()
                    .any(|a| a.z == periodic::N && a.charge == 0 && a.h <= 1)
        }
        Role::CH => m
            .atoms
            .iter()
            .any(|a| a.z == periodic::C && a.h > 0 && a.aromatic),
    }
}

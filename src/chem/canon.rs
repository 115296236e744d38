//! Canonical atom order and the SMILES writer.
//!
//! Atoms are ranked by refining classes of element, hydrogens, charge and bonds against their
//! neighbours' classes until nothing splits (Morgan's idea, J. Chem. Doc. 1965, 5, 107, in the
//! form of Weininger, Weininger & Weininger, J. Chem. Inf. Comput. Sci. 1989, 29, 97); ties
//! between equivalent atoms are broken by trying each in turn and keeping the smallest SMILES,
//! with a bound on the tries so a highly symmetric ligand stays cheap.

use std::collections::HashMap;
use std::sync::{Mutex, OnceLock};

use super::molecule::{Molecule, AROMATIC};
use super::periodic::{self, symbol};

/// Leaves of the tie-breaking search tried at most.
const MAX_LEAVES: usize = 32;

/// Canonical strings already worked out, by the exact atom and bond lists: steps build the
/// same fragments again and again (the C6F5 of a borane, the acetate of a base), and the
/// planner previews the same step on every key press.
static MEMO: OnceLock<Mutex<HashMap<Vec<u8>, String>>> = OnceLock::new();

/// Entries kept before the memo starts afresh (a few MB at most).
const MEMO_MAX: usize = 20_000;

pub fn canonical_smiles(m: &Molecule) -> String {
    let mut key = Vec::with_capacity(4 * m.atoms.len() + 5 * m.bonds.len());
    for a in &m.atoms {
        key.extend_from_slice(&[a.z, a.h, a.charge as u8, a.aromatic as u8]);
    }
    key.push(0xff);
    for b in &m.bonds {
        key.extend_from_slice(&(b.a as u16).to_le_bytes());
        key.extend_from_slice(&(b.b as u16).to_le_bytes());
        key.push(b.order);
    }
    let memo = MEMO.get_or_init(|| Mutex::new(HashMap::new()));
    if let Some(s) = memo.lock().ok().and_then(|g| g.get(&key).cloned()) {
        return s;
    }
    let s = compute(m);
    if let Ok(mut g) = memo.lock() {
        if g.len() >= MEMO_MAX {
            g.clear();
        }
        g.insert(key, s.clone());
    }
    s
}

fn compute(m: &Molecule) -> String {
    let n = m.atoms.len();
    if n == 0 {
        return String::new();
    }
    let adj = adjacency(m);
    let start: Vec<u64> = m
        .atoms
        .iter()
        .enumerate()
        .map(|(i, a)| {
            let orders: u64 = adj[i]
                .iter()
                .fold(0u64, |acc, &(_, o)| acc + (1u64 << (8 * (o as u64 % 5))));
            ((a.z as u64) << 48)
                ^ ((a.h as u64) << 40)
                ^ (((a.charge as i64 + 64) as u64) << 32)
                ^ ((a.aromatic as u64) << 31)
                ^ (orders & 0x7fff_ffff)
        })
        .collect();
    let classes = refine(&adj, rank_values(&start));
    // equivalent atoms give the same string whichever is taken first: take the first, then
    // the last, of each tied class; only when the two differ (tied atoms that are not
    // equivalent, which refinement rarely leaves) search the ties
    let first = descend(m, &adj, classes.clone(), false);
    let last = descend(m, &adj, classes.clone(), true);
    if first == last {
        return first;
    }
    let mut best: Option<String> = Some(first.min(last));
    let mut leaves = 0;
    search(m, &adj, classes, &mut best, &mut leaves);
    best.unwrap_or_default()
}

/// Break ties down to single atoms, always taking the first (or last) atom of the smallest
/// tied class, and write the SMILES of that order.
fn descend(m: &Molecule, adj: &[Vec<(usize, u8)>], mut classes: Vec<usize>, last: bool) -> String {
    loop {
        let mut sizes = vec![0usize; classes.len()];
        for &c in &classes {
            sizes[c] += 1;
        }
        let Some(target) = (0..sizes.len()).find(|&c| sizes[c] > 1) else {
            let mut order: Vec<usize> = (0..classes.len()).collect();
            order.sort_by_key(|&i| classes[i]);
            return write_smiles(m, &order);
        };
        let mut members = (0..classes.len()).filter(|&i| classes[i] == target);
        let pick = if last {
            members.next_back()
        } else {
            members.next()
        };
        let Some(pick) = pick else {
            return String::new();
        };
        let split: Vec<usize> = classes
            .iter()
            .enumerate()
            .map(|(i, &c)| 2 * c + usize::from(c == target && i != pick))
            .collect();
        classes = refine(adj, rank_values(&split));
    }
}

fn adjacency(m: &Molecule) -> Vec<Vec<(usize, u8)>> {
    let mut adj = vec![Vec::new(); m.atoms.len()];
    for b in &m.bonds {
        if b.a < adj.len() && b.b < adj.len() {
            adj[b.a].push((b.b, b.order));
            adj[b.b].push((b.a, b.order));
        }
    }
    adj
}

/// Dense ranks 0.. of arbitrary sortable values.
fn rank_values<T: Ord + Clone>(values: &[T]) -> Vec<usize> {
    let mut sorted: Vec<T> = values.to_vec();
    sorted.sort();
    sorted.dedup();
    values
        .iter()
        .map(|v| sorted.binary_search(v).unwrap_or(0))
        .collect()
}

/// Split classes by the multiset of (bond order, neighbour class) until stable. The
/// multiset is hashed (FNV-1a over the sorted pairs), so a step costs a sort of small
/// arrays rather than of vectors.
fn refine(adj: &[Vec<(usize, u8)>], mut classes: Vec<usize>) -> Vec<usize> {
    let count = |c: &[usize]| c.iter().copied().max().map_or(0, |m| m + 1);
    let mut k = count(&classes);
    let mut pairs: Vec<u64> = Vec::new();
    loop {
        let sig: Vec<(usize, u64)> = (0..classes.len())
            .map(|i| {
                pairs.clear();
                pairs.extend(
                    adj[i]
                        .iter()
                        .map(|&(j, o)| ((classes[j] as u64) << 8) | o as u64),
                );
                pairs.sort_unstable();
                let mut h: u64 = 0xcbf2_9ce4_8422_2325;
                for &p in &pairs {
                    for byte in p.to_le_bytes() {
                        h ^= byte as u64;
                        h = h.wrapping_mul(0x0100_0000_01b3);
                    }
                }
                (classes[i], h)
            })
            .collect();
        let next = rank_values(&sig);
        let k2 = count(&next);
        classes = next;
        if k2 == k {
            return classes;
        }
        k = k2;
    }
}

fn search(
    m: &Molecule,
    adj: &[Vec<(usize, u8)>],
    classes: Vec<usize>,
    best: &mut Option<String>,
    leaves: &mut usize,
) {
    // the smallest class with more than one member
    let mut sizes = vec![0usize; classes.len()];
    for &c in &classes {
        sizes[c] += 1;
    }
    let target = (0..sizes.len()).find(|&c| sizes[c] > 1);
    let Some(target) = target else {
        *leaves += 1;
        let mut order: Vec<usize> = (0..classes.len()).collect();
        order.sort_by_key(|&i| classes[i]);
        let s = write_smiles(m, &order);
        if best.as_ref().is_none_or(|b| s < *b) {
            *best = Some(s);
        }
        return;
    };
    let members: Vec<usize> = (0..classes.len())
        .filter(|&i| classes[i] == target)
        .collect();
    for &pick in &members {
        if *leaves >= MAX_LEAVES && best.is_some() {
            return;
        }
        // the picked atom goes first in its class
        let split: Vec<usize> = classes
            .iter()
            .enumerate()
            .map(|(i, &c)| 2 * c + usize::from(c == target && i != pick))
            .collect();
        let refined = refine(adj, rank_values(&split));
        search(m, adj, refined, best, leaves);
    }
}

/// Write SMILES visiting atoms in `priority` order (earlier first): each piece starts at its
/// first atom, branches are taken in priority order, ring bonds get the lowest free digit.
pub fn write_smiles(m: &Molecule, priority: &[usize]) -> String {
    let n = m.atoms.len();
    let mut rank = vec![usize::MAX; n];
    for (r, &i) in priority.iter().enumerate() {
        if i < n {
            rank[i] = r;
        }
    }
    let mut adj = adjacency(m);
    for list in &mut adj {
        list.sort_by_key(|&(j, _)| (rank[j], j));
    }
    // first pass: the depth-first tree, and the bonds that close rings (ancestor first)
    let mut visited = vec![false; n];
    let mut on_stack = vec![false; n];
    let mut parent = vec![usize::MAX; n];
    let mut children: Vec<Vec<(usize, u8)>> = vec![Vec::new(); n];
    let mut rings_at: Vec<Vec<usize>> = vec![Vec::new(); n];
    let mut closures: Vec<u8> = Vec::new();
    let mut roots = Vec::new();
    let mut by_rank: Vec<usize> = (0..n).collect();
    by_rank.sort_by_key(|&i| (rank[i], i));
    for &root in &by_rank {
        if visited[root] {
            continue;
        }
        roots.push(root);
        visited[root] = true;
        on_stack[root] = true;
        let mut stack: Vec<(usize, usize)> = vec![(root, 0)];
        while let Some(top) = stack.last_mut() {
            let (i, next) = (top.0, top.1);
            if next >= adj[i].len() {
                on_stack[i] = false;
                stack.pop();
                continue;
            }
            top.1 += 1;
            let (j, o) = adj[i][next];
            if j == parent[i] {
                continue;
            }
            if !visited[j] {
                visited[j] = true;
                on_stack[j] = true;
                parent[j] = i;
                children[i].push((j, o));
                stack.push((j, 0));
            } else if on_stack[j] {
                // a bond back to an ancestor: the ring opens at j, closes at i
                let ci = closures.len();
                closures.push(o);
                rings_at[j].push(ci);
                rings_at[i].push(ci);
            }
        }
    }
    enum Work {
        Atom(usize, u8),
        Open,
        Close,
    }
    let mut out = String::new();
    let mut digit: Vec<Option<usize>> = vec![None; closures.len()];
    let mut in_use = [false; 100];
    for (k, &root) in roots.iter().enumerate() {
        if k > 0 {
            out.push('.');
        }
        let mut stack = vec![Work::Atom(root, 0)];
        while let Some(w) = stack.pop() {
            match w {
                Work::Open => out.push('('),
                Work::Close => out.push(')'),
                Work::Atom(i, order) => {
                    if order > 0 {
                        let p = parent[i];
                        let aro = p < n && m.atoms[p].aromatic && m.atoms[i].aromatic;
                        out.push_str(bond_symbol(order, aro));
                    }
                    out.push_str(&atom_text(m, i, &adj[i]));
                    for &ci in &rings_at[i] {
                        match digit[ci] {
                            None => {
                                let d = (1..100).find(|&d| !in_use[d]).unwrap_or(99);
                                in_use[d] = true;
                                digit[ci] = Some(d);
                                // the bond symbol goes with the opening digit
                                let partner = (0..n)
                                    .find(|&x| x != i && rings_at[x].contains(&ci))
                                    .unwrap_or(i);
                                let aro = m.atoms[partner].aromatic && m.atoms[i].aromatic;
                                out.push_str(bond_symbol(closures[ci], aro));
                                push_ring_digit(&mut out, d);
                            }
                            Some(d) => {
                                in_use[d] = false;
                                push_ring_digit(&mut out, d);
                            }
                        }
                    }
                    let kids = &children[i];
                    for (k, &(c, o)) in kids.iter().enumerate().rev() {
                        if k + 1 < kids.len() {
                            stack.push(Work::Close);
                            stack.push(Work::Atom(c, o));
                            stack.push(Work::Open);
                        } else {
                            stack.push(Work::Atom(c, o));
                        }
                    }
                }
            }
        }
    }
    out
}

fn push_ring_digit(out: &mut String, d: usize) {
    if d < 10 {
        out.push(char::from(b'0' + d as u8));
    } else {
        out.push('%');
        out.push_str(&d.to_string());
    }
}

fn bond_symbol(order: u8, between_aromatic: bool) -> &'static str {
    match order {
        1 if between_aromatic => "-",
        2 => "=",
        3 => "#",
        4 => "$",
        _ => "",
    }
}

/// Hydrogens OpenSMILES implies on an unbracketed atom of the organic subset with this bond
/// valence (aromatic atoms give one valence to the ring).
fn implied_h(z: u8, aromatic: bool, valence: u8) -> Option<u8> {
    let targets: &[u8] = match z {
        5 => &[3],
        6 => &[4],
        7 | 15 => &[3, 5],
        8 => &[2],
        16 => &[2, 4, 6],
        9 | 17 | 35 | 53 => &[1],
        _ => return None,
    };
    let v = valence + u8::from(aromatic);
    Some(targets.iter().find(|&&t| t >= v).map_or(0, |t| t - v))
}

fn atom_text(m: &Molecule, i: usize, adj: &[(usize, u8)]) -> String {
    let a = m.atoms[i];
    if a.is_star() {
        return "*".into();
    }
    let sym = symbol(a.z);
    let valence: u8 = adj
        .iter()
        .map(|&(_, o)| if o == AROMATIC { 1 } else { o })
        .sum();
    let aromatic_ok = a.aromatic && periodic::may_be_aromatic(a.z);
    let text = if aromatic_ok {
        sym.to_ascii_lowercase()
    } else {
        sym.to_string()
    };
    let bare = a.charge == 0
        && periodic::organic_subset(a.z)
        && (!a.aromatic || matches!(a.z, 5 | 6 | 7 | 8 | 15 | 16))
        && implied_h(a.z, aromatic_ok, valence) == Some(a.h);
    if bare {
        return text;
    }
    let mut s = String::from("[");
    s.push_str(&text);
    if a.h > 0 {
        s.push('H');
        if a.h > 1 {
            s.push_str(&a.h.to_string());
        }
    }
    if a.charge != 0 {
        s.push(if a.charge > 0 { '+' } else { '-' });
        if a.charge.abs() > 1 {
            s.push_str(&a.charge.abs().to_string());
        }
    }
    s.push(']');
    s
}

#[cfg(test)]
mod tests {
    use super::*;

    fn canon(s: &str) -> String {
        Molecule::from_smiles(s).unwrap().canonical_smiles()
    }

    #[test]
    fn same_molecule_same_string() {
        assert_eq!(canon("OCC"), canon("CCO"));
        assert_eq!(canon("c1ccccc1C"), canon("Cc1ccccc1"));
        assert_eq!(canon("*CC(C)C"), canon("CC(C)C*"));
        assert_ne!(canon("*CCC"), canon("*C(C)C"));
        assert_eq!(
            canon("P(c1ccccc1)(c1ccccc1)c1ccccc1"),
            canon("c1ccc(cc1)P(c1ccccc1)c1ccccc1")
        );
    }

    #[test]
    fn written_smiles_read_back() {
        for s in [
            "CCO",
            "*C(C)=O",
            "[CH]1C=CC=C1",
            "c1ccc(-c2ccccc2)cc1",
            "[Ag+].F[B-](F)(F)F",
            "*[H]",
            "[H][H]",
            "C1CC2CCC1C2",
            "*OS(=O)(=O)C(F)(F)F",
            "[C-]#[O+]",
            "*N=[N+]=[N-]",
            "Cc1cc(C)c(c(C)c1)N1C=CN(c2c(C)cc(C)cc2C)[C]1",
        ] {
            let m = Molecule::from_smiles(s).unwrap();
            let c = m.canonical_smiles();
            let back = Molecule::from_smiles(&c).unwrap_or_else(|e| panic!("{s} -> {c}: {e}"));
            assert_eq!(back.canonical_smiles(), c, "{s}");
            assert_eq!(back.composition(), m.composition(), "{s} -> {c}");
        }
    }
}

//! Stereodescriptors of an arrangement on a polyhedron, by the rules of IUPAC, Nomenclature
//! of Inorganic Chemistry, Recommendations 2005 (the "Red Book"), IR-9.3: the polyhedral
//! symbol, the configuration index worked out from the donors' priority numbers (IR-9.3.3),
//! and the chirality symbol C or A (IR-9.3.4.4-9), as in `OC-6-24-A`.
//!
//! Priority numbers come from the caller (1 is the most preferred donor); nonet ranks real
//! ligands by an approximation of the CIP rules (see `geometry`).

use super::isomers::Seat;
use super::polyhedron::Polyhedron;

/// The full descriptor: polyhedral symbol, configuration index where the polyhedron has one,
/// and C or A when the arrangement is chiral and the priority sequence tells the two apart.
pub fn descriptor(poly: &Polyhedron, seats: &[Seat], rank: &dyn Fn(char) -> u8) -> String {
    let mut out = poly.symbol.to_string();
    if let Some(index) = configuration_index(poly, seats, rank) {
        out.push('-');
        out.push_str(&index);
    }
    if let Some(c) = chirality(poly, seats, rank) {
        out.push('-');
        out.push(c);
    }
    out
}

fn digit(n: u8) -> char {
    char::from_digit(u32::from(n.min(9)), 10).unwrap_or('9')
}

/// The configuration index (IR-9.3.3): one digit for SP-4 and TS-3, two for OC-6, SPY-5 and
/// TBPY-5, two and then the equatorial sequence for PBPY-7; None for L-2, TP-3 and T-4.
pub fn configuration_index(
    poly: &Polyhedron,
    seats: &[Seat],
    rank: &dyn Fn(char) -> u8,
) -> Option<String> {
    let pr = |p: u8| seats.get(p as usize).map_or(9, |s| rank(s.0));
    let n = seats.len() as u8;
    let all: Vec<u8> = (0..n).collect();
    match poly.symbol {
        // the digit trans to the most preferred donor; among several of priority 1, the
        // largest such digit (the principle of trans maximum difference, IR-9.3.3.4)
        "SP-4" => Some(digit(trans_to_best(poly, &all, &pr)?.1).to_string()),
        "OC-6" => {
            let (axis, first) = trans_to_best(poly, &all, &pr)?;
            let other = poly.trans_to(axis)?;
            let plane: Vec<u8> = all
                .iter()
                .copied()
                .filter(|&p| p != axis && p != other)
                .collect();
            let (_, second) = trans_to_best(poly, &plane, &pr)?;
            Some(format!("{}{}", digit(first), digit(second)))
        }
        "SPY-5" => {
            let basal: Vec<u8> = (1..5).collect();
            let (_, second) = trans_to_best(poly, &basal, &pr)?;
            Some(format!("{}{}", digit(pr(0)), digit(second)))
        }
        "TBPY-5" | "PBPY-7" => {
            let (a, b) = (pr(0).min(pr(1)), pr(0).max(pr(1)));
            let mut s = format!("{}{}", digit(a), digit(b));
            if poly.symbol == "PBPY-7" {
                let view = if pr(0) <= pr(1) { 0 } else { 1 };
                let ring = poly.clockwise_around(view, &all);
                let (seq, _) = lowest_sequence(&ring, &pr)?;
                s.push('-');
                s.extend(seq.into_iter().map(digit));
            }
            Some(s)
        }
        "TS-3" => Some(digit(pr(1)).to_string()),
        _ => None,
    }
}

/// Among `among`, the positions of the most preferred donor that have a trans partner, and
/// the partner's priority number: the largest when there is a choice. Returns (position of
/// the preferred donor, partner's priority).
fn trans_to_best(poly: &Polyhedron, among: &[u8], pr: &dyn Fn(u8) -> u8) -> Option<(u8, u8)> {
    let best = among
        .iter()
        .filter(|&&p| poly.trans_to(p).is_some())
        .map(|&p| pr(p))
        .min()?;
    among
        .iter()
        .filter(|&&p| pr(p) == best)
        .filter_map(|&p| Some((p, pr(poly.trans_to(p)?))))
        .max_by_key(|&(_, t)| t)
}

/// The lowest sequence of priority numbers around a ring of positions (given clockwise),
/// starting at a most preferred one and going either way; true when it runs clockwise. When
/// both ways give the same lowest sequence the answer is None for the direction.
fn lowest_sequence(ring: &[u8], pr: &dyn Fn(u8) -> u8) -> Option<(Vec<u8>, Option<bool>)> {
    let n = ring.len();
    let best = ring.iter().map(|&p| pr(p)).min()?;
    let mut found: Option<(Vec<u8>, Option<bool>)> = None;
    for start in (0..n).filter(|&i| pr(ring[i]) == best) {
        for clockwise in [true, false] {
            let seq: Vec<u8> = (0..n)
                .map(|k| {
                    let i = if clockwise {
                        (start + k) % n
                    } else {
                        (start + n - k) % n
                    };
                    pr(ring[i])
                })
                .collect();
            found = match found {
                None => Some((seq, Some(clockwise))),
                Some((f, dir)) => {
                    if seq < f {
                        Some((seq, Some(clockwise)))
                    } else if seq == f && dir != Some(clockwise) {
                        Some((f, None))
                    } else {
                        Some((f, dir))
                    }
                }
            };
        }
    }
    found
}

/// C (clockwise) or A (anticlockwise) by IR-9.3.4: look down the reference axis from its
/// more preferred donor and read the priorities in the plane around it, from the most
/// preferred, the way that gives the lower sequence. None when the arrangement is not told
/// from its mirror image this way (achiral, or a tie in both directions).
pub fn chirality(poly: &Polyhedron, seats: &[Seat], rank: &dyn Fn(char) -> u8) -> Option<char> {
    let pr = |p: u8| seats.get(p as usize).map_or(9, |s| rank(s.0));
    let n = seats.len() as u8;
    let all: Vec<u8> = (0..n).collect();
    // the viewpoints the rules allow: each a position to look from, with the ring around it
    let views: Vec<u8> = match poly.symbol {
        "OC-6" => {
            // the reference axis: priority 1 and the trans donor of highest number; every
            // such choice is tried and the lowest sequence wins
            let best = all.iter().map(|&p| pr(p)).min()?;
            let far = all
                .iter()
                .filter(|&&p| pr(p) == best)
                .filter_map(|&p| poly.trans_to(p).map(pr))
                .max()?;
            all.iter()
                .copied()
                .filter(|&p| pr(p) == best && poly.trans_to(p).map(pr) == Some(far))
                .collect()
        }
        "SPY-5" => vec![0],
        "TBPY-5" | "PBPY-7" => {
            if pr(0) == pr(1) {
                vec![0, 1]
            } else if pr(0) < pr(1) {
                vec![0]
            } else {
                vec![1]
            }
        }
        "T-4" => return tetrahedral(poly, seats, &pr),
        _ => return None,
    };
    let mut found: Option<(Vec<u8>, Option<bool>)> = None;
    for v in views {
        let ring = poly.clockwise_around(v, &all);
        let Some((seq, dir)) = lowest_sequence(&ring, &pr) else {
            continue;
        };
        found = match found {
            None => Some((seq, dir)),
            Some((f, _)) if seq < f => Some((seq, dir)),
            Some((f, d)) if seq == f && d != dir => Some((f, None)),
            keep => keep,
        };
    }
    match found?.1? {
        true => Some('C'),
        false => Some('A'),
    }
}

/// R/S is the tetrahedral counterpart; in the C/A letters: look from the side opposite the
/// least preferred donor, and read 1 -> 2 -> 3 (IR-9.3.4.2-3). Only when all four differ.
fn tetrahedral(poly: &Polyhedron, seats: &[Seat], pr: &dyn Fn(u8) -> u8) -> Option<char> {
    let mut order: Vec<u8> = (0..seats.len() as u8).collect();
    order.sort_by_key(|&p| pr(p));
    let numbers: Vec<u8> = order.iter().map(|&p| pr(p)).collect();
    if numbers.windows(2).any(|w| w[0] == w[1]) || order.len() != 4 {
        return None;
    }
    let c = |p: u8| poly.coords[p as usize];
    let (a, b, d) = (c(order[0]), c(order[1]), c(order[2]));
    // seen from outside, on the side of a + b + d (opposite the least preferred donor), the
    // turn a -> b -> d runs anticlockwise when the triple product a.(b x d) is positive
    let cross = [
        b[1] * d[2] - b[2] * d[1],
        b[2] * d[0] - b[0] * d[2],
        b[0] * d[1] - b[1] * d[0],
    ];
    let triple = a[0] * cross[0] + a[1] * cross[1] + a[2] * cross[2];
    Some(if triple > 0.0 { 'A' } else { 'C' })
}

/// The descriptor's parts read back from text: "OC-6-24-A", "(SP-4-2)", "TBPY-5-12".
pub fn normalize(text: &str) -> String {
    text.trim()
        .trim_start_matches('(')
        .trim_end_matches(')')
        .replace(['\u{2010}', '\u{2011}', '\u{2013}', '\u{2212}'], "-")
        .to_ascii_uppercase()
}

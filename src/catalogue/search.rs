//! Fuzzy search over the catalogue and "did you mean" suggestions for unknown tokens.

use std::collections::HashMap;
use std::sync::Arc;

use fuzzy_matcher::FuzzyMatcher;

use super::Catalogue;
use crate::chem::ligand::LigandDef;

/// A ligand matching a query, with the matcher's score (higher is better).
#[derive(Debug, Clone)]
pub struct Hit {
    pub ligand: Arc<LigandDef>,
    pub score: i64,
}

impl Catalogue {
    /// Ligands matching `query` in key, name, formula, aliases or family, best first; ties by key so the
    /// order is stable. An empty query lists everything in catalogue order.
    pub fn search(&self, query: &str) -> Vec<Hit> {
        self.filter(query, |_| true, None)
            .into_iter()
            .map(|(i, score)| Hit {
                ligand: self.ligands[i].clone(),
                score,
            })
            .collect()
    }

    /// Indices (with scores) of the ligands that pass `keep` and match `query`, best first.
    /// `within` narrows the scan to earlier results, which is how typing one more letter refines
    /// a search without rescanning the catalogue.
    pub fn filter(
        &self,
        query: &str,
        keep: impl Fn(&LigandDef) -> bool,
        within: Option<&[usize]>,
    ) -> Vec<(usize, i64)> {
        let query = query.trim();
        let all: Vec<usize>;
        let candidates: &[usize] = match within {
            Some(w) => w,
            None => {
                all = (0..self.ligands.len()).collect();
                &all
            }
        };
        if query.is_empty() {
            return candidates
                .iter()
                .filter(|&&i| keep(&self.ligands[i]))
                .map(|&i| (i, 0))
                .collect();
        }
        let lower = query.to_lowercase();
        // one or two letters match nearly everything; rank those by where they occur, which
        // is much cheaper than the fuzzy matcher and keeps a keystroke well under 2 ms
        let short = lower.chars().count() <= 2;
        let mut hits: Vec<(usize, i64)> = candidates
            .iter()
            .filter(|&&i| keep(&self.ligands[i]) && subsequence(&lower, &self.haystacks[i]))
            .filter_map(|&i| {
                let l = &self.ligands[i];
                let s = if short {
                    Some(quick_score(l, &lower))
                } else {
                    self.score(l, query)
                };
                s.map(|s| (i, s))
            })
            .collect();
        hits.sort_by(|a, b| {
            b.1.cmp(&a.1)
                .then_with(|| self.ligands[a.0].key.cmp(&self.ligands[b.0].key))
        });
        hits
    }

    /// Character positions of `query` in `text`, for highlighting the rows on screen.
    pub fn match_positions(&self, text: &str, query: &str) -> Vec<usize> {
        if query.trim().is_empty() {
            return Vec::new();
        }
        self.matcher
            .fuzzy_indices(text, query.trim())
            .map(|(_, idx)| idx)
            .unwrap_or_default()
    }

    /// Best score of `query` over a ligand's names; exact key or alias matches rank first.
    fn score(&self, l: &LigandDef, query: &str) -> Option<i64> {
        let fields = std::iter::once(l.key.as_str())
            .chain(std::iter::once(l.name.as_str()))
            .chain(std::iter::once(l.formula.as_str()))
            .chain(l.aliases.iter().map(String::as_str))
            .chain(std::iter::once(l.family.as_str()));
        let mut best: Option<i64> = None;
        let family = l.aliases.len() + 3;
        for (i, f) in fields.enumerate() {
            // an exact name wins; an exact family only groups, it does not pick one ligand
            let bonus = if i != family && f.eq_ignore_ascii_case(query) {
                1000
            } else {
                0
            };
            // the key is what a chemist types: favour it slightly
            let key_bonus = if i == 0 { 5 } else { 0 };
            // skip the matcher where the letters are not even there in order
            if !subsequence_ci(query, f) {
                continue;
            }
            if let Some(s) = self.matcher.fuzzy_match(f, query) {
                let s = s + bonus + key_bonus;
                best = Some(best.map_or(s, |b| b.max(s)));
            }
        }
        best
    }
}

/// Rank for one- or two-letter queries: the key starting with them first, then any name
/// starting with them, then containing them, then merely holding the letters in order.
fn quick_score(l: &LigandDef, lower: &str) -> i64 {
    let starts = |f: &str| {
        f.len() >= lower.len() && f.as_bytes()[..lower.len()].eq_ignore_ascii_case(lower.as_bytes())
    };
    let contains = |f: &str| {
        f.as_bytes()
            .windows(lower.len().max(1))
            .any(|w| w.eq_ignore_ascii_case(lower.as_bytes()))
    };
    let names = || {
        std::iter::once(l.name.as_str())
            .chain(std::iter::once(l.formula.as_str()))
            .chain(l.aliases.iter().map(String::as_str))
    };
    if l.key.eq_ignore_ascii_case(lower) {
        1000
    } else if starts(&l.key) {
        300
    } else if names().any(starts) {
        200
    } else if contains(&l.key) {
        150
    } else if names().any(contains) {
        100
    } else {
        50
    }
}

/// Whether the characters of `needle` (lower case) appear in order in `hay` (lower case): a
/// cheap test that rules out most ligands before the fuzzy matcher scores the rest.
fn subsequence(needle: &str, hay: &str) -> bool {
    let mut hay = hay.chars();
    needle
        .chars()
        .filter(|c| !c.is_whitespace())
        .all(|n| hay.by_ref().any(|h| h == n))
}

/// `subsequence` without lower-casing first (ASCII letters compared case-blind).
fn subsequence_ci(needle: &str, hay: &str) -> bool {
    let mut hay = hay.bytes();
    needle
        .bytes()
        .filter(|b| !b.is_ascii_whitespace())
        .all(|n| hay.by_ref().any(|h| h.eq_ignore_ascii_case(&n)))
}

/// The lower-case text searched for a ligand: key, name, formula and aliases.
pub fn haystack(l: &LigandDef) -> String {
    let mut s = String::with_capacity(64);
    for part in std::iter::once(&l.key)
        .chain(std::iter::once(&l.name))
        .chain(std::iter::once(&l.formula))
        .chain(l.aliases.iter())
        .chain(std::iter::once(&l.family))
    {
        s.push_str(&part.to_lowercase());
        s.push(' ');
    }
    s
}

/// What "did you mean" searches, built the first time a token is unknown: every formula token
/// lower-cased, grouped by length, with a signature of the characters it holds, and a
/// signature per ligand's search text. An unknown token then costs a few microseconds instead
/// of an edit distance to every token and a fuzzy match against every ligand.
pub struct SuggestIndex {
    /// Lower-cased token -> the first token (in byte order) with that spelling.
    folded: HashMap<String, String>,
    /// Tokens by their length in characters, sorted by token within each length.
    by_len: Vec<Vec<Spelling>>,
    /// Signature of each ligand's haystack, in catalogue order.
    haystacks: Vec<u64>,
}

/// A token as compared: its lower-cased characters, their signature, and the token itself.
type Spelling = (Box<[char]>, u64, String);

impl SuggestIndex {
    pub fn new(cat: &Catalogue) -> SuggestIndex {
        let mut tokens: Vec<&String> = cat.tokens.keys().collect();
        tokens.sort();
        let mut folded: HashMap<String, String> = HashMap::with_capacity(tokens.len());
        let mut by_len: Vec<Vec<Spelling>> = Vec::new();
        for t in tokens {
            let lower = t.to_lowercase();
            let chars: Box<[char]> = lower.chars().collect();
            let n = chars.len();
            if by_len.len() <= n {
                by_len.resize_with(n + 1, Vec::new);
            }
            by_len[n].push((chars, signature(&lower), t.clone()));
            folded.entry(lower).or_insert_with(|| t.clone());
        }
        SuggestIndex {
            folded,
            by_len,
            haystacks: cat.haystacks.iter().map(|h| signature(h)).collect(),
        }
    }
}

/// Which characters a text holds, as bits: letters and digits one bit each, everything else
/// folded into the remaining bits. A character whose bit is missing from another text's
/// signature is missing from that text.
fn signature(text: &str) -> u64 {
    text.chars()
        .filter(|c| !c.is_whitespace())
        .fold(0u64, |sig, c| sig | 1 << char_bit(c))
}

fn char_bit(c: char) -> u32 {
    match c {
        'a'..='z' => c as u32 - 'a' as u32,
        '0'..='9' => 26 + (c as u32 - '0' as u32),
        _ => 36 + (c as u32 % 28),
    }
}

/// The nearest known formula token to `token`: a case-insensitive match, else the closest by
/// edit distance (ties to the first in byte order), else the best fuzzy match.
///
/// Only tokens whose length is within the allowed distance are compared, a token whose
/// characters differ by more than the distance is skipped on its signature, and the distance
/// itself stops once it cannot win; the fuzzy matcher sees only ligands that hold every
/// character of the token.
pub fn suggest(cat: &Catalogue, token: &str) -> Option<String> {
    if token.is_empty() {
        return None;
    }
    let index = cat.suggest_index();
    let lower = token.to_lowercase();
    if let Some(t) = index.folded.get(&lower) {
        return Some(t.clone());
    }
    let query: Vec<char> = lower.chars().collect();
    let sig = signature(&lower);
    let limit = (token.chars().count() / 3).clamp(1, 3);
    let longest = (query.len() + limit).min(index.by_len.len().saturating_sub(1));
    let lengths = query.len().saturating_sub(limit)..=longest;
    let mut best: Option<(usize, &String)> = None;
    for bucket in index.by_len.get(lengths).into_iter().flatten() {
        for (chars, s, t) in bucket {
            let bound = (sig & !s).count_ones().max((s & !sig).count_ones()) as usize;
            let cap = best.map_or(limit, |(d, _)| d);
            if bound > cap {
                continue;
            }
            if let Some(d) = edit_distance_within(&query, chars, cap) {
                if best.is_none_or(|(bd, bt)| (d, t) < (bd, bt)) {
                    best = Some((d, t));
                }
            }
        }
    }
    if let Some((_, t)) = best {
        return Some(t.clone());
    }
    cat.best_hit(token, &index.haystacks)
        .filter(|&(_, score)| score > 40)
        .map(|(i, _)| cat.ligands[i].key.clone())
}

impl Catalogue {
    /// The best search hit for `query` (highest score, then the first key), as `search` would
    /// rank it first, without ranking the rest; `sigs` rules out ligands that lack a character.
    fn best_hit(&self, query: &str, sigs: &[u64]) -> Option<(usize, i64)> {
        let query = query.trim();
        if query.is_empty() {
            return None;
        }
        let lower = query.to_lowercase();
        let need = signature(&lower);
        let short = lower.chars().count() <= 2;
        let mut best: Option<(usize, i64)> = None;
        for (i, l) in self.ligands.iter().enumerate() {
            if sigs.get(i).is_some_and(|s| need & !s != 0)
                || !subsequence(&lower, &self.haystacks[i])
            {
                continue;
            }
            let score = if short {
                Some(quick_score(l, &lower))
            } else {
                self.score(l, query)
            };
            let Some(score) = score else { continue };
            let better =
                best.is_none_or(|(j, b)| score > b || (score == b && l.key < self.ligands[j].key));
            if better {
                best = Some((i, score));
            }
        }
        best
    }
}

/// Levenshtein distance over characters when it is at most `cap`, else None; stops as soon as
/// a whole row exceeds `cap`.
fn edit_distance_within(a: &[char], b: &[char], cap: usize) -> Option<usize> {
    if a.len().abs_diff(b.len()) > cap {
        return None;
    }
    let mut prev: Vec<usize> = (0..=b.len()).collect();
    let mut cur = vec![0; b.len() + 1];
    for (i, ca) in a.iter().enumerate() {
        cur[0] = i + 1;
        let mut row_min = cur[0];
        for (j, cb) in b.iter().enumerate() {
            let sub = prev[j] + usize::from(ca != cb);
            cur[j + 1] = sub.min(prev[j + 1] + 1).min(cur[j] + 1);
            row_min = row_min.min(cur[j + 1]);
        }
        if row_min > cap {
            return None;
        }
        std::mem::swap(&mut prev, &mut cur);
    }
    (prev[b.len()] <= cap).then_some(prev[b.len()])
}

/// Levenshtein distance over characters.
#[cfg(test)]
fn edit_distance(a: &str, b: &str) -> usize {
    let a: Vec<char> = a.chars().collect();
    let b: Vec<char> = b.chars().collect();
    edit_distance_within(&a, &b, usize::MAX / 2).unwrap_or(usize::MAX)
}

#[cfg(test)]
mod tests {
    use super::{edit_distance, edit_distance_within};

    #[test]
    fn edit_distance_counts_single_changes() {
        assert_eq!(edit_distance("pph3", "pph3"), 0);
        assert_eq!(edit_distance("pme3", "pmw3"), 1);
        assert_eq!(edit_distance("", "abc"), 3);
    }

    #[test]
    fn capped_edit_distance_gives_up_past_the_cap() {
        let c = |s: &str| s.chars().collect::<Vec<char>>();
        assert_eq!(edit_distance_within(&c("pph4"), &c("pph3"), 1), Some(1));
        assert_eq!(edit_distance_within(&c("dppx"), &c("dppe"), 1), Some(1));
        assert_eq!(edit_distance_within(&c("abcd"), &c("wxyz"), 3), None);
        assert_eq!(
            edit_distance_within(&c("kitten"), &c("sitting"), 3),
            Some(3)
        );
        assert_eq!(edit_distance_within(&c("kitten"), &c("sitting"), 2), None);
    }
}

//! Fuzzy search over the catalogue and "did you mean" suggestions for unknown tokens.

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

/// The nearest known formula token to `token`: a case-insensitive match, else the closest by
/// edit distance, else the best fuzzy match.
pub fn suggest(cat: &Catalogue, token: &str) -> Option<String> {
    if token.is_empty() {
        return None;
    }
    let lower = token.to_lowercase();
    let mut tokens: Vec<&String> = cat.tokens.keys().collect();
    tokens.sort();
    if let Some(t) = tokens.iter().find(|t| t.to_lowercase() == lower) {
        return Some((*t).clone());
    }
    let limit = (token.chars().count() / 3).clamp(1, 3);
    let mut best: Option<(usize, &String)> = None;
    for t in &tokens {
        let d = edit_distance(&lower, &t.to_lowercase());
        if d <= limit && best.is_none_or(|(bd, _)| d < bd) {
            best = Some((d, t));
        }
    }
    if let Some((_, t)) = best {
        return Some(t.clone());
    }
    cat.search(token)
        .into_iter()
        .find(|h| h.score > 40)
        .map(|h| h.ligand.key.clone())
}

/// Levenshtein distance over characters.
fn edit_distance(a: &str, b: &str) -> usize {
    let b: Vec<char> = b.chars().collect();
    let mut prev: Vec<usize> = (0..=b.len()).collect();
    let mut cur = vec![0; b.len() + 1];
    for (i, ca) in a.chars().enumerate() {
        cur[0] = i + 1;
        for (j, cb) in b.iter().enumerate() {
            let sub = prev[j] + usize::from(ca != *cb);
            cur[j + 1] = sub.min(prev[j + 1] + 1).min(cur[j] + 1);
        }
        std::mem::swap(&mut prev, &mut cur);
    }
    prev[b.len()]
}

#[cfg(test)]
mod tests {
    use super::edit_distance;

    #[test]
    fn edit_distance_counts_single_changes() {
        assert_eq!(edit_distance("pph3", "pph3"), 0);
        assert_eq!(edit_distance("pme3", "pmw3"), 1);
        assert_eq!(edit_distance("", "abc"), 3);
    }
}

//! Paths of steps and the cycles they close: where a path comes back to an intermediate it
//! has passed, and the net reaction of the steps on it (what entered minus what left,
//! cancelled, with stoichiometric counts).

use super::molecule::Composition;
use super::species::{term_text, Equation, Species, Term};

/// Where a path of intermediates (its canonical formulas, start first) closes: the first
/// intermediate that is the same species as an earlier one, as (earlier, later) positions.
pub fn closure(formulas: &[String]) -> Option<(usize, usize)> {
    (1..formulas.len()).find_map(|j| {
        formulas[..j]
            .iter()
            .position(|f| *f == formulas[j])
            .map(|i| (i, j))
    })
}

/// What a run of steps took in and gave off overall.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Net {
    pub consumed: Vec<Term>,
    pub formed: Vec<Term>,
}

/// Sum the equations and cancel what one step gives off and another takes in (PPh3 that
/// leaves and comes back, CO, a proton).
pub fn net<'a>(equations: impl IntoIterator<Item = &'a Equation>) -> Net {
    // signed counts per species: + formed, - consumed
    let mut ledger: Vec<(Species, i64)> = Vec::new();
    let mut post = |s: &Species, n: i64| {
        if let Some(e) = ledger.iter_mut().find(|e| e.0.same(s)) {
            e.1 += n;
        } else {
            ledger.push((s.clone(), n));
        }
    };
    for eq in equations {
        for t in &eq.enters {
            post(&t.species, -(t.count as i64));
        }
        for t in &eq.leaves {
            post(&t.species, t.count as i64);
        }
    }
    let mut out = Net::default();
    for (s, n) in ledger {
        let term = |count: i64| Term {
            species: s.clone(),
            count: count.unsigned_abs().min(u32::MAX as u64) as u32,
        };
        match n {
            n if n < 0 => out.consumed.push(term(n)),
            n if n > 0 => out.formed.push(term(n)),
            _ => {}
        }
    }
    out
}

impl Net {
    /// "C2H4 + H2 -> C2H6"; "nothing" for a path that changed nothing outside the metal.
    pub fn text(&self) -> String {
        let side = |terms: &[Term]| {
            if terms.is_empty() {
                "nothing".to_string()
            } else {
                terms.iter().map(term_text).collect::<Vec<_>>().join(" + ")
            }
        };
        format!("{} -> {}", side(&self.consumed), side(&self.formed))
    }

    /// Atoms and charge of what was consumed against what was formed; a closed cycle must
    /// balance (its catalyst is back where it started).
    pub fn check_balance(&self) -> Result<(), String> {
        let total = |terms: &[Term]| {
            let mut c = Composition::default();
            let mut q = 0i64;
            for t in terms {
                c.add_all(&t.species.composition(), t.count);
                q += t.species.charge() as i64 * t.count as i64;
            }
            (c, q)
        };
        let (a, qa) = total(&self.consumed);
        let (b, qb) = total(&self.formed);
        if a != b {
            let (more, less) = a.difference(&b);
            return Err(format!(
                "atoms do not balance: {more} more consumed, {less} more formed"
            ));
        }
        if qa != qb {
            return Err(format!(
                "charge does not balance: {qa:+} consumed, {qb:+} formed"
            ));
        }
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn closure_finds_the_first_return() {
        let f = |v: &[&str]| v.iter().map(|s| s.to_string()).collect::<Vec<_>>();
        assert_eq!(closure(&f(&["A", "B", "C", "A"])), Some((0, 3)));
        assert_eq!(closure(&f(&["A", "B", "C", "B", "A"])), Some((1, 3)));
        assert_eq!(closure(&f(&["A", "B", "C"])), None);
        assert_eq!(closure(&f(&[])), None);
    }
}

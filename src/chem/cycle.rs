//! Paths of steps and the cycles they close: where a path comes back to an intermediate it
//! has passed, and the net reaction of the steps on it (what entered minus what left,
//! cancelled, with stoichiometric counts).

use super::formula::split_stereo;
use super::molecule::Composition;
use super::species::{term_text, Equation, Species, Term};

/// Where a path of intermediates (its canonical formulas, start first) closes: the first
/// intermediate that is the same species as an earlier one, as (earlier, later) positions.
pub fn closure(formulas: &[String]) -> Option<(usize, usize)> {
    (1..formulas.len()).find_map(|j| {
        formulas[..j]
            .iter()
            .position(|f| same_species(f, &formulas[j]))
            .map(|i| (i, j))
    })
}

/// Two canonical formulas name the same species: the same formula proper, and the same
/// isomer where both name one (a formula without a descriptor stands for all its isomers, so
/// a catalyst started unfixed that comes back as one isomer is back).
pub fn same_species(a: &str, b: &str) -> bool {
    if a == b {
        return true;
    }
    let (sa, fa) = split_stereo(a);
    let (sb, fb) = split_stereo(b);
    fa == fb && (sa.is_none() || sb.is_none() || sa == sb)
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
    pair_ions(&mut ledger);
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

/// Ions on the same side of the net are written as the acid or salt they make (H+ + Cl- as
/// HCl, Na+ + Br- as NaBr), the way a textbook writes a net reaction (Wacker: "... + 2 HCl";
/// Buchwald-Hartwig: "... + tBuOH + NaBr").
fn pair_ions(ledger: &mut Vec<(Species, i64)>) {
    let is_proton = |s: &Species| {
        s.electrons == 0
            && s.structure.atoms.len() == 1
            && s.structure.atoms[0].z == 1
            && s.structure.atoms[0].charge == 1
    };
    // the one charged atom of a singly charged ion
    let ion = |s: &Species, q: i32| {
        let charged: Vec<usize> = (0..s.structure.atoms.len())
            .filter(|&i| s.structure.atoms[i].charge != 0)
            .collect();
        (s.electrons == 0 && s.charge() == q && charged.len() == 1).then(|| charged[0])
    };
    // protons first (they bond), then other cations (they pair)
    let mut cations: Vec<usize> = (0..ledger.len())
        .filter(|&i| ion(&ledger[i].0, 1).is_some())
        .collect();
    cations.sort_by_key(|&i| !is_proton(&ledger[i].0));
    for p in cations {
        let proton = is_proton(&ledger[p].0);
        for k in 0..ledger.len() {
            let (n_p, n_a) = (ledger[p].1, ledger[k].1);
            if n_p == 0 || n_p.signum() != n_a.signum() {
                continue;
            }
            let Some(at) = ion(&ledger[k].0, -1) else {
                continue;
            };
            let pairs = n_p.abs().min(n_a.abs()) * n_p.signum();
            let base = ledger[k].0.name.trim_end_matches('-');
            let made = if proton {
                let mut acid = ledger[k].0.structure.clone();
                acid.atoms[at].charge += 1;
                acid.atoms[at].h = acid.atoms[at].h.saturating_add(1);
                let name = if base == "OH" {
                    "H2O".to_string()
                } else {
                    format!("H{base}")
                };
                Species::new(name, acid)
            } else {
                let mut salt = ledger[p].0.structure.clone();
                salt.merge(&ledger[k].0.structure);
                let cation = ledger[p].0.name.trim_end_matches('+');
                let name = if ledger[p].0.structure.atoms.len() > 1 {
                    format!("[{cation}]{base}")
                } else {
                    format!("{cation}{base}")
                };
                Species::new(name, salt)
            };
            ledger[p].1 -= pairs;
            ledger[k].1 -= pairs;
            match ledger.iter_mut().find(|e| e.0.same(&made)) {
                Some(e) => e.1 += pairs,
                None => ledger.push((made, pairs)),
            }
        }
    }
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
        // a start with no isomer named is back as any of its isomers; two named isomers differ
        assert_eq!(
            closure(&f(&["[PtCl2L2]", "X", "cis-[PtCl2L2]"])),
            Some((0, 2))
        );
        assert_eq!(
            closure(&f(&["SP-4-1-[PtCl2L2]", "X", "SP-4-2-[PtCl2L2]"])),
            None
        );
        assert_eq!(
            closure(&f(&["SP-4-1-[PtCl2L2]", "X", "SP-4-1-[PtCl2L2]"])),
            Some((0, 2))
        );
    }
}

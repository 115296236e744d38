//! Invariants of the counting models on random complexes (property tests), each a textbook
//! identity: the neutral and ionic models give the same count, d = group - oxidation state
//! (common practice, e.g. Crabtree 6th ed., 2014, ch. 2), and Green's CBC electron number
//! m + 2l + x equals the count (Green, J. Organomet. Chem. 1995, 500, 127).

mod common;

use common::arb_complex;
use nonet::chem::count::Saturation;
use nonet::chem::{count, Frac};
use proptest::prelude::*;

proptest! {
    #![proptest_config(ProptestConfig {
        cases: 500,
        failure_persistence: None,
        ..ProptestConfig::default()
    })]

    #[test]
    fn both_models_and_the_cbc_class_agree(c in arb_complex()) {
        let r = count(&c);
        prop_assert_eq!(r.metals.len(), c.sites.len());
        let mut total = Frac::ZERO;
        for m in &r.metals {
            prop_assert_eq!(m.electron_count, m.ionic_electron_count, "{}", r.formula);
            prop_assert_eq!(m.d_electrons, -m.oxidation_state + m.valence_electrons as i64);
            if m.charge_share.is_integer() && m.valence_number.is_integer() {
                prop_assert_eq!(m.cbc_electron_count, m.electron_count, "{} {}", r.formula, m.equivalent_neutral_class);
            }
            let contributions: Frac = m.contributions.iter().map(|c| c.neutral).sum();
            prop_assert_eq!(
                m.electron_count,
                contributions + m.valence_electrons as i64 - m.charge_share + m.metal_metal_bonds,
                "{}", r.formula
            );
            if m.saturation == Saturation::Unsaturated {
                prop_assert!(m.electrons_short > Frac::ZERO);
            }
            total += m.electron_count - m.metal_metal_bonds;
        }
        // the cluster count is the sum over metals before M-M bonds
        prop_assert_eq!(total, r.cluster_valence_electrons, "{}", r.formula);
    }

    #[test]
    fn spin_candidates_are_physical(c in arb_complex()) {
        let r = count(&c);
        prop_assert_eq!(r.unpaired_electrons.len(), r.spin_only_moment_bm.len());
        for &n in &r.unpaired_electrons {
            prop_assert!(n as usize <= 5 * r.metals.len(), "{}: {}", r.formula, n);
        }
    }
}

proptest! {
    #![proptest_config(ProptestConfig {
        cases: 500,
        failure_persistence: None,
        ..ProptestConfig::default()
    })]

    /// The check that a complex can exist, made without the rest of the count (for
    /// `count --fields input,formula,charge`), agrees with the full count's, at any charge.
    #[test]
    fn the_quick_existence_check_agrees_with_the_count(c in arb_complex(), q in -8i32..8) {
        let mut c = c;
        c.charge = q;
        prop_assert_eq!(nonet::chem::count::impossible(&c), count(&c).impossible());
    }
}

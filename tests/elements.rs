//! Periodic data checked against an independent periodic table: the `mendeleev` crate
//! (crates.io), whose group numbers follow the IUPAC 1-18 numbering.

use mendeleev::Element as Ref;
use nonet::chem::element::{Block, ELEMENTS};

fn reference(symbol: &str) -> &'static Ref {
    Ref::list()
        .iter()
        .find(|e| e.symbol() == symbol)
        .unwrap_or_else(|| panic!("{symbol} missing from the reference table"))
}

#[test]
fn d_block_groups_periods_and_numbers_match_the_reference() {
    for e in ELEMENTS.iter().filter(|e| e.block == Block::D) {
        let r = reference(e.symbol);
        assert_eq!(r.atomic_number(), e.number as u32, "{}", e.symbol);
        assert_eq!(r.period(), e.period as u32, "{}", e.symbol);
        let group = r.group().map(|g| g.group_number());
        assert_eq!(group, Some(e.group as u32), "{}: group", e.symbol);
        assert_eq!(r.name().to_lowercase(), e.name, "{}", e.symbol);
    }
}

#[test]
fn f_block_metals_match_the_reference_and_have_no_group_there() {
    for e in ELEMENTS.iter().filter(|e| e.block == Block::F) {
        let r = reference(e.symbol);
        assert_eq!(r.atomic_number(), e.number as u32, "{}", e.symbol);
        assert_eq!(r.period(), e.period as u32, "{}", e.symbol);
        assert_eq!(r.name().to_lowercase(), e.name, "{}", e.symbol);
    }
}

#[test]
fn usual_oxidation_states_include_the_reference_main_states() {
    // every "main" oxidation state the reference table gives a d-block metal is among the
    // states nonet treats as usual (nonet adds the low states of organometallic chemistry)
    use mendeleev::OxidationStateCategory::Main;
    use nonet::chem::element::common_oxidation_states;
    for e in ELEMENTS.iter().filter(|e| e.block == Block::D) {
        let ours = common_oxidation_states(e.symbol);
        assert!(!ours.is_empty(), "{}: no usual states", e.symbol);
        for s in reference(e.symbol).oxidation_states(Main) {
            assert!(ours.contains(s), "{}: {s:+} missing", e.symbol);
        }
    }
}

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

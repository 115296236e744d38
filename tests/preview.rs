//! Previews of edits: what a swap, a ring slip or a charge change does before it is committed.

mod common;

use common::cat;
use nonet::catalogue::Catalogue;
use nonet::chem::count;
use nonet::chem::edit::{apply, Edit, EditError, Slot};
use nonet::chem::preview::{preview, Mechanism};
use nonet::chem::{parse, Complex};

fn setup(f: &str) -> (&'static Catalogue, Complex) {
    let c = parse(f, cat()).unwrap_or_else(|e| panic!("{}", e.render()));
    (cat(), c)
}

// Vaska's complex is 16 e and substitutes associatively; swapping PPh3 (TEP 2068.9) for
// PMe3 (2064.1) brings in a stronger donor (Tolman, Chem. Rev. 1977, 77, 313).
#[test]
fn swap_on_a_16_electron_complex() {
    let (cat, c) = setup("IrCl(CO)(PPh3)2");
    let slot = c.find("PPh3", 0).unwrap();
    let pme3 = cat.get("PMe3").unwrap().clone();
    let p = preview(
        &c,
        &count(&c),
        &Edit::Swap {
            slot,
            ligand: pme3,
            mode: 0,
        },
    )
    .unwrap();
    assert_eq!(p.mechanism, Some(Mechanism::Associative));
    let shift = p.donor.unwrap().delta().unwrap();
    assert!((shift - (2064.1 - 2068.9)).abs() < 0.01);
    assert!(p.crowd_after.total < p.crowd_before.total);
    assert_eq!(p.after_report.metals[0].electron_count.as_int(), Some(16));
}

// Replacing CO (L, 2 e) by Cl (X, 1 e) on Cr(CO)6 gives a 17-e [Cr(CO)5Cl] radical.
#[test]
fn swap_that_changes_the_count_and_spin() {
    let (cat, c) = setup("Cr(CO)6");
    let slot = c.find("CO", 0).unwrap();
    let cl = cat.get("Cl").unwrap().clone();
    let p = preview(
        &c,
        &count(&c),
        &Edit::Swap {
            slot,
            ligand: cl,
            mode: 0,
        },
    )
    .unwrap();
    assert_eq!(p.mechanism, Some(Mechanism::Dissociative));
    assert_eq!(p.after_report.metals[0].electron_count.as_int(), Some(17));
    assert!(p.paramagnetic());
}

#[test]
fn ring_slip_and_charge_edits() {
    let (_, c) = setup("CpMn(CO)3");
    let slot = c.find("Cp", 0).unwrap();
    let cp = c.group(slot).unwrap().ligand.clone();
    let eta3 = cp.mode_index("η3").unwrap();
    let (slipped, _) = apply(&c, &Edit::ChangeMode { slot, mode: eta3 }).unwrap();
    assert_eq!(count(&slipped).metals[0].electron_count.as_int(), Some(16));
    let (ox, _) = apply(&c, &Edit::Charge(1)).unwrap();
    assert_eq!(count(&ox).metals[0].oxidation_state.as_int(), Some(2));
    assert_eq!(
        apply(
            &c,
            &Edit::Remove {
                slot: Slot { index: 99, ..slot }
            }
        ),
        Err(EditError::NoSuchLigand)
    );
}

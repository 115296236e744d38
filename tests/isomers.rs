//! Stereoisomer counts of compositions on coordination polyhedra against the published table
//! (Miessler, Fischer & Tarr, Inorganic Chemistry, 5th ed., Pearson 2014, ch. 9, the table of
//! possible isomers of six-coordinate complexes; counts include enantiomers, pairs in
//! parentheses). Values confirmed on a page quoting that table: Mabcdef 30 (15 pairs), and
//! Ma2b2c2 6 (1 pair); the others are from memory of the same table and of common practice
//! (cis/trans, fac/mer, Δ/Λ).

use nonet::chem::isomers::{enumerate, parse_parts, tally, IsomerError};
use nonet::chem::polyhedron::Polyhedron;

fn count(poly: &Polyhedron, composition: &str) -> (usize, usize) {
    let parts = parse_parts(composition).unwrap_or_else(|e| panic!("{composition}: {e}"));
    let isomers = enumerate(poly, &parts).unwrap_or_else(|e| panic!("{composition}: {e}"));
    tally(&isomers)
}

#[test]
fn octahedral_counts_match_the_table() {
    let oc = Polyhedron::octahedron();
    for (composition, total, pairs) in [
        ("Ma6", 1, 0),
        ("Ma5b", 1, 0),
        ("Ma4b2", 2, 0),
        ("Ma3b3", 2, 0),
        ("Ma4bc", 2, 0),
        ("Ma3bcd", 5, 1),
        ("Ma2bcde", 15, 6),
        ("Mabcdef", 30, 15),
        ("Ma2b2c2", 6, 1),
        ("Ma2b2cd", 8, 2),
        ("Ma3b2c", 3, 0),
        ("M(AA)(BC)de", 10, 5),
        ("M(AB)(AB)cd", 11, 5),
        ("M(AB)(CD)ef", 20, 10),
        ("M(AB)3", 4, 2),
        ("M(AA)3", 2, 1),
        ("M(AA)2b2", 3, 1),
        ("M(AA)2bc", 3, 1),
    ] {
        assert_eq!(
            count(&oc, composition),
            (total, pairs),
            "{composition}: (stereoisomers, enantiomeric pairs)"
        );
    }
}

#[test]
fn four_and_five_coordinate_counts() {
    // square planar: cis/trans for Ma2b2, three for Mabcd, no enantiomers in the plane;
    // tetrahedral Mabcd is the chiral centre of organic chemistry (common practice)
    let sp = Polyhedron::square_plane();
    for (composition, want) in [
        ("Ma4", (1, 0)),
        ("Ma3b", (1, 0)),
        ("Ma2b2", (2, 0)),
        ("Ma2bc", (2, 0)),
        ("Mabcd", (3, 0)),
        ("M(AA)b2", (1, 0)),
        ("M(AB)cd", (2, 0)),
        ("M(AB)2", (2, 0)),
    ] {
        assert_eq!(count(&sp, composition), want, "SP-4 {composition}");
    }
    let t = Polyhedron::tetrahedron();
    assert_eq!(count(&t, "Mabcd"), (2, 1));
    assert_eq!(count(&t, "Ma2bc"), (1, 0));
    assert_eq!(count(&t, "Ma2b2"), (1, 0));
    // trigonal bipyramid: b axial or equatorial; two b axial-axial, axial-equatorial or
    // equatorial-equatorial
    let tbp = Polyhedron::trigonal_bipyramid();
    assert_eq!(count(&tbp, "Ma5"), (1, 0));
    assert_eq!(count(&tbp, "Ma4b"), (2, 0));
    assert_eq!(count(&tbp, "Ma3b2"), (3, 0));
    // square pyramid: b apical or basal
    let spy = Polyhedron::square_pyramid();
    assert_eq!(count(&spy, "Ma4b"), (2, 0));
    assert_eq!(count(&spy, "Ma3b2"), (3, 0)); // apical+basal, cis-basal, trans-basal
}

#[test]
fn the_groups_have_their_orders() {
    // O 24, D4 8, T 12, D3 6, C4 4 proper rotations (common practice)
    for (p, n) in [
        (Polyhedron::octahedron(), 24),
        (Polyhedron::square_plane(), 8),
        (Polyhedron::tetrahedron(), 12),
        (Polyhedron::trigonal_bipyramid(), 6),
        (Polyhedron::square_pyramid(), 4),
    ] {
        assert_eq!(p.rotations.len(), n, "{}", p.symbol);
    }
}

#[test]
fn chelates_never_span_trans_positions() {
    let oc = Polyhedron::octahedron();
    let parts = parse_parts("M(AA)3").expect("notation");
    for iso in enumerate(&oc, &parts).expect("placed") {
        for (i, &(_, partner)) in iso.seats.iter().enumerate() {
            let j = partner.expect("every seat is a chelate end");
            assert!(!oc.is_trans(i as u8, j), "{iso:?}");
        }
    }
}

#[test]
fn bad_compositions_are_refused_with_the_reason() {
    let oc = Polyhedron::octahedron();
    let parts = parse_parts("Ma4b").expect("notation");
    let e = enumerate(&oc, &parts).expect_err("five donors");
    assert!(matches!(
        e,
        IsomerError::Positions {
            donors: 5,
            positions: 6,
            ..
        }
    ));
    for bad in ["a2b2", "M(A)2", "M(AAA)", "Ma0b6", "M", "Mx99"] {
        assert!(parse_parts(bad).is_err(), "{bad}");
    }
}

#[test]
fn cis_trans_fac_mer_name_the_isomers() {
    // IUPAC, Nomenclature of Inorganic Chemistry (Recommendations 2005), IR-9.3.3.3-4: cis and
    // trans for [Ma2b4] and square-planar [Ma2b2], fac and mer for [Ma3b3]
    let names = |poly: &Polyhedron, composition: &str| {
        let parts = parse_parts(composition).expect("notation");
        let mut n: Vec<_> = enumerate(poly, &parts)
            .expect("placed")
            .iter()
            .filter_map(|i| i.short_name(poly))
            .collect();
        n.sort_unstable();
        n
    };
    let oc = Polyhedron::octahedron();
    assert_eq!(names(&oc, "Ma4b2"), ["cis", "trans"]);
    assert_eq!(names(&oc, "Ma2b4"), ["cis", "trans"]);
    assert_eq!(names(&oc, "Ma3b3"), ["fac", "mer"]);
    assert_eq!(
        names(&Polyhedron::square_plane(), "Ma2b2"),
        ["cis", "trans"]
    );
    // compositions the words do not settle get none
    assert!(names(&oc, "Ma2b2c2").is_empty());
    // the trans pairs tell the six isomers of Ma2b2c2 apart but for the enantiomers: five
    // sets of trans pairs, one of them shared by the chiral pair
    let parts = parse_parts("Ma2b2c2").expect("notation");
    let isomers = enumerate(&oc, &parts).expect("placed");
    let mut sets: Vec<_> = isomers.iter().map(|i| i.trans_pairs(&oc)).collect();
    sets.sort();
    sets.dedup();
    assert_eq!(sets.len(), 5);
    assert!(sets.contains(&vec![('a', 'a'), ('b', 'b'), ('c', 'c')]));
    assert!(sets.contains(&vec![('a', 'b'), ('a', 'c'), ('b', 'c')]));
}

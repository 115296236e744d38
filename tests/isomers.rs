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
        for (i, &(_, group)) in iso.seats.iter().enumerate() {
            let low = group.expect("every seat is a chelate end");
            let ends: Vec<u8> = (0..6u8)
                .filter(|&j| iso.seats[j as usize].1 == Some(low))
                .collect();
            assert_eq!(ends.len(), 2, "{iso:?}");
            assert!(ends.contains(&(i as u8)));
            assert!(!oc.is_trans(ends[0], ends[1]), "{iso:?}");
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
    for bad in ["a2b2", "M(A)2", "M(AAAA)", "M(AB", "Ma0b6", "M", "Mx99"] {
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

#[test]
fn positions_are_moved_by_the_symmetry_operations_rigidly() {
    // every rotation keeps the angles between positions and the handedness of three of them;
    // the improper operation keeps the angles and reverses the handedness
    let dot = |p: [f64; 3], q: [f64; 3]| p[0] * q[0] + p[1] * q[1] + p[2] * q[2];
    let triple = |p: [f64; 3], q: [f64; 3], r: [f64; 3]| {
        dot(
            p,
            [
                q[1] * r[2] - q[2] * r[1],
                q[2] * r[0] - q[0] * r[2],
                q[0] * r[1] - q[1] * r[0],
            ],
        )
    };
    for poly in [
        Polyhedron::octahedron(),
        Polyhedron::square_plane(),
        Polyhedron::tetrahedron(),
        Polyhedron::trigonal_bipyramid(),
        Polyhedron::square_pyramid(),
    ] {
        let c = &poly.coords;
        let n = poly.positions();
        let ops = poly
            .rotations
            .iter()
            .map(|g| (g, 1.0))
            .chain([(&poly.improper, -1.0)]);
        for (g, sign) in ops {
            let at = |i: usize| c[g[i] as usize];
            for i in 0..n {
                for j in 0..n {
                    assert!(
                        (dot(c[i], c[j]) - dot(at(i), at(j))).abs() < 1e-9,
                        "{}",
                        poly.symbol
                    );
                    for k in 0..n {
                        let before = triple(c[i], c[j], c[k]);
                        let after = triple(at(i), at(j), at(k));
                        assert!(
                            (after - sign * before).abs() < 1e-9,
                            "{} {g:?}",
                            poly.symbol
                        );
                    }
                }
            }
        }
        // trans pairs point opposite ways
        for &(i, j) in &poly.trans {
            assert!(
                (dot(c[i as usize], c[j as usize]) + 1.0).abs() < 1e-9,
                "{}",
                poly.symbol
            );
        }
    }
}

#[test]
fn the_skew_lines_convention() {
    use nonet::chem::isomers::helicity;
    // IUPAC 2005, Figure IR-9.1: axis AA along z; BB crosses the common normal (along x) at
    // x = 1 and climbs as it turns. Turning from +x towards +y while climbing +z is the
    // right-handed sense (IUPAC Gold Book, "helix sense": clockwise moving away from the
    // observer), Δ; turning towards -y is Λ.
    let right = helicity(
        [0.0, 0.0, 0.0],
        [0.0, 0.0, 1.0],
        [1.0, 0.0, 0.0],
        [1.0, 1.0, 1.0],
    );
    assert_eq!(right, Some(true));
    let left = helicity(
        [0.0, 0.0, 0.0],
        [0.0, 0.0, 1.0],
        [1.0, 0.0, 0.0],
        [1.0, -1.0, 1.0],
    );
    assert_eq!(left, Some(false));
    // either line read in either direction, or the two swapped, names the same helix
    let flipped = helicity(
        [0.0, 0.0, 1.0],
        [0.0, 0.0, 0.0],
        [1.0, 1.0, 1.0],
        [1.0, 0.0, 0.0],
    );
    assert_eq!(flipped, Some(true));
    let swapped = helicity(
        [1.0, 0.0, 0.0],
        [1.0, 1.0, 1.0],
        [0.0, 0.0, 0.0],
        [0.0, 0.0, 1.0],
    );
    assert_eq!(swapped, Some(true));
    // orthogonal or meeting lines define no helix
    assert_eq!(
        helicity(
            [0.0, 0.0, 0.0],
            [0.0, 0.0, 1.0],
            [1.0, 0.0, 0.0],
            [1.0, 1.0, 0.0]
        ),
        None
    );
}

#[test]
fn tris_and_bis_chelates_come_as_delta_and_lambda() {
    // [M(AA)3] and cis-[M(AA)2b2]: one Δ and one Λ, mirror images of each other; trans is
    // achiral and unlabelled (IUPAC 2005, IR-9.3.4.12-13)
    let oc = Polyhedron::octahedron();
    for composition in ["M(AA)3", "M(AA)2b2", "M(AA)2bc"] {
        let parts = parse_parts(composition).expect("notation");
        let isomers = enumerate(&oc, &parts).expect("placed");
        let mut labels: Vec<_> = isomers
            .iter()
            .filter_map(|i| i.configuration(&oc))
            .collect();
        labels.sort_unstable();
        assert_eq!(labels, ["Δ", "Λ"], "{composition}");
        assert!(isomers
            .iter()
            .filter(|i| !i.chiral)
            .all(|i| i.configuration(&oc).is_none()));
    }
}

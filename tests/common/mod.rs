//! Shared test helpers: the bundled catalogue and a generator of random complexes.

#![allow(dead_code)]

pub mod cli;
pub mod keys;

use nonet::catalogue::Catalogue;
use nonet::chem::element::{Block, ELEMENTS};
use nonet::chem::{BoundLigand, Complex, MetalSite};
use proptest::prelude::*;
use std::sync::OnceLock;

pub fn cat() -> &'static Catalogue {
    static CAT: OnceLock<Catalogue> = OnceLock::new();
    CAT.get_or_init(Catalogue::bundled)
}

pub fn d_metals() -> Vec<&'static nonet::chem::element::Element> {
    ELEMENTS.iter().filter(|e| e.block == Block::D).collect()
}

/// A random complex: one or more metals of one element, terminal ligands on fragments or
/// shared, and bridges when there are several metals.
pub fn arb_complex() -> impl Strategy<Value = Complex> {
    let n_lig = cat().len();
    let n_metal = d_metals().len();
    (
        0..n_metal,
        1usize..4,
        proptest::collection::vec((0..n_lig, 0usize..4, 1u32..5), 1..6),
        -4i32..5,
        any::<bool>(),
    )
        .prop_map(move |(mi, n, groups, charge, fragments)| {
            let metal = d_metals()[mi];
            let mut c = Complex {
                sites: (0..n)
                    .map(|_| MetalSite {
                        element: metal,
                        ligands: Vec::new(),
                    })
                    .collect(),
                shared: Vec::new(),
                charge,
                notes: Vec::new(),
                stereo: None,
            };
            for (li, mi, count) in groups {
                let l = cat().ligands()[li].clone();
                let mode = mi % l.modes.len();
                let m = &l.modes[mode];
                if m.bridges as usize > n {
                    continue;
                }
                let b = BoundLigand::new(l.clone(), mode, count);
                if fragments && m.bridges == 1 {
                    for s in &mut c.sites {
                        s.ligands.push(b.clone());
                    }
                } else {
                    c.shared.push(b);
                }
            }
            c.canonicalize();
            c
        })
}

//! Screening speed with a 10,000-entry catalogue: every single swap at one site of a
//! six-ligand complex (target under 20 ms), and every pair over two sites, filtered and top-50
//! ranked (target under 1 s). Peak memory is measured by benches/screen_memory.sh.

use std::hint::black_box;

use criterion::{criterion_group, criterion_main, Criterion};
use nonet::chem::parse;
use nonet::chem::screen::{screen, Constraints, Rank};

#[path = "common.rs"]
mod common;
use common::big_catalogue;

fn bench(c: &mut Criterion) {
    let cat = big_catalogue(10_000);
    assert!(cat.len() >= 10_000);
    // six ligands: fac-IrH3(PPh3)3 style, screened at one PPh3 and at two
    let complex = parse("IrH3(PPh3)3", &cat).expect("formula");
    let slot = complex
        .slots()
        .into_iter()
        .find(|s| complex.group(*s).is_some_and(|b| b.ligand.key == "PPh3"))
        .expect("PPh3");
    let any = Constraints::default();
    c.bench_function("screen 10,000 ligands at one site", |b| {
        b.iter(|| {
            black_box(screen(
                &complex,
                &[slot],
                cat.ligands(),
                &any,
                Rank::Electrons,
                50,
                None,
            ))
        })
    });
    let filtered = Constraints {
        electrons: Some((18, 18)),
        max_crowding: Some(1.5),
        ..Constraints::default()
    };
    let mut g = c.benchmark_group("pairs");
    g.sample_size(10);
    g.bench_function("screen all pairs at two sites, top 50", |b| {
        b.iter(|| {
            black_box(screen(
                &complex,
                &[slot, slot],
                cat.ligands(),
                &filtered,
                Rank::Electrons,
                50,
                None,
            ))
        })
    });
    let electrons_only = Constraints {
        electrons: Some((18, 18)),
        ..Constraints::default()
    };
    g.bench_function(
        "screen all pairs at two sites, electrons only, top 50",
        |b| {
            b.iter(|| {
                black_box(screen(
                    &complex,
                    &[slot, slot],
                    cat.ligands(),
                    &electrons_only,
                    Rank::Electrons,
                    50,
                    None,
                ))
            })
        },
    );
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);

//! Enumerating stereoisomers: the octahedral [Mabcdef] (30 isomers from 720 placements, each
//! compared under 24 rotations) must take under 1 ms; [M(AB)(CD)ef] and [Ma2b2c2] for scale.

use criterion::{criterion_group, criterion_main, Criterion};
use nonet::chem::isomers::{enumerate, parse_parts};
use nonet::chem::polyhedron::Polyhedron;
use std::hint::black_box;

fn bench(c: &mut Criterion) {
    let oc = Polyhedron::octahedron();
    for composition in ["Mabcdef", "M(AB)(CD)ef", "Ma2b2c2"] {
        let parts = match parse_parts(composition) {
            Ok(p) => p,
            Err(e) => panic!("{composition}: {e}"),
        };
        c.bench_function(&format!("isomers of {composition} (OC-6)"), |b| {
            b.iter(|| enumerate(black_box(&oc), black_box(&parts)).map(|v| v.len()))
        });
    }
}

criterion_group!(benches, bench);
criterion_main!(benches);

//! The cost of an unknown ligand: parsing a line with a typo (which looks for a "did you mean"
//! suggestion) against parsing a good line, on the bundled catalogue and on 5,000 and 50,000
//! ligands. A messy literature list must not slow `count --batch` to a crawl.

mod common;

use criterion::{criterion_group, criterion_main, Criterion, Throughput};
use nonet::catalogue::Catalogue;
use nonet::chem::{parse, LigandLookup};
use std::hint::black_box;

/// Lines as a literature list mangles them: typos, wrong counts, run-together names.
const UNKNOWN: &[&str] = &[
    "Pd(PPh4)4",
    "Fe(Xyzzy)5",
    "Rh(PPh)3Cl",
    "Ni(CQ)4",
    "Pt(dppx)Cl2",
    "Fe(tetramethylcyclopentadienylz)2",
    "Ru(bipyrydine)3",
    "Ir(PCy4)3H",
    "Co(NH4)6",
    "Mo(COO)6",
];

const GOOD: &[&str] = &[
    "Pd(PPh3)4",
    "Fe(CO)5",
    "RhCl(PPh3)3",
    "Ni(CO)4",
    "PtCl2(dppe)",
    "Cp*2Fe",
    "[Ru(bpy)3]2+",
    "IrH(PCy3)3",
    "[Co(NH3)6]3+",
    "Mo(CO)6",
];

fn lines(c: &mut Criterion, name: &str, cat: &Catalogue) {
    let mut g = c.benchmark_group(format!("lines/{name}"));
    g.throughput(Throughput::Elements(GOOD.len() as u64));
    g.bench_function("good", |b| {
        b.iter(|| {
            for f in GOOD {
                black_box(parse(black_box(f), cat).ok());
            }
        })
    });
    g.bench_function("unknown", |b| {
        b.iter(|| {
            for f in UNKNOWN {
                black_box(parse(black_box(f), cat).err());
            }
        })
    });
    g.bench_function("suggest", |b| {
        b.iter(|| {
            for t in [
                "PPh4",
                "Xyzzy",
                "CQ",
                "dppx",
                "bipyrydine",
                "PCy4",
                "NH4",
                "COO",
            ] {
                black_box(cat.suggest(black_box(t)));
            }
        })
    });
    g.finish();
}

fn bench(c: &mut Criterion) {
    lines(c, "bundled", &Catalogue::bundled());
    lines(c, "5000", &common::big_catalogue(5_000));
    lines(c, "50000", &common::big_catalogue(50_000));
}

criterion_group! {
    name = benches;
    config = Criterion::default().sample_size(20);
    targets = bench
}
criterion_main!(benches);

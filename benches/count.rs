//! Parse + count throughput. The target for `count --batch` is 500,000 formulas per second on
//! one core; `benches/batch_throughput.sh` measures the whole binary end to end.

use criterion::{criterion_group, criterion_main, Criterion, Throughput};
use nonet::catalogue::Catalogue;
use nonet::chem::{count, parse};
use std::hint::black_box;

/// A mix of the shapes a literature list holds: carbonyls, metallocenes, Werner complexes,
/// phosphine complexes, clusters and bridged dimers.
const FORMULAS: &[&str] = &[
    "CpFe(CO)2Me",
    "[Co(NH3)6]3+",
    "RhCl(PPh3)3",
    "IrCl(CO)(PPh3)2",
    "Mn2(CO)10",
    "Os3(CO)12",
    "Cp2ZrCl2",
    "[Fe(CN)6]4-",
    "Pd(PtBu3)2",
    "Rh2(μ-Cl)2(CO)4",
    "[PtCl3(C2H4)]-",
    "W(CO)3(PCy3)2(η2-H2)",
    "Cr(acac)3",
    "[Ru(bpy)3]2+",
    "(η6-C6H6)Cr(CO)3",
    "[ReH9]2-",
];

fn bench(c: &mut Criterion) {
    let cat = Catalogue::bundled();
    let mut g = c.benchmark_group("count");
    g.throughput(Throughput::Elements(FORMULAS.len() as u64));
    g.bench_function("parse", |b| {
        b.iter(|| {
            for f in FORMULAS {
                black_box(parse(black_box(f), &cat).ok());
            }
        })
    });
    g.bench_function("parse+count", |b| {
        b.iter(|| {
            for f in FORMULAS {
                if let Ok(c) = parse(black_box(f), &cat) {
                    black_box(count(&c));
                }
            }
        })
    });
    let complexes: Vec<_> = FORMULAS
        .iter()
        .filter_map(|f| parse(f, &cat).ok())
        .collect();
    g.bench_function("parse+count+json", |b| {
        let mut buf = Vec::with_capacity(1 << 16);
        b.iter(|| {
            buf.clear();
            for (f, c) in FORMULAS.iter().zip(&complexes) {
                let r = count(c);
                buf.extend_from_slice(f.as_bytes());
                serde_json::to_writer(&mut buf, &r).ok();
            }
            black_box(buf.len())
        })
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);

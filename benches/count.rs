//! Parse + count throughput. The target for `count --batch` is 500,000 formulas per second on
//! one core; `benches/batch_throughput.sh` measures the whole binary end to end.

use criterion::{criterion_group, criterion_main, Criterion, Throughput};
use nonet::catalogue::Catalogue;
use nonet::chem::{count, parse};
use std::hint::black_box;

/// A mix of the shapes a literature list holds: carbonyls, metallocenes, Werner complexes,
/// phosphine complexes, clusters and bridged dimers.
const SAMPLE: &str = include_str!("sample_formulas.txt");

fn formulas() -> Vec<&'static str> {
    SAMPLE.lines().filter(|l| !l.trim().is_empty()).collect()
}

fn bench(c: &mut Criterion) {
    let formulas = formulas();
    let cat = Catalogue::bundled();
    let mut g = c.benchmark_group("count");
    g.throughput(Throughput::Elements(formulas.len() as u64));
    g.bench_function("parse", |b| {
        b.iter(|| {
            for f in &formulas {
                black_box(parse(black_box(f), &cat).ok());
            }
        })
    });
    g.bench_function("parse+count", |b| {
        b.iter(|| {
            for f in &formulas {
                if let Ok(c) = parse(black_box(f), &cat) {
                    black_box(count(&c));
                }
            }
        })
    });
    let complexes: Vec<_> = formulas
        .iter()
        .filter_map(|f| parse(f, &cat).ok())
        .collect();
    g.bench_function("parse+count+json", |b| {
        let mut buf = Vec::with_capacity(1 << 16);
        b.iter(|| {
            buf.clear();
            for (f, c) in formulas.iter().zip(&complexes) {
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

//! Loading a planning session of 10,000 variants (target: under 50 ms).

use std::hint::black_box;
use std::io::Write;

use criterion::{criterion_group, criterion_main, Criterion};
use nonet::catalogue::Catalogue;
use nonet::chem::{count, parse};
use nonet::session::log::{Record, FORMAT};
use nonet::session::{counts, Session};

fn bench(c: &mut Criterion) {
    let cat = Catalogue::bundled();
    let formulas = [
        "IrCl(CO)(PPh3)2",
        "IrH2Cl(CO)(PPh3)2",
        "CpFe(CO)2Me",
        "[Co(NH3)6]3+",
    ];
    let made: Vec<(String, nonet::session::Counts)> = formulas
        .iter()
        .map(|f| {
            let cx = parse(f, &cat).expect("formula");
            (cx.formula(false), counts(&count(&cx)))
        })
        .collect();
    let dir = std::env::temp_dir().join(format!("nonet-bench-{}", std::process::id()));
    std::fs::create_dir_all(&dir).expect("dir");
    let path = dir.join("big.jsonl");
    let mut f = std::io::BufWriter::new(std::fs::File::create(&path).expect("file"));
    for id in 0..10_000u64 {
        let (formula, counts) = &made[id as usize % made.len()];
        // a bushy tree: every variant hangs off one of the last few
        let parent = id.checked_sub(1 + id % 3);
        let r = Record::Variant {
            nonet_session: FORMAT,
            id,
            parent,
            time: "2026-12-01T12:00:00Z".into(),
            action: format!("change {id}"),
            formula: formula.clone(),
            counts: counts.clone(),
            made_by: Some("edit".into()),
            enters: Vec::new(),
            leaves: Vec::new(),
            uid: None,
            parent_uid: None,
        };
        serde_json::to_writer(&mut f, &r).expect("write");
        f.write_all(b"\n").expect("write");
    }
    drop(f);
    c.bench_function("load a session of 10,000 variants", |b| {
        b.iter(|| {
            let s = Session::load(black_box(&path)).expect("load");
            black_box(s.tree().len())
        })
    });
    let _ = std::fs::remove_dir_all(&dir);
}

criterion_group!(benches, bench);
criterion_main!(benches);

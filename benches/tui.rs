//! Planner speed with a 5,000-entry catalogue: one full frame at 120x40 (target under 1 ms) and
//! filtering the catalogue for one keystroke (target under 2 ms).

use std::hint::black_box;
use std::sync::Arc;

use criterion::{criterion_group, criterion_main, Criterion};

#[path = "common.rs"]
mod common;
use common::big_catalogue;
use nonet::chem::parse;
use nonet::tui::{Action, App, Theme};
use ratatui::backend::TestBackend;
use ratatui::Terminal;

fn bench(c: &mut Criterion) {
    let cat = Arc::new(big_catalogue(5000));
    assert!(cat.len() >= 5000, "catalogue has {}", cat.len());
    let complex = parse(nonet::tui::DEMO_FORMULA, cat.as_ref()).expect("demo formula");
    let mut app = App::new(cat.clone(), complex, "bench".into(), false);
    for ch in "ph".chars() {
        let _ = app.apply(Action::StartSearch);
        let _ = app.apply(Action::Input(ch));
    }
    let theme = Theme { color: true };
    let mut term = Terminal::new(TestBackend::new(120, 40)).expect("terminal");
    c.bench_function("frame 120x40, 5000 ligands", |b| {
        b.iter(|| {
            term.draw(|f| nonet::tui::draw(f, black_box(&app), &theme))
                .expect("draw");
        })
    });
    for q in ["p", "ph", "pho", "phos", "PMe3"] {
        c.bench_function(&format!("filter 5000 ligands for '{q}'"), |b| {
            b.iter(|| black_box(cat.filter(black_box(q), |_| true, None)))
        });
    }
}

criterion_group!(benches, bench);
criterion_main!(benches);

//! Applying a step and counting its product: the target is under 20 µs for any step type
//! (each case below is one step on a prepared complex, counted before and after, with its
//! equation built and checked for balance).

use criterion::{criterion_group, criterion_main, Criterion};
use nonet::catalogue::Catalogue;
use nonet::chem::parse;
use nonet::chem::steps::{take, Step};
use std::hint::black_box;

/// One case per step type, on the textbook complexes the tests use.
const CASES: &[(&str, &str)] = &[
    ("RhCl(PPh3)3", "dissociation PPh3"),
    ("[PtCl4]2-", "substitution Cl C2H4"),
    ("IrCl(CO)(PPh3)2", "association CO"),
    ("Mn(CO)5Me", "homolysis Me"),
    ("Cp*IrHCl(PMe3)", "abstraction Cl AgBF4"),
    ("Cp2ZrMe2", "abstraction Me B(C6F5)3"),
    ("PdBr(Ph)(PPh3)2", "transmetalation PhB(OH)2"),
    ("IrCl(CO)(PPh3)2", "oxidative-addition MeI"),
    ("Pd(PPh3)2", "oxidative-addition PhBr"),
    ("PdPh2(PPh3)2", "reductive-elimination Ph Ph"),
    ("Cp2Zr(nPr)(C2H4)+", "migratory-insertion C2H4 nPr"),
    ("Mn(CO)5Et", "migratory-insertion CO Et"),
    ("Mn(CO)4(COMe)", "deinsertion COMe"),
    (
        "Pd(PPh3)Cl(CH(CH3)CH2CH3)",
        "beta-hydride-elimination CH(CH3)CH2CH3",
    ),
    ("Cp*2Sc(CH2CH(CH3)2)", "beta-alkyl-elimination CH2CH(CH3)2"),
    (
        "Pd(PPh3)Cl(CH2CH2OAc)",
        "beta-heteroatom-elimination CH2CH2OAc",
    ),
    ("Ta(CH2tBu)5", "alpha-elimination CH2tBu"),
    ("PdCl2(H2O)(C2H4)", "nucleophilic-attack H2O C2H4"),
    ("CpFe(CO)2(η1-C3H5)", "electrophilic-attack HBF4 C3H5"),
    ("Cp*2ScMe", "sigma-bond-metathesis H2 Me"),
    ("Cp2ZrMe2", "protonolysis Me HCl"),
    ("RuCl2(PCy3)(C2H4)(=CHPh)", "cycloaddition C2H4 CHPh"),
    ("Cp2Zr(C2H4)2", "oxidative-coupling C2H4 C2H4"),
    (
        "Pd(OAc)2(PPh3)",
        "concerted-metalation-deprotonation PhH OAc",
    ),
    ("CpMn(CO)3", "ring-slip Cp 3"),
    ("Cp2Fe", "oxidation"),
    ("Fe(CO)5", "protonation"),
];

fn bench(c: &mut Criterion) {
    let cat = Catalogue::bundled();
    let mut g = c.benchmark_group("step");
    for (formula, text) in CASES {
        let complex = parse(formula, &cat).expect("a bench complex reads");
        let step = Step::parse(text).expect("a bench step reads");
        take(&complex, &step, &cat).expect("a bench step goes through");
        let name = text.split_whitespace().next().unwrap_or(text).to_string();
        g.bench_function(format!("{name} ({formula})"), |b| {
            b.iter(|| black_box(take(black_box(&complex), &step, &cat).ok()))
        });
    }
    // the metallacycle from the [2+2] step, taken apart again
    let cycle = take(
        &parse("RuCl2(PCy3)(C2H4)(=CHPh)", &cat).expect("reads"),
        &Step::parse("cycloaddition C2H4 CHPh").expect("reads"),
        &cat,
    )
    .expect("goes")
    .product;
    let rev = Step::parse("cycloreversion CH2CHPh").expect("reads");
    g.bench_function("cycloreversion (ruthenacyclobutane)", |b| {
        b.iter(|| black_box(take(black_box(&cycle), &rev, &cat).ok()))
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);

use nonet::catalogue::Catalogue;
use nonet::chem::parse;
use nonet::chem::steps::{take, Step};
fn main() {
    let args: Vec<String> = std::env::args().collect();
    let cat = Catalogue::bundled();
    let c = parse(&args[1], &cat).unwrap();
    let s = Step::parse(&args[2]).unwrap();
    let n: usize = args.get(3).and_then(|x| x.parse().ok()).unwrap_or(20000);
    let t = std::time::Instant::now();
    for _ in 0..n {
        std::hint::black_box(take(&c, &s, &cat).ok());
    }
    println!("{:.1} µs", t.elapsed().as_secs_f64() * 1e6 / n as f64);
}

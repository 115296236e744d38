//! The cycle figure: `nonet export --format svg` writes XML that parses (an SVG document any
//! browser opens) and names every intermediate of the cycle and its net reaction.

mod common;

use common::cli::Scratch;

fn nonet(s: &Scratch, args: &[&str]) -> std::process::Output {
    s.cmd().args(args).output().expect("run nonet")
}

#[test]
fn the_suzuki_cycle_as_svg() {
    let dir = Scratch::new("figure");
    let steps = [
        "oxidative-addition PhBr",
        "transmetalation PhB(OH)2",
        "reductive-elimination Ph Ph",
    ];
    let mut args = vec!["step", "--session", "suzuki", "Pd(PPh3)2"];
    args.extend(steps);
    let o = nonet(&dir, &args);
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let o = nonet(&dir, &["export", "suzuki", "--format", "svg"]);
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let svg = String::from_utf8(o.stdout).expect("UTF-8");
    let doc = roxmltree::Document::parse(&svg).expect("the figure is well-formed XML");
    let root = doc.root_element();
    assert_eq!(root.tag_name().name(), "svg");
    assert_eq!(
        root.tag_name().namespace(),
        Some("http://www.w3.org/2000/svg")
    );
    let texts: Vec<&str> = doc
        .descendants()
        .filter(|n| n.has_tag_name("text"))
        .filter_map(|n| n.text())
        .collect();
    // the Pd(II) intermediates carry their isomer in front: cis from the addition of PhBr
    for intermediate in ["[Pd(PPh3)2]", "cis-[Pd(PPh3)2Br(Ph)]", "cis-[Pd(PPh3)2Ph2]"] {
        assert!(
            texts.contains(&intermediate),
            "{intermediate} missing: {texts:?}"
        );
    }
    // Suzuki coupling: ArBr + Ar'B(OH)2 -> Ar-Ar' + BrB(OH)2 (Hartwig 2010, ch. 19)
    assert!(
        texts.contains(&"PhBr + PhB(OH)2 -> BrB(OH)2 + Ph-Ph"),
        "{texts:?}"
    );
    assert!(texts.iter().any(|t| t.contains("transmetalation")));
}

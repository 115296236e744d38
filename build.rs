//! Compiles every ligand set under `ligand_sets/` into the binary, so nonet runs anywhere.

use std::env;
use std::fs;
use std::path::Path;

fn main() {
    println!("cargo:rerun-if-changed=ligand_sets");
    let dir = Path::new(&env::var("CARGO_MANIFEST_DIR").expect("cargo sets CARGO_MANIFEST_DIR"))
        .join("ligand_sets");
    let mut files: Vec<_> = fs::read_dir(&dir)
        .map(|rd| {
            rd.filter_map(Result::ok)
                .map(|e| e.path())
                .filter(|p| p.extension().is_some_and(|x| x == "toml"))
                .collect()
        })
        .unwrap_or_default();
    files.sort();
    let mut out = String::from("/// The bundled ligand sets: (file name, TOML text).\npub static BUNDLED: &[(&str, &str)] = &[\n");
    for f in &files {
        println!("cargo:rerun-if-changed={}", f.display());
        let name = f.file_name().and_then(|n| n.to_str()).unwrap_or("set.toml");
        out.push_str(&format!(
            "    ({name:?}, include_str!({:?})),\n",
            f.display().to_string()
        ));
    }
    out.push_str("];\n");
    let dest = Path::new(&env::var("OUT_DIR").expect("cargo sets OUT_DIR")).join("bundled_sets.rs");
    fs::write(dest, out).expect("write bundled_sets.rs");
}

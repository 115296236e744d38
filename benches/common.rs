//! Shared by the benchmarks: a large synthetic catalogue.

use std::fmt::Write as _;

use nonet::catalogue::Catalogue;

/// The bundled ligands repeated under new keys until there are `n`, as one extra ligand set.
pub fn big_catalogue(n: usize) -> Catalogue {
    let base = Catalogue::bundled();
    let mut toml = String::new();
    let extra = n.saturating_sub(base.len());
    for i in 0..extra {
        let l = &base.ligands()[i % base.len()];
        let m = &l.modes[0];
        let _ = write!(
            toml,
            "[[ligand]]\nkey = \"{key}v{i}\"\nname = \"{name} variant {i}\"\nformula = \"{key}v{i}f\"\n\
             family = \"{family}\"\n[[ligand.mode]]\nlabel = \"{label}\"\nclass = \"{class}\"\n\n",
            key = l.key.replace('"', ""),
            name = l.name.replace('"', ""),
            family = l.family,
            label = m.label,
            class = m.class,
        );
    }
    let bundled: Vec<(String, String)> = nonet::catalogue::BUNDLED
        .iter()
        .map(|(n, t)| (n.to_string(), t.to_string()))
        .collect();
    Catalogue::from_sets(bundled, vec![("synthetic.toml".into(), toml)])
}

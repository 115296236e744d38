//! `nonet sterics`: cone angle, solid angle, buried volume and a steric map from a structure
//! file, and storing the ligand in a user set.

use std::io::{Read, Write};
use std::path::Path;

use serde_json::json;

use super::{diag, failed, rejected, Outcome, Status, StericsArgs};
use crate::chem::shape::{buried_volume, exact_cone_angle, setup, solid_angle};
use crate::chem::structure;

/// Largest structure file read, bytes. 20,000 atoms (`structure::MAX_ATOMS`) take about 1.5
/// MB as XYZ; a bigger file is a trajectory or a library of records, and /dev/zero never ends.
const MAX_FILE: u64 = 32 << 20;

const SPHERE: f64 = 3.5;
const SCALE: f64 = 1.17;
const MAP: usize = 21;

pub fn run(req: &StericsArgs, ascii: bool) -> Outcome {
    let hydrogens = !req.no_hydrogens;
    if let Err(e) = check_add_to(req) {
        return rejected(e);
    }
    let shown = req.file.display().to_string();
    let bytes = match read_bounded(&req.file) {
        Ok(Some(b)) => b,
        Ok(None) => {
            return rejected(format!(
                "{shown} is larger than {} MiB; nonet reads one structure of at most {} \
                 atoms: cut out the frame or record you want (an SDF record ends at '$$$$')",
                MAX_FILE >> 20,
                structure::grouped(structure::MAX_ATOMS)
            ));
        }
        Err(e) => return failed(format!("cannot read {shown}: {e}")),
    };
    let Ok(text) = String::from_utf8(bytes) else {
        return rejected(format!(
            "{shown} is not a text file; give an XYZ file or an MDL molfile/SDF (V2000)"
        ));
    };
    let atoms = match structure::parse(&text) {
        Ok(a) => a,
        Err(e) => return rejected(format!("{shown}: line {}: {}", e.line, e.message)),
    };
    let distance = req.distance.unwrap_or(2.28);
    if !(1.0..=4.0).contains(&distance) {
        return rejected(format!(
            "--distance {distance} Å is not a metal-donor distance (1 to 4 Å)"
        ));
    }
    let s = match setup(&atoms, req.donor, distance) {
        Ok(s) => s,
        Err(e) => return rejected(format!("{shown}: {e}")),
    };
    if req.distance.is_some() && !s.dummy {
        diag::line(&format!(
            "note: --distance is not used: the metal is taken from the file, {:.2} Å from the \
             donor",
            s.distance
        ));
    }
    let (cone, (omega, g)) = match (exact_cone_angle(&s), solid_angle(&s)) {
        (Ok(c), Ok(o)) => (c, o),
        (Err(e), _) | (_, Err(e)) => return rejected(format!("{shown}: {e}")),
    };
    let buried = buried_volume(&s, SPHERE, SCALE, hydrogens, MAP);
    let metal = if s.dummy {
        format!(
            "placed {:.2} Å from the donor along its lone pair",
            s.distance
        )
    } else {
        format!("from the file, {:.2} Å from the donor", s.distance)
    };
    let donor = &s.atoms[s.donor];
    let mut out: Vec<u8> = Vec::new();
    if req.json {
        let v = json!({
            "schema": 1,
            "file": shown,
            "donor": donor.symbol,
            "donor_atom": s.donor_atom,
            "ligand_atoms": s.atoms.len(),
            "left_out_atoms": s.left_out,
            "metal": if s.dummy { "placed" } else { "from file" },
            "metal_donor_distance": (s.distance * 1000.0).round() / 1000.0,
            "exact_cone_angle_deg": (cone * 10.0).round() / 10.0,
            "solid_angle_sr": (omega * 1000.0).round() / 1000.0,
            "g_parameter": (g * 10.0).round() / 10.0,
            "buried_volume_percent": (buried.percent * 10.0).round() / 10.0,
            "quadrants_percent": buried.quadrants.map(|q| (q * 10.0).round() / 10.0),
            "sphere_radius": SPHERE,
            "radii": "Bondi 1964, scaled by 1.17",
            "hydrogens": hydrogens,
        });
        serde_json::to_writer(&mut out, &v)?;
        writeln!(out)?;
    } else {
        let deg = if ascii { " deg" } else { "°" };
        writeln!(
            out,
            "{shown}: {} atoms, donor {} (atom {}), metal {metal}",
            atoms.len(),
            donor.symbol,
            s.donor_atom
        )?;
        if s.left_out > 0 {
            writeln!(
                out,
                "  ligand: the {} atoms bonded to the donor; {} other atoms (other ligands) left \
                 out; choose another ligand with --donor N",
                s.atoms.len(),
                s.left_out
            )?;
        }
        writeln!(
            out,
            "  exact cone angle   {cone:.1}{deg}   (smallest cone from the metal holding every \
             substituent atom's Bondi sphere)"
        )?;
        writeln!(
            out,
            "  solid angle        {omega:.3} sr, G = {g:.1} %   (shadow on a sphere around the metal)"
        )?;
        writeln!(
            out,
            "  buried volume      {:.1} %   (sphere {SPHERE} Å, Bondi radii x {SCALE}, hydrogens {})",
            buried.percent,
            if hydrogens { "included" } else { "left out" }
        )?;
        writeln!(
            out,
            "  quadrants          {:.1} | {:.1} | {:.1} | {:.1} %   (+x+y, -x+y, -x-y, +x-y; +x: donor's first neighbour)",
            buried.quadrants[0], buried.quadrants[1], buried.quadrants[2], buried.quadrants[3]
        )?;
        writeln!(out, "  steric map, looking down the metal-donor axis:")?;
        // a faint dot marks the sphere's outline where nothing is buried
        let shades: [&str; 5] = if ascii {
            [".", "-", ":", "#", "@"]
        } else {
            ["·", "░", "▒", "▓", "█"]
        };
        for row in &buried.map {
            let line: String = row
                .iter()
                .map(|c| match c {
                    None => "  ".to_string(),
                    Some(f) => {
                        let i = ((f * 4.0).round() as usize).min(4);
                        shades[i].repeat(2)
                    }
                })
                .collect();
            writeln!(out, "    {}", line.trim_end())?;
        }
    }
    let text = String::from_utf8_lossy(&out);
    let text = if ascii {
        crate::plain::ascii_text(&text)
    } else {
        text.into_owned()
    };
    let mut stdout = std::io::stdout().lock();
    stdout.write_all(text.as_bytes())?;
    stdout.flush()?;
    drop(stdout);
    if let (Some(set), Some(key)) = (&req.add_to, &req.key) {
        return add_to_set(req, set, key, cone, &shown, &metal);
    }
    Ok(Status::Ok)
}

/// The file's bytes, or None when it holds more than `MAX_FILE` (only that much is read, so
/// an endless device costs bounded time and memory).
fn read_bounded(path: &Path) -> std::io::Result<Option<Vec<u8>>> {
    let mut bytes = Vec::new();
    std::fs::File::open(path)?
        .take(MAX_FILE + 1)
        .read_to_end(&mut bytes)?;
    Ok((bytes.len() as u64 <= MAX_FILE).then_some(bytes))
}

/// A key that formulas can use: a letter first, then letters, digits and ( ) * ' with
/// balanced brackets (PCyp3, P(OMe)3, Cp').
fn formula_key(key: &str) -> bool {
    let mut depth = 0i32;
    key.chars().next().is_some_and(|c| c.is_ascii_alphabetic())
        && key.chars().all(|c| {
            depth += match c {
                '(' => 1,
                ')' => -1,
                _ => 0,
            };
            depth >= 0 && (c.is_ascii_alphanumeric() || matches!(c, '(' | ')' | '*' | '\''))
        })
        && depth == 0
}

/// Checks `--add-to` and its options before anything is measured or printed, so a bad request
/// writes nothing.
fn check_add_to(req: &StericsArgs) -> Result<(), String> {
    let Some(set) = &req.add_to else {
        if req.key.is_some() || req.name.is_some() {
            return Err("--key and --name go with --add-to SET".into());
        }
        return Ok(());
    };
    let Some(key) = &req.key else {
        return Err("--add-to needs --key, the ligand's name in formulas".into());
    };
    if set.is_empty()
        || !set
            .chars()
            .all(|c| c.is_ascii_alphanumeric() || matches!(c, '_' | '-'))
    {
        return Err(format!(
            "--add-to '{set}': a set name is letters, digits, '_' or '-'"
        ));
    }
    if !formula_key(key) {
        return Err(format!(
            "--key '{key}': a key starts with a letter and holds letters, digits and ( ) * ' \
             with balanced brackets, as it will be written in formulas"
        ));
    }
    if crate::chem::CbcClass::parse(&req.class).is_err() {
        return Err(format!(
            "--class '{}' is not a CBC class such as L or LX",
            req.class
        ));
    }
    if !crate::catalogue::FAMILIES.contains(&req.family.as_str()) {
        return Err(format!(
            "--family '{}' is not a family; the families are: {}",
            req.family,
            crate::catalogue::FAMILIES.join(", ")
        ));
    }
    let cat = super::load_catalogue();
    if let Some(l) = cat.get(key) {
        return Err(format!(
            "--key {key} is already in the catalogue (from {}); choose another key",
            l.origin
        ));
    }
    Ok(())
}

/// Append the ligand to a user set (never rewriting what is there), after checking in a
/// scratch directory that the set still loads with it.
/// `check_add_to` has already vetted `set`, `key`, class and family.
fn add_to_set(
    req: &StericsArgs,
    set: &str,
    key: &str,
    cone: f64,
    shown: &str,
    metal: &str,
) -> Outcome {
    let Some(dir) = crate::catalogue::user_set_dir() else {
        return failed("no config directory; set NONET_CONFIG_DIR");
    };
    let path = dir.join(format!("{set}.toml"));
    let q = |s: &str| serde_json::to_string(s).unwrap_or_default();
    let name = req.name.clone().unwrap_or_else(|| key.to_string());
    let source = format!(
        "computed by nonet from {shown}: exact cone angle (Bilbrey, Kazez, Locklin & Allen, \
         J. Comput. Chem. 2013) with Bondi radii, metal {metal}"
    );
    let entry = format!(
        "\n[[ligand]]\nkey = {}\nname = {}\nformula = {}\nfamily = {}\ncone_angle = {:.1}\n\
         cone_angle_source = {}\nnotes = {}\n\n[[ligand.mode]]\nlabel = \"κ1\"\nclass = {}\n",
        q(key),
        q(&name),
        q(key),
        q(&req.family),
        cone,
        q(&source),
        q(&format!("steric descriptors from {shown}")),
        q(&req.class)
    );
    // try the grown set on its own first: nothing reaches the real file unless it loads
    let old = match std::fs::metadata(&path) {
        Err(e) if e.kind() == std::io::ErrorKind::NotFound => String::new(),
        _ => match crate::catalogue::read_set_file(&path) {
            Ok(t) => t,
            Err(e) => return failed(format!("{}: {e}; nothing was written", path.display())),
        },
    };
    let scratch = std::env::temp_dir().join(format!("nonet-add-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&scratch);
    std::fs::create_dir_all(&scratch)?;
    let trial = scratch.join(format!("{set}.toml"));
    std::fs::write(&trial, format!("{old}{entry}"))?;
    let check = crate::catalogue::Catalogue::with_user_dir(Some(&scratch));
    let loads = check
        .get(key)
        .is_some_and(|l| l.origin == trial.display().to_string());
    let problems: Vec<String> = check
        .warnings
        .iter()
        .filter(|w| w.file == trial.display().to_string())
        .map(|w| w.to_string())
        .collect();
    let _ = std::fs::remove_dir_all(&scratch);
    if !loads {
        for w in &problems {
            diag::warning(w);
        }
        return rejected(format!(
            "{key} would not load in {}; nothing was written",
            path.display()
        ));
    }
    std::fs::create_dir_all(&dir)?;
    let mut f = std::fs::OpenOptions::new()
        .create(true)
        .append(true)
        .open(&path)?;
    f.write_all(entry.as_bytes())?;
    f.sync_data()?;
    diag::line(&format!(
        "stored {key} in {} (cone angle {cone:.1}°)",
        path.display()
    ));
    Ok(Status::Ok)
}

//! `nonet sterics`: cone angle, solid angle, buried volume and a steric map from a structure
//! file, and storing the ligand in a user set.

use std::io::Write;
use std::path::PathBuf;

use serde_json::json;

use super::Status;
use crate::chem::shape::{buried_volume, exact_cone_angle, setup, solid_angle};
use crate::chem::structure;

pub struct StericsRequest {
    pub file: PathBuf,
    pub donor: Option<usize>,
    pub distance: f64,
    pub hydrogens: bool,
    pub json: bool,
    pub add_to: Option<String>,
    pub key: Option<String>,
    pub name: Option<String>,
    pub class: String,
    pub family: String,
    pub ascii: bool,
}

const SPHERE: f64 = 3.5;
const SCALE: f64 = 1.17;
const MAP: usize = 21;

pub fn run(req: StericsRequest) -> anyhow::Result<Status> {
    let shown = req.file.display().to_string();
    let text = match std::fs::read_to_string(&req.file) {
        Ok(t) => t,
        Err(e) => {
            eprintln!("error: cannot read {shown}: {e}");
            return Ok(Status::Failure);
        }
    };
    let atoms = match structure::parse(&text) {
        Ok(a) => a,
        Err(e) => {
            eprintln!("error: {shown}: line {}: {}", e.line, e.message);
            return Ok(Status::Rejected);
        }
    };
    if !(1.0..=4.0).contains(&req.distance) {
        eprintln!(
            "error: --distance {} Å is not a metal-donor distance (1 to 4 Å)",
            req.distance
        );
        return Ok(Status::Rejected);
    }
    let s = match setup(&atoms, req.donor, req.distance) {
        Ok(s) => s,
        Err(e) => {
            eprintln!("error: {shown}: {e}");
            return Ok(Status::Rejected);
        }
    };
    let (cone, (omega, g)) = match (exact_cone_angle(&s), solid_angle(&s)) {
        (Ok(c), Ok(o)) => (c, o),
        (Err(e), _) | (_, Err(e)) => {
            eprintln!("error: {shown}: {e}");
            return Ok(Status::Rejected);
        }
    };
    let buried = buried_volume(&s, SPHERE, SCALE, req.hydrogens, MAP);
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
            "hydrogens": req.hydrogens,
        });
        serde_json::to_writer(&mut out, &v)?;
        writeln!(out)?;
    } else {
        let deg = if req.ascii { " deg" } else { "°" };
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
            if req.hydrogens { "included" } else { "left out" }
        )?;
        writeln!(
            out,
            "  quadrants          {:.1} | {:.1} | {:.1} | {:.1} %   (+x+y, -x+y, -x-y, +x-y)",
            buried.quadrants[0], buried.quadrants[1], buried.quadrants[2], buried.quadrants[3]
        )?;
        writeln!(out, "  steric map, looking down the metal-donor axis:")?;
        // a faint dot marks the sphere's outline where nothing is buried
        let shades: [&str; 5] = if req.ascii {
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
    let text = if req.ascii {
        crate::plain::ascii_text(&text)
    } else {
        text.into_owned()
    };
    let mut stdout = std::io::stdout().lock();
    stdout.write_all(text.as_bytes())?;
    stdout.flush()?;
    drop(stdout);
    if let Some(set) = &req.add_to {
        return add_to_set(&req, set, cone, &shown);
    }
    Ok(Status::Ok)
}

/// Append the ligand to a user set (never rewriting what is there), then check it loads.
fn add_to_set(req: &StericsRequest, set: &str, cone: f64, shown: &str) -> anyhow::Result<Status> {
    let Some(key) = &req.key else {
        eprintln!("error: --add-to needs --key, the ligand's name in formulas");
        return Ok(Status::Rejected);
    };
    let key_ok = !key.is_empty() && !key.chars().any(char::is_whitespace);
    let set_ok = !set.is_empty()
        && set
            .chars()
            .all(|c| c.is_ascii_alphanumeric() || matches!(c, '_' | '-'));
    if !key_ok || !set_ok {
        eprintln!("error: a key is one word, a set name letters, digits, '_' or '-'");
        return Ok(Status::Rejected);
    }
    if crate::chem::CbcClass::parse(&req.class).is_err() {
        eprintln!(
            "error: --class '{}' is not a CBC class such as L or LX",
            req.class
        );
        return Ok(Status::Rejected);
    }
    let Some(dir) = crate::catalogue::user_set_dir() else {
        eprintln!("error: no config directory; set NONET_CONFIG_DIR");
        return Ok(Status::Failure);
    };
    std::fs::create_dir_all(&dir)?;
    let path = dir.join(format!("{set}.toml"));
    let q = |s: &str| serde_json::to_string(s).unwrap_or_default();
    let name = req.name.clone().unwrap_or_else(|| key.clone());
    let source = format!(
        "computed by nonet from {shown}: exact cone angle (Bilbrey, Kazez, Locklin & Allen, \
         J. Comput. Chem. 2013) with Bondi radii, metal-donor {:.2} Å",
        req.distance
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
    let mut f = std::fs::OpenOptions::new()
        .create(true)
        .append(true)
        .open(&path)?;
    f.write_all(entry.as_bytes())?;
    f.sync_data()?;
    let cat = crate::catalogue::Catalogue::with_user_dir(Some(&dir));
    let problems: Vec<_> = cat
        .warnings
        .iter()
        .filter(|w| w.file == path.display().to_string())
        .collect();
    for w in &problems {
        eprintln!("warning: {w}");
    }
    match cat.get(key) {
        Some(l) if l.origin == path.display().to_string() => {
            eprintln!("stored {key} in {} (cone angle {cone:.1}°)", path.display());
            Ok(Status::Ok)
        }
        _ => {
            eprintln!(
                "error: {key} was written to {} but does not load; see the warnings",
                path.display()
            );
            Ok(Status::Rejected)
        }
    }
}

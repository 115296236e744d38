//! `nonet isomers`: the stereoisomers of a complex (or of a textbook composition such as
//! `Ma2b2c2`) on its coordination polyhedron, with their IUPAC descriptors.

use std::io::Write;

use serde_json::json;

use super::{diag, load_catalogue, rejected, IsomersArgs, Outcome, Status};
use crate::chem::{self, geometry, isomers, polyhedron::Polyhedron};

pub fn run(args: &IsomersArgs, ascii: bool) -> Outcome {
    let text = args.formula.trim();
    if is_textbook(text) {
        return textbook(args, ascii);
    }
    let cat = load_catalogue();
    let complex = match chem::parse(text, &cat) {
        Ok(c) => c,
        Err(e) => return rejected(diag::parse_error(&e)),
    };
    let report = chem::count(&complex);
    if let Some(why) = report.impossible() {
        return rejected(format!("{}: {why}", report.formula));
    }
    let placed = match geometry::place(&complex, &report) {
        Ok(p) => p,
        Err(why) => return rejected(format!("{}: {why}", report.formula)),
    };
    if args.polyhedron.is_some() {
        return rejected(
            "--polyhedron is for textbook compositions (e.g. Ma2b2c2); for a formula nonet \
             chooses the polyhedron from the count",
        );
    }
    let f = &placed.frame;
    let mut out = std::io::stdout().lock();
    if args.json {
        let list: Vec<serde_json::Value> = placed
            .isomers
            .iter()
            .enumerate()
            .map(|(i, iso)| {
                let positions = f.positions(iso);
                json!({
                    "descriptor": f.descriptor(iso),
                    "names": f.short_names(iso),
                    "chiral": iso.chiral,
                    "fixed_by_prefix": placed.chosen.contains(&i) && placed.chosen.len() < placed.isomers.len(),
                    "ligands": f.ligands.iter().zip(&positions).map(|(b, p)| json!({
                        "ligand": b.ligand.key,
                        "positions": p.iter().map(|c| c.iter().map(|&x| x + 1).collect::<Vec<_>>()).collect::<Vec<_>>(),
                    })).collect::<Vec<_>>(),
                    "trans": trans_text(f, iso),
                })
            })
            .collect();
        let (total, pairs) = isomers::tally(&placed.isomers);
        let doc = json!({
            "schema": 1,
            "input": text,
            "formula": report.formula,
            "polyhedron": f.poly.symbol,
            "positions": f.poly.roles,
            "stereoisomers": total,
            "enantiomeric_pairs": pairs,
            "isomers": list,
            "notes": placed.notes,
        });
        writeln!(out, "{doc}")?;
        return Ok(Status::Ok);
    }
    let (total, pairs) = isomers::tally(&placed.isomers);
    writeln!(
        out,
        "{}  {} ({}): {} stereoisomer{}, {} enantiomeric pair{}",
        complex.formula(ascii),
        f.poly.symbol,
        f.poly.name,
        total,
        if total == 1 { "" } else { "s" },
        pairs,
        if pairs == 1 { "" } else { "s" }
    )?;
    for (i, iso) in placed.isomers.iter().enumerate() {
        let mark = if placed.chosen.len() < placed.isomers.len() && placed.chosen.contains(&i) {
            "*"
        } else {
            " "
        };
        let names = f.short_names(iso).join(", ");
        let names = if ascii {
            names.replace('Δ', "Delta").replace('Λ', "Lambda")
        } else {
            names
        };
        writeln!(
            out,
            "{mark} {:<14} {:<12} {}",
            f.descriptor(iso),
            names,
            trans_text(f, iso).join("; ")
        )?;
    }
    for n in &placed.notes {
        writeln!(out, "note: {n}")?;
    }
    Ok(Status::Ok)
}

/// Trans pairs in words: "Cl trans CO".
fn trans_text(f: &geometry::Frame, iso: &isomers::Isomer) -> Vec<String> {
    f.poly
        .trans
        .iter()
        .filter_map(|&(a, b)| {
            let (x, y) = (iso.seats.get(a as usize)?, iso.seats.get(b as usize)?);
            Some(format!("{} trans {}", f.seat_label(x), f.seat_label(y)))
        })
        .collect()
}

/// `M` followed by the textbook letters: `Ma2b2c2`, `M(AA)3`.
fn is_textbook(text: &str) -> bool {
    text.starts_with('M')
        && !text.starts_with("Mo")
        && !text.starts_with("Mn")
        && !text.starts_with("Mg")
        && !text.starts_with("Mt")
        && !text.starts_with("Mc")
        && !text.starts_with("Md")
        && text[1..]
            .chars()
            .all(|c| c.is_ascii_alphanumeric() || c == '(' || c == ')')
        && text[1..]
            .chars()
            .any(|c| c.is_ascii_lowercase() || c == '(')
}

fn textbook(args: &IsomersArgs, ascii: bool) -> Outcome {
    let text = args.formula.trim();
    let parts = match isomers::parse_parts(text) {
        Ok(p) => p,
        Err(e) => return rejected(e.to_string()),
    };
    let donors: usize = parts
        .iter()
        .map(|p| match p {
            isomers::Part::Mono(_) => 1,
            isomers::Part::Chelate(..) | isomers::Part::Bite(..) => 2,
            isomers::Part::Mer(..) | isomers::Part::Fac(..) => 3,
            isomers::Part::Square(_) => 4,
        })
        .sum();
    let poly = match &args.polyhedron {
        Some(sym) => match Polyhedron::by_symbol(sym) {
            Some(p) => p,
            None => {
                return rejected(format!(
                    "'{sym}' is not a polyhedron nonet models; use one of {}",
                    Polyhedron::all()
                        .iter()
                        .map(|p| p.symbol)
                        .collect::<Vec<_>>()
                        .join(", ")
                ))
            }
        },
        None => match donors {
            2 => Polyhedron::linear(),
            3 => Polyhedron::trigonal_plane(),
            4 => Polyhedron::square_plane(),
            5 => Polyhedron::trigonal_bipyramid(),
            6 => Polyhedron::octahedron(),
            7 => Polyhedron::pentagonal_bipyramid(),
            n => {
                return rejected(format!(
                    "{text}: {n} donor positions; nonet models 2 to 7 (give --polyhedron)"
                ))
            }
        },
    };
    let list = match isomers::enumerate(&poly, &parts) {
        Ok(l) => l,
        Err(e) => return rejected(format!("{text}: {e}")),
    };
    // priority by letter: a before b, small letters and capitals of one letter together
    let mut letters: Vec<char> = parts
        .iter()
        .flat_map(|p| match *p {
            isomers::Part::Mono(c) | isomers::Part::Square(c) => vec![c],
            isomers::Part::Chelate(a, b) | isomers::Part::Bite(a, b, _) => vec![a, b],
            isomers::Part::Mer(a, b, c) | isomers::Part::Fac(a, b, c) => vec![a, b, c],
        })
        .collect();
    letters.sort_by_key(|c| (c.to_ascii_lowercase(), c.is_ascii_uppercase()));
    letters.dedup();
    let rank = |c: char| -> u8 {
        letters
            .iter()
            .position(|&l| l == c)
            .map_or(9, |i| i as u8 + 1)
    };
    let (total, pairs) = isomers::tally(&list);
    let mut out = std::io::stdout().lock();
    if args.json {
        let items: Vec<serde_json::Value> = list
            .iter()
            .map(|iso| {
                json!({
                    "descriptor": chem::descriptor::descriptor(&poly, &iso.seats, &rank),
                    "names": iso.short_name(&poly).into_iter().chain(iso.configuration(&poly)).collect::<Vec<_>>(),
                    "chiral": iso.chiral,
                    "seats": iso.seats.iter().map(|s| s.0.to_string()).collect::<Vec<_>>(),
                })
            })
            .collect();
        let doc = json!({
            "schema": 1,
            "input": text,
            "polyhedron": poly.symbol,
            "positions": poly.roles,
            "stereoisomers": total,
            "enantiomeric_pairs": pairs,
            "isomers": items,
        });
        writeln!(out, "{doc}")?;
        return Ok(Status::Ok);
    }
    writeln!(
        out,
        "{text}  {} ({}): {total} stereoisomer{}, {pairs} enantiomeric pair{}",
        poly.symbol,
        poly.name,
        if total == 1 { "" } else { "s" },
        if pairs == 1 { "" } else { "s" }
    )?;
    for iso in &list {
        let names: Vec<&str> = iso
            .short_name(&poly)
            .into_iter()
            .chain(iso.configuration(&poly))
            .collect();
        let names = names.join(", ");
        let names = if ascii {
            names.replace('Δ', "Delta").replace('Λ', "Lambda")
        } else {
            names
        };
        let seats: String = iso.seats.iter().map(|s| s.0).collect();
        writeln!(
            out,
            "  {:<14} {:<10} positions {seats}",
            chem::descriptor::descriptor(&poly, &iso.seats, &rank),
            names
        )?;
    }
    Ok(Status::Ok)
}

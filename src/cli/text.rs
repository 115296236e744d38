//! The readable report: one block per complex, a table per metal.

use std::io::{self, Write};

use crate::chem::count::{MetalReport, Saturation};
use crate::chem::ligand::{ascii_label, LigandDef};
use crate::chem::{Frac, Report};
pub use crate::plain::ascii_text;

fn greek(s: &str, ascii: bool) -> String {
    if ascii {
        ascii_label(s)
            .replace('°', " deg")
            .replace('σ', "sigma")
            .replace('π', "pi")
    } else {
        s.to_string()
    }
}

/// The readable report; with `ascii` every character is plain ASCII.
pub fn write_report(out: &mut impl Write, input: &str, r: &Report, ascii: bool) -> io::Result<()> {
    if ascii {
        let mut buf = Vec::new();
        report(&mut buf, input, r, true)?;
        out.write_all(ascii_text(&String::from_utf8_lossy(&buf)).as_bytes())
    } else {
        report(out, input, r, false)
    }
}

fn report(out: &mut impl Write, input: &str, r: &Report, ascii: bool) -> io::Result<()> {
    let formula = if ascii {
        ascii_label(&r.formula)
    } else {
        r.formula.clone()
    };
    // what was typed is shown with its control characters escaped, never raw
    writeln!(
        out,
        "{formula}    (as typed: {})",
        super::diag::quote(input)
    )?;
    if r.metals.len() > 1 {
        let bonds = r
            .metal_metal_bonds
            .map_or("not given by the 18-electron rule".to_string(), |b| {
                b.to_string()
            });
        writeln!(
            out,
            "  {} metals · cluster valence electrons {} · M-M bonds {}{}",
            r.metals.len(),
            r.cluster_valence_electrons,
            bonds,
            r.polyhedron.map(|p| format!(" · {p}")).unwrap_or_default()
        )?;
    }
    // equivalent metals (the usual case for homometallic clusters) are shown once
    let mut i = 0;
    while i < r.metals.len() {
        let same = r.metals[i..]
            .iter()
            .take_while(|m| **m == r.metals[i])
            .count();
        write_metal(out, &r.metals[i], r.metals.len() > 1, same, ascii)?;
        i += same;
    }
    let spin = match r.unpaired_electrons.as_slice() {
        [] => "not estimated".to_string(),
        list => list
            .iter()
            .zip(&r.spin_only_moment_bm)
            .map(|(n, mu)| {
                if *n == 0 {
                    "0 unpaired (diamagnetic)".to_string()
                } else {
                    format!("{n} unpaired (paramagnetic, spin-only {mu:.2} μB)")
                }
            })
            .collect::<Vec<_>>()
            .join("; or "),
    };
    let flag = if r.spin_ambiguous { " [ambiguous]" } else { "" };
    writeln!(out, "  geometry: {}", r.geometry)?;
    // where each ligand sits, when the isomer is known
    if r.metals.len() == 1 {
        if let Some(m) = r.metals.first() {
            match crate::chem::geometry::sketch_of_report(m) {
                Some(s) => {
                    writeln!(out, "  positions: {}", s.head)?;
                    for row in &s.rows {
                        writeln!(out, "    {}", greek(row, ascii))?;
                    }
                }
                None => {
                    if let (Some(p), Some(n)) = (m.polyhedron, m.stereoisomers) {
                        if n > 1 {
                            writeln!(
                                out,
                                "  positions: {p}, {n} isomers; a prefix names one (nonet isomers lists them)"
                            )?;
                        }
                    }
                }
            }
        }
    }
    writeln!(out, "  spin: {}{flag}", greek(&spin, ascii))?;
    writeln!(out, "        {}", greek(&r.spin_basis.to_string(), ascii))?;
    for n in &r.notes {
        writeln!(out, "  note: {}", greek(n, ascii))?;
    }
    if !r.cautions.is_empty() {
        writeln!(out, "  cautions:")?;
        for h in &r.hazards {
            let l = &h.0;
            let src = l
                .hazard_source
                .as_deref()
                .map(|s| format!(" ({s})"))
                .unwrap_or_default();
            writeln!(
                out,
                "    ! {} ({}), free ligand: {}{src}",
                l.key,
                l.name,
                l.hazards.join(", ")
            )?;
        }
        for c in &r.cautions {
            writeln!(out, "    ! {}", c.text())?;
        }
    }
    writeln!(out)
}

fn write_metal(
    out: &mut impl Write,
    m: &MetalReport,
    many: bool,
    same: usize,
    ascii: bool,
) -> io::Result<()> {
    let status = match m.saturation {
        Saturation::Unsaturated => format!(
            "unsaturated, {} e short of {} ({} open site{})",
            m.electrons_short,
            m.target,
            m.open_sites,
            if m.open_sites == 1 { "" } else { "s" }
        ),
        s => s.word().to_string(),
    };
    let each = match (many, same) {
        (false, _) => String::new(),
        (true, 1) => " (this metal)".to_string(),
        (true, n) => format!(" (each of {n})"),
    };
    writeln!(
        out,
        "  {}{each}: {} e, {} · oxidation state {} · d{}",
        m.symbol,
        m.electron_count,
        status,
        m.oxidation_state.signed(),
        m.d_electrons
    )?;
    writeln!(
        out,
        "    {:<16} {:<7} {:<6} {:>8} {:>8}",
        "ligand", "mode", "class", "neutral", "ionic"
    )?;
    for c in &m.contributions {
        let name = if c.count == Frac::int(1) {
            c.ligand.key.clone()
        } else {
            format!("{} x{}", c.ligand.key, c.count)
        };
        let mode = greek(&c.mode().label, ascii);
        writeln!(
            out,
            "    {:<16} {:<7} {:<6} {:>8} {:>8}",
            name,
            mode,
            c.mode().class.to_string(),
            c.neutral.to_string(),
            c.ionic.to_string()
        )?;
    }
    writeln!(
        out,
        "    {:<16} {:<7} {:<6} {:>8} {:>8}",
        match m.group {
            Some(g) => format!("{} (group {g})", m.symbol),
            None => format!("{} (f block)", m.symbol),
        },
        "",
        "",
        m.valence_electrons,
        format!("d{}", m.d_electrons)
    )?;
    if m.charge_share != Frac::ZERO {
        writeln!(
            out,
            "    {:<16} {:<7} {:<6} {:>8} {:>8}",
            "charge",
            "",
            "",
            (-m.charge_share).to_string(),
            "-"
        )?;
    }
    if m.metal_metal_bonds != Frac::ZERO {
        writeln!(
            out,
            "    {:<16} {:<7} {:<6} {:>8} {:>8}",
            "M-M bonds",
            "",
            "X",
            m.metal_metal_bonds.to_string(),
            m.metal_metal_bonds.to_string()
        )?;
    }
    writeln!(
        out,
        "    {:<16} {:<7} {:<6} {:>8} {:>8}",
        "total",
        "",
        "",
        m.electron_count.to_string(),
        m.ionic_electron_count.to_string()
    )?;
    writeln!(
        out,
        "    CBC {} (neutral class {}) · VN {} · LBN {} · coordination number {} ({} donor atoms)",
        m.cbc_class,
        m.equivalent_neutral_class,
        m.valence_number,
        m.ligand_bond_number,
        m.coordination_number,
        m.donor_atoms
    )?;
    for n in &m.notes {
        writeln!(out, "    note: {}", greek(n, ascii))?;
    }
    Ok(())
}

/// One catalogue entry; with `ascii` every character is plain ASCII.
pub fn write_ligand(out: &mut impl Write, l: &LigandDef, ascii: bool) -> io::Result<()> {
    if ascii {
        let mut buf = Vec::new();
        ligand(&mut buf, l, true)?;
        out.write_all(ascii_text(&String::from_utf8_lossy(&buf)).as_bytes())
    } else {
        ligand(out, l, false)
    }
}

fn ligand(out: &mut impl Write, l: &LigandDef, ascii: bool) -> io::Result<()> {
    writeln!(out, "{}  {}  {}  [{}]", l.key, l.name, l.formula, l.family)?;
    if !l.aliases.is_empty() {
        writeln!(out, "    also: {}", l.aliases.join(", "))?;
    }
    let modes: Vec<String> = l
        .modes
        .iter()
        .map(|m| {
            format!(
                "{} {} ({} e neutral, {} e ionic)",
                greek(&m.label, ascii),
                m.class,
                m.neutral_electrons(),
                m.ionic_electrons()
            )
        })
        .collect();
    writeln!(out, "    modes: {}", modes.join("; "))?;
    let degrees = if ascii { " deg" } else { "°" };
    let numbers = [
        ("cone angle", &l.cone_angle, degrees),
        ("electronic parameter", &l.tep, " cm-1"),
        ("bite angle", &l.bite_angle, degrees),
    ];
    for (what, number, unit) in numbers {
        if let Some(n) = number {
            writeln!(out, "    {what} {}{unit} ({})", n.value, n.source)?;
        }
    }
    for (what, r) in [
        ("trans effect", &l.trans_effect),
        ("trans influence", &l.trans_influence),
    ] {
        if let Some(r) = r {
            writeln!(out, "    {what} {}/10 ({})", r.rank, r.source)?;
        }
    }
    if let Some(f) = l.field {
        writeln!(out, "    ligand field: {}", f.word())?;
    }
    if !l.hazards.is_empty() {
        writeln!(
            out,
            "    hazards (free ligand): {} ({})",
            l.hazards.join(", "),
            l.hazard_source.as_deref().unwrap_or("")
        )?;
    }
    if let Some(n) = &l.notes {
        writeln!(out, "    {}", greek(n, ascii))?;
    }
    Ok(())
}

/// A step: what changed, then the product's full report.
pub fn write_step(
    out: &mut impl Write,
    o: &crate::chem::steps::Outcome,
    ascii: bool,
) -> io::Result<()> {
    let (Some(a), Some(b)) = (o.before.metals.first(), o.after.metals.first()) else {
        return Ok(());
    };
    let line = format!(
        "step: {} · {} → {} e · oxidation state {} → {} · d{} → d{} · CN {} → {}\n",
        o.step,
        a.electron_count,
        b.electron_count,
        a.oxidation_state.signed(),
        b.oxidation_state.signed(),
        a.d_electrons,
        b.d_electrons,
        a.coordination_number,
        b.coordination_number
    );
    let mut line = line;
    line.push_str(&format!("  {}\n", o.equation_text()));
    for n in &o.notes {
        line.push_str(&format!("  note: {n}\n"));
    }
    let hazardous: Vec<&crate::chem::species::Term> = o
        .equation
        .enters
        .iter()
        .filter(|t| !t.species.hazards.is_empty())
        .collect();
    for t in &hazardous {
        line.push_str(&format!(
            "  ! {} entering: {} ({})\n",
            t.species.name,
            t.species.hazards.join(", "),
            t.species
                .hazard_source
                .as_deref()
                .unwrap_or("no source on record")
        ));
    }
    if !hazardous.is_empty() {
        line.push_str(
            "  ! read the supplier's safety data sheet and follow local rules; nonet plans on \
             paper and never judges whether a reaction is safe\n",
        );
    }
    if ascii {
        out.write_all(ascii_text(&line).as_bytes())?;
    } else {
        out.write_all(line.as_bytes())?;
    }
    write_report(out, &o.after.formula, &o.after, ascii)
}

/// One substrate: key, name, formula and structure, then its hazards on record.
pub fn write_substrate(
    out: &mut impl Write,
    d: &crate::chem::species::SubstrateDef,
) -> io::Result<()> {
    writeln!(
        out,
        "{:<16} {}  ({}, {})",
        d.key,
        d.name,
        d.structure.composition(),
        d.smiles
    )?;
    if !d.hazards.is_empty() {
        writeln!(
            out,
            "    hazards: {} ({})",
            d.hazards.join(", "),
            d.hazard_source.as_deref().unwrap_or("")
        )?;
    }
    if let Some(n) = &d.notes {
        writeln!(out, "    {n}")?;
    }
    Ok(())
}
/// The end of a path of steps: its net reaction, and whether it closed a cycle.
pub fn write_path(
    out: &mut impl Write,
    net: &crate::chem::cycle::Net,
    closed: Option<(usize, usize)>,
    ascii: bool,
) -> io::Result<()> {
    let mut line = format!("net: {}\n", net.text());
    line.push_str(&match closed {
        Some((0, j)) => format!("cycle closed at step {j}: the start complex is back\n"),
        Some((i, j)) => format!(
            "cycle closed at step {j}: back to the product of step {i} (the net is of steps {}-{j})\n",
            i + 1
        ),
        None => "open: no intermediate came back (the net is of the whole path)\n".to_string(),
    });
    if ascii {
        out.write_all(ascii_text(&line).as_bytes())
    } else {
        out.write_all(line.as_bytes())
    }
}

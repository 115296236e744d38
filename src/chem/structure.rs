//! Molecular geometry read from XYZ files and MDL molfiles/SDF (V2000), in ångström.

use std::fmt;

/// One atom: element symbol and position (Å).
#[derive(Debug, Clone, PartialEq)]
pub struct Atom {
    pub symbol: String,
    pub pos: [f64; 3],
}

/// A structure file that cannot be read: where and why.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct StructureError {
    pub line: usize,
    pub message: String,
}

impl fmt::Display for StructureError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "line {}: {}", self.line, self.message)
    }
}

impl std::error::Error for StructureError {}

fn err<T>(line: usize, message: impl Into<String>) -> Result<T, StructureError> {
    Err(StructureError {
        line,
        message: message.into(),
    })
}

/// Normalise an element symbol ("CL" -> "Cl", "C12" -> "C") and check it is one; deuterium
/// reads as hydrogen.
fn symbol(raw: &str, line: usize) -> Result<String, StructureError> {
    let t = raw.trim();
    let letters: String = t.chars().take_while(|c| c.is_ascii_alphabetic()).collect();
    if letters.is_empty() || letters.len() > 2 {
        return err(line, format!("'{t}' is not an element symbol"));
    }
    let mut s = letters[..1].to_ascii_uppercase();
    s.push_str(&letters[1..].to_ascii_lowercase());
    if s == "D" {
        return Ok("H".into());
    }
    if super::periodic::number(&s).is_none_or(|z| z == 0) {
        return err(line, format!("'{t}' is not an element symbol"));
    }
    Ok(s)
}

fn coord(raw: &str, line: usize, what: &str) -> Result<f64, StructureError> {
    match raw.trim().parse::<f64>() {
        Ok(v) if v.is_finite() && v.abs() <= MAX_COORDINATE => Ok(v),
        Ok(v) if v.is_finite() => err(
            line,
            format!(
                "{what} = {} Å is farther out than 10,000 Å; is the file in ångström?",
                raw.trim()
            ),
        ),
        _ => err(line, format!("{what} '{}' is not a number", raw.trim())),
    }
}

/// The most atoms a structure may hold: a complex with its ligands, or a metal site cut from a
/// protein with a generous shell around it. Descriptors scale near-linearly with atoms, but a
/// whole protein or a periodic cell is not one ligand seen from one metal.
pub const MAX_ATOMS: usize = 20_000;

/// Coordinates beyond this many ångström are taken as a unit or format error.
pub const MAX_COORDINATE: f64 = 10_000.0;

/// A count with thousands separated by commas, as people write them (20,000).
pub fn grouped(n: usize) -> String {
    let digits = n.to_string();
    let mut out = String::with_capacity(digits.len() + digits.len() / 3);
    for (i, c) in digits.chars().enumerate() {
        if i > 0 && (digits.len() - i).is_multiple_of(3) {
            out.push(',');
        }
        out.push(c);
    }
    out
}

/// The atom count read from `raw`, checked against `MAX_ATOMS` before anything is allocated.
fn atom_count(raw: &str, line: usize, what: &str) -> Result<usize, StructureError> {
    let t = raw.trim();
    if t.is_empty() || !t.bytes().all(|b| b.is_ascii_digit()) {
        return err(line, format!("'{t}' is not an atom count ({what})"));
    }
    match t.parse::<usize>() {
        Ok(0) => err(
            line,
            format!("the atom count is 0 ({what}); the file has no atoms"),
        ),
        Ok(n) if n <= MAX_ATOMS => Ok(n),
        _ => err(
            line,
            format!(
                "the file promises {t} atoms; nonet reads at most {} (a complex with its \
                 ligands): cut the structure down to the metal and the ligand you want",
                grouped(MAX_ATOMS)
            ),
        ),
    }
}

/// XYZ: an atom count, a comment line, then "Symbol x y z" per atom. Only the first frame is
/// read; lines are taken one at a time, so a huge file costs no more memory than its text.
pub fn parse_xyz(text: &str) -> Result<Vec<Atom>, StructureError> {
    let mut lines = text.lines();
    let Some(first) = lines.next() else {
        return err(1, "empty file: an XYZ file starts with the number of atoms");
    };
    let n = atom_count(first, 1, "XYZ files start with one")?;
    if lines.next().is_none() {
        return err(
            2,
            format!("the file promises {n} atoms but ends after the count"),
        );
    }
    let mut atoms = Vec::with_capacity(n);
    for i in 0..n {
        let no = i + 3;
        let Some(line) = lines.next() else {
            return err(
                no,
                format!("the file promises {n} atoms on line 1 but has {i} atom lines"),
            );
        };
        let mut f = line.split_whitespace();
        let (Some(sym), Some(x), Some(y), Some(z)) = (f.next(), f.next(), f.next(), f.next())
        else {
            return err(no, "an atom line needs a symbol and x, y, z");
        };
        atoms.push(Atom {
            symbol: symbol(sym, no)?,
            pos: [coord(x, no, "x")?, coord(y, no, "y")?, coord(z, no, "z")?],
        });
    }
    // more atom lines than promised: the count is wrong (a second frame starts with a count)
    if let Some((k, extra)) = lines.enumerate().find(|(_, l)| !l.trim().is_empty()) {
        let f: Vec<&str> = extra.split_whitespace().take(4).collect();
        if f.len() >= 4 && f[1..4].iter().all(|x| x.parse::<f64>().is_ok()) {
            return err(
                n + 3 + k,
                format!(
                    "the file promises {n} atoms on line 1, but more atom lines follow; \
                     correct the count"
                ),
            );
        }
    }
    Ok(atoms)
}

/// MDL molfile V2000 (or the first record of an SDF): header, counts line, atom block.
pub fn parse_molfile(text: &str) -> Result<Vec<Atom>, StructureError> {
    let mut lines = text.lines();
    let header = lines.by_ref().take(3).count();
    let Some(counts) = lines.next() else {
        return err(
            header + 1,
            "a molfile needs three header lines and a counts line",
        );
    };
    if counts.contains("V3000") {
        return err(4, "V3000 molfiles are not read; save as V2000");
    }
    let n = match counts.get(0..3) {
        Some(c) => atom_count(c, 4, "the counts line starts with it")?,
        None => {
            return err(
                4,
                format!("counts line '{counts}' does not start with the atom count"),
            )
        }
    };
    let mut atoms = Vec::with_capacity(n);
    for i in 0..n {
        let no = 5 + i;
        let Some(line) = lines.next() else {
            return err(
                no,
                format!("the counts line promises {n} atoms; the file ends first"),
            );
        };
        // fixed columns: x 1-10, y 11-20, z 21-30, symbol 32-34; fall back to whitespace
        let fixed = (
            line.get(0..10),
            line.get(10..20),
            line.get(20..30),
            line.get(31..34),
        );
        let atom = match fixed {
            (Some(x), Some(y), Some(z), Some(s)) if x.trim().parse::<f64>().is_ok() => Atom {
                symbol: symbol(s, no)?,
                pos: [coord(x, no, "x")?, coord(y, no, "y")?, coord(z, no, "z")?],
            },
            _ => {
                let f: Vec<&str> = line.split_whitespace().collect();
                if f.len() < 4 {
                    return err(no, "an atom line needs x, y, z and a symbol");
                }
                Atom {
                    symbol: symbol(f[3], no)?,
                    pos: [
                        coord(f[0], no, "x")?,
                        coord(f[1], no, "y")?,
                        coord(f[2], no, "z")?,
                    ],
                }
            }
        };
        atoms.push(atom);
    }
    Ok(atoms)
}

/// Read by content: a counts line marked V2000/V3000 on line 4 means a molfile/SDF (whose
/// title may be a number, such as a database id); else a first line that is a number means XYZ.
pub fn parse(text: &str) -> Result<Vec<Atom>, StructureError> {
    if text.trim().is_empty() {
        return err(
            1,
            "the file is empty: give an XYZ file or an MDL molfile/SDF (V2000)",
        );
    }
    let fourth = text.lines().nth(3).unwrap_or("");
    if fourth.contains("V2000") || fourth.contains("V3000") {
        return parse_molfile(text);
    }
    let first = text.lines().next().unwrap_or("").trim();
    if !first.is_empty() && first.bytes().all(|b| b.is_ascii_digit()) {
        parse_xyz(text)
    } else {
        parse_molfile(text)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn xyz_and_molfile_read_the_same_atoms() {
        let xyz = "2\nphosphine fragment\nP 0 0 0\nH 1.42 0 0\n";
        let a = parse(xyz).unwrap();
        assert_eq!(a.len(), 2);
        assert_eq!(a[1].symbol, "H");
        let mol = "PH\n  test\n\n  2  1  0  0  0  0  0  0  0  0999 V2000\n    0.0000    0.0000    0.0000 P   0  0\n    1.4200    0.0000    0.0000 H   0  0\n  1  2  1  0\nM  END\n$$$$\n";
        let b = parse(mol).unwrap();
        assert_eq!(a, b);
    }

    #[test]
    fn malformed_files_name_the_line() {
        assert_eq!(parse_xyz("x\n").unwrap_err().line, 1);
        assert_eq!(parse_xyz("2\nc\nP 0 0 0\n").unwrap_err().line, 4);
        assert_eq!(parse_xyz("1\nc\nP 0 zero 0\n").unwrap_err().line, 3);
        assert_eq!(parse_molfile("a\nb\nc\n").unwrap_err().line, 4);
        assert!(
            parse_molfile("a\nb\nc\n  1  0  0  0  0  0  0  0  0  0999 V3000\n")
                .unwrap_err()
                .message
                .contains("V3000")
        );
    }
}

//! Periodic data the counting needs: the d-block metals and the f-block metals.

use serde::Serialize;

/// Where a metal sits in the periodic table, which decides whether the 18-electron frame applies.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Block {
    /// Groups 3-12: counted against 18 (or 16) electrons.
    D,
    /// Lanthanides and actinides: bonding is largely ionic; the 18-electron rule does not apply.
    F,
}

/// A metal element.
#[derive(Debug, PartialEq, Eq)]
pub struct Element {
    pub symbol: &'static str,
    pub name: &'static str,
    pub number: u8,
    /// IUPAC group (3-12) for d-block metals; 3 for the f-block, whose valence count is in `valence`.
    pub group: u8,
    pub period: u8,
    pub block: Block,
    /// Valence electrons of the neutral atom used in counting: the group number for the d block,
    /// 3 plus the 4f/5f count for the f block.
    pub valence: u8,
}

impl Element {
    /// 3d metals show high/low-spin choices; 4d and 5d metals are nearly always low spin.
    pub fn is_first_row(&self) -> bool {
        self.block == Block::D && self.period == 4
    }
}

macro_rules! d {
    ($sym:literal, $name:literal, $z:literal, $group:literal, $period:literal) => {
        Element {
            symbol: $sym,
            name: $name,
            number: $z,
            group: $group,
            period: $period,
            block: Block::D,
            valence: $group,
        }
    };
}

macro_rules! f {
    ($sym:literal, $name:literal, $z:literal, $period:literal, $valence:literal) => {
        Element {
            symbol: $sym,
            name: $name,
            number: $z,
            group: 3,
            period: $period,
            block: Block::F,
            valence: $valence,
        }
    };
}

/// Every metal nonet can count, ordered by atomic number.
pub static ELEMENTS: &[Element] = &[
    d!("Sc", "scandium", 21, 3, 4),
    d!("Ti", "titanium", 22, 4, 4),
    d!("V", "vanadium", 23, 5, 4),
    d!("Cr", "chromium", 24, 6, 4),
    d!("Mn", "manganese", 25, 7, 4),
    d!("Fe", "iron", 26, 8, 4),
    d!("Co", "cobalt", 27, 9, 4),
    d!("Ni", "nickel", 28, 10, 4),
    d!("Cu", "copper", 29, 11, 4),
    d!("Zn", "zinc", 30, 12, 4),
    d!("Y", "yttrium", 39, 3, 5),
    d!("Zr", "zirconium", 40, 4, 5),
    d!("Nb", "niobium", 41, 5, 5),
    d!("Mo", "molybdenum", 42, 6, 5),
    d!("Tc", "technetium", 43, 7, 5),
    d!("Ru", "ruthenium", 44, 8, 5),
    d!("Rh", "rhodium", 45, 9, 5),
    d!("Pd", "palladium", 46, 10, 5),
    d!("Ag", "silver", 47, 11, 5),
    d!("Cd", "cadmium", 48, 12, 5),
    d!("La", "lanthanum", 57, 3, 6),
    f!("Ce", "cerium", 58, 6, 4),
    f!("Pr", "praseodymium", 59, 6, 5),
    f!("Nd", "neodymium", 60, 6, 6),
    f!("Pm", "promethium", 61, 6, 7),
    f!("Sm", "samarium", 62, 6, 8),
    f!("Eu", "europium", 63, 6, 9),
    f!("Gd", "gadolinium", 64, 6, 10),
    f!("Tb", "terbium", 65, 6, 11),
    f!("Dy", "dysprosium", 66, 6, 12),
    f!("Ho", "holmium", 67, 6, 13),
    f!("Er", "erbium", 68, 6, 14),
    f!("Tm", "thulium", 69, 6, 15),
    f!("Yb", "ytterbium", 70, 6, 16),
    f!("Lu", "lutetium", 71, 6, 17),
    d!("Hf", "hafnium", 72, 4, 6),
    d!("Ta", "tantalum", 73, 5, 6),
    d!("W", "tungsten", 74, 6, 6),
    d!("Re", "rhenium", 75, 7, 6),
    d!("Os", "osmium", 76, 8, 6),
    d!("Ir", "iridium", 77, 9, 6),
    d!("Pt", "platinum", 78, 10, 6),
    d!("Au", "gold", 79, 11, 6),
    d!("Hg", "mercury", 80, 12, 6),
    f!("Ac", "actinium", 89, 7, 3),
    f!("Th", "thorium", 90, 7, 4),
    f!("Pa", "protactinium", 91, 7, 5),
    f!("U", "uranium", 92, 7, 6),
    f!("Np", "neptunium", 93, 7, 7),
    f!("Pu", "plutonium", 94, 7, 8),
    f!("Am", "americium", 95, 7, 9),
    f!("Cm", "curium", 96, 7, 10),
    f!("Bk", "berkelium", 97, 7, 11),
    f!("Cf", "californium", 98, 7, 12),
    f!("Es", "einsteinium", 99, 7, 13),
    f!("Fm", "fermium", 100, 7, 14),
    f!("Md", "mendelevium", 101, 7, 15),
    f!("No", "nobelium", 102, 7, 16),
    f!("Lr", "lawrencium", 103, 7, 17),
];

/// The oxidation states a metal commonly takes in its coordination and organometallic
/// compounds (common practice, as tabulated in Greenwood & Earnshaw, *Chemistry of the
/// Elements*, 2nd ed., 1997; the low states of carbonyl and phosphine chemistry included).
/// Used only to choose between readings a formula leaves open, never to refuse one; empty for
/// metals not listed (the f block).
pub fn common_oxidation_states(symbol: &str) -> &'static [i8] {
    match symbol {
        "Sc" | "Y" | "La" => &[3],
        "Ti" => &[2, 3, 4],
        "V" => &[2, 3, 4, 5],
        "Cr" => &[0, 2, 3, 6],
        "Mn" => &[1, 2, 3, 4, 7],
        "Fe" => &[0, 2, 3],
        "Co" => &[1, 2, 3],
        "Ni" => &[0, 2],
        "Cu" => &[1, 2],
        "Zn" | "Cd" => &[2],
        "Zr" => &[2, 4],
        "Nb" | "Ta" => &[3, 5],
        "Mo" => &[0, 2, 3, 4, 5, 6],
        "Tc" => &[1, 4, 5, 7],
        "Ru" => &[0, 2, 3, 4],
        "Rh" => &[1, 3],
        "Pd" | "Pt" => &[0, 2, 4],
        "Ag" => &[1],
        "Hf" => &[4],
        "W" => &[0, 2, 4, 6],
        "Re" => &[1, 3, 4, 5, 7],
        "Os" => &[0, 2, 3, 4, 6, 8],
        "Ir" => &[1, 3, 4],
        "Au" => &[1, 3],
        "Hg" => &[1, 2],
        _ => &[],
    }
}

/// Look a metal up by its exact (case-sensitive) symbol.
pub fn by_symbol(symbol: &str) -> Option<&'static Element> {
    let code = symbol_code(symbol.as_bytes())?;
    let index = symbol_index();
    index
        .binary_search_by_key(&code, |&(c, _)| c)
        .ok()
        .map(|i| &ELEMENTS[index[i].1])
}

/// Symbol codes sorted for binary search, built once.
fn symbol_index() -> &'static [(u16, usize)] {
    static INDEX: std::sync::OnceLock<Vec<(u16, usize)>> = std::sync::OnceLock::new();
    INDEX.get_or_init(|| {
        let mut v: Vec<(u16, usize)> = ELEMENTS
            .iter()
            .enumerate()
            .filter_map(|(i, e)| symbol_code(e.symbol.as_bytes()).map(|c| (c, i)))
            .collect();
        v.sort_unstable();
        v
    })
}

/// "H", "Cl", "O": shaped like an element symbol, one upper-case letter and at most one
/// lower-case one.
pub fn is_symbol_shaped(s: &str) -> bool {
    let b = s.as_bytes();
    match b.len() {
        1 => b[0].is_ascii_uppercase(),
        2 => b[0].is_ascii_uppercase() && b[1].is_ascii_lowercase(),
        _ => false,
    }
}

/// A one- or two-letter symbol packed into an integer, so look-ups compare numbers, not
/// strings (the parser asks for every bare token).
fn symbol_code(b: &[u8]) -> Option<u16> {
    match b {
        [a] => Some((*a as u16) << 8),
        [a, c] => Some((*a as u16) << 8 | *c as u16),
        _ => None,
    }
}

/// The metal symbol at the start of `text`, if any: two letters are preferred over one.
pub fn symbol_prefix(text: &str) -> Option<&'static Element> {
    let mut chars = text.char_indices();
    let (_, first) = chars.next()?;
    if !first.is_ascii_uppercase() {
        return None;
    }
    if let Some((i, second)) = chars.next() {
        if second.is_ascii_lowercase() {
            if let Some(e) = by_symbol(&text[..i + 1]) {
                return Some(e);
            }
        }
    }
    by_symbol(&text[..1])
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn two_letter_symbols_win_over_one_letter() {
        assert_eq!(symbol_prefix("Nb(").map(|e| e.symbol), Some("Nb"));
        assert_eq!(symbol_prefix("W(CO)6").map(|e| e.symbol), Some("W"));
        assert_eq!(symbol_prefix("CO"), None);
        assert_eq!(symbol_prefix("Co2").map(|e| e.symbol), Some("Co"));
    }

    #[test]
    fn d_block_covers_groups_3_to_12_in_three_rows() {
        for period in 4..=6 {
            let groups: Vec<u8> = ELEMENTS
                .iter()
                .filter(|e| e.block == Block::D && e.period == period)
                .map(|e| e.group)
                .collect();
            assert_eq!(groups, (3..=12).collect::<Vec<_>>(), "period {period}");
        }
    }
}

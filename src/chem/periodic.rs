//! Element symbols for every atom a ligand or reagent can hold, with the usual valences that
//! SMILES and condensed formulas leave implicit.

/// Symbols by atomic number; index 0 is the `*` of a bond to the metal.
pub const SYMBOLS: [&str; 119] = [
    "*", "H", "He", "Li", "Be", "B", "C", "N", "O", "F", "Ne", "Na", "Mg", "Al", "Si", "P", "S",
    "Cl", "Ar", "K", "Ca", "Sc", "Ti", "V", "Cr", "Mn", "Fe", "Co", "Ni", "Cu", "Zn", "Ga", "Ge",
    "As", "Se", "Br", "Kr", "Rb", "Sr", "Y", "Zr", "Nb", "Mo", "Tc", "Ru", "Rh", "Pd", "Ag", "Cd",
    "In", "Sn", "Sb", "Te", "I", "Xe", "Cs", "Ba", "La", "Ce", "Pr", "Nd", "Pm", "Sm", "Eu", "Gd",
    "Tb", "Dy", "Ho", "Er", "Tm", "Yb", "Lu", "Hf", "Ta", "W", "Re", "Os", "Ir", "Pt", "Au", "Hg",
    "Tl", "Pb", "Bi", "Po", "At", "Rn", "Fr", "Ra", "Ac", "Th", "Pa", "U", "Np", "Pu", "Am", "Cm",
    "Bk", "Cf", "Es", "Fm", "Md", "No", "Lr", "Rf", "Db", "Sg", "Bh", "Hs", "Mt", "Ds", "Rg", "Cn",
    "Nh", "Fl", "Mc", "Lv", "Ts", "Og",
];

pub const H: u8 = 1;
pub const B: u8 = 5;
pub const C: u8 = 6;
pub const N: u8 = 7;
pub const O: u8 = 8;
pub const SI: u8 = 14;
pub const S: u8 = 16;

/// Atomic number of a symbol ("Cl" -> 17); `*` is 0.
pub fn number(symbol: &str) -> Option<u8> {
    // a match, not a search of SYMBOLS: condensed formulas ask for every letter they read
    Some(match symbol {
        "*" => 0,
        "H" => 1,
        "He" => 2,
        "Li" => 3,
        "Be" => 4,
        "B" => 5,
        "C" => 6,
        "N" => 7,
        "O" => 8,
        "F" => 9,
        "Ne" => 10,
        "Na" => 11,
        "Mg" => 12,
        "Al" => 13,
        "Si" => 14,
        "P" => 15,
        "S" => 16,
        "Cl" => 17,
        "Ar" => 18,
        "K" => 19,
        "Ca" => 20,
        "Sc" => 21,
        "Ti" => 22,
        "V" => 23,
        "Cr" => 24,
        "Mn" => 25,
        "Fe" => 26,
        "Co" => 27,
        "Ni" => 28,
        "Cu" => 29,
        "Zn" => 30,
        "Ga" => 31,
        "Ge" => 32,
        "As" => 33,
        "Se" => 34,
        "Br" => 35,
        "Kr" => 36,
        "Rb" => 37,
        "Sr" => 38,
        "Y" => 39,
        "Zr" => 40,
        "Nb" => 41,
        "Mo" => 42,
        "Tc" => 43,
        "Ru" => 44,
        "Rh" => 45,
        "Pd" => 46,
        "Ag" => 47,
        "Cd" => 48,
        "In" => 49,
        "Sn" => 50,
        "Sb" => 51,
        "Te" => 52,
        "I" => 53,
        "Xe" => 54,
        "Cs" => 55,
        "Ba" => 56,
        "La" => 57,
        "Ce" => 58,
        "Pr" => 59,
        "Nd" => 60,
        "Pm" => 61,
        "Sm" => 62,
        "Eu" => 63,
        "Gd" => 64,
        "Tb" => 65,
        "Dy" => 66,
        "Ho" => 67,
        "Er" => 68,
        "Tm" => 69,
        "Yb" => 70,
        "Lu" => 71,
        "Hf" => 72,
        "Ta" => 73,
        "W" => 74,
        "Re" => 75,
        "Os" => 76,
        "Ir" => 77,
        "Pt" => 78,
        "Au" => 79,
        "Hg" => 80,
        "Tl" => 81,
        "Pb" => 82,
        "Bi" => 83,
        "Po" => 84,
        "At" => 85,
        "Rn" => 86,
        "Fr" => 87,
        "Ra" => 88,
        "Ac" => 89,
        "Th" => 90,
        "Pa" => 91,
        "U" => 92,
        "Np" => 93,
        "Pu" => 94,
        "Am" => 95,
        "Cm" => 96,
        "Bk" => 97,
        "Cf" => 98,
        "Es" => 99,
        "Fm" => 100,
        "Md" => 101,
        "No" => 102,
        "Lr" => 103,
        "Rf" => 104,
        "Db" => 105,
        "Sg" => 106,
        "Bh" => 107,
        "Hs" => 108,
        "Mt" => 109,
        "Ds" => 110,
        "Rg" => 111,
        "Cn" => 112,
        "Nh" => 113,
        "Fl" => 114,
        "Mc" => 115,
        "Lv" => 116,
        "Ts" => 117,
        "Og" => 118,
        _ => return None,
    })
}

pub fn symbol(z: u8) -> &'static str {
    SYMBOLS.get(z as usize).copied().unwrap_or("?")
}

/// The valences a neutral atom of this element usually shows, lowest first: the targets of
/// OpenSMILES' organic subset (B 3, C 4, N 3/5, O 2, P 3/5, S 2/4/6, halogens 1) and the group
/// valences of the main-group elements reagents carry (common practice).
pub fn valences(z: u8) -> &'static [u8] {
    match z {
        1 | 3 | 9 | 11 | 19 | 37 | 55 | 29 | 47 | 79 | 81 => &[1],
        17 | 35 | 53 => &[1, 3, 5, 7],
        4 | 12 | 20 | 30 | 48 | 80 => &[2],
        5 | 13 | 31 | 49 => &[3],
        6 | 14 | 32 | 50 | 82 => &[4],
        7 => &[3, 5],
        15 | 33 | 51 | 83 => &[3, 5],
        8 => &[2],
        16 | 34 | 52 => &[2, 4, 6],
        _ => &[],
    }
}

/// The valences an atom of this element and charge shows: a cation takes the valences of its
/// isoelectronic neighbour to the right in the row (N+ like C), an anion those to the left
/// (O- like F... by one bond fewer), as OpenSMILES reads bracket atoms.
pub fn valences_charged(z: u8, charge: i8) -> Vec<u8> {
    let base = valences(z);
    if charge == 0 {
        return base.to_vec();
    }
    // boron and carbon cations and anions change the count of bonds the other way round
    // from N, O: C+ and B have three bonds, C- three (with a lone pair), B- four
    let shift: i16 = match z {
        5 | 13 => -(charge as i16),
        6 | 14 => -(charge.abs() as i16),
        _ => charge as i16,
    };
    base.iter()
        .filter_map(|&v| u8::try_from(v as i16 + shift).ok())
        .collect()
}

/// The elements of OpenSMILES' organic subset, which may be written without brackets.
pub fn organic_subset(z: u8) -> bool {
    matches!(z, 5 | 6 | 7 | 8 | 9 | 15 | 16 | 17 | 35 | 53)
}

/// The elements that may be written aromatic (lower case) in SMILES.
pub fn may_be_aromatic(z: u8) -> bool {
    matches!(z, 5 | 6 | 7 | 8 | 15 | 16 | 33 | 34)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn symbols_round_trip() {
        for (z, s) in SYMBOLS.iter().enumerate() {
            assert_eq!(number(s), Some(z as u8));
        }
        assert_eq!(number("Xx"), None);
        assert_eq!(symbol(6), "C");
    }

    #[test]
    fn charged_valences_follow_isoelectronic_neighbours() {
        assert_eq!(valences_charged(7, 1), vec![4, 6]);
        assert_eq!(valences_charged(8, -1), vec![1]);
        assert_eq!(valences_charged(5, -1), vec![4]);
        assert_eq!(valences_charged(6, 1), vec![3]);
        assert_eq!(valences_charged(6, -1), vec![3]);
    }
}

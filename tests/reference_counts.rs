//! Black-box reference tests: `nonet count --json` against published (textbook) values.
//!
//! Every expected value below is paired with the source it comes from; the source is printed
//! with any mismatch. Sources are the primary works (books, journals). "common practice" marks a
//! convention with no single source; "(from memory)" marks a citation or value recalled without
//! checking the work itself. Where the literature disputes a value the conventional one is
//! tested and the dispute is named next to the case.
//!
//! Contract under test (fixed): `nonet count --json FORMULA...` prints one JSON object per
//! formula, one per line, in input order; exit code 0 if every formula parsed, 2 if any failed;
//! a failed formula prints `{"input": ..., "error": ...}`. Numbers are compared as f64 with a
//! tolerance of 1e-6. Per-metal values of polynuclear complexes are per metal (averages).
//!
//! Each test runs the binary once per group of formulas, with NONET_CONFIG_DIR and
//! NONET_DATA_DIR pointing into a fresh scratch directory so no user files are read.

use serde_json::Value;

mod common;

use common::cli::{Run, Scratch};

const TOL: f64 = 1e-6;

// ---------------------------------------------------------------------------------------------
// Sources
// ---------------------------------------------------------------------------------------------

const CRABTREE: &str =
    "Crabtree, The Organometallic Chemistry of the Transition Metals, 6th ed., Wiley 2014, ch. 2";
const MFT_OM: &str =
    "Miessler, Fischer & Tarr, Inorganic Chemistry, 5th ed., Pearson 2014, ch. 13 (organometallics)";
const MFT_LF: &str =
    "Miessler, Fischer & Tarr, Inorganic Chemistry, 5th ed., Pearson 2014, ch. 10-11 (ligand field)";
const GE: &str =
    "Greenwood & Earnshaw, Chemistry of the Elements, 2nd ed., Butterworth-Heinemann 1997";
const ELSCH: &str = "Elschenbroich, Organometallics, 3rd ed., Wiley-VCH 2006 (metallocenes)";
const GREEN95: &str = "Green, J. Organomet. Chem. 1995, 500, 127 (CBC definitions)";
const GREEN_PARKIN: &str = "Green & Parkin, J. Chem. Educ. 2014, 91, 807 (CBC, VN, LBN)";
const MINGOS: &str = "Mingos, Acc. Chem. Res. 1984, 17, 311 (cluster valence electron counts)";
const KUBAS: &str = "Kubas, Ryan, Swanson, Vergamini & Wasserman, J. Am. Chem. Soc. 1984, 106, 451";
const TOLMAN72: &str = "Tolman, Chem. Soc. Rev. 1972, 1, 337 (16-e square-planar d8 is stable)";
const TRO: &str = "Tro, Chemistry: A Molecular Approach, 4th ed., Pearson 2017, ch. 25";
const SHRIVER: &str =
    "Shriver & Atkins, Inorganic Chemistry, 3rd ed., OUP 2001, ch. 7 (ligand field)";
const VCO6_NATURE: &str =
    "Nature 1964, 204, 871 (V(CO)6 mononuclear, d5, one unpaired electron; authors not checked)";
const ABRAHAMS: &str =
    "Abrahams, Ginsberg & Knox, Inorg. Chem. 1964, 3, 558 (K2ReH9 structure) (from memory)";
const DIDISHEIM: &str = "Didisheim, Zolliker, Yvon, Fischer, Schefer, Gubelmann & Williams, Inorg. Chem. 1984, 23, 1953 (Mg2FeH6, octahedral [FeH6]4-, diamagnetic)";
const BRAUNSCHWEIG: &str =
    "Braunschweig, Gruss & Radacki, Angew. Chem. Int. Ed. 2007, 46, 7782 (Pt(PCy3)2(AlCl3))";
const AMGOUNE: &str =
    "Amgoune & Bourissou, Chem. Commun. 2011, 47, 859 (Z-type ligands leave OS unchanged) (from memory)";
const FISCHER_MAASBOL: &str =
    "Fischer & Maasböl, Angew. Chem. Int. Ed. Engl. 1964, 3, 580 (from memory)";
const SCHROCK75: &str = "Schrock, J. Am. Chem. Soc. 1975, 97, 6577 (Cp2Ta(CH3)(CH2)) (from memory)";
const SCHROCK81: &str =
    "Wengrovius, Sancho & Schrock, J. Am. Chem. Soc. 1981, 103, 3932 (W(CtBu)(OtBu)3) (from memory)";
const FISCHER_HAFNER: &str =
    "Fischer & Hafner, Z. Naturforsch. B 1955, 10, 665 (Cr(C6H6)2) (from memory)";
const VASKA: &str = "Vaska & DiLuzio, J. Am. Chem. Soc. 1961, 83, 2784 (from memory)";
const VASKA_H2: &str =
    "Vaska & DiLuzio, J. Am. Chem. Soc. 1962, 84, 679 (H2 addition) (from memory)";
const WILKINSON66: &str =
    "Osborn, Jardine, Young & Wilkinson, J. Chem. Soc. A 1966, 1711 (from memory)";
const SHORTLAND: &str =
    "Shortland & Wilkinson, J. Chem. Soc., Dalton Trans. 1973, 872 (WMe6) (from memory)";
const COLLMAN: &str = "Collman, Acc. Chem. Res. 1975, 8, 342 (Na2Fe(CO)4) (from memory)";
const ENEMARK: &str =
    "Enemark & Feltham, Coord. Chem. Rev. 1974, 13, 339 (bent {CoNO}8 nitrosyls) (from memory)";
const GGP: &str = "conventional count; disputed by Green, Green & Parkin, Chem. Commun. 2012, 48, 11481 and Ponec et al., J. Phys. Chem. A 2008, 112, 9936 (no direct M-M bond)";
const COMMON: &str = "common practice";
const CONTRACT_CN: &str = "common practice (nonet contract: eta5-Cp and eta6-arene take 3 positions, eta3-allyl 2, eta2-alkene 1, kappa-n chelate n)";
const CHARGE_AS_WRITTEN: &str = "the charge written in the formula";

// ---------------------------------------------------------------------------------------------
// Expectations
// ---------------------------------------------------------------------------------------------

/// One expected value. Per-metal expectations are checked on every entry of `metals`
/// (all reference complexes are homometallic).
#[derive(Debug, Clone, Copy)]
enum E {
    /// metals[].electron_count (neutral/covalent model)
    Ec(f64),
    /// metals[].oxidation_state (conventional)
    Os(f64),
    /// metals[].d_electrons (conventional, ionic model)
    D(f64),
    /// metals[].coordination_number (positions)
    Cn(f64),
    /// metals[].cbc_class, exact
    Class(&'static str),
    /// metals[].equivalent_neutral_class, exact
    Enc(&'static str),
    /// metals[].valence_number
    Vn(f64),
    /// metals[].ligand_bond_number
    Lbn(f64),
    /// metals[].saturation, exact
    Sat(&'static str),
    /// metals[].electrons_short
    Short(f64),
    /// metal_metal_bonds == n
    Mm(i64),
    /// metal_metal_bonds is null (18-electron rule does not apply)
    MmNull,
    /// metal_metal_bonds is 0 or null (no M-M bond; 16-e centres)
    MmNone,
    /// cluster_valence_electrons
    Cve(f64),
    /// polyhedron is a string containing this (case-insensitive)
    Poly(&'static str),
    /// unpaired_electrons[0] (most likely)
    Unpaired(f64),
    /// geometry contains this, after lowercasing and mapping '-' and '_' to ' '
    Geom(&'static str),
}

struct Case {
    formula: &'static str,
    metal: &'static str,
    checks: &'static [(E, &'static str)],
}

use E::*;

// ---------------------------------------------------------------------------------------------
// Reference tables
// ---------------------------------------------------------------------------------------------

/// Mononuclear carbonyls, carbonylates and nitrosyls.
const CARBONYLS: &[Case] = &[
    Case {
        formula: "Cr(CO)6",
        metal: "Cr",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(0.0), CRABTREE),
            (D(6.0), CRABTREE),
            (Cn(6.0), CONTRACT_CN),
            (Class("[CrL6]"), GREEN95),
            (Vn(0.0), GREEN_PARKIN),
            (Lbn(6.0), GREEN_PARKIN),
            (Sat("saturated"), CRABTREE),
            (Unpaired(0.0), MFT_OM),
            (Geom("octahedr"), MFT_OM),
        ],
    },
    Case {
        formula: "Fe(CO)5",
        metal: "Fe",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(0.0), CRABTREE),
            (D(8.0), CRABTREE),
            (Cn(5.0), CONTRACT_CN),
            (Class("[FeL5]"), GREEN95),
            (Sat("saturated"), CRABTREE),
            (Unpaired(0.0), MFT_OM),
            (Geom("trigonal bipyram"), GE),
        ],
    },
    Case {
        formula: "Ni(CO)4",
        metal: "Ni",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(0.0), CRABTREE),
            (D(10.0), CRABTREE),
            (Cn(4.0), CONTRACT_CN),
            (Class("[NiL4]"), GREEN95),
            (Unpaired(0.0), MFT_OM),
            (Geom("tetrahedr"), GE),
        ],
    },
    Case {
        formula: "[V(CO)6]-",
        metal: "V",
        checks: &[
            (Ec(18.0), MFT_OM),
            (Os(-1.0), MFT_OM),
            (D(6.0), MFT_OM),
            (Cn(6.0), CONTRACT_CN),
            (Unpaired(0.0), MFT_OM),
        ],
    },
    Case {
        // the classic 17-electron, paramagnetic, monomeric binary carbonyl
        formula: "V(CO)6",
        metal: "V",
        checks: &[
            (Ec(17.0), CRABTREE),
            (Os(0.0), CRABTREE),
            (D(5.0), VCO6_NATURE),
            (Sat("unsaturated"), CRABTREE),
            (Short(1.0), CRABTREE),
            (Unpaired(1.0), VCO6_NATURE),
        ],
    },
    Case {
        formula: "[Mn(CO)6]+",
        metal: "Mn",
        checks: &[
            (Ec(18.0), MFT_OM),
            (Os(1.0), MFT_OM),
            (D(6.0), MFT_OM),
            // equivalent neutral class: L+ -> X
            (Enc("[MnL5X]"), GREEN95),
            (Unpaired(0.0), MFT_OM),
        ],
    },
    Case {
        formula: "[Co(CO)4]-",
        metal: "Co",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(-1.0), CRABTREE),
            (D(10.0), CRABTREE),
            (Cn(4.0), CONTRACT_CN),
            (Unpaired(0.0), MFT_OM),
        ],
    },
    Case {
        // Collman's reagent anion
        formula: "[Fe(CO)4]2-",
        metal: "Fe",
        checks: &[
            (Ec(18.0), COLLMAN),
            (Os(-2.0), COLLMAN),
            (D(10.0), COLLMAN),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        formula: "CoH(CO)4",
        metal: "Co",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(1.0), CRABTREE),
            (D(8.0), CRABTREE),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        // linear NO counted as NO+ (3-e LX donor in the neutral model)
        formula: "Fe(CO)2(NO)2",
        metal: "Fe",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(-2.0), CRABTREE),
            (D(10.0), CRABTREE),
            (Class("[FeL4X2]"), GREEN95),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        // isoelectronic with Ni(CO)4
        formula: "Co(CO)3(NO)",
        metal: "Co",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(-1.0), CRABTREE),
            (D(10.0), CRABTREE),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        // nitroprusside: Fe(II) with linear NO+
        formula: "[Fe(CN)5(NO)]2-",
        metal: "Fe",
        checks: &[
            (Ec(18.0), GE),
            (Os(2.0), GE),
            (D(6.0), GE),
            (Unpaired(0.0), GE),
        ],
    },
    Case {
        // black [Co(NH3)5NO]2+: bent NO (Co-N-O ~119 deg) counted as NO-, Co(III)
        formula: "[Co(NH3)5(bent-NO)]2+",
        metal: "Co",
        checks: &[
            (Ec(18.0), ENEMARK),
            (Os(3.0), ENEMARK),
            (D(6.0), ENEMARK),
            (Unpaired(0.0), ENEMARK),
        ],
    },
];

/// Metallocenes and half-sandwich complexes, including 15/16/19/20-electron metallocenes.
const METALLOCENES: &[Case] = &[
    Case {
        formula: "Cp2Fe",
        metal: "Fe",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(2.0), CRABTREE),
            (D(6.0), CRABTREE),
            (Cn(6.0), CONTRACT_CN),
            (Class("[FeL4X2]"), GREEN95),
            (Enc("[FeL4X2]"), GREEN95),
            (Vn(2.0), GREEN_PARKIN),
            (Lbn(6.0), GREEN_PARKIN),
            (Unpaired(0.0), ELSCH),
        ],
    },
    Case {
        // ASCII hapticity spelling of ferrocene
        formula: "Fe(eta5-C5H5)2",
        metal: "Fe",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(2.0), CRABTREE),
            (D(6.0), CRABTREE),
            (Class("[FeL4X2]"), GREEN95),
            (Unpaired(0.0), ELSCH),
        ],
    },
    Case {
        formula: "Cp*2Fe",
        metal: "Fe",
        checks: &[
            (Ec(18.0), ELSCH),
            (Os(2.0), ELSCH),
            (D(6.0), ELSCH),
            (Unpaired(0.0), ELSCH),
        ],
    },
    Case {
        formula: "Cp2Co",
        metal: "Co",
        checks: &[
            (Ec(19.0), CRABTREE),
            (Os(2.0), CRABTREE),
            (D(7.0), CRABTREE),
            (Sat("above_18"), CRABTREE),
            (Unpaired(1.0), ELSCH),
        ],
    },
    Case {
        formula: "Cp2Ni",
        metal: "Ni",
        checks: &[
            (Ec(20.0), CRABTREE),
            (Os(2.0), CRABTREE),
            (D(8.0), CRABTREE),
            (Sat("above_18"), CRABTREE),
            // two unpaired electrons in the degenerate e1g* (dxz, dyz) pair
            (Unpaired(2.0), ELSCH),
        ],
    },
    Case {
        formula: "[Cp2Co]+",
        metal: "Co",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(3.0), CRABTREE),
            (D(6.0), CRABTREE),
            // L+ -> X on [CoL4X2]+
            (Enc("[CoL3X3]"), GREEN95),
            (Unpaired(0.0), ELSCH),
        ],
    },
    Case {
        // vanadocene: 15 e, quartet
        formula: "Cp2V",
        metal: "V",
        checks: &[
            (Ec(15.0), ELSCH),
            (Os(2.0), ELSCH),
            (D(3.0), ELSCH),
            (Unpaired(3.0), ELSCH),
        ],
    },
    Case {
        // chromocene: 16 e, triplet
        formula: "Cp2Cr",
        metal: "Cr",
        checks: &[
            (Ec(16.0), ELSCH),
            (Os(2.0), ELSCH),
            (D(4.0), ELSCH),
            (Unpaired(2.0), ELSCH),
        ],
    },
    Case {
        formula: "Cp2ZrCl2",
        metal: "Zr",
        checks: &[
            (Ec(16.0), CRABTREE),
            (Os(4.0), CRABTREE),
            (D(0.0), CRABTREE),
            (Cn(8.0), CONTRACT_CN),
            (Class("[ZrL4X4]"), GREEN95),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        formula: "Cp2TiMe2",
        metal: "Ti",
        checks: &[
            (Ec(16.0), GREEN95),
            (Os(4.0), CRABTREE),
            (D(0.0), CRABTREE),
            (Cn(8.0), CONTRACT_CN),
            (Class("[TiL4X4]"), GREEN95),
            (Vn(4.0), GREEN_PARKIN),
            (Lbn(8.0), GREEN_PARKIN),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        // cymantrene
        formula: "CpMn(CO)3",
        metal: "Mn",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(1.0), CRABTREE),
            (D(6.0), CRABTREE),
            (Cn(6.0), CONTRACT_CN),
            (Unpaired(0.0), COMMON),
        ],
    },
];

/// Square-planar d8 complexes and d10 phosphine complexes.
const SQUARE_PLANAR: &[Case] = &[
    Case {
        // Vaska's complex; 16 e is the stable count for square-planar d8
        formula: "IrCl(CO)(PPh3)2",
        metal: "Ir",
        checks: &[
            (Ec(16.0), CRABTREE),
            (Os(1.0), VASKA),
            (D(8.0), CRABTREE),
            (Cn(4.0), CONTRACT_CN),
            (Class("[IrL3X]"), GREEN95),
            (Vn(1.0), GREEN_PARKIN),
            (Lbn(4.0), GREEN_PARKIN),
            (Sat("saturated"), TOLMAN72),
            (Unpaired(0.0), CRABTREE),
            (Geom("square planar"), CRABTREE),
        ],
    },
    Case {
        formula: "[PtCl4]2-",
        metal: "Pt",
        checks: &[
            (Ec(16.0), MFT_OM),
            (Os(2.0), MFT_OM),
            (D(8.0), MFT_OM),
            (Cn(4.0), CONTRACT_CN),
            // X- -> L twice on [PtX4]2-
            (Enc("[PtL2X2]"), GREEN95),
            (Vn(2.0), GREEN_PARKIN),
            (Lbn(4.0), GREEN_PARKIN),
            (Unpaired(0.0), MFT_LF),
            (Geom("square planar"), MFT_LF),
        ],
    },
    Case {
        formula: "[Ni(CN)4]2-",
        metal: "Ni",
        checks: &[
            (Ec(16.0), COMMON),
            (Os(2.0), MFT_LF),
            (D(8.0), MFT_LF),
            (Unpaired(0.0), MFT_LF),
            (Geom("square planar"), MFT_LF),
        ],
    },
    Case {
        // cisplatin
        formula: "PtCl2(NH3)2",
        metal: "Pt",
        checks: &[
            (Ec(16.0), MFT_OM),
            (Os(2.0), MFT_OM),
            (D(8.0), MFT_OM),
            (Cn(4.0), CONTRACT_CN),
            (Unpaired(0.0), MFT_LF),
        ],
    },
    Case {
        // Wilkinson's catalyst
        formula: "RhCl(PPh3)3",
        metal: "Rh",
        checks: &[
            (Ec(16.0), CRABTREE),
            (Os(1.0), WILKINSON66),
            (D(8.0), CRABTREE),
            (Cn(4.0), CONTRACT_CN),
            (Class("[RhL3X]"), GREEN95),
            (Unpaired(0.0), CRABTREE),
        ],
    },
    Case {
        formula: "Pd(PPh3)4",
        metal: "Pd",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(0.0), CRABTREE),
            (D(10.0), CRABTREE),
            (Unpaired(0.0), COMMON),
        ],
    },
];

/// d0 alkyls, halides, alkoxides, alkylidenes/alkylidynes; hydride complexes.
const D0_AND_HYDRIDES: &[Case] = &[
    Case {
        formula: "WMe6",
        metal: "W",
        checks: &[
            (Ec(12.0), CRABTREE),
            (Os(6.0), SHORTLAND),
            (D(0.0), SHORTLAND),
            (Cn(6.0), CONTRACT_CN),
            (Class("[WX6]"), GREEN95),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        // halide pi-donation ignored, as is conventional
        formula: "TiCl4",
        metal: "Ti",
        checks: &[
            (Ec(8.0), COMMON),
            (Os(4.0), GE),
            (D(0.0), GE),
            (Class("[TiX4]"), GREEN95),
            (Unpaired(0.0), GE),
        ],
    },
    Case {
        // alkoxides counted as 1-e X ligands (pi-donation not counted): common practice
        formula: "Ti(OiPr)4",
        metal: "Ti",
        checks: &[
            (Ec(8.0), COMMON),
            (Os(4.0), COMMON),
            (D(0.0), COMMON),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        // Schrock's methylidene: CH2 is an X2 alkylidene
        formula: "Cp2TaMe(CH2)",
        metal: "Ta",
        checks: &[
            (Ec(18.0), SCHROCK75),
            (Os(5.0), SCHROCK75),
            (D(0.0), SCHROCK75),
            (Class("[TaL4X5]"), GREEN95),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        // alkylidyne X3; alkoxides as X (pi-donation not counted): 12 e conventional
        formula: "W(CtBu)(OtBu)3",
        metal: "W",
        checks: &[
            (Ec(12.0), COMMON),
            (Os(6.0), SCHROCK81),
            (D(0.0), SCHROCK81),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        formula: "[ReH9]2-",
        metal: "Re",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(7.0), ABRAHAMS),
            (D(0.0), ABRAHAMS),
            (Cn(9.0), ABRAHAMS),
            // X- -> L twice on [ReX9]2-
            (Enc("[ReL2X7]"), GREEN95),
            (Unpaired(0.0), GE),
        ],
    },
    Case {
        formula: "[FeH6]4-",
        metal: "Fe",
        checks: &[
            (Ec(18.0), COMMON),
            (Os(2.0), DIDISHEIM),
            (D(6.0), DIDISHEIM),
            (Cn(6.0), DIDISHEIM),
            (Unpaired(0.0), DIDISHEIM),
        ],
    },
    Case {
        // oxidative-addition product of Vaska's complex and H2 (bare H2 = two hydrides)
        formula: "IrH2Cl(CO)(PPh3)2",
        metal: "Ir",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(3.0), VASKA_H2),
            (D(6.0), VASKA_H2),
            (Cn(6.0), CONTRACT_CN),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        // Kubas complex: eta2-H2 is a 2-e L donor, W(0)
        formula: "W(CO)3(PCy3)2(η2-H2)",
        metal: "W",
        checks: &[
            (Ec(18.0), KUBAS),
            (Os(0.0), KUBAS),
            (D(6.0), KUBAS),
            (Cn(6.0), CONTRACT_CN),
            (Class("[WL6]"), GREEN95),
            (Unpaired(0.0), KUBAS),
        ],
    },
];

/// Werner-type complexes and high-spin/low-spin pairs.
const WERNER: &[Case] = &[
    Case {
        formula: "[Co(NH3)6]3+",
        metal: "Co",
        checks: &[
            (Ec(18.0), MFT_LF),
            (Os(3.0), MFT_LF),
            (D(6.0), MFT_LF),
            (Cn(6.0), CONTRACT_CN),
            // L+ -> X three times on [CoL6]3+
            (Enc("[CoL3X3]"), GREEN95),
            (Vn(3.0), GREEN_PARKIN),
            (Lbn(6.0), GREEN_PARKIN),
            (Unpaired(0.0), MFT_LF),
            (Geom("octahedr"), MFT_LF),
        ],
    },
    Case {
        // the high-spin Co(III) complex: 18 e does not mean low spin
        formula: "[CoF6]3-",
        metal: "Co",
        checks: &[
            (Ec(18.0), COMMON),
            (Os(3.0), GE),
            (D(6.0), GE),
            (Unpaired(4.0), GE),
        ],
    },
    Case {
        formula: "[Fe(CN)6]4-",
        metal: "Fe",
        checks: &[
            (Ec(18.0), MFT_LF),
            (Os(2.0), TRO),
            (D(6.0), TRO),
            (Enc("[FeL4X2]"), GREEN95),
            (Vn(2.0), GREEN_PARKIN),
            (Lbn(6.0), GREEN_PARKIN),
            (Unpaired(0.0), TRO),
        ],
    },
    Case {
        formula: "[Fe(CN)6]3-",
        metal: "Fe",
        checks: &[
            (Ec(17.0), COMMON),
            (Os(3.0), MFT_LF),
            (D(5.0), MFT_LF),
            (Enc("[FeL3X3]"), GREEN95),
            (Unpaired(1.0), MFT_LF),
        ],
    },
    Case {
        formula: "[Fe(H2O)6]2+",
        metal: "Fe",
        checks: &[
            (Ec(18.0), COMMON),
            (Os(2.0), TRO),
            (D(6.0), TRO),
            (Unpaired(4.0), TRO),
        ],
    },
    Case {
        formula: "[FeF6]3-",
        metal: "Fe",
        checks: &[
            (Ec(17.0), COMMON),
            (Os(3.0), MFT_LF),
            (D(5.0), MFT_LF),
            (Unpaired(5.0), MFT_LF),
        ],
    },
    Case {
        formula: "[Mn(H2O)6]2+",
        metal: "Mn",
        checks: &[
            (Ec(17.0), COMMON),
            (Os(2.0), MFT_LF),
            (D(5.0), MFT_LF),
            (Unpaired(5.0), MFT_LF),
        ],
    },
    Case {
        formula: "[Ti(H2O)6]3+",
        metal: "Ti",
        checks: &[
            (Ec(13.0), COMMON),
            (Os(3.0), MFT_LF),
            (D(1.0), MFT_LF),
            (Unpaired(1.0), MFT_LF),
        ],
    },
    Case {
        formula: "[NiCl4]2-",
        metal: "Ni",
        checks: &[
            (Ec(16.0), COMMON),
            (Os(2.0), MFT_LF),
            (D(8.0), MFT_LF),
            (Enc("[NiL2X2]"), GREEN95),
            (Unpaired(2.0), MFT_LF),
            (Geom("tetrahedr"), MFT_LF),
        ],
    },
    Case {
        // octahedral d8: always two unpaired electrons
        formula: "[Ni(H2O)6]2+",
        metal: "Ni",
        checks: &[
            (Ec(20.0), COMMON),
            (Os(2.0), MFT_LF),
            (D(8.0), MFT_LF),
            (Unpaired(2.0), MFT_LF),
        ],
    },
    Case {
        formula: "[Cr(NH3)6]3+",
        metal: "Cr",
        checks: &[
            (Ec(15.0), COMMON),
            (Os(3.0), GE),
            (D(3.0), GE),
            (Unpaired(3.0), GE),
        ],
    },
    Case {
        formula: "Cr(acac)3",
        metal: "Cr",
        checks: &[
            (Ec(15.0), COMMON),
            (Os(3.0), GE),
            (D(3.0), GE),
            (Cn(6.0), CONTRACT_CN),
            (Class("[CrL3X3]"), GREEN95),
            (Unpaired(3.0), GE),
        ],
    },
    Case {
        formula: "[Co(en)3]3+",
        metal: "Co",
        checks: &[
            (Ec(18.0), COMMON),
            (Os(3.0), GE),
            (D(6.0), GE),
            (Cn(6.0), CONTRACT_CN),
            (Unpaired(0.0), GE),
        ],
    },
    Case {
        formula: "[Fe(bpy)3]2+",
        metal: "Fe",
        checks: &[
            (Ec(18.0), COMMON),
            (Os(2.0), GE),
            (D(6.0), GE),
            (Cn(6.0), CONTRACT_CN),
            (Unpaired(0.0), SHRIVER),
        ],
    },
];

/// Polynuclear carbonyls, clusters and halide-bridged dimers.
const POLYNUCLEAR: &[Case] = &[
    Case {
        formula: "Mn2(CO)10",
        metal: "Mn",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(0.0), CRABTREE),
            (D(7.0), CRABTREE),
            (Mm(1), CRABTREE),
            (Cve(34.0), MINGOS),
            (Unpaired(0.0), GE),
        ],
    },
    Case {
        // one Co-Co bond is the conventional 18-e count
        formula: "Co2(CO)8",
        metal: "Co",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(0.0), CRABTREE),
            (D(9.0), CRABTREE),
            (Mm(1), GGP),
            (Cve(34.0), MINGOS),
            (Unpaired(0.0), GE),
        ],
    },
    Case {
        // one Fe-Fe bond is the conventional 18-e count
        formula: "Fe2(CO)9",
        metal: "Fe",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(0.0), CRABTREE),
            (D(8.0), CRABTREE),
            (Mm(1), GGP),
            (Cve(34.0), MINGOS),
            (Unpaired(0.0), GE),
        ],
    },
    Case {
        // the same molecule with its three (ketonic) mu-CO written out
        formula: "Fe2(CO)6(μ-CO)3",
        metal: "Fe",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(0.0), CRABTREE),
            (D(8.0), CRABTREE),
            (Mm(1), GGP),
            (Cve(34.0), MINGOS),
        ],
    },
    Case {
        // Fe(I) dimer; one Fe-Fe bond conventional
        formula: "[CpFe(CO)2]2",
        metal: "Fe",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(1.0), CRABTREE),
            (D(7.0), CRABTREE),
            (Mm(1), GGP),
            (Cve(34.0), MINGOS),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        formula: "Os3(CO)12",
        metal: "Os",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(0.0), CRABTREE),
            (D(8.0), CRABTREE),
            (Mm(3), MINGOS),
            (Cve(48.0), MINGOS),
            (Poly("triang"), MINGOS),
            (Unpaired(0.0), GE),
        ],
    },
    Case {
        formula: "Ir4(CO)12",
        metal: "Ir",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(0.0), CRABTREE),
            (D(9.0), CRABTREE),
            (Mm(6), MINGOS),
            (Cve(60.0), MINGOS),
            (Poly("tetrahedr"), MINGOS),
            (Unpaired(0.0), GE),
        ],
    },
    Case {
        // 86 = 14n + 2: closo octahedron; 18n - 2b would need 11 bonds on 12 edges
        formula: "Rh6(CO)16",
        metal: "Rh",
        checks: &[
            (Os(0.0), GE),
            (D(9.0), GE),
            (MmNull, MINGOS),
            (Cve(86.0), MINGOS),
            (Poly("octahedr"), MINGOS),
        ],
    },
    Case {
        // [Rh(CO)2(mu-Cl)]2: two square-planar 16-e Rh(I) centres, no Rh-Rh bond
        formula: "Rh2(μ-Cl)2(CO)4",
        metal: "Rh",
        checks: &[
            (Ec(16.0), CRABTREE),
            (Os(1.0), GE),
            (D(8.0), GE),
            (MmNone, GE),
            (Cve(32.0), COMMON),
            (Unpaired(0.0), GE),
        ],
    },
    Case {
        // ASCII bridge spelling of the same molecule
        formula: "Rh2(mu-Cl)2(CO)4",
        metal: "Rh",
        checks: &[
            (Ec(16.0), CRABTREE),
            (Os(1.0), GE),
            (D(8.0), GE),
            (MmNone, GE),
        ],
    },
    Case {
        // [Rh(COD)(mu-Cl)]2: 16-e Rh(I)
        formula: "Rh2(μ-Cl)2(COD)2",
        metal: "Rh",
        checks: &[
            (Ec(16.0), CRABTREE),
            (Os(1.0), CRABTREE),
            (D(8.0), CRABTREE),
            (MmNone, COMMON),
            (Unpaired(0.0), COMMON),
        ],
    },
];

/// Alkene, allyl, diene, arene, tropylium complexes; carbene; Z ligand; oxo complexes.
const PI_AND_OTHERS: &[Case] = &[
    Case {
        // anion of Zeise's salt
        formula: "[PtCl3(C2H4)]-",
        metal: "Pt",
        checks: &[
            (Ec(16.0), CRABTREE),
            (Os(2.0), CRABTREE),
            (D(8.0), CRABTREE),
            (Cn(4.0), CONTRACT_CN),
            // X- -> L on [PtLX3]-
            (Enc("[PtL2X2]"), GREEN95),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        formula: "(η6-C6H6)Cr(CO)3",
        metal: "Cr",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(0.0), CRABTREE),
            (D(6.0), CRABTREE),
            (Cn(6.0), CONTRACT_CN),
            (Class("[CrL6]"), GREEN95),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        formula: "Cr(η6-C6H6)2",
        metal: "Cr",
        checks: &[
            (Ec(18.0), FISCHER_HAFNER),
            (Os(0.0), ELSCH),
            (D(6.0), ELSCH),
            (Cn(6.0), CONTRACT_CN),
            (Unpaired(0.0), ELSCH),
        ],
    },
    Case {
        formula: "CpMo(CO)3Me",
        metal: "Mo",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(2.0), CRABTREE),
            (D(4.0), CRABTREE),
            (Cn(7.0), CONTRACT_CN),
            (Class("[MoL5X2]"), GREEN95),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        formula: "CpFe(CO)2Me",
        metal: "Fe",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(2.0), CRABTREE),
            (D(6.0), CRABTREE),
            (Cn(6.0), CONTRACT_CN),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        // the same molecule, metal-first with explicit hapticity
        formula: "[Fe(CO)2(η5-C5H5)(CH3)]",
        metal: "Fe",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(2.0), CRABTREE),
            (D(6.0), CRABTREE),
            (Cn(6.0), CONTRACT_CN),
        ],
    },
    Case {
        // eta3-allyl: 3-e LX (4-e allyl anion in the ionic model)
        formula: "Mn(η3-C3H5)(CO)4",
        metal: "Mn",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(1.0), CRABTREE),
            (D(6.0), CRABTREE),
            (Cn(6.0), CONTRACT_CN),
            (Class("[MnL5X]"), GREEN95),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        // eta1-allyl: 1-e X
        formula: "Mn(η1-C3H5)(CO)5",
        metal: "Mn",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(1.0), CRABTREE),
            (D(6.0), CRABTREE),
            (Cn(6.0), CONTRACT_CN),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        // bis(allyl)nickel: 16-e Ni(II)
        formula: "Ni(η3-C3H5)2",
        metal: "Ni",
        checks: &[
            (Ec(16.0), CRABTREE),
            (Os(2.0), CRABTREE),
            (D(8.0), CRABTREE),
            (Cn(4.0), CONTRACT_CN),
            (Unpaired(0.0), ELSCH),
        ],
    },
    Case {
        formula: "Ni(COD)2",
        metal: "Ni",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(0.0), CRABTREE),
            (D(10.0), CRABTREE),
            (Cn(4.0), CONTRACT_CN),
            (Class("[NiL4]"), GREEN95),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        // (butadiene)Fe(CO)3: eta4-diene as L2
        formula: "Fe(CO)3(C4H6)",
        metal: "Fe",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(0.0), CRABTREE),
            (D(8.0), CRABTREE),
            (Cn(5.0), CONTRACT_CN),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        // eta7-C7H7 counted as tropylium C7H7+ (6 e) in the ionic model, so Mo(0);
        // Green 1995 notes that charges of +1, -1 and -3 have all been assigned to C7H7.
        formula: "[Mo(η7-C7H7)(CO)3]+",
        metal: "Mo",
        checks: &[
            (Ec(18.0), CRABTREE),
            (Os(0.0), CRABTREE),
            (D(6.0), CRABTREE),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        // Fischer carbene: L donor, W(0)
        formula: "W(CO)5(C(OMe)Me)",
        metal: "W",
        checks: &[
            (Ec(18.0), FISCHER_MAASBOL),
            (Os(0.0), CRABTREE),
            (D(6.0), CRABTREE),
            (Cn(6.0), CONTRACT_CN),
            (Class("[WL6]"), GREEN95),
            (Unpaired(0.0), COMMON),
        ],
    },
    Case {
        // Z-type AlCl3: adds nothing to EN, nothing to OS, 2 to VN
        formula: "Pt(PCy3)2(AlCl3)",
        metal: "Pt",
        checks: &[
            (Ec(14.0), GREEN95),
            (Os(0.0), AMGOUNE),
            (D(10.0), AMGOUNE),
            (Vn(2.0), GREEN95),
            (Lbn(3.0), GREEN95),
            (Unpaired(0.0), BRAUNSCHWEIG),
        ],
    },
    Case {
        formula: "[MnO4]-",
        metal: "Mn",
        checks: &[(Os(7.0), GE), (D(0.0), GE), (Unpaired(0.0), GE)],
    },
    Case {
        formula: "OsO4",
        metal: "Os",
        checks: &[(Os(8.0), GE), (D(0.0), GE), (Unpaired(0.0), GE)],
    },
    Case {
        // vanadyl acetylacetonate
        formula: "VO(acac)2",
        metal: "V",
        checks: &[(Os(4.0), GE), (D(1.0), GE), (Unpaired(1.0), GE)],
    },
];

const ALL_GROUPS: &[(&str, &[Case])] = &[
    ("carbonyls", CARBONYLS),
    ("metallocenes", METALLOCENES),
    ("square_planar", SQUARE_PLANAR),
    ("d0_and_hydrides", D0_AND_HYDRIDES),
    ("werner", WERNER),
    ("polynuclear", POLYNUCLEAR),
    ("pi_and_others", PI_AND_OTHERS),
];

/// Group numbers (IUPAC 1-18) of the metals used above.
fn group_of(symbol: &str) -> Option<f64> {
    Some(match symbol {
        "Ti" | "Zr" => 4.0,
        "V" | "Ta" => 5.0,
        "Cr" | "Mo" | "W" => 6.0,
        "Mn" | "Re" => 7.0,
        "Fe" | "Ru" | "Os" => 8.0,
        "Co" | "Rh" | "Ir" => 9.0,
        "Ni" | "Pd" | "Pt" => 10.0,
        _ => return None,
    })
}

// ---------------------------------------------------------------------------------------------
// Running the binary
// ---------------------------------------------------------------------------------------------

/// Runs `nonet count --json FORMULA...` once.
fn count_json(tag: &str, formulas: &[&str]) -> Run {
    let scratch = Scratch::new(tag);
    let mut args = vec!["count", "--json"];
    args.extend(formulas);
    scratch.run(&args)
}

/// Parses stdout into one JSON value per non-empty line.
fn json_lines(run: &Run) -> Vec<Result<Value, String>> {
    run.stdout
        .lines()
        .filter(|l| !l.trim().is_empty())
        .map(|l| serde_json::from_str::<Value>(l).map_err(|e| format!("not JSON ({e}): {l}")))
        .collect()
}

// ---------------------------------------------------------------------------------------------
// Checking
// ---------------------------------------------------------------------------------------------

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() < TOL
}

fn show(v: Option<&Value>) -> String {
    match v {
        None => "missing".to_string(),
        Some(v) => v.to_string(),
    }
}

fn fmt_num(x: f64) -> String {
    if x.fract() == 0.0 {
        format!("{}", x as i64)
    } else {
        format!("{x}")
    }
}

/// Charge written at the end of a bracketed formula, e.g. `[Co(NH3)6]3+` -> 3, `[V(CO)6]-` -> -1.
fn written_charge(formula: &str) -> i64 {
    let tail = match formula.rfind(']') {
        Some(i) => &formula[i + 1..],
        None => return 0,
    };
    let sign = if tail.ends_with('+') {
        1
    } else if tail.ends_with('-') {
        -1
    } else {
        return 0;
    };
    let digits = &tail[..tail.len() - 1];
    let magnitude = if digits.is_empty() {
        1
    } else {
        digits.parse::<i64>().unwrap_or(0)
    };
    sign * magnitude
}

fn norm_geometry(s: &str) -> String {
    s.to_lowercase().replace(['-', '_'], " ")
}

fn metals_of(line: &Value) -> Option<&Vec<Value>> {
    line.get("metals")
        .and_then(Value::as_array)
        .filter(|m| !m.is_empty())
}

fn check_metal_num(
    fails: &mut Vec<String>,
    formula: &str,
    line: &Value,
    field: &str,
    expected: f64,
    src: &str,
) {
    let Some(metals) = metals_of(line) else {
        fails.push(format!("{formula}: metals: missing or empty  [{src}]"));
        return;
    };
    for (i, m) in metals.iter().enumerate() {
        let got = m.get(field);
        let ok = got
            .and_then(Value::as_f64)
            .is_some_and(|g| close(g, expected));
        if !ok {
            fails.push(format!(
                "{formula}: metals[{i}].{field}: expected {}, got {}  [{src}]",
                fmt_num(expected),
                show(got)
            ));
        }
    }
}

fn check_metal_str(
    fails: &mut Vec<String>,
    formula: &str,
    line: &Value,
    field: &str,
    expected: &str,
    src: &str,
) {
    let Some(metals) = metals_of(line) else {
        fails.push(format!("{formula}: metals: missing or empty  [{src}]"));
        return;
    };
    for (i, m) in metals.iter().enumerate() {
        let got = m.get(field);
        if got.and_then(Value::as_str) != Some(expected) {
            fails.push(format!(
                "{formula}: metals[{i}].{field}: expected {expected:?}, got {}  [{src}]",
                show(got)
            ));
        }
    }
}

fn check_expectation(fails: &mut Vec<String>, formula: &str, line: &Value, e: E, src: &str) {
    match e {
        Ec(x) => check_metal_num(fails, formula, line, "electron_count", x, src),
        Os(x) => check_metal_num(fails, formula, line, "oxidation_state", x, src),
        D(x) => check_metal_num(fails, formula, line, "d_electrons", x, src),
        Cn(x) => check_metal_num(fails, formula, line, "coordination_number", x, src),
        Vn(x) => check_metal_num(fails, formula, line, "valence_number", x, src),
        Lbn(x) => check_metal_num(fails, formula, line, "ligand_bond_number", x, src),
        Short(x) => check_metal_num(fails, formula, line, "electrons_short", x, src),
        Class(s) => check_metal_str(fails, formula, line, "cbc_class", s, src),
        Enc(s) => check_metal_str(fails, formula, line, "equivalent_neutral_class", s, src),
        Sat(s) => check_metal_str(fails, formula, line, "saturation", s, src),
        Mm(n) => {
            let got = line.get("metal_metal_bonds");
            let ok = got
                .and_then(Value::as_f64)
                .is_some_and(|g| close(g, n as f64));
            if !ok {
                fails.push(format!(
                    "{formula}: metal_metal_bonds: expected {n}, got {}  [{src}]",
                    show(got)
                ));
            }
        }
        MmNull => {
            let got = line.get("metal_metal_bonds");
            if !matches!(got, Some(Value::Null)) {
                fails.push(format!(
                    "{formula}: metal_metal_bonds: expected null (18-e rule does not apply), got {}  [{src}]",
                    show(got)
                ));
            }
        }
        MmNone => {
            let got = line.get("metal_metal_bonds");
            let ok = match got {
                Some(Value::Null) => true,
                Some(v) => v.as_f64().is_some_and(|g| close(g, 0.0)),
                None => false,
            };
            if !ok {
                fails.push(format!(
                    "{formula}: metal_metal_bonds: expected 0 or null (no M-M bond), got {}  [{src}]",
                    show(got)
                ));
            }
        }
        Cve(x) => {
            let got = line.get("cluster_valence_electrons");
            let ok = got.and_then(Value::as_f64).is_some_and(|g| close(g, x));
            if !ok {
                fails.push(format!(
                    "{formula}: cluster_valence_electrons: expected {}, got {}  [{src}]",
                    fmt_num(x),
                    show(got)
                ));
            }
        }
        Poly(needle) => {
            let got = line.get("polyhedron");
            let ok = got
                .and_then(Value::as_str)
                .is_some_and(|s| s.to_lowercase().contains(needle));
            if !ok {
                fails.push(format!(
                    "{formula}: polyhedron: expected a string containing {needle:?}, got {}  [{src}]",
                    show(got)
                ));
            }
        }
        Unpaired(x) => {
            let got = line.get("unpaired_electrons");
            let first = got.and_then(Value::as_array).and_then(|a| a.first());
            let ok = first.and_then(Value::as_f64).is_some_and(|g| close(g, x));
            if !ok {
                fails.push(format!(
                    "{formula}: unpaired_electrons[0] (most likely): expected {}, got {}  [{src}]",
                    fmt_num(x),
                    show(got)
                ));
            }
        }
        Geom(needle) => {
            let got = line.get("geometry");
            let ok = got
                .and_then(Value::as_str)
                .is_some_and(|s| norm_geometry(s).contains(needle));
            if !ok {
                fails.push(format!(
                    "{formula}: geometry: expected a description containing {needle:?}, got {}  [{src}]",
                    show(got)
                ));
            }
        }
    }
}

/// Checks one successfully counted line against a reference case.
fn check_case(fails: &mut Vec<String>, case: &Case, line: &Value) {
    let f = case.formula;
    if let Some(err) = line.get("error") {
        fails.push(format!("{f}: expected a count, got error {err}"));
        return;
    }
    if line.get("schema").and_then(Value::as_i64) != Some(1) {
        fails.push(format!(
            "{f}: schema: expected 1, got {}",
            show(line.get("schema"))
        ));
    }
    if line.get("input").and_then(Value::as_str).map(str::trim) != Some(f.trim()) {
        fails.push(format!(
            "{f}: input: expected {f:?}, got {}",
            show(line.get("input"))
        ));
    }
    if line
        .get("formula")
        .and_then(Value::as_str)
        .is_none_or(str::is_empty)
    {
        fails.push(format!(
            "{f}: formula: expected a canonical formula string, got {}",
            show(line.get("formula"))
        ));
    }
    let charge = written_charge(f);
    let got = line.get("charge");
    if got.and_then(Value::as_f64) != Some(charge as f64) {
        fails.push(format!(
            "{f}: charge: expected {charge}, got {}  [{CHARGE_AS_WRITTEN}]",
            show(got)
        ));
    }
    match metals_of(line) {
        None => fails.push(format!("{f}: metals: missing or empty")),
        Some(metals) => {
            for (i, m) in metals.iter().enumerate() {
                if m.get("symbol").and_then(Value::as_str) != Some(case.metal) {
                    fails.push(format!(
                        "{f}: metals[{i}].symbol: expected {:?}, got {}",
                        case.metal,
                        show(m.get("symbol"))
                    ));
                }
            }
        }
    }
    for &(e, src) in case.checks {
        check_expectation(fails, f, line, e, src);
    }
}

fn report(tag: &str, fails: &[String]) {
    if !fails.is_empty() {
        panic!(
            "{} mismatch(es) against reference values in group '{tag}':\n  {}\n",
            fails.len(),
            fails.join("\n  ")
        );
    }
}

/// Runs one group of reference cases through a single invocation and checks every value.
fn check_group(tag: &str, cases: &[Case]) {
    let formulas: Vec<&str> = cases.iter().map(|c| c.formula).collect();
    let run = count_json(tag, &formulas);
    let mut fails = Vec::new();
    if run.code != Some(0) {
        fails.push(format!(
            "exit code: expected 0 (all reference formulas parse), got {:?}; stderr: {}",
            run.code,
            run.stderr.trim()
        ));
    }
    let lines = json_lines(&run);
    if lines.len() != cases.len() {
        fails.push(format!(
            "expected {} output lines (one per formula), got {}; stdout:\n{}",
            cases.len(),
            lines.len(),
            run.stdout
        ));
    }
    for (case, line) in cases.iter().zip(lines.iter()) {
        match line {
            Err(e) => fails.push(format!("{}: {e}", case.formula)),
            Ok(v) => check_case(&mut fails, case, v),
        }
    }
    report(tag, &fails);
}

// ---------------------------------------------------------------------------------------------
// Tests: reference values
// ---------------------------------------------------------------------------------------------

#[test]
fn mononuclear_carbonyls_and_nitrosyls() {
    check_group("carbonyls", CARBONYLS);
}

#[test]
fn metallocenes_and_half_sandwiches() {
    check_group("metallocenes", METALLOCENES);
}

#[test]
fn square_planar_d8_and_d10_phosphine_complexes() {
    check_group("square_planar", SQUARE_PLANAR);
}

#[test]
fn d0_complexes_hydrides_and_dihydrogen() {
    check_group("d0_and_hydrides", D0_AND_HYDRIDES);
}

#[test]
fn werner_complexes_and_spin_states() {
    check_group("werner", WERNER);
}

#[test]
fn polynuclear_carbonyls_clusters_and_bridged_dimers() {
    check_group("polynuclear", POLYNUCLEAR);
}

#[test]
fn pi_complexes_carbenes_z_ligands_and_oxo_complexes() {
    check_group("pi_and_others", PI_AND_OTHERS);
}

#[test]
fn reference_set_is_large_enough() {
    let n: usize = ALL_GROUPS.iter().map(|(_, cases)| cases.len()).sum();
    assert!(n >= 45, "only {n} reference complexes");
}

/// For every reference complex the neutral (covalent) and ionic models must agree, the d count
/// must equal group minus oxidation state, and the group must be right.
/// Sources: Crabtree 2014, ch. 2 (both counting methods give the same answer; d^n = group - OS);
/// group numbers per IUPAC 1-18 numbering (common practice).
#[test]
fn both_counting_models_agree_for_every_reference_complex() {
    let cases: Vec<&Case> = ALL_GROUPS.iter().flat_map(|(_, c)| c.iter()).collect();
    let formulas: Vec<&str> = cases.iter().map(|c| c.formula).collect();
    let run = count_json("models_agree", &formulas);
    let lines = json_lines(&run);
    let mut fails = Vec::new();
    if run.code != Some(0) {
        fails.push(format!(
            "exit code: expected 0, got {:?}; stderr: {}",
            run.code,
            run.stderr.trim()
        ));
    }
    if lines.len() != cases.len() {
        fails.push(format!(
            "expected {} output lines, got {}",
            cases.len(),
            lines.len()
        ));
    }
    for (case, line) in cases.iter().zip(lines.iter()) {
        let f = case.formula;
        let line = match line {
            Ok(v) if v.get("error").is_none() => v,
            Ok(v) => {
                fails.push(format!("{f}: expected a count, got {v}"));
                continue;
            }
            Err(e) => {
                fails.push(format!("{f}: {e}"));
                continue;
            }
        };
        let Some(metals) = metals_of(line) else {
            fails.push(format!("{f}: metals: missing or empty"));
            continue;
        };
        for (i, m) in metals.iter().enumerate() {
            let num = |k: &str| m.get(k).and_then(Value::as_f64);
            match (num("electron_count"), num("ionic_electron_count")) {
                (Some(a), Some(b)) if close(a, b) => {}
                (a, b) => fails.push(format!(
                    "{f}: metals[{i}]: electron_count {a:?} != ionic_electron_count {b:?}  [{CRABTREE}]"
                )),
            }
            let symbol = m.get("symbol").and_then(Value::as_str).unwrap_or("?");
            let expected_group = group_of(symbol);
            match (expected_group, num("group")) {
                (Some(g), Some(got)) if close(g, got) => {}
                (g, got) => fails.push(format!(
                    "{f}: metals[{i}].group for {symbol}: expected {g:?}, got {got:?}  [IUPAC group numbering]"
                )),
            }
            match (expected_group, num("oxidation_state"), num("d_electrons")) {
                (Some(g), Some(os), Some(d)) if close(g - os, d) => {}
                (g, os, d) => fails.push(format!(
                    "{f}: metals[{i}]: d_electrons {d:?} != group {g:?} - oxidation_state {os:?}  [{CRABTREE}]"
                )),
            }
        }
    }
    report("models_agree", &fails);
}

// ---------------------------------------------------------------------------------------------
// Tests: errors
// ---------------------------------------------------------------------------------------------

const BAD_FORMULAS: &[&str] = &["Fe(XyZ)3", "[Co(NH3)6", ""];

fn check_error_line(fails: &mut Vec<String>, input: &str, line: &Result<Value, String>) {
    match line {
        Err(e) => fails.push(format!("{input:?}: {e}")),
        Ok(v) => {
            if v.get("input").and_then(Value::as_str) != Some(input) {
                fails.push(format!(
                    "{input:?}: error object input: expected {input:?}, got {}",
                    show(v.get("input"))
                ));
            }
            if v.get("error")
                .and_then(Value::as_str)
                .is_none_or(|s| s.trim().is_empty())
            {
                fails.push(format!(
                    "{input:?}: expected a non-empty \"error\" string, got {v}"
                ));
            }
            if v.get("metals").is_some() || v.get("electron_count").is_some() {
                fails.push(format!("{input:?}: error object also carries a count: {v}"));
            }
        }
    }
}

#[test]
fn bad_formulas_yield_error_objects_and_exit_code_2() {
    let mut fails = Vec::new();

    // all at once
    let run = count_json("bad_all", BAD_FORMULAS);
    if run.code != Some(2) {
        fails.push(format!("all bad: exit code expected 2, got {:?}", run.code));
    }
    let lines = json_lines(&run);
    if lines.len() != BAD_FORMULAS.len() {
        fails.push(format!(
            "all bad: expected {} lines, got {}; stdout:\n{}",
            BAD_FORMULAS.len(),
            lines.len(),
            run.stdout
        ));
    }
    for (input, line) in BAD_FORMULAS.iter().zip(lines.iter()) {
        check_error_line(&mut fails, input, line);
    }

    // one at a time
    for input in BAD_FORMULAS {
        let run = count_json("bad_one", &[input]);
        if run.code != Some(2) {
            fails.push(format!(
                "{input:?} alone: exit code expected 2, got {:?}",
                run.code
            ));
        }
        let lines = json_lines(&run);
        if lines.len() != 1 {
            fails.push(format!(
                "{input:?} alone: expected 1 line, got {}; stdout:\n{}",
                lines.len(),
                run.stdout
            ));
        }
        if let Some(line) = lines.first() {
            check_error_line(&mut fails, input, line);
        }
    }
    report("bad_formulas", &fails);
}

#[test]
fn good_formulas_are_still_counted_when_mixed_with_bad_ones() {
    let inputs = [
        "Cr(CO)6",
        "Fe(XyZ)3",
        "Ni(CO)4",
        "[Co(NH3)6",
        "[Co(NH3)6]3+",
        "",
        "Cp2Fe",
    ];
    let good: &[(usize, f64, f64, f64)] = &[
        // (index, electron_count, oxidation_state, d_electrons); source: Crabtree 2014, ch. 2
        (0, 18.0, 0.0, 6.0),
        (2, 18.0, 0.0, 10.0),
        (4, 18.0, 3.0, 6.0),
        (6, 18.0, 2.0, 6.0),
    ];
    let bad = [1usize, 3, 5];

    let run = count_json("mixed", &inputs);
    let mut fails = Vec::new();
    if run.code != Some(2) {
        fails.push(format!(
            "exit code: expected 2 (some formulas failed), got {:?}",
            run.code
        ));
    }
    let lines = json_lines(&run);
    if lines.len() != inputs.len() {
        fails.push(format!(
            "expected {} lines, got {}; stdout:\n{}",
            inputs.len(),
            lines.len(),
            run.stdout
        ));
    }
    for &i in &bad {
        if let Some(line) = lines.get(i) {
            check_error_line(&mut fails, inputs[i], line);
        }
    }
    for &(i, ec, os, d) in good {
        let f = inputs[i];
        match lines.get(i) {
            None => {}
            Some(Err(e)) => fails.push(format!("{f}: {e}")),
            Some(Ok(v)) if v.get("error").is_some() => {
                fails.push(format!("{f}: expected a count, got {v}"))
            }
            Some(Ok(v)) => {
                if v.get("input").and_then(Value::as_str) != Some(f) {
                    fails.push(format!(
                        "{f}: input: expected {f:?}, got {}",
                        show(v.get("input"))
                    ));
                }
                check_metal_num(&mut fails, f, v, "electron_count", ec, CRABTREE);
                check_metal_num(&mut fails, f, v, "oxidation_state", os, CRABTREE);
                check_metal_num(&mut fails, f, v, "d_electrons", d, CRABTREE);
            }
        }
    }
    report("mixed", &fails);
}

#[test]
fn written_charge_helper_reads_trailing_charges() {
    assert_eq!(written_charge("[Co(NH3)6]3+"), 3);
    assert_eq!(written_charge("[V(CO)6]-"), -1);
    assert_eq!(written_charge("[PtCl4]2-"), -2);
    assert_eq!(written_charge("[Cp2Co]+"), 1);
    assert_eq!(written_charge("[CpFe(CO)2]2"), 0);
    assert_eq!(written_charge("Cp*2Fe"), 0);
    assert_eq!(written_charge("[Fe(CO)2(η5-C5H5)(CH3)]"), 0);
}

//! Ligand definitions and their binding modes, each mode carrying its covalent bond
//! classification (Green, J. Organomet. Chem. 1995, 500, 127).

use serde::{Deserialize, Serialize};
use std::fmt;
use std::sync::Arc;

use super::molecule::{Composition, Molecule};
use super::ChemError;

/// The CBC functions a ligand presents to the metal(s): L (2-electron dative), X (1-electron
/// covalent), Z (0-electron acceptor).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Default)]
pub struct CbcClass {
    pub l: u8,
    pub x: u8,
    pub z: u8,
}

impl CbcClass {
    /// Parse "L", "X", "LX", "L2X", "X2", "L3Z", ... (each letter at most once, in L, X, Z order).
    pub fn parse(text: &str) -> Result<CbcClass, ChemError> {
        let bad = || ChemError::BadClass(text.to_string());
        let mut class = CbcClass::default();
        let mut rest = text.trim();
        if rest.is_empty() {
            return Err(bad());
        }
        for letter in ['L', 'X', 'Z'] {
            if let Some(after) = rest.strip_prefix(letter) {
                let digits: String = after.chars().take_while(|c| c.is_ascii_digit()).collect();
                let n: u8 = if digits.is_empty() {
                    1
                } else {
                    digits.parse().map_err(|_| bad())?
                };
                if n == 0 || n > 12 {
                    return Err(bad());
                }
                match letter {
                    'L' => class.l = n,
                    'X' => class.x = n,
                    _ => class.z = n,
                }
                rest = &after[digits.len()..];
            }
        }
        if rest.is_empty() {
            Ok(class)
        } else {
            Err(bad())
        }
    }

    /// Electrons given in the neutral (covalent) model: 2 per L, 1 per X, 0 per Z.
    pub fn neutral_electrons(self) -> i64 {
        2 * self.l as i64 + self.x as i64
    }

    pub fn functions(self) -> u8 {
        self.l + self.x + self.z
    }
}

/// Serialized as its text, "L2X".
impl Serialize for CbcClass {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.collect_str(self)
    }
}

impl fmt::Display for CbcClass {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        for (letter, n) in [('L', self.l), ('X', self.x), ('Z', self.z)] {
            match n {
                0 => {}
                1 => write!(f, "{letter}")?,
                n => write!(f, "{letter}{n}")?,
            }
        }
        Ok(())
    }
}

/// Position in the spectrochemical series (Shriver & Atkins, Inorganic Chemistry, 3rd ed., 2001),
/// coarsened into five classes.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Deserialize, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum FieldClass {
    VeryWeak,
    Weak,
    Medium,
    MediumStrong,
    Strong,
}

impl FieldClass {
    /// A number on which the spin heuristics work; the ordering is the published one, the spacing
    /// is nonet's own.
    pub fn score(self) -> f64 {
        match self {
            FieldClass::VeryWeak => 0.0,
            FieldClass::Weak => 0.5,
            FieldClass::Medium => 1.0,
            FieldClass::MediumStrong => 1.6,
            FieldClass::Strong => 2.0,
        }
    }

    pub fn word(self) -> &'static str {
        match self {
            FieldClass::VeryWeak => "very weak",
            FieldClass::Weak => "weak",
            FieldClass::Medium => "medium",
            FieldClass::MediumStrong => "medium-strong",
            FieldClass::Strong => "strong",
        }
    }
}

/// A published number with the work it comes from.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Sourced {
    pub value: f64,
    pub source: String,
}

/// A ligand's place in a published ordinal series (trans effect, trans influence), higher
/// meaning stronger, with the work it comes from.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Ranked {
    pub rank: u8,
    pub source: String,
}

/// One way a ligand binds: hapticity, denticity or bridging, with its CBC functions.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BindingMode {
    /// "κ1", "η5", "μ", "μ3", "linear", ... unique within its ligand.
    pub label: String,
    pub class: CbcClass,
    /// Atoms bonded to the metal(s).
    pub donors: u8,
    /// Coordination positions taken at one metal (for a bridge: at each metal it spans).
    pub sites: u8,
    /// Number of metals spanned (1 for terminal ligands).
    pub bridges: u8,
    /// Charge of the closed-shell ligand removed in the ionic model.
    pub ionic_charge: i8,
    /// A 3c-2e M-H-M bridge: one electron to the cluster, one M-M edge satisfied.
    pub three_centre: bool,
    pub note: Option<String>,
    /// n of an ηn label (n >= 2), worked out once from the label.
    #[serde(skip)]
    hapto: Option<u8>,
    /// The class as text ("L2X"), written once: reports print it for every ligand.
    #[serde(skip)]
    class_text: String,
}

impl BindingMode {
    /// Build a mode with the conventional defaults for donors, sites, bridges and ionic charge.
    pub fn new(label: &str, class: CbcClass) -> BindingMode {
        let label = normalize_label(label);
        let (kind, n) = label_parts(&label);
        let bridges = match kind {
            LabelKind::Mu => n.unwrap_or(2),
            _ => 1,
        };
        let donors = match kind {
            LabelKind::Eta | LabelKind::Kappa => n.unwrap_or(1),
            _ => 1,
        };
        let sites = match kind {
            LabelKind::Kappa => n.unwrap_or(1),
            LabelKind::Eta if n.unwrap_or(1) >= 2 => class.functions().max(1),
            _ => 1,
        };
        let hapto = match (kind, n) {
            (LabelKind::Eta, Some(n)) if n >= 2 => Some(n),
            _ => None,
        };
        BindingMode {
            hapto,
            class_text: class.to_string(),
            ionic_charge: -(class.x as i8),
            label,
            class,
            donors,
            sites,
            bridges,
            three_centre: false,
            note: None,
        }
    }

    pub fn neutral_electrons(&self) -> i64 {
        self.class.neutral_electrons()
    }

    /// The class as text, "L2X".
    pub fn class_text(&self) -> &str {
        &self.class_text
    }

    /// Electrons donated as a closed-shell ion: neutral count minus the ionic charge.
    pub fn ionic_electrons(&self) -> i64 {
        self.neutral_electrons() - self.ionic_charge as i64
    }

    /// Hapticity of a π-bound ligand (η2 and up), if this mode is one.
    pub fn hapticity(&self) -> Option<u8> {
        self.hapto
    }
}

/// What a ligand's family implies for the counting rules, worked out once when the ligand is
/// loaded (the rules ask for every ligand of every count).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct FamilyTraits {
    /// CO, isocyanide, NO, alkene, alkyne: back-bonding ligands.
    pub pi_acceptor: bool,
    /// Oxo, imido, nitrido: metal-ligand multiple bonds.
    pub multiple_bond: bool,
    /// Porphyrinates, salen and the like.
    pub macrocycle: bool,
    /// Heteroatom X ligands that bridge or hold square-planar d8 centres.
    pub hetero_x: bool,
    /// Organometallic (non-Werner) ligands: π acceptors and π-bound hydrocarbons.
    pub organometallic: bool,
}

impl FamilyTraits {
    pub fn of(family: &str) -> FamilyTraits {
        let pi_acceptor = matches!(
            family,
            "carbonyl" | "isocyanide" | "nitrosyl" | "alkene" | "alkyne"
        );
        FamilyTraits {
            pi_acceptor,
            multiple_bond: matches!(family, "oxo" | "imido" | "nitrido"),
            macrocycle: family == "macrocycle",
            hetero_x: matches!(
                family,
                "halide"
                    | "alkoxide"
                    | "thiolate"
                    | "amide"
                    | "carboxylate"
                    | "diketonate"
                    | "pseudohalide"
                    | "oxo"
            ),
            organometallic: pi_acceptor
                || matches!(
                    family,
                    "cyclopentadienyl" | "arene" | "diene" | "allyl" | "polyene"
                ),
        }
    }
}

/// A ligand as the catalogue defines it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LigandDef {
    pub key: String,
    pub name: String,
    pub formula: String,
    /// OpenSMILES of the free or formally bound species; `*` marks a bond to the metal.
    pub smiles: Option<String>,
    pub aliases: Vec<String>,
    pub family: String,
    pub field: Option<FieldClass>,
    pub pi_donor: bool,
    pub cone_angle: Option<Sourced>,
    pub tep: Option<Sourced>,
    /// Natural bite angle of a chelate, degrees: which pairs of positions it spans.
    pub bite_angle: Option<Sourced>,
    /// Kinetic trans effect: how much it speeds the loss of the ligand opposite (1-10).
    pub trans_effect: Option<Ranked>,
    /// Ground-state trans influence: how much it lengthens the bond opposite (1-10).
    pub trans_influence: Option<Ranked>,
    pub hazards: Vec<String>,
    pub hazard_source: Option<String>,
    pub notes: Option<String>,
    /// The key of the same ligand in its other protonation form, where papers write both
    /// (a pincer's neutral amine or pyridine and its anionic amide or dearomatized arm).
    pub counterpart: Option<String>,
    pub modes: Vec<BindingMode>,
    /// Which set it came from ("bundled:phosphorus", or a user file path).
    pub origin: String,
    /// The structure read from `smiles`, when the ligand has one.
    #[serde(skip)]
    pub structure: Option<Arc<Molecule>>,
    /// The structure's element counts, worked out once (every count reports them).
    #[serde(skip)]
    pub elements: Option<Composition>,
    /// Made by a step or read from a condensed formula, not taken from the catalogue.
    #[serde(skip)]
    pub derived: bool,
    /// What the family implies, from `FamilyTraits::of(&family)`.
    #[serde(skip)]
    pub traits: FamilyTraits,
}

impl LigandDef {
    pub fn mode_index(&self, label: &str) -> Option<usize> {
        let label = normalize_label(label);
        self.modes.iter().position(|m| m.label == label)
    }

    /// Element counts of the ligand, when its structure is known.
    pub fn composition(&self) -> Option<&Composition> {
        self.elements.as_ref()
    }

    /// Give the ligand a structure (and with it a composition).
    pub fn set_structure(&mut self, m: Molecule) {
        self.elements = Some(m.composition());
        self.structure = Some(Arc::new(m));
    }

    pub fn mode_labels(&self) -> String {
        self.modes
            .iter()
            .map(|m| m.label.as_str())
            .collect::<Vec<_>>()
            .join(", ")
    }
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum LabelKind {
    Eta,
    Kappa,
    Mu,
    Word,
}

fn label_parts(label: &str) -> (LabelKind, Option<u8>) {
    let (kind, rest) = if let Some(r) = label.strip_prefix('η') {
        (LabelKind::Eta, r)
    } else if let Some(r) = label.strip_prefix('κ') {
        (LabelKind::Kappa, r)
    } else if let Some(r) = label.strip_prefix('μ') {
        (LabelKind::Mu, r)
    } else {
        return (LabelKind::Word, None);
    };
    if rest.is_empty() {
        return (kind, None);
    }
    match rest.parse::<u8>() {
        Ok(n) => (kind, Some(n)),
        Err(_) => (LabelKind::Word, None),
    }
}

/// Bring a mode label to its canonical spelling: "eta5", "h5" -> "η5"; "kappa2" -> "κ2";
/// "kappaS" -> "κS"; "mu", "mu2", "μ2", "µ" -> "μ"; "mu3" -> "μ3". Words are lower-cased.
pub fn normalize_label(label: &str) -> String {
    let l = label.trim();
    let split = [
        ("eta", 'η'),
        ("η", 'η'),
        ("kappa", 'κ'),
        ("κ", 'κ'),
        ("mu", 'μ'),
        ("μ", 'μ'),
        ("µ", 'μ'),
        ("h", 'η'),
    ]
    .iter()
    .find_map(|(prefix, greek)| {
        let rest = l.strip_prefix(prefix)?;
        // a Greek prefix is followed by nothing, a number or a donor atom ("κS", "κ2N")
        let ok = match rest.chars().next() {
            None => *prefix != "h",
            Some(c) => c.is_ascii_digit() || (c.is_ascii_uppercase() && *prefix != "h"),
        };
        ok.then_some((*greek, rest))
    });
    match split {
        Some(('μ', "" | "2")) => "μ".to_string(),
        Some((greek, rest)) => format!("{greek}{rest}"),
        None => l.to_lowercase(),
    }
}

/// Spell out Greek mode labels for terminals without UTF-8 ("η5" -> "eta5").
pub fn ascii_label(label: &str) -> String {
    label
        .replace('η', "eta")
        .replace('κ', "kappa")
        .replace('μ', "mu")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn class_strings_round_trip() {
        for s in [
            "L", "X", "Z", "LX", "L2X", "X2", "L3X2", "L2X2", "L3Z", "X3",
        ] {
            let c = CbcClass::parse(s).unwrap();
            assert_eq!(c.to_string(), s);
        }
        for bad in ["", "Q", "XL", "L0", "LL", "L2X2Y", "L99"] {
            assert!(CbcClass::parse(bad).is_err(), "{bad}");
        }
    }

    // Green 1995: Cp is L2X (5 e neutral, 6 e as Cp-); η3-allyl LX (3 e / 4 e).
    #[test]
    fn cyclopentadienyl_counts_five_and_six() {
        let m = BindingMode::new("η5", CbcClass::parse("L2X").unwrap());
        assert_eq!(m.neutral_electrons(), 5);
        assert_eq!(m.ionic_electrons(), 6);
        assert_eq!(m.sites, 3);
        assert_eq!(m.donors, 5);
        assert_eq!(m.hapticity(), Some(5));
    }

    #[test]
    fn labels_normalize_from_ascii_and_greek() {
        assert_eq!(normalize_label("eta5"), "η5");
        assert_eq!(normalize_label("h3"), "η3");
        assert_eq!(normalize_label("kappa2"), "κ2");
        assert_eq!(normalize_label("mu"), "μ");
        assert_eq!(normalize_label("μ2"), "μ");
        assert_eq!(normalize_label("µ3"), "μ3");
        assert_eq!(normalize_label("Bent"), "bent");
        assert_eq!(normalize_label("kappaS"), "κS");
        assert_eq!(normalize_label("multi"), "multi");
        assert_eq!(ascii_label("μ3"), "mu3");
        let bridge = BindingMode::new("mu3", CbcClass::parse("L").unwrap());
        assert_eq!(bridge.bridges, 3);
    }
}

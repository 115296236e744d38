//! Elementary steps of organometallic reactions, each a balanced equation worked out on the
//! structures of the ligands and reagents: what enters, what leaves, and the product.
//!
//! The bookkeeping follows Crabtree, The Organometallic Chemistry of the Transition Metals,
//! 6th ed., Wiley 2014, ch. 4 (substitution), 6 (oxidative addition, reductive elimination),
//! 7 (insertion, elimination), 8 (attack on ligands) and 11-12 (metathesis, cycles); Hartwig,
//! Organotransition Metal Chemistry, University Science Books 2010, ch. 5-13:
//!
//! | step | e | OS | d | CN |
//! |---|---|---|---|---|
//! | dissociation of L, or of X- (heterolysis) | -2 | 0 | 0 | -1 |
//! | association of L, or of X- | +2 | 0 | 0 | +1 |
//! | oxidative addition of A-B | +2 | +2 | -2 | +2 |
//! | reductive elimination of A-B | -2 | -2 | +2 | -2 |
//! | 1,1- or 1,2-insertion | -2 | 0 | 0 | -1 |
//! | β-elimination (H, alkyl, heteroatom) | +2 | 0 | 0 | +1 |
//! | α-hydride elimination | +2 | +2 | -2 | +1 |
//! | transmetalation, σ-bond metathesis, protonolysis, CMD | 0 | 0 | 0 | 0 |
//! | nucleophilic attack on a π ligand | -2 | 0 | 0 | -1 |
//! | one-electron oxidation | -1 | +1 | -1 | 0 |
//!
//! Every step checks that the atoms and the charge of the start plus what enters equal those
//! of the product plus what leaves before it reports; an unbalanced step is a bug.

mod advice;
mod attack;
mod ctx;
mod cyclo;
mod insertion;
mod ligands;
mod positions;
mod redox;

use std::fmt;

use super::complex::Complex;
use super::count::{count, Report, Saturation};
use super::formula::LigandLookup;
use super::frac::Frac;
use super::species::Equation;
pub use advice::{choices, suggest};
use ctx::Ctx;
pub use positions::{carry, Carry, Course};

/// Which way an alkene inserts: `1,2` puts the metal on the less substituted carbon, `2,1` on
/// the more substituted one.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Regio {
    OneTwo,
    TwoOne,
}

impl fmt::Display for Regio {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Regio::OneTwo => "1,2",
            Regio::TwoOne => "2,1",
        })
    }
}

/// An elementary step, with its arguments as typed (ligand, group and reagent names).
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Step {
    Dissociation(String),
    Association(String),
    Substitution {
        leaving: String,
        entering: String,
    },
    Homolysis(String),
    Abstraction {
        group: String,
        by: String,
    },
    Transmetalation {
        reagent: String,
        leaving: Option<String>,
    },
    /// The substrate, and cis or trans when the chemist chooses (else from the substrate).
    OxidativeAddition(String, Option<Course>),
    ReductiveElimination(String, String),
    MigratoryInsertion {
        inserting: String,
        into: String,
        regio: Option<Regio>,
    },
    Deinsertion(String),
    BetaHydrideElimination {
        group: String,
        which: Option<String>,
    },
    BetaAlkylElimination {
        group: String,
        which: Option<String>,
    },
    BetaHeteroatomElimination {
        group: String,
        which: Option<String>,
    },
    AlphaElimination(String),
    NucleophilicAttack {
        nucleophile: String,
        target: String,
    },
    ElectrophilicAttack {
        electrophile: String,
        target: String,
    },
    SigmaBondMetathesis {
        reagent: String,
        group: String,
    },
    Protonolysis {
        group: String,
        acid: String,
    },
    Cycloaddition {
        unsaturated: String,
        ligand: String,
        /// 2,1 (the default) bonds the alkene's more substituted carbon to the metal; 1,2
        /// bonds it to the ylidene carbon.
        regio: Option<Regio>,
    },
    Cycloreversion(String),
    OxidativeCoupling(String, String),
    ReductiveDecoupling(String),
    ConcertedMetalationDeprotonation {
        substrate: String,
        base: String,
    },
    RingSlip {
        ligand: String,
        hapticity: u8,
    },
    /// One electron leaves, to the named oxidant if any (CuCl2, AgBF4, Cu2+).
    Oxidation {
        by: Option<String>,
    },
    /// One electron comes in, from the named reductant if any (Na, K).
    Reduction {
        by: Option<String>,
    },
    Protonation {
        acid: Option<String>,
    },
    Deprotonation {
        group: String,
        base: Option<String>,
    },
    /// The same complex rearranged to the named isomer ("cis", "OC-6-22").
    Isomerization(String),
}

/// Each step's word, its arguments and one example, as the CLI, the log and the README write
/// them.
pub const STEP_WORDS: &[(&str, &str, &str)] = &[
    ("dissociation", "LIGAND", "dissociation PPh3"),
    ("association", "LIGAND", "association C2H4"),
    ("substitution", "LEAVING ENTERING", "substitution Cl C2H4"),
    ("homolysis", "GROUP", "homolysis Me"),
    ("abstraction", "GROUP BY", "abstraction Cl AgBF4"),
    (
        "transmetalation",
        "REAGENT [LEAVING]",
        "transmetalation PhB(OH)2 Br",
    ),
    (
        "oxidative-addition",
        "SUBSTRATE [cis|trans]",
        "oxidative-addition MeI",
    ),
    (
        "reductive-elimination",
        "GROUP GROUP",
        "reductive-elimination H Et",
    ),
    (
        "migratory-insertion",
        "UNSATURATED GROUP [1,2|2,1]",
        "migratory-insertion C2H4 H",
    ),
    ("deinsertion", "GROUP", "deinsertion COMe"),
    (
        "beta-hydride-elimination",
        "GROUP [ALKENE]",
        "beta-hydride-elimination nPr",
    ),
    (
        "beta-alkyl-elimination",
        "GROUP [ALKENE]",
        "beta-alkyl-elimination CH2CMe3",
    ),
    (
        "beta-heteroatom-elimination",
        "GROUP [ALKENE]",
        "beta-heteroatom-elimination CH2CH2OAc",
    ),
    ("alpha-elimination", "GROUP", "alpha-elimination CH2tBu"),
    (
        "nucleophilic-attack",
        "NUCLEOPHILE TARGET",
        "nucleophilic-attack OH C2H4",
    ),
    (
        "electrophilic-attack",
        "ELECTROPHILE TARGET",
        "electrophilic-attack HBF4 CH2CHCH2",
    ),
    (
        "sigma-bond-metathesis",
        "REAGENT GROUP",
        "sigma-bond-metathesis H2 nPr",
    ),
    ("protonolysis", "GROUP ACID", "protonolysis Me HCl"),
    (
        "cycloaddition",
        "UNSATURATED LIGAND [2,1|1,2]",
        "cycloaddition C2H4 CHPh",
    ),
    ("cycloreversion", "ALKENE", "cycloreversion CH2CHPh"),
    (
        "oxidative-coupling",
        "UNSATURATED UNSATURATED",
        "oxidative-coupling C2H4 C2H4",
    ),
    (
        "reductive-decoupling",
        "METALLACYCLE",
        "reductive-decoupling CH2CH2CH2CH2",
    ),
    (
        "concerted-metalation-deprotonation",
        "SUBSTRATE BASE",
        "concerted-metalation-deprotonation PhH OAc",
    ),
    ("ring-slip", "LIGAND HAPTICITY", "ring-slip Cp 3"),
    ("oxidation", "[OXIDANT]", "oxidation CuCl2"),
    ("reduction", "[REDUCTANT]", "reduction Na"),
    ("protonation", "[ACID]", "protonation HBF4"),
    (
        "deprotonation",
        "GROUP [BASE]",
        "deprotonation HNMe2 NaOtBu",
    ),
    ("isomerization", "ISOMER", "isomerization cis"),
];

/// Other spellings chemists use for a step word.
const ALIASES: &[(&str, &str)] = &[
    ("insertion", "migratory-insertion"),
    ("1,1-insertion", "migratory-insertion"),
    ("1,2-insertion", "migratory-insertion"),
    ("β-hydride-elimination", "beta-hydride-elimination"),
    ("beta-h-elimination", "beta-hydride-elimination"),
    ("beta-elimination", "beta-hydride-elimination"),
    ("β-alkyl-elimination", "beta-alkyl-elimination"),
    ("beta-carbon-elimination", "beta-alkyl-elimination"),
    ("β-carbon-elimination", "beta-alkyl-elimination"),
    ("β-heteroatom-elimination", "beta-heteroatom-elimination"),
    ("α-elimination", "alpha-elimination"),
    ("alpha-hydride-elimination", "alpha-elimination"),
    ("α-hydride-elimination", "alpha-elimination"),
    ("σ-bond-metathesis", "sigma-bond-metathesis"),
    ("cmd", "concerted-metalation-deprotonation"),
    ("[2+2]-cycloaddition", "cycloaddition"),
    ("2+2-cycloaddition", "cycloaddition"),
    ("retro-[2+2]", "cycloreversion"),
    ("retro-oxidative-coupling", "reductive-decoupling"),
    ("de-insertion", "deinsertion"),
    ("extrusion", "deinsertion"),
    ("ligand-substitution", "substitution"),
];

impl Step {
    /// Read "oxidative-addition H2", "ring-slip Cp 3", "migratory-insertion C3H6 H 2,1", ...
    pub fn parse(text: &str) -> Result<Step, StepError> {
        let text = plain_text(text);
        let words: Vec<&str> = text.split_whitespace().collect();
        let Some((&verb, args)) = words.split_first() else {
            return Err(StepError::Usage(
                "no step given; name one: ".to_string() + &step_list(),
            ));
        };
        let verb = verb
            .to_lowercase()
            .replace(['_', '\u{2010}', '\u{2011}'], "-");
        let verb = ALIASES
            .iter()
            .find(|(a, _)| *a == verb)
            .map_or(verb.as_str(), |(_, w)| w)
            .to_string();
        let usage = || {
            STEP_WORDS
                .iter()
                .find(|(w, _, _)| *w == verb)
                .map_or(String::new(), |(w, a, e)| format!("{w} {a} (e.g. {e})"))
        };
        let want = |lo: usize, hi: usize| -> Result<(), StepError> {
            if (lo..=hi).contains(&args.len()) {
                Ok(())
            } else {
                let n = if lo == hi {
                    format!("{lo}")
                } else {
                    format!("{lo} or {hi}")
                };
                Err(StepError::Usage(format!(
                    "'{verb}' takes {n} argument{}: {}",
                    if hi == 1 { "" } else { "s" },
                    usage()
                )))
            }
        };
        let a = |i: usize| args[i].to_string();
        let opt = |i: usize| args.get(i).map(|s| s.to_string());
        Ok(match verb.as_str() {
            "dissociation" => {
                want(1, 1)?;
                Step::Dissociation(a(0))
            }
            "association" => {
                want(1, 1)?;
                Step::Association(a(0))
            }
            "substitution" => {
                want(2, 2)?;
                Step::Substitution {
                    leaving: a(0),
                    entering: a(1),
                }
            }
            "homolysis" => {
                want(1, 1)?;
                Step::Homolysis(a(0))
            }
            "abstraction" => {
                want(2, 2)?;
                Step::Abstraction {
                    group: a(0),
                    by: a(1),
                }
            }
            "transmetalation" => {
                want(1, 2)?;
                Step::Transmetalation {
                    reagent: a(0),
                    leaving: opt(1),
                }
            }
            "oxidative-addition" => {
                want(1, 2)?;
                let course = match args.get(1).map(|s| s.to_lowercase()) {
                    None => None,
                    Some(c) if c == "cis" => Some(Course::Cis),
                    Some(c) if c == "trans" => Some(Course::Trans),
                    Some(other) => {
                        return Err(StepError::Usage(format!(
                            "'{other}' is not a course of addition: write cis (concerted) or \
                             trans (SN2), e.g. oxidative-addition MeI trans"
                        )))
                    }
                };
                Step::OxidativeAddition(a(0), course)
            }
            "reductive-elimination" => {
                want(2, 2)?;
                Step::ReductiveElimination(a(0), a(1))
            }
            "migratory-insertion" => {
                want(2, 3)?;
                let regio = regio(args.get(2).copied())?;
                Step::MigratoryInsertion {
                    inserting: a(0),
                    into: a(1),
                    regio,
                }
            }
            "deinsertion" => {
                want(1, 1)?;
                Step::Deinsertion(a(0))
            }
            "beta-hydride-elimination" => {
                want(1, 2)?;
                Step::BetaHydrideElimination {
                    group: a(0),
                    which: opt(1),
                }
            }
            "beta-alkyl-elimination" => {
                want(1, 2)?;
                Step::BetaAlkylElimination {
                    group: a(0),
                    which: opt(1),
                }
            }
            "beta-heteroatom-elimination" => {
                want(1, 2)?;
                Step::BetaHeteroatomElimination {
                    group: a(0),
                    which: opt(1),
                }
            }
            "alpha-elimination" => {
                want(1, 1)?;
                Step::AlphaElimination(a(0))
            }
            "nucleophilic-attack" => {
                want(2, 2)?;
                Step::NucleophilicAttack {
                    nucleophile: a(0),
                    target: a(1),
                }
            }
            "electrophilic-attack" => {
                want(2, 2)?;
                Step::ElectrophilicAttack {
                    electrophile: a(0),
                    target: a(1),
                }
            }
            "sigma-bond-metathesis" => {
                want(2, 2)?;
                Step::SigmaBondMetathesis {
                    reagent: a(0),
                    group: a(1),
                }
            }
            "protonolysis" => {
                want(2, 2)?;
                Step::Protonolysis {
                    group: a(0),
                    acid: a(1),
                }
            }
            "cycloaddition" => {
                want(2, 3)?;
                Step::Cycloaddition {
                    unsaturated: a(0),
                    ligand: a(1),
                    regio: regio(args.get(2).copied())?,
                }
            }
            "cycloreversion" => {
                want(1, 1)?;
                Step::Cycloreversion(a(0))
            }
            "oxidative-coupling" => {
                want(2, 2)?;
                Step::OxidativeCoupling(a(0), a(1))
            }
            "reductive-decoupling" => {
                want(1, 1)?;
                Step::ReductiveDecoupling(a(0))
            }
            "concerted-metalation-deprotonation" => {
                want(2, 2)?;
                Step::ConcertedMetalationDeprotonation {
                    substrate: a(0),
                    base: a(1),
                }
            }
            "ring-slip" => {
                want(2, 2)?;
                let h = args[1]
                    .trim_start_matches("eta")
                    .trim_start_matches('η')
                    .parse::<u8>()
                    .map_err(|_| {
                        StepError::Usage(format!(
                            "ring-slip needs a hapticity number, e.g. ring-slip Cp 3 (got '{}')",
                            args[1]
                        ))
                    })?;
                Step::RingSlip {
                    ligand: a(0),
                    hapticity: h,
                }
            }
            "oxidation" => {
                want(0, 1)?;
                Step::Oxidation { by: opt(0) }
            }
            "reduction" => {
                want(0, 1)?;
                Step::Reduction { by: opt(0) }
            }
            "protonation" => {
                want(0, 1)?;
                Step::Protonation { acid: opt(0) }
            }
            "isomerization" => {
                want(1, 1)?;
                Step::Isomerization(a(0))
            }
            "deprotonation" => {
                want(1, 2)?;
                Step::Deprotonation {
                    group: a(0),
                    base: opt(1),
                }
            }
            other => {
                return Err(StepError::Usage(format!(
                    "unknown step '{other}'; the steps are: {}",
                    step_list()
                )))
            }
        })
    }

    /// The step's word ("oxidative-addition").
    pub fn word(&self) -> &'static str {
        match self {
            Step::Dissociation(_) => "dissociation",
            Step::Association(_) => "association",
            Step::Substitution { .. } => "substitution",
            Step::Homolysis(_) => "homolysis",
            Step::Abstraction { .. } => "abstraction",
            Step::Transmetalation { .. } => "transmetalation",
            Step::OxidativeAddition(..) => "oxidative-addition",
            Step::Isomerization(_) => "isomerization",
            Step::ReductiveElimination(..) => "reductive-elimination",
            Step::MigratoryInsertion { .. } => "migratory-insertion",
            Step::Deinsertion(_) => "deinsertion",
            Step::BetaHydrideElimination { .. } => "beta-hydride-elimination",
            Step::BetaAlkylElimination { .. } => "beta-alkyl-elimination",
            Step::BetaHeteroatomElimination { .. } => "beta-heteroatom-elimination",
            Step::AlphaElimination(_) => "alpha-elimination",
            Step::NucleophilicAttack { .. } => "nucleophilic-attack",
            Step::ElectrophilicAttack { .. } => "electrophilic-attack",
            Step::SigmaBondMetathesis { .. } => "sigma-bond-metathesis",
            Step::Protonolysis { .. } => "protonolysis",
            Step::Cycloaddition { .. } => "cycloaddition",
            Step::Cycloreversion(_) => "cycloreversion",
            Step::OxidativeCoupling(..) => "oxidative-coupling",
            Step::ReductiveDecoupling(_) => "reductive-decoupling",
            Step::ConcertedMetalationDeprotonation { .. } => "concerted-metalation-deprotonation",
            Step::RingSlip { .. } => "ring-slip",
            Step::Oxidation { .. } => "oxidation",
            Step::Reduction { .. } => "reduction",
            Step::Protonation { .. } => "protonation",
            Step::Deprotonation { .. } => "deprotonation",
        }
    }

    /// Deprotonation of a group (a hydride, or an N-H, O-H donor), the proton left free.
    pub fn deprotonation(group: String) -> Step {
        Step::Deprotonation { group, base: None }
    }

    /// β-hydride elimination of a group, the chemist's default alkene.
    pub fn beta_hydride(group: String) -> Step {
        Step::BetaHydrideElimination { group, which: None }
    }
}

/// Text pasted from papers brought to what the step words use: sub- and superscript digits
/// and signs, the hyphens and dashes U+2010-U+2015 and the minus sign, no-break and
/// zero-width spaces ("η²-C₂H₄", "Ph–Br", "oxidative‑addition").
/// A regiochemistry as typed: 1,2 puts the metal on the less substituted carbon, 2,1 on the
/// more substituted one.
fn regio(arg: Option<&str>) -> Result<Option<Regio>, StepError> {
    match arg {
        None => Ok(None),
        Some("1,2") | Some("12") => Ok(Some(Regio::OneTwo)),
        Some("2,1") | Some("21") => Ok(Some(Regio::TwoOne)),
        Some(other) => Err(StepError::Usage(format!(
            "'{other}' is not a regiochemistry: write 1,2 (metal on the less substituted carbon) \
             or 2,1 (metal on the more substituted carbon)"
        ))),
    }
}

fn plain_text(text: &str) -> String {
    const SUB: &str = "₀₁₂₃₄₅₆₇₈₉";
    const SUP: &str = "⁰¹²³⁴⁵⁶⁷⁸⁹";
    text.chars()
        .filter_map(|c| match c {
            '\u{2010}'..='\u{2015}' | '\u{2212}' | '⁻' | '₋' => Some('-'),
            '⁺' | '₊' => Some('+'),
            '\u{a0}' | '\u{2007}' | '\u{202f}' => Some(' '),
            '\u{200b}' | '\u{200c}' | '\u{200d}' | '\u{feff}' => None,
            c => Some(
                SUB.chars()
                    .position(|s| s == c)
                    .or_else(|| SUP.chars().position(|s| s == c))
                    .map_or(c, |i| char::from(b'0' + i as u8)),
            ),
        })
        .collect()
}

fn step_list() -> String {
    STEP_WORDS
        .iter()
        .map(|(w, _, _)| *w)
        .collect::<Vec<_>>()
        .join(", ")
}

impl fmt::Display for Step {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.word())?;
        let opt = |o: &Option<String>| o.as_ref().map(|s| format!(" {s}")).unwrap_or_default();
        match self {
            Step::Dissociation(l)
            | Step::Association(l)
            | Step::Homolysis(l)
            | Step::Isomerization(l)
            | Step::Deinsertion(l)
            | Step::AlphaElimination(l)
            | Step::Cycloreversion(l)
            | Step::ReductiveDecoupling(l) => write!(f, " {l}"),
            Step::Deprotonation { group, base } => write!(f, " {group}{}", opt(base)),
            Step::OxidativeAddition(s, course) => match course {
                Some(c) => write!(f, " {s} {c}"),
                None => write!(f, " {s}"),
            },
            Step::Protonation { acid } => f.write_str(&opt(acid)),
            Step::Substitution { leaving, entering } => write!(f, " {leaving} {entering}"),
            Step::Abstraction { group, by } => write!(f, " {group} {by}"),
            Step::Transmetalation { reagent, leaving } => write!(f, " {reagent}{}", opt(leaving)),
            Step::ReductiveElimination(a, b) | Step::OxidativeCoupling(a, b) => {
                write!(f, " {a} {b}")
            }
            Step::MigratoryInsertion {
                inserting,
                into,
                regio,
            } => {
                write!(f, " {inserting} {into}")?;
                match regio {
                    Some(r) => write!(f, " {r}"),
                    None => Ok(()),
                }
            }
            Step::BetaHydrideElimination { group, which }
            | Step::BetaAlkylElimination { group, which }
            | Step::BetaHeteroatomElimination { group, which } => {
                write!(f, " {group}{}", opt(which))
            }
            Step::NucleophilicAttack {
                nucleophile,
                target,
            } => write!(f, " {nucleophile} {target}"),
            Step::ElectrophilicAttack {
                electrophile,
                target,
            } => write!(f, " {electrophile} {target}"),
            Step::SigmaBondMetathesis { reagent, group } => write!(f, " {reagent} {group}"),
            Step::Protonolysis { group, acid } => write!(f, " {group} {acid}"),
            Step::Cycloaddition {
                unsaturated,
                ligand,
                regio,
            } => {
                write!(f, " {unsaturated} {ligand}")?;
                match regio {
                    Some(r) => write!(f, " {r}"),
                    None => Ok(()),
                }
            }
            Step::ConcertedMetalationDeprotonation { substrate, base } => {
                write!(f, " {substrate} {base}")
            }
            Step::RingSlip { ligand, hapticity } => write!(f, " {ligand} {hapticity}"),
            Step::Oxidation { by } | Step::Reduction { by } => match by {
                Some(b) => write!(f, " {b}"),
                None => Ok(()),
            },
        }
    }
}

/// Why a step cannot be taken.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum StepError {
    /// The step or its arguments are written wrongly.
    #[error("{0}")]
    Usage(String),
    /// The chemistry does not allow it here; the text says why.
    #[error("{0}")]
    Refused(String),
    /// The step came out unbalanced: a fault in nonet, never in the input.
    #[error("internal fault, please report it: {0}")]
    Unbalanced(String),
}

pub(crate) fn refuse<T>(why: impl Into<String>) -> Result<T, StepError> {
    Err(StepError::Refused(why.into()))
}

/// A step taken: the product, the counts before and after, the equation and notes on what
/// nonet chose (a regiochemistry, a carbene convention, the other alkenes possible).
#[derive(Debug, Clone)]
pub struct Outcome {
    pub step: Step,
    pub product: Complex,
    pub before: Report,
    pub after: Report,
    pub equation: Equation,
    pub notes: Vec<String>,
}

impl Outcome {
    /// Change of (electrons, oxidation state, d count, coordination number) at the first metal.
    pub fn deltas(&self) -> (Frac, Frac, Frac, Frac) {
        match (self.before.metals.first(), self.after.metals.first()) {
            (Some(a), Some(b)) => (
                b.electron_count - a.electron_count,
                b.oxidation_state - a.oxidation_state,
                b.d_electrons - a.d_electrons,
                b.coordination_number - a.coordination_number,
            ),
            _ => (Frac::ZERO, Frac::ZERO, Frac::ZERO, Frac::ZERO),
        }
    }

    /// The equation in one line: "[PtCl4]2- + C2H4 -> [PtCl3(η2-C2H4)]- + Cl-".
    pub fn equation_text(&self) -> String {
        self.equation
            .text(&self.before.formula, &self.after.formula)
    }
}

/// Take `step` on `complex`, checking its preconditions; the result balances.
pub fn take(
    complex: &Complex,
    step: &Step,
    lookup: &dyn LigandLookup,
) -> Result<Outcome, StepError> {
    let before = super::geometry::counted(complex);
    let charge_only = matches!(step, Step::Oxidation { .. } | Step::Reduction { .. });
    if complex.metal_count() != 1 && !charge_only {
        return refuse(
            "steps at a metal need a mononuclear complex; oxidation and reduction work on any",
        );
    }
    let mut cx = Ctx::new(complex, &before, lookup);
    let product = match step {
        Step::Dissociation(l) => ligands::dissociation(&mut cx, l)?,
        Step::Association(l) => ligands::association(&mut cx, l)?,
        Step::Substitution { leaving, entering } => {
            ligands::substitution(&mut cx, leaving, entering)?
        }
        Step::Homolysis(g) => ligands::homolysis(&mut cx, g)?,
        Step::Abstraction { group, by } => ligands::abstraction(&mut cx, group, by)?,
        Step::RingSlip { ligand, hapticity } => ligands::ring_slip(&mut cx, ligand, *hapticity)?,
        Step::OxidativeAddition(s, _) => redox::oxidative_addition(&mut cx, s)?,
        Step::Isomerization(t) => positions::isomerization(complex, &before, t)?,
        Step::ReductiveElimination(a, b) => redox::reductive_elimination(&mut cx, a, b)?,
        Step::Oxidation { by } => redox::electron_transfer(&mut cx, 1, by.as_deref())?,
        Step::Reduction { by } => redox::electron_transfer(&mut cx, -1, by.as_deref())?,
        Step::Protonation { acid } => redox::protonation(&mut cx, acid.as_deref())?,
        Step::Deprotonation { group, base } => {
            redox::deprotonation(&mut cx, group, base.as_deref())?
        }
        Step::Protonolysis { group, acid } => redox::protonolysis(&mut cx, group, acid)?,
        Step::SigmaBondMetathesis { reagent, group } => {
            redox::sigma_bond_metathesis(&mut cx, reagent, group)?
        }
        Step::MigratoryInsertion {
            inserting,
            into,
            regio,
        } => insertion::migratory_insertion(&mut cx, inserting, into, *regio)?,
        Step::Deinsertion(g) => insertion::deinsertion(&mut cx, g)?,
        Step::BetaHydrideElimination { group, which } => {
            insertion::beta_elimination(&mut cx, group, which.as_deref(), insertion::Beta::Hydride)?
        }
        Step::BetaAlkylElimination { group, which } => {
            insertion::beta_elimination(&mut cx, group, which.as_deref(), insertion::Beta::Alkyl)?
        }
        Step::BetaHeteroatomElimination { group, which } => insertion::beta_elimination(
            &mut cx,
            group,
            which.as_deref(),
            insertion::Beta::Heteroatom,
        )?,
        Step::AlphaElimination(g) => insertion::alpha_elimination(&mut cx, g)?,
        Step::NucleophilicAttack {
            nucleophile,
            target,
        } => attack::nucleophilic(&mut cx, nucleophile, target)?,
        Step::ElectrophilicAttack {
            electrophile,
            target,
        } => attack::electrophilic(&mut cx, electrophile, target)?,
        Step::Transmetalation { reagent, leaving } => {
            attack::transmetalation(&mut cx, reagent, leaving.as_deref())?
        }
        Step::ConcertedMetalationDeprotonation { substrate, base } => {
            attack::cmd(&mut cx, substrate, base)?
        }
        Step::Cycloaddition {
            unsaturated,
            ligand,
            regio,
        } => cyclo::cycloaddition(&mut cx, unsaturated, ligand, *regio)?,
        Step::Cycloreversion(alkene) => cyclo::cycloreversion(&mut cx, alkene)?,
        Step::OxidativeCoupling(a, b) => cyclo::oxidative_coupling(&mut cx, a, b)?,
        Step::ReductiveDecoupling(g) => cyclo::reductive_decoupling(&mut cx, g)?,
    };
    let mut product = product;
    let after = count(&product);
    if let Some(why) = after.impossible() {
        return refuse(why);
    }
    let mut geo_notes = Vec::new();
    if !matches!(step, Step::Isomerization(_)) {
        let course = match step {
            Step::OxidativeAddition(_, c) => *c,
            _ => None,
        };
        let (stereo, notes) = positions::follow(step, complex, &before, &product, &after, course)?;
        product.stereo = stereo;
        geo_notes = notes;
    }
    let mut after = after;
    super::geometry::annotate(&product, &mut after);
    after.formula = product.formula(false);
    if matches!(
        after.metals.first().map(|m| m.saturation),
        Some(Saturation::Above18)
    ) && matches!(step, Step::Association(_))
    {
        return refuse("association would take the metal past 18 e");
    }
    let (equation, mut notes) = cx.finish();
    notes.extend(geo_notes);
    equation
        .check_balance(complex, &product)
        .map_err(|why| StepError::Unbalanced(format!("{step}: {why}")))?;
    Ok(Outcome {
        step: step.clone(),
        product,
        before,
        after,
        equation,
        notes,
    })
}

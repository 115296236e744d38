//! Elementary steps of organometallic reactions, with their preconditions.
//!
//! The bookkeeping follows Crabtree, The Organometallic Chemistry of the Transition Metals,
//! 6th ed., Wiley 2014, ch. 4 (substitution), 6 (oxidative addition, reductive elimination) and
//! 7 (insertion, elimination); Hartwig, Organotransition Metal Chemistry, 2010, ch. 5-9:
//!
//! | step | e | OS | d | CN |
//! |---|---|---|---|---|
//! | dissociation of L | -2 | 0 | 0 | -1 |
//! | association of L | +2 | 0 | 0 | +1 |
//! | oxidative addition of A-B | +2 | +2 | -2 | +2 |
//! | reductive elimination of A-B | -2 | -2 | +2 | -2 |
//! | 1,1- or 1,2-insertion | -2 | 0 | 0 | -1 |
//! | β-hydride elimination | +2 | 0 | 0 | +1 |
//! | α-hydride elimination | +2 | +2 | -2 | +1 |
//! | protonation at M | 0 | +2 | -2 | +1 |
//! | one-electron oxidation | -1 | +1 | -1 | 0 |

use std::fmt;
use std::sync::Arc;

use super::complex::Complex;
use super::count::{count, Report, Saturation};
use super::edit::{apply, Edit, Place, Slot};
use super::formula::LigandLookup;
use super::frac::Frac;
use super::ligand::LigandDef;

/// An elementary step, with its arguments as typed (ligand tokens).
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Step {
    Dissociation(String),
    Association(String),
    Substitution { leaving: String, entering: String },
    OxidativeAddition(String),
    ReductiveElimination(String, String),
    MigratoryInsertion { inserting: String, into: String },
    BetaHydrideElimination(String),
    AlphaElimination(String),
    RingSlip { ligand: String, hapticity: u8 },
    Oxidation,
    Reduction,
    Protonation,
    Deprotonation(String),
}

/// The words of each step, as the CLI and the log write them.
pub const STEP_WORDS: &[(&str, &str)] = &[
    ("dissociation", "LIGAND"),
    ("association", "LIGAND"),
    ("substitution", "LEAVING ENTERING"),
    (
        "oxidative-addition",
        "SUBSTRATE (H2, CH3I, PhBr, HSiEt3, or A-B)",
    ),
    ("reductive-elimination", "GROUP GROUP"),
    ("migratory-insertion", "INSERTING GROUP (CO CH3, C2H4 H)"),
    ("beta-hydride-elimination", "ALKYL"),
    ("alpha-elimination", "ALKYL"),
    ("ring-slip", "LIGAND HAPTICITY"),
    ("oxidation", ""),
    ("reduction", ""),
    ("protonation", ""),
    ("deprotonation", "H"),
];

impl Step {
    /// Read "oxidative-addition H2", "ring-slip Cp 3", ...
    pub fn parse(text: &str) -> Result<Step, StepError> {
        let words: Vec<&str> = text.split_whitespace().collect();
        let Some((&verb, args)) = words.split_first() else {
            return Err(StepError::Usage(
                "no step given; name one: ".to_string() + &step_list(),
            ));
        };
        let verb = verb.to_lowercase().replace(['_', ' '], "-");
        let want = |n: usize| -> Result<(), StepError> {
            if args.len() == n {
                Ok(())
            } else {
                let usage = STEP_WORDS
                    .iter()
                    .find(|(w, _)| *w == verb)
                    .map_or(String::new(), |(w, a)| format!("{w} {a}"));
                Err(StepError::Usage(format!(
                    "'{verb}' takes {n} argument{}: {usage}",
                    if n == 1 { "" } else { "s" }
                )))
            }
        };
        let a = |i: usize| args[i].to_string();
        Ok(match verb.as_str() {
            "dissociation" => {
                want(1)?;
                Step::Dissociation(a(0))
            }
            "association" => {
                want(1)?;
                Step::Association(a(0))
            }
            "substitution" => {
                want(2)?;
                Step::Substitution {
                    leaving: a(0),
                    entering: a(1),
                }
            }
            "oxidative-addition" => {
                want(1)?;
                Step::OxidativeAddition(a(0))
            }
            "reductive-elimination" => {
                want(2)?;
                Step::ReductiveElimination(a(0), a(1))
            }
            "migratory-insertion" | "insertion" => {
                want(2)?;
                Step::MigratoryInsertion {
                    inserting: a(0),
                    into: a(1),
                }
            }
            "beta-hydride-elimination" | "β-hydride-elimination" | "beta-elimination" => {
                want(1)?;
                Step::BetaHydrideElimination(a(0))
            }
            "alpha-elimination" | "α-elimination" | "alpha-hydride-elimination" => {
                want(1)?;
                Step::AlphaElimination(a(0))
            }
            "ring-slip" => {
                want(2)?;
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
                want(0)?;
                Step::Oxidation
            }
            "reduction" => {
                want(0)?;
                Step::Reduction
            }
            "protonation" => {
                want(0)?;
                Step::Protonation
            }
            "deprotonation" => {
                want(1)?;
                Step::Deprotonation(a(0))
            }
            other => {
                return Err(StepError::Usage(format!(
                    "unknown step '{other}'; the steps are: {}",
                    step_list()
                )))
            }
        })
    }
}

fn step_list() -> String {
    STEP_WORDS
        .iter()
        .map(|(w, _)| *w)
        .collect::<Vec<_>>()
        .join(", ")
}

impl fmt::Display for Step {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Step::Dissociation(l) => write!(f, "dissociation {l}"),
            Step::Association(l) => write!(f, "association {l}"),
            Step::Substitution { leaving, entering } => {
                write!(f, "substitution {leaving} {entering}")
            }
            Step::OxidativeAddition(s) => write!(f, "oxidative-addition {s}"),
            Step::ReductiveElimination(a, b) => write!(f, "reductive-elimination {a} {b}"),
            Step::MigratoryInsertion { inserting, into } => {
                write!(f, "migratory-insertion {inserting} {into}")
            }
            Step::BetaHydrideElimination(a) => write!(f, "beta-hydride-elimination {a}"),
            Step::AlphaElimination(a) => write!(f, "alpha-elimination {a}"),
            Step::RingSlip { ligand, hapticity } => write!(f, "ring-slip {ligand} {hapticity}"),
            Step::Oxidation => write!(f, "oxidation"),
            Step::Reduction => write!(f, "reduction"),
            Step::Protonation => write!(f, "protonation"),
            Step::Deprotonation(h) => write!(f, "deprotonation {h}"),
        }
    }
}

/// Why a step cannot be taken.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum StepError {
    #[error("{0}")]
    Usage(String),
    #[error("{0}")]
    Refused(String),
}

fn refuse<T>(why: impl Into<String>) -> Result<T, StepError> {
    Err(StepError::Refused(why.into()))
}

/// A step taken: the product and what changed.
#[derive(Debug, Clone)]
pub struct Outcome {
    pub step: Step,
    pub product: Complex,
    pub before: Report,
    pub after: Report,
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
}

/// Substrates known by name for oxidative addition, as the two X groups they give.
const SUBSTRATES: &[(&str, &str, &str)] = &[
    ("H2", "H", "H"),
    ("HCl", "H", "Cl"),
    ("HBr", "H", "Br"),
    ("HI", "H", "I"),
    ("Cl2", "Cl", "Cl"),
    ("Br2", "Br", "Br"),
    ("I2", "I", "I"),
    ("CH3I", "Me", "I"),
    ("MeI", "Me", "I"),
    ("CH3Br", "Me", "Br"),
    ("MeBr", "Me", "Br"),
    ("CH3Cl", "Me", "Cl"),
    ("MeCl", "Me", "Cl"),
    ("EtBr", "Et", "Br"),
    ("EtI", "Et", "I"),
    ("PhI", "Ph", "I"),
    ("PhBr", "Ph", "Br"),
    ("PhCl", "Ph", "Cl"),
    ("CH4", "Me", "H"),
    ("MeH", "Me", "H"),
    ("C6H6", "Ph", "H"),
    ("PhH", "Ph", "H"),
    ("HSiEt3", "SiEt3", "H"),
    ("Et3SiH", "SiEt3", "H"),
    ("HSiMe3", "SiMe3", "H"),
    ("Me3SiH", "SiMe3", "H"),
    ("HSiPh3", "SiPh3", "H"),
    ("Ph3SiH", "SiPh3", "H"),
    ("HSiCl3", "SiCl3", "H"),
    ("HBpin", "Bpin", "H"),
    ("PhOTf", "Ph", "OTf"),
    ("MeOTf", "Me", "OTf"),
];

/// 1,1-insertion of CO into M-R gives the acyl; 1,2-insertion of an alkene or alkyne into M-H
/// or M-R gives the alkyl or vinyl (anti-Markovnikov, the usual course at late metals).
const INSERTIONS: &[(&str, &str, &str)] = &[
    ("CO", "Me", "COMe"),
    ("CO", "Et", "COEt"),
    ("CO", "Ph", "COPh"),
    ("CO", "H", "CHO"),
    ("C2H4", "H", "Et"),
    ("C2H4", "Me", "nPr"),
    ("C2H4", "Et", "nBu"),
    ("C3H6", "H", "nPr"),
    ("C4H8", "H", "nBu"),
    ("C2H2", "H", "CHCH2"),
    ("C2H4", "Ph", "CH2CH2Ph"),
];

/// β-hydride elimination: the alkyl, and the alkene it leaves behind.
const BETA: &[(&str, &str)] = &[
    ("Et", "C2H4"),
    ("nPr", "C3H6"),
    ("iPr", "C3H6"),
    ("nBu", "C4H8"),
    ("tBu", "CH2CMe2"),
    ("Cy", "C6H10"),
    ("CH2CH2Ph", "CH2CHPh"),
];

/// α-hydride elimination: the alkyl, and the alkylidene it becomes.
const ALPHA: &[(&str, &str)] = &[
    ("Me", "CH2"),
    ("CH2tBu", "CHtBu"),
    ("CH2Ph", "CHPh"),
    ("CH2CMe2Ph", "CHCMe2Ph"),
];

/// Alkyls with no hydrogen on the β carbon (why their β-elimination is refused).
const NO_BETA_H: &[&str] = &[
    "Me",
    "CH2tBu",
    "CH2Ph",
    "CH2SiMe3",
    "CH2CMe2Ph",
    "CF3",
    "Ph",
];

struct Ctx<'a> {
    c: &'a Complex,
    r: &'a Report,
    lookup: &'a dyn LigandLookup,
}

impl<'a> Ctx<'a> {
    fn ligand(&self, token: &str) -> Result<&'a Arc<LigandDef>, StepError> {
        self.lookup.exact(token).ok_or_else(|| {
            let hint = self
                .lookup
                .suggest(token)
                .map(|s| format!("; did you mean '{s}'?"))
                .unwrap_or_default();
            StepError::Usage(format!("unknown ligand '{token}'{hint}"))
        })
    }

    /// The slot of a ligand the complex holds, by token.
    fn slot(&self, token: &str) -> Result<Slot, StepError> {
        let l = self.ligand(token)?;
        self.c
            .slots()
            .into_iter()
            .find(|s| self.c.group(*s).is_some_and(|b| b.ligand.key == l.key))
            .ok_or_else(|| {
                StepError::Refused(format!(
                    "the complex has no {} ({}) to act on",
                    l.key, l.name
                ))
            })
    }

    fn metal(&self) -> &'a super::count::MetalReport {
        &self.r.metals[0]
    }

    fn count(&self) -> Frac {
        self.metal().electron_count
    }

    fn d(&self) -> Frac {
        self.metal().d_electrons
    }

    /// An open site: at most 16 e (Crabtree 2014, ch. 4).
    fn needs_open_site(&self, what: &str) -> Result<(), StepError> {
        if self.count() > Frac::int(16) {
            return refuse(format!(
                "{what} needs an open site, but the metal has {} e; a ligand must leave first \
                 (dissociation)",
                self.count()
            ));
        }
        Ok(())
    }
}

fn edit(c: &Complex, e: &Edit) -> Result<Complex, StepError> {
    apply(c, e)
        .map(|(c, _)| c)
        .map_err(|e| StepError::Refused(e.to_string()))
}

fn add(c: &Complex, l: &Arc<LigandDef>) -> Result<Complex, StepError> {
    edit(
        c,
        &Edit::Add {
            place: Place::Site(0),
            ligand: l.clone(),
            mode: 0,
        },
    )
}

fn remove(c: &Complex, slot: Slot) -> Result<Complex, StepError> {
    edit(c, &Edit::Remove { slot })
}

/// Take `step` on `complex`, checking its preconditions.
pub fn take(
    complex: &Complex,
    step: &Step,
    lookup: &dyn LigandLookup,
) -> Result<Outcome, StepError> {
    let before = count(complex);
    let charge_only = matches!(step, Step::Oxidation | Step::Reduction);
    if complex.metal_count() != 1 && !charge_only {
        return refuse(
            "steps at a metal need a mononuclear complex; oxidation and reduction work on any",
        );
    }
    let cx = Ctx {
        c: complex,
        r: &before,
        lookup,
    };
    let product = match step {
        Step::Dissociation(tok) => {
            let slot = cx.slot(tok)?;
            let b = complex
                .group(slot)
                .ok_or(StepError::Refused("no such ligand".into()))?;
            let m = b.mode();
            if m.class.x > 0 {
                return refuse(format!(
                    "{} is an X ligand: it leaves as an anion (change the charge) or by reductive \
                     elimination, not by dissociation",
                    b.ligand.key
                ));
            }
            remove(complex, slot)?
        }
        Step::Association(tok) => {
            let l = cx.ligand(tok)?;
            if l.modes[0].class.x > 0 {
                return refuse(format!(
                    "{} is an X ligand: it binds by oxidative addition or as an anion, not by \
                     association",
                    l.key
                ));
            }
            cx.needs_open_site("association")?;
            add(complex, l)?
        }
        Step::Substitution { leaving, entering } => {
            let slot = cx.slot(leaving)?;
            let l = cx.ligand(entering)?;
            edit(
                complex,
                &Edit::Swap {
                    slot,
                    ligand: l.clone(),
                    mode: 0,
                },
            )?
        }
        Step::OxidativeAddition(sub) => {
            let (a, b) = substrate(sub, &cx)?;
            if cx.d() < Frac::int(2) {
                return refuse(format!(
                    "oxidative addition needs at least two d electrons; the metal is d{}",
                    cx.d()
                ));
            }
            cx.needs_open_site("oxidative addition")?;
            let once = add(complex, a)?;
            add(&once, b)?
        }
        Step::ReductiveElimination(x, y) => {
            let sx = cx.slot(x)?;
            let lx = cx.ligand(x)?;
            let ly = cx.ligand(y)?;
            for l in [lx, ly] {
                if l.modes[0].class.x != 1 || l.modes[0].class.l != 0 {
                    return refuse(format!(
                        "reductive elimination joins two X-type groups; {} is {}",
                        l.key, l.modes[0].class
                    ));
                }
            }
            let once = remove(complex, sx)?;
            let c2 = Ctx {
                c: &once,
                r: &before,
                lookup,
            };
            let sy = c2.slot(y).map_err(|_| {
                StepError::Refused(format!(
                    "reductive elimination needs two X-type groups on the metal: there is no \
                     second {}",
                    ly.key
                ))
            })?;
            remove(&once, sy)?
        }
        Step::MigratoryInsertion { inserting, into } => {
            let si = cx.slot(inserting)?;
            let sr = cx.slot(into)?;
            let li = cx.ligand(inserting)?;
            let lr = cx.ligand(into)?;
            let Some(&(_, _, product)) = INSERTIONS
                .iter()
                .find(|(i, r, _)| *i == li.key && *r == lr.key)
            else {
                return refuse(format!(
                    "nonet knows no product for {} inserting into M-{}; it knows: {}",
                    li.key,
                    lr.key,
                    INSERTIONS
                        .iter()
                        .map(|(i, r, _)| format!("{i} into {r}"))
                        .collect::<Vec<_>>()
                        .join(", ")
                ));
            };
            let lp = cx.ligand(product)?;
            let once = remove(complex, si)?;
            let c2 = Ctx {
                c: &once,
                r: &before,
                lookup,
            };
            let sr2 = c2.slot(into)?;
            let _ = sr;
            let twice = remove(&once, sr2)?;
            add(&twice, lp)?
        }
        Step::BetaHydrideElimination(tok) => {
            let slot = cx.slot(tok)?;
            let l = cx.ligand(tok)?;
            let Some(&(_, alkene)) = BETA.iter().find(|(a, _)| *a == l.key) else {
                if NO_BETA_H.contains(&l.key.as_str()) {
                    return refuse(format!(
                        "{} has no hydrogen on the β carbon, so it cannot β-eliminate",
                        l.key
                    ));
                }
                return refuse(format!(
                    "nonet knows no alkene for β-elimination from {}",
                    l.key
                ));
            };
            cx.needs_open_site("β-hydride elimination")?;
            if cx.metal().target == 16 && cx.metal().saturation == Saturation::Saturated {
                return refuse(
                    "a 16-e square-planar complex has no cis site for the β-hydrogen: a ligand \
                     must leave first (Whitesides; Crabtree 2014, ch. 7)",
                );
            }
            let h = cx.ligand("H")?;
            let ene = cx.ligand(alkene)?;
            let once = remove(complex, slot)?;
            let twice = add(&once, h)?;
            add(&twice, ene)?
        }
        Step::AlphaElimination(tok) => {
            let slot = cx.slot(tok)?;
            let l = cx.ligand(tok)?;
            let Some(&(_, ylidene)) = ALPHA.iter().find(|(a, _)| *a == l.key) else {
                return refuse(format!(
                    "{} has no α-hydrogen that nonet knows to eliminate; it knows: {}",
                    l.key,
                    ALPHA.iter().map(|(a, _)| *a).collect::<Vec<_>>().join(", ")
                ));
            };
            let yl = cx.ligand(ylidene)?;
            let x2 = yl.modes.iter().position(|m| m.class.x == 2).unwrap_or(0);
            let ylidene_in = |c: &Complex| {
                edit(
                    c,
                    &Edit::Add {
                        place: Place::Site(0),
                        ligand: yl.clone(),
                        mode: x2,
                    },
                )
            };
            if cx.d() < Frac::int(2) {
                // a d0 metal cannot rise by two: with a second alkyl it abstracts instead,
                // M(CH2R)2 -> M(=CHR) + CH3R, no change in oxidation state (Schrock's
                // Ta(CH2tBu)5 -> Ta(=CHtBu)(CH2tBu)3 + CMe4; Crabtree 2014, ch. 7)
                let units = complex.group(slot).map_or(0, |b| b.count);
                if units < 2 {
                    return refuse(format!(
                        "α-elimination raises the oxidation state by two and the metal is d{}; \
                         α-abstraction needs a second {}",
                        cx.d(),
                        l.key
                    ));
                }
                let once = remove(complex, slot)?;
                let c2 = Ctx {
                    c: &once,
                    r: &before,
                    lookup,
                };
                let slot2 = c2.slot(tok)?;
                let twice = remove(&once, slot2)?;
                ylidene_in(&twice)?
            } else {
                cx.needs_open_site("α-elimination")?;
                let h = cx.ligand("H")?;
                let once = remove(complex, slot)?;
                let twice = add(&once, h)?;
                ylidene_in(&twice)?
            }
        }
        Step::RingSlip { ligand, hapticity } => {
            let slot = cx.slot(ligand)?;
            let b = complex
                .group(slot)
                .ok_or(StepError::Refused("no such ligand".into()))?;
            let label = format!("η{hapticity}");
            let Some(mode) = b.ligand.mode_index(&label) else {
                return refuse(format!(
                    "{} has no {label} mode; its modes are {}",
                    b.ligand.key,
                    b.ligand.mode_labels()
                ));
            };
            if mode == b.mode {
                return refuse(format!("{} is already {label}", b.ligand.key));
            }
            edit(complex, &Edit::ChangeMode { slot, mode })?
        }
        Step::Oxidation => edit(complex, &Edit::Charge(1))?,
        Step::Reduction => edit(complex, &Edit::Charge(-1))?,
        Step::Protonation => {
            if cx.d() < Frac::int(2) {
                return refuse(format!(
                    "protonation at the metal takes two d electrons; the metal is d{}",
                    cx.d()
                ));
            }
            let h = cx.ligand("H")?;
            let once = add(complex, h)?;
            edit(&once, &Edit::Charge(1))?
        }
        Step::Deprotonation(tok) => {
            let slot = cx.slot(tok)?;
            if complex.group(slot).is_none_or(|b| b.ligand.key != "H") {
                return refuse("deprotonation at the metal removes a hydride (H) as H+");
            }
            let once = remove(complex, slot)?;
            edit(&once, &Edit::Charge(-1))?
        }
    };
    let after = count(&product);
    if let Some(why) = after.impossible() {
        return refuse(why);
    }
    if matches!(
        after.metals.first().map(|m| m.saturation),
        Some(Saturation::Above18)
    ) && matches!(step, Step::Association(_))
    {
        return refuse("association would take the metal past 18 e");
    }
    Ok(Outcome {
        step: step.clone(),
        product,
        before,
        after,
    })
}

/// The two X groups a substrate gives: a name from the table, or "A-B" with both in the
/// catalogue.
fn substrate<'a>(
    text: &str,
    cx: &Ctx<'a>,
) -> Result<(&'a Arc<LigandDef>, &'a Arc<LigandDef>), StepError> {
    let (a, b) = if let Some(&(_, a, b)) = SUBSTRATES.iter().find(|(n, _, _)| *n == text) {
        (a.to_string(), b.to_string())
    } else if let Some((a, b)) = text.split_once('-') {
        (a.to_string(), b.to_string())
    } else {
        return Err(StepError::Usage(format!(
            "unknown substrate '{text}': write it as A-B with both groups in the catalogue \
             (Me-I, H-SiEt3), or use one of {}",
            SUBSTRATES
                .iter()
                .map(|(n, _, _)| *n)
                .collect::<Vec<_>>()
                .join(", ")
        )));
    };
    let la = cx.ligand(&a)?;
    let lb = cx.ligand(&b)?;
    for l in [la, lb] {
        if l.modes[0].class.x != 1 || l.modes[0].class.l != 0 {
            return refuse(format!(
                "oxidative addition splits A-B into two X groups; {} is {}",
                l.key, l.modes[0].class
            ));
        }
    }
    Ok((la, lb))
}

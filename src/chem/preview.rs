//! What an edit would change, worked out before it is committed: counts under both models,
//! oxidation state, d count, saturation and open sites, crowding from cone angles, the shift in
//! donor strength, spin, hazards of an entering ligand and the likely substitution mechanism.

use std::sync::Arc;

use super::complex::Complex;
use super::count::{count, Report, Saturation};
use super::edit::{apply, Edit, EditError, Slot};
use super::ligand::LigandDef;
use super::steps::{Outcome, Step};
use super::sterics::{crowding, Crowding};

/// How a substitution at this metal most likely goes.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Mechanism {
    /// 18-e complexes lose a ligand first (D).
    Dissociative,
    /// 16-e and lower complexes take the incoming ligand first (A).
    Associative,
    /// 17- and 19-e radicals substitute fast, by associative paths.
    Radical,
}

impl Mechanism {
    /// Tolman's 16/18-electron rule (Chem. Soc. Rev. 1972, 1, 337) and the substitution
    /// mechanisms of Langford & Gray (Ligand Substitution Processes, 1965).
    pub fn text(self) -> &'static str {
        match self {
            Mechanism::Dissociative => {
                "dissociative (D): an 18-e complex loses a ligand before the new one binds"
            }
            Mechanism::Associative => {
                "associative (A): the unsaturated complex binds the new ligand first"
            }
            Mechanism::Radical => {
                "odd-electron complex: 17/19-e species substitute fast, usually associatively"
            }
        }
    }
}

/// The change in donor strength between a leaving and an entering ligand.
#[derive(Debug, Clone, PartialEq)]
pub struct DonorShift {
    pub leaving: Option<f64>,
    pub entering: Option<f64>,
}

impl DonorShift {
    /// Entering minus leaving Tolman electronic parameter (cm-1): negative means a stronger net
    /// donor comes in (Tolman, Chem. Rev. 1977, 77, 313).
    pub fn delta(&self) -> Option<f64> {
        Some(self.entering? - self.leaving?)
    }
}

/// What is being previewed: a free edit, or an elementary step with its preconditions met.
#[derive(Debug, Clone, PartialEq)]
pub enum Change {
    Edit(Edit),
    Step(Step),
}

/// Everything a chemist wants to see before committing an edit.
#[derive(Debug, Clone)]
pub struct Preview {
    pub change: Change,
    pub after: Complex,
    pub before_report: Report,
    pub after_report: Report,
    pub focus: Option<Slot>,
    pub crowd_before: Crowding,
    pub crowd_after: Crowding,
    pub leaving: Option<Arc<LigandDef>>,
    pub entering: Option<Arc<LigandDef>>,
    pub donor: Option<DonorShift>,
    pub mechanism: Option<Mechanism>,
    /// A step's equation in one line, what nonet chose on the way, and the hazards on record
    /// for what enters (name, GHS statements).
    pub equation: Option<super::species::Equation>,
    pub equation_text: Option<String>,
    pub step_notes: Vec<String>,
    pub entering_hazards: Vec<(String, Vec<String>)>,
}

impl Preview {
    /// Unpaired electrons of the product, most likely first; empty when not estimated.
    pub fn product_unpaired(&self) -> &[u8] {
        &self.after_report.unpaired_electrons
    }

    pub fn paramagnetic(&self) -> bool {
        self.product_unpaired().first().is_some_and(|&n| n > 0)
    }
}

/// Work out `edit` on `before` without committing it.
pub fn preview(
    before: &Complex,
    before_report: &Report,
    edit: &Edit,
) -> Result<Preview, EditError> {
    let (mut after, focus) = apply(before, edit)?;
    let after_report = count(&after);
    if let Some(why) = after_report.impossible() {
        return Err(EditError::Impossible(why));
    }
    // a named isomer stays named: the other ligands keep their positions
    use super::steps::{carry, Carry};
    let (stereo, step_notes) = match edit {
        Edit::Swap { .. } => carry(before, before_report, &after, &after_report, Carry::Swap),
        Edit::Add { .. } => carry(before, before_report, &after, &after_report, Carry::Add),
        Edit::Remove { .. } => carry(before, before_report, &after, &after_report, Carry::Remove),
        Edit::Charge(_) => (before.stereo.clone(), Vec::new()),
        Edit::ChangeMode { .. } => (None, Vec::new()),
    };
    after.stereo = stereo;
    let (leaving, entering) = match edit {
        Edit::Swap { slot, ligand, .. } => (
            before.group(*slot).map(|b| b.ligand.clone()),
            Some(ligand.clone()),
        ),
        Edit::Add { ligand, .. } => (None, Some(ligand.clone())),
        Edit::Remove { slot } => (before.group(*slot).map(|b| b.ligand.clone()), None),
        Edit::ChangeMode { .. } | Edit::Charge(_) => (None, None),
    };
    let donor = match (&leaving, &entering) {
        (Some(l), Some(e)) => Some(DonorShift {
            leaving: l.tep.as_ref().map(|t| t.value),
            entering: e.tep.as_ref().map(|t| t.value),
        }),
        _ => None,
    };
    let mechanism = match edit {
        Edit::Swap { .. } => {
            before_report
                .metals
                .first()
                .map(|m| match m.electron_count.as_int() {
                    Some(c) if c % 2 != 0 => Mechanism::Radical,
                    _ if m.saturation == Saturation::Unsaturated => Mechanism::Associative,
                    _ if m.target == 16 => Mechanism::Associative,
                    _ => Mechanism::Dissociative,
                })
        }
        _ => None,
    };
    Ok(Preview {
        change: Change::Edit(edit.clone()),
        crowd_before: crowding(before),
        crowd_after: crowding(&after),
        after,
        before_report: before_report.clone(),
        after_report,
        focus,
        leaving,
        entering,
        donor,
        mechanism,
        equation: None,
        equation_text: None,
        step_notes,
        entering_hazards: Vec::new(),
    })
}

/// The preview of a step already taken on paper (see `steps::take`).
pub fn from_step(before: &Complex, o: &Outcome) -> Preview {
    Preview {
        change: Change::Step(o.step.clone()),
        crowd_before: crowding(before),
        crowd_after: crowding(&o.product),
        after: o.product.clone(),
        before_report: o.before.clone(),
        after_report: o.after.clone(),
        focus: None,
        leaving: None,
        entering: None,
        donor: None,
        mechanism: None,
        equation: Some(o.equation.clone()),
        equation_text: Some(o.equation_text()),
        step_notes: o.notes.clone(),
        entering_hazards: o
            .equation
            .enters
            .iter()
            .filter(|t| !t.species.hazards.is_empty())
            .map(|t| (t.species.name.clone(), t.species.hazards.clone()))
            .collect(),
    }
}

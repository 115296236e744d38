//! Edits of a complex: swap one ligand for another, add, remove, change binding mode, change
//! the charge. Each returns a new complex; the old one is untouched (undo keeps it).

use std::sync::Arc;

use super::complex::{BoundLigand, Complex};
use super::ligand::LigandDef;

/// Which ligand list a group is in.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Place {
    /// The ligands of metal site i.
    Site(usize),
    /// Ligands shared between all metals (bridges and the like).
    Shared,
}

/// One ligand group of a complex, as a row the user can select.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct Slot {
    pub place: Place,
    pub index: usize,
}

/// A change to a complex.
#[derive(Debug, Clone, PartialEq)]
pub enum Edit {
    /// Replace one ligand of the group at `slot` by `ligand` bound in `mode`.
    Swap {
        slot: Slot,
        ligand: Arc<LigandDef>,
        mode: usize,
    },
    /// Bind one more ligand (association) at `place`.
    Add {
        place: Place,
        ligand: Arc<LigandDef>,
        mode: usize,
    },
    /// Take one ligand of the group at `slot` off (dissociation).
    Remove { slot: Slot },
    /// Bind one ligand of the group at `slot` in another mode (ring slip, κ2 -> κ1, ...).
    ChangeMode { slot: Slot, mode: usize },
    /// Change the charge: +1 is a one-electron oxidation, -1 a reduction.
    Charge(i32),
}

/// Why an edit cannot be made.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum EditError {
    #[error("no ligand is selected")]
    NoSuchLigand,
    #[error("{0} has no binding mode number {1}")]
    NoSuchMode(String, usize),
    #[error("{label}-{key} bridges {bridges} metals but the complex has {metals}")]
    TooFewMetals {
        label: String,
        key: String,
        bridges: u8,
        metals: usize,
    },
    #[error("a charge beyond ±20 is not a molecular complex")]
    ChargeOutOfRange,
    #[error("{0}")]
    Impossible(String),
}

impl Complex {
    /// Every ligand group in display order: each site's ligands, then the shared ones.
    pub fn slots(&self) -> Vec<Slot> {
        let mut out = Vec::new();
        for (i, s) in self.sites.iter().enumerate() {
            out.extend((0..s.ligands.len()).map(|index| Slot {
                place: Place::Site(i),
                index,
            }));
        }
        out.extend((0..self.shared.len()).map(|index| Slot {
            place: Place::Shared,
            index,
        }));
        out
    }

    pub fn group(&self, slot: Slot) -> Option<&BoundLigand> {
        self.list(slot.place)?.get(slot.index)
    }

    fn list(&self, place: Place) -> Option<&Vec<BoundLigand>> {
        match place {
            Place::Site(i) => self.sites.get(i).map(|s| &s.ligands),
            Place::Shared => Some(&self.shared),
        }
    }

    fn list_mut(&mut self, place: Place) -> Option<&mut Vec<BoundLigand>> {
        match place {
            Place::Site(i) => self.sites.get_mut(i).map(|s| &mut s.ligands),
            Place::Shared => Some(&mut self.shared),
        }
    }

    /// Where the group of `key` bound in `mode` sits, if present.
    pub fn find(&self, key: &str, mode: usize) -> Option<Slot> {
        self.slots().into_iter().find(|&s| {
            self.group(s)
                .is_some_and(|b| b.ligand.key == key && b.mode == mode)
        })
    }
}

/// Apply `edit` to `complex`. Returns the new complex and the slot of the ligand the edit
/// brought in or changed (for keeping the selection on it), if any.
pub fn apply(complex: &Complex, edit: &Edit) -> Result<(Complex, Option<Slot>), EditError> {
    let mut c = complex.clone();
    // notes about how the formula was read, and isomer labels, no longer describe it
    c.notes.clear();
    c.stereo = None;
    let n = c.metal_count();
    let check_mode = |l: &Arc<LigandDef>, mode: usize| -> Result<(), EditError> {
        let m = l
            .modes
            .get(mode)
            .ok_or_else(|| EditError::NoSuchMode(l.key.clone(), mode))?;
        if m.bridges as usize > n {
            return Err(EditError::TooFewMetals {
                label: m.label.clone(),
                key: l.key.clone(),
                bridges: m.bridges,
                metals: n,
            });
        }
        Ok(())
    };
    let focus: Option<(String, usize)> = match edit {
        Edit::Swap { slot, ligand, mode } => {
            check_mode(ligand, *mode)?;
            let place = take_one(&mut c, *slot)?;
            put(&mut c, place, ligand, *mode);
            Some((ligand.key.clone(), *mode))
        }
        Edit::Add {
            place,
            ligand,
            mode,
        } => {
            check_mode(ligand, *mode)?;
            let place = if c.list(*place).is_some() {
                *place
            } else {
                Place::Site(0)
            };
            put(&mut c, place, ligand, *mode);
            Some((ligand.key.clone(), *mode))
        }
        Edit::Remove { slot } => {
            take_one(&mut c, *slot)?;
            None
        }
        Edit::ChangeMode { slot, mode } => {
            let ligand = c
                .group(*slot)
                .map(|b| b.ligand.clone())
                .ok_or(EditError::NoSuchLigand)?;
            check_mode(&ligand, *mode)?;
            let place = take_one(&mut c, *slot)?;
            put(&mut c, place, &ligand, *mode);
            Some((ligand.key.clone(), *mode))
        }
        Edit::Charge(delta) => {
            let charge = c.charge + delta;
            if charge.abs() > 20 {
                return Err(EditError::ChargeOutOfRange);
            }
            c.charge = charge;
            None
        }
    };
    c.canonicalize();
    let slot = focus.and_then(|(key, mode)| c.find(&key, mode));
    Ok((c, slot))
}

/// Remove one unit of the group at `slot`; returns the list it was in.
fn take_one(c: &mut Complex, slot: Slot) -> Result<Place, EditError> {
    let list = c.list_mut(slot.place).ok_or(EditError::NoSuchLigand)?;
    let group = list.get_mut(slot.index).ok_or(EditError::NoSuchLigand)?;
    if group.count > 1 {
        group.count -= 1;
    } else {
        list.remove(slot.index);
    }
    Ok(slot.place)
}

/// Add one ligand; bridges always go to the shared list.
fn put(c: &mut Complex, place: Place, ligand: &Arc<LigandDef>, mode: usize) {
    let bridging = ligand.modes.get(mode).is_some_and(|m| m.bridges > 1);
    let place = if bridging || c.sites.is_empty() {
        Place::Shared
    } else {
        place
    };
    if let Some(list) = c.list_mut(place) {
        list.push(BoundLigand::new(ligand.clone(), mode, 1));
    }
}

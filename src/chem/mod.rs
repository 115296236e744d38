//! The chemistry core: elements, ligands, complexes, the formula notation and electron
//! counting. Pure: no terminal, no files, no clock.

pub mod canon;
pub mod cells;
pub mod cluster;
pub mod complex;
pub mod condensed;
pub mod count;
pub mod cycle;
pub mod derived;
pub mod descriptor;
pub mod edit;
pub mod element;
pub mod fit;
pub mod formula;
pub mod frac;
pub mod geometry;
pub mod isomers;
pub mod ligand;
pub mod molecule;
pub mod periodic;
pub mod polyhedron;
pub mod preview;
pub mod reagent;
pub mod screen;
pub mod shape;
pub mod species;
pub mod spin;
pub mod steps;
pub mod sterics;
pub mod structure;
pub mod trans;

pub use complex::{BoundLigand, Complex, MetalSite};
pub use count::{count, Report};
pub use formula::{parse, parse_ions, LigandLookup, ParseError};
pub use frac::Frac;
pub use ligand::{BindingMode, CbcClass, FieldClass, LigandDef, Sourced};

/// Errors of the chemistry core other than formula parsing.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ChemError {
    #[error("'{0}' is not a CBC class: write L, X and Z with counts, in that order (e.g. L2X)")]
    BadClass(String),
}

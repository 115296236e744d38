//! nonet: electron counting and ligand planning for transition-metal complexes.
//!
//! `chem` is the pure science; `catalogue` loads ligand sets; `cli` is the scriptable front end.

pub mod catalogue;
pub mod chem;
pub mod cli;
pub mod plain;
pub mod session;
pub mod tui;

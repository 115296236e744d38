//! nonet: electron counting and ligand planning for transition-metal complexes.
//!
//! `chem` is the pure science; `catalogue` loads ligand sets; `cli` is the scriptable front end.

// a panic on user data is a bug: outside tests, no unwrap or expect anywhere in the library
#![cfg_attr(not(test), deny(clippy::unwrap_used, clippy::expect_used))]

pub mod catalogue;
pub mod chem;
pub mod cli;
pub mod plain;
pub mod session;
pub mod tui;

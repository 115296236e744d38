//! The trans effect: how strongly a ligand speeds the loss of the ligand opposite it. The
//! kinetic series for square-planar Pt(II) substitution, as Miessler, Fischer & Tarr,
//! Inorganic Chemistry, 5th ed., 2014, ch. 12 give it (from memory):
//! CN⁻ ≈ CO ≈ C2H4 ≈ NO > PR3 ≈ H⁻ > CH3⁻ ≈ SC(NH2)2 > C6H5⁻ > NO2⁻ > I⁻ ≈ SCN⁻ > Br⁻ > Cl⁻ >
//! py, NH3 ≈ OH⁻ ≈ H2O. The ground-state trans influence follows nearly the same order for
//! σ donors (Appleton, Clark & Manzer, Coord. Chem. Rev. 1973, 10, 335), silyl above hydride.
//! Ligands are placed by key where the series names them, else by family.

use super::ligand::LigandDef;

/// Place in the series, higher labilizes more; 0 for the weakest and for ligands the series
/// does not reach.
pub fn trans_effect(l: &LigandDef) -> u8 {
    match l.key.as_str() {
        "CN" | "CO" | "NO" | "C2H4" => return 10,
        "H" => return 9,
        "NO2" => return 5,
        "I" | "SCN" | "NCS" => return 4,
        "Br" => return 3,
        "Cl" => return 2,
        "F" => return 1,
        _ => {}
    }
    match l.family.as_str() {
        "carbonyl" | "isocyanide" | "nitrosyl" | "alkene" | "alkyne" => 10,
        "silyl" | "hydride" => 9,
        "phosphine" | "phosphite" | "arsine" | "carbene" | "boryl" => 9,
        "alkyl" | "acyl" => 8,
        "aryl" => 7,
        "pseudohalide" => 5,
        "thioether" | "thiolate" => 4,
        "halide" => 2,
        _ => 0,
    }
}

/// Whether the ligand labilizes the one opposite strongly (σ donors and π acceptors at the
/// top of the series: H, alkyls, phosphines, CO and alkenes).
pub fn strong(l: &LigandDef) -> bool {
    trans_effect(l) >= 8
}

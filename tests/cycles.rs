//! Textbook catalytic cycles planned through the CLI (`nonet step --json`), each closed and
//! checked against the net reaction its source gives. The net is compared as Hill formulas
//! with counts and charges, so a renamed species cannot hide a wrong one.

mod common;

use common::cli::Scratch;
use serde_json::Value;

/// The closing line of `nonet step --json START STEPS...`.
fn closing(start: &str, steps: &[&str]) -> Value {
    let out = Scratch::new("cycle")
        .cmd()
        .arg("step")
        .arg("--json")
        .arg(start)
        .args(steps)
        .output()
        .expect("nonet runs");
    let stdout = String::from_utf8_lossy(&out.stdout);
    assert!(
        out.status.success(),
        "{start} {steps:?}\n{stdout}\n{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let last = stdout.lines().last().expect("a closing line");
    serde_json::from_str(last).expect("the closing line is JSON")
}

/// A side of the net as sorted (formula, charge, count).
fn side(v: &Value) -> Vec<(String, i64, u64)> {
    let mut out: Vec<(String, i64, u64)> = v
        .as_array()
        .expect("a list of species")
        .iter()
        .map(|s| {
            (
                s["formula"].as_str().unwrap_or("?").to_string(),
                s["charge"].as_i64().unwrap_or(99),
                s["count"].as_u64().unwrap_or(0),
            )
        })
        .collect();
    out.sort();
    out
}

fn terms(list: &[(&str, u64)]) -> Vec<(String, i64, u64)> {
    let mut out: Vec<(String, i64, u64)> =
        list.iter().map(|(f, n)| (f.to_string(), 0, *n)).collect();
    out.sort();
    out
}

/// Plan the cycle and check it closes with `consumed -> formed` (neutral species).
fn cycle(start: &str, steps: &[&str], consumed: &[(&str, u64)], formed: &[(&str, u64)]) {
    let c = closing(start, steps);
    assert_eq!(
        c["closed"], true,
        "{start} did not close: {}",
        c["net_text"]
    );
    assert_eq!(
        side(&c["net"]["consumed"]),
        terms(consumed),
        "consumed, {start}: {}",
        c["net_text"]
    );
    assert_eq!(
        side(&c["net"]["formed"]),
        terms(formed),
        "formed, {start}: {}",
        c["net_text"]
    );
}

#[test]
fn wilkinson_hydrogenation() {
    // Osborn, Jardine, Young & Wilkinson, J. Chem. Soc. A 1966, 1711; the dissociative
    // cycle as in Crabtree, The Organometallic Chemistry of the Transition Metals, 6th ed.,
    // Wiley 2014, ch. 9: C2H4 + H2 -> C2H6
    cycle(
        "RhCl(PPh3)3",
        &[
            "dissociation PPh3",
            "oxidative-addition H2",
            "association C2H4",
            "migratory-insertion C2H4 H",
            "reductive-elimination Et H",
            "association PPh3",
        ],
        &[("C2H4", 1), ("H2", 1)],
        &[("C2H6", 1)],
    );
}

#[test]
fn rhodium_hydroformylation() {
    // Evans, Osborn & Wilkinson, J. Chem. Soc. A 1968, 3133 (the dissociative path from
    // RhH(CO)(PPh3)3): C2H4 + CO + H2 -> EtCHO
    cycle(
        "RhH(CO)(PPh3)3",
        &[
            "dissociation PPh3",
            "association C2H4",
            "migratory-insertion C2H4 H",
            "association CO",
            "migratory-insertion CO Et",
            "oxidative-addition H2",
            "reductive-elimination C(O)Et H",
            "association PPh3",
        ],
        &[("C2H4", 1), ("CO", 1), ("H2", 1)],
        &[("C3H6O", 1)],
    );
}

#[test]
fn cobalt_hydroformylation() {
    // Heck & Breslow, J. Am. Chem. Soc. 1961, 83, 4023: HCo(CO)4 loses CO, the alkene
    // inserts, CO inserts, H2 adds and the aldehyde leaves
    cycle(
        "HCo(CO)4",
        &[
            "dissociation CO",
            "association C2H4",
            "migratory-insertion C2H4 H",
            "association CO",
            "migratory-insertion CO Et",
            "oxidative-addition H2",
            "reductive-elimination C(O)Et H",
            "association CO",
        ],
        &[("C2H4", 1), ("CO", 1), ("H2", 1)],
        &[("C3H6O", 1)],
    );
}

#[test]
fn monsanto_acetic_acid() {
    // Forster, Adv. Organomet. Chem. 1979, 17, 255: [RhI2(CO)2]- + MeI, methyl migration,
    // CO uptake, acetyl iodide out: MeI + CO -> MeC(O)I
    cycle(
        "[RhI2(CO)2]-",
        &[
            "oxidative-addition MeI",
            "migratory-insertion CO Me",
            "association CO",
            "reductive-elimination C(O)Me I",
        ],
        &[("CH3I", 1), ("CO", 1)],
        &[("C2H3IO", 1)],
    );
}

#[test]
fn cativa_acetic_acid() {
    // Haynes, Maitlis et al., J. Am. Chem. Soc. 2004, 126, 2847, from memory (iridium: iodide loss
    // before migration, the step promoters speed up): MeI + CO -> MeC(O)I
    cycle(
        "[IrI2(CO)2]-",
        &[
            "oxidative-addition MeI",
            "substitution I CO",
            "migratory-insertion CO Me",
            "association I",
            "reductive-elimination C(O)Me I",
        ],
        &[("CH3I", 1), ("CO", 1)],
        &[("C2H3IO", 1)],
    );
}

#[test]
fn suzuki_coupling() {
    // Miyaura & Suzuki, Chem. Rev. 1995, 95, 2457 (base left out, as in the net):
    // PhBr + PhB(OH)2 -> Ph-Ph + BrB(OH)2
    cycle(
        "Pd(PPh3)2",
        &[
            "oxidative-addition PhBr",
            "transmetalation PhB(OH)2",
            "reductive-elimination Ph Ph",
        ],
        &[("C6H5Br", 1), ("C6H7BO2", 1)],
        &[("C12H10", 1), ("BBrH2O2", 1)],
    );
}

#[test]
fn negishi_coupling() {
    // Negishi, Acc. Chem. Res. 1982, 15, 340: ArX + RZnX' -> Ar-R + ZnXX'
    cycle(
        "Pd(PPh3)2",
        &[
            "oxidative-addition PhBr",
            "transmetalation MeZnCl",
            "reductive-elimination Ph Me",
        ],
        &[("C6H5Br", 1), ("CH3ClZn", 1)],
        &[("C7H8", 1), ("BrClZn", 1)],
    );
}

#[test]
fn stille_coupling() {
    // Stille, Angew. Chem. Int. Ed. Engl. 1986, 25, 508: ArX + R'SnBu3 -> Ar-R' + XSnBu3
    cycle(
        "Pd(PPh3)2",
        &[
            "oxidative-addition PhBr",
            "transmetalation Bu3SnPh",
            "reductive-elimination Ph Ph",
        ],
        &[("C6H5Br", 1), ("C18H32Sn", 1)],
        &[("C12H10", 1), ("C12H27BrSn", 1)],
    );
}

#[test]
fn heck_reaction() {
    // Beletskaya & Cheprakov, Chem. Rev. 2000, 100, 3009 (the neutral pathway; the base
    // takes HBr from the palladium hydride): PhBr + C2H4 + Et3N -> styrene + [HNEt3]Br
    cycle(
        "Pd(PPh3)2",
        &[
            "oxidative-addition PhBr",
            "dissociation PPh3",
            "association C2H4",
            "migratory-insertion C2H4 Ph",
            "beta-hydride-elimination CH2CH2Ph",
            "dissociation CH2CHPh",
            "association PPh3",
            "deprotonation H NEt3",
            "dissociation Br",
        ],
        &[("C6H5Br", 1), ("C2H4", 1), ("C6H15N", 1)],
        &[("C8H8", 1), ("C6H16BrN", 1)],
    );
}

#[test]
fn buchwald_hartwig_amination() {
    // Hartwig, Acc. Chem. Res. 1998, 31, 852 (amine binding, deprotonation by the base,
    // C-N reductive elimination): ArBr + HNR2 + NaOtBu -> ArNR2 + tBuOH + NaBr
    cycle(
        "Pd(PPh3)2",
        &[
            "dissociation PPh3",
            "oxidative-addition PhBr",
            "substitution Br HNMe2",
            "deprotonation HNMe2 NaOtBu",
            "reductive-elimination Ph NMe2",
        ],
        &[("C6H5Br", 1), ("C2H7N", 1), ("C4H9NaO", 1)],
        &[("C8H11N", 1), ("C4H10O", 1), ("BrNa", 1)],
    );
}

#[test]
fn wacker_oxidation() {
    // Smidt et al., Angew. Chem. 1959, 71, 176; the cycle and its net as in Crabtree 2014,
    // ch. 8: C2H4 + H2O + 2 CuCl2 -> MeCHO + 2 CuCl + 2 HCl (water attacks the bound
    // ethylene, β-H elimination and reinsertion give the 1-hydroxyethyl, whose β-H
    // elimination gives the aldehyde; CuCl2 takes Pd(0) back to Pd(II))
    cycle(
        "[PdCl4]2-",
        &[
            "dissociation Cl",
            "association C2H4",
            "substitution Cl H2O",
            "nucleophilic-attack H2O C2H4",
            "dissociation Cl",
            "beta-hydride-elimination CH2CH2OH",
            "migratory-insertion CH2CHOH H 2,1",
            "beta-hydride-elimination CH(OH)CH3",
            "reductive-elimination H Cl",
            "oxidation CuCl2",
            "oxidation CuCl2",
            "substitution H2O Cl",
            "association Cl",
            "association Cl",
            "association Cl",
        ],
        &[("C2H4", 1), ("H2O", 1), ("Cl2Cu", 2)],
        &[("C2H4O", 1), ("ClCu", 2), ("ClH", 2)],
    );
}

#[test]
fn chauvin_self_metathesis() {
    // Hérisson & Chauvin, Makromol. Chem. 1971, 141, 161 (the metallacyclobutane
    // mechanism); self-metathesis of a terminal alkene, 2 RCH=CH2 -> RCH=CHR + C2H4
    // (Grubbs, ed., Handbook of Metathesis, Wiley-VCH 2003, vol. 1)
    cycle(
        "[RuCl2(PCy3)(CH2)]",
        &[
            "association PhCHCH2",
            "cycloaddition PhCHCH2 CH2",
            "cycloreversion C2H4",
            "association PhCHCH2",
            "cycloaddition PhCHCH2 CHPh 1,2",
            "cycloreversion PhCH=CHPh",
        ],
        &[("C8H8", 2)],
        &[("C2H4", 1), ("C14H12", 1)],
    );
}

#[test]
fn metallocene_polymerization_with_chain_transfer() {
    // Cossee, J. Catal. 1964, 3, 80 (insertion at the cationic alkyl); chain transfer by
    // β-H elimination as in Brintzinger et al., Angew. Chem. Int. Ed. Engl. 1995, 34, 1143.
    // Two insertions, then the chain leaves as 1-butene: 2 C2H4 -> C4H8
    cycle(
        "[Cp2ZrH]+",
        &[
            "association C2H4",
            "migratory-insertion C2H4 H",
            "association C2H4",
            "migratory-insertion C2H4 Et",
            "beta-hydride-elimination Bu",
            "dissociation CH2CHEt",
        ],
        &[("C2H4", 2)],
        &[("C4H8", 1)],
    );
}

#[test]
fn chalk_harrod_hydrosilylation() {
    // Chalk & Harrod, J. Am. Chem. Soc. 1965, 87, 16: Si-H adds, the alkene inserts into
    // M-H, C-Si reductive elimination: HSiEt3 + C2H4 -> EtSiEt3
    cycle(
        "Pt(PPh3)2",
        &[
            "dissociation PPh3",
            "oxidative-addition HSiEt3",
            "association C2H4",
            "migratory-insertion C2H4 H",
            "reductive-elimination Et SiEt3",
            "association PPh3",
        ],
        &[("C6H16Si", 1), ("C2H4", 1)],
        &[("C8H20Si", 1)],
    );
}

#[test]
fn cmd_direct_arylation() {
    // Lafrance & Fagnou, J. Am. Chem. Soc. 2006, 128, 16496; Gorelsky, Lapointe & Fagnou,
    // J. Am. Chem. Soc. 2008, 130, 10848 (acetate-assisted C-H cleavage):
    // ArBr + ArH + KOAc -> Ar-Ar + AcOH + KBr
    cycle(
        "Pd(PPh3)2",
        &[
            "dissociation PPh3",
            "oxidative-addition PhBr",
            "substitution Br KOAc",
            "concerted-metalation-deprotonation PhH OAc",
            "reductive-elimination Ph Ph",
            "association PPh3",
        ],
        &[("C6H5Br", 1), ("C6H6", 1), ("C2H3KO2", 1)],
        &[("C12H10", 1), ("C2H4O2", 1), ("BrK", 1)],
    );
}

#[test]
fn an_open_path_says_so() {
    // common practice: a path that never returns to an intermediate is not a cycle
    let c = closing("Pd(PPh3)2", &["oxidative-addition PhBr"]);
    assert_eq!(c["closed"], false);
    assert_eq!(side(&c["net"]["consumed"]), terms(&[("C6H5Br", 1)]));
}

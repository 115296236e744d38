//! Electron counting under the neutral (covalent) and ionic models, oxidation state, d count,
//! CBC class (Green, J. Organomet. Chem. 1995, 500, 127; Green & Parkin, J. Chem. Educ. 2014,
//! 91, 807), coordination and saturation, for every metal of a complex.

use std::sync::Arc;

use serde::ser::{SerializeStruct, Serializer};
use serde::Serialize;

use super::cluster::{self, ClusterView};
use super::complex::{push_charge, BoundLigand, Complex};
use super::element::Block;
use super::frac::Frac;
use super::ligand::{BindingMode, LigandDef};
use super::spin::{self, Basis, SpinGuess, SpinInput};

/// Whether a metal has the electrons its type usually wants.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Saturation {
    Saturated,
    Unsaturated,
    #[serde(rename = "above_18")]
    Above18,
    NotApplicable,
}

impl Saturation {
    /// The JSON word, part of the schema.
    pub fn code(self) -> &'static str {
        match self {
            Saturation::Saturated => "saturated",
            Saturation::Unsaturated => "unsaturated",
            Saturation::Above18 => "above_18",
            Saturation::NotApplicable => "not_applicable",
        }
    }

    pub fn word(self) -> &'static str {
        match self {
            Saturation::Saturated => "saturated",
            Saturation::Unsaturated => "unsaturated",
            Saturation::Above18 => "above 18",
            Saturation::NotApplicable => "not applicable",
        }
    }
}

/// One ligand group's share in a metal's count.
#[derive(Debug, Clone, PartialEq)]
pub struct Contribution {
    pub ligand: Arc<LigandDef>,
    pub mode: usize,
    /// How many of this ligand the metal has (a fraction when shared between metals).
    pub count: Frac,
    pub neutral: Frac,
    pub ionic: Frac,
    pub ionic_charge: Frac,
    pub shared: bool,
    /// Positions (numbered from 1 on the polyhedron) each copy holds, when the isomer is fixed.
    pub positions: Option<Vec<Vec<u8>>>,
}

impl Contribution {
    pub fn mode(&self) -> &BindingMode {
        self.ligand
            .modes
            .get(self.mode)
            .unwrap_or(&self.ligand.modes[0])
    }
}

impl Serialize for Contribution {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        let m = self.mode();
        let mut st = s.serialize_struct("Contribution", 9)?;
        st.serialize_field("ligand", &self.ligand.key)?;
        st.serialize_field("mode", &m.label)?;
        st.serialize_field("class", &m.class)?;
        st.serialize_field("count", &self.count)?;
        st.serialize_field("neutral", &self.neutral)?;
        st.serialize_field("ionic", &self.ionic)?;
        st.serialize_field("ionic_charge", &self.ionic_charge)?;
        st.serialize_field("shared", &self.shared)?;
        st.serialize_field("positions", &self.positions)?;
        st.end()
    }
}

/// GHS hazard statements of a hazardous free ligand in the complex.
#[derive(Debug, Clone, PartialEq)]
pub struct Hazard(pub Arc<LigandDef>);

impl Serialize for Hazard {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        let mut st = s.serialize_struct("Hazard", 2)?;
        st.serialize_field("ligand", &self.0.key)?;
        st.serialize_field("ghs", &self.0.hazards)?;
        st.end()
    }
}

/// A general caution about the complex. JSON carries the code, the text report the sentence.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Caution {
    MetalCarbonyl,
    MetalAlkyl,
    /// Deferral to the people and documents that decide whether work is safe.
    ConsultSds,
}

impl Caution {
    /// The JSON word, part of the schema.
    pub fn code(self) -> &'static str {
        match self {
            Caution::MetalCarbonyl => "metal-carbonyl",
            Caution::MetalAlkyl => "metal-alkyl",
            Caution::ConsultSds => "consult-sds",
        }
    }

    pub fn text(self) -> &'static str {
        match self {
            Caution::MetalCarbonyl => {
                "metal carbonyls can release carbon monoxide; several are volatile and highly toxic"
            }
            Caution::MetalAlkyl => {
                "metal alkyls can be pyrophoric or react violently with water and air"
            }
            Caution::ConsultSds => {
                "consult the supplier's safety data sheet and local rules; nonet plans on paper \
                 and never judges whether a reaction is safe"
            }
        }
    }
}

/// Everything counted for one metal.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MetalReport {
    pub symbol: &'static str,
    /// IUPAC group; none for the f block.
    pub group: Option<u8>,
    /// Electrons the metal brings to the neutral count: the group number for the d block,
    /// those beyond the f shell for the f block.
    pub valence_electrons: u8,
    /// f electrons of an f-block metal at its oxidation state.
    pub f_electrons: Option<Frac>,
    pub electron_count: Frac,
    pub ionic_electron_count: Frac,
    pub oxidation_state: Frac,
    pub d_electrons: Frac,
    pub coordination_number: Frac,
    pub donor_atoms: Frac,
    pub cbc_class: String,
    pub equivalent_neutral_class: String,
    pub valence_number: Frac,
    pub ligand_bond_number: Frac,
    /// d count from the CBC class: group minus valence number.
    pub cbc_d_electrons: Frac,
    /// Electron count from the CBC class, m + 2l + x (minus any charge left on the metal); a
    /// cross-check that equals `electron_count`, not part of the JSON.
    #[serde(skip)]
    pub cbc_electron_count: Frac,
    pub saturation: Saturation,
    pub target: u8,
    pub electrons_short: Frac,
    pub open_sites: i64,
    pub metal_metal_bonds: Frac,
    /// IUPAC polyhedral symbol of the coordination sphere ("OC-6"); None for a polynuclear
    /// complex or a shape nonet does not place.
    pub polyhedron: Option<&'static str>,
    /// The IUPAC descriptor of the isomer ("OC-6-22"), when the written prefix or the
    /// composition fixes one.
    pub isomer: Option<String>,
    /// How many stereoisomers the composition has on that polyhedron (enantiomers apart).
    pub stereoisomers: Option<u32>,
    /// This metal's share of the complex's charge (internal; not part of the JSON).
    #[serde(skip)]
    pub charge_share: Frac,
    pub contributions: Vec<Contribution>,
    pub notes: Vec<String>,
}

/// The count of a whole complex.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Report {
    pub formula: String,
    pub charge: i32,
    /// Element counts of the complex; None when a ligand has no structure on record.
    pub composition: Option<super::molecule::Composition>,
    pub metals: Vec<MetalReport>,
    pub metal_metal_bonds: Option<u32>,
    pub cluster_valence_electrons: Frac,
    pub polyhedron: Option<&'static str>,
    pub geometry: &'static str,
    pub unpaired_electrons: Vec<u8>,
    pub spin_only_moment_bm: Vec<f64>,
    pub spin_ambiguous: bool,
    pub spin_basis: Basis,
    /// Hazardous free ligands with their GHS statements.
    pub hazards: Vec<Hazard>,
    /// General cautions (metal carbonyls, metal alkyls) and, when any caution applies, the
    /// deferral to the safety data sheet and local rules.
    pub cautions: Vec<Caution>,
    pub notes: Vec<String>,
}

/// Why a metal forms no M-M bond, if it does not: no d electrons to share (d0), a closed shell
/// (d10), a square-planar d8 centre content at 16 e, an f-block metal, or a first-row metal in
/// a high oxidation state (Fe(III), Ti(III) dimers are bridged, not bonded; common practice).
pub fn bond_refusal(
    e: &super::element::Element,
    os: Frac,
    d: Frac,
    target: u8,
    werner: bool,
) -> Option<&'static str> {
    if e.block == Block::F {
        return Some("f-block metals are not counted to 18 e");
    }
    let d = d.floor();
    if d <= 0 {
        return Some("a d0 metal has no electrons for an M-M bond");
    }
    if d >= 10 {
        return Some("a d10 metal has a closed shell");
    }
    if target == 16 {
        return Some("square-planar d8 centres are content at 16 e");
    }
    if e.is_first_row() && os >= Frac::int(3) {
        return Some(
            "first-row metals in oxidation states of +3 and above are bridged, not bonded",
        );
    }
    // Werner-type first-row M(II) with five or more d electrons (Co(acac)2, Ni(acac)2
    // oligomers) are held by bridging ligands; d1-d4 ones still bond (Cr2(O2CMe)4)
    if werner && e.is_first_row() && os >= Frac::int(2) && d >= 5 {
        return Some("first-row M(II) Werner complexes with d5 or more are bridged, not bonded");
    }
    None
}

/// No π-acceptor or organometallic ring ligand: a classical (Werner) coordination complex.
pub fn is_werner(complex: &Complex) -> bool {
    !complex.all_ligands().any(|(_, b)| {
        matches!(
            b.ligand.family.as_str(),
            "carbonyl"
                | "isocyanide"
                | "nitrosyl"
                | "cyclopentadienyl"
                | "arene"
                | "alkene"
                | "alkyne"
                | "diene"
                | "allyl"
                | "polyene"
        )
    })
}

/// Cone angle from which a ligand is called bulky (PCy3 170 deg, PtBu3 182 deg; Tolman,
/// Chem. Rev. 1977, 77, 313: such ligands favour ML3 and ML2 over ML4).
const BULKY_CONE_ANGLE: f64 = 160.0;

/// One value per metal: most complexes have one or two, so these stay off the heap.
type PerMetal<T> = smallvec::SmallVec<[T; 2]>;

struct Tally<'a> {
    neutral: Frac,
    ionic: Frac,
    ionic_charge: Frac,
    l: Frac,
    x: Frac,
    z: Frac,
    sites: Frac,
    donors: Frac,
    field_sum: f64,
    field_weight: f64,
    pi_donor: Vec<&'a str>,
    bulky: Vec<(&'a str, f64)>,
    contributions: Vec<Contribution>,
}

impl<'a> Tally<'a> {
    /// Mean spectrochemical score, weighted by positions taken; medium when nothing is known.
    fn field(&self) -> f64 {
        if self.field_weight > 0.0 {
            self.field_sum / self.field_weight
        } else {
            1.0
        }
    }

    /// A tally for `ligands` ligand entries.
    fn new(ligands: usize) -> Tally<'a> {
        Tally {
            neutral: Frac::ZERO,
            ionic: Frac::ZERO,
            ionic_charge: Frac::ZERO,
            l: Frac::ZERO,
            x: Frac::ZERO,
            z: Frac::ZERO,
            sites: Frac::ZERO,
            donors: Frac::ZERO,
            field_sum: 0.0,
            field_weight: 0.0,
            pi_donor: Vec::new(),
            bulky: Vec::new(),
            contributions: Vec::with_capacity(ligands),
        }
    }

    /// Add `b`, of which this metal holds the fraction `share`.
    fn add(&mut self, b: &'a BoundLigand, share: Frac, shared: bool) {
        let m = b.mode();
        let count = share * b.count as i64;
        let neutral = count * m.neutral_electrons();
        let ionic = count * m.ionic_electrons();
        let q = count * m.ionic_charge as i64;
        self.neutral += neutral;
        self.ionic += ionic;
        self.ionic_charge += q;
        self.l += count * m.class.l as i64;
        self.x += count * m.class.x as i64;
        self.z += count * m.class.z as i64;
        self.sites += count * (m.sites as i64 * m.bridges as i64);
        self.donors += count
            * if m.bridges > 1 {
                m.bridges as i64
            } else {
                m.donors as i64
            };
        if let Some(f) = b.ligand.field {
            let w = (count * m.sites as i64).to_f64();
            self.field_sum += f.score() * w;
            self.field_weight += w;
        }
        if b.ligand.pi_donor && !self.pi_donor.contains(&b.ligand.key.as_str()) {
            self.pi_donor.push(&b.ligand.key);
        }
        if let Some(c) = &b.ligand.cone_angle {
            if c.value >= BULKY_CONE_ANGLE && !self.bulky.iter().any(|(k, _)| *k == b.ligand.key) {
                self.bulky.push((&b.ligand.key, c.value));
            }
        }
        self.contributions.push(Contribution {
            positions: None,
            ligand: b.ligand.clone(),
            mode: b.mode,
            count,
            neutral,
            ionic,
            ionic_charge: q,
            shared,
        });
    }
}

/// Count every metal of `complex`.
pub fn count(complex: &Complex) -> Report {
    let n = complex.metal_count().max(1) as i64;
    let share = Frac::new(1, n);
    let charge_share = Frac::new(complex.charge as i64, n);

    let tallies: Vec<Tally> = complex
        .sites
        .iter()
        .map(|site| {
            let mut t = Tally::new(site.ligands.len() + complex.shared.len());
            for b in &site.ligands {
                t.add(b, Frac::int(1), false);
            }
            for b in &complex.shared {
                t.add(b, share, true);
            }
            t
        })
        .collect();

    let oxidation: PerMetal<Frac> = tallies
        .iter()
        .map(|t| charge_share - t.ionic_charge)
        .collect();
    // f-block metals count the electrons beyond their f shell: three (Ln(III), An(III)), or as
    // many as the oxidation state asks (Ce(IV), U(IV)); their f electrons are reported apart
    let valence: PerMetal<i64> = complex
        .sites
        .iter()
        .zip(&oxidation)
        .map(|(s, os)| match s.element.block {
            Block::D => s.element.valence as i64,
            Block::F => {
                let os_up = -((-*os).floor());
                os_up.max(0)
            }
        })
        .collect();
    // Before any M-M bond: the count each metal gets from its ligands and its share of charge.
    let pre: PerMetal<Frac> = tallies
        .iter()
        .zip(&valence)
        .map(|(t, v)| t.neutral - charge_share + *v)
        .collect();
    let d: PerMetal<Frac> = valence
        .iter()
        .zip(&oxidation)
        .map(|(v, os)| -*os + *v)
        .collect();
    let polynuclear = complex.metal_count() >= 2;
    let hetero: PerMetal<bool> = if polynuclear {
        complex
            .sites
            .iter()
            .map(|s| {
                s.ligands
                    .iter()
                    .chain(&complex.shared)
                    .any(|b| b.ligand.traits.hetero_x)
            })
            .collect()
    } else {
        PerMetal::new()
    };
    let targets: PerMetal<u8> = complex
        .sites
        .iter()
        .zip(&tallies)
        .zip(&d)
        .enumerate()
        .map(|(i, ((s, t), d))| {
            // in a cluster only heteroatom-bridged or -ligated d8 centres stay at 16 e;
            // carbon-bridged carbonyl clusters go to 18 with M-M bonds (Co3(CO)9(μ3-CMe))
            // a ring ligand makes a half-sandwich fragment (CpRh(CO), 16 e), not a
            // square-planar complex
            let ring = s
                .ligands
                .iter()
                .chain(&complex.shared)
                .any(|b| b.mode().hapticity().is_some_and(|h| h >= 5));
            // three-coordinate d8 is a T-shaped fragment of the square plane: 16 e is its
            // aim too, and it sits 2 e short of it (Rh(PPh3)2Cl; Hartwig 2010, ch. 1)
            let planar_d8 = s.element.block == Block::D
                && !ring
                && d.as_int() == Some(8)
                && (t.sites == Frac::int(4) || t.sites == Frac::int(3))
                && (!polynuclear || hetero.get(i).copied().unwrap_or(false))
                && spin::square_planar_d8(
                    s.element.symbol,
                    s.element.group,
                    s.element.is_first_row(),
                    (-*d + valence[i]).floor(),
                    t.field(),
                );
            if planar_d8 {
                16
            } else {
                18
            }
        })
        .collect();
    let cve: Frac = pre.iter().copied().sum();
    let three_centre: u32 = complex
        .shared
        .iter()
        .filter(|b| b.mode().three_centre)
        .map(|b| b.count)
        .sum();

    let view = if polynuclear {
        let need: PerMetal<Frac> = pre
            .iter()
            .zip(&targets)
            .map(|(p, t)| Frac::int(*t as i64) - *p)
            .collect();
        let werner = is_werner(complex);
        let refusal = complex
            .sites
            .iter()
            .zip(&oxidation)
            .zip(&d)
            .zip(&targets)
            .find_map(|(((s, os), d), t)| bond_refusal(s.element, *os, *d, *t, werner));
        let mut v = cluster::metal_bonds(&need, &d, cve, refusal.is_some(), werner, three_centre);
        if let Some(why) = refusal {
            v.notes.push(format!("no M-M bonds inferred: {why}"));
        }
        v
    } else {
        ClusterView {
            bonds: Some(0),
            polyhedron: None,
            notes: Vec::new(),
        }
    };
    let bond_total = view.bonds.unwrap_or(0);
    let per_metal_bonds = bonds_per_metal(&pre, &targets, bond_total);

    let metals: Vec<MetalReport> = complex
        .sites
        .iter()
        .zip(tallies)
        .enumerate()
        .map(|(i, (site, t))| {
            metal_report(
                site.element,
                valence[i],
                t,
                pre[i],
                oxidation[i],
                d[i],
                targets[i],
                per_metal_bonds[i],
                charge_share,
            )
        })
        .collect();

    let mut metals = metals;
    // an odd count in a classical coordination complex is a paramagnetic ion, not a reactive
    // radical ([Co(NH3)6]2+, 19 e, is a stable salt; common practice)
    if is_werner(complex) {
        for m in &mut metals {
            for n in &mut m.notes {
                if n == "odd electron count: a radical" {
                    *n = "odd electron count: paramagnetic, as Werner complexes of σ-donor \
                          ligands often are; not a reactive radical"
                        .into();
                }
            }
        }
    }
    if view.bonds.is_none() {
        // a delocalized cluster: per-metal counts say little, the cluster count says it all
        for m in &mut metals {
            m.saturation = Saturation::NotApplicable;
            m.electrons_short = Frac::ZERO;
            m.open_sites = 0;
            m.notes.push(
                "delocalized cluster: judge it by the cluster valence electron count, not per metal"
                    .into(),
            );
        }
    }
    let mut notes = complex.notes.clone();
    notes.extend(view.notes.iter().cloned());
    let (hazards, cautions) = collect_cautions(complex);
    if complex.metal_count() >= 2 && bond_total > 0 && carbonyl_may_bridge(complex) {
        notes.push(
            "where CO bridges the metals (as in Fe2(CO)9 and solid Co2(CO)8) bonding analyses find \
             little or no direct M-M bond (Green, Green & Parkin, Chem. Commun. 2012, 48, 11481); \
             the count given is the conventional one"
                .into(),
        );
    }
    if three_centre > 0 {
        notes.push(format!(
            "{three_centre} M-H-M bridge(s) counted as 3c-2e bonds; each stands in for one M-M bond"
        ));
    }

    let (geometry, unpaired, ambiguous, basis) =
        spin_of(complex, &metals, cve, bond_total, view.polyhedron.is_some());
    let moments = unpaired
        .iter()
        .map(|&u| (spin::spin_only_moment(u) * 100.0).round() / 100.0)
        .collect();
    Report {
        formula: complex.formula(false),
        charge: complex.charge,
        composition: complex.composition(),
        metals,
        metal_metal_bonds: view.bonds.map(|b| b.saturating_sub(three_centre.min(b))),
        cluster_valence_electrons: cve,
        polyhedron: view.polyhedron.map(|p| p.name),
        geometry,
        unpaired_electrons: unpaired,
        spin_only_moment_bm: moments,
        spin_ambiguous: ambiguous,
        spin_basis: basis,
        hazards,
        cautions,
        notes,
    }
}

/// Whether CO is written as a bridge, cannot be shared evenly (Fe2(CO)9), or sits on first-row
/// group 8-9 metals, whose carbonyl dimers and clusters bridge (Co2(CO)8, [CpFe(CO)2]2).
fn carbonyl_may_bridge(complex: &Complex) -> bool {
    let first_row_8_9 = complex
        .sites
        .iter()
        .any(|s| s.element.is_first_row() && (8..=9).contains(&s.element.group));
    complex
        .all_ligands()
        .any(|(_, b)| b.ligand.key == "CO" && (b.mode().bridges > 1 || first_row_8_9))
}

impl Report {
    /// Why these numbers describe no real complex, if they do not: a d-block metal stripped
    /// of more electrons than its group holds (TiCl6 would be d-2), or given more than its d10
    /// shell can take ([Fe(CO)5]4- would be d12). Beyond d10 an electron has to go into the s
    /// orbital, which only a bond to another metal makes use of: d10s1 metals pair up in
    /// Hg2Cl2 and Cp*Zn-ZnCp*, and carbonyl cluster anions such as the Chini platinum clusters
    /// sit a fraction of an electron above d10. So a polynuclear complex may go one electron
    /// past d10 per metal; a metal on its own may not.
    pub fn impossible(&self) -> Option<String> {
        let polynuclear = self.metals.len() > 1;
        self.metals.iter().find_map(|m| {
            impossible_metal(
                m.symbol,
                m.group?,
                m.valence_electrons,
                m.oxidation_state,
                m.d_electrons,
                polynuclear,
            )
        })
    }
}

/// `count(complex).impossible()` without the rest of the count: only each metal's oxidation
/// state and d count, for callers that want no more than the formula and the charge
/// (`count --fields input,formula,charge`). Agrees with the full count on every complex (a
/// test checks it over the paste corpus and the fuzz seeds).
pub fn impossible(complex: &Complex) -> Option<String> {
    let n = complex.metal_count().max(1) as i64;
    let share = Frac::new(1, n);
    let charge_share = Frac::new(complex.charge as i64, n);
    let polynuclear = complex.sites.len() > 1;
    complex.sites.iter().find_map(|site| {
        if site.element.block != Block::D {
            return None;
        }
        // the ionic charges the ligands take away, as `Tally::add` sums them
        let mut taken = Frac::ZERO;
        for (b, part) in site
            .ligands
            .iter()
            .map(|b| (b, Frac::int(1)))
            .chain(complex.shared.iter().map(|b| (b, share)))
        {
            taken += part * b.count as i64 * b.mode().ionic_charge as i64;
        }
        let os = charge_share - taken;
        let valence = site.element.valence as i64;
        impossible_metal(
            site.element.symbol,
            site.element.group,
            site.element.valence,
            os,
            -os + valence,
            polynuclear,
        )
    })
}

/// Why a d-block metal at oxidation state `os` with `d` d electrons is no real complex, if it
/// is not (see `Report::impossible`).
fn impossible_metal(
    symbol: &str,
    group: u8,
    valence: u8,
    os: Frac,
    d: Frac,
    polynuclear: bool,
) -> Option<String> {
    let most = Frac::int(if polynuclear { 11 } else { 10 });
    if d < Frac::ZERO {
        Some(format!(
            "{symbol} would be {:+} with d{d}: a group-{group} metal has only {valence} \
             electrons to give; check the charge and the ligands",
            os.to_f64(),
        ))
    } else if d > most {
        let limit = if polynuclear {
            "a d shell holds 10 electrons, and a metal-metal bond takes at most one more per \
             metal"
        } else {
            "a d shell holds 10 electrons, and a metal with no metal partner has no use for more"
        };
        Some(format!(
            "{symbol} would be {os} with d{d}: {limit}; check the charge (too negative?) and the \
             ligands"
        ))
    } else {
        None
    }
}

/// Spread `total` M-M bonds over the metals: exactly where each metal's shortfall says how many
/// it makes, evenly otherwise.
fn bonds_per_metal(pre: &[Frac], targets: &[u8], total: u32) -> PerMetal<Frac> {
    let n = pre.len() as i64;
    if total == 0 || n < 2 {
        return smallvec::smallvec![Frac::ZERO; pre.len()];
    }
    let need: PerMetal<Frac> = pre
        .iter()
        .zip(targets)
        .map(|(p, t)| Frac::int(*t as i64) - *p)
        .collect();
    let sum: Frac = need.iter().copied().sum();
    let max = if n == 2 { 4 } else { n - 1 };
    let exact = sum == Frac::int(2 * total as i64)
        && need
            .iter()
            .all(|x| x.is_integer() && *x >= Frac::ZERO && *x <= Frac::int(max));
    if exact {
        need
    } else {
        smallvec::smallvec![Frac::new(2 * total as i64, n); pre.len()]
    }
}

#[allow(clippy::too_many_arguments)]
fn metal_report(
    element: &'static super::element::Element,
    valence: i64,
    t: Tally<'_>,
    pre: Frac,
    os: Frac,
    d: Frac,
    target: u8,
    bonds: Frac,
    charge_share: Frac,
) -> MetalReport {
    let count = pre + bonds;
    let ionic_count = d + t.ionic + bonds;
    let (l, x, z) = (t.l, t.x + bonds, t.z);
    let raw = class_text(element.symbol, l, x, z, charge_share);
    let (el, ex, ez, q_left) = equivalent_neutral(l, x, z, charge_share);
    let enc = class_text(element.symbol, el, ex, ez, q_left);
    let vn = ex + ez * 2;
    let lbn = el + ex + ez;
    let cbc_count = el * 2 + ex - q_left + valence;
    let mut notes = Vec::new();
    let (saturation, short, open) = if element.block == Block::F {
        notes.push("f-block metal: the 18-electron rule does not apply".into());
        (Saturation::NotApplicable, Frac::ZERO, 0)
    } else if count == Frac::int(target as i64) {
        (Saturation::Saturated, Frac::ZERO, 0)
    } else if count < Frac::int(target as i64) {
        let short = Frac::int(target as i64) - count;
        (Saturation::Unsaturated, short, (short / 2).floor())
    } else if count > Frac::int(18) {
        notes.push(
            "electrons beyond 18 go into M-L antibonding orbitals: expect easy oxidation or \
             ligand loss"
                .into(),
        );
        (Saturation::Above18, Frac::ZERO, 0)
    } else {
        (Saturation::Saturated, Frac::ZERO, 0)
    };
    if target == 16 && t.sites == Frac::int(3) {
        notes.push(
            "three-coordinate d8: a T-shaped fragment of a square plane, 2 e short of 16; it \
             takes a fourth ligand readily"
                .into(),
        );
    } else if target == 16 {
        notes.push(
            "square-planar d8 is stable at 16 e; it can still add a ligand or an \
             oxidant to reach 18 e"
                .into(),
        );
    }
    if saturation == Saturation::Unsaturated {
        if d == Frac::ZERO && !t.pi_donor.is_empty() {
            notes.push(format!(
                "d0 metal with π-donor ligands ({}): their lone pairs can add electrons the σ count \
                 leaves out, so the count is ambiguous",
                t.pi_donor.join(", ")
            ));
        } else if element.group <= 5 {
            notes.push("early transition metals are often stable below 18 e".into());
        }
        if let Some((key, angle)) = t
            .bulky
            .iter()
            .max_by(|a, b| a.1.partial_cmp(&b.1).unwrap_or(std::cmp::Ordering::Equal))
        {
            notes.push(format!(
                "bulky ligand {key} (cone angle {angle:.0}°) keeps the metal at a low count and \
                 coordination number"
            ));
        }
    }
    if element.group >= 11 && element.block == Block::D && d == Frac::int(10) {
        notes.push(
            "d10 metals of groups 11-12 often sit below 18 e (linear 14 e, trigonal 16 e)".into(),
        );
    }
    if let Some(c) = count.as_int() {
        if c % 2 != 0 && element.block == Block::D {
            notes.push("odd electron count: a radical".into());
        }
    }
    MetalReport {
        symbol: element.symbol,
        group: (element.block == Block::D).then_some(element.group),
        valence_electrons: valence as u8,
        f_electrons: (element.block == Block::F).then(|| -os + element.valence as i64),
        electron_count: count,
        ionic_electron_count: ionic_count,
        oxidation_state: os,
        d_electrons: d,
        coordination_number: t.sites,
        donor_atoms: t.donors,
        cbc_class: raw,
        equivalent_neutral_class: enc,
        valence_number: vn,
        ligand_bond_number: lbn,
        cbc_d_electrons: -vn - q_left + valence,
        cbc_electron_count: cbc_count,
        saturation,
        target,
        electrons_short: short,
        open_sites: open,
        metal_metal_bonds: bonds,
        polyhedron: None,
        isomer: None,
        stereoisomers: None,
        charge_share,
        contributions: t.contributions,
        notes,
    }
}

/// Green's equivalent neutral class: move each unit of charge onto a ligand (cation: L -> X,
/// else X -> Z; anion: X -> L, else Z -> X), then rewrite each LZ pair as X2. Charge that
/// cannot move stays on the metal. Fractions (shared ligands) are left as they are.
fn equivalent_neutral(l: Frac, x: Frac, z: Frac, q: Frac) -> (Frac, Frac, Frac, Frac) {
    let (Some(mut l), Some(mut x), Some(mut z), Some(mut q)) =
        (l.as_int(), x.as_int(), z.as_int(), q.as_int())
    else {
        return (l, x, z, q);
    };
    while q > 0 {
        if l > 0 {
            l -= 1;
            x += 1;
        } else if x > 0 {
            x -= 1;
            z += 1;
        } else {
            break;
        }
        q -= 1;
    }
    while q < 0 {
        if x > 0 {
            x -= 1;
            l += 1;
        } else if z > 0 {
            z -= 1;
            x += 1;
        } else {
            break;
        }
        q += 1;
    }
    let lz = l.min(z);
    (
        Frac::int(l - lz),
        Frac::int(x + 2 * lz),
        Frac::int(z - lz),
        Frac::int(q),
    )
}

fn class_text(symbol: &str, l: Frac, x: Frac, z: Frac, q: Frac) -> String {
    let mut s = String::with_capacity(16);
    s.push('[');
    s.push_str(symbol);
    for (letter, n) in [('L', l), ('X', x), ('Z', z)] {
        if n == Frac::ZERO {
            continue;
        }
        s.push(letter);
        if n != Frac::int(1) {
            n.push_to(&mut s);
        }
    }
    s.push(']');
    match q.as_int() {
        Some(c) => push_charge(&mut s, c),
        None => {
            s.push('(');
            q.push_to(&mut s);
            s.push(')');
        }
    }
    s
}

type SpinSummary = (&'static str, Vec<u8>, bool, Basis);

fn spin_of(
    complex: &Complex,
    metals: &[MetalReport],
    cve: Frac,
    bonds: u32,
    polyhedron: bool,
) -> SpinSummary {
    if complex.metal_count() >= 2 {
        let bonded = bonds > 0 || polyhedron;
        if bonded || metals.iter().all(|m| m.saturation == Saturation::Saturated) {
            let odd = cve.as_int().map(|c| c % 2 != 0);
            let unpaired = match odd {
                Some(true) => vec![1],
                Some(false) => vec![0],
                None => Vec::new(),
            };
            let why = if bonded {
                "metal-metal bonded: from the parity of the cluster count"
            } else {
                "every metal saturated: from the parity of the cluster count"
            };
            return ("polynuclear", unpaired, false, Basis(why, None));
        }
        let mut total = 0u8;
        for (site, m) in complex.sites.iter().zip(metals) {
            let g = centre_guess(complex, site_index(complex, site), m);
            total = total.saturating_add(g.unpaired.first().copied().unwrap_or(0));
        }
        return (
            "polynuclear",
            vec![total],
            true,
            Basis(
                "metals without M-M bonds: sum of the centres, ignoring magnetic coupling",
                None,
            ),
        );
    }
    let Some(m) = metals.first() else {
        return ("unknown", Vec::new(), false, Basis("no metal", None));
    };
    let g = centre_guess(complex, 0, m);
    (g.geometry, g.unpaired, g.ambiguous, g.basis)
}

fn site_index(complex: &Complex, site: &super::complex::MetalSite) -> usize {
    complex
        .sites
        .iter()
        .position(|s| std::ptr::eq(s, site))
        .unwrap_or(0)
}

fn centre_guess(complex: &Complex, i: usize, m: &MetalReport) -> SpinGuess {
    let Some(site) = complex.sites.get(i) else {
        return spin::guess(&SpinInput {
            d: -1,
            electrons: -1,
            symbol: m.symbol,
            group: m.group.unwrap_or(0),
            oxidation_state: 0,
            first_row: false,
            f_block: false,
            sites: 0,
            rings: 0,
            field: 1.0,
            planar_ligand: false,
            pi_acceptor: false,
            multiple_bond: false,
        });
    };
    let mut rings = 0;
    let mut planar_ligand = false;
    let mut pi_acceptor = false;
    let mut multiple_bond = false;
    let mut field_sum = 0.0;
    let mut weight = 0.0;
    for b in site.ligands.iter().chain(&complex.shared) {
        let mode = b.mode();
        if mode.hapticity().is_some_and(|h| h >= 5) {
            rings += b.count;
        }
        planar_ligand |= b.ligand.traits.macrocycle && mode.sites == 4;
        pi_acceptor |= b.ligand.traits.pi_acceptor;
        multiple_bond |= b.ligand.traits.multiple_bond;
        if let Some(f) = b.ligand.field {
            let w = (b.count as f64) * mode.sites as f64;
            field_sum += f.score() * w;
            weight += w;
        }
    }
    let d = m.d_electrons.as_int().unwrap_or(-1);
    spin::guess(&SpinInput {
        d,
        electrons: m.electron_count.as_int().unwrap_or(-1),
        symbol: m.symbol,
        group: m.group.unwrap_or(0),
        oxidation_state: m.oxidation_state.as_int().unwrap_or(0),
        first_row: site.element.is_first_row(),
        f_block: site.element.block == Block::F,
        sites: m.coordination_number.as_int().unwrap_or(0),
        rings,
        field: if weight > 0.0 {
            field_sum / weight
        } else {
            1.0
        },
        planar_ligand,
        pi_acceptor,
        multiple_bond,
    })
}

/// GHS hazards of the free ligands, and the general cautions for metal carbonyls and alkyls.
fn collect_cautions(complex: &Complex) -> (Vec<Hazard>, Vec<Caution>) {
    let mut hazards: Vec<Hazard> = Vec::new();
    let mut carbonyl = false;
    let mut alkyl = false;
    for (_, b) in complex.all_ligands() {
        let l = &b.ligand;
        carbonyl |= l.key == "CO";
        alkyl |= l.family == "alkyl";
        if !l.hazards.is_empty() && !hazards.iter().any(|h| h.0.key == l.key) {
            hazards.push(Hazard(l.clone()));
        }
    }
    let mut cautions = Vec::new();
    if carbonyl {
        cautions.push(Caution::MetalCarbonyl);
    }
    if alkyl {
        cautions.push(Caution::MetalAlkyl);
    }
    if !hazards.is_empty() || !cautions.is_empty() {
        cautions.push(Caution::ConsultSds);
    }
    (hazards, cautions)
}

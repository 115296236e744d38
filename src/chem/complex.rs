//! A complex as nonet holds it: metal sites with their own ligands, ligands shared between the
//! metals, and the overall charge.

use std::sync::Arc;

use super::element::{is_symbol_shaped, Element};
use super::frac::push_int;
use super::ligand::{ascii_label, BindingMode, LigandDef};
use super::molecule::Composition;

/// A ligand group bound in one mode, `count` times.
#[derive(Debug, Clone)]
pub struct BoundLigand {
    pub ligand: Arc<LigandDef>,
    pub mode: usize,
    pub count: u32,
    /// The mode was written in the formula, so nonet must not choose another.
    pub pinned: bool,
}

impl BoundLigand {
    pub fn new(ligand: Arc<LigandDef>, mode: usize, count: u32) -> BoundLigand {
        BoundLigand {
            ligand,
            mode,
            count,
            pinned: false,
        }
    }

    pub fn mode(&self) -> &BindingMode {
        // `mode` is checked against the definition whenever a BoundLigand is built by the parser;
        // fall back to the default mode rather than panic on a hand-built value.
        self.ligand
            .modes
            .get(self.mode)
            .unwrap_or(&self.ligand.modes[0])
    }

    pub(crate) fn same_kind(&self, other: &BoundLigand) -> bool {
        self.ligand.key == other.ligand.key && self.mode == other.mode
    }

    /// Ordering used by the canonical form: π ligands by falling hapticity, then L, X, Z donors,
    /// then bridges; ties by key.
    fn rank(&self) -> (u8, i16, &str, usize) {
        let m = self.mode();
        let group = if m.bridges > 1 {
            5
        } else if let Some(h) = m.hapticity() {
            return (0, -(h as i16), &self.ligand.key, self.mode);
        } else if m.class.x == 0 && m.class.z == 0 {
            1
        } else if m.class.x > 0 {
            2
        } else {
            3
        };
        (group, 0, &self.ligand.key, self.mode)
    }

    /// Whether the mode label is written in the canonical form.
    fn shows_label(&self) -> bool {
        let m = self.mode();
        let terminal_modes = self.ligand.modes.iter().filter(|m| m.bridges == 1).count();
        self.mode != 0
            || m.hapticity().is_some()
            || m.bridges > 1
            || terminal_modes > 1
            || (self.ligand.derived && m.sites > 1)
    }

    /// Single-atom X or L ligands in their default mode (Cl, H, O) print without parentheses,
    /// as chemists write them, unless the previous group also did (N then O would read as NO).
    fn write(&self, out: &mut String, ascii: bool, prev_bare: &mut bool) {
        let bare = !*prev_bare && !self.shows_label() && is_symbol_shaped(&self.ligand.key);
        *prev_bare = bare;
        if bare {
            out.push_str(&self.ligand.key);
            if self.count != 1 {
                push_int(out, self.count as i64);
            }
            return;
        }
        out.push('(');
        if self.shows_label() {
            let label = &self.mode().label;
            if ascii {
                out.push_str(&ascii_label(label));
            } else {
                out.push_str(label);
            }
            out.push('-');
        }
        out.push_str(&self.ligand.key);
        out.push(')');
        if self.count != 1 {
            push_int(out, self.count as i64);
        }
    }
}

impl PartialEq for BoundLigand {
    fn eq(&self, other: &BoundLigand) -> bool {
        self.same_kind(other) && self.count == other.count
    }
}

/// One metal atom and the ligands that belong to it alone.
#[derive(Debug, Clone, PartialEq)]
pub struct MetalSite {
    pub element: &'static Element,
    pub ligands: Vec<BoundLigand>,
}

/// A whole complex.
#[derive(Debug, Clone)]
pub struct Complex {
    pub sites: Vec<MetalSite>,
    /// Ligands spread evenly over all metals (bridges, and ligands written outside any
    /// single-metal fragment).
    pub shared: Vec<BoundLigand>,
    pub charge: i32,
    /// What reading the formula decided on the chemist's behalf (counter-ions set aside, modes
    /// chosen); not part of the complex's identity.
    pub notes: Vec<String>,
    /// Isomer or configuration prefixes as written ("cis", "rac", "(R,R)", "Δ"): printed in
    /// front of the formula, not part of the count. A step or edit clears them, since it may
    /// change what they describe.
    pub stereo: Option<String>,
}

impl PartialEq for Complex {
    fn eq(&self, other: &Complex) -> bool {
        self.sites == other.sites && self.shared == other.shared && self.charge == other.charge
    }
}

impl Complex {
    pub fn metal_count(&self) -> usize {
        self.sites.len()
    }

    /// Every ligand group with the metal it belongs to (None for shared ones).
    pub fn all_ligands(&self) -> impl Iterator<Item = (Option<usize>, &BoundLigand)> {
        self.sites
            .iter()
            .enumerate()
            .flat_map(|(i, s)| s.ligands.iter().map(move |b| (Some(i), b)))
            .chain(self.shared.iter().map(|b| (None, b)))
    }

    /// Element counts of the whole complex (metals and every ligand), when every ligand has a
    /// known structure; counter-ions and lattice solvent are not part of it.
    pub fn composition(&self) -> Option<Composition> {
        let mut c = Composition::with_capacity(8);
        for s in &self.sites {
            c.add(s.element.number, 1);
        }
        for (_, b) in self.all_ligands() {
            c.add_all(b.ligand.composition()?, b.count);
        }
        Some(c)
    }

    /// Merge repeated groups and put everything in canonical order; a mononuclear complex keeps
    /// all its ligands on its one site.
    pub fn canonicalize(&mut self) {
        if self.sites.len() == 1 {
            let shared = std::mem::take(&mut self.shared);
            self.sites[0].ligands.extend(shared);
        }
        for site in &mut self.sites {
            tidy(&mut site.ligands);
        }
        tidy(&mut self.shared);
    }

    /// The canonical formula: `[Fe(η5-Cp)(CO)2(Me)]`, `[Mn2(CO)10]`, `[[Fe(η5-Cp)(CO)2]2]`.
    pub fn formula(&self, ascii: bool) -> String {
        let mut out = String::with_capacity(64);
        if let Some(s) = &self.stereo {
            out.push_str(s);
            out.push('-');
        }
        out.push('[');
        let fragments = self.sites.len() > 1 && self.sites.iter().any(|s| !s.ligands.is_empty());
        if fragments {
            let mut i = 0;
            while i < self.sites.len() {
                let mut j = i + 1;
                while j < self.sites.len() && self.sites[j] == self.sites[i] {
                    j += 1;
                }
                out.push('[');
                out.push_str(self.sites[i].element.symbol);
                let mut bare = false;
                for b in &self.sites[i].ligands {
                    b.write(&mut out, ascii, &mut bare);
                }
                out.push(']');
                if j - i > 1 {
                    push_int(&mut out, (j - i) as i64);
                }
                i = j;
            }
        } else {
            let mut i = 0;
            while i < self.sites.len() {
                let sym = self.sites[i].element.symbol;
                let mut j = i + 1;
                while j < self.sites.len() && self.sites[j].element.symbol == sym {
                    j += 1;
                }
                out.push_str(sym);
                if j - i > 1 {
                    push_int(&mut out, (j - i) as i64);
                }
                i = j;
            }
            let mut bare = false;
            for site in &self.sites {
                for b in &site.ligands {
                    b.write(&mut out, ascii, &mut bare);
                }
            }
        }
        let mut bare = false;
        for b in &self.shared {
            b.write(&mut out, ascii, &mut bare);
        }
        out.push(']');
        push_charge(&mut out, self.charge as i64);
        out
    }
}

/// "", "+", "2-", ... as written after a closing bracket.
pub fn charge_text(charge: i32) -> String {
    let mut s = String::new();
    push_charge(&mut s, charge as i64);
    s
}

/// Append "", "+", "2-", ... without the formatting machinery (this runs for every count).
pub fn push_charge(s: &mut String, c: i64) {
    if c == 0 {
        return;
    }
    if c.abs() != 1 {
        push_int(s, c.abs());
    }
    s.push(if c > 0 { '+' } else { '-' });
}

fn tidy(list: &mut Vec<BoundLigand>) {
    let mut i = 0;
    while i < list.len() {
        if let Some(j) = list[..i].iter().position(|m| m.same_kind(&list[i])) {
            let extra = list[i].count;
            list[j].count = list[j].count.saturating_add(extra);
            list.remove(i);
        } else {
            i += 1;
        }
    }
    list.retain(|b| b.count > 0);
    list.sort_by(|a, b| a.rank().cmp(&b.rank()));
}

//! A complex as nonet holds it: metal sites with their own ligands, ligands shared between the
//! metals, and the overall charge.

use std::sync::Arc;

use super::element::Element;
use super::ligand::{ascii_label, BindingMode, LigandDef};

/// A ligand group bound in one mode, `count` times.
#[derive(Debug, Clone)]
pub struct BoundLigand {
    pub ligand: Arc<LigandDef>,
    pub mode: usize,
    pub count: u32,
}

impl BoundLigand {
    pub fn new(ligand: Arc<LigandDef>, mode: usize, count: u32) -> BoundLigand {
        BoundLigand {
            ligand,
            mode,
            count,
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

    fn same_kind(&self, other: &BoundLigand) -> bool {
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
        self.mode != 0 || m.hapticity().is_some() || m.bridges > 1
    }

    fn write(&self, out: &mut String, ascii: bool) {
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
            out.push_str(&self.count.to_string());
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
#[derive(Debug, Clone, PartialEq)]
pub struct Complex {
    pub sites: Vec<MetalSite>,
    /// Ligands spread evenly over all metals (bridges, and ligands written outside any
    /// single-metal fragment).
    pub shared: Vec<BoundLigand>,
    pub charge: i32,
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
        let mut out = String::from("[");
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
                for b in &self.sites[i].ligands {
                    b.write(&mut out, ascii);
                }
                out.push(']');
                if j - i > 1 {
                    out.push_str(&(j - i).to_string());
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
                    out.push_str(&(j - i).to_string());
                }
                i = j;
            }
            for site in &self.sites {
                for b in &site.ligands {
                    b.write(&mut out, ascii);
                }
            }
        }
        for b in &self.shared {
            b.write(&mut out, ascii);
        }
        out.push(']');
        out.push_str(&charge_text(self.charge));
        out
    }
}

/// "", "+", "2-", ... as written after a closing bracket.
pub fn charge_text(charge: i32) -> String {
    match charge {
        0 => String::new(),
        1 => "+".into(),
        -1 => "-".into(),
        c if c > 0 => format!("{c}+"),
        c => format!("{}-", -c),
    }
}

fn tidy(list: &mut Vec<BoundLigand>) {
    let mut merged: Vec<BoundLigand> = Vec::with_capacity(list.len());
    for b in list.drain(..) {
        match merged.iter_mut().find(|m| m.same_kind(&b)) {
            Some(m) => m.count = m.count.saturating_add(b.count),
            None => merged.push(b),
        }
    }
    merged.retain(|b| b.count > 0);
    merged.sort_by(|a, b| a.rank().cmp(&b.rank()));
    *list = merged;
}

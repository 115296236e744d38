//! A hand-written JSON writer for count reports.
//!
//! serde_json escapes every key of every object; with forty-odd keys per metal that cost most
//! of the time of `count --batch`. Keys here are literals known to need no escaping; values are
//! escaped. A test checks that the output equals serde's rendering of the same report.

use std::fmt::Write as _;

use crate::chem::count::{Contribution, MetalReport, Report};
use crate::chem::Frac;

/// Appends JSON to a byte buffer.
pub struct Json<'a> {
    buf: &'a mut Vec<u8>,
    first: bool,
    /// Only these keys are written (`count --fields`); None: all.
    keep: Option<&'a [String]>,
}

impl<'a> Json<'a> {
    /// Start an object (the caller has written nothing yet).
    pub fn object(buf: &'a mut Vec<u8>) -> Json<'a> {
        buf.push(b'{');
        Json {
            buf,
            first: true,
            keep: None,
        }
    }

    /// Continue an object already opened, with fields written before.
    pub fn resume(buf: &'a mut Vec<u8>) -> Json<'a> {
        Json {
            buf,
            first: false,
            keep: None,
        }
    }

    /// Write only the keys in `keep` from here on.
    pub fn only(mut self, keep: Option<&'a [String]>) -> Json<'a> {
        self.keep = keep;
        self
    }

    /// Whether `k` is written.
    #[inline(always)]
    fn wants(&self, k: &str) -> bool {
        self.keep.is_none_or(|f| f.iter().any(|x| x == k))
    }

    pub fn end(self) {
        self.buf.push(b'}');
    }

    /// Write `,"k":` (no comma before the first field). Keys are plain identifiers.
    #[inline(always)]
    fn key(&mut self, k: &str) {
        let b = k.as_bytes();
        self.buf.reserve(b.len() + 4);
        if !self.first {
            self.buf.push(b',');
        }
        self.first = false;
        self.buf.push(b'"');
        self.buf.extend_from_slice(b);
        self.buf.push(b'"');
        self.buf.push(b':');
    }

    #[inline(always)]
    pub fn str(&mut self, k: &str, v: &str) {
        if !self.wants(k) {
            return;
        }
        self.key(k);
        string(self.buf, v);
    }

    #[inline(always)]
    pub fn int(&mut self, k: &str, v: i64) {
        if !self.wants(k) {
            return;
        }
        self.key(k);
        int(self.buf, v);
    }

    #[inline(always)]
    pub fn frac(&mut self, k: &str, v: Frac) {
        if !self.wants(k) {
            return;
        }
        self.key(k);
        frac(self.buf, v);
    }

    #[inline(always)]
    pub fn bool(&mut self, k: &str, v: bool) {
        if !self.wants(k) {
            return;
        }
        self.key(k);
        self.buf
            .extend_from_slice(if v { b"true" } else { b"false" });
    }

    #[inline(always)]
    pub fn null(&mut self, k: &str) {
        if !self.wants(k) {
            return;
        }
        self.key(k);
        self.buf.extend_from_slice(b"null");
    }

    #[inline(always)]
    pub fn strs<'s>(&mut self, k: &str, v: impl IntoIterator<Item = &'s str>) {
        if !self.wants(k) {
            return;
        }
        self.key(k);
        self.buf.push(b'[');
        for (i, s) in v.into_iter().enumerate() {
            if i > 0 {
                self.buf.push(b',');
            }
            string(self.buf, s);
        }
        self.buf.push(b']');
    }

    /// A nested array whose items the closure writes, one call per item.
    pub fn array<T>(&mut self, k: &str, items: &[T], mut each: impl FnMut(&mut Vec<u8>, &T)) {
        if !self.wants(k) {
            return;
        }
        self.key(k);
        self.buf.push(b'[');
        for (i, item) in items.iter().enumerate() {
            if i > 0 {
                self.buf.push(b',');
            }
            each(self.buf, item);
        }
        self.buf.push(b']');
    }
}

fn int(buf: &mut Vec<u8>, v: i64) {
    let mut digits = [0u8; 21];
    buf.extend_from_slice(crate::chem::frac::int_digits(v, &mut digits));
}

/// Whole numbers as integers, others as floats rounded to four decimals (as `Frac`'s serde form).
fn frac(buf: &mut Vec<u8>, v: Frac) {
    match v.as_int() {
        Some(n) => int(buf, n),
        None => float(buf, (v.to_f64() * 1e4).round() / 1e4),
    }
}

fn float(buf: &mut Vec<u8>, v: f64) {
    if v.is_finite() {
        let mut s = String::new();
        // serde_json prints f64 with ryu; `{:?}` gives the same shortest round-trip form
        let _ = write!(s, "{v:?}");
        buf.extend_from_slice(s.as_bytes());
    } else {
        buf.extend_from_slice(b"null");
    }
}

/// A JSON string; plain text (the usual case) is copied without per-byte work beyond a scan.
pub fn string(buf: &mut Vec<u8>, s: &str) {
    buf.push(b'"');
    if s.bytes().all(|b| b >= 0x20 && b != b'"' && b != b'\\') {
        buf.extend_from_slice(s.as_bytes());
    } else {
        for c in s.chars() {
            match c {
                '"' => buf.extend_from_slice(b"\\\""),
                '\\' => buf.extend_from_slice(b"\\\\"),
                '\n' => buf.extend_from_slice(b"\\n"),
                '\r' => buf.extend_from_slice(b"\\r"),
                '\t' => buf.extend_from_slice(b"\\t"),
                '\u{08}' => buf.extend_from_slice(b"\\b"),
                '\u{0c}' => buf.extend_from_slice(b"\\f"),
                c if (c as u32) < 0x20 => {
                    let _ = std::io::Write::write_fmt(buf, format_args!("\\u{:04x}", c as u32));
                }
                c => {
                    let mut b = [0u8; 4];
                    buf.extend_from_slice(c.encode_utf8(&mut b).as_bytes());
                }
            }
        }
    }
    buf.push(b'"');
}

fn contribution(buf: &mut Vec<u8>, c: &Contribution) {
    let m = c.mode();
    let class = m.class_text();
    let mut o = Json::object(buf);
    o.str("ligand", &c.ligand.key);
    o.str("mode", &m.label);
    o.str("class", class);
    o.frac("count", c.count);
    o.frac("neutral", c.neutral);
    o.frac("ionic", c.ionic);
    o.frac("ionic_charge", c.ionic_charge);
    o.bool("shared", c.shared);
    match &c.positions {
        Some(p) => o.array("positions", p, |b, copy| {
            b.push(b'[');
            for (i, &x) in copy.iter().enumerate() {
                if i > 0 {
                    b.push(b',');
                }
                int(b, x as i64);
            }
            b.push(b']');
        }),
        None => o.null("positions"),
    }
    o.end();
}

fn metal(buf: &mut Vec<u8>, m: &MetalReport) {
    let mut o = Json::object(buf);
    o.str("symbol", m.symbol);
    match m.group {
        Some(g) => o.int("group", g as i64),
        None => o.null("group"),
    }
    o.int("valence_electrons", m.valence_electrons as i64);
    match m.f_electrons {
        Some(f) => o.frac("f_electrons", f),
        None => o.null("f_electrons"),
    }
    o.frac("electron_count", m.electron_count);
    o.frac("ionic_electron_count", m.ionic_electron_count);
    o.frac("oxidation_state", m.oxidation_state);
    o.frac("d_electrons", m.d_electrons);
    o.frac("coordination_number", m.coordination_number);
    o.frac("donor_atoms", m.donor_atoms);
    o.str("cbc_class", &m.cbc_class);
    o.str("equivalent_neutral_class", &m.equivalent_neutral_class);
    o.frac("valence_number", m.valence_number);
    o.frac("ligand_bond_number", m.ligand_bond_number);
    o.frac("cbc_d_electrons", m.cbc_d_electrons);
    o.str("saturation", m.saturation.code());
    o.int("target", m.target as i64);
    o.frac("electrons_short", m.electrons_short);
    o.int("open_sites", m.open_sites);
    o.frac("metal_metal_bonds", m.metal_metal_bonds);
    match m.polyhedron {
        Some(p) => o.str("polyhedron", p),
        None => o.null("polyhedron"),
    }
    match &m.isomer {
        Some(i) => o.str("isomer", i),
        None => o.null("isomer"),
    }
    match m.stereoisomers {
        Some(n) => o.int("stereoisomers", n as i64),
        None => o.null("stereoisomers"),
    }
    o.array("contributions", &m.contributions, contribution);
    o.strs("notes", m.notes.iter().map(String::as_str));
    o.end();
}

/// The report's fields, continuing an object whose first fields the caller wrote.
pub fn report_fields(buf: &mut Vec<u8>, r: &Report) {
    report_fields_only(buf, r, None, false);
}

/// The report's fields named in `keep` (all when None); `first`: nothing written before them
/// in the object.
pub fn report_fields_only(buf: &mut Vec<u8>, r: &Report, keep: Option<&[String]>, first: bool) {
    let mut o = Json::resume(buf).only(keep);
    o.first = first;
    o.str("formula", &r.formula);
    o.int("charge", r.charge as i64);
    if o.wants("composition") {
        match &r.composition {
            Some(c) => o.str("composition", &c.to_string()),
            None => o.null("composition"),
        }
    }
    o.array("metals", &r.metals, metal);
    match r.metal_metal_bonds {
        Some(b) => o.int("metal_metal_bonds", b as i64),
        None => o.null("metal_metal_bonds"),
    }
    o.frac("cluster_valence_electrons", r.cluster_valence_electrons);
    match r.polyhedron {
        Some(p) => o.str("polyhedron", p),
        None => o.null("polyhedron"),
    }
    o.str("geometry", r.geometry);
    o.array("unpaired_electrons", &r.unpaired_electrons, |b, &n| {
        int(b, n as i64)
    });
    o.array("spin_only_moment_bm", &r.spin_only_moment_bm, |b, &x| {
        float(b, x)
    });
    o.bool("spin_ambiguous", r.spin_ambiguous);
    match r.spin_basis.1 {
        None => o.str("spin_basis", r.spin_basis.0),
        Some(_) if !o.wants("spin_basis") => {}
        Some(regime) => {
            let mut basis = String::with_capacity(r.spin_basis.0.len() + regime.len() + 2);
            basis.push_str(r.spin_basis.0);
            basis.push_str("; ");
            basis.push_str(regime);
            o.str("spin_basis", &basis);
        }
    }
    o.array("hazards", &r.hazards, |b, h| {
        let mut h_o = Json::object(b);
        h_o.str("ligand", &h.0.key);
        h_o.strs("ghs", h.0.hazards.iter().map(String::as_str));
        h_o.end();
    });
    o.strs("cautions", r.cautions.iter().map(|c| c.code()));
    o.strs("notes", r.notes.iter().map(String::as_str));
    o.end();
}

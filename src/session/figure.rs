//! A catalytic cycle drawn as an SVG figure for a notebook or a group meeting: the
//! intermediates round a ring with their counts under each, arrows labelled with the step and
//! what enters and leaves, the net reaction in the middle. Plain SVG 1.1, written here: it opens
//! in any browser and converts to PNG with the usual tools (rsvg-convert, inkscape).

use std::fmt::Write;

use super::{Made, Session, Variant};

/// The variants a figure shows: the closed cycle that ends at `id`, else the path to it.
pub fn cycle_ids(s: &Session, id: u64) -> Vec<u64> {
    match s.closes(id) {
        Some(from) => s.path_between(from, id),
        None => s.path_to(id),
    }
}

/// The variant a figure is drawn to when none is named: the first one that closes a cycle
/// (the catalytic cycle proper, before any return to the precatalyst), else the last variant.
pub fn default_end(s: &Session) -> Option<u64> {
    s.cycles()
        .first()
        .map(|&(_, to)| to)
        .or_else(|| s.last().map(|v| v.id))
}

fn esc(t: &str) -> String {
    t.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('"', "&quot;")
}

fn num(v: &serde_json::Value) -> String {
    match v {
        serde_json::Value::Number(n) => n.to_string(),
        serde_json::Value::Null => "?".into(),
        other => other.to_string().trim_matches('"').to_string(),
    }
}

fn signed(v: &serde_json::Value) -> String {
    match v.as_f64() {
        Some(x) if x > 0.0 => format!("+{}", num(v)),
        _ => num(v),
    }
}

/// The figure for the variants `ids` (in order; a closed cycle repeats its first species as
/// its last, which the figure draws once).
pub fn svg(s: &Session, ids: &[u64]) -> String {
    let all: Vec<&Variant> = ids.iter().filter_map(|&i| s.get(i)).collect();
    let closed = all.len() > 2
        && matches!((all.first(), all.last()), (Some(a), Some(b)) if crate::chem::cycle::same_species(&a.formula, &b.formula));
    // a closed cycle's last variant is its first species again: the ring has one node fewer
    let nodes: Vec<&Variant> = if closed {
        all[..all.len() - 1].to_vec()
    } else {
        all.clone()
    };
    let n = nodes.len().max(1);
    let size = (560.0 + 70.0 * n as f64).clamp(760.0, 1600.0);
    // room on both sides for the step labels beside the ring
    let width = size + 320.0;
    let (cx, cy) = (width / 2.0, size / 2.0);
    let r = size * 0.34;
    let mut out = String::new();
    let _ = writeln!(
        out,
        r##"<?xml version="1.0" encoding="UTF-8"?>
<svg xmlns="http://www.w3.org/2000/svg" version="1.1" width="{width:.0}" height="{size:.0}" viewBox="0 0 {width:.0} {size:.0}" font-family="DejaVu Sans, Arial, sans-serif">
<title>nonet: {title}</title>
<defs><marker id="head" viewBox="0 0 10 10" refX="9" refY="5" markerWidth="8" markerHeight="8" orient="auto-start-reverse"><path d="M0,0 L10,5 L0,10 z" fill="#333"/></marker></defs>
<rect width="100%" height="100%" fill="white"/>"##,
        title = esc(&format!("session {}", s.name))
    );
    // the lowest count and odd counts stand out with a word, not colour alone
    let count = |v: &Variant| v.counts.electron_count.as_f64();
    let lowest = nodes
        .iter()
        .filter_map(|v| count(v))
        .fold(f64::INFINITY, f64::min);
    let pos = |k: usize| {
        let a = -std::f64::consts::FRAC_PI_2 + 2.0 * std::f64::consts::PI * k as f64 / n as f64;
        (cx + r * a.cos(), cy + r * a.sin(), a)
    };
    for (k, v) in nodes.iter().enumerate() {
        let (x, y, _) = pos(k);
        let c = &v.counts;
        let e = count(v);
        let mut marks = Vec::new();
        if e == Some(lowest) && nodes.len() > 1 {
            marks.push("lowest count");
        }
        if e.is_some_and(|e| e.fract() == 0.0 && (e as i64) % 2 != 0) {
            marks.push("odd electron");
        }
        let _ = writeln!(
            out,
            r##"<g id="v{id}"><rect x="{rx:.1}" y="{ry:.1}" width="220" height="{h}" rx="8" fill="{fill}" stroke="#333"/>
<text x="{x:.1}" y="{t1:.1}" text-anchor="middle" font-size="13" font-weight="bold">{formula}</text>
<text x="{x:.1}" y="{t2:.1}" text-anchor="middle" font-size="12">{e} e · OS {os} · d{d}</text>"##,
            id = v.id,
            rx = x - 110.0,
            ry = y - 30.0,
            h = if marks.is_empty() { 52 } else { 68 },
            fill = if marks.is_empty() {
                "#f4f4f4"
            } else {
                "#fff3d6"
            },
            t1 = y - 10.0,
            t2 = y + 8.0,
            formula = esc(&v.formula),
            e = num(&c.electron_count),
            os = signed(&c.oxidation_state),
            d = num(&c.d_electrons),
        );
        if !marks.is_empty() {
            let _ = writeln!(
                out,
                r#"<text x="{x:.1}" y="{t:.1}" text-anchor="middle" font-size="12" font-style="italic">{m}</text>"#,
                t = y + 26.0,
                m = esc(&marks.join(", "))
            );
        }
        let _ = writeln!(out, "</g>");
    }
    // arrows along the ring, from each species to the next (back to the first when closed)
    let edges = if closed {
        nodes.len()
    } else {
        nodes.len().saturating_sub(1)
    };
    for k in 0..edges {
        let v = all.get(k + 1).copied();
        let Some(v) = v else { continue };
        let (x1, y1, a1) = pos(k);
        let (x2, y2, a2) = pos((k + 1) % n);
        // from the edge of one box to the edge of the next, bowing outward
        let am =
            (a1 + if a2 < a1 {
                a2 + 2.0 * std::f64::consts::PI
            } else {
                a2
            }) / 2.0;
        let edge = |x: f64, y: f64, tx: f64, ty: f64| {
            let (dx, dy) = (tx - x, ty - y);
            let t = (112.0 / dx.abs().max(1e-6))
                .min(36.0 / dy.abs().max(1e-6))
                .min(0.45);
            (x + t * dx, y + t * dy)
        };
        let (sx, sy) = edge(x1, y1, x2, y2);
        let (ex, ey) = edge(x2, y2, x1, y1);
        let bow = if n <= 2 { 1.35 } else { 1.12 };
        let (qx, qy) = (cx + bow * r * am.cos(), cy + bow * r * am.sin());
        let _ = writeln!(
            out,
            r##"<path d="M{sx:.1},{sy:.1} Q{qx:.1},{qy:.1} {ex:.1},{ey:.1}" fill="none" stroke="#333" stroke-width="2" marker-end="url(#head)"/>"##
        );
        let (lx, ly) = (cx + 1.32 * r * am.cos(), cy + 1.32 * r * am.sin());
        let anchor = if am.cos() > 0.2 {
            "start"
        } else if am.cos() < -0.2 {
            "end"
        } else {
            "middle"
        };
        let mut lines = vec![if v.made == Made::Edit {
            format!("{} (edit)", v.action)
        } else {
            v.action.clone()
        }];
        for r in &v.enters {
            lines.push(format!("+ {}", with_count(r.count, &r.name)));
        }
        for r in &v.leaves {
            lines.push(format!("− {}", with_count(r.count, &r.name)));
        }
        for (i, t) in lines.iter().enumerate() {
            let _ = writeln!(
                out,
                r#"<text x="{lx:.1}" y="{y:.1}" text-anchor="{anchor}" font-size="12"{style}>{t}</text>"#,
                y = ly + 15.0 * i as f64 - 7.0 * (lines.len() as f64 - 1.0),
                style = if i == 0 {
                    r#" font-style="italic""#
                } else {
                    ""
                },
                t = esc(t)
            );
        }
    }
    // the net reaction in the middle
    let (Some(first), Some(last)) = (ids.first(), ids.last()) else {
        out.push_str("</svg>\n");
        return out;
    };
    let net = s.net(*first, *last);
    let head = if closed {
        "net reaction"
    } else {
        "open path: net so far"
    };
    let _ = writeln!(
        out,
        r#"<text x="{cx:.1}" y="{y1:.1}" text-anchor="middle" font-size="14" font-weight="bold">{head}</text>
<text x="{cx:.1}" y="{y2:.1}" text-anchor="middle" font-size="14">{net}</text>
</svg>"#,
        y1 = cy - 10.0,
        y2 = cy + 12.0,
        net = esc(&net.text())
    );
    out
}

fn with_count(n: u32, name: &str) -> String {
    if n == 1 {
        name.to_string()
    } else {
        format!("{n} {name}")
    }
}

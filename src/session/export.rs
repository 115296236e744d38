//! Writing a session out for a notebook: a Markdown table, JSON, or CSV of its variants, the
//! whole tree or one path through it.

use serde_json::{json, Value};

use super::{Session, SpeciesRecord, Variant};

/// Which variants to write.
pub enum Scope {
    /// The whole tree, in tree order.
    Tree,
    /// The path from the root to this variant.
    Path(u64),
}

fn rows<'a>(s: &'a Session, scope: &Scope) -> Vec<(usize, &'a Variant)> {
    match scope {
        Scope::Tree => s.tree(),
        Scope::Path(id) => s
            .path_to(*id)
            .into_iter()
            .enumerate()
            .filter_map(|(d, id)| s.get(id).map(|v| (d, v)))
            .collect(),
    }
}

/// "C2H4 + H2": species as a side of an equation.
fn side(list: &[SpeciesRecord]) -> String {
    list.iter()
        .map(|r| {
            if r.count == 1 {
                r.name.clone()
            } else {
                format!("{} {}", r.count, r.name)
            }
        })
        .collect::<Vec<_>>()
        .join(" + ")
}

/// The closed cycles among the rows written: (back to, closing variant).
fn cycles_in(s: &Session, rows: &[(usize, &Variant)]) -> Vec<(u64, u64)> {
    rows.iter()
        .filter_map(|(_, v)| s.closes(v.id).map(|a| (a, v.id)))
        .collect()
}

fn num(v: &Value) -> String {
    match v {
        Value::Number(n) => n.to_string(),
        Value::Null => String::new(),
        other => other.to_string(),
    }
}

fn signed(v: &Value) -> String {
    match v.as_f64() {
        Some(x) if x > 0.0 => format!("+{}", num(v)),
        _ => num(v),
    }
}

/// Deeper than this, a row shows its depth as a number instead of one mark per level, so the
/// table grows linearly with the tree however deep it is.
const MAX_INDENT: usize = 8;

/// The marks before a change: one per level, or the depth in figures past `MAX_INDENT`.
fn indent(depth: usize) -> String {
    if depth <= MAX_INDENT {
        "· ".repeat(depth)
    } else {
        format!("·×{depth} ")
    }
}

/// A cycle's path, "#1 → #2 → #3"; a long one keeps its ends and counts the rest.
fn cycle_path(ids: &[u64]) -> String {
    const ENDS: usize = 4;
    let show = |part: &[u64]| {
        part.iter()
            .map(|i| format!("#{i}"))
            .collect::<Vec<_>>()
            .join(" → ")
    };
    if ids.len() <= 3 * ENDS {
        show(ids)
    } else {
        format!(
            "{} → … {} more … → {}",
            show(&ids[..ENDS]),
            ids.len() - 2 * ENDS,
            show(&ids[ids.len() - ENDS..])
        )
    }
}

/// A Markdown table, indented by depth in the tree, then the closed cycles with their net
/// reactions. Its size is linear in the number of variants, whatever the depth.
pub fn markdown(s: &Session, scope: &Scope) -> String {
    let mut out = format!("## nonet session `{}`\n\n", s.name);
    out.push_str(
        "| # | parent | change | in | out | formula | e | OS | d | CN | saturation | unpaired | bookmark |\n",
    );
    out.push_str("|---|---|---|---|---|---|---|---|---|---|---|---|---|\n");
    let rows = rows(s, scope);
    let cell = |t: &str| t.replace('|', "\\|");
    for (depth, v) in &rows {
        let c = &v.counts;
        let closes = s
            .closes(v.id)
            .map_or(String::new(), |a| format!(" (closes the cycle from #{a})"));
        let made = match v.made {
            super::Made::Edit => " (edit)",
            _ => "",
        };
        out.push_str(&format!(
            "| {} | {} | {}{}{}{} | {} | {} | `{}` | {} | {} | {} | {} | {} | {} | {} |\n",
            v.id,
            v.parent.map_or(String::new(), |p| p.to_string()),
            indent(*depth),
            cell(&v.action),
            made,
            closes,
            cell(&side(&v.enters)),
            cell(&side(&v.leaves)),
            cell(&v.formula),
            num(&c.electron_count),
            signed(&c.oxidation_state),
            num(&c.d_electrons),
            num(&c.coordination_number),
            c.saturation,
            c.unpaired_electrons
                .map_or(String::new(), |n| n.to_string()),
            cell(s.bookmark_of(v.id).unwrap_or("")),
        ));
    }
    let cycles = cycles_in(s, &rows);
    if !cycles.is_empty() {
        out.push_str("\n### Closed cycles\n\n");
        for (from, to) in cycles {
            out.push_str(&format!(
                "- {}: net {}\n",
                cycle_path(&s.path_between(from, to)),
                s.net(from, to).text()
            ));
        }
    }
    out
}

/// One JSON document: the session's name, its variants with their counts, how each came
/// about and what entered and left, and the closed cycles with their net reactions.
pub fn json(s: &Session, scope: &Scope) -> String {
    let rows = rows(s, scope);
    let variants: Vec<Value> = rows
        .iter()
        .map(|(depth, v)| {
            json!({
                "id": v.id,
                "parent": v.parent,
                "depth": depth,
                "time": v.time,
                "action": v.action,
                "made_by": v.made.word(),
                "enters": v.enters,
                "leaves": v.leaves,
                "formula": v.formula,
                "counts": v.counts,
                "bookmark": s.bookmark_of(v.id),
                "closes": s.closes(v.id),
            })
        })
        .collect();
    let cycles: Vec<Value> = cycles_in(s, &rows)
        .into_iter()
        .map(|(from, to)| {
            let n = s.net(from, to);
            let species = |terms: &[crate::chem::species::Term]| -> Vec<Value> {
                terms
                    .iter()
                    .map(|t| {
                        json!({
                            "name": t.species.label(),
                            "formula": t.species.formula(),
                            "smiles": t.species.smiles(),
                            "charge": t.species.charge(),
                            "count": t.count,
                        })
                    })
                    .collect()
            };
            let path = s.path_between(from, to);
            json!({
                "from": from,
                "to": to,
                "path": path,
                "net": {"consumed": species(&n.net.consumed), "formed": species(&n.net.formed)},
                "net_text": n.text(),
                "balanced_by_steps": n.by_steps(),
            })
        })
        .collect();
    let doc = json!({ "schema": 1, "session": s.name, "variants": variants, "cycles": cycles });
    serde_json::to_string_pretty(&doc).unwrap_or_default() + "\n"
}

/// CSV with a header row (RFC 4180 quoting).
pub fn csv(s: &Session, scope: &Scope) -> String {
    let q = |t: &str| {
        if t.contains([',', '"', '\n']) {
            format!("\"{}\"", t.replace('"', "\"\""))
        } else {
            t.to_string()
        }
    };
    let mut out = String::from(
        "id,parent,depth,time,action,made_by,enters,leaves,formula,electron_count,\
         oxidation_state,d_electrons,coordination_number,saturation,unpaired_electrons,bookmark,\
         closes\n",
    );
    for (depth, v) in rows(s, scope) {
        let c = &v.counts;
        out.push_str(&format!(
            "{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{}\n",
            v.id,
            v.parent.map_or(String::new(), |p| p.to_string()),
            depth,
            q(&v.time),
            q(&v.action),
            v.made.word(),
            q(&side(&v.enters)),
            q(&side(&v.leaves)),
            q(&v.formula),
            num(&c.electron_count),
            num(&c.oxidation_state),
            num(&c.d_electrons),
            num(&c.coordination_number),
            c.saturation,
            c.unpaired_electrons
                .map_or(String::new(), |n| n.to_string()),
            q(s.bookmark_of(v.id).unwrap_or("")),
            s.closes(v.id).map_or(String::new(), |a| a.to_string()),
        ));
    }
    out
}

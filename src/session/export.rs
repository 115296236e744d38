//! Writing a session out for a notebook: a Markdown table, JSON, or CSV of its variants, the
//! whole tree or one path through it.

use serde_json::{json, Value};

use super::{Session, Variant};

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

/// A Markdown table, indented by depth in the tree.
pub fn markdown(s: &Session, scope: &Scope) -> String {
    let mut out = format!("## nonet session `{}`\n\n", s.name);
    out.push_str(
        "| # | parent | change | formula | e | OS | d | CN | saturation | unpaired | bookmark |\n",
    );
    out.push_str("|---|---|---|---|---|---|---|---|---|---|---|\n");
    for (depth, v) in rows(s, scope) {
        let c = &v.counts;
        out.push_str(&format!(
            "| {} | {} | {}{} | `{}` | {} | {} | {} | {} | {} | {} | {} |\n",
            v.id,
            v.parent.map_or(String::new(), |p| p.to_string()),
            "· ".repeat(depth),
            v.action.replace('|', "\\|"),
            v.formula.replace('|', "\\|"),
            num(&c.electron_count),
            signed(&c.oxidation_state),
            num(&c.d_electrons),
            num(&c.coordination_number),
            c.saturation,
            c.unpaired_electrons
                .map_or(String::new(), |n| n.to_string()),
            s.bookmark_of(v.id).unwrap_or("").replace('|', "\\|"),
        ));
    }
    out
}

/// One JSON document: the session's name and its variants with their counts.
pub fn json(s: &Session, scope: &Scope) -> String {
    let variants: Vec<Value> = rows(s, scope)
        .into_iter()
        .map(|(depth, v)| {
            json!({
                "id": v.id,
                "parent": v.parent,
                "depth": depth,
                "time": v.time,
                "action": v.action,
                "formula": v.formula,
                "counts": v.counts,
                "bookmark": s.bookmark_of(v.id),
            })
        })
        .collect();
    let doc = json!({ "schema": 1, "session": s.name, "variants": variants });
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
        "id,parent,depth,time,action,formula,electron_count,oxidation_state,d_electrons,\
         coordination_number,saturation,unpaired_electrons,bookmark\n",
    );
    for (depth, v) in rows(s, scope) {
        let c = &v.counts;
        out.push_str(&format!(
            "{},{},{},{},{},{},{},{},{},{},{},{},{}\n",
            v.id,
            v.parent.map_or(String::new(), |p| p.to_string()),
            depth,
            q(&v.time),
            q(&v.action),
            q(&v.formula),
            num(&c.electron_count),
            num(&c.oxidation_state),
            num(&c.d_electrons),
            num(&c.coordination_number),
            c.saturation,
            c.unpaired_electrons
                .map_or(String::new(), |n| n.to_string()),
            q(s.bookmark_of(v.id).unwrap_or("")),
        ));
    }
    out
}

//! Plain-ASCII text for terminals and locales without UTF-8: Greek spelled out, symbols
//! replaced. Used by the CLI and the TUI alike.

/// Spell out or replace every non-ASCII character, for terminals and locales without UTF-8.
pub fn ascii_text(s: &str) -> String {
    let mut out = String::with_capacity(s.len() + 16);
    for c in s.chars() {
        if c.is_ascii() {
            out.push(c);
            continue;
        }
        let r: &str = match c {
            'η' => "eta",
            'κ' => "kappa",
            'μ' | 'µ' => "mu",
            'α' => "alpha",
            'β' => "beta",
            'γ' => "gamma",
            'δ' => "delta",
            'σ' => "sigma",
            'π' => "pi",
            'ν' => "nu",
            'θ' => "theta",
            'Δ' => "Delta",
            'Ω' => "Omega",
            'Å' => "A",
            '·' | '•' => "-",
            '×' => "x",
            '−' | '–' | '—' => "-",
            '→' => "->",
            '←' => "<-",
            '↔' => "<->",
            '≡' => "#",
            '≈' => "~",
            '≤' => "<=",
            '≥' => ">=",
            '±' => "+/-",
            '°' => " deg",
            '⁺' => "+",
            '⁻' => "-",
            '✓' => "ok",
            '…' => "...",
            '‘' | '’' => "'",
            '“' | '”' => "\"",
            '\u{feff}' => "",
            c => {
                if let Some(d) = "⁰¹²³⁴⁵⁶⁷⁸⁹".chars().position(|s| s == c) {
                    out.push(char::from(b'0' + d as u8));
                    continue;
                }
                if let Some(d) = "₀₁₂₃₄₅₆₇₈₉".chars().position(|s| s == c) {
                    out.push(char::from(b'0' + d as u8));
                    continue;
                }
                "?"
            }
        };
        out.push_str(r);
    }
    out
}

#[cfg(test)]
mod tests {
    use super::ascii_text;

    #[test]
    fn ascii_text_is_ascii() {
        let s = ascii_text("[Fe(η5-Cp)2] · 18 e · cone 145° · β-H → μ3 ≡ ×2 ₂ ⁴⁻ 中");
        assert!(s.is_ascii(), "{s}");
        assert!(s.contains("eta5") && s.contains("mu3") && s.contains("145 deg"));
    }
}

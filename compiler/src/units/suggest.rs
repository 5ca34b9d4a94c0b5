//! Help texts for unit errors: common slips, case slips, powers written without `^`, units
//! run together (`mK` for `m*K`), and near-miss spellings by edit distance.

use super::parse::{err, parse_unit, Tok, Token};
use super::table::{known_spellings, lookup};
use super::UnitError;

pub(super) fn missing_operator_help(toks: &[Token], i: usize) -> String {
    match toks.get(i).map(|t| &t.tok) {
        Some(Tok::Minus) => "a negative power is written `^-1` or `⁻¹` after the unit".to_string(),
        Some(Tok::Caret | Tok::Sup(_)) => "a unit takes only one exponent".to_string(),
        _ => "join units with `*` (or `·`) and `/`".to_string(),
    }
}

/// For `W/m²K`: the text with the missing operator put in, if that parses.
pub(super) fn insert_operator_help(text: &str, toks: &[Token], i: usize) -> Option<String> {
    let t = toks.get(i)?;
    if !matches!(t.tok, Tok::Sym(_) | Tok::LParen | Tok::Num(_)) {
        return None;
    }
    let at = t.start;
    let mut depth = 0i32;
    let mut last_slash = None;
    for t in &toks[..i] {
        match t.tok {
            Tok::LParen => depth += 1,
            Tok::RParen => depth -= 1,
            Tok::Slash if depth == 0 => last_slash = Some(t.end),
            _ => {}
        }
    }
    let candidate = match last_slash {
        Some(s) => format!("{}({}*{})", &text[..s], &text[s..at], &text[at..]),
        None => format!("{}*{}", &text[..at], &text[at..]),
    };
    parse_unit(&candidate)
        .ok()
        .map(|_| format!("units need an operator between them: did you mean `{candidate}`?"))
}

/// Common slips with a direct answer.
fn slip_help(s: &str) -> Option<&'static str> {
    Some(match s {
        "C" | "deg_C" | "celsius" | "Celsius" | "ºC" => {
            "write `°C` or `degC` for degrees Celsius (`Δ°C` or `delta_degC` for a difference)"
        }
        "F" | "deg_F" | "fahrenheit" | "Fahrenheit" | "ºF" => {
            "write `°F` or `degF` for degrees Fahrenheit (`Δ°F` or `delta_degF` for a difference)"
        }
        "R" | "ºR" | "rankine" => "write `°R` or `degR` for degrees Rankine",
        "deg" | "°" | "º" => {
            "`deg` alone is not a unit: write `degC`, `degF` or `degR` (or `°C`, `°F`, `°R`)"
        }
        "°K" | "degK" | "ºK" | "kelvin" | "Kelvin" => {
            "kelvin is written `K`, without a degree sign"
        }
        "ΔK" | "∆K" | "delta_K" | "delta_degK" | "dK" => {
            "write `K`: a kelvin value can already serve as a difference"
        }
        "ΔC" | "∆C" | "delta_C" | "dC" | "Δ°c" => {
            "write `Δ°C` or `delta_degC` for a difference"
        }
        "ΔF" | "∆F" | "delta_F" | "dF" => "write `Δ°F` or `delta_degF` for a difference",
        "sec" | "secs" | "second" | "seconds" => "seconds are written `s`",
        "hr" | "hrs" | "hour" | "hours" => "hours are written `h`",
        "mins" | "minute" | "minutes" => "minutes are written `min`",
        "day" | "days" => "days are written `d`",
        "BTU" | "btu" | "BTu" | "Btus" => "write `Btu` (the International Table Btu)",
        "kWhr" | "kwh" | "KWH" | "KWh" => "kilowatt hours are written `kWh`",
        "l" => "the litre is written `L`",
        "ml" => "the millilitre is written `mL`",
        "lbs" | "lbm" => "pounds (mass) are written `lb`",
        "inch" | "inches" => "inches are written `in`",
        "foot" | "feet" => "feet are written `ft`",
        "meter" | "meters" | "metre" | "metres" => "metres are written `m`",
        "watt" | "watts" => "watts are written `W`",
        "joule" | "joules" => "joules are written `J`",
        "micron" | "microns" => "write `µm` (or `um`)",
        "kgs" => "kilograms are written `kg`",
        "cc" => "write `cm^3` (or `mL`)",
        "hp" => "horsepower is not supported (its definitions differ); convert to `W`",
        _ => return None,
    })
}

/// Splits an unknown spelling into known symbols, like `mK` -> [`m`, `K`].
fn split_symbols(s: &str, depth: u32) -> Option<Vec<&str>> {
    if lookup(s).is_some() {
        return Some(vec![s]);
    }
    if depth == 0 {
        return None;
    }
    let bounds: Vec<usize> = s.char_indices().map(|(i, _)| i).skip(1).collect();
    for &i in bounds.iter().rev() {
        let (left, right) = s.split_at(i);
        if lookup(left).is_some() {
            if let Some(mut rest) = split_symbols(right, depth - 1) {
                rest.insert(0, left);
                return Some(rest);
            }
        }
    }
    None
}

fn levenshtein(a: &str, b: &str) -> usize {
    let b: Vec<char> = b.chars().collect();
    let mut row: Vec<usize> = (0..=b.len()).collect();
    for (i, ca) in a.chars().enumerate() {
        let mut prev = row[0];
        row[0] = i + 1;
        for (j, cb) in b.iter().enumerate() {
            let cur = row[j + 1];
            row[j + 1] = if ca == *cb {
                prev
            } else {
                1 + prev.min(cur).min(row[j])
            };
            prev = cur;
        }
    }
    row[b.len()]
}

/// The error for an unknown symbol at token `i`, with the most useful help we can find.
pub(super) fn unknown_symbol(text: &str, toks: &[Token], i: usize) -> UnitError {
    let t = &toks[i];
    let s = &text[t.start..t.end];
    let message = format!("unknown unit `{s}`");
    let help = |h: String| err(t.start, t.end, message.clone(), Some(h));
    if let Some(h) = slip_help(s) {
        return help(h.to_string());
    }
    let known = known_spellings();
    let lower = s.to_lowercase();
    let case_slip = known.iter().find(|k| k.to_lowercase() == lower);
    // `ft2`, `mm3`: a power written without `^`.
    let stem = s.trim_end_matches(|c: char| c.is_ascii_digit());
    if case_slip.is_none() && stem.len() < s.len() && lookup(stem).is_some() {
        let digits = &s[stem.len()..];
        return help(format!("write the power with `^`: `{stem}^{digits}`"));
    }
    // `mK`, `Nm`: units run together.
    let split = if s.chars().count() >= 2 {
        split_symbols(s, 2)
    } else {
        None
    };
    let joined = split.map(|parts| parts.join("*"));
    match (case_slip, joined) {
        (Some(k), Some(j)) => {
            return help(format!(
                "did you mean `{k}` (units are case-sensitive) or `{j}` (units need an operator \
                 between them)?"
            ))
        }
        (Some(k), None) => return help(format!("units are case-sensitive: did you mean `{k}`?")),
        (None, Some(j)) => {
            let after_slash = i > 0 && toks[i - 1].tok == Tok::Slash;
            let replacement = if after_slash { format!("({j})") } else { j };
            let fixed = format!("{}{replacement}{}", &text[..t.start], &text[t.end..]);
            return help(format!(
                "units need an operator between them: did you mean `{fixed}`?"
            ));
        }
        (None, None) => {}
    }
    let n = s.chars().count();
    let max = if n <= 3 { 1 } else { 2 };
    let best = known
        .iter()
        .map(|k| (levenshtein(s, k), k))
        .filter(|(d, _)| *d <= max && *d < n)
        .min_by_key(|(d, _)| *d);
    match best {
        Some((_, k)) => help(format!("did you mean `{k}`?")),
        None => err(t.start, t.end, message, None),
    }
}

#[cfg(test)]
mod tests {
    use super::levenshtein;

    #[test]
    fn levenshtein_distance() {
        assert_eq!(levenshtein("", ""), 0);
        assert_eq!(levenshtein("abc", ""), 3);
        assert_eq!(levenshtein("kitten", "sitting"), 3);
        assert_eq!(levenshtein("Btu", "BTU"), 2);
        assert_eq!(levenshtein("°C", "°F"), 1);
        assert_eq!(levenshtein("µm", "um"), 1);
    }
}

//! `caloris explain CODE`: what a diagnostic code means and how to fix it, offline, from the
//! same table as docs/diagnostics.md (compiled into the binary, so the two cannot drift).

use crate::{exit, usage};

const TABLE: &str = include_str!("../docs/diagnostics.md");

/// One row of the code table: code, meaning, typical fix.
fn rows() -> impl Iterator<Item = (&'static str, &'static str, &'static str)> {
    TABLE.lines().filter_map(|line| {
        let cells: Vec<&str> = line
            .trim()
            .trim_matches('|')
            .split(" | ")
            .map(str::trim)
            .collect();
        match cells.as_slice() {
            [code, meaning, fix]
                if code.len() == 4
                    && (code.starts_with('E') || code.starts_with('W'))
                    && code[1..].bytes().all(|b| b.is_ascii_digit()) =>
            {
                Some((*code, *meaning, *fix))
            }
            _ => None,
        }
    })
}

/// Markdown inline code and links read as plain text on a terminal.
fn plain(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    let mut rest = s;
    while let Some(i) = rest.find('[') {
        out.push_str(&rest[..i]);
        let after = &rest[i + 1..];
        match (after.find("]("), after.find(')')) {
            (Some(j), Some(k)) if j < k => {
                out.push_str(&after[..j]);
                rest = &after[k + 1..];
            }
            _ => {
                out.push('[');
                rest = after;
            }
        }
    }
    out.push_str(rest);
    out.replace("\\|", "|").replace('`', "")
}

pub fn run(code: &str) -> u8 {
    let wanted = code.trim().to_ascii_uppercase();
    if let Some((c, meaning, fix)) = rows().find(|(c, _, _)| *c == wanted) {
        let kind = if c.starts_with('E') {
            "error: the model is not solved until it is fixed"
        } else {
            "warning: the model is solved, but look at the result"
        };
        println!("{c} ({kind})\n");
        println!("What it means: {}\n", plain(meaning));
        println!("How to fix it: {}\n", plain(fix));
        println!("Every code is listed in docs/diagnostics.md.");
        return exit::OK;
    }
    let known: Vec<&str> = rows().map(|(c, _, _)| c).collect();
    let hint = caloris_compiler::diagnostic::did_you_mean(&wanted, known.iter().copied())
        .map(|s| format!("; did you mean `{s}`?"))
        .unwrap_or_else(|| {
            format!(
                "; codes look like `{}` or `{}`",
                known.first().unwrap_or(&"E001"),
                known.iter().find(|c| c.starts_with('W')).unwrap_or(&"W001")
            )
        });
    usage(format!("no diagnostic code `{code}`{hint}"))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_code_the_compiler_emits_is_in_the_table() {
        let codes: Vec<&str> = rows().map(|(c, _, _)| c).collect();
        assert!(codes.len() > 40, "{codes:?}");
        for c in ["E001", "E102", "E202"] {
            assert!(codes.contains(&c), "{c} missing");
        }
        let mut sorted = codes.clone();
        sorted.sort_unstable();
        sorted.dedup();
        assert_eq!(sorted.len(), codes.len(), "a code is listed twice");
    }

    #[test]
    fn links_and_code_marks_become_plain_text() {
        assert_eq!(
            plain("see [units.md](units.md) for `m`"),
            "see units.md for m"
        );
        assert_eq!(plain("a [b c"), "a [b c");
    }
}

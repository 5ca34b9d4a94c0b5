//! Names that a syntax error took away. A declaration the parser could not read is dropped
//! whole, so every use of its name would otherwise be reported as unknown — an echo that sends
//! the analyst to declare what they did declare. The names are read off the line of each
//! syntax error (`param t = 12 mm +` loses `t`), and the "unknown" errors about them are left
//! out: the syntax error is the one to fix.

use crate::diagnostic::Diagnostic;
use crate::schema;
use crate::source::Sources;
use rustc_hash::FxHashSet;

/// Whether `d` is a syntax error (unreadable characters, declarations, strings, numbers,
/// nesting).
fn is_syntax_error(d: &Diagnostic) -> bool {
    d.is_error() && matches!(d.code, "E001" | "E002" | "E003" | "E004" | "E005")
}

/// The names declared on the lines of the syntax errors in `diags`.
pub fn lost_names(sources: &Sources, diags: &[Diagnostic]) -> FxHashSet<String> {
    let mut lost = FxHashSet::default();
    for d in diags.iter().filter(|d| is_syntax_error(d)) {
        let text = sources.text(d.primary.span.file);
        let at = (d.primary.span.start as usize).min(text.len());
        let start = text[..at].rfind('\n').map_or(0, |i| i + 1);
        let end = text[at..].find('\n').map_or(text.len(), |i| at + i);
        let mut words = text[start..end].split_whitespace();
        let (Some(word), Some(name)) = (words.next(), words.next()) else {
            continue;
        };
        if !schema::declaration_words().any(|w| w == word) {
            continue;
        }
        let name = name.trim_end_matches(':');
        let is_name = name
            .chars()
            .next()
            .is_some_and(|c| c.is_alphabetic() || c == '_')
            && name.chars().all(|c| c.is_alphanumeric() || c == '_');
        if is_name {
            lost.insert(name.to_string());
        }
    }
    lost
}

/// Leave out the "unknown" errors (E102) about names a syntax error took away.
pub fn drop_echoes(diags: &mut Vec<Diagnostic>, lost: &FxHashSet<String>) {
    if lost.is_empty() {
        return;
    }
    diags.retain(|d| {
        if d.code != "E102" {
            return true;
        }
        let name = ["unknown name `", "unknown node `", "unknown material `"]
            .iter()
            .find_map(|p| d.message.strip_prefix(p))
            .and_then(|rest| rest.strip_suffix('`'));
        !name.is_some_and(|n| lost.contains(n))
    });
}

#[cfg(test)]
mod tests {
    use crate::source::NoImports;
    use crate::{analyze, Options};

    fn codes(text: &str) -> Vec<&'static str> {
        analyze("m.heat", text, &NoImports, &Options::default())
            .diagnostics
            .iter()
            .map(|d| d.code)
            .collect()
    }

    const USE_T: &str = "node a (fixed = 1 °C)\nnode b (fixed = 2 °C)\nlink l: a to b layer(k = 1 W/(m*K), thickness = t, area = 1 m^2)\n";

    #[test]
    fn a_parameter_lost_to_a_syntax_error_is_not_reported_unknown_where_it_is_used() {
        assert_eq!(codes(&format!("param t = 12 mm +\n{USE_T}")), ["E002"]);
        assert_eq!(codes(&format!("param t = 12 mm $ 3\n{USE_T}")), ["E001"]);
    }

    #[test]
    fn a_node_lost_to_a_syntax_error_is_not_reported_unknown_either() {
        let text =
            "node a (fixed = 1 °C\nnode b (fixed = 2 °C)\nlink l: a to b resistance(1 K/W)\n";
        assert_eq!(codes(text), ["E002"]);
    }

    #[test]
    fn other_unknown_names_are_still_reported() {
        assert_eq!(
            codes(&format!(
                "param t = 12 mm +\n{}",
                USE_T.replace("= t,", "= s,")
            )),
            ["E002", "E102"]
        );
    }
}

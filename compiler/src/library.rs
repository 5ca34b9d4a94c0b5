//! Libraries built into the compiler, importable from any folder as `import "caloris:NAME"`:
//! the command line and the language server read the same text, with no file to find.

/// Prefix of a built-in import path.
pub const PREFIX: &str = "caloris:";

/// The bundled material library (`library/materials.heat` in the repository).
pub const MATERIALS: &str = include_str!("../../library/materials.heat");

/// Built-in libraries by name.
pub const ALL: &[(&str, &str)] = &[("materials", MATERIALS)];

/// For an import path naming a built-in library: `Some(Ok((name, text)))`, or `Some(Err(why))`
/// when the prefix is there but the library is not; `None` for an ordinary path.
pub fn resolve(path: &str) -> Option<Result<(String, String), String>> {
    let name = path.strip_prefix(PREFIX)?;
    Some(match ALL.iter().find(|(n, _)| *n == name) {
        Some((n, text)) => Ok((format!("{PREFIX}{n}"), (*text).to_string())),
        None => Err(format!(
            "there is no built-in library `{name}`; the built-in ones are {}",
            ALL.iter()
                .map(|(n, _)| format!("`{PREFIX}{n}`"))
                .collect::<Vec<_>>()
                .join(", ")
        )),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn resolves_known_names_and_explains_unknown_ones() {
        let (name, text) = resolve("caloris:materials")
            .expect("built in")
            .expect("known");
        assert_eq!(name, "caloris:materials");
        assert!(text.contains("material mineral_wool"));
        let err = resolve("caloris:metals")
            .expect("built-in prefix")
            .expect_err("unknown");
        assert!(err.contains("caloris:materials"), "{err}");
        assert!(resolve("../library/materials.heat").is_none());
    }
}

//! Parser tests: syntax, spans (byte offsets, multibyte input) and help texts.

use super::*;

fn ok(text: &str) -> Unit {
    parse_unit(text).unwrap_or_else(|e| panic!("{text}: {e}"))
}

fn fail(text: &str) -> UnitError {
    match parse_unit(text) {
        Ok(u) => panic!("{text} parsed as {u:?}"),
        Err(e) => e,
    }
}

/// The text an error points at.
fn spanned(text: &str) -> String {
    let e = fail(text);
    text[e.start..e.end].to_string()
}

fn help(text: &str) -> String {
    fail(text).help.unwrap_or_default()
}

#[test]
fn syntax_forms() {
    let k = Dim::CONDUCTIVITY;
    for t in [
        "W/(m*K)",
        "W/(m·K)",
        "W/(m⋅K)",
        "W/m/K",
        "(W/m)/K",
        "W*m^-1*K^-1",
        "W·m⁻¹·K⁻¹",
    ] {
        assert_eq!(ok(t).dim, k, "{t}");
    }
    assert_eq!(ok("m^2").dim, Dim::AREA);
    assert_eq!(ok("m²").dim, Dim::AREA);
    assert_eq!(ok("m2").dim, Dim::AREA);
    assert_eq!(ok("m3").dim, Dim::VOLUME);
    assert_eq!(ok("m^(2)").dim, Dim::AREA);
    assert_eq!(ok("m^(-2)").dim, Dim::new(-2, 0, 0, 0));
    assert_eq!(ok("m^+2").dim, Dim::AREA);
    assert_eq!(ok("m^−1").dim, Dim::new(-1, 0, 0, 0));
    assert_eq!(ok("m^0").dim, Dim::NONE);
    assert_eq!(ok("m⁴").dim, Dim::new(4, 0, 0, 0));
    assert_eq!(ok("m¹²").dim, Dim::new(12, 0, 0, 0));
    assert_eq!(ok("(m^2)^2").dim, Dim::new(4, 0, 0, 0));
    assert_eq!(ok("((W))/((m²)*(K))").dim, Dim::HEAT_TRANSFER_COEFF);
    assert_eq!(ok("W/m^2/K").dim, Dim::HEAT_TRANSFER_COEFF);
    assert_eq!(ok("1/(m*K)").dim, Dim::new(-1, 0, 0, -1));
    assert_eq!(ok("µm").scale, 1e-6);
    assert_eq!(ok("um").scale, 1e-6);
    assert_eq!(ok("kg").scale, 1.0);
    assert_eq!(ok("cm^2").scale, 1e-4);
}

#[test]
fn division_is_left_associative() {
    // W/m^2/K = W/(m²·K), not W·K/m².
    let u = ok("W/m^2/K");
    assert_eq!(u.dim, Dim::HEAT_TRANSFER_COEFF);
    let u = ok("Btu/h/ft^2/°F");
    assert_eq!(u.dim, Dim::HEAT_TRANSFER_COEFF);
    assert_eq!(u.scale, ok("Btu/(h*ft^2*°F)").scale);
}

#[test]
fn star_after_slash_is_ambiguous() {
    let e = fail("W/m*K");
    assert_eq!(e.message, "`*` after `/` is ambiguous in a unit");
    assert_eq!((e.start, e.end), (1, 5));
    assert!(
        e.help.as_deref().unwrap_or("").contains("`/(m*K)`"),
        "{e:?}"
    );
    let e = fail("J/kg·K");
    assert!(
        e.help.as_deref().unwrap_or("").contains("`/(kg·K)`"),
        "{e:?}"
    );
    // Inside parentheses the `*` is fine.
    ok("W/(m*K)");
    ok("h*ft^2*°F/Btu");
}

#[test]
fn unknown_symbol_spans_and_suggestions() {
    let e = fail("W/(m*xyz)");
    assert_eq!(e.message, "unknown unit `xyz`");
    assert_eq!((e.start, e.end), (5, 8));
    assert_eq!(help("yrd"), "did you mean `yd`?");
    assert_eq!(help("Bto"), "did you mean `Btu`?");
    assert_eq!(help("kcall"), "did you mean `kcal`?");
    assert_eq!(fail("q").help, None);
    assert!(!help("mmm").is_empty());
}

#[test]
fn common_slips() {
    assert!(help("C").contains("`°C` or `degC`"));
    assert!(help("W/(m*C)").contains("`°C` or `degC`"));
    assert!(help("F").contains("`°F` or `degF`"));
    assert!(help("deg").contains("`degC`"));
    assert!(help("°").contains("`°C`"));
    assert!(help("ºC").contains("`°C`"));
    assert!(help("°K").contains("`K`"));
    assert!(help("ΔK").contains("`K`"));
    assert!(help("ΔC").contains("`Δ°C`"));
    assert!(help("sec").contains("`s`"));
    assert!(help("hr").contains("`h`"));
    assert!(help("Btu/hr").contains("`h`"));
    assert!(help("BTU").contains("`Btu`"));
    assert!(help("BTU/h").contains("`Btu`"));
    assert!(help("l").contains("`L`"));
    assert!(help("hp").contains("not supported"));
    // Case slips.
    assert!(help("KW").starts_with("did you mean `kW` (units are case-sensitive)"));
    assert_eq!(help("w"), "units are case-sensitive: did you mean `W`?");
    assert_eq!(help("kj"), "units are case-sensitive: did you mean `kJ`?");
    assert_eq!(help("PA"), "units are case-sensitive: did you mean `Pa`?");
}

#[test]
fn missing_operator() {
    let e = fail("kW/mK");
    assert_eq!(e.message, "unknown unit `mK`");
    assert_eq!((e.start, e.end), (3, 5));
    assert!(
        e.help.as_deref().unwrap_or("").contains("`kW/(m*K)`"),
        "{e:?}"
    );
    assert!(help("W/mK").contains("`W/(m*K)`"));
    assert_eq!(
        help("Nm"),
        "did you mean `nm` (units are case-sensitive) or `N*m` (units need an operator between \
         them)?"
    );
    assert!(help("m2K/W").contains("`m2*K/W`"));
    assert!(help("m°C").contains("`m*°C`"));
    let e = fail("W/m²K");
    assert_eq!(e.message, "expected `*` or `/` before `K`");
    assert_eq!((e.start, e.end), (5, 6));
    assert!(
        e.help.as_deref().unwrap_or("").contains("`W/(m²*K)`"),
        "{e:?}"
    );
    assert!(help("m²K").contains("`m²*K`"));
    assert!(help("m(K)").contains("`m*(K)`"));
    // Powers without `^`.
    assert_eq!(help("ft2"), "write the power with `^`: `ft^2`");
    assert_eq!(help("mm3"), "write the power with `^`: `mm^3`");
}

#[test]
fn structural_errors_with_spans() {
    let e = fail("W/(m*K");
    assert_eq!(e.message, "unclosed `(` in a unit");
    assert_eq!((e.start, e.end), (2, 3));
    let e = fail("W/m*K)");
    assert!(e.message.contains("ambiguous"));
    let e = fail("W)");
    assert_eq!(e.message, "unmatched `)` in a unit");
    assert_eq!((e.start, e.end), (1, 2));
    let e = fail(")");
    assert_eq!(e.message, "unmatched `)` in a unit");
    let e = fail("W/");
    assert_eq!(e.message, "expected a unit after `/`");
    assert_eq!((e.start, e.end), (1, 2));
    let e = fail("W*");
    assert_eq!(e.message, "expected a unit after `*`");
    let e = fail("W/(m*)");
    assert_eq!(e.message, "expected a unit after `*`");
    assert_eq!((e.start, e.end), (4, 5));
    let e = fail("/m");
    assert_eq!(e.message, "expected a unit, found `/`");
    let e = fail("()");
    assert_eq!(e.message, "empty parentheses in a unit");
    let e = fail("");
    assert_eq!(e.message, "empty unit");
    let e = fail("m**2");
    assert!(e.message.contains("`**`"));
    assert!(e.help.as_deref().unwrap_or("").contains("`^`"));
}

#[test]
fn exponent_errors() {
    let e = fail("m^2.5");
    assert_eq!(e.message, "a unit exponent must be an integer");
    assert_eq!((e.start, e.end), (2, 5));
    let e = fail("m^-0.5");
    assert_eq!((e.start, e.end), (2, 6));
    let e = fail("m^");
    assert_eq!(e.message, "expected an integer exponent after `^`");
    assert_eq!((e.start, e.end), (1, 2));
    let e = fail("m^x");
    assert_eq!(
        e.message,
        "expected an integer exponent after `^`, found `x`"
    );
    assert_eq!((e.start, e.end), (2, 3));
    let e = fail("m^(2");
    assert_eq!(e.message, "expected `)` after the exponent");
    assert!(fail("m^99999999999").message.contains("too large"));
    assert!(fail("m^200").message.contains("too large"));
    assert!(fail("m^100*m^100").message.contains("too large"));
    assert!(fail("m⁻⁻¹").message.contains("superscript"));
    assert!(fail("m^2^3").message.contains("before `^`"));
    let e = fail("m-1");
    assert!(e.help.as_deref().unwrap_or("").contains("`^-1`"), "{e:?}");
}

#[test]
fn numbers_in_units() {
    assert_eq!(ok("1/s").dim, Dim::new(0, 0, -1, 0));
    let e = fail("10/s");
    assert_eq!(e.message, "a number cannot stand inside a unit");
    assert_eq!((e.start, e.end), (0, 2));
    assert!(fail("m^1/2").message.contains("number"));
}

#[test]
fn spans_are_byte_offsets_in_multibyte_text() {
    // `°` is 2 bytes, `²` 2 bytes, `µ` 2 bytes, `Δ` 2 bytes, `·` 2 bytes.
    let t = "W/(m²·°K)";
    let e = fail(t);
    assert_eq!(&t[e.start..e.end], "°K");
    assert_eq!((e.start, e.end), (8, 11));
    let t = "µm·xyz";
    let e = fail(t);
    assert_eq!(&t[e.start..e.end], "xyz");
    assert_eq!((e.start, e.end), (5, 8));
    let t = "Δ°F/(h·ft²·°G)";
    assert_eq!(spanned(t), "°G");
    let t = "m²·K/(W";
    let e = fail(t);
    assert_eq!(&t[e.start..e.end], "(");
    assert_eq!(e.start, 7);
    let t = "m² K";
    let e = fail(t);
    assert_eq!(e.message, "spaces are not allowed inside a unit");
    assert_eq!((e.start, e.end), (3, 4));
    assert_eq!(
        e.help.as_deref(),
        Some("write the unit without spaces: `m²*K`")
    );
    assert_eq!(help("W /m"), "write the unit without spaces: `W/m`");
    assert_eq!(help(" W"), "write the unit without spaces: `W`");
    assert!(help("W / xyz").contains("joining units"));
    let t = "°C%";
    let e = fail(t);
    assert_eq!(&t[e.start..e.end], "%");
    assert!(e.help.as_deref().unwrap_or("").contains("percent"));
    let t = "m²⁻";
    let e = fail(t);
    assert_eq!((e.start, e.end), (1, 6));
    for t in [
        "W/(m²·°K)",
        "µm·xyz",
        "Δ°F/(h·ft²·°G)",
        "m²·K/(W",
        "°C%",
        "ft²·h/ΔQ",
    ] {
        let e = fail(t);
        assert!(
            t.is_char_boundary(e.start) && t.is_char_boundary(e.end),
            "{t}: {e:?}"
        );
        assert!(e.start <= e.end && e.end <= t.len());
    }
}

#[test]
fn errors_display() {
    let e = fail("hr");
    assert_eq!(
        e.to_string(),
        "unknown unit `hr` (help: hours are written `h`)"
    );
}

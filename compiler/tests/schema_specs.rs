//! Every argument table of the schema against what the compiler does with it: for each element
//! kind, build-up use and declaration, a use with only the required arguments (and one of each
//! pair of alternatives) checks clean; leaving out a required argument, or both alternatives,
//! is E203; giving both alternatives is E207; an argument that needs a partner is E203 without
//! it; a value outside its range is refused (E202, E213, E216); an unknown name is E204 with the
//! nearest name of the table as the fix. So the docs, completion and hover, which read the
//! schema, say what the checker enforces.

use caloris_compiler::elements::shell::Geometry;
use caloris_compiler::schema::{self, ArgSpec, ArgType, DeclArgs, Need, Range};
use caloris_compiler::source::NoImports;
use caloris_compiler::units::Dim;
use caloris_compiler::{analyze, Options};

/// A plausible value for an argument (invented numbers that make every geometry valid).
fn value(s: &ArgSpec) -> &'static str {
    match s.name {
        "inner_radius" => return "50 mm",
        "outer_radius" => return "100 mm",
        "thickness" => return "10 mm",
        "diameter" | "diameter_to" => return "50 mm",
        "depth" => return "1 m",
        "spacing" => return "500 mm",
        "width" | "height" => return "50 mm",
        "radius" => return "10 mm",
        "area_to" => return "2 m^2",
        "emissivity" => return "0.9",
        "emissivity_to" => return "0.8",
        "view_factor" => return "0.5",
        "start" => return "0 h",
        "velocity" => return "2 m/s",
        "pressure" => return "1 atm",
        _ => {}
    }
    match s.ty {
        ArgType::Material => "brick",
        ArgType::Node => "b",
        ArgType::Choice(words) => words[0],
        ArgType::Temperature | ArgType::Scheduled(Dim::TEMPERATURE) => "20 °C",
        ArgType::TemperatureDifference => "0.01 K",
        ArgType::Conductivity => "1 W/(m*K)",
        ArgType::Scheduled(_) => "1 W",
        ArgType::Quantity(d) => match d {
            _ if d == Dim::NONE => "2",
            _ if d == Dim::LENGTH => "1 m",
            _ if d == Dim::AREA => "1 m^2",
            _ if d == Dim::CONDUCTIVITY => "1 W/(m*K)",
            _ if d == Dim::HEAT_TRANSFER_COEFF => "10 W/(m^2*K)",
            _ if d == Dim::AREA_RESISTANCE => "0.1 m^2*K/W",
            _ if d == Dim::RESISTANCE => "1 K/W",
            _ if d == Dim::CONDUCTANCE => "1 W/K",
            _ if d == Dim::VOLUMETRIC_POWER => "1000 W/m^3",
            _ if d == Dim::POWER => "10 W",
            _ if d == Dim::TIME => "1 h",
            _ if d == Dim::CAPACITY => "1 kJ/K",
            _ if d == Dim::VOLUME => "1 L",
            _ if d == Dim::MASS => "1 kg",
            _ if d == Dim::DENSITY => "1000 kg/m^3",
            _ if d == Dim::SPECIFIC_HEAT => "1000 J/(kg*K)",
            _ if d == Dim::CONDUCTIVITY_SLOPE => "1e-4 W/(m*K^2)",
            _ => panic!("no test value for `{}` ({})", s.name, d.describe()),
        },
    }
}

/// The same value with its number replaced (`50 mm` → `0 mm`).
fn with_number(s: &ArgSpec, number: &str) -> String {
    let v = value(s);
    match v.split_once(' ') {
        Some((_, unit)) => format!("{number} {unit}"),
        None => number.to_string(),
    }
}

/// A table's arguments with the model that uses them, `ARGS` standing for the argument list.
struct Owner {
    name: String,
    specs: &'static [ArgSpec],
    template: String,
    /// Arguments always given besides the table's own (none yet).
    extra: &'static str,
}

/// Materials and nodes every model below may name.
const BASE: &str =
    "material brick (k = 1 W/(m*K), density = 1000 kg/m^3, specific_heat = 1000 J/(kg*K))
node a
node b (fixed = 10 °C)
node c (fixed = 20 °C)
link tie: c to a resistance(1 K/W)
";

fn owners() -> Vec<Owner> {
    let mut out = Vec::new();
    for k in schema::element_kinds() {
        out.push(Owner {
            name: k.name().to_string(),
            specs: k.params(),
            template: format!("{BASE}link x: a to b {}(ARGS)\n", k.name()),
            extra: "",
        });
    }
    for (geom, buildup) in [
        (
            Geometry::Plane,
            "buildup w {\n  f: film(h = 10 W/(m^2*K))\n}\n",
        ),
        (
            Geometry::Cylinder,
            "buildup w {\n  s: cylinder(brick, thickness = 10 mm)\n}\n",
        ),
        (
            Geometry::Sphere,
            "buildup w {\n  s: sphere(brick, thickness = 10 mm)\n}\n",
        ),
    ] {
        out.push(Owner {
            name: format!("{geom:?} build-up use"),
            specs: schema::buildup_use(geom),
            template: format!("{BASE}{buildup}link x: a to b w(ARGS)\n"),
            extra: "",
        });
    }
    for d in schema::DECLARATIONS {
        let DeclArgs::Fixed(specs) = d.args else {
            continue;
        };
        let template = match d.word {
            "node" => format!("{BASE}node n (ARGS)\nlink l: n to b resistance(1 K/W)\n"),
            "material" => format!("{BASE}material m (ARGS)\nlink l: a to b layer(m, thickness = 1 m, area = 1 m^2)\n"),
            "schedule" => format!("{BASE}schedule s (ARGS) {{\n  0 h: 1 °C\n  1 h: 2 °C\n}}\n"),
            "transient" => format!("{BASE}node h (capacity = 1 kJ/K)\nlink l: h to b resistance(1 K/W)\ntransient t (ARGS)\n"),
            "repeat" => format!("{BASE}repeat r (ARGS) {{\n  node t\n  link l: t to b resistance(1 K/W)\n}}\n"),
            "region" => format!("{BASE}region r (ARGS) {{\n  left: b\n}}\n"),
            w => panic!("no test model for `{w}`"),
        };
        out.push(Owner {
            name: d.word.to_string(),
            specs,
            template,
            extra: "",
        });
    }
    out
}

/// The error codes of the model with these arguments.
fn errors(o: &Owner, args: &[(String, String)]) -> Vec<&'static str> {
    let list: Vec<String> = args.iter().map(|(n, v)| format!("{n} = {v}")).collect();
    let mut list = list.join(", ");
    if !o.extra.is_empty() {
        list = format!("{list}, {}", o.extra);
    }
    let text = o.template.replace("ARGS", &list);
    analyze("model.heat", &text, &NoImports, &Options::default())
        .diagnostics
        .iter()
        .filter(|d| d.is_error())
        .map(|d| d.code)
        .collect()
}

/// The required arguments and the first of each pair of alternatives.
fn minimal(specs: &[ArgSpec]) -> Vec<(String, String)> {
    let mut chosen: Vec<&ArgSpec> = Vec::new();
    for s in specs {
        let take = match s.need {
            Need::Required => true,
            Need::Either(o) => !chosen.iter().any(|c| c.name == o),
            _ => false,
        };
        if take {
            chosen.push(s);
        }
    }
    chosen
        .iter()
        .map(|s| (s.name.to_string(), value(s).to_string()))
        .collect()
}

fn without(args: &[(String, String)], name: &str) -> Vec<(String, String)> {
    args.iter().filter(|a| a.0 != name).cloned().collect()
}

fn with(args: &[(String, String)], s: &ArgSpec, v: String) -> Vec<(String, String)> {
    let mut out = without(args, s.name);
    out.push((s.name.to_string(), v));
    out
}

#[test]
fn a_minimal_use_of_every_table_checks_clean() {
    for o in owners() {
        let args = minimal(o.specs);
        assert_eq!(
            errors(&o, &args),
            Vec::<&str>::new(),
            "{}: {args:?}",
            o.name
        );
    }
}

#[test]
fn required_arguments_and_alternatives_are_enforced() {
    for o in owners() {
        let args = minimal(o.specs);
        let spec = |n: &str| o.specs.iter().find(|s| s.name == n).expect("partner");
        for s in o.specs {
            match s.need {
                Need::Required => {
                    let e = errors(&o, &without(&args, s.name));
                    assert!(
                        e.contains(&"E203"),
                        "{} without `{}`: {e:?}",
                        o.name,
                        s.name
                    );
                }
                Need::Either(other) if args.iter().any(|a| a.0 == s.name) => {
                    let both = with(&args, spec(other), value(spec(other)).to_string());
                    let e = errors(&o, &both);
                    assert!(
                        e.contains(&"E207"),
                        "{} with `{}` and `{other}`: {e:?}",
                        o.name,
                        s.name
                    );
                    let e = errors(&o, &without(&args, s.name));
                    assert!(
                        e.contains(&"E203"),
                        "{} without `{}` or `{other}`: {e:?}",
                        o.name,
                        s.name
                    );
                }
                Need::Instead(other) => {
                    let both = with(
                        &with(&args, s, value(s).to_string()),
                        spec(other),
                        value(spec(other)).to_string(),
                    );
                    let e = errors(&o, &both);
                    assert!(
                        e.contains(&"E207"),
                        "{} with `{}` and `{other}`: {e:?}",
                        o.name,
                        s.name
                    );
                }
                Need::With(other) => {
                    let e = errors(&o, &with(&args, s, value(s).to_string()));
                    assert!(
                        e.contains(&"E203"),
                        "{} with `{}` but no `{other}`: {e:?}",
                        o.name,
                        s.name
                    );
                }
                _ => {}
            }
        }
    }
}

#[test]
fn values_outside_their_range_are_refused() {
    for o in owners() {
        let args = minimal(o.specs);
        for s in o.specs {
            let cases: &[(&str, &str)] = match s.range {
                Range::Positive => &[("0", "E202"), ("-1", "E202")],
                Range::Fraction => &[("0", "E202"), ("1.5", "E213")],
                Range::Count(_) => &[("2.5", "E216"), ("0", "E216")],
                Range::AboveAbsoluteZero => &[("0 K", "E202")],
                Range::Any => &[],
            };
            for (number, code) in cases {
                let v = if number.contains(' ') {
                    number.to_string()
                } else {
                    with_number(s, number)
                };
                let e = errors(&o, &with(&args, s, v.clone()));
                assert!(
                    e.contains(code),
                    "{}: `{} = {v}` gives {e:?}",
                    o.name,
                    s.name
                );
            }
        }
        if let Some(Range::Count(max)) = o
            .specs
            .iter()
            .map(|s| s.range)
            .find(|r| matches!(r, Range::Count(_)))
        {
            let s = o
                .specs
                .iter()
                .find(|s| s.range == Range::Count(max))
                .expect("count");
            let e = errors(&o, &with(&args, s, format!("{}", max as u64 + 1)));
            assert!(
                e.contains(&"E216"),
                "{}: {} above {max}: {e:?}",
                o.name,
                s.name
            );
        }
    }
}

#[test]
fn an_unknown_argument_is_offered_the_nearest_name_of_its_table() {
    for o in owners() {
        let args = minimal(o.specs);
        let Some(first) = o.specs.iter().find(|s| s.name.len() > 3) else {
            continue;
        };
        // A slip: the name with its last letter doubled.
        let slip = format!("{}{}", first.name, &first.name[first.name.len() - 1..]);
        let mut written = without(&args, first.name);
        written.push((slip.clone(), value(first).to_string()));
        let text = o.template.replace(
            "ARGS",
            &written
                .iter()
                .map(|(n, v)| format!("{n} = {v}"))
                .collect::<Vec<_>>()
                .join(", "),
        );
        let a = analyze("model.heat", &text, &NoImports, &Options::default());
        let d = a
            .diagnostics
            .iter()
            .find(|d| d.code == "E204")
            .unwrap_or_else(|| panic!("{}: `{slip}` gives {:?}", o.name, a.diagnostics));
        assert!(d.message.contains(&slip), "{}", d.message);
        let fix = d.fix.as_ref().map(|f| f.replacement.as_str());
        assert_eq!(fix, Some(first.name), "{}: the fix for `{slip}`", o.name);
        // The misspelt argument is reported once, as the unknown name, not also as missing.
        assert!(
            !a.diagnostics.iter().any(|d| d.code == "E203"),
            "{}: {:?}",
            o.name,
            a.diagnostics
        );
    }
}

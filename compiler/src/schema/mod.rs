//! The language's declarations in one table: every declaration word with its one-line doc and
//! form, and every argument a declaration or element kind takes — its name, what its value is
//! (a dimension, a temperature on a scale, a material, ...), whether it is required, the range
//! it must lie in, its default and a one-line doc.
//!
//! Elaboration checks arguments against these specs; the editor queries, the language server's
//! completion, signature help and hover, the generated argument reference in
//! `docs/language.md` and the test of the editor grammars all read them, so nothing else keeps
//! a list of the language's words. Element kinds keep their specs beside their laws
//! (`crate::elements`), in the same [`ArgSpec`] type; [`element_kinds`] reaches them from here.

mod declarations;
mod reference;
mod words;

#[cfg(test)]
mod tests;

pub use declarations::{
    buildup_use, DECLARATIONS, MATERIAL, NODE, PLANE_USE, REPEAT, SCHEDULE, TRANSIENT,
};
pub use reference::markdown_reference;
pub use words::{
    function, measure, FunctionSpec, MeasureSpec, CONSTANTS, FUNCTIONS, MEASURES, OTHER_KEYWORDS,
    REGION_SIDES,
};

use crate::elements::{self, ElementKind};
use crate::units::Dim;

/// What an argument's value is.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ArgType {
    /// A quantity of this dimension (`140 mm`, `8 W/(m^2*K)`, a bare number when dimensionless).
    Quantity(Dim),
    /// A temperature on a scale (`20 °C`); a difference (`5 Δ°C`) is refused.
    Temperature,
    /// A temperature difference (`0.01 K`); a temperature on a scale is refused.
    TemperatureDifference,
    /// A quantity of this dimension, or the name of a `schedule` of it (a temperature on a scale
    /// for [`Dim::TEMPERATURE`]): a boundary temperature or load that may follow a time table.
    Scheduled(Dim),
    /// A conductivity, or `table(T₁, k₁, T₂, k₂, …)` of rising temperatures.
    Conductivity,
    /// The name of a declared material.
    Material,
    /// The name of a node.
    Node,
    /// One of a fixed set of words (`fluid = air`, `facing = up`).
    Choice(&'static [&'static str]),
}

impl ArgType {
    /// The dimension of a quantity-valued argument.
    pub fn dim(self) -> Option<Dim> {
        match self {
            ArgType::Quantity(d) | ArgType::Scheduled(d) => Some(d),
            ArgType::Temperature | ArgType::TemperatureDifference => Some(Dim::TEMPERATURE),
            ArgType::Conductivity => Some(Dim::CONDUCTIVITY),
            ArgType::Material | ArgType::Node | ArgType::Choice(_) => None,
        }
    }

    /// What the value is, in the analyst's words: `a length (m)`, `the name of a material`.
    pub fn describe(self) -> String {
        match self {
            ArgType::Quantity(d) => d.describe(),
            ArgType::Temperature => "a temperature on a scale (°C, °F or K)".to_string(),
            ArgType::TemperatureDifference => "a temperature difference (K or Δ°C)".to_string(),
            ArgType::Scheduled(d) if d == Dim::TEMPERATURE => {
                "a temperature on a scale, or the name of a schedule of them".to_string()
            }
            ArgType::Scheduled(d) => format!("{}, or the name of a schedule of them", d.describe()),
            ArgType::Conductivity => format!(
                "{}, or `table(T₁, k₁, T₂, k₂, …)`",
                Dim::CONDUCTIVITY.describe()
            ),
            ArgType::Material => "the name of a declared material".to_string(),
            ArgType::Node => "the name of a node".to_string(),
            ArgType::Choice(words) => format!(
                "one of {}",
                words
                    .iter()
                    .map(|w| format!("`{w}`"))
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
        }
    }
}

/// Whether an argument must be given.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Need {
    Required,
    Optional,
    /// Exactly one of this argument and the other must be given (`material` or `k`).
    Either(&'static str),
    /// Optional, but not together with the other (`capacity` instead of `material`).
    Instead(&'static str),
    /// Optional, and only together with the other (`k_slope` with `k_at`).
    With(&'static str),
}

impl Need {
    /// `required`, `optional`, `required unless `k` is given`, ...
    pub fn describe(self) -> String {
        match self {
            Need::Required => "required".to_string(),
            Need::Optional => "optional".to_string(),
            Need::Either(o) => format!("required unless `{o}` is given"),
            Need::Instead(o) => format!("optional, instead of `{o}`"),
            Need::With(o) => format!("optional, together with `{o}`"),
        }
    }
}

/// The values an argument accepts beyond its type.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Range {
    /// Any value of the type (within what the solver can compute with).
    Any,
    /// Greater than zero.
    Positive,
    /// Greater than zero and at most 1 (an emissivity, a view factor).
    Fraction,
    /// A whole number from 1 to the bound (a number of cells, fins or copies).
    Count(u32),
    /// A temperature above absolute zero.
    AboveAbsoluteZero,
}

impl Range {
    /// `greater than zero`, `0 < x ≤ 1`, ...; empty for [`Range::Any`].
    pub fn describe(self) -> String {
        match self {
            Range::Any => String::new(),
            Range::Positive => "greater than zero".to_string(),
            Range::Fraction => "greater than 0, at most 1".to_string(),
            Range::Count(max) => format!("a whole number from 1 to {max}"),
            Range::AboveAbsoluteZero => "above absolute zero".to_string(),
        }
    }
}

/// One argument a declaration or element kind takes.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct ArgSpec {
    pub name: &'static str,
    pub ty: ArgType,
    pub need: Need,
    pub range: Range,
    /// What applies when the argument is left out, as the docs state it.
    pub default: Option<&'static str>,
    /// One line for completion, signature help and hover.
    pub doc: &'static str,
}

impl ArgSpec {
    /// An optional argument of any value; the builders below narrow it.
    pub const fn new(name: &'static str, ty: ArgType, doc: &'static str) -> ArgSpec {
        ArgSpec {
            name,
            ty,
            need: Need::Optional,
            range: Range::Any,
            default: None,
            doc,
        }
    }
    pub const fn required(self) -> ArgSpec {
        ArgSpec {
            need: Need::Required,
            ..self
        }
    }
    pub const fn optional(self) -> ArgSpec {
        ArgSpec {
            need: Need::Optional,
            ..self
        }
    }
    pub const fn either(self, other: &'static str) -> ArgSpec {
        ArgSpec {
            need: Need::Either(other),
            ..self
        }
    }
    pub const fn instead(self, other: &'static str) -> ArgSpec {
        ArgSpec {
            need: Need::Instead(other),
            ..self
        }
    }
    pub const fn with(self, other: &'static str) -> ArgSpec {
        ArgSpec {
            need: Need::With(other),
            ..self
        }
    }
    pub const fn positive(self) -> ArgSpec {
        ArgSpec {
            range: Range::Positive,
            ..self
        }
    }
    pub const fn fraction(self) -> ArgSpec {
        ArgSpec {
            range: Range::Fraction,
            ..self
        }
    }
    pub const fn count(self, max: u32) -> ArgSpec {
        ArgSpec {
            range: Range::Count(max),
            ..self
        }
    }
    pub const fn above_absolute_zero(self) -> ArgSpec {
        ArgSpec {
            range: Range::AboveAbsoluteZero,
            ..self
        }
    }
    pub const fn default(self, default: &'static str) -> ArgSpec {
        ArgSpec {
            default: Some(default),
            ..self
        }
    }

    /// The doc line with what the value is, whether it is needed, its range and its default:
    /// what hover and signature help show.
    pub fn describe(&self) -> String {
        let mut out = format!("{} — {}", self.doc, self.ty.describe());
        let range = self.range.describe();
        if !range.is_empty() {
            out.push_str(&format!(", {range}"));
        }
        out.push_str(&format!("; {}", self.need.describe()));
        if let Some(d) = self.default {
            out.push_str(&format!(", default {d}"));
        }
        out
    }
}

/// A positive quantity: the common case among element arguments (thickness, area, k, h, ...).
pub const fn quantity(name: &'static str, dim: Dim, doc: &'static str) -> ArgSpec {
    ArgSpec::new(name, ArgType::Quantity(dim), doc).positive()
}

/// One of a fixed set of words.
pub const fn choice(
    name: &'static str,
    words: &'static [&'static str],
    doc: &'static str,
) -> ArgSpec {
    ArgSpec::new(name, ArgType::Choice(words), doc)
}

/// The name of a declared material.
pub const fn material(doc: &'static str) -> ArgSpec {
    ArgSpec::new("material", ArgType::Material, doc)
}

/// What the arguments of a declaration are.
#[derive(Clone, Copy, Debug)]
pub enum DeclArgs {
    /// None (`title`, `import`, `param`).
    None,
    /// The arguments listed.
    Fixed(&'static [ArgSpec]),
    /// Those of the link's element kind ([`element_kinds`]) or, for a build-up, [`buildup_use`].
    OfKind,
    /// A build-up lists elements, one per line, each with its element kind's arguments.
    Elements,
    /// A limit: a measure ([`MEASURES`]) of a subject, compared with a value.
    Measure,
    /// The parameters of the model, each given a value (`case`).
    Parameters,
    /// The ports of the sub-network, each a node (`network`).
    Ports,
    /// The ports and parameters of the sub-network used (`use`).
    OfNetwork,
}

/// One declaration word.
#[derive(Clone, Copy, Debug)]
pub struct DeclSpec {
    pub word: &'static str,
    /// A keyword everywhere (`node`), or a contextual word that begins a declaration only at the
    /// start of a line and followed by a name (`schedule`), an ordinary name elsewhere.
    pub reserved: bool,
    /// What messages call one (`node`, `transient run`, `build-up`).
    pub noun: &'static str,
    /// One line for completion and hover.
    pub doc: &'static str,
    /// How it is written: `node NAME (ARGUMENTS)`.
    pub form: &'static str,
    /// A complete example.
    pub example: &'static str,
    pub args: DeclArgs,
}

impl DeclSpec {
    /// The listed arguments; empty for declarations whose arguments depend on something else.
    pub fn arg_specs(&self) -> &'static [ArgSpec] {
        match self.args {
            DeclArgs::Fixed(a) => a,
            _ => &[],
        }
    }
    pub fn arg(&self, name: &str) -> Option<&'static ArgSpec> {
        self.arg_specs().iter().find(|a| a.name == name)
    }
}

/// The declaration introduced by `word`.
pub fn declaration(word: &str) -> Option<&'static DeclSpec> {
    DECLARATIONS.iter().find(|d| d.word == word)
}

/// Every declaration word, keywords first.
pub fn declaration_words() -> impl Iterator<Item = &'static str> {
    DECLARATIONS.iter().map(|d| d.word)
}

/// The declaration words that are keywords, and the other keywords (`to`).
pub fn keywords() -> impl Iterator<Item = &'static str> {
    DECLARATIONS
        .iter()
        .filter(|d| d.reserved)
        .map(|d| d.word)
        .chain(OTHER_KEYWORDS.iter().map(|k| k.0))
}

/// The contextual declaration words.
pub fn contextual_words() -> impl Iterator<Item = &'static str> {
    DECLARATIONS.iter().filter(|d| !d.reserved).map(|d| d.word)
}

/// Every element kind with its arguments (the table in `crate::elements`).
pub fn element_kinds() -> impl Iterator<Item = &'static dyn ElementKind> {
    elements::ALL.iter().copied()
}

/// The spec of `name` among `specs`.
pub fn find(specs: &'static [ArgSpec], name: &str) -> Option<&'static ArgSpec> {
    specs.iter().find(|s| s.name == name)
}

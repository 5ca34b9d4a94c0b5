//! The context every pass of elaboration shares: the evaluator of parameters, the symbol table,
//! the network being assembled, the checked materials, what transient runs collect, and the
//! diagnostics.

use super::args;
use crate::assemble::Assembler;
use crate::diagnostic::Diagnostic;
use crate::elements::Material;
use crate::eval::{Evaluator, NameKinds};
use crate::schema;
use crate::source::Sources;
use crate::span::Span;
use crate::symbols::SymbolTable;
use crate::syntax::{Arg, Ident, Item, ItemKind, Row};
use crate::transient::model::{Dynamics, Studies};
use rustc_hash::FxHashMap;

/// What the symbol table says a name is, for the evaluator's messages.
pub(super) struct Kinds<'a>(pub &'a SymbolTable);
impl NameKinds for Kinds<'_> {
    fn kind_of(&self, name: &str) -> Option<&'static str> {
        self.0.get(name).map(|s| s.kind.article())
    }
}

/// What the passes about transient runs collect: capacities, schedules and initial
/// temperatures (`dynamics`), cases and runs (`studies`).
/// What this pass collects while elaboration runs.
#[derive(Default)]
pub(super) struct Timed {
    pub dynamics: Dynamics,
    pub studies: Studies,
    pub schedule_index: FxHashMap<String, usize>,
}

pub(super) struct Cx<'a> {
    pub ev: Evaluator<'a>,
    pub symbols: SymbolTable,
    pub sources: &'a Sources,
    pub diags: Vec<Diagnostic>,
    /// The network being built: the only way into it.
    pub asm: Assembler,
    pub materials: Vec<Material>,
    pub material_index: FxHashMap<String, usize>,
    pub timed: Timed,
    /// What the arguments being checked belong to (`` `film` ``, ``node `room` ``), for
    /// messages about values out of range; empty outside a declaration.
    pub owner: String,
}

impl<'a> Cx<'a> {
    pub fn new(
        ev: Evaluator<'a>,
        symbols: SymbolTable,
        sources: &'a Sources,
        diags: Vec<Diagnostic>,
    ) -> Cx<'a> {
        Cx {
            ev,
            symbols,
            sources,
            diags,
            asm: Assembler::default(),
            materials: Vec::new(),
            material_index: FxHashMap::default(),
            timed: Timed::default(),
            owner: String::new(),
        }
    }

    pub fn text(&self, span: Span) -> &str {
        self.sources.text(span.file)
    }

    /// The checked material declared under `name`; `None` for an unknown one and for one that
    /// failed its own checks.
    pub fn material_named(&self, name: &str) -> Option<&Material> {
        self.material_index
            .get(name)
            .and_then(|&i| self.materials.get(i))
    }

    /// Check a declaration's arguments against the schema's entry for `word`.
    pub fn declared(&mut self, word: &str, name: &Ident, args: &[Arg]) -> args::Checked {
        let Some(d) = schema::declaration(word) else {
            return args::Checked::default();
        };
        let subject = format!("{} `{}`", d.noun, name.name);
        // The schema's example, with the analyst's own name in it.
        let example = match d.example.split_once(' ') {
            Some((word, rest)) => {
                let end = rest
                    .find(|c: char| !(c.is_alphanumeric() || c == '_'))
                    .unwrap_or(rest.len());
                format!("{word} {}{}", name.name, &rest[end..])
            }
            None => d.example.to_string(),
        };
        self.decl_args(d.arg_specs(), &subject, &example, name.span, args, false)
    }
}

/// The declarations introduced by the contextual word `which` (`schedule`, `case`,
/// `transient`): name, arguments, table rows and span.
pub(super) fn declarations<'i>(
    items: &'i [&'i Item],
    which: &'static str,
) -> impl Iterator<Item = (&'i Ident, &'i [Arg], Option<&'i [Row]>, Span)> + 'i {
    items.iter().filter_map(move |i| match &i.kind {
        ItemKind::Declaration {
            word,
            name,
            args,
            rows,
        } if word.name == which => Some((name, args.as_slice(), rows.as_deref(), i.span)),
        _ => None,
    })
}

//! The syntax tree: what the analyst wrote, with the span of every piece.

use crate::span::Span;
use serde::Serialize;

/// A name as written, with its place.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Ident {
    pub name: String,
    pub span: Span,
}

/// The operators of a [`ExprKind::Chain`]: `+ -` (one level) and `* /` (the level above).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
pub enum BinOp {
    Add,
    Sub,
    Mul,
    Div,
}

impl BinOp {
    pub fn symbol(self) -> &'static str {
        match self {
            BinOp::Add => "+",
            BinOp::Sub => "-",
            BinOp::Mul => "*",
            BinOp::Div => "/",
        }
    }
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub enum ExprKind {
    /// A number and the unit written after it (`12.5 mm`); `unit` is `None` for a bare number.
    /// The number as written is the text at the expression's span.
    Number {
        value: f64,
        unit: Option<(String, Span)>,
    },
    Name(Ident),
    Neg(Box<Expr>),
    /// `a + b - c` or `a * b / c`: operands of one precedence level applied left to right
    /// (`((a + b) - c)`). Kept flat rather than as a left-deep tree of pairs so that a
    /// generated sum of thousands of terms costs no recursion depth in anything that walks
    /// the tree. Always at least one operator in `rest`.
    Chain {
        first: Box<Expr>,
        rest: Vec<(BinOp, Expr)>,
    },
    /// `base ^ exponent`; right-associative (`a ^ b ^ c` is `a ^ (b ^ c)`).
    Power {
        base: Box<Expr>,
        exponent: Box<Expr>,
    },
    Call {
        func: Ident,
        args: Vec<Expr>,
    },
    Paren(Box<Expr>),
    /// Placeholder left by error recovery; never evaluated because the parse error is reported.
    Missing,
}

/// An expression. Its nesting is bounded by the parser (`parser::MAX_EXPR_DEPTH`), so
/// recursive walks over it, derived `Clone`/`PartialEq`/`Debug` and drop are safe.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Expr {
    pub kind: ExprKind,
    pub span: Span,
}

impl Expr {
    /// Every name the expression refers to (not function names), left to right.
    pub fn visit_names<'e>(&'e self, f: &mut dyn FnMut(&'e Ident)) {
        match &self.kind {
            ExprKind::Name(id) => f(id),
            ExprKind::Neg(x) | ExprKind::Paren(x) => x.visit_names(f),
            ExprKind::Chain { first, rest } => {
                first.visit_names(f);
                rest.iter().for_each(|(_, x)| x.visit_names(f));
            }
            ExprKind::Power { base, exponent } => {
                base.visit_names(f);
                exponent.visit_names(f);
            }
            ExprKind::Call { args, .. } => args.iter().for_each(|x| x.visit_names(f)),
            ExprKind::Number { .. } | ExprKind::Missing => {}
        }
    }
}

/// `name = value`, or a bare value for a kind's main argument.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Arg {
    pub name: Option<Ident>,
    pub value: Expr,
    pub span: Span,
}

/// `kind(arguments)`: an element such as `layer(gypsum, thickness = 12.5 mm)`.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct ElementCall {
    pub kind: Ident,
    pub args: Vec<Arg>,
    pub span: Span,
}

#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
pub enum CmpOp {
    Lt,
    Le,
    Gt,
    Ge,
}

impl CmpOp {
    pub fn symbol(self) -> &'static str {
        match self {
            CmpOp::Lt => "<",
            CmpOp::Le => "<=",
            CmpOp::Gt => ">",
            CmpOp::Ge => ">=",
        }
    }
    /// True for `<`/`<=`: the value must stay below the limit.
    pub fn is_upper(self) -> bool {
        matches!(self, CmpOp::Lt | CmpOp::Le)
    }
}

/// One element of a build-up: `insulation: layer(wood_fibre, thickness = 140 mm)`.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct BuildupElement {
    pub name: Ident,
    pub element: ElementCall,
    pub span: Span,
}

#[derive(Clone, Debug, PartialEq, Serialize)]
pub enum ItemKind {
    Title {
        text: String,
    },
    Import {
        path: String,
        path_span: Span,
    },
    Param {
        name: Ident,
        value: Expr,
    },
    Material {
        name: Ident,
        args: Vec<Arg>,
    },
    Node {
        name: Ident,
        args: Vec<Arg>,
    },
    Link {
        name: Ident,
        from: Ident,
        to: Ident,
        element: ElementCall,
    },
    Buildup {
        name: Ident,
        elements: Vec<BuildupElement>,
    },
    Limit {
        name: Ident,
        measure: Ident,
        subject: Ident,
        op: CmpOp,
        value: Expr,
    },
    /// `WORD NAME (ARGS) { KEY: VALUE ... }`: a declaration introduced by a contextual word from
    /// [`DECLARATION_WORDS`] (`schedule`, `case`, `transient`); the argument list and the table
    /// of rows are both optional in the grammar and checked by elaboration.
    Declaration {
        word: Ident,
        name: Ident,
        args: Vec<Arg>,
        rows: Option<Vec<Row>>,
    },
    /// `repeat NAME (count = N, first = NODE) { declarations }`: N copies of the body, copy i's
    /// names prefixed `NAME.i.` (see `crate::expand`).
    Repeat {
        name: Ident,
        args: Vec<Arg>,
        body: Vec<Item>,
    },
    /// `network NAME (PORT, ...) { declarations }`: a reusable sub-network; ports are the nodes
    /// a use connects, `param`s in the body are defaults a use may replace.
    Network {
        name: Ident,
        ports: Vec<Ident>,
        body: Vec<Item>,
    },
    /// `use NAME: NETWORK(PORT = NODE, PARAM = VALUE, ...)`: one copy of a sub-network, its
    /// names prefixed `NAME.`.
    Use {
        name: Ident,
        network: Ident,
        args: Vec<Arg>,
    },
    /// `region NAME (ARGS) { SIDE: NODE [ELEMENT(...)] ... }`: a rectangle meshed into cells
    /// (see `crate::region`).
    Region {
        name: Ident,
        args: Vec<Arg>,
        edges: Vec<RegionEdge>,
    },
}

/// Words that begin a declaration only at the start of a line and are otherwise ordinary names
/// (a node may still be called `case`), so adding them breaks no existing model.
pub const DECLARATION_WORDS: &[&str] = &["schedule", "case", "transient"];

/// Words that begin the block declarations of repetition, sub-networks and regions when a name
/// follows; like [`DECLARATION_WORDS`] they stay ordinary names everywhere else.
pub const BLOCK_WORDS: &[&str] = &["repeat", "network", "use", "region"];

/// Whether `word` is one of the contextual words that may open a declaration.
pub fn is_declaration_word(word: &str) -> bool {
    DECLARATION_WORDS.contains(&word) || BLOCK_WORDS.contains(&word)
}

/// One row of a declaration's table, `6 h: -4 °C` (a time and a value in a schedule).
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Row {
    pub key: Expr,
    pub value: Expr,
    pub span: Span,
}

/// One attachment of a region: `right: air film(h = 10 W/(m^2*K))`, or `left: hot_bar`.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct RegionEdge {
    pub side: Ident,
    pub node: Ident,
    pub element: Option<ElementCall>,
    pub span: Span,
}

/// A top-level declaration.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Item {
    pub kind: ItemKind,
    pub span: Span,
}

impl Item {
    /// The declared name, for items that have one.
    pub fn name(&self) -> Option<&Ident> {
        match &self.kind {
            ItemKind::Title { .. } | ItemKind::Import { .. } => None,
            ItemKind::Param { name, .. }
            | ItemKind::Material { name, .. }
            | ItemKind::Node { name, .. }
            | ItemKind::Link { name, .. }
            | ItemKind::Buildup { name, .. }
            | ItemKind::Limit { name, .. }
            | ItemKind::Declaration { name, .. }
            | ItemKind::Repeat { name, .. }
            | ItemKind::Network { name, .. }
            | ItemKind::Use { name, .. }
            | ItemKind::Region { name, .. } => Some(name),
        }
    }
}

/// A parsed file: its declarations and the comments between them.
#[derive(Clone, Debug, Default, PartialEq, Serialize)]
pub struct Module {
    pub items: Vec<Item>,
    pub comments: Vec<Span>,
}

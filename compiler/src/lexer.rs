//! Tokens of the model language (logos), with comments kept for the formatter.
//!
//! A number swallows the unit written right after it (`12.5 mm`, `0.04 W/(m*K)`): a unit is
//! written without spaces, so spaces are what separate arithmetic from units.

use crate::span::{FileId, Span};
use logos::Logos;

#[derive(Logos, Clone, Copy, Debug, PartialEq, Eq)]
#[logos(skip r"[ \t\r\n\f]+")]
pub enum Tok {
    #[regex(r"#[^\n]*", allow_greedy = true)]
    Comment,
    #[token("title")]
    Title,
    #[token("import")]
    Import,
    #[token("param")]
    Param,
    #[token("material")]
    Material,
    #[token("node")]
    Node,
    #[token("link")]
    Link,
    #[token("buildup")]
    Buildup,
    #[token("limit")]
    Limit,
    #[token("to")]
    To,
    // Segments after a dot may start with a digit: `fin.3.t` names a node of copy 3 of a
    // repetition.
    #[regex(r"[A-Za-z_][A-Za-z0-9_]*(\.[A-Za-z0-9_]+)*")]
    Ident,
    /// A number and the unit written after it; the payload is the byte length of the number.
    #[regex(r"[0-9]+(\.[0-9]*)?([eE][+-]?[0-9]+)?", number_with_unit)]
    #[regex(r"\.[0-9]+([eE][+-]?[0-9]+)?", number_with_unit)]
    Number(u32),
    #[regex(r#""([^"\\\n]|\\.)*""#)]
    Str,
    #[regex(r#""([^"\\\n]|\\.)*"#, priority = 1)]
    UnterminatedStr,
    #[token("(")]
    LParen,
    #[token(")")]
    RParen,
    #[token("{")]
    LBrace,
    #[token("}")]
    RBrace,
    #[token(",")]
    Comma,
    #[token(":")]
    Colon,
    #[token("=")]
    Eq,
    #[token("+")]
    Plus,
    #[token("-")]
    #[token("−")]
    Minus,
    #[token("*")]
    #[token("·")]
    #[token("×")]
    Star,
    #[token("/")]
    Slash,
    #[token("^")]
    Caret,
    #[token("<")]
    Lt,
    #[token("<=")]
    #[token("≤")]
    Le,
    #[token(">")]
    Gt,
    #[token(">=")]
    #[token("≥")]
    Ge,
    #[token("±")]
    #[token("+-")]
    PlusMinus,
    /// Any character the language does not use.
    Unknown,
}

fn is_unit_start(c: char) -> bool {
    c.is_alphabetic() || matches!(c, '°' | 'µ' | 'Δ' | '%')
}

fn is_unit_char(c: char) -> bool {
    c.is_alphanumeric()
        || matches!(
            c,
            '_' | '°' | 'µ' | 'Δ' | '²' | '³' | '¹' | '⁴' | '⁻' | '·' | '⋅' | '*' | '/' | '^'
        )
}

/// Extend a number token over the unit that follows it on the same line.
fn number_with_unit(lex: &mut logos::Lexer<Tok>) -> u32 {
    let num_len = lex.slice().len() as u32;
    let rest = lex.remainder();
    let after_space = rest.len() - rest.trim_start_matches([' ', '\t']).len();
    let unit = &rest[after_space..];
    let Some(first) = unit.chars().next() else {
        return num_len;
    };
    // A reciprocal unit is written with the number one: `0.004 1/K`, `2 1/(m*K)`. Only after a
    // space, since the digits right after a number are part of it.
    let reciprocal = after_space > 0 && {
        let mut c = unit.chars();
        c.next() == Some('1')
            && c.next() == Some('/')
            && c.next().is_some_and(|n| is_unit_start(n) || n == '(')
    };
    if !is_unit_start(first) && first != '(' && !reciprocal {
        return num_len;
    }
    // A unit never starts with a bracket unless written `(…)` right after the number with no
    // space, which the language does not use: `2 (a + b)` stays arithmetic.
    if first == '(' {
        return num_len;
    }
    let mut depth = 0i32;
    let mut end = 0;
    let mut prev = ' ';
    for (i, c) in unit.char_indices() {
        let ok = match c {
            '(' => {
                depth += 1;
                true
            }
            ')' if depth > 0 => {
                depth -= 1;
                true
            }
            '-' => prev == '^',
            c => is_unit_char(c),
        };
        if !ok {
            break;
        }
        end = i + c.len_utf8();
        prev = c;
    }
    // Do not swallow a trailing operator or an open bracket that belongs to the expression.
    // The bracket counts are kept as the end moves back, so a unit followed by thousands of
    // brackets is trimmed in one pass, not one count of the text per bracket.
    let mut text = &unit[..end];
    let mut open = text.matches('(').count();
    let close = text.matches(')').count();
    while let Some(last) = text.chars().next_back() {
        if matches!(last, '*' | '/' | '^' | '·' | '⋅' | '(') && open >= close {
            text = &text[..text.len() - last.len_utf8()];
            if last == '(' {
                open -= 1;
            }
        } else {
            break;
        }
    }
    lex.bump(after_space + text.len());
    num_len
}

/// One token with its place in the file.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Token {
    pub kind: Tok,
    pub span: Span,
}

/// Split a file into tokens. Characters the language does not use become `Tok::Unknown`
/// tokens, reported by the parser, so lexing never fails.
pub fn lex(text: &str, file: FileId) -> Vec<Token> {
    tokens(text, file).collect()
}

/// The tokens of `text` one by one, for callers that keep them in a form of their own.
pub fn tokens(text: &str, file: FileId) -> impl Iterator<Item = Token> + '_ {
    let mut lexer = Tok::lexer(text);
    // A byte-order mark that some editors write at the start of a file is not part of the
    // model; spans still count from the file's first byte.
    if text.starts_with('\u{FEFF}') {
        lexer.bump('\u{FEFF}'.len_utf8());
    }
    std::iter::from_fn(move || {
        let res = lexer.next()?;
        let r = lexer.span();
        Some(Token {
            kind: res.unwrap_or(Tok::Unknown),
            span: Span::new(file, r.start, r.end),
        })
    })
}

impl std::fmt::Display for Tok {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.noun())
    }
}

impl Tok {
    /// How a message names a token of this kind (`` `(` ``, "a name", "a number").
    pub fn noun(self) -> &'static str {
        match self {
            Tok::Comment => "a comment",
            Tok::Title => "`title`",
            Tok::Import => "`import`",
            Tok::Param => "`param`",
            Tok::Material => "`material`",
            Tok::Node => "`node`",
            Tok::Link => "`link`",
            Tok::Buildup => "`buildup`",
            Tok::Limit => "`limit`",
            Tok::To => "`to`",
            Tok::Ident => "a name",
            Tok::Number(_) => "a number",
            Tok::Str | Tok::UnterminatedStr => "a string",
            Tok::LParen => "`(`",
            Tok::RParen => "`)`",
            Tok::LBrace => "`{`",
            Tok::RBrace => "`}`",
            Tok::Comma => "`,`",
            Tok::Colon => "`:`",
            Tok::Eq => "`=`",
            Tok::Plus => "`+`",
            Tok::Minus => "`-`",
            Tok::Star => "`*`",
            Tok::Slash => "`/`",
            Tok::Caret => "`^`",
            Tok::Lt => "`<`",
            Tok::Le => "`<=`",
            Tok::Gt => "`>`",
            Tok::Ge => "`>=`",
            Tok::PlusMinus => "`±`",
            Tok::Unknown => "an unexpected character",
        }
    }

    /// Keywords that begin a declaration; error recovery resumes at the next one.
    pub fn starts_item(self) -> bool {
        matches!(
            self,
            Tok::Title
                | Tok::Import
                | Tok::Param
                | Tok::Material
                | Tok::Node
                | Tok::Link
                | Tok::Buildup
                | Tok::Limit
        )
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn kinds(text: &str) -> Vec<(Tok, &str)> {
        lex(text, FileId(0))
            .into_iter()
            .map(|t| (t.kind, &text[t.span.range()]))
            .collect()
    }

    #[test]
    fn units_stick_to_numbers_but_spaced_operators_do_not() {
        assert_eq!(
            kinds("2 m * h"),
            vec![(Tok::Number(1), "2 m"), (Tok::Star, "*"), (Tok::Ident, "h")]
        );
        assert_eq!(
            kinds("0.04 W/(m*K))"),
            vec![(Tok::Number(4), "0.04 W/(m*K)"), (Tok::RParen, ")")]
        );
        assert_eq!(
            kinds("20 °C)"),
            vec![(Tok::Number(2), "20 °C"), (Tok::RParen, ")")]
        );
        assert_eq!(
            kinds("1e-3 m^-2,"),
            vec![(Tok::Number(4), "1e-3 m^-2"), (Tok::Comma, ",")]
        );
        assert_eq!(
            kinds("5 - 2"),
            vec![
                (Tok::Number(1), "5"),
                (Tok::Minus, "-"),
                (Tok::Number(1), "2")
            ]
        );
        assert_eq!(kinds("3 m²·K/W"), vec![(Tok::Number(1), "3 m²·K/W")]);
    }

    #[test]
    fn trailing_operators_and_brackets_stay_out_of_the_unit() {
        assert_eq!(
            kinds("2 mm(("),
            vec![
                (Tok::Number(1), "2 mm"),
                (Tok::LParen, "("),
                (Tok::LParen, "(")
            ]
        );
        assert_eq!(
            kinds("2 W/(m*K)**"),
            vec![
                (Tok::Number(1), "2 W/(m*K)"),
                (Tok::Star, "*"),
                (Tok::Star, "*")
            ]
        );
        // Trimming a long tail is one pass (it counted the brackets again per character).
        let long = format!("2 mm{}{}", "(".repeat(50_000), "*".repeat(50_000));
        let toks = lex(&long, FileId(0));
        assert_eq!(toks.len(), 100_001);
        assert_eq!(&long[toks[0].span.range()], "2 mm");
    }

    #[test]
    fn dotted_names_and_comments() {
        assert_eq!(
            kinds("north.inside # face\nx"),
            vec![
                (Tok::Ident, "north.inside"),
                (Tok::Comment, "# face"),
                (Tok::Ident, "x")
            ]
        );
    }
}

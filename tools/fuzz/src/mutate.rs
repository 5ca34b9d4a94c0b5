//! Mutations of model text: byte flips, token edits, lines spliced from other seeds, repeated
//! lines, deep nesting, extreme numbers and swapped units. Each input gets one to four of them.

use crate::rng::Rng;
use caloris_compiler::lexer::{lex, Tok, Token};
use caloris_compiler::span::FileId;
use caloris_compiler::vocabulary;

/// Mutated inputs are kept below this size (unless told otherwise) so one input cannot take a
/// campaign's memory.
pub const MAX_INPUT_BYTES: usize = 256 * 1024;

/// Besides the language's words (`caloris_compiler::vocabulary`), which a seed may not
/// contain: import paths and string literals the seeds do not have.
const STRINGS: &[&str] = &["\"caloris:materials\"", "\"other.heat\"", "\"\"", "\"é°\""];

const NUMBERS: &[&str] = &[
    "0",
    "-0",
    "0.0",
    "1",
    "-1",
    "2",
    "1e308",
    "-1e308",
    "1.8e308",
    "1e99999",
    "1e-320",
    "4.9e-324",
    "1e-9",
    "1e-300",
    "4294967296",
    "18446744073709551616",
    "65536",
    "100000",
    "100001",
    "999999999999",
    "0.000",
    ".5",
    "5.",
    "1e",
    "1e+",
    "00012",
    "1_000",
    "NaN",
    "inf",
    "-inf",
    "1/0",
    "0/0",
    "(1e308*10)",
    "2^1024",
    "10^-400",
    "1e3e3",
    "1..2",
    "17",
];

const UNITS: &[&str] = &[
    "",
    "m",
    "mm",
    "km",
    "W",
    "kW",
    "K",
    "°C",
    "°F",
    "degC",
    "Δ°C",
    "K/W",
    "W/K",
    "W/(m*K)",
    "W/(m^2*K)",
    "m^2",
    "m²",
    "m³",
    "kJ/K",
    "J/(kg*K)",
    "kg/m^3",
    "s",
    "min",
    "h",
    "d",
    "%",
    "µm",
    "in",
    "ft",
    "Btu/h",
    "W/m^2",
    "m^-1",
    "1/K",
    "kg",
    "Pa",
    "mx",
    "W/(m*K)^2",
    "°",
    "W/(m*K",
    "m^99999",
    "m^-1000000",
    "K^0.5",
];

const CHARS: &[&str] = &[
    "(", ")", "{", "}", ",", ":", "=", "+", "-", "*", "/", "^", "<", ">", "<=", ">=", "±", "·",
    "×", "−", "≤", "≥", "°", "µ", "Δ", "²", "\"", "#", ".", "..", "\n", "\t", "\r", "\r\n", " ",
    "\u{0}", "\u{FEFF}", "\u{2028}", "é", "😀", "e\u{301}", "\u{FFFD}", "\\", "@", ";", "%",
];

pub struct Mutator {
    words: Vec<String>,
    lines: Vec<String>,
    /// A mutation that would make the input larger than this is dropped.
    pub max_bytes: usize,
}

impl Mutator {
    /// A mutator whose dictionary holds the language's words, a few strings and every name and
    /// line of the seeds.
    pub fn new<'a>(seeds: impl IntoIterator<Item = &'a str>) -> Mutator {
        let mut words: Vec<String> = vocabulary::words()
            .into_iter()
            .chain(STRINGS.iter().copied())
            .map(str::to_string)
            .collect();
        let mut lines = Vec::new();
        for text in seeds {
            for t in lex(text, FileId(0)) {
                if t.kind == Tok::Ident || matches!(t.kind, Tok::Number(_)) {
                    words.push(slice(text, &t).to_string());
                }
            }
            lines.extend(
                text.lines()
                    .filter(|l| !l.trim().is_empty() && l.len() < 400)
                    .map(str::to_string),
            );
        }
        words.sort();
        words.dedup();
        lines.sort();
        lines.dedup();
        Mutator {
            words,
            lines,
            max_bytes: MAX_INPUT_BYTES,
        }
    }

    /// `base` changed by one to four mutations; `other` is a second seed for splices.
    pub fn mutate(&self, rng: &mut Rng, base: &str, other: &str) -> String {
        let mut text = base.to_string();
        let n = 1 + rng.below(4);
        for _ in 0..n {
            let next = self.once(rng, &text, other);
            if next.len() <= self.max_bytes {
                text = next;
            }
        }
        text
    }

    fn once(&self, rng: &mut Rng, text: &str, other: &str) -> String {
        match rng.below(20) {
            0 => flip_byte(rng, text),
            1 => {
                let c = rng_pick(rng, CHARS);
                insert_at_char(rng, text, c)
            }
            2 | 3 => self.token_edit(rng, text),
            4 => swap_tokens(rng, text),
            5 | 6 => replace_number(rng, text),
            7 => swap_unit(rng, text),
            8 => self.splice_line(rng, text),
            9 => splice_other(rng, text, other),
            10 => repeat_line(rng, text),
            11 => nest_parens(rng, text),
            12 => nest_blocks(rng, text),
            13 => delete_range(rng, text),
            14 => duplicate_range(rng, text),
            15 => truncate(rng, text),
            16 => delete_lines(rng, text),
            17 => long_name(rng, text),
            18 => self.insert_word(rng, text),
            _ => self.token_edit(rng, text),
        }
    }

    fn token_edit(&self, rng: &mut Rng, text: &str) -> String {
        let toks = lex(text, FileId(0));
        let Some(t) = rng.pick(&toks) else {
            return self.insert_word(rng, text);
        };
        let (s, e) = (t.span.start as usize, t.span.end as usize);
        match rng.below(4) {
            // Delete the token.
            0 => format!("{}{}", &text[..s], &text[e..]),
            // Duplicate it.
            1 => format!("{}{}", &text[..e], &text[s..]),
            // Replace it with a word or a punctuation mark.
            2 => {
                let w = if rng.chance(1, 2) {
                    rng.pick(&self.words).map(String::as_str).unwrap_or("x")
                } else {
                    rng_pick(rng, CHARS)
                };
                format!("{}{}{}", &text[..s], w, &text[e..])
            }
            // Insert a word before it.
            _ => {
                let w = rng.pick(&self.words).map(String::as_str).unwrap_or("x");
                format!("{}{} {}", &text[..s], w, &text[s..])
            }
        }
    }

    fn insert_word(&self, rng: &mut Rng, text: &str) -> String {
        let w = rng.pick(&self.words).map(String::as_str).unwrap_or("x");
        let sep = [" ", "", "\n", "(", " = "][rng.below(5)];
        insert_at_char(rng, text, &format!("{sep}{w}{sep}"))
    }

    fn splice_line(&self, rng: &mut Rng, text: &str) -> String {
        let line = rng.pick(&self.lines).cloned().unwrap_or_default();
        insert_line(rng, text, &line)
    }
}

fn rng_pick<'a>(rng: &mut Rng, items: &'a [&'a str]) -> &'a str {
    rng.pick(items).copied().unwrap_or("")
}

fn slice<'a>(text: &'a str, t: &Token) -> &'a str {
    &text[t.span.start as usize..t.span.end as usize]
}

/// A char boundary of `text` chosen at random (the end included).
fn boundary(rng: &mut Rng, text: &str) -> usize {
    let mut i = rng.below(text.len() + 1);
    while !text.is_char_boundary(i) {
        i -= 1;
    }
    i
}

/// Two boundaries `a <= b`, at most `max` bytes apart.
fn range(rng: &mut Rng, text: &str, max: usize) -> (usize, usize) {
    let a = boundary(rng, text);
    let mut b = (a + rng.below(max + 1)).min(text.len());
    while !text.is_char_boundary(b) {
        b -= 1;
    }
    (a, b)
}

fn flip_byte(rng: &mut Rng, text: &str) -> String {
    let mut bytes = text.as_bytes().to_vec();
    if bytes.is_empty() {
        return "\u{80}".into();
    }
    let i = rng.below(bytes.len());
    bytes[i] ^= 1 << rng.below(8);
    String::from_utf8_lossy(&bytes).into_owned()
}

fn insert_at_char(rng: &mut Rng, text: &str, what: &str) -> String {
    let i = boundary(rng, text);
    format!("{}{}{}", &text[..i], what, &text[i..])
}

fn swap_tokens(rng: &mut Rng, text: &str) -> String {
    let toks = lex(text, FileId(0));
    if toks.len() < 2 {
        return text.to_string();
    }
    let (mut i, mut j) = (rng.below(toks.len()), rng.below(toks.len()));
    if i > j {
        std::mem::swap(&mut i, &mut j);
    }
    if i == j {
        return text.to_string();
    }
    let (a, b) = (&toks[i], &toks[j]);
    format!(
        "{}{}{}{}{}",
        &text[..a.span.start as usize],
        slice(text, b),
        &text[a.span.end as usize..b.span.start as usize],
        slice(text, a),
        &text[b.span.end as usize..]
    )
}

fn numbers(text: &str) -> Vec<Token> {
    lex(text, FileId(0))
        .into_iter()
        .filter(|t| matches!(t.kind, Tok::Number(_)))
        .collect()
}

fn replace_number(rng: &mut Rng, text: &str) -> String {
    let nums = numbers(text);
    let Some(t) = rng.pick(&nums) else {
        let n = rng_pick(rng, NUMBERS);
        return insert_at_char(rng, text, n);
    };
    let Tok::Number(len) = t.kind else {
        return text.to_string();
    };
    let s = t.span.start as usize;
    let e = s + len as usize;
    format!("{}{}{}", &text[..s], rng_pick(rng, NUMBERS), &text[e..])
}

fn swap_unit(rng: &mut Rng, text: &str) -> String {
    let nums = numbers(text);
    let Some(t) = rng.pick(&nums) else {
        return text.to_string();
    };
    let Tok::Number(len) = t.kind else {
        return text.to_string();
    };
    let s = t.span.start as usize + len as usize;
    let unit = rng_pick(rng, UNITS);
    let sep = if unit.is_empty() || rng.chance(1, 3) {
        ""
    } else {
        " "
    };
    format!("{}{sep}{unit}{}", &text[..s], &text[t.span.end as usize..])
}

fn line_starts(text: &str) -> Vec<usize> {
    std::iter::once(0)
        .chain(text.match_indices('\n').map(|(i, _)| i + 1))
        .collect()
}

fn insert_line(rng: &mut Rng, text: &str, line: &str) -> String {
    let starts = line_starts(text);
    let at = starts[rng.below(starts.len())];
    let nl = if at == text.len() && !text.ends_with('\n') && !text.is_empty() {
        "\n"
    } else {
        ""
    };
    format!("{}{nl}{line}\n{}", &text[..at], &text[at..])
}

fn splice_other(rng: &mut Rng, text: &str, other: &str) -> String {
    if rng.chance(1, 2) {
        // Crossover: a head of one and a tail of the other.
        let a = boundary(rng, text);
        let b = boundary(rng, other);
        format!("{}{}", &text[..a], &other[b..])
    } else {
        let (a, b) = range(rng, other, 2000);
        insert_at_char(rng, text, &other[a..b])
    }
}

fn repeat_line(rng: &mut Rng, text: &str) -> String {
    let lines: Vec<&str> = text.lines().collect();
    let Some(line) = rng.pick(&lines) else {
        return text.to_string();
    };
    let times = [2, 10, 100, 1000, 3000][rng.below(5)];
    let block = format!("{line}\n").repeat(times);
    insert_line(rng, text, block.trim_end_matches('\n'))
}

fn nest_parens(rng: &mut Rng, text: &str) -> String {
    let depth = [2, 8, 40, 200, 1000, 3000][rng.below(6)];
    let toks = lex(text, FileId(0));
    let Some(t) = rng.pick(&toks) else {
        return format!("param p = {}1{}", "(".repeat(depth), ")".repeat(depth));
    };
    let (s, e) = (t.span.start as usize, t.span.end as usize);
    let close = if rng.chance(7, 8) {
        depth
    } else {
        rng.below(depth)
    };
    format!(
        "{}{}{}{}{}",
        &text[..s],
        "(".repeat(depth),
        &text[s..e],
        ")".repeat(close),
        &text[e..]
    )
}

fn nest_blocks(rng: &mut Rng, text: &str) -> String {
    let starts = line_starts(text);
    let a = starts[rng.below(starts.len())];
    let b = starts[rng.below(starts.len())].max(a);
    // Deep nesting with one copy per level tests the depth limits; several copies per level
    // only at shallow depths, so the copies stay in the thousands (bigger products are the
    // expansion-size class, met often enough by the seeds' own counts).
    let (depth, open, close) = match rng.below(4) {
        0 => (
            [1, 2, 5, 17, 100, 1000][rng.below(6)],
            "repeat r (count = 1) {\n".to_string(),
            "}\n",
        ),
        1 => (
            rng.range(1, 10),
            "repeat r (count = 2) {\n".to_string(),
            "}\n",
        ),
        2 => (
            [1, 2, 17, 100][rng.below(4)],
            "network n (p) {\n".to_string(),
            "}\n",
        ),
        _ => (
            rng.range(1, 2),
            format!("repeat q (count = {}) {{\n", rng.range(1, 40)),
            "}\n",
        ),
    };
    let mut body = String::from(&text[a..b]);
    if !body.is_empty() && !body.ends_with('\n') {
        body.push('\n');
    }
    format!(
        "{}{}{}{}{}",
        &text[..a],
        open.repeat(depth),
        body,
        close.repeat(depth),
        &text[b..]
    )
}

fn delete_range(rng: &mut Rng, text: &str) -> String {
    let (a, b) = range(rng, text, 64);
    format!("{}{}", &text[..a], &text[b..])
}

fn duplicate_range(rng: &mut Rng, text: &str) -> String {
    let (a, b) = range(rng, text, 200);
    format!("{}{}", &text[..b], &text[a..])
}

fn truncate(rng: &mut Rng, text: &str) -> String {
    text[..boundary(rng, text)].to_string()
}

fn delete_lines(rng: &mut Rng, text: &str) -> String {
    let lines: Vec<&str> = text.lines().collect();
    if lines.is_empty() {
        return String::new();
    }
    let a = rng.below(lines.len());
    let b = (a + 1 + rng.below(4)).min(lines.len());
    let mut out: Vec<&str> = lines[..a].to_vec();
    out.extend(&lines[b..]);
    out.join("\n")
}

fn long_name(rng: &mut Rng, text: &str) -> String {
    let idents: Vec<Token> = lex(text, FileId(0))
        .into_iter()
        .filter(|t| t.kind == Tok::Ident)
        .collect();
    let Some(t) = rng.pick(&idents) else {
        return text.to_string();
    };
    let len = [50, 1000, 20_000][rng.below(3)];
    let name = format!("{}{}", slice(text, t), "n".repeat(len));
    format!(
        "{}{}{}",
        &text[..t.span.start as usize],
        name,
        &text[t.span.end as usize..]
    )
}

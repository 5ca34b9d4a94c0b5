//! Line breaking and indentation: from pieces to lines.
//!
//! The rules need only light structure, so constructs added to the language later are laid out
//! sensibly without this file knowing them:
//! - a declaration keyword starts a new line (at the top level or inside `{ }`), and so does
//!   `name:` after a complete value (build-up elements);
//! - a line break the analyst put between two values is kept: it separates two entries of a
//!   block or declarations this formatter may not know;
//! - `{` ends its line, the block's entries are indented two spaces, `}` stands on its own line;
//! - a bracket group `( … )` stays on one line unless the analyst broke the line right after
//!   `(` or the group holds a comment; then each comma-separated item gets its own line;
//! - a comment stays after the token it followed, or on its own line; a token that has to
//!   follow a comment mid-declaration goes on a continuation line, indented four spaces;
//! - runs of blank lines become one; blank lines after an opening or before a closing bracket go.

use super::pieces::Piece;
use super::spacing::{separator, Join};

/// Indentation of a block's entries and of a broken bracket group's items.
const INDENT: usize = 2;
/// Indentation of a declaration's continuation line (after a comment in mid-declaration).
const CONTINUATION: usize = 4;

/// One output line before alignment.
#[derive(Clone, Debug, Default)]
pub struct Line {
    pub indent: usize,
    pub code: String,
    pub comment: Option<String>,
    pub blank_before: bool,
    /// The declaration head (`node room`, `link north:`, `inside:`) that alignment lines up.
    pub head: Option<Head>,
}

#[derive(Clone, Debug)]
pub struct Head {
    /// Lines whose heads share a key (indentation and keyword) are aligned together.
    pub key: String,
    /// Byte length of the head at the start of `code`.
    pub len: usize,
}

#[derive(Clone, Copy, PartialEq, Eq, Debug)]
enum FrameKind {
    Block,
    Broken,
    Inline,
}

struct Frame {
    kind: FrameKind,
    opener: usize,
    close: Option<usize>,
    open_indent: usize,
    inner_indent: usize,
    saved_entry_indent: usize,
}

#[derive(Clone, Copy, Debug)]
enum Break {
    /// A new entry (declaration, block entry, group item) at this indentation.
    Entry(usize),
    /// A closing bracket on its own line at this indentation.
    Closer(usize),
    /// The token continues the current line if it can.
    Join,
}

struct Emitter<'a> {
    p: &'a [Piece],
    sig: Vec<usize>,
    closers: Vec<Option<usize>>,
    broken: Vec<bool>,
    lines: Vec<Line>,
    cur: Option<Line>,
    cur_opens: bool,
    block_start: bool,
    stack: Vec<Frame>,
    entry_indent: usize,
    last: Option<usize>,
    last_is_sign: bool,
    head_pending: Option<(String, usize)>,
}

/// Lay pieces out as lines (no alignment yet).
pub fn layout(p: &[Piece]) -> Vec<Line> {
    let closers = super::pieces::match_brackets(p);
    let broken = p
        .iter()
        .enumerate()
        .map(|(i, piece)| {
            let Some(c) = closers[i] else { return false };
            if piece.is("{") {
                return false;
            }
            let inside = &p[i + 1..c];
            let has_comment = inside.iter().any(Piece::is_comment);
            let has_code = inside.iter().any(|x| !x.is_comment());
            has_comment || (has_code && inside.first().is_some_and(|x| x.newlines > 0))
        })
        .collect();
    let sig = (0..p.len()).filter(|&i| !p[i].is_comment()).collect();
    let mut e = Emitter {
        p,
        sig,
        closers,
        broken,
        lines: Vec::new(),
        cur: None,
        cur_opens: false,
        block_start: false,
        stack: Vec::new(),
        entry_indent: 0,
        last: None,
        last_is_sign: false,
        head_pending: None,
    };
    e.run();
    e.lines
}

impl Emitter<'_> {
    fn run(&mut self) {
        let mut scan_from = 0;
        let mut s = 0;
        while s < self.sig.len() {
            let i = self.sig[s];
            let brk = self.break_before(s);
            self.comments(scan_from..i, brk);
            let consumed = self.place(s, brk);
            scan_from = self.sig[s + consumed - 1] + 1;
            s += consumed;
        }
        let base = self.base_indent();
        self.comments(scan_from..self.p.len(), Break::Entry(base));
        self.finish_line();
    }

    fn base_indent(&self) -> usize {
        self.stack
            .iter()
            .rev()
            .find(|f| f.kind != FrameKind::Inline)
            .map_or(0, |f| f.inner_indent)
    }

    fn sig_piece(&self, s: usize) -> Option<&Piece> {
        self.sig.get(s).map(|&i| &self.p[i])
    }

    /// Where the entries of a declaration-like list start: the top level or a `{ }` block.
    fn in_entry_context(&self) -> bool {
        self.stack.last().is_none_or(|f| f.kind == FrameKind::Block)
    }

    fn break_before(&self, s: usize) -> Break {
        let i = self.sig[s];
        let n = &self.p[i];
        let Some(last) = self.last else {
            return Break::Entry(0);
        };
        let lp = &self.p[last];
        if let Some(top) = self.stack.last() {
            if top.kind != FrameKind::Inline {
                if top.close == Some(i) {
                    return Break::Closer(top.open_indent);
                }
                if top.opener == last {
                    return Break::Entry(top.inner_indent);
                }
                if top.kind == FrameKind::Broken && lp.is(",") {
                    return Break::Entry(top.inner_indent);
                }
            }
        }
        if self.in_entry_context() {
            let base = self.base_indent();
            if n.starts_item() {
                return Break::Entry(base);
            }
            let next_is_colon = self.sig_piece(s + 1).is_some_and(|x| x.is(":"));
            // `use kitchen_wall: …`: the name after a contextual declaration word stays with it.
            let after_word =
                lp.kind == crate::lexer::Tok::Ident && crate::syntax::is_declaration_word(&lp.text);
            if n.kind == crate::lexer::Tok::Ident && next_is_colon && lp.ends_value() && !after_word
            {
                return Break::Entry(base);
            }
            // Two values with a line break between them are two entries, unless the first
            // follows an infix keyword (`to b` then the link's kind on the next line).
            let after_infix = last
                .checked_sub(1)
                .and_then(|b| self.prev_sig(b))
                .is_some_and(|x| x.is_keyword() && !x.starts_item());
            if n.newlines > 0 && lp.ends_value() && n.starts_value() && !after_infix {
                return Break::Entry(base);
            }
        }
        Break::Join
    }

    fn comments(&mut self, range: std::ops::Range<usize>, brk: Break) {
        for i in range {
            let c = &self.p[i];
            let trailing =
                c.newlines == 0 && self.cur.as_ref().is_some_and(|l| l.comment.is_none());
            if trailing {
                if let Some(line) = self.cur.as_mut() {
                    line.comment = Some(c.text.clone());
                }
                self.finish_line();
                continue;
            }
            self.finish_line();
            let indent = match brk {
                Break::Entry(ind) => ind,
                Break::Closer(_) => self.base_indent(),
                Break::Join => self.entry_indent + CONTINUATION,
            };
            let blank_before = c.newlines >= 2 && !self.lines.is_empty() && !self.block_start;
            self.block_start = false;
            self.lines.push(Line {
                indent,
                code: String::new(),
                comment: Some(c.text.clone()),
                blank_before,
                head: None,
            });
        }
    }

    fn start_line(&mut self, indent: usize, blank_before: bool) {
        self.finish_line();
        self.block_start = false;
        self.cur = Some(Line {
            indent,
            blank_before,
            ..Line::default()
        });
    }

    fn finish_line(&mut self) {
        if let Some(line) = self.cur.take() {
            self.block_start = self.cur_opens;
            self.lines.push(line);
        }
        self.cur_opens = false;
        self.head_pending = None;
    }

    /// The alignment head of an entry starting at sig index `s`: the keyword, the declared name
    /// and its `:`, or a block entry's `name:`.
    fn head_for(&self, s: usize, indent: usize) -> Option<(String, usize)> {
        let n = self.sig_piece(s)?;
        let n1 = self.sig_piece(s + 1);
        let colon_at = |k: usize| self.sig_piece(k).is_some_and(|x| x.is(":"));
        if n.is_keyword() {
            if n1.is_some_and(|x| x.kind == crate::lexer::Tok::Ident) {
                return Some(if colon_at(s + 2) {
                    (format!("{indent} {}:", n.text), 3)
                } else {
                    (format!("{indent} {}", n.text), 2)
                });
            }
            return Some((format!("{indent} {}", n.text), 1));
        }
        if n.kind == crate::lexer::Tok::Ident && colon_at(s + 1) {
            return Some((format!("{indent} name:"), 2));
        }
        None
    }

    /// Put the token at sig index `s` on the current or a new line. Returns how many sig
    /// tokens were consumed (two for an empty block `{}`).
    fn place(&mut self, s: usize, brk: Break) -> usize {
        let i = self.sig[s];
        let n = &self.p[i];
        match brk {
            Break::Entry(indent) | Break::Closer(indent) => {
                let is_entry = matches!(brk, Break::Entry(_));
                self.finish_line();
                let blank =
                    is_entry && n.newlines >= 2 && !self.lines.is_empty() && !self.block_start;
                let head = if is_entry && self.in_entry_context() {
                    self.head_for(s, indent)
                } else {
                    None
                };
                self.start_line(indent, blank);
                if is_entry {
                    self.entry_indent = indent;
                }
                self.head_pending = head;
            }
            Break::Join => {
                let sep = match (self.cur.is_some(), self.last) {
                    (true, Some(last)) => separator(&Join {
                        before_prev: last.checked_sub(1).and_then(|b| self.prev_sig(b)),
                        prev: &self.p[last],
                        prev_is_sign: self.last_is_sign,
                        next: n,
                    }),
                    _ => None,
                };
                match sep {
                    Some(sep) => {
                        if let Some(line) = self.cur.as_mut() {
                            line.code.push_str(sep);
                        }
                    }
                    None => self.start_line(self.entry_indent + CONTINUATION, false),
                }
            }
        }
        let prev = self.last.map(|l| &self.p[l]);
        self.last_is_sign = n.is_sign_after(prev);
        self.last = Some(i);
        self.push_text(&n.text);

        let mut consumed = 1;
        if n.is_opener() {
            let close = self.closers[i];
            let empty_block =
                n.is("{") && close.is_some_and(|c| self.sig.get(s + 1) == Some(&c) && c == i + 1);
            if empty_block {
                self.push_text("}");
                self.last = close;
                consumed = 2;
            } else {
                let kind = if n.is("{") {
                    FrameKind::Block
                } else if self.broken[i] {
                    FrameKind::Broken
                } else {
                    FrameKind::Inline
                };
                let open_indent = self.cur.as_ref().map_or(0, |l| l.indent);
                self.stack.push(Frame {
                    kind,
                    opener: i,
                    close,
                    open_indent,
                    inner_indent: open_indent + INDENT,
                    saved_entry_indent: self.entry_indent,
                });
                self.cur_opens = kind != FrameKind::Inline;
            }
        } else {
            self.cur_opens = false;
        }
        if n.is_closer() && self.stack.last().is_some_and(|f| f.close == Some(i)) {
            if let Some(f) = self.stack.pop() {
                self.entry_indent = f.saved_entry_indent;
            }
        }
        consumed
    }

    /// The nearest non-comment piece at or before index `b`.
    fn prev_sig(&self, b: usize) -> Option<&Piece> {
        self.p[..=b].iter().rev().find(|x| !x.is_comment())
    }

    fn push_text(&mut self, text: &str) {
        let Some(line) = self.cur.as_mut() else {
            return;
        };
        line.code.push_str(text);
        if let Some((key, left)) = self.head_pending.take() {
            if left <= 1 {
                line.head = Some(Head {
                    key,
                    len: line.code.len(),
                });
            } else {
                self.head_pending = Some((key, left - 1));
            }
        }
    }
}

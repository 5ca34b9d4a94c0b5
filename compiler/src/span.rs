//! Byte-offset spans and the one line index that turns them into line/column positions.
//!
//! Every phase of the compiler speaks in byte offsets into the source text; only the edges
//! (terminal rendering, the language server) convert to lines and columns, through [`LineIndex`].

use serde::Serialize;

/// Identifies a source file within one analysis (the root model is always file 0).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord, Serialize, Default)]
pub struct FileId(pub u32);

/// A half-open byte range `[start, end)` in one file.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord, Serialize, Default)]
pub struct Span {
    pub file: FileId,
    pub start: u32,
    pub end: u32,
}

impl Span {
    pub fn new(file: FileId, start: usize, end: usize) -> Span {
        Span {
            file,
            start: start as u32,
            end: end as u32,
        }
    }
    /// The smallest span covering both (same file assumed).
    pub fn to(self, other: Span) -> Span {
        Span {
            file: self.file,
            start: self.start.min(other.start),
            end: self.end.max(other.end),
        }
    }
    pub fn range(self) -> std::ops::Range<usize> {
        self.start as usize..self.end as usize
    }
    pub fn contains(self, offset: u32) -> bool {
        self.start <= offset && offset <= self.end
    }
    pub fn len(self) -> u32 {
        self.end - self.start
    }
    pub fn is_empty(self) -> bool {
        self.start == self.end
    }
}

/// A zero-based line and a column counted in the unit the caller asked for.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
pub struct LineCol {
    pub line: u32,
    pub col: u32,
}

/// Line starts of one text, for offset <-> position conversion.
#[derive(Clone, Debug)]
pub struct LineIndex {
    line_starts: Vec<u32>,
    text: String,
}

impl LineIndex {
    pub fn new(text: &str) -> LineIndex {
        let mut line_starts = vec![0];
        for (i, b) in text.bytes().enumerate() {
            if b == b'\n' {
                line_starts.push(i as u32 + 1);
            }
        }
        LineIndex {
            line_starts,
            text: text.to_string(),
        }
    }

    fn line_of(&self, offset: u32) -> usize {
        match self.line_starts.binary_search(&offset) {
            Ok(l) => l,
            Err(l) => l - 1,
        }
    }

    fn clamp(&self, offset: u32) -> u32 {
        let mut o = (offset as usize).min(self.text.len());
        while !self.text.is_char_boundary(o) {
            o -= 1;
        }
        o as u32
    }

    /// Line and column in Unicode scalar values (what a person counts; used in messages and
    /// test expectations).
    pub fn line_col_chars(&self, offset: u32) -> LineCol {
        let offset = self.clamp(offset);
        let line = self.line_of(offset);
        let start = self.line_starts[line] as usize;
        let col = self.text[start..offset as usize].chars().count() as u32;
        LineCol {
            line: line as u32,
            col,
        }
    }

    /// Line and column in UTF-16 code units, as the Language Server Protocol requires.
    pub fn line_col_utf16(&self, offset: u32) -> LineCol {
        let offset = self.clamp(offset);
        let line = self.line_of(offset);
        let start = self.line_starts[line] as usize;
        let col = self.text[start..offset as usize]
            .chars()
            .map(|c| c.len_utf16() as u32)
            .sum();
        LineCol {
            line: line as u32,
            col,
        }
    }

    /// Byte offset of a UTF-16 position; positions past the end of a line clamp to its end.
    pub fn offset_utf16(&self, pos: LineCol) -> u32 {
        let Some(&start) = self.line_starts.get(pos.line as usize) else {
            return self.text.len() as u32;
        };
        let end = self
            .line_starts
            .get(pos.line as usize + 1)
            .map(|&e| e as usize)
            .unwrap_or(self.text.len());
        let mut col = 0u32;
        for (i, c) in self.text[start as usize..end].char_indices() {
            if col >= pos.col || c == '\n' {
                return start + i as u32;
            }
            col += c.len_utf16() as u32;
        }
        end as u32
    }

    pub fn line_count(&self) -> usize {
        self.line_starts.len()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn utf16_columns_count_degree_sign_once() {
        let text = "node a (fixed = 20 °C)\nx²y";
        let idx = LineIndex::new(text);
        let c = text.find('C').unwrap() as u32;
        assert_eq!(idx.line_col_utf16(c), LineCol { line: 0, col: 20 });
        assert_eq!(idx.line_col_chars(c), LineCol { line: 0, col: 20 });
        let y = text.find('y').unwrap() as u32;
        assert_eq!(idx.line_col_utf16(y), LineCol { line: 1, col: 2 });
        assert_eq!(idx.offset_utf16(LineCol { line: 1, col: 2 }), y);
        assert_eq!(idx.offset_utf16(LineCol { line: 0, col: 20 }), c);
        // Past the end of a line clamps to the line's end.
        assert_eq!(
            idx.offset_utf16(LineCol { line: 0, col: 99 }),
            22 + '°'.len_utf8() as u32 - 1
        );
    }

    #[test]
    fn astral_characters_take_two_utf16_units() {
        let text = "a😀b";
        let idx = LineIndex::new(text);
        assert_eq!(idx.line_col_utf16(text.find('b').unwrap() as u32).col, 3);
        assert_eq!(idx.line_col_chars(text.find('b').unwrap() as u32).col, 2);
    }
}

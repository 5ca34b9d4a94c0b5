//! Column alignment and the final text.
//!
//! Consecutive declarations of one kind read as a table when what follows their names starts in
//! one column (`node room    (fixed = 20 °C)`), and so do the elements of a build-up. A run
//! ends at a blank line or at a line of another kind; comment lines do not end it. Trailing
//! comments on consecutive lines line up the same way.

use super::layout::Line;

fn width(s: &str) -> usize {
    s.chars().count()
}

/// Pad heads so that the text after them starts in one column within each run.
pub fn align_heads(lines: &mut [Line]) {
    let mut run: Vec<usize> = Vec::new();
    let mut key: Option<String> = None;
    for i in 0..=lines.len() {
        let continues = lines.get(i).is_some_and(|l| {
            if l.blank_before {
                return false;
            }
            if l.code.is_empty() {
                return true;
            }
            l.head
                .as_ref()
                .is_some_and(|h| Some(&h.key) == key.as_ref())
        });
        if !continues {
            pad_run(lines, &run);
            run.clear();
            key = lines
                .get(i)
                .and_then(|l| l.head.as_ref().map(|h| h.key.clone()));
            if key.is_none() {
                continue;
            }
        }
        if let Some(l) = lines.get(i) {
            if !l.code.is_empty() && l.head.is_some() {
                run.push(i);
            }
        }
    }
}

fn pad_run(lines: &mut [Line], run: &[usize]) {
    let bodied: Vec<usize> = run
        .iter()
        .copied()
        .filter(|&i| has_body(&lines[i]))
        .collect();
    if bodied.len() < 2 {
        return;
    }
    let col = bodied
        .iter()
        .map(|&i| head_text(&lines[i]).map_or(0, width))
        .max()
        .unwrap_or(0);
    for i in bodied {
        let line = &mut lines[i];
        let Some(head) = &line.head else { continue };
        let (h, body) = line.code.split_at(head.len);
        let pad = col - width(h) + 1;
        let code = format!("{h}{}{}", " ".repeat(pad), body.trim_start());
        line.code = code;
    }
}

fn head_text(l: &Line) -> Option<&str> {
    l.head.as_ref().and_then(|h| l.code.get(..h.len))
}

fn has_body(l: &Line) -> bool {
    l.head.as_ref().is_some_and(|h| l.code.len() > h.len)
}

/// Render lines as text, lining up trailing comments of consecutive lines.
pub fn render(lines: &[Line]) -> String {
    let code_width = |l: &Line| l.indent + width(&l.code);
    let mut comment_col = vec![0; lines.len()];
    let mut i = 0;
    while i < lines.len() {
        let trailing = |l: &Line| !l.code.is_empty() && l.comment.is_some();
        if !trailing(&lines[i]) {
            i += 1;
            continue;
        }
        let mut j = i + 1;
        while j < lines.len() && trailing(&lines[j]) && !lines[j].blank_before {
            j += 1;
        }
        let col = lines[i..j].iter().map(code_width).max().unwrap_or(0) + 2;
        comment_col[i..j].iter_mut().for_each(|c| *c = col);
        i = j;
    }
    let mut out = String::new();
    for (l, col) in lines.iter().zip(comment_col) {
        if l.blank_before && !out.is_empty() {
            out.push('\n');
        }
        out.push_str(&" ".repeat(l.indent));
        out.push_str(&l.code);
        if let Some(c) = &l.comment {
            if !l.code.is_empty() {
                out.push_str(&" ".repeat(col - code_width(l)));
            }
            out.push_str(c);
        }
        out.push('\n');
    }
    out
}

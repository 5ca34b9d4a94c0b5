//! Small helpers for hand-written SVG: XML escaping, coordinates, axis ticks and a colour
//! scale for temperatures.

use std::fmt::Write;

/// Escape text for XML content and attribute values.
pub fn esc(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&apos;"),
            // Characters XML 1.0 does not allow at all.
            c if (c as u32) < 0x20 && !matches!(c, '\t' | '\n' | '\r') => out.push('\u{fffd}'),
            c => out.push(c),
        }
    }
    out
}

/// A coordinate with two decimals, never `NaN` in the file.
pub fn n(v: f64) -> String {
    if v.is_finite() {
        let s = format!("{v:.2}");
        s.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        "0".to_string()
    }
}

/// The opening `<svg>` element with a white background and shared text style.
pub fn open(out: &mut String, width: f64, height: f64, title: &str) {
    let _ = write!(
        out,
        "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{w}\" height=\"{h}\" viewBox=\"0 0 {w} {h}\" font-family=\"sans-serif\" font-size=\"12\">\n<title>{t}</title>\n<rect x=\"0\" y=\"0\" width=\"{w}\" height=\"{h}\" fill=\"white\"/>\n",
        w = n(width),
        h = n(height),
        t = esc(title)
    );
}

pub fn close(out: &mut String) {
    out.push_str("</svg>\n");
}

/// Text at a point; `anchor` is `start`, `middle` or `end`; `extra` holds further attributes.
pub fn text(out: &mut String, x: f64, y: f64, anchor: &str, extra: &str, content: &str) {
    let _ = writeln!(
        out,
        "<text x=\"{}\" y=\"{}\" text-anchor=\"{anchor}\"{}{extra}>{}</text>",
        n(x),
        n(y),
        if extra.is_empty() { "" } else { " " },
        esc(content)
    );
}

/// Evenly spaced round values covering `[lo, hi]` (steps of 1, 2 or 5 × 10ⁿ).
pub fn ticks(lo: f64, hi: f64, target: usize) -> Vec<f64> {
    if !(lo.is_finite() && hi.is_finite()) || hi <= lo {
        return vec![lo];
    }
    let raw = (hi - lo) / target.max(1) as f64;
    let mag = 10f64.powf(raw.log10().floor());
    let step = [1.0, 2.0, 5.0, 10.0]
        .iter()
        .map(|m| m * mag)
        .find(|s| *s >= raw)
        .unwrap_or(10.0 * mag);
    let first = (lo / step).ceil() * step;
    let mut out = Vec::new();
    let mut v = first;
    while v <= hi + step * 1e-9 && out.len() < 100 {
        out.push(if v.abs() < step * 1e-9 { 0.0 } else { v });
        v += step;
    }
    out
}

/// Colour for a position between cold (0) and hot (1): blue through grey to red.
pub fn heat_colour(t: f64) -> String {
    let t = if t.is_finite() {
        t.clamp(0.0, 1.0)
    } else {
        0.5
    };
    let (cold, mid, hot) = (
        (49.0, 104.0, 178.0),
        (150.0, 150.0, 150.0),
        (200.0, 55.0, 45.0),
    );
    let mix = |a: (f64, f64, f64), b: (f64, f64, f64), s: f64| {
        (
            a.0 + (b.0 - a.0) * s,
            a.1 + (b.1 - a.1) * s,
            a.2 + (b.2 - a.2) * s,
        )
    };
    let c = if t < 0.5 {
        mix(cold, mid, t * 2.0)
    } else {
        mix(mid, hot, (t - 0.5) * 2.0)
    };
    format!(
        "#{:02x}{:02x}{:02x}",
        c.0.round() as u8,
        c.1.round() as u8,
        c.2.round() as u8
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn escapes_markup_and_control_characters() {
        assert_eq!(
            esc("a<b & \"c\" 'd'>"),
            "a&lt;b &amp; &quot;c&quot; &apos;d&apos;&gt;"
        );
        assert_eq!(esc("x\u{1}y"), "x\u{fffd}y");
    }

    #[test]
    fn ticks_are_round_and_cover_the_range() {
        assert_eq!(ticks(-8.0, 20.0, 6), vec![-5.0, 0.0, 5.0, 10.0, 15.0, 20.0]);
        assert_eq!(ticks(0.0, 3.96, 5), vec![0.0, 1.0, 2.0, 3.0]);
        assert_eq!(ticks(1.0, 1.0, 5), vec![1.0]);
    }

    #[test]
    fn colours_run_from_blue_to_red() {
        assert_eq!(heat_colour(0.0), "#3168b2");
        assert_eq!(heat_colour(1.0), "#c8372d");
        assert_eq!(heat_colour(f64::NAN), heat_colour(0.5));
    }
}

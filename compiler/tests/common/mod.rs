//! Helpers shared by the formatter's model tests: what "the same model" means.

use caloris_compiler::source::NoImports;
use caloris_compiler::{analyze, Analysis, Options};

pub fn analyse(text: &str) -> Analysis {
    analyze("model.heat", text, &NoImports, &Options::default())
}

/// Everything a model means, without positions: parameters, materials, nodes, links with
/// their conductances, build-up uses, limits, diagnostics (by code) and the solution.
/// Two texts that analyse to the same fingerprint describe the same network.
pub fn fingerprint(a: &Analysis) -> Vec<String> {
    let net = &a.network;
    let mut out = vec![format!("title {:?}", a.title)];
    for (name, q) in &a.params {
        out.push(format!(
            "param {name} {:?}",
            q.map(|q| (q.value.to_bits(), q.dim))
        ));
    }
    for m in &a.materials {
        out.push(format!(
            "material {} {} {:?} {:?}",
            m.name,
            m.k.to_bits(),
            m.density,
            m.specific_heat
        ));
    }
    for n in &net.nodes {
        out.push(format!(
            "node {} {:?} {} {}",
            n.name,
            n.fixed.map(f64::to_bits),
            n.load.to_bits(),
            n.generated
        ));
    }
    for l in &net.links {
        out.push(format!(
            "link {} {} {} {} {} {:?} {:?} {}",
            l.name,
            l.from,
            l.to,
            l.kind,
            l.conductance().to_bits(),
            l.area.map(f64::to_bits),
            l.group,
            l.formula
        ));
    }
    for g in &net.groups {
        out.push(format!(
            "group {} {} {} {} {:?} {:?}",
            g.name,
            g.buildup,
            g.from,
            g.to,
            g.area.map(f64::to_bits),
            g.links
        ));
    }
    for l in &a.limits {
        out.push(format!(
            "limit {} {:?} {} {:?} {}",
            l.name,
            l.measure,
            l.subject_name,
            l.op,
            l.value.to_bits()
        ));
    }
    for d in &a.diagnostics {
        out.push(format!("diagnostic {} {:?}", d.code, d.severity));
    }
    if let Some(s) = &a.solution {
        out.extend(s.temperatures.iter().map(|t| format!("T {}", t.to_bits())));
        out.extend(s.heat_flows.iter().map(|q| format!("Q {}", q.to_bits())));
        out.extend(
            s.limits
                .iter()
                .map(|l| format!("verdict {} {}", l.name, l.passed)),
        );
    } else {
        out.push("unsolved".into());
    }
    out
}

/// The comments of a text in order, as the lexer sees them (trailing blanks dropped).
pub fn comments(text: &str) -> Vec<String> {
    caloris_compiler::lexer::lex(text, caloris_compiler::span::FileId(0))
        .into_iter()
        .filter(|t| t.kind == caloris_compiler::lexer::Tok::Comment)
        .map(|t| text[t.span.range()].trim_end().to_string())
        .collect()
}

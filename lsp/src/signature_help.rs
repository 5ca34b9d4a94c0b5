//! Signature help inside an argument list: the arguments an element kind, a build-up use or a
//! declaration (node, material, schedule, transient run, region, repetition) takes, from the
//! compiler's schema, with the one under the cursor active.

use crate::completion::owner_specs;
use crate::proto::lsp;
use crate::snapshot::Snapshot;
use caloris_compiler::elements;
use caloris_compiler::query::{completion_context, ArgOwner};
use caloris_compiler::schema;
use lsp::{
    Documentation, ParameterInformation, ParameterLabel, Position, SignatureHelp,
    SignatureInformation,
};

pub fn signature_help(snap: &Snapshot, pos: Position) -> Option<SignatureHelp> {
    let call = completion_context(snap.text(), snap.offset(pos)).call?;
    let a = &snap.analysis;
    let specs = owner_specs(&call.owner, a);
    let (name, summary, supplied): (String, String, &[&str]) = match &call.owner {
        // A case's arguments are the model's parameters: completion lists them.
        ArgOwner::Declaration { word: "case" } => return None,
        ArgOwner::Declaration { word } => {
            let d = schema::declaration(word)?;
            (d.word.to_string(), format!("{}: {}", d.doc, d.form), &[])
        }
        ArgOwner::Element {
            kind,
            in_buildup,
            supplied,
        } => match elements::lookup(kind) {
            Some(k) => {
                let mut summary = k.summary().to_string();
                if *in_buildup {
                    summary.push_str(&format!(
                        "; {} from the link that uses the build-up",
                        list(supplied)
                    ));
                }
                (kind.clone(), summary, supplied)
            }
            None if !specs.is_empty() => (
                kind.clone(),
                format!("build-up `{kind}` in series between the link's nodes"),
                &[],
            ),
            None => return None,
        },
    };
    let params: Vec<(String, String)> = specs
        .iter()
        .filter(|p| !supplied.contains(&p.name))
        .map(|p| (p.name.to_string(), p.describe()))
        .collect();
    let mut label = format!("{name}(");
    let mut parameters = Vec::new();
    for (i, (p, doc)) in params.iter().enumerate() {
        if i > 0 {
            label.push_str(", ");
        }
        let start = label.encode_utf16().count() as u32;
        label.push_str(p);
        let end = label.encode_utf16().count() as u32;
        parameters.push(ParameterInformation {
            label: ParameterLabel::LabelOffsets([start, end]),
            documentation: Some(Documentation::String(doc.clone())),
        });
    }
    label.push(')');
    let active = match &call.arg {
        Some(a) => params.iter().position(|(p, _)| p == a),
        None if call.index == 0 => Some(0),
        None => params.iter().position(|(p, _)| !call.given.contains(p)),
    };
    Some(SignatureHelp {
        signatures: vec![SignatureInformation {
            label,
            documentation: Some(Documentation::String(summary)),
            parameters: Some(parameters),
            active_parameter: active.map(|a| a as u32),
        }],
        active_signature: Some(0),
        active_parameter: active.map(|a| a as u32),
    })
}

/// `` `area` `` or `` `length`, `area` and `inner_radius` ``.
fn list(names: &[&str]) -> String {
    let quoted: Vec<String> = names.iter().map(|n| format!("`{n}`")).collect();
    match quoted.split_last() {
        Some((last, [])) => format!("{last} comes"),
        Some((last, rest)) => format!("{} and {last} come", rest.join(", ")),
        None => "nothing comes".to_string(),
    }
}

//! Signature help inside an argument list: the arguments an element kind, a build-up use, a
//! node or a material takes, with the one under the cursor active.

use crate::proto::lsp;
use crate::snapshot::Snapshot;
use caloris_compiler::elements;
use caloris_compiler::query::{completion_context, ArgOwner};
use caloris_compiler::symbols::SymbolKind;
use lsp::{
    Documentation, ParameterInformation, ParameterLabel, Position, SignatureHelp,
    SignatureInformation,
};

pub fn signature_help(snap: &Snapshot, pos: Position) -> Option<SignatureHelp> {
    let call = completion_context(snap.text(), snap.offset(pos)).call?;
    let (name, summary, params): (String, String, Vec<(String, String)>) = match &call.owner {
        ArgOwner::Node => (
            "node".into(),
            "a temperature node: fixed (a boundary) or free, with an optional heat load".into(),
            vec![
                ("fixed".into(), "boundary temperature, e.g. 20 °C".into()),
                ("load".into(), "heat put into the node, e.g. 3 W".into()),
            ],
        ),
        ArgOwner::Material => (
            "material".into(),
            "a material; `k` is required".into(),
            vec![
                ("k".into(), "thermal conductivity, W/(m·K)".into()),
                ("density".into(), "density, kg/m³".into()),
                (
                    "specific_heat".into(),
                    "specific heat capacity, J/(kg·K)".into(),
                ),
            ],
        ),
        ArgOwner::Element { kind, in_buildup } => {
            if snap
                .analysis
                .symbols
                .get(kind)
                .is_some_and(|s| s.kind == SymbolKind::Buildup)
            {
                (
                    kind.clone(),
                    format!("build-up `{kind}` in series between the link's nodes"),
                    vec![("area".into(), "the area the build-up covers".into())],
                )
            } else {
                let k = elements::lookup(kind)?;
                let params = k
                    .params()
                    .iter()
                    .filter(|p| !(*in_buildup && p.name == "area"))
                    .map(|p| (p.name.to_string(), p.describe()))
                    .collect();
                let mut summary = k.summary().to_string();
                if *in_buildup {
                    summary.push_str("; the area comes from the link that uses the build-up");
                }
                (kind.clone(), summary, params)
            }
        }
    };
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

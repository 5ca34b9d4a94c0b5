//! The study engine and the language server's transient summary, through the compiler API.

use caloris_compiler::source::NoImports;
use caloris_compiler::study::{
    parse_setting, parse_sweep, parse_value, run_study, Mode, Outcome, Plan, StudyError, StudyHooks,
};
use caloris_compiler::transient::summarize;
use caloris_compiler::units::{Dim, TempKind};
use caloris_compiler::{analyze, Options};
use std::sync::atomic::AtomicBool;

/// A garden-cabin wall: insulation thickness and outdoor temperature are parameters.
const CABIN: &str = "param insulation = 100 mm\nparam t_out = -5 °C\nmaterial wool (k = 0.04 W/(m*K))\nnode room (fixed = 20 °C)\nnode outdoor (fixed = t_out)\nnode face\nlink wool_layer: room to face layer(wool, thickness = insulation, area = 10 m^2)\nlink film: face to outdoor film(h = 25 W/(m^2*K), area = 10 m^2)\nlimit loss: heat_flow(wool_layer) <= 60 W\ncase mild (t_out = 5 °C)\ncase hard_frost (t_out = -15 °C)\n";

fn plan(axes: &[&str], cases: &[&str]) -> Plan {
    Plan {
        axes: axes
            .iter()
            .map(|a| parse_sweep(a).expect("sweep"))
            .collect(),
        cases: cases.iter().map(|c| c.to_string()).collect(),
        mode: Mode::Steady,
        measures: vec!["temperature(face)".into()],
        settings: Vec::new(),
    }
}

fn study(p: &Plan) -> caloris_compiler::study::StudyResult {
    match run_study("cabin.heat", CABIN, &NoImports, p, StudyHooks::default()) {
        Ok(r) => r,
        Err(StudyError::Request(m)) => panic!("{m}"),
        Err(StudyError::Model(a)) => panic!("{:?}", a.diagnostics),
    }
}

fn loss(p: &caloris_compiler::study::Point) -> f64 {
    match &p.outcome {
        Outcome::Solved { limits, .. } => limits[0].result.actual,
        Outcome::Failed { messages } => panic!("{messages:?}"),
    }
}

#[test]
fn sweep_values_and_their_units() {
    let a = parse_sweep("insulation=50mm..150mm:3").expect("sweep");
    let v: Vec<f64> = a.values.iter().map(|q| q.value).collect();
    assert!(
        v.iter()
            .zip([0.05, 0.1, 0.15])
            .all(|(a, b)| (a - b).abs() < 1e-15),
        "{v:?}"
    );
    let a = parse_sweep("t_out=-10°C..10°C:5").expect("sweep");
    assert_eq!(a.values[0].kind, TempKind::Point);
    assert!((a.values[2].value - 273.15).abs() < 1e-12);
    let a = parse_sweep("h=5 W/(m^2*K),10 W/(m^2*K)").expect("list");
    assert_eq!(a.values.len(), 2);
    assert_eq!(a.values[1].dim, Dim::HEAT_TRANSFER_COEFF);
    assert!(parse_sweep("h=5W..3m:4").is_err());
    assert!(parse_sweep("thickness").is_err());
    assert!(parse_value("12 parsecs").is_err());
    assert_eq!(parse_setting("t_out = -8 °C").expect("setting").0, "t_out");
}

#[test]
fn a_sweep_with_cases_follows_fouriers_law() {
    let r = study(&plan(
        &["insulation=50mm..200mm:4"],
        &["mild", "hard_frost"],
    ));
    assert_eq!(r.points.len(), 8);
    // Q = ΔT / (L/(k·A) + 1/(h·A)), Fourier's law and Newton's law of cooling in series.
    for p in &r.points {
        let l = p.values[0].1.value;
        let dt = if p.case.as_deref() == Some("mild") {
            15.0
        } else {
            35.0
        };
        let q = dt / (l / (0.04 * 10.0) + 1.0 / (25.0 * 10.0));
        assert!((loss(p) - q).abs() < 1e-9 * q, "{p:?}");
    }
    // Hard frost with 50 mm loses 35 / (0.125 + 0.004) = 271 W: fails; mild with 200 mm passes.
    assert!(!r.points[4].all_limits_pass());
    assert!(r.points[3].all_limits_pass());
}

#[test]
fn a_point_the_model_rejects_is_reported_and_the_study_goes_on() {
    let r = study(&plan(&["insulation=0mm,100mm"], &[]));
    assert!(
        matches!(&r.points[0].outcome, Outcome::Failed { messages } if messages[0].starts_with("E202")),
        "{:?}",
        r.points[0]
    );
    assert!(matches!(r.points[1].outcome, Outcome::Solved { .. }));
}

#[test]
fn a_two_parameter_study_is_every_combination() {
    let r = study(&plan(&["insulation=50mm..150mm:3", "t_out=-10°C,0°C"], &[]));
    assert_eq!(r.points.len(), 6);
    assert_eq!(r.points[1].values[1].1.value, 273.15);
    assert!(loss(&r.points[0]) > loss(&r.points[1]));
}

#[test]
fn requests_that_do_not_fit_the_model() {
    let bad = |p: Plan| match run_study("cabin.heat", CABIN, &NoImports, &p, StudyHooks::default())
    {
        Err(StudyError::Request(m)) => m,
        _ => panic!("accepted"),
    };
    assert!(bad(plan(&["insulatoin=1mm,2mm"], &[])).contains("did you mean `insulation`?"));
    assert!(bad(plan(&["insulation=1W,2W"], &[])).contains("is a length (m)"));
    assert!(bad(plan(&["t_out=1Δ°C..2Δ°C:2"], &[])).contains("a temperature on a scale"));
    assert!(bad(plan(&[], &["mlid"])).contains("did you mean `mild`?"));
    let mut p = plan(&[], &["mild"]);
    p.measures = vec!["temperature(loss)".into()];
    assert!(bad(p).contains("temperature"));
    let mut p = plan(&[], &["mild"]);
    p.mode = Mode::Transient("night".into());
    assert!(bad(p).contains("no transient run `night`"));
}

#[test]
fn the_summary_for_hover_gives_final_and_peak_values() {
    // A battery box warmed by a charge of 2 h, then cooling: the peak comes at the end of the
    // charge, the final value near the garage temperature.
    let src = "schedule charge {\n  0 h: 40 W\n  2 h: 40 W\n  2.01 h: 0 W\n}\nnode garage (fixed = 15 °C)\nnode box (capacity = 60 kJ/K, load = charge)\nlink walls: box to garage conductance(1.5 W/K)\ntransient charge_and_rest (duration = 12 h)\n";
    let a = analyze("box.heat", src, &NoImports, &Options::default());
    assert!(!a.has_errors(), "{:?}", a.diagnostics);
    // A steady solve takes the schedule's value at time 0: 15 °C + 40 W / 1.5 W/K.
    let steady = a.solution.as_ref().expect("solution");
    let b = a.network.node_id("box").expect("box");
    assert!((steady.temperatures[b] - (288.15 + 40.0 / 1.5)).abs() < 1e-9);
    let cancel = AtomicBool::new(false);
    let s = summarize(&a, &cancel).expect("a run").expect("ok");
    assert!(!s.stopped_early);
    let n = &s.nodes[b];
    // The run starts from the steady state at time 0 (the charge already on), so the box stays
    // at 15 + 40/1.5 °C until the charge stops, then cools with τ = 60000/1.5 s:
    // T = 15 + 26.67·exp(−(t − 2.01 h)/τ) °C (Newton's law of cooling).
    let tau: f64 = 60000.0 / 1.5;
    let want = 288.15 + 40.0 / 1.5 * (-(12.0 - 2.01) * 3600.0 / tau).exp();
    assert!((n.final_k - want).abs() < 0.05, "{} vs {want}", n.final_k);
    assert!((n.max_k - (288.15 + 40.0 / 1.5)).abs() < 0.01);
    // Cancelled from the start: it stops after its first step and says so.
    let cancel = AtomicBool::new(true);
    let s = summarize(&a, &cancel).expect("a run").expect("ok");
    assert!(s.stopped_early && s.reached_s < 12.0 * 3600.0);
    // No run, no summary.
    let a = analyze("w.heat", CABIN, &NoImports, &Options::default());
    assert!(summarize(&a, &AtomicBool::new(false)).is_none());
}

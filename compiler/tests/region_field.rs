//! 2-D regions against exact solutions: a linear field is reproduced exactly, and a square with
//! one heated edge converges to the classical Fourier-series solution of Laplace's equation.

use caloris_compiler::region::CellResult;
use caloris_compiler::source::NoImports;
use caloris_compiler::{analyze, Analysis, Options};

fn run(src: &str) -> Analysis {
    let a = analyze("region.heat", src, &NoImports, &Options::default());
    assert!(a.solution.is_some(), "{:?}", a.diagnostics);
    a
}

fn field(a: &Analysis) -> Vec<CellResult> {
    let s = a.solution.as_ref().expect("solved");
    a.network.regions[0].field(&s.temperatures, &s.heat_flows)
}

#[test]
fn linear_boundary_temperatures_give_an_exact_linear_field() {
    // Held edges left/right (x) or bottom/top (y), the other two adiabatic: T is linear, and
    // the flux is k·ΔT/size along the axis, zero across it (Fourier's law).
    for (a_side, b_side, axis) in [("left", "right", 0), ("bottom", "top", 1)] {
        let src = format!(
            "node a (fixed = 75 °C)\nnode b (fixed = 15 °C)\n\
             region wall (k = 1.7 W/(m*K), thickness = 0.2 m, width = 1.2 m, height = 0.9 m, cells_x = 7, cells_y = 5) {{\n  {a_side}: a\n  {b_side}: b\n}}\n"
        );
        let a = run(&src);
        let size = if axis == 0 { 1.2 } else { 0.9 };
        for c in field(&a) {
            let pos = if axis == 0 { c.x_m } else { c.y_m };
            let exact = 348.15 - 60.0 * pos / size;
            assert!(
                (c.temperature_k - exact).abs() < 1e-10,
                "cell {},{}: {} vs {exact}",
                c.i,
                c.j,
                c.temperature_k
            );
            let q = 1.7 * 60.0 / size;
            assert!(
                (c.heat_flux_w_per_m2[axis] - q).abs() < 1e-9 * q,
                "{:?}",
                c.heat_flux_w_per_m2
            );
            assert!(c.heat_flux_w_per_m2[1 - axis].abs() < 1e-9 * q);
        }
    }
}

/// Classical Fourier-series (separation of variables) solution of Laplace's equation: square W × W, T = T₁ on the top edge and T₀ on the other three:
/// θ = (T − T₀)/(T₁ − T₀) = (2/π) Σ ((−1)ⁿ⁺¹ + 1)/n · sin(nπx/W) · sinh(nπy/W)/sinh(nπ).
fn fourier_square(x: f64, y: f64) -> f64 {
    let pi = std::f64::consts::PI;
    let mut sum = 0.0;
    for n in (1..4000).step_by(2) {
        let n = n as f64;
        let (a, b) = (n * pi * y, n * pi);
        // sinh(a)/sinh(b) without overflow.
        let ratio = ((a - b).exp() - (-a - b).exp()) / (1.0 - (-2.0 * b).exp());
        sum += 2.0 / n * (n * pi * x).sin() * ratio;
    }
    2.0 / pi * sum
}

fn laplace_error(cells: usize) -> f64 {
    let src = format!(
        "node heated (fixed = 100 °C)\nnode cold (fixed = 0 °C)\n\
         region square (k = 45 W/(m*K), thickness = 10 mm, width = 1 m, height = 1 m, cells_x = {cells}, cells_y = {cells}) {{\n  top: heated\n  left: cold\n  right: cold\n  bottom: cold\n}}\n"
    );
    let a = run(&src);
    // Points away from the two singular top corners: x, y in [0.2, 0.8].
    field(&a)
        .iter()
        .filter(|c| (0.2..=0.8).contains(&c.x_m) && (0.2..=0.8).contains(&c.y_m))
        .map(|c| ((c.temperature_k - 273.15) / 100.0 - fourier_square(c.x_m, c.y_m)).abs())
        .fold(0.0, f64::max)
}

#[test]
fn square_with_one_heated_edge_converges_to_the_fourier_series() {
    // The series itself: the centre of the square is exactly 1/4 by superposition of the four
    // rotations of the problem.
    assert!((fourier_square(0.5, 0.5) - 0.25).abs() < 1e-12);
    let e10 = laplace_error(10);
    let e20 = laplace_error(20);
    let e40 = laplace_error(40);
    assert!(e40 < 2e-3, "{e10} {e20} {e40}");
    // Second order: halving the cells' size cuts the error about fourfold.
    assert!(e10 / e20 > 3.0 && e20 / e40 > 3.0, "{e10} {e20} {e40}");
}

#[test]
fn a_region_reports_nonsense_where_it_is_written() {
    let src = "node a (fixed = 20 °C)\nregion r (k = 1 W/(m*K), thickness = 1 m, width = 1 m, height = 1 m, cells_x = 2.5, cells_y = 2) {\n  left: a\n  middle: a\n  left: a\n  top: nowhere\n}\n";
    let a = analyze("r.heat", src, &NoImports, &Options::default());
    let mut codes: Vec<&str> = a
        .diagnostics
        .iter()
        .filter(|d| d.is_error())
        .map(|d| d.code)
        .collect();
    codes.sort();
    assert_eq!(codes, ["E216"], "{:?}", a.diagnostics);
    let src = src.replace("cells_x = 2.5", "cells_x = 2");
    let a = analyze("r.heat", &src, &NoImports, &Options::default());
    let mut codes: Vec<&str> = a
        .diagnostics
        .iter()
        .filter(|d| d.is_error())
        .map(|d| d.code)
        .collect();
    codes.sort();
    assert_eq!(codes, ["E102", "E204", "E205"], "{:?}", a.diagnostics);
}

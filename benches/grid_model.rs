//! The generated model of the benchmarks: a square grid of free nodes (a wall section meshed by
//! hand, the densest sparsity an analyst's model reaches), linked to its neighbours by layer
//! elements, with a warm boundary along one edge, a cold one along the opposite edge and a heat
//! load on every 97th node. The grid's cell size is the parameter `cell`, so a study can change
//! every conductance without changing the network's pattern.

use std::fmt::Write as _;

/// The model text of a grid of about `n` nodes.
pub fn model(n: usize) -> String {
    let side = (n as f64).sqrt().ceil() as usize;
    let mut s = String::with_capacity(side * side * 160);
    s.push_str("material brick (k = 0.77 W/(m*K))\nparam cell = 10 mm\n");
    s.push_str("node warm (fixed = 21 °C)\nnode cold (fixed = -4 °C)\n");
    for i in 0..side {
        for j in 0..side {
            if (i * side + j).is_multiple_of(97) {
                let _ = writeln!(s, "node c{i}_{j} (load = 0.01 W)");
            } else {
                let _ = writeln!(s, "node c{i}_{j}");
            }
        }
    }
    for i in 0..side {
        for j in 0..side {
            if j + 1 < side {
                let _ = writeln!(s, "link h{i}_{j}: c{i}_{j} to c{i}_{} layer(brick, thickness = cell, area = 1 cm^2)", j + 1);
            }
            if i + 1 < side {
                let _ = writeln!(s, "link v{i}_{j}: c{i}_{j} to c{}_{j} layer(brick, thickness = cell, area = 1 cm^2)", i + 1);
            }
        }
        let _ = writeln!(
            s,
            "link w{i}: warm to c{i}_0 film(h = 8 W/(m^2*K), area = 1 cm^2)"
        );
        let _ = writeln!(
            s,
            "link e{i}: c{i}_{} to cold film(h = 25 W/(m^2*K), area = 1 cm^2)",
            side - 1
        );
    }
    s
}

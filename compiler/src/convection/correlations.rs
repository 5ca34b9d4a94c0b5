//! The published convection correlations, as plain functions of the dimensionless groups, each
//! with the range its authors (or the usual practice) give for it. docs/elements.md states the
//! formulas, sources and ranges; tests/reference/gen_films.py checks each against `ht` 1.2.0.

/// Where a correlation holds, and the group it is stated in.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Validity {
    /// `Ra`, `Re`, `Re·Pr`, `Pr`.
    pub group: &'static str,
    pub low: f64,
    pub high: f64,
}

impl Validity {
    pub const fn new(group: &'static str, low: f64, high: f64) -> Validity {
        Validity { group, low, high }
    }
    pub fn holds(&self, value: f64) -> bool {
        value >= self.low && value <= self.high
    }
}

/// Standard acceleration of gravity, m/s² (exact by definition, CGPM 1901).
pub const GRAVITY: f64 = 9.80665;

/// Churchill–Chu (1975) for a vertical plate or wall, the whole range of Ra:
/// Nu = {0.825 + 0.387·Ra^(1/6) / [1 + (0.492/Pr)^(9/16)]^(8/27)}².
pub fn vertical_plate_churchill_chu(ra: f64, pr: f64) -> f64 {
    let t =
        0.825 + 0.387 * ra.powf(1.0 / 6.0) / (1.0 + (0.492 / pr).powf(9.0 / 16.0)).powf(8.0 / 27.0);
    t * t
}
pub const VERTICAL_PLATE_RANGE: &[Validity] = &[Validity::new("Ra", 0.1, 1e12)];

/// Churchill–Chu (1975) for a long horizontal cylinder:
/// Nu = {0.60 + 0.387·Ra^(1/6) / [1 + (0.559/Pr)^(9/16)]^(8/27)}².
pub fn horizontal_cylinder_churchill_chu(ra: f64, pr: f64) -> f64 {
    let t =
        0.60 + 0.387 * ra.powf(1.0 / 6.0) / (1.0 + (0.559 / pr).powf(9.0 / 16.0)).powf(8.0 / 27.0);
    t * t
}
pub const HORIZONTAL_CYLINDER_RANGE: &[Validity] = &[Validity::new("Ra", 1e-5, 1e12)];

/// The hot face of a horizontal plate facing up (or a cold face facing down), on the
/// characteristic length A/P of Goldstein, Sparrow and Jones (1973): Lloyd and Moran (1974),
/// Nu = 0.54·Ra^(1/4) up to Ra = 10⁷ and Nu = 0.15·Ra^(1/3) above.
pub fn plate_facing_up_lloyd_moran(ra: f64) -> f64 {
    if ra <= 1e7 {
        0.54 * ra.powf(0.25)
    } else {
        0.15 * ra.powf(1.0 / 3.0)
    }
}
pub const PLATE_UP_RANGE: &[Validity] = &[
    Validity::new("Ra", 1e4, 1e11),
    Validity::new("Pr", 0.7, f64::INFINITY),
];

/// The hot face of a horizontal plate facing down (or a cold face facing up), the stable
/// case: Nu = 0.27·Ra^(1/4) (McAdams 1954), characteristic length A/P.
pub fn plate_facing_down_mcadams(ra: f64) -> f64 {
    0.27 * ra.powf(0.25)
}
pub const PLATE_DOWN_RANGE: &[Validity] = &[Validity::new("Ra", 1e5, 1e10)];

/// Churchill (1983) for a sphere:
/// Nu = 2 + 0.589·Ra^(1/4) / [1 + (0.469/Pr)^(9/16)]^(4/9) · {1 + 7.44e-8·Ra / [1 + (0.469/Pr)^(9/16)]^(16/9)}^(1/12).
pub fn sphere_churchill(ra: f64, pr: f64) -> f64 {
    let f = 1.0 + (0.469 / pr).powf(9.0 / 16.0);
    2.0 + 0.589 * ra.powf(0.25) / f.powf(4.0 / 9.0)
        * (1.0 + 7.44e-8 * ra / f.powf(16.0 / 9.0)).powf(1.0 / 12.0)
}
pub const SPHERE_RANGE: &[Validity] = &[
    Validity::new("Ra", 0.0, 1e13),
    Validity::new("Pr", 0.7, f64::INFINITY),
];

/// Churchill–Bernstein (1977), a cylinder in cross flow:
/// Nu = 0.3 + 0.62·Re^(1/2)·Pr^(1/3) / [1 + (0.4/Pr)^(2/3)]^(1/4) · [1 + (Re/282000)^(5/8)]^(4/5).
pub fn cylinder_crossflow_churchill_bernstein(re: f64, pr: f64) -> f64 {
    0.3 + 0.62 * re.sqrt() * pr.powf(1.0 / 3.0) / (1.0 + (0.4 / pr).powf(2.0 / 3.0)).powf(0.25)
        * (1.0 + (re / 282_000.0).powf(0.625)).powf(0.8)
}
pub const CROSSFLOW_RANGE: &[Validity] = &[Validity::new("Re·Pr", 0.2, f64::INFINITY)];

/// Where the laminar boundary layer on a flat plate turns turbulent (common practice).
pub const PLATE_TRANSITION_RE: f64 = 5e5;

/// Laminar boundary layer along an isothermal flat plate, mean over the length
/// (Pohlhausen 1921): Nu = 0.664·Re^(1/2)·Pr^(1/3).
pub fn plate_laminar_pohlhausen(re: f64, pr: f64) -> f64 {
    0.664 * re.sqrt() * pr.powf(1.0 / 3.0)
}

/// Turbulent boundary layer from the leading edge, mean over the length (Petukhov and Popov's
/// form as Schlichting and Gersten give it): Nu = 0.037·Re^0.8·Pr / [1 + 2.443·Re^(−0.1)·(Pr^(2/3) − 1)].
pub fn plate_turbulent_schlichting(re: f64, pr: f64) -> f64 {
    0.037 * re.powf(0.8) * pr / (1.0 + 2.443 * re.powf(-0.1) * (pr.powf(2.0 / 3.0) - 1.0))
}

/// Laminar up to Re_c = 5·10⁵ and turbulent after: the mean of the two parts,
/// Nu = Nu_lam(Re_c) + Nu_turb(Re) − Nu_turb(Re_c); the laminar value below Re_c.
pub fn plate_mixed(re: f64, pr: f64) -> f64 {
    if re <= PLATE_TRANSITION_RE {
        plate_laminar_pohlhausen(re, pr)
    } else {
        plate_laminar_pohlhausen(PLATE_TRANSITION_RE, pr) + plate_turbulent_schlichting(re, pr)
            - plate_turbulent_schlichting(PLATE_TRANSITION_RE, pr)
    }
}
pub const PLATE_LAMINAR_RANGE: &[Validity] = &[
    Validity::new("Re", 0.0, PLATE_TRANSITION_RE),
    Validity::new("Pr", 0.6, 10.0),
];
/// From memory (as the usual statement of the turbulent-plate form); the laminar part keeps its own Pr range.
pub const PLATE_TURBULENT_RANGE: &[Validity] = &[
    Validity::new("Re", PLATE_TRANSITION_RE, 1e7),
    Validity::new("Pr", 0.6, 2000.0),
];

/// Fully developed laminar flow in a round pipe: Nu = 3.66 at a uniform wall temperature,
/// 48/11 ≈ 4.36 at a uniform heat flux (the exact Graetz–Nusselt limits).
pub const PIPE_LAMINAR_WALL_TEMPERATURE: f64 = 3.66;
pub const PIPE_LAMINAR_HEAT_FLUX: f64 = 48.0 / 11.0;
/// Laminar below, turbulent (Gnielinski) from [`PIPE_TURBULENT_RE`]; between them the Nusselt
/// number is interpolated linearly in Re and a warning says so.
pub const PIPE_LAMINAR_RE: f64 = 2300.0;
pub const PIPE_TURBULENT_RE: f64 = 3000.0;

/// Petukhov (1970) friction factor of a smooth pipe (Darcy): f = (0.790·ln Re − 1.64)^(−2).
pub fn petukhov_friction(re: f64) -> f64 {
    (0.790 * re.ln() - 1.64).powi(-2)
}

/// Gnielinski (1976): Nu = (f/8)(Re − 1000)·Pr / [1 + 12.7·(f/8)^(1/2)·(Pr^(2/3) − 1)].
pub fn pipe_gnielinski(re: f64, pr: f64, f: f64) -> f64 {
    (f / 8.0) * (re - 1000.0) * pr / (1.0 + 12.7 * (f / 8.0).sqrt() * (pr.powf(2.0 / 3.0) - 1.0))
}
pub const PIPE_TURBULENT_RANGE: &[Validity] = &[
    Validity::new("Re", PIPE_TURBULENT_RE, 5e6),
    Validity::new("Pr", 0.5, 2000.0),
];

/// Fully developed pipe flow across the regimes; returns Nu and the regime's name.
pub fn pipe(re: f64, pr: f64, uniform_heat_flux: bool) -> (f64, &'static str) {
    let laminar = if uniform_heat_flux {
        PIPE_LAMINAR_HEAT_FLUX
    } else {
        PIPE_LAMINAR_WALL_TEMPERATURE
    };
    if re < PIPE_LAMINAR_RE {
        (laminar, "laminar")
    } else if re >= PIPE_TURBULENT_RE {
        (pipe_gnielinski(re, pr, petukhov_friction(re)), "turbulent")
    } else {
        let top = pipe_gnielinski(PIPE_TURBULENT_RE, pr, petukhov_friction(PIPE_TURBULENT_RE));
        let s = (re - PIPE_LAMINAR_RE) / (PIPE_TURBULENT_RE - PIPE_LAMINAR_RE);
        (laminar + s * (top - laminar), "transitional")
    }
}

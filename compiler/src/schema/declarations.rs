//! The declaration words and the arguments of those whose arguments are fixed: nodes,
//! materials, schedules, transient runs, repetitions, regions and the uses of build-ups.

use super::{material, quantity, ArgSpec, ArgType, DeclArgs, DeclSpec};
use crate::conductivity::material_args::SLOPE_DIM;
use crate::elements::shell::Geometry;
use crate::units::Dim;

/// A node's arguments: a boundary temperature or a load, and what a transient run needs.
pub const NODE: &[ArgSpec] = &[
    ArgSpec::new(
        "fixed",
        ArgType::Scheduled(Dim::TEMPERATURE),
        "boundary temperature the node is held at",
    )
    .above_absolute_zero(),
    ArgSpec::new(
        "load",
        ArgType::Scheduled(Dim::POWER),
        "heat put into the node (negative: taken out)",
    )
    .default("0 W"),
    quantity(
        "capacity",
        Dim::CAPACITY,
        "heat capacity C of the body the node stands for",
    )
    .instead("material"),
    material("material whose density and specific heat give the capacity, with a volume or mass")
        .instead("capacity"),
    quantity("volume", Dim::VOLUME, "volume of the node's material").with("material"),
    quantity(
        "mass",
        Dim::MASS,
        "mass of the node's material, instead of its volume",
    )
    .with("material"),
    ArgSpec::new(
        "initial",
        ArgType::Temperature,
        "temperature at the start of a transient run",
    )
    .above_absolute_zero()
    .default("the steady solution at the run's start"),
];

/// A material's arguments: its conductivity, constant or k(T), and what a capacity needs.
pub const MATERIAL: &[ArgSpec] = &[
    ArgSpec::new(
        "k",
        ArgType::Conductivity,
        "thermal conductivity, constant or as a table of k(T)",
    )
    .required()
    .positive(),
    ArgSpec::new(
        "k_slope",
        ArgType::Quantity(SLOPE_DIM),
        "dk/dT of a linear k(T) = k + k_slope·(T − k_at)",
    )
    .with("k_at"),
    ArgSpec::new(
        "k_at",
        ArgType::Temperature,
        "temperature at which `k` holds, for a linear k(T)",
    )
    .with("k_slope")
    .above_absolute_zero(),
    quantity("density", Dim::DENSITY, "density ρ, for a node's capacity"),
    quantity(
        "specific_heat",
        Dim::SPECIFIC_HEAT,
        "specific heat capacity c, for a node's capacity",
    ),
];

/// A schedule's arguments (its rows are `TIME: VALUE`).
pub const SCHEDULE: &[ArgSpec] = &[quantity(
    "repeat",
    Dim::TIME,
    "period after which the table starts again (a daily cycle: 24 h)",
)
.default("none: the last row's value holds")];

/// A transient run's arguments.
pub const TRANSIENT: &[ArgSpec] = &[
    quantity("duration", Dim::TIME, "how long to run").required(),
    quantity(
        "step",
        Dim::TIME,
        "a fixed time step, instead of the automatic one",
    )
    .default("automatic"),
    ArgSpec::new(
        "tolerance",
        ArgType::TemperatureDifference,
        "local error allowed per automatic step",
    )
    .positive()
    .default("0.01 K"),
    quantity("output", Dim::TIME, "interval between reported times")
        .default("about a hundredth of the duration, rounded to a round interval"),
    ArgSpec::new(
        "start",
        ArgType::Quantity(Dim::TIME),
        "the schedules' clock time at which the run starts",
    )
    .default("0 s"),
];

/// A repetition's arguments (checked when repetitions are expanded, see `crate::expand`).
pub const REPEAT: &[ArgSpec] = &[
    ArgSpec::new("count", ArgType::Quantity(Dim::NONE), "number of copies")
        .required()
        .count(crate::expand::MAX_COPIES as u32),
    ArgSpec::new(
        "first",
        ArgType::Node,
        "the node `previous` stands for in copy 1 (needed when the body uses `previous`)",
    ),
];

/// The argument of a link that uses a plane build-up.
pub const PLANE_USE: &[ArgSpec] = &[quantity(
    "area",
    Dim::AREA,
    "area the build-up covers (needed when one of its elements takes an area)",
)
.required()];

const CYLINDER_USE: &[ArgSpec] = &[
    quantity(
        "inner_radius",
        Dim::LENGTH,
        "bore: the radius the first shell starts at",
    )
    .required(),
    quantity("length", Dim::LENGTH, "length of the pipe run").required(),
];

const SPHERE_USE: &[ArgSpec] = &[quantity(
    "inner_radius",
    Dim::LENGTH,
    "bore: the radius the first shell starts at",
)
.required()];

/// The arguments of a link that uses a build-up of this geometry; the first may go unnamed.
pub fn buildup_use(geom: Geometry) -> &'static [ArgSpec] {
    match geom {
        Geometry::Plane => PLANE_USE,
        Geometry::Cylinder => CYLINDER_USE,
        Geometry::Sphere => SPHERE_USE,
    }
}

/// Every declaration word: the keywords, then the contextual words.
pub const DECLARATIONS: &[DeclSpec] = &[
    DeclSpec {
        word: "title",
        reserved: true,
        noun: "title",
        doc: "the model's title, shown in reports",
        form: "title \"TEXT\"",
        example: "title \"Garden office north wall\"",
        args: DeclArgs::None,
    },
    DeclSpec {
        word: "import",
        reserved: true,
        noun: "import",
        doc: "the materials, parameters, build-ups and sub-networks of another file",
        form: "import \"PATH\"",
        example: "import \"materials/common.heat\"",
        args: DeclArgs::None,
    },
    DeclSpec {
        word: "param",
        reserved: true,
        noun: "parameter",
        doc: "a named value with its unit, usable in any expression",
        form: "param NAME = EXPRESSION",
        example: "param wall_area = 2.4 m * 4 m",
        args: DeclArgs::None,
    },
    DeclSpec {
        word: "material",
        reserved: true,
        noun: "material",
        doc: "a material: its conductivity, and density and specific heat for capacities",
        form: "material NAME (ARGUMENTS)",
        example: "material wood_fibre (k = 0.04 W/(m*K))",
        args: DeclArgs::Fixed(MATERIAL),
    },
    DeclSpec {
        word: "node",
        reserved: true,
        noun: "node",
        doc: "a temperature node: fixed at a boundary temperature, or free with an optional load",
        form: "node NAME (ARGUMENTS)",
        example: "node room (fixed = 20 °C)",
        args: DeclArgs::Fixed(NODE),
    },
    DeclSpec {
        word: "link",
        reserved: true,
        noun: "link",
        doc: "a heat path between two nodes, through an element kind or a build-up",
        form: "link NAME: FROM to TO KIND(ARGUMENTS)",
        example: "link wall: room to outdoor layer(brick, thickness = 240 mm, area = 8 m^2)",
        args: DeclArgs::OfKind,
    },
    DeclSpec {
        word: "buildup",
        reserved: true,
        noun: "build-up",
        doc: "layers and films in series, declared once and used by links",
        form: "buildup NAME { ELEMENT: KIND(ARGUMENTS) ... }",
        example: "buildup timber_wall { inside: film(r = 0.13 m^2*K/W) ... }",
        args: DeclArgs::Elements,
    },
    DeclSpec {
        word: "limit",
        reserved: true,
        noun: "limit",
        doc: "a design limit, checked on every solve",
        form: "limit NAME: MEASURE(SUBJECT) OP VALUE",
        example: "limit touch_safe: temperature(jacket) < 60 °C",
        args: DeclArgs::Measure,
    },
    DeclSpec {
        word: "schedule",
        reserved: false,
        noun: "schedule",
        doc: "a time table of temperatures or loads, for boundaries and loads of transient runs",
        form: "schedule NAME (ARGUMENTS) { TIME: VALUE ... }",
        example: "schedule frosty_night (repeat = 24 h) { 0 h: -4 °C ... }",
        args: DeclArgs::Fixed(SCHEDULE),
    },
    DeclSpec {
        word: "case",
        reserved: false,
        noun: "case",
        doc: "a named set of parameter values, solved besides the model as written",
        form: "case NAME (PARAM = VALUE, ...)",
        example: "case windy_night (h_wind = 40 W/(m^2*K))",
        args: DeclArgs::Parameters,
    },
    DeclSpec {
        word: "transient",
        reserved: false,
        noun: "transient run",
        doc: "a run through time of the nodes that store heat",
        form: "transient NAME (ARGUMENTS)",
        example: "transient overnight (start = 17 h, duration = 15 h)",
        args: DeclArgs::Fixed(TRANSIENT),
    },
    DeclSpec {
        word: "repeat",
        reserved: false,
        noun: "repetition",
        doc: "copies of the declarations in braces, for a rod or fin split into segments",
        form: "repeat NAME (ARGUMENTS) { DECLARATIONS }",
        example: "repeat fin (count = 12, first = base) { ... }",
        args: DeclArgs::Fixed(REPEAT),
    },
    DeclSpec {
        word: "network",
        reserved: false,
        noun: "sub-network",
        doc: "a reusable sub-network: its ports are the nodes a use connects",
        form: "network NAME (PORT, ...) { DECLARATIONS }",
        example: "network outer_wall (room, outside) { ... }",
        args: DeclArgs::Ports,
    },
    DeclSpec {
        word: "use",
        reserved: false,
        noun: "use",
        doc: "one copy of a sub-network, its ports given nodes and its parameters values",
        form: "use NAME: NETWORK(PORT = NODE, PARAM = VALUE, ...)",
        example: "use kitchen_wall: outer_wall(room = kitchen, outside = outdoor)",
        args: DeclArgs::OfNetwork,
    },
    DeclSpec {
        word: "region",
        reserved: false,
        noun: "region",
        doc: "a rectangular plate or wall section meshed into cells",
        form: "region NAME (ARGUMENTS) { SIDE: NODE [KIND(ARGUMENTS)] ... }",
        example: "region plate (aluminium, thickness = 2 mm, width = 100 mm, height = 60 mm, cells_x = 20, cells_y = 12) { ... }",
        args: DeclArgs::Fixed(crate::region::REGION),
    },
];

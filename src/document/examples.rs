//! The bundled examples, each a file in `scenarios/` compiled in: invented scenarios, no
//! real site, product or record. `hibernal example` lists them and prints one; the page's
//! picker and gallery show them. `tests/example_outputs.rs` keeps every example's report,
//! CSV files and charts the same to the bit against stored digests.

/// A bundled example: an invented scenario of our own.
pub struct Example {
    pub id: &'static str,
    pub summary: &'static str,
    pub json: &'static str,
}

/// The bundled examples; the page starts from the first.
pub const EXAMPLES: [Example; 11] = [
    Example {
        id: "snow-over-foam-on-silt",
        summary: "40 cm of wind-packed snow over 50 mm of foam board over silty soil",
        json: include_str!("../../scenarios/snow-over-foam-on-silt.json"),
    },
    Example {
        id: "snow-block-wall",
        summary: "A 40 cm wall of snow blocks between a −25 °C night and a 0 °C interior",
        json: include_str!("../../scenarios/snow-block-wall.json"),
    },
    Example {
        id: "unheated-shed-floor",
        summary: "Concrete floor of an unheated shed on foam board, gravel and silt",
        json: include_str!("../../scenarios/unheated-shed-floor.json"),
    },
    Example {
        id: "bare-sand-path",
        summary: "A cleared garden path on sand: no snow, no insulation",
        json: include_str!("../../scenarios/bare-sand-path.json"),
    },
    Example {
        id: "silty-yard-design-winter",
        summary: "Bare silty yard through a design winter of 1200 °C·days",
        json: include_str!("../../scenarios/silty-yard-design-winter.json"),
    },
    Example {
        id: "cabin-porch-slab-snowy-winter",
        summary: "A cabin's porch slab on foam board, gravel and silt through a snowy winter: change the board and watch the deepest frost move",
        json: include_str!("../../scenarios/cabin-porch-slab-snowy-winter.json"),
    },
    Example {
        id: "silt-yard-how-sure",
        summary: "Frost in a silt yard as P10, P50 and P90 over uncertain snow, water, conductivity and winter",
        json: include_str!("../../scenarios/silt-yard-how-sure.json"),
    },
    Example {
        id: "training-dome-four",
        summary: "A snow-block dome for four on a training night at −20 °C in a 5 m/s wind: how warm, how thick, how the night goes",
        json: include_str!("../../scenarios/training-dome-four.json"),
    },
    Example {
        id: "drift-cave-two",
        summary: "A drift cave for two with a 5 cm vent at −25 °C: the deep snow around it keeps the air at the melt limit, and the roof drips",
        json: include_str!("../../scenarios/drift-cave-two.json"),
    },
    Example {
        id: "heated-workshop-edge",
        summary: "The edge of a heated workshop on a 0.6 m footing with wall board and wing in silt, through a 1500 °C·day winter: frost stays above the footing's base",
        json: include_str!("../../scenarios/heated-workshop-edge.json"),
    },
    Example {
        id: "unheated-storage-edge",
        summary: "The edge of an unheated storage building on a 0.45 m footing with a narrow wing: frost reaches below the base; widen the wing",
        json: include_str!("../../scenarios/unheated-storage-edge.json"),
    },
];

pub fn example(id: &str) -> Option<&'static Example> {
    EXAMPLES.iter().find(|e| e.id == id)
}

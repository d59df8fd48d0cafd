//! The safety notes shown with every shelter result, whatever the inputs.
//!
//! Sources as listed in the project's model reference: US Army field manuals FM 21-76
//! (Survival) and its successor FM 3-05.70; Keyes et al. 2001 and Gill 1994 on
//! carbon monoxide from stoves in snow shelters. Input-dependent warnings (thin walls, snow
//! density outside a regression's range, little vent for the people inside, a stove or
//! candles) are raised where the inputs are checked ([`super::model`]) and with the steady
//! result ([`mod@super::steady`]).

/// One note and where it comes from.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Caution {
    pub id: &'static str,
    pub text: &'static str,
    pub source: &'static str,
}

const CAUTIONS: [Caution; 8] = [
    Caution {
        id: "carbon-monoxide",
        text: "Stoves, lamps and candles make carbon monoxide, which cannot be seen or smelt, and it builds up fast in a snow shelter. Never sleep with a stove, lamp or candle burning.",
        source: "US Army FM 21-76 / FM 3-05.70; Keyes et al. 2001; Gill 1994",
    },
    Caution {
        id: "vent-open",
        text: "Keep the vent open at all times and clear it of new snow and frost.",
        source: "US Army FM 21-76 / FM 3-05.70",
    },
    Caution {
        id: "wall-thickness",
        text: "Walls and roof of caves and hollowed piles should be at least about 30 cm thick.",
        source: "US Army FM 21-76 / FM 3-05.70",
    },
    Caution {
        id: "light-through-roof",
        text: "If daylight shows through the roof, it is too thin.",
        source: "US Army FM 21-76 / FM 3-05.70",
    },
    Caution {
        id: "collapse",
        text: "A snow roof can sag and collapse, the more so when it is thin or melting: keep a shovel inside, within reach.",
        source: "common practice in snow-shelter instruction (from memory, no single source)",
    },
    Caution {
        id: "avalanche",
        text: "Do not build on or below slopes that can avalanche, nor under cornices.",
        source: "US Army FM 21-76 / FM 3-05.70",
    },
    Caution {
        id: "estimates",
        text: "These numbers are estimates from simplified physics; snow properties vary about twofold. They are no guarantee of warmth or safety.",
        source: "this tool's models (see the model notes)",
    },
    Caution {
        id: "training",
        text: "Defer to qualified training and local guidance.",
        source: "US Army FM 21-76 / FM 3-05.70",
    },
];

/// The notes that must always be shown.
pub fn cautions() -> &'static [Caution] {
    &CAUTIONS
}

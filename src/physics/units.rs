//! Units for the faces. Everything inside is SI; a [`Quantity`] says how to show a value in
//! either unit system: shown = SI × factor + offset.
//!
//! Conversion factors: NIST Special Publication 811 (2008 edition), Appendix B, using the
//! International Table Btu (1 Btu_IT = 1055.056 J), 1 ft = 0.3048 m, 1 lb = 0.45359237 kg.
//!
//! [`QUANTITIES`] is the one table of units: every face converts with it (the charts, the
//! CSV files, the climate reader), and the page receives it through the wasm face's
//! catalogue, so no script hard-codes a factor. A value is named by its quantity's id
//! ([`quantity`]: `thickness`, `temperature`, `degree_days`, …).

/// Which system values are shown in.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum UnitSystem {
    Si,
    Us,
}

impl UnitSystem {
    pub fn from_id(id: &str) -> Option<Self> {
        match id {
            "si" => Some(UnitSystem::Si),
            "us" => Some(UnitSystem::Us),
            _ => None,
        }
    }
}

/// How one quantity is shown in one system.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct UnitDef {
    pub symbol: &'static str,
    pub factor: f64,
    pub offset: f64,
    /// Decimals to show by default.
    pub decimals: u8,
}

/// A physical quantity and its two presentations.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Quantity {
    pub id: &'static str,
    pub si: UnitDef,
    pub us: UnitDef,
}

impl Quantity {
    pub fn unit(&self, sys: UnitSystem) -> &UnitDef {
        match sys {
            UnitSystem::Si => &self.si,
            UnitSystem::Us => &self.us,
        }
    }
    /// SI value → shown value.
    pub fn show(&self, sys: UnitSystem, si: f64) -> f64 {
        let u = self.unit(sys);
        si * u.factor + u.offset
    }
    /// Shown value → SI value.
    pub fn to_si(&self, sys: UnitSystem, shown: f64) -> f64 {
        let u = self.unit(sys);
        (shown - u.offset) / u.factor
    }
}

const fn u(symbol: &'static str, factor: f64, offset: f64, decimals: u8) -> UnitDef {
    UnitDef {
        symbol,
        factor,
        offset,
        decimals,
    }
}

/// K → °F (a temperature difference of 1 K is 1.8 °F).
pub const DEG_F_PER_K: f64 = 1.8;
/// °F reading at 0 °C.
pub const DEG_F_AT_0_C: f64 = 32.0;
/// m → cm (SI prefix).
pub const CM_PER_M: f64 = 100.0;
/// m → mm (SI prefix).
pub const MM_PER_M: f64 = 1000.0;
/// m → ft.
pub const FT_PER_M: f64 = 1.0 / 0.3048;
/// m → in.
pub const IN_PER_M: f64 = 1.0 / 0.0254;
/// kg/m³ → lb/ft³ (1 lb/ft³ = 16.018 46 kg/m³).
pub const LB_FT3_PER_KG_M3: f64 = 1.0 / 16.018_463;
/// W/m²K → Btu/(h·ft²·°F) (1 Btu/(h·ft²·°F) = 5.678 263 W/m²K).
pub const BTU_H_FT2_F_PER_W_M2K: f64 = 1.0 / 5.678_263;
/// m²K/W → h·ft²·°F/Btu (the US R-value): × 5.678 263.
pub const R_US_PER_R_SI: f64 = 5.678_263;
/// W/m/K → Btu·in/(h·ft²·°F) (1 Btu·in/(h·ft²·°F) = 0.144 227 9 W/m/K).
pub const BTU_IN_PER_W_M_K: f64 = 1.0 / 0.144_227_9;
/// W/m² → Btu/(h·ft²) (1 Btu/(h·ft²) = 3.154 591 W/m²).
pub const BTU_H_FT2_PER_W_M2: f64 = 1.0 / 3.154_591;
/// J/m³K → Btu/(ft³·°F) (1 Btu/(ft³·°F) = 67 066.1 J/m³K).
pub const BTU_FT3_F_PER_J_M3K: f64 = 1.0 / 67_066.1;
/// J/m³ → Btu/ft³ (1 Btu/ft³ = 37 258.9 J/m³).
pub const BTU_FT3_PER_J_M3: f64 = 1.0 / 37_258.9;
/// °C·days → °F·days: a degree-day sum is a temperature interval times a time, so it
/// converts as a temperature interval (1 K = 1.8 °F, NIST SP 811 B.9), with no offset.
pub const DEG_F_DAYS_PER_DEG_C_DAYS: f64 = DEG_F_PER_K;

/// W → Btu/h (1 Btu_IT/h = 0.293 071 1 W).
pub const BTU_H_PER_W: f64 = 1.0 / 0.293_071_1;
/// kg → lb (1 lb = 0.453 592 37 kg, exact).
pub const LB_PER_KG: f64 = 1.0 / 0.453_592_37;
/// m/s → mph (1 mph = 0.447 04 m/s, exact).
pub const MPH_PER_M_S: f64 = 1.0 / 0.447_04;
/// m³/s → ft³/min (1 ft³/min = 4.719 474 × 10⁻⁴ m³/s).
pub const CFM_PER_M3_S: f64 = 1.0 / 4.719_474e-4;
/// m² → ft² (1 ft² = 0.092 903 04 m², exact).
pub const FT2_PER_M2: f64 = 1.0 / 0.092_903_04;

/// Every quantity the page and CLI show.
pub const QUANTITIES: [Quantity; 32] = [
    Quantity {
        id: "temperature",
        si: u("°C", 1.0, 0.0, 1),
        us: u("°F", DEG_F_PER_K, DEG_F_AT_0_C, 1),
    },
    Quantity {
        id: "temperature_difference",
        si: u("K", 1.0, 0.0, 1),
        us: u("°F", DEG_F_PER_K, 0.0, 1),
    },
    Quantity {
        id: "thickness",
        si: u("cm", CM_PER_M, 0.0, 1),
        us: u("in", IN_PER_M, 0.0, 2),
    },
    Quantity {
        id: "depth",
        si: u("m", 1.0, 0.0, 3),
        us: u("ft", FT_PER_M, 0.0, 2),
    },
    Quantity {
        id: "density",
        si: u("kg/m³", 1.0, 0.0, 0),
        us: u("lb/ft³", LB_FT3_PER_KG_M3, 0.0, 1),
    },
    Quantity {
        id: "water_content",
        si: u("%", 1.0, 0.0, 1),
        us: u("%", 1.0, 0.0, 1),
    },
    Quantity {
        id: "percent",
        si: u("%", 1.0, 0.0, 0),
        us: u("%", 1.0, 0.0, 0),
    },
    Quantity {
        id: "specific_heat",
        si: u("J/(kg·K)", 1.0, 0.0, 0),
        us: u("Btu/(lb·°F)", 1.0 / 4186.8, 0.0, 3),
    },
    Quantity {
        id: "fraction",
        si: u("", 1.0, 0.0, 2),
        us: u("", 1.0, 0.0, 2),
    },
    Quantity {
        id: "conductivity",
        si: u("W/(m·K)", 1.0, 0.0, 3),
        us: u("Btu·in/(h·ft²·°F)", BTU_IN_PER_W_M_K, 0.0, 3),
    },
    Quantity {
        id: "film",
        si: u("W/(m²·K)", 1.0, 0.0, 1),
        us: u("Btu/(h·ft²·°F)", BTU_H_FT2_F_PER_W_M2K, 0.0, 2),
    },
    Quantity {
        id: "r_value",
        si: u("m²·K/W", 1.0, 0.0, 2),
        us: u("ft²·°F·h/Btu", R_US_PER_R_SI, 0.0, 1),
    },
    Quantity {
        id: "u_value",
        si: u("W/(m²·K)", 1.0, 0.0, 3),
        us: u("Btu/(h·ft²·°F)", BTU_H_FT2_F_PER_W_M2K, 0.0, 4),
    },
    Quantity {
        id: "heat_flux",
        si: u("W/m²", 1.0, 0.0, 2),
        us: u("Btu/(h·ft²)", BTU_H_FT2_PER_W_M2, 0.0, 3),
    },
    Quantity {
        id: "heat_capacity_vol",
        si: u("MJ/(m³·K)", 1e-6, 0.0, 3),
        us: u("Btu/(ft³·°F)", BTU_FT3_F_PER_J_M3K, 0.0, 2),
    },
    Quantity {
        id: "latent_vol",
        si: u("MJ/m³", 1e-6, 0.0, 1),
        us: u("Btu/ft³", BTU_FT3_PER_J_M3, 0.0, 0),
    },
    Quantity {
        id: "degree_days",
        si: u("°C·days", 1.0, 0.0, 0),
        us: u("°F·days", DEG_F_DAYS_PER_DEG_C_DAYS, 0.0, 0),
    },
    Quantity {
        id: "days",
        si: u("days", 1.0, 0.0, 0),
        us: u("days", 1.0, 0.0, 0),
    },
    Quantity {
        id: "step",
        // Stored in seconds, shown in hours.
        si: u("h", 1.0 / 3600.0, 0.0, 2),
        us: u("h", 1.0 / 3600.0, 0.0, 2),
    },
    Quantity {
        id: "hours",
        // A time stored in seconds, shown in hours (the night of a shelter).
        si: u("h", 1.0 / 3600.0, 0.0, 1),
        us: u("h", 1.0 / 3600.0, 0.0, 1),
    },
    Quantity {
        id: "time_h",
        // A time stored in hours (the length of a shelter's night).
        si: u("h", 1.0, 0.0, 1),
        us: u("h", 1.0, 0.0, 1),
    },
    Quantity {
        id: "power",
        si: u("W", 1.0, 0.0, 0),
        us: u("Btu/h", BTU_H_PER_W, 0.0, 0),
    },
    Quantity {
        id: "mass_rate",
        // Stored in kg/h (a melt rate).
        si: u("kg/h", 1.0, 0.0, 2),
        us: u("lb/h", LB_PER_KG, 0.0, 2),
    },
    Quantity {
        id: "mass",
        si: u("kg", 1.0, 0.0, 2),
        us: u("lb", LB_PER_KG, 0.0, 2),
    },
    Quantity {
        id: "speed",
        si: u("m/s", 1.0, 0.0, 1),
        us: u("mph", MPH_PER_M_S, 0.0, 1),
    },
    Quantity {
        id: "ppm",
        si: u("ppm", 1.0, 0.0, 0),
        us: u("ppm", 1.0, 0.0, 0),
    },
    Quantity {
        id: "air_flow",
        // Stored in m³/s, shown in L/s.
        si: u("L/s", 1000.0, 0.0, 1),
        us: u("ft³/min", CFM_PER_M3_S, 0.0, 1),
    },
    Quantity {
        id: "area",
        si: u("m²", 1.0, 0.0, 2),
        us: u("ft²", FT2_PER_M2, 0.0, 1),
    },
    Quantity {
        id: "count",
        si: u("", 1.0, 0.0, 0),
        us: u("", 1.0, 0.0, 0),
    },
    Quantity {
        id: "length",
        // Room sizes: m or ft.
        si: u("m", 1.0, 0.0, 2),
        us: u("ft", FT_PER_M, 0.0, 2),
    },
    Quantity {
        id: "linear_heat",
        // Heat per length of wall: W/m, or Btu/h per foot (power over length).
        si: u("W/m", 1.0, 0.0, 1),
        us: u("Btu/(h·ft)", BTU_H_PER_W / FT_PER_M, 0.0, 1),
    },
    Quantity {
        id: "gradient",
        // A temperature gradient: K/m, or °F per foot (interval over length).
        si: u("K/m", 1.0, 0.0, 3),
        us: u("°F/ft", DEG_F_PER_K / FT_PER_M, 0.0, 3),
    },
];

/// Look a quantity up by id.
pub fn quantity(id: &str) -> Option<&'static Quantity> {
    QUANTITIES.iter().find(|q| q.id == id)
}

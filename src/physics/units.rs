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

// ---------- values as the trade writes them ----------
//
// The one rule for how a value is written for people (the page's inputs and answers; the
// CSV files and the charts keep the table's decimals, which machines and axes read):
//
// | quantity                       | US customary                         | SI                |
// |--------------------------------|--------------------------------------|-------------------|
// | `thickness` (layers, boards)   | inches to the nearest 1/8 in, as a   | the table's       |
// |                                | fraction: `3 7/8 in`, `1/2 in`       | decimals          |
// | `depth`, `length` (frost depth,| feet and inches to the nearest 1 in: | the table's       |
// | footing depth, layer depths,   | `2 ft 2 in`, `4 ft 0 in`, `7 in`     | decimals          |
// | wing widths, room sizes)       |                                      |                   |
// | every other quantity           | the table's decimals (lb/ft³ to 0.1, °F to 0.1, R to 0.1)| |
//
// Boards are bought by the fraction of an inch and footings dug to the inch, and a model's
// frost depth is no surer than an inch (common practice, no source). In US units an input
// of a converted quantity shows the value at the precision it is written in, nothing more;
// displaying it never changes the stored SI value (only an edit does), and what is typed
// is converted exactly (inches × 0.0254 m).

/// How a quantity's values are written in one system (see the table above).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Written {
    /// A decimal number with the unit's decimals.
    Decimal,
    /// Inches, whole and a fraction to the nearest 1/`denominator` (a power of 2).
    InchFractions { denominator: u32 },
    /// Feet and inches, to the nearest `step_in` whole inches.
    FeetInches { step_in: u32 },
}

/// The written form of quantity `q` in `sys`.
pub fn written(q: &Quantity, sys: UnitSystem) -> Written {
    match (sys, q.id) {
        (UnitSystem::Us, "thickness") => Written::InchFractions { denominator: 8 },
        (UnitSystem::Us, "depth" | "length") => Written::FeetInches { step_in: 1 },
        _ => Written::Decimal,
    }
}

impl Written {
    /// The id the page reads: `decimal`, `inch-fractions`, `feet-inches`.
    pub fn id(&self) -> &'static str {
        match self {
            Written::Decimal => "decimal",
            Written::InchFractions { .. } => "inch-fractions",
            Written::FeetInches { .. } => "feet-inches",
        }
    }
}

/// How a written value is rounded.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Rounding {
    /// To the nearest step of its written form.
    Nearest,
    /// Up to the next step (a least value that must be enough: rounded down it could fall
    /// short).
    Up,
}

/// Where the text goes.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Form {
    /// In a sentence or a table: with its unit, non-breaking spaces inside.
    Text,
    /// In an input box, as one would type it: plain spaces; a decimal or inch value
    /// without its unit (the box shows it), feet and inches with theirs.
    Input,
}

/// m per inch (exact, by the definition of the inch).
pub const M_PER_IN: f64 = 0.0254;

fn rounded(x: f64, rounding: Rounding) -> f64 {
    match rounding {
        Rounding::Nearest => x.round(),
        // Above the step by no more than float noise: that step, not the next.
        Rounding::Up => (x - 1e-9).ceil(),
    }
}

/// A number with its sign: the typographic minus (U+2212) in text, the hyphen-minus one
/// types in an input.
fn signed(negative: bool, body: String, form: Form) -> String {
    match (negative, form) {
        (false, _) => body,
        (true, Form::Text) => format!("\u{2212}{body}"),
        (true, Form::Input) => format!("-{body}"),
    }
}

/// Whole inches and a reduced fraction of `n` 1/`den` inch steps: `3 7/8`, `1/2`, `12`.
fn inch_text(n: u64, den: u32, space: &str) -> String {
    let den = den as u64;
    let (whole, mut num, mut d) = (n / den, n % den, den);
    while num > 0 && num % 2 == 0 && d % 2 == 0 {
        num /= 2;
        d /= 2;
    }
    match (whole, num) {
        (w, 0) => w.to_string(),
        (0, f) => format!("{f}/{d}"),
        (w, f) => format!("{w}{space}{f}/{d}"),
    }
}

/// SI value `si` of quantity `q` written in `sys` (see the table above). Not finite: "–".
pub fn write(q: &Quantity, sys: UnitSystem, si: f64, rounding: Rounding, form: Form) -> String {
    if !si.is_finite() {
        return "\u{2013}".to_string();
    }
    let space = match form {
        Form::Text => "\u{a0}",
        Form::Input => " ",
    };
    let unit = q.unit(sys);
    match written(q, sys) {
        Written::Decimal => {
            let scale = 10f64.powi(unit.decimals as i32);
            let shown = rounded(q.show(sys, si) * scale, rounding) / scale;
            let body = format!("{:.*}", unit.decimals as usize, shown.abs());
            let negative = shown < 0.0 && body.bytes().any(|b| (b'1'..=b'9').contains(&b));
            let number = signed(negative, body, form);
            if form == Form::Text && !unit.symbol.is_empty() {
                format!("{number}{space}{}", unit.symbol)
            } else {
                number
            }
        }
        Written::InchFractions { denominator } => {
            let steps = rounded(si / M_PER_IN * denominator as f64, rounding);
            let body = inch_text(steps.abs() as u64, denominator, space);
            let number = signed(steps < 0.0, body, form);
            match form {
                Form::Text => format!("{number}{space}in"),
                Form::Input => number,
            }
        }
        Written::FeetInches { step_in } => {
            let steps = rounded(si / M_PER_IN / step_in as f64, rounding);
            let inches = steps.abs() as u64 * step_in as u64;
            let (ft, inch) = (inches / 12, inches % 12);
            let body = if ft == 0 {
                format!("{inch}{space}in")
            } else {
                format!("{ft}{space}ft{space}{inch}{space}in")
            };
            signed(steps < 0.0, body, form)
        }
    }
}

/// A plain number as typed: `12`, `-3.5`, `.5`, `1e-3`, a decimal comma (`1,5`).
pub fn read_number(text: &str) -> Option<f64> {
    let t = text.trim().replace('\u{2212}', "-");
    let t = match t.split_once(',') {
        Some((a, b))
            if !a.is_empty()
                && !b.is_empty()
                && a.trim_start_matches(['+', '-'])
                    .bytes()
                    .all(|c| c.is_ascii_digit())
                && b.bytes().all(|c| c.is_ascii_digit()) =>
        {
            format!("{a}.{b}")
        }
        _ => t,
    };
    let body = t.trim_start_matches(['+', '-']);
    let starts_ok = body.starts_with(|c: char| c.is_ascii_digit())
        || (body.starts_with('.') && body[1..].starts_with(|c: char| c.is_ascii_digit()));
    if !starts_ok || t.len() - body.len() > 1 {
        return None;
    }
    t.parse::<f64>().ok().filter(|v| v.is_finite())
}

/// An amount as typed: `3`, `3.5`, `3,5`, `7/8`, `3 1/2`, `3-1/2`.
fn read_amount(text: &str) -> Option<f64> {
    let t = text.trim();
    let fraction = |f: &str| -> Option<f64> {
        let (n, d) = f.split_once('/')?;
        let (n, d) = (n.trim(), d.trim());
        if n.is_empty() || d.is_empty() || !n.bytes().chain(d.bytes()).all(|c| c.is_ascii_digit()) {
            return None;
        }
        let (n, d) = (n.parse::<f64>().ok()?, d.parse::<f64>().ok()?);
        (d > 0.0).then(|| n / d)
    };
    if !t.contains('/') {
        return read_number(t).filter(|v| *v >= 0.0);
    }
    // A whole number, then the fraction after a space or a hyphen; or a fraction alone.
    match t.rsplit_once([' ', '-']) {
        Some((w, f)) if !w.trim().is_empty() => {
            let w = w.trim();
            if !w.bytes().all(|c| c.is_ascii_digit()) {
                return None;
            }
            Some(w.parse::<f64>().ok()? + fraction(f)?)
        }
        _ => fraction(t),
    }
}

/// A length as typed in feet and inches, in inches: `2 ft 3 in`, `2' 3"`, `2'-3 1/2"`,
/// `27 in`, `27"`, `2 ft`, `3 1/2`. A number without a unit is in `bare_in_inches`' unit
/// (inches, else feet), except after feet, where it is inches (`2' 3`). `None` if it does
/// not read.
pub fn read_feet_inches(text: &str, bare_in_inches: bool) -> Option<f64> {
    let mut t = text.trim().replace('\u{2212}', "-").to_lowercase();
    for (from, to) in [
        ("\u{2032}", "'"),
        ("\u{2033}", "\""),
        ("\u{2019}", "'"),
        ("\u{201d}", "\""),
    ] {
        t = t.replace(from, to);
    }
    let negative = t.starts_with('-');
    let mut rest = t.trim_start_matches(['-', '+']).trim_start();
    if rest.is_empty() || t.len() - t.trim_start_matches(['-', '+']).len() > 1 {
        return None;
    }
    let feet_marks = ["feet", "foot", "ft", "'"];
    let inch_marks = ["inches", "inch", "in", "\""];
    let mut feet: Option<f64> = None;
    let mut inches: Option<f64> = None;
    let mut bare: Option<f64> = None;
    while !rest.is_empty() {
        // The amount runs up to the first letter or mark.
        let end = rest
            .find(|c: char| c.is_ascii_alphabetic() || c == '\'' || c == '"')
            .unwrap_or(rest.len());
        let (amount, after) = rest.split_at(end);
        let value = read_amount(amount)?;
        let after = after.trim_start();
        let mark = |marks: &[&str]| {
            marks
                .iter()
                .find(|m| after.starts_with(**m))
                .map(|m| m.len())
        };
        if let Some(m) = mark(&feet_marks) {
            if feet.is_some() || inches.is_some() || bare.is_some() {
                return None;
            }
            feet = Some(value);
            rest = after[m..].trim_start();
            // The trade's hyphen between feet and inches: 2'-3".
            rest = rest.strip_prefix('-').unwrap_or(rest).trim_start();
        } else if let Some(m) = mark(&inch_marks) {
            if inches.is_some() || bare.is_some() {
                return None;
            }
            inches = Some(value);
            rest = after[m..].trim_start();
        } else if after.is_empty() {
            if inches.is_some() || bare.is_some() {
                return None;
            }
            bare = Some(value);
            rest = after;
        } else {
            return None;
        }
    }
    let total = match (feet, inches, bare) {
        (f, i, None) if f.is_some() || i.is_some() => f.unwrap_or(0.0) * 12.0 + i.unwrap_or(0.0),
        (Some(f), None, Some(b)) => f * 12.0 + b,
        (None, None, Some(b)) if bare_in_inches => b,
        (None, None, Some(b)) => b * 12.0,
        _ => return None,
    };
    Some(if negative { -total } else { total })
}

/// A value of quantity `q` typed in `sys`, in SI: exactly the conversion of what was typed
/// (inches × 0.0254 m for lengths written in inches or feet and inches). `None` if it does
/// not read.
pub fn read(q: &Quantity, sys: UnitSystem, text: &str) -> Option<f64> {
    match written(q, sys) {
        Written::Decimal => read_number(text).map(|v| q.to_si(sys, v)),
        Written::InchFractions { .. } => read_feet_inches(text, true).map(|i| i * M_PER_IN),
        Written::FeetInches { .. } => read_feet_inches(text, false).map(|i| i * M_PER_IN),
    }
}

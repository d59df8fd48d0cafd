//! Effective thermal conductivity of dry snow as a function of density.
//!
//! Published regressions disagree by about a factor of two at one density, so every one is
//! offered by its authors and year, none is "the" snow conductivity, and results show the
//! spread across all of them. Water-vapour transport can raise the effective conductivity
//! of low-density snow by up to about 50 % (Fourteau et al. 2021, The Cryosphere 15:2739);
//! these regressions do not include it.
//!
//! Notation: `rho` is density in kg/m³; `r = rho / 1000` is density in g/cm³.
//! Coefficients are as listed in the project's model reference (marked there as recalled
//! from the literature, not re-read); the one value read in a source is the check
//! Sturm et al. 1997 quadratic at 0.30 g/cm³ → 0.126 W/m/K (tested).
//!
//! The nine regressions are the variants of [`SnowRegression`] (`SnowRegression::ALL`),
//! each with its id (the one the file format and the page use), its published name, a short
//! name for the charts, its citation, the density range its data cover and its formula. A
//! density outside that range gives a warning, not an error.

/// A published snow conductivity regression.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum SnowRegression {
    /// Sturm, Holmgren, König & Morris 1997, J. Glaciol. 43(143):26–41, quadratic fit:
    /// k = 0.138 − 1.01 r + 3.233 r² for 0.156 ≤ r ≤ 0.6; below r = 0.156
    /// k = 0.023 + 0.234 r.
    Sturm1997Quadratic,
    /// Sturm et al. 1997, logarithmic fit: k = 10^(2.650 r − 1.652).
    Sturm1997Logarithmic,
    /// Calonne et al. 2011, Geophys. Res. Lett. 38, L23501:
    /// k = 2.5e-6 ρ² − 1.23e-4 ρ + 0.024.
    Calonne2011,
    /// Yen 1981, CRREL Report 81-10: k = 2.22362 r^1.885.
    Yen1981,
    /// Jordan 1991, CRREL Special Report 91-16:
    /// k = k_air + (7.75e-5 ρ + 1.105e-6 ρ²)(k_ice − k_air), k_air = 0.023, k_ice = 2.29.
    Jordan1991,
    /// Abels 1893: k = 2.846 r².
    Abels1893,
    /// Van Dusen 1929: k = 0.021 + 4.2e-4 ρ + 2.2e-9 ρ³.
    VanDusen1929,
    /// Devaux 1933: k = 0.0293 + 2.93e-6 ρ².
    Devaux1933,
    /// Riche & Schneebeli 2013, The Cryosphere 7:217–227:
    /// k = 3.0e-6 ρ² − 1.06e-5 ρ + 0.024.
    RicheSchneebeli2013,
}

impl SnowRegression {
    /// Every regression, in the order the page lists them.
    pub const ALL: [SnowRegression; 9] = [
        SnowRegression::Sturm1997Quadratic,
        SnowRegression::Sturm1997Logarithmic,
        SnowRegression::Calonne2011,
        SnowRegression::Yen1981,
        SnowRegression::Jordan1991,
        SnowRegression::Abels1893,
        SnowRegression::VanDusen1929,
        SnowRegression::Devaux1933,
        SnowRegression::RicheSchneebeli2013,
    ];

    /// Stable identifier used in scenario files.
    pub fn id(self) -> &'static str {
        match self {
            Self::Sturm1997Quadratic => "sturm-1997-quadratic",
            Self::Sturm1997Logarithmic => "sturm-1997-logarithmic",
            Self::Calonne2011 => "calonne-2011",
            Self::Yen1981 => "yen-1981",
            Self::Jordan1991 => "jordan-1991",
            Self::Abels1893 => "abels-1893",
            Self::VanDusen1929 => "van-dusen-1929",
            Self::Devaux1933 => "devaux-1933",
            Self::RicheSchneebeli2013 => "riche-schneebeli-2013",
        }
    }

    pub fn from_id(id: &str) -> Option<Self> {
        Self::ALL.into_iter().find(|c| c.id() == id)
    }

    /// The published name: authors and year.
    pub fn name(self) -> &'static str {
        match self {
            Self::Sturm1997Quadratic => "Sturm et al. 1997 (quadratic)",
            Self::Sturm1997Logarithmic => "Sturm et al. 1997 (logarithmic)",
            Self::Calonne2011 => "Calonne et al. 2011",
            Self::Yen1981 => "Yen 1981",
            Self::Jordan1991 => "Jordan 1991",
            Self::Abels1893 => "Abels 1893",
            Self::VanDusen1929 => "Van Dusen 1929",
            Self::Devaux1933 => "Devaux 1933",
            Self::RicheSchneebeli2013 => "Riche & Schneebeli 2013",
        }
    }

    /// The first author's name alone (and the form, for the two of Sturm et al. 1997), for
    /// labels where the whole name does not fit; [`Self::name`] wherever there is room.
    pub fn short_name(self) -> &'static str {
        match self {
            Self::Sturm1997Quadratic => "Sturm quad.",
            Self::Sturm1997Logarithmic => "Sturm log.",
            Self::Calonne2011 => "Calonne",
            Self::Yen1981 => "Yen",
            Self::Jordan1991 => "Jordan",
            Self::Abels1893 => "Abels",
            Self::VanDusen1929 => "Van Dusen",
            Self::Devaux1933 => "Devaux",
            Self::RicheSchneebeli2013 => "Riche",
        }
    }

    /// Where it was published.
    pub fn citation(self) -> &'static str {
        match self {
            Self::Sturm1997Quadratic | Self::Sturm1997Logarithmic => {
                "Sturm, Holmgren, König & Morris 1997, J. Glaciol. 43(143):26–41"
            }
            Self::Calonne2011 => "Calonne et al. 2011, Geophys. Res. Lett. 38, L23501",
            Self::Yen1981 => "Yen 1981, CRREL Report 81-10",
            Self::Jordan1991 => "Jordan 1991, CRREL Special Report 91-16",
            Self::Abels1893 => "Abels 1893",
            Self::VanDusen1929 => "Van Dusen 1929",
            Self::Devaux1933 => "Devaux 1933",
            Self::RicheSchneebeli2013 => "Riche & Schneebeli 2013, The Cryosphere 7:217–227",
        }
    }

    /// Density range (kg/m³) of the data behind the fit. Sturm quadratic and Calonne are
    /// from the model reference; the others are approximate spans of the underlying data,
    /// recalled from the literature (from memory).
    pub fn valid_range_kg_m3(self) -> (f64, f64) {
        match self {
            Self::Sturm1997Quadratic => (156.0, 600.0),
            Self::Sturm1997Logarithmic => (100.0, 600.0),
            Self::Calonne2011 => (100.0, 550.0),
            Self::Yen1981 => (100.0, 900.0),
            Self::Jordan1991 => (50.0, 900.0),
            Self::Abels1893 => (140.0, 340.0),
            Self::VanDusen1929 => (100.0, 600.0),
            Self::Devaux1933 => (100.0, 500.0),
            Self::RicheSchneebeli2013 => (100.0, 550.0),
        }
    }

    /// Effective conductivity, W/m/K, at density `rho` kg/m³.
    pub fn conductivity_w_m_k(self, rho: f64) -> f64 {
        let r = rho / 1000.0;
        match self {
            Self::Sturm1997Quadratic => {
                if r < 0.156 {
                    0.023 + 0.234 * r
                } else {
                    0.138 - 1.01 * r + 3.233 * r * r
                }
            }
            Self::Sturm1997Logarithmic => 10f64.powf(2.650 * r - 1.652),
            Self::Calonne2011 => 2.5e-6 * rho * rho - 1.23e-4 * rho + 0.024,
            Self::Yen1981 => 2.22362 * r.powf(1.885),
            Self::Jordan1991 => {
                let (k_air, k_ice) = (0.023, 2.29);
                k_air + (7.75e-5 * rho + 1.105e-6 * rho * rho) * (k_ice - k_air)
            }
            Self::Abels1893 => 2.846 * r * r,
            Self::VanDusen1929 => 0.021 + 4.2e-4 * rho + 2.2e-9 * rho * rho * rho,
            Self::Devaux1933 => 0.0293 + 2.93e-6 * rho * rho,
            Self::RicheSchneebeli2013 => 3.0e-6 * rho * rho - 1.06e-5 * rho + 0.024,
        }
    }
}

/// Snow denser than this is not snow (density of ice at 0 °C, IAPWS R10-06).
pub const MAX_SNOW_DENSITY_KG_M3: f64 = super::ice::ICE_DENSITY_0C_KG_M3;
/// Lightest snow accepted at all (fresh powder is about 50 kg/m³; Cuffey & Paterson,
/// The Physics of Glaciers, Table 2.1, from memory).
pub const MIN_SNOW_DENSITY_KG_M3: f64 = 10.0;

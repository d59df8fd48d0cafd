//! Materials against their sources. Each check names its source.

mod common;
use common::*;

use hibernal::physics::error::Warning;
use hibernal::physics::materials::ice::*;
use hibernal::physics::materials::soil::{self, SoilInput, SoilModel, Texture};
use hibernal::physics::materials::{Board, Branch, ConductivityLaw, MaterialSpec, SnowRegression};

#[test]
fn sturm_quadratic_matches_the_published_check_value() {
    // Sturm et al. 1997 (J. Glaciol. 43:26–41), abstract: 0.126 W/m/K at 0.30 g/cm³,
    // given to three decimals, so ±0.0005.
    let k = SnowRegression::Sturm1997Quadratic.conductivity_w_m_k(300.0);
    assert_abs(k, 0.126, 0.0005, "Sturm 1997 quadratic at 300 kg/m³");
}

#[test]
fn every_snow_regression_matches_its_formula_at_several_densities() {
    // Source: the published formulas, evaluated independently by tools/reference.py.
    let r = reference();
    let rows = r["snow"].as_array().unwrap();
    assert_eq!(rows.len(), 27, "9 regressions × 3 densities");
    for row in rows {
        let id = row["id"].as_str().unwrap();
        let c = SnowRegression::from_id(id).unwrap_or_else(|| panic!("no regression {id}"));
        let rho = f(row, "density_kg_m3");
        assert_rel(
            c.conductivity_w_m_k(rho),
            f(row, "k_w_m_k"),
            1e-12,
            &format!("{id} at {rho} kg/m³"),
        );
    }
    // The spread the model reference warns of: about ×2 between regressions at one density.
    let ks: Vec<f64> = SnowRegression::ALL
        .iter()
        .map(|c| c.conductivity_w_m_k(300.0))
        .collect();
    let (lo, hi) = ks
        .iter()
        .fold((f64::MAX, f64::MIN), |(a, b), &k| (a.min(k), b.max(k)));
    assert!(hi / lo > 1.5 && hi / lo < 4.0, "spread {lo}..{hi}");
}

#[test]
fn snow_regressions_have_distinct_ids_names_and_ranges() {
    for c in SnowRegression::ALL {
        assert_eq!(SnowRegression::from_id(c.id()), Some(c));
        let (lo, hi) = c.valid_range_kg_m3();
        assert!(lo < hi && lo > 0.0 && hi <= ICE_DENSITY_0C_KG_M3);
        assert!(c.name().contains(char::is_numeric), "name carries a year");
    }
}

#[test]
fn snow_outside_its_range_warns_but_computes() {
    let mut w: Vec<Warning> = Vec::new();
    let m = MaterialSpec::Snow {
        density_kg_m3: 100.0,
        regression: SnowRegression::Sturm1997Quadratic,
    }
    .resolve("layers[0].material", &mut w)
    .unwrap();
    assert_eq!(w.len(), 1);
    assert_eq!(w[0].field, "layers[0].material.density_kg_m3");
    // Sturm 1997 below 0.156 g/cm³: 0.023 + 0.234 r.
    assert_rel(
        m.conductivity.k(-5.0),
        0.023 + 0.234 * 0.1,
        1e-12,
        "low-density form",
    );
}

#[test]
fn snow_denser_than_ice_is_refused_naming_the_field() {
    let mut w = Vec::new();
    let e = MaterialSpec::Snow {
        density_kg_m3: 950.0,
        regression: SnowRegression::Calonne2011,
    }
    .resolve("layers[3].material", &mut w)
    .unwrap_err();
    assert_eq!(e.0[0].field, "layers[3].material.density_kg_m3");
    assert!(e.to_string().contains("denser than solid ice"), "{e}");
}

#[test]
fn ice_conductivity_matches_the_model_reference() {
    // k = 9.828 exp(−0.0057 T) (model reference §2, from memory): 2.07 at 0 °C, 2.19 at −10 °C.
    assert_abs(ice_conductivity_w_m_k(0.0), 2.07, 0.005, "ice k at 0 °C");
    assert_abs(
        ice_conductivity_w_m_k(-10.0),
        2.19,
        0.005,
        "ice k at −10 °C",
    );
}

#[test]
fn ice_heat_capacity_and_density_match_iapws() {
    // IAPWS R10-06 via the iapws package (tests/data/reference.json). The specific-heat fit is
    // linear in T; IAPWS curves slightly, so 0.5 %. Density fit to 0.02 %.
    for row in reference()["ice"].as_array().unwrap() {
        let t = f(row, "t_c");
        assert_rel(
            ice_specific_heat_j_kg_k(t),
            f(row, "cp_j_kg_k"),
            5e-3,
            &format!("ice cp at {t} °C"),
        );
        assert_rel(
            ice_density_kg_m3(t),
            f(row, "density_kg_m3"),
            2e-4,
            &format!("ice density at {t} °C"),
        );
    }
    // The constant used at 0 °C.
    assert_rel(ICE_DENSITY_0C_KG_M3, 916.72, 1e-4, "IAPWS R10-06 at 0 °C");
}

#[test]
fn water_properties_match_iapws() {
    // IAPWS-95 at 0.01 °C via the iapws package; the constants are rounded to 4 digits.
    let w = &reference()["water"];
    assert_rel(
        WATER_DENSITY_KG_M3,
        f(w, "density_kg_m3"),
        1e-4,
        "water density",
    );
    assert_rel(
        WATER_SPECIFIC_HEAT_J_PER_KG_K,
        f(w, "cp_j_kg_k"),
        1e-3,
        "water cp",
    );
    assert_rel(
        WATER_CONDUCTIVITY_W_PER_M_K,
        f(w, "k_w_m_k"),
        2e-3,
        "water k",
    );
    assert_abs(
        LATENT_HEAT_FUSION_J_PER_KG,
        333.4e3,
        100.0,
        "IAPWS latent heat",
    );
}

#[test]
fn air_conductivity_matches_coolprop() {
    // CoolProp (tests/data/reference.json): the linear fit holds to 0.5 % over −40..+20 °C.
    let mut w = Vec::new();
    let air = MaterialSpec::Air.resolve("m", &mut w).unwrap();
    for row in reference()["air"].as_array().unwrap() {
        let t = f(row, "t_c");
        assert_rel(
            air.conductivity.k(t),
            f(row, "k_w_m_k"),
            5e-3,
            &format!("air k at {t} °C"),
        );
    }
}

fn soil_props(
    texture: Texture,
    model: SoilModel,
    rho: f64,
    w: f64,
    q: f64,
) -> soil::SoilProperties {
    let mut warn = Vec::new();
    soil::soil_properties(
        &SoilInput {
            texture,
            model,
            dry_density_kg_m3: rho,
            water_content_pct: w,
            quartz_fraction: q,
            conductivity_factor: 1.0,
        },
        "m",
        &mut warn,
    )
    .unwrap()
}

fn check_soil_rows(key: &str, model: SoilModel) {
    // Source: the published formulas, evaluated independently by tools/reference.py.
    for row in reference()[key].as_array().unwrap() {
        let t = Texture::from_id(row["texture"].as_str().unwrap()).unwrap();
        let q = row["quartz_fraction"].as_f64().unwrap_or(0.5);
        let p = soil_props(
            t,
            model,
            f(row, "dry_density_kg_m3"),
            f(row, "water_content_pct"),
            q,
        );
        let what = format!("{key} {row}");
        assert_rel(p.k_frozen_w_m_k, f(row, "k_frozen"), 1e-12, &what);
        assert_rel(p.k_unfrozen_w_m_k, f(row, "k_unfrozen"), 1e-12, &what);
    }
}

#[test]
fn kersten_matches_its_formulas() {
    check_soil_rows("kersten", SoilModel::Kersten1949);
}

#[test]
fn johansen_matches_its_formulas() {
    check_soil_rows("johansen", SoilModel::Johansen1975);
}

#[test]
fn cote_konrad_matches_its_formulas() {
    check_soil_rows("cote_konrad", SoilModel::CoteKonrad2005);
}

#[test]
fn johansen_limits_are_the_dry_and_saturated_conductivities() {
    // Johansen 1975: K_e = 0 when dry gives k_dry (Farouki 1986 form); at saturation
    // K_e = 1 gives the geometric mean k_s^(1−n) k_w^n.
    let rho = 1700.0;
    let dry = soil_props(Texture::Sand, SoilModel::Johansen1975, rho, 0.0, 0.5);
    assert_rel(
        dry.k_unfrozen_w_m_k,
        soil::johansen_k_dry(rho),
        1e-12,
        "dry",
    );
    let wsat = soil::saturation_water_content_pct(Texture::Sand, rho);
    let sat = soil_props(Texture::Sand, SoilModel::Johansen1975, rho, wsat, 0.5);
    let n = 1.0 - rho / 2650.0;
    let ks = soil::johansen_k_solids(0.5);
    assert_rel(
        sat.k_unfrozen_w_m_k,
        ks.powf(1.0 - n) * 0.57f64.powf(n),
        1e-9,
        "sat u",
    );
    assert_rel(
        sat.k_frozen_w_m_k,
        ks.powf(1.0 - n) * 2.2f64.powf(n),
        1e-9,
        "sat f",
    );
    // Frozen soil conducts better than unfrozen (ice 2.2 vs water 0.57).
    assert!(sat.k_frozen_w_m_k > sat.k_unfrozen_w_m_k);
}

#[test]
fn soil_heat_capacity_and_latent_heat_follow_the_mass_balance() {
    // TM 5-852-6 forms (model reference §3): L = ρ_d w 333.7 kJ/kg, C = ρ_d (c_s + c_w w).
    let p = soil_props(Texture::Silt, SoilModel::Kersten1949, 1600.0, 20.0, 0.3);
    assert_rel(p.latent_j_m3, 1600.0 * 0.20 * 333.7e3, 1e-12, "latent");
    assert_rel(
        p.c_unfrozen_j_m3k,
        1600.0 * (712.0 + 4187.0 * 0.2),
        1e-12,
        "C_u",
    );
    assert_rel(
        p.c_frozen_j_m3k,
        1600.0 * (712.0 + 2090.0 * 0.2),
        1e-12,
        "C_f",
    );
}

#[test]
fn water_beyond_saturation_is_refused_naming_the_field() {
    let mut w = Vec::new();
    let e = soil::soil_properties(
        &SoilInput {
            texture: Texture::Silt,
            model: SoilModel::Kersten1949,
            dry_density_kg_m3: 1600.0,
            water_content_pct: 40.0,
            quartz_fraction: 0.3,
            conductivity_factor: 1.0,
        },
        "layers[2].material",
        &mut w,
    )
    .unwrap_err();
    assert_eq!(e.0[0].field, "layers[2].material.water_content_pct");
    assert!(e.to_string().contains("saturation is 24.8"), "{e}");
}

#[test]
fn peat_needs_a_model_that_covers_it() {
    let mut w = Vec::new();
    let e = soil::soil_properties(
        &SoilInput {
            texture: Texture::Peat,
            model: SoilModel::Kersten1949,
            dry_density_kg_m3: 150.0,
            water_content_pct: 300.0,
            quartz_fraction: 0.0,
            conductivity_factor: 1.0,
        },
        "layers[0].material",
        &mut w,
    )
    .unwrap_err();
    assert_eq!(e.0[0].field, "layers[0].material.model");
}

#[test]
fn kersten_below_its_water_range_warns() {
    let mut w = Vec::new();
    soil::soil_properties(
        &SoilInput {
            texture: Texture::Clay,
            model: SoilModel::Kersten1949,
            dry_density_kg_m3: 1500.0,
            water_content_pct: 5.0,
            quartz_fraction: 0.3,
            conductivity_factor: 1.0,
        },
        "layers[1].material",
        &mut w,
    )
    .unwrap();
    assert!(w
        .iter()
        .any(|w| w.field == "layers[1].material.water_content_pct"));
}

#[test]
fn board_derating_raises_conductivity_by_the_lost_share_of_r() {
    let mut w = Vec::new();
    let m = MaterialSpec::Insulation {
        board: Board::ExtrudedPolystyrene,
        conductivity_w_m_k: None,
        moisture_derating_pct: 20.0,
    }
    .resolve("m", &mut w)
    .unwrap();
    // R per metre falls by 20 %: k_eff = k / 0.8.
    assert_rel(m.conductivity.k(0.0), 0.029 / 0.8, 1e-12, "derated XPS");
}

#[test]
fn kirchhoff_inverse_round_trips_on_every_branch() {
    let laws = [
        ConductivityLaw::same(Branch::IceIh),
        ConductivityLaw::same(Branch::Linear {
            k0: 0.02436,
            slope: 7.74e-5,
        }),
        ConductivityLaw {
            frozen: Branch::Constant(2.0),
            unfrozen: Branch::Constant(1.2),
        },
    ];
    for law in laws {
        for t in [-80.0, -25.0, -0.5, 0.0, 0.5, 15.0] {
            let back = law.phi_inverse(law.phi(t)).unwrap();
            assert_abs(back, t, 1e-9, "Φ⁻¹(Φ(T))");
        }
    }
    // Φ' = k: a central difference of the ice transform equals k.
    let h = 1e-4;
    let dphi = (ice_kirchhoff_w_m(-10.0 + h) - ice_kirchhoff_w_m(-10.0 - h)) / (2.0 * h);
    assert_rel(dphi, ice_conductivity_w_m_k(-10.0), 1e-8, "dΦ/dT = k");
}

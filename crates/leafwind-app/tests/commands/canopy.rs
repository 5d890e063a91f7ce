//! `leafwind canopy`: the JSON answer for an open field with a design day, a greenhouse with a
//! shade answer, a weather file with a bad row, and a scenario with no canopy section.

use std::path::PathBuf;

use crate::support::write;

use leafwind_app::canopy_scenario::{CanopySection, GreenhouseSection, InsideMode};
use leafwind_app::cli::canopy::{CanopyArgs, run};
use leafwind_app::document::ScenarioDocument;
use leafwind_physics::Humidity;
use leafwind_physics::crops::LimitKind;
use leafwind_physics::design_day::DesignDay;
use leafwind_physics::greenhouse::Cover;
use leafwind_physics::heat_rules::HeatRule;

fn temp_dir(name: &str) -> PathBuf {
    crate::support::temp_dir("canopy", name)
}

fn json(path: PathBuf) -> serde_json::Value {
    let mut out = Vec::new();
    run(
        &CanopyArgs {
            scenario: path,
            json: true,
            imperial: false,
        },
        &mut out,
    )
    .unwrap();
    crate::support::parse_json(out)
}

fn hot_field() -> ScenarioDocument {
    let mut doc = ScenarioDocument::default();
    doc.case.air.temp_c = 33.0;
    doc.case.air.humidity = Humidity::RelativePct(35.0);
    doc.case.air.speed_m_s = 0.3;
    doc.heat_limit_c = 38.0;
    doc.margin_k = 1.0;
    doc.canopy = Some(CanopySection {
        design_day: Some(DesignDay::default()),
        heat_rules: vec![HeatRule {
            temperature: LimitKind::Air,
            above_c: 20.0,
            hours: 2,
            hours_in_a_row: true,
            days: 1,
            days_in_a_row: false,
        }],
        ..CanopySection::default()
    });
    doc
}

#[test]
fn open_field_json_has_the_documented_keys_and_a_design_day() {
    let dir = temp_dir("field");
    let v = json(write(&hot_field(), &dir));
    for key in [
        "hottest_leaf_temp_c",
        "hottest_layer",
        "hottest_leaf_sunlit",
        "margin_k",
        "required_wind_m_s",
        "required_wind_reason",
        "required_shade_fraction",
        "required_shade_fraction_reason",
        "required_ventilation_m3_m2_s",
        "required_ventilation_reason",
        "design_rise_k",
        "ventilation_for_design_rise_m3_m2_s",
        "standard_factor_rate_m3_m2_s",
        "layers",
        "design_day",
    ] {
        assert!(v.get(key).is_some(), "missing {key}");
    }
    assert_eq!(v["layers"].as_array().unwrap().len(), 20);
    // Open field: no shade answer, and the reason says why.
    assert!(v["required_shade_fraction"].is_null());
    assert!(
        v["required_shade_fraction_reason"]
            .as_str()
            .unwrap()
            .contains("greenhouse")
    );
    // Nor a ventilation answer.
    assert!(v["required_ventilation_m3_m2_s"].is_null());
    assert!(v["standard_factor_rate_m3_m2_s"].is_null());
    assert!(
        v["required_ventilation_reason"]
            .as_str()
            .unwrap()
            .contains("open field")
    );
    let day = &v["design_day"];
    let steps = day["steps"].as_array().unwrap();
    assert!(steps.len() >= 24);
    for key in [
        "time",
        "sun_elevation_deg",
        "sun_azimuth_deg",
        "air_temp_c",
        "hottest_leaf_temp_c",
    ] {
        assert!(steps[12].get(key).is_some(), "step missing {key}");
    }
    assert!(day["hours_over_limit"].as_f64().unwrap() >= 0.0);
    // The design day also counts dew hours; the open field has no cooling options table.
    assert!(v["dew_hours_below_dew_point"].as_f64().unwrap() >= 0.0);
    assert!(v["cooling_options"].as_array().unwrap().is_empty());
    assert!(day["degree_hours_over_limit"].as_f64().unwrap() >= 0.0);
    // The heat rule over the design day: every design day has two hours in a row above 20 °C.
    let rule = &day["heat_rules"][0];
    assert_eq!(
        rule["rule"],
        "2 h in a row above 20.0 °C (air around the crop) on a day"
    );
    assert_eq!(rule["verdict"], "met");
    assert_eq!(rule["days_meeting"], 1);
    assert!(rule["first_met"].as_str().unwrap().starts_with("20"));
    assert!(rule["most_hours_in_a_day"].as_f64().unwrap() >= 2.0);
    // The hottest leaf is the one the layers say.
    let layer = v["hottest_layer"].as_u64().unwrap() as usize;
    let l = &v["layers"][layer];
    let t = if v["hottest_leaf_sunlit"].as_bool().unwrap() {
        l["sunlit_leaf_temp_c"].as_f64().unwrap()
    } else {
        l["shaded_leaf_temp_c"].as_f64().unwrap()
    };
    assert!((t - v["hottest_leaf_temp_c"].as_f64().unwrap()).abs() < 1e-9);
}

#[test]
fn greenhouse_gives_a_shade_answer() {
    let dir = temp_dir("house");
    let mut doc = hot_field();
    doc.heat_limit_c = 36.0;
    if let Some(c) = doc.canopy.as_mut() {
        c.design_day = None;
        c.greenhouse = Some(GreenhouseSection {
            cover: Cover::default(),
            shade_fraction: 0.0,
            outside_air_temp_c: 32.0,
            outside_humidity: Humidity::RelativePct(40.0),
            inside: InsideMode::Ventilated { rate_m3_m2_s: 0.03 },
            design_rise_k: 4.0,
        });
    }
    let v = json(write(&doc, &dir));
    assert!(v["inside_air_temp_c"].as_f64().is_some());
    let reason = v["required_shade_fraction_reason"].as_str().unwrap();
    assert!(!reason.contains("open field"), "{reason}");
    // Under cover the options are compared; shading the house never heats the hottest leaf
    // (common practice, no source).
    let options = v["cooling_options"].as_array().unwrap();
    let hottest = |label: &str| {
        options
            .iter()
            .find(|o| o["option"] == label)
            .and_then(|o| o["hottest_leaf_temp_c"].as_f64())
            .unwrap()
    };
    assert!(options.len() >= 5);
    assert!(hottest("shade screen") <= hottest("none"));
    // The ventilation answers: a rate for the hottest leaf in words, the rate for a 4 K rise from
    // the balance, and the standard's factor method (ASABE EP406, from memory) beside it.
    let reason = v["required_ventilation_reason"].as_str().unwrap();
    assert!(reason.contains("From the ventilation balance"), "{reason}");
    if let Some(rate) = v["required_ventilation_m3_m2_s"].as_f64() {
        assert!(rate > 0.0 && rate <= 0.5, "{rate}");
    }
    let factor = v["standard_factor_rate_m3_m2_s"].as_f64().unwrap();
    assert!(factor > 0.0 && factor < 0.2, "{factor}");
    assert!(v["ventilation_for_design_rise_m3_m2_s"].as_f64().unwrap() > 0.0);
    assert_eq!(v["design_rise_k"].as_f64(), Some(4.0));
}

#[test]
fn weather_file_bad_rows_are_listed_and_good_rows_run() {
    let dir = temp_dir("weather");
    std::fs::write(
        dir.join("hours.csv"),
        "time,air_temp_c,rh_pct,wind_m_s,shortwave_w_m2\n\
         2026-07-21 12:00,34,30,1.0,850\n\
         2026-07-21 13:00,35,130,1.0,870\n\
         2026-07-21 14:00,36,28,1.2,820\n",
    )
    .unwrap();
    let mut doc = hot_field();
    if let Some(c) = doc.canopy.as_mut() {
        c.design_day = None;
        c.weather_csv = Some("hours.csv".into());
    }
    let v = json(write(&doc, &dir));
    let w = &v["weather"];
    assert_eq!(w["steps"].as_array().unwrap().len(), 2);
    let rejected = w["rejected_rows"].as_array().unwrap();
    assert_eq!(rejected.len(), 1);
    assert!(rejected[0].as_str().unwrap().contains('3'), "{rejected:?}");
}

/// A heat rule over a two-day weather file (invented rows): two hours above 33 °C on both days,
/// days in a row, is met on the second day; a missing hour breaks an "in a row" run.
#[test]
fn heat_rules_run_over_the_weather_file() {
    let dir = temp_dir("weather-rules");
    std::fs::write(
        dir.join("two_days.csv"),
        "time,air_temp_c,rh_pct,wind_m_s,shortwave_w_m2\n\
         2026-07-21 12:00,34,30,1.0,850\n\
         2026-07-21 13:00,35,30,1.0,870\n\
         2026-07-21 14:00,31,30,1.2,820\n\
         2026-07-22 12:00,34,30,1.0,850\n\
         2026-07-22 14:00,34,30,1.0,820\n",
    )
    .unwrap();
    let mut doc = hot_field();
    if let Some(c) = doc.canopy.as_mut() {
        c.design_day = None;
        c.weather_csv = Some("two_days.csv".into());
        let two_days = HeatRule {
            temperature: LimitKind::Air,
            above_c: 33.0,
            hours: 2,
            hours_in_a_row: false,
            days: 2,
            days_in_a_row: true,
        };
        c.heat_rules = vec![
            two_days,
            HeatRule {
                hours_in_a_row: true,
                ..two_days
            },
        ];
    }
    let v = json(write(&doc, &dir));
    let rules = v["weather"]["heat_rules"].as_array().unwrap();
    assert_eq!(rules[0]["verdict"], "met");
    assert_eq!(rules[0]["first_met"], "2026-07-22");
    assert_eq!(rules[0]["longest_day_run"], 2);
    // 12:00 and 14:00 on the 22nd are not an unbroken run: only the 21st meets it.
    assert_eq!(rules[1]["verdict"], "not met");
    assert_eq!(rules[1]["days_meeting"], 1);
}

/// `--imperial` text: °F, ft/min and the same sentences as the window; the JSON stays SI.
#[test]
fn imperial_text_uses_fahrenheit_and_feet_per_minute() {
    let dir = temp_dir("imperial");
    let path = write(&hot_field(), &dir);
    let text = |imperial: bool| {
        let mut out = Vec::new();
        run(
            &CanopyArgs {
                scenario: path.clone(),
                json: false,
                imperial,
            },
            &mut out,
        )
        .unwrap();
        String::from_utf8(out).unwrap()
    };
    let im = text(true);
    assert!(im.contains("°F") && im.contains("ft/min"), "{im}");
    assert!(!im.contains("°C"), "{im}");
    assert!(im.contains("Least canopy-top air speed"), "{im}");
    assert!(im.contains("Rule “2 h in a row above 68.0 °F"), "{im}");
    assert!(!im.contains("NaN") && !im.contains("-0.0"), "{im}");
    let si = text(false);
    assert!(
        si.contains("°C") && si.contains("m/s") && !si.contains("°F"),
        "{si}"
    );
    assert!(si.contains("licensed practice"), "{si}");
}

#[test]
fn scenario_without_canopy_is_a_named_error() {
    let dir = temp_dir("none");
    let path = write(&ScenarioDocument::default(), &dir);
    let mut out = Vec::new();
    let err = run(
        &CanopyArgs {
            scenario: path.clone(),
            json: false,
            imperial: false,
        },
        &mut out,
    )
    .unwrap_err();
    let msg = format!("{err:#}");
    assert!(
        msg.contains("no canopy section") && msg.contains(&path.display().to_string()),
        "{msg}"
    );
}

#[test]
fn the_users_own_crop_limit_is_found_before_the_built_in_ones() {
    use leafwind_app::canopy_scenario::CropChoice;
    use leafwind_physics::crops::{HeatLimit, LimitKind};
    let dir = temp_dir("own-limit");
    let mut doc = hot_field();
    if let Some(c) = doc.canopy.as_mut() {
        c.design_day = None;
        // The user's own tomato limit shadows the built-in tomato entry of the same stage.
        let mut mine =
            HeatLimit::user("tomato", "flowering and fruit set", 30.5, LimitKind::Tissue);
        mine.source = "our own trial, 2025 (invented for this test)".into();
        c.own_limits = vec![mine];
        c.crop = Some(CropChoice {
            crop: "Tomato".into(),
            stage: "flowering".into(),
        });
    }
    let v = json(write(&doc, &dir));
    assert_eq!(v["limit_c"].as_f64(), Some(30.5));
    assert_eq!(v["limit_kind"].as_str(), Some("tissue"));
    assert!(
        v["limit_source"]
            .as_str()
            .unwrap()
            .contains("our own trial")
    );
}

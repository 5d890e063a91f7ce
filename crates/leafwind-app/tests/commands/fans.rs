//! `leafwind fans`: the canopy air-speed range of a layout, sizing for a target, spot readings
//! with a bad row, the night dew check, and a scenario with no fans section.

use std::path::PathBuf;

use crate::support::write;

use leafwind_app::cli::fans::{FansArgs, run};
use leafwind_app::document::ScenarioDocument;
use leafwind_app::fans_scenario::{FansSection, NightCheck};
use leafwind_physics::{Humidity, UpperView};

fn temp_dir(name: &str) -> PathBuf {
    crate::support::temp_dir("fans", name)
}

fn json(path: PathBuf) -> serde_json::Value {
    let mut out = Vec::new();
    run(
        &FansArgs {
            scenario: path,
            json: true,
            imperial: false,
        },
        &mut out,
    )
    .unwrap();
    crate::support::parse_json(out)
}

#[test]
fn layout_gives_an_ordered_range_and_answers() {
    let dir = temp_dir("layout");
    std::fs::write(
        dir.join("spots.csv"),
        "position_m,height_m,speed_m_s\n5,1.8,0.6\n20,1.8,0.15\n35,1.8,abc\n50,1.8,0.4\n",
    )
    .unwrap();
    let doc = ScenarioDocument {
        fans: Some(FansSection {
            target_canopy_speed_m_s: Some(0.5),
            readings_csv: Some("spots.csv".into()),
            night: Some(NightCheck {
                air_temp_c: 14.0,
                humidity: Humidity::RelativePct(92.0),
                upper_view: UpperView::ClearSky,
                margin_k: 0.5,
            }),
            ..FansSection::default()
        }),
        ..ScenarioDocument::default()
    };
    let v = json(write(&doc, &dir));
    for which in ["canopy_speed_min", "canopy_speed_mean"] {
        let r = &v[which];
        let (lo, ty, hi) = (
            r["low_m_s"].as_f64().unwrap(),
            r["typical_m_s"].as_f64().unwrap(),
            r["high_m_s"].as_f64().unwrap(),
        );
        assert!(lo <= ty && ty <= hi, "{which}: {lo} {ty} {hi}");
    }
    assert!(v["estimate_note"].as_str().unwrap().contains("anemometer"));
    assert!(v["sizing_reason"].as_str().is_some());
    assert_eq!(v["rejected_readings"].as_array().unwrap().len(), 1);
    assert_eq!(v["readings"]["count"].as_u64(), Some(3));
    assert!(v["night_reason"].as_str().is_some());
    assert!(v["fan_power_w"].as_f64().unwrap() > 0.0);
}

#[test]
fn scenario_without_fans_is_a_named_error() {
    let dir = temp_dir("none");
    let path = write(&ScenarioDocument::default(), &dir);
    let mut out = Vec::new();
    let err = run(
        &FansArgs {
            scenario: path,
            json: false,
            imperial: false,
        },
        &mut out,
    )
    .unwrap_err();
    assert!(format!("{err:#}").contains("no fans section"));
}

/// `--imperial` text: ft/min, cfm per ft² and ft, with the window's sentences; SI text in m/s.
#[test]
fn imperial_text_uses_feet_per_minute_and_cfm() {
    let (_, text) = leafwind_app::document::EXAMPLES[0];
    let doc = ScenarioDocument::from_ron(text).unwrap();
    assert!(doc.fans.is_some());
    let dir = temp_dir("imperial");
    let path = write(&doc, &dir);
    let text = |imperial: bool| {
        let mut out = Vec::new();
        run(
            &FansArgs {
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
    assert!(
        im.contains("ft/min") && im.contains("cfm/ft²") && im.contains(" ft"),
        "{im}"
    );
    assert!(im.contains("°F"), "{im}");
    assert!(im.contains("Where more air stops helping"), "{im}");
    assert!(!im.contains("NaN") && !im.contains("-0.0"), "{im}");
    let si = text(false);
    assert!(si.contains("m/s") && !si.contains("ft/min"), "{si}");
    assert!(si.contains("licensed electrician"), "{si}");
}

//! The grower report: one per shipped scenario, valid HTML with the expected sections, numbers
//! that match the engine, plots with axis titles and units, CSVs with unit headers, imperial
//! units, never a NaN; the optional canopy and design-day sections; the `leafwind report` command.
//!
//! The expected values are the engine's own results for the same inputs (no published source:
//! these check that the report carries the engine's numbers faithfully); tolerances follow the
//! digits the report prints.

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use leafwind_app::document::ScenarioDocument;
use leafwind_app::report::{
    HTML_FILE, ReportExtras, build_report, extras_for, write_report, write_report_with,
};
use leafwind_app::units::{Quantity, UnitSystem};
use leafwind_physics::canopy::{CanopyCase, solve_canopy};
use leafwind_physics::design_day::{DesignDay, SeriesCase, run};
use leafwind_physics::heat_rules::{HeatRule, Verdict, check_rule};
use leafwind_physics::required_wind::SEARCH_MAX_SPEED_DEFAULT_M_S;
use leafwind_physics::{WindAnswer, required_wind, solve_leaf};
use proptest::prelude::*;
use scraper::{ElementRef, Html, Selector};

fn scenarios() -> Vec<(String, ScenarioDocument)> {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("../../scenarios");
    let mut v: Vec<(String, ScenarioDocument)> = std::fs::read_dir(&dir)
        .expect("the scenarios folder")
        .filter_map(Result::ok)
        .map(|e| e.path())
        .filter(|p| p.extension().is_some_and(|x| x == "ron"))
        .map(|p| {
            let doc = ScenarioDocument::load(&p).unwrap_or_else(|e| panic!("{}: {e}", p.display()));
            (p.file_name().unwrap().to_string_lossy().into_owned(), doc)
        })
        .collect();
    v.sort_by(|a, b| a.0.cmp(&b.0));
    assert!(v.len() >= 4, "the shipped scenarios are found");
    v
}

fn out_dir(name: &str) -> PathBuf {
    let d = Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join("report-tests")
        .join(name);
    let _ = std::fs::remove_dir_all(&d);
    d
}

fn sel(s: &str) -> Selector {
    Selector::parse(s).unwrap()
}

fn text(e: ElementRef<'_>) -> String {
    e.text().collect::<String>().trim().to_owned()
}

fn by_id<'a>(html: &'a Html, id: &str) -> ElementRef<'a> {
    html.select(&sel(&format!("#{id}")))
        .next()
        .unwrap_or_else(|| panic!("no element #{id}"))
}

fn si_of(html: &Html, id: &str) -> Option<f64> {
    by_id(html, id)
        .value()
        .attr("data-si")
        .and_then(|s| s.parse().ok())
}

/// The first number in a text ("34.8 °C" → 34.8; "−" and "-" both read as minus).
fn first_number(s: &str) -> f64 {
    let s = s.replace('−', "-");
    let start = s
        .find(|c: char| c.is_ascii_digit() || c == '-')
        .unwrap_or_else(|| panic!("no number in {s:?}"));
    let num: String = s[start..]
        .chars()
        .take_while(|c| c.is_ascii_digit() || *c == '.' || *c == '-')
        .collect();
    num.parse().unwrap_or_else(|_| panic!("no number in {s:?}"))
}

fn no_nan(s: &str, what: &str) {
    for token in s.split(|c: char| !c.is_ascii_alphanumeric()) {
        assert!(
            !matches!(token, "NaN" | "nan" | "inf" | "Infinity" | "infinity"),
            "{what} contains {token:?}"
        );
    }
}

/// Every section the report must have, by id, with its heading element.
const SECTIONS: [(&str, &str); 11] = [
    ("title", "h1"),
    ("answer", "h2"),
    ("notes", "h2"),
    ("inputs", "h2"),
    ("leaf-result", "h2"),
    ("sweep", "h2"),
    ("map", "h2"),
    ("assumptions", "h2"),
    ("sources", "h2"),
    ("cautions", "h2"),
    ("files", "h2"),
];

/// Axis titles each plot must carry, in the given units.
fn expected_axes(units: UnitSystem) -> BTreeMap<&'static str, Vec<String>> {
    let u = |q: Quantity| q.unit(units).to_owned();
    let sp = u(Quantity::Speed);
    BTreeMap::from([
        ("fig-budget", vec!["flux per leaf area [W/m²]".to_owned()]),
        (
            "fig-sweep-diff",
            vec![
                format!("air speed over the leaf [{sp}]"),
                format!("leaf − air [{}]", u(Quantity::TempDiff)),
            ],
        ),
        (
            "fig-sweep-thickness",
            vec![
                format!("air speed over the leaf [{sp}]"),
                format!(
                    "99 % thickness at the trailing edge [{}]",
                    u(Quantity::Thickness)
                ),
            ],
        ),
        (
            "fig-map",
            vec![
                format!("air speed over the leaf [{sp}]"),
                format!("leaf size along the wind [{}]", u(Quantity::LeafSize)),
            ],
        ),
    ])
}

fn check_report(name: &str, doc: &ScenarioDocument, units: UnitSystem) {
    let dir = out_dir(&format!("{name}-{units:?}"));
    let files = write_report(doc, &dir, units).unwrap_or_else(|e| panic!("{name}: {e:#}"));
    assert_eq!(files.html, dir.join(HTML_FILE));
    let source = std::fs::read_to_string(&files.html).unwrap();
    no_nan(&source, name);

    // Valid HTML: html5ever's tree builder reports no parse error.
    let html = Html::parse_document(&source);
    assert!(html.errors.is_empty(), "{name}: {:?}", html.errors);
    for (id, heading) in SECTIONS {
        let s = by_id(&html, id);
        assert!(
            s.select(&sel(heading)).next().is_some(),
            "{name}: #{id} has no {heading}"
        );
    }
    // The answer comes first.
    let first = html.select(&sel("section")).next().unwrap();
    assert_eq!(first.value().id(), Some("answer"), "{name}");
    // The optional sections appear exactly when the scenario's canopy section asks for them.
    let has = |id: &str| html.select(&sel(&format!("#{id}"))).next().is_some();
    let canopy = doc.canopy.as_ref();
    assert_eq!(has("canopy"), canopy.is_some(), "{name}");
    assert_eq!(
        has("design-day"),
        canopy.is_some_and(|c| c.design_day.is_some()),
        "{name}"
    );

    // The numbers are the engine's.
    let units_t = Quantity::Temperature;
    let leaf = solve_leaf(&doc.case).unwrap();
    let shown_t = si_of(&html, "leaf-temp").unwrap();
    assert!((shown_t - leaf.leaf_temp_c).abs() < 1e-9, "{name}");
    let printed = first_number(&text(by_id(&html, "leaf-temp")));
    // Printed to 0.1 °C (°F): within half a unit of the last digit.
    assert!(
        (printed - units_t.to_display(leaf.leaf_temp_c, units)).abs() <= 0.05 + 1e-9,
        "{name}: {printed}"
    );
    let table_t = first_number(&text(by_id(&html, "res-leaf-temp")));
    assert!((table_t - printed).abs() < 1e-9, "{name}");
    let answer = required_wind(
        &doc.case,
        doc.heat_limit_c,
        doc.margin_k,
        SEARCH_MAX_SPEED_DEFAULT_M_S,
    )
    .unwrap();
    let least = by_id(&html, "least-speed");
    match answer {
        WindAnswer::Speed { speed_m_s, .. } => {
            assert!((si_of(&html, "least-speed").unwrap() - speed_m_s).abs() < 1e-9);
            let sp = Quantity::Speed;
            let printed = first_number(&text(least));
            // Printed to 0.01 m/s or 1 ft/min.
            let half = 0.5 * 10f64.powi(-(sp.decimals(units) as i32));
            assert!(
                (printed - sp.to_display(speed_m_s, units)).abs() <= half + 1e-9,
                "{name}: {printed}"
            );
        }
        WindAnswer::NotNeeded { .. } => {
            assert_eq!(si_of(&html, "least-speed"), Some(0.0), "{name}");
        }
        WindAnswer::Unreachable(_) => {
            assert_eq!(least.value().attr("data-si"), Some(""), "{name}");
            let t = text(least);
            assert!(
                t.contains("No air speed") || t.contains("Air alone cannot"),
                "{t}"
            );
        }
    }
    // The budget closes as printed.
    let (bin, bout) = (
        si_of(&html, "budget-in").unwrap(),
        si_of(&html, "budget-out").unwrap(),
    );
    assert!(
        (bin - bout).abs() < 1e-6 * bin.max(1.0),
        "{name}: {bin} vs {bout}"
    );

    // Every plot has its axis titles with units (as SVG text), and every SVG is in a figure.
    let expected = expected_axes(units);
    let figures: Vec<ElementRef<'_>> = html.select(&sel("figure")).collect();
    // The main figures, plus those of the optional sections (each checked for unit labels below).
    let ids: Vec<&str> = figures.iter().filter_map(|f| f.value().id()).collect();
    for id in expected.keys() {
        assert!(ids.contains(id), "{name}: no figure #{id}");
    }
    assert_eq!(html.select(&sel("svg")).count(), figures.len());
    for f in figures {
        let id = f.value().id().unwrap();
        let svg = f.select(&sel("svg")).next().expect("an inline SVG");
        let texts: Vec<String> = svg.select(&sel("text")).map(text).collect();
        for axis in expected.get(id).into_iter().flatten() {
            assert!(
                texts.iter().any(|t| t == axis),
                "{name} {id}: no {axis:?} in {texts:?}"
            );
        }
        assert!(
            texts.iter().any(|t| t.contains('[') && t.ends_with(']')),
            "{name} {id}"
        );
    }
    // The map's colour bar names its quantity with its unit.
    let map_texts: Vec<String> = by_id(&html, "fig-map")
        .select(&sel("text"))
        .map(text)
        .collect();
    let t_unit = Quantity::Temperature.unit(units);
    let d_unit = Quantity::TempDiff.unit(units);
    assert!(map_texts.iter().any(|t| {
        *t == format!("leaf temperature [{t_unit}]")
            || *t == format!("limit − leaf temperature [{d_unit}]")
    }));

    // The CSVs parse, have unit headers, hold no NaN, and are all listed in the report.
    let optional_tables = usize::from(has("canopy")) + usize::from(has("design-day"));
    assert_eq!(files.csv.len(), 5 + optional_tables, "{name}");
    for path in &files.csv {
        let file = path.file_name().unwrap().to_string_lossy().into_owned();
        assert!(
            html.select(&sel(&format!("#files a[href=\"{file}\"]")))
                .next()
                .is_some(),
            "{file} is listed"
        );
        let body = std::fs::read_to_string(path).unwrap();
        no_nan(&body, &file);
        let mut r = csv::Reader::from_reader(body.as_bytes());
        let header = r.headers().unwrap().clone();
        // Columns that are labels, counts or clock times rather than quantities.
        let text_columns = [
            "quantity",
            "value",
            "unit",
            "note",
            "term",
            "direction",
            "layer_from_top",
            "time",
            "error",
        ];
        let mut with_unit = 0;
        for h in &header {
            if h.contains(" [") && h.ends_with(']') {
                with_unit += 1;
            } else {
                assert!(
                    text_columns.contains(&h),
                    "{file}: column {h:?} has no unit"
                );
            }
        }
        assert!(
            with_unit > 0 || header.iter().any(|h| h == "unit"),
            "{file}: no units"
        );
        let rows: Vec<csv::StringRecord> = r.records().map(Result::unwrap).collect();
        assert!(!rows.is_empty(), "{file}");
        assert!(rows.iter().all(|row| row.len() == header.len()), "{file}");
    }
    let map_rows = csv::Reader::from_path(dir.join("map.csv"))
        .unwrap()
        .records()
        .count();
    assert_eq!(map_rows, 64 * 64, "{name}");
}

#[test]
fn every_shipped_scenario_gives_a_valid_report_in_si() {
    for (name, doc) in scenarios() {
        check_report(&name, &doc, UnitSystem::Si);
    }
}

#[test]
fn every_shipped_scenario_gives_a_valid_report_in_imperial() {
    for (name, doc) in scenarios() {
        check_report(&name, &doc, UnitSystem::Imperial);
    }
}

#[test]
fn imperial_report_shows_fahrenheit_feet_per_minute_and_inches() {
    let (_, doc) = &scenarios()[0];
    let r = build_report(doc, &ReportExtras::default(), UnitSystem::Imperial).unwrap();
    let html = Html::parse_document(&r.html);
    let answer = text(by_id(&html, "answer"));
    assert!(answer.contains("°F"), "{answer}");
    assert!(
        !answer.contains("°C") && !answer.contains("m/s"),
        "{answer}"
    );
    let inputs = text(by_id(&html, "inputs-table"));
    for unit in ["°F", "ft/min", " in"] {
        assert!(inputs.contains(unit), "{unit} in {inputs}");
    }
    assert!(!inputs.contains("°C") && !inputs.contains("m/s") && !inputs.contains(" mm"));
    for f in html.select(&sel("figure svg")) {
        let t: String = f
            .select(&sel("text"))
            .map(text)
            .collect::<Vec<_>>()
            .join("|");
        assert!(
            !t.contains("°C") && !t.contains("[m/s]") && !t.contains("[mm]"),
            "{t}"
        );
    }
    let sweep = r
        .tables
        .iter()
        .find(|t| t.file_name == "sweep.csv")
        .unwrap();
    assert!(sweep.header.contains(&"air_speed [ft/min]".to_owned()));
    assert!(sweep.header.contains(&"leaf_minus_air [°F]".to_owned()));
    assert!(sweep.header.contains(&"leaf_size [in]".to_owned()));
}

#[test]
fn optional_sections_appear_with_their_engine_inputs() {
    let (_, doc) = &scenarios()[0];
    let canopy = CanopyCase {
        limit_c: Some(35.0),
        ..CanopyCase::default()
    };
    let extras = ReportExtras {
        canopy: Some(canopy),
        design_day: Some((DesignDay::default(), SeriesCase::default())),
        sizing: None,
        heat_rules: vec![HeatRule::default()],
    };
    let dir = out_dir("extras");
    let files = write_report_with(doc, &extras, &dir, UnitSystem::Si).unwrap();
    let source = std::fs::read_to_string(&files.html).unwrap();
    no_nan(&source, "extras");
    let html = Html::parse_document(&source);
    assert!(html.errors.is_empty(), "{:?}", html.errors);
    for id in ["canopy", "design-day"] {
        assert!(by_id(&html, id).select(&sel("h2")).next().is_some());
    }
    // Numbers from the engine's canopy and design-day runs.
    let c = solve_canopy(&canopy).unwrap();
    assert!((si_of(&html, "canopy-hottest").unwrap() - c.hottest.leaf_temp_c).abs() < 1e-9);
    let d = run(&DesignDay::default(), &SeriesCase::default()).unwrap();
    assert_eq!(si_of(&html, "day-hours-over").unwrap(), d.hours_over_limit);
    // The heat rule is stated over the day with the engine's verdict.
    let rule = text(by_id(&html, "day-rule-0"));
    let o = check_rule(&HeatRule::default(), &d).unwrap();
    assert!(rule.starts_with("Rule “3 h above 40.0 °C"), "{rule}");
    let word = match o.verdict {
        Verdict::Met => "met over",
        Verdict::NotMet => "not met",
        Verdict::DailyConditionOnly => "daily condition",
    };
    assert!(rule.contains(word), "{rule}");
    // Their plots have axis titles with units, and their CSVs are written.
    for (fig, axes) in [
        (
            "fig-canopy",
            ["leaf temperature [°C]", "height above the ground [m]"],
        ),
        (
            "fig-design-day",
            ["local clock time [h]", "temperature [°C]"],
        ),
    ] {
        let texts: Vec<String> = by_id(&html, fig).select(&sel("text")).map(text).collect();
        for a in axes {
            assert!(texts.iter().any(|t| t == a), "{fig}: {a} in {texts:?}");
        }
    }
    for f in ["canopy_profile.csv", "design_day.csv"] {
        assert!(files.csv.contains(&dir.join(f)), "{f}");
        let mut r = csv::Reader::from_path(dir.join(f)).unwrap();
        assert!(r.headers().unwrap().iter().any(|h| h.ends_with(" [°C]")));
        assert!(r.records().count() > 0);
    }
    // Their sources are listed.
    let sources = text(by_id(&html, "sources"));
    assert!(sources.contains("Cionco") && sources.contains("Michalsky"));
}

/// A ventilated glasshouse: the report's canopy sizing section states the least canopy-top air
/// speed, the least shade and the least ventilation rate with the numbers of the scenario's canopy
/// run, in ft/min and cfm/ft² when imperial, with the installation caution.
#[test]
fn the_glasshouse_report_has_the_canopy_sizing_answers_of_the_canopy_run() {
    let (_, mut doc) = scenarios()
        .into_iter()
        .find(|(n, d)| n.contains("glasshouse") && d.canopy.is_some())
        .expect("the glasshouse example");
    if let Some(g) = doc.canopy.as_mut().and_then(|c| c.greenhouse.as_mut()) {
        g.inside = leafwind_app::canopy_scenario::InsideMode::Ventilated { rate_m3_m2_s: 0.03 };
    }
    let section = doc.canopy.clone().unwrap();
    let run = section
        .run(&doc.case, doc.heat_limit_c, doc.margin_k, None)
        .unwrap();
    let vent = run.ventilation.expect("under cover");
    for units in [UnitSystem::Si, UnitSystem::Imperial] {
        let r = build_report(&doc, &extras_for(&doc), units).unwrap();
        no_nan(&r.html, "sizing");
        let html = Html::parse_document(&r.html);
        assert!(html.errors.is_empty(), "{:?}", html.errors);
        let speed = text(by_id(&html, "canopy-least-speed"));
        let shade = text(by_id(&html, "canopy-least-shade"));
        let v = text(by_id(&html, "canopy-least-ventilation"));
        assert!(speed.starts_with("Least canopy-top air speed"), "{speed}");
        assert!(shade.starts_with("Least shade"), "{shade}");
        assert!(v.starts_with("Least ventilation"), "{v}");
        let q = Quantity::VentilationRate;
        let factor = q.format(vent.check.factor.rate_m3_m2_s, units);
        assert!(v.contains(&factor), "{factor} in {v}");
        if let Some(rate) = vent.check.for_leaf.rate_m3_m2_s() {
            assert!(v.contains(&q.format(rate, units)), "{v}");
        }
        let unit = if units == UnitSystem::Si {
            "m³/s per m²"
        } else {
            "cfm/ft²"
        };
        assert!(v.contains(unit), "{v}");
        let all = text(by_id(&html, "canopy-sizing"));
        assert!(all.contains("licensed practitioners"), "{all}");
        assert!(text(by_id(&html, "sources")).contains("EP406"));
    }
}

#[test]
fn a_failed_optional_section_says_why_and_the_rest_stands() {
    let (_, doc) = &scenarios()[0];
    let mut bad = CanopyCase::default();
    bad.structure.lai = -1.0;
    let extras = ReportExtras {
        canopy: Some(bad),
        design_day: None,
        sizing: Some(Err("an invented failure".to_owned())),
        heat_rules: Vec::new(),
    };
    let r = build_report(doc, &extras, UnitSystem::Si).unwrap();
    let html = Html::parse_document(&r.html);
    assert!(text(by_id(&html, "canopy")).contains("could not be computed"));
    assert!(text(by_id(&html, "canopy-sizing")).contains("an invented failure"));
    assert!(html.select(&sel("#leaf-temp")).next().is_some());
}

#[test]
fn an_invalid_scenario_is_an_error_not_a_panic() {
    let (_, doc) = &scenarios()[0];
    for mutate in [
        (|d: &mut ScenarioDocument| d.heat_limit_c = f64::NAN) as fn(&mut ScenarioDocument),
        |d| d.case.air.speed_m_s = -1.0,
        |d| d.case.leaf.dimension_m = f64::INFINITY,
        |d| d.sweep.max_speed_m_s = 0.0,
        |d| d.map.size_max_m = 2.0,
    ] {
        let mut d = doc.clone();
        mutate(&mut d);
        let e = build_report(&d, &ReportExtras::default(), UnitSystem::Si).unwrap_err();
        assert!(format!("{e:#}").contains("cannot"), "{e:#}");
    }
}

#[test]
fn a_map_that_cannot_be_drawn_is_left_out_with_the_reason() {
    let (_, doc) = &scenarios()[0];
    for mutate in [
        (|d: &mut ScenarioDocument| d.map.speed_min_m_s = d.map.speed_max_m_s)
            as fn(&mut ScenarioDocument),
        |d| d.map.speed_min_m_s = 0.0,
        |d| std::mem::swap(&mut d.map.size_min_m, &mut d.map.size_max_m),
    ] {
        let mut d = doc.clone();
        mutate(&mut d);
        let r = build_report(&d, &ReportExtras::default(), UnitSystem::Si).unwrap();
        no_nan(&r.html, "html");
        let html = Html::parse_document(&r.html);
        assert!(text(by_id(&html, "map")).contains("The map is left out"));
        assert!(html.select(&sel("#fig-map")).next().is_none());
        assert!(r.tables.iter().all(|t| t.file_name != "map.csv"));
    }
}

#[test]
fn the_report_command_writes_the_folder() {
    let scenario = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("../../scenarios")
        .join(&scenarios()[0].0);
    let dir = out_dir("cli");
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_leafwind"))
        .arg("report")
        .arg(&scenario)
        .arg("--out")
        .arg(&dir)
        .arg("--imperial")
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let stdout = String::from_utf8_lossy(&out.stdout);
    assert!(
        stdout.contains("ft/min") || stdout.contains("°F"),
        "{stdout}"
    );
    assert!(dir.join(HTML_FILE).is_file() && dir.join("map.csv").is_file());

    let missing = dir.join("no-such-scenario.ron");
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_leafwind"))
        .arg("report")
        .arg(&missing)
        .arg("--out")
        .arg(&dir)
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(stderr.contains("no-such-scenario.ron"), "{stderr}");
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 24, .. ProptestConfig::default() })]

    /// Over the valid range of the main inputs the report builds, parses, and never shows NaN
    /// (invariant; common practice, no source).
    #[test]
    fn any_valid_leaf_gives_a_clean_report(
        air in -5.0f64..45.0,
        rh in 5.0f64..95.0,
        wind in 0.0f64..6.0,
        size in 0.002f64..0.6,
        sun in 0.0f64..1100.0,
        stomatal in 0.0f64..0.8,
        imperial in any::<bool>(),
    ) {
        let mut d = ScenarioDocument::default();
        d.case.air.temp_c = air;
        d.case.air.humidity = leafwind_physics::Humidity::RelativePct(rh);
        d.case.air.speed_m_s = wind;
        d.case.leaf.dimension_m = size;
        d.case.surroundings.shortwave_w_m2 = sun;
        d.case.leaf.stomatal_conductance_mol_m2_s = stomatal;
        let units = if imperial { UnitSystem::Imperial } else { UnitSystem::Si };
        let r = build_report(&d, &ReportExtras::default(), units).unwrap();
        no_nan(&r.html, "html");
        for t in &r.tables {
            no_nan(&t.to_csv().unwrap(), t.file_name);
        }
        let html = Html::parse_document(&r.html);
        prop_assert!(html.errors.is_empty(), "{:?}", html.errors);
        prop_assert!(html.select(&sel("#least-speed")).next().is_some());
    }
}

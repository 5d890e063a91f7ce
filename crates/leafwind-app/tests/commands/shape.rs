//! `leafwind shape` on the invented example outlines in `assets/outlines/` and on broken files.

use std::path::PathBuf;
use std::process::ExitCode;

use leafwind_app::cli::shape::{ShapeArgs, run, run_to};
use leafwind_physics::shape::{ShapeMetrics, effective_dimension_m, outline_from_csv_mm};

fn asset(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("../../assets/outlines")
        .join(name)
}

fn args(files: Vec<PathBuf>, angle: f64, json: bool) -> ShapeArgs {
    ShapeArgs { files, angle, json }
}

/// A file in the system temporary folder, unique to this test process.
fn temp_file(name: &str, text: &str) -> PathBuf {
    let path =
        std::env::temp_dir().join(format!("leafwind-cli-shape-{}-{name}", std::process::id()));
    std::fs::write(&path, text).unwrap();
    path
}

#[test]
fn text_table_lists_every_quantity_for_both_examples() {
    let files = vec![asset("broad_ovate.csv"), asset("deeply_lobed.csv")];
    let mut out = Vec::new();
    let code = run(&args(files, 0.0, false), &mut out).unwrap();
    assert_eq!(code, ExitCode::SUCCESS);
    let text = String::from_utf8(out).unwrap();
    for name in [
        "area_m2",
        "perimeter_m",
        "length_along_wind_m",
        "width_across_wind_m",
        "effective_dimension_m",
        "hand_rule_dimension_m",
        "effective_dimension_min_m",
        "effective_dimension_max_m",
        "effective_dimension_mean_m",
    ] {
        assert_eq!(
            text.matches(&format!("  {name} ")).count(),
            2,
            "{name}\n{text}"
        );
    }
    assert!(text.contains("broad_ovate.csv") && text.contains("deeply_lobed.csv"));
    assert!(!text.contains("NaN") && !text.contains("inf"));
}

// The JSON values are those of the engine (same functions, no rounding in JSON).
#[test]
fn json_array_matches_the_engine() {
    let files = vec![asset("broad_ovate.csv"), asset("deeply_lobed.csv")];
    let mut out = Vec::new();
    let code = run(&args(files.clone(), 30.0, true), &mut out).unwrap();
    assert_eq!(code, ExitCode::SUCCESS);
    let v: serde_json::Value = serde_json::from_slice(&out).unwrap();
    let arr = v.as_array().unwrap();
    assert_eq!(arr.len(), 2);
    for (obj, file) in arr.iter().zip(&files) {
        let outline = outline_from_csv_mm(&std::fs::read_to_string(file).unwrap()).unwrap();
        let shape = outline.into();
        let m = ShapeMetrics::of(&shape, 30f64.to_radians()).unwrap();
        let get = |k: &str| obj[k].as_f64().unwrap_or_else(|| panic!("{k}: {obj}"));
        assert_eq!(get("area_m2"), m.area_m2);
        assert_eq!(get("effective_dimension_m"), m.effective_dimension_m);
        assert_eq!(get("hand_rule_dimension_m"), m.hand_rule_dimension_m);
        assert_eq!(get("angle_deg"), 30.0);
        assert!(get("effective_dimension_min_m") <= get("effective_dimension_mean_m"));
        assert!(get("effective_dimension_mean_m") <= get("effective_dimension_max_m"));
        assert!(obj.get("error").is_none());
        // The invented examples are leaf-sized: no warning about units.
        assert!(obj.get("warning").is_none(), "{obj}");
    }
    // The lobed leaf splits lines along its midrib into several chords; the ovate one does not.
    assert_eq!(arr[0]["chords_per_line_max"], 1);
    let lobed_along = {
        let mut out = Vec::new();
        run(&args(vec![files[1].clone()], 0.0, true), &mut out).unwrap();
        serde_json::from_slice::<serde_json::Value>(&out).unwrap()[0].clone()
    };
    assert!(lobed_along["chords_per_line_max"].as_u64().unwrap() >= 3);
    // And its effective dimension lies below its convex hull's (engine check on the same file).
    let lobed = outline_from_csv_mm(&std::fs::read_to_string(&files[1]).unwrap()).unwrap();
    let hull = effective_dimension_m(&lobed.convex_hull().into(), 0.0);
    assert!(lobed_along["effective_dimension_m"].as_f64().unwrap() < hull);
}

#[test]
fn a_bad_file_is_named_with_its_row_and_the_others_still_run() {
    let bad = temp_file("bad.csv", "x_mm,y_mm\n0,0\n10,0\n10,ten\n0,10\n");
    let crossing = temp_file("crossing.csv", "0,0\n10,10\n10,0\n0,10\n");
    let files = vec![asset("broad_ovate.csv"), bad.clone(), crossing.clone()];
    let (mut out, mut err) = (Vec::new(), Vec::new());
    let code = run_to(&args(files, 0.0, true), &mut out, &mut err).unwrap();
    assert_eq!(code, ExitCode::FAILURE);
    let v: serde_json::Value = serde_json::from_slice(&out).unwrap();
    let arr = v.as_array().unwrap();
    assert_eq!(arr.len(), 3);
    assert!(arr[0]["effective_dimension_m"].as_f64().is_some());
    let e1 = arr[1]["error"].as_str().unwrap();
    assert!(e1.contains("row 4") && e1.contains("bad.csv"), "{e1}");
    let e2 = arr[2]["error"].as_str().unwrap();
    assert!(
        e2.contains("crosses itself") && e2.contains("row 1 to row 2"),
        "{e2}"
    );
    let stderr = String::from_utf8(err).unwrap();
    assert_eq!(stderr.lines().count(), 2, "{stderr}");
    // Text mode shows the error in place of the table.
    let (mut out, mut err) = (Vec::new(), Vec::new());
    let missing = PathBuf::from("/nonexistent/leafwind/outline.csv");
    let code = run_to(
        &args(vec![missing, bad.clone()], 0.0, false),
        &mut out,
        &mut err,
    )
    .unwrap();
    assert_eq!(code, ExitCode::FAILURE);
    let text = String::from_utf8(out).unwrap();
    assert!(
        text.contains("cannot read") && text.contains("row 4"),
        "{text}"
    );
    std::fs::remove_file(bad).ok();
    std::fs::remove_file(crossing).ok();
}

#[test]
fn angle_out_of_range_is_an_error() {
    let mut out = Vec::new();
    assert!(
        run(
            &args(vec![asset("broad_ovate.csv")], 400.0, false),
            &mut out
        )
        .is_err()
    );
    assert!(
        run(
            &args(vec![asset("broad_ovate.csv")], f64::NAN, false),
            &mut out
        )
        .is_err()
    );
}

//! `leafwind solve`: JSON keys, the limit question, and batch rows with errors.

use std::io::Write as _;

use clap::Parser;
use leafwind_app::cli::{Cli, Command, solve};

fn args(list: &[&str]) -> solve::SolveArgs {
    let mut full = vec!["leafwind", "solve"];
    full.extend_from_slice(list);
    match Cli::parse_from(full).command {
        Some(Command::Solve(a)) => a,
        other => panic!("{other:?}"),
    }
}

fn run(a: &solve::SolveArgs) -> (anyhow::Result<std::process::ExitCode>, String) {
    let mut out = Vec::new();
    let r = solve::run(a, &mut out);
    (r, String::from_utf8(out).unwrap())
}

const BASE: [&str; 10] = [
    "--air-temp",
    "32",
    "--rh",
    "55",
    "--wind",
    "0.3",
    "--leaf-size",
    "0.08",
    "--sun",
    "600",
];

#[test]
fn json_has_every_documented_key() {
    let mut a = BASE.to_vec();
    a.extend(["--limit", "35", "--margin", "2", "--json"]);
    let (r, text) = run(&args(&a));
    r.unwrap();
    let v: serde_json::Value = serde_json::from_str(&text).unwrap();
    for key in [
        "leaf_temp_c",
        "leaf_air_diff_k",
        "absorbed_w_m2",
        "emitted_w_m2",
        "sensible_w_m2",
        "latent_w_m2",
        "residual_w_m2",
        "transpiration_mmol_m2_s",
        "heat_transfer_coeff_w_m2_k",
        "bl_vapour_conductance_mol_m2_s",
        "total_vapour_conductance_mol_m2_s",
        "reynolds",
        "grashof",
        "regime",
        "bl_thickness_mm",
        "effective_bl_thickness_mm",
        "linearised_leaf_temp_c",
        "iterations",
        "required_wind_m_s",
        "required_wind_reason",
    ] {
        assert!(v.get(key).is_some(), "missing {key}");
    }
    assert!(v["residual_w_m2"].as_f64().unwrap().abs() < 1e-6);
    let closure = v["absorbed_w_m2"].as_f64().unwrap()
        - v["emitted_w_m2"].as_f64().unwrap()
        - v["sensible_w_m2"].as_f64().unwrap()
        - v["latent_w_m2"].as_f64().unwrap();
    assert!(closure.abs() < 1e-6);
    assert!(v["required_wind_m_s"].as_f64().unwrap() > 0.0);
}

#[test]
fn unreachable_limit_gives_null_and_a_reason() {
    let mut a = BASE.to_vec();
    a.extend(["--limit", "31", "--json"]);
    let (r, text) = run(&args(&a));
    r.unwrap();
    let v: serde_json::Value = serde_json::from_str(&text).unwrap();
    assert!(v["required_wind_m_s"].is_null());
    assert!(v["required_wind_reason"].as_str().unwrap().contains("air"));
}

#[test]
fn still_air_has_no_velocity_thickness_and_no_nan() {
    let mut a = BASE.to_vec();
    a[5] = "0";
    a.push("--json");
    let (r, text) = run(&args(&a));
    r.unwrap();
    assert!(!text.contains("NaN") && !text.contains("inf"));
    let v: serde_json::Value = serde_json::from_str(&text).unwrap();
    assert!(v["bl_thickness_mm"].is_null());
}

#[test]
fn missing_required_flag_is_named() {
    let (r, _) = run(&args(&["--air-temp", "30"]));
    assert!(r.unwrap_err().to_string().contains("--rh"));
}

#[test]
fn batch_reports_bad_rows_and_solves_the_rest() {
    let dir = std::env::temp_dir().join(format!("leafwind-batch-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("cases.csv");
    let mut f = std::fs::File::create(&path).unwrap();
    writeln!(f, "air_temp,rh,wind,leaf_size,sun\n30,50,1,0.05,800\n30,150,1,0.05,800\nabc,1,1,1,1\n20,70,0,0.01,0").unwrap();
    drop(f);
    let path_text = path.to_string_lossy().into_owned();
    let (r, text) = run(&args(&["--batch", &path_text]));
    assert!(
        r.is_err(),
        "failed rows make the command fail after the others ran"
    );
    let mut reader = csv::Reader::from_reader(text.as_bytes());
    let rows: Vec<csv::StringRecord> = reader.records().map(Result::unwrap).collect();
    assert_eq!(rows.len(), 4);
    assert_eq!(&rows[0][0], "2");
    assert!(rows[0][1].is_empty());
    assert!(rows[1][1].contains("relative humidity"));
    assert!(!rows[2][1].is_empty());
    assert!(rows[3][1].is_empty());
    // JSON lines too.
    let (_, text) = run(&args(&["--batch", &path_text, "--json"]));
    assert_eq!(text.lines().count(), 4);
    for line in text.lines() {
        let _: serde_json::Value = serde_json::from_str(line).unwrap();
    }
}

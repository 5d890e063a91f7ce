//! CSV export of each plot's data, in the units on screen (units in the column names).
//! Non-finite values are written as empty cells, never "NaN".

use std::io::Write;
use std::path::Path;

use anyhow::Context as _;

use super::compute::{BoundaryResult, LeafResult, MapResult, SweepResult};
use super::panels::result::budget_terms;
use crate::units::{Quantity, UnitSystem};

fn cell(x: f64) -> String {
    if x.is_finite() {
        format!("{x}")
    } else {
        String::new()
    }
}

fn opt(x: Option<f64>) -> String {
    x.map_or_else(String::new, cell)
}

fn head(name: &str, q: Quantity, units: UnitSystem) -> String {
    let u = q.unit(units);
    if u.is_empty() {
        name.to_owned()
    } else {
        format!("{name} [{u}]")
    }
}

/// Writes records to any writer.
fn write_records<W: Write>(
    out: W,
    header: &[String],
    rows: impl Iterator<Item = Vec<String>>,
) -> anyhow::Result<()> {
    let mut w = csv::Writer::from_writer(out);
    w.write_record(header)?;
    for r in rows {
        w.write_record(&r)?;
    }
    w.flush()?;
    Ok(())
}

/// The energy budget as CSV text.
///
/// # Errors
/// Writer failure.
pub fn budget_csv<W: Write>(out: W, r: &LeafResult) -> anyhow::Result<()> {
    let header = vec![
        "term".to_owned(),
        "direction".to_owned(),
        "flux [W/m²]".to_owned(),
    ];
    let rows = budget_terms(r).into_iter().map(|t| {
        vec![
            t.name.to_owned(),
            if t.gain { "gain" } else { "loss" }.to_owned(),
            cell(t.w_m2),
        ]
    });
    write_records(out, &header, rows)
}

/// The sweep as CSV.
///
/// # Errors
/// Writer failure.
pub fn sweep_csv<W: Write>(out: W, s: &SweepResult, units: UnitSystem) -> anyhow::Result<()> {
    let (sz, sp, dt, th) = (
        Quantity::LeafSize,
        Quantity::Speed,
        Quantity::TempDiff,
        Quantity::Thickness,
    );
    let header = vec![
        head("leaf_size", sz, units),
        head("air_speed", sp, units),
        head("leaf_minus_air", dt, units),
        head("bl_thickness_99", th, units),
        head("bl_equivalent_k_over_h", th, units),
    ];
    let rows = s.curves.iter().flat_map(|c| {
        (0..c.speeds_m_s.len()).map(move |i| {
            vec![
                cell(sz.to_display(c.size_m, units)),
                cell(sp.to_display(c.speeds_m_s[i], units)),
                opt(c.diff_k[i].map(|v| dt.to_display(v, units))),
                opt(c.delta99_m[i].map(|v| th.to_display(v, units))),
                opt(c.effective_m[i].map(|v| th.to_display(v, units))),
            ]
        })
    });
    write_records(out, &header, rows)
}

/// The map as CSV (one row per cell).
///
/// # Errors
/// Writer failure.
pub fn map_csv<W: Write>(out: W, m: &MapResult, units: UnitSystem) -> anyhow::Result<()> {
    let (sp, sz, t, dt) = (
        Quantity::Speed,
        Quantity::LeafSize,
        Quantity::Temperature,
        Quantity::TempDiff,
    );
    let header = vec![
        head("air_speed", sp, units),
        head("leaf_size", sz, units),
        head("leaf_temperature", t, units),
        head("limit_minus_leaf", dt, units),
    ];
    let w = m.speeds_m_s.len();
    let rows = m.sizes_m.iter().enumerate().flat_map(|(r, &d)| {
        m.speeds_m_s.iter().enumerate().map(move |(c, &u)| {
            let v = m.leaf_temp_c[r * w + c];
            vec![
                cell(sp.to_display(u, units)),
                cell(sz.to_display(d, units)),
                cell(t.to_display(v, units)),
                cell(dt.to_display(m.input.limit_c - v, units)),
            ]
        })
    });
    write_records(out, &header, rows)
}

/// The boundary-layer curves as CSV (one series per row group).
///
/// # Errors
/// Writer failure.
pub fn boundary_csv<W: Write>(out: W, b: &BoundaryResult, units: UnitSystem) -> anyhow::Result<()> {
    let (pos, th, sp) = (Quantity::Position, Quantity::Thickness, Quantity::Speed);
    let header = vec![
        "series".to_owned(),
        head("distance_from_leading_edge", pos, units),
        head("height_above_leaf", th, units),
        head("velocity", sp, units),
        head("thickness_99", th, units),
        "wall_shear_rate [1/s]".to_owned(),
    ];
    let mut rows: Vec<Vec<String>> = Vec::new();
    for (x, pts) in &b.profiles {
        for &(y, u) in pts {
            rows.push(vec![
                "velocity profile".into(),
                cell(pos.to_display(*x, units)),
                cell(th.to_display(y, units)),
                cell(sp.to_display(u, units)),
                String::new(),
                String::new(),
            ]);
        }
    }
    for &(x, d) in &b.thickness {
        rows.push(vec![
            "thickness".into(),
            cell(pos.to_display(x, units)),
            String::new(),
            String::new(),
            cell(th.to_display(d, units)),
            String::new(),
        ]);
    }
    for &(x, g) in &b.shear {
        rows.push(vec![
            "wall shear".into(),
            cell(pos.to_display(x, units)),
            String::new(),
            String::new(),
            String::new(),
            cell(g),
        ]);
    }
    write_records(out, &header, rows.into_iter())
}

/// Opens `path` for writing, with the path in the error.
///
/// # Errors
/// Create failure.
pub fn create(path: &Path) -> anyhow::Result<std::fs::File> {
    std::fs::File::create(path).with_context(|| format!("could not write {}", path.display()))
}

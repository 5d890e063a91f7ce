//! `leafwind solve`: one leaf from flags, or a CSV batch of leaves, printed as text, JSON or CSV.

use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;

use anyhow::{Context, Result, anyhow, bail};
use clap::Args;
use leafwind_physics::case::{ABSORPTIVITY_DEFAULT, EMISSIVITY_DEFAULT};
use leafwind_physics::constants::STANDARD_PRESSURE_KPA;
use leafwind_physics::convection::{CRITICAL_REYNOLDS_DEFAULT, TURBULENCE_FACTOR_DEFAULT};
use leafwind_physics::radiation::GROUND_ALBEDO_DEFAULT;
use leafwind_physics::required_wind::SEARCH_MAX_SPEED_DEFAULT_M_S;
use leafwind_physics::transpiration::{
    CUTICULAR_CONDUCTANCE_DEFAULT_MOL_M2_S, LOWER_SHARE_DEFAULT,
    STOMATAL_CONDUCTANCE_DEFAULT_MOL_M2_S,
};
use leafwind_physics::{
    Air, Humidity, Leaf, LeafCase, Surroundings, UpperView, required_wind, solve_leaf,
};
use serde::{Deserialize, Serialize};

use crate::output::LeafRecord;

/// Flags of `leafwind solve` (SI units).
#[derive(Debug, Clone, Args)]
pub struct SolveArgs {
    /// Air temperature [°C].
    #[arg(long, allow_negative_numbers = true)]
    pub air_temp: Option<f64>,
    /// Relative humidity [%].
    #[arg(long)]
    pub rh: Option<f64>,
    /// Air pressure [kPa].
    #[arg(long, default_value_t = STANDARD_PRESSURE_KPA)]
    pub pressure: f64,
    /// Air speed over the leaf [m/s].
    #[arg(long)]
    pub wind: Option<f64>,
    /// Leaf characteristic dimension along the wind [m].
    #[arg(long)]
    pub leaf_size: Option<f64>,
    /// Shortwave (sun) on the upper face [W/m²].
    #[arg(long)]
    pub sun: Option<f64>,
    /// Shortwave absorptivity of the leaf [-].
    #[arg(long, default_value_t = ABSORPTIVITY_DEFAULT)]
    pub absorptivity: f64,
    /// Longwave emissivity of the leaf [-].
    #[arg(long, default_value_t = EMISSIVITY_DEFAULT)]
    pub emissivity: f64,
    /// Sky (or greenhouse cover) radiant temperature [°C]; default: clear sky from the air.
    #[arg(long, allow_negative_numbers = true)]
    pub sky_temp: Option<f64>,
    /// Ground albedo lighting the lower face [-].
    #[arg(long, default_value_t = GROUND_ALBEDO_DEFAULT)]
    pub ground_albedo: f64,
    /// Total stomatal conductance [mol m⁻² s⁻¹].
    #[arg(long, default_value_t = STOMATAL_CONDUCTANCE_DEFAULT_MOL_M2_S)]
    pub stomatal: f64,
    /// Share of stomatal conductance on the lower face [-].
    #[arg(long, default_value_t = LOWER_SHARE_DEFAULT)]
    pub lower_share: f64,
    /// Free-stream turbulence enhancement factor [-] (1.4: Campbell & Norman 1998, ch. 7).
    #[arg(long, default_value_t = TURBULENCE_FACTOR_DEFAULT)]
    pub turbulence: f64,
    /// Critical Reynolds number for laminar–turbulent transition [-].
    #[arg(long, default_value_t = CRITICAL_REYNOLDS_DEFAULT)]
    pub critical_re: f64,
    /// Leaf temperature limit [°C]; with it the least air speed is answered.
    #[arg(long, allow_negative_numbers = true)]
    pub limit: Option<f64>,
    /// Margin below the limit [K].
    #[arg(long, default_value_t = 0.0)]
    pub margin: f64,
    /// Print JSON (one object; JSON lines with --batch).
    #[arg(long)]
    pub json: bool,
    /// CSV file with one case per row (columns named like the flags, e.g. air_temp, rh, wind,
    /// leaf_size, sun); missing columns take the flags' values.
    #[arg(long, value_name = "FILE.csv")]
    pub batch: Option<PathBuf>,
}

/// One row of a batch file. Every column is optional; a missing one takes the flag's value.
#[derive(Debug, Clone, Default, Deserialize)]
#[serde(deny_unknown_fields)]
struct BatchRow {
    air_temp: Option<f64>,
    rh: Option<f64>,
    pressure: Option<f64>,
    wind: Option<f64>,
    leaf_size: Option<f64>,
    sun: Option<f64>,
    absorptivity: Option<f64>,
    emissivity: Option<f64>,
    sky_temp: Option<f64>,
    ground_albedo: Option<f64>,
    stomatal: Option<f64>,
    lower_share: Option<f64>,
    turbulence: Option<f64>,
    critical_re: Option<f64>,
    limit: Option<f64>,
    margin: Option<f64>,
}

impl SolveArgs {
    /// The flags' values overridden by a batch row's.
    fn with_row(&self, r: &BatchRow) -> Self {
        let pick = |row: Option<f64>, flag: Option<f64>| row.or(flag);
        Self {
            air_temp: pick(r.air_temp, self.air_temp),
            rh: pick(r.rh, self.rh),
            pressure: r.pressure.unwrap_or(self.pressure),
            wind: pick(r.wind, self.wind),
            leaf_size: pick(r.leaf_size, self.leaf_size),
            sun: pick(r.sun, self.sun),
            absorptivity: r.absorptivity.unwrap_or(self.absorptivity),
            emissivity: r.emissivity.unwrap_or(self.emissivity),
            sky_temp: pick(r.sky_temp, self.sky_temp),
            ground_albedo: r.ground_albedo.unwrap_or(self.ground_albedo),
            stomatal: r.stomatal.unwrap_or(self.stomatal),
            lower_share: r.lower_share.unwrap_or(self.lower_share),
            turbulence: r.turbulence.unwrap_or(self.turbulence),
            critical_re: r.critical_re.unwrap_or(self.critical_re),
            limit: pick(r.limit, self.limit),
            margin: r.margin.unwrap_or(self.margin),
            json: self.json,
            batch: None,
        }
    }

    /// The leaf case these flags describe.
    ///
    /// # Errors
    /// A required value (air temperature, RH, wind, leaf size, sun) is missing.
    pub fn case(&self) -> Result<LeafCase> {
        let need = |v: Option<f64>, flag: &str| v.ok_or_else(|| anyhow!("--{flag} is required"));
        Ok(LeafCase {
            air: Air {
                temp_c: need(self.air_temp, "air-temp")?,
                humidity: Humidity::RelativePct(need(self.rh, "rh")?),
                pressure_kpa: self.pressure,
                speed_m_s: need(self.wind, "wind")?,
                turbulence_factor: self.turbulence,
            },
            leaf: Leaf {
                dimension_m: need(self.leaf_size, "leaf-size")?,
                absorptivity: self.absorptivity,
                emissivity: self.emissivity,
                stomatal_conductance_mol_m2_s: self.stomatal,
                lower_share: self.lower_share,
                cuticular_conductance_mol_m2_s: CUTICULAR_CONDUCTANCE_DEFAULT_MOL_M2_S,
                free_convection_length_m: None,
            },
            surroundings: Surroundings {
                shortwave_w_m2: need(self.sun, "sun")?,
                ground_albedo: self.ground_albedo,
                upper_view: self
                    .sky_temp
                    .map_or(UpperView::ClearSky, UpperView::SkyTempC),
                ground_temp_c: None,
            },
            critical_reynolds: self.critical_re,
        })
    }

    /// Solves the case and answers the limit question if a limit was given.
    ///
    /// # Errors
    /// Missing or invalid inputs, named.
    pub fn solve(&self) -> Result<LeafRecord> {
        let case = self.case()?;
        let solution = solve_leaf(&case)?;
        let wind = match self.limit {
            Some(limit) => Some(required_wind(
                &case,
                limit,
                self.margin,
                SEARCH_MAX_SPEED_DEFAULT_M_S,
            )?),
            None => None,
        };
        Ok(LeafRecord::new(&solution, wind.as_ref()))
    }
}

/// A batch output row: the row number, the result or the error.
#[derive(Debug, Serialize)]
struct BatchOutput<'a> {
    row: usize,
    error: Option<&'a str>,
    #[serde(flatten)]
    result: Option<&'a LeafRecord>,
}

/// Runs `leafwind solve`, writing to `out`.
///
/// # Errors
/// A single case that cannot be solved, an unreadable batch file, or a failed write.
pub fn run(args: &SolveArgs, out: &mut impl Write) -> Result<ExitCode> {
    match &args.batch {
        None => {
            let record = args.solve()?;
            if args.json {
                crate::output::write_json(out, &record)?;
            } else {
                write_text(&record, out)?;
            }
            Ok(ExitCode::SUCCESS)
        }
        Some(path) => run_batch(args, path, out),
    }
}

fn run_batch(args: &SolveArgs, path: &PathBuf, out: &mut impl Write) -> Result<ExitCode> {
    let mut reader = csv::ReaderBuilder::new()
        .trim(csv::Trim::All)
        .from_path(path)
        .with_context(|| format!("cannot read the batch file {}", path.display()))?;
    let headers = reader.headers()?.clone();
    let mut failed = 0usize;
    let mut csv_out = (!args.json).then(|| csv::Writer::from_writer(Vec::new()));
    let mut header_written = false;
    for (i, row) in reader.records().enumerate() {
        // Row numbers count the header as row 1, as a spreadsheet shows them.
        let row_number = i + 2;
        let outcome: Result<LeafRecord> = row
            .map_err(anyhow::Error::from)
            .and_then(|r| {
                r.deserialize::<BatchRow>(Some(&headers))
                    .map_err(Into::into)
            })
            .and_then(|r| args.with_row(&r).solve());
        let (record, error) = match &outcome {
            Ok(r) => (Some(r), None),
            Err(e) => {
                failed += 1;
                let msg = format!("{e:#}");
                eprintln!("{}: row {row_number}: {msg}", path.display());
                (None, Some(msg))
            }
        };
        let line = BatchOutput {
            row: row_number,
            error: error.as_deref(),
            result: record,
        };
        match csv_out.as_mut() {
            None => {
                serde_json::to_writer(&mut *out, &line)?;
                writeln!(out)?;
            }
            Some(w) => {
                // CSV needs every row to have every column: write the header from a full record
                // once, and failed rows with empty result fields.
                if !header_written {
                    w.write_record(batch_header())?;
                    header_written = true;
                }
                w.write_record(batch_fields(row_number, error.as_deref(), record)?)?;
            }
        }
    }
    if let Some(w) = csv_out {
        out.write_all(&w.into_inner().map_err(|e| anyhow!("{e}"))?)?;
    }
    if failed > 0 {
        bail!(
            "{failed} row(s) of {} could not be solved (see above)",
            path.display()
        );
    }
    Ok(ExitCode::SUCCESS)
}

/// Column names of a batch CSV: `row`, `error`, then the record's fields.
fn batch_header() -> Vec<String> {
    let mut names = vec!["row".to_owned(), "error".to_owned()];
    names.extend(
        record_columns(&reference_record())
            .into_iter()
            .map(|(k, _)| k),
    );
    names
}

fn batch_fields(
    row: usize,
    error: Option<&str>,
    record: Option<&LeafRecord>,
) -> Result<Vec<String>> {
    let mut fields = vec![row.to_string(), error.unwrap_or("").to_owned()];
    let reference = record_columns(&reference_record());
    match record {
        Some(r) => {
            let cols = record_columns(r);
            fields.extend(reference.iter().map(|(k, _)| {
                cols.iter()
                    .find(|(c, _)| c == k)
                    .map(|(_, v)| v.clone())
                    .unwrap_or_default()
            }));
        }
        None => fields.extend(reference.iter().map(|_| String::new())),
    }
    Ok(fields)
}

/// A record with every optional field present, to fix the CSV columns.
fn reference_record() -> LeafRecord {
    let case = LeafCase::default();
    let s = solve_leaf(&case).expect("the default case solves");
    let w = required_wind(&case, 35.0, 0.0, SEARCH_MAX_SPEED_DEFAULT_M_S).expect("valid");
    LeafRecord::new(&s, Some(&w))
}

/// The record's fields as (name, text) pairs, nulls as empty text.
fn record_columns(r: &LeafRecord) -> Vec<(String, String)> {
    let value = serde_json::to_value(r).unwrap_or_default();
    let mut out = Vec::new();
    if let serde_json::Value::Object(map) = value {
        for (k, v) in map {
            let text = match v {
                serde_json::Value::Null => String::new(),
                serde_json::Value::String(s) => s,
                other => other.to_string(),
            };
            out.push((k, text));
        }
    }
    out
}

fn write_text(r: &LeafRecord, out: &mut impl Write) -> Result<()> {
    let opt = |v: Option<f64>| v.map_or("— (still air)".to_owned(), |x| format!("{x:.2} mm"));
    writeln!(
        out,
        "Leaf temperature      {:.2} °C ({:+.2} K from the air)",
        r.leaf_temp_c, r.leaf_air_diff_k
    )?;
    writeln!(
        out,
        "Linearised estimate   {:.2} °C (exact − linearised {:+.3} K)",
        r.linearised_leaf_temp_c, r.linearisation_error_k
    )?;
    writeln!(
        out,
        "Energy budget         absorbed {:.1} = emitted {:.1} + sensible {:.1} + latent {:.1} W/m² (residual {:.1e})",
        r.absorbed_w_m2, r.emitted_w_m2, r.sensible_w_m2, r.latent_w_m2, r.residual_w_m2
    )?;
    writeln!(
        out,
        "Transpiration         {:.2} mmol/m²/s ({:.1} g/m²/h)",
        r.transpiration_mmol_m2_s, r.transpiration_g_m2_h
    )?;
    writeln!(
        out,
        "Convection            h = {:.2} W/m²/K, Re = {:.0}, Gr = {:.0}, {}",
        r.heat_transfer_coeff_w_m2_k, r.reynolds, r.grashof, r.regime
    )?;
    writeln!(
        out,
        "Boundary layer        99 % thickness {}, effective {}",
        opt(r.bl_thickness_mm),
        opt(r.effective_bl_thickness_mm)
    )?;
    if let Some(reason) = &r.required_wind_reason {
        writeln!(out, "Least air speed       {reason}")?;
    }
    Ok(())
}

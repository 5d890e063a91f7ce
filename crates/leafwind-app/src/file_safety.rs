//! Keeping scenario files safe: atomic writes, a stamp of what was on disk when a file was opened
//! or saved (to notice another program changing it), and the range check of every loaded value
//! with the document path of the field (`case.air.speed_m_s`).

use std::hash::{Hash as _, Hasher as _};
use std::io::Write as _;
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicU64, Ordering};
use std::time::SystemTime;

use anyhow::Context as _;
use leafwind_physics::PhysicsError;
use leafwind_physics::air::{AIR_TEMP_RANGE_C, ALTITUDE_RANGE_M, PRESSURE_RANGE_KPA};
use leafwind_physics::case::{
    AIR_SPEED_RANGE_M_S, FREE_CONVECTION_LENGTH_RANGE_M, LEAF_DIMENSION_RANGE_M,
};
use leafwind_physics::convection::{CRITICAL_REYNOLDS_RANGE, TURBULENCE_FACTOR_RANGE};
use leafwind_physics::error::ValidRange;
use leafwind_physics::radiation::{
    ABSORPTIVITY_RANGE, ALBEDO_RANGE, EMISSIVITY_RANGE, SHORTWAVE_RANGE_W_M2, SURFACE_TEMP_RANGE_C,
    UpperView,
};
use leafwind_physics::required_wind::{LIMIT_RANGE_C, MARGIN_RANGE_K};
use leafwind_physics::transpiration::{
    CUTICULAR_CONDUCTANCE_RANGE_MOL_M2_S, LOWER_SHARE_RANGE, STOMATAL_CONDUCTANCE_RANGE_MOL_M2_S,
};

use leafwind_physics::greenhouse::{
    CoverTemperature, HEAT_LOSS_RANGE_W_M2_K, SHADE_FRACTION_RANGE, TRANSMITTANCE_RANGE,
    VENTILATION_RANGE_M3_M2_S,
};
use leafwind_physics::ventilation::RISE_RANGE_K;

use crate::canopy_scenario::{GreenhouseSection, InsideMode};
use crate::document::{MAX_EXTRA_SIZES, SWEEP_MAX_RANGE_M_S, ScenarioDocument};

// ----- atomic writes -----

/// Writes `bytes` to `path` so that the file is either the old one or the new one, never a
/// truncated mix: the bytes go to a temporary file beside the target, are flushed and synced to
/// the disk, and the temporary file is then renamed over the target (a rename within one folder
/// is atomic on the file systems Leafwind runs on). On any failure the temporary file is removed
/// and the target is left as it was.
///
/// # Errors
/// Creating, writing, syncing or renaming failed (a full disk, no permission), with the path.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> anyhow::Result<()> {
    static COUNTER: AtomicU64 = AtomicU64::new(0);
    let dir = match path.parent() {
        Some(d) if !d.as_os_str().is_empty() => d.to_path_buf(),
        _ => PathBuf::from("."),
    };
    let name = path
        .file_name()
        .map_or_else(|| "scenario".into(), |n| n.to_string_lossy().into_owned());
    let tmp = dir.join(format!(
        ".{name}.{}-{}.tmp",
        std::process::id(),
        COUNTER.fetch_add(1, Ordering::Relaxed)
    ));
    let result = (|| -> anyhow::Result<()> {
        let mut f = std::fs::OpenOptions::new()
            .write(true)
            .create_new(true)
            .open(&tmp)
            .with_context(|| format!("could not create a temporary file in {}", dir.display()))?;
        // Keep the permissions of the file being replaced.
        if let Ok(meta) = std::fs::metadata(path) {
            std::fs::set_permissions(&tmp, meta.permissions()).ok();
        }
        f.write_all(bytes)?;
        f.flush()?;
        f.sync_all()?;
        drop(f);
        std::fs::rename(&tmp, path)?;
        // Make the rename itself durable (Unix; a folder cannot be opened this way on Windows).
        #[cfg(unix)]
        if let Ok(d) = std::fs::File::open(&dir) {
            d.sync_all().ok();
        }
        Ok(())
    })();
    if result.is_err() {
        std::fs::remove_file(&tmp).ok();
    }
    result.with_context(|| format!("could not write {}", path.display()))
}

// ----- what was on disk -----

/// What a file held when Leafwind last read or wrote it: size, modification time and a hash of
/// the content. Two stamps of the same file differ when another program changed it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct FileStamp {
    /// Size \[bytes\].
    pub len: u64,
    /// Modification time, when the file system reports one.
    pub modified: Option<SystemTime>,
    /// Hash of the content (only compared within one run of Leafwind).
    pub hash: u64,
}

impl FileStamp {
    /// The stamp of `bytes` as the file at `path` now holds them.
    #[must_use]
    pub fn of(path: &Path, bytes: &[u8]) -> Self {
        let mut h = std::collections::hash_map::DefaultHasher::new();
        bytes.hash(&mut h);
        Self {
            len: bytes.len() as u64,
            modified: std::fs::metadata(path).and_then(|m| m.modified()).ok(),
            hash: h.finish(),
        }
    }

    /// The stamp of the file at `path` now; `None` when it does not exist or cannot be read.
    #[must_use]
    pub fn read(path: &Path) -> Option<Self> {
        std::fs::read(path).ok().map(|b| Self::of(path, &b))
    }

    /// Whether the file changed between the two stamps. The content decides: a file touched
    /// but not changed (same size and hash, another time) has not changed.
    #[must_use]
    pub fn differs_from(&self, other: &Self) -> bool {
        self.len != other.len || self.hash != other.hash
    }
}

// ----- range check with document paths -----

/// A loaded value that is out of range, with the document path of its field.
#[derive(Debug, Clone, PartialEq)]
pub struct FieldError {
    /// Document path of the field, e.g. `case.air.speed_m_s`.
    pub path: String,
    /// What is wrong: the quantity, the value and the valid range.
    pub message: String,
}

fn field_error(path: &str, e: &PhysicsError, range: Option<&ValidRange>) -> FieldError {
    let mut message = e.to_string();
    if let (PhysicsError::NotFinite { .. }, Some(r)) = (e, range) {
        message.push_str(&format!(
            "; the valid range is {} to {} {}",
            r.min, r.max, r.unit
        ));
    }
    FieldError {
        path: path.to_owned(),
        message,
    }
}

fn check(path: &str, value: f64, range: &ValidRange) -> Result<(), FieldError> {
    range
        .check(value)
        .map(|_| ())
        .map_err(|e| field_error(path, &e, Some(range)))
}

fn renamed(range: ValidRange, quantity: &'static str) -> ValidRange {
    ValidRange { quantity, ..range }
}

/// The scalar fields of the leaf case with their document paths and valid ranges (the engine's
/// constants, so the check and [`leafwind_physics::LeafCase::validate`] agree).
fn case_fields(doc: &ScenarioDocument) -> Vec<(&'static str, f64, ValidRange)> {
    let c = &doc.case;
    let mut v = vec![
        ("case.air.temp_c", c.air.temp_c, AIR_TEMP_RANGE_C),
        (
            "case.air.pressure_kpa",
            c.air.pressure_kpa,
            PRESSURE_RANGE_KPA,
        ),
        ("case.air.speed_m_s", c.air.speed_m_s, AIR_SPEED_RANGE_M_S),
        (
            "case.air.turbulence_factor",
            c.air.turbulence_factor,
            TURBULENCE_FACTOR_RANGE,
        ),
        (
            "case.leaf.dimension_m",
            c.leaf.dimension_m,
            LEAF_DIMENSION_RANGE_M,
        ),
        (
            "case.leaf.absorptivity",
            c.leaf.absorptivity,
            ABSORPTIVITY_RANGE,
        ),
        ("case.leaf.emissivity", c.leaf.emissivity, EMISSIVITY_RANGE),
        (
            "case.leaf.stomatal_conductance_mol_m2_s",
            c.leaf.stomatal_conductance_mol_m2_s,
            STOMATAL_CONDUCTANCE_RANGE_MOL_M2_S,
        ),
        (
            "case.leaf.lower_share",
            c.leaf.lower_share,
            LOWER_SHARE_RANGE,
        ),
        (
            "case.leaf.cuticular_conductance_mol_m2_s",
            c.leaf.cuticular_conductance_mol_m2_s,
            CUTICULAR_CONDUCTANCE_RANGE_MOL_M2_S,
        ),
        (
            "case.surroundings.shortwave_w_m2",
            c.surroundings.shortwave_w_m2,
            SHORTWAVE_RANGE_W_M2,
        ),
        (
            "case.surroundings.ground_albedo",
            c.surroundings.ground_albedo,
            ALBEDO_RANGE,
        ),
        (
            "case.critical_reynolds",
            c.critical_reynolds,
            CRITICAL_REYNOLDS_RANGE,
        ),
    ];
    if let Some(l) = c.leaf.free_convection_length_m {
        v.push((
            "case.leaf.free_convection_length_m",
            l,
            FREE_CONVECTION_LENGTH_RANGE_M,
        ));
    }
    match c.surroundings.upper_view {
        UpperView::ClearSky => {}
        UpperView::SkyTempC(t) => v.push((
            "case.surroundings.upper_view",
            t,
            renamed(SURFACE_TEMP_RANGE_C, "sky temperature"),
        )),
        UpperView::CoverTempC(t) => v.push((
            "case.surroundings.upper_view",
            t,
            renamed(SURFACE_TEMP_RANGE_C, "cover temperature"),
        )),
    }
    if let Some(t) = c.surroundings.ground_temp_c {
        v.push((
            "case.surroundings.ground_temp_c",
            t,
            renamed(SURFACE_TEMP_RANGE_C, "ground temperature"),
        ));
    }
    v.push(("heat_limit_c", doc.heat_limit_c, LIMIT_RANGE_C));
    v.push(("margin_k", doc.margin_k, MARGIN_RANGE_K));
    if let Some(z) = doc.altitude_m {
        v.push(("altitude_m", z, ALTITUDE_RANGE_M));
    }
    v.push((
        "sweep.max_speed_m_s",
        doc.sweep.max_speed_m_s,
        SWEEP_MAX_RANGE_M_S,
    ));
    v.push((
        "map.speed_min_m_s",
        doc.map.speed_min_m_s,
        AIR_SPEED_RANGE_M_S,
    ));
    v.push((
        "map.speed_max_m_s",
        doc.map.speed_max_m_s,
        AIR_SPEED_RANGE_M_S,
    ));
    v.push(("map.size_min_m", doc.map.size_min_m, LEAF_DIMENSION_RANGE_M));
    v.push(("map.size_max_m", doc.map.size_max_m, LEAF_DIMENSION_RANGE_M));
    v
}

/// Checks every value of a loaded document against its valid range: first each scalar field of
/// the leaf case and of the document with its own range (so the error names the exact field),
/// then the engine's own checks ([`leafwind_physics::LeafCase::validate`], the map axes, the
/// canopy and fan sections' `validate`) for what a single range cannot express, such as a
/// humidity that contradicts the air temperature.
///
/// # Errors
/// The first invalid value, with its document path, the value and the valid range.
pub fn validate_document(doc: &ScenarioDocument) -> Result<(), FieldError> {
    let fields = case_fields(doc);
    for (path, value, range) in &fields {
        check(path, *value, range)?;
    }
    for (i, &d) in doc.extra_sizes_m.iter().enumerate() {
        check(&format!("extra_sizes_m[{i}]"), d, &LEAF_DIMENSION_RANGE_M)?;
    }
    if doc.extra_sizes_m.len() > MAX_EXTRA_SIZES {
        return Err(FieldError {
            path: "extra_sizes_m".to_owned(),
            message: format!(
                "{} extra leaf sizes; at most {MAX_EXTRA_SIZES} are allowed",
                doc.extra_sizes_m.len()
            ),
        });
    }
    // What the ranges above cannot say (humidity against air temperature, axis order…): the
    // engine's checks, with the path of the field whose quantity the engine names.
    let path_of = |e: &PhysicsError, fallback: &str| -> String {
        let q = match e {
            PhysicsError::OutOfRange { quantity, .. }
            | PhysicsError::NotFinite { quantity, .. } => Some(*quantity),
            _ => None,
        };
        match q {
            Some("dew point" | "vapour-pressure deficit" | "relative humidity") => {
                "case.air.humidity".to_owned()
            }
            Some(q) => fields
                .iter()
                .find(|(p, _, r)| r.quantity == q && p.starts_with(fallback))
                .map_or_else(|| fallback.to_owned(), |(p, _, _)| (*p).to_owned()),
            None => fallback.to_owned(),
        }
    };
    doc.case
        .validate()
        .map_err(|e| field_error(&path_of(&e, "case"), &e, None))?;
    doc.map
        .axes()
        .validate()
        .map_err(|e| field_error(&path_of(&e, "map"), &e, None))?;
    if let Some(c) = &doc.canopy {
        c.structure
            .validate()
            .map_err(|e| field_error("canopy.structure", &e, None))?;
        c.site
            .validate()
            .map_err(|e| field_error("canopy.site", &e, None))?;
        c.when
            .validate()
            .map_err(|e| field_error("canopy.when", &e, None))?;
        check(
            "canopy.max_search_speed_m_s",
            c.max_search_speed_m_s,
            &renamed(AIR_SPEED_RANGE_M_S, "canopy-top air speed search maximum"),
        )?;
        if let Some(g) = &c.greenhouse {
            validate_greenhouse(g)?;
        }
        for (i, r) in c.heat_rules.iter().enumerate() {
            r.validate()
                .map_err(|e| field_error(&format!("canopy.heat_rules[{i}]"), &e, None))?;
        }
    }
    if let Some(f) = &doc.fans {
        f.layout
            .validate()
            .map_err(|e| field_error("fans.layout", &e, None))?;
        if let Some(u) = f.target_canopy_speed_m_s {
            check(
                "fans.target_canopy_speed_m_s",
                u,
                &renamed(AIR_SPEED_RANGE_M_S, "target canopy air speed"),
            )?;
        }
    }
    non_finite_anywhere(doc)
}

/// The greenhouse fields, each against its range with its document path.
fn validate_greenhouse(g: &GreenhouseSection) -> Result<(), FieldError> {
    const AT: &str = "canopy.greenhouse";
    check(
        &format!("{AT}.cover.transmittance"),
        g.cover.transmittance,
        &TRANSMITTANCE_RANGE,
    )?;
    check(
        &format!("{AT}.cover.heat_loss_w_m2_k"),
        g.cover.heat_loss_w_m2_k,
        &HEAT_LOSS_RANGE_W_M2_K,
    )?;
    if let CoverTemperature::GivenC(t) = g.cover.temperature {
        check(
            &format!("{AT}.cover.temperature"),
            t,
            &renamed(SURFACE_TEMP_RANGE_C, "cover temperature"),
        )?;
    }
    check(
        &format!("{AT}.shade_fraction"),
        g.shade_fraction,
        &SHADE_FRACTION_RANGE,
    )?;
    check(
        &format!("{AT}.outside_air_temp_c"),
        g.outside_air_temp_c,
        &renamed(AIR_TEMP_RANGE_C, "outside air temperature"),
    )?;
    g.outside_humidity
        .vapour_pressure_kpa(g.outside_air_temp_c)
        .map_err(|e| field_error(&format!("{AT}.outside_humidity"), &e, None))?;
    if let InsideMode::Ventilated { rate_m3_m2_s } = g.inside {
        check(
            &format!("{AT}.inside.rate_m3_m2_s"),
            rate_m3_m2_s,
            &VENTILATION_RANGE_M3_M2_S,
        )?;
    }
    check(
        &format!("{AT}.design_rise_k"),
        g.design_rise_k,
        &RISE_RANGE_K,
    )
}

/// A backstop for the sections the checks above do not list field by field: any NaN or infinite
/// number anywhere in the document is an error naming where it is. The document is written as
/// RON and read back as a generic value tree, whose map keys are the field names.
fn non_finite_anywhere(doc: &ScenarioDocument) -> Result<(), FieldError> {
    fn walk(v: &ron::Value, path: &mut String) -> Result<(), FieldError> {
        match v {
            ron::Value::Number(n) => {
                let x = n.into_f64();
                if x.is_finite() {
                    Ok(())
                } else {
                    Err(FieldError {
                        path: path.clone(),
                        message: format!("{x} is not a finite number"),
                    })
                }
            }
            ron::Value::Option(Some(inner)) => walk(inner, path),
            ron::Value::Seq(items) => {
                for (i, item) in items.iter().enumerate() {
                    let len = path.len();
                    path.push_str(&format!("[{i}]"));
                    walk(item, path)?;
                    path.truncate(len);
                }
                Ok(())
            }
            ron::Value::Map(m) => {
                for (k, item) in m.iter() {
                    let len = path.len();
                    if let ron::Value::String(s) = k {
                        if !path.is_empty() {
                            path.push('.');
                        }
                        path.push_str(s);
                    }
                    walk(item, path)?;
                    path.truncate(len);
                }
                Ok(())
            }
            _ => Ok(()),
        }
    }
    let Ok(text) = ron::to_string(doc) else {
        return Ok(());
    };
    let Ok(value) = ron::from_str::<ron::Value>(&text) else {
        return Ok(());
    };
    walk(&value, &mut String::new())
}

/// The text without a leading UTF-8 byte-order mark (some Windows editors write one).
#[must_use]
pub fn strip_bom(text: &str) -> &str {
    text.strip_prefix('\u{feff}').unwrap_or(text)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn atomic_write_replaces_and_leaves_no_temporary_file() {
        let dir = std::env::temp_dir().join(format!("leafwind-atomic-{}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap();
        let p = dir.join("a.ron");
        write_atomic(&p, b"one").unwrap();
        write_atomic(&p, b"two").unwrap();
        assert_eq!(std::fs::read(&p).unwrap(), b"two");
        let names: Vec<_> = std::fs::read_dir(&dir).unwrap().flatten().collect();
        assert_eq!(names.len(), 1, "{names:?}");
        std::fs::remove_dir_all(dir).ok();
    }

    #[test]
    fn atomic_write_into_a_missing_folder_fails_and_names_the_path() {
        let p = std::env::temp_dir().join("leafwind-no-such-folder-xyz/a.ron");
        let e = write_atomic(&p, b"x").unwrap_err();
        assert!(format!("{e:#}").contains("a.ron"), "{e:#}");
    }

    #[test]
    fn the_default_document_is_valid_and_a_bad_speed_names_its_path() {
        let mut d = ScenarioDocument::default();
        validate_document(&d).unwrap();
        d.case.air.speed_m_s = 45.0;
        let e = validate_document(&d).unwrap_err();
        assert_eq!(e.path, "case.air.speed_m_s");
        assert!(
            e.message.contains("45") && e.message.contains("0 to 30"),
            "{e:?}"
        );
        d.case.air.speed_m_s = f64::NAN;
        let e = validate_document(&d).unwrap_err();
        assert_eq!(e.path, "case.air.speed_m_s");
        assert!(e.message.contains("0 to 30"), "{e:?}");
    }
}

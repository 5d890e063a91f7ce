//! The scenario document: what the user saves and opens (RON).
//!
//! Only inputs live here, never results. The file carries a `version`; later sections (canopy,
//! greenhouse, design day) will be added as `#[serde(default)] Option<…>` fields so that older files
//! still load. Unknown fields are refused at every depth (a misspelt field name is an error with
//! its line and column, not silently dropped); older format versions are migrated step by step
//! ([`MIGRATIONS`]); every value is range-checked on load with the document path of its field
//! ([`crate::file_safety::validate_document`]); saves are atomic.

use std::fmt;
use std::path::Path;

use leafwind_physics::air::{
    ALTITUDE_RANGE_M, dew_point_c, pressure_from_altitude_kpa, rh_from_vapour_pressure_pct,
    vapour_pressure_deficit_kpa,
};
use leafwind_physics::case::LEAF_DIMENSION_RANGE_M;
use leafwind_physics::grid::{Axis, GridAxes};
use leafwind_physics::required_wind::{LIMIT_RANGE_C, MARGIN_RANGE_K};
use leafwind_physics::{Humidity, LeafCase};
use serde::{Deserialize, Serialize};

/// The file format version this build writes and the newest it reads.
pub const DOCUMENT_VERSION: u32 = 1;

/// Largest scenario file read \[bytes\] (shipped scenarios are under 10 kB).
pub const MAX_FILE_BYTES: u64 = 16 * 1024 * 1024;

/// Most extra leaf sizes in a sweep.
pub const MAX_EXTRA_SIZES: usize = 6;

/// What the wind × size map colours.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
pub enum MapQuantity {
    /// The leaf temperature.
    #[default]
    LeafTemperature,
    /// Limit minus leaf temperature (positive = below the limit).
    MarginToLimit,
}

/// Settings of the wind × size map.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MapSettings {
    /// What is coloured.
    #[serde(default)]
    pub quantity: MapQuantity,
    /// Air speed axis \[m s⁻¹\], log-spaced.
    pub speed_min_m_s: f64,
    /// Upper end of the air speed axis \[m s⁻¹\].
    pub speed_max_m_s: f64,
    /// Leaf size axis \[m\], log-spaced.
    pub size_min_m: f64,
    /// Upper end of the leaf size axis \[m\].
    pub size_max_m: f64,
}

impl Default for MapSettings {
    fn default() -> Self {
        let a = GridAxes::default_map();
        Self {
            quantity: MapQuantity::LeafTemperature,
            speed_min_m_s: a.speed_m_s.min,
            speed_max_m_s: a.speed_m_s.max,
            size_min_m: a.dimension_m.min,
            size_max_m: a.dimension_m.max,
        }
    }
}

impl MapSettings {
    /// The grid axes: 256 × 256, both logarithmic.
    #[must_use]
    pub fn axes(&self) -> GridAxes {
        let d = GridAxes::default_map();
        GridAxes {
            speed_m_s: Axis {
                min: self.speed_min_m_s,
                max: self.speed_max_m_s,
                ..d.speed_m_s
            },
            dimension_m: Axis {
                min: self.size_min_m,
                max: self.size_max_m,
                ..d.dimension_m
            },
        }
    }
}

/// Settings of the sweep over air speed.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SweepSettings {
    /// Highest air speed of the sweep \[m s⁻¹\].
    pub max_speed_m_s: f64,
}

impl Default for SweepSettings {
    fn default() -> Self {
        Self { max_speed_m_s: 3.0 }
    }
}

/// Valid sweep maxima \[m s⁻¹\].
pub const SWEEP_MAX_RANGE_M_S: leafwind_physics::error::ValidRange =
    leafwind_physics::error::ValidRange {
        quantity: "sweep maximum air speed",
        min: 0.2,
        max: 30.0,
        unit: "m/s",
    };

/// Default leaf temperature limit \[°C\]: 35 °C, a round figure near which heat stress of many
/// warm-season crops begins (common practice, no source — set your crop's own value).
pub const HEAT_LIMIT_DEFAULT_C: f64 = 35.0;

/// Default margin below the limit \[K\]: 2 K (common practice, no source).
pub const MARGIN_DEFAULT_K: f64 = 2.0;

/// A saved scenario.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ScenarioDocument {
    /// File format version ([`DOCUMENT_VERSION`]); a file without one is version 0 and is
    /// migrated on load (see [`MIGRATIONS`]).
    #[serde(default)]
    pub version: u32,
    /// Short title shown in the title bar.
    pub title: String,
    /// Free notes: the situation, the assumptions.
    #[serde(default)]
    pub notes: String,
    /// The leaf case (all inputs of the energy balance, SI).
    pub case: LeafCase,
    /// Site altitude \[m\] when the pressure is set from it; `None` when the pressure is typed.
    #[serde(default)]
    pub altitude_m: Option<f64>,
    /// Leaf temperature limit of the crop \[°C\].
    pub heat_limit_c: f64,
    /// Margin kept below the limit \[K\].
    pub margin_k: f64,
    /// Further leaf sizes for the sweep \[m\].
    #[serde(default)]
    pub extra_sizes_m: Vec<f64>,
    /// The sweep over air speed.
    #[serde(default)]
    pub sweep: SweepSettings,
    /// The wind × size map.
    #[serde(default)]
    pub map: MapSettings,
    /// The canopy (and greenhouse, design day, weather) section, if any.
    #[serde(default)]
    pub canopy: Option<crate::canopy_scenario::CanopySection>,
    /// The circulation-fan section, if any.
    #[serde(default)]
    pub fans: Option<crate::fans_scenario::FansSection>,
    /// The leaf shape the leaf size was taken from, if any.
    #[serde(default)]
    pub shape: Option<crate::shape_scenario::ShapeSection>,
}

impl Default for ScenarioDocument {
    fn default() -> Self {
        Self {
            version: DOCUMENT_VERSION,
            title: "Untitled scenario".to_owned(),
            notes: String::new(),
            case: LeafCase::default(),
            altitude_m: None,
            heat_limit_c: HEAT_LIMIT_DEFAULT_C,
            margin_k: MARGIN_DEFAULT_K,
            extra_sizes_m: vec![0.01, 0.15],
            sweep: SweepSettings::default(),
            map: MapSettings::default(),
            canopy: None,
            fans: None,
            shape: None,
        }
    }
}

/// Why a scenario file could not be read.
#[derive(Debug, Clone, PartialEq)]
pub enum LoadError {
    /// The text is not a valid scenario; line and column are 1-based.
    Parse {
        /// Line of the error.
        line: usize,
        /// Column of the error.
        col: usize,
        /// What is wrong.
        message: String,
    },
    /// A file from a newer Leafwind.
    Version(u32),
    /// A value out of its valid range (or not a finite number).
    Invalid {
        /// Document path of the field, e.g. `case.air.speed_m_s`.
        path: String,
        /// The quantity, the value and the valid range.
        message: String,
    },
    /// The file could not be read.
    Io(String),
}

impl fmt::Display for LoadError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            LoadError::Parse { line, col, message } => {
                write!(f, "line {line}, column {col}: {message}")
            }
            LoadError::Version(v) => write!(
                f,
                "the file is format version {v}; this Leafwind reads up to version {DOCUMENT_VERSION}"
            ),
            LoadError::Io(e) => write!(f, "{e}"),
            LoadError::Invalid { path, message } => write!(f, "{path}: {message}"),
        }
    }
}

impl std::error::Error for LoadError {}

impl ScenarioDocument {
    /// Parses a scenario from RON text, migrates an older format version and range-checks every
    /// value.
    ///
    /// # Errors
    /// [`LoadError::Parse`] with line and column (a misspelt or unknown field is named, at every
    /// depth), [`LoadError::Version`], or [`LoadError::Invalid`] naming the field, its value and
    /// the valid range.
    pub fn from_ron(text: &str) -> Result<Self, LoadError> {
        Self::from_ron_migrated(text).map(|(d, _)| d)
    }

    /// As [`ScenarioDocument::from_ron`], also returning the version it was migrated from
    /// (`None` when the file was already current).
    ///
    /// # Errors
    /// As [`ScenarioDocument::from_ron`].
    pub fn from_ron_migrated(text: &str) -> Result<(Self, Option<u32>), LoadError> {
        let (doc, from) = Self::parse_unchecked(text)?;
        crate::file_safety::validate_document(&doc).map_err(|e| LoadError::Invalid {
            path: e.path,
            message: e.message,
        })?;
        Ok((doc, from))
    }

    /// Parses and migrates without the range check (the autosave of work in progress, which may
    /// hold a value being typed; the window shows such values as invalid inputs).
    ///
    /// # Errors
    /// [`LoadError::Parse`] or [`LoadError::Version`].
    pub fn parse_unchecked(text: &str) -> Result<(Self, Option<u32>), LoadError> {
        let text = crate::file_safety::strip_bom(text);
        let mut doc: Self = ron::from_str(text).map_err(|e| LoadError::Parse {
            line: e.span.start.line,
            col: e.span.start.col,
            message: e.code.to_string(),
        })?;
        if doc.version > DOCUMENT_VERSION {
            return Err(LoadError::Version(doc.version));
        }
        let from = migrate(&mut doc);
        Ok((doc, from))
    }

    /// Reads a scenario file.
    ///
    /// # Errors
    /// As [`ScenarioDocument::from_ron`], or the read error.
    pub fn load(path: &Path) -> Result<Self, LoadError> {
        Self::load_stamped(path).map(|l| l.doc)
    }

    /// Reads a scenario file, with the stamp of what was on disk (to notice later changes by
    /// another program) and the version it was migrated from.
    ///
    /// # Errors
    /// As [`ScenarioDocument::from_ron`], or the read error.
    pub fn load_stamped(path: &Path) -> Result<Loaded, LoadError> {
        // A scenario is a few kilobytes: anything far larger is not one (and is not read whole).
        if let Ok(m) = std::fs::metadata(path)
            && m.len() > MAX_FILE_BYTES
        {
            return Err(LoadError::Io(format!(
                "{} is {} bytes, larger than any scenario (at most {MAX_FILE_BYTES})",
                path.display(),
                m.len()
            )));
        }
        let bytes = std::fs::read(path)
            .map_err(|e| LoadError::Io(format!("could not read {}: {e}", path.display())))?;
        let stamp = crate::file_safety::FileStamp::of(path, &bytes);
        let text = String::from_utf8(bytes).map_err(|e| {
            LoadError::Io(format!(
                "{} is not UTF-8 text (invalid byte at offset {})",
                path.display(),
                e.utf8_error().valid_up_to()
            ))
        })?;
        let (doc, migrated_from) = Self::from_ron_migrated(&text)?;
        Ok(Loaded {
            doc,
            stamp,
            migrated_from,
        })
    }

    /// The scenario as pretty RON text.
    ///
    /// # Errors
    /// Serialisation failure (not expected).
    pub fn to_ron(&self) -> anyhow::Result<String> {
        let cfg = ron::ser::PrettyConfig::new()
            .struct_names(true)
            .depth_limit(4);
        Ok(ron::ser::to_string_pretty(self, cfg)?)
    }

    /// Writes the scenario to `path` atomically (a temporary file beside it, synced, then
    /// renamed over it: a crash or a full disk leaves the old file whole).
    ///
    /// # Errors
    /// Write failure, with the path.
    pub fn save(&self, path: &Path) -> anyhow::Result<()> {
        self.save_stamped(path).map(|_| ())
    }

    /// As [`ScenarioDocument::save`], returning the stamp of what is now on disk.
    ///
    /// # Errors
    /// Write failure, with the path.
    pub fn save_stamped(&self, path: &Path) -> anyhow::Result<crate::file_safety::FileStamp> {
        let text = self.to_ron()?;
        crate::file_safety::write_atomic(path, text.as_bytes())?;
        Ok(crate::file_safety::FileStamp::of(path, text.as_bytes()))
    }

    /// Every leaf size of the sweep: the current one first, then the extra ones \[m\] (valid only).
    #[must_use]
    pub fn sweep_sizes_m(&self) -> Vec<f64> {
        let mut v = vec![self.case.leaf.dimension_m];
        for &d in &self.extra_sizes_m {
            if LEAF_DIMENSION_RANGE_M.contains(d) && !v.iter().any(|&x| (x - d).abs() < 1e-9) {
                v.push(d);
            }
        }
        v
    }

    /// Checks the inputs that are not part of the leaf case (limit, margin, altitude, sweep).
    ///
    /// # Errors
    /// The first invalid one, as the engine phrases it.
    pub fn validate_extras(&self) -> leafwind_physics::Result<()> {
        LIMIT_RANGE_C.check(self.heat_limit_c)?;
        MARGIN_RANGE_K.check(self.margin_k)?;
        if let Some(z) = self.altitude_m {
            ALTITUDE_RANGE_M.check(z)?;
        }
        SWEEP_MAX_RANGE_M_S.check(self.sweep.max_speed_m_s)?;
        self.map.axes().validate()?;
        Ok(())
    }

    /// Sets the pressure from the altitude, when the altitude is given and valid.
    pub fn apply_altitude(&mut self) {
        if let Some(z) = self.altitude_m
            && let Ok(p) = pressure_from_altitude_kpa(z)
        {
            self.case.air.pressure_kpa = p;
        }
    }

    /// Switches the humidity to another form, keeping the same vapour pressure when it is valid.
    pub fn convert_humidity(&mut self, to: HumidityKind) {
        let t = self.case.air.temp_c;
        let h = self.case.air.humidity;
        if HumidityKind::of(h) == to {
            return;
        }
        let e = h.vapour_pressure_kpa(t).ok();
        self.case.air.humidity = match (to, e) {
            (HumidityKind::Relative, Some(e)) => {
                Humidity::RelativePct((rh_from_vapour_pressure_pct(t, e) * 10.0).round() / 10.0)
            }
            (HumidityKind::DewPoint, Some(e)) => {
                Humidity::DewPointC(dew_point_c(e).map_or(t - 10.0, |d| (d * 10.0).round() / 10.0))
            }
            (HumidityKind::Deficit, Some(e)) => {
                Humidity::DeficitKpa((vapour_pressure_deficit_kpa(t, e) * 100.0).round() / 100.0)
            }
            (HumidityKind::Relative, None) => Humidity::RelativePct(60.0),
            (HumidityKind::DewPoint, None) => Humidity::DewPointC(t - 10.0),
            (HumidityKind::Deficit, None) => Humidity::DeficitKpa(1.0),
        };
    }
}

/// A scenario read from a file.
#[derive(Debug, Clone, PartialEq)]
pub struct Loaded {
    /// The document (migrated and range-checked).
    pub doc: ScenarioDocument,
    /// What was on disk when it was read.
    pub stamp: crate::file_safety::FileStamp,
    /// The format version it was migrated from, if it was older.
    pub migrated_from: Option<u32>,
}

/// One step of the format migration: it turns a document of version `from` into version
/// `from + 1`.
#[derive(Debug, Clone, Copy)]
pub struct Migration {
    /// The version it starts from.
    pub from: u32,
    /// What changed, for the developers' record.
    pub change: &'static str,
    /// The step.
    pub apply: fn(&mut ScenarioDocument),
}

/// The migration steps, oldest first; each takes `from` to `from + 1`, and together they reach
/// [`DOCUMENT_VERSION`].
///
/// Version 0 is a file without a `version` field (the pre-release drafts of the format); its
/// fields are those of version 1, so the step only sets the number. A later change that renames
/// or restructures a field adds its step here, with the old field kept as
/// `#[serde(default, skip_serializing)]` on the document until the step has moved it.
pub const MIGRATIONS: [Migration; 1] = [Migration {
    from: 0,
    change: "the format version is recorded in the file",
    apply: |_| {},
}];

/// Brings `doc` to [`DOCUMENT_VERSION`], step by step; returns the version it started from when
/// it was older.
pub fn migrate(doc: &mut ScenarioDocument) -> Option<u32> {
    let start = doc.version;
    if start >= DOCUMENT_VERSION {
        return None;
    }
    while doc.version < DOCUMENT_VERSION {
        // No step (cannot happen with a complete table): the fields are taken as they are.
        if let Some(m) = MIGRATIONS.iter().find(|m| m.from == doc.version) {
            (m.apply)(doc);
        }
        doc.version += 1;
    }
    Some(start)
}

/// The three ways of giving humidity.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum HumidityKind {
    /// Relative humidity.
    Relative,
    /// Dew point.
    DewPoint,
    /// Vapour-pressure deficit.
    Deficit,
}

impl HumidityKind {
    /// The kind of a humidity value.
    #[must_use]
    pub fn of(h: Humidity) -> Self {
        match h {
            Humidity::RelativePct(_) => Self::Relative,
            Humidity::DewPointC(_) => Self::DewPoint,
            Humidity::DeficitKpa(_) => Self::Deficit,
        }
    }

    /// Menu text.
    #[must_use]
    pub fn label(self) -> &'static str {
        match self {
            Self::Relative => "Relative humidity",
            Self::DewPoint => "Dew point",
            Self::Deficit => "Vapour-pressure deficit",
        }
    }
}

/// The example scenarios shipped with the app (file name, RON text), embedded at build time.
pub const EXAMPLES: [(&str, &str); 4] = [
    (
        "glasshouse_still_afternoon.ron",
        include_str!("../../../scenarios/glasshouse_still_afternoon.ron"),
    ),
    (
        "shade_house.ron",
        include_str!("../../../scenarios/shade_house.ron"),
    ),
    (
        "open_field_hot_wind.ron",
        include_str!("../../../scenarios/open_field_hot_wind.ron"),
    ),
    (
        "nursery_seedlings.ron",
        include_str!("../../../scenarios/nursery_seedlings.ron"),
    ),
];

/// The first example, opened on first start (the default document if it fails to parse).
#[must_use]
pub fn first_example() -> ScenarioDocument {
    ScenarioDocument::from_ron(EXAMPLES[0].1).unwrap_or_default()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn round_trip_through_ron() {
        let d = ScenarioDocument::default();
        let text = d.to_ron().unwrap();
        assert_eq!(ScenarioDocument::from_ron(&text).unwrap(), d);
    }

    #[test]
    fn unknown_field_gives_line_and_column() {
        let d = ScenarioDocument::default();
        let text = d.to_ron().unwrap().replace("margin_k:", "margin_kelvin:");
        match ScenarioDocument::from_ron(&text) {
            Err(LoadError::Parse { line, col, .. }) => assert!(line > 1 && col >= 1),
            other => panic!("expected a parse error, got {other:?}"),
        }
    }

    #[test]
    fn optional_sections_may_be_left_out() {
        // Only the required fields: notes, altitude, extra sizes, sweep and map take defaults,
        // as future sections will.
        let mut full = ScenarioDocument::default();
        full.notes.clear();
        let case = ron::ser::to_string(&full.case).unwrap();
        let text = format!(
            "(version: 1, title: \"{}\", case: {case}, heat_limit_c: {}, margin_k: {})",
            full.title, full.heat_limit_c, full.margin_k
        );
        let d = ScenarioDocument::from_ron(&text).unwrap();
        assert_eq!(d.notes, "");
        assert_eq!(d.altitude_m, None);
        assert!(d.extra_sizes_m.is_empty());
        assert_eq!(d.sweep, SweepSettings::default());
        assert_eq!(d.map, MapSettings::default());
    }

    #[test]
    fn garbage_is_an_error_not_a_panic() {
        for text in [
            "",
            "(",
            "ScenarioDocument(version: \"one\")",
            "\u{0}\u{1}",
            "[1, 2, 3]",
        ] {
            assert!(ScenarioDocument::from_ron(text).is_err(), "{text:?}");
        }
    }

    #[test]
    fn newer_version_is_refused() {
        let d = ScenarioDocument {
            version: DOCUMENT_VERSION + 1,
            ..Default::default()
        };
        assert_eq!(
            ScenarioDocument::from_ron(&d.to_ron().unwrap()),
            Err(LoadError::Version(DOCUMENT_VERSION + 1))
        );
    }

    #[test]
    fn humidity_conversion_keeps_vapour_pressure() {
        let mut d = ScenarioDocument::default();
        let t = d.case.air.temp_c;
        let e0 = d.case.air.humidity.vapour_pressure_kpa(t).unwrap();
        for k in [
            HumidityKind::DewPoint,
            HumidityKind::Deficit,
            HumidityKind::Relative,
        ] {
            d.convert_humidity(k);
            let e = d.case.air.humidity.vapour_pressure_kpa(t).unwrap();
            // Rounded to 0.1 °C / 0.01 kPa / 0.1 %: within 1 % of e.
            assert!((e / e0 - 1.0).abs() < 0.01, "{k:?}");
        }
    }
}

//! Heat limits of crops: a temperature above which a growth stage suffers, whether it is an air or
//! a tissue (leaf, flower, panicle) temperature, and where each value comes from.
//!
//! The table [`CROP_HEAT_LIMITS`] is mirrored in `assets/crops.ron` (same crops, stages, values and
//! sources; a check that the two agree belongs with whoever loads the asset). A user-defined limit is
//! simply another [`HeatLimit`].
//!
//! **Caution.** These are indicative thresholds for planning, not guarantees: damage depends on
//! duration, humidity, cultivar, hardening and water status; the values marked "from memory" were
//! not checked against the cited text by the engine's authors. Take advice from local extension
//! services and agronomists before acting on them, especially where crop losses are at stake.

use std::borrow::Cow;

use crate::error::{PhysicsError, Result};
use crate::required_wind::LIMIT_RANGE_C;

/// Which temperature a limit applies to.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub enum LimitKind {
    /// The air around the crop (most agronomic thresholds are stated for air).
    Air,
    /// The plant tissue itself (leaf, flower or panicle temperature).
    Tissue,
}

impl LimitKind {
    /// Lower-case word for sentences.
    #[must_use]
    pub fn word(&self) -> &'static str {
        match self {
            LimitKind::Air => "air",
            LimitKind::Tissue => "tissue",
        }
    }
}

/// One heat limit with its source.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct HeatLimit {
    /// Crop name, lower case (e.g. "tomato").
    pub crop: Cow<'static, str>,
    /// Growth stage (e.g. "flowering and fruit set").
    pub stage: Cow<'static, str>,
    /// The limit \[°C\].
    pub limit_c: f64,
    /// Whether the limit is an air or a tissue temperature.
    pub kind: LimitKind,
    /// Where the value comes from; says "from memory" where it was not checked against the text.
    pub source: Cow<'static, str>,
}

impl HeatLimit {
    /// A user-defined limit.
    #[must_use]
    pub fn user(crop: &str, stage: &str, limit_c: f64, kind: LimitKind) -> Self {
        Self {
            crop: Cow::Owned(crop.to_owned()),
            stage: Cow::Owned(stage.to_owned()),
            limit_c,
            kind,
            source: Cow::Borrowed("user-defined"),
        }
    }

    /// Checks the limit against [`LIMIT_RANGE_C`].
    ///
    /// # Errors
    /// A limit out of range or not finite.
    pub fn validate(&self) -> Result<()> {
        LIMIT_RANGE_C.check(self.limit_c).map(|_| ())
    }

    /// Limit minus the temperature compared with it \[K\]; positive is below the limit.
    #[must_use]
    pub fn margin_k(&self, temp_c: f64) -> f64 {
        self.limit_c - temp_c
    }
}

const fn entry(
    crop: &'static str,
    stage: &'static str,
    limit_c: f64,
    kind: LimitKind,
    source: &'static str,
) -> HeatLimit {
    HeatLimit {
        crop: Cow::Borrowed(crop),
        stage: Cow::Borrowed(stage),
        limit_c,
        kind,
        source: Cow::Borrowed(source),
    }
}

/// The built-in heat limits. Mirrored in `assets/crops.ron`.
pub static CROP_HEAT_LIMITS: [HeatLimit; 12] = [
    entry(
        "tomato",
        "flowering and fruit set",
        32.0,
        LimitKind::Air,
        "Sato, S., Peet, M. M., Thomas, J. F. (2000). Physiological factors limit fruit set of tomato \
         under chronic, mild heat stress. Plant, Cell & Environment 23, 719-726 (day air above about \
         32 °C cuts fruit set; from memory)",
    ),
    entry(
        "tomato",
        "vegetative (leaf)",
        45.0,
        LimitKind::Tissue,
        "Schreiber, U., Berry, J. A. (1977). Heat-induced changes of chlorophyll fluorescence in intact \
         leaves correlated with damage of the photosynthetic apparatus. Planta 136, 233-238 (leaf \
         photosystem II damage near 45 °C in C3 crops; from memory)",
    ),
    entry(
        "pepper",
        "flowering and fruit set",
        33.0,
        LimitKind::Air,
        "Erickson, A. N., Markhart, A. H. (2002). Flower developmental stage and organ sensitivity of \
         bell pepper (Capsicum annuum L.) to elevated temperature. Plant, Cell & Environment 25, \
         123-130 (fruit set falls at 33 °C; from memory)",
    ),
    entry(
        "cucumber",
        "vegetative and fruiting",
        35.0,
        LimitKind::Air,
        "common practice, no source (greenhouse growers keep day air below about 35 °C)",
    ),
    entry(
        "lettuce",
        "head formation",
        30.0,
        LimitKind::Air,
        "common practice, no source (tipburn and bolting rise above about 30 °C day air)",
    ),
    entry(
        "strawberry",
        "flowering",
        30.0,
        LimitKind::Air,
        "Ledesma, N., Sugiyama, N. (2005). Pollen quality and performance in strawberry plants exposed \
         to high-temperature stress. Journal of the American Society for Horticultural Science 130, \
         341-347 (pollen viability falls above about 30 °C; from memory)",
    ),
    entry(
        "wheat",
        "anthesis",
        31.0,
        LimitKind::Air,
        "Porter, J. R., Gawith, M. (1999). Temperatures and the growth and development of wheat: a \
         review. European Journal of Agronomy 10, 23-36 (maximum at anthesis about 31 °C; from memory)",
    ),
    entry(
        "maize",
        "silking and pollination",
        35.0,
        LimitKind::Air,
        "Schoper, J. B., Lambert, R. J., Vasilas, B. L., Westgate, M. E. (1987). Plant factors \
         controlling seed set in maize. Plant Physiology 83, 121-125 (pollen viability falls with \
         air above about 35 °C; from memory)",
    ),
    entry(
        "rice",
        "anthesis",
        35.0,
        LimitKind::Tissue,
        "Jagadish, S. V. K., Craufurd, P. Q., Wheeler, T. R. (2007). High temperature stress and \
         spikelet fertility in rice (Oryza sativa L.). Journal of Experimental Botany 58, 1627-1635 \
         (spikelet sterility above about 33.7-35 °C panicle temperature at anthesis; from memory)",
    ),
    entry(
        "soybean",
        "flowering and pod set",
        35.0,
        LimitKind::Air,
        "Boote, K. J., Allen, L. H., Prasad, P. V. V., et al. (2005). Elevated temperature and CO2 \
         impacts on pollination, reproductive growth, and yield of several globally important crops. \
         Journal of Agricultural Meteorology 60, 469-474 (pod set declines above about 35 °C day air; \
         from memory)",
    ),
    entry(
        "wheat",
        "any stage (leaf)",
        45.0,
        LimitKind::Tissue,
        "Schreiber, U., Berry, J. A. (1977). Planta 136, 233-238 (photosystem II damage near 45 °C \
         leaf temperature in C3 plants; from memory)",
    ),
    entry(
        "generic C3 crop",
        "leaf",
        45.0,
        LimitKind::Tissue,
        "Schreiber, U., Berry, J. A. (1977). Planta 136, 233-238 (photosystem II damage near 45 °C \
         leaf temperature; from memory)",
    ),
];

/// The built-in limit for `crop` at `stage` (both matched case-insensitively; `stage` may be just the
/// start of the stage's name).
///
/// # Errors
/// [`PhysicsError::Inconsistent`] naming the valid crop and stage pairs when none matches.
pub fn find(crop: &str, stage: &str) -> Result<&'static HeatLimit> {
    let crop_l = crop.trim().to_lowercase();
    let stage_l = stage.trim().to_lowercase();
    CROP_HEAT_LIMITS
        .iter()
        .find(|l| l.crop == crop_l.as_str() && l.stage.starts_with(stage_l.as_str()))
        .ok_or_else(|| {
            let names: Vec<String> = CROP_HEAT_LIMITS
                .iter()
                .map(|l| format!("{} ({})", l.crop, l.stage))
                .collect();
            PhysicsError::Inconsistent(format!(
                "no built-in heat limit for \"{crop}\" at \"{stage}\"; known: {}",
                names.join(", ")
            ))
        })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_entry_is_valid_and_sourced() {
        for l in &CROP_HEAT_LIMITS {
            l.validate().unwrap();
            assert!(!l.source.is_empty());
        }
    }

    #[test]
    fn lookup_and_error_listing() {
        assert_eq!(find("Tomato", "flowering").unwrap().limit_c, 32.0);
        let e = find("banana", "any").unwrap_err().to_string();
        assert!(e.contains("tomato (flowering and fruit set)"));
    }
}

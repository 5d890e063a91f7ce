//! UI preferences: what eframe persists between runs (never the scenario itself).

use std::path::PathBuf;

use serde::{Deserialize, Serialize};

use crate::units::UnitSystem;

/// Key of the preferences in eframe's storage.
pub const PREFS_KEY: &str = "leafwind-prefs-v1";

/// Most files in the recent list.
pub const MAX_RECENT: usize = 8;

/// Which plot the central area shows.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
pub enum PlotTab {
    /// Leaf − air and boundary-layer thickness against air speed.
    #[default]
    Sweep,
    /// Leaf temperature over air speed × leaf size.
    Map,
    /// Velocity profiles, thickness and wall shear along the leaf.
    BoundaryLayer,
    /// The whole crop: canopy profile, sizing answers, design day.
    Canopy,
    /// Circulation fans, their air speed along the house, and the night dew check.
    Fans,
    /// The leaf outline, its effective dimension and how it changes with the wind direction.
    Shape,
    /// Several leaves or scenarios side by side.
    Compare,
}

impl PlotTab {
    /// Tab text.
    #[must_use]
    pub fn label(self) -> &'static str {
        match self {
            Self::Sweep => "Sweep over air speed",
            Self::Map => "Wind × leaf size map",
            Self::BoundaryLayer => "Boundary layer",
            Self::Canopy => "Canopy & day",
            Self::Fans => "Fans & night",
            Self::Shape => "Leaf shape",
            Self::Compare => "Compare",
        }
    }
}

/// Layout choices.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(default)]
pub struct Layout {
    /// The plot tab shown.
    pub tab: PlotTab,
    /// Width of the inputs panel \[points\].
    pub inputs_width: f32,
    /// Width of the result panel \[points\].
    pub result_width: f32,
}

impl Default for Layout {
    fn default() -> Self {
        Self {
            tab: PlotTab::Sweep,
            inputs_width: 370.0,
            result_width: 390.0,
        }
    }
}

/// Everything persisted.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
#[serde(default)]
pub struct UiPrefs {
    /// SI or imperial.
    pub units: UnitSystem,
    /// Recently opened or saved files, newest first.
    pub recent_files: Vec<PathBuf>,
    /// Layout.
    pub layout: Layout,
    /// Whether Leafwind has run before (the first start opens the first example).
    pub started_before: bool,
}

impl UiPrefs {
    /// Puts `path` at the top of the recent list.
    pub fn add_recent(&mut self, path: PathBuf) {
        self.recent_files.retain(|p| p != &path);
        self.recent_files.insert(0, path);
        self.recent_files.truncate(MAX_RECENT);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn recent_list_is_unique_newest_first_and_bounded() {
        let mut p = UiPrefs::default();
        for i in 0..12 {
            p.add_recent(PathBuf::from(format!("/tmp/{i}.ron")));
        }
        p.add_recent(PathBuf::from("/tmp/5.ron"));
        assert_eq!(p.recent_files.len(), MAX_RECENT);
        assert_eq!(p.recent_files[0], PathBuf::from("/tmp/5.ron"));
        assert_eq!(
            p.recent_files
                .iter()
                .filter(|f| f.ends_with("5.ron"))
                .count(),
            1
        );
    }
}

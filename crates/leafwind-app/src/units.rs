//! Display units: SI inside, SI or US customary on screen and in exports.
//!
//! Every number the window shows or exports passes through [`Quantity::to_display`] and every number
//! the user types back through [`Quantity::from_display`]. Absolute temperatures and temperature
//! differences are separate quantities (°C → °F adds 32, K → °F of difference does not).

use serde::{Deserialize, Serialize};

/// The unit system of the window.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
pub enum UnitSystem {
    /// °C, K, m/s, mm, kPa, m.
    #[default]
    Si,
    /// °F, °F of difference, ft/min, inches, inHg, ft.
    Imperial,
}

impl UnitSystem {
    /// The commands' `--imperial` flag as a unit system.
    #[must_use]
    pub fn from_imperial_flag(imperial: bool) -> Self {
        if imperial { Self::Imperial } else { Self::Si }
    }
}

impl UnitSystem {
    /// The other system.
    #[must_use]
    pub fn toggled(self) -> Self {
        match self {
            Self::Si => Self::Imperial,
            Self::Imperial => Self::Si,
        }
    }

    /// Short name for menus.
    #[must_use]
    pub fn name(self) -> &'static str {
        match self {
            Self::Si => "SI (°C, m/s, mm)",
            Self::Imperial => "Imperial (°F, ft/min, in)",
        }
    }
}

/// Feet per metre (exact by definition of the international foot).
const FT_PER_M: f64 = 1.0 / 0.3048;
/// Inches per metre (exact).
const IN_PER_M: f64 = 1.0 / 0.0254;
/// Kilopascals per inch of mercury at 0 °C (3.386 389 kPa; NIST SP 811, appendix B; from memory).
const KPA_PER_INHG: f64 = 3.386_389;

/// A kind of number on screen. The SI unit of each is the one the engine uses for it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Quantity {
    /// Absolute temperature; SI °C.
    Temperature,
    /// Temperature difference; SI K.
    TempDiff,
    /// Air speed; SI m/s (imperial ft/min, the fan trade's unit).
    Speed,
    /// Leaf size; SI m shown as mm (imperial inches).
    LeafSize,
    /// Boundary-layer thickness or height above the leaf; SI m shown as mm (imperial inches).
    Thickness,
    /// Distance along the leaf; SI m shown as mm (imperial inches).
    Position,
    /// Atmospheric pressure; SI kPa (imperial inHg).
    Pressure,
    /// Site altitude; SI m (imperial ft).
    Altitude,
    /// Ventilation rate per floor area; SI m³/s per m² (imperial cfm per ft², the fan trade's).
    VentilationRate,
    /// Quantities shown alike in both systems (W/m², mol/m²/s, kPa of VPD, ratios).
    Same(&'static str),
}

impl Quantity {
    /// The unit label in `units`.
    #[must_use]
    pub fn unit(self, units: UnitSystem) -> &'static str {
        use Quantity::*;
        match (self, units) {
            (Temperature, UnitSystem::Si) => "°C",
            (Temperature, UnitSystem::Imperial) => "°F",
            (TempDiff, UnitSystem::Si) => "K",
            (TempDiff, UnitSystem::Imperial) => "°F",
            (Speed, UnitSystem::Si) => "m/s",
            (Speed, UnitSystem::Imperial) => "ft/min",
            (LeafSize | Thickness | Position, UnitSystem::Si) => "mm",
            (LeafSize | Thickness | Position, UnitSystem::Imperial) => "in",
            (Pressure, UnitSystem::Si) => "kPa",
            (Pressure, UnitSystem::Imperial) => "inHg",
            (Altitude, UnitSystem::Si) => "m",
            (Altitude, UnitSystem::Imperial) => "ft",
            (VentilationRate, UnitSystem::Si) => "m³/s per m²",
            (VentilationRate, UnitSystem::Imperial) => "cfm/ft²",
            (Same(u), _) => u,
        }
    }

    /// SI value → display value.
    #[must_use]
    pub fn to_display(self, si: f64, units: UnitSystem) -> f64 {
        use Quantity::*;
        match (self, units) {
            (LeafSize | Thickness | Position, UnitSystem::Si) => si * 1e3,
            (_, UnitSystem::Si) | (Same(_), _) => si,
            (Temperature, UnitSystem::Imperial) => si * 1.8 + 32.0,
            (TempDiff, UnitSystem::Imperial) => si * 1.8,
            (Speed, UnitSystem::Imperial) => si * FT_PER_M * 60.0,
            (LeafSize | Thickness | Position, UnitSystem::Imperial) => si * IN_PER_M,
            (Pressure, UnitSystem::Imperial) => si / KPA_PER_INHG,
            (Altitude, UnitSystem::Imperial) => si * FT_PER_M,
            (VentilationRate, UnitSystem::Imperial) => si * FT_PER_M * 60.0,
        }
    }

    /// Display value → SI value.
    #[must_use]
    pub fn from_display(self, shown: f64, units: UnitSystem) -> f64 {
        use Quantity::*;
        match (self, units) {
            (LeafSize | Thickness | Position, UnitSystem::Si) => shown * 1e-3,
            (_, UnitSystem::Si) | (Same(_), _) => shown,
            (Temperature, UnitSystem::Imperial) => (shown - 32.0) / 1.8,
            (TempDiff, UnitSystem::Imperial) => shown / 1.8,
            (Speed, UnitSystem::Imperial) => shown / (FT_PER_M * 60.0),
            (LeafSize | Thickness | Position, UnitSystem::Imperial) => shown / IN_PER_M,
            (Pressure, UnitSystem::Imperial) => shown * KPA_PER_INHG,
            (Altitude, UnitSystem::Imperial) => shown / FT_PER_M,
            (VentilationRate, UnitSystem::Imperial) => shown / (FT_PER_M * 60.0),
        }
    }

    /// Decimals worth showing in `units`.
    #[must_use]
    pub fn decimals(self, units: UnitSystem) -> usize {
        use Quantity::*;
        match (self, units) {
            (Temperature | TempDiff, _) => 1,
            (Speed, UnitSystem::Si) => 2,
            (Speed, UnitSystem::Imperial) => 0,
            (LeafSize, UnitSystem::Si) => 0,
            (LeafSize, UnitSystem::Imperial) => 2,
            (Thickness | Position, UnitSystem::Si) => 2,
            (Thickness | Position, UnitSystem::Imperial) => 3,
            (Pressure, UnitSystem::Si) => 1,
            (Pressure, UnitSystem::Imperial) => 2,
            (Altitude, _) => 0,
            (VentilationRate, UnitSystem::Si) => 3,
            (VentilationRate, UnitSystem::Imperial) => 1,
            (Same(_), _) => 2,
        }
    }

    /// "12.3 °C" — the SI value shown in `units`; "–" when not finite (never "NaN").
    #[must_use]
    pub fn format(self, si: f64, units: UnitSystem) -> String {
        self.format_with(si, units, self.decimals(units))
    }

    /// As [`Quantity::format`] with a chosen number of decimals.
    #[must_use]
    pub fn format_with(self, si: f64, units: UnitSystem, decimals: usize) -> String {
        let v = self.to_display(si, units);
        if !v.is_finite() {
            return "–".to_owned();
        }
        let unit = self.unit(units);
        let n = fmt_num(v, decimals);
        if unit.is_empty() {
            n
        } else {
            format!("{n} {unit}")
        }
    }

    /// The number only, in `units`; "–" when not finite.
    #[must_use]
    pub fn number(self, si: f64, units: UnitSystem) -> String {
        fmt_num(self.to_display(si, units), self.decimals(units))
    }
}

/// Formats any number for display, never as "NaN" or "inf", and never as "-0.0": a value that
/// rounds to zero at `decimals` is shown without a sign.
#[must_use]
pub fn fmt_num(x: f64, decimals: usize) -> String {
    if !x.is_finite() {
        return "–".to_owned();
    }
    let s = format!("{x:.decimals$}");
    match s.strip_prefix('-') {
        Some(rest) if rest.chars().all(|c| c == '0' || c == '.') => rest.to_owned(),
        _ => s,
    }
}

/// Formats a positive number with engineering-style significant figures (e.g. Re, Gr).
#[must_use]
pub fn fmt_sig(x: f64) -> String {
    if !x.is_finite() {
        return "–".to_owned();
    }
    let a = x.abs();
    if a == 0.0 {
        "0".to_owned()
    } else if !(1e-2..1e5).contains(&a) {
        format!("{x:.2e}")
    } else if a >= 100.0 {
        format!("{x:.0}")
    } else if a >= 1.0 {
        format!("{x:.2}")
    } else {
        format!("{x:.3}")
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn round_trips() {
        let all = [
            Quantity::Temperature,
            Quantity::TempDiff,
            Quantity::Speed,
            Quantity::LeafSize,
            Quantity::Thickness,
            Quantity::Pressure,
            Quantity::Altitude,
            Quantity::VentilationRate,
            Quantity::Same("W/m²"),
        ];
        for q in all {
            for u in [UnitSystem::Si, UnitSystem::Imperial] {
                for x in [-12.5, 0.0, 0.05, 101.325, 3000.0] {
                    let back = q.from_display(q.to_display(x, u), u);
                    assert!((back - x).abs() < 1e-9 * (1.0 + x.abs()), "{q:?} {u:?} {x}");
                }
            }
        }
    }

    #[test]
    fn known_conversions() {
        // Exact definitions: 0 °C = 32 °F, 100 °C = 212 °F, 1 m/s = 196.85 ft/min, 25.4 mm = 1 in.
        let im = UnitSystem::Imperial;
        assert!((Quantity::Temperature.to_display(100.0, im) - 212.0).abs() < 1e-12);
        assert!((Quantity::TempDiff.to_display(10.0, im) - 18.0).abs() < 1e-12);
        assert!((Quantity::Speed.to_display(1.0, im) - 196.850_393_7).abs() < 1e-6);
        assert!((Quantity::LeafSize.to_display(0.0254, im) - 1.0).abs() < 1e-12);
        // 8 cfm per ft² = 8 × 0.3048³/60 m³/s per 0.3048² m² = 0.040 64 m³/s per m² (exact foot).
        assert!((Quantity::VentilationRate.from_display(8.0, im) - 0.040_64).abs() < 1e-5);
        // Standard atmosphere 101.325 kPa = 29.92 inHg (from memory).
        assert!((Quantity::Pressure.to_display(101.325, im) - 29.92).abs() < 0.005);
    }

    #[test]
    fn never_prints_negative_zero() {
        assert_eq!(fmt_num(-0.04, 1), "0.0");
        assert_eq!(fmt_num(-0.0, 0), "0");
        assert_eq!(fmt_num(-0.06, 1), "-0.1");
        assert_eq!(Quantity::TempDiff.format(-0.01, UnitSystem::Si), "0.0 K");
        assert_eq!(
            Quantity::TempDiff.number(-0.01, UnitSystem::Imperial),
            "0.0"
        );
    }

    #[test]
    fn never_prints_nan() {
        assert_eq!(Quantity::Temperature.format(f64::NAN, UnitSystem::Si), "–");
        assert_eq!(fmt_num(f64::INFINITY, 2), "–");
        assert_eq!(fmt_sig(f64::NAN), "–");
    }
}

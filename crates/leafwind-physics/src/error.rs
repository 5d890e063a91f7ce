//! Errors of the engine: values, never panics.

use thiserror::Error;

/// Why a physics call could not give a result.
///
/// Every message names the quantity, its value and what was expected, so the app can show it beside
/// the field that caused it.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum PhysicsError {
    /// A finite input outside its documented valid range.
    #[error("{quantity} = {value} {unit} is outside the valid range {min} to {max} {unit}")]
    OutOfRange {
        /// Name of the quantity, as a user would read it.
        quantity: &'static str,
        /// The value given, in `unit`.
        value: f64,
        /// Smallest valid value (inclusive), in `unit`.
        min: f64,
        /// Largest valid value (inclusive), in `unit`.
        max: f64,
        /// Unit of `value`, `min` and `max`.
        unit: &'static str,
    },
    /// An input that is NaN or infinite.
    #[error("{quantity} is not a finite number ({value})")]
    NotFinite {
        /// Name of the quantity.
        quantity: &'static str,
        /// The value given.
        value: f64,
    },
    /// Two inputs that are each in range but contradict each other.
    #[error("{0}")]
    Inconsistent(String),
    /// The root finder could not bracket a solution (should not happen for valid inputs).
    #[error(
        "no {quantity} between {low} and {high} balances the equation (residuals {f_low} and {f_high})"
    )]
    NoBracket {
        /// What was being solved for.
        quantity: &'static str,
        /// Lower end of the search interval.
        low: f64,
        /// Upper end of the search interval.
        high: f64,
        /// Residual at `low`.
        f_low: f64,
        /// Residual at `high`.
        f_high: f64,
    },
}

/// Result type of the engine.
pub type Result<T> = std::result::Result<T, PhysicsError>;

/// A closed valid range of one input quantity, with the name and unit used in error messages.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ValidRange {
    /// Name of the quantity as a user reads it.
    pub quantity: &'static str,
    /// Smallest valid value (inclusive).
    pub min: f64,
    /// Largest valid value (inclusive).
    pub max: f64,
    /// Unit of `min` and `max`.
    pub unit: &'static str,
}

impl ValidRange {
    /// Checks that `value` is finite and within `[min, max]`, and returns it.
    ///
    /// # Errors
    /// [`PhysicsError::NotFinite`] for NaN or ±∞, [`PhysicsError::OutOfRange`] outside the range.
    pub fn check(&self, value: f64) -> Result<f64> {
        if !value.is_finite() {
            return Err(PhysicsError::NotFinite {
                quantity: self.quantity,
                value,
            });
        }
        if value < self.min || value > self.max {
            return Err(PhysicsError::OutOfRange {
                quantity: self.quantity,
                value,
                min: self.min,
                max: self.max,
                unit: self.unit,
            });
        }
        Ok(value)
    }

    /// Whether `value` would pass [`ValidRange::check`].
    #[must_use]
    pub fn contains(&self, value: f64) -> bool {
        value.is_finite() && value >= self.min && value <= self.max
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const R: ValidRange = ValidRange {
        quantity: "air speed",
        min: 0.0,
        max: 30.0,
        unit: "m/s",
    };

    #[test]
    fn range_check_accepts_both_ends_and_rejects_outside() {
        assert_eq!(R.check(0.0), Ok(0.0));
        assert_eq!(R.check(30.0), Ok(30.0));
        assert!(matches!(
            R.check(-1e-9),
            Err(PhysicsError::OutOfRange { .. })
        ));
        assert!(matches!(
            R.check(30.000_001),
            Err(PhysicsError::OutOfRange { .. })
        ));
        assert!(matches!(
            R.check(f64::NAN),
            Err(PhysicsError::NotFinite { .. })
        ));
        assert!(matches!(
            R.check(f64::INFINITY),
            Err(PhysicsError::NotFinite { .. })
        ));
    }

    #[test]
    fn message_names_quantity_value_and_range() {
        let msg = R.check(-2.0).unwrap_err().to_string();
        assert_eq!(
            msg,
            "air speed = -2 m/s is outside the valid range 0 to 30 m/s"
        );
    }
}

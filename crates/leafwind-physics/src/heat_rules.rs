//! Heat rules with durations, as growers and extension agents state them — "3 h above 40 °C on two
//! days" — checked against an hourly series (a design day or a weather file).
//!
//! A rule names the temperature it is about (the air around the crop, or the hottest leaf: the
//! [`LimitKind`] of crop limits), a threshold, how long within one day the temperature must be above
//! it (in total, or in one unbroken run), and on how many days that must happen (in total, or on
//! days in a row). Each row of a series stands for its duration
//! ([`crate::design_day::row_durations_h`]: one hour in an hourly record, the logging step in a
//! finer one), so "3 h" means three hours of clock time whatever the step; a day is a calendar date
//! of the series' local clock time. A run "in a row" is broken by a row at or below the threshold,
//! an unsolved row, or a gap in the record.
//!
//! Rules of this form are common practice (no source): the thresholds and durations are the user's,
//! from their crop adviser or their own records. Leafwind counts; it does not say which rule a crop
//! obeys.

use crate::crops::LimitKind;
use crate::design_day::{HourResult, HourlySeries};
use crate::error::{PhysicsError, Result, ValidRange};
use crate::sun::{DateTime, days_from_civil};

/// Valid rule thresholds \[°C\].
pub const THRESHOLD_RANGE_C: ValidRange = ValidRange {
    quantity: "rule threshold",
    min: -30.0,
    max: 80.0,
    unit: "°C",
};

/// Valid hours above the threshold within a day \[h\].
pub const HOURS_RANGE_H: ValidRange = ValidRange {
    quantity: "hours above the threshold in a day",
    min: 1.0,
    max: 24.0,
    unit: "h",
};

/// Valid numbers of days.
pub const DAYS_RANGE: ValidRange = ValidRange {
    quantity: "number of days",
    min: 1.0,
    max: 366.0,
    unit: "days",
};

/// A heat rule.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct HeatRule {
    /// The temperature the rule is about: the air around the crop, or the hottest leaf (tissue).
    pub temperature: LimitKind,
    /// The threshold \[°C\]; an hour counts when the temperature is above it.
    pub above_c: f64,
    /// Hours above the threshold needed within one day \[h\] (whole hours).
    pub hours: u32,
    /// Whether those hours must be one unbroken run (otherwise they are added up over the day).
    pub hours_in_a_row: bool,
    /// Days on which that must happen.
    pub days: u32,
    /// Whether those days must follow one another (otherwise they are counted over the series).
    pub days_in_a_row: bool,
}

impl Default for HeatRule {
    /// "3 h above 40 °C (air) on 2 days" — an invented example.
    fn default() -> Self {
        Self {
            temperature: LimitKind::Air,
            above_c: 40.0,
            hours: 3,
            hours_in_a_row: false,
            days: 2,
            days_in_a_row: false,
        }
    }
}

impl HeatRule {
    /// Checks every field.
    ///
    /// # Errors
    /// The first field out of range.
    pub fn validate(&self) -> Result<()> {
        THRESHOLD_RANGE_C.check(self.above_c)?;
        HOURS_RANGE_H.check(f64::from(self.hours))?;
        DAYS_RANGE.check(f64::from(self.days))?;
        Ok(())
    }

    /// The rule in words, e.g. "3 h above 40.0 °C (air around the crop) on 2 days" (°C).
    #[must_use]
    pub fn words(&self) -> String {
        self.words_with(&format!("{:.1} °C", self.above_c))
    }

    /// The rule in words with the threshold already formatted (for other units).
    #[must_use]
    pub fn words_with(&self, threshold: &str) -> String {
        let what = match self.temperature {
            LimitKind::Air => "air around the crop",
            LimitKind::Tissue => "hottest leaf",
        };
        let hours = if self.hours_in_a_row {
            format!("{} h in a row", self.hours)
        } else {
            format!("{} h", self.hours)
        };
        let days = match (self.days, self.days_in_a_row) {
            (1, _) => "on a day".to_owned(),
            (n, true) => format!("on {n} days in a row"),
            (n, false) => format!("on {n} days"),
        };
        format!("{hours} above {threshold} ({what}) {days}")
    }

    /// The temperature of `hour` the rule is about \[°C\]; None when the hour was not solved.
    #[must_use]
    pub fn temperature_of(&self, hour: &HourResult) -> Option<f64> {
        match self.temperature {
            LimitKind::Air => Some(hour.inside_air_temp_c.unwrap_or(hour.air_temp_c)),
            LimitKind::Tissue => hour.hottest_leaf_temp_c,
        }
    }
}

/// One calendar day of the series as the rule sees it.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct RuleDay {
    /// The date (year, month, day).
    pub date: (i32, u32, u32),
    /// Hours above the threshold that day \[h\].
    pub hours_above: f64,
    /// Longest unbroken run of hours above it \[h\] (a run is broken by a row at or below the
    /// threshold, an unsolved row, or a gap in the record).
    pub longest_run_h: f64,
    /// Hours of that day in the series \[h\].
    pub hours_in_series: f64,
    /// Hours of that day that could not be solved (not counted as above) \[h\].
    pub unsolved_hours: f64,
    /// Whether the day meets the rule's daily condition.
    pub meets: bool,
}

/// What a rule found over a series.
#[derive(Debug, Clone, Copy, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub enum Verdict {
    /// The rule is met: enough days meet the daily condition (in a row, if asked).
    Met,
    /// The rule is not met.
    NotMet,
    /// The series is shorter than the days the rule asks for, and every day of it meets the daily
    /// condition: the rule would be met if such days went on (a design day, say).
    DailyConditionOnly,
}

/// A rule checked over a series.
#[derive(Debug, Clone, PartialEq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(deny_unknown_fields))]
pub struct RuleOutcome {
    /// The rule.
    pub rule: HeatRule,
    /// Each calendar day of the series, in order.
    pub days: Vec<RuleDay>,
    /// Days that meet the daily condition.
    pub days_meeting: u32,
    /// Longest run of calendar days in a row that meet it.
    pub longest_day_run: u32,
    /// The first date on which the rule is met (the day that completes it), if it is.
    pub first_met: Option<(i32, u32, u32)>,
    /// The verdict.
    pub verdict: Verdict,
}

impl RuleOutcome {
    /// Most hours above the threshold on any one day \[h\].
    #[must_use]
    pub fn most_hours_in_a_day(&self) -> f64 {
        self.days.iter().map(|d| d.hours_above).fold(0.0, f64::max)
    }

    /// Hours of the series that could not be solved \[h\].
    #[must_use]
    pub fn unsolved_hours(&self) -> f64 {
        self.days.iter().map(|d| d.unsolved_hours).sum()
    }
}

/// Rows closer than this to the end of the previous row's duration continue a run \[min\].
const RUN_JOIN_TOLERANCE_MIN: f64 = 0.5;

fn date_of(t: &DateTime) -> (i32, u32, u32) {
    (t.year, t.month, t.day)
}

/// Checks `rule` over the rows of `series` (in time order; each row stands for its
/// [`HourResult::duration_h`]).
///
/// # Errors
/// An invalid rule, or rows out of time order.
pub fn check_rule(rule: &HeatRule, series: &HourlySeries) -> Result<RuleOutcome> {
    rule.validate()?;
    let mut days: Vec<RuleDay> = Vec::new();
    let mut run_h = 0.0;
    // Minutes since the epoch of the previous row's start and end.
    let mut last: Option<(i64, f64)> = None;
    for h in &series.hours {
        let date = date_of(&h.time);
        let start = h.time.minutes_since_epoch();
        let duration_h = if h.duration_h.is_finite() {
            h.duration_h.max(0.0)
        } else {
            0.0
        };
        if let Some((prev, _)) = last
            && start <= prev
        {
            return Err(PhysicsError::Inconsistent(format!(
                "the rows are not in time order at {}",
                h.time
            )));
        }
        let new_day = days.last().is_none_or(|d| d.date != date);
        let contiguous = !new_day
            && last.is_some_and(|(_, end)| (start as f64 - end).abs() <= RUN_JOIN_TOLERANCE_MIN);
        if new_day {
            days.push(RuleDay {
                date,
                hours_above: 0.0,
                longest_run_h: 0.0,
                hours_in_series: 0.0,
                unsolved_hours: 0.0,
                meets: false,
            });
        }
        let Some(day) = days.last_mut() else {
            continue;
        };
        day.hours_in_series += duration_h;
        if !contiguous {
            run_h = 0.0;
        }
        match rule.temperature_of(h) {
            Some(t) if t > rule.above_c => {
                day.hours_above += duration_h;
                run_h += duration_h;
                day.longest_run_h = day.longest_run_h.max(run_h);
            }
            Some(_) => run_h = 0.0,
            None => {
                day.unsolved_hours += duration_h;
                run_h = 0.0;
            }
        }
        last = Some((start, start as f64 + duration_h * 60.0));
    }
    // Whole hours asked; a sum of logged steps may miss them by rounding only.
    let needed_h = f64::from(rule.hours) - 1e-6;
    for d in &mut days {
        let got = if rule.hours_in_a_row {
            d.longest_run_h
        } else {
            d.hours_above
        };
        d.meets = got >= needed_h;
    }
    // Count the meeting days, in total and in calendar runs.
    let mut days_meeting = 0u32;
    let mut longest_day_run = 0u32;
    let mut day_run = 0u32;
    let mut prev_day: Option<i64> = None;
    let mut first_met = None;
    for d in &days {
        let n = days_from_civil(d.date.0, d.date.1, d.date.2);
        if d.meets {
            days_meeting += 1;
            day_run = if prev_day.is_some_and(|p| p + 1 == n) {
                day_run + 1
            } else {
                1
            };
            prev_day = Some(n);
            longest_day_run = longest_day_run.max(day_run);
            let count = if rule.days_in_a_row {
                day_run
            } else {
                days_meeting
            };
            if first_met.is_none() && count >= rule.days {
                first_met = Some(d.date);
            }
        } else {
            day_run = 0;
            prev_day = None;
        }
    }
    let verdict = if first_met.is_some() {
        Verdict::Met
    } else if !days.is_empty() && days.len() < rule.days as usize && days.iter().all(|d| d.meets) {
        Verdict::DailyConditionOnly
    } else {
        Verdict::NotMet
    };
    Ok(RuleOutcome {
        rule: *rule,
        days,
        days_meeting,
        longest_day_run,
        first_met,
        verdict,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn civil_days_known_dates() {
        // 1970-01-01 is day 0; 2000-03-01 is day 11 017; 2024-02-29 + 1 day = 2024-03-01.
        assert_eq!(days_from_civil(1970, 1, 1), 0);
        assert_eq!(days_from_civil(2000, 3, 1), 11_017);
        assert_eq!(
            days_from_civil(2024, 3, 1) - days_from_civil(2024, 2, 29),
            1
        );
        assert_eq!(
            days_from_civil(2027, 1, 1) - days_from_civil(2026, 12, 31),
            1
        );
    }

    #[test]
    fn words_read_as_growers_say_them() {
        assert_eq!(
            HeatRule::default().words(),
            "3 h above 40.0 °C (air around the crop) on 2 days"
        );
        let r = HeatRule {
            temperature: LimitKind::Tissue,
            hours_in_a_row: true,
            days: 1,
            ..HeatRule::default()
        };
        assert_eq!(
            r.words(),
            "3 h in a row above 40.0 °C (hottest leaf) on a day"
        );
    }
}

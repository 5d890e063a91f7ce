//! The numeric input widget: a live slider with the unit shown, a tooltip, a range check against
//! the engine's valid range, and the reason in words beside the field when it fails.

use egui::{Align, Color32, Layout, Response, RichText, Slider, SliderClamping, Ui, vec2};
use leafwind_physics::error::ValidRange;

use crate::units::{Quantity, UnitSystem};

/// Width of the label column of the inputs \[points\].
pub const LABEL_WIDTH: f32 = 150.0;

/// Colour of error text (always with a "⚠" and words, never colour alone).
pub const ERROR_COLOUR: Color32 = Color32::from_rgb(200, 60, 50);

/// The description of one numeric input.
#[derive(Debug, Clone, Copy)]
pub struct Field<'a> {
    /// Label (also the accessible name of the slider).
    pub label: &'a str,
    /// What kind of number (sets unit and conversion).
    pub quantity: Quantity,
    /// The engine's valid range (SI).
    pub range: ValidRange,
    /// The span of the slider (SI); typed values may go beyond it and are then range-checked.
    pub slider: (f64, f64),
    /// Logarithmic slider.
    pub log: bool,
    /// Decimals shown (None: the quantity's default).
    pub decimals: Option<usize>,
    /// Meaning, typical range, and where the default comes from.
    pub tooltip: &'a str,
}

/// The reason a value is invalid, in the user's units; None when valid.
#[must_use]
pub fn range_error(
    range: &ValidRange,
    quantity: Quantity,
    si: f64,
    units: UnitSystem,
) -> Option<String> {
    if !si.is_finite() {
        return Some(format!("{} is not a number", range.quantity));
    }
    if range.contains(si) {
        return None;
    }
    let unit = quantity.unit(units);
    let d = quantity.decimals(units).max(1);
    let show = |x: f64| {
        let v = quantity.to_display(x, units);
        let s = format!("{v:.d$}");
        if unit.is_empty() {
            s
        } else {
            format!("{s} {unit}")
        }
    };
    Some(format!(
        "{} {} is outside the valid range {} to {}",
        capitalise(range.quantity),
        show(si),
        show(range.min),
        show(range.max)
    ))
}

fn capitalise(s: &str) -> String {
    let mut c = s.chars();
    match c.next() {
        Some(f) => f.to_uppercase().collect::<String>() + c.as_str(),
        None => String::new(),
    }
}

/// The label column.
pub fn field_label(ui: &mut Ui, label: &str, tooltip: &str) -> Response {
    ui.allocate_ui_with_layout(
        vec2(LABEL_WIDTH, ui.spacing().interact_size.y),
        Layout::left_to_right(Align::Center),
        |ui| {
            ui.set_min_width(LABEL_WIDTH);
            ui.label(label)
        },
    )
    .inner
    .on_hover_text(tooltip)
}

/// Shows an error line under a field.
pub fn error_line(ui: &mut Ui, message: &str) {
    ui.horizontal(|ui| {
        ui.add_space(4.0);
        ui.label(
            RichText::new(format!("⚠ {message}"))
                .color(ERROR_COLOUR)
                .small(),
        );
    });
}

/// A numeric field with range check. `extra` adds checks that depend on other inputs (e.g. a dew
/// point above the air temperature). Returns the slider's response.
pub fn number_field(
    ui: &mut Ui,
    field: &Field<'_>,
    value_si: &mut f64,
    units: UnitSystem,
    extra: impl Fn(f64) -> Option<String>,
) -> Response {
    let q = field.quantity;
    let unit = q.unit(units);
    let decimals = field.decimals.unwrap_or_else(|| q.decimals(units));
    let before = q.to_display(*value_si, units);
    let mut shown = if before.is_finite() { before } else { 0.0 };
    let (lo, hi) = (
        q.to_display(field.slider.0, units),
        q.to_display(field.slider.1, units),
    );
    let response = ui
        .horizontal(|ui| {
            field_label(ui, field.label, field.tooltip);
            let mut slider = Slider::new(&mut shown, lo.min(hi)..=lo.max(hi))
                .clamping(SliderClamping::Never)
                .logarithmic(field.log)
                .max_decimals(decimals + 1)
                .min_decimals(decimals);
            if !unit.is_empty() {
                slider = slider.suffix(format!(" {unit}"));
            }
            let r = ui.add(slider).on_hover_text(field.tooltip);
            let label = field.label.to_owned();
            ui.ctx()
                .accesskit_node_builder(r.id, |node| node.set_label(label));
            r
        })
        .inner;
    if response.changed() && shown != before && shown.is_finite() {
        let si = q.from_display(shown, units);
        if si.is_finite() {
            *value_si = si;
        }
    }
    let error = range_error(&field.range, q, *value_si, units).or_else(|| extra(*value_si));
    if let Some(e) = error {
        error_line(ui, &e);
    }
    response
}

/// Gives a widget an accessible name (for screen readers and the UI tests).
pub fn name_widget(ui: &Ui, response: &Response, name: &str) {
    let name = name.to_owned();
    ui.ctx()
        .accesskit_node_builder(response.id, |node| node.set_label(name));
}

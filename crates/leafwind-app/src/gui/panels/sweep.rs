//! The sweep over air speed: leaf − air difference and boundary-layer thickness against air
//! speed, one curve per leaf size, with the limit and the current point marked.

use egui::{Color32, DragValue, RichText, Ui};
use egui_plot::{HLine, HoverPosition, Legend, Line, LineStyle, MarkerShape, Plot, Points, VLine};
use leafwind_physics::WindAnswer;

use crate::document::{MAX_EXTRA_SIZES, ScenarioDocument};
use crate::gui::commands::{Command, PlotKind};
use crate::gui::compute::{LeafResult, SweepResult};
use crate::units::{Quantity, UnitSystem, fmt_num};

/// Curve colours, the current leaf size first.
pub const PALETTE: [Color32; 7] = [
    Color32::from_rgb(220, 90, 40),
    Color32::from_rgb(50, 120, 200),
    Color32::from_rgb(60, 160, 90),
    Color32::from_rgb(170, 80, 170),
    Color32::from_rgb(190, 160, 30),
    Color32::from_rgb(40, 170, 170),
    Color32::from_rgb(120, 120, 120),
];

/// Colour of the least-air-speed line.
pub const LEAST_SPEED_COLOUR: Color32 = Color32::from_rgb(120, 200, 120);

/// Limit line colour.
pub const LIMIT_COLOUR: Color32 = Color32::from_rgb(200, 40, 40);

/// Options of the sweep plots.
#[derive(Debug, Clone)]
pub struct SweepPanel {
    /// Show the 99 % thickness curves.
    pub show_delta99: bool,
    /// Show the k/h curves.
    pub show_effective: bool,
}

impl Default for SweepPanel {
    fn default() -> Self {
        Self {
            show_delta99: true,
            show_effective: true,
        }
    }
}

/// The name of a curve for a leaf size.
#[must_use]
pub fn size_name(size_m: f64, current: bool, units: UnitSystem) -> String {
    let s = Quantity::LeafSize.format(size_m, units);
    if current {
        format!("leaf {s} (current)")
    } else {
        format!("leaf {s}")
    }
}

/// A hover read-out "name / x unit / y unit".
pub fn hover_text(
    pos: &HoverPosition<'_>,
    x_unit: &str,
    y_unit: &str,
    x_dec: usize,
    y_dec: usize,
) -> Option<String> {
    match pos {
        HoverPosition::NearDataPoint {
            plot_name,
            position,
            ..
        } => Some(format!(
            "{plot_name}\n{} {x_unit}\n{} {y_unit}",
            fmt_num(position.x, x_dec),
            fmt_num(position.y, y_dec)
        )),
        HoverPosition::Elsewhere { position } => Some(format!(
            "{} {x_unit}\n{} {y_unit}",
            fmt_num(position.x, x_dec),
            fmt_num(position.y, y_dec)
        )),
    }
}

/// A sweep curve as plot points in `units`: air speed on x, `q` on y; missing values left out.
fn curve_points(
    speeds_m_s: &[f64],
    values: &[Option<f64>],
    q: Quantity,
    units: UnitSystem,
) -> Vec<[f64; 2]> {
    speeds_m_s
        .iter()
        .zip(values)
        .filter_map(|(&u, v)| {
            v.map(|v| [Quantity::Speed.to_display(u, units), q.to_display(v, units)])
        })
        .collect()
}

/// The least air speed (when it lies within the sweep, up to `max_speed_m_s`) as a vertical line,
/// and the current case as a diamond at height `current_y` (display units).
fn least_speed_and_current(
    p: &mut egui_plot::PlotUi<'_>,
    r: &LeafResult,
    max_speed_m_s: f64,
    current_y: f64,
    marker: Color32,
    units: UnitSystem,
) {
    let sp = Quantity::Speed;
    if let Ok(WindAnswer::Speed { speed_m_s, .. }) = r.wind
        && speed_m_s <= max_speed_m_s
    {
        p.vline(
            VLine::new(
                format!("least air speed {}", sp.format(speed_m_s, units)),
                sp.to_display(speed_m_s, units),
            )
            .color(LEAST_SPEED_COLOUR)
            .style(LineStyle::dashed_dense())
            .width(1.5),
        );
    }
    p.points(
        Points::new(
            "current",
            vec![[sp.to_display(r.case.air.speed_m_s, units), current_y]],
        )
        .shape(MarkerShape::Diamond)
        .radius(7.0)
        .color(marker)
        .filled(true),
    );
}

/// The colour of the "current" marker: the strongest text colour of the theme.
#[must_use]
pub fn current_marker_colour(ui: &Ui) -> Color32 {
    ui.visuals().strong_text_color()
}

impl SweepPanel {
    /// Draws the controls and the two plots.
    #[allow(clippy::too_many_lines)]
    pub fn ui(
        &mut self,
        ui: &mut Ui,
        sweep: Option<&SweepResult>,
        status: Option<String>,
        doc: &ScenarioDocument,
        current: Option<&LeafResult>,
        units: UnitSystem,
    ) -> Vec<Command> {
        let mut commands = Vec::new();
        let mut edited = doc.clone();
        let sp = Quantity::Speed;
        let size_q = Quantity::LeafSize;
        ui.horizontal_wrapped(|ui| {
            ui.label("Up to").on_hover_text("Highest air speed of the sweep.");
            let mut max = sp.to_display(edited.sweep.max_speed_m_s, units);
            let r = ui.add(
                DragValue::new(&mut max)
                    .speed(0.05 * sp.to_display(1.0, units))
                    .range(sp.to_display(0.2, units)..=sp.to_display(30.0, units))
                    .suffix(format!(" {}", sp.unit(units))),
            );
            if r.changed() {
                edited.sweep.max_speed_m_s = sp.from_display(max, units).clamp(0.2, 30.0);
            }
            ui.separator();
            ui.label("Other leaf sizes:").on_hover_text(
                "Leaf sizes to compare with the current one (for breeders comparing leaf sizes). Each gets its own curve.",
            );
            let mut remove = None;
            for (i, d) in edited.extra_sizes_m.iter_mut().enumerate() {
                let mut shown = size_q.to_display(*d, units);
                let r = ui.add(
                    DragValue::new(&mut shown)
                        .speed(0.5 * size_q.to_display(0.001, units))
                        .range(size_q.to_display(0.001, units)..=size_q.to_display(1.0, units))
                        .max_decimals(size_q.decimals(units) + 1)
                        .suffix(format!(" {}", size_q.unit(units))),
                );
                if r.changed() {
                    *d = size_q.from_display(shown, units).clamp(0.001, 1.0);
                }
                if ui.small_button("✖").on_hover_text("Remove this leaf size").clicked() {
                    remove = Some(i);
                }
            }
            if let Some(i) = remove {
                edited.extra_sizes_m.remove(i);
            }
            if edited.extra_sizes_m.len() < MAX_EXTRA_SIZES
                && ui.small_button("+ size").on_hover_text("Add a leaf size to compare").clicked()
            {
                let next = edited.extra_sizes_m.last().map_or(0.02, |d| (d * 2.0).min(1.0));
                edited.extra_sizes_m.push(next);
            }
            ui.separator();
            ui.checkbox(&mut self.show_delta99, "99 % thickness")
                .on_hover_text("Velocity boundary-layer thickness at the trailing edge (Blasius, laminar; turbulent past transition).");
            ui.checkbox(&mut self.show_effective, "k/h equivalent")
                .on_hover_text("Conduction-equivalent thickness k/h: the still-air layer with the same heat resistance, per face.");
            let export = Command::ExportCsv(PlotKind::Sweep);
            if ui.button(export.label()).on_hover_text(export.tooltip()).clicked() {
                commands.push(export);
            }
        });
        if let Some(s) = status {
            ui.label(RichText::new(s).small().weak());
        }
        if edited != *doc {
            commands.push(Command::Edit(Box::new(edited)));
        }
        let Some(sweep) = sweep else {
            ui.label("Computing the sweep…");
            return commands;
        };
        let tq = Quantity::TempDiff;
        let th = Quantity::Thickness;
        let (x_unit, y_unit, t_unit) = (sp.unit(units), tq.unit(units), th.unit(units));
        let avail = ui.available_height();
        let h1 = (avail * 0.56 - 20.0).max(160.0);
        let h2 = (avail - h1 - 48.0).max(140.0);
        let link = egui::Id::unique("sweep-link");
        let x_dec = sp.decimals(units);
        let air = sweep.air_temp_c;
        let marker = current_marker_colour(ui);
        ui.label(
            RichText::new("How much warmer than the air the leaf runs, by air speed").strong(),
        );
        Plot::new("sweep-diff")
            .height(h1)
            .legend(
                Legend::default()
                    .follow_insertion_order(true)
                    .position(egui_plot::Corner::RightTop),
            )
            .x_axis_label(format!("Air speed over the leaf [{x_unit}]"))
            .y_axis_label(format!("Leaf − air [{y_unit}]"))
            .link_axis(link, [true, false])
            .link_cursor(link, [true, false])
            .include_y(0.0)
            .label_formatter(move |p| hover_text(p, x_unit, y_unit, x_dec, 2))
            .show(ui, |p| {
                for (i, c) in sweep.curves.iter().enumerate() {
                    let pts = curve_points(&c.speeds_m_s, &c.diff_k, tq, units);
                    p.line(
                        Line::new(size_name(c.size_m, i == 0, units), pts)
                            .color(PALETTE[i % PALETTE.len()])
                            .width(if i == 0 { 2.5 } else { 1.5 }),
                    );
                }
                if let Some(r) = current {
                    let limit = r.limit_c - air;
                    p.hline(
                        HLine::new(
                            format!("limit {}", Quantity::Temperature.format(r.limit_c, units)),
                            tq.to_display(limit, units),
                        )
                        .color(LIMIT_COLOUR)
                        .width(1.5),
                    );
                    let x_right = sp.to_display(
                        sweep.curves[0].speeds_m_s.last().copied().unwrap_or(1.0),
                        units,
                    );
                    p.text(
                        egui_plot::Text::new(
                            "",
                            egui_plot::PlotPoint::new(x_right, tq.to_display(limit, units)),
                            RichText::new(format!(
                                "limit {}",
                                Quantity::Temperature.format(r.limit_c, units)
                            ))
                            .color(LIMIT_COLOUR),
                        )
                        .anchor(egui::Align2::RIGHT_BOTTOM),
                    );
                    p.hline(
                        HLine::new("limit − margin", tq.to_display(limit - r.margin_k, units))
                            .color(LIMIT_COLOUR)
                            .style(LineStyle::dashed_loose())
                            .width(1.0),
                    );
                    let max_u = sweep.curves[0].speeds_m_s.last().copied().unwrap_or(0.0);
                    least_speed_and_current(
                        p,
                        r,
                        max_u,
                        tq.to_display(r.solution.leaf_air_diff_k, units),
                        marker,
                        units,
                    );
                }
            });
        ui.add_space(4.0);
        ui.label(RichText::new("Boundary-layer thickness: solid 99 % velocity layer, dashed k/h equivalent still air").strong());
        let th_dec = th.decimals(units);
        Plot::new("sweep-thickness")
            .height(h2)
            .legend(
                Legend::default()
                    .follow_insertion_order(true)
                    .position(egui_plot::Corner::RightTop),
            )
            .x_axis_label(format!("Air speed over the leaf [{x_unit}]"))
            .y_axis_label(format!("Boundary layer [{t_unit}]"))
            .link_axis(link, [true, false])
            .link_cursor(link, [true, false])
            .include_y(0.0)
            .label_formatter(move |p| hover_text(p, x_unit, t_unit, x_dec, th_dec))
            .show(ui, |p| {
                for (i, c) in sweep.curves.iter().enumerate() {
                    let col = PALETTE[i % PALETTE.len()];
                    let name = size_name(c.size_m, i == 0, units);
                    if self.show_delta99 {
                        let mut pts = curve_points(&c.speeds_m_s, &c.delta99_m, th, units);
                        pts.retain(|p| p[1] <= th.to_display(0.05, units));
                        p.line(
                            Line::new(format!("{name}: 99 %"), pts)
                                .color(col)
                                .width(if i == 0 { 2.0 } else { 1.2 }),
                        );
                    }
                    if self.show_effective {
                        let pts = curve_points(&c.speeds_m_s, &c.effective_m, th, units);
                        p.line(
                            Line::new(format!("{name}: k/h"), pts)
                                .color(col)
                                .style(LineStyle::dashed_dense())
                                .width(1.2),
                        );
                    }
                }
                if let Some(r) = current
                    && let Some(d) = r.solution.bl_thickness_m
                {
                    let max_u = sweep.curves[0].speeds_m_s.last().copied().unwrap_or(0.0);
                    least_speed_and_current(p, r, max_u, th.to_display(d, units), marker, units);
                }
            });
        commands
    }
}

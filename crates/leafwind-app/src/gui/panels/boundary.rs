//! The boundary-layer view: Blasius velocity profiles at several positions along the leaf, the
//! 99 % thickness along the leaf, and the wall shear rate along it.

use egui::{RichText, Ui};
use egui_plot::{Legend, Line, LineStyle, Plot, VLine};

use crate::gui::commands::{Command, PlotKind};
use crate::gui::compute::BoundaryResult;
use crate::gui::panels::sweep::{PALETTE, hover_text};
use crate::units::{Quantity, UnitSystem};

/// State of the boundary-layer view.
#[derive(Debug, Clone, Default)]
pub struct BoundaryPanel {}

impl BoundaryPanel {
    /// Draws the three plots.
    pub fn ui(
        &mut self,
        ui: &mut Ui,
        bl: Option<&BoundaryResult>,
        status: Option<String>,
        units: UnitSystem,
    ) -> Vec<Command> {
        let mut commands = Vec::new();
        ui.horizontal_wrapped(|ui| {
            ui.label(
                RichText::new(
                    "Laminar (Blasius) layer over the leaf's upper face at the current air speed.",
                )
                .weak(),
            );
            let export = Command::ExportCsv(PlotKind::Boundary);
            if ui
                .button(export.label())
                .on_hover_text(export.tooltip())
                .clicked()
            {
                commands.push(export);
            }
        });
        if let Some(s) = status {
            ui.label(RichText::new(s).small().weak());
        }
        let Some(bl) = bl else {
            ui.label("Computing the boundary layer…");
            return commands;
        };
        if bl.speed_m_s <= 0.0 {
            ui.label("Still air: there is no forced boundary layer; heat leaves the leaf by free convection (rising warm air) only. Set an air speed above zero to see the layer.");
            return commands;
        }
        let sp = Quantity::Speed;
        let th = Quantity::Thickness;
        let pos = Quantity::Position;
        let (u_unit, h_unit, x_unit) = (sp.unit(units), th.unit(units), pos.unit(units));
        let avail = ui.available_height();
        let width = ui.available_width();
        let left_w = (width * 0.45 - 6.0).max(200.0);
        let right_w = (width - left_w - 12.0).max(200.0);
        let (u_dec, h_dec, x_dec) = (sp.decimals(units), th.decimals(units), pos.decimals(units));
        ui.horizontal(|ui| {
            Plot::new("bl-profiles")
                .width(left_w)
                .height(avail)
                .legend(
                    Legend::default()
                        .follow_insertion_order(true)
                        .position(egui_plot::Corner::LeftTop),
                )
                .x_axis_label(format!("Air velocity u [{u_unit}]"))
                .y_axis_label(format!("Height above the leaf [{h_unit}]"))
                .include_x(0.0)
                .include_y(0.0)
                .label_formatter(move |p| hover_text(p, u_unit, h_unit, u_dec + 1, h_dec))
                .show(ui, |p| {
                    for (i, (x, pts)) in bl.profiles.iter().enumerate() {
                        let line: Vec<[f64; 2]> = pts
                            .iter()
                            .map(|&(y, u)| [sp.to_display(u, units), th.to_display(y, units)])
                            .collect();
                        let name = format!(
                            "x = {} ({:.0} % of the leaf)",
                            pos.format_with(*x, units, pos.decimals(units) - 1),
                            100.0 * x / bl.size_m
                        );
                        p.line(
                            Line::new(name, line)
                                .color(PALETTE[i % PALETTE.len()])
                                .width(2.0),
                        );
                    }
                });
            ui.vertical(|ui| {
                let h = (avail - 8.0) * 0.5;
                Plot::new("bl-thickness")
                    .width(right_w)
                    .height(h)
                    .legend(
                        Legend::default()
                            .follow_insertion_order(true)
                            .position(egui_plot::Corner::LeftTop),
                    )
                    .x_axis_label(format!("Distance from the leading edge [{x_unit}]"))
                    .y_axis_label(format!("99 % thickness [{h_unit}]"))
                    .x_grid_spacer(egui_plot::log_grid_spacer(5))
                    .include_x(0.0)
                    .include_y(0.0)
                    .label_formatter(move |p| hover_text(p, x_unit, h_unit, x_dec, h_dec))
                    .show(ui, |p| {
                        let line: Vec<[f64; 2]> = bl
                            .thickness
                            .iter()
                            .map(|&(x, d)| [pos.to_display(x, units), th.to_display(d, units)])
                            .collect();
                        p.line(
                            Line::new("99 % thickness δ", line)
                                .color(PALETTE[0])
                                .width(2.0),
                        );
                        if let Some(xc) = bl.transition_x_m {
                            p.vline(
                                VLine::new("transition (Re = Re_c)", pos.to_display(xc, units))
                                    .style(LineStyle::dashed_loose()),
                            );
                        }
                    });
                Plot::new("bl-shear")
                    .width(right_w)
                    .height(h)
                    .legend(
                        Legend::default()
                            .follow_insertion_order(true)
                            .position(egui_plot::Corner::RightTop),
                    )
                    .x_axis_label(format!("Distance from the leading edge [{x_unit}]"))
                    .y_axis_label("Wall shear rate ∂u/∂y [1/s]")
                    .x_grid_spacer(egui_plot::log_grid_spacer(5))
                    .include_x(0.0)
                    .include_y(0.0)
                    .label_formatter(move |p| hover_text(p, x_unit, "1/s", x_dec, 0))
                    .show(ui, |p| {
                        // The leading-edge singularity: start at 2 % of the leaf.
                        let line: Vec<[f64; 2]> = bl
                            .shear
                            .iter()
                            .filter(|&&(x, _)| x >= 0.02 * bl.size_m)
                            .map(|&(x, g)| [pos.to_display(x, units), g])
                            .collect();
                        p.line(
                            Line::new("wall shear rate (laminar)", line)
                                .color(PALETTE[1])
                                .width(2.0),
                        );
                    });
            });
        });
        commands
    }
}

//! The leaf result panel: how hot the leaf runs, where it stands against the limit, why (the
//! energy budget and the conductances), and what air speed would keep it under the limit.

use egui::{Color32, CornerRadius, Frame, Grid, RichText, ScrollArea, Ui};
use egui_plot::{Bar, BarChart, Plot};
use leafwind_physics::WindAnswer;
use leafwind_physics::required_wind::Unreachable;
use leafwind_physics::transpiration::mol_to_mmol;

use crate::gui::commands::{Command, PlotKind};
use crate::gui::compute::{LeafResult, LimitStatus};
use crate::units::{Quantity, UnitSystem, fmt_num, fmt_sig};

/// Colours of the budget terms.
const SHORTWAVE: Color32 = Color32::from_rgb(235, 175, 50);
const LONGWAVE_IN: Color32 = Color32::from_rgb(200, 110, 60);
const EMITTED: Color32 = Color32::from_rgb(150, 90, 170);
const SENSIBLE: Color32 = Color32::from_rgb(90, 150, 210);
const LATENT: Color32 = Color32::from_rgb(70, 170, 130);

/// One term of the energy budget, as shown: name, W/m², gain (true) or loss.
#[derive(Debug, Clone, PartialEq)]
pub struct BudgetTerm {
    /// Name.
    pub name: &'static str,
    /// Size \[W m⁻²\] (positive).
    pub w_m2: f64,
    /// Whether it heats the leaf.
    pub gain: bool,
}

/// The budget terms of a result: gains (absorbed shortwave and longwave, and sensible or latent
/// heat when they flow into the leaf) and losses. Both columns sum to the same total.
#[must_use]
pub fn budget_terms(r: &LeafResult) -> Vec<BudgetTerm> {
    let s = &r.solution;
    let t = &s.terms;
    let mut v = vec![
        BudgetTerm {
            name: "Sunlight absorbed",
            w_m2: s.absorbed_shortwave_w_m2,
            gain: true,
        },
        BudgetTerm {
            name: "Heat radiation absorbed",
            w_m2: s.absorbed_longwave_w_m2,
            gain: true,
        },
        BudgetTerm {
            name: "Heat radiation emitted",
            w_m2: t.emitted_w_m2,
            gain: false,
        },
    ];
    let sensible_name = if t.sensible_w_m2 >= 0.0 {
        "Sensible heat to the air"
    } else {
        "Sensible heat from the air"
    };
    v.push(BudgetTerm {
        name: sensible_name,
        w_m2: t.sensible_w_m2.abs(),
        gain: t.sensible_w_m2 < 0.0,
    });
    let latent_name = if t.latent_w_m2 >= 0.0 {
        "Latent heat (transpiration)"
    } else {
        "Latent heat (dew)"
    };
    v.push(BudgetTerm {
        name: latent_name,
        w_m2: t.latent_w_m2.abs(),
        gain: t.latent_w_m2 < 0.0,
    });
    v
}

fn term_colour(name: &str) -> Color32 {
    match name {
        "Sunlight absorbed" => SHORTWAVE,
        "Heat radiation absorbed" => LONGWAVE_IN,
        "Heat radiation emitted" => EMITTED,
        n if n.starts_with("Sensible") => SENSIBLE,
        _ => LATENT,
    }
}

/// The least-air-speed answer in one or two sentences, in the user's units.
#[must_use]
pub fn wind_sentence(answer: &WindAnswer, units: UnitSystem) -> String {
    let t = |c: f64| Quantity::Temperature.format(c, units);
    let u = |s: f64| Quantity::Speed.format_with(s, units, Quantity::Speed.decimals(units));
    let ceiling = |c: Option<f64>| {
        c.map_or(String::new(), |c| {
            format!(
                " Above {} more air warms the leaf past the target again.",
                u(c)
            )
        })
    };
    match *answer {
        WindAnswer::NotNeeded {
            still_air_leaf_temp_c,
            target_c,
            ceiling_m_s,
        } => format!(
            "No air movement is needed: even in still air the leaf runs at {}, at or below the target of {}.{}",
            t(still_air_leaf_temp_c),
            t(target_c),
            ceiling(ceiling_m_s)
        ),
        WindAnswer::Speed {
            speed_m_s,
            leaf_temp_c,
            target_c,
            ceiling_m_s,
        } => format!(
            "An air speed of at least {} over the leaf keeps it at {}, the target of {} (limit minus margin).{}",
            u(speed_m_s),
            t(leaf_temp_c),
            t(target_c),
            ceiling(ceiling_m_s)
        ),
        WindAnswer::Unreachable(Unreachable::AirTooHot {
            air_temp_c,
            target_c,
            leaf_temp_at_max_c,
            leaf_cooler_than_air,
        }) => {
            let tail = if leaf_cooler_than_air {
                " Transpiration already holds the leaf below the air; more air would warm it toward the air."
            } else {
                " More air only brings the leaf toward the air temperature."
            };
            format!(
                "No air speed can do it: the air is at {}, at or above the target of {} (at the fastest speed tried the leaf is at {}).{tail} Cool the air (ventilation, shade, evaporative cooling) instead.",
                t(air_temp_c),
                t(target_c),
                t(leaf_temp_at_max_c)
            )
        }
        WindAnswer::Unreachable(Unreachable::BeyondSearch {
            max_speed_m_s,
            leaf_temp_at_max_c,
            target_c,
        }) => format!(
            "Not reachable with air alone: even at {} the leaf runs at {}, above the target of {}. Reduce the radiation load (shade) or keep the stomata open (water).",
            u(max_speed_m_s),
            t(leaf_temp_at_max_c),
            t(target_c)
        ),
    }
}

/// State of the result panel.
#[derive(Debug, Clone, Default)]
pub struct ResultPanel {}

impl ResultPanel {
    /// Draws the result. `stale` is the reason the shown result is not for the current inputs.
    pub fn ui(
        &mut self,
        ui: &mut Ui,
        result: Option<&LeafResult>,
        stale: Option<&str>,
        units: UnitSystem,
    ) -> Option<Command> {
        let mut command = None;
        ScrollArea::vertical()
            .id_salt("result-scroll")
            .auto_shrink([false, false])
            .show(ui, |ui| {
                if let Some(reason) = stale {
                    Frame::new()
                        .fill(ui.visuals().warn_fg_color.gamma_multiply(0.15))
                        .corner_radius(CornerRadius::same(4))
                        .inner_margin(6.0)
                        .show(ui, |ui| {
                            ui.label(
                                RichText::new(format!("⚠ Showing the last valid result: {reason}"))
                                    .color(ui.visuals().warn_fg_color),
                            );
                        });
                }
                let Some(r) = result else {
                    ui.label("No result yet: check the inputs marked ⚠.");
                    return;
                };
                headline(ui, r, units);
                ui.add_space(6.0);
                answer(ui, r, units);
                ui.add_space(6.0);
                if budget(ui, r) {
                    command = Some(Command::ExportCsv(PlotKind::Budget));
                }
                ui.add_space(4.0);
                details(ui, r, units);
            });
        command
    }
}

fn headline(ui: &mut Ui, r: &LeafResult, units: UnitSystem) {
    let s = &r.solution;
    ui.horizontal(|ui| {
        ui.label(RichText::new("Leaf").size(18.0));
        ui.label(
            RichText::new(Quantity::Temperature.format(s.leaf_temp_c, units))
                .size(30.0)
                .strong(),
        )
        .on_hover_text(
            "Leaf temperature from the exact energy balance (both faces, steady state).",
        );
    });
    let diff = Quantity::TempDiff.to_display(s.leaf_air_diff_k, units);
    let word = if s.leaf_air_diff_k >= 0.0 {
        "warmer"
    } else {
        "cooler"
    };
    ui.label(
        RichText::new(format!(
            "{:+.1} {} {word} than the air at {}",
            diff,
            Quantity::TempDiff.unit(units),
            Quantity::Temperature.format(s.air_temp_c, units)
        ))
        .size(15.0),
    );
    let status = r.status();
    let (fill, text) = match status {
        LimitStatus::WithinMargin => (Color32::from_rgb(40, 120, 70), Color32::WHITE),
        LimitStatus::InsideMargin => (Color32::from_rgb(210, 150, 30), Color32::BLACK),
        LimitStatus::OverLimit => (Color32::from_rgb(180, 40, 40), Color32::WHITE),
    };
    let margin = r.margin_to_limit_k();
    let margin_text = if margin >= 0.0 {
        format!(
            "{} below the limit of {} (margin wanted {})",
            Quantity::TempDiff.format(margin, units),
            Quantity::Temperature.format(r.limit_c, units),
            Quantity::TempDiff.format(r.margin_k, units)
        )
    } else {
        format!(
            "{} above the limit of {}",
            Quantity::TempDiff.format(-margin, units),
            Quantity::Temperature.format(r.limit_c, units)
        )
    };
    Frame::new()
        .fill(fill)
        .corner_radius(CornerRadius::same(4))
        .inner_margin(6.0)
        .show(ui, |ui| {
            ui.set_width(ui.available_width());
            ui.label(
                RichText::new(status.words())
                    .color(text)
                    .strong()
                    .size(16.0),
            );
            ui.label(RichText::new(margin_text).color(text));
        });
}

fn answer(ui: &mut Ui, r: &LeafResult, units: UnitSystem) {
    ui.label(RichText::new("Least air speed for the limit minus the margin").strong());
    match &r.wind {
        Ok(a) => {
            ui.label(wind_sentence(a, units));
        }
        Err(e) => {
            crate::gui::fields::error_line(ui, &format!("Not answered: {e}"));
        }
    }
}

/// Draws the budget chart; returns true when "Export CSV…" was clicked.
fn budget(ui: &mut Ui, r: &LeafResult) -> bool {
    let export = Command::ExportCsv(PlotKind::Budget);
    let clicked = ui
        .horizontal(|ui| {
            ui.label(RichText::new("Energy budget").strong()).on_hover_text(
                "Per square metre of leaf (one side), both faces summed. The gains column and the losses column are equal when the balance closes. Sensible and latent heat count as gains when they flow into the leaf (warm air, dew).",
            );
            ui.with_layout(egui::Layout::right_to_left(egui::Align::Center), |ui| {
                ui.small_button(export.label())
                    .on_hover_text(export.tooltip())
                    .clicked()
            })
            .inner
        })
        .inner;
    let terms = budget_terms(r);
    let mut charts = Vec::new();
    let mut base = [0.0_f64, 0.0];
    for t in &terms {
        let i = usize::from(!t.gain);
        let bar = Bar::new(i as f64, t.w_m2)
            .base_offset(base[i])
            .width(0.6)
            .name(t.name)
            .fill(term_colour(t.name));
        base[i] += t.w_m2;
        charts.push(
            BarChart::new(t.name, vec![bar])
                .color(term_colour(t.name))
                .element_formatter(Box::new(|b, _| {
                    format!("{}: {} W/m²", b.name, fmt_num(b.value, 0))
                })),
        );
    }
    let top = base[0].max(base[1]);
    ui.horizontal(|ui| {
        Plot::new("energy-budget")
            .height(190.0)
            .width(150.0)
            .allow_drag(false)
            .allow_zoom(false)
            .allow_scroll(false)
            .allow_boxed_zoom(false)
            .show_grid([false, true])
            .include_y(0.0)
            .include_y(top * 1.05)
            .include_x(-0.5)
            .include_x(1.5)
            .y_axis_label("W/m²")
            .x_axis_formatter(|m, _| {
                if m.value.abs() < 1e-6 {
                    "gains".to_owned()
                } else if (m.value - 1.0).abs() < 1e-6 {
                    "losses".to_owned()
                } else {
                    String::new()
                }
            })
            .x_grid_spacer(|_| {
                vec![
                    egui_plot::GridMark {
                        value: 0.0,
                        step_size: 1.0,
                    },
                    egui_plot::GridMark {
                        value: 1.0,
                        step_size: 1.0,
                    },
                ]
            })
            .label_formatter(|_| None)
            .show(ui, |p| {
                for c in charts {
                    p.bar_chart(c);
                }
            });
        // The legend, with the values: gains first, then losses.
        ui.vertical(|ui| {
            Grid::new("budget-legend")
                .num_columns(3)
                .spacing([6.0, 4.0])
                .show(ui, |ui| {
                    for gain in [true, false] {
                        ui.label(RichText::new(if gain { "Gains" } else { "Losses" }).strong());
                        ui.label("");
                        ui.label("");
                        ui.end_row();
                        for t in terms.iter().filter(|t| t.gain == gain) {
                            let (rect, _) = ui
                                .allocate_exact_size(egui::vec2(12.0, 12.0), egui::Sense::hover());
                            ui.painter().rect_filled(rect, 2.0, term_colour(t.name));
                            ui.label(t.name);
                            ui.label(format!("{} W/m²", fmt_num(t.w_m2, 0)));
                            ui.end_row();
                        }
                    }
                });
        });
    });
    ui.label(
        RichText::new(format!(
            "Gains {} W/m² = losses {} W/m²; residual {} W/m².",
            fmt_num(base[0], 1),
            fmt_num(base[1], 1),
            fmt_sig(r.solution.solver.residual)
        ))
        .small(),
    );
    clicked
}

fn details(ui: &mut Ui, r: &LeafResult, units: UnitSystem) {
    let s = &r.solution;
    let t = &s.terms;
    let c = &t.convection;
    egui::CollapsingHeader::new(RichText::new("Why: conductances and flow").strong())
        .default_open(true)
        .show(ui, |ui| {
            Grid::new("result-details")
                .num_columns(2)
                .striped(true)
                .spacing([12.0, 3.0])
                .show(ui, |ui| {
                    let mut row = |name: &str, value: String, tip: &str| {
                        ui.label(name).on_hover_text(tip);
                        ui.label(value).on_hover_text(tip);
                        ui.end_row();
                    };
                    row(
                        "Convective heat transfer h",
                        format!("{} W/m²/K", fmt_num(c.heat_total_w_m2_k(), 1)),
                        "Boundary-layer heat-transfer coefficient, both faces summed. More air or a smaller leaf raises it.",
                    );
                    row(
                        "Radiative conductance",
                        format!("{} W/m²/K", fmt_num(s.radiative_conductance_w_m2_k, 1)),
                        "How strongly extra leaf warmth is shed as heat radiation, 2 · 4εσT³.",
                    );
                    row(
                        "Boundary-layer vapour cond.",
                        format!("{} mol/m²/s", fmt_num(c.vapour_total_mol_m2_s(), 3)),
                        "Conductance of the air layer next to the leaf for water vapour, both faces.",
                    );
                    row(
                        "Total vapour conductance",
                        format!("{} mol/m²/s", fmt_num(s.total_vapour_conductance_mol_m2_s(), 3)),
                        "Stomata and cuticle in series with the boundary layer, both faces.",
                    );
                    row(
                        "Transpiration",
                        format!("{} mmol/m²/s", fmt_num(mol_to_mmol(t.transpiration_mol_m2_s), 2)),
                        "Water lost by the leaf per unit area.",
                    );
                    row(
                        "Leaf-to-air VPD",
                        format!("{} kPa", fmt_num(s.leaf_vpd_kpa, 2)),
                        "Vapour-pressure difference between the leaf interior (saturated at leaf temperature) and the air.",
                    );
                    row(
                        "Reynolds number Re",
                        fmt_sig(c.reynolds),
                        "Re = U d / ν on the leaf size: how strongly the air stream forces heat away.",
                    );
                    row(
                        "Grashof number Gr",
                        fmt_sig(c.grashof),
                        "Gr on the leaf size: how strongly buoyancy (warm air rising off the leaf) drives heat away.",
                    );
                    row(
                        "Regime",
                        c.regime.description().to_owned(),
                        "Forced when Gr/Re² < 0.1, free when > 10, mixed between (common practice, no source).",
                    );
                    row(
                        "Boundary layer (99 %)",
                        s.bl_thickness_m
                            .map_or_else(|| "– (still air)".to_owned(), |d| Quantity::Thickness.format(d, units)),
                        "Velocity boundary-layer thickness at the trailing edge of the leaf.",
                    );
                    row(
                        "Equivalent still-air layer k/h",
                        s.effective_bl_thickness_m
                            .map_or_else(|| "–".to_owned(), |d| Quantity::Thickness.format(d, units)),
                        "The still-air layer that would conduct heat as the real boundary layer convects it, per face.",
                    );
                    row(
                        "Linearised estimate",
                        format!(
                            "{} (exact − linearised {})",
                            Quantity::Temperature.format(s.linearised.leaf_temp_c, units),
                            Quantity::TempDiff.format_with(s.linearisation_error_k(), units, 2)
                        ),
                        "The Penman–Monteith-type closed form (Campbell & Norman 1998, ch. 14) beside the exact solve.",
                    );
                    row(
                        "Sky or cover seen above",
                        Quantity::Temperature.format(s.above_radiant_temp_c, units),
                        "Radiant temperature of what the upper face sees.",
                    );
                });
        });
    let solver = &s.solver;
    ui.add_space(4.0);
    ui.label(
        RichText::new(format!(
            "Solver: {} iterations, residual {} W/m² — {}.",
            solver.iterations,
            fmt_sig(solver.residual),
            solver.status.sentence()
        ))
        .small()
        .weak(),
    );
}

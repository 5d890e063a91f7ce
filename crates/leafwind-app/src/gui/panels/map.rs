//! The wind × leaf size map: leaf temperature (or margin to the limit) over air speed and leaf
//! size, on log axes, with the limit lines, the current leaf and a hover read-out.

use egui::{
    Color32, ComboBox, Rect, RichText, Sense, TextureHandle, TextureOptions, Ui, pos2, vec2,
};
use egui_plot::{
    GridInput, GridMark, Legend, Line, LineStyle, MarkerShape, Plot, PlotImage, PlotPoint, Points,
};

use crate::document::{MapQuantity, ScenarioDocument};
use crate::gui::commands::{Command, PlotKind};
use crate::gui::compute::{LeafResult, MapResult, colour};
use crate::gui::panels::sweep::LIMIT_COLOUR;
use crate::units::{Quantity, UnitSystem, fmt_num};

/// State of the map panel: the texture of the last map.
#[derive(Default)]
pub struct MapPanel {
    texture: Option<TextureHandle>,
    /// Serial of the map result the texture shows (to upload only when it changes).
    shown: Option<u64>,
}

impl std::fmt::Debug for MapPanel {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("MapPanel")
            .field("shown", &self.shown)
            .finish()
    }
}

/// Grid marks at 1, 2, 5 × 10ⁿ *in the displayed unit* for an axis that plots log₁₀ of the SI
/// value (the speed and size conversions are pure scalings, so the marks stay evenly placed).
pub fn log_marks(q: Quantity, units: UnitSystem) -> impl Fn(GridInput) -> Vec<GridMark> {
    move |input: GridInput| {
        let (lo, hi) = input.bounds;
        // Display value = scale × SI value; in log space, an offset.
        let offset = q.to_display(1.0, units).log10();
        let (dlo, dhi) = (lo + offset, hi + offset);
        let mut marks = Vec::new();
        if !(dlo.is_finite() && dhi.is_finite()) {
            return marks;
        }
        let first = dlo.floor() as i32 - 1;
        let last = dhi.ceil() as i32 + 1;
        for n in first..=last {
            for k in [1.0_f64, 2.0, 5.0] {
                let v = (k * 10f64.powi(n)).log10() - offset;
                if v >= lo && v <= hi {
                    marks.push(GridMark {
                        value: v,
                        step_size: 1.0,
                    });
                }
            }
        }
        marks
    }
}

/// A tick label for a log₁₀ axis value, converted to display units.
fn log_label(log_v: f64, q: Quantity, units: UnitSystem) -> String {
    let v = q.to_display(10f64.powf(log_v), units);
    if !v.is_finite() {
        return String::new();
    }
    // Three significant figures, trailing zeros dropped: 0.05, 0.2, 1, 20, 500.
    let digits = (2 - v.abs().log10().floor() as i32).clamp(0, 6) as usize;
    let s = format!("{v:.digits$}");
    if s.contains('.') {
        s.trim_end_matches('0').trim_end_matches('.').to_owned()
    } else {
        s
    }
}

impl MapPanel {
    /// Draws the map.
    #[allow(clippy::too_many_lines)]
    pub fn ui(
        &mut self,
        ui: &mut Ui,
        map: Option<&MapResult>,
        status: Option<String>,
        doc: &ScenarioDocument,
        current: Option<&LeafResult>,
        units: UnitSystem,
    ) -> Vec<Command> {
        let mut commands = Vec::new();
        let mut edited = doc.clone();
        ui.horizontal_wrapped(|ui| {
            ui.label("Colour shows")
                .on_hover_text("What the colours of the map mean.");
            let name = |q: MapQuantity| match q {
                MapQuantity::LeafTemperature => "leaf temperature",
                MapQuantity::MarginToLimit => "margin to the limit (limit − leaf)",
            };
            let r = ComboBox::from_id_salt("map-quantity")
                .selected_text(name(edited.map.quantity))
                .show_ui(ui, |ui| {
                    for q in [MapQuantity::LeafTemperature, MapQuantity::MarginToLimit] {
                        ui.selectable_value(&mut edited.map.quantity, q, name(q));
                    }
                });
            crate::gui::fields::name_widget(ui, &r.response, "Colour shows");
            ui.separator();
            let sp = Quantity::Speed;
            let sz = Quantity::LeafSize;
            let range = |ui: &mut Ui,
                         q: Quantity,
                         lo: &mut f64,
                         hi: &mut f64,
                         valid: (f64, f64),
                         name: &str| {
                let mut a = q.to_display(*lo, units);
                let mut b = q.to_display(*hi, units);
                let span = (q.to_display(valid.0, units), q.to_display(valid.1, units));
                let unit = format!(" {}", q.unit(units));
                let (speed_a, speed_b, b_half, a_twice) = (a * 0.02, b * 0.02, b * 0.5, a * 2.0);
                let ra = ui.add(
                    egui::DragValue::new(&mut a)
                        .range(span.0..=b_half)
                        .speed(speed_a)
                        .max_decimals(q.decimals(units) + 2),
                );
                crate::gui::fields::name_widget(ui, &ra, &format!("{name} from"));
                ui.label("to");
                let rb = ui.add(
                    egui::DragValue::new(&mut b)
                        .range(a_twice..=span.1)
                        .speed(speed_b)
                        .max_decimals(q.decimals(units) + 2)
                        .suffix(unit),
                );
                crate::gui::fields::name_widget(ui, &rb, &format!("{name} to"));
                if ra.changed() || rb.changed() {
                    *lo = q.from_display(a, units).clamp(valid.0, valid.1);
                    *hi = q.from_display(b, units).clamp(valid.0, valid.1);
                }
            };
            ui.label("Speeds")
                .on_hover_text("Range of the air-speed axis (log scale).");
            range(
                ui,
                sp,
                &mut edited.map.speed_min_m_s,
                &mut edited.map.speed_max_m_s,
                (0.01, 30.0),
                "Speeds",
            );
            ui.label("sizes")
                .on_hover_text("Range of the leaf-size axis (log scale).");
            range(
                ui,
                sz,
                &mut edited.map.size_min_m,
                &mut edited.map.size_max_m,
                (0.001, 1.0),
                "Sizes",
            );
            let export = Command::ExportCsv(PlotKind::Map);
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
        if edited != *doc {
            commands.push(Command::Edit(Box::new(edited)));
        }
        let Some(map) = map else {
            ui.label("Computing the map…");
            return commands;
        };
        // Upload the picture when a new map arrived.
        let key = map.serial;
        if self.shown != Some(key) || self.texture.is_none() {
            let opts = TextureOptions::LINEAR;
            match &mut self.texture {
                Some(t) => t.set(map.image.clone(), opts),
                None => {
                    self.texture = Some(ui.ctx().load_texture(
                        "leafwind-map",
                        map.image.clone(),
                        opts,
                    ));
                }
            }
            self.shown = Some(key);
        }
        let Some(texture) = &self.texture else {
            return commands;
        };
        let sp = Quantity::Speed;
        let sz = Quantity::LeafSize;
        let tq = Quantity::Temperature;
        let dq = Quantity::TempDiff;
        let x0 = map.speeds_m_s[0].log10();
        let x1 = map.speeds_m_s[map.speeds_m_s.len() - 1].log10();
        let y0 = map.sizes_m[0].log10();
        let y1 = map.sizes_m[map.sizes_m.len() - 1].log10();
        let colourbar_width = 70.0;
        let plot_width = (ui.available_width() - colourbar_width - 8.0).max(200.0);
        let height = ui.available_height().max(200.0);
        let quantity = map.input.quantity;
        let limit_c = map.input.limit_c;
        ui.horizontal(|ui| {
            Plot::new("wind-size-map")
                .width(plot_width)
                .height(height)
                .legend(
                    Legend::default()
                        .follow_insertion_order(true)
                        .position(egui_plot::Corner::LeftTop),
                )
                .x_axis_label(format!(
                    "Air speed over the leaf [{}] (log scale)",
                    sp.unit(units)
                ))
                .y_axis_label(format!(
                    "Leaf size along the wind [{}] (log scale)",
                    sz.unit(units)
                ))
                .x_grid_spacer(log_marks(sp, units))
                .y_grid_spacer(log_marks(sz, units))
                .x_axis_formatter(move |m, _| log_label(m.value, sp, units))
                .y_axis_formatter(move |m, _| log_label(m.value, sz, units))
                .include_x(x0)
                .include_x(x1)
                .include_y(y0)
                .include_y(y1)
                .set_margin_fraction(vec2(0.0, 0.0))
                .show_grid(false)
                .label_formatter(move |pos| {
                    let p = match pos {
                        egui_plot::HoverPosition::NearDataPoint { position, .. }
                        | egui_plot::HoverPosition::Elsewhere { position } => *position,
                    };
                    let (u, d) = (10f64.powf(p.x), 10f64.powf(p.y));
                    let head = format!(
                        "{} {}, leaf {} {}",
                        fmt_num(sp.to_display(u, units), sp.decimals(units)),
                        sp.unit(units),
                        fmt_num(sz.to_display(d, units), sz.decimals(units) + 1),
                        sz.unit(units)
                    );
                    Some(match map.lookup(u, d) {
                        Some(t) => format!(
                            "{head}\nleaf {}\nlimit − leaf {}",
                            tq.format(t, units),
                            dq.format(limit_c - t, units)
                        ),
                        None => head,
                    })
                })
                .show(ui, |p| {
                    p.image(PlotImage::new(
                        "",
                        texture.id(),
                        PlotPoint::new(0.5 * (x0 + x1), 0.5 * (y0 + y1)),
                        vec2((x1 - x0) as f32, (y1 - y0) as f32),
                    ));
                    let limit_name = format!("at the limit {}", tq.format(limit_c, units));
                    for line in &map.limit_lines {
                        p.line(
                            Line::new(limit_name.clone(), line.clone())
                                .color(LIMIT_COLOUR)
                                .width(2.5),
                        );
                    }
                    for line in &map.margin_lines {
                        p.line(
                            Line::new("at limit − margin", line.clone())
                                .color(Color32::BLACK)
                                .style(LineStyle::dashed_loose())
                                .width(1.8),
                        );
                    }
                    if let Some(r) = current {
                        let u = r.case.air.speed_m_s.max(1e-6).log10();
                        let d = r.case.leaf.dimension_m.log10();
                        p.points(
                            Points::new("current leaf", vec![[u, d]])
                                .shape(MarkerShape::Circle)
                                .radius(7.0)
                                .color(Color32::WHITE)
                                .filled(false),
                        );
                        p.points(
                            Points::new("current leaf", vec![[u, d]])
                                .shape(MarkerShape::Cross)
                                .radius(7.0)
                                .color(Color32::BLACK),
                        );
                    }
                });
            colour_bar(ui, map, quantity, units, colourbar_width, height);
        });
        commands
    }
}

fn colour_bar(
    ui: &mut Ui,
    map: &MapResult,
    quantity: MapQuantity,
    units: UnitSystem,
    width: f32,
    height: f32,
) {
    let (rect, _) = ui.allocate_exact_size(vec2(width, height), Sense::hover());
    let painter = ui.painter_at(rect);
    let (lo, hi) = map.scale;
    let bar = Rect::from_min_max(
        pos2(rect.left() + 4.0, rect.top() + 24.0),
        pos2(rect.left() + 20.0, rect.bottom() - 40.0),
    );
    let n = 64;
    for i in 0..n {
        let f0 = i as f32 / n as f32;
        let f1 = (i + 1) as f32 / n as f32;
        let v = lo + (hi - lo) * f64::from(1.0 - (f0 + f1) * 0.5);
        let r = Rect::from_min_max(
            pos2(bar.left(), bar.top() + f0 * bar.height()),
            pos2(bar.right(), bar.top() + f1 * bar.height()),
        );
        painter.rect_filled(r, 0.0, colour(v, lo, hi, quantity));
    }
    let (q, title) = match quantity {
        MapQuantity::LeafTemperature => (Quantity::Temperature, "leaf"),
        MapQuantity::MarginToLimit => (Quantity::TempDiff, "limit − leaf"),
    };
    let text_colour = ui.visuals().text_color();
    let font = egui::FontId::proportional(11.0);
    painter.text(
        pos2(rect.left() + 2.0, rect.top() + 4.0),
        egui::Align2::LEFT_TOP,
        format!("{title} [{}]", q.unit(units)),
        font.clone(),
        text_colour,
    );
    for k in 0..=4 {
        let f = k as f32 / 4.0;
        let v = hi - (hi - lo) * f64::from(f);
        painter.text(
            pos2(bar.right() + 4.0, bar.top() + f * bar.height()),
            egui::Align2::LEFT_CENTER,
            fmt_num(q.to_display(v, units), 1),
            font.clone(),
            text_colour,
        );
    }
}

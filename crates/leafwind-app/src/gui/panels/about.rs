//! About and cautions: what Leafwind computes, from which sources, and where its answers stop.

use egui::{RichText, Window};

/// The short cautions line shown in the footer of the window.
pub const CAUTIONS: &str = "Estimates from physics and typical parameters. Crop decisions and fan or electrical installations defer to local codes, licensed electricians and agronomists.";

/// State of the About window.
#[derive(Debug, Clone, Default)]
pub struct AboutPanel {
    /// Whether the window is open.
    pub open: bool,
}

impl AboutPanel {
    /// Shows the About window while open.
    pub fn window(&mut self, ctx: &egui::Context) {
        let mut open = self.open;
        Window::new("About Leafwind")
            .open(&mut open)
            .collapsible(false)
            .resizable(true)
            .default_width(520.0)
            .show(ctx, |ui| {
                ui.label(RichText::new("Leafwind").heading());
                ui.label(format!("Version {}", env!("CARGO_PKG_VERSION")));
                ui.add_space(6.0);
                ui.label("Leafwind solves the steady energy balance of a single flat leaf: sunlight and heat radiation absorbed, heat radiation emitted, sensible heat carried off by the air and latent heat of transpiration. It shows how hot the leaf runs, why, and what air speed or leaf size would change that.");
                ui.add_space(6.0);
                ui.label(RichText::new("Sources").strong());
                ui.label("Campbell & Norman 1998, An Introduction to Environmental Biophysics, 2nd ed. (leaf energy balance, conductances); Incropera et al. 2007, Fundamentals of Heat and Mass Transfer, 6th ed. (flat-plate convection); Schlichting & Gersten 2017, Boundary-Layer Theory, 9th ed. (Blasius layer); Allen et al. 1998, FAO-56 (humidity, pressure); Brutsaert 1975 (clear-sky radiation). Each input's tooltip names where its default comes from.");
                ui.add_space(6.0);
                ui.label(RichText::new("Cautions").strong());
                ui.label(CAUTIONS);
                ui.label("A single leaf in steady conditions is a simplification: real leaves flutter, shade one another, and see sun that changes by the minute. Use the margin for that. Heat limits depend on the crop, its stage and the duration of exposure — ask an agronomist. Fans, their wiring and their guards must follow local codes and be installed by licensed electricians.");
            });
        self.open = open;
    }
}

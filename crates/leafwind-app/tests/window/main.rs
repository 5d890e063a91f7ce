//! The window tests (egui_kittest on the accessibility tree, no GPU), one test binary: each
//! module is one part of the window. One binary links the GUI stack once instead of once per file.

mod canopy_fans;
mod files;
mod files_safety;
mod inputs;
mod properties;
mod shape_compare;
mod support;
mod worker;

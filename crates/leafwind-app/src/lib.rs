//! # leafwind-app
//!
//! The `leafwind` desktop app and its headless subcommands, over `leafwind-physics`.
//!
//! | module | what it owns |
//! |---|---|
//! | [`cli`] | argument parsing and the headless subcommands |
//! | [`output`] | flat, unit-named records of engine results for JSON and CSV |
//! | [`gui`] | the eframe window: document, panels, plots |

pub mod canopy_scenario;
pub mod cli;
pub mod fans_scenario;
pub mod gui;
pub mod output;
pub mod report;
pub mod shape_scenario;

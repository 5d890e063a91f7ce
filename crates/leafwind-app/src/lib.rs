//! # leafwind-app
//!
//! The `leafwind` desktop app and its headless subcommands, over `leafwind-physics`.
//!
//! | module | what it owns |
//! |---|---|
//! | [`cli`] | argument parsing and the headless subcommands |
//! | [`output`] | flat, unit-named records of engine results for JSON and CSV |
//! | [`document`] | the scenario document (saved, RON), its examples and migration |
//! | [`file_safety`] | atomic saves, on-disk stamps, range check with field paths |
//! | [`units`] | SI ↔ imperial for every number shown or exported |
//! | [`canopy_scenario`], [`fans_scenario`], [`shape_scenario`] | the document's optional sections and their runs |
//! | [`report`] | the grower report (HTML + CSV) |
//! | [`words`] | the canopy answers in sentences, in the user's units |
//! | [`gui`] | the eframe window: panels, plots, background work |
//!
//! Everything but [`gui`] is free of drawing code; the commands and the report use it as the
//! window does.

pub mod canopy_scenario;
pub mod cli;
pub mod document;
pub mod fans_scenario;
pub mod file_safety;
pub mod gui;
pub mod output;
pub mod report;
pub mod shape_scenario;
pub mod units;
pub mod words;

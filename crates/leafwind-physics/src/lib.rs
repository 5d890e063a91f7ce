//! # leafwind-physics
//!
//! The steady energy balance of a leaf in moving air: how hot a leaf runs in the sun, why, and what
//! air speed or leaf size changes that. Pure functions, one module per physical process, each
//! documented with its equation, units and published source; component types that carry a case's
//! fields; and an orchestrator ([`energy_balance`]) that solves it exactly.
//!
//! | module | process |
//! |---|---|
//! | [`constants`] | physical constants, once, with their sources |
//! | [`air`] | moist-air properties, humidity conversions, pressure |
//! | [`convection`] | forced, free and mixed convection of a flat leaf |
//! | [`boundary_layer`] | numerical Blasius solution, thicknesses, wall shear |
//! | [`radiation`] | shortwave and longwave exchange |
//! | [`transpiration`] | stomatal, cuticular and boundary-layer vapour paths |
//! | [`case`] | the component types of a leaf case and their valid ranges |
//! | [`energy_balance`] | the exact solve and the linearised form |
//! | [`required_wind`] | the least air speed for a temperature limit |
//! | [`solver`] | bracketed safeguarded Newton and its report |
//! | [`grid`] | leaf temperature over a wind × size grid |
//! | [`shape`] | leaf outlines, effective dimension, cylinders and spheres |
//! | [`canopy`] | Beer's-law layers, sunlit and shaded leaves, the hottest leaf |
//! | [`sun`] | sun position, clear-sky shortwave, beam/diffuse split |
//! | [`greenhouse`] | cover, shade and the steady ventilation balance; sizing answers |
//! | [`ventilation`] | the least ventilation rate; the standard's factor method |
//! | [`crops`] | crop heat limits |
//! | [`design_day`], [`weather`] | hourly design days and weather files |
//! | [`heat_rules`] | rules with durations ("3 h above 40 °C on two days") over a series |
//! | [`fans`], [`condensation`], [`cooling`] | air from fans, night dew, cooling options |
//!
//! Units: SI inside (K for absolute temperatures in formulas, °C at the component boundary, K for
//! temperature differences, named `_diff_k`); every name carries its unit.
//!
//! No GUI, windowing or file-dialog dependency may ever enter this crate.

pub mod air;
pub mod boundary_layer;
pub mod case;
pub mod constants;
pub mod convection;
pub mod energy_balance;
pub mod error;
pub mod grid;
pub mod radiation;
pub mod required_wind;
pub mod shape;
pub mod solver;
pub mod transpiration;
// Canopy, sun, greenhouse, crop limits and time series.
pub mod canopy;
pub mod crops;
pub mod design_day;
pub mod greenhouse;
pub mod heat_rules;
pub mod sun;
pub mod ventilation;
pub mod weather;
// Air movement, night condensation and cooling options.
pub mod condensation;
pub mod cooling;
pub mod fans;

pub use air::Humidity;
pub use case::{Air, Leaf, LeafCase, Surroundings};
pub use energy_balance::{LeafSolution, PreparedLeaf, leaf_temp_c, solve_leaf};
pub use error::{PhysicsError, Result};
pub use radiation::UpperView;
pub use required_wind::{WindAnswer, required_wind};

//! One panel per file; each owns its display state and returns commands.

pub mod about;
pub mod boundary;
pub mod inputs;
pub mod map;
pub mod result;
pub mod sweep;

//! One panel per file; each owns its display state and returns commands.

pub mod about;
pub mod boundary;
pub mod canopy;
pub mod compare;
pub mod fans;
pub mod file_prompt;
pub mod inputs;
pub mod map;
pub mod result;
pub mod shape;
pub mod sweep;

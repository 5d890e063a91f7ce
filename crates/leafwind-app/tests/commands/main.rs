//! The headless commands (`leafwind solve`, `shape`, `canopy`, `fans`), one test binary with a
//! module per command.

mod canopy;
mod fans;
mod shape;
mod solve;
mod support;

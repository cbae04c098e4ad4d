//! wherefore: measures spatial relations between labelled regions, reasons over OWL 2
//! knowledge with its own tableau, explains observations by abduction and renders drafts.
//!
//! The library is layered as DEVELOPERS.md describes; `main.rs` is a thin shell over it.

pub mod check;
pub mod cli;
pub mod demo;
pub mod explain;
pub mod facts;
pub mod files;
pub mod kb;
pub mod reasoner;
pub mod render;
pub mod shell;
pub mod spatial;

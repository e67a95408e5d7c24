//! Output formats: the package as bytes.
//!
//! Renderers never compute engineering values; they only present what the
//! earlier stages recorded.

pub mod context;
pub mod pdf;
pub mod svg;
pub mod templates;

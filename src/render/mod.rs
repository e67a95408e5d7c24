//! Output formats for [`crate::drawing::Drawing`] figures.

pub mod svg;

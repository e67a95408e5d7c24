//! Knuckle compiles a declarative pressure-vessel case file into a traceable
//! calculation package.
//!
//! The pipeline, one module a stage (see `DEVELOPERS.md` for the code map):
//!
//! | stage | type | module |
//! |---|---|---|
//! | case file text | [`case::CaseFile`] | [`case`] |
//! | validated design | [`model::Design`] | [`model`] |
//! | rules of a design code | [`rules::Calculation`] | [`rules`], [`calc`] |
//! | results JSON | `serde_json::Value` | [`results`] |
//! | package (digest, manifest) | [`package::Package`] | [`package`] |
//! | Markdown, PDF, SVG | bytes | [`render`] |
//! | figures | [`drawing::Drawing`] | [`drawing`] |
//!
//! Beside the stages: [`materials`] (library files and their stress tables,
//! read through [`pipeline::SourceLoader`]), [`joints`] (Table UW-12) and
//! [`stock`] (commercial plate and pipe thicknesses).

pub mod archive;
pub mod calc;
pub mod case;
pub mod cautions;
pub mod cli;
pub mod diag;
pub mod diff;
pub mod drawing;
pub mod expr;
pub mod fsio;
pub mod geometry;
pub mod inspection;
pub mod joints;
pub mod materials;
pub mod model;
pub mod package;
pub mod pipeline;
pub mod render;
pub mod results;
pub mod rules;
pub mod signing;
pub mod stock;
pub mod units;

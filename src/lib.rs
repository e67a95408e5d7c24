//! Knuckle compiles a declarative pressure-vessel case file into a traceable
//! calculation package.
//!
//! The pipeline, one module a stage (see `DEVELOPERS.md` for the code map):
//!
//! | stage | type | module |
//! |---|---|---|
//! | case file text | [`case::CaseFile`] | [`case`] |
//! | validated design | [`model::Design`] | [`model`] |
//! | rules of a design code | [`calc::Calculation`] | [`rules`], [`calc`] |
//! | figures | [`drawing::Drawing`] | [`drawing`] |

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
pub mod model;
pub mod package;
pub mod pipeline;
pub mod results;
pub mod rules;
pub mod signing;
pub mod units;

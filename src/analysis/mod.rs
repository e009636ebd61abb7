//! Analysis of models: responses, deviations, crossing frequencies.
//!
//! In: analog and digital models. Out: plain numbers and point lists for reports,
//! plots and checks. Nothing here changes a model.

pub mod measure;
pub mod response;

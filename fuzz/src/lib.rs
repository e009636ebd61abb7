//! The byte-driven harness the fuzz targets share with the test that replays their
//! crash inputs (tests/fuzz_regressions.rs), compiled from the one source file.

#[path = "../../tests/common/harness.rs"]
pub mod harness;

//! Fuzz target: see `harness::circuit` in tests/common/harness.rs.

#![no_main]

libfuzzer_sys::fuzz_target!(|data: &[u8]| {
    let _ = tonewright_fuzz::harness::circuit(data);
});

//! Helpers shared by the integration tests.

use num_complex::Complex64;
use tonewright::analog::AnalogSection;

/// Asserts |got − want| ≤ atol + rtol·|want|, naming the quantity on failure.
#[track_caller]
pub fn assert_close(what: &str, got: f64, want: f64, rtol: f64, atol: f64) {
    let err = (got - want).abs();
    assert!(
        err <= atol + rtol * want.abs(),
        "{what}: got {got:e}, want {want:e}, error {err:e} (rtol {rtol:e}, atol {atol:e})"
    );
}

/// H(j·2π·hz) of a cascade of analog sections.
pub fn response(sections: &[AnalogSection], hz: f64) -> Complex64 {
    let s = Complex64::new(0.0, 2.0 * std::f64::consts::PI * hz);
    sections.iter().map(|x| x.eval(s)).product()
}

/// 20·log10|H| of a cascade at `hz`.
pub fn db(sections: &[AnalogSection], hz: f64) -> f64 {
    20.0 * response(sections, hz).norm().log10()
}

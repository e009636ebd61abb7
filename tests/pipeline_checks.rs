//! Checks of the whole front half (design file → analog model → bilinear → sections)
//! against facts from outside the project. Each check names its source.

use num_complex::Complex64;
use proptest::prelude::*;
use std::f64::consts::PI;
use tonewright::analog::AnalogSection;
use tonewright::analysis::response::{analog_point, crossings};
use tonewright::design::{self, Scaling};
use tonewright::discretize::{bilinear, prewarp_constant, Prewarp};
use tonewright::pipeline::port;
use tonewright::sections;

fn port_of(text: &str, rate: f64) -> tonewright::pipeline::Port {
    let d = design::parse("check.toml", text, text.as_bytes()).unwrap();
    port(d, &[], rate).unwrap()
}

fn minus_3db(p: &tonewright::pipeline::Port, lo: f64, hi: f64) -> Vec<f64> {
    let dc = analog_point(&p.analog.zpk, 0.0).db;
    crossings(|f| analog_point(&p.analog.zpk, f).db, dc - 10.0 * 2f64.log10(), lo, hi)
}

#[test]
fn buffered_identical_first_order_lowpasses_move_the_corner_inward() {
    // Textbook, common practice: n buffered identical first-order low-passes have their
    // −3 dB point at fc·√(2^(1/n) − 1) (n = 2: 0.6436·fc, n = 3: 0.5098·fc).
    for n in 1..=4 {
        let stage = "[[stage]]\nkind = \"lowpass\"\norder = 1\nfreq = 1000\n\n";
        let p = port_of(&stage.repeat(n), 48000.0);
        let f3 = minus_3db(&p, 1.0, 20000.0);
        let want = 1000.0 * (2f64.powf(1.0 / n as f64) - 1.0).sqrt();
        assert_eq!(f3.len(), 1);
        assert!((f3[0] - want).abs() < 1e-6 * want, "n={n}: {} vs {want}", f3[0]);
        // Each stage adds −45° at its own corner (textbook): n stages give −45·n°.
        let phase = analog_point(&p.analog.zpk, 1000.0).phase_deg;
        let wrapped = ((-45.0 * n as f64 + 180.0).rem_euclid(360.0)) - 180.0;
        assert!((phase - wrapped).abs() < 1e-9, "n={n}: phase {phase}");
    }
}

#[test]
fn unbuffered_rc_pair_has_its_corner_at_0_374_over_rc() {
    // Textbook, from memory: two identical unbuffered RC sections give
    // H(s) = 1/(s²R²C² + 3sRC + 1), −3 dB at ω ≈ 0.374/RC (0.644/RC buffered).
    let (r, c) = (10e3, 10e-9);
    let text = r#"
[[stage]]
kind = "circuit"
parts = [
  { r = "10k", nodes = ["in", "a"] },
  { c = "10n", nodes = ["a", "gnd"] },
  { r = "10k", nodes = ["a", "out"] },
  { c = "10n", nodes = ["out", "gnd"] },
]
"#;
    let p = port_of(text, 48000.0);
    let f3 = minus_3db(&p, 1.0, 20000.0);
    let w3 = 2.0 * PI * f3[0] * r * c;
    // The exact root of |H|² = 1/2 for the closed form is ω·RC = 0.3742 (4 digits).
    assert!((w3 - 0.3742).abs() < 5e-5, "ω·RC = {w3}");
    for f in [50.0, 500.0, 1591.5, 7000.0] {
        let s = Complex64::new(0.0, 2.0 * PI * f);
        let closed = 1.0 / (s * s * (r * c).powi(2) + s * 3.0 * r * c + 1.0);
        let got = p.analog.zpk.eval(s);
        assert!((got - closed).norm() < 1e-9 * closed.norm(), "{f} Hz");
    }
}

const LP_PLUS_HP: &str = r#"
[[stage]]
kind = "sum"
paths = ["low", "high"]

[[path.low]]
kind = "lowpass"
order = 1
freq = LOW

[[path.high]]
kind = "highpass"
order = 1
freq = HIGH
"#;

#[test]
fn lowpass_plus_highpass_at_one_corner_sums_flat() {
    // Common practice: w/(s+w) + s/(s+w) = 1 at every frequency.
    let p = port_of(&LP_PLUS_HP.replace("LOW", "800").replace("HIGH", "800"), 48000.0);
    for f in [10.0, 100.0, 800.0, 5000.0, 20000.0] {
        assert!(analog_point(&p.analog.zpk, f).db.abs() < 1e-9, "{f} Hz");
    }
    assert!(p.analog.zpk.poles.is_empty(), "the common pole cancels");
}

#[test]
fn lowpass_below_highpass_sums_to_a_band_reject_of_the_closed_form_depth() {
    // Common practice: with w1 < w2, w1/(s+w1) + s/(s+w2) dips at √(w1·w2) to
    // 2·w1/(w1 + w2) (derived from the two first-order sections in a line of algebra).
    let (f1, f2) = (300.0f64, 3000.0f64);
    let p = port_of(&LP_PLUS_HP.replace("LOW", "300").replace("HIGH", "3000"), 48000.0);
    let centre = (f1 * f2).sqrt();
    let depth = analog_point(&p.analog.zpk, centre).db;
    let want = 20.0 * (2.0 * f1 / (f1 + f2)).log10();
    assert!((depth - want).abs() < 1e-9, "{depth} vs {want}");
    // Far outside the band the sum returns to 0 dB (within 0.2 dB at 10 Hz and 20 kHz).
    assert!(analog_point(&p.analog.zpk, 10.0).db.abs() < 0.2);
    assert!(analog_point(&p.analog.zpk, 20000.0).db.abs() < 0.2);
}

/// |H_d(e^{jω}) − H_a(j·K·tan(ω/2))| over the band, relative to the peak magnitude.
fn bilinear_identity_error(sections: &[AnalogSection], rate: f64, fp: f64) -> f64 {
    let d = bilinear(sections, rate, Prewarp::AtHz(fp)).unwrap();
    let cascade = sections::build(&d.zpk, Scaling::Linf);
    let k = prewarp_constant(fp, rate);
    let grid = tonewright::analysis::response::log_grid(1.0, 0.49 * rate, 400);
    let analog = |f: f64| {
        let w = 2.0 * PI * f / rate;
        let s = Complex64::new(0.0, k * (w / 2.0).tan());
        sections.iter().map(|x| x.eval(s)).product::<Complex64>()
    };
    let peak = grid.iter().map(|&f| analog(f).norm()).fold(0.0, f64::max);
    grid.iter()
        .map(|&f| {
            let a = analog(f);
            (d.zpk.response_at_hz(f) - a).norm().max((cascade.response_at_hz(f) - a).norm())
        })
        .fold(0.0, f64::max)
        / peak
}

#[test]
fn bilinear_identity_holds_for_every_demo_design() {
    // Oppenheim & Schafer, DTSP 3rd ed., 7.2: with one prewarp frequency the digital
    // response is the analog one at Ω = K·tan(ω/2), K = 2π·fp / tan(π·fp/rate).
    for entry in std::fs::read_dir("audio-demos").unwrap() {
        let path = entry.unwrap().path();
        if path.extension().and_then(|e| e.to_str()) != Some("toml") {
            continue;
        }
        let d = design::load(&path).unwrap();
        let p = port(d, &[], 48000.0).unwrap();
        for fp in [100.0, 1000.0, 10000.0] {
            let e = bilinear_identity_error(&p.analog.sections(), 48000.0, fp);
            assert!(e < 1e-9, "{}: prewarp {fp} Hz: error {e:e}", path.display());
        }
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(64))]
    #[test]
    fn bilinear_identity_holds_for_random_stable_designs(
        poles in prop::collection::vec((20.0f64..15000.0, 0.3f64..8.0), 1..5),
        zeros in prop::collection::vec((20.0f64..15000.0, -1.0f64..1.0), 0..5),
        rate in prop::sample::select(vec![44100.0, 48000.0, 96000.0]),
        fp in 50.0f64..15000.0,
    ) {
        // Random second-order factors: poles from (f0, Q), zeros on or near the jω axis.
        let sections: Vec<AnalogSection> = poles.iter().enumerate().map(|(i, &(f0, q))| {
            let w = 2.0 * PI * f0;
            let num = match zeros.get(i) {
                Some(&(fz, damp)) => { let wz = 2.0 * PI * fz; [wz * wz, damp.abs() * wz, 1.0] }
                None => [w * w, 0.0, 0.0],
            };
            AnalogSection::new(num, [w * w, w / q, 1.0])
        }).collect();
        let e = bilinear_identity_error(&sections, rate, fp);
        prop_assert!(e < 1e-9, "error {e:e}");
    }
}

/// One random stage of a design file whose analog poles are all in the left half-plane
/// (parametric sections with positive Q, classic families), without its `freq` line,
/// and that frequency as a fraction of Nyquist, from 1e-4 (poles a hair from z = 1) to
/// 0.98.
fn stable_stage() -> impl Strategy<Value = (String, f64)> {
    let q = (-1.0f64..2.0).prop_map(|e| 10f64.powf(e));
    let parametric = (
        prop::sample::select(vec![
            "lowpass",
            "highpass",
            "bandpass",
            "notch",
            "allpass",
            "peak",
            "lowshelf",
            "highshelf",
        ]),
        q,
        -40.0f64..40.0,
    )
        .prop_map(|(kind, q, g)| {
            let gain = if matches!(kind, "peak" | "lowshelf" | "highshelf") {
                format!("gain_db = {g}\n")
            } else {
                String::new()
            };
            format!("kind = \"{kind}\"\nq = {q}\n{gain}")
        });
    let family = (
        prop::sample::select(vec!["butterworth", "bessel", "chebyshev", "linkwitz-riley"]),
        1usize..=8,
        prop::sample::select(vec!["lowpass", "highpass"]),
        0.01f64..3.0,
    )
        .prop_map(|(family, order, band, ripple)| {
            let order = if family == "linkwitz-riley" { 2 * order.div_ceil(2) } else { order };
            let ripple = if family == "chebyshev" {
                format!("ripple_db = {ripple}\n")
            } else {
                String::new()
            };
            format!(
                "kind = \"prototype\"\nfamily = \"{family}\"\norder = {order}\nband = \"{band}\"\n\
                 {ripple}"
            )
        });
    (prop_oneof![parametric, family], (-4.0f64..-0.01).prop_map(|e| 10f64.powf(e)))
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(96))]
    #[test]
    fn random_stable_analog_designs_give_stable_finite_digital_sections(
        stages in prop::collection::vec(stable_stage(), 1..5),
        rate in prop::sample::select(vec![8000u32, 44100, 48000, 96000, 192_000, 384_000]),
        prewarp in prop::sample::select(vec!["each", "none"]),
        scaling in prop::sample::select(vec!["none", "linf", "l2", "l1"]),
    ) {
        // The bilinear transform maps the open left half-plane into the open unit disc
        // (Oppenheim & Schafer, Discrete-Time Signal Processing, 3rd ed., sec. 7.2), so
        // every pole of every section must have |z| < 1.
        let nyquist = f64::from(rate) / 2.0;
        let body: String = stages
            .iter()
            .map(|(stage, fraction)| format!("[[stage]]\n{stage}freq = {}\n\n", fraction * nyquist))
            .collect();
        let text = format!("[target]\nprewarp = \"{prewarp}\"\nscaling = \"{scaling}\"\n\n{body}");
        let d = design::parse("random.toml", &text, text.as_bytes()).unwrap();
        let p = port(d, &[], f64::from(rate)).unwrap();
        for s in &p.cascade.sections {
            prop_assert!(s.b.iter().chain(&s.a).all(|c| c.is_finite()), "{s:?}\n{text}");
        }
        let radius = sections::max_pole_radius(&p.cascade.sections);
        prop_assert!(radius < 1.0, "pole radius {radius}\n{text}");
    }
}

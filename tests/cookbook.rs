//! Parametric stages against the audio EQ cookbook (through the `biquad` crate) and
//! the textbook levels of first-order stages.

mod common;

use biquad::{Coefficients, Hertz, Type};
use common::{assert_close, assert_input_error, db, response};
use num_complex::Complex64;
use tonewright::analog::parametric::{parametric, Shape};
use tonewright::analog::{poly, AnalogSection};
use tonewright::discretize::{bilinear, Prewarp};

const FREQS: [f64; 5] = [30.0, 200.0, 1000.0, 5000.0, 15000.0];
const QS: [f64; 4] = [0.3, 0.707, 2.0, 8.0];
const GAINS: [f64; 4] = [-12.0, -3.0, 3.0, 12.0];
const RATES: [f64; 3] = [44100.0, 48000.0, 96000.0];

/// b0 b1 b2 a1 a2 (a0 = 1) of one section discretized with prewarp at its f0; the
/// digital zpk is gain·Π(z − zero)/Π(z − pole), so b = gain·(monic zero polynomial).
fn digital(section: &AnalogSection, rate: f64) -> [f64; 5] {
    let d = bilinear(std::slice::from_ref(section), rate, Prewarp::Each).unwrap();
    assert_eq!(d.prewarp_hz, vec![Some(section.natural_hz)]);
    // Ascending in z; read backwards it is 1, c1, c2 in powers of z⁻¹.
    let desc = |roots: &[Complex64]| {
        let mut c = poly::from_roots(roots);
        c.reverse();
        c.resize(3, 0.0);
        c
    };
    let (b, a) = (desc(&d.zpk.zeros), desc(&d.zpk.poles));
    let g = d.zpk.gain;
    [g * b[0], g * b[1], g * b[2], a[1], a[2]]
}

/// The `biquad` type for a gain in dB (ignored by the shapes without gain).
type CookbookType = fn(f64) -> Type<f64>;

fn coefficients(c: &Coefficients<f64>) -> [f64; 5] {
    [c.b0, c.b1, c.b2, c.a1, c.a2]
}

fn reference(kind: Type<f64>, rate: f64, f0: f64, q: f64) -> [f64; 5] {
    let (fs, f0) = (Hertz::from_hz(rate).unwrap(), Hertz::from_hz(f0).unwrap());
    coefficients(&Coefficients::<f64>::from_params(kind, fs, f0, q).unwrap())
}

#[test]
fn second_order_shapes_are_the_cookbook_biquads() {
    // R. Bristow-Johnson, "Cookbook formulae for audio EQ biquad filter coefficients",
    // as implemented by the `biquad` crate 0.6 (`Coefficients::from_params`). Its
    // BandPass is the cookbook's constant-skirt form (peak gain Q), which is Q times
    // our constant 0 dB peak form. Tolerance 1e-12 absolute on coefficients of order 1
    // (|a1| < 2): two f64 evaluations of the same closed form through different routes.
    let shapes: [(Shape, CookbookType, bool); 8] = [
        (Shape::Lowpass, |_| Type::LowPass, false),
        (Shape::Highpass, |_| Type::HighPass, false),
        (Shape::Bandpass, |_| Type::BandPass, false),
        (Shape::Notch, |_| Type::Notch, false),
        (Shape::Allpass, |_| Type::AllPass, false),
        (Shape::Peak, Type::PeakingEQ, true),
        (Shape::Lowshelf, Type::LowShelf, true),
        (Shape::Highshelf, Type::HighShelf, true),
    ];
    let mut checked = 0;
    for (shape, kind, has_gain) in shapes {
        let gains: &[f64] = if has_gain { &GAINS } else { &[0.0] };
        for rate in RATES {
            for f0 in FREQS {
                for q in QS {
                    for &gain_db in gains {
                        let section = parametric(shape, 2, f0, q, gain_db).unwrap();
                        let mut got = digital(&section, rate);
                        if shape == Shape::Bandpass {
                            got[..3].iter_mut().for_each(|b| *b *= q);
                        }
                        let want = reference(kind(gain_db), rate, f0, q);
                        for (i, name) in ["b0", "b1", "b2", "a1", "a2"].iter().enumerate() {
                            let what =
                                format!("{shape} {f0} Hz q {q} {gain_db} dB at {rate}: {name}");
                            assert_close(&what, got[i], want[i], 0.0, 1e-12);
                        }
                        checked += 1;
                    }
                }
            }
        }
    }
    assert_eq!(checked, 3 * 5 * 4 * (5 + 3 * 4));
}

#[test]
fn first_order_lowpass_is_the_prewarped_single_pole_lowpass() {
    // `biquad` 0.6 SinglePoleLowPass: the bilinear transform of ω0/(s + ω0) with
    // tan(ω0/(2·fs)), i.e. prewarped at f0. Tolerance as for the second-order shapes.
    for rate in RATES {
        for f0 in FREQS {
            let got = digital(&parametric(Shape::Lowpass, 1, f0, 0.707, 0.0).unwrap(), rate);
            let want = reference(Type::SinglePoleLowPass, rate, f0, 0.707);
            for i in 0..5 {
                assert_close(&format!("{f0} Hz at {rate}: [{i}]"), got[i], want[i], 0.0, 1e-12);
            }
        }
    }
}

#[test]
fn second_order_levels_at_f0_follow_the_cookbook_definitions() {
    // Cookbook (Bristow-Johnson): BPF with constant 0 dB peak gain; notch null at f0;
    // peaking EQ gain_db at f0; shelves at gain_db/2 at their midpoint f0; all-pass
    // unit magnitude, -180° at f0.
    let f0 = 1000.0;
    for q in QS {
        let at = |shape, g| db(&[parametric(shape, 2, f0, q, g).unwrap()], f0);
        assert_close(&format!("bandpass q {q}"), at(Shape::Bandpass, 0.0), 0.0, 0.0, 1e-12);
        assert!(at(Shape::Notch, 0.0) < -250.0, "notch q {q}");
        for g in GAINS {
            assert_close(&format!("peak q {q} {g}"), at(Shape::Peak, g), g, 0.0, 1e-12);
            assert_close(
                &format!("lowshelf q {q} {g}"),
                at(Shape::Lowshelf, g),
                g / 2.0,
                0.0,
                1e-12,
            );
            assert_close(
                &format!("highshelf q {q} {g}"),
                at(Shape::Highshelf, g),
                g / 2.0,
                0.0,
                1e-12,
            );
        }
        let ap = response(&[parametric(Shape::Allpass, 2, f0, q, 0.0).unwrap()], f0);
        assert_close(&format!("allpass q {q} |H|"), ap.norm(), 1.0, 0.0, 1e-12);
        assert_close(
            &format!("allpass q {q} phase"),
            ap.arg().to_degrees().abs(),
            180.0,
            0.0,
            1e-9,
        );
    }
}

#[test]
fn first_order_stages_have_their_textbook_levels() {
    // Common practice (design/references.md): a first-order low-pass and high-pass with
    // the same corner sum flat; the first-order all-pass is flat with -90° at its
    // corner; a first-order shelf has its full gain at one end, 0 dB at the other and
    // half its gain in dB at the geometric midpoint of its pole and zero (f0 here).
    let f0 = 800.0;
    let lp = parametric(Shape::Lowpass, 1, f0, 0.707, 0.0).unwrap();
    let hp = parametric(Shape::Highpass, 1, f0, 0.707, 0.0).unwrap();
    let ap = parametric(Shape::Allpass, 1, f0, 0.707, 0.0).unwrap();
    for hz in [10.0, 100.0, 800.0, 5000.0, 20000.0] {
        let sum = response(std::slice::from_ref(&lp), hz) + response(std::slice::from_ref(&hp), hz);
        assert_close(&format!("lp + hp at {hz}"), sum.norm(), 1.0, 0.0, 1e-12);
        assert_close(
            &format!("allpass at {hz}"),
            db(std::slice::from_ref(&ap), hz),
            0.0,
            0.0,
            1e-12,
        );
    }
    let phase = response(std::slice::from_ref(&ap), f0).arg().to_degrees();
    assert_close("allpass phase at f0", phase, -90.0, 0.0, 1e-9);
    for g in GAINS {
        let low = [parametric(Shape::Lowshelf, 1, f0, 0.707, g).unwrap()];
        let high = [parametric(Shape::Highshelf, 1, f0, 0.707, g).unwrap()];
        assert_close(&format!("lowshelf {g} dc"), db(&low, 1e-3), g, 0.0, 1e-6);
        assert_close(&format!("lowshelf {g} top"), db(&low, 1e9), 0.0, 0.0, 1e-4);
        assert_close(&format!("lowshelf {g} f0"), db(&low, f0), g / 2.0, 0.0, 1e-12);
        assert_close(&format!("highshelf {g} dc"), db(&high, 1e-3), 0.0, 0.0, 1e-6);
        assert_close(&format!("highshelf {g} top"), db(&high, 1e9), g, 0.0, 1e-4);
        assert_close(&format!("highshelf {g} f0"), db(&high, f0), g / 2.0, 0.0, 1e-12);
    }
}

#[test]
fn every_parametric_stage_is_prewarped_at_f0() {
    // Cookbook: every biquad, shelves included, is prewarped at f0 (natural_hz).
    let shapes = [
        Shape::Lowpass,
        Shape::Highpass,
        Shape::Bandpass,
        Shape::Notch,
        Shape::Allpass,
        Shape::Peak,
        Shape::Lowshelf,
        Shape::Highshelf,
    ];
    for shape in shapes {
        for order in [1, 2] {
            if let Ok(s) = parametric(shape, order, 1234.0, 2.0, 9.0) {
                assert_eq!(s.natural_hz, 1234.0, "{shape} order {order}");
                assert_eq!(s.order(), order, "{shape} order {order}");
            }
        }
    }
}

#[test]
fn invalid_parametric_requests_are_refused_with_clear_messages() {
    assert_input_error(parametric(Shape::Lowpass, 2, 0.0, 0.7, 0.0), &["freq 0 Hz", "positive"]);
    assert_input_error(parametric(Shape::Lowpass, 2, f64::NAN, 0.7, 0.0), &["freq NaN Hz"]);
    assert_input_error(parametric(Shape::Peak, 2, f64::INFINITY, 0.7, 3.0), &["freq inf Hz"]);
    assert_input_error(parametric(Shape::Highpass, 2, 100.0, 0.0, 0.0), &["q 0 must be positive"]);
    assert_input_error(parametric(Shape::Highpass, 2, 100.0, -1.0, 0.0), &["q -1"]);
    assert_input_error(parametric(Shape::Notch, 2, 100.0, f64::NAN, 0.0), &["q NaN"]);
    assert_input_error(
        parametric(Shape::Peak, 2, 100.0, 1.0, f64::NAN),
        &["gain_db NaN dB", "finite"],
    );
    assert_input_error(parametric(Shape::Peak, 1, 100.0, 1.0, 3.0), &["peak order 1 must be 2"]);
    assert_input_error(parametric(Shape::Notch, 1, 100.0, 1.0, 0.0), &["notch order 1 must be 2"]);
    assert_input_error(parametric(Shape::Bandpass, 3, 100.0, 1.0, 0.0), &["bandpass order 3"]);
    assert_input_error(
        parametric(Shape::Lowpass, 0, 100.0, 1.0, 0.0),
        &["lowpass order 0 must be 1 or 2"],
    );
    assert_input_error(parametric(Shape::Lowshelf, 3, 100.0, 1.0, 6.0), &["lowshelf order 3"]);
    // A finite but absurd gain overflows A = 10^(gain_db/40).
    assert_input_error(parametric(Shape::Lowshelf, 2, 100.0, 1.0, 1e5), &["cannot be represented"]);
    // Q is not used at order 1, so an unset (zero) Q there is accepted.
    assert!(parametric(Shape::Lowpass, 1, 100.0, 0.0, 0.0).is_ok());
}

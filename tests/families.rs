//! Classic filter families and buffered first-order cascades against published values
//! and scipy.signal reference vectors.

mod common;

use common::{assert_close, assert_input_error, db, response};
use num_complex::Complex64;
use serde_json::Value;
use std::f64::consts::PI;
use tonewright::analog::families::{bessel, prototype, Band, BesselNorm, Family, MAX_ORDER};
use tonewright::analog::parametric::{parametric, Shape};
use tonewright::analog::{poly, AnalogSection, AnalogZpk};

/// The whole filter as one zpk, from the roots of each section.
fn zpk_of(sections: &[AnalogSection]) -> AnalogZpk {
    let one = AnalogZpk { zeros: vec![], poles: vec![], gain: 1.0 };
    sections.iter().fold(one, |acc, s| acc.cascade(&s.zpk().unwrap()))
}

fn pairs(v: &Value) -> Vec<Complex64> {
    v.as_array()
        .unwrap()
        .iter()
        .map(|p| Complex64::new(p[0].as_f64().unwrap(), p[1].as_f64().unwrap()))
        .collect()
}

/// Matches each wanted root to the nearest unused got root, within `rtol` of its
/// modulus (roots at the origin: within `rtol`·`scale`).
fn assert_roots_match(what: &str, got: &[Complex64], want: &[Complex64], rtol: f64, scale: f64) {
    assert_eq!(got.len(), want.len(), "{what}: count, got {got:?}, want {want:?}");
    let mut used = vec![false; got.len()];
    for w in want {
        let (i, err) = (0..got.len())
            .filter(|&i| !used[i])
            .map(|i| (i, (got[i] - w).norm()))
            .min_by(|a, b| a.1.total_cmp(&b.1))
            .unwrap();
        used[i] = true;
        let tol = rtol * if w.norm() > 0.0 { w.norm() } else { scale };
        assert!(err <= tol, "{what}: want {w}, nearest {} off by {err:e} > {tol:e}", got[i]);
    }
}

fn band_of(case: &Value) -> Band {
    let hz: Vec<f64> = case["hz"].as_array().unwrap().iter().map(|x| x.as_f64().unwrap()).collect();
    match case["btype"].as_str().unwrap() {
        "lowpass" => Band::Lowpass { hz: hz[0] },
        "highpass" => Band::Highpass { hz: hz[0] },
        "bandpass" => Band::Bandpass { lo_hz: hz[0], hi_hz: hz[1] },
        "bandstop" => Band::Bandstop { lo_hz: hz[0], hi_hz: hz[1] },
        other => panic!("unknown btype {other}"),
    }
}

#[test]
fn families_match_scipy_zeros_poles_and_gain() {
    // Source: scipy.signal 1.17.1 butter/bessel/cheby1/cheby2 with analog=True,
    // output='zpk' (tests/reference/families.py writes families.json). Tolerance 1e-10
    // relative: both sides compute each root in f64 from closed forms (Bessel: roots
    // polished in double-double; scipy's order-16 Bessel poles match mpmath to 1e-15),
    // so the agreement is a few ulps; 1e-10 leaves room for other platforms' libm.
    let text = include_str!("reference/families.json");
    let data: Value = serde_json::from_str(text).unwrap();
    let cases = data["cases"].as_array().unwrap();
    assert!(cases.len() > 200);
    for case in cases {
        let order = case["order"].as_u64().unwrap() as usize;
        let band = band_of(case);
        let what = format!("{} {} order {order} {band}", case["family"], case["norm"]);
        let sections = match case["family"].as_str().unwrap() {
            "butter" => prototype(Family::Butterworth, band, order),
            "cheby1" => {
                let ripple_db = case["ripple_db"].as_f64().unwrap();
                prototype(Family::Chebyshev { ripple_db }, band, order)
            }
            "cheby2" => {
                let stop_db = case["stop_db"].as_f64().unwrap();
                prototype(Family::InverseChebyshev { stop_db }, band, order)
            }
            "bessel" => {
                let norm = match case["norm"].as_str().unwrap() {
                    "mag" => BesselNorm::Magnitude,
                    "phase" => BesselNorm::Phase,
                    "delay" => BesselNorm::Delay,
                    other => panic!("unknown norm {other}"),
                };
                if norm == BesselNorm::Magnitude {
                    // family = "bessel" is the magnitude-normalised form.
                    assert_eq!(
                        prototype(Family::Bessel, band, order).unwrap(),
                        bessel(norm, band, order).unwrap()
                    );
                }
                bessel(norm, band, order)
            }
            other => panic!("unknown family {other}"),
        }
        .unwrap();
        let got = zpk_of(&sections);
        let scale = 2.0 * PI * case["hz"][0].as_f64().unwrap();
        assert_roots_match(
            &format!("{what} poles"),
            &got.poles,
            &pairs(&case["poles"]),
            1e-10,
            scale,
        );
        assert_roots_match(
            &format!("{what} zeros"),
            &got.zeros,
            &pairs(&case["zeros"]),
            1e-10,
            scale,
        );
        assert_close(&format!("{what} gain"), got.gain, case["gain"].as_f64().unwrap(), 1e-10, 0.0);
        for s in &sections {
            assert_close(
                &format!("{what} natural_hz"),
                s.natural_hz,
                s.natural_rad() / (2.0 * PI),
                1e-15,
                0.0,
            );
        }
    }
}

#[test]
#[allow(clippy::approx_constant)] // 1.4142 is the table's printed value, not √2
fn butterworth_polynomials_match_handbook_table() {
    // Source: A. B. Williams, F. J. Taylor, "Electronic Filter Design Handbook",
    // normalized Butterworth polynomial coefficients a0..an (from memory, 4 decimals).
    let table: [&[f64]; 8] = [
        &[1.0, 1.0],
        &[1.0, 1.4142, 1.0],
        &[1.0, 2.0, 2.0, 1.0],
        &[1.0, 2.6131, 3.4142, 2.6131, 1.0],
        &[1.0, 3.2361, 5.2361, 5.2361, 3.2361, 1.0],
        &[1.0, 3.8637, 7.4641, 9.1416, 7.4641, 3.8637, 1.0],
        &[1.0, 4.4940, 10.0978, 14.5918, 14.5918, 10.0978, 4.4940, 1.0],
        &[1.0, 5.1258, 13.1371, 21.8462, 25.6884, 21.8462, 13.1371, 5.1258, 1.0],
    ];
    for (i, want) in table.iter().enumerate() {
        let n = i + 1;
        let sections =
            prototype(Family::Butterworth, Band::Lowpass { hz: 1.0 / (2.0 * PI) }, n).unwrap();
        // Expanding here only to compare with the table; the library keeps factors.
        let den = sections.iter().fold(vec![1.0], |acc, s| {
            poly::mul(
                &acc,
                &s.den[..=s.order()].iter().map(|c| c / s.den[s.order()]).collect::<Vec<_>>(),
            )
        });
        assert_eq!(den.len(), want.len());
        for (k, (&g, &w)) in den.iter().zip(want.iter()).enumerate() {
            assert_close(&format!("order {n} a{k}"), g, w, 0.0, 5e-5);
        }
    }
}

#[test]
fn butterworth_is_3db_down_at_its_edges() {
    // -3.0103 dB = 20·log10(1/√2) at the corner (Williams & Taylor, from memory; the
    // definition of the Butterworth corner).
    for n in 1..=MAX_ORDER {
        let lp = prototype(Family::Butterworth, Band::Lowpass { hz: 1000.0 }, n).unwrap();
        assert_close(&format!("lp order {n}"), db(&lp, 1000.0), -3.0103, 0.0, 5e-5);
        let hp = prototype(Family::Butterworth, Band::Highpass { hz: 1000.0 }, n).unwrap();
        assert_close(&format!("hp order {n}"), db(&hp, 1000.0), -3.0103, 0.0, 5e-5);
        let bp = Band::Bandpass { lo_hz: 300.0, hi_hz: 3400.0 };
        let bp = prototype(Family::Butterworth, bp, n).unwrap();
        for edge in [300.0, 3400.0] {
            assert_close(&format!("bp order {n} at {edge}"), db(&bp, edge), -3.0103, 0.0, 5e-5);
        }
        assert_close(
            &format!("bp order {n} centre"),
            db(&bp, (300.0f64 * 3400.0).sqrt()),
            0.0,
            0.0,
            1e-9,
        );
    }
}

#[test]
fn chebyshev_is_down_by_its_ripple_at_the_band_edge() {
    // Williams & Taylor (from memory): the Chebyshev passband ripples between 0 dB and
    // -ripple_db and ends at -ripple_db at the band edge; odd orders are 0 dB at DC,
    // even orders -ripple_db.
    for ripple_db in [0.1, 0.5, 1.0, 3.0] {
        for n in 1..=8 {
            let f = Family::Chebyshev { ripple_db };
            let lp = prototype(f, Band::Lowpass { hz: 1000.0 }, n).unwrap();
            let what = format!("ripple {ripple_db} order {n}");
            assert_close(&format!("{what} edge"), db(&lp, 1000.0), -ripple_db, 0.0, 1e-9);
            let dc = if n % 2 == 1 { 0.0 } else { -ripple_db };
            assert_close(&format!("{what} dc"), db(&lp, 1e-6), dc, 0.0, 1e-9);
            // The passband touches 0 dB where T_n vanishes, ω = cos((2k − 1)π/(2n))·fc.
            for k in 1..=n {
                let hz = 1000.0 * ((2 * k - 1) as f64 * PI / (2 * n) as f64).cos();
                assert_close(&format!("{what} peak {k}"), db(&lp, hz), 0.0, 0.0, 1e-9);
            }
            let top = (0..1000).map(|i| db(&lp, i as f64)).fold(f64::MIN, f64::max);
            assert!(top <= 1e-9, "{what}: passband rises to {top} dB");
        }
    }
}

#[test]
fn inverse_chebyshev_is_down_by_stop_db_where_the_stopband_begins() {
    // Williams & Taylor (from memory): the inverse Chebyshev reaches -stop_db at the
    // stopband edge and never rises above it beyond; 0 dB at DC.
    for stop_db in [20.0, 40.0, 60.0] {
        for n in 1..=8 {
            let f = Family::InverseChebyshev { stop_db };
            let lp = prototype(f, Band::Lowpass { hz: 1000.0 }, n).unwrap();
            let what = format!("stop {stop_db} order {n}");
            assert_close(&format!("{what} edge"), db(&lp, 1000.0), -stop_db, 0.0, 1e-9);
            assert_close(&format!("{what} dc"), db(&lp, 1e-6), 0.0, 0.0, 1e-9);
            let worst =
                (1..2000).map(|i| db(&lp, 1000.0 + 10.0 * i as f64)).fold(f64::MIN, f64::max);
            assert!(worst <= -stop_db + 1e-9, "{what}: stopband reaches {worst} dB");
        }
    }
}

#[test]
fn linkwitz_riley_outputs_sum_flat_and_cross_at_minus_6db() {
    // S. H. Linkwitz, JAES 24(1), 1976: LP + HP of a Linkwitz-Riley crossover sum to an
    // all-pass; each output is -6.02 dB at the crossover; for orders 2 and 6 one output
    // is inverted (the high-pass here). Tolerance 1e-9 dB: rounding of the sum only.
    let fc = 1000.0;
    for n in [2, 4, 6, 8] {
        let lp = prototype(Family::LinkwitzRiley, Band::Lowpass { hz: fc }, n).unwrap();
        let hp = prototype(Family::LinkwitzRiley, Band::Highpass { hz: fc }, n).unwrap();
        let sign = if (n / 2) % 2 == 1 { -1.0 } else { 1.0 };
        assert_close(&format!("lp order {n}"), db(&lp, fc), -6.0206, 0.0, 5e-5);
        assert_close(&format!("hp order {n}"), db(&hp, fc), -6.0206, 0.0, 5e-5);
        for i in 0..=400 {
            let hz = 10.0 * 10f64.powf(i as f64 / 100.0);
            let sum = response(&lp, hz) + response(&hp, hz) * sign;
            assert_close(
                &format!("order {n} sum at {hz} Hz"),
                20.0 * sum.norm().log10(),
                0.0,
                0.0,
                1e-9,
            );
        }
    }
}

#[test]
fn bessel_phase_normalisation_has_butterworth_asymptote() {
    // scipy.signal.bessel docs, norm='phase': the magnitude asymptote equals that of a
    // Butterworth of the same corner, i.e. |H(jω)|·ω^n → 1 at 1 rad/s (product of pole
    // moduli 1). Checked at ω = 1e6 rad/s, where the next term is O(1/ω).
    for n in 1..=8 {
        let h = bessel(BesselNorm::Phase, Band::Lowpass { hz: 1.0 / (2.0 * PI) }, n).unwrap();
        let w = 1e6;
        let mag = response(&h, w / (2.0 * PI)).norm() * w.powi(n as i32);
        assert_close(&format!("order {n}"), mag, 1.0, 1e-4, 0.0);
    }
}

#[test]
fn buffered_first_order_lowpasses_move_the_corner_down() {
    // Textbook, common practice (design/references.md): n identical buffered RC
    // low-passes put -3 dB at fc·√(2^(1/n) − 1) (n=2: 0.6436·fc, n=3: 0.5098·fc), and
    // each stage is -45° at its own corner.
    let fc = 1000.0;
    let stage = parametric(Shape::Lowpass, 1, fc, 0.707, 0.0).unwrap();
    assert_close(
        "one stage phase",
        response(std::slice::from_ref(&stage), fc).arg().to_degrees(),
        -45.0,
        0.0,
        1e-12,
    );
    for (n, ratio) in [(2, 0.6436), (3, 0.5098)] {
        let chain = vec![stage.clone(); n];
        let corner = fc * (2f64.powf(1.0 / n as f64) - 1.0).sqrt();
        assert_close(&format!("n {n} ratio"), corner / fc, ratio, 0.0, 5e-5);
        assert_close(&format!("n {n} level"), db(&chain, corner), -3.0103, 0.0, 5e-5);
        let phase = response(&chain, fc).arg().to_degrees();
        assert_close(&format!("n {n} phase at fc"), phase, -45.0 * n as f64, 0.0, 1e-9);
    }
}

#[test]
fn invalid_family_requests_are_refused_with_clear_messages() {
    let lp = Band::Lowpass { hz: 1000.0 };
    let bw = Family::Butterworth;
    assert_input_error(prototype(bw, lp, 0), &["order 0", "between 1 and 16"]);
    assert_input_error(prototype(bw, lp, MAX_ORDER + 1), &["order 17", "between 1 and 16"]);
    assert_input_error(prototype(bw, Band::Lowpass { hz: 0.0 }, 2), &["freq 0 Hz", "positive"]);
    assert_input_error(prototype(bw, Band::Highpass { hz: -5.0 }, 2), &["freq -5 Hz"]);
    assert_input_error(
        prototype(bw, Band::Lowpass { hz: f64::NAN }, 2),
        &["freq NaN Hz", "finite"],
    );
    assert_input_error(prototype(bw, Band::Lowpass { hz: f64::INFINITY }, 2), &["freq inf Hz"]);
    let swapped = Band::Bandpass { lo_hz: 3400.0, hi_hz: 300.0 };
    assert_input_error(prototype(bw, swapped, 2), &["lo < hi", "lo = 3400 Hz", "hi = 300 Hz"]);
    let equal = Band::Bandstop { lo_hz: 50.0, hi_hz: 50.0 };
    assert_input_error(prototype(bw, equal, 2), &["lo < hi", "lo = 50 Hz"]);
    let negative = Band::Bandstop { lo_hz: -1.0, hi_hz: 50.0 };
    assert_input_error(prototype(bw, negative, 2), &["lower band edge -1 Hz"]);
    let nan_hi = Band::Bandpass { lo_hz: 1.0, hi_hz: f64::NAN };
    assert_input_error(prototype(bw, nan_hi, 2), &["upper band edge NaN Hz"]);
    assert_input_error(prototype(Family::Chebyshev { ripple_db: 0.0 }, lp, 2), &["ripple_db 0 dB"]);
    assert_input_error(
        prototype(Family::Chebyshev { ripple_db: f64::NAN }, lp, 2),
        &["ripple_db NaN"],
    );
    let no_stop = Family::InverseChebyshev { stop_db: -20.0 };
    assert_input_error(prototype(no_stop, lp, 2), &["stop_db -20 dB", "positive"]);
    assert_input_error(
        prototype(Family::LinkwitzRiley, lp, 3),
        &["linkwitz-riley order 3", "even"],
    );
    let bp = Band::Bandpass { lo_hz: 300.0, hi_hz: 3400.0 };
    assert_input_error(
        prototype(Family::LinkwitzRiley, bp, 4),
        &["lowpass or highpass", "bandpass"],
    );
    let bs = Band::Bandstop { lo_hz: 300.0, hi_hz: 3400.0 };
    assert_input_error(prototype(Family::LinkwitzRiley, bs, 4), &["bandstop"]);
    assert_input_error(bessel(BesselNorm::Phase, lp, 0), &["order 0"]);
    // Each value is valid alone, but ω0² overflows f64 or the poles reach the jω axis.
    assert_input_error(prototype(bw, Band::Lowpass { hz: 1e200 }, 2), &["cannot be represented"]);
    assert_input_error(
        prototype(Family::Chebyshev { ripple_db: 4000.0 }, lp, 3),
        &["cannot be represented"],
    );
}

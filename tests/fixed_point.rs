//! Number formats, quantization and the engines against sources outside the project.

use proptest::prelude::*;
use serde_json::Value;
use std::f64::consts::PI;
use tonewright::pipeline::Realized;
use tonewright::quantize::{
    analyze, default_band, find_limit_cycle, quantize, rounding_noise, FixedCascade, FixedFormat,
    Overflow, Rounding, Structure, Verdict,
};
use tonewright::sections::norms::{l1_norm, l2_norm};
use tonewright::sections::{Cascade, Sos};
use tonewright::simulate::{Engine, FixedEngine, FloatEngine, Runner, SampleScale};

#[path = "common/engines.rs"]
mod reference;

const RATE: f64 = 48000.0;

/// Cookbook low-pass (R. Bristow-Johnson, "Audio EQ Cookbook"): bilinear, prewarped at f0.
fn lowpass(f0: f64, q: f64) -> Sos {
    let w0 = 2.0 * PI * f0 / RATE;
    let (alpha, cw) = (w0.sin() / (2.0 * q), w0.cos());
    let a0 = 1.0 + alpha;
    let b = (1.0 - cw) / 2.0 / a0;
    Sos { b: [b, 2.0 * b, b], a: [-2.0 * cw / a0, (1.0 - alpha) / a0] }
}

fn reference(name: &str) -> Value {
    let path = format!("{}/tests/reference/{name}", env!("CARGO_MANIFEST_DIR"));
    serde_json::from_str(&std::fs::read_to_string(path).unwrap()).unwrap()
}

fn floats(v: &Value) -> Vec<f64> {
    v.as_array().unwrap().iter().map(|x| x.as_f64().unwrap()).collect()
}

fn ints(v: &Value) -> Vec<i64> {
    v.as_array().unwrap().iter().map(|x| x.as_i64().unwrap()).collect()
}

/// Seeded uniform noise in [−1, 1) (splitmix64).
fn noise(n: usize, mut seed: u64) -> Vec<f64> {
    (0..n)
        .map(|_| {
            seed = seed.wrapping_add(0x9E37_79B9_7F4A_7C15);
            let mut z = seed;
            z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
            z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
            ((z ^ (z >> 31)) >> 11) as f64 / (1u64 << 52) as f64 - 1.0
        })
        .collect()
}

fn db(power_ratio: f64) -> f64 {
    10.0 * power_ratio.log10()
}

#[test]
fn quantized_lowpass_matches_numpy_integers_and_moves_its_pole_in_q15_only() {
    let r = reference("quantized_lowpass.json");
    let (b, a) = (floats(&r["b"]), floats(&r["a"]));
    // Our cookbook formula gives the script's float coefficients.
    let ours = lowpass(100.0, 0.707);
    for (got, want) in ours.b.iter().chain(&ours.a).zip(b.iter().chain(&a)) {
        assert!((got - want).abs() < 1e-15, "{got} vs {want}");
    }
    let cascade = Cascade { rate: RATE, sections: vec![ours] };
    let float_pole = r["float"]["pole_freq_hz"].as_f64().unwrap();
    for (name, format) in [("q15", FixedFormat::q15()), ("q31", FixedFormat::q31())] {
        let fx = quantize(&cascade, &format, Structure::Df1).unwrap();
        let want = &r[name];
        // numpy.round integers (tests/reference/quantized_lowpass.py, scipy 1.17.1).
        assert_eq!(fx.format.coef_frac, Some(want["a_frac"].as_u64().unwrap() as u32));
        assert_eq!(fx.sections[0].a.to_vec(), ints(&want["a"]), "{name} a");
        assert_eq!(fx.sections[0].b.to_vec(), ints(&want["b_common"]), "{name} b");
        let report = analyze(&cascade, &fx, default_band(RATE)).unwrap();
        let pole = report.sections[0].quantized_poles[0];
        let np_pole = want["common"]["pole_freq_hz"].as_f64().unwrap();
        assert!((pole.freq_hz - np_pole).abs() < 1e-6, "{name}: {} vs {np_pole}", pole.freq_hz);
        let radius = want["common"]["pole_radius"].as_f64().unwrap();
        assert!((pole.radius - radius).abs() < 1e-12);
        let eff = fx.to_cascade(RATE).unwrap();
        let dc_db = 20.0 * eff.response_at_hz(0.0).norm().log10();
        let np_dc = want["common"]["dc_gain_db"].as_f64().unwrap();
        assert!((dc_db - np_dc).abs() < 1e-9, "{name}: {dc_db} vs {np_dc}");
        // The well-known consequence (Oppenheim & Schafer, 3rd ed., section 6.8:
        // direct-form poles near z = 1 are very sensitive to coefficient rounding).
        let moved = (pole.freq_hz - float_pole).abs();
        if name == "q15" {
            assert!(moved > 10.0, "q15 pole moved only {moved} Hz");
            assert!(dc_db.abs() > 1.0, "q15 dc gain {dc_db} dB");
            // The textbook split (b in Q1.15, a in Q2.14) moves it as well.
            assert!(want["split"]["dc_gain_db"].as_f64().unwrap() > 1.0);
            assert_eq!(report.assessment.verdict, Verdict::DoesNotFit);
            assert!(report.assessment.findings.iter().any(|f| f.contains("lower rate")));
        } else {
            assert!(moved < 0.01, "q31 pole moved {moved} Hz");
            assert!(dc_db.abs() < 0.001);
            assert!(report.response.max_db < 0.001);
            assert_ne!(report.assessment.verdict, Verdict::DoesNotFit);
        }
    }
}

#[test]
fn f64_engine_matches_scipy_sosfilt() {
    let r = reference("sosfilt.json");
    let sections: Vec<Sos> = r["sections"]
        .as_array()
        .unwrap()
        .iter()
        .map(|s| {
            let (b, a) = (floats(&s["b"]), floats(&s["a"]));
            Sos { b: [b[0], b[1], b[2]], a: [a[0], a[1]] }
        })
        .collect();
    let cascade = Cascade { rate: RATE, sections };
    let want = floats(&r["output"]);
    let rms = (want.iter().map(|v| v * v).sum::<f64>() / want.len() as f64).sqrt();
    for structure in [Structure::Df1, Structure::Df2t] {
        let mut x = floats(&r["input"]);
        let mut e = FloatEngine::<f64>::new(&cascade, structure, 1).unwrap();
        e.process(&mut x).unwrap();
        // scipy.signal.sosfilt (scipy 1.17.1), tests/reference/sosfilt.py: within 1e-12
        // of the output RMS (double rounding differences only).
        for (i, (g, w)) in x.iter().zip(&want).enumerate() {
            assert!((g - w).abs() <= 1e-12 * rms, "{structure} [{i}]: {g} vs {w}");
        }
    }
}

/// Output of `fixed` on integer input minus the f64 engine running the same effective
/// coefficients, in LSB; the first 2000 samples (transient) left out.
fn measured_noise(fixed: &FixedCascade, input: &[i32]) -> f64 {
    let mut y = input.to_vec();
    FixedEngine::new(fixed, 1).unwrap().process(&mut y).unwrap();
    let mut r: Vec<f64> = input.iter().map(|&v| f64::from(v)).collect();
    let eff = fixed.to_cascade(RATE).unwrap();
    FloatEngine::<f64>::new(&eff, Structure::Df1, 1).unwrap().process(&mut r).unwrap();
    let d: Vec<f64> = y.iter().zip(&r).skip(2000).map(|(&a, b)| f64::from(a) - b).collect();
    d.iter().map(|v| v * v).sum::<f64>() / d.len() as f64
}

#[test]
fn measured_rounding_noise_of_every_fixed_kernel_is_delta_squared_over_12_times_noise_gain() {
    let cascade =
        Cascade { rate: RATE, sections: vec![lowpass(1000.0, 0.7), lowpass(3000.0, 1.2)] };
    let n = 10 * RATE as usize; // 10 s
    let kernels = [
        (FixedFormat::q15(), Structure::Df1, 0),
        (FixedFormat::q15(), Structure::Df1, 1),
        (FixedFormat::q15(), Structure::Df1, 2),
        (FixedFormat::q15(), Structure::Df2t, 0),
        (FixedFormat::q23(), Structure::Df1, 0),
        (FixedFormat::q31(), Structure::Df1, 2),
        (FixedFormat::q31(), Structure::Df2t, 0),
    ];
    for (format, structure, ef) in kernels {
        let format = FixedFormat { error_feedback: ef, ..format };
        let fixed = quantize(&cascade, &format, structure).unwrap();
        let scale = SampleScale::new(format.data_bits).unwrap();
        let eff = fixed.effective_sections().unwrap();
        // Δ²/12 per narrowing (Oppenheim & Schafer, 3rd ed., section 6.7) times the noise
        // gain Σh² of 1/A_k(z) (with the error feedback zeros) and the later sections.
        let shaping = [[1.0, 0.0, 0.0], [1.0, -1.0, 0.0], [1.0, -2.0, 1.0]][ef as usize];
        let predicted: f64 = (0..eff.len())
            .map(|k| {
                let mut chain = vec![Sos { b: shaping, a: eff[k].a }];
                chain.extend_from_slice(&eff[k + 1..]);
                l2_norm(&chain).powi(2) / 12.0
            })
            .sum();
        let model = rounding_noise(&fixed).unwrap().output_power_lsb2;
        assert!(db(model / predicted).abs() < 0.01, "model {model} vs {predicted}");
        let seeded: Vec<i32> = noise(n, 7).iter().map(|&v| scale.to_int(0.25 * v)).collect();
        let sine: Vec<i32> = (0..n)
            .map(|i| scale.to_int(0.5 * (2.0 * PI * 997.0 * i as f64 / RATE).sin()))
            .collect();
        for (what, input) in [("noise", &seeded), ("sine", &sine)] {
            let got = measured_noise(&fixed, input);
            let off = db(got / predicted);
            assert!(
                off.abs() < 1.0,
                "{structure} ef {ef} {}-bit {what}: measured {got} vs {predicted} ({off} dB)",
                format.data_bits
            );
        }
    }
}

#[test]
fn full_scale_sine_through_a_flat_design_has_the_textbook_snr() {
    let flat = Cascade { rate: RATE, sections: vec![Sos { b: [1.0, 0.0, 0.0], a: [0.0, 0.0] }] };
    for format in [FixedFormat::q15(), FixedFormat::q23()] {
        let bits = format.data_bits;
        let scale = SampleScale::new(bits).unwrap();
        let fixed = quantize(&flat, &format, Structure::Df1).unwrap();
        let amp = f64::from(scale.max()) * scale.lsb(); // full scale less one LSB
        let ideal: Vec<f64> =
            (0..480_000).map(|i| amp * (2.0 * PI * 997.0 * i as f64 / RATE).sin()).collect();
        let mut y: Vec<i32> = ideal.iter().map(|&v| scale.to_int(v)).collect();
        let mut engine = FixedEngine::new(&fixed, 1).unwrap();
        engine.process(&mut y).unwrap();
        assert_eq!(engine.overflows(), 0);
        let signal = ideal.iter().map(|v| v * v).sum::<f64>();
        let err = y.iter().zip(&ideal).map(|(&q, v)| (scale.to_f64(q) - v).powi(2)).sum::<f64>();
        // SNR = 6.02·N + 1.76 dB (Oppenheim & Schafer, 3rd ed., section 4.8.3).
        let want = 6.02 * f64::from(bits) + 1.76;
        let got = db(signal / err);
        assert!((got - want).abs() < 1.0, "{bits} bits: {got} dB vs {want} dB");
        let predicted = rounding_noise(&fixed).unwrap().snr_full_scale_sine_db;
        assert!((predicted - want).abs() < 0.1, "{bits} bits: predicted {predicted} dB");
    }
}

#[test]
fn first_order_rounding_limit_cycle_has_the_deadband_amplitude() {
    // y[n] = round(a·y[n−1]) sticks at |y| ≤ 0.5 / (1 − |a|) LSB: the deadband of the
    // first-order recursion (Oppenheim & Schafer, 3rd ed., section 6.10, the first-order
    // limit-cycle example; from memory). a > 0 sticks at a constant, a < 0 alternates.
    for (a, period) in [(0.9, 1), (0.85, 1), (-0.85, 2), (0.95, 1)] {
        let c = Cascade { rate: RATE, sections: vec![Sos { b: [1.0, 0.0, 0.0], a: [-a, 0.0] }] };
        let fixed = quantize(&c, &FixedFormat::q15(), Structure::Df1).unwrap();
        let aq = -fixed.effective_sections().unwrap()[0].a[0];
        let deadband = (0.5 / (1.0 - aq.abs())).floor() as i64;
        let found = find_limit_cycle(&fixed).unwrap().largest.unwrap();
        assert_eq!((found.amplitude_lsb, found.period), (deadband, period), "a = {a}");
    }
    // Floor toward −∞ (the same recursion, worked through: common practice): positive
    // values decay to 0, negative ones stick where floor(−a·k) = −k, k < 1 / (1 − a).
    let c = Cascade { rate: RATE, sections: vec![Sos { b: [1.0, 0.0, 0.0], a: [-0.9, 0.0] }] };
    let floor = FixedFormat { rounding: Rounding::Floor, ..FixedFormat::q15() };
    let fixed = quantize(&c, &floor, Structure::Df1).unwrap();
    let aq = -fixed.effective_sections().unwrap()[0].a[0];
    let deadband = (1.0 / (1.0 - aq)).ceil() as i64 - 1;
    let found = find_limit_cycle(&fixed).unwrap().largest.unwrap();
    assert_eq!((found.amplitude_lsb, found.period), (deadband, 1));
}

/// One section y = gain·x in `format`, run on `x`; returns outputs and overflow count.
fn run_gain(format: FixedFormat, gain: f64, x: &[i64]) -> (Vec<i64>, u64) {
    let c = Cascade { rate: RATE, sections: vec![Sos { b: [gain, 0.0, 0.0], a: [0.0, 0.0] }] };
    let fixed = quantize(&c, &format, Structure::Df1).unwrap();
    let mut e = FixedEngine::new(&fixed, 1).unwrap();
    let mut buf: Vec<i32> = x.iter().map(|&v| i32::try_from(v).unwrap()).collect();
    e.process(&mut buf).unwrap();
    (buf.into_iter().map(i64::from).collect(), e.overflows())
}

#[test]
fn rounding_saturation_and_wrap_are_exact_at_the_edges_of_every_format() {
    // Common practice (two's complement arithmetic); expected values built with checked
    // operations so a wrong expectation cannot wrap silently.
    for base in [FixedFormat::q15(), FixedFormat::q23(), FixedFormat::q31()] {
        let d = base.data_bits;
        let max = 1i64.checked_shl(d - 1).unwrap().checked_sub(1).unwrap();
        let min = max.checked_neg().unwrap().checked_sub(1).unwrap();
        let edges = [min, -1, 0, 1, max];
        let span = max.checked_sub(min).unwrap().checked_add(1).unwrap();
        for overflow in [Overflow::Saturate, Overflow::Wrap] {
            // ×2 overflows at both ends.
            let f = FixedFormat { overflow, ..base };
            let (got, count) = run_gain(f, 2.0, &edges);
            let want: Vec<i64> = edges
                .iter()
                .map(|&x| {
                    let v = x.checked_mul(2).unwrap();
                    match overflow {
                        Overflow::Saturate => v.clamp(min, max),
                        Overflow::Wrap => {
                            v.checked_sub(min).unwrap().rem_euclid(span).checked_add(min).unwrap()
                        }
                    }
                })
                .collect();
            assert_eq!(got, want, "{d} bits {overflow:?}");
            assert_eq!(count, 2, "{d} bits {overflow:?}: overflows at min and max");
        }
        for rounding in [Rounding::Nearest, Rounding::Floor, Rounding::Even] {
            // ×0.5: halves land exactly on ties for odd inputs.
            let (got, count) = run_gain(FixedFormat { rounding, ..base }, 0.5, &edges);
            let want: Vec<i64> = edges
                .iter()
                .map(|&x| {
                    let (q, odd) = (x.div_euclid(2), x.rem_euclid(2) == 1);
                    let up = match rounding {
                        Rounding::Nearest => odd,
                        Rounding::Floor => false,
                        Rounding::Even => odd && q.rem_euclid(2) == 1,
                    };
                    if up {
                        q.checked_add(1).unwrap()
                    } else {
                        q
                    }
                })
                .collect();
            assert_eq!(got, want, "{d} bits {rounding:?}");
            assert_eq!(count, 0);
        }
    }
}

#[test]
fn bad_formats_are_refused_with_the_key_named() {
    let c = Cascade { rate: RATE, sections: vec![lowpass(1000.0, 0.7)] };
    let cases = [
        (FixedFormat { coef_frac: Some(16), ..FixedFormat::q15() }, "target.fixed.coef_frac: 16"),
        (FixedFormat { data_bits: 40, ..FixedFormat::q15() }, "target.fixed.data_bits: 40"),
        (FixedFormat { acc_bits: 48, ..FixedFormat::q31() }, "target.fixed.acc_bits: 48"),
        (FixedFormat { acc_bits: 33, ..FixedFormat::q15() }, "target.fixed.acc_bits: 33"),
        (FixedFormat { error_feedback: 5, ..FixedFormat::q15() }, "target.fixed.error_feedback"),
    ];
    for (format, key) in cases {
        let err = quantize(&c, &format, Structure::Df1).unwrap_err();
        assert!(err.to_string().starts_with(key), "{err}");
        assert_eq!(err.exit_code(), 2);
    }
}

/// A stable section from pole radius/angle and zero radius/angle, gain g.
fn section(p: (f64, f64), z: (f64, f64), g: f64) -> Sos {
    Sos {
        b: [g, -2.0 * g * z.0 * z.1.cos(), g * z.0 * z.0],
        a: [-2.0 * p.0 * p.1.cos(), p.0 * p.0],
    }
}

fn cascades(max_radius: f64) -> impl Strategy<Value = Vec<Sos>> {
    let sec = (0.05..max_radius, 0.01..3.1f64, 0.0..1.2f64, 0.0..PI, 0.1..2.0f64)
        .prop_map(|(pr, pa, zr, za, g)| section((pr, pa), (zr, za), g));
    prop::collection::vec(sec, 1..5)
}

fn formats() -> impl Strategy<Value = (FixedFormat, Structure)> {
    let base = prop_oneof![
        Just(FixedFormat::q15()),
        Just(FixedFormat::q23()),
        Just(FixedFormat::q31()),
        Just(FixedFormat { acc_bits: 40, ..FixedFormat::q15() }),
    ];
    let rounding =
        prop_oneof![Just(Rounding::Nearest), Just(Rounding::Floor), Just(Rounding::Even)];
    let overflow = prop_oneof![Just(Overflow::Saturate), Just(Overflow::Wrap)];
    let st = prop_oneof![
        Just((Structure::Df1, 0)),
        Just((Structure::Df1, 1)),
        Just((Structure::Df1, 2)),
        Just((Structure::Df2t, 0))
    ];
    (base, rounding, overflow, st).prop_map(|(b, rounding, overflow, (s, ef))| {
        (FixedFormat { rounding, overflow, error_feedback: ef, ..b }, s)
    })
}

/// Scales each section so the l1 gain from the input to its output is `target`.
fn l1_scaled(mut sections: Vec<Sos>, target: f64) -> Vec<Sos> {
    for k in 0..sections.len() {
        let g = l1_norm(&sections[..=k]) / target;
        sections[k].b = sections[k].b.map(|b| b / g);
    }
    sections
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 48, ..ProptestConfig::default() })]

    #[test]
    fn no_kernel_panics_and_blocks_and_channels_never_change_the_output(
        sections in cascades(0.999),
        (format, structure) in formats(),
        seed in any::<u64>(),
    ) {
        let c = Cascade { rate: RATE, sections };
        let Ok(fixed) = quantize(&c, &format, structure) else { return Ok(()) };
        let scale = SampleScale::new(format.data_bits).unwrap();
        let x: Vec<i32> = noise(2 * 4100, seed).iter().map(|&v| scale.to_int(v)).collect();
        // Whole buffer, stereo interleaved.
        let mut whole = x.clone();
        FixedEngine::new(&fixed, 2).unwrap().process(&mut whole).unwrap();
        for frames in [1usize, 7, 64, 4096] {
            let mut e = FixedEngine::new(&fixed, 2).unwrap();
            let mut y = x.clone();
            for block in y.chunks_mut(2 * frames) {
                e.process(block).unwrap();
            }
            prop_assert_eq!(&y, &whole, "block of {} frames", frames);
        }
        // Each channel alone gives the same samples.
        for ch in 0..2 {
            let mut mono: Vec<i32> = x.iter().skip(ch).step_by(2).copied().collect();
            FixedEngine::new(&fixed, 1).unwrap().process(&mut mono).unwrap();
            let from_stereo: Vec<i32> = whole.iter().skip(ch).step_by(2).copied().collect();
            prop_assert_eq!(mono, from_stereo);
        }
    }

    #[test]
    fn l1_scaled_sections_never_overflow_with_wrap(
        sections in cascades(0.98),
        base in prop_oneof![Just(FixedFormat::q15()), Just(FixedFormat::q23()), Just(FixedFormat::q31())],
        ef in 0u32..3,
        seed in any::<u64>(),
    ) {
        // Jackson (BSTJ 49(2), 1970): with every node's l1 gain at most 1, no input
        // bounded by full scale can overflow. 0.9 leaves room for rounding noise.
        let c = Cascade { rate: RATE, sections: l1_scaled(sections, 0.9) };
        let format = FixedFormat { overflow: Overflow::Wrap, error_feedback: ef, ..base };
        let Ok(fixed) = quantize(&c, &format, Structure::Df1) else { return Ok(()) };
        let eff = fixed.effective_sections().unwrap();
        prop_assume!(fixed.is_stable());
        prop_assume!((0..eff.len()).all(|k| l1_norm(&eff[..=k]) < 0.95));
        let scale = SampleScale::new(format.data_bits).unwrap();
        // Full-scale input: random signs at ±full scale, the worst case for l1.
        let mut y: Vec<i32> = noise(4000, seed)
            .iter()
            .map(|&v| if v < 0.0 { scale.min() } else { scale.max() })
            .collect();
        let mut e = FixedEngine::new(&fixed, 1).unwrap();
        e.process(&mut y).unwrap();
        prop_assert_eq!(e.overflows(), 0);
    }

    #[test]
    fn float_kernels_agree_with_the_f64_reference(
        sections in cascades(0.95),
        seed in any::<u64>(),
    ) {
        let c = Cascade { rate: RATE, sections: l1_scaled(sections, 1.0) };
        let x = noise(3000, seed);
        let mut want = x.clone();
        FloatEngine::<f64>::new(&c, Structure::Df2t, 1).unwrap().process(&mut want).unwrap();
        let mut df1 = x.clone();
        FloatEngine::<f64>::new(&c, Structure::Df1, 1).unwrap().process(&mut df1).unwrap();
        for structure in [Structure::Df1, Structure::Df2t] {
            let mut y: Vec<f32> = x.iter().map(|&v| v as f32).collect();
            FloatEngine::<f32>::new(&c, structure, 1).unwrap().process(&mut y).unwrap();
            // Stated bound: with poles at radius ≤ 0.95 (time constants under 20
            // samples) and l1-scaled sections, f32 stays within 1e-4 of full scale
            // (f32 epsilon 6e-8 times sums of a few hundred terms).
            for (g, w) in y.iter().zip(&want) {
                prop_assert!((f64::from(*g) - w).abs() < 1e-4, "{} vs {}", g, w);
            }
        }
        // Two f64 structures: the same function, rounded differently (1e-12 of full scale).
        for (g, w) in df1.iter().zip(&want) {
            prop_assert!((g - w).abs() < 1e-12, "{} vs {}", g, w);
        }
    }
}

/// Full-scale noise, occasional runs at the extremes (to drive the overflow paths), and
/// a quiet stretch (to reach the rounding deadband), for `channels` channels.
fn exacting_input(scale: SampleScale, frames: usize, channels: usize, seed: u64) -> Vec<i32> {
    noise(frames * channels, seed)
        .iter()
        .enumerate()
        .map(|(i, &v)| match (i / channels / 97) % 5 {
            0 => {
                if v < 0.0 {
                    scale.min()
                } else {
                    scale.max()
                }
            }
            1 => scale.to_int(v * 1e-3),
            _ => scale.to_int(v),
        })
        .collect()
}

/// The instruction-set builds of the engines: the best this processor has, without
/// AVX-512, and the baseline.
const BUILDS: [&str; 3] = ["best", "no AVX-512", "baseline"];

/// The engine's output and overflow count for `channels` channels processed in blocks
/// of `frames` frames, in one of [`BUILDS`].
fn fixed_engine_in_blocks(
    fixed: &FixedCascade,
    channels: usize,
    x: &[i32],
    frames: usize,
    build: &str,
) -> (Vec<i32>, u64) {
    let mut e = FixedEngine::new(fixed, channels).unwrap();
    match build {
        "best" => {}
        "no AVX-512" => e = e.without_avx512(),
        _ => e = e.baseline(),
    }
    let mut y = x.to_vec();
    for block in y.chunks_mut(frames * channels) {
        e.process(block).unwrap();
    }
    (y, e.overflows())
}

/// The [`Runner`]'s output (as integers) and overflow count for `x` as fractions of
/// full scale, in blocks of `frames` frames, alternating its in-place and
/// out-of-place entries.
fn runner_in_blocks(
    fixed: &FixedCascade,
    structure: Structure,
    channels: usize,
    x: &[i32],
    frames: usize,
) -> (Vec<i32>, u64) {
    let scale = SampleScale::new(fixed.format.data_bits).unwrap();
    let mut runner = Runner::new(&Realized::Fixed(fixed.clone()), structure, channels).unwrap();
    let mut y: Vec<f64> = x.iter().map(|&v| scale.to_f64(v)).collect();
    let mut out = Vec::new();
    for (i, block) in y.chunks_mut(frames * channels).enumerate() {
        if i % 2 == 0 {
            runner.process(block).unwrap();
        } else {
            runner.process_from(block, &mut out).unwrap();
            block.copy_from_slice(&out);
        }
    }
    (y.iter().map(|&v| scale.to_int(v)).collect(), runner.overflows())
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 64, ..ProptestConfig::default() })]

    #[test]
    fn fixed_engine_equals_the_literal_arithmetic_for_every_format_block_and_channel_count(
        sections in cascades(0.999),
        gain in prop_oneof![Just(1.0), Just(4.0), Just(60.0)],
        (format, structure) in formats(),
        acc_bits in prop_oneof![Just(None), Just(Some(64u32))],
        channels in prop_oneof![Just(1usize), Just(2), Just(3), Just(4), Just(8)],
        seed in any::<u64>(),
    ) {
        // Gains above 1 drive accumulators and outputs into saturation or wrap; a
        // 64-bit accumulator on the 16- and 24-bit formats tests the overflow-checked
        // sums with every rounding, overflow and structure.
        let sections = sections
            .into_iter()
            .map(|s| Sos { b: s.b.map(|b| b * gain), a: s.a })
            .collect();
        let c = Cascade { rate: RATE, sections };
        let format = FixedFormat { acc_bits: acc_bits.unwrap_or(format.acc_bits), ..format };
        let Ok(fixed) = quantize(&c, &format, structure) else { return Ok(()) };
        let scale = SampleScale::new(format.data_bits).unwrap();
        let x = exacting_input(scale, 700, channels, seed);
        let mut want = x.clone();
        let want_overflows = reference::fixed_cascade(&fixed, channels, &mut want);
        for frames in [1usize, 63, 64, 65, 700] {
            for build in BUILDS {
                let (got, overflows) = fixed_engine_in_blocks(&fixed, channels, &x, frames, build);
                prop_assert_eq!(&got, &want, "{} frames per block, {} build", frames, build);
                prop_assert_eq!(overflows, want_overflows, "{} frames, {} build", frames, build);
            }
            // The runner over f64 frames: one engine per channel, run side by side.
            let (got, overflows) = runner_in_blocks(&fixed, structure, channels, &x, frames);
            prop_assert_eq!(&got, &want, "runner, {} frames per block", frames);
            prop_assert_eq!(overflows, want_overflows, "runner, {} frames per block", frames);
        }
    }

    #[test]
    fn float_engines_equal_the_plain_loops_bit_for_bit_on_every_path(
        sections in prop::collection::vec(
            (0.05..0.999f64, 0.01..3.1f64, 0.0..1.2f64, 0.0..PI, 0.1..2.0f64)
                .prop_map(|(pr, pa, zr, za, g)| section((pr, pa), (zr, za), g)),
            1..11,
        ),
        structure in prop_oneof![Just(Structure::Df1), Just(Structure::Df2t)],
        channels in 1usize..12,
        seed in any::<u64>(),
    ) {
        let c = Cascade { rate: RATE, sections };
        let x = noise(300 * channels, seed);
        let mismatch = float_paths_mismatch(&c, structure, channels, &x, &[1, 64, 65, 300]);
        prop_assert!(mismatch.is_none(), "{}", mismatch.unwrap_or_default());
    }
}

/// Runs `x` through the f64 and f32 engines (every build of [`BUILDS`]) in
/// blocks of each of `block_frames` and compares every output bit with the plain
/// loops (NaN-free inputs; to_bits also tells −0.0 from 0.0). Returns the first
/// difference found.
fn float_paths_mismatch(
    c: &Cascade,
    structure: Structure,
    channels: usize,
    x: &[f64],
    block_frames: &[usize],
) -> Option<String> {
    let mut want = x.to_vec();
    reference::float_cascade(c, structure, channels, &mut want);
    let x32: Vec<f32> = x.iter().map(|&v| v as f32).collect();
    let mut want32 = x32.clone();
    reference::float_cascade(c, structure, channels, &mut want32);
    let bits = |v: &[f64]| v.iter().map(|f| f.to_bits()).collect::<Vec<_>>();
    let bits32 = |v: &[f32]| v.iter().map(|f| f.to_bits()).collect::<Vec<_>>();
    for &frames in block_frames {
        for build in BUILDS {
            let mut e = FloatEngine::<f64>::new(c, structure, channels).unwrap();
            let mut e32 = FloatEngine::<f32>::new(c, structure, channels).unwrap();
            match build {
                "best" => {}
                "no AVX-512" => {
                    e = e.without_avx512();
                    e32 = e32.without_avx512();
                }
                _ => {
                    e = e.baseline();
                    e32 = e32.baseline();
                }
            }
            let (mut y, mut y32) = (x.to_vec(), x32.clone());
            for block in y.chunks_mut(frames * channels) {
                e.process(block).unwrap();
            }
            for block in y32.chunks_mut(frames * channels) {
                e32.process(block).unwrap();
            }
            let case = format!(
                "{} sections, {structure:?}, {channels} channels, {frames} frames per block, \
                 {build} build",
                c.sections.len()
            );
            if bits(&y) != bits(&want) {
                return Some(format!("f64 differs: {case}"));
            }
            if bits32(&y32) != bits32(&want32) {
                return Some(format!("f32 differs: {case}"));
            }
        }
    }
    None
}

#[test]
fn float_engines_equal_the_plain_loops_over_passes_and_waves() {
    // The wavefront kernels cut a block into passes of 4096 frames and the cascade into
    // waves of at most 8 sections: blocks longer than a pass, cuts one frame either
    // side of it, and 9 to 17 sections (two and three waves, with passing lanes).
    for (ns, channels) in [(8, 1), (9, 2), (12, 1), (13, 3), (17, 2), (5, 2), (4, 1)] {
        let sections = (0..ns)
            .map(|k| {
                let f = 0.02 + 0.9 * k as f64 / ns as f64;
                section((0.97, f * PI), (0.9, (1.0 - f) * PI), 0.5)
            })
            .collect();
        let c = Cascade { rate: RATE, sections };
        let x = noise(9000 * channels, ns as u64);
        for structure in [Structure::Df1, Structure::Df2t] {
            let mismatch = float_paths_mismatch(&c, structure, channels, &x, &[9000, 4095, 4097]);
            assert!(mismatch.is_none(), "{}", mismatch.unwrap_or_default());
        }
    }
}

#[test]
fn fixed_kernels_equal_the_literal_arithmetic_over_passes_and_waves() {
    // The AVX2 kernel cuts a block into passes of 2048 frames and the cascade into
    // waves of at most 8 sections, and redoes a wave whose sums leave their fast
    // range. 13 sections (two waves, passing lanes), 5000 frames in blocks longer and
    // shorter than a pass, a loud stretch that drives only the second wave (gain on
    // its first section) into saturation or wrap, every format family and structure,
    // every build. One, two and three channels with the loud stretch in channel 1 of
    // the pair (or the one channel): the kernels run channels in pairs, an odd one
    // alone, and redo a channel's marked wave from that channel's own saved state.
    // (The quieter channel overflows too, so that only the marked channel is redone
    // is left to the literal-arithmetic proptest, which catches a redo of the wrong
    // one.)
    let sections: Vec<Sos> = (0..13)
        .map(|k| {
            let f = 0.03 + 0.9 * f64::from(k) / 13.0;
            let g = if k == 7 { 6.0 } else { 0.3 };
            section((0.95, f * PI), (0.9, (1.0 - f) * PI), g)
        })
        .collect();
    let c = Cascade { rate: RATE, sections };
    let mut cases = 0;
    for format in [FixedFormat::q15(), FixedFormat::q23(), FixedFormat::q31()] {
        for (structure, ef) in [(Structure::Df1, 0), (Structure::Df1, 2), (Structure::Df2t, 0)] {
            for (rounding, overflow) in
                [(Rounding::Nearest, Overflow::Saturate), (Rounding::Even, Overflow::Wrap)]
            {
                let format = FixedFormat { rounding, overflow, error_feedback: ef, ..format };
                let fixed = quantize(&c, &format, structure).unwrap();
                let scale = SampleScale::new(format.data_bits).unwrap();
                for channels in [1, 2, 3] {
                    let loud = usize::from(channels > 1);
                    let mut x = exacting_input(scale, 5000, channels, 7);
                    // Quiet except for one loud stretch of one channel.
                    for (i, v) in x.iter_mut().enumerate() {
                        if i % channels != loud || !(2500..2600).contains(&(i / channels)) {
                            *v /= 64;
                        }
                    }
                    let mut want = x.clone();
                    let want_overflows = reference::fixed_cascade(&fixed, channels, &mut want);
                    for frames in [5000, 2047, 2049] {
                        for build in BUILDS {
                            let (got, overflows) =
                                fixed_engine_in_blocks(&fixed, channels, &x, frames, build);
                            let case =
                                format!("{format:?} {structure:?} {channels} {frames} {build}");
                            assert!(got == want, "output differs: {case}");
                            assert_eq!(overflows, want_overflows, "{case}");
                        }
                    }
                    cases += usize::from(want_overflows > 0);
                }
            }
        }
    }
    // The loud stretch must reach the exact path in most cases, or the test would not
    // cover the redone waves.
    assert!(cases >= 18, "only {cases} cases overflowed");
}

#[test]
fn q31_sums_that_overflow_64_bits_saturate_and_wrap_exactly() {
    // Five products of up to 2^62 each pass i64: the overflow-checked sum must fall
    // back to exact arithmetic. Coefficients near ±1.99 in Q2.30 with full-scale input.
    let s = Sos { b: [1.99, 1.99, 1.99], a: [-1.99, 0.995] };
    let c = Cascade { rate: RATE, sections: vec![s, s] };
    for overflow in [Overflow::Saturate, Overflow::Wrap] {
        for structure in [Structure::Df1, Structure::Df2t] {
            let format = FixedFormat { overflow, ..FixedFormat::q31() };
            let fixed = quantize(&c, &format, structure).unwrap();
            let scale = SampleScale::new(32).unwrap();
            let x = exacting_input(scale, 2000, 2, 11);
            let mut want = x.clone();
            let want_overflows = reference::fixed_cascade(&fixed, 2, &mut want);
            assert!(want_overflows > 0, "{overflow:?} {structure}: no overflow exercised");
            let (got, overflows) = fixed_engine_in_blocks(&fixed, 2, &x, 100, "best");
            assert_eq!(got, want, "{overflow:?} {structure}");
            assert_eq!(overflows, want_overflows, "{overflow:?} {structure}");
        }
    }
}

#[test]
fn gains_one_lsb_either_side_of_one_narrow_exactly_at_the_edges_of_the_data_word() {
    // Sums within a step of the data word's ends decide between the fast path and an
    // overflow: every rounding and overflow, every preset and accumulator, inputs at
    // and next to both extremes, gains of 1 ± a few coefficient LSBs.
    let bases = [
        FixedFormat::q15(),
        FixedFormat { acc_bits: 64, ..FixedFormat::q15() },
        FixedFormat::q23(),
        FixedFormat::q31(),
    ];
    for base in bases {
        for rounding in [Rounding::Nearest, Rounding::Floor, Rounding::Even] {
            for overflow in [Overflow::Saturate, Overflow::Wrap] {
                for structure in [Structure::Df1, Structure::Df2t] {
                    let format = FixedFormat { rounding, overflow, ..base };
                    let scale = SampleScale::new(format.data_bits).unwrap();
                    let (min, max) = (scale.min(), scale.max());
                    let x: Vec<i32> =
                        vec![max, max - 1, min, min + 1, max, min, -1, 0, 1, max, max, min, min];
                    for k in -3i32..=3 {
                        let g = 1.0 + f64::from(k) * 2f64.powi(1 - format.coef_bits as i32);
                        let s = Sos { b: [g, 0.0, 0.0], a: [0.0, 0.0] };
                        let c = Cascade { rate: RATE, sections: vec![s] };
                        let fixed = quantize(&c, &format, structure).unwrap();
                        let mut want = x.clone();
                        let want_overflows = reference::fixed_cascade(&fixed, 1, &mut want);
                        // One-frame blocks: a block that overflows anywhere runs
                        // exactly throughout, so each sample needs its own block here.
                        for frames in [1, 5] {
                            let (got, n) = fixed_engine_in_blocks(&fixed, 1, &x, frames, "best");
                            let what = format!("{format:?} {structure} gain {g} by {frames}");
                            assert_eq!((&got, n), (&want, want_overflows), "{what}");
                        }
                    }
                }
            }
        }
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 64, ..ProptestConfig::default() })]

    #[test]
    fn fixed_kernels_take_any_sample_of_the_data_word_and_return_samples_in_it(
        sections in prop::collection::vec(
            (0.05..1.05f64, 0.0..PI, 0.0..1.5f64, 0.0..PI, 0.1..100.0f64)
                .prop_map(|(pr, pa, zr, za, g)| section((pr, pa), (zr, za), g)),
            1..5,
        ),
        (format, structure) in formats(),
        codes in prop::collection::vec(
            prop_oneof![Just(i32::MIN), Just(i32::MAX), Just(0), Just(-1), any::<i32>()],
            1..600,
        ),
    ) {
        // Unstable and high-gain cascades (poles to radius 1.05, gains to 100, as a
        // forced run may hold) fed extreme and random codes: no panic, and every output
        // is a code of the data word, whatever saturation or wrap did on the way.
        let c = Cascade { rate: RATE, sections };
        let Ok(fixed) = quantize(&c, &format, structure) else { return Ok(()) };
        let scale = SampleScale::new(format.data_bits).unwrap();
        let shift = 32 - format.data_bits;
        let mut x: Vec<i32> = codes.iter().map(|&v| v >> shift).collect();
        FixedEngine::new(&fixed, 1).unwrap().process(&mut x).unwrap();
        for v in x {
            prop_assert!((scale.min()..=scale.max()).contains(&v), "{v} outside the data word");
        }
    }
}

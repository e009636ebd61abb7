//! Test signals, dither and metrics checked against their published definitions:
//! Goertzel (Amer. Math. Monthly 65(1), 1958) for tone levels, Farina (AES preprint
//! 5093, 2000) for the sweep, the 1/f law of pink noise, Karplus-Strong (Computer
//! Music Journal 7(2), 1983) for the pluck, and Lipshitz, Wannamaker, Vanderkooy
//! ("Quantization and dither: a theoretical survey", JAES 40(5), 1992) for TPDF dither.

use std::f64::consts::PI;
use tonewright::audio::dither::TpdfDither;
use tonewright::audio::metrics::{amp_to_db, channel, goertzel_amplitude, LevelMeter};
use tonewright::audio::signal::{
    impulse, log_sweep, mix_hum, multitone, pink_noise, pluck, sine, white_noise, Mains, SignalSpec,
};
use tonewright::audio::{SampleFormat, WavReader, WavSpec, WavWriter};

const F64: SampleFormat = SampleFormat::Float { bits: 64 };

fn spec(rate: u32, channels: u16, seconds: f64, level_dbfs: f64) -> SignalSpec {
    SignalSpec { rate, channels, seconds, level_dbfs }
}

#[test]
fn sine_has_its_level_and_frequency_in_every_channel() {
    let x = sine(&spec(48_000, 2, 1.0, -6.0), 997.0).unwrap();
    assert_eq!(x.len(), 96_000);
    for c in 0..2 {
        let mono = channel(&x, 2, c);
        // Goertzel at the tone: the level asked for (997 whole periods in 1 s).
        assert!((amp_to_db(goertzel_amplitude(&mono, 48_000.0, 997.0)) + 6.0).abs() < 0.001);
        // 10 bins away the Hann-windowed reading is far down (Harris 1978: sidelobes
        // fall 18 dB/octave), so the energy is at 997 Hz and nowhere near 1007 Hz.
        assert!(amp_to_db(goertzel_amplitude(&mono, 48_000.0, 1007.0)) < -80.0);
    }
    let mut meter = LevelMeter::new(2, F64);
    meter.add(&x);
    for l in meter.levels() {
        // Peak −6 dBFS; RMS 3.0103 dB lower (sine RMS = peak/√2).
        assert!((l.peak_dbfs + 6.0).abs() < 1e-3, "{l:?}");
        assert!((l.rms_dbfs + 9.0103).abs() < 1e-3, "{l:?}");
    }
}

/// Times of upward zero crossings (linearly interpolated) 10 periods apart.
fn ten_period_spans(x: &[f64], rate: f64) -> Vec<(f64, f64)> {
    let crossings: Vec<f64> = x
        .windows(2)
        .enumerate()
        .filter(|(_, w)| w[0] < 0.0 && w[1] >= 0.0)
        .map(|(n, w)| (n as f64 + w[0] / (w[0] - w[1])) / rate)
        .collect();
    crossings.windows(11).map(|t| (t[0], t[10])).collect()
}

#[test]
fn log_sweep_follows_farinas_instantaneous_frequency_from_start_to_end() {
    // Farina 2000: f(t) = f1·exp(k·t), k = ln(f2/f1)/T. Its integral from a to b,
    // f1/k·(exp(k·b) − exp(k·a)), counts the cycles between two times: exactly 10
    // between crossings 10 periods apart. Spans of 10 periods divide the interpolation
    // error of each crossing time by 10; at 96 kHz even f2 has 12 samples per period,
    // where linear interpolation places a crossing within about 1e-4 of a period.
    let (f1, f2, seconds, rate) = (100.0, 8000.0, 2.0, 96_000.0);
    let x = log_sweep(&spec(96_000, 1, seconds, -1.0), f1, f2).unwrap();
    let k = (f2 / f1).ln() / seconds;
    let spans = ten_period_spans(&x, rate);
    for &(a, b) in &spans {
        let cycles = f1 / k * ((k * b).exp() - (k * a).exp());
        assert!((cycles - 10.0).abs() < 0.005, "from {a} s to {b} s: {cycles} cycles");
    }
    // The spans cover the sweep: the first starts in the first period of f1, the last
    // ends within two periods of f2 of the end, where 10 cycles take 10/f2.
    let (first, last) = (spans[0], spans[spans.len() - 1]);
    assert!(first.0 < 1.0 / f1, "{first:?}");
    assert!(last.1 > seconds - 2.0 / f2 && ((last.1 - last.0) * f2 / 10.0 - 1.0).abs() < 0.01);
}

/// Mean power density (Hann-windowed Goertzel, averaged over 4096-sample segments and
/// 8 frequencies spread over the octave) in dB, at octave centres 125 Hz … 8 kHz.
fn octave_levels_db(x: &[f64], rate: f64) -> Vec<(f64, f64)> {
    let centres = [125.0, 250.0, 500.0, 1000.0, 2000.0, 4000.0, 8000.0];
    centres
        .iter()
        .map(|&fc| {
            let mut sum = 0.0;
            let mut count = 0;
            for seg in x.chunks_exact(4096) {
                for k in 0..8 {
                    let f = fc * 2f64.powf((f64::from(k) - 3.5) / 8.0);
                    sum += goertzel_amplitude(seg, rate, f).powi(2);
                    count += 1;
                }
            }
            (fc, 10.0 * (sum / f64::from(count)).log10())
        })
        .collect()
}

/// Least-squares slope in dB per octave.
fn slope_db_per_octave(points: &[(f64, f64)]) -> f64 {
    let xs: Vec<f64> = points.iter().map(|p| p.0.log2()).collect();
    let n = xs.len() as f64;
    let (mx, my) = (xs.iter().sum::<f64>() / n, points.iter().map(|p| p.1).sum::<f64>() / n);
    let sxy: f64 = xs.iter().zip(points).map(|(x, p)| (x - mx) * (p.1 - my)).sum();
    let sxx: f64 = xs.iter().map(|x| (x - mx).powi(2)).sum();
    sxy / sxx
}

#[test]
fn pink_noise_falls_3_db_per_octave_and_white_noise_is_flat() {
    // Pink noise has power density ∝ 1/f: 10·log10(2) = 3.01 dB less per octave.
    // Each octave averages 64 segments × 8 frequencies; the spread of such averages is
    // about 0.2 dB here, so the fitted slope over 6 octaves is good to about 0.05
    // dB/octave; the 0.15 tolerance leaves room for Kellet's own ±0.05 dB ripple.
    let s = spec(48_000, 1, 262_144.0 / 48_000.0, -20.0);
    let pink = pink_noise(&s, 11).unwrap();
    let octaves = octave_levels_db(&pink, 48_000.0);
    let slope = slope_db_per_octave(&octaves);
    assert!((slope + 3.0103).abs() < 0.15, "pink slope {slope} dB/octave: {octaves:?}");
    for &(f, db) in &octaves {
        let line = octaves[3].1 + slope * (f / 1000.0).log2();
        assert!((db - line).abs() < 0.5, "pink at {f} Hz off the line by {}", db - line);
    }
    let white = white_noise(&s, 11).unwrap();
    let slope = slope_db_per_octave(&octave_levels_db(&white, 48_000.0));
    assert!(slope.abs() < 0.15, "white slope {slope} dB/octave");
}

type Generator = fn(&SignalSpec, u64) -> tonewright::Result<Vec<f64>>;

#[test]
fn noise_meets_its_rms_level_with_independent_reproducible_channels() {
    let s = spec(48_000, 2, 0.5, -23.0);
    for (name, make) in [("white", white_noise as Generator), ("pink", pink_noise as Generator)] {
        let x = make(&s, 42).unwrap();
        let mut meter = LevelMeter::new(2, F64);
        meter.add(&x);
        for l in meter.levels() {
            assert!((l.rms_dbfs + 23.0).abs() < 1e-9, "{name}: {l:?}");
        }
        let (a, b) = (channel(&x, 2, 0), channel(&x, 2, 1));
        let corr: f64 = a.iter().zip(&b).map(|(p, q)| p * q).sum::<f64>()
            / (a.iter().map(|p| p * p).sum::<f64>() * b.iter().map(|q| q * q).sum::<f64>()).sqrt();
        // Independent channels: correlation of order 1/√N (N = 24000 frames, fewer
        // effective ones for pink), 0.1 is many standard errors away from 1.
        assert!(corr.abs() < 0.1, "{name}: channels correlate {corr}");
        assert_eq!(make(&s, 42).unwrap(), x, "{name}: same seed, same samples");
        assert_ne!(make(&s, 43).unwrap(), x, "{name}: different seed, different samples");
    }
}

#[test]
fn hum_has_each_harmonic_at_its_stated_level_and_leaves_the_signal_alone() {
    // Stated series: harmonic n of the mains frequency at level − 20·log10(n), n = 1..8.
    for mains in [Mains::Hz50, Mains::Hz60] {
        let tone = sine(&spec(48_000, 2, 1.0, -12.0), 1000.0).unwrap();
        let mut x = tone.clone();
        mix_hum(&mut x, 2, 48_000, mains, -40.0).unwrap();
        let mono = channel(&x, 2, 1);
        for n in 1..=8 {
            let f = mains.hz() * f64::from(n);
            let got = amp_to_db(goertzel_amplitude(&mono, 48_000.0, f));
            let want = -40.0 - amp_to_db(f64::from(n));
            assert!((got - want).abs() < 0.01, "{mains:?} harmonic {n}: {got} dB, want {want}");
        }
        let ninth = amp_to_db(goertzel_amplitude(&mono, 48_000.0, mains.hz() * 9.0));
        assert!(ninth < -100.0, "{mains:?}: no 9th harmonic, got {ninth} dB");
        let kept = amp_to_db(goertzel_amplitude(&mono, 48_000.0, 1000.0));
        assert!((kept + 12.0).abs() < 0.01, "the signal under the hum is unchanged: {kept}");
    }
    let mut odd = vec![0.0; 3];
    assert!(mix_hum(&mut odd, 2, 48_000, Mains::Hz50, -40.0).is_err());
}

#[test]
fn impulse_and_multitone_have_their_levels() {
    let x = impulse(&spec(8000, 2, 0.01, -6.0)).unwrap();
    let a = 10f64.powf(-6.0 / 20.0);
    assert_eq!(&x[..4], &[a, a, 0.0, 0.0]);
    assert!(x[2..].iter().all(|&v| v == 0.0));
    let freqs = [100.0, 1000.0, 5000.0];
    let y = multitone(&spec(48_000, 1, 1.0, -3.0), &freqs).unwrap();
    for f in freqs {
        // Each of 3 tones at 1/3 of the level: −3 dB − 9.54 dB.
        let got = amp_to_db(goertzel_amplitude(&y, 48_000.0, f));
        assert!((got - (-3.0 - amp_to_db(3.0))).abs() < 0.01, "{f} Hz: {got}");
    }
    assert!(y.iter().all(|v| v.abs() <= 10f64.powf(-3.0 / 20.0)));
}

#[test]
fn pluck_rings_at_rate_over_p_plus_half_and_decays() {
    // Karplus & Strong 1983: the two-point average delays by half a sample, so the
    // loop of p samples sounds at rate/(p + 1/2); p = round(48000/220 − 1/2) = 218.
    let x = pluck(&spec(48_000, 1, 1.0, -6.0), 220.0, 3).unwrap();
    let f0 = 48_000.0 / 218.5;
    let at = |f: f64| amp_to_db(goertzel_amplitude(&x, 48_000.0, f));
    assert!(at(f0) > at(1.5 * f0) + 30.0, "{} vs {}", at(f0), at(1.5 * f0));
    assert!(at(f0) > at(f0 * 1.02) + 20.0, "the peak is at rate/(p + 1/2)");
    let rms = |s: &[f64]| (s.iter().map(|v| v * v).sum::<f64>() / s.len() as f64).sqrt();
    assert!(rms(&x[36_000..]) < 0.5 * rms(&x[..12_000]), "the note decays");
    assert!(x.iter().all(|v| v.abs() <= 10f64.powf(-6.0 / 20.0)));
}

#[test]
fn signal_parameters_out_of_range_are_refused_with_the_value() {
    let s = spec(48_000, 1, 1.0, -6.0);
    let err = sine(&s, 24_000.0).unwrap_err().to_string();
    assert!(err.contains("24000 Hz must be above 0 and below rate/2 = 24000 Hz"), "{err}");
    assert!(log_sweep(&s, 0.0, 1000.0).is_err());
    assert!(multitone(&s, &[]).is_err());
    assert!(sine(&spec(48_000, 0, 1.0, 0.0), 1000.0).is_err());
    assert!(sine(&spec(48_000, 1, -1.0, 0.0), 1000.0).is_err());
    assert!(sine(&spec(48_000, 1, f64::NAN, 0.0), 1000.0).is_err());
    let err = white_noise(&spec(48_000, 8, 1e6, -20.0), 1).unwrap_err().to_string();
    assert!(err.contains("more than 268435456 samples"), "{err}");
}

#[test]
fn tpdf_dither_is_triangular_on_plus_minus_one_lsb_with_variance_one_sixth() {
    // Lipshitz et al. 1992: TPDF dither is the sum of two independent uniform
    // variables of 1 LSB width. Each has variance Δ²/12, so the dither has mean 0,
    // variance Δ²/6 (not Δ²/4, which is the TOTAL error of dither plus rounding,
    // checked below), and the triangular density 1 − |d| on (−1, 1) LSB.
    let n = 1_000_000;
    let mut d = TpdfDither::new(2024);
    let values: Vec<f64> = (0..n).map(|_| d.next_lsb()).collect();
    let mean = values.iter().sum::<f64>() / n as f64;
    let var = values.iter().map(|v| (v - mean).powi(2)).sum::<f64>() / n as f64;
    // Standard errors: √(1/6 / n) = 4.1e-4 for the mean; for the variance
    // √((E[d⁴] − σ⁴)/n) with E[d⁴] = 1/15: √((1/15 − 1/36)/n) = 2.0e-4. Five of each.
    assert!(mean.abs() < 5.0 * 4.1e-4, "mean {mean}");
    assert!((var - 1.0 / 6.0).abs() < 5.0 * 2.0e-4, "variance {var}");
    assert!(values.iter().all(|v| v.abs() < 1.0));
    // Histogram of 20 bins against the triangle's probability per bin.
    let mut counts = [0u32; 20];
    for v in &values {
        counts[((v + 1.0) * 10.0) as usize] += 1;
    }
    let cdf =
        |x: f64| if x < 0.0 { (1.0 + x).powi(2) / 2.0 } else { 1.0 - (1.0 - x).powi(2) / 2.0 };
    for (i, &c) in counts.iter().enumerate() {
        let (lo, hi) = (-1.0 + i as f64 / 10.0, -1.0 + (i + 1) as f64 / 10.0);
        let p = cdf(hi) - cdf(lo);
        let sd = (n as f64 * p * (1.0 - p)).sqrt();
        assert!(
            (f64::from(c) - n as f64 * p).abs() < 5.0 * sd,
            "bin {i}: {c}, want {}",
            n as f64 * p
        );
    }
    let mut again = TpdfDither::new(2024);
    assert!(values.iter().take(1000).all(|&v| v == again.next_lsb()), "seeded: same sequence");
}

#[test]
fn dithered_16_bit_output_has_error_mean_0_and_variance_a_quarter_lsb_squared_for_any_input() {
    // Lipshitz et al. 1992: with ±1 LSB TPDF dither before rounding, the first two
    // moments of the total error are independent of the signal: mean 0 and variance
    // Δ²/6 (dither) + Δ²/12 (rounding) = Δ²/4. Without dither a constant input gives a
    // constant error that depends on the input (no error at 0 LSB, 0.25 LSB at 0.25),
    // which is the noise modulation TPDF removes. Checked through the WAV writer.
    let dir = std::env::temp_dir().join(format!("tonewright-signals-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let lsb = 1.0 / 32768.0;
    let n = 200_000;
    for offset in [0.0, 0.25, 0.5, 0.75] {
        let value = (100.0 + offset) * lsb;
        let path = dir.join(format!("dither-{offset}.wav"));
        let spec = WavSpec { channels: 1, rate: 48_000, sample: SampleFormat::Int { bits: 16 } };
        let mut w = WavWriter::create(&path, spec, &[]).unwrap().with_tpdf_dither(9).unwrap();
        w.write_block(&vec![value; n]).unwrap();
        w.finish().unwrap();
        let mut r = WavReader::open(&path).unwrap();
        let mut got = Vec::new();
        r.read_block(&mut got, n).unwrap();
        let errors: Vec<f64> = got.iter().map(|x| (x - value) / lsb).collect();
        let mean = errors.iter().sum::<f64>() / n as f64;
        let var = errors.iter().map(|e| (e - mean).powi(2)).sum::<f64>() / n as f64;
        // Standard errors at n = 200000: mean √(1/4 / n) = 1.1e-3; variance
        // √((E[e⁴] − 1/16)/n) ≈ √(0.1/n) = 7e-4 (E[e⁴] ≈ 0.1625 for a sum of three
        // uniforms); about 5 of each.
        assert!(mean.abs() < 0.006, "offset {offset}: mean {mean} LSB");
        assert!((var - 0.25).abs() < 0.0035, "offset {offset}: variance {var} LSB²");
        // A TPDF-dithered error never exceeds 1.5 LSB.
        assert!(errors.iter().all(|e| e.abs() < 1.5 + 1e-9));
    }
}

#[test]
fn sine_written_at_16_bits_has_the_textbook_quantisation_snr() {
    // Oppenheim & Schafer 2010: a full-scale sine rounded to N bits has SNR ≈
    // 6.02·N + 1.76 dB (98.1 dB at 16 bits), for rounding error that is uniform and
    // uncorrelated with the signal (true for a sine of a non-rational period).
    let dir = std::env::temp_dir().join(format!("tonewright-snr-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let x = sine(&spec(48_000, 1, 1.0, -0.001), 1000.0 * PI / 3.0).unwrap();
    let path = dir.join("sine.wav");
    let spec16 = WavSpec { channels: 1, rate: 48_000, sample: SampleFormat::Int { bits: 16 } };
    let mut w = WavWriter::create(&path, spec16, &[]).unwrap();
    w.write_block(&x).unwrap();
    assert_eq!(w.finish().unwrap().overs, 0);
    let mut got = Vec::new();
    WavReader::open(&path).unwrap().read_block(&mut got, x.len()).unwrap();
    let snr = tonewright::audio::metrics::snr_db(&got, &x).unwrap();
    assert!((snr - (6.02 * 16.0 + 1.76)).abs() < 0.2, "snr {snr} dB");
}

#[test]
fn committed_demo_recording_carries_the_stated_50_hz_hum_series() {
    // examples/make_demo_audio.rs states: hum harmonic n at −36 − 20·log10(n) dBFS,
    // n = 1..8. The phrase's partials below 410 Hz sit at least 10 Hz from every
    // multiple of 50 Hz, far outside the 6 s Hann window's main lobe, but notes that
    // start abruptly and decay have broad spectral skirts: they move the readings by
    // up to 0.12 dB (measured when the file was made), hence 0.3 dB.
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("audio-demos/plucked-phrase-hum50-48k-16bit.wav");
    let mut reader = WavReader::open(&path).unwrap();
    let spec = reader.spec();
    assert_eq!(
        (spec.channels, spec.rate, spec.sample),
        (1, 48_000, SampleFormat::Int { bits: 16 })
    );
    assert!(std::fs::metadata(&path).unwrap().len() < 2_000_000, "demo WAVs stay under 2 MB");
    let mut x = Vec::new();
    reader.read_block(&mut x, usize::MAX).unwrap();
    for n in 1..=8 {
        let got = amp_to_db(goertzel_amplitude(&x, 48_000.0, 50.0 * f64::from(n)));
        let want = -36.0 - amp_to_db(f64::from(n));
        assert!((got - want).abs() < 0.3, "harmonic {n}: {got} dB, want {want}");
    }
}

//! Levels and tone measurements of sample blocks.
//!
//! In: interleaved `f64` blocks (any number, streamed into a [`LevelMeter`]) or mono
//! slices. Out: per-channel peak and RMS in dBFS and clipped-sample counts, the SNR of
//! a signal against a reference, the amplitude of one tone, and how much a process
//! rejected a tone. dBFS as in the [`crate::audio`] conventions: 20·log10 of the
//! amplitude, so a full-scale sine has 0 dBFS peak and −3.01 dBFS RMS. Silence reads
//! −∞ dB.
//!
//! The tone measurement is the Goertzel recursion (reference 1) over a Hann-windowed
//! block, evaluated at the exact frequency asked for (not the nearest FFT bin). The
//! window keeps other content (music, hiss, neighbouring harmonics) from leaking into
//! the reading; its coherent gain is divided out, so a sine of amplitude A reads A
//! when the block holds at least a few periods.
//!
//! # References
//! 1. G. Goertzel, "An algorithm for the evaluation of finite trigonometric series",
//!    American Mathematical Monthly 65(1), 1958.
//! 2. F. J. Harris, "On the use of windows for harmonic analysis with the discrete
//!    Fourier transform", Proc. IEEE 66(1), 1978 (Hann window, coherent gain 0.5).

use super::SampleFormat;
use crate::error::{Error, Result};
use crate::isa::Isa;
use serde::Serialize;
use std::f64::consts::PI;

/// An amplitude ratio in dB: 20·log10(`amp`).
pub fn amp_to_db(amp: f64) -> f64 {
    20.0 * amp.log10()
}

/// A level in dB as an amplitude ratio: 10^(`db`/20).
pub fn db_to_amp(db: f64) -> f64 {
    10f64.powf(db / 20.0)
}

/// Levels of one channel.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct ChannelLevels {
    /// Largest |sample| in dBFS.
    pub peak_dbfs: f64,
    /// 20·log10 of the root mean square in dBFS.
    pub rms_dbfs: f64,
    /// Samples at or beyond full scale of the format (what clipping leaves behind).
    pub clipped: u64,
}

/// Samples in a run of whole frames when the channel count divides it: a fixed-size run
/// lets the meter's loop vectorise completely.
const RUN: usize = 24;

/// Accumulates per-channel peak, RMS and clipped samples over a stream of blocks.
///
/// The accumulators are lanes over a run of whole frames (24 samples when the channel
/// count divides 24, else one frame): lane l always meets channel l mod n, so the loop
/// vectorises and several running sums break the add chain of one.
#[derive(Debug, Clone)]
pub struct LevelMeter {
    channels: usize,
    positive_full_scale: f64,
    /// Per lane.
    peak: Vec<f64>,
    sum_squares: Vec<f64>,
    clipped: Vec<u64>,
    frames: u64,
}

impl LevelMeter {
    /// A meter for `channels` interleaved channels of samples stored as `format`; a
    /// sample counts as clipped at or below −1.0 or at or above the format's largest
    /// positive value (32767/32768 for 16-bit).
    pub fn new(channels: u16, format: SampleFormat) -> LevelMeter {
        let n = usize::from(channels.max(1));
        let lanes = if RUN.is_multiple_of(n) { RUN } else { n };
        LevelMeter {
            channels: n,
            positive_full_scale: format.positive_full_scale(),
            peak: vec![0.0; lanes],
            sum_squares: vec![0.0; lanes],
            clipped: vec![0; lanes],
            frames: 0,
        }
    }

    /// Adds a block of interleaved frames; a trailing partial frame is ignored.
    pub fn add(&mut self, block: &[f64]) {
        let frames = block.len() / self.channels;
        let block = &block[..frames * self.channels];
        Isa::run_widest(
            #[inline(always)]
            || match (
                <&mut [f64; RUN]>::try_from(&mut self.peak[..]),
                <&mut [f64; RUN]>::try_from(&mut self.sum_squares[..]),
                <&mut [u64; RUN]>::try_from(&mut self.clipped[..]),
            ) {
                // Exactly RUN lanes, not just at least: 25 channels keep 25.
                (Ok(peak), Ok(sum), Ok(clipped)) => {
                    let (runs, rest) = block.as_chunks::<RUN>();
                    for run in runs {
                        meter(run, peak, sum, clipped, self.positive_full_scale);
                    }
                    meter(rest, peak, sum, clipped, self.positive_full_scale);
                }
                _ => {
                    for run in block.chunks(self.peak.len()) {
                        meter(
                            run,
                            &mut self.peak,
                            &mut self.sum_squares,
                            &mut self.clipped,
                            self.positive_full_scale,
                        );
                    }
                }
            },
        );
        self.frames += frames as u64;
    }

    /// The levels of each channel so far (RMS of no frames is −∞).
    pub fn levels(&self) -> Vec<ChannelLevels> {
        let n = self.channels;
        let lanes = |c: usize| (c..self.peak.len()).step_by(n);
        (0..n)
            .map(|c| ChannelLevels {
                peak_dbfs: amp_to_db(lanes(c).map(|l| self.peak[l]).fold(0.0, f64::max)),
                rms_dbfs: amp_to_db(
                    (lanes(c).map(|l| self.sum_squares[l]).sum::<f64>()
                        / self.frames.max(1) as f64)
                        .sqrt(),
                ),
                clipped: lanes(c).map(|l| self.clipped[l]).sum(),
            })
            .collect()
    }
}

/// Adds one run of samples (starting on a frame) to the lanes it meets.
#[inline(always)]
fn meter(run: &[f64], peak: &mut [f64], sum: &mut [f64], clipped: &mut [u64], full: f64) {
    for (((&x, sum), peak), clipped) in run.iter().zip(sum).zip(peak).zip(clipped) {
        *sum += x * x;
        *peak = peak.max(x.abs());
        *clipped += u64::from(x <= -1.0 || x >= full);
    }
}

/// Channel `index` of interleaved frames as a mono vector.
pub fn channel(interleaved: &[f64], channels: usize, index: usize) -> Vec<f64> {
    interleaved.iter().skip(index).step_by(channels.max(1)).copied().collect()
}

/// Signal-to-noise ratio in dB of `signal` against `reference`: the power of the
/// reference over the power of their difference (+∞ when they are equal).
///
/// # Errors
/// [`Error::Input`] when the two have different lengths.
pub fn snr_db(signal: &[f64], reference: &[f64]) -> Result<f64> {
    if signal.len() != reference.len() {
        return Err(Error::input(format!(
            "snr: signal has {} samples, reference has {}",
            signal.len(),
            reference.len()
        )));
    }
    let (power, noise) = powers(signal, reference);
    Ok(10.0 * (power / noise).log10())
}

/// Σ r² of `reference` and Σ (s − r)² of `signal`'s error against it, each in eight
/// running sums so the loop vectorises; one pass over both, which have equal lengths.
pub fn powers(signal: &[f64], reference: &[f64]) -> (f64, f64) {
    debug_assert_eq!(signal.len(), reference.len());
    let (s_runs, s_rest) = signal.as_chunks::<8>();
    let (r_runs, r_rest) = reference.as_chunks::<8>();
    let (mut power, mut error) = ([0.0; 8], [0.0; 8]);
    for (s, r) in s_runs.iter().zip(r_runs) {
        for l in 0..8 {
            power[l] += r[l] * r[l];
            let e = s[l] - r[l];
            error[l] += e * e;
        }
    }
    let rest = s_rest.iter().zip(r_rest);
    let power_rest: f64 = r_rest.iter().map(|r| r * r).sum();
    let error_rest: f64 = rest.map(|(s, r)| (s - r) * (s - r)).sum();
    (power.iter().sum::<f64>() + power_rest, error.iter().sum::<f64>() + error_rest)
}

/// A streaming Hann-windowed Goertzel detector for one frequency over a block of
/// known length, fed sample by sample (reference 1).
#[derive(Debug, Clone)]
pub struct ToneMeter {
    coeff: f64,
    len: usize,
    seen: usize,
    s1: f64,
    s2: f64,
    window_sum: f64,
}

impl ToneMeter {
    /// A detector for `freq_hz` at `rate_hz` over `len` samples.
    pub fn new(rate_hz: f64, freq_hz: f64, len: usize) -> Self {
        let coeff = 2.0 * (2.0 * PI * freq_hz / rate_hz).cos();
        ToneMeter { coeff, len, seen: 0, s1: 0.0, s2: 0.0, window_sum: 0.0 }
    }

    /// Feeds samples; those beyond the stated length are ignored.
    pub fn add(&mut self, mono: impl IntoIterator<Item = f64>) {
        for x in mono {
            if self.seen >= self.len {
                return;
            }
            // Periodic Hann window over the block: exactly N/2 coherent gain.
            let w = 0.5 - 0.5 * (2.0 * PI * self.seen as f64 / self.len as f64).cos();
            self.window_sum += w;
            let s0 = x * w + self.coeff * self.s1 - self.s2;
            self.s2 = self.s1;
            self.s1 = s0;
            self.seen += 1;
        }
    }

    /// The amplitude of the sine found (0 before any sample).
    pub fn amplitude(&self) -> f64 {
        if self.window_sum == 0.0 {
            return 0.0;
        }
        // |X(ω)|² from the last two states (reference 1).
        let power =
            (self.s1 * self.s1 + self.s2 * self.s2 - self.coeff * self.s1 * self.s2).max(0.0);
        2.0 * power.sqrt() / self.window_sum
    }
}

/// The amplitude of the sine at `freq_hz` in a mono block sampled at `rate_hz`
/// (Hann-windowed Goertzel; 0 for an empty block).
///
/// ```
/// use tonewright::audio::metrics::goertzel_amplitude;
/// let x: Vec<f64> = (0..4800)
///     .map(|n| 0.25 * (2.0 * std::f64::consts::PI * 1000.0 * n as f64 / 48000.0).sin())
///     .collect();
/// // 100 whole periods: exact up to rounding.
/// assert!((goertzel_amplitude(&x, 48000.0, 1000.0) - 0.25).abs() < 1e-9);
/// ```
pub fn goertzel_amplitude(mono: &[f64], rate_hz: f64, freq_hz: f64) -> f64 {
    let mut meter = ToneMeter::new(rate_hz, freq_hz, mono.len());
    meter.add(mono.iter().copied());
    meter.amplitude()
}

/// How many dB a process lowered the tone at `freq_hz`: its level in `input` minus its
/// level in `output` (both mono, sampled at `rate_hz`).
pub fn tone_rejection_db(input: &[f64], output: &[f64], rate_hz: f64, freq_hz: f64) -> f64 {
    amp_to_db(goertzel_amplitude(input, rate_hz, freq_hz))
        - amp_to_db(goertzel_amplitude(output, rate_hz, freq_hz))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sine(amp: f64, freq: f64, rate: f64, n: usize) -> Vec<f64> {
        (0..n).map(|i| amp * (2.0 * PI * freq * i as f64 / rate).sin()).collect()
    }

    #[test]
    fn full_scale_sine_reads_0_dbfs_peak_and_minus_3_01_rms() {
        // A sine's RMS is peak/√2: −3.0103 dB (textbook identity).
        let x = sine(1.0, 1000.0, 48000.0, 48000);
        let mut meter = LevelMeter::new(1, SampleFormat::Float { bits: 64 });
        meter.add(&x);
        let l = meter.levels()[0];
        assert!(l.peak_dbfs.abs() < 1e-6, "{l:?}");
        assert!((l.rms_dbfs + 3.0103).abs() < 1e-3, "{l:?}");
        // Peaks touch ±1.0 exactly at quarter periods (48 samples per period).
        assert!(l.clipped > 0);
    }

    #[test]
    fn meter_lanes_equal_a_plain_per_channel_count_for_any_channels_and_blocks() {
        // Channel counts that divide the 24-sample run and ones that do not; blocks that
        // end mid-run and a trailing partial frame.
        let mut rng = crate::audio::dither::SplitMix64::new(5);
        let x: Vec<f64> = (0..2411).map(|_| 2.2 * rng.next_f64() - 1.1).collect();
        for channels in [1usize, 2, 3, 5, 7, 25] {
            let mut meter = LevelMeter::new(channels as u16, SampleFormat::Int { bits: 16 });
            let mut start = 0;
            for len in [1, 23, 24, 25, 500].iter().cycle().map(|f| f * channels) {
                let end = (start + len).min(x.len());
                meter.add(&x[start..end]);
                start = end - (end - start) % channels;
                if end == x.len() {
                    break;
                }
            }
            let frames = start / channels;
            for (c, got) in meter.levels().iter().enumerate() {
                let ch: Vec<f64> = x[..start].iter().skip(c).step_by(channels).copied().collect();
                let peak = ch.iter().fold(0.0f64, |p, v| p.max(v.abs()));
                let rms = (ch.iter().map(|v| v * v).sum::<f64>() / frames as f64).sqrt();
                let clipped = ch.iter().filter(|&&v| v <= -1.0 || v >= 32767.0 / 32768.0).count();
                assert_eq!(got.peak_dbfs, amp_to_db(peak), "{channels} channels");
                assert!((got.rms_dbfs - amp_to_db(rms)).abs() < 1e-12, "{channels} channels");
                assert_eq!(got.clipped, clipped as u64, "{channels} channels");
            }
        }
    }

    #[test]
    fn meter_counts_16_bit_extreme_codes_as_clipped_per_channel() {
        let top = 32767.0 / 32768.0;
        let block = [top, 0.5, -1.0, 0.0, 0.1, 0.0];
        let mut meter = LevelMeter::new(2, SampleFormat::Int { bits: 16 });
        meter.add(&block[..4]);
        meter.add(&block[4..]);
        let l = meter.levels();
        assert_eq!((l[0].clipped, l[1].clipped), (2, 0));
        assert!((l[1].peak_dbfs - amp_to_db(0.5)).abs() < 1e-12);
    }

    #[test]
    fn snr_of_a_signal_with_known_error_power() {
        // Reference power 1 per sample, error power 0.01: 20 dB by definition.
        let reference = vec![1.0, -1.0, 1.0, -1.0];
        let signal: Vec<f64> = reference.iter().map(|r| r + 0.1).collect();
        assert!((snr_db(&signal, &reference).unwrap() - 20.0).abs() < 1e-9);
        assert!(snr_db(&signal, &reference[..3]).is_err());
    }

    #[test]
    fn powers_in_lanes_equal_plain_sums() {
        let mut rng = crate::audio::dither::SplitMix64::new(3);
        let r: Vec<f64> = (0..1003).map(|_| rng.next_f64() - 0.5).collect();
        let s: Vec<f64> = r.iter().map(|v| v + 0.01 * (rng.next_f64() - 0.5)).collect();
        let power: f64 = r.iter().map(|v| v * v).sum();
        let error: f64 = s.iter().zip(&r).map(|(a, b)| (a - b) * (a - b)).sum();
        let (got_power, got_error) = powers(&s, &r);
        assert!((got_power / power - 1.0).abs() < 1e-12);
        assert!((got_error / error - 1.0).abs() < 1e-12);
    }

    #[test]
    fn goertzel_reads_off_bin_tone_and_ignores_a_distant_one() {
        // 1234.5 Hz is not a bin of a 4800-sample block (10 Hz bins). The other tone is
        // 10.5 bins away, where the Hann transform's envelope is 1/(π·k·(k²−1)) = −71 dB
        // (reference 2); at 5x the amplitude that is an error below 0.02 dB.
        let mut x = sine(0.1, 1234.5, 48000.0, 4800);
        for (a, b) in x.iter_mut().zip(sine(0.5, 1339.5, 48000.0, 4800)) {
            *a += b;
        }
        let got = goertzel_amplitude(&x, 48000.0, 1234.5);
        assert!((amp_to_db(got) - amp_to_db(0.1)).abs() < 0.02, "{got}");
    }

    #[test]
    fn rejection_of_a_tone_halved_is_6_02_db() {
        let input = sine(0.5, 50.0, 48000.0, 48000);
        let output: Vec<f64> = input.iter().map(|x| x * 0.5).collect();
        let r = tone_rejection_db(&input, &output, 48000.0, 50.0);
        assert!((r - 6.0206).abs() < 1e-3, "{r}");
    }
}

//! Test signals: sine, exponential sweep, white and pink noise, impulse, multi-tone,
//! plucked string, and mains hum mixed under a signal.
//!
//! In: a [`SignalSpec`] (rate, channels, seconds, level in dBFS) and the signal's own
//! parameters. Out: interleaved `f64` frames, `round(seconds · rate)` of them.
//!
//! Level conventions: for deterministic signals (sine, sweep, impulse, multi-tone,
//! pluck, hum) the level is the peak amplitude, 10^(level/20); a multi-tone gives each
//! of its n tones 1/n of it so the sum never exceeds it. For noise it is the RMS of
//! each channel, met exactly (the generated block is scaled to it). Deterministic
//! signals are identical in every channel; noise channels are independent, each from
//! its own seed derived from the one given, so the same seed gives the same samples.
//!
//! Methods:
//! - Sweep: x(t) = sin(2π·f1·T/L·(e^{t·L/T} − 1)) with L = ln(f2/f1), whose
//!   instantaneous frequency is f1·e^{t·L/T} (reference 1).
//! - White noise: Gaussian by the Box-Muller transform (reference 2) from SplitMix64.
//! - Pink noise: white noise through P. Kellet's "refined" sum of six one-pole filters
//!   (reference 3), within ±0.05 dB of −3 dB/octave above 9.2 Hz at 44.1 kHz; at other
//!   rates its corner frequencies scale with the rate. The filter is run for 8192
//!   samples before the output starts so the slowest pole has settled.
//! - Pluck: Karplus-Strong (reference 4): a zero-mean noise burst in a delay line of p
//!   samples, each output the average of the two oldest; the averager adds half a sample
//!   of delay, so the pitch is rate/(p + 1/2) and p = round(rate/f − 1/2).
//! - Hum: harmonics n = 1..=8 of 50 or 60 Hz with amplitude level/n and sine phase
//!   (a buzzy ground-loop hum; the series is our choice, common practice, not a
//!   measurement), those at or above Nyquist left out.
//!
//! # References
//! 1. A. Farina, "Simultaneous measurement of impulse response and distortion with a
//!    swept-sine technique", AES 108th Convention, preprint 5093, 2000.
//! 2. G. E. P. Box, M. E. Muller, "A note on the generation of random normal deviates",
//!    Annals of Mathematical Statistics 29(2), 1958.
//! 3. P. Kellet, "Filter to make pink noise from white", music-dsp mailing list and
//!    musicdsp.org archive, 1999 (coefficients from that post, from memory).
//! 4. K. Karplus, A. Strong, "Digital synthesis of plucked-string and drum timbres",
//!    Computer Music Journal 7(2), 1983.

use super::dither::SplitMix64;
use super::metrics::db_to_amp;
use crate::error::{Error, Result};
use std::f64::consts::PI;

/// The longest signal generated in one piece, in samples (2 GiB of `f64`).
pub const MAX_SAMPLES: usize = 1 << 28;

/// How much signal to make and how loud.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SignalSpec {
    /// Sample rate in Hz.
    pub rate: u32,
    /// Interleaved channels.
    pub channels: u16,
    /// Duration in seconds.
    pub seconds: f64,
    /// Level in dBFS: peak for deterministic signals, RMS for noise.
    pub level_dbfs: f64,
}

impl SignalSpec {
    /// The number of frames, checking the spec.
    ///
    /// # Errors
    /// [`Error::Input`] for zero rate or channels, a negative or non-finite duration or
    /// level, or more than [`MAX_SAMPLES`] samples.
    pub fn frames(&self) -> Result<usize> {
        if self.rate == 0 || self.channels == 0 {
            return Err(Error::input(format!(
                "signal: rate {} Hz and channels {} must both be at least 1",
                self.rate, self.channels
            )));
        }
        if !(self.seconds.is_finite() && self.seconds >= 0.0) {
            return Err(Error::input(format!(
                "signal: duration {} s must be a finite number of seconds, at least 0",
                self.seconds
            )));
        }
        if !self.level_dbfs.is_finite() {
            return Err(Error::input(format!(
                "signal: level {} dBFS must be finite",
                self.level_dbfs
            )));
        }
        let frames = (self.seconds * f64::from(self.rate)).round();
        if frames * f64::from(self.channels) > MAX_SAMPLES as f64 {
            return Err(Error::input(format!(
                "signal: {} s of {} channel(s) at {} Hz is more than {MAX_SAMPLES} samples \
                 (2^28), the most a signal is built from in memory",
                self.seconds, self.channels, self.rate
            )));
        }
        Ok(frames as usize)
    }

    fn amplitude(&self) -> f64 {
        db_to_amp(self.level_dbfs)
    }

    fn check_freq(&self, what: &str, hz: f64) -> Result<()> {
        let nyquist = f64::from(self.rate) / 2.0;
        if hz > 0.0 && hz < nyquist {
            Ok(())
        } else {
            Err(Error::input(format!(
                "signal: {what} {hz} Hz must be above 0 and below rate/2 = {nyquist} Hz"
            )))
        }
    }

    /// The same mono signal `f(frame index)` in every channel.
    fn every_channel(&self, f: impl Fn(usize) -> f64) -> Result<Vec<f64>> {
        let frames = self.frames()?;
        let channels = usize::from(self.channels);
        let mut out = Vec::with_capacity(frames * channels);
        for n in 0..frames {
            let x = f(n);
            out.extend(std::iter::repeat_n(x, channels));
        }
        Ok(out)
    }

    /// One independent signal per channel, each made by `make(frames, rng)` from its
    /// own generator, scaled to the level as RMS.
    fn independent(
        &self,
        seed: u64,
        make: impl Fn(usize, &mut SplitMix64) -> Vec<f64>,
    ) -> Result<Vec<f64>> {
        let frames = self.frames()?;
        let channels = usize::from(self.channels);
        let mut seeds = SplitMix64::new(seed);
        let mut out = vec![0.0; frames * channels];
        for c in 0..channels {
            let mono = make(frames, &mut SplitMix64::new(seeds.next_u64()));
            let rms = (mono.iter().map(|x| x * x).sum::<f64>() / frames.max(1) as f64).sqrt();
            let gain = if rms > 0.0 { self.amplitude() / rms } else { 0.0 };
            for (slot, x) in out.iter_mut().skip(c).step_by(channels).zip(mono) {
                *slot = x * gain;
            }
        }
        Ok(out)
    }
}

/// A sine at `freq_hz` starting at phase 0.
///
/// # Errors
/// [`Error::Input`] for a bad spec or a frequency not in (0, rate/2).
pub fn sine(spec: &SignalSpec, freq_hz: f64) -> Result<Vec<f64>> {
    spec.check_freq("sine frequency", freq_hz)?;
    let (a, w) = (spec.amplitude(), 2.0 * PI * freq_hz / f64::from(spec.rate));
    spec.every_channel(|n| a * (w * n as f64).sin())
}

/// An exponential (logarithmic) sweep from `start_hz` to `end_hz` over the whole duration.
///
/// # Errors
/// [`Error::Input`] for a bad spec or a frequency not in (0, rate/2).
pub fn log_sweep(spec: &SignalSpec, start_hz: f64, end_hz: f64) -> Result<Vec<f64>> {
    spec.check_freq("sweep start", start_hz)?;
    spec.check_freq("sweep end", end_hz)?;
    let a = spec.amplitude();
    let rate = f64::from(spec.rate);
    let duration = spec.frames()? as f64 / rate;
    let l = (end_hz / start_hz).ln();
    spec.every_channel(|n| {
        let t = n as f64 / rate;
        if l == 0.0 {
            a * (2.0 * PI * start_hz * t).sin()
        } else {
            a * (2.0 * PI * start_hz * duration / l * ((t * l / duration).exp() - 1.0)).sin()
        }
    })
}

/// Gaussian white noise with the level as RMS of each channel.
///
/// # Errors
/// [`Error::Input`] for a bad spec.
pub fn white_noise(spec: &SignalSpec, seed: u64) -> Result<Vec<f64>> {
    spec.independent(seed, |frames, rng| (0..frames).map(|_| gaussian(rng)).collect())
}

/// Pink noise (−3 dB per octave) with the level as RMS of each channel.
///
/// # Errors
/// [`Error::Input`] for a bad spec.
pub fn pink_noise(spec: &SignalSpec, seed: u64) -> Result<Vec<f64>> {
    spec.independent(seed, |frames, rng| {
        // Pole and gain pairs of Kellet's refined filter (reference 3), plus a direct
        // path and a one-sample-delayed path.
        const POLES: [(f64, f64); 6] = [
            (0.99886, 0.0555179),
            (0.99332, 0.0750759),
            (0.96900, 0.1538520),
            (0.86650, 0.3104856),
            (0.55000, 0.5329522),
            (-0.7616, -0.0168980),
        ];
        const SETTLE: usize = 8192;
        let mut state = [0.0f64; 6];
        let mut delayed = 0.0;
        let mut out = Vec::with_capacity(frames);
        for n in 0..SETTLE + frames {
            let white = gaussian(rng);
            let mut pink = white * 0.5362 + delayed;
            for (s, &(pole, gain)) in state.iter_mut().zip(&POLES) {
                *s = pole * *s + white * gain;
                pink += *s;
            }
            delayed = white * 0.115926;
            if n >= SETTLE {
                out.push(pink);
            }
        }
        out
    })
}

/// A single sample at the level in frame 0 of every channel, silence after it.
///
/// # Errors
/// [`Error::Input`] for a bad spec.
pub fn impulse(spec: &SignalSpec) -> Result<Vec<f64>> {
    let a = spec.amplitude();
    spec.every_channel(|n| if n == 0 { a } else { 0.0 })
}

/// Sines at each of `freqs_hz`, each with amplitude level/n, all starting at phase 0.
///
/// # Errors
/// [`Error::Input`] for a bad spec, no frequencies, or a frequency not in (0, rate/2).
pub fn multitone(spec: &SignalSpec, freqs_hz: &[f64]) -> Result<Vec<f64>> {
    if freqs_hz.is_empty() {
        return Err(Error::input("signal: a multi-tone needs at least one frequency"));
    }
    for &f in freqs_hz {
        spec.check_freq("multi-tone frequency", f)?;
    }
    let a = spec.amplitude() / freqs_hz.len() as f64;
    let w: Vec<f64> = freqs_hz.iter().map(|f| 2.0 * PI * f / f64::from(spec.rate)).collect();
    spec.every_channel(|n| w.iter().map(|w| a * (w * n as f64).sin()).sum())
}

/// A plucked-string note at about `freq_hz` (Karplus-Strong), ringing for the whole
/// duration, its noise burst fixed by `seed`.
///
/// # Errors
/// [`Error::Input`] for a bad spec or a frequency not in (0, rate/2).
pub fn pluck(spec: &SignalSpec, freq_hz: f64, seed: u64) -> Result<Vec<f64>> {
    spec.check_freq("pluck frequency", freq_hz)?;
    let frames = spec.frames()?;
    // rate/f > 2 here, so p ≥ 2.
    let p = (f64::from(spec.rate) / freq_hz - 0.5).round() as usize;
    let mut rng = SplitMix64::new(seed);
    let mut line: Vec<f64> = (0..p).map(|_| 2.0 * rng.next_f64() - 1.0).collect();
    // The averager passes DC unchanged forever, so the burst is made zero-mean.
    let mean = line.iter().sum::<f64>() / p as f64;
    let a = spec.amplitude();
    for x in &mut line {
        *x = (*x - mean) * a / 2.0;
    }
    let mut mono = Vec::with_capacity(frames);
    for n in 0..frames {
        let i = n % p;
        let out = line[i];
        line[i] = 0.5 * (line[i] + line[(i + 1) % p]);
        mono.push(out);
    }
    let mono = &mono;
    spec.every_channel(|n| mono[n])
}

/// The mains frequency a hum is built on.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Mains {
    /// 50 Hz (Europe, most of Asia, Africa, Oceania).
    Hz50,
    /// 60 Hz (the Americas, parts of Asia).
    Hz60,
}

impl Mains {
    /// The fundamental in Hz.
    pub fn hz(self) -> f64 {
        match self {
            Mains::Hz50 => 50.0,
            Mains::Hz60 => 60.0,
        }
    }
}

/// The number of harmonics (fundamental included) in a hum.
pub const HUM_HARMONICS: u32 = 8;

/// Adds mains hum (harmonic n at `level_dbfs` peak / n) to every channel of
/// interleaved `signal`.
///
/// # Errors
/// [`Error::Input`] for zero channels or rate, a non-finite level, a rate too low to
/// hold the fundamental, or a signal that is not whole frames.
pub fn mix_hum(
    signal: &mut [f64],
    channels: u16,
    rate: u32,
    mains: Mains,
    level_dbfs: f64,
) -> Result<()> {
    let spec = SignalSpec { rate, channels, seconds: 0.0, level_dbfs };
    spec.frames()?;
    spec.check_freq("mains frequency", mains.hz())?;
    let channels = usize::from(channels);
    if !signal.len().is_multiple_of(channels) {
        return Err(Error::input(format!(
            "signal: {} samples are not a whole number of {channels}-channel frames",
            signal.len()
        )));
    }
    let a = spec.amplitude();
    let nyquist = f64::from(rate) / 2.0;
    let harmonics: Vec<(f64, f64)> = (1..=HUM_HARMONICS)
        .map(|k| (mains.hz() * f64::from(k), a / f64::from(k)))
        .filter(|&(f, _)| f < nyquist)
        .map(|(f, amp)| (2.0 * PI * f / f64::from(rate), amp))
        .collect();
    for (n, frame) in signal.chunks_exact_mut(channels).enumerate() {
        let hum: f64 = harmonics.iter().map(|(w, amp)| amp * (w * n as f64).sin()).sum();
        for x in frame {
            *x += hum;
        }
    }
    Ok(())
}

/// A standard normal deviate (Box-Muller, reference 2); 1 − u keeps the log finite.
fn gaussian(rng: &mut SplitMix64) -> f64 {
    let u1 = 1.0 - rng.next_f64();
    let u2 = rng.next_f64();
    (-2.0 * u1.ln()).sqrt() * (2.0 * PI * u2).cos()
}

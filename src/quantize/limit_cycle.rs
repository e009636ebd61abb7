//! Zero-input limit cycles: run the bit-exact engine from many seeded states.

use super::coefs::FixedCascade;
use crate::error::Result;
use crate::sections::max_pole_radius;
use crate::simulate::{Engine, FixedEngine};
use serde::Serialize;

/// Seeded initial states tried by [`find_limit_cycle`] when the settling run is short.
pub const LIMIT_CYCLE_SEEDS: usize = 48;
/// Fewest seeds tried, however long the settling run.
pub const MIN_LIMIT_CYCLE_SEEDS: usize = 8;
/// Section-samples of settling the search may spend before it tries fewer seeds
/// (keeps `inspect` interactive on slow-decaying, many-section designs).
const SETTLE_BUDGET: usize = 4 << 20;
/// The longest period [`find_limit_cycle`] recognises, in samples.
pub const MAX_PERIOD: usize = 4096;

/// The largest zero-input limit cycle found.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct LimitCycle {
    /// Largest |output| over one period, in LSB.
    pub amplitude_lsb: i64,
    /// Period in samples (1: a stuck constant).
    pub period: usize,
}

/// What the search found.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct LimitCycleSearch {
    /// The cycle of largest amplitude (then shortest period), if any state kept cycling.
    pub largest: Option<LimitCycle>,
    /// Seeds tried.
    pub seeds: usize,
    /// Zero-input samples run before looking for a period.
    pub settle_samples: usize,
    /// Seeds still moving without repeating after the settle run and MAX_PERIOD more
    /// samples (long cycles or slow decay): neither counted as cycles nor as zero.
    pub unsettled: usize,
}

/// splitmix64: a small fixed-seed generator, so searches repeat exactly.
fn splitmix(seed: &mut u64) -> u64 {
    *seed = seed.wrapping_add(0x9E37_79B9_7F4A_7C15);
    let mut z = *seed;
    z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
    z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
    z ^ (z >> 31)
}

/// A random integer in [−m, m].
fn uniform(seed: &mut u64, m: i64) -> i64 {
    (splitmix(seed) % (2 * m as u64 + 1)) as i64 - m
}

/// Searches for zero-input limit cycles from up to [`LIMIT_CYCLE_SEEDS`] seeded states
/// (fewer, down to [`MIN_LIMIT_CYCLE_SEEDS`], when the settling run is long; the report
/// says how many).
///
/// Each seed sets every state of every section at random, with magnitudes from a few
/// LSB up to a quarter of full scale (df2t states at accumulator scale), runs the
/// input at zero until the slowest quantized pole has decayed by 2^−(data_bits+4)
/// (1024 to 2^20 samples), then looks for the first return of the whole state vector
/// within [`MAX_PERIOD`] samples: a return is an exact period.
///
/// # Errors
/// A cascade refused by [`FixedCascade::validate`].
pub fn find_limit_cycle(fixed: &FixedCascade) -> Result<LimitCycleSearch> {
    let frac = fixed.validate()?;
    let rho = max_pole_radius(&fixed.effective_sections()?);
    let bits = fixed.format.data_bits;
    let decay =
        if rho > 0.0 && rho < 1.0 { (bits + 4) as f64 * 2f64.ln() / -rho.ln() } else { 0.0 };
    let settle = (decay.ceil() as usize).clamp(1024, 1 << 20);
    let per_seed = settle * fixed.sections.len().max(1);
    let channels = (SETTLE_BUDGET / per_seed).clamp(MIN_LIMIT_CYCLE_SEEDS, LIMIT_CYCLE_SEEDS);
    let mut engine = FixedEngine::new(fixed, channels)?;
    let mut seed = 0x746f_6e65_7772_6967_u64;
    for ch in 0..channels {
        // Seed magnitudes step from 4 LSB up to a quarter of full scale.
        let m = 4i64 << ((ch as u32 * (bits - 3)) / channels as u32).min(bits - 3);
        let Some(state) = engine.channel_state_mut(ch) else { break };
        for (k, st) in state.iter_mut().enumerate() {
            let scale = 1i64 << (frac - fixed.sections[k].shift);
            *st = match fixed.structure {
                super::Structure::Df1 => {
                    let e = (scale / 2).max(1);
                    [
                        uniform(&mut seed, m),
                        uniform(&mut seed, m),
                        uniform(&mut seed, m),
                        uniform(&mut seed, m),
                        uniform(&mut seed, e),
                        uniform(&mut seed, e),
                    ]
                }
                super::Structure::Df2t => {
                    [uniform(&mut seed, m) * scale, uniform(&mut seed, m) * scale, 0, 0, 0, 0]
                }
            };
        }
    }
    let mut block = vec![0i32; 1024 * channels];
    let mut done = 0;
    while done < settle {
        let n = (settle - done).min(1024);
        block[..n * channels].fill(0);
        engine.process(&mut block[..n * channels])?;
        done += n;
        // With zero input the all-zero state stays put: once every seed is there, the
        // rest of the settling run would change nothing.
        let at_rest = |ch| {
            engine
                .channel_state_mut(ch)
                .is_some_and(|s| s.iter().all(|v| v.iter().all(|&x| x == 0)))
        };
        if (0..channels).all(at_rest) {
            break;
        }
    }
    let snapshot: Vec<Vec<[i64; 6]>> = (0..channels)
        .map(|ch| engine.channel_state_mut(ch).map(|s| s.to_vec()).unwrap_or_default())
        .collect();
    let mut period: Vec<Option<usize>> = vec![None; channels];
    let mut peak = vec![0i64; channels];
    let mut frame = vec![0i32; channels];
    for step in 1..=MAX_PERIOD {
        frame.fill(0);
        engine.process(&mut frame)?;
        let mut open = false;
        for ch in 0..channels {
            if period[ch].is_some() {
                continue;
            }
            peak[ch] = peak[ch].max(i64::from(frame[ch]).abs());
            let now = engine.channel_state_mut(ch).map(|s| &*s == snapshot[ch].as_slice());
            if now == Some(true) {
                period[ch] = Some(step);
            } else {
                open = true;
            }
        }
        if !open {
            break;
        }
    }
    let mut largest: Option<LimitCycle> = None;
    let mut unsettled = 0;
    for ch in 0..channels {
        let at_rest = snapshot[ch].iter().all(|s| s.iter().all(|&v| v == 0));
        match period[ch] {
            _ if at_rest => {}
            Some(p) => {
                let c = LimitCycle { amplitude_lsb: peak[ch], period: p };
                let key = |l: &LimitCycle| (l.amplitude_lsb, std::cmp::Reverse(l.period));
                if largest.as_ref().is_none_or(|l| key(&c) > key(l)) {
                    largest = Some(c);
                }
            }
            None => unsettled += 1,
        }
    }
    Ok(LimitCycleSearch { largest, seeds: channels, settle_samples: settle, unsettled })
}

//! Seeded random numbers and TPDF dither.
//!
//! In: a 64-bit seed. Out: uniform numbers from [`SplitMix64`] and triangular dither
//! values in LSB from [`TpdfDither`]. The same seed gives the same sequence on every
//! platform, so dithered outputs and noise signals are reproducible byte for byte.
//!
//! The generator is SplitMix64 (reference 1), written out in a few lines instead of
//! pulling in the `rand` family: it passes BigCrush, has one word of state, and our
//! files must not change when a dependency changes its algorithms between versions.
//!
//! TPDF dither is the difference of two independent uniforms on [0, 1) LSB (the two
//! 32-bit halves of one generator output): a
//! triangular density on (−1, +1) LSB, mean 0, variance 1/6 LSB² (1/12 each). Added
//! before rounding to the nearest step, it makes the first and second moments of the
//! total error independent of the signal (reference 2): mean 0 and variance
//! Δ²/6 + Δ²/12 = Δ²/4 for every input, where plain rounding gives an error that
//! depends on the input (no noise modulation).
//!
//! # References
//! 1. G. L. Steele, D. Lea, C. H. Flood, "Fast splittable pseudorandom number
//!    generators", OOPSLA 2014 (SplitMix64 constants as in Java's `SplittableRandom`).
//! 2. S. P. Lipshitz, R. A. Wannamaker, J. Vanderkooy, "Quantization and dither: a
//!    theoretical survey", JAES 40(5), 1992.

use crate::isa::Isa;

/// The state increment of SplitMix64 (the odd integer nearest 2^64/φ).
const GAMMA: u64 = 0x9E37_79B9_7F4A_7C15;

/// SplitMix64's output function of a state. The i-th output is `mix(seed + i·GAMMA)`,
/// a function of i alone, so a block of outputs needs no chain from one to the next.
#[inline(always)]
fn mix(mut z: u64) -> u64 {
    z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
    z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
    z ^ (z >> 31)
}

/// The SplitMix64 pseudo-random generator.
#[derive(Debug, Clone)]
pub struct SplitMix64 {
    state: u64,
}

impl SplitMix64 {
    /// A generator whose sequence is fixed by `seed`.
    pub fn new(seed: u64) -> Self {
        SplitMix64 { state: seed }
    }

    /// The next 64 random bits.
    pub fn next_u64(&mut self) -> u64 {
        self.state = self.state.wrapping_add(GAMMA);
        mix(self.state)
    }

    /// A uniform number in [0, 1) with 53 random bits.
    pub fn next_f64(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 * (1.0 / (1u64 << 53) as f64)
    }
}

/// Triangular (TPDF) dither of ±1 LSB peak.
#[derive(Debug, Clone)]
pub struct TpdfDither {
    rng: SplitMix64,
}

impl TpdfDither {
    /// A dither source whose sequence is fixed by `seed`.
    pub fn new(seed: u64) -> Self {
        TpdfDither { rng: SplitMix64::new(seed) }
    }

    /// The next dither value in LSB, triangular on (−1, +1).
    ///
    /// ```
    /// use tonewright::audio::dither::TpdfDither;
    /// let mut d = TpdfDither::new(7);
    /// let n = 100_000;
    /// let mean = (0..n).map(|_| d.next_lsb()).sum::<f64>() / n as f64;
    /// // Standard error of the mean: sqrt(1/6 / n) = 0.0013; 5 of them.
    /// assert!(mean.abs() < 0.0065);
    /// ```
    pub fn next_lsb(&mut self) -> f64 {
        triangular(self.rng.next_u64())
    }

    /// The next `out.len()` dither values, the same as as many calls of
    /// [`TpdfDither::next_lsb`], computed side by side (each from its own state).
    ///
    /// ```
    /// use tonewright::audio::dither::TpdfDither;
    /// let (mut one, mut block) = (TpdfDither::new(9), TpdfDither::new(9));
    /// let mut values = [0.0; 5];
    /// block.fill(&mut values);
    /// assert!(values.iter().all(|&v| v == one.next_lsb()));
    /// assert_eq!(block.next_lsb(), one.next_lsb());
    /// ```
    pub fn fill(&mut self, out: &mut [f64]) {
        let start = self.rng.state;
        Isa::run_widest(
            #[inline(always)]
            || {
                let mut state = start;
                for v in out.iter_mut() {
                    state = state.wrapping_add(GAMMA);
                    *v = triangular(mix(state));
                }
            },
        );
        self.rng.state = start.wrapping_add(GAMMA.wrapping_mul(out.len() as u64));
    }
}

/// A triangular value on (−1, +1) from 64 random bits.
#[inline(always)]
fn triangular(r: u64) -> f64 {
    // The two uniforms are the two 32-bit halves of one output: independent, on a
    // grid of 2^−32 LSB (far below anything a sample word resolves), at half the cost
    // of two draws.
    (f64::from((r >> 32) as u32) - f64::from(r as u32)) * (1.0 / 4_294_967_296.0)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn splitmix64_matches_published_first_outputs_for_seed_zero() {
        // First outputs of SplitMix64 from state 0, as printed by the reference C
        // implementation by S. Vigna (prng.di.unimi.it/splitmix64.c), from memory.
        let mut rng = SplitMix64::new(0);
        assert_eq!(rng.next_u64(), 0xE220_A839_7B1D_CDAF);
        assert_eq!(rng.next_u64(), 0x6E78_9E6A_A1B9_65F4);
    }

    #[test]
    fn blocks_of_dither_continue_the_one_at_a_time_sequence() {
        for seed in [0, 7, u64::MAX - 3] {
            let (mut one, mut blocks) = (TpdfDither::new(seed), TpdfDither::new(seed));
            for len in [0, 1, 7, 1000, 33] {
                let mut values = vec![0.0; len];
                blocks.fill(&mut values);
                for v in values {
                    assert_eq!(v.to_bits(), one.next_lsb().to_bits(), "seed {seed}");
                }
            }
        }
    }

    #[test]
    fn uniform_stays_in_unit_interval() {
        let mut rng = SplitMix64::new(1);
        assert!((0..10_000).map(|_| rng.next_f64()).all(|u| (0.0..1.0).contains(&u)));
    }
}

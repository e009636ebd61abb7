//! Analog to digital: the bilinear transform with prewarping.
//!
//! In: the real analog factors of H(s) and a sample rate. Out: a [`DigitalZpk`] in z
//! with as many zeros as poles (zeros at s = ∞ land on z = −1). Each factor is mapped
//! with s = K·(z − 1)/(z + 1), where K is 2·rate (no prewarp), or ω_p / tan(ω_p/(2·rate))
//! so the digital response equals the analog one exactly at ω_p: either each factor's
//! own natural frequency or one frequency for the whole design.
//!
//! # References
//! 1. A. V. Oppenheim, R. W. Schafer, "Discrete-Time Signal Processing", 3rd ed., 2010,
//!    section 7.2 (bilinear transformation, ω = 2·atan(ΩT/2)).

mod bilinear;

pub use bilinear::{bilinear, prewarp_constant, DigitalZpk, Discretized, Prewarp};

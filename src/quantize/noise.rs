//! Rounding noise: the noise transfer from each narrowing point to the output.

use super::coefs::FixedCascade;
use super::format::Rounding;
use crate::error::Result;
use crate::sections::norms::l2_norm;
use crate::sections::Sos;
use num_complex::Complex64;
use serde::Serialize;

/// Predicted rounding noise at the output of a quantized cascade.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct NoiseReport {
    /// Per section: noise gain Σh² from its narrowing point to the output (the error
    /// passes 1/A_k(z), the error feedback zeros, and every later section).
    pub section_gains: Vec<f64>,
    /// Per section: variance of its narrowing error, LSB².
    pub section_variances: Vec<f64>,
    /// Output noise power from rounding, LSB² (variance plus the square of any bias).
    pub output_power_lsb2: f64,
    /// Output rounding noise relative to full scale, dBFS (0 dBFS = 2^(data_bits−1)).
    pub output_dbfs: f64,
    /// SNR of a full-scale sine at the output against the rounding noise plus the
    /// input word's own quantization (Δ²/12 through the whole cascade), dB.
    pub snr_full_scale_sine_db: f64,
}

/// Mean and variance (LSB, LSB²) of the error of dropping `r` bits, when the dropped
/// bits are uniformly distributed over their 2^r values: Δ²/12 · (1 − 2^−2r) and a
/// bias of −(1 − 2^−r)/2 (floor), +2^−(r+1) (nearest, ties up), 0 (even).
fn narrowing_error(rounding: Rounding, r: u32) -> (f64, f64) {
    if r == 0 {
        return (0.0, 0.0);
    }
    let levels = 2f64.powi(-(r as i32));
    let var = (1.0 - levels * levels) / 12.0;
    let mean = match rounding {
        Rounding::Floor => -(1.0 - levels) / 2.0,
        Rounding::Nearest => levels / 2.0,
        Rounding::Even => 0.0,
    };
    (mean, var)
}

/// The chain from section `k`'s narrowing point to the output.
pub(crate) fn noise_chain(sections: &[Sos], k: usize, error_feedback: u32) -> Vec<Sos> {
    let shaping = match error_feedback {
        0 => [1.0, 0.0, 0.0],
        1 => [1.0, -1.0, 0.0],
        _ => [1.0, -2.0, 1.0],
    };
    std::iter::once(Sos { b: shaping, a: sections[k].a })
        .chain(sections[k + 1..].iter().copied())
        .collect()
}

/// Predicts the rounding noise of a quantized cascade.
///
/// Each narrowing drops r = coef_frac − shift bits, less the trailing zero bits every
/// stored coefficient of the section shares (those bits of the accumulator are always
/// zero). The model is the textbook one: white, uniform, independent errors.
///
/// # Errors
/// A cascade refused by [`FixedCascade::validate`].
pub fn rounding_noise(fixed: &FixedCascade) -> Result<NoiseReport> {
    let frac = fixed.validate()?;
    let eff = fixed.effective_sections()?;
    let f = fixed.format;
    let one = Complex64::new(1.0, 0.0);
    let (mut gains, mut vars) = (Vec::new(), Vec::new());
    let (mut power, mut bias) = (0.0, 0.0);
    for (k, s) in fixed.sections.iter().enumerate() {
        let zeros_shared = [s.b[0], s.b[1], s.b[2], s.a[0], s.a[1]]
            .iter()
            .filter(|&&c| c != 0)
            .map(|c| c.trailing_zeros())
            .min()
            .unwrap_or(u32::MAX);
        let r = (frac - s.shift).saturating_sub(zeros_shared);
        let (mean, var) = narrowing_error(f.rounding, r);
        let chain = noise_chain(&eff, k, f.error_feedback);
        let gain = l2_norm(&chain).powi(2);
        power += var * gain;
        bias += mean * chain.iter().map(|c| c.eval(one)).product::<Complex64>().re;
        gains.push(gain);
        vars.push(var);
    }
    let power = power + bias * bias;
    let full_scale = 2f64.powi(f.data_bits as i32 - 1);
    let input_noise = l2_norm(&eff).powi(2) / 12.0;
    Ok(NoiseReport {
        section_gains: gains,
        section_variances: vars,
        output_power_lsb2: power,
        output_dbfs: 10.0 * (power / (full_scale * full_scale)).log10(),
        snr_full_scale_sine_db: 10.0
            * (full_scale * full_scale / 2.0 / (power + input_noise)).log10(),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dropping_many_bits_gives_the_textbook_variance() {
        // Δ²/12 for r → ∞ (Oppenheim & Schafer, 3rd ed., section 6.7).
        let (mean, var) = narrowing_error(Rounding::Even, 30);
        assert!((var - 1.0 / 12.0).abs() < 1e-15 && mean == 0.0);
        // r = 1: errors {0, +½} (nearest) or {0, −½} (floor): variance 1/16.
        assert_eq!(narrowing_error(Rounding::Nearest, 1), (0.25, 1.0 / 16.0));
        assert_eq!(narrowing_error(Rounding::Floor, 1), (-0.25, 1.0 / 16.0));
    }
}

//! Conversion between fractions of full scale and integer samples of a data word.

use crate::error::{Error, Result};
use crate::offset_rounding;

/// The scale of a `data_bits`-bit sample word: full scale 1.0 is 2^(data_bits−1).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SampleScale {
    bits: u32,
    /// 2^(data_bits−1): one full scale in LSB.
    full_scale: f64,
    /// 2^−(data_bits−1): one LSB in full scales, so going back is a product (exact, as
    /// the scale is a power of two) instead of a division.
    lsb: f64,
}

impl SampleScale {
    /// The scale of a data word of `data_bits` bits (2..=32).
    ///
    /// # Errors
    /// `data_bits` outside 2..=32, named as `target.fixed.data_bits`.
    pub fn new(data_bits: u32) -> Result<Self> {
        if !(2..=32).contains(&data_bits) {
            return Err(Error::input(format!(
                "target.fixed.data_bits: {data_bits} must be between 2 and 32"
            )));
        }
        let full_scale = 2f64.powi(data_bits as i32 - 1);
        Ok(Self { bits: data_bits, full_scale, lsb: 1.0 / full_scale })
    }

    /// The word length, bits.
    pub fn bits(&self) -> u32 {
        self.bits
    }

    /// Largest sample value, 2^(data_bits−1) − 1.
    pub fn max(&self) -> i32 {
        ((1i64 << (self.bits - 1)) - 1) as i32
    }

    /// Smallest sample value, −2^(data_bits−1).
    pub fn min(&self) -> i32 {
        (-(1i64 << (self.bits - 1))) as i32
    }

    /// One LSB as a fraction of full scale, 2^−(data_bits−1).
    pub fn lsb(&self) -> f64 {
        self.lsb
    }

    /// A fraction of full scale to the nearest sample (ties to even), saturated to the
    /// word; NaN maps to 0.
    ///
    /// ```
    /// use tonewright::simulate::SampleScale;
    /// let q15 = SampleScale::new(16).unwrap();
    /// assert_eq!(q15.to_int(0.5), 16384);
    /// assert_eq!(q15.to_int(1.0), 32767); // saturated
    /// ```
    #[inline]
    pub fn to_int(&self, x: f64) -> i32 {
        // Rounded by the offset (see `offset_rounding`): no libm call and no saturating
        // cast, so loops over blocks vectorise.
        let (lo, hi) = (f64::from(self.min()), f64::from(self.max()));
        // NaN maps to 0. Not `clamp`, whose check of its bounds stays in the loop.
        let v = x * self.full_scale;
        let v = if v.is_nan() { 0.0 } else { v.max(lo).min(hi) };
        offset_rounding::integer_of(v + offset_rounding::OFFSET) as i32
    }

    /// A sample as a fraction of full scale.
    #[inline]
    pub fn to_f64(&self, v: i32) -> f64 {
        f64::from(v) * self.lsb
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn conversion_saturates_and_rounds_ties_to_even() {
        let s = SampleScale::new(24).unwrap();
        assert_eq!((s.min(), s.max()), (-8_388_608, 8_388_607));
        assert_eq!(s.to_int(-2.0), s.min());
        assert_eq!(s.to_int(2.5 * s.lsb()), 2);
        assert_eq!(s.to_int(f64::NAN), 0);
        let s32 = SampleScale::new(32).unwrap();
        assert_eq!((s32.to_int(1.0), s32.to_int(-1.0)), (i32::MAX, i32::MIN));
        assert!(SampleScale::new(33).is_err());
    }
}

//! Rounding to an integer by adding 1.5·2^52, without a float-to-integer conversion.
//!
//! In an f64 between 2^52 and 2^53 one unit is the last mantissa bit, so adding
//! [`OFFSET`] to |v| < 2^51 rounds v to the nearest integer k, ties to even (IEEE 754
//! default rounding), and leaves k in two's complement in the low bits of the sum's
//! representation. Loops that round this way need no saturating cast, so they
//! vectorise; clamping v, or the sum, to integer bounds commutes with the rounding.

/// 1.5·2^52.
pub(crate) const OFFSET: f64 = 6_755_399_441_055_744.0;

/// The integer k of an offset sum `OFFSET + k` with |k| < 2^31, as 32-bit two's
/// complement.
#[inline(always)]
pub(crate) fn integer_of(sum: f64) -> u32 {
    sum.to_bits() as u32
}

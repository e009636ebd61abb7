//! Vector registers for the wavefront over the intrinsics of `std::arch`: 256-bit
//! registers of f64 (4 lanes) or f32 (8 lanes) with AVX2, 512-bit registers of f64 (8
//! lanes) with AVX-512F and DQ.
//!
//! Every method is inlined into the wavefront's functions, which are compiled for the
//! register's instruction set and reached only after run-time detection; nothing else
//! calls them.

use std::arch::x86_64::{
    __m256, __m256d, __m512d, _mm256_add_pd, _mm256_add_ps, _mm256_blend_pd, _mm256_blend_ps,
    _mm256_blendv_pd, _mm256_blendv_ps, _mm256_castsi256_pd, _mm256_castsi256_ps, _mm256_cvtsd_f64,
    _mm256_cvtss_f32, _mm256_loadu_pd, _mm256_loadu_ps, _mm256_loadu_si256, _mm256_mul_pd,
    _mm256_mul_ps, _mm256_permute4x64_pd, _mm256_permutevar8x32_ps, _mm256_set1_pd, _mm256_set1_ps,
    _mm256_setr_epi32, _mm256_storeu_pd, _mm256_storeu_ps, _mm256_sub_pd, _mm256_sub_ps,
    _mm512_add_pd, _mm512_alignr_epi64, _mm512_castpd_si512, _mm512_castsi512_pd, _mm512_cvtsd_f64,
    _mm512_loadu_pd, _mm512_loadu_si512, _mm512_mask_blend_pd, _mm512_movepi64_mask, _mm512_mul_pd,
    _mm512_set1_pd, _mm512_storeu_pd, _mm512_sub_pd,
};

/// A register of `LANES` float lanes. Arithmetic rounds each operation on its own,
/// as the plain loop does.
pub(super) trait Register: Copy {
    /// The float type of a lane.
    type Lane: Copy + Default;
    /// Lanes per register.
    const LANES: usize;
    /// The first `LANES` values of `a`.
    fn load(a: &[Self::Lane]) -> Self;
    /// Writes the lanes to the first `LANES` values of `a`.
    fn store(self, a: &mut [Self::Lane]);
    /// `v` in every lane.
    fn splat(v: Self::Lane) -> Self;
    /// All ones in the lanes where `set` is true, zero elsewhere.
    fn mask(set: impl Fn(usize) -> bool) -> Self;
    fn add(self, b: Self) -> Self;
    fn sub(self, b: Self) -> Self;
    fn mul(self, b: Self) -> Self;
    /// `b` in the lanes where `mask` is set, `self` elsewhere.
    fn select(self, b: Self, mask: Self) -> Self;
    /// Lanes moved up by one, the last lane of `b` into lane 0.
    fn shift_in(self, b: Self) -> Self;
    /// The last lane.
    fn last(self) -> Self::Lane;
}

// SAFETY (every block below): the intrinsics need AVX2 (or less) for the 256-bit
// registers and AVX-512F and DQ for the 512-bit ones, which the only callers, the
// wavefront's functions compiled for those instruction sets, have; the loads and
// stores are given slices of at least `LANES` values (checked by indexing).

impl Register for __m256d {
    type Lane = f64;
    const LANES: usize = 4;
    #[inline(always)]
    fn load(a: &[f64]) -> Self {
        unsafe { _mm256_loadu_pd(a[..4].as_ptr()) }
    }
    #[inline(always)]
    fn store(self, a: &mut [f64]) {
        unsafe { _mm256_storeu_pd(a[..4].as_mut_ptr(), self) }
    }
    #[inline(always)]
    fn splat(v: f64) -> Self {
        unsafe { _mm256_set1_pd(v) }
    }
    #[inline(always)]
    fn mask(set: impl Fn(usize) -> bool) -> Self {
        let bits: [i64; 4] = std::array::from_fn(|l| -i64::from(set(l)));
        unsafe { _mm256_castsi256_pd(_mm256_loadu_si256(bits.as_ptr().cast())) }
    }
    #[inline(always)]
    fn add(self, b: Self) -> Self {
        unsafe { _mm256_add_pd(self, b) }
    }
    #[inline(always)]
    fn sub(self, b: Self) -> Self {
        unsafe { _mm256_sub_pd(self, b) }
    }
    #[inline(always)]
    fn mul(self, b: Self) -> Self {
        unsafe { _mm256_mul_pd(self, b) }
    }
    #[inline(always)]
    fn select(self, b: Self, mask: Self) -> Self {
        unsafe { _mm256_blendv_pd(self, b, mask) }
    }
    #[inline(always)]
    fn shift_in(self, b: Self) -> Self {
        // Both rotated ([l3, l0, l1, l2]), lane 0 from b's.
        let rotate = |r| unsafe { _mm256_permute4x64_pd::<0b10_01_00_11>(r) };
        unsafe { _mm256_blend_pd::<1>(rotate(self), rotate(b)) }
    }
    #[inline(always)]
    fn last(self) -> f64 {
        unsafe { _mm256_cvtsd_f64(_mm256_permute4x64_pd::<0b10_01_00_11>(self)) }
    }
}

impl Register for __m256 {
    type Lane = f32;
    const LANES: usize = 8;
    #[inline(always)]
    fn load(a: &[f32]) -> Self {
        unsafe { _mm256_loadu_ps(a[..8].as_ptr()) }
    }
    #[inline(always)]
    fn store(self, a: &mut [f32]) {
        unsafe { _mm256_storeu_ps(a[..8].as_mut_ptr(), self) }
    }
    #[inline(always)]
    fn splat(v: f32) -> Self {
        unsafe { _mm256_set1_ps(v) }
    }
    #[inline(always)]
    fn mask(set: impl Fn(usize) -> bool) -> Self {
        let bits: [i32; 8] = std::array::from_fn(|l| -i32::from(set(l)));
        unsafe { _mm256_castsi256_ps(_mm256_loadu_si256(bits.as_ptr().cast())) }
    }
    #[inline(always)]
    fn add(self, b: Self) -> Self {
        unsafe { _mm256_add_ps(self, b) }
    }
    #[inline(always)]
    fn sub(self, b: Self) -> Self {
        unsafe { _mm256_sub_ps(self, b) }
    }
    #[inline(always)]
    fn mul(self, b: Self) -> Self {
        unsafe { _mm256_mul_ps(self, b) }
    }
    #[inline(always)]
    fn select(self, b: Self, mask: Self) -> Self {
        unsafe { _mm256_blendv_ps(self, b, mask) }
    }
    #[inline(always)]
    fn shift_in(self, b: Self) -> Self {
        unsafe { _mm256_blend_ps::<1>(rotate_ps(self), rotate_ps(b)) }
    }
    #[inline(always)]
    fn last(self) -> f32 {
        unsafe { _mm256_cvtss_f32(rotate_ps(self)) }
    }
}

/// [l7, l0, …, l6] of an f32 register.
#[inline(always)]
unsafe fn rotate_ps(r: __m256) -> __m256 {
    unsafe { _mm256_permutevar8x32_ps(r, _mm256_setr_epi32(7, 0, 1, 2, 3, 4, 5, 6)) }
}

impl Register for __m512d {
    type Lane = f64;
    const LANES: usize = 8;
    #[inline(always)]
    fn load(a: &[f64]) -> Self {
        unsafe { _mm512_loadu_pd(a[..8].as_ptr()) }
    }
    #[inline(always)]
    fn store(self, a: &mut [f64]) {
        unsafe { _mm512_storeu_pd(a[..8].as_mut_ptr(), self) }
    }
    #[inline(always)]
    fn splat(v: f64) -> Self {
        unsafe { _mm512_set1_pd(v) }
    }
    #[inline(always)]
    fn mask(set: impl Fn(usize) -> bool) -> Self {
        let bits: [i64; 8] = std::array::from_fn(|l| -i64::from(set(l)));
        unsafe { _mm512_castsi512_pd(_mm512_loadu_si512(bits.as_ptr().cast())) }
    }
    #[inline(always)]
    fn add(self, b: Self) -> Self {
        unsafe { _mm512_add_pd(self, b) }
    }
    #[inline(always)]
    fn sub(self, b: Self) -> Self {
        unsafe { _mm512_sub_pd(self, b) }
    }
    #[inline(always)]
    fn mul(self, b: Self) -> Self {
        unsafe { _mm512_mul_pd(self, b) }
    }
    #[inline(always)]
    fn select(self, b: Self, mask: Self) -> Self {
        unsafe { _mm512_mask_blend_pd(_mm512_movepi64_mask(_mm512_castpd_si512(mask)), self, b) }
    }
    #[inline(always)]
    fn shift_in(self, b: Self) -> Self {
        // One valignq: lanes 7 of b, then 0 to 6 of self.
        unsafe {
            _mm512_castsi512_pd(_mm512_alignr_epi64::<7>(
                _mm512_castpd_si512(self),
                _mm512_castpd_si512(b),
            ))
        }
    }
    #[inline(always)]
    fn last(self) -> f64 {
        unsafe { _mm512_cvtsd_f64(self.shift_in(self)) }
    }
}

//! The instruction sets the engines' kernels are built for, found at run time.
//!
//! The release binary targets baseline x86-64 (SSE2); wider kernels are compiled with
//! `#[target_feature]` and chosen only after `is_x86_feature_detected!` has found what
//! they use. Every build gives the same output bit for bit (tests/fixed_point.rs).

/// An instruction set; each includes the ones before it. Public in name only (the
/// module is private), so the sealed kernel trait of the float engines can name it.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
pub enum Isa {
    /// SSE2 on x86-64, or whatever the target has elsewhere.
    Baseline,
    /// AVX2.
    Avx2,
    /// AVX2 with AVX-512F, DQ and VL (all the kernels use).
    Avx512,
}

impl Isa {
    /// The widest set this processor runs.
    #[cfg(target_arch = "x86_64")]
    pub fn detected() -> Isa {
        use std::is_x86_feature_detected as has;
        if !has!("avx2") {
            Isa::Baseline
        } else if has!("avx512f") && has!("avx512dq") && has!("avx512vl") {
            Isa::Avx512
        } else {
            Isa::Avx2
        }
    }

    /// Off x86-64, the baseline only.
    #[cfg(not(target_arch = "x86_64"))]
    pub fn detected() -> Isa {
        Isa::Baseline
    }
}

//! The instruction sets the kernels are built for, found at run time.
//!
//! The release binary targets baseline x86-64 (SSE2); wider kernels are compiled with
//! `#[target_feature]` and chosen only after `is_x86_feature_detected!` has found what
//! they use. Every build gives the same output bit for bit (tests/fixed_point.rs for
//! the engines; the block loops of [`Isa::run_widest`] are plain Rust, whose float results
//! do not depend on the vector width: no build enables FMA contraction).

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

    /// Runs `work` compiled for the widest set detected: a plain loop over a block
    /// then vectorises 4 or 8 lanes wide instead of SSE2's 2. `work` must be an
    /// `#[inline(always)]` closure (and what it calls inlined too), or it keeps the
    /// baseline build.
    #[inline(always)]
    pub fn run_widest<R>(work: impl FnOnce() -> R) -> R {
        #[cfg(target_arch = "x86_64")]
        match Isa::detected() {
            // SAFETY: the processor has the features each function enables.
            Isa::Avx512 => unsafe { with_avx512(work) },
            Isa::Avx2 => unsafe { with_avx2(work) },
            Isa::Baseline => work(),
        }
        #[cfg(not(target_arch = "x86_64"))]
        work()
    }
}

/// `work` compiled with AVX2.
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
fn with_avx2<R>(work: impl FnOnce() -> R) -> R {
    work()
}

/// `work` compiled with AVX2 and AVX-512F/DQ/VL.
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2,avx512f,avx512dq,avx512vl")]
fn with_avx512<R>(work: impl FnOnce() -> R) -> R {
    work()
}

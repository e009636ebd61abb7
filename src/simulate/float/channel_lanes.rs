//! The cascade across adjacent channels: one channel per lane, sections in groups.
//!
//! Frames are copied block by block into an aligned buffer; groups of sections run
//! over the block with their states held in registers, so the recursions of a group's
//! sections overlap in the processor, and each operation acts on all lanes at once.
//! Fast when there are enough channels to fill a vector (4 or 8).

use super::{FloatSample, Kernel};

/// Frames per block: small enough that a block of 8 f64 lanes (4 KiB) stays in the
/// first-level cache, large enough that loading a group's states is rare.
const BLOCK: usize = 64;

/// Sections per group. The recursion of one df2t section is a chain of a multiply and
/// three adds per sample (about 12 cycles); four sections in flight cover it while
/// their 8 to 16 states and temporaries still fit the 16 vector registers of x86-64.
/// Measured on 8 sections (benches/engines.rs): groups of 8 spill and run at less than
/// half the speed for one channel; groups of 1 or 2 wait on the chain.
const GROUP: usize = 4;

/// One block of frames of `L` lanes, aligned for the widest vector loads.
#[repr(C, align(64))]
struct Block<T, const L: usize>([[T; L]; BLOCK]);

/// b0, b1, b2, a1, a2, each with one value per lane.
type LaneCoefs<T, const L: usize> = [[T; L]; 5];

/// States, each with one value per lane: df1 x1, x2, y1, y2; df2t s1, s2 (the last
/// two unused).
type LaneStates<T, const L: usize> = [[T; L]; 4];

/// Lane `l` runs the section `c[·][l]` from state `s[·][l]` on input `x[l]` (df2t
/// when `DF2T`, else df1) and returns the outputs. Oppenheim & Schafer, "Discrete-Time
/// Signal Processing", 3rd ed., section 6.3.
#[inline(always)]
// Lane loops index several arrays at once; iterator chains would hide the per-lane
// expression that must stay identical to the plain loop.
#[allow(clippy::needless_range_loop)]
fn step<T: FloatSample, const L: usize, const DF2T: bool>(
    c: &LaneCoefs<T, L>,
    s: &mut LaneStates<T, L>,
    x: &[T; L],
) -> [T; L] {
    let [b0, b1, b2, a1, a2] = c;
    let mut y = [T::default(); L];
    if DF2T {
        for l in 0..L {
            y[l] = b0[l] * x[l] + s[0][l];
            s[0][l] = b1[l] * x[l] - a1[l] * y[l] + s[1][l];
            s[1][l] = b2[l] * x[l] - a2[l] * y[l];
        }
    } else {
        for l in 0..L {
            y[l] = b0[l] * x[l] + b1[l] * s[0][l] + b2[l] * s[1][l]
                - a1[l] * s[2][l]
                - a2[l] * s[3][l];
        }
        *s = [*x, s[0], y, s[2]];
    }
    y
}

/// `G` sections (df2t when `DF2T`, else df1) over a block of `L`-lane frames, with
/// the states in local variables for the whole block.
#[inline(always)]
fn sections<T: FloatSample, const L: usize, const G: usize, const DF2T: bool>(
    coefs: &[[T; 5]],
    state: &mut [T],
    block: &mut [[T; L]],
) {
    let c: [LaneCoefs<T, L>; G] = std::array::from_fn(|k| coefs[k].map(|v| [v; L]));
    let mut s: [LaneStates<T, L>; G] = std::array::from_fn(|k| {
        std::array::from_fn(|j| std::array::from_fn(|l| state[(k * 4 + j) * L + l]))
    });
    for v in block.iter_mut() {
        let mut x = *v;
        for k in 0..G {
            x = step::<T, L, DF2T>(&c[k], &mut s[k], &x);
        }
        *v = x;
    }
    for k in 0..G {
        for j in 0..4 {
            state[(k * 4 + j) * L..(k * 4 + j + 1) * L].copy_from_slice(&s[k][j]);
        }
    }
}

/// [`sections`] for a group of `size` sections (1 to [`GROUP`]).
#[inline(always)]
fn group<T: FloatSample, const L: usize, const DF2T: bool>(
    size: usize,
    coefs: &[[T; 5]],
    state: &mut [T],
    block: &mut [[T; L]],
) {
    match size {
        1 => sections::<T, L, 1, DF2T>(coefs, state, block),
        2 => sections::<T, L, 2, DF2T>(coefs, state, block),
        3 => sections::<T, L, 3, DF2T>(coefs, state, block),
        _ => sections::<T, L, 4, DF2T>(coefs, state, block),
    }
}

/// The cascade over `L` adjacent channels, df2t when `DF2T`, else df1.
pub(super) struct ChannelLanes<const L: usize, const DF2T: bool>;

impl<T: FloatSample, const L: usize, const DF2T: bool> Kernel<T> for ChannelLanes<L, DF2T> {
    /// Block by block, sections in groups of at most [`GROUP`], as equal in size as
    /// possible.
    #[inline(always)]
    fn run(coefs: &[[T; 5]], state: &mut [T], frames: &mut [T], first: usize, n: usize) {
        let mut block = Block([[T::default(); L]; BLOCK]);
        let ns = coefs.len();
        let groups = ns.div_ceil(GROUP);
        for chunk in frames.chunks_mut(BLOCK * n) {
            let b = &mut block.0[..chunk.len() / n];
            for (v, frame) in b.iter_mut().zip(chunk.chunks_exact(n)) {
                v.copy_from_slice(&frame[first..first + L]);
            }
            let mut k = 0;
            for g in 0..groups {
                // The first ns % groups groups take one section more.
                let size = ns / groups + usize::from(g < ns % groups);
                group::<T, L, DF2T>(
                    size,
                    &coefs[k..k + size],
                    &mut state[k * 4 * L..(k + size) * 4 * L],
                    b,
                );
                k += size;
            }
            for (v, frame) in b.iter().zip(chunk.chunks_exact_mut(n)) {
                frame[first..first + L].copy_from_slice(v);
            }
        }
    }
}

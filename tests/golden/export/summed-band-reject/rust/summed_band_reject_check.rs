// generated: do not edit
// tool: tonewright 0.1.0
// command: tonewright export audio-demos/summed-band-reject.toml --lang rust --vectors 64 --knobs
// design: Low-pass plus high-pass summed into a band-reject (audio-demos/summed-band-reject.toml, fnv1a-64 96df495b86b72f92)
// format: q15: Q1.15 samples, Q2.14 coefficients (16 bits), 32-bit accumulator, rounding nearest, saturate on overflow, error feedback 0
// structure: df1; rate: 48000 Hz; knobs: scoop=1

//! Checks `summed_band_reject.rs` against the simulator's golden vectors, bit for bit.
//! Build and run: `rustc --edition 2021 --test summed_band_reject_check.rs && ./summed_band_reject_check`

// The module offers more than this check uses (knob tables, reset, overflow counts).
#[allow(dead_code)]
#[path = "summed_band_reject.rs"]
mod filter;
#[path = "summed_band_reject_vectors.rs"]
mod vectors;

#[test]
fn kernel_matches_the_simulator_bit_for_bit() {
    let mut buf = vectors::INPUT;
    let mut state = filter::State::new();
    // Blocks of 1 to 7 frames: the state must carry across calls.
    let (mut done, mut block) = (0, 1);
    while done < buf.len() {
        let end = (done + block).min(buf.len());
        state.process(&filter::TABLE, &mut buf[done..end]);
        done = end;
        block = block % 7 + 1;
    }
    for (i, (got, want)) in buf.iter().zip(vectors::OUTPUT.iter()).enumerate() {
        assert!(got == want, "frame {i}: got {got:?}, want {want:?}");
    }
}

// generated: do not edit
// tool: tonewright 0.1.0
// command: tonewright export audio-demos/hum-reject-50.toml --lang rust --vectors 64 --force
// design: Bench recorder hum band-reject, 50 Hz mains (audio-demos/hum-reject-50.toml, fnv1a-64 ee62542a9dae04ef)
// format: fixed: Q1.23 samples, Q2.30 coefficients (32 bits), 64-bit accumulator, rounding nearest, saturate on overflow, error feedback 2
// structure: df1; rate: 48000 Hz; knobs: none

//! Checks `hum_reject_50.rs` against the simulator's golden vectors, bit for bit.
//! Build and run: `rustc --edition 2021 --test hum_reject_50_check.rs && ./hum_reject_50_check`

// The module offers more than this check uses (knob tables, reset, overflow counts).
#[allow(dead_code)]
#[path = "hum_reject_50.rs"]
mod filter;
#[path = "hum_reject_50_vectors.rs"]
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

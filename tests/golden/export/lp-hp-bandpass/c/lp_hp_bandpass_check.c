/*
 * generated: do not edit
 * tool: tonewright 0.1.0
 * command: tonewright export audio-demos/lp-hp-bandpass.toml --lang c --vectors 64
 * design: Low-pass into high-pass band-pass, buffered RC stages (audio-demos/lp-hp-bandpass.toml, fnv1a-64 0b9a49ae9decb6fc)
 * format: q15: Q1.15 samples, Q2.14 coefficients (16 bits), 32-bit accumulator, rounding nearest, saturate on overflow, error feedback 0
 * structure: df1; rate: 48000 Hz; knobs: none
 *
 * Runs lp_hp_bandpass.c on the golden vectors in blocks of 1 to 7 frames (so the
 * state must carry across calls) and compares with the simulator's output.
 * Exit status 0: bit-exact; 1: the first mismatch is printed.
 * Build: cc -std=c99 lp_hp_bandpass.c lp_hp_bandpass_check.c && ./a.out
 */
#include <stdio.h>
#include "lp_hp_bandpass.h"
#include "lp_hp_bandpass_vectors.h"

int main(void)
{
    static int32_t buf[LP_HP_BANDPASS_VECTOR_FRAMES];
    lp_hp_bandpass_state st;
    size_t i, done, block = 1;
    for (i = 0; i < LP_HP_BANDPASS_VECTOR_FRAMES; ++i) {
        buf[i] = lp_hp_bandpass_vector_input[i];
    }
    lp_hp_bandpass_reset(&st);
    for (done = 0; done < LP_HP_BANDPASS_VECTOR_FRAMES; done += block, block = block % 7 + 1) {
        size_t left = LP_HP_BANDPASS_VECTOR_FRAMES - done;
        lp_hp_bandpass_process(&st, &lp_hp_bandpass_table, buf + done, block < left ? block : left);
    }
    for (i = 0; i < LP_HP_BANDPASS_VECTOR_FRAMES; ++i) {
        if (buf[i] != lp_hp_bandpass_vector_output[i]) {
            printf("lp_hp_bandpass: mismatch at frame %lu: got %ld, want %ld\n", (unsigned long)i,
                   (long)buf[i], (long)lp_hp_bandpass_vector_output[i]);
            return 1;
        }
    }
    printf("lp_hp_bandpass: %d frames bit-exact\n", LP_HP_BANDPASS_VECTOR_FRAMES);
    return 0;
}

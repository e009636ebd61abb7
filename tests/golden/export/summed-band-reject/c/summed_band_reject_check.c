/*
 * generated: do not edit
 * tool: tonewright 0.1.0
 * command: tonewright export audio-demos/summed-band-reject.toml --lang c --vectors 64 --knobs
 * design: Low-pass plus high-pass summed into a band-reject (audio-demos/summed-band-reject.toml, fnv1a-64 96df495b86b72f92)
 * format: q15: Q1.15 samples, Q2.14 coefficients (16 bits), 32-bit accumulator, rounding nearest, saturate on overflow, error feedback 0
 * structure: df1; rate: 48000 Hz; knobs: scoop=1
 *
 * Runs summed_band_reject.c on the golden vectors in blocks of 1 to 7 frames (so the
 * state must carry across calls) and compares with the simulator's output.
 * Exit status 0: bit-exact; 1: the first mismatch is printed.
 * Build: cc -std=c99 summed_band_reject.c summed_band_reject_check.c && ./a.out
 */
#include <stdio.h>
#include "summed_band_reject.h"
#include "summed_band_reject_vectors.h"

int main(void)
{
    static int32_t buf[SUMMED_BAND_REJECT_VECTOR_FRAMES];
    summed_band_reject_state st;
    size_t i, done, block = 1;
    for (i = 0; i < SUMMED_BAND_REJECT_VECTOR_FRAMES; ++i) {
        buf[i] = summed_band_reject_vector_input[i];
    }
    summed_band_reject_reset(&st);
    for (done = 0; done < SUMMED_BAND_REJECT_VECTOR_FRAMES; done += block, block = block % 7 + 1) {
        size_t left = SUMMED_BAND_REJECT_VECTOR_FRAMES - done;
        summed_band_reject_process(&st, &summed_band_reject_table, buf + done, block < left ? block : left);
    }
    for (i = 0; i < SUMMED_BAND_REJECT_VECTOR_FRAMES; ++i) {
        if (buf[i] != summed_band_reject_vector_output[i]) {
            printf("summed_band_reject: mismatch at frame %lu: got %ld, want %ld\n", (unsigned long)i,
                   (long)buf[i], (long)summed_band_reject_vector_output[i]);
            return 1;
        }
    }
    printf("summed_band_reject: %d frames bit-exact\n", SUMMED_BAND_REJECT_VECTOR_FRAMES);
    return 0;
}

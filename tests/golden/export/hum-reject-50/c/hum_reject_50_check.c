/*
 * generated: do not edit
 * tool: tonewright 0.1.0
 * command: tonewright export audio-demos/hum-reject-50.toml --lang c --vectors 64 --force
 * design: Bench recorder hum band-reject, 50 Hz mains (audio-demos/hum-reject-50.toml, fnv1a-64 ee62542a9dae04ef)
 * format: fixed: Q1.23 samples, Q2.30 coefficients (32 bits), 64-bit accumulator, rounding nearest, saturate on overflow, error feedback 2
 * structure: df1; rate: 48000 Hz; knobs: none
 *
 * Runs hum_reject_50.c on the golden vectors in blocks of 1 to 7 frames (so the
 * state must carry across calls) and compares with the simulator's output.
 * Exit status 0: bit-exact; 1: the first mismatch is printed.
 * Build: cc -std=c99 hum_reject_50.c hum_reject_50_check.c && ./a.out
 */
#include <stdio.h>
#include "hum_reject_50.h"
#include "hum_reject_50_vectors.h"

int main(void)
{
    static int32_t buf[HUM_REJECT_50_VECTOR_FRAMES];
    hum_reject_50_state st;
    size_t i, done, block = 1;
    for (i = 0; i < HUM_REJECT_50_VECTOR_FRAMES; ++i) {
        buf[i] = hum_reject_50_vector_input[i];
    }
    hum_reject_50_reset(&st);
    for (done = 0; done < HUM_REJECT_50_VECTOR_FRAMES; done += block, block = block % 7 + 1) {
        size_t left = HUM_REJECT_50_VECTOR_FRAMES - done;
        hum_reject_50_process(&st, &hum_reject_50_table, buf + done, block < left ? block : left);
    }
    for (i = 0; i < HUM_REJECT_50_VECTOR_FRAMES; ++i) {
        if (buf[i] != hum_reject_50_vector_output[i]) {
            printf("hum_reject_50: mismatch at frame %lu: got %ld, want %ld\n", (unsigned long)i,
                   (long)buf[i], (long)hum_reject_50_vector_output[i]);
            return 1;
        }
    }
    printf("hum_reject_50: %d frames bit-exact\n", HUM_REJECT_50_VECTOR_FRAMES);
    return 0;
}

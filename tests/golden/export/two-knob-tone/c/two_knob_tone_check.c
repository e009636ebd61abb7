/*
 * generated: do not edit
 * tool: tonewright 0.1.0
 * command: tonewright export audio-demos/two-knob-tone.toml --lang c --vectors 64
 * design: Two-knob passive tone stage, bench port (audio-demos/two-knob-tone.toml, fnv1a-64 eb1577a73018a044)
 * format: q15: Q1.15 samples, Q2.14 coefficients (16 bits), 32-bit accumulator, rounding nearest, saturate on overflow, error feedback 0
 * structure: df1; rate: 48000 Hz; knobs: bass=0.5, treble=0.5
 *
 * Runs two_knob_tone.c on the golden vectors in blocks of 1 to 7 frames (so the
 * state must carry across calls) and compares with the simulator's output.
 * Exit status 0: bit-exact; 1: the first mismatch is printed.
 * Build: cc -std=c99 two_knob_tone.c two_knob_tone_check.c && ./a.out
 */
#include <stdio.h>
#include "two_knob_tone.h"
#include "two_knob_tone_vectors.h"

int main(void)
{
    static int32_t buf[TWO_KNOB_TONE_VECTOR_FRAMES];
    two_knob_tone_state st;
    size_t i, done, block = 1;
    for (i = 0; i < TWO_KNOB_TONE_VECTOR_FRAMES; ++i) {
        buf[i] = two_knob_tone_vector_input[i];
    }
    two_knob_tone_reset(&st);
    for (done = 0; done < TWO_KNOB_TONE_VECTOR_FRAMES; done += block, block = block % 7 + 1) {
        size_t left = TWO_KNOB_TONE_VECTOR_FRAMES - done;
        two_knob_tone_process(&st, &two_knob_tone_table, buf + done, block < left ? block : left);
    }
    for (i = 0; i < TWO_KNOB_TONE_VECTOR_FRAMES; ++i) {
        if (buf[i] != two_knob_tone_vector_output[i]) {
            printf("two_knob_tone: mismatch at frame %lu: got %ld, want %ld\n", (unsigned long)i,
                   (long)buf[i], (long)two_knob_tone_vector_output[i]);
            return 1;
        }
    }
    printf("two_knob_tone: %d frames bit-exact\n", TWO_KNOB_TONE_VECTOR_FRAMES);
    return 0;
}

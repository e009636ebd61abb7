//! The block loop of one file, three blocks in flight.
//!
//! While the engines run block k, the meters and writers finish block k − 1 and the
//! reader fetches block k + 1: every step of the loop is a handful of independent
//! tasks, which rayon spreads over the cores (a fixed target also splits its channels,
//! see [`Runner`]). Each task owns what it touches, so the outputs are those of the
//! plain sequential loop, byte for byte.

use crate::audio::metrics::{powers, LevelMeter, ToneMeter};
use crate::audio::{WavReader, WavWriter};
use crate::error::Result;
use crate::simulate::Runner;

/// Frames per block: large enough to amortise handing tasks between the cores (8192
/// spent a tenth of the time switching threads), small enough for the second-level
/// cache (512 KiB of stereo f64).
pub const BLOCK_FRAMES: usize = 32768;

/// What the loop reads, runs, meters and writes; `None` for what the run leaves out.
pub(super) struct Stages<'a> {
    pub reader: &'a mut WavReader,
    pub channels: usize,
    pub target: &'a mut Runner,
    pub reference: Option<&'a mut Runner>,
    pub levels_in: &'a mut LevelMeter,
    pub levels_out: &'a mut LevelMeter,
    /// The tone meters of the input and the target's output, over channel 0 from frame
    /// `settle` on.
    pub tone_in: Option<&'a mut ToneMeter>,
    pub tone_out: Option<&'a mut ToneMeter>,
    pub settle: u64,
    pub target_out: &'a mut WavWriter,
    pub reference_out: Option<&'a mut WavWriter>,
    /// The target-minus-reference file and its gain.
    pub residual_out: Option<&'a mut WavWriter>,
    pub residual_gain: f64,
}

/// Sums over the whole file.
#[derive(Debug, Default)]
pub(super) struct Totals {
    pub frames: u64,
    /// Of the reference output.
    pub signal_power: f64,
    /// Of the target minus the reference.
    pub error_power: f64,
}

/// One block's buffers.
#[derive(Default)]
struct Block {
    /// Index of the first frame in the file.
    first_frame: u64,
    input: Vec<f64>,
    target: Vec<f64>,
    reference: Vec<f64>,
    residual: Vec<f64>,
}

/// Runs the whole file through `stages`, telling `progress` the frames done.
///
/// # Errors
/// The first error of any task (reading, an engine, writing); the loop stops there.
pub(super) fn run(stages: Stages<'_>, progress: &(dyn Fn(u64) + Sync)) -> Result<Totals> {
    let Stages {
        reader,
        channels,
        target,
        mut reference,
        levels_in,
        levels_out,
        mut tone_in,
        mut tone_out,
        settle,
        target_out,
        mut reference_out,
        mut residual_out,
        residual_gain,
    } = stages;
    let mut totals = Totals::default();
    let (mut previous, mut current, mut next) =
        (Block::default(), Block::default(), Block::default());
    reader.read_block(&mut next.input, BLOCK_FRAMES)?;
    loop {
        // The block read becomes the one to run, the one run the one to finish.
        std::mem::swap(&mut previous, &mut current);
        std::mem::swap(&mut current, &mut next);
        next.first_frame = current.first_frame + (current.input.len() / channels) as u64;
        if current.input.is_empty() && previous.input.is_empty() {
            return Ok(totals);
        }
        let mut results: [Result<()>; 6] = std::array::from_fn(|_| Ok(()));
        let [run_target, run_reference, finish_target, finish_reference, compare, read] =
            &mut results;
        let (mut signal_power, mut error_power) = (0.0, 0.0);
        let Block { first_frame, input, target: run_out, reference: reference_run, .. } =
            &mut current;
        let (first_frame, input) = (*first_frame, &*input);
        let Block {
            first_frame: finished_from,
            input: finished,
            target: target_done,
            reference: reference_done,
            residual,
        } = &mut previous;
        let (finished_from, target_done, reference_done) =
            (*finished_from, &*target_done, &*reference_done);
        let ran = !finished.is_empty();
        let compared = reference.is_some();
        // Spawned so that the two cores share the step evenly: the scope's own thread
        // takes its tasks newest first, a thief takes them oldest first. The reference
        // engine, spawned last, starts at once on this thread while the target engine,
        // spawned first, is stolen; the reads and writes between them fill whichever
        // core frees first.
        rayon::scope(|s| {
            if !input.is_empty() {
                let engine = &mut *target;
                s.spawn(move |_| *run_target = engine.process_from(input, run_out));
            }
            if ran && compared {
                if let Some(w) = &mut reference_out {
                    s.spawn(move |_| *finish_reference = w.write_block(reference_done));
                }
            }
            {
                // At the end this empties `next`, which ends the loop.
                let (reader, into) = (&mut *reader, &mut next.input);
                s.spawn(move |_| *read = reader.read_block(into, BLOCK_FRAMES).map(|_| ()));
            }
            if ran && compared {
                let (out, signal, error) = (&mut residual_out, &mut signal_power, &mut error_power);
                s.spawn(move |_| {
                    (*signal, *error) = powers(target_done, reference_done);
                    if let Some(w) = out {
                        residual.clear();
                        residual.extend(
                            target_done
                                .iter()
                                .zip(reference_done)
                                .map(|(t, r)| (t - r) * residual_gain),
                        );
                        *compare = w.write_block(residual);
                    }
                });
            }
            if ran {
                let (levels, tone, out) = (&mut *levels_out, &mut tone_out, &mut *target_out);
                s.spawn(move |_| {
                    levels.add(target_done);
                    if let Some(t) = tone {
                        t.add(tone_samples(target_done, channels, settle, finished_from));
                    }
                    *finish_target = out.write_block(target_done);
                });
            }
            if !input.is_empty() {
                let (levels, tone, engine) = (&mut *levels_in, &mut tone_in, &mut reference);
                s.spawn(move |_| {
                    levels.add(input);
                    if let Some(t) = tone {
                        t.add(tone_samples(input, channels, settle, first_frame));
                    }
                    if let Some(e) = engine {
                        *run_reference = e.process_from(input, reference_run);
                    }
                });
            }
        });
        for r in results {
            r?;
        }
        if ran {
            totals.signal_power += signal_power;
            totals.error_power += error_power;
            totals.frames += (finished.len() / channels) as u64;
            progress(totals.frames);
        }
    }
}

/// The samples of channel 0 of `block` (of `channels`, starting at frame
/// `first_frame`) that a tone meter takes: those from frame `settle` on.
fn tone_samples(
    block: &[f64],
    channels: usize,
    settle: u64,
    first_frame: u64,
) -> impl Iterator<Item = f64> + '_ {
    let skip = settle.saturating_sub(first_frame) as usize;
    block.iter().step_by(channels).skip(skip).copied()
}

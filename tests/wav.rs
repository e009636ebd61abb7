//! WAV reading and writing checked against sources outside tonewright: the RIFF/WAVE
//! layout (IBM, Microsoft, "Multimedia Programming Interface and Data Specifications
//! 1.0", 1991, and Microsoft's WAVE_FORMAT_EXTENSIBLE), the `hound` crate's reader,
//! and Python's standard `wave` module.

#[path = "common/corpus.rs"]
mod corpus;

use corpus::scratch_dir;
use proptest::prelude::*;
use std::path::Path;
use tonewright::audio::dither::{SplitMix64, TpdfDither};
use tonewright::audio::{SampleFormat, WavReader, WavSpec, WavWriter};

/// The formats hound 3.5 writes and reads: 8/16/24/32-bit integer and 32-bit float.
const HOUND_FORMATS: [(hound::SampleFormat, u16); 5] = [
    (hound::SampleFormat::Int, 8),
    (hound::SampleFormat::Int, 16),
    (hound::SampleFormat::Int, 24),
    (hound::SampleFormat::Int, 32),
    (hound::SampleFormat::Float, 32),
];

const FORMATS: [SampleFormat; 6] = [
    SampleFormat::Int { bits: 8 },
    SampleFormat::Int { bits: 16 },
    SampleFormat::Int { bits: 24 },
    SampleFormat::Int { bits: 32 },
    SampleFormat::Float { bits: 32 },
    SampleFormat::Float { bits: 64 },
];

fn read_all(path: &Path) -> (WavSpec, Vec<f64>) {
    let mut reader = WavReader::open(path).unwrap();
    let mut all = Vec::new();
    let mut block = Vec::new();
    // A small block size so every file is read in several blocks.
    while reader.read_block(&mut block, 37).unwrap() > 0 {
        all.extend_from_slice(&block);
    }
    assert_eq!(all.len() as u64, reader.frames() * u64::from(reader.spec().channels));
    (reader.spec(), all)
}

fn write(path: &Path, spec: WavSpec, samples: &[f64]) -> tonewright::audio::WriteStats {
    let mut writer = WavWriter::create(path, spec, &[]).unwrap();
    // Two blocks, split at a frame boundary, to exercise streaming.
    let split = samples.len() / usize::from(spec.channels) / 2 * usize::from(spec.channels);
    writer.write_block(&samples[..split]).unwrap();
    writer.write_block(&samples[split..]).unwrap();
    writer.finish().unwrap()
}

/// Every extreme and small code of a `bits`-bit integer, then seeded random codes.
fn int_codes(bits: u16, count: usize) -> Vec<i64> {
    let max = (1i64 << (bits - 1)) - 1;
    let min = -(1i64 << (bits - 1));
    let mut codes = vec![min, min + 1, -1, 0, 1, max - 1, max];
    let mut rng = SplitMix64::new(u64::from(bits));
    while codes.len() < count {
        codes.push(min + (rng.next_u64() % (1u64 << bits)) as i64);
    }
    codes
}

/// Samples that a format stores exactly, extremes first, `count` of them.
fn exact_samples(format: SampleFormat, count: usize) -> Vec<f64> {
    let mut rng = SplitMix64::new(99);
    match format {
        SampleFormat::Int { bits } => {
            let scale = (1i64 << (bits - 1)) as f64;
            int_codes(bits, count).into_iter().map(|k| k as f64 / scale).collect()
        }
        SampleFormat::Float { bits: 32 } => {
            let mut v = vec![1.0, -1.0, 0.0, f64::from(f32::MIN_POSITIVE), f64::from(f32::EPSILON)];
            while v.len() < count {
                v.push(f64::from((2.0 * rng.next_f64() - 1.0) as f32));
            }
            v
        }
        SampleFormat::Float { .. } => {
            let mut v = vec![1.0, -1.0, 0.0, 1e-300, -f64::EPSILON, 0.1];
            while v.len() < count {
                v.push(2.0 * rng.next_f64() - 1.0);
            }
            v
        }
    }
}

#[test]
fn round_trip_is_bit_exact_for_every_format_and_channel_layout() {
    let dir = scratch_dir("roundtrip");
    for format in FORMATS {
        for channels in [1u16, 2, 6] {
            // 101 frames: an odd count, so 8- and 24-bit mono data needs a pad byte.
            let samples = exact_samples(format, 101 * usize::from(channels));
            let spec = WavSpec { channels, rate: 44_100, sample: format };
            let path =
                dir.join(format!("{format:?}-{channels}ch.wav").replace([' ', '{', '}', ':'], ""));
            let stats = write(&path, spec, &samples);
            assert_eq!((stats.frames, stats.overs), (101, 0), "{format:?} {channels}");
            let (got_spec, got) = read_all(&path);
            assert_eq!(got_spec, spec);
            let bits = |v: &[f64]| v.iter().map(|x| x.to_bits()).collect::<Vec<_>>();
            assert_eq!(bits(&got), bits(&samples), "{format:?} {channels} channels");
        }
    }
}

#[test]
fn written_headers_follow_the_riff_wave_layout() {
    // Field offsets and meanings from Multimedia Programming Interface and Data
    // Specifications 1.0 (1991), "WAVE Form Definition": wFormatTag at 20, nChannels 22,
    // nSamplesPerSec 24, nAvgBytesPerSec 28 (= rate × block align), nBlockAlign 32,
    // wBitsPerSample 34; fmt size 16 for PCM, 18 for tag 3 (cbSize = 0), 40 for
    // EXTENSIBLE (cbSize = 22); the RIFF size counts the file after its first 8 bytes.
    let dir = scratch_dir("header");
    let cases = [
        (SampleFormat::Int { bits: 16 }, 2u16, 1u16, 16u32),
        (SampleFormat::Int { bits: 24 }, 2, 1, 16),
        (SampleFormat::Int { bits: 32 }, 1, 1, 16),
        (SampleFormat::Float { bits: 32 }, 2, 3, 18),
        (SampleFormat::Float { bits: 64 }, 1, 3, 18),
        (SampleFormat::Int { bits: 16 }, 6, 0xFFFE, 40),
        (SampleFormat::Float { bits: 32 }, 6, 0xFFFE, 40),
    ];
    for (format, channels, tag, fmt_size) in cases {
        let spec = WavSpec { channels, rate: 48_000, sample: format };
        let path = dir.join("h.wav");
        write(&path, spec, &vec![0.25; 10 * usize::from(channels)]);
        let b = std::fs::read(&path).unwrap();
        let u16_at = |i: usize| u16::from_le_bytes([b[i], b[i + 1]]);
        let u32_at = |i: usize| u32::from_le_bytes([b[i], b[i + 1], b[i + 2], b[i + 3]]);
        let block_align = u32::from(channels) * u32::from(format_bits(format) / 8);
        assert_eq!(&b[0..4], b"RIFF");
        assert_eq!(u32_at(4) as usize, b.len() - 8, "{format:?} {channels}");
        assert_eq!(&b[8..16], b"WAVEfmt ");
        assert_eq!(u32_at(16), fmt_size, "{format:?} {channels}");
        assert_eq!(u16_at(20), tag, "{format:?} {channels}");
        assert_eq!(u16_at(22), channels);
        assert_eq!(u32_at(24), 48_000);
        assert_eq!(u32_at(28), 48_000 * block_align);
        assert_eq!(u32::from(u16_at(32)), block_align);
        assert_eq!(u16_at(34), format_bits(format));
        if tag == 0xFFFE {
            // WAVE_FORMAT_EXTENSIBLE: valid bits, the 5.1 speaker mask (ksmedia.h
            // KSAUDIO_SPEAKER_5POINT1 = 0x3F, from memory), then the subformat GUID
            // whose first two bytes are the plain format tag.
            assert_eq!(u16_at(36), 22);
            assert_eq!(u16_at(38), format_bits(format));
            assert_eq!(u32_at(40), 0x3F);
            let sub = if matches!(format, SampleFormat::Int { .. }) { 1 } else { 3 };
            assert_eq!(u16_at(44), sub);
        }
        let data_at = b.len() - 10 * block_align as usize - 8;
        assert_eq!(&b[data_at..data_at + 4], b"data");
        assert_eq!(u32_at(data_at + 4), 10 * block_align);
        if tag != 1 {
            // A fact chunk with the frame count precedes data for non-PCM formats.
            assert_eq!(&b[data_at - 12..data_at - 4], b"fact\x04\0\0\0");
            assert_eq!(u32_at(data_at - 4), 10);
        }
    }
}

fn format_bits(format: SampleFormat) -> u16 {
    match format {
        SampleFormat::Int { bits } | SampleFormat::Float { bits } => bits,
    }
}

#[test]
fn integer_output_rounds_to_nearest_and_counts_clipped_samples() {
    // Round to nearest then saturate at the extreme codes (common practice); ties go
    // to even, so ±0.5 LSB gives 0 and 1.5 LSB gives 2.
    let dir = scratch_dir("clip");
    let path = dir.join("clip.wav");
    let lsb = 1.0 / 32768.0;
    let input = [1.5, -1.5, 0.999_999_99, -1.000_000_1, 0.5 * lsb, -0.5 * lsb, 1.5 * lsb, 0.3];
    let spec = WavSpec { channels: 2, rate: 8000, sample: SampleFormat::Int { bits: 16 } };
    let stats = write(&path, spec, &input);
    assert_eq!(stats.overs, 3);
    let (_, got) = read_all(&path);
    let codes: Vec<i64> = got.iter().map(|x| (x * 32768.0) as i64).collect();
    assert_eq!(codes, [32767, -32768, 32767, -32768, 0, 0, 2, 9830]);
}

#[test]
fn float_output_keeps_overs_and_counts_them() {
    let dir = scratch_dir("float-over");
    let path = dir.join("over.wav");
    let spec = WavSpec { channels: 1, rate: 8000, sample: SampleFormat::Float { bits: 32 } };
    let stats = write(&path, spec, &[2.0, -1.0, 0.5, -3.0]);
    assert_eq!(stats.overs, 2);
    assert_eq!(read_all(&path).1, [2.0, -1.0, 0.5, -3.0]);
}

#[test]
fn reader_matches_hound_for_every_format_hound_reads() {
    // hound 3.5 writes and reads 8/16/24/32-bit integer and 32-bit float (not 64-bit
    // float); it writes EXTENSIBLE headers for 6 channels and for >16 bits.
    let dir = scratch_dir("hound");
    for (sample_format, bits) in HOUND_FORMATS {
        for channels in [1u16, 2, 6] {
            let path = dir.join(format!("hound-{bits}-{channels}.wav"));
            let spec = hound::WavSpec {
                channels,
                sample_rate: 22_050,
                bits_per_sample: bits,
                sample_format,
            };
            let mut w = hound::WavWriter::create(&path, spec).unwrap();
            let n = 99 * usize::from(channels);
            if sample_format == hound::SampleFormat::Int {
                for k in int_codes(bits, n) {
                    w.write_sample(k as i32).unwrap();
                }
            } else {
                for x in exact_samples(SampleFormat::Float { bits: 32 }, n) {
                    w.write_sample(x as f32).unwrap();
                }
            }
            w.finalize().unwrap();

            let mut h = hound::WavReader::open(&path).unwrap();
            let want: Vec<f64> = if sample_format == hound::SampleFormat::Int {
                let scale = (1i64 << (bits - 1)) as f64;
                h.samples::<i32>().map(|s| f64::from(s.unwrap()) / scale).collect()
            } else {
                h.samples::<f32>().map(|s| f64::from(s.unwrap())).collect()
            };
            let (spec, got) = read_all(&path);
            assert_eq!(
                (spec.channels, spec.rate, format_bits(spec.sample)),
                (channels, 22_050, bits)
            );
            assert_eq!(got, want, "{bits} bits {channels} channels");
        }
    }
}

/// The bytes of the `data` chunk of a RIFF/WAVE file.
fn data_chunk(path: &Path) -> Vec<u8> {
    let bytes = std::fs::read(path).unwrap();
    let mut at = 12;
    loop {
        let size = u32::from_le_bytes(bytes[at + 4..at + 8].try_into().unwrap()) as usize;
        if &bytes[at..at + 4] == b"data" {
            return bytes[at + 8..at + 8 + size].to_vec();
        }
        at += 8 + size + size % 2;
    }
}

#[test]
fn writer_stores_the_same_sample_bytes_as_hound_for_every_format_hound_writes() {
    // The headers differ on purpose (module doc of wav_write: plain PCM up to two
    // channels); the data chunk must be byte for byte what hound 3.5 writes.
    let dir = scratch_dir("hound-write");
    for (sample_format, bits) in HOUND_FORMATS {
        for channels in [1u16, 2, 6] {
            let n = 1001 * usize::from(channels);
            let (ours, theirs) = (dir.join("ours.wav"), dir.join("hound.wav"));
            let spec = hound::WavSpec {
                channels,
                sample_rate: 44_100,
                bits_per_sample: bits,
                sample_format,
            };
            let mut w = hound::WavWriter::create(&theirs, spec).unwrap();
            let format = if sample_format == hound::SampleFormat::Int {
                for k in int_codes(bits, n) {
                    w.write_sample(k as i32).unwrap();
                }
                SampleFormat::Int { bits }
            } else {
                for x in exact_samples(SampleFormat::Float { bits: 32 }, n) {
                    w.write_sample(x as f32).unwrap();
                }
                SampleFormat::Float { bits: 32 }
            };
            w.finalize().unwrap();
            let spec = WavSpec { channels, rate: 44_100, sample: format };
            write(&ours, spec, &exact_samples(format, n));
            assert_eq!(data_chunk(&ours), data_chunk(&theirs), "{bits} bits {channels} channels");
        }
    }
}

/// Writes `samples` in blocks of 1, 7, 64, 1000 and 8191 frames, over and over, so
/// blocks end at odd places, with TPDF dither from `seed` if given.
fn write_in_odd_blocks(
    path: &Path,
    spec: WavSpec,
    seed: Option<u64>,
    samples: &[f64],
) -> tonewright::audio::WriteStats {
    let mut writer = WavWriter::create(path, spec, &[]).unwrap();
    if let Some(seed) = seed {
        writer = writer.with_tpdf_dither(seed).unwrap();
    }
    let mut rest = samples;
    for frames in [1, 7, 64, 1000, 8191].into_iter().cycle() {
        if rest.is_empty() {
            break;
        }
        let (block, tail) = rest.split_at((frames * usize::from(spec.channels)).min(rest.len()));
        writer.write_block(block).unwrap();
        rest = tail;
    }
    writer.finish().unwrap()
}

/// hound's file of `channels` × `bits` samples, each written by `write`.
fn hound_file(
    path: &Path,
    channels: u16,
    sample_format: hound::SampleFormat,
    bits: u16,
    write: impl FnOnce(&mut hound::WavWriter<std::io::BufWriter<std::fs::File>>),
) {
    let spec =
        hound::WavSpec { channels, sample_rate: 44_100, bits_per_sample: bits, sample_format };
    let mut w = hound::WavWriter::create(path, spec).unwrap();
    write(&mut w);
    w.finalize().unwrap();
}

/// Frames of the edge tests: odd, so 8-bit mono needs a pad byte, and enough that
/// every layout spans several of the writer's write calls (of 256 KiB).
const FRAMES: usize = 300_001;

/// Samples on and beside every rounding and clipping edge of a `bits`-bit integer
/// (ties, the extreme codes and half an LSB beyond them, 2^50 to 2^53 LSB where
/// adding a 1.5·2^52 rounding offset stops being exact, infinities), then seeded
/// samples up to 10 % beyond full scale, `count` in all.
fn edge_samples(bits: u16, count: usize) -> Vec<f64> {
    let scale = (1i64 << (bits - 1)) as f64;
    let mut v = vec![0.0, -0.0, 5e-324, f64::MAX, f64::MIN, f64::INFINITY, f64::NEG_INFINITY];
    for lsb in [0.5, 1.5, 2.5, scale - 1.5, scale - 1.0, scale - 0.5, scale, scale + 0.5] {
        v.extend([lsb / scale, -lsb / scale]);
    }
    for power in [50, 51, 52, 53] {
        let lsb = 2f64.powi(power);
        v.extend([lsb / scale, -lsb / scale, (lsb - 0.5) / scale, (0.5 - lsb) / scale]);
    }
    let mut rng = SplitMix64::new(u64::from(bits) + 100);
    while v.len() < count {
        v.push(2.2 * rng.next_f64() - 1.1);
    }
    v
}

/// The code and the clip of `v` LSB by the literal rule: nearest integer, ties to
/// even, then the nearer extreme code of a `bits`-bit integer.
fn literal_code(v: f64, bits: u16) -> (i64, bool) {
    let (min, max) = (-(1i64 << (bits - 1)), (1i64 << (bits - 1)) - 1);
    let r = v.round_ties_even();
    if r < min as f64 {
        (min, true)
    } else if r > max as f64 {
        (max, true)
    } else {
        (r as i64, false)
    }
}

#[test]
fn integer_writer_stores_what_hound_stores_for_literally_rounded_codes_at_every_edge() {
    // The oracle adds the same seeded dither, rounds with round_ties_even and clips in
    // i64; hound writes its codes.
    let dir = scratch_dir("hound-edges");
    let (ours, theirs) = (dir.join("ours.wav"), dir.join("hound.wav"));
    for bits in [8u16, 16, 24, 32] {
        let scale = (1i64 << (bits - 1)) as f64;
        for channels in [1u16, 2, 3] {
            let x = edge_samples(bits, FRAMES * usize::from(channels));
            for seed in [None, Some(11)] {
                let mut dither = seed.map(TpdfDither::new);
                let mut overs = 0;
                hound_file(&theirs, channels, hound::SampleFormat::Int, bits, |w| {
                    for &s in &x {
                        let d = dither.as_mut().map_or(0.0, TpdfDither::next_lsb);
                        let (code, clipped) = literal_code(s * scale + d, bits);
                        overs += u64::from(clipped);
                        w.write_sample(code as i32).unwrap();
                    }
                });
                let spec = WavSpec { channels, rate: 44_100, sample: SampleFormat::Int { bits } };
                let stats = write_in_odd_blocks(&ours, spec, seed, &x);
                let what = format!("{bits} bits, {channels} channels, dither {seed:?}");
                assert_eq!((stats.frames, stats.overs), (FRAMES as u64, overs), "{what}");
                assert_eq!(data_chunk(&ours), data_chunk(&theirs), "{what}");
            }
        }
    }
}

#[test]
fn float_writer_stores_what_hound_stores_beyond_full_scale_and_at_f32_edges() {
    // f64 to f32 rounds to nearest (IEEE 754, Rust `as`), so hound gets `x as f32`;
    // values beyond f32 become infinities, values below its subnormals zeros.
    let dir = scratch_dir("hound-float-edges");
    let (ours, theirs) = (dir.join("ours.wav"), dir.join("hound.wav"));
    let f32_max = f64::from(f32::MAX);
    let edges = [1.0 + f64::EPSILON, -1.5, 3.0, f32_max, f32_max * 1.000_000_1, 1e300, 1e-46];
    for channels in [1u16, 2, 3] {
        let mut x = edges.to_vec();
        x.extend(edge_samples(24, FRAMES * usize::from(channels) - edges.len()));
        hound_file(&theirs, channels, hound::SampleFormat::Float, 32, |w| {
            for &s in &x {
                w.write_sample(s as f32).unwrap();
            }
        });
        let spec = WavSpec { channels, rate: 44_100, sample: SampleFormat::Float { bits: 32 } };
        let stats = write_in_odd_blocks(&ours, spec, None, &x);
        let overs = x.iter().filter(|s| s.abs() > 1.0).count() as u64;
        assert_eq!((stats.frames, stats.overs), (FRAMES as u64, overs), "{channels} channels");
        assert_eq!(data_chunk(&ours), data_chunk(&theirs), "{channels} channels");
    }
}

/// A 16-bit stereo RIFF/WAVE file with the given chunks between `fmt ` and `data`.
fn wav_with_chunks_before_data(extra: &[u8], codes: &[i16]) -> Vec<u8> {
    let mut body = b"WAVEfmt ".to_vec();
    body.extend_from_slice(&16u32.to_le_bytes());
    for field in [1u16, 2] {
        body.extend_from_slice(&field.to_le_bytes());
    }
    body.extend_from_slice(&8000u32.to_le_bytes());
    body.extend_from_slice(&32000u32.to_le_bytes());
    body.extend_from_slice(&4u16.to_le_bytes());
    body.extend_from_slice(&16u16.to_le_bytes());
    body.extend_from_slice(extra);
    body.extend_from_slice(b"data");
    body.extend_from_slice(&(codes.len() as u32 * 2).to_le_bytes());
    for c in codes {
        body.extend_from_slice(&c.to_le_bytes());
    }
    // A LIST chunk after data, as many editors write, must be ignored.
    body.extend_from_slice(b"LIST\x04\0\0\0INFO");
    let mut file = b"RIFF".to_vec();
    file.extend_from_slice(&(body.len() as u32).to_le_bytes());
    file.extend_from_slice(&body);
    file
}

#[test]
fn odd_sized_chunk_before_data_is_skipped_with_its_pad_byte() {
    // RIFF (MPIDS 1.0, 1991): a chunk of odd size is followed by one pad byte that its
    // size does not count. hound 3.5 fails on this file; we must not.
    let dir = scratch_dir("odd-chunk");
    let path = dir.join("odd.wav");
    let codes = [1i16, -2, 32767, -32768, 0, 12345];
    std::fs::write(&path, wav_with_chunks_before_data(b"junk\x03\0\0\0abc\0bext\0\0\0\0", &codes))
        .unwrap();
    let (spec, got) = read_all(&path);
    assert_eq!(spec.channels, 2);
    let want: Vec<f64> = codes.iter().map(|&c| f64::from(c) / 32768.0).collect();
    assert_eq!(got, want);
}

#[test]
fn extensible_with_fewer_valid_bits_reads_by_container_width() {
    // WAVE_FORMAT_EXTENSIBLE: 20 valid bits are left-justified in a 24-bit container,
    // so the code read as 24-bit and divided by 2^23 is the right value.
    let dir = scratch_dir("valid-bits");
    let path = dir.join("v.wav");
    let mut fmt = Vec::new();
    for v in [0xFFFEu16, 1] {
        fmt.extend_from_slice(&v.to_le_bytes());
    }
    fmt.extend_from_slice(&8000u32.to_le_bytes());
    fmt.extend_from_slice(&24000u32.to_le_bytes());
    for v in [3u16, 24, 22, 20] {
        fmt.extend_from_slice(&v.to_le_bytes());
    }
    fmt.extend_from_slice(&4u32.to_le_bytes());
    fmt.extend_from_slice(&[1, 0, 0, 0, 0, 0, 0x10, 0, 0x80, 0, 0, 0xAA, 0, 0x38, 0x9B, 0x71]);
    let codes: [i32; 3] = [-(1 << 23), 16, (1 << 23) - 16]; // multiples of 2^4
    let mut body = b"WAVEfmt ".to_vec();
    body.extend_from_slice(&(fmt.len() as u32).to_le_bytes());
    body.extend_from_slice(&fmt);
    body.extend_from_slice(b"data\x09\0\0\0");
    for c in codes {
        body.extend_from_slice(&c.to_le_bytes()[..3]);
    }
    body.push(0); // pad byte after 9 data bytes
    let mut file = b"RIFF".to_vec();
    file.extend_from_slice(&(body.len() as u32).to_le_bytes());
    file.extend_from_slice(&body);
    std::fs::write(&path, file).unwrap();
    let (spec, got) = read_all(&path);
    assert_eq!(spec.sample, SampleFormat::Int { bits: 24 });
    let want: Vec<f64> = codes.iter().map(|&c| f64::from(c) / 8_388_608.0).collect();
    assert_eq!(got, want);
}

#[test]
fn python_wave_module_reads_our_integer_files_with_the_same_samples() {
    // Python's standard `wave` module (3.11 reads WAVE_FORMAT_PCM only): readframes()
    // returns the raw little-endian frames, unsigned for 8-bit.
    let script = r#"
import sys, wave
w = wave.open(sys.argv[1], "rb")
n, sw = w.getnframes(), w.getsampwidth()
raw = w.readframes(n)
if sw == 1:
    vals = [b - 128 for b in raw]
else:
    vals = [int.from_bytes(raw[i:i + sw], "little", signed=True) for i in range(0, len(raw), sw)]
print(w.getnchannels(), sw, w.getframerate(), n)
print(" ".join(map(str, vals)))
"#;
    if std::process::Command::new("python3").arg("--version").output().is_err() {
        eprintln!("notice: python3 not found; skipping the Python wave module check");
        return;
    }
    let dir = scratch_dir("python");
    for bits in [8u16, 16, 24, 32] {
        for channels in [1u16, 2] {
            let path = dir.join(format!("py-{bits}-{channels}.wav"));
            let codes = int_codes(bits, 41 * usize::from(channels));
            let scale = (1i64 << (bits - 1)) as f64;
            let samples: Vec<f64> = codes.iter().map(|&k| k as f64 / scale).collect();
            let spec = WavSpec { channels, rate: 32_000, sample: SampleFormat::Int { bits } };
            write(&path, spec, &samples);
            let out = std::process::Command::new("python3")
                .args(["-c", script])
                .arg(&path)
                .output()
                .unwrap();
            assert!(out.status.success(), "python: {}", String::from_utf8_lossy(&out.stderr));
            let text = String::from_utf8(out.stdout).unwrap();
            let mut lines = text.lines();
            assert_eq!(lines.next().unwrap(), format!("{channels} {} 32000 41", bits / 8));
            let got: Vec<i64> =
                lines.next().unwrap().split(' ').map(|s| s.parse().unwrap()).collect();
            assert_eq!(got, codes, "{bits} bits {channels} channels");
        }
    }
}

#[test]
fn every_bad_wav_is_refused_with_one_line_naming_file_and_defect() {
    // Each defective file of tests/bad-wav (made by tests/bad-wav/make.py) and the start
    // of its message, shared with the replay through the binary in tests/bad_input.rs.
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/bad-wav");
    let expected = corpus::table(&dir.join("expected.tsv"), 2);
    let on_disk = corpus::files_with_extension(&dir, "wav");
    let listed: Vec<&String> = expected.iter().map(|row| &row[0]).collect();
    assert_eq!(
        on_disk.iter().collect::<Vec<_>>(),
        listed,
        "every file in tests/bad-wav is in the table"
    );
    assert!(expected.len() >= 25);
    for row in &expected {
        let (name, start) = (&row[0], &row[1]);
        let path = dir.join(name);
        let err = WavReader::open(&path).expect_err(name).to_string();
        let want = format!("{}: {start}", path.display());
        assert!(err.starts_with(&want), "{name}: want {want:?}, got {err:?}");
        assert!(!err.contains('\n'), "{name}: more than one line: {err}");
        // Lowercase prose; quoted file bytes ("RIFF") and units (Hz) keep their case.
        assert!(start.starts_with(|c: char| c.is_lowercase()), "{name}: {err}");
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(400))]

    #[test]
    fn corrupted_or_truncated_files_never_panic(
        cut in 0usize..200,
        flips in proptest::collection::vec((0usize..200, any::<u8>()), 0..6),
    ) {
        // A valid file with random bytes overwritten, then cut short: open and read
        // must return Ok or Err, never panic or allocate from a bogus size.
        let samples: Vec<f64> = (0..40).map(|i| f64::from(i) / 64.0 - 0.3).collect();
        let dir = scratch_dir("fuzz");
        let good = dir.join("good.wav");
        let spec = WavSpec { channels: 2, rate: 8000, sample: SampleFormat::Int { bits: 24 } };
        write(&good, spec, &samples);
        let mut bytes = std::fs::read(&good).unwrap();
        for (at, value) in flips {
            if let Some(b) = bytes.get_mut(at) {
                *b = value;
            }
        }
        bytes.truncate(cut);
        let bad = dir.join("bad.wav");
        std::fs::write(&bad, &bytes).unwrap();
        if let Ok(mut reader) = WavReader::open(&bad) {
            let mut block = Vec::new();
            while reader.read_block(&mut block, 1000).unwrap() > 0 {}
        }
    }
}

#[test]
fn writer_refuses_to_overwrite_its_input_and_leaves_it_intact() {
    let dir = scratch_dir("protect");
    let input = dir.join("in.wav");
    let spec = WavSpec { channels: 1, rate: 8000, sample: SampleFormat::Int { bits: 16 } };
    write(&input, spec, &[0.5; 16]);
    let before = std::fs::read(&input).unwrap();
    let same = dir.join(".").join("in.wav");
    let err = WavWriter::create(&same, spec, &[&input]).unwrap_err().to_string();
    assert!(err.contains("would overwrite the input"), "{err}");
    assert_eq!(std::fs::read(&input).unwrap(), before);
}

#[test]
fn failed_write_leaves_no_output_file() {
    let dir = scratch_dir("nan");
    let path = dir.join("out.wav");
    let spec = WavSpec { channels: 2, rate: 8000, sample: SampleFormat::Int { bits: 16 } };
    let mut writer = WavWriter::create(&path, spec, &[]).unwrap();
    writer.write_block(&[0.1, 0.2]).unwrap();
    let err = writer.write_block(&[0.1, f64::NAN]).unwrap_err().to_string();
    assert!(err.contains("not a number (nan) at frame 1, channel 1"), "{err}");
    let err = writer.write_block(&[0.1, 0.2, 0.3]).unwrap_err().to_string();
    assert!(err.contains("not a whole number of 2-channel frames"), "{err}");
    drop(writer);
    assert_eq!(std::fs::read_dir(&dir).unwrap().count(), 0, "no file, no temporary file");
}

#[test]
fn a_block_refused_for_a_nan_leaves_no_trace_in_any_format() {
    // The writer searches for NaNs only in blocks with overs, where it counts a NaN,
    // so NaNs come alone, beside an over and beside an infinity, in every format; the
    // refused block must move neither the dither nor the counts.
    let dir = scratch_dir("nan-refused");
    let (before, after) = ([0.25, -1.5, 0.1], [0.3, 2.0, -0.7]);
    for format in FORMATS {
        let spec = WavSpec { channels: 1, rate: 8000, sample: format };
        let seed = matches!(format, SampleFormat::Int { .. }).then_some(3);
        let run = |bad: &[f64]| {
            let path = dir.join("out.wav");
            let mut w = WavWriter::create(&path, spec, &[]).unwrap();
            if let Some(seed) = seed {
                w = w.with_tpdf_dither(seed).unwrap();
            }
            w.write_block(&before).unwrap();
            if !bad.is_empty() {
                let err = w.write_block(bad).unwrap_err().to_string();
                assert!(err.contains("not a number (nan) at frame 4, channel 0"), "{err}");
            }
            w.write_block(&after).unwrap();
            let stats = w.finish().unwrap();
            (stats, std::fs::read(&path).unwrap())
        };
        let clean = run(&[]);
        assert_eq!(clean.0.overs, 2, "{format:?}");
        for bad in
            [[0.5, f64::NAN, 0.5], [1.5, f64::NAN, -f64::NAN], [0.0, -f64::NAN, f64::INFINITY]]
        {
            assert_eq!(run(&bad), clean, "{format:?} {bad:?}");
        }
    }
}

#[test]
fn dither_is_refused_for_float_output_and_reproducible_for_integer_output() {
    let dir = scratch_dir("dither-seed");
    let float = WavSpec { channels: 1, rate: 8000, sample: SampleFormat::Float { bits: 32 } };
    let err = WavWriter::create(&dir.join("f.wav"), float, &[]).unwrap().with_tpdf_dither(1);
    assert!(err.unwrap_err().to_string().contains("tpdf dither applies to integer outputs"));
    let spec = WavSpec { channels: 1, rate: 8000, sample: SampleFormat::Int { bits: 16 } };
    let signal: Vec<f64> = (0..1000).map(|i| 0.001 * (f64::from(i) * 0.01).sin()).collect();
    let mut files = Vec::new();
    for (name, seed) in [("a.wav", 5), ("b.wav", 5), ("c.wav", 6)] {
        let path = dir.join(name);
        let mut w = WavWriter::create(&path, spec, &[]).unwrap().with_tpdf_dither(seed).unwrap();
        w.write_block(&signal).unwrap();
        w.finish().unwrap();
        files.push(std::fs::read(&path).unwrap());
    }
    assert_eq!(files[0], files[1], "same seed, same bytes");
    assert_ne!(files[0], files[2], "different seed, different dither");
}

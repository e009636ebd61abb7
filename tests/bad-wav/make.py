#!/usr/bin/env python3
"""Writes the corpus of defective WAV files that tests/wav.rs replays.

Each file is named by its one defect; everything else about it is a valid 16-bit
mono 8 kHz RIFF/WAVE file as laid out in the Multimedia Programming Interface and Data
Specifications 1.0 (IBM, Microsoft, 1991) and, for tag 0xFFFE, Microsoft's
WAVE_FORMAT_EXTENSIBLE. Standard library only; output is deterministic.

Run from the repository root:  python3 tests/bad-wav/make.py
"""
import os
import struct

HERE = os.path.dirname(os.path.abspath(__file__))
GUID_TAIL = bytes([0x00, 0x00, 0x00, 0x00, 0x10, 0x00, 0x80, 0x00,
                   0x00, 0xAA, 0x00, 0x38, 0x9B, 0x71])


def chunk(cid, body, size=None):
    """A chunk with its pad byte; `size` overrides the declared size."""
    declared = len(body) if size is None else size
    pad = b"\0" if len(body) % 2 else b""
    return cid + struct.pack("<I", declared) + body + pad


def fmt(tag=1, channels=1, rate=8000, bits=16, block_align=None, extra=b""):
    if block_align is None:
        block_align = channels * (bits // 8)
    body = struct.pack("<HHIIHH", tag, channels, rate, rate * block_align & 0xFFFFFFFF,
                       block_align & 0xFFFF, bits) + extra
    return chunk(b"fmt ", body)


def extensible(subtag=1, bits=16, valid=16, guid_tail=GUID_TAIL, cb=22):
    ext = struct.pack("<HHI", cb, valid, 4) + struct.pack("<H", subtag) + guid_tail
    return fmt(tag=0xFFFE, bits=bits, extra=ext)


def riff(*chunks, magic=b"RIFF", form=b"WAVE"):
    body = form + b"".join(chunks)
    return magic + struct.pack("<I", len(body)) + body


DATA = chunk(b"data", bytes(range(0, 200, 2)) * 2)  # 200 bytes: 100 frames
GOOD = riff(fmt(), DATA)

FILES = {
    "zero-length.wav": b"",
    "truncated-header.wav": GOOD[:10],
    "wrong-magic.wav": b"JUNK" + GOOD[4:],
    "not-wave-form.wav": riff(fmt(), DATA, form=b"AVI "),
    "rifx-big-endian.wav": b"RIFX" + GOOD[4:],
    "rf64.wav": b"RF64" + GOOD[4:],
    "missing-fmt.wav": riff(chunk(b"LIST", b"INFOISFT\x04\0\0\0abc\0")),
    "data-before-fmt.wav": riff(DATA, fmt()),
    "missing-data.wav": riff(fmt(), chunk(b"LIST", b"INFO")),
    "truncated-chunk-header.wav": riff(fmt()) + b"dat",
    "fmt-too-short.wav": riff(chunk(b"fmt ", b"\x01\0\x01\0\x40\x1f\0\0"), DATA),
    "fmt-truncated.wav": riff(fmt())[:30],
    "chunk-size-past-end.wav": riff(fmt(), chunk(b"LIST", b"INFO", size=1_000_000), DATA),
    "second-fmt-chunk.wav": riff(fmt(), fmt(bits=8), DATA),
    "mulaw-8bit.wav": riff(fmt(tag=7, bits=8), DATA),
    "alaw.wav": riff(fmt(tag=6, bits=8), DATA),
    "adpcm.wav": riff(fmt(tag=2, bits=4, block_align=256), DATA),
    "ima-adpcm.wav": riff(fmt(tag=0x11, bits=4, block_align=256), DATA),
    "mp3-in-wav.wav": riff(fmt(tag=0x55, bits=0, block_align=1), DATA),
    "unknown-format-tag.wav": riff(fmt(tag=0x1234), DATA),
    "zero-channels.wav": riff(fmt(channels=0, block_align=2), DATA),
    "zero-rate.wav": riff(fmt(rate=0), DATA),
    "zero-bits.wav": riff(fmt(bits=0, block_align=2), DATA),
    "pcm-12bit.wav": riff(fmt(bits=12, block_align=2), DATA),
    "float-16bit.wav": riff(fmt(tag=3, bits=16), DATA),
    "block-align-mismatch.wav": riff(fmt(block_align=4), DATA),
    "huge-channel-count.wav": riff(fmt(channels=65535), DATA),
    "data-size-exceeds-file.wav": riff(fmt(), b"data" + struct.pack("<I", 4_000_000)
                                       + bytes(1200)),
    "data-declares-4gib.wav": riff(fmt(), b"data" + struct.pack("<I", 0xFFFFFFFF)
                                   + bytes(64)),
    "partial-frame.wav": riff(fmt(), chunk(b"data", b"\0\0\0")),
    "extensible-too-short.wav": riff(fmt(tag=0xFFFE, extra=b"\0\0"), DATA),
    "extensible-small-cbsize.wav": riff(extensible(cb=10), DATA),
    "extensible-mulaw.wav": riff(extensible(subtag=7, bits=8, valid=8), DATA),
    "extensible-unknown-guid.wav": riff(extensible(guid_tail=bytes(14)), DATA),
    "extensible-valid-bits-exceed.wav": riff(extensible(valid=24), DATA),
}

for name, content in sorted(FILES.items()):
    with open(os.path.join(HERE, name), "wb") as f:
        f.write(content)
print(f"wrote {len(FILES)} files to {HERE}")

#!/usr/bin/python3
"""Run a post-processing script and check the image it writes.

    /usr/bin/python3 tests/post/check_image.py SCRIPT.py ARGS... -o OUT.png

Fails (exit 1, with the reason) unless the script exits 0, prints the image's path, and
OUT.png is a PNG of at least 300 x 200 pixels whose pixels are not all one colour
(decoded with zlib: 8-bit RGB or RGBA, as matplotlib writes them).
"""
import os
import struct
import subprocess
import sys
import zlib


def png_pixels(path):
    with open(path, "rb") as fh:
        data = fh.read()
    if data[:8] != b"\x89PNG\r\n\x1a\n":
        raise ValueError("not a PNG file")
    pos, idat, width, height, depth, ctype = 8, b"", 0, 0, 0, 0
    while pos < len(data):
        n, kind = struct.unpack(">I4s", data[pos:pos + 8])
        body = data[pos + 8:pos + 8 + n]
        if kind == b"IHDR":
            width, height, depth, ctype = struct.unpack(">IIBB", body[:10])
        elif kind == b"IDAT":
            idat += body
        pos += 12 + n
    return width, height, depth, ctype, zlib.decompress(idat)


def unfiltered_pixels(raw, w, h, channels):
    """Undo the PNG row filters (None, Sub, Up, Average, Paeth; PNG specification,
    section 9) and yield every pixel as a bytes object."""
    stride = w * channels
    prev = bytearray(stride)
    pos = 0
    for _ in range(h):
        ftype = raw[pos]
        line = bytearray(raw[pos + 1:pos + 1 + stride])
        pos += 1 + stride
        for i in range(stride):
            a = line[i - channels] if i >= channels else 0
            b = prev[i]
            c = prev[i - channels] if i >= channels else 0
            if ftype == 1:
                line[i] = (line[i] + a) & 0xFF
            elif ftype == 2:
                line[i] = (line[i] + b) & 0xFF
            elif ftype == 3:
                line[i] = (line[i] + (a + b) // 2) & 0xFF
            elif ftype == 4:
                pa, pb, pc = abs(b - c), abs(a - c), abs(a + b - 2 * c)
                pred = a if pa <= pb and pa <= pc else (b if pb <= pc else c)
                line[i] = (line[i] + pred) & 0xFF
        for i in range(0, stride, channels):
            yield bytes(line[i:i + channels])
        prev = line


def main(argv):
    if "-o" not in argv:
        print("check_image: give the script's -o OUT.png", file=sys.stderr)
        return 2
    out = argv[argv.index("-o") + 1]
    if os.path.exists(out):
        os.remove(out)
    p = subprocess.run([sys.executable] + argv[1:], capture_output=True, text=True)
    print(p.stdout + p.stderr)
    if p.returncode != 0:
        print(f"check_image: {argv[1]} exited {p.returncode}", file=sys.stderr)
        return 1
    if out not in p.stdout:
        print(f"check_image: {argv[1]} did not print the image path {out}", file=sys.stderr)
        return 1
    if not os.path.isfile(out):
        print(f"check_image: {out} was not written", file=sys.stderr)
        return 1
    w, h, depth, ctype, raw = png_pixels(out)
    if w < 300 or h < 200:
        print(f"check_image: {out} is only {w} x {h} pixels", file=sys.stderr)
        return 1
    if depth != 8 or ctype not in (2, 6):
        print(f"check_image: {out}: unexpected PNG format (depth {depth}, colour type {ctype})", file=sys.stderr)
        return 1
    channels = 3 if ctype == 2 else 4
    colours = len(set(unfiltered_pixels(raw, w, h, channels)))
    if colours < 8:
        print(f"check_image: {out} looks blank ({colours} distinct colours)", file=sys.stderr)
        return 1
    print(f"check_image: {out}: {w} x {h} pixels, {colours} distinct colours")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))

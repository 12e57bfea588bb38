#!/usr/bin/python3
"""Replaces every PNG file under a directory by NAME.png.pixels, a line with its width, height, colour
type and the SHA-256 of its decoded pixel bytes, so that compare_outputs.sh compares what a figure
shows rather than how it was compressed (tipgap's PNG encoder changed in issue 14; the pixels did
not). Decoder written from the PNG specification, 2nd ed. (W3C 2003): chunks, zlib stream, the five
row filters; 8-bit, non-interlaced images only (what PLplot's cairo drivers and tipgap write).
usage: /usr/bin/python3 tests/compat/png_pixels.py DIR
"""
import hashlib
import os
import struct
import sys
import zlib


def pixels(path):
    d = open(path, "rb").read()
    if d[:8] != b"\x89PNG\r\n\x1a\n":
        return "not a PNG"
    i, idat, head = 8, b"", None
    while i + 12 <= len(d):
        n, = struct.unpack(">I", d[i:i + 4])
        kind, body = d[i + 4:i + 8], d[i + 8:i + 8 + n]
        if kind == b"IHDR":
            head = struct.unpack(">IIBBBBB", body)
        elif kind == b"IDAT":
            idat += body
        i += 12 + n
    w, h, depth, colour, _, _, interlace = head
    if depth != 8 or interlace:
        return f"unsupported PNG {head}"
    bpp = {0: 1, 2: 3, 4: 2, 6: 4}.get(colour)
    if bpp is None:
        return f"unsupported colour type {colour}"
    raw, row = zlib.decompress(idat), w * bpp
    out, prev = bytearray(), bytearray(row)
    for y in range(h):
        f = raw[y * (row + 1)]
        line = bytearray(raw[y * (row + 1) + 1:(y + 1) * (row + 1)])
        for x in range(row):
            a = line[x - bpp] if x >= bpp else 0
            b = prev[x]
            c = prev[x - bpp] if x >= bpp else 0
            if f == 1:
                line[x] = (line[x] + a) & 255
            elif f == 2:
                line[x] = (line[x] + b) & 255
            elif f == 3:
                line[x] = (line[x] + (a + b) // 2) & 255
            elif f == 4:
                p = a + b - c
                pa, pb, pc = abs(p - a), abs(p - b), abs(p - c)
                line[x] = (line[x] + (a if pa <= pb and pa <= pc else b if pb <= pc else c)) & 255
        out += line
        prev = line
    return f"{w} x {h}, colour type {colour}, pixels sha256 {hashlib.sha256(bytes(out)).hexdigest()}"


for root, _, files in os.walk(sys.argv[1]):
    for name in files:
        if name.lower().endswith(".png"):
            p = os.path.join(root, name)
            with open(p + ".pixels", "w") as f:
                f.write(pixels(p) + "\n")
            os.remove(p)

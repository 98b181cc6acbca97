#!/usr/bin/env python3
"""The fixed-generation trap-density conversion of `trapmap convert` done with vectorized NumPy, for the speed
comparison of scripts/bench-e2e. Not part of the application.

    numpy_convert.py IN.tif OUT.tif CONSTANTS.json
    numpy_convert.py --compare NUMPY_OUT.tif TRAPMAP_OUT.tif

IN.tif: an uncompressed little- or big-endian float32 TIFF (strips), as trapmap writes it; read with np.memmap at
the strip offsets of the first IFD (no TIFF library). CONSTANTS.json: the wafer-level constants printed by
trapmap.maps.bench.BenchConversionConstants (equilibrium densities, SRH n1/p1 and capture coefficients, surface
rate, B_low, temperature, detection resolution, generation rate), O(1) numbers computed once per wafer. Per pixel,
in float64 as the project's TrapDensityConverter:

    Δn = G·τ_eff
    1/τ_intr = (n0 + p0 + Δn)·[2.5e-31 g_eeh n0 + 8.5e-32 g_ehh p0 + 3.0e-29 Δn^0.92 + B_low·B_rel(n0 + p0 + 2Δn)]
               (Richter et al., PRB 86, 165202 (2012); B_rel: Altermatt et al., NUSOD 2005)
    1/τ_SRH = 1/τ_eff − 1/τ_intr − 1/τ_surf;  below δ·(1/τ_intr + 1/τ_surf) the rate is that limit
    N_t = K(Δn)/τ_SRH,  K = [(n0 + n1 + Δn)/c_p + (p0 + p1 + Δn)/c_n]/(n0 + p0 + Δn)

NaN (no data) and lifetimes below the 1 ns floor or infinite give NaN. OUT.tif: float32, one strip, no metadata.
--compare compares two such outputs on the pixels valid in both and prints the largest relative difference (exit
status 1 above 1e-4 or when the no-data pixels differ).
"""
import json
import os
import struct
import sys

import numpy as np


def read_tiff_float32(path):
    with open(path, "rb") as f:
        head = f.read(8)
        if head[:2] == b"II":
            bo = "<"
        elif head[:2] == b"MM":
            bo = ">"
        else:
            raise SystemExit(f"{path}: not a TIFF file")
        (ifd,) = struct.unpack(bo + "I", head[4:8])
        f.seek(ifd)
        (count,) = struct.unpack(bo + "H", f.read(2))
        entries = {}
        sizes = {1: 1, 2: 1, 3: 2, 4: 4, 5: 8, 16: 8}
        for _ in range(count):
            tag, typ, n, raw = struct.unpack(bo + "HHI4s", f.read(12))
            entries[tag] = (typ, n, raw)

        def values(tag):
            typ, n, raw = entries[tag]
            code = {3: "H", 4: "I"}[typ]
            if sizes[typ] * n <= 4:
                return list(struct.unpack(bo + code * n, raw[: sizes[typ] * n]))
            (offset,) = struct.unpack(bo + "I", raw)
            pos = f.tell()
            f.seek(offset)
            out = list(struct.unpack(bo + code * n, f.read(sizes[typ] * n)))
            f.seek(pos)
            return out

        width = values(256)[0]
        height = values(257)[0]
        if values(258)[0] != 32 or values(339)[0] != 3 or values(259)[0] != 1:
            raise SystemExit(f"{path}: not an uncompressed float32 TIFF")
        offsets = values(273)
        counts = values(279)
    dtype = np.dtype(bo + "f4")
    mm = np.memmap(path, dtype=np.uint8, mode="r")
    out = np.empty(width * height, dtype=np.float32)
    pos = 0
    for off, cnt in zip(offsets, counts):
        n = cnt // 4
        out[pos:pos + n] = mm[off:off + cnt].view(dtype)
        pos += n
    return out.reshape(height, width)


def write_tiff_float32(path, data):
    data = np.ascontiguousarray(data, dtype="<f4")
    height, width = data.shape
    entries = [(256, 4, 1, width), (257, 4, 1, height), (258, 3, 1, 32), (259, 3, 1, 1), (262, 3, 1, 1),
               (273, 4, 1, 0), (277, 3, 1, 1), (278, 4, 1, height), (279, 4, 1, data.nbytes), (339, 3, 1, 3)]
    ifd_size = 2 + 12 * len(entries) + 4
    data_offset = 8 + ifd_size
    ifd = struct.pack("<H", len(entries))
    for tag, typ, n, v in entries:
        if tag == 273:
            v = data_offset
        if typ == 3:
            ifd += struct.pack("<HHIHH", tag, typ, n, v, 0)
        else:
            ifd += struct.pack("<HHII", tag, typ, n, v)
    ifd += struct.pack("<I", 0)
    tmp = path + ".part"
    with open(tmp, "wb") as f:
        f.write(b"II*\x00" + struct.pack("<I", 8) + ifd)
        data.tofile(f)
    os.replace(tmp, path)


def convert(tau_us, k):
    n0, p0, n1, p1 = k["n0_cm3"], k["p0_cm3"], k["n1_cm3"], k["p1_cm3"]
    cn, cp = k["cn_cm3_s"], k["cp_cm3_s"]
    surf = k["surface_rate_per_s"]
    t = k["temperature_k"]
    # Richter 2012 doping-dependent Auger part and Altermatt 2005 B_rel constants (per wafer)
    geeh = 1 + 13 * (1 - np.tanh((n0 / 3.3e17) ** 0.66))
    gehh = 1 + 7.5 * (1 - np.tanh((p0 / 7.0e17) ** 0.63))
    auger_doping = 2.5e-31 * geeh * n0 + 8.5e-32 * gehh * p0
    b_min = 0.2 + (0.0 - 0.2) / (1 + (t / 320.0) ** 2.5)
    b1 = 2 * (1.5e18 + (1e7 - 1.5e18) / (1 + (t / 550.0) ** 3))
    b3 = 2 * (4e18 + (1e9 - 4e18) / (1 + (t / 365.0) ** 3.54))
    s0 = n0 + p0
    ka = (n0 + n1) / cp + (p0 + p1) / cn
    kb = 1 / cp + 1 / cn

    tau = tau_us.astype(np.float64)
    with np.errstate(invalid="ignore", divide="ignore"):
        valid = (tau >= k["lifetime_floor_us"]) & (tau != np.inf)
        tau_s = tau * 1e-6
        dn = k["generation_cm3_s"] * tau_s
        total = s0 + dn
        carriers = total + dn
        x3 = carriers / b3
        b_rel = b_min + (1 - b_min) / (1 + carriers ** 0.54 * b1 ** -0.54 + x3 * np.sqrt(np.sqrt(x3)))
        intrinsic = total * (auger_doping + 3.0e-29 * dn ** 0.92 + k["b_low_cm3_s"] * b_rel)
        srh = 1 / tau_s - intrinsic - surf
        detectable = k["detection_resolution"] * (intrinsic + surf)
        rate = np.where(srh >= detectable, srh, detectable)
        nt = (ka + kb * dn) / total * rate
        nt[~valid] = np.nan
    return nt.astype(np.float32)


def check(ours_path, theirs_path):
    ours = read_tiff_float32(ours_path)
    theirs = read_tiff_float32(theirs_path)
    both = np.isfinite(ours) & np.isfinite(theirs)
    same_nan = np.array_equal(np.isnan(ours), np.isnan(theirs))
    a = ours[both].astype(np.float64)
    b = theirs[both].astype(np.float64)
    rel = np.abs(a - b) / np.maximum(np.abs(b), 1e-300)
    worst = float(rel.max()) if rel.size else float("nan")
    print(f"numpy vs trapmap: {both.sum()} valid pixels, largest relative difference {worst:.2e}"
          f" ({'agrees' if worst <= 1e-4 and same_nan else 'DISAGREES'} within 1e-4;"
          f" no-data pixels {'identical' if same_nan else 'differ'})")
    return worst <= 1e-4 and same_nan


def main(argv):
    if len(argv) == 4 and argv[1] == "--compare":
        return 0 if check(argv[2], argv[3]) else 1
    if len(argv) != 4:
        raise SystemExit(__doc__)
    with open(argv[3]) as f:
        constants = json.load(f)
    nt = convert(read_tiff_float32(argv[1]), constants)
    write_tiff_float32(argv[2], nt)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))

#!/usr/bin/env python3
"""
An independent numpy/scipy pipeline for Borewave projects: the yardstick `npm run bench` times the
command line against (cliVsScipyRatio). It reads a project (archive .zip or folder with project.json,
docs/project-format.md) and its SEG-2 or delimited-text waveforms, forms the working traces, picks AIC
onsets, measures cross-correlation delays and writes the interval velocities:

    python3 scripts/scipy_pipeline.py <project.zip|folder> --out <dir>

It writes <dir>/intervals.csv with depth_top_m, depth_bottom_m, wave, delay_s, path_a_m, path_b_m,
velocity_mps (the cross-correlation interval velocity of every pair).

Written the way an engineer would script the job with numpy and scipy, vectorised over traces:
- SEG-2 (Pullan 1990): descriptor blocks read with numpy structured dtypes, samples with
  np.frombuffer in the file's byte order; delimited text with np.loadtxt.
- Working trace per receiver, depth, component and wave: linear detrend (scipy.signal.detrend) and a
  cosine taper of the conditioned hits, the optional zero-phase Butterworth band-pass
  (scipy.signal.butter + sosfiltfilt), then half the difference of reversed hits for S and half their
  sum for P (common practice).
- Search window from the straight source-receiver path and the plausible velocity range; AIC onset
  (Maeda 1985) from cumulative sums; dominant period from the main lobe.
- Delays: windows of 2.5 dominant periods starting half a period before the onsets, cosine-tapered,
  cross-correlated by FFT (numpy.fft.rfft on a batch of windows), lags bounded by the path difference
  and the velocity range, parabolic sub-sample peak. V = (L2 - L1) / delay (ASTM D7400 downhole,
  D4428 crosshole: straight rays).
The settings (detrend, taper, band-pass, velocity ranges) are those saved in project.json.
"""
import argparse
import csv
import io
import json
import os
import sys
import zipfile

import numpy as np
from scipy import signal


# ---------------------------------------------------------------- project
def first_layout(doc):
    """The fields this script reads, in the first project layout, from either layout: the second lists
    files as {path, role}, gives each record its file and its depth and hit as {value, source}, and
    names a borehole holeId."""
    if not doc.get("files") or isinstance(doc["files"][0], str):
        return doc
    doc = dict(doc)
    doc["files"] = [f["path"] for f in doc["files"] if f.get("role", "wave") == "wave"]
    survey = dict(doc["survey"])
    value = lambda x: x.get("value") if isinstance(x, dict) else x
    survey["records"] = [
        dict(r, recordId=r.get("file", r["recordId"]), depthM=value(r.get("depthM")), hit=value(r.get("hit")))
        for r in survey["records"]
    ]
    survey["boreholes"] = [dict(h, id=h.get("id", h.get("holeId"))) for h in survey["boreholes"]]
    doc["survey"] = survey
    return doc


def open_project(path):
    """project.json (dict, first layout) and a function name -> bytes, from a .zip archive or a folder."""
    if os.path.isdir(path):
        with open(os.path.join(path, "project.json"), "rb") as f:
            doc = json.load(f)

        def read(name):
            with open(os.path.join(path, name), "rb") as f:
                return f.read()

        return first_layout(doc), read
    z = zipfile.ZipFile(path)
    doc = json.loads(z.read("project.json"))
    return first_layout(doc), z.read


# ---------------------------------------------------------------- SEG-2
SEG2_DTYPES = {1: "i2", 2: "i4", 4: "f4", 5: "f8"}


def seg2_strings(buf, start, end, endian):
    """Keyword -> value strings of a descriptor block (each string: 2-byte offset to the next, then text)."""
    out = {}
    pos = start
    u16 = np.dtype(endian + "u2")
    while pos + 2 <= end:
        off = int(np.frombuffer(buf, u16, 1, pos)[0])
        if off == 0:
            break
        text = buf[pos + 2 : pos + off].split(b"\0", 1)[0].decode("latin-1").strip()
        if text:
            key, _, value = text.partition(" ")
            out[key.upper()] = value.strip()
        pos += off
    return out


def read_seg2(buf):
    """List of (channel, samples float64, dt_s, delay_s)."""
    endian = "<" if buf[0:2] == b"\x55\x3a" else ">"
    head = np.frombuffer(buf, np.dtype([("id", endian + "u2"), ("rev", endian + "u2"), ("m", endian + "u2"), ("n", endian + "u2")]), 1)[0]
    pointers = np.frombuffer(buf, endian + "u4", int(head["n"]), 32)
    file_strings = seg2_strings(buf, 32 + int(head["m"]), int(pointers[0]) if len(pointers) else len(buf), endian)
    tdesc = np.dtype([("id", endian + "u2"), ("x", endian + "u2"), ("y", endian + "u4"), ("ns", endian + "u4"), ("code", "u1")])
    traces = []
    for k, p in enumerate(pointers):
        p = int(p)
        d = np.frombuffer(buf, tdesc, 1, p)[0]
        strings = dict(file_strings)
        strings.update(seg2_strings(buf, p + 32, p + int(d["x"]), endian))
        code = int(d["code"])
        if code not in SEG2_DTYPES:
            raise ValueError(f"SEG-2 data format {code} is not read by this script")
        x = np.frombuffer(buf, endian + SEG2_DTYPES[code], int(d["ns"]), p + int(d["x"])).astype(np.float64)
        x *= float(strings.get("DESCALING_FACTOR", "1").split()[0])
        channel = int(strings.get("CHANNEL_NUMBER", str(k + 1)).split()[0])
        dt = float(strings["SAMPLE_INTERVAL"].split()[0])
        delay = float(strings.get("DELAY", "0").split()[0])
        traces.append((channel, x, dt, delay))
    return traces


def read_text(buf):
    """Delimited text: a time column (ms or s, from the header) then one column per channel."""
    text = buf.decode("utf-8-sig")
    first = next(line for line in text.splitlines() if line.strip() and not line.lstrip().startswith(("#", "//")))
    sep = "\t" if "\t" in first else ";" if ";" in first else "," if "," in first else None
    header = not any(ch.isdigit() for ch in first.split(sep)[0]) if sep else False
    data = np.loadtxt(io.StringIO(text), delimiter=sep, skiprows=1 if header else 0, comments=("#", "//"))
    t = data[:, 0]
    step = (t[-1] - t[0]) / (len(t) - 1)
    head0 = first.split(sep)[0].lower() if header else ""
    to_s = 1e-3 if ("ms" in head0 or (not header and step >= 0.005)) else 1.0
    return [(c, data[:, c].copy(), step * to_s, t[0] * to_s) for c in range(1, data.shape[1])]


def read_wave(name, buf):
    if buf[0:2] in (b"\x55\x3a", b"\x3a\x55"):
        return read_seg2(buf)
    return read_text(buf)


# ---------------------------------------------------------------- geometry
def position_along_hole(hole, depth):
    """Point at `depth` along the hole: deviation offsets linear between surveyed stations (docs)."""
    st = [(s["depthAlongM"], s["eastM"], s["northM"]) for s in hole.get("deviation", [])]
    if not st or st[0][0] > 0:
        st = [(0.0, 0.0, 0.0)] + st
    st = np.array(st, dtype=float)
    seg = np.diff(st, axis=0)
    rise = np.sqrt(np.maximum(seg[:, 0] ** 2 - seg[:, 1] ** 2 - seg[:, 2] ** 2, 0.0)) if len(seg) else np.zeros(0)
    z_at = np.concatenate([[st[0, 0]], st[0, 0] + np.cumsum(rise)])
    i = int(np.searchsorted(st[:, 0], depth, side="right") - 1)
    i = max(0, min(i, len(st) - 1))
    if i + 1 < len(st):
        f = (depth - st[i, 0]) / seg[i, 0]
        e, n, z = st[i, 1] + f * seg[i, 1], st[i, 2] + f * seg[i, 2], z_at[i] + f * rise[i]
    elif i > 0:
        f = (depth - st[i, 0]) / seg[i - 1, 0]
        e, n, z = st[i, 1] + f * seg[i - 1, 1], st[i, 2] + f * seg[i - 1, 2], z_at[i] + f * rise[i - 1]
    else:
        e, n, z = st[i, 1], st[i, 2], z_at[i] + depth - st[i, 0]
    return np.array([hole["collarEastM"] + e, hole["collarNorthM"] + n, z])


# ---------------------------------------------------------------- processing
def condition(x, dt, settings, wave):
    """Detrend, taper and band-pass a 2-D block of traces (one per row)."""
    if settings.get("detrend", True):
        x = signal.detrend(x, axis=1, type="linear")
    frac = settings.get("taperFraction", 0.02)
    n = x.shape[1]
    if frac > 0:
        m = frac * (n - 1)
        j = np.arange(int(np.floor(m)) + 1)
        w = np.ones(n)
        w[j] = 0.5 * (1 - np.cos(np.pi * j / m))
        w[n - 1 - j] = w[j]
        x = x * w
    bp = settings.get("bandpassS" if wave == "S" else "bandpassP")
    if bp:
        sos = signal.butter(bp.get("order", 4), [bp["lowHz"], bp["highHz"]], btype="bandpass", fs=1 / dt, output="sos")
        x = signal.sosfiltfilt(sos, x, axis=1)
    return x


def aic_onset(x, i0, i1):
    """AIC onset (Maeda 1985) inside [i0, i1), from a quarter of the window before i0 to the largest |x|."""
    n = len(x)
    imax = i0 + int(np.argmax(np.abs(x[i0:i1])))
    ext = max(8, int(round(0.25 * (i1 - i0))))
    a0 = max(0, i0 - ext)
    a1 = min(n, max(imax + 2, a0 + 5))
    seg = x[a0:a1] - x[a0:a1].mean()
    m = len(seg)
    c1 = np.cumsum(seg)
    c2 = np.cumsum(seg * seg)
    k = np.arange(2, m - 1)
    v1 = c2[k - 1] / k - (c1[k - 1] / k) ** 2
    r = m - k
    v2 = (c2[-1] - c2[k - 1]) / r - ((c1[-1] - c1[k - 1]) / r) ** 2
    var_all = c2[-1] / m - (c1[-1] / m) ** 2
    floor = var_all * 1e-12 if var_all > 0 else np.finfo(float).tiny
    aic = k * np.log(np.maximum(v1, floor)) + (r - 1) * np.log(np.maximum(v2, floor))
    j_from = max(2, i0 - a0)
    j_to = max(j_from, min(m - 2, imax - a0))
    sel = aic[j_from - 2 : j_to - 1]
    return a0 + j_from + int(np.argmin(sel))


def lobe_period(x, start, end, dt):
    """Twice the width between the zero crossings around the largest |x| in [start, end)."""
    k = start + int(np.argmax(np.abs(x[start:end])))
    s = np.sign(x[k])
    if s == 0:
        return None
    same = np.sign(x) == s
    left = np.flatnonzero(~same[:k])
    right = np.flatnonzero(~same[k:])
    if not len(left) or not len(right):
        return None
    l, r = left[-1] + 1, k + right[0] - 1
    lc = l - 1 + x[l - 1] / (x[l - 1] - x[l])
    rc = r + x[r] / (x[r] - x[r + 1])
    half = rc - lc
    return 2 * half * dt if half > 1 else None


def stations_of(doc, records):
    """Working traces per station: dict key -> dict(wave, receiver, depth, trace, dt, delay, path)."""
    survey = doc["survey"]
    settings = doc.get("settings", {})
    kind = survey["kind"]
    holes = {h["id"]: h for h in survey["boreholes"]}
    comp = {"S": "V" if kind == "crosshole" else "H1", "P": "H1" if kind == "crosshole" else "V"}
    dirs = ("up", "down") if kind == "crosshole" else ("left", "right")
    groups = {}
    for ra in survey["records"]:
        if ra.get("excluded") or ra.get("depthM") is None or ra["recordId"] not in records:
            continue
        traces = records[ra["recordId"]]
        for wave in ("S", "P"):
            for ch in ra["channels"]:
                if ch["component"] != comp[wave]:
                    continue
                depth = ra["depthM"] + (survey["receiverSpacingM"] if kind == "downhole-pair" and ch["receiver"] == "lower" else 0)
                g = groups.setdefault((wave, ch["receiver"], round(depth, 6)), [])
                g.append((ra["hit"], traces[ch["channel"]]))
    out = {}
    for wave in ("S", "P"):
        keys = [k for k in groups if k[0] == wave]
        if not keys:
            continue
        # One block per wave: every hit trace conditioned at once (equal lengths in a survey).
        flat = [(k, hit, tr) for k in keys for hit, tr in groups[k]]
        dt, delay = flat[0][2][1], flat[0][2][2]
        block = condition(np.stack([tr[0] for _, _, tr in flat]), dt, settings, wave)
        rows = {}
        for i, (k, hit, _) in enumerate(flat):
            rows.setdefault(k, []).append((hit, block[i]))
        for k in keys:
            a = [x for h, x in rows[k] if h == dirs[0]]
            b = [x for h, x in rows[k] if h == dirs[1]]
            if settings.get("useReversedHits", True) and a and b:
                ma, mb = np.mean(a, axis=0), np.mean(b, axis=0)
                trace = 0.5 * (ma - mb) if wave == "S" else 0.5 * (ma + mb)
            else:
                trace = np.mean([x for _, x in rows[k]], axis=0)
            _, receiver, depth = k
            if kind == "crosshole":
                rx = position_along_hole(holes[receiver], depth)
                sx = position_along_hole(holes[survey["mainHoleId"]], depth)
            else:
                h = holes[survey["mainHoleId"]]
                rx = position_along_hole(h, depth)
                sx = np.array([h["collarEastM"] + survey["sourceOffsetM"], h["collarNorthM"], survey["sourceDepthM"]])
            out[k] = dict(wave=wave, receiver=receiver, depth=depth, x=trace, dt=dt, delay=delay, path=float(np.linalg.norm(rx - sx)))
    return out


def analyse(st, vrange):
    """Onset sample and dominant period of one station trace."""
    x, dt, delay = st["x"], st["dt"], st["delay"]
    n = len(x)
    last = delay + (n - 1) * dt
    t0 = max(delay, st["path"] / vrange[1])
    t1 = max(t0, min(last, st["path"] / vrange[0]))
    i0 = max(0, int(np.ceil((t0 - delay) / dt - 1e-9)))
    i1 = min(n, int(np.floor((t1 - delay) / dt + 1e-9)) + 1)
    onset = aic_onset(x, i0, i1)
    end = min(n, max(i1, onset + 32))
    period = lobe_period(x, onset, end, dt)
    if period is None:
        spec = np.abs(np.fft.rfft(x[onset:end]))
        f = np.fft.rfftfreq(end - onset, dt)
        period = 1 / f[1 + np.argmax(spec[1:])] if len(spec) > 1 else (end - onset) * dt
    st["onset"], st["period"] = onset, period


def pairs_of(doc, st):
    survey = doc["survey"]
    kind = survey["kind"]
    out = []
    for wave in ("S", "P"):
        ws = [s for s in st.values() if s["wave"] == wave]
        if kind == "downhole":
            for rec in sorted({s["receiver"] for s in ws}):
                lst = sorted((s for s in ws if s["receiver"] == rec), key=lambda s: s["depth"])
                out += [(a, b, a["depth"], b["depth"]) for a, b in zip(lst, lst[1:]) if b["depth"] - a["depth"] > 1e-6]
        elif kind == "downhole-pair":
            low = {round(s["depth"], 6): s for s in ws if s["receiver"] == "lower"}
            for a in (s for s in ws if s["receiver"] == "upper"):
                b = low.get(round(a["depth"] + survey["receiverSpacingM"], 6))
                if b:
                    out.append((a, b, a["depth"], b["depth"]))
        else:
            near_id, far_id = survey["receiverHoleIds"]
            near = sorted((s for s in ws if s["receiver"] == near_id), key=lambda s: s["depth"])
            far = {round(s["depth"], 6): s for s in ws if s["receiver"] == far_id}
            d = [s["depth"] for s in near]
            for i, a in enumerate(near):
                b = far.get(round(a["depth"], 6))
                if not b:
                    continue
                half = (d[1] - d[0]) / 2 if len(d) > 1 else 0.5
                top = (d[i - 1] + d[i]) / 2 if i > 0 else max(0.0, d[i] - half)
                bottom = (d[i + 1] + d[i]) / 2 if i + 1 < len(d) else d[i] + ((d[i] - d[i - 1]) / 2 if len(d) > 1 else 0.5)
                out.append((a, b, top, bottom))
    return out


def taper20(length):
    m = 0.2 * (length - 1)
    w = np.ones(length)
    j = np.arange(int(np.floor(m)) + 1)
    w[j] = 0.5 * (1 - np.cos(np.pi * j / m))
    w[length - 1 - j] = w[j]
    return w


def window(x, start, length):
    out = np.zeros(length)
    lo, hi = max(0, start), min(len(x), start + length)
    if hi > lo:
        out[lo - start : hi - start] = x[lo:hi]
    return out


def delays(pairs, settings):
    """Cross-correlation delay of every pair: windows batched into one FFT per window length."""
    jobs = []
    for a, b, top, bottom in pairs:
        dt = a["dt"]
        vr = settings.get("vsRangeMps", [50, 1500]) if a["wave"] == "S" else settings.get("vpRangeMps", [150, 5000])
        dl = max(b["path"] - a["path"], 1e-6)
        lo_s, hi_s = dl / vr[1], dl / vr[0]
        period = max(a["period"], b["period"])
        pre = int(round(0.5 * period / dt))
        length = max(16, int(round(2.5 * period / dt)))
        ta, tb = a["delay"] + a["onset"] * dt, b["delay"] + b["onset"] * dt
        d0 = min(hi_s, max(lo_s, tb - ta))
        sa = a["onset"] - pre
        sb = int(round((ta + d0 - b["delay"]) / dt)) - pre
        offset = (b["delay"] + sb * dt) - (a["delay"] + sa * dt)
        lag_lo, lag_hi = lo_s - offset, hi_s - offset
        if np.floor(lag_hi / dt + 1e-9) < np.ceil(lag_lo / dt - 1e-9):
            mid = round((lag_lo + lag_hi) / 2 / dt) * dt
            lag_lo, lag_hi = mid - dt, mid + dt
        jobs.append(dict(a=a, b=b, top=top, bottom=bottom, sa=sa, sb=sb, length=length, offset=offset, lo=lag_lo, hi=lag_hi, dl=dl))
    for length in sorted({j["length"] for j in jobs}):
        group = [j for j in jobs if j["length"] == length]
        w = taper20(length)
        wa = np.stack([window(j["a"]["x"], j["sa"], length) for j in group]) * w
        wb = np.stack([window(j["b"]["x"], j["sb"], length) for j in group]) * w
        nfft = 1 << int(np.ceil(np.log2(2 * length - 1)))
        corr = np.fft.irfft(np.conj(np.fft.rfft(wa, nfft, axis=1)) * np.fft.rfft(wb, nfft, axis=1), nfft, axis=1)
        for row, j in zip(corr, group):
            dt = j["a"]["dt"]
            k_lo = max(-(length - 1), int(np.ceil(j["lo"] / dt - 1e-9)))
            k_hi = min(length - 1, int(np.floor(j["hi"] / dt + 1e-9)))
            lags = np.arange(k_lo, k_hi + 1)
            r = row[lags % nfft]
            best = int(np.argmax(r))
            frac = 0.0
            if 0 < best < len(r) - 1:
                den = r[best - 1] - 2 * r[best] + r[best + 1]
                frac = float(np.clip(0.5 * (r[best - 1] - r[best + 1]) / den, -0.5, 0.5)) if den != 0 else 0.0
            j["delay"] = j["offset"] + (lags[best] + frac) * dt
    return jobs


def main(argv):
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("project")
    ap.add_argument("--out", required=True)
    args = ap.parse_args(argv)
    doc, read = open_project(args.project)
    deviation = set((doc.get("deviationFiles") or {}).values())
    records = {}
    for name in doc["files"]:
        if name in deviation:
            continue
        records[name] = {ch: (x, dt, delay) for ch, x, dt, delay in read_wave(name, read(name))}
    settings = doc.get("settings", {})
    st = stations_of(doc, records)
    for s in st.values():
        analyse(s, settings.get("vsRangeMps", [50, 1500]) if s["wave"] == "S" else settings.get("vpRangeMps", [150, 5000]))
    jobs = delays(pairs_of(doc, st), settings)
    os.makedirs(args.out, exist_ok=True)
    with open(os.path.join(args.out, "intervals.csv"), "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(["depth_top_m", "depth_bottom_m", "wave", "delay_s", "path_a_m", "path_b_m", "velocity_mps"])
        for j in sorted(jobs, key=lambda j: (j["a"]["wave"], j["top"])):
            v = j["dl"] / j["delay"] if j["delay"] > 0 else ""
            w.writerow([f"{j['top']:.6g}", f"{j['bottom']:.6g}", j["a"]["wave"], f"{j['delay']:.9g}", f"{j['a']['path']:.6f}", f"{j['b']['path']:.6f}", f"{v:.6g}" if v != "" else ""])
    print(f"{len(jobs)} intervals written to {os.path.join(args.out, 'intervals.csv')}")


if __name__ == "__main__":
    main(sys.argv[1:])

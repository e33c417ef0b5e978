#!/usr/bin/python3
"""Native reference for the whole-process benchmark (scripts/bench-process.mjs, issue 16).

A Python + native OpenCV pipeline of work comparable to `fractozone measure IMG --pixel-size 2um
--out DIR`, run as a whole process: start-up and imports, decode, measure, write a result JSON and a
1600-px overlay PNG, exit. It is a yardstick, not a second measuring method: its steps are the ones
issue 16 names, each done the plain native way, at full resolution (native OpenCV is fast enough not
to need fractozone's working copy):

  1 decode        cv2.imread (libpng / libjpeg), to gray float32 0..1 (Rec. 709 weights for colour)
  2 variance      local variance of a 15-px window: boxFilter of x and of x^2, std = sqrt(E[x^2] - E[x]^2)
  3 gradient      Gaussian sigma 1 px, Sobel x and y (3x3, float32), magnitude
  4 otsu          Otsu threshold of the 8-bit image smoothed with sigma 2 px; polarity from the border
  5 morphology    close + open with a 15-px ellipse; holes filled (largest outer contour drawn filled)
  6 contour       findContours (external, no approximation): the specimen outline
  7 fits          circle (Kasa least squares) and ellipse (cv2.fitEllipse) on the outline
  8 classify      Otsu threshold of log local std inside the specimen eroded by one window (rough core
                  vs smooth rim), open 5 px
  9 rays          360 rays: sub-pixel outer edge (midpoint crossing of the sigma-1 image, 0.25-px steps,
                  cv2.remap bilinear) and the rim/core boundary (first run of 3 core samples from the
                  edge inwards, 0.5-px steps); widths in um; mean, sd, median, p05/p95, 2000-sample
                  bootstrap 95 % CI of the mean
 10 overlay       INTER_AREA reduction to 1600 px on the long side, outline, boundary, circle and label
                  drawn, written with cv2.imwrite (PNG, OpenCV's default compression level)
 11 result        JSON with the figures above and the stage times

Threads: `--threads 1` (the default) calls cv2.setNumThreads(1) and limits the BLAS/OpenMP pools to
one thread before NumPy is imported, so the process uses one core like fractozone's (single-threaded
opencv-wasm); `--threads 0` keeps OpenCV's default thread count.

  /usr/bin/python3 scripts/bench/native_reference.py IMG --pixel-size-um 2 --out DIR [--threads 1]
  /usr/bin/python3 scripts/bench/native_reference.py --batch IN_DIR --pixel-size-um 3.5 --out DIR

Needs Debian's python3-opencv and python3-numpy (no GPU). Prints one JSON line (file, stage times,
mean width) per image on stdout.
"""
import os
import sys


def _arg(name, default=None):
    return sys.argv[sys.argv.index(name) + 1] if name in sys.argv else default


THREADS = int(_arg('--threads', '1'))
# NumPy asks the kernel for transparent huge pages for large arrays; where THP defrag is on
# (/sys/kernel/mm/transparent_hugepage/defrag), compacting memory for them cost this reference
# 1.0-1.5 s of system time per 12-MP run on this project's machine (2026-12-02: 6.7-7.2 s wall,
# 2.0 s sys with them; 3.1-4.5 s, 0.6 s without). Off by default so the yardstick is not slowed by
# the machine; --numpy-hugepages keeps NumPy's default.
if '--numpy-hugepages' not in sys.argv:
    os.environ.setdefault('NUMPY_MADVISE_HUGEPAGE', '0')
if THREADS > 0:
    for v in ('OMP_NUM_THREADS', 'OPENBLAS_NUM_THREADS', 'MKL_NUM_THREADS', 'NUMEXPR_NUM_THREADS'):
        os.environ[v] = str(THREADS)

import json  # noqa: E402
import time  # noqa: E402

import cv2  # noqa: E402
import numpy as np  # noqa: E402

if THREADS > 0:
    cv2.setNumThreads(THREADS)

WINDOW_PX = 15
N_RAYS = 360
OVERLAY_PX = 1600


def to_gray01(img):
    """Decoded array (8/16-bit, 1/3/4 channels, BGR order) -> float32 0..1 with Rec. 709 weights."""
    scale = 65535.0 if img.dtype == np.uint16 else 255.0
    if img.ndim == 3:
        # BGR(A) order from imread: weights b, g, r
        m = np.array([[0.0722 / scale, 0.7152 / scale, 0.2126 / scale] + [0.0] * (img.shape[2] - 3)], np.float32)
        return cv2.transform(img, m)
    return img.astype(np.float32) * np.float32(1.0 / scale)


def measure(path, um_per_px, out_dir):
    t = {}
    t0 = time.perf_counter()

    def lap(name):
        nonlocal t0
        now = time.perf_counter()
        t[name] = round((now - t0) * 1000, 1)
        t0 = now

    raw = cv2.imread(path, cv2.IMREAD_UNCHANGED)
    if raw is None:
        raise SystemExit(f'native_reference: cannot decode {path}')
    x = to_gray01(raw)
    h, w = x.shape
    lap('decode')

    k = (WINDOW_PX, WINDOW_PX)
    mean = cv2.boxFilter(x, cv2.CV_32F, k, borderType=cv2.BORDER_REFLECT_101)
    mean2 = cv2.boxFilter(cv2.multiply(x, x), cv2.CV_32F, k, borderType=cv2.BORDER_REFLECT_101)
    var = cv2.subtract(mean2, cv2.multiply(mean, mean))
    std = cv2.sqrt(cv2.max(var, 0.0))
    lap('variance')

    sm1 = cv2.GaussianBlur(x, (0, 0), 1.0)
    gx = cv2.Sobel(sm1, cv2.CV_32F, 1, 0, ksize=3)
    gy = cv2.Sobel(sm1, cv2.CV_32F, 0, 1, ksize=3)
    grad = cv2.magnitude(gx, gy)
    lap('gradient')

    sm2 = cv2.GaussianBlur(x, (0, 0), 2.0)
    g8 = cv2.convertScaleAbs(sm2, alpha=255.0)
    thr, fg = cv2.threshold(g8, 0, 1, cv2.THRESH_BINARY + cv2.THRESH_OTSU)
    border = np.concatenate([fg[0], fg[-1], fg[:, 0], fg[:, -1]])
    if border.mean() > 0.5:  # bright background: the specimen is the dark class
        fg = 1 - fg
    lap('otsu')

    ell = cv2.getStructuringElement(cv2.MORPH_ELLIPSE, (15, 15))
    fg = cv2.morphologyEx(fg, cv2.MORPH_CLOSE, ell)
    fg = cv2.morphologyEx(fg, cv2.MORPH_OPEN, ell)
    lap('morphology')

    contours, _ = cv2.findContours(fg, cv2.RETR_EXTERNAL, cv2.CHAIN_APPROX_NONE)
    if not contours:
        raise SystemExit(f'native_reference: no specimen found in {path}')
    outline = max(contours, key=cv2.contourArea)
    filled = np.zeros_like(fg)
    cv2.drawContours(filled, [outline], -1, 1, thickness=cv2.FILLED)
    lap('contour')

    pts = outline.reshape(-1, 2).astype(np.float64)
    a = np.column_stack([pts[:, 0], pts[:, 1], np.ones(len(pts))])
    b = pts[:, 0] ** 2 + pts[:, 1] ** 2
    sol = np.linalg.lstsq(a, b, rcond=None)[0]
    cx, cy = sol[0] / 2, sol[1] / 2
    radius = float(np.sqrt(sol[2] + cx * cx + cy * cy))
    ellipse = cv2.fitEllipse(outline)
    lap('fits')

    logstd = cv2.log(cv2.add(std, 1e-4))
    # the window straddling the outline reads as rough: classify only a window inside it
    inside = cv2.erode(filled, cv2.getStructuringElement(cv2.MORPH_ELLIPSE, (2 * WINDOW_PX + 1,) * 2)).astype(bool)
    lv = logstd[inside]
    lo, hi = float(lv.min()), float(lv.max())
    q8 = cv2.convertScaleAbs(logstd, alpha=255.0 / max(hi - lo, 1e-9), beta=-lo * 255.0 / max(hi - lo, 1e-9))
    t_rough, _ = cv2.threshold(q8[inside].reshape(1, -1), 0, 1, cv2.THRESH_BINARY + cv2.THRESH_OTSU)
    core = ((q8 > t_rough) & inside).astype(np.uint8)
    core = cv2.morphologyEx(core, cv2.MORPH_OPEN, cv2.getStructuringElement(cv2.MORPH_ELLIPSE, (5, 5)))
    lap('classify')

    th = np.deg2rad(np.arange(N_RAYS) * (360.0 / N_RAYS))
    dx, dy = np.cos(th)[:, None], -np.sin(th)[:, None]
    # outer edge: radius of the outline in each direction (nearest outline point by angle)
    ang = np.mod(np.arctan2(-(pts[:, 1] - cy), pts[:, 0] - cx), 2 * np.pi)
    order = np.argsort(ang)
    ang_s, rad_s = ang[order], np.hypot(pts[order, 0] - cx, pts[order, 1] - cy)
    j = np.clip(np.searchsorted(ang_s, th), 0, len(ang_s) - 1)
    r0 = rad_s[j][:, None]
    tt = r0 + np.arange(-4, 4.0001, 0.25)[None, :]
    prof = cv2.remap(sm1, (cx + tt * dx).astype(np.float32), (cy + tt * dy).astype(np.float32), cv2.INTER_LINEAR,
                     borderMode=cv2.BORDER_REPLICATE)
    mid = 0.5 * (prof[:, :4].mean(axis=1) + prof[:, -4:].mean(axis=1))[:, None]
    s = np.sign(prof - mid)
    cross = (s[:, :-1] * s[:, 1:]) <= 0
    first = np.where(cross.any(axis=1), cross.argmax(axis=1), 16)
    p0 = prof[np.arange(N_RAYS), first] - mid[:, 0]
    p1 = prof[np.arange(N_RAYS), np.minimum(first + 1, tt.shape[1] - 1)] - mid[:, 0]
    frac = np.where(np.abs(p0 - p1) > 1e-9, p0 / (p0 - p1), 0.5)
    r_edge = tt[np.arange(N_RAYS), first] + 0.25 * frac
    # boundary: from the edge inwards, first run of 3 core samples (0.5-px steps)
    steps = np.arange(0, radius, 0.5)[None, :]
    rr = r_edge[:, None] - steps
    cls = cv2.remap(core, (cx + rr * dx).astype(np.float32), (cy + rr * dy).astype(np.float32), cv2.INTER_NEAREST,
                    borderMode=cv2.BORDER_CONSTANT, borderValue=0)
    run3 = cls[:, :-2] & cls[:, 1:-1] & cls[:, 2:]
    has = run3.any(axis=1)
    width_px = np.where(has, run3.argmax(axis=1) * 0.5, np.nan)
    widths = width_px * um_per_px
    ok = widths[np.isfinite(widths)]
    rng = np.random.default_rng(1)
    boots = rng.choice(ok, size=(2000, len(ok)), replace=True).mean(axis=1) if len(ok) else np.array([np.nan])
    stats = {
        'n': int(len(ok)),
        'meanUm': float(ok.mean()) if len(ok) else None,
        'sdUm': float(ok.std(ddof=1)) if len(ok) > 1 else None,
        'medianUm': float(np.median(ok)) if len(ok) else None,
        'p05Um': float(np.percentile(ok, 5)) if len(ok) else None,
        'p95Um': float(np.percentile(ok, 95)) if len(ok) else None,
        'ci95Um': [float(np.percentile(boots, 2.5)), float(np.percentile(boots, 97.5))],
    }
    lap('rays')

    f = OVERLAY_PX / max(w, h)
    ow, oh = round(w * f), round(h * f)
    small = cv2.resize(cv2.convertScaleAbs(x, alpha=255.0), (ow, oh), interpolation=cv2.INTER_AREA)
    ov = cv2.cvtColor(small, cv2.COLOR_GRAY2BGR)
    edge_pts = np.column_stack([cx + r_edge * dx[:, 0], cy + r_edge * dy[:, 0]]) * f
    cv2.polylines(ov, [np.round(edge_pts).astype(np.int32)], True, (0, 200, 255), 1, cv2.LINE_AA)
    rb = np.where(has, r_edge - width_px, r_edge)
    bnd_pts = np.column_stack([cx + rb * dx[:, 0], cy + rb * dy[:, 0]]) * f
    cv2.polylines(ov, [np.round(bnd_pts).astype(np.int32)], True, (255, 120, 0), 1, cv2.LINE_AA)
    cv2.circle(ov, (round(cx * f), round(cy * f)), round(radius * f), (0, 255, 0), 1, cv2.LINE_AA)
    label = f"w = {stats['meanUm']:.1f} um (n = {stats['n']})" if stats['meanUm'] is not None else 'no band'
    cv2.putText(ov, label, (12, 28), cv2.FONT_HERSHEY_SIMPLEX, 0.8, (255, 255, 255), 1, cv2.LINE_AA)
    stem = os.path.splitext(os.path.basename(path))[0]
    cv2.imwrite(os.path.join(out_dir, stem + '.overlay.png'), ov)
    lap('overlay')

    result = {
        'schema': 'fractozone.native-reference/1',
        'file': os.path.basename(path),
        'image': {'widthPx': w, 'heightPx': h},
        'umPerPx': um_per_px,
        'specimen': {
            'center': {'x': cx, 'y': cy}, 'radiusPx': radius,
            'ellipse': {'center': list(ellipse[0]), 'axes': list(ellipse[1]), 'angleDeg': ellipse[2]},
            'otsu': thr,
        },
        'band': {'widthUm': stats, 'widthsUm': [None if not np.isfinite(v) else round(float(v), 2) for v in widths]},
        'edgeRadiiPx': [round(float(v), 2) for v in r_edge],
        'threads': cv2.getNumThreads(),
    }
    with open(os.path.join(out_dir, stem + '.result.json'), 'w') as fh:
        json.dump(result, fh, indent=2)
    lap('result')
    return {'file': os.path.basename(path), 'timingsMs': t, 'meanUm': stats['meanUm'], 'threads': cv2.getNumThreads()}


def main():
    um = float(_arg('--pixel-size-um', '1'))
    out = _arg('--out', '.')
    os.makedirs(out, exist_ok=True)
    batch = _arg('--batch')
    if batch:
        files = sorted(os.path.join(batch, n) for n in os.listdir(batch) if n.lower().endswith(('.png', '.jpg', '.jpeg', '.tif', '.tiff')))
    else:
        skip = {'--pixel-size-um', '--out', '--threads', '--batch'}  # options with a value
        files = [a for i, a in enumerate(sys.argv[1:], 1) if not a.startswith('--') and sys.argv[i - 1] not in skip]
    if not files:
        raise SystemExit('native_reference: no image given')
    for p in files:
        print(json.dumps(measure(p, um, out)), flush=True)


if __name__ == '__main__':
    main()

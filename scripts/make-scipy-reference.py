#!/usr/bin/env python3
"""Write SciPy reference vectors for the signal and picking tests into test/reference/.

Run from the repository root:  python3 scripts/make-scipy-reference.py
Needs numpy and scipy (Debian: python3-scipy). Every JSON file records the library versions used.
The inputs are fixed (seeded generator, stored in the JSON), so the tests need no Python.
"""
import json
import os

import numpy as np
import scipy
from scipy import signal

OUT = os.path.join(os.path.dirname(os.path.abspath(__file__)), '..', 'test', 'reference')
VERSIONS = {'scipy': scipy.__version__, 'numpy': np.__version__}


def write(name, payload):
    payload = {'source': VERSIONS, **payload}
    path = os.path.join(OUT, name)
    with open(path, 'w') as f:
        json.dump(payload, f, indent=None, separators=(',', ':'))
        f.write('\n')
    print('wrote', os.path.relpath(path))


def as_list(a):
    return [float(v) for v in np.asarray(a).ravel()]


def main():
    os.makedirs(OUT, exist_ok=True)
    rng = np.random.default_rng(20260101)

    # Butterworth band-pass designs: narrow, wide (real poles for odd orders), high order, near Nyquist.
    designs = [
        (2, 20.0, 200.0, 10000.0),
        (4, 30.0, 300.0, 8000.0),
        (3, 5.0, 400.0, 2000.0),
        (5, 10.0, 800.0, 4000.0),
        (8, 50.0, 120.0, 20000.0),
        (1, 100.0, 900.0, 2000.0),
        (6, 200.0, 1800.0, 4000.0),
    ]
    cases = []
    for order, lo, hi, fs in designs:
        sos = signal.butter(order, [lo, hi], 'bandpass', fs=fs, output='sos')
        cases.append({'order': order, 'lowHz': lo, 'highHz': hi, 'fsHz': fs, 'sos': as_list(sos)})
    write('butter-sos.json', {'call': "signal.butter(order, [lowHz, highHz], 'bandpass', fs=fsHz, output='sos')", 'cases': cases})

    # sosfilt / sosfiltfilt on a fixed input: noise plus a pulse plus an offset and a trend.
    n = 600
    t = np.arange(n) / 4000.0
    x = 0.3 * rng.standard_normal(n) + np.sin(2 * np.pi * 120 * t) * np.exp(-((t - 0.06) / 0.01) ** 2) + 0.5 + 2.0 * t
    filt_cases = []
    for order, lo, hi, fs in [(4, 30.0, 300.0, 4000.0), (3, 5.0, 400.0, 4000.0), (2, 80.0, 160.0, 4000.0)]:
        sos = signal.butter(order, [lo, hi], 'bandpass', fs=fs, output='sos')
        filt_cases.append({
            'order': order, 'lowHz': lo, 'highHz': hi, 'fsHz': fs,
            'sosfilt': as_list(signal.sosfilt(sos, x)),
            'sosfiltfilt': as_list(signal.sosfiltfilt(sos, x)),
            'sosfilt_zi': as_list(signal.sosfilt_zi(sos)),
        })
    write('sos-filtering.json', {'input': as_list(x), 'cases': filt_cases,
                                 'calls': ['signal.sosfilt(sos, x)', 'signal.sosfiltfilt(sos, x)', 'signal.sosfilt_zi(sos)']})

    # Cross-correlation r(k) = sum a(n) b(n+k) = signal.correlate(b, a, 'full'), lags from correlation_lags.
    corr_cases = []
    for na, nb in [(50, 80), (64, 64), (101, 37)]:
        a = rng.standard_normal(na)
        b = rng.standard_normal(nb)
        corr_cases.append({
            'a': as_list(a), 'b': as_list(b),
            'r': as_list(signal.correlate(b, a, mode='full', method='fft')),
            'lags': [int(v) for v in signal.correlation_lags(nb, na, mode='full')],
        })
    write('correlate.json', {'call': "signal.correlate(b, a, mode='full', method='fft'), signal.correlation_lags(len(b), len(a))",
                             'cases': corr_cases})

    # Detrend and Tukey taper.
    y = rng.standard_normal(257) + 3.0 - 0.02 * np.arange(257)
    taper_cases = []
    for m, alpha in [(100, 0.2), (101, 0.1), (64, 1.0), (50, 0.0)]:
        taper_cases.append({'n': m, 'alpha': alpha, 'window': as_list(signal.windows.tukey(m, alpha))})
    write('detrend-taper.json', {
        'detrend': {'input': as_list(y), 'output': as_list(signal.detrend(y, type='linear'))},
        'tukey': taper_cases,
        'calls': ["signal.detrend(y, type='linear')", 'signal.windows.tukey(n, alpha)'],
    })


if __name__ == '__main__':
    main()

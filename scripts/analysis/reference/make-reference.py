"""Writes scipy reference vectors for the analysis tests: python3 make-reference.py (numpy + scipy)."""
import json
import os

import numpy as np
import scipy
from scipy import signal

rng = np.random.default_rng(20240601)
fs = 1000
n = 800
t = np.arange(n) / fs
x = rng.standard_normal(n) * 0.3 + np.sin(2 * np.pi * 40 * t) * np.exp(-((t - 0.4) ** 2) / 0.002)
odd = rng.standard_normal(797)


def tf(b, a):
    return {"b": list(map(float, b)), "a": list(map(float, a))}


designs = [
    {"order": 2, "cutoff": 400, "fs": 1000, "kind": "lowpass"},
    {"order": 2, "cutoff": 25, "fs": 1000, "kind": "highpass"},
    {"order": 1, "cutoff": 8, "fs": 1000, "kind": "lowpass"},
    {"order": 4, "cutoff": [25, 400], "fs": 1000, "kind": "bandpass"},
    {"order": 3, "cutoff": 100, "fs": 4000, "kind": "highpass"},
    {"order": 5, "cutoff": 300, "fs": 2000, "kind": "lowpass"},
]
for d in designs:
    b, a = signal.butter(d["order"], d["cutoff"], btype=d["kind"], fs=d["fs"])
    d.update(tf(b, a))
    d["zi"] = list(map(float, signal.lfilter_zi(b, a)))
    d["filtfilt"] = list(map(float, signal.filtfilt(b, a, x)))

resampling = []
for up, down, length in [(1, 4, 800), (10, 441, 1764), (2, 1, 300), (5, 8, 640), (1, 2, 999)]:
    source = rng.standard_normal(length)
    resampling.append({
        "up": up,
        "down": down,
        "input": list(map(float, source)),
        "output": list(map(float, signal.resample_poly(source, up, down))),
    })

analytic = signal.hilbert(x)
analytic_odd = signal.hilbert(odd)
padded = np.abs(signal.hilbert(x, 1024))[:n]
b8, a8 = signal.butter(1, 8, btype="lowpass", fs=fs)
homomorphic = np.exp(signal.filtfilt(b8, a8, np.log(padded)))

reference = {
    "generator": "scripts/analysis/reference/make-reference.py",
    "scipy": scipy.__version__,
    "numpy": np.__version__,
    "x": list(map(float, x)),
    "odd": list(map(float, odd)),
    "butter": designs,
    "resamplePoly": resampling,
    "hilbert": {"re": list(map(float, analytic.real)), "im": list(map(float, analytic.imag))},
    "hilbertOdd": {"re": list(map(float, analytic_odd.real)), "im": list(map(float, analytic_odd.imag))},
    "hilbertEnvelopePadded1024": list(map(float, padded)),
    "homomorphicEnvelope": list(map(float, homomorphic)),
    "firwinKaiser": {
        "numtaps": 81, "cutoff": 0.25, "beta": 5.0,
        "h": list(map(float, signal.firwin(81, 0.25, window=("kaiser", 5.0)))),
    },
}
out = os.path.join(os.path.dirname(os.path.abspath(__file__)), "scipy-reference.json")
with open(out, "w") as f:
    json.dump(reference, f, separators=(",", ":"))
print("wrote", out)

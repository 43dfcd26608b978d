#!/usr/bin/env python3
"""Reference values for Tinct's colour science, from two independent colour libraries.

Writes tests/data/colour/reference.json, read by tests/colour.rs. Run it from the repository root:

    pip install colour-science==0.4.7 colorspacious==1.1.2
    python3 tests/scripts/colour_reference.py

Sources:
- CIEDE2000: the 34 pairs of Sharma, Wu and Dalal (2005), "The CIEDE2000 color-difference formula:
  implementation notes, supplementary test data, and mathematical observations", Table 1. The Lab
  values and the published differences below were typed from memory; this script recomputes each
  difference with colour-science's delta_E_CIE2000 and refuses to write anything unless every one
  agrees to 4 decimals, so the committed table is confirmed by an independent implementation.
- sRGB to CIELAB: colour-science's sRGB_to_XYZ (IEC 61966-2-1 decoding, D65) and XYZ_to_Lab with the
  D65 whitepoint, and colorspacious's "sRGB255" to "CIELab" conversion as a second opinion.
- Colour-vision deficiency: colorspacious's "sRGB1+CVD" space, which implements Machado, Oliveira and
  Fernandes (2009) at severity 100 in linear sRGB, and colour-science's matrix_cvd_Machado2009.
"""

import json
import sys

import colorspacious
import colour
import numpy as np

# (L1, a1, b1, L2, a2, b2, published dE00), Sharma, Wu and Dalal (2005) Table 1, pairs 1 to 34.
SHARMA = [
    (50.0000, 2.6772, -79.7751, 50.0000, 0.0000, -82.7485, 2.0425),
    (50.0000, 3.1571, -77.2803, 50.0000, 0.0000, -82.7485, 2.8615),
    (50.0000, 2.8361, -74.0200, 50.0000, 0.0000, -82.7485, 3.4412),
    (50.0000, -1.3802, -84.2814, 50.0000, 0.0000, -82.7485, 1.0000),
    (50.0000, -1.1848, -84.8006, 50.0000, 0.0000, -82.7485, 1.0000),
    (50.0000, -0.9009, -85.5211, 50.0000, 0.0000, -82.7485, 1.0000),
    (50.0000, 0.0000, 0.0000, 50.0000, -1.0000, 2.0000, 2.3669),
    (50.0000, -1.0000, 2.0000, 50.0000, 0.0000, 0.0000, 2.3669),
    (50.0000, 2.4900, -0.0010, 50.0000, -2.4900, 0.0009, 7.1792),
    (50.0000, 2.4900, -0.0010, 50.0000, -2.4900, 0.0010, 7.1792),
    (50.0000, 2.4900, -0.0010, 50.0000, -2.4900, 0.0011, 7.2195),
    (50.0000, 2.4900, -0.0010, 50.0000, -2.4900, 0.0012, 7.2195),
    (50.0000, -0.0010, 2.4900, 50.0000, 0.0009, -2.4900, 4.8045),
    (50.0000, -0.0010, 2.4900, 50.0000, 0.0010, -2.4900, 4.8045),
    (50.0000, -0.0010, 2.4900, 50.0000, 0.0011, -2.4900, 4.7461),
    (50.0000, 2.5000, 0.0000, 50.0000, 0.0000, -2.5000, 4.3065),
    (50.0000, 2.5000, 0.0000, 73.0000, 25.0000, -18.0000, 27.1492),
    (50.0000, 2.5000, 0.0000, 61.0000, -5.0000, 29.0000, 22.8977),
    (50.0000, 2.5000, 0.0000, 56.0000, -27.0000, -3.0000, 31.9030),
    (50.0000, 2.5000, 0.0000, 58.0000, 24.0000, 15.0000, 19.4535),
    (50.0000, 2.5000, 0.0000, 50.0000, 3.1736, 0.5854, 1.0000),
    (50.0000, 2.5000, 0.0000, 50.0000, 3.2972, 0.0000, 1.0000),
    (50.0000, 2.5000, 0.0000, 50.0000, 1.8634, 0.5757, 1.0000),
    (50.0000, 2.5000, 0.0000, 50.0000, 3.2592, 0.3350, 1.0000),
    (60.2574, -34.0099, 36.2677, 60.4626, -34.1751, 39.4387, 1.2644),
    (63.0109, -31.0961, -5.8663, 62.8187, -29.7946, -4.0864, 1.2630),
    (61.2901, 3.7196, -5.3901, 61.4292, 2.2480, -4.9620, 1.8731),
    (35.0831, -44.1164, 3.7933, 35.0232, -40.0716, 1.5901, 1.8645),
    (22.7233, 20.0904, -46.6940, 23.0331, 14.9730, -42.5619, 2.0373),
    (36.4612, 47.8580, 18.3852, 36.2715, 50.5065, 21.2231, 1.4146),
    (90.8027, -2.0831, 1.4410, 91.1528, -1.6435, 0.0447, 1.4441),
    (90.9257, -0.5406, -0.9208, 88.6381, -0.8985, -0.7239, 1.5381),
    (6.7747, -0.2908, -2.4247, 5.8714, -0.0985, -2.2286, 0.6377),
    (2.0776, 0.0795, -1.1350, 0.9033, -0.0636, -0.5514, 0.9082),
]

# Test colours: primaries, secondaries, greys, and assorted mid-tones like map fills.
COLOURS = [
    "#000000", "#ffffff", "#808080", "#ff0000", "#00ff00", "#0000ff", "#ffff00", "#00ffff",
    "#ff00ff", "#9cc98a", "#e8c68e", "#b5a1cf", "#86c0c9", "#d99480", "#a7adb5", "#123456",
    "#c0ffee", "#7f3b08", "#2d004b", "#fafafa", "#0a0a0a",
]

CVD = {"protanopia": "protanomaly", "deuteranopia": "deuteranomaly", "tritanopia": "tritanomaly"}
CS_CVD = {"protanopia": "Protanomaly", "deuteranopia": "Deuteranomaly", "tritanopia": "Tritanomaly"}


def main():
    failures = []
    sharma = []
    for i, (l1, a1, b1, l2, a2, b2, published) in enumerate(SHARMA, start=1):
        value = float(colour.difference.delta_E_CIE2000([l1, a1, b1], [l2, a2, b2]))
        if round(value, 4) != published:
            failures.append(f"pair {i}: colour-science {value:.4f}, table {published:.4f}")
        sharma.append({"pair": i, "lab1": [l1, a1, b1], "lab2": [l2, a2, b2], "delta_e00": published})
    if failures:
        sys.exit("typed table disagrees with colour-science:\n" + "\n".join(failures))

    d65 = colour.CCS_ILLUMINANTS["CIE 1931 2 Degree Standard Observer"]["D65"]
    srgb = []
    for hex_colour in COLOURS:
        rgb255 = np.array([int(hex_colour[i:i + 2], 16) for i in (1, 3, 5)], dtype=float)
        xyz = colour.sRGB_to_XYZ(rgb255 / 255.0)
        lab = colour.XYZ_to_Lab(xyz, d65)
        lab2 = colorspacious.cspace_convert(rgb255, "sRGB255", "CIELab")
        linear = colorspacious.cspace_convert(rgb255, "sRGB255", "sRGB1-linear")
        cvd = {}
        for ours, theirs in CVD.items():
            space = {"name": "sRGB1+CVD", "cvd_type": theirs, "severity": 100}
            simulated = colorspacious.cspace_convert(rgb255 / 255.0, space, "sRGB1-linear")
            matrix = colour.blindness.matrix_cvd_Machado2009(CS_CVD[ours], 1.0)
            cs = matrix @ linear
            if np.max(np.abs(cs - simulated)) > 1e-5:
                sys.exit(f"{hex_colour} {ours}: the two libraries disagree: {cs} vs {simulated}")
            cvd[ours] = [float(v) for v in simulated]
        srgb.append({
            "hex": hex_colour,
            "lab_colour_science": [float(v) for v in lab],
            "lab_colorspacious": [float(v) for v in lab2],
            "linear": [float(v) for v in linear],
            "cvd_linear": cvd,
        })

    out = {
        "provenance": {
            "script": "tests/scripts/colour_reference.py",
            "colour-science": colour.__version__,
            "colorspacious": colorspacious.__version__ if hasattr(colorspacious, "__version__") else "1.1.2",
            "numpy": np.__version__,
        },
        "sharma_2005": sharma,
        "srgb": srgb,
    }
    with open("tests/data/colour/reference.json", "w") as f:
        json.dump(out, f, indent=1, sort_keys=True)
        f.write("\n")


if __name__ == "__main__":
    main()

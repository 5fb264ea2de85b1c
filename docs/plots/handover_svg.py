#!/usr/bin/env python3
"""Draws docs/plots/<solute>-handover.svg from the CSV of build/tests/reference/binary_handover_curves.

    for s in HCl NaOH H2SO4; do build/tests/reference/binary_handover_curves $s |
      python3 docs/plots/handover_svg.py > docs/plots/$(echo $s | tr A-Z a-z)-handover.svg; done

Left: L_phi at 25 °C, the binary model against the ionic engine with the Pitzer model (its
equilibrium enthalpy with the Pitzer heats of dilution), and for HCl Parker's values (parker-1965,
read). Right: water activity, the same two. The dashed line is the hand-over: the molality to which
the ion-interaction parameters are fitted; beyond it the engine's curve is an extrapolation.
"""
import csv
import math
import sys

PARKER = [(0.1, 0.556), (0.5, 1.172), (1.0, 1.695), (2.0, 2.623), (3.0, 3.506), (5.0, 5.318), (6.0, 6.268),
          (8.0, 8.201), (10.0, 10.24), (15.0, 15.40)]  # mol/kg, kJ/mol (parker-1965, read)

header = sys.stdin.readline().split()  # "# HCl 298.15 K handover 6"
SOLUTE, HANDOVER = header[1], float(header[5])
rows = [{k: float(v) for k, v in r.items()} for r in csv.DictReader(sys.stdin)]
MMAX = rows[-1]["molality"]
VALUES = [r[k] for r in rows for k in ("binary_l_phi_kJ", "engine_l_phi_kJ") if not math.isnan(r[k])]


def nice_axis(low, high, ticks=4):
    """An axis from a multiple of a round step (1, 2, 2.5 or 5 times a power of ten) over `ticks` steps."""
    raw = (high - low) / ticks
    for step in sorted(m * 10 ** e for e in range(-3, 4) for m in (1, 2, 2.5, 5)):
        if step < raw:
            continue
        start = math.floor(low / step) * step
        if start + ticks * step >= high:
            return start, start + ticks * step
    raise ValueError("no axis")


LMIN, LMAX = nice_axis(min(0.0, min(VALUES)), max(VALUES))
W, H, PAD = 380, 300, 50


def panel(x0, title, ylabel, series, ymin, ymax, points=()):
    xmin, xmax = math.log10(0.1), math.log10(MMAX)
    sx = lambda m: x0 + PAD + (math.log10(m) - xmin) / (xmax - xmin) * (W - 2 * PAD)
    sy = lambda v: H - PAD - (v - ymin) / (ymax - ymin) * (H - 2 * PAD)
    out = [f'<text x="{x0 + W / 2}" y="20" text-anchor="middle" font-size="13">{title}</text>',
           f'<rect x="{x0 + PAD}" y="{PAD}" width="{W - 2 * PAD}" height="{H - 2 * PAD}" fill="none" stroke="#444"/>',
           f'<text x="{x0 + 12}" y="{H / 2}" font-size="11" transform="rotate(-90 {x0 + 12} {H / 2})" '
           f'text-anchor="middle">{ylabel}</text>',
           f'<text x="{x0 + W / 2}" y="{H - 10}" text-anchor="middle" font-size="11">molality / mol kg⁻¹</text>']
    for m in (0.1, 1.0, 10.0):
        out.append(f'<text x="{sx(m)}" y="{H - PAD + 14}" text-anchor="middle" font-size="10">{m:g}</text>')
    for k in range(5):
        v = ymin + k * (ymax - ymin) / 4
        out.append(f'<text x="{x0 + PAD - 4}" y="{sy(v) + 3}" text-anchor="end" font-size="10">{v:g}</text>')
    out.append(f'<line x1="{sx(HANDOVER)}" y1="{PAD}" x2="{sx(HANDOVER)}" y2="{H - PAD}" stroke="#888" '
               'stroke-dasharray="4 3"/>')
    for key, colour, label, dy in series:
        path = " ".join(f"{sx(r['molality']):.1f},{sy(r[key]):.1f}" for r in rows if not math.isnan(r[key]))
        out.append(f'<polyline points="{path}" fill="none" stroke="{colour}" stroke-width="1.6"/>')
        out.append(f'<text x="{x0 + PAD + 6}" y="{PAD + dy}" font-size="10" fill="{colour}">{label}</text>')
    for m, v in (p for p in points if p[0] <= MMAX):
        out.append(f'<circle cx="{sx(m):.1f}" cy="{sy(v):.1f}" r="2.8" fill="none" stroke="#000"/>')
    return out


SOURCE = {"HCl": "Parker 1965 table", "NaOH": "Olsson et al. 1997", "H2SO4": "NBS 1982 heats"}[SOLUTE]
body = panel(0, f"{SOLUTE}, 25 °C: L_φ / kJ mol⁻¹", "L_φ / kJ mol⁻¹",
             [("binary_l_phi_kJ", "#c0392b", f"binary model ({SOURCE})", 14),
              ("engine_l_phi_kJ", "#2471a3", "ionic engine, Pitzer (heats of dilution)", 28)],
             LMIN, LMAX, PARKER if SOLUTE == "HCl" else ())
note = "○ Parker 1965 (read); " if SOLUTE == "HCl" else ""
body += [f'<text x="{PAD + 6}" y="{PAD + 42}" font-size="10">{note}dashed: {HANDOVER:g} mol/kg hand-over</text>']
body += panel(W, f"{SOLUTE}, 25 °C: water activity", "a_w",
              [("binary_water_activity", "#c0392b", "binary model", 150),
               ("engine_water_activity", "#2471a3", "ionic engine, Pitzer", 164)], 0.0, 1.0)
print(f'<svg xmlns="http://www.w3.org/2000/svg" width="{2 * W}" height="{H}" font-family="sans-serif">')
print("\n".join(body))
print("</svg>")

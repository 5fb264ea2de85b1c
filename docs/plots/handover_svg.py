#!/usr/bin/env python3
"""Draws docs/plots/hcl-handover.svg from the CSV of build/tests/reference/binary_handover_curves.

    build/tests/reference/binary_handover_curves | python3 docs/plots/handover_svg.py > docs/plots/hcl-handover.svg

Left: L_phi of HCl at 25 °C, the binary model against the ionic engine's dilute-solution enthalpy
(which has no heat of dilution) and Parker's values (parker-1965, read). Right: water activity, the
binary model against the engine with Davies activity. The dashed line is the molality to which the
ionic engine's HCl ion-interaction parameters are fitted (6 mol/kg): the hand-over.
"""
import csv
import math
import sys

PARKER = [(0.1, 0.556), (0.5, 1.172), (1.0, 1.695), (2.0, 2.623), (3.0, 3.506), (5.0, 5.318), (6.0, 6.268),
          (8.0, 8.201), (10.0, 10.24), (15.0, 15.40)]  # mol/kg, kJ/mol (parker-1965, read)
HANDOVER = 6.0

rows = [{k: float(v) for k, v in r.items()} for r in csv.DictReader(sys.stdin)]
W, H, PAD = 380, 300, 50


def panel(x0, title, ylabel, series, ymin, ymax, points=()):
    xmin, xmax = math.log10(0.1), math.log10(16.0)
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
        path = " ".join(f"{sx(r['molality']):.1f},{sy(r[key]):.1f}" for r in rows)
        out.append(f'<polyline points="{path}" fill="none" stroke="{colour}" stroke-width="1.6"/>')
        out.append(f'<text x="{x0 + PAD + 6}" y="{PAD + dy}" font-size="10" fill="{colour}">{label}</text>')
    for m, v in points:
        out.append(f'<circle cx="{sx(m):.1f}" cy="{sy(v):.1f}" r="2.8" fill="none" stroke="#000"/>')
    return out


body = panel(0, "HCl, 25 °C: L_φ / kJ mol⁻¹", "L_φ / kJ mol⁻¹",
             [("binary_l_phi_kJ", "#c0392b", "binary model (Parker 1965 table)", 14),
              ("engine_l_phi_kJ", "#2471a3", "ionic engine, dilute enthalpy (no heat of dilution)", 28)],
             0.0, 16.0, PARKER)
body += [f'<text x="{PAD + 6}" y="{PAD + 42}" font-size="10">○ Parker 1965 (read); dashed: 6 mol/kg hand-over</text>']
body += panel(W, "HCl, 25 °C: water activity", "a_w",
              [("binary_water_activity", "#c0392b", "binary model (γ±, Gibbs–Duhem)", 150),
               ("engine_water_activity", "#2471a3", "ionic engine, Davies", 164)], 0.0, 1.0)
print(f'<svg xmlns="http://www.w3.org/2000/svg" width="{2 * W}" height="{H}" font-family="sans-serif">')
print("\n".join(body))
print("</svg>")

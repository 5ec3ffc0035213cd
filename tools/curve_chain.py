#!/usr/bin/env python3
"""An independent, plain-Python propeller curve: the same chain as tidewright's
`curve/marram_101_points` bench, written from the design (docs/method.md) and not from the Rust
code, to put the bench's figure against a second implementation's on the same machine.

Per speed: ITTC-1957 friction with a form factor, a residuary term of van Oortmerssen's (1971)
form (two exponentials, a sine and a cosine of Fn^-2; the coefficients here are made up, of the
demo boat's size), air drag, a service margin; wake and thrust deduction linear in Fn; the
Wageningen B-series KT/KQ polynomials of data/bseries-polynomials.csv collapsed into cubics in
J for one screw, with the Reynolds-number correction iterated (J -> n -> Rn -> KT); the thrust
identity solved by bisection with secant steps; then torque, delivered and brake power, engine
rpm and Willans-line fuel. Standard library only (no numpy on the build machine).

Prints the median time of one 101-point curve in microseconds, and the top point as a check.
"""

import math
import os
import sys
import time

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
GRAVITY = 9.80665

# A boat of the demo trawler's size (invented values).
LENGTH = 11.6  # waterline length, m
WETTED = 38.0  # wetted surface, m^2
VOLUME = 14.0  # displaced volume, m^3
FORM_FACTOR = 1.12
RESIDUARY = (0.012, -0.004, 0.0025, -0.0018)  # c1..c4 of the residuary form (made up)
DECAY = 0.85  # m of the residuary form (made up)
AIR = 0.5 * 1.225 * 0.9 * 7.5  # 1/2 rho_air Cd A, kg/m
SERVICE = 0.15
RHO, NU = 1025.0, 1.19e-6
# Screw, gear, engine.
DIAMETER, PITCH_RATIO, AREA_RATIO, BLADES = 0.66, 0.67, 0.55, 3
GEAR, SHAFT_EFF, GEAR_EFF = 2.5, 0.98, 0.97
FULL_LOAD = [(1200.0, 30e3), (2000.0, 55e3), (2600.0, 66e3)]
SFC_FULL, ZERO_LOAD = 235e-3 / 3.6e6, 0.15  # kg/J, fraction
FUEL_DENSITY = 840.0


def read_terms():
    """The B-series terms: (series, C, p, s, t, u, v)."""
    terms = []
    with open(os.path.join(ROOT, "data", "bseries-polynomials.csv")) as f:
        header = False
        for line in f:
            line = line.strip()
            if not line or line.startswith("#"):
                continue
            if not header:
                header = True
                continue
            series, c, p, s, t, u, v = [x.strip() for x in line.split(",")]
            terms.append((series, float(c), int(p), int(s), int(t), int(u), int(v)))
    return terms


def collapse(terms):
    """Cubics in J for this screw: KT, KQ and the correction's cubics per power of x."""
    kt, kq = [0.0] * 4, [0.0] * 4
    dkt = [[0.0] * 4 for _ in range(3)]
    dkq = [[0.0] * 4 for _ in range(3)]
    for series, c, p, s, t, u, v in terms:
        w = c * PITCH_RATIO**t * AREA_RATIO**u * BLADES**v
        {"KT": lambda: kt, "KQ": lambda: kq, "dKT": lambda: dkt[p], "dKQ": lambda: dkq[p]}[
            series
        ]()[s] += w
    return kt, kq, dkt, dkq


def at_reynolds(screw, rn):
    """KT and KQ cubics at Rn (the correction folded in above 2e6)."""
    kt, kq, dkt, dkq = screw
    if rn is None or rn <= 2e6:
        return kt, kq
    x = math.log10(rn) - 0.301
    fold = lambda base, corr: [
        base[s] + corr[0][s] + x * (corr[1][s] + x * corr[2][s]) for s in range(4)
    ]
    return fold(kt, dkt), fold(kq, dkq)


def cubic(c, j):
    return ((c[3] * j + c[2]) * j + c[1]) * j + c[0]


def root(kt, loading):
    """J where KT(J) = loading J^2: bisection with secant steps on [0, sqrt(KT0/loading)]."""
    lo, hi = 0.0, math.sqrt(kt[0] / loading)
    flo, fhi = kt[0], cubic(kt, hi) - loading * hi * hi
    for _ in range(100):
        j = hi - fhi * (hi - lo) / (fhi - flo)
        if not lo < j < hi:
            j = 0.5 * (lo + hi)
        f = cubic(kt, j) - loading * j * j
        if abs(f) <= 1e-10 * loading * j * j:
            return j
        if f > 0:
            lo, flo = j, f
        else:
            hi, fhi = j, f
    return j


def full_load_power(rpm):
    pts = FULL_LOAD
    if rpm <= pts[0][0]:
        return pts[0][1] * rpm / pts[0][0]
    for (r0, p0), (r1, p1) in zip(pts, pts[1:]):
        if rpm <= r1:
            return p0 + (p1 - p0) * (rpm - r0) / (r1 - r0)
    return pts[-1][1]


def point(screw, speed):
    if speed == 0.0:
        return None
    froude = speed / math.sqrt(GRAVITY * LENGTH)
    rn_hull = speed * LENGTH / NU
    cf = 0.075 / (math.log10(rn_hull) - 2.0) ** 2
    q = 0.5 * RHO * speed * speed
    x = max(froude, 0.1) ** -2
    c1, c2, c3, c4 = RESIDUARY
    residuary = RHO * GRAVITY * VOLUME * max(
        0.0,
        c1 * math.exp(-DECAY * x / 9.0)
        + math.exp(-DECAY * x) * (c2 + c3 * math.sin(x) + c4 * math.cos(x)),
    )
    calm = q * WETTED * cf * FORM_FACTOR + residuary
    resistance = (calm + AIR * speed * speed) * (1.0 + SERVICE)
    wake, deduction, eta_r = 0.20 + 0.05 * froude, 0.16 - 0.04 * froude, 1.01
    va = speed * (1.0 - wake)
    thrust = resistance / (1.0 - deduction)
    loading = thrust / (RHO * va * va * DIAMETER * DIAMETER)
    chord = 2.073 * AREA_RATIO * DIAMETER / BLADES
    rn = None
    for _ in range(5):
        kt, kq = at_reynolds(screw, rn)
        j = root(kt, loading)
        n = va / (j * DIAMETER)
        updated = chord * math.hypot(va, 0.75 * math.pi * n * DIAMETER) / NU
        if rn is not None and abs(updated - rn) <= 1e-3 * rn:
            break
        rn = updated
    torque = cubic(kq, j) * RHO * n * n * DIAMETER**5
    delivered = 2.0 * math.pi * n * torque / eta_r
    brake = delivered / (SHAFT_EFF * GEAR_EFF)
    rpm = 60.0 * n * GEAR
    full = full_load_power(rpm)
    fuel = SFC_FULL * (ZERO_LOAD * full + (1.0 - ZERO_LOAD) * brake) / FUEL_DENSITY
    return rpm, brake, fuel


def curve(screw, top):
    return [point(screw, top * i / 100.0) for i in range(101)]


def main():
    screw = collapse(read_terms())
    top = 0.45 * math.sqrt(GRAVITY * LENGTH)
    runs = int(sys.argv[1]) if len(sys.argv) > 1 else 200
    times = []
    for _ in range(runs):
        start = time.perf_counter()
        last = curve(screw, top)[-1]
        times.append(time.perf_counter() - start)
    times.sort()
    median = times[len(times) // 2]
    rpm, brake, fuel = last
    print(
        f"python curve (101 points): median {median * 1e6:.1f} us over {runs} runs; "
        f"top point {rpm:.0f} rpm, {brake / 1e3:.1f} kW, {fuel * 3.6e6:.1f} L/h"
    )
    print(f"PYTHON_CURVE_US={median * 1e6:.3f}")


if __name__ == "__main__":
    main()

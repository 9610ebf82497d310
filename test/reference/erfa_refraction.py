#!/usr/bin/python3
"""Write erfa-refraction.json: ERFA's refraction constants and refraction by wavelength and humidity.

Two parts, both from ERFA (the open IAU SOFA library) through Debian's python3-erfa:
  - "constants": erfa.refco(phpa, tc, rh, wl) -> A, B (radians) of dZ = A tan Z + B tan^3 Z over a
    grid of pressure, temperature, relative humidity and wavelength (0.55, 1.25, 1.65, 2.2 um);
  - "refraction": for random stars, sites and instants, erfa.atco13's observed altitude without
    refraction (pressure 0, the true altitude) and with it, at the site's standard-atmosphere
    pressure, a random temperature and humidity, and a wavelength of 0.55, 1.25 or 2.2 um. Their
    difference is ERFA's refraction at that true altitude. Only true altitudes above 15 degrees;
  - "lowRefraction": the same at true altitudes from 5 to 15 degrees (its own seed).
Conventions as in erfa_topocentric.py: UT1 - UTC = 0, no polar motion, parallax or radial velocity.

Usage: /usr/bin/python3 test/reference/erfa_refraction.py [output.json]
The output is deterministic for a given ERFA version (fixed seed).
"""
import json
import math
import random
import sys
import warnings

import erfa

warnings.filterwarnings("ignore", category=erfa.ErfaWarning)

SEED = 20261203
CASES = 300
LOW_CASES = 240
LOW_ALTITUDE_DEG = 5.0
WAVELENGTHS_UM = [0.55, 1.25, 2.2]
OUT = sys.argv[1] if len(sys.argv) > 1 else __file__.replace("erfa_refraction.py", "erfa-refraction.json")


def standard_atmosphere(h_m):
    """ICAO / U.S. Standard Atmosphere 1976 troposphere: pressure hPa, temperature C."""
    t_k = 288.15 - 0.0065 * h_m
    return 1013.25 * (t_k / 288.15) ** 5.25588, t_k - 273.15


def altitude(utc1, utc2, ra, dec, lon, lat, h, phpa, tc, rh, wl):
    _aob, zob, _hob, _dob, _rob, _eo = erfa.atco13(
        ra, dec, 0.0, 0.0, 0.0, 0.0, utc1, utc2, 0.0, lon, lat, h, 0.0, 0.0, phpa, tc, rh, wl)
    return 90 - math.degrees(zob)


def draw_cases(rng, count, keep):
    """Random sites, stars and instants, kept where the true altitude passes `keep`."""
    cases = []
    while len(cases) < count:
        lat = math.asin(rng.uniform(-math.sin(math.radians(75)), math.sin(math.radians(75))))
        lon = math.radians(rng.uniform(-180, 180))
        h = rng.uniform(0, 5000)
        phpa, tstd = standard_atmosphere(h)
        tc = tstd + rng.uniform(-8, 8)
        rh = rng.uniform(0, 1)
        wl = WAVELENGTHS_UM[len(cases) % len(WAVELENGTHS_UM)]
        ra = rng.uniform(0, 2 * math.pi)
        dec = math.asin(rng.uniform(-1, 1))
        utc1, utc2 = erfa.dtf2d("UTC", rng.randint(2020, 2034), rng.randint(1, 12), rng.randint(1, 28),
                                rng.randint(0, 23), rng.randint(0, 59), 0.0)
        true_alt = altitude(utc1, utc2, ra, dec, lon, lat, h, 0.0, tc, rh, wl)
        if not keep(true_alt):
            continue
        observed_alt = altitude(utc1, utc2, ra, dec, lon, lat, h, phpa, tc, rh, wl)
        cases.append({"pressureHpa": phpa, "temperatureC": tc, "humidity": rh, "wavelengthUm": wl,
                      "trueAltDeg": true_alt, "observedAltDeg": observed_alt})
    return cases


def main():
    constants = []
    for phpa in [550.0, 620.0, 700.0, 780.0, 1010.0]:
        for tc in [-5.0, 2.0, 10.0, 20.0]:
            for rh in [0.0, 0.2, 0.5, 0.9]:
                for wl in [0.55, 1.25, 1.65, 2.2]:
                    a, b = erfa.refco(phpa, tc, rh, wl)
                    constants.append({"pressureHpa": phpa, "temperatureC": tc, "humidity": rh,
                                      "wavelengthUm": wl, "aRad": a, "bRad": b})
    # Above 15 degrees; then 5 to 15 degrees from its own seed. Below about 5 degrees ERFA's own
    # series is no reference: atioq clamps tan Z near 20 (SELMIN = 0.05).
    cases = draw_cases(random.Random(SEED), CASES, lambda alt: alt > 15)
    low = draw_cases(random.Random(SEED + 1), LOW_CASES, lambda alt: LOW_ALTITUDE_DEG <= alt <= 15)
    doc = {
        "source": "ERFA %s via python3-erfa %s, erfa.refco and erfa.atco13" % (erfa.version.erfa_version, erfa.__version__),
        "generator": "test/reference/erfa_refraction.py",
        "seed": SEED,
        "constants": constants,
        "refraction": cases,
        "lowRefraction": low,
    }
    with open(OUT, "w") as f:
        json.dump(doc, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()

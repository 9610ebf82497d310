#!/usr/bin/python3
"""Write erfa-topocentric.json: topocentric altitudes and azimuths from ERFA (the open IAU SOFA
library, Debian's python3-erfa) for random sites, stars and instants, each without refraction
(pressure 0) and with refraction at the site's pressure and temperature.

ERFA's atco13 goes ICRS -> observed place: proper motion from J2000.0, light deflection, annual
and diurnal aberration, IAU 2006/2000A precession-nutation, Earth rotation, refraction.
Conventions fixed here so the TypeScript side can match them:
  - UT1 - UTC = 0 (dut1 = 0) and polar motion xp = yp = 0;
  - parallax 0 and radial velocity 0 (stars at infinity);
  - relative humidity 0 and wavelength 0.55 um (visual).

Usage: /usr/bin/python3 test/reference/erfa_topocentric.py [output.json]
The output is deterministic for a given ERFA version (fixed seed).
"""
import json
import math
import random
import sys

import warnings

import erfa

# ERFA flags instants past its leap-second table as 'dubious year'; it then assumes no new leap
# seconds, which is also what the TypeScript side assumes.
warnings.filterwarnings("ignore", category=erfa.ErfaWarning)

SEED = 20261201
CASES = 240
OUT = sys.argv[1] if len(sys.argv) > 1 else __file__.replace("erfa_topocentric.py", "erfa-topocentric.json")
MAS = math.pi / 180 / 3_600_000


def standard_atmosphere(h_m):
    """ICAO / U.S. Standard Atmosphere 1976 troposphere: pressure hPa, temperature C."""
    t_k = 288.15 - 0.0065 * h_m
    p = 1013.25 * (t_k / 288.15) ** 5.25588
    return p, t_k - 273.15


def observed(utc1, utc2, ra, dec, pr, pd, site, phpa):
    aob, zob, hob, dob, rob, eo = erfa.atco13(
        ra, dec, pr, pd, 0.0, 0.0, utc1, utc2, 0.0,
        math.radians(site["longitudeDeg"]), math.radians(site["latitudeDeg"]), site["elevationM"],
        0.0, 0.0, phpa, site["temperatureC"], 0.0, 0.55)
    return {
        "altDeg": 90 - math.degrees(zob),
        "azDeg": math.degrees(aob) % 360,
        "hourAngleDeg": math.degrees(hob),
        "decDeg": math.degrees(dob),
    }


def main():
    rng = random.Random(SEED)
    cases = []
    while len(cases) < CASES:
        lat = math.degrees(math.asin(rng.uniform(-math.sin(math.radians(75)), math.sin(math.radians(75)))))
        site = {"latitudeDeg": lat, "longitudeDeg": rng.uniform(-180, 180), "elevationM": rng.uniform(0, 5000)}
        p, t = standard_atmosphere(site["elevationM"])
        site["pressureHpa"] = p
        site["temperatureC"] = t + rng.uniform(-8, 8)
        ra = rng.uniform(0, 2 * math.pi)
        dec = math.asin(rng.uniform(-1, 1))
        pm_ra_star = rng.uniform(-800, 800)  # mas/yr, mu_alpha* = mu_alpha cos(dec)
        pm_dec = rng.uniform(-800, 800)
        # A UTC instant between 2020 and 2035, whole milliseconds.
        ms = rng.randrange(1_577_836_800_000, 2_051_222_400_000)
        iy, im, id_, ihmsf = erfa.d2dtf("UTC", 3, 2440587.5, ms / 86_400_000)
        utc = "%04d-%02d-%02dT%02d:%02d:%02d.%03dZ" % (iy, im, id_, *ihmsf)
        utc1, utc2 = erfa.dtf2d("UTC", iy, im, id_, ihmsf[0], ihmsf[1], ihmsf[2] + ihmsf[3] / 1000)
        geo = observed(utc1, utc2, ra, dec, pm_ra_star * MAS / math.cos(dec), pm_dec * MAS, site, 0.0)
        if geo["altDeg"] < 3:  # keep stars above the horizon: that is what the engine is used for
            continue
        refr = observed(utc1, utc2, ra, dec, pm_ra_star * MAS / math.cos(dec), pm_dec * MAS, site, p)
        cases.append({
            "utc": utc,
            "site": site,
            "star": {"raDeg": math.degrees(ra), "decDeg": math.degrees(dec), "pmRaMasYr": pm_ra_star,
                     "pmDecMasYr": pm_dec, "epoch": "J2000.0"},
            "geometric": geo,
            "refracted": refr,
        })
    # TAI - UTC on the first day of each January and July, for the leap-second table of the engine.
    leap = []
    for year in range(1972, 2036):
        for month in (1, 7):
            leap.append({"date": "%04d-%02d-01" % (year, month), "taiMinusUtcS": erfa.dat(year, month, 1, 0.0)})
    doc = {
        "source": "ERFA %s via python3-erfa %s, erfa.atco13" % (erfa.version.erfa_version, erfa.__version__),
        "generator": "test/reference/erfa_topocentric.py",
        "conventions": {"dut1": 0, "polarMotion": 0, "parallax": 0, "radialVelocity": 0,
                        "relativeHumidity": 0, "wavelengthUm": 0.55, "catalogueEpoch": "J2000.0 (TDB)"},
        "seed": SEED,
        "leapSeconds": leap,
        "cases": cases,
    }
    with open(OUT, "w") as f:
        json.dump(doc, f, indent=1)
        f.write("\n")
    print("wrote %d cases to %s" % (len(cases), OUT))


if __name__ == "__main__":
    main()

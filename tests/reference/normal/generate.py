"""Reference values for server/stats/normal.ts.

Prints (to values.json) the standard normal cdf, upper tail and quantile at many points, from
scipy (scipy.special.ndtr, scipy.stats.norm.sf, scipy.special.ndtri) and, as the ground truth,
mpmath at 60 significant digits. Run with Debian's python3-scipy and python3-mpmath:

    /usr/bin/python3 tests/reference/normal/generate.py > tests/reference/normal/values.json
"""
import json
import sys

import mpmath
import numpy
import scipy
from scipy import special, stats

mpmath.mp.dps = 60

zs = sorted(
    set(
        [round(-38 + 0.25 * i, 2) for i in range(0, 305)]  # -38 .. 38 in steps of 0.25
        + [-37.5, -37.0, -20.0, -8.0, -1e-10, 0.0, 1e-10, 0.1, 0.3, 0.6744897, 0.6744898, 1.959963984540054,
           2.5758293035489, 5.65, 5.66, 8.0, 8.3, 20.0, 37.0, 37.5]
    )
)


def cdf(z):
    return mpmath.ncdf(mpmath.mpf(z))


rows = []
for z in zs:
    lower = cdf(z)
    upper = cdf(-z)  # P(Z > z) = P(Z < -z), exact by symmetry
    rows.append(
        {
            "z": z,
            "cdf": float(lower),
            "sf": float(upper),
            "scipyNdtr": float(special.ndtr(z)),
            "scipySf": float(stats.norm.sf(z)),
        }
    )

ps = sorted(
    set(
        [1e-300, 1e-200, 1e-100, 1e-50, 1e-20, 1e-16, 1e-12, 1.3887e-11, 1.3889e-11, 1e-10, 1e-8, 1e-6, 1e-4, 0.001, 0.0025,
         0.005, 0.01, 0.025, 0.05, 0.07, 0.075, 0.08, 0.1, 0.2, 0.3, 0.4, 0.45, 0.5, 0.55, 0.6, 0.7, 0.8, 0.9, 0.925, 0.93,
         0.95, 0.975, 0.99, 0.995, 0.999, 0.9999, 1 - 1e-8, 1 - 1e-12]
    )
)
quantiles = []
for p in ps:
    # The quantile of the double nearest p (p as stored), solved with mpmath's erfinv.
    mp_p = mpmath.mpf(p)
    q = mpmath.sqrt(2) * mpmath.erfinv(2 * mp_p - 1) if 1e-15 < p < 1 - 1e-15 else None
    if q is None:
        q = mpmath.findroot(lambda x: mpmath.ncdf(x) - mp_p, special.ndtri(p))
    quantiles.append({"p": p, "quantile": float(q), "scipyNdtri": float(special.ndtri(p))})

json.dump(
    {
        "source": "tests/reference/normal/generate.py",
        "versions": {"python": sys.version.split()[0], "numpy": numpy.__version__, "scipy": scipy.__version__,
                     "mpmath": mpmath.__version__},
        "points": rows,
        "quantiles": quantiles,
    },
    sys.stdout,
    indent=1,
)
print()

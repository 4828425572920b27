"""Long-term frequency aging of a crystal (logarithmic law)."""

from __future__ import annotations

import numpy as np

from picker.physics._arrays import ArrayLike, FloatArray, to_float

SECONDS_PER_DAY = 86400.0


def aging_ppm(first_year_ppm: ArrayLike, t_s: ArrayLike, b_per_day: ArrayLike = 0.1) -> FloatArray:
    """Aging after a time t, fitted to the part's first-year figure.

    Parameters
    ----------
    first_year_ppm : aging in the first year, X [ppm] (its sign is kept)
    t_s : time since the reference point [s]
    b_per_day : time-scale constant B of the log law [1/day]

    Returns
    -------
    aging : A·ln(B·t + 1) [ppm], with A = X / ln(365·B + 1) so the first year gives X

    Notes
    -----
    The log law f(t) = A·ln(B·t + 1) is the aging model of MIL-PRF-55310. With
    B = 0.1/day, 10 years gives about 1.63·X.

    Examples
    --------
    Ten years of a part rated ±3 ppm in its first year:

    >>> round(float(aging_ppm(3.0, 10 * 365 * 86400.0)), 2)
    4.89
    """
    x = np.asarray(first_year_ppm, dtype=np.float64)
    b = np.asarray(b_per_day, dtype=np.float64)
    t_days = np.asarray(t_s, dtype=np.float64) / SECONDS_PER_DAY
    a = x / np.log(365.0 * b + 1.0)
    result = np.asarray(a * np.log(b * t_days + 1.0), dtype=np.float64)
    return to_float(result)

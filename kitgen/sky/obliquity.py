"""Mean obliquity of the ecliptic, IAU 2006 (Capitaine, Wallace & Chapront
2003, A&A 412, 567, eq. 39; adopted by IAU 2006 Resolution B1; SOFA/ERFA
routine OBL06)."""

from __future__ import annotations

import numpy as np

from .constants import ARCSEC_TO_RAD


def mean_obliquity_rad(t_centuries_tt):
    """Mean obliquity of the ecliptic in radians at ``t_centuries_tt``
    Julian centuries of TT from J2000.0:

    84381.406" - 46.836769" T - 0.0001831" T^2 + 0.00200340" T^3
    - 0.000000576" T^4 - 0.0000000434" T^5.
    """
    t = np.asarray(t_centuries_tt, dtype=float)
    arcsec = (84381.406 + t * (-46.836769 + t * (-0.0001831 + t * (0.00200340
              + t * (-0.000000576 + t * (-0.0000000434))))))
    return arcsec * ARCSEC_TO_RAD

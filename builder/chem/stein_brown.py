"""Stein & Brown (1994) non-linear correction applied to the Joback Tb sum.

Contents
--------
- ``stein_brown_correction(tb_K)``: the published piecewise correction.
- ``joback_stein_brown(mol_or_smiles)``: Joback groups (``joback.py``),
  Joback's own increments, then the correction.

Which groups are used
---------------------
Stein and Brown refitted the increments of an extended Joback group set to
4426 compounds before applying their correction.  This module does **not**
use those refitted groups: it applies only the Stein-Brown correction to the
sum computed with the original Joback & Reid (1987) increments.  The method
is therefore named "Joback + Stein-Brown correction", not "Stein-Brown".

References
----------
.. [1] Stein, S. E.; Brown, R. L. "Estimation of Normal Boiling Points from
   Group Contributions." J. Chem. Inf. Comput. Sci. 1994, 34, 581-587.
   doi:10.1021/ci00019a016.
.. [2] Joback, K. G.; Reid, R. C. Chem. Eng. Commun. 1987, 57, 233-243.
   doi:10.1080/00986448708960487.
"""

from __future__ import annotations

from dataclasses import dataclass

from rdkit import Chem

from builder.chem.joback import STATUS_OK, joback

SWITCH_K = 700.0
"""Uncorrected Tb [K] above which the linear branch of the correction applies."""


def stein_brown_correction(tb_K: float) -> float:
    r"""Correct a group-contribution boiling point by Stein & Brown (1994).

    .. math::
        T_b^{corr} = \begin{cases}
            T_b - 94.84 + 0.5577\,T_b - 0.0007705\,T_b^2 & T_b \le 700 \\
            T_b + 282.7 - 0.5209\,T_b & T_b > 700
        \end{cases}

    Parameters
    ----------
    tb_K : float
        Uncorrected boiling point, 198.2 K plus the group sum [K]

    Returns
    -------
    float
        Corrected normal boiling point [K]

    Notes
    -----
    The two branches differ by 0.07 K at 700 K.  With their refitted groups,
    Stein and Brown report an average absolute error of 15.5 K (3.2 %) over
    4426 training compounds and 20.4 K (4.3 %) over 6584 test compounds [1]_
    (figures from memory).  Applied here to Joback's original increments the
    held-out error on CRC Handbook data is about 19 K (see
    ``boiling_validation.json``).  Constants as quoted in the open
    implementation of the UManSysProp project, not re-read from the paper.

    Examples
    --------
    n-Hexane: Joback gives 336.88 K; corrected 342.5 K (measured 341.9 K):

    >>> round(stein_brown_correction(336.88), 1)
    342.5

    References
    ----------
    .. [1] Stein, S. E.; Brown, R. L. J. Chem. Inf. Comput. Sci. 1994, 34,
       581-587. doi:10.1021/ci00019a016.
    """
    if tb_K <= SWITCH_K:
        return tb_K - 94.84 + 0.5577 * tb_K - 0.0007705 * tb_K * tb_K
    return tb_K + 282.7 - 0.5209 * tb_K


@dataclass(frozen=True)
class SteinBrownResult:
    """Joback + Stein-Brown estimate; ``tb_K`` None when Joback failed."""

    tb_K: float | None
    joback_tb_K: float | None
    status: str


def joback_stein_brown(mol_or_smiles: Chem.Mol | str) -> SteinBrownResult:
    """Estimate Tb [K] with Joback groups and the Stein-Brown correction."""
    result = joback(mol_or_smiles)
    if result.tb_K is None or result.status != STATUS_OK:
        return SteinBrownResult(None, None, result.status)
    return SteinBrownResult(stein_brown_correction(result.tb_K), result.tb_K, STATUS_OK)

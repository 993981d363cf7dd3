"""Report number formatting: the vectorized significant-digit rounding."""

from __future__ import annotations

import math

import numpy as np
import pytest

from stanchion.service.reports.report import _sig, _sig_columns


def _reference(x: float, digits: int) -> float | None:
    """Round to significant digits with Python's decimal formatting (common practice, no
    source): ``float(f"{x:.{digits - 1}e}")``."""
    if not math.isfinite(x):
        return None
    return float(f"{x:.{digits - 1}e}")


@pytest.mark.parametrize("digits", [4, 6])
def test_columns_round_like_decimal_formatting(digits: int) -> None:
    rng = np.random.default_rng(7)
    # forces in N reach 1e7, stresses in Pa 1e9, utilizations 1e-3: both rounding branches
    values = rng.uniform(-1, 1, 4000) * 10.0 ** rng.integers(-6, 10, 4000)
    got = _sig_columns([values], [digits])[0]
    for x, g in zip(values.tolist(), got, strict=True):
        assert g == pytest.approx(_reference(x, digits), rel=1e-12, abs=0), x


def test_zero_nan_and_infinity_in_some_columns_only() -> None:
    a = np.array([0.0, 1234.5678, float("nan")])
    b = np.array([2.0, float("inf"), -0.000123456])
    got = _sig_columns([a, b], [4, 3])
    assert got == [[0.0, 1235.0, None], [2.0, None, -0.000123]]  # by hand
    assert got[0][:2] == [_sig(0.0, 4), _sig(1234.5678, 4)]


def test_all_finite_nonzero_columns_match_the_scalar_rounding() -> None:
    cols = [np.array([1.0, 2.5, 987654321.0]), np.array([0.1, 3.14159, 7e-5])]
    assert _sig_columns(cols, [6, 3]) == [[_sig(x, 6) for x in cols[0]],
                                         [_sig(x, 3) for x in cols[1]]]


def test_no_rows() -> None:
    assert _sig_columns([np.zeros(0), np.zeros(0)], [4, 6]) == [[], []]


def test_very_large_and_very_small_values_keep_their_digits() -> None:
    # 10**k is not exact beyond 1e22, so multiplying by it left 1.4000000000000002e+30;
    # the expected values are the decimal texts themselves (by hand).
    got = _sig_columns([np.array([1.4e30, -2.345678e25, 1.23456789e-30])], [6])[0]
    assert got == [1.4e30, -2.34568e25, 1.23457e-30]
    assert [repr(x) for x in got] == ["1.4e+30", "-2.34568e+25", "1.23457e-30"]


def test_scalar_rounding_is_the_column_rounding() -> None:
    # summary.max_utilization (_sig) must equal the row's utilization (_sig_columns).
    # By hand: the float 0.70475 x 1e4 is 7047.5, which np.round takes to 7048, so the rows
    # say 0.7048; Python's round(0.70475, 4) said 0.7047 (the float is 0.704749999...).
    values = [0.70475, 1.4e30, -2.345678e25, 123.4565, 6972.0]
    assert [_sig(x, 4) for x in values] == _sig_columns([np.array(values)], [4])[0]
    assert _sig(0.70475, 4) == 0.7048

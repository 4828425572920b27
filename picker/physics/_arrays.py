"""Shared array helpers for the physics modules: float conversion and shape handling."""

from __future__ import annotations

from typing import Any, TypeAlias, cast

import numpy as np
import numpy.typing as npt

ArrayLike: TypeAlias = npt.ArrayLike
FloatArray: TypeAlias = npt.NDArray[np.float64]
BoolArray: TypeAlias = npt.NDArray[np.bool_]
ComplexArray: TypeAlias = npt.NDArray[np.complex128]


def as_float(value: ArrayLike) -> FloatArray:
    """``value`` as a float64 array (no copy when it already is one)."""
    return np.asarray(value, dtype=np.float64)


def squeeze(result: npt.NDArray[Any]) -> Any:
    """A 0-d array as a numpy scalar, so that a float in gives a float-like out."""
    return result[()] if result.ndim == 0 else result


def to_float(result: npt.ArrayLike) -> FloatArray:
    """Final float result of a physics function, 0-d arrays as numpy scalars."""
    return cast(FloatArray, squeeze(np.asarray(result, dtype=np.float64)))


def to_bool(result: npt.ArrayLike) -> BoolArray:
    """Final boolean result of a physics function, 0-d arrays as numpy scalars."""
    return cast(BoolArray, squeeze(np.asarray(result, dtype=bool)))


def to_complex(result: npt.ArrayLike) -> ComplexArray:
    """Final complex result of a physics function, 0-d arrays as numpy scalars."""
    return cast(ComplexArray, squeeze(np.asarray(result, dtype=np.complex128)))

"""strake from Python: the Darboux frame of a curve on a freeform surface and its invariants
(normal curvature, geodesic curvature, geodesic torsion) with the surface's principal
curvatures, over whole paths at once into numpy arrays.

The library (libstrake.so) ships inside this package and is loaded with ctypes. Conventions,
units and signs are strake's (see strake.h): N = sigma Su x Sv / |Su x Sv|, T = c'/|c'|,
B = N x T; kn = c''.N/|c'|^2, kg = c''.B/|c'|^2, tg = II(T, B); lengths in your unit,
curvatures in 1/length.

Frames come back as structured arrays of :data:`FRAME_DTYPE` (one record per point, the fields
of StrakeFrame: ``f["normal_curvature"]``, ``f["point"]`` of shape (n, 3), ...), samples as
:data:`SAMPLE_DTYPE` (``s["frame"]``, ``s["arc_length"]``). Every function that fills an array
takes ``out=`` to reuse one. Every failure raises a subclass of :class:`StrakeError` carrying
the status and strake's message (which argument, index, value or sample was wrong). Handles
free themselves when garbage-collected (or at ``close()`` / the end of a ``with`` block).
"""

from __future__ import annotations

import ctypes
from typing import Callable, Optional, Sequence, Union

import numpy as np
import numpy.typing as npt

from . import _lib
from ._lib import FRAME_DTYPE, SAMPLE_DTYPE, VIOLATION_DTYPE

__all__ = [
    "FRAME_DTYPE",
    "SAMPLE_DTYPE",
    "VIOLATION_DTYPE",
    "StrakeError",
    "ArgumentError",
    "NurbsDataError",
    "EvaluationError",
    "CallbackError",
    "InternalError",
    "Surface",
    "Curve",
    "frame_at",
    "frames_at",
    "frames_even",
    "samples_at",
    "sample_even_t",
    "sample_even_arc",
    "sample_chordal",
    "arc_length",
    "path_extremes",
    "path_violations",
    "version",
    "dtype",
    "BALL",
    "FLAT",
    "TOROIDAL",
    "ALONG_NORMAL",
    "AGAINST_NORMAL",
    "check_gouge_path",
    "check_rear_gouge_path",
    "check_scallop_path",
    "check_step_over_cutter_path",
    "check_feed_path",
    "check_fibre_path",
    "check_tow_edges_path",
    "tool_axis_path",
]

#: Cutter kinds (StrakeCutter.kind) and tool sides (the ``tool_side`` arguments).
BALL, FLAT, TOROIDAL = 0, 1, 2
ALONG_NORMAL, AGAINST_NORMAL = 0, 1

ArrayLike = npt.ArrayLike
SurfaceFunction = Callable[[float, float, int], ArrayLike]

_BUFFER_TOO_SMALL = 4


class StrakeError(Exception):
    """A strake call failed. ``status`` is the StrakeStatus number, ``status_name`` its C name,
    ``message`` strake's message, ``callback_code`` the host callback's code (0 if none)."""

    def __init__(self, status: int, message: str, callback_code: int = 0) -> None:
        super().__init__(message)
        self.status = status
        self.status_name = _lib.lib.strake_status_name(status).decode()
        self.message = message
        self.callback_code = callback_code


class ArgumentError(StrakeError, ValueError):
    """Statuses 1-9: a NULL or misaligned pointer, an invalid or non-finite argument."""


class NurbsDataError(StrakeError, ValueError):
    """Statuses 10-19: degree, knots, control points or weights that do not make a NURBS."""


class EvaluationError(StrakeError):
    """Statuses 20-29: out of domain, degenerate surface point, stalled curve, too far from
    the surface, an iteration that did not converge."""


class CallbackError(StrakeError):
    """Statuses 30-39: a host callback failed (for a Python callback: it raised; the message
    holds the exception's type and text)."""


class InternalError(StrakeError):
    """Statuses 90-99: a bug in strake (a panic caught at the C boundary)."""


def _error_class(status: int) -> type:
    if status < 10:
        return ArgumentError
    if status < 20:
        return NurbsDataError
    if status < 30:
        return EvaluationError
    if status < 40:
        return CallbackError
    return InternalError


def _message() -> str:
    n = _lib.lib.strake_last_error_message(None, 0)
    buf = ctypes.create_string_buffer(n)
    _lib.lib.strake_last_error_message(buf, n)
    return buf.value.decode("utf-8", "replace")


def _check(status: int) -> None:
    if status != 0:
        code = _lib.lib.strake_last_callback_code() if 30 <= status < 40 else 0
        raise _error_class(status)(status, _message(), code)


def version() -> str:
    """The library's version (as Cargo.toml)."""
    return _lib.lib.strake_version().decode()


def _doubles(a: ArrayLike, name: str, shape_tail: tuple = ()) -> np.ndarray:
    arr = np.ascontiguousarray(a, dtype=np.float64)
    if shape_tail and (arr.ndim != 1 + len(shape_tail) or arr.shape[1:] != shape_tail):
        raise ArgumentError(2, f"`{name}` must have shape (n, {', '.join(map(str, shape_tail))}), got {arr.shape}")
    if not shape_tail and arr.ndim != 1:
        raise ArgumentError(2, f"`{name}` must be one-dimensional, got shape {arr.shape}")
    return arr


def _ptr(arr: Optional[np.ndarray]):
    if arr is None:
        return None
    return arr.ctypes.data_as(_lib.PD)


def _out(out: Optional[np.ndarray], n: int, dtype: np.dtype, tail: tuple = ()) -> np.ndarray:
    shape = (n,) + tail
    if out is None:
        return np.empty(shape, dtype=dtype)
    if not isinstance(out, np.ndarray) or out.dtype != dtype or out.shape != shape:
        raise ArgumentError(2, f"`out` must be a numpy array of shape {shape} and dtype {dtype}")
    if not out.flags.c_contiguous or not out.flags.writeable:
        raise ArgumentError(2, "`out` must be C-contiguous and writeable")
    return out


class _Handle:
    _free: Callable
    _h: Optional[int]

    def close(self) -> None:
        """Frees the handle now (also done when the object is garbage-collected)."""
        h, self._h = getattr(self, "_h", None), None
        if h:
            type(self)._free(h)

    def __del__(self) -> None:
        try:
            self.close()
        except Exception:  # interpreter shutdown
            pass

    def __enter__(self):
        return self

    def __exit__(self, *exc) -> None:
        self.close()

    @property
    def handle(self) -> int:
        if not self._h:
            raise ArgumentError(1, f"this {type(self).__name__} was closed")
        return self._h


class Surface(_Handle):
    """A surface strake holds: a native NURBS surface or a Python function."""

    _free = staticmethod(_lib.lib.strake_surface_free)

    def __init__(self) -> None:
        raise TypeError("use Surface.nurbs(...) or Surface.from_function(...)")

    @classmethod
    def _wrap(cls, h: int, keep=None) -> "Surface":
        s = object.__new__(cls)
        s._h = h
        s._keep = keep
        return s

    @classmethod
    def nurbs(
        cls,
        degree_u: int,
        degree_v: int,
        knots_u: ArrayLike,
        knots_v: ArrayLike,
        points: ArrayLike,
        weights: Optional[ArrayLike] = None,
        flip_normal: bool = False,
    ) -> "Surface":
        """A NURBS surface: ``points`` of shape (count_u, count_v, 3), ``weights`` of shape
        (count_u, count_v) or None (non-rational)."""
        p = np.ascontiguousarray(points, dtype=np.float64)
        if p.ndim != 3 or p.shape[2] != 3:
            raise ArgumentError(2, f"`points` must have shape (count_u, count_v, 3), got {p.shape}")
        ku, kv = _doubles(knots_u, "knots_u"), _doubles(knots_v, "knots_v")
        w = None if weights is None else np.ascontiguousarray(weights, dtype=np.float64)
        if w is not None and w.shape != p.shape[:2]:
            raise ArgumentError(2, f"`weights` must have shape {p.shape[:2]}, got {w.shape}")
        data = _lib.NurbsSurfaceData(degree_u, degree_v, p.shape[0], p.shape[1], _ptr(ku), ku.size,
                                     _ptr(kv), kv.size, _ptr(p), _ptr(w))
        h = ctypes.c_void_p()
        _check(_lib.lib.strake_surface_new_nurbs(ctypes.byref(data), int(bool(flip_normal)), ctypes.byref(h)))
        return cls._wrap(h.value)

    @classmethod
    def from_function(
        cls,
        f: SurfaceFunction,
        u_range: Sequence[float],
        v_range: Sequence[float],
        flip_normal: bool = False,
    ) -> "Surface":
        """A surface evaluated by ``f(u, v, order)``, which returns an array of shape (k, 3)
        with k = 1, 3 or 6 rows: S, then Su, Sv, then Suu, Suv, Svv (at least the rows
        ``order`` needs: 1 for order 0, 3 for order 1, 6 for order 2). To refuse a point,
        raise: the exception's type and text reach the caller in a :class:`CallbackError`.
        The function may be called from several threads at once by ``frames_at(threads=...)``.
        """

        def trampoline(_user, u, v, order, jet):
            try:
                rows = np.asarray(f(u, v, order), dtype=np.float64)
                need = (1, 3, 6)[order]
                if rows.ndim != 2 or rows.shape[1] != 3 or not need <= rows.shape[0] <= 6:
                    raise ValueError(
                        f"the surface function must return an array of shape (k, 3) with "
                        f"{need} <= k <= 6 rows for order {order}, got shape {rows.shape}")
                ctypes.memmove(jet, rows.ctypes.data, min(rows.shape[0], 6) * 24)
                return 0
            except BaseException as e:  # never let an exception unwind into C
                text = f"{type(e).__name__}: {e}".encode("utf-8", "replace")
                _lib.lib.strake_callback_report(text)
                return -1

        cb = _lib.SURFACE_FN(trampoline)
        h = ctypes.c_void_p()
        _check(_lib.lib.strake_surface_from_callback(
            cb, None, float(u_range[0]), float(u_range[1]), float(v_range[0]), float(v_range[1]),
            int(bool(flip_normal)), ctypes.byref(h)))
        return cls._wrap(h.value, keep=(cb, f))

    def evaluate(self, uv: ArrayLike, order: int = 2, out: Optional[np.ndarray] = None) -> np.ndarray:
        """The point and partials to ``order`` at the (u, v) rows of ``uv`` (shape (n, 2)):
        an array of shape (n, 6, 3), rows S, Su, Sv, Suu, Suv, Svv; rows above ``order`` are
        zero. ``out`` (float64, (n, 6, 3)) is filled and returned when given."""
        a = _doubles(uv, "uv", (2,))
        o = _out(out, a.shape[0], np.dtype(np.float64), (6, 3))
        _check(_lib.lib.strake_surface_evaluate(self.handle, _ptr(a), a.shape[0], order, o.ctypes.data))
        return o


class Curve(_Handle):
    """A curve (u(t), v(t)) in a surface's parameter plane."""

    _free = staticmethod(_lib.lib.strake_curve_free)

    def __init__(self) -> None:
        raise TypeError("use Curve.nurbs(...), Curve.line(...) or Curve.through_uv_points(...)")

    @classmethod
    def _wrap(cls, h: int) -> "Curve":
        c = object.__new__(cls)
        c._h = h
        return c

    @classmethod
    def nurbs(cls, degree: int, knots: ArrayLike, uv_points: ArrayLike,
              weights: Optional[ArrayLike] = None) -> "Curve":
        """A NURBS curve: ``uv_points`` of shape (n, 2), ``weights`` of shape (n,) or None."""
        k, p = _doubles(knots, "knots"), _doubles(uv_points, "uv_points", (2,))
        w = None if weights is None else _doubles(weights, "weights")
        h = ctypes.c_void_p()
        _check(_lib.lib.strake_curve_new_nurbs(degree, _ptr(k), k.size, _ptr(p), p.shape[0], _ptr(w),
                                               ctypes.byref(h)))
        return cls._wrap(h.value)

    @classmethod
    def line(cls, start: Sequence[float], end: Sequence[float]) -> "Curve":
        """The straight line from (u, v) = start at t = 0 to end at t = 1."""
        return cls.nurbs(1, [0.0, 0.0, 1.0, 1.0], [start, end])

    @classmethod
    def through_uv_points(cls, uv_points: ArrayLike, degree: int = 3, centripetal: bool = False) -> "Curve":
        """The interpolating B-spline of ``degree`` through the (n, 2) points (chord-length or
        centripetal parameters)."""
        p = _doubles(uv_points, "uv_points", (2,))
        h = ctypes.c_void_p()
        _check(_lib.lib.strake_curve_through_uv_points(_ptr(p), p.shape[0], degree, int(centripetal),
                                                       None, None, ctypes.byref(h)))
        return cls._wrap(h.value)


def frame_at(surface: Surface, curve: Curve, t: float) -> np.void:
    """The frame at one t (a record of :data:`FRAME_DTYPE`)."""
    out = np.empty(1, dtype=FRAME_DTYPE)
    _check(_lib.lib.strake_frame_at(surface.handle, curve.handle, float(t), out.ctypes.data))
    return out[0]


def frames_at(surface: Surface, curve: Curve, ts: ArrayLike, out: Optional[np.ndarray] = None,
              threads: int = 1) -> np.ndarray:
    """The frames at the parameters ``ts`` (one call for the whole path) into a structured
    array of :data:`FRAME_DTYPE`; ``threads`` > 1 spreads the work over that many threads."""
    t = _doubles(ts, "ts")
    o = _out(out, t.size, FRAME_DTYPE)
    if threads == 1:
        _check(_lib.lib.strake_frames_at(surface.handle, curve.handle, _ptr(t), t.size, o.ctypes.data))
    else:
        _check(_lib.lib.strake_frames_at_parallel(surface.handle, curve.handle, _ptr(t), t.size,
                                                  threads, o.ctypes.data))
    return o


def frames_even(surface: Surface, curve: Curve, n: int, out: Optional[np.ndarray] = None) -> np.ndarray:
    """The frames at ``n`` evenly spaced parameters over the curve's domain, ends included."""
    o = _out(out, n, FRAME_DTYPE)
    _check(_lib.lib.strake_frames_even(surface.handle, curve.handle, n, o.ctypes.data))
    return o


def samples_at(surface: Surface, curve: Curve, ts: ArrayLike, arc_tolerance: float = 1e-10,
               out: Optional[np.ndarray] = None) -> np.ndarray:
    """The frames at ``ts`` with each one's arc length from the start of the curve's domain,
    as :data:`SAMPLE_DTYPE` records (ready for :func:`path_extremes`)."""
    t = _doubles(ts, "ts")
    o = _out(out, t.size, SAMPLE_DTYPE)
    _check(_lib.lib.strake_samples_at(surface.handle, curve.handle, _ptr(t), t.size,
                                      float(arc_tolerance), o.ctypes.data))
    return o


def _fill(call, dtype: np.dtype) -> np.ndarray:
    count = ctypes.c_size_t(0)
    st = call(None, 0, ctypes.byref(count))
    if st != _BUFFER_TOO_SMALL:
        _check(st)
    out = np.empty(count.value, dtype=dtype)
    if count.value:
        _check(call(out.ctypes.data, out.size, ctypes.byref(count)))
    return out[: count.value]


def sample_even_t(surface: Surface, curve: Curve, n: int, arc_tolerance: float = 1e-10) -> np.ndarray:
    """``n`` samples evenly spaced in t, with arc lengths."""
    return _fill(lambda b, c, k: _lib.lib.strake_sample_even_t(surface.handle, curve.handle, n,
                                                               arc_tolerance, b, c, k), SAMPLE_DTYPE)


def sample_even_arc(surface: Surface, curve: Curve, n: int, arc_tolerance: float = 1e-10) -> np.ndarray:
    """``n`` samples evenly spaced in arc length."""
    return _fill(lambda b, c, k: _lib.lib.strake_sample_even_arc(surface.handle, curve.handle, n,
                                                                 arc_tolerance, b, c, k), SAMPLE_DTYPE)


def sample_chordal(surface: Surface, curve: Curve, chord_tolerance: float, max_step: float,
                   arc_tolerance: float = 1e-10) -> np.ndarray:
    """Samples spaced so that each chord stays within ``chord_tolerance`` of the path."""
    return _fill(lambda b, c, k: _lib.lib.strake_sample_chordal(
        surface.handle, curve.handle, chord_tolerance, max_step, arc_tolerance, b, c, k), SAMPLE_DTYPE)


def arc_length(surface: Surface, curve: Curve, t0: float, t1: float, rel_tol: float = 1e-10) -> float:
    """The (signed) arc length between t0 and t1."""
    s = ctypes.c_double()
    _check(_lib.lib.strake_arc_length(surface.handle, curve.handle, t0, t1, rel_tol, ctypes.byref(s)))
    return s.value


def _samples(samples: np.ndarray, values: ArrayLike) -> tuple:
    if not isinstance(samples, np.ndarray) or samples.dtype != SAMPLE_DTYPE or samples.ndim != 1:
        raise ArgumentError(2, "`samples` must be a one-dimensional array of SAMPLE_DTYPE")
    s = np.ascontiguousarray(samples)
    v = _doubles(values, "values")
    if v.size != s.size:
        raise ArgumentError(2, f"`values` has {v.size} entries for {s.size} samples")
    return s, v


def path_extremes(samples: np.ndarray, values: ArrayLike) -> dict:
    """Where ``values`` (one per sample) are smallest and largest: a dict with min, min_index,
    min_arc_length, min_t, max, max_index, max_arc_length, max_t."""
    s, v = _samples(samples, values)
    e = _lib.Extremes()
    _check(_lib.lib.strake_path_extremes(s.ctypes.data, _ptr(v), s.size, ctypes.byref(e)))
    return {name: getattr(e, name) for name, _ in _lib.Extremes._fields_}


def path_violations(samples: np.ndarray, values: ArrayLike, limit: float) -> np.ndarray:
    """Every interval where ``values`` exceed ``limit``, as :data:`VIOLATION_DTYPE` records."""
    s, v = _samples(samples, values)
    return _fill(lambda b, c, k: _lib.lib.strake_path_violations(s.ctypes.data, _ptr(v), s.size,
                                                                 float(limit), b, c, k), VIOLATION_DTYPE)


def dtype(struct_name: str) -> np.dtype:
    """The numpy dtype of a struct of strake.h, e.g. ``dtype("StrakeGougeState")``, read from
    the header shipped with the package (fields, offsets and size as in C)."""
    try:
        return _lib.STRUCTS[struct_name]
    except KeyError:
        raise ArgumentError(2, f"strake.h has no struct `{struct_name}`") from None


def _record(struct_name: str, value, arg: str) -> np.ndarray:
    """A one-element array of the struct from a dict of its fields (all of them)."""
    dt = dtype(struct_name)
    if not isinstance(value, dict) or set(value) != set(dt.names):
        raise ArgumentError(2, f"`{arg}` must be a dict with the fields {', '.join(dt.names)}")
    rec = np.zeros(1, dtype=dt)
    for k, v in value.items():
        rec[k] = v
    return rec


def _path_call(fname: str, result: Optional[str], samples: np.ndarray, args: tuple,
               out: Optional[np.ndarray]) -> np.ndarray:
    s, _ = _samples(samples, np.zeros(len(samples)))
    dt = np.dtype(np.float64) if result is None else dtype(result)
    o = _out(out, s.size, dt)
    _check(getattr(_lib.lib, fname)(s.ctypes.data, s.size, *args, o.ctypes.data))
    return o


def check_gouge_path(samples: np.ndarray, cutter: dict, angles: dict, tool_side: int = ALONG_NORMAL,
                     out: Optional[np.ndarray] = None) -> np.ndarray:
    """Local gouging at every sample (``strake_check_gouge_path``): StrakeGougeState records.
    ``cutter`` = {"kind", "radius", "corner_radius"}, ``angles`` = {"lead", "tilt"} (radians)."""
    c, a = _record("StrakeCutter", cutter, "cutter"), _record("StrakeToolAngles", angles, "angles")
    return _path_call("strake_check_gouge_path", "StrakeGougeState", samples,
                      (tool_side, c.ctypes.data, a.ctypes.data), out)


def check_rear_gouge_path(samples: np.ndarray, cutter: dict, angles: dict,
                          tool_side: int = ALONG_NORMAL, out: Optional[np.ndarray] = None) -> np.ndarray:
    """Rear (heel) gouging of a flat or toroidal cutter at every sample: StrakeRearGouge records."""
    c, a = _record("StrakeCutter", cutter, "cutter"), _record("StrakeToolAngles", angles, "angles")
    return _path_call("strake_check_rear_gouge_path", "StrakeRearGouge", samples,
                      (tool_side, c.ctypes.data, a.ctypes.data), out)


def check_scallop_path(samples: np.ndarray, cutter_radius: float, step_over: float,
                       tool_side: int = ALONG_NORMAL, out: Optional[np.ndarray] = None) -> np.ndarray:
    """Scallop height at every sample for passes ``step_over`` apart: StrakeScallop records."""
    return _path_call("strake_check_scallop_path", "StrakeScallop", samples,
                      (tool_side, float(cutter_radius), float(step_over)), out)


def check_step_over_cutter_path(samples: np.ndarray, cutter: dict, angles: dict, scallop_height: float,
                                tool_side: int = ALONG_NORMAL,
                                out: Optional[np.ndarray] = None) -> np.ndarray:
    """The largest step-over for ``scallop_height`` at every sample: StrakeCutterStepOver."""
    c, a = _record("StrakeCutter", cutter, "cutter"), _record("StrakeToolAngles", angles, "angles")
    return _path_call("strake_check_step_over_cutter_path", "StrakeCutterStepOver", samples,
                      (tool_side, c.ctypes.data, a.ctypes.data, float(scallop_height)), out)


def check_feed_path(samples: np.ndarray, limits: dict, out: Optional[np.ndarray] = None) -> np.ndarray:
    """The highest feed at every sample (float64): ``limits`` = {"feed", "max_acceleration",
    "max_jerk"}."""
    lim = _record("StrakeFeedLimits", limits, "limits")
    return _path_call("strake_check_feed_path", None, samples, (lim.ctypes.data,), out)


def check_fibre_path(samples: np.ndarray, limits: dict, out: Optional[np.ndarray] = None) -> np.ndarray:
    """Steering and twist at every sample: StrakeFibreState records; ``limits`` =
    {"tow_width", "min_steering_radius", "max_twist_rate"}."""
    lim = _record("StrakeFibreLimits", limits, "limits")
    return _path_call("strake_check_fibre_path", "StrakeFibreState", samples, (lim.ctypes.data,), out)


def check_tow_edges_path(samples: np.ndarray, tow_width: float,
                         out: Optional[np.ndarray] = None) -> np.ndarray:
    """The strain of a tow's two edges at every sample: StrakeTowEdges records."""
    return _path_call("strake_check_tow_edges_path", "StrakeTowEdges", samples, (float(tow_width),), out)


def tool_axis_path(samples: np.ndarray, angles: dict, tool_side: int = ALONG_NORMAL,
                   out: Optional[np.ndarray] = None) -> np.ndarray:
    """The tool axis at every sample: StrakeToolAxis records (``local``, ``space``)."""
    a = _record("StrakeToolAngles", angles, "angles")
    return _path_call("strake_tool_axis_path", "StrakeToolAxis", samples, (tool_side, a.ctypes.data), out)

"""strake from Python: the Darboux frame of a curve on a freeform surface and its invariants
(normal curvature, geodesic curvature, geodesic torsion) with the surface's principal
curvatures, over whole paths at once into numpy arrays; the checks a machining or
fibre-placement engineer asks of them; the tool-centre path and its feed; geodesics, offsets,
fibre courses, projected drive patterns and plans of passes.

The library (libstrake.so) ships inside this package and is loaded with ctypes. Conventions,
units and signs are strake's (see strake.h, shipped beside it): N = sigma Su x Sv / |Su x Sv|,
T = c'/|c'|, B = N x T; kn = c''.N/|c'|^2, kg = c''.B/|c'|^2, tg = II(T, B); lengths in your
unit, curvatures in 1/length, angles in radians.

Every struct of strake.h has a numpy dtype read from the shipped header (:func:`dtype`), so
the layouts are those of the library actually loaded. Frames come back as structured arrays
of :data:`FRAME_DTYPE` (one record per point, ``f["normal_curvature"]``, ``f["point"]`` of
shape (n, 3), ...), samples as :data:`SAMPLE_DTYPE` (``s["frame"]``, ``s["arc_length"]``),
whole-path results as arrays of the result struct's dtype; single results as dicts of the
struct's fields. Every function that fills an array of known size takes ``out=`` to reuse
one. Options are keyword arguments named after the fields of the C options struct; a field
not given is 0, which the header documents as the default.

Every failure raises a subclass of :class:`StrakeError` (one per status family: arguments,
NURBS data, evaluation, host callbacks, tool path, planning, internal) carrying the status and
strake's message (which argument, index, value or sample was wrong). Handles (surfaces,
curves, offsets, drive results, pass plans) free themselves when garbage-collected, or at
``close()`` / the end of a ``with`` block.

The named constants of the header's enums are IntEnum classes (:class:`Status`,
:class:`ToolSide`, :class:`CutterKind`, :class:`StepRule`, ...), also read from the header.
"""

from __future__ import annotations

import ctypes
import enum
from typing import Callable, Optional, Sequence

import numpy as np
import numpy.typing as npt

from . import _lib
from ._lib import FRAME_DTYPE, SAMPLE_DTYPE, VIOLATION_DTYPE

__version__ = _lib.HEADER_VERSION

ArrayLike = npt.ArrayLike
SurfaceFunction = Callable[[float, float, int], ArrayLike]


# ---- Named constants, from the header's enums ---------------------------------------------


def _enum_class(c_name: str) -> type:
    values = _lib.ENUMS[c_name]
    prefix = "STRAKE_" + "".join(
        "_" + ch if ch.isupper() and i else ch for i, ch in enumerate(c_name[len("Strake"):])
    ).upper() + "_"
    members = {(k[len(prefix):] if k.startswith(prefix) else k): v for k, v in values.items()}
    base = enum.IntFlag if c_name == "StrakeKnotLineFlag" else enum.IntEnum
    cls = base(c_name[len("Strake"):], members, module=__name__)
    cls.__doc__ = f"The named constants of `enum {c_name}` in strake.h ({prefix}...)."
    return cls


ENUM_CLASSES = {name: _enum_class(name) for name in _lib.ENUMS}
Status = ENUM_CLASSES["StrakeStatus"]
Parametrization = ENUM_CLASSES["StrakeParametrization"]
ToolSide = ENUM_CLASSES["StrakeToolSide"]
CutterKind = ENUM_CLASSES["StrakeCutterKind"]
DirectionKind = ENUM_CLASSES["StrakeDirectionKind"]
GeodesicEnd = ENUM_CLASSES["StrakeGeodesicEnd"]
DomainSide = ENUM_CLASSES["StrakeDomainSide"]
OffsetSide = ENUM_CLASSES["StrakeOffsetSide"]
KnotLineFlag = ENUM_CLASSES["StrakeKnotLineFlag"]
PatternIntervalKind = ENUM_CLASSES["StrakePatternIntervalKind"]
StepRule = ENUM_CLASSES["StrakeStepRule"]
FeedBound = ENUM_CLASSES["StrakeFeedBound"]

#: Cutter kinds (StrakeCutter.kind), tool sides (the ``tool_side`` arguments) and path sides
#: (offsets, courses, the advance of passes).
BALL, FLAT, TOROIDAL = CutterKind.BALL, CutterKind.FLAT, CutterKind.TOROIDAL
ALONG_NORMAL, AGAINST_NORMAL = ToolSide.ALONG_NORMAL, ToolSide.AGAINST_NORMAL
LEFT, RIGHT = OffsetSide.LEFT, OffsetSide.RIGHT

_BUFFER_TOO_SMALL = Status.BUFFER_TOO_SMALL


# ---- Errors --------------------------------------------------------------------------------


class StrakeError(Exception):
    """A strake call failed. ``status`` is the StrakeStatus number, ``status_name`` its C name,
    ``message`` strake's message, ``callback_code`` the host callback's code (0 if none)."""

    def __init__(self, status: int, message: str, callback_code: int = 0) -> None:
        super().__init__(message)
        self.status = int(status)
        self.status_name = status_name(status)
        self.message = message
        self.callback_code = callback_code


class ArgumentError(StrakeError, ValueError):
    """Statuses 1-9: a NULL or misaligned pointer, an invalid or non-finite argument, a buffer
    too small."""


class NurbsDataError(StrakeError, ValueError):
    """Statuses 10-19: degree, knots, control points or weights that do not make a NURBS."""


class EvaluationError(StrakeError):
    """Statuses 20-29 and 32: out of domain, degenerate surface point, stalled curve, too far
    from the surface, an iteration that did not converge; a surface or curve without the
    derivative order a call needs (ORDER_UNAVAILABLE)."""


class CallbackError(StrakeError):
    """Statuses 30 and 31: a host callback failed (for a Python callback: it raised; the
    message holds the exception's type and text)."""


class ToolPathError(StrakeError):
    """Statuses 40-49: the tool-centre path cannot be made (it folds back on itself)."""


class PlanningError(StrakeError):
    """Statuses 50-59: geodesics, offsets and passes: a trace that could not go on, no
    geodesic found, a construction that leaves the surface, a cutter too large for the
    concavity, more passes than the cap."""


class InternalError(StrakeError):
    """Statuses 90-99: a bug in strake (a panic caught at the C boundary)."""


def error_class(status: int) -> type:
    """The exception class of a status number (StrakeError for a number of no family)."""
    if status == Status.ORDER_UNAVAILABLE:
        return EvaluationError
    for low, high, cls in (
        (1, 9, ArgumentError),
        (10, 19, NurbsDataError),
        (20, 29, EvaluationError),
        (30, 39, CallbackError),
        (40, 49, ToolPathError),
        (50, 59, PlanningError),
        (90, 99, InternalError),
    ):
        if low <= status <= high:
            return cls
    return StrakeError


def status_name(status: int) -> str:
    """The C name of a status, e.g. "STRAKE_STATUS_OUT_OF_DOMAIN" (strake_status_name)."""
    return _lib.lib.strake_status_name(int(status)).decode()


def last_error_message() -> str:
    """This thread's message of the last failed strake call (strake_last_error_message)."""
    n = _lib.lib.strake_last_error_message(None, 0)
    buf = ctypes.create_string_buffer(n)
    _lib.lib.strake_last_error_message(buf, n)
    return buf.value.decode("utf-8", "replace")


def last_callback_code() -> int:
    """The code of the host callback in the last call that failed with a callback status on
    this thread, else 0 (strake_last_callback_code)."""
    return _lib.lib.strake_last_callback_code()


def _check(status: int) -> None:
    if status != 0:
        code = last_callback_code() if status in (30, 31) else 0
        raise error_class(status)(status, last_error_message(), code)


def version() -> str:
    """The library's version (as Cargo.toml)."""
    return _lib.lib.strake_version().decode()


# ---- Arrays and structs ---------------------------------------------------------------------


def dtype(struct_name: str) -> np.dtype:
    """The numpy dtype of a struct of strake.h, e.g. ``dtype("StrakeGougeState")``, read from
    the header shipped with the package (fields, offsets and size as in C)."""
    try:
        return _lib.STRUCTS[struct_name]
    except KeyError:
        raise ArgumentError(2, f"strake.h has no struct `{struct_name}`") from None


def _doubles(a: ArrayLike, name: str, shape_tail: tuple = ()) -> np.ndarray:
    arr = np.ascontiguousarray(a, dtype=np.float64)
    if shape_tail and (arr.ndim != 1 + len(shape_tail) or arr.shape[1:] != shape_tail):
        raise ArgumentError(2, f"`{name}` must have shape (n, {', '.join(map(str, shape_tail))}), got {arr.shape}")
    if not shape_tail and arr.ndim != 1:
        raise ArgumentError(2, f"`{name}` must be one-dimensional, got shape {arr.shape}")
    return arr


def _fixed(a: ArrayLike, name: str, n: int) -> np.ndarray:
    arr = np.ascontiguousarray(a, dtype=np.float64).reshape(-1)
    if arr.size != n:
        raise ArgumentError(2, f"`{name}` must hold {n} numbers, got {arr.size}")
    return arr


def _ptr(arr: Optional[np.ndarray]):
    return None if arr is None else arr.ctypes.data


def _out(out: Optional[np.ndarray], n: int, dt: np.dtype, tail: tuple = ()) -> np.ndarray:
    shape = (n,) + tail
    if out is None:
        return np.empty(shape, dtype=dt)
    if not isinstance(out, np.ndarray) or out.dtype != dt or out.shape != shape:
        raise ArgumentError(2, f"`out` must be a numpy array of shape {shape} and dtype {dt}")
    if not out.flags.c_contiguous or not out.flags.writeable:
        raise ArgumentError(2, "`out` must be C-contiguous and writeable")
    return out


def _record(struct_name: str, value, arg: str) -> np.ndarray:
    """A one-element array of a value struct (a cutter, angles, limits) from a dict of all its
    fields."""
    dt = dtype(struct_name)
    if not isinstance(value, dict) or set(value) != set(dt.names):
        raise ArgumentError(2, f"`{arg}` must be a dict with the fields {', '.join(dt.names)}")
    rec = np.zeros(1, dtype=dt)
    for k, v in value.items():
        rec[k] = v
    return rec


def _options(struct_name: str, fields: dict, arg: str = "options") -> np.ndarray:
    """A one-element array of an options struct from some of its fields: the others are 0,
    the header's "default" (so a field added to the struct later keeps its default). A nested
    struct field takes a dict of its own fields the same way."""
    dt = dtype(struct_name)
    rec = np.zeros(1, dtype=dt)
    for k, v in fields.items():
        if k not in dt.names:
            raise ArgumentError(2, f"`{arg}`: {struct_name} has no field `{k}` (it has {', '.join(dt.names)})")
        sub = dt.fields[k][0]
        if sub.names is not None:
            if not isinstance(v, dict):
                raise ArgumentError(2, f"`{arg}`: `{k}` must be a dict of the fields of its struct")
            inner = _options_dtype(sub, v, f"{arg}.{k}")
            rec[k] = inner[0]
        else:
            rec[k] = v
    return rec


def _options_dtype(dt: np.dtype, fields: dict, arg: str) -> np.ndarray:
    rec = np.zeros(1, dtype=dt)
    for k, v in fields.items():
        if k not in dt.names:
            raise ArgumentError(2, f"`{arg}` has no field `{k}` (it has {', '.join(dt.names)})")
        rec[k] = v
    return rec


def _value(x):
    if isinstance(x, np.ndarray):
        return x.copy()
    if isinstance(x, np.void):
        return _dict(x)
    return x.item() if isinstance(x, np.generic) else x


def _dict(rec) -> dict:
    """The fields of a struct record as a dict (numbers as Python numbers, arrays copied)."""
    return {name: _value(rec[name]) for name in rec.dtype.names}


def _single(struct_name: str, call) -> np.ndarray:
    out = np.zeros(1, dtype=dtype(struct_name))
    _check(call(out.ctypes.data))
    return out


def _fill(call, dt: np.dtype) -> np.ndarray:
    count = ctypes.c_size_t(0)
    st = call(None, 0, ctypes.byref(count))
    if st != _BUFFER_TOO_SMALL:
        _check(st)
    out = np.empty(count.value, dtype=dt)
    if count.value:
        _check(call(out.ctypes.data, out.size, ctypes.byref(count)))
    return out[: count.value]


def _frame(frame, arg: str = "frame") -> np.ndarray:
    """A one-element FRAME_DTYPE array from a frame record (frame_at, frames_at(...)[i],
    samples["frame"][i])."""
    try:
        a = np.array(frame, dtype=FRAME_DTYPE).reshape(-1)
    except (TypeError, ValueError):
        raise ArgumentError(2, f"`{arg}` must be a record of FRAME_DTYPE") from None
    if a.size != 1:
        raise ArgumentError(2, f"`{arg}` must be one frame, got {a.size}")
    return a


def _structs(a, struct_name: str, arg: str) -> np.ndarray:
    dt = dtype(struct_name)
    if not isinstance(a, np.ndarray) or a.dtype != dt or a.ndim != 1:
        raise ArgumentError(2, f"`{arg}` must be a one-dimensional array of dtype('{struct_name}')")
    return np.ascontiguousarray(a)


def _report(e: BaseException) -> int:
    text = f"{type(e).__name__}: {e}".encode("utf-8", "replace")
    _lib.lib.strake_callback_report(text)
    return -1


# ---- Handles ---------------------------------------------------------------------------------


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
        if not getattr(self, "_h", None):
            raise ArgumentError(1, f"this {type(self).__name__} was closed")
        return self._h

    def __init__(self) -> None:
        raise TypeError(f"{type(self).__name__} objects are made by strake's functions")

    @classmethod
    def _wrap(cls, h: int, keep=None):
        s = object.__new__(cls)
        s._h = h
        s._keep = keep
        return s

    @classmethod
    def _made(cls, call, keep=None):
        h = ctypes.c_void_p()
        _check(call(ctypes.byref(h)))
        return cls._wrap(h.value, keep)


_ROWS = (1, 3, 6, 10, 15)


class Surface(_Handle):
    """A surface strake holds: a native NURBS surface or a Python function."""

    _free = staticmethod(_lib.lib.strake_surface_free)

    def __init__(self) -> None:
        raise TypeError("use Surface.nurbs(...), Surface.from_function(...), "
                        "Surface.from_batch_function(...) or Surface.from_high_function(...)")

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
        data = _options("StrakeNurbsSurfaceData", dict(
            degree_u=degree_u, degree_v=degree_v, count_u=p.shape[0], count_v=p.shape[1],
            knots_u=_ptr(ku), knot_count_u=ku.size, knots_v=_ptr(kv), knot_count_v=kv.size,
            points=_ptr(p), weights=_ptr(w) or 0), "data")
        return cls._made(lambda out: _lib.lib.strake_surface_new_nurbs(
            data.ctypes.data, int(bool(flip_normal)), out))

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
                need = _ROWS[order]
                if rows.ndim != 2 or rows.shape[1] != 3 or not need <= rows.shape[0] <= 6:
                    raise ValueError(
                        f"the surface function must return an array of shape (k, 3) with "
                        f"{need} <= k <= 6 rows for order {order}, got shape {rows.shape}")
                rows = np.ascontiguousarray(rows)
                ctypes.memmove(jet, rows.ctypes.data, rows.shape[0] * 24)
                return 0
            except BaseException as e:  # never let an exception unwind into C
                return _report(e)

        cb = _lib.SURFACE_FN(trampoline)
        return cls._made(lambda out: _lib.lib.strake_surface_from_callback(
            cb, None, float(u_range[0]), float(u_range[1]), float(v_range[0]), float(v_range[1]),
            int(bool(flip_normal)), out), keep=(cb, f))

    @classmethod
    def from_batch_function(
        cls,
        f: Callable[[np.ndarray, np.ndarray, int], ArrayLike],
        u_range: Sequence[float],
        v_range: Sequence[float],
        flip_normal: bool = False,
    ) -> "Surface":
        """A surface evaluated by ``f(u, v, order)`` for many points per call
        (strake_surface_from_batch_callback): ``u`` and ``v`` are float64 arrays of the same
        length n (blocks of up to 64 points of a path), and ``f`` returns an array of shape
        (n, k, 3), rows as for :meth:`from_function`. Vectorised numpy code in ``f`` makes the
        callback's cost per point small."""

        def trampoline(_user, u_ptr, v_ptr, count, order, out_ptr):
            try:
                u = np.ctypeslib.as_array(ctypes.cast(u_ptr, _lib.PD), shape=(count,)).copy()
                v = np.ctypeslib.as_array(ctypes.cast(v_ptr, _lib.PD), shape=(count,)).copy()
                rows = np.asarray(f(u, v, order), dtype=np.float64)
                need = _ROWS[order]
                if rows.ndim != 3 or rows.shape[0] != count or rows.shape[2] != 3 \
                        or not need <= rows.shape[1] <= 6:
                    raise ValueError(
                        f"the batch surface function must return an array of shape ({count}, k, 3) "
                        f"with {need} <= k <= 6 for order {order}, got shape {rows.shape}")
                out = np.ctypeslib.as_array(ctypes.cast(out_ptr, _lib.PD), shape=(count, 6, 3))
                out[:, : rows.shape[1]] = rows
                return 0
            except BaseException as e:
                return _report(e)

        cb = _lib.SURFACE_BATCH_FN(trampoline)
        return cls._made(lambda out: _lib.lib.strake_surface_from_batch_callback(
            cb, None, float(u_range[0]), float(u_range[1]), float(v_range[0]), float(v_range[1]),
            int(bool(flip_normal)), out), keep=(cb, f))

    @classmethod
    def from_high_function(
        cls,
        f: SurfaceFunction,
        u_range: Sequence[float],
        v_range: Sequence[float],
        max_order: int = 4,
        flip_normal: bool = False,
    ) -> "Surface":
        """A surface evaluated by ``f(u, v, order)`` with partials up to ``max_order`` (3 or
        4; strake_surface_from_high_callback), for the calls that need third or fourth order
        (invariant rates, the tool-centre path). ``f`` returns an array of shape (k, 3), at
        least the rows ``order`` needs (1, 3, 6, 10 or 15): S; Su, Sv; Suu, Suv, Svv; Suuu,
        Suuv, Suvv, Svvv; Suuuu, Suuuv, Suuvv, Suvvv, Svvvv."""

        def trampoline(_user, u, v, order, jet):
            try:
                rows = np.ascontiguousarray(f(u, v, order), dtype=np.float64)
                need = _ROWS[order]
                if rows.ndim != 2 or rows.shape[1] != 3 or not need <= rows.shape[0] <= 15:
                    raise ValueError(
                        f"the surface function must return an array of shape (k, 3) with "
                        f"{need} <= k <= 15 rows for order {order}, got shape {rows.shape}")
                ctypes.memmove(jet, rows.ctypes.data, rows.shape[0] * 24)
                return 0
            except BaseException as e:
                return _report(e)

        cb = _lib.SURFACE_HIGH_FN(trampoline)
        return cls._made(lambda out: _lib.lib.strake_surface_from_high_callback(
            cb, None, int(max_order), float(u_range[0]), float(u_range[1]), float(v_range[0]),
            float(v_range[1]), int(bool(flip_normal)), out), keep=(cb, f))

    def evaluate(self, uv: ArrayLike, order: int = 2, out: Optional[np.ndarray] = None) -> np.ndarray:
        """The point and partials to ``order`` at the (u, v) rows of ``uv`` (shape (n, 2)):
        an array of shape (n, 6, 3), rows S, Su, Sv, Suu, Suv, Svv; rows above ``order`` are
        zero. ``out`` (float64, (n, 6, 3)) is filled and returned when given."""
        a = _doubles(uv, "uv", (2,))
        o = _out(out, a.shape[0], np.dtype(np.float64), (6, 3))
        _check(_lib.lib.strake_surface_evaluate(self.handle, _ptr(a), a.shape[0], order, o.ctypes.data))
        return o

    def set_knot_lines(self, u_lines: ArrayLike = (), v_lines: ArrayLike = ()) -> None:
        """Declares the interior knots of the host's NURBS in u and in v (ascending, inside the
        domain), where arc length splits its quadrature (strake_surface_set_knot_lines); empty
        lists go back to what the surface knows itself. Not to be called while another thread
        uses the surface."""
        u, v = _doubles(u_lines, "u_lines"), _doubles(v_lines, "v_lines")
        _check(_lib.lib.strake_surface_set_knot_lines(
            self.handle, _ptr(u) if u.size else None, u.size, _ptr(v) if v.size else None, v.size))


def _projection_options(tolerance: float, periodic_u: bool, periodic_v: bool, grid: int,
                        max_iterations: int) -> np.ndarray:
    return _options("StrakeProjectionOptions", dict(
        tolerance=tolerance, periodic_u=int(bool(periodic_u)), periodic_v=int(bool(periodic_v)),
        grid=grid, max_iterations=max_iterations))


class Curve(_Handle):
    """A curve (u(t), v(t)) in a surface's parameter plane."""

    _free = staticmethod(_lib.lib.strake_curve_free)

    #: The projections of the points, for a curve made by :meth:`through_space_points`.
    projections: Optional[np.ndarray] = None

    def __init__(self) -> None:
        raise TypeError("use Curve.nurbs(...), Curve.line(...), Curve.through_uv_points(...), "
                        "Curve.from_function(...) or another Curve constructor")

    @classmethod
    def nurbs(cls, degree: int, knots: ArrayLike, uv_points: ArrayLike,
              weights: Optional[ArrayLike] = None) -> "Curve":
        """A NURBS curve: ``uv_points`` of shape (n, 2), ``weights`` of shape (n,) or None."""
        k, p = _doubles(knots, "knots"), _doubles(uv_points, "uv_points", (2,))
        w = None if weights is None else _doubles(weights, "weights")
        return cls._made(lambda out: _lib.lib.strake_curve_new_nurbs(
            degree, _ptr(k), k.size, _ptr(p), p.shape[0], _ptr(w), out))

    @classmethod
    def line(cls, start: Sequence[float], end: Sequence[float]) -> "Curve":
        """The straight line from (u, v) = start at t = 0 to end at t = 1."""
        return cls.nurbs(1, [0.0, 0.0, 1.0, 1.0], [start, end])

    @classmethod
    def from_function(cls, f: Callable[[float], ArrayLike], t_range: Sequence[float]) -> "Curve":
        """A curve evaluated by ``f(t)`` over ``t_range``, which returns the six numbers
        (u, v, du/dt, dv/dt, d2u/dt2, d2v/dt2) (strake_curve_from_callback). To refuse a t,
        raise: the text reaches the caller in a :class:`CallbackError`."""

        def trampoline(_user, t, jet):
            try:
                row = np.ascontiguousarray(f(t), dtype=np.float64).reshape(-1)
                if row.size != 6:
                    raise ValueError(f"the curve function must return 6 numbers, got {row.size}")
                ctypes.memmove(jet, row.ctypes.data, 48)
                return 0
            except BaseException as e:
                return _report(e)

        cb = _lib.CURVE_FN(trampoline)
        return cls._made(lambda out: _lib.lib.strake_curve_from_callback(
            cb, None, float(t_range[0]), float(t_range[1]), out), keep=(cb, f))

    @classmethod
    def from_high_function(cls, f: Callable[[float, int], ArrayLike], t_range: Sequence[float],
                           max_order: int = 4) -> "Curve":
        """A curve evaluated by ``f(t, order)`` with derivatives up to ``max_order`` (3 or 4;
        strake_curve_from_high_callback), for the calls that need the curve's third or fourth
        derivatives (invariant rates, the tool-centre path). ``f`` returns an array of shape
        (k, 2), at least ``order + 1`` rows: (u, v), (du, dv), (d2u, d2v), (d3u, d3v),
        (d4u, d4v) with respect to t. To refuse a t, raise."""

        def trampoline(_user, t, order, jet):
            try:
                rows = np.ascontiguousarray(f(t, order), dtype=np.float64)
                if rows.ndim != 2 or rows.shape[1] != 2 or not order + 1 <= rows.shape[0] <= 5:
                    raise ValueError(
                        f"the curve function must return an array of shape (k, 2) with "
                        f"{order + 1} <= k <= 5 rows for order {order}, got shape {rows.shape}")
                ctypes.memmove(jet, rows.ctypes.data, rows.shape[0] * 16)
                return 0
            except BaseException as e:
                return _report(e)

        cb = _lib.CURVE_HIGH_FN(trampoline)
        return cls._made(lambda out: _lib.lib.strake_curve_from_high_callback(
            cb, None, int(max_order), float(t_range[0]), float(t_range[1]), out),
            keep=(cb, f))

    @classmethod
    def through_uv_points(cls, uv_points: ArrayLike, degree: int = 3, centripetal: bool = False,
                          start_derivative: Optional[Sequence[float]] = None,
                          end_derivative: Optional[Sequence[float]] = None) -> "Curve":
        """The interpolating B-spline of ``degree`` through the (n, 2) points (chord-length or
        centripetal parameters), with optional end derivatives (du/dt, dv/dt) at t = 0 and 1
        (both or neither)."""
        p = _doubles(uv_points, "uv_points", (2,))
        d0 = None if start_derivative is None else _fixed(start_derivative, "start_derivative", 2)
        d1 = None if end_derivative is None else _fixed(end_derivative, "end_derivative", 2)
        return cls._made(lambda out: _lib.lib.strake_curve_through_uv_points(
            _ptr(p), p.shape[0], degree, int(bool(centripetal)), _ptr(d0), _ptr(d1), out))

    @classmethod
    def through_space_points(cls, surface: Surface, points: ArrayLike, degree: int = 3,
                             centripetal: bool = False, tolerance: float = np.inf,
                             periodic_u: bool = False, periodic_v: bool = False, grid: int = 0,
                             max_iterations: int = 0) -> "Curve":
        """The curve on ``surface`` through points in space (shape (n, 3), in path order),
        projected onto the surface and interpolated in the parameter plane
        (strake_curve_through_space_points). ``tolerance`` is the largest accepted distance
        from a point to the surface. The projections (:data:`dtype("StrakeProjection")`) are
        kept in the curve's ``projections``."""
        p = _doubles(points, "points", (3,))
        opts = _projection_options(tolerance, periodic_u, periodic_v, grid, max_iterations)
        proj = np.zeros(p.shape[0], dtype=dtype("StrakeProjection"))
        c = cls._made(lambda out: _lib.lib.strake_curve_through_space_points(
            surface.handle, _ptr(p), p.shape[0], opts.ctypes.data, degree, int(bool(centripetal)),
            proj.ctypes.data, out))
        c.projections = proj
        return c

    @classmethod
    def project_nurbs(cls, surface: Surface, degree: int, knots: ArrayLike, points: ArrayLike,
                      fit_tolerance: float, weights: Optional[ArrayLike] = None,
                      tolerance: float = np.inf, periodic_u: bool = False,
                      periodic_v: bool = False, grid: int = 0, max_iterations: int = 0) -> "Curve":
        """A NURBS curve in space (control ``points`` of shape (n, 3)) projected onto
        ``surface`` and fitted in its parameter plane to ``fit_tolerance``
        (strake_curve_project_nurbs)."""
        k, p = _doubles(knots, "knots"), _doubles(points, "points", (3,))
        w = None if weights is None else _doubles(weights, "weights")
        opts = _projection_options(tolerance, periodic_u, periodic_v, grid, max_iterations)
        return cls._made(lambda out: _lib.lib.strake_curve_project_nurbs(
            surface.handle, degree, _ptr(k), k.size, _ptr(p), p.shape[0], _ptr(w),
            opts.ctypes.data, float(fit_tolerance), out))

    @classmethod
    def spiral(cls, centre: Sequence[float], r_start: float, r_end: float, pitch: float) -> "Curve":
        """An Archimedean spiral in a plane (its u and v read as x and y), for
        :func:`drive_project`: r = r_start + pitch theta / (2 pi), theta the curve parameter
        (strake_curve_new_spiral)."""
        c = _fixed(centre, "centre", 2)
        return cls._made(lambda out: _lib.lib.strake_curve_new_spiral(
            _ptr(c), float(r_start), float(r_end), float(pitch), out))


def project_points(surface: Surface, points: ArrayLike, tolerance: float = np.inf,
                   periodic_u: bool = False, periodic_v: bool = False, grid: int = 0,
                   max_iterations: int = 0) -> np.ndarray:
    """Projects points in space (shape (n, 3), in order) onto ``surface``: an array of
    ``dtype("StrakeProjection")`` (u, v, foot, distance, signed_distance) per point
    (strake_surface_project_points)."""
    p = _doubles(points, "points", (3,))
    opts = _projection_options(tolerance, periodic_u, periodic_v, grid, max_iterations)
    out = np.zeros(p.shape[0], dtype=dtype("StrakeProjection"))
    _check(_lib.lib.strake_surface_project_points(surface.handle, _ptr(p), p.shape[0],
                                                  opts.ctypes.data, out.ctypes.data))
    return out


# ---- Frames ----------------------------------------------------------------------------------


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


def frame_from_jets(surface_jet: ArrayLike, curve_jet: ArrayLike, scales: Sequence[float],
                    flip_normal: bool = False) -> np.void:
    """The frame from jets the caller evaluated, with no handles (strake_frame_from_jets):
    ``surface_jet`` of shape (6, 3) (S, Su, Sv, Suu, Suv, Svv at the curve's (u, v)),
    ``curve_jet`` the six numbers (u, v, du, dv, ddu, ddv), ``scales`` = (u_extent,
    v_extent, t_extent), the widths of the domains against which degeneracy is judged."""
    sj = _fixed(surface_jet, "surface_jet", 18)
    cj = _fixed(curve_jet, "curve_jet", 6)
    sc = _options("StrakeParamScales", dict(zip(("u_extent", "v_extent", "t_extent"),
                                                 _fixed(scales, "scales", 3))), "scales")
    out = np.empty(1, dtype=FRAME_DTYPE)
    _check(_lib.lib.strake_frame_from_jets(_ptr(sj), _ptr(cj), int(bool(flip_normal)),
                                           sc.ctypes.data, out.ctypes.data))
    return out[0]


def knot_line_flags(surface: Surface, curve: Curve, ts: ArrayLike) -> np.ndarray:
    """The crease flags (uint32, OR of :class:`KnotLineFlag` bits; 0 at a smooth point) of
    the frames at ``ts`` (strake_knot_line_flags)."""
    t = _doubles(ts, "ts")
    out = np.zeros(t.size, dtype=np.uint32)
    _check(_lib.lib.strake_knot_line_flags(surface.handle, curve.handle, _ptr(t), t.size,
                                           out.ctypes.data))
    return out


# ---- Sampling --------------------------------------------------------------------------------


def samples_at(surface: Surface, curve: Curve, ts: ArrayLike, arc_tolerance: float = 1e-10,
               out: Optional[np.ndarray] = None) -> np.ndarray:
    """The frames at ``ts`` with each one's arc length from the start of the curve's domain,
    as :data:`SAMPLE_DTYPE` records (ready for :func:`path_extremes`)."""
    t = _doubles(ts, "ts")
    o = _out(out, t.size, SAMPLE_DTYPE)
    _check(_lib.lib.strake_samples_at(surface.handle, curve.handle, _ptr(t), t.size,
                                      float(arc_tolerance), o.ctypes.data))
    return o


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


def sample_chordal_centre(surface: Surface, curve: Curve, chord_tolerance: float, max_step: float,
                          cutter: dict, angles: dict, tool_side: int = ALONG_NORMAL,
                          arc_tolerance: float = 1e-10) -> np.ndarray:
    """Samples of the contact path spaced so that the chords of the tool-centre path of
    ``cutter`` at ``angles`` stay within ``chord_tolerance`` of it
    (strake_sample_chordal_centre; needs third-order derivatives)."""
    c, a = _record("StrakeCutter", cutter, "cutter"), _record("StrakeToolAngles", angles, "angles")
    return _fill(lambda b, n, k: _lib.lib.strake_sample_chordal_centre(
        surface.handle, curve.handle, float(chord_tolerance), float(max_step), float(arc_tolerance),
        int(tool_side), c.ctypes.data, a.ctypes.data, b, n, k), SAMPLE_DTYPE)


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
    return _dict(_single("StrakeExtremes", lambda o: _lib.lib.strake_path_extremes(
        s.ctypes.data, _ptr(v), s.size, o))[0])


def path_violations(samples: np.ndarray, values: ArrayLike, limit: float) -> np.ndarray:
    """Every interval where ``values`` exceed ``limit``, as :data:`VIOLATION_DTYPE` records."""
    s, v = _samples(samples, values)
    return _fill(lambda b, c, k: _lib.lib.strake_path_violations(s.ctypes.data, _ptr(v), s.size,
                                                                 float(limit), b, c, k), VIOLATION_DTYPE)


# ---- Checks at one sample --------------------------------------------------------------------


def check_gouge(frame, cutter: dict, angles: dict, tool_side: int = ALONG_NORMAL) -> dict:
    """Local (and rear) gouging of ``cutter`` at one frame: the fields of StrakeGougeState.
    ``cutter`` = {"kind", "radius", "corner_radius"}, ``angles`` = {"lead", "tilt"}."""
    f = _frame(frame)
    c, a = _record("StrakeCutter", cutter, "cutter"), _record("StrakeToolAngles", angles, "angles")
    return _dict(_single("StrakeGougeState", lambda o: _lib.lib.strake_check_gouge(
        f.ctypes.data, int(tool_side), c.ctypes.data, a.ctypes.data, o))[0])


def check_rear_gouge(frame, cutter: dict, angles: dict, tool_side: int = ALONG_NORMAL) -> dict:
    """Rear (heel) gouging of a flat or toroidal cutter at one frame: StrakeRearGouge."""
    f = _frame(frame)
    c, a = _record("StrakeCutter", cutter, "cutter"), _record("StrakeToolAngles", angles, "angles")
    return _dict(_single("StrakeRearGouge", lambda o: _lib.lib.strake_check_rear_gouge(
        f.ctypes.data, int(tool_side), c.ctypes.data, a.ctypes.data, o))[0])


def check_scallop(frame, cutter_radius: float, step_over: float, tool_side: int = ALONG_NORMAL) -> dict:
    """The scallop height at one frame for passes ``step_over`` apart: StrakeScallop."""
    f = _frame(frame)
    return _dict(_single("StrakeScallop", lambda o: _lib.lib.strake_check_scallop(
        f.ctypes.data, int(tool_side), float(cutter_radius), float(step_over), o))[0])


def check_step_over(frame, cutter_radius: float, scallop_height: float,
                    tool_side: int = ALONG_NORMAL) -> dict:
    """The largest step-over for ``scallop_height`` at one frame: StrakeStepOver."""
    f = _frame(frame)
    return _dict(_single("StrakeStepOver", lambda o: _lib.lib.strake_check_step_over(
        f.ctypes.data, int(tool_side), float(cutter_radius), float(scallop_height), o))[0])


def check_step_over_cutter(frame, cutter: dict, angles: dict, scallop_height: float,
                           tool_side: int = ALONG_NORMAL) -> dict:
    """The step-over for ``scallop_height`` with ``cutter`` at ``angles``, limited by the
    width it cuts: StrakeCutterStepOver."""
    f = _frame(frame)
    c, a = _record("StrakeCutter", cutter, "cutter"), _record("StrakeToolAngles", angles, "angles")
    return _dict(_single("StrakeCutterStepOver", lambda o: _lib.lib.strake_check_step_over_cutter(
        f.ctypes.data, int(tool_side), c.ctypes.data, a.ctypes.data, float(scallop_height), o))[0])


def check_feed(frame, limits: dict) -> float:
    """The highest feed at one frame: ``limits`` = {"feed", "max_acceleration", "max_jerk"}."""
    f = _frame(frame)
    lim = _record("StrakeFeedLimits", limits, "limits")
    v = ctypes.c_double()
    _check(_lib.lib.strake_check_feed(f.ctypes.data, lim.ctypes.data, ctypes.byref(v)))
    return v.value


def check_fibre(frame, limits: dict) -> dict:
    """Steering and twist at one frame: StrakeFibreState; ``limits`` = {"tow_width",
    "min_steering_radius", "max_twist_rate"}."""
    f = _frame(frame)
    lim = _record("StrakeFibreLimits", limits, "limits")
    return _dict(_single("StrakeFibreState", lambda o: _lib.lib.strake_check_fibre(
        f.ctypes.data, lim.ctypes.data, o))[0])


def check_tow_edges(frame, tow_width: float) -> dict:
    """The strain of a tow's two edges at one frame: StrakeTowEdges."""
    f = _frame(frame)
    return _dict(_single("StrakeTowEdges", lambda o: _lib.lib.strake_check_tow_edges(
        f.ctypes.data, float(tow_width), o))[0])


def tool_axis(frame, angles: dict, tool_side: int = ALONG_NORMAL) -> dict:
    """The tool axis at one frame for lead and tilt: StrakeToolAxis (``local``, ``space``)."""
    f = _frame(frame)
    a = _record("StrakeToolAngles", angles, "angles")
    return _dict(_single("StrakeToolAxis", lambda o: _lib.lib.strake_tool_axis(
        f.ctypes.data, int(tool_side), a.ctypes.data, o))[0])


def cutter_radii(cutter: dict, angles: dict) -> dict:
    """The cutter's radii of curvature at its contact point for lead and tilt:
    StrakeCutterRadii (``across_path`` is the radius scallop and step-over need)."""
    c, a = _record("StrakeCutter", cutter, "cutter"), _record("StrakeToolAngles", angles, "angles")
    return _dict(_single("StrakeCutterRadii", lambda o: _lib.lib.strake_cutter_radii(
        c.ctypes.data, a.ctypes.data, o))[0])


# ---- Checks along a whole path (one result per sample, one call) ----------------------------


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


# ---- Tool-centre path ------------------------------------------------------------------------


def invariant_rates_at(surface: Surface, curve: Curve, t: float) -> tuple:
    """(frame, rates) at one t: the frame of :func:`frame_at` and the dict of
    StrakeInvariantRates (d kn/ds, d kg/ds, d tg/ds, d kappa/ds; third order needed)."""
    f = np.empty(1, dtype=FRAME_DTYPE)
    r = np.zeros(1, dtype=dtype("StrakeInvariantRates"))
    _check(_lib.lib.strake_invariant_rates_at(surface.handle, curve.handle, float(t),
                                              f.ctypes.data, r.ctypes.data))
    return f[0], _dict(r[0])


def invariant_rates_path(surface: Surface, curve: Curve, ts: ArrayLike) -> tuple:
    """(frames, rates) at every t of ``ts`` in one call: arrays of :data:`FRAME_DTYPE` and of
    ``dtype("StrakeInvariantRates")``."""
    t = _doubles(ts, "ts")
    f = np.empty(t.size, dtype=FRAME_DTYPE)
    r = np.zeros(t.size, dtype=dtype("StrakeInvariantRates"))
    _check(_lib.lib.strake_invariant_rates_path(surface.handle, curve.handle, _ptr(t), t.size,
                                                f.ctypes.data, r.ctypes.data))
    return f, r


def centre_point_at(surface: Surface, curve: Curve, t: float, cutter: dict, angles: dict,
                    order: int = 4, tool_side: int = ALONG_NORMAL) -> np.void:
    """The tool-centre path at one t (a record of ``dtype("StrakeCentrePoint")``, ready for
    :func:`centre_feed`), from derivatives of ``order`` 3 or 4."""
    c, a = _record("StrakeCutter", cutter, "cutter"), _record("StrakeToolAngles", angles, "angles")
    return _single("StrakeCentrePoint", lambda o: _lib.lib.strake_centre_point_at(
        surface.handle, curve.handle, float(t), int(tool_side), c.ctypes.data, a.ctypes.data,
        int(order), o))[0]


def centre_path_at(surface: Surface, curve: Curve, ts: ArrayLike, cutter: dict, angles: dict,
                   order: int = 4, tool_side: int = ALONG_NORMAL,
                   out: Optional[np.ndarray] = None) -> np.ndarray:
    """The tool-centre path at every t of ``ts``: an array of ``dtype("StrakeCentrePoint")``."""
    t = _doubles(ts, "ts")
    c, a = _record("StrakeCutter", cutter, "cutter"), _record("StrakeToolAngles", angles, "angles")
    o = _out(out, t.size, dtype("StrakeCentrePoint"))
    _check(_lib.lib.strake_centre_path_at(surface.handle, curve.handle, _ptr(t), t.size,
                                          int(tool_side), c.ctypes.data, a.ctypes.data, int(order),
                                          o.ctypes.data))
    return o


def centre_feed(point, limits: dict) -> dict:
    """The feed allowed at one centre-path point and what limits it (StrakeCentreFeed; ``bound``
    a :class:`FeedBound`). ``limits`` = {"feed", "max_acceleration", "max_jerk",
    "max_angular_speed"}."""
    p = _structs(np.array(point, dtype=dtype("StrakeCentrePoint")).reshape(-1), "StrakeCentrePoint", "point")
    if p.size != 1:
        raise ArgumentError(2, "`point` must be one centre point")
    lim = _record("StrakeCentreFeedLimits", limits, "limits")
    return _dict(_single("StrakeCentreFeed", lambda o: _lib.lib.strake_centre_feed(
        p.ctypes.data, lim.ctypes.data, o))[0])


def centre_feed_path(points: np.ndarray, limits: dict, out: Optional[np.ndarray] = None) -> np.ndarray:
    """:func:`centre_feed` at every point of a centre path: an array of
    ``dtype("StrakeCentreFeed")``."""
    p = _structs(points, "StrakeCentrePoint", "points")
    lim = _record("StrakeCentreFeedLimits", limits, "limits")
    o = _out(out, p.size, dtype("StrakeCentreFeed"))
    _check(_lib.lib.strake_centre_feed_path(p.ctypes.data, p.size, lim.ctypes.data, o.ctypes.data))
    return o


# ---- Geodesics, offsets, courses -------------------------------------------------------------


def _geodesic_options(tolerance: float, max_steps: int) -> np.ndarray:
    return _options("StrakeGeodesicOptions", dict(tolerance=tolerance, max_steps=max_steps))


def geodesic_trace(surface: Surface, u: float, v: float, direction, length: float,
                   tolerance: float, max_steps: int = 0, kind: Optional[int] = None) -> tuple:
    """Traces the geodesic from (u, v) for arc length ``length`` (strake_geodesic_trace):
    (curve, info) with the curve's t the arc length and ``info`` the dict of
    StrakeGeodesicInfo (``end`` a :class:`GeodesicEnd`). ``direction`` is an angle (one
    number, from Su/|Su| toward N x Su/|Su|), a (du, dv) pair or a space vector (3 numbers);
    ``kind`` (a :class:`DirectionKind`) says which when the count does not."""
    d = np.ascontiguousarray(direction, dtype=np.float64).reshape(-1)
    if kind is None:
        kinds = {1: DirectionKind.ANGLE, 2: DirectionKind.PARAMETER, 3: DirectionKind.SPACE}
        if d.size not in kinds:
            raise ArgumentError(2, f"`direction` must hold 1, 2 or 3 numbers, got {d.size}")
        kind = kinds[d.size]
    opts = _geodesic_options(tolerance, max_steps)
    info = np.zeros(1, dtype=dtype("StrakeGeodesicInfo"))
    c = Curve._made(lambda out: _lib.lib.strake_geodesic_trace(
        surface.handle, float(u), float(v), int(kind), _ptr(d), float(length), opts.ctypes.data,
        out, info.ctypes.data))
    return c, _dict(info[0])


def geodesic_between(surface: Surface, start: Sequence[float], end: Sequence[float],
                     tolerance: float, max_steps: int = 0) -> tuple:
    """(distance, curve): the geodesic distance between the (u, v) points ``start`` and
    ``end`` and the geodesic (t = arc length from start) (strake_geodesic_between)."""
    s, e = _fixed(start, "start", 2), _fixed(end, "end", 2)
    opts = _geodesic_options(tolerance, max_steps)
    dist = ctypes.c_double()
    c = Curve._made(lambda out: _lib.lib.strake_geodesic_between(
        surface.handle, s[0], s[1], e[0], e[1], opts.ctypes.data, out, ctypes.byref(dist)))
    return dist.value, c


class Offset(_Handle):
    """An offset of a path on a surface (geodesic parallel): made by :func:`offset` or
    :func:`course_adjacent`; its pieces, their points, and the path intervals whose offset
    left the surface or looped."""

    _free = staticmethod(_lib.lib.strake_offset_free)

    def summary(self) -> dict:
        """Counts and figures (the fields of StrakeOffsetSummary)."""
        return _dict(_single("StrakeOffsetSummary", lambda o: _lib.lib.strake_offset_summary(
            self.handle, o))[0])

    def __len__(self) -> int:
        return self.summary()["pieces"]

    def piece_curve(self, index: int) -> Curve:
        """Piece ``index`` as a curve in (u, v), t in [0, 1] (it outlives the offset)."""
        return Curve._made(lambda out: _lib.lib.strake_offset_piece_curve(self.handle, index, out))

    def piece_points(self, index: int) -> np.ndarray:
        """The points of piece ``index`` in path order: ``dtype("StrakeOffsetPoint")``."""
        return _fill(lambda b, c, k: _lib.lib.strake_offset_piece_points(self.handle, index, b, c, k),
                     dtype("StrakeOffsetPoint"))

    def exits(self) -> np.ndarray:
        """Path intervals whose offset leaves the surface: ``dtype("StrakePathInterval")``."""
        return _fill(lambda b, c, k: _lib.lib.strake_offset_exits(self.handle, b, c, k),
                     dtype("StrakePathInterval"))

    def loops(self) -> np.ndarray:
        """Path intervals whose offset looped and was cut: ``dtype("StrakePathInterval")``."""
        return _fill(lambda b, c, k: _lib.lib.strake_offset_loops(self.handle, b, c, k),
                     dtype("StrakePathInterval"))

    def piece_curves(self) -> list:
        """Every piece as a curve, in order."""
        return [self.piece_curve(i) for i in range(len(self))]


def offset(surface: Surface, curve: Curve, distance, side: int = LEFT,
           distance_t: Optional[ArrayLike] = None, **options) -> Offset:
    """The offset of ``curve`` at geodesic distance ``distance`` to ``side`` (strake_offset_new).
    ``distance`` is one number, or with ``distance_t`` (strictly increasing path parameters)
    the distances there (linear between, held beyond). ``options``: the fields of
    StrakeOffsetOptions (``chord_tolerance`` needed; the others 0 for their defaults)."""
    d = np.ascontiguousarray(distance, dtype=np.float64).reshape(-1)
    t = None if distance_t is None else _doubles(distance_t, "distance_t")
    if t is not None and t.size != d.size:
        raise ArgumentError(2, f"`distance_t` has {t.size} entries for {d.size} distances")
    if t is None and d.size != 1:
        raise ArgumentError(2, f"{d.size} distances need `distance_t`, the path parameters they are at")
    opts = _options("StrakeOffsetOptions", options)
    return Offset._made(lambda out: _lib.lib.strake_offset_new(
        surface.handle, curve.handle, int(side), _ptr(t), _ptr(d), d.size, opts.ctypes.data, out))


def course_fixed_angle(surface: Surface, u: float, v: float, axis: Sequence[float], angle: float,
                       length: float, tolerance: float, max_steps: int = 0) -> tuple:
    """(curve, info): the fibre course from (u, v) whose tangent keeps ``angle`` to the axis
    (3 numbers) projected onto the tangent plane (strake_course_fixed_angle)."""
    ax = _fixed(axis, "axis", 3)
    opts = _geodesic_options(tolerance, max_steps)
    info = np.zeros(1, dtype=dtype("StrakeGeodesicInfo"))
    c = Curve._made(lambda out: _lib.lib.strake_course_fixed_angle(
        surface.handle, float(u), float(v), _ptr(ax), float(angle), float(length),
        opts.ctypes.data, out, info.ctypes.data))
    return c, _dict(info[0])


def course_adjacent(surface: Surface, course: Curve, band_width: float, side: int = LEFT,
                    **options) -> Offset:
    """The adjacent course one band ``band_width`` to ``side`` of ``course``, as an
    :class:`Offset` (strake_course_adjacent); ``options`` as for :func:`offset`."""
    opts = _options("StrakeOffsetOptions", options)
    return Offset._made(lambda out: _lib.lib.strake_course_adjacent(
        surface.handle, course.handle, float(band_width), int(side), opts.ctypes.data, out))


def course_gaps(surface: Surface, a: Curve, b: Curve, band_width: float, samples: int,
                tolerance: float, trace_tolerance: float, side: int = LEFT,
                max_steps: int = 0) -> tuple:
    """(gaps, unmatched): the gaps and overlaps wider than ``tolerance`` between the bands
    on courses ``a`` and ``b`` (``b`` to ``side`` of ``a``), as ``dtype("StrakeCourseGap")``,
    and the number of samples where no edge of ``b`` was met (strake_course_gaps).
    ``trace_tolerance`` is the error per step of the geodesic traces."""
    opts = _geodesic_options(trace_tolerance, max_steps)
    unmatched = ctypes.c_size_t(0)
    gaps = _fill(lambda buf, cap, k: _lib.lib.strake_course_gaps(
        surface.handle, a.handle, b.handle, int(side), float(band_width), int(samples),
        float(tolerance), opts.ctypes.data, buf, cap, k, ctypes.byref(unmatched)),
        dtype("StrakeCourseGap"))
    return gaps, unmatched.value


def course_check(surface: Surface, course: Curve, limits: dict, samples: int) -> dict:
    """Steering and twist along ``course`` at ``samples`` even parameters, summarised (the
    fields of StrakeCourseCheck; ``limits`` as for :func:`check_fibre`)."""
    lim = _record("StrakeFibreLimits", limits, "limits")
    return _dict(_single("StrakeCourseCheck", lambda o: _lib.lib.strake_course_check(
        surface.handle, course.handle, lim.ctypes.data, int(samples), o))[0])


# ---- Drive patterns and passes ---------------------------------------------------------------


class DriveResult(_Handle):
    """A planar pattern projected onto a surface (:func:`drive_project`): its pieces and its
    intervals of misses, folds and multiple hits."""

    _free = staticmethod(_lib.lib.strake_drive_result_free)

    def piece_count(self) -> int:
        """The number of pieces (0 when every ray misses)."""
        n = ctypes.c_size_t(0)
        _check(_lib.lib.strake_drive_result_piece_count(self.handle, ctypes.byref(n)))
        return n.value

    def __len__(self) -> int:
        return self.piece_count()

    def piece(self, index: int) -> tuple:
        """(curve, (start, end)): piece ``index`` as a curve in the surface's parameter plane
        (t in [0, 1]; it outlives the result) and the pattern parameters where it starts and
        ends."""
        rng = np.zeros(2)
        c = Curve._made(lambda out: _lib.lib.strake_drive_result_piece(self.handle, index,
                                                                       rng.ctypes.data, out))
        return c, (float(rng[0]), float(rng[1]))

    def intervals(self) -> np.ndarray:
        """The intervals (``dtype("StrakePatternInterval")``, ``kind`` a
        :class:`PatternIntervalKind`), ordered by start."""
        return _fill(lambda b, c, k: _lib.lib.strake_drive_result_intervals(self.handle, b, c, k),
                     dtype("StrakePatternInterval"))

    def pieces(self) -> list:
        """Every piece as (curve, (start, end)), in pattern order."""
        return [self.piece(i) for i in range(self.piece_count())]


def drive_project(surface: Surface, plane: dict, direction: Sequence[float], pattern: Curve,
                  fit_tolerance: float, hit_tolerance: float = 1e-9, **options) -> DriveResult:
    """Projects the planar curve ``pattern`` (its u, v read as the plane's x, y) onto
    ``surface`` along ``direction`` (strake_drive_project). ``plane`` = {"origin", "x_axis",
    "y_axis"} (3 numbers each); ``fit_tolerance`` bounds the distance from the fitted pieces
    to the hits, ``hit_tolerance`` the distance from a hit to its ray (host length unit);
    ``options``: the other fields of StrakeDriveOptions (``samples``, ``locate_tolerance``,
    ``projection`` = a dict of StrakeProjectionOptions fields), 0 for their defaults."""
    pl = _record("StrakeDrivePlane", plane, "plane")
    d = _fixed(direction, "direction", 3)
    projection = dict(options.pop("projection", {}))
    projection.setdefault("tolerance", hit_tolerance)
    opts = _options("StrakeDriveOptions", dict(options, fit_tolerance=fit_tolerance,
                                               projection=projection))
    return DriveResult._made(lambda out: _lib.lib.strake_drive_project(
        surface.handle, pl.ctypes.data, _ptr(d), pattern.handle, opts.ctypes.data, out))


class PassPlan(_Handle):
    """A plan of passes across a surface (:func:`plan_passes`)."""

    _free = staticmethod(_lib.lib.strake_pass_plan_free)

    def summary(self) -> dict:
        """The totals (the fields of StrakePassSummary)."""
        return _dict(_single("StrakePassSummary", lambda o: _lib.lib.strake_pass_plan_summary(
            self.handle, o))[0])

    def passes(self) -> np.ndarray:
        """One ``dtype("StrakePassInfo")`` record per pass after the first, in plan order."""
        return _fill(lambda b, c, k: _lib.lib.strake_pass_plan_passes(self.handle, b, c, k),
                     dtype("StrakePassInfo"))

    def curve(self, index: int) -> Curve:
        """Pass ``index`` after the first (0-based, the order of :meth:`passes`) as a curve in
        (u, v), t in [0, 1] (it outlives the plan)."""
        return Curve._made(lambda out: _lib.lib.strake_pass_plan_curve(self.handle, index, out))

    def curves(self) -> list:
        """Every pass after the first as a curve, in plan order."""
        return [self.curve(i) for i in range(self.summary()["count"] - 1)]


def plan_passes(surface: Surface, first: Curve, **options) -> PassPlan:
    """Plans passes of a ball-end mill across ``surface`` from the pass ``first``
    (strake_plan_passes). ``options``: the fields of StrakePassOptions (``ball_radius``,
    ``rule`` a :class:`StepRule`, ``scallop_height`` or ``step_over``, ``advance`` an
    :class:`OffsetSide`, ``chord_tolerance``, ...; 0 for their defaults)."""
    opts = _options("StrakePassOptions", options)
    return PassPlan._made(lambda out: _lib.lib.strake_plan_passes(
        surface.handle, first.handle, opts.ctypes.data, out))


__all__ = [
    "FRAME_DTYPE", "SAMPLE_DTYPE", "VIOLATION_DTYPE", "dtype", "version",
    "status_name", "last_error_message", "last_callback_code", "error_class",
    "StrakeError", "ArgumentError", "NurbsDataError", "EvaluationError", "CallbackError",
    "ToolPathError", "PlanningError", "InternalError",
    "Status", "Parametrization", "ToolSide", "CutterKind", "DirectionKind", "GeodesicEnd",
    "DomainSide", "OffsetSide", "KnotLineFlag", "PatternIntervalKind", "StepRule", "FeedBound",
    "BALL", "FLAT", "TOROIDAL", "ALONG_NORMAL", "AGAINST_NORMAL", "LEFT", "RIGHT",
    "Surface", "Curve", "Offset", "DriveResult", "PassPlan", "project_points",
    "frame_at", "frames_at", "frames_even", "frame_from_jets", "knot_line_flags",
    "samples_at", "sample_even_t", "sample_even_arc", "sample_chordal", "sample_chordal_centre",
    "arc_length", "path_extremes", "path_violations",
    "check_gouge", "check_rear_gouge", "check_scallop", "check_step_over",
    "check_step_over_cutter", "check_feed", "check_fibre", "check_tow_edges", "tool_axis",
    "cutter_radii",
    "check_gouge_path", "check_rear_gouge_path", "check_scallop_path",
    "check_step_over_cutter_path", "check_feed_path", "check_fibre_path",
    "check_tow_edges_path", "tool_axis_path",
    "invariant_rates_at", "invariant_rates_path", "centre_point_at", "centre_path_at",
    "centre_feed", "centre_feed_path",
    "geodesic_trace", "geodesic_between", "offset", "course_fixed_angle", "course_adjacent",
    "course_gaps", "course_check", "drive_project", "plan_passes",
]

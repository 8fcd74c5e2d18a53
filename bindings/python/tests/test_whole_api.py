"""Tests of the parts of strake_darboux beyond frames and checks: higher-order and batch
surfaces, geodesics, the tool-centre path, offsets, courses, drive patterns and passes, with
values checked against closed forms; and the wrapper's coverage of the shipped header (run by
tests/install.rs after pip installs the package)."""

import inspect
import math
import os
import re

import numpy as np
import pytest

import strake_darboux as sd
from strake_darboux import _lib

R = 2.0  # the test sphere's radius


def sphere_high(u, v, order):
    """S = R (cos u cos v, sin u cos v, sin v) and its partials to ``order``, rows in the
    order of StrakeSurfaceHighJet (S; Su, Sv; Suu, Suv, Svv; ...): d^a/du^a d^b/dv^b of
    cos u cos v is cos(u + a pi/2) cos(v + b pi/2) (each derivative of cos or sin shifts its
    argument by pi/2)."""
    h = math.pi / 2
    rows = []
    for n in range(order + 1):
        for b in range(n + 1):
            a = n - b
            rows.append([R * math.cos(u + a * h) * math.cos(v + b * h),
                         R * math.sin(u + a * h) * math.cos(v + b * h),
                         R * math.sin(v + b * h) if a == 0 else 0.0])
    return rows


def on_sphere(u, v):
    return R * np.array([math.cos(u) * math.cos(v), math.sin(u) * math.cos(v), math.sin(v)])


@pytest.fixture
def sphere():
    with sd.Surface.from_high_function(sphere_high, (-3, 3), (-1.2, 1.2), max_order=4) as s:
        yield s


@pytest.fixture
def plane():
    """S(u, v) = (10 u, 10 v, 0) over [0, 1]^2: N = +z; along a u-line B = N x T = +y."""
    pts = [[[0, 0, 0], [0, 10, 0]], [[10, 0, 0], [10, 10, 0]]]
    with sd.Surface.nurbs(1, 1, [0, 0, 1, 1], [0, 0, 1, 1], pts) as s:
        yield s


def bowl(u, v, order):
    return [[u, v, 0.5 * (u * u + v * v)], [1, 0, u], [0, 1, v], [0, 0, 1], [0, 0, 0], [0, 0, 1]]


# ---- Geodesics and the tool-centre path on a sphere -----------------------------------------


def test_a_geodesic_on_a_sphere_is_a_great_circle(sphere):
    # Closed form (any differential geometry text): after arc length L the end lies at the
    # central angle L/R from the start; kg = 0 and kn = -1/R (N points outward).
    length = 2.5
    curve, info = sd.geodesic_trace(sphere, 0.2, 0.1, 0.7, length, tolerance=1e-11)
    assert info["end"] == sd.GeodesicEnd.LENGTH and info["length"] == pytest.approx(length, abs=1e-12)
    p0 = on_sphere(0.2, 0.1)
    assert np.dot(p0, info["point"]) / R**2 == pytest.approx(math.cos(length / R), abs=1e-9)
    f = sd.frames_even(sphere, curve, 9)
    assert np.all(np.abs(f["geodesic_curvature"]) < 1e-6)
    np.testing.assert_allclose(f["normal_curvature"], -1 / R, rtol=1e-12)
    # A direction in (du, dv) and in space give the same kind of curve.
    _, info2 = sd.geodesic_trace(sphere, 0.0, 0.0, [0.0, 1.0], 1.0, tolerance=1e-11)
    assert info2["v"] == pytest.approx(1.0 / R, abs=1e-9) and info2["u"] == pytest.approx(0.0, abs=1e-9)
    # Between two points: R times the central angle.
    a, b = on_sphere(-0.5, 0.2), on_sphere(0.7, -0.3)
    dist, between = sd.geodesic_between(sphere, (-0.5, 0.2), (0.7, -0.3), tolerance=1e-9)
    assert dist == pytest.approx(R * math.acos(np.dot(a, b) / R**2), abs=1e-7)
    assert sd.arc_length(sphere, between, 0, dist) == pytest.approx(dist, abs=1e-8)


def test_rates_and_the_centre_path_along_a_circle_of_latitude(sphere):
    # Along v = v0, kn = -1/R, kg = tan(v0)/R and tg = 0 are constant: every rate is 0.
    v0 = 0.3
    lat = sd.Curve.line((-1.0, v0), (1.0, v0))
    frame, rates = sd.invariant_rates_at(sphere, lat, 0.4)
    assert frame["geodesic_curvature"] == pytest.approx(math.tan(v0) / R, rel=1e-13)
    assert max(abs(x) for x in rates.values()) < 1e-12
    ts = np.linspace(0, 1, 7)
    frames, r = sd.invariant_rates_path(sphere, lat, ts)
    assert frames.dtype == sd.FRAME_DTYPE and r.dtype == sd.dtype("StrakeInvariantRates")
    assert np.all(np.abs(r["normal_curvature_rate"]) < 1e-12)
    # A ball of radius r outside the sphere: its centre runs on the circle of radius
    # (R + r) cos v0, so kc = 1/((R + r) cos v0) and ds_c/ds = (R + r)/R.
    rb = 0.5
    ball = {"kind": sd.BALL, "radius": rb, "corner_radius": 0.0}
    upright = {"lead": 0.0, "tilt": 0.0}
    c = sd.centre_point_at(sphere, lat, 0.25, ball, upright)
    assert c["order"] == 4 and c["speed_ratio"] == pytest.approx((R + rb) / R, rel=1e-12)
    assert c["curvature"] == pytest.approx(1 / ((R + rb) * math.cos(v0)), rel=1e-12)
    path = sd.centre_path_at(sphere, lat, ts, ball, upright)
    np.testing.assert_allclose(np.hypot(path["centre"][:, 0], path["centre"][:, 1]),
                               (R + rb) * math.cos(v0), rtol=1e-12)
    # The acceleration bound: v^2 kc <= a gives v = sqrt(a / kc).
    limits = {"feed": 100.0, "max_acceleration": 50.0, "max_jerk": 0.0, "max_angular_speed": 0.0}
    feeds = sd.centre_feed_path(path, limits)
    one = sd.centre_feed(path[2], limits)
    assert feeds["feed"][2] == one["feed"] and one["bound"] == sd.FeedBound.ACCELERATION
    np.testing.assert_allclose(feeds["feed"], np.sqrt(50.0 / path["curvature"]), rtol=1e-10)
    samples = sd.sample_chordal_centre(sphere, lat, 1e-4, 0.0, ball, upright)
    assert len(samples) > 2
    assert samples["arc_length"][-1] == pytest.approx(2 * R * math.cos(v0), abs=1e-9)


def test_a_host_curve_of_third_order_along_a_circle_of_latitude(sphere):
    # The circle of latitude v0 run at a varying speed, u(t) = t + 0.3 t^3 (d3u = 1.8, so a
    # lost third derivative would show): the invariants are constant in arc length, so every
    # rate is 0 whatever the parametrisation, and a ball's centre path has curvature
    # 1/((R + r) cos v0) (closed forms as in the test above).
    v0 = 0.3

    def lat_high(t, order):
        return [[t + 0.3 * t**3, v0], [1 + 0.9 * t**2, 0.0], [1.8 * t, 0.0], [1.8, 0.0],
                [0.0, 0.0]][: order + 1]

    lat = sd.Curve.from_high_function(lat_high, (-0.8, 0.8), max_order=4)
    frame, rates = sd.invariant_rates_at(sphere, lat, 0.5)
    assert frame["geodesic_curvature"] == pytest.approx(math.tan(v0) / R, rel=1e-13)
    assert max(abs(x) for x in rates.values()) < 1e-12
    ball = {"kind": sd.BALL, "radius": 0.5, "corner_radius": 0.0}
    c = sd.centre_point_at(sphere, lat, 0.25, ball, {"lead": 0.0, "tilt": 0.0})
    assert c["curvature"] == pytest.approx(1 / ((R + 0.5) * math.cos(v0)), rel=1e-12)
    # The same curve of second order only: the third-order call is refused.
    lat2 = sd.Curve.from_function(lambda t: lat_high(t, 2), (-0.8, 0.8))
    with pytest.raises(sd.EvaluationError) as e:
        sd.invariant_rates_at(sphere, lat2, 0.5)
    assert e.value.status == sd.Status.ORDER_UNAVAILABLE


def test_order_unavailable_is_an_evaluation_error_and_folds_a_tool_path_error(sphere):
    s = sd.Surface.from_function(bowl, (-1, 1), (-1, 1))
    line = sd.Curve.line((-0.5, 0.0), (0.5, 0.0))
    with pytest.raises(sd.EvaluationError) as e:
        sd.invariant_rates_at(s, line, 0.5)
    assert e.value.status == sd.Status.ORDER_UNAVAILABLE
    # A ball larger than the sphere's radius inside it (tool against N): the centre path
    # folds back (its radius R - r would be negative).
    lat = sd.Curve.line((-1.0, 0.0), (1.0, 0.0))
    big = {"kind": sd.BALL, "radius": 3.0, "corner_radius": 0.0}
    with pytest.raises(sd.ToolPathError) as e:
        sd.centre_point_at(sphere, lat, 0.5, big, {"lead": 0.0, "tilt": 0.0},
                           tool_side=sd.AGAINST_NORMAL)
    assert e.value.status_name == "STRAKE_STATUS_CENTRE_PATH_FOLDS"
    assert sd.error_class(56) is sd.PlanningError and sd.error_class(90) is sd.InternalError
    assert sd.error_class(77) is sd.StrakeError


# ---- Offsets, courses, drive patterns and passes on a plane ----------------------------------


def test_the_offset_of_a_line_on_a_plane_is_the_parallel_line(plane):
    mid = sd.Curve.line((0.2, 0.5), (0.8, 0.5))  # (2, 5) to (8, 5)
    with sd.offset(plane, mid, 1.5, side=sd.LEFT, chord_tolerance=1e-6) as off:
        summary = off.summary()
        assert (summary["pieces"], summary["exits"], summary["loops"]) == (1, 0, 0)
        pts = off.piece_points(0)
        assert pts.dtype == sd.dtype("StrakeOffsetPoint") and len(pts) == summary["points"]
        np.testing.assert_allclose(pts["distance"], 1.5, atol=1e-9)
        np.testing.assert_allclose(pts["point"][:, 1], 6.5, atol=1e-9)
        f = sd.frame_at(plane, off.piece_curve(0), 0.5)
        assert f["point"][1] == pytest.approx(6.5, abs=1e-9)
        assert len(off.exits()) == 0 and len(off.loops()) == 0
        assert len(off.piece_curves()) == 1 and len(off) == 1
    ramp = sd.offset(plane, mid, [1.0, 2.0], distance_t=[0.0, 1.0], chord_tolerance=1e-6)
    p = ramp.piece_points(0)
    np.testing.assert_allclose(p["distance"], 1.0 + p["t"], atol=1e-9)
    with pytest.raises(sd.PlanningError) as e:
        sd.offset(plane, mid, 6.0, side=sd.RIGHT, chord_tolerance=1e-6)
    assert e.value.status == sd.Status.LEAVES_SURFACE
    with pytest.raises(sd.ArgumentError, match="no field"):
        sd.offset(plane, mid, 1.0, chord_tolerance=1e-6, chord=1)


def test_passes_a_constant_step_over_apart_on_a_plane(plane):
    # From y = 5 to the left (+y) 2 apart: y = 7 and 9, then y = 11 is off the patch. A ball
    # of radius 3 leaves 3 - sqrt(3^2 - 1^2) between passes 2 apart on a plane.
    first = sd.Curve.line((0.1, 0.5), (0.9, 0.5))
    plan = sd.plan_passes(plane, first, ball_radius=3.0, rule=sd.StepRule.CONSTANT_STEP_OVER,
                          step_over=2.0, chord_tolerance=1e-7)
    s = plan.summary()
    assert (s["count"], s["rows"], s["covered"]) == (3, 3, 1)
    h = 3.0 - math.sqrt(8.0)
    assert s["scallop_max"] == pytest.approx(h, abs=1e-9) and s["scallop_min"] == pytest.approx(h, abs=1e-9)
    assert s["total_length"] == pytest.approx(24.0, abs=1e-9)
    info = plan.passes()
    assert info.dtype == sd.dtype("StrakePassInfo") and list(info["row"]) == [1, 2]
    np.testing.assert_allclose(info["step_over_min"], 2.0, atol=1e-7)
    assert sd.frame_at(plane, plan.curve(1), 0.3)["point"][1] == pytest.approx(9.0, abs=1e-6)
    ys = [sd.frame_at(plane, c, 0.5)["point"][1] for c in plan.curves()]
    np.testing.assert_allclose(ys, [7.0, 9.0], atol=1e-6)
    # Iso-scallop with the height of that step-over gives the same passes (w = 2 sqrt(h(2r - h))).
    iso = sd.plan_passes(plane, first, ball_radius=3.0, rule=sd.StepRule.ISO_SCALLOP,
                         scallop_height=h, chord_tolerance=1e-7)
    np.testing.assert_allclose(iso.passes()["step_over_max"], 2.0, atol=1e-6)
    plan.close()
    with pytest.raises(sd.ArgumentError, match="closed"):
        plan.summary()


def test_a_pattern_projected_onto_a_plane_lands_under_itself(plane):
    above = {"origin": [0, 0, 5], "x_axis": [1, 0, 0], "y_axis": [0, 1, 0]}
    pattern = sd.Curve.nurbs(1, [0, 0, 1, 1], [[5, 5], [15, 5]])
    drive = sd.drive_project(plane, above, [0, 0, -1], pattern, fit_tolerance=1e-8)
    assert drive.piece_count() == 1 and len(drive) == 1
    curve, (start, end) = drive.piece(0)
    assert start == 0.0 and end == pytest.approx(0.5, abs=1e-7)
    f = sd.frame_at(plane, curve, 0.5)
    assert f["point"][0] == pytest.approx(7.5, abs=1e-6) and f["point"][1] == pytest.approx(5.0, abs=1e-8)
    assert len(drive.pieces()) == 1
    misses = drive.intervals()
    assert len(misses) == 1 and misses["kind"][0] == sd.PatternIntervalKind.MISS
    assert misses["start"][0] == pytest.approx(0.5, abs=1e-7) and misses["end"][0] == 1.0
    # Spiral of pitch 0.5 from radius 0.5 to 3: theta ends at 2 pi (3 - 0.5)/0.5.
    spiral = sd.Curve.spiral((5, 5), 0.5, 3.0, 0.5)
    sdr = sd.drive_project(plane, above, [0, 0, -1], spiral, fit_tolerance=1e-6)
    assert sdr.piece(0)[1][1] == pytest.approx(10 * math.pi, abs=1e-9)


def test_courses_on_a_plane(plane):
    # A fixed-angle course on a plane is the straight line at that angle to the axis.
    course, info = sd.course_fixed_angle(plane, 0.2, 0.2, [1, 0, 0], 0.3, 4.0, tolerance=1e-10)
    assert info["end"] == sd.GeodesicEnd.LENGTH
    np.testing.assert_allclose(info["point"][:2], [2 + 4 * math.cos(0.3), 2 + 4 * math.sin(0.3)], atol=1e-8)
    mid = sd.Curve.line((0.2, 0.5), (0.8, 0.5))
    nxt = sd.course_adjacent(plane, mid, 1.0, chord_tolerance=1e-6).piece_curve(0)
    assert sd.frame_at(plane, nxt, 0.5)["point"][1] == pytest.approx(6.0, abs=1e-9)
    # Bands 0.8 wide on lines 1.0 apart leave a gap of 0.2 all along.
    gaps, unmatched = sd.course_gaps(plane, mid, nxt, 0.8, 9, tolerance=1e-6, trace_tolerance=1e-9)
    assert unmatched == 0 and len(gaps) == 1 and gaps["overlap"][0] == 0
    assert gaps["worst"][0] == pytest.approx(0.2, abs=1e-7)
    check = sd.course_check(plane, mid, {"tow_width": 0.5, "min_steering_radius": 100.0,
                                         "max_twist_rate": 0.1}, 11)
    assert check["length"] == pytest.approx(6.0, abs=1e-12) and check["max_steering_curvature"] == 0.0


def test_points_in_space_onto_a_plane(plane):
    pr = sd.project_points(plane, [[3, 4, 2], [6, 4, -1]])
    np.testing.assert_allclose(pr["u"], [0.3, 0.6], atol=1e-12)
    np.testing.assert_allclose(pr["signed_distance"], [2.0, -1.0], atol=1e-12)
    with pytest.raises(sd.EvaluationError) as e:
        sd.project_points(plane, [[3, 4, 2]], tolerance=1.0)
    assert e.value.status == sd.Status.TOO_FAR_FROM_SURFACE
    c = sd.Curve.through_space_points(plane, [[1, 1, 0.5], [4, 2, 0.5], [7, 4, 0.5], [9, 5, 0.5]],
                                      tolerance=1.0)
    np.testing.assert_allclose(c.projections["distance"], 0.5, atol=1e-12)
    assert sd.frame_at(plane, c, 1.0)["point"][0] == pytest.approx(9.0, abs=1e-9)
    p = sd.Curve.project_nurbs(plane, 1, [0, 0, 1, 1], [[2, 2, 1], [8, 8, 1]], fit_tolerance=1e-8)
    np.testing.assert_allclose(sd.frame_at(plane, p, 0.5)["point"], [5, 5, 0], atol=1e-7)


# ---- Surfaces, curves and single-sample checks -----------------------------------------------


def test_batch_callbacks_and_python_curves():
    one = sd.Surface.from_function(bowl, (-1, 1), (-1, 1))

    def bowl_many(u, v, order):
        z, o = np.zeros_like(u), np.ones_like(u)
        return np.stack([np.stack([u, v, 0.5 * (u * u + v * v)], -1), np.stack([o, z, u], -1),
                         np.stack([z, o, v], -1), np.stack([z, z, o], -1),
                         np.stack([z, z, z], -1), np.stack([z, z, o], -1)], axis=1)

    many = sd.Surface.from_batch_function(bowl_many, (-1, 1), (-1, 1))
    line = sd.Curve.line((-0.8, -0.3), (0.7, 0.6))
    assert sd.frames_even(one, line, 200).tobytes() == sd.frames_even(many, line, 200).tobytes()
    many.set_knot_lines([0.5], [])
    with pytest.raises(sd.ArgumentError):
        many.set_knot_lines([2.0])
    lam = sd.Curve.from_function(lambda t: (t - 0.5, 0, 1, 0, 0, 0), (0, 1))
    assert sd.frame_at(one, lam, 0.5)["normal_curvature"] == 1.0

    def refusing(t):
        raise LookupError("no curve data here")

    with pytest.raises(sd.CallbackError, match="no curve data here") as e:
        sd.frame_at(one, sd.Curve.from_function(refusing, (0, 1)), 0.5)
    assert e.value.status == sd.Status.CURVE_CALLBACK_FAILED and sd.last_callback_code() == -1
    ends = sd.Curve.through_uv_points([[-0.5, 0], [0, 0.1], [0.5, 0]], start_derivative=(1, 0),
                                      end_derivative=(1, 0))
    assert len(sd.frames_even(one, ends, 5)) == 5
    # The frame from two jets: the bowl at the origin along u has kn = 1.
    f = sd.frame_from_jets(bowl(0, 0, 2), [0, 0, 1, 0, 0, 0], scales=(2, 2, 1))
    assert f["normal_curvature"] == 1.0 and f["geodesic_curvature"] == 0.0
    # A degree-1 patch with an interior u knot at 0.5 is only C0 there.
    pts = [[[0, 0, 0], [0, 1, 0]], [[0.5, 0, 0.2], [0.5, 1, 0.2]], [[1, 0, 0], [1, 1, 0]]]
    roof = sd.Surface.nurbs(1, 1, [0, 0, 0.5, 1, 1], [0, 0, 1, 1], pts)
    flags = sd.knot_line_flags(roof, sd.Curve.line((0, 0.5), (1, 0.5)), [0.25, 0.5])
    assert flags[0] == 0 and flags[1] & sd.KnotLineFlag.U_LINE and flags[1] & sd.KnotLineFlag.U_ONLY_C0


def test_single_sample_checks_agree_with_the_whole_path_ones():
    s = sd.Surface.from_function(bowl, (-1, 1), (-1, 1))
    samples = sd.sample_even_t(s, sd.Curve.line((-0.8, -0.3), (0.7, 0.6)), 5)
    torus = {"kind": sd.TOROIDAL, "radius": 0.2, "corner_radius": 0.05}
    lean = {"lead": 0.1, "tilt": 0.05}
    side = sd.AGAINST_NORMAL
    paths = {
        "check_gouge": sd.check_gouge_path(samples, torus, lean, side),
        "check_rear_gouge": sd.check_rear_gouge_path(samples, torus, lean, side),
        "check_step_over_cutter": sd.check_step_over_cutter_path(samples, torus, lean, 0.001, side),
        "check_tow_edges": sd.check_tow_edges_path(samples, 0.05),
        "tool_axis": sd.tool_axis_path(samples, lean, side),
        "check_scallop": sd.check_scallop_path(samples, 0.1, 0.02, side),
        "check_fibre": sd.check_fibre_path(samples, {"tow_width": 0.01, "min_steering_radius": 1.0,
                                                     "max_twist_rate": 1.0}),
    }
    for i in range(len(samples)):
        f = samples["frame"][i]
        singles = {
            "check_gouge": sd.check_gouge(f, torus, lean, side),
            "check_rear_gouge": sd.check_rear_gouge(f, torus, lean, side),
            "check_step_over_cutter": sd.check_step_over_cutter(f, torus, lean, 0.001, side),
            "check_tow_edges": sd.check_tow_edges(f, 0.05),
            "tool_axis": sd.tool_axis(f, lean, side),
            "check_scallop": sd.check_scallop(f, 0.1, 0.02, side),
            "check_fibre": sd.check_fibre(f, {"tow_width": 0.01, "min_steering_radius": 1.0,
                                              "max_twist_rate": 1.0}),
        }
        for name, one in singles.items():
            for field, value in one.items():
                np.testing.assert_array_equal(paths[name][field][i], value, err_msg=f"{name}.{field}")
    feed = sd.check_feed(samples["frame"][2], {"feed": 1.0, "max_acceleration": 0.5, "max_jerk": 0.0})
    assert feed == sd.check_feed_path(samples, {"feed": 1.0, "max_acceleration": 0.5, "max_jerk": 0.0})[2]
    st = sd.check_step_over(samples["frame"][2], 0.1, 0.001)
    # On the bowl near the middle the exact rule inverts the scallop rule.
    back = sd.check_scallop(samples["frame"][2], 0.1, st["step_over"])
    assert back["height"] == pytest.approx(0.001, rel=1e-10)
    radii = sd.cutter_radii({"kind": sd.BALL, "radius": 0.3, "corner_radius": 0.0}, lean)
    assert radii["across_path"] == pytest.approx(0.3, rel=1e-15)


# ---- The wrapper against the shipped header -------------------------------------------------


def test_every_function_of_the_header_is_wrapped():
    """Every exported function of the shipped strake.h is called by the package's Python code
    (its signature is set from the header, and a public function or method calls it)."""
    source = inspect.getsource(sd)
    called = set(re.findall(r"\b(strake_\w+)\b", source))
    missing = [name for name in _lib.FUNCTIONS if name not in called]
    assert not missing, f"functions of strake.h with no Python wrapper: {missing}"
    assert len(_lib.FUNCTIONS) >= 81
    for name in _lib.FUNCTIONS:
        assert getattr(_lib.lib, name).argtypes is not None
    assert all(hasattr(sd, name) for name in sd.__all__)


def test_layouts_and_constants_come_from_the_header():
    assert sd.FRAME_DTYPE is sd.dtype("StrakeFrame")
    assert sd.dtype("StrakeSurfaceJet").itemsize == 18 * 8
    assert sd.dtype("StrakeSample").fields["arc_length"][1] == sd.FRAME_DTYPE.itemsize
    assert sd.StepRule.CONSTANT_STEP_OVER == 1 and sd.FeedBound.ANGULAR_SPEED == 3
    assert sd.PatternIntervalKind.SEVERAL_HITS == 2 and sd.Status.PASS_LIMIT == 56
    assert all(sd.status_name(v) == "STRAKE_" + "STATUS_" + k for k, v in sd.Status.__members__.items())
    # A field a later version adds at the end of an options struct is read from the header
    # and defaults to 0: the same parse on a header with one more field.
    header = open(_lib.HEADER_PATH, encoding="utf-8").read()
    grown = re.sub(r"(typedef struct StrakePassOptions \{.*?)(\} StrakePassOptions;)",
                   r"\1  double added_later;\n\2", header, count=1, flags=re.S)
    old, new = _lib.parse_structs(header)["StrakePassOptions"], _lib.parse_structs(grown)["StrakePassOptions"]
    assert new.names[-1] == "added_later" and new.itemsize == old.itemsize + 8
    assert new.names[:-1] == old.names and all(new.fields[n][1] == old.fields[n][1] for n in old.names)
    assert os.path.dirname(_lib.HEADER_PATH) == os.path.dirname(_lib.LIBRARY_PATH)
    assert sd.__version__ == sd.version() == _lib.HEADER_VERSION

"""Tests of the Python package strake_darboux (run by tests/install.rs after pip installs it)."""

import gc

import numpy as np
import pytest

import strake_darboux as sd


def bowl(u, v, order):
    """z = (u^2 + v^2)/2 over [-1, 1]^2: rows S, Su, Sv, Suu, Suv, Svv."""
    return [[u, v, 0.5 * (u * u + v * v)], [1, 0, u], [0, 1, v], [0, 0, 1], [0, 0, 0], [0, 0, 1]]


@pytest.fixture
def surface():
    with sd.Surface.from_function(bowl, (-1, 1), (-1, 1)) as s:
        yield s


def test_version_matches_the_package():
    assert sd.version() == "0.1.0"


def test_a_path_of_100k_frames_in_one_call_matches_the_closed_form(surface):
    # Along v = 0 the path is the plane curve z = u^2/2, whose principal normal is the
    # surface normal there: kn = curvature = f''/(1 + f'^2)^(3/2) = 1/(1 + u^2)^(3/2), kg = 0
    # (the curvature of a plane graph, any calculus text; formula recalled from memory).
    line = sd.Curve.line((-0.9, 0.0), (0.9, 0.0))
    ts = np.linspace(0.0, 1.0, 100_000)
    f = sd.frames_at(surface, line, ts)
    assert f.dtype == sd.FRAME_DTYPE and f.shape == (100_000,)
    u = -0.9 + 1.8 * ts
    np.testing.assert_allclose(f["normal_curvature"], (1 + u * u) ** -1.5, rtol=1e-13)
    assert np.all(np.abs(f["geodesic_curvature"]) < 1e-14)
    np.testing.assert_allclose(f["point"][:, 0], u, atol=1e-15)
    np.testing.assert_allclose(np.linalg.norm(f["tangent"], axis=1), 1.0, rtol=1e-15)


def test_output_arrays_are_reused_and_threads_agree(surface):
    line = sd.Curve.line((-0.5, -0.5), (0.8, 0.3))
    ts = np.linspace(0, 1, 5000)
    out = np.zeros(5000, dtype=sd.FRAME_DTYPE)
    got = sd.frames_at(surface, line, ts, out=out)
    assert got is out and out["speed"].min() > 0
    par = sd.frames_at(surface, line, ts, threads=2)
    assert par.tobytes() == out.tobytes()
    with pytest.raises(sd.ArgumentError, match="out"):
        sd.frames_at(surface, line, ts, out=np.zeros(10, dtype=sd.FRAME_DTYPE))


def test_surface_evaluation_gives_the_functions_values(surface):
    uv = np.array([[0.25, -0.5], [0.0, 0.75]])
    jets = surface.evaluate(uv, order=1)
    assert jets.shape == (2, 6, 3)
    np.testing.assert_array_equal(jets[0, :3], np.array(bowl(0.25, -0.5, 1))[:3])
    assert np.all(jets[:, 3:] == 0)
    out = np.empty((2, 6, 3))
    assert surface.evaluate(uv, out=out) is out


def test_native_nurbs_surface_bilinear_patch():
    # Degree 1 x 1 with corner heights 0, 0, 0, 1: z = u v (The NURBS Book eq. 3.11).
    pts = np.array([[[0, 0, 0], [0, 1, 0]], [[1, 0, 0], [1, 1, 1]]], dtype=float)
    s = sd.Surface.nurbs(1, 1, [0, 0, 1, 1], [0, 0, 1, 1], pts)
    rng = np.random.default_rng(7)
    uv = rng.random((100, 2))
    j = s.evaluate(uv)
    np.testing.assert_allclose(j[:, 0, 2], uv[:, 0] * uv[:, 1], rtol=1e-14, atol=1e-15)
    np.testing.assert_array_equal(j[:, 4, 2], 1.0)


def test_samples_with_arc_length_feed_the_path_summaries(surface):
    line = sd.Curve.line((-0.5, 0.0), (0.5, 0.0))
    ts = np.linspace(0, 1, 201)
    s = sd.samples_at(surface, line, ts)
    assert s.dtype == sd.SAMPLE_DTYPE
    # Arc length of z = u^2/2 from -0.5 to 0.5: the integral of sqrt(1 + u^2) is
    # [u sqrt(1 + u^2) + asinh u]/2 (standard integral, recalled from memory; checked against
    # strake_arc_length below as well).
    whole = 0.5 * np.sqrt(1.25) + np.arcsinh(0.5)
    assert s["arc_length"][-1] == pytest.approx(whole, rel=1e-12)
    assert s["arc_length"][-1] == pytest.approx(sd.arc_length(surface, line, 0, 1), rel=1e-12)
    kn = s["frame"]["normal_curvature"]
    e = sd.path_extremes(s, kn)
    assert e["max_index"] == 100 and e["max"] == pytest.approx(1.0, rel=1e-14)
    v = sd.path_violations(s, kn, 0.95)
    assert v.shape == (1,) and v["first_index"][0] < 100 < v["last_index"][0]
    assert len(sd.sample_even_arc(surface, line, 11)) == 11
    assert len(sd.sample_chordal(surface, line, 1e-4, 0.5)) > 2


def test_failures_raise_the_family_class_with_strakes_message(surface):
    line = sd.Curve.line((-0.5, 0.0), (0.5, 0.0))
    with pytest.raises(sd.EvaluationError) as e:
        sd.frame_at(surface, line, 1.5)
    assert e.value.status_name == "STRAKE_STATUS_OUT_OF_DOMAIN"
    assert "strake_frame_at" in str(e.value) and "1.5" in str(e.value)
    with pytest.raises(sd.NurbsDataError, match="knot"):
        sd.Curve.nurbs(1, [0, 1, 0, 1], [[0, 0], [1, 1]])
    with pytest.raises(sd.ArgumentError):
        sd.frames_at(surface, line, [[0.1, 0.2]])
    assert issubclass(sd.ArgumentError, ValueError) and issubclass(sd.CallbackError, sd.StrakeError)


def test_a_python_callback_that_raises_comes_back_with_its_text():
    def hull(u, v, order):
        if u > 0.5:
            raise KeyError("no hull data beyond u = 0.5")
        return bowl(u, v, order)

    s = sd.Surface.from_function(hull, (-1, 1), (-1, 1))
    line = sd.Curve.line((0.0, 0.0), (1.0, 0.0))
    with pytest.raises(sd.CallbackError) as e:
        sd.frames_at(s, line, np.linspace(0, 1, 1000), threads=2)
    assert "KeyError" in str(e.value) and "no hull data beyond u = 0.5" in str(e.value)
    assert e.value.callback_code == -1

    bad = sd.Surface.from_function(lambda u, v, order: [[u, v, 0]], (-1, 1), (-1, 1))
    with pytest.raises(sd.CallbackError, match="shape"):
        sd.frame_at(bad, line, 0.5)


def test_handles_free_themselves_and_refuse_use_after_close():
    s = sd.Surface.from_function(bowl, (-1, 1), (-1, 1))
    c = sd.Curve.through_uv_points([[0, 0], [0.2, 0.1], [0.4, 0.3], [0.5, 0.5]])
    assert sd.frames_even(s, c, 4).shape == (4,)
    c.close()
    c.close()  # twice is harmless
    with pytest.raises(sd.ArgumentError, match="closed"):
        sd.frames_even(s, c, 4)
    for _ in range(200):
        sd.Surface.from_function(bowl, (-1, 1), (-1, 1))
    del s
    gc.collect()


def test_dtypes_read_from_the_header_match_the_hand_written_layouts():
    assert sd.dtype("StrakeFrame") == sd.FRAME_DTYPE
    assert sd.dtype("StrakeSample") == sd.SAMPLE_DTYPE
    assert sd.dtype("StrakeViolation").itemsize == sd.VIOLATION_DTYPE.itemsize
    with pytest.raises(sd.ArgumentError, match="no struct"):
        sd.dtype("StrakeNothing")


def test_whole_path_checks_in_one_call(surface):
    line = sd.Curve.line((-0.5, 0.0), (0.5, 0.0))
    s = sd.samples_at(surface, line, np.linspace(0, 1, 1001))
    kn = s["frame"]["normal_curvature"]
    ball = {"kind": sd.BALL, "radius": 0.5, "corner_radius": 0.0}
    angles = {"lead": 0.0, "tilt": 0.0}
    g = sd.check_gouge_path(s, ball, angles)
    assert g.shape == (1001,) and g.dtype == sd.dtype("StrakeGougeState")
    # The bowl is concave toward a tool on the N side with k1 = k2 = 1 at the origin: a ball of
    # radius 0.5 fits (margin 1/r - k = 2 - 1 = 1 there), a ball of radius 2 gouges.
    assert g["margin"][500] == pytest.approx(1.0, rel=1e-12) and not g["gouges"].any()
    big = sd.check_gouge_path(s, dict(ball, radius=2.0), angles)
    assert big["gouges"][500] == 1
    axes = sd.tool_axis_path(s, angles)
    np.testing.assert_allclose(axes["space"], s["frame"]["normal"], atol=1e-15)
    feed = sd.check_feed_path(s, {"feed": 1.0, "max_acceleration": 0.5, "max_jerk": 0.0})
    np.testing.assert_allclose(feed, np.minimum(1.0, np.sqrt(0.5 / np.abs(kn))), rtol=1e-14)
    out = np.empty(1001, dtype=sd.dtype("StrakeScallop"))
    assert sd.check_scallop_path(s, 0.5, 0.1, out=out) is out
    assert sd.check_fibre_path(s, {"tow_width": 0.01, "min_steering_radius": 1.0,
                                   "max_twist_rate": 1.0}).shape == (1001,)
    assert sd.check_tow_edges_path(s, 0.01).shape == (1001,)
    with pytest.raises(sd.ArgumentError, match="fields"):
        sd.check_gouge_path(s, {"radius": 1.0}, angles)
    with pytest.raises(sd.ArgumentError):
        sd.check_scallop_path(s, -1.0, 0.1)

//! The C functions added for the cutter's radii, rear gouging, tow edges, the width-limited
//! step-over and the path (array) versions of every check, called as a host would: agreement
//! with the Rust API on the same frames, NULL for each pointer, every status with its message
//! naming the field or the failing sample, and outputs untouched on failure.

#[path = "support/ffi_util.rs"]
mod ffi_util;

use ffi_util::*;
use std::ptr;
use strake::analytic::torus;
use strake::checks::*;
use strake::ffi::*;
use strake::{DarbouxFrame, SurfaceSource};

const OK: StrakeStatus = StrakeStatus::Ok;
const NP: StrakeStatus = StrakeStatus::NullPointer;
const IA: StrakeStatus = StrakeStatus::InvalidArgument;
const NF: StrakeStatus = StrakeStatus::NonFinite;
const ALONG: u32 = StrakeToolSide::AlongNormal as u32;
const S: f64 = -7777.25;

fn own_surface(s: impl SurfaceSource + 'static) -> *mut StrakeSurface {
    Box::into_raw(Box::new(StrakeSurface::new(Box::new(s))))
}

/// Nine samples along a slanted line on a torus (R = 40, r = 15), through the C ABI, and their
/// frames for the Rust API.
fn path() -> (Vec<StrakeSample>, Vec<DarbouxFrame>) {
    let s = own_surface(torus(40.0, 15.0));
    let c = uv_line([0.2, 2.6], [0.35, 3.3]);
    let n = 9;
    let mut buf = vec![StrakeSample::default(); n];
    let mut count = 0;
    // SAFETY: live handles, room for n samples.
    let st = unsafe { strake_sample_even_t(s, c, n, 1e-12, buf.as_mut_ptr(), n, &mut count) };
    assert_eq!((st, count), (OK, n), "{}", message());
    free(s, c);
    let frames = buf.iter().map(|s| s.frame.to_darboux().unwrap()).collect();
    (buf, frames)
}

fn toroidal() -> StrakeCutter {
    StrakeCutter {
        kind: StrakeCutterKind::Toroidal as u32,
        radius: 6.0,
        corner_radius: 1.0,
    }
}

fn rust_cutter() -> Cutter {
    Cutter::Toroidal {
        radius: 6.0,
        corner_radius: 1.0,
    }
}

const ANG: StrakeToolAngles = StrakeToolAngles {
    lead: 0.05,
    tilt: 0.3,
};

fn rust_angles() -> ToolAngles {
    ToolAngles {
        lead: 0.05,
        tilt: 0.3,
    }
}

// Every path function gives, sample for sample, what the Rust API gives on the same frames.
#[test]
fn path_functions_agree_with_the_rust_api() {
    let (samples, frames) = path();
    let n = samples.len();
    let side = ToolSide::AlongNormal;
    let (c, a) = (rust_cutter(), rust_angles());
    let sp = samples.as_ptr();
    let mut g = vec![StrakeGougeState::default(); n];
    let mut rg = vec![StrakeRearGouge::default(); n];
    let mut sc = vec![StrakeScallop::default(); n];
    let mut so = vec![StrakeCutterStepOver::default(); n];
    let mut fd = vec![0.0; n];
    let mut fb = vec![StrakeFibreState::default(); n];
    let mut te = vec![StrakeTowEdges::default(); n];
    let mut ax = vec![StrakeToolAxis::default(); n];
    let feed = StrakeFeedLimits {
        feed: 100.0,
        max_acceleration: 2000.0,
        max_jerk: 0.0,
    };
    let fibre = StrakeFibreLimits {
        tow_width: 6.35,
        min_steering_radius: 600.0,
        max_twist_rate: 0.01,
    };
    // SAFETY: arrays of n samples and results.
    unsafe {
        let cut = toroidal();
        assert_eq!(
            strake_check_gouge_path(sp, n, ALONG, &cut, &ANG, g.as_mut_ptr()),
            OK
        );
        assert_eq!(
            strake_check_rear_gouge_path(sp, n, ALONG, &cut, &ANG, rg.as_mut_ptr()),
            OK
        );
        assert_eq!(
            strake_check_scallop_path(sp, n, ALONG, 1.0, 0.5, sc.as_mut_ptr()),
            OK
        );
        assert_eq!(
            strake_check_step_over_cutter_path(sp, n, ALONG, &cut, &ANG, 0.01, so.as_mut_ptr()),
            OK
        );
        assert_eq!(strake_check_feed_path(sp, n, &feed, fd.as_mut_ptr()), OK);
        assert_eq!(strake_check_fibre_path(sp, n, &fibre, fb.as_mut_ptr()), OK);
        assert_eq!(
            strake_check_tow_edges_path(sp, n, 6.35, te.as_mut_ptr()),
            OK
        );
        assert_eq!(
            strake_tool_axis_path(sp, n, ALONG, &ANG, ax.as_mut_ptr()),
            OK
        );
    }
    let fl = FibreLimits {
        tow_width: 6.35,
        min_steering_radius: 600.0,
        max_twist_rate: 0.01,
    };
    let feed_r = FeedLimits {
        feed: 100.0,
        max_acceleration: 2000.0,
        max_jerk: None,
    };
    for (i, f) in frames.iter().enumerate() {
        let want = gouge_state(f, side, &c, &a).unwrap();
        assert_eq!(g[i], StrakeGougeState::from(&want));
        assert_eq!(rg[i], StrakeRearGouge::from(&want.rear));
        let k = cross_path_curvature(f, side);
        assert_eq!(sc[i].height, scallop_height(1.0, 0.5, k).unwrap());
        let s = step_over_for_cutter(&c, &a, 0.01, k).unwrap();
        assert_eq!(so[i], StrakeCutterStepOver::new(k, &s));
        assert_eq!(fd[i], curvature_limited_feed(f, &feed_r).unwrap());
        assert_eq!(fb[i], StrakeFibreState::from(&fibre_state(f, &fl).unwrap()));
        assert_eq!(te[i], StrakeTowEdges::from(&tow_edges(f, 6.35).unwrap()));
        let axis = tool_axis(f, side, &a).unwrap();
        assert_eq!(ax[i].local, axis.local);
        assert_eq!(ax[i].space, [axis.space.x, axis.space.y, axis.space.z]);
        // The per-sample C functions agree too.
        let mut r1 = StrakeRearGouge::default();
        let mut t1 = StrakeTowEdges::default();
        let mut s1 = StrakeCutterStepOver::default();
        // SAFETY: valid pointers.
        unsafe {
            let cut = toroidal();
            assert_eq!(
                strake_check_rear_gouge(&samples[i].frame, ALONG, &cut, &ANG, &mut r1),
                OK
            );
            assert_eq!(strake_check_tow_edges(&samples[i].frame, 6.35, &mut t1), OK);
            assert_eq!(
                strake_check_step_over_cutter(&samples[i].frame, ALONG, &cut, &ANG, 0.01, &mut s1),
                OK
            );
        }
        assert_eq!((r1, t1, s1), (rg[i], te[i], so[i]));
    }
    let mut rr = StrakeCutterRadii::default();
    // SAFETY: valid pointers.
    unsafe { assert_eq!(strake_cutter_radii(&toroidal(), &ANG, &mut rr), OK) };
    assert_eq!(rr, StrakeCutterRadii::from(&cutter_radii(&c, &a).unwrap()));
}

// A failure at one sample returns its status with a message naming the sample, and writes
// nothing to the output array.
#[test]
fn path_failure_names_the_sample_and_writes_nothing() {
    let (mut samples, _) = path();
    let n = samples.len();
    samples[6].frame.tangent = [2.0, 0.0, 0.0];
    let mut ax = vec![
        StrakeToolAxis {
            local: [S; 3],
            space: [S; 3],
        };
        n
    ];
    let keep = ax.clone();
    // SAFETY: arrays of n elements.
    let st = unsafe { strake_tool_axis_path(samples.as_ptr(), n, ALONG, &ANG, ax.as_mut_ptr()) };
    expect(st, IA, &["sample 6:", "frame.tangent"]);
    assert_eq!(ax, keep);
    // A computed failure at a sample: a tow too wide for the curvature.
    let (samples, _) = path();
    let mut te = vec![
        StrakeTowEdges {
            left: S,
            ..Default::default()
        };
        n
    ];
    let keep = te.clone();
    // SAFETY: arrays of n elements.
    let st = unsafe { strake_check_tow_edges_path(samples.as_ptr(), n, 1e300, te.as_mut_ptr()) };
    expect(st, NF, &["sample 0:", "tow left edge strain"]);
    assert_eq!(te, keep);
    // A ball too large for the concavity somewhere along the path.
    let mut sc = vec![
        StrakeScallop {
            height: S,
            ..Default::default()
        };
        n
    ];
    let keep = sc.clone();
    // SAFETY: arrays of n elements.
    let st = unsafe {
        strake_check_scallop_path(samples.as_ptr(), n, ALONG, 36.5, 0.5, sc.as_mut_ptr())
    };
    expect(st, IA, &["sample ", "does not fit"]);
    assert_eq!(sc, keep);
}

// NULL for each pointer of each new function, named; a zero count; a bad tool side; bad
// struct contents named by field.
#[test]
fn new_functions_refuse_null_and_bad_arguments_by_name() {
    let (samples, _) = path();
    let n = samples.len();
    let sp = samples.as_ptr();
    let f = &samples[0].frame;
    let cut = toroidal();
    let mut rr = StrakeCutterRadii::default();
    let mut rg = StrakeRearGouge::default();
    let mut te = StrakeTowEdges::default();
    let mut so = StrakeCutterStepOver::default();
    let mut gv = vec![StrakeGougeState::default(); n];
    let mut rv = vec![StrakeRearGouge::default(); n];
    let mut sv = vec![StrakeScallop::default(); n];
    let mut ov = vec![StrakeCutterStepOver::default(); n];
    let mut dv = vec![0.0; n];
    let mut fv = vec![StrakeFibreState::default(); n];
    let mut tv = vec![StrakeTowEdges::default(); n];
    let mut av = vec![StrakeToolAxis::default(); n];
    let feed = StrakeFeedLimits {
        feed: 1.0,
        max_acceleration: 1.0,
        max_jerk: 0.0,
    };
    let fibre = StrakeFibreLimits {
        tow_width: 1.0,
        min_steering_radius: 1.0,
        max_twist_rate: 1.0,
    };
    let nf: *const StrakeFrame = ptr::null();
    let ns: *const StrakeSample = ptr::null();
    let nc: *const StrakeCutter = ptr::null();
    let na: *const StrakeToolAngles = ptr::null();
    // SAFETY: NULL or valid pointers; arrays of n elements.
    unsafe {
        expect(strake_cutter_radii(nc, &ANG, &mut rr), NP, &["`cutter`"]);
        expect(strake_cutter_radii(&cut, na, &mut rr), NP, &["`angles`"]);
        expect(
            strake_cutter_radii(&cut, &ANG, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        expect(
            strake_check_rear_gouge(nf, ALONG, &cut, &ANG, &mut rg),
            NP,
            &["`frame`"],
        );
        expect(
            strake_check_rear_gouge(f, ALONG, nc, &ANG, &mut rg),
            NP,
            &["`cutter`"],
        );
        expect(
            strake_check_rear_gouge(f, ALONG, &cut, na, &mut rg),
            NP,
            &["`angles`"],
        );
        expect(
            strake_check_rear_gouge(f, ALONG, &cut, &ANG, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        expect(
            strake_check_rear_gouge(f, 2, &cut, &ANG, &mut rg),
            IA,
            &["`tool_side` = 2"],
        );
        expect(strake_check_tow_edges(nf, 1.0, &mut te), NP, &["`frame`"]);
        expect(
            strake_check_tow_edges(f, 1.0, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        expect(
            strake_check_tow_edges(f, -1.0, &mut te),
            IA,
            &["tow_width = -1"],
        );
        expect(
            strake_check_step_over_cutter(nf, ALONG, &cut, &ANG, 0.1, &mut so),
            NP,
            &["`frame`"],
        );
        expect(
            strake_check_step_over_cutter(f, ALONG, nc, &ANG, 0.1, &mut so),
            NP,
            &["`cutter`"],
        );
        expect(
            strake_check_step_over_cutter(f, ALONG, &cut, na, 0.1, &mut so),
            NP,
            &["`angles`"],
        );
        expect(
            strake_check_step_over_cutter(f, ALONG, &cut, &ANG, 0.1, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        expect(
            strake_check_step_over_cutter(f, ALONG, &cut, &ANG, f64::NAN, &mut so),
            IA,
            &["scallop height = NaN"],
        );
        let bad_cut = StrakeCutter {
            corner_radius: 7.0,
            ..cut
        };
        expect(
            strake_cutter_radii(&bad_cut, &ANG, &mut rr),
            IA,
            &["corner_radius = 7"],
        );
        let tiny = StrakeCutter {
            kind: StrakeCutterKind::Ball as u32,
            radius: 1e-310,
            corner_radius: 0.0,
        };
        expect(
            strake_cutter_radii(&tiny, &ANG, &mut rr),
            IA,
            &["subnormal"],
        );
        let bad_ang = StrakeToolAngles {
            lead: 2.0,
            tilt: 0.0,
        };
        expect(
            strake_cutter_radii(&cut, &bad_ang, &mut rr),
            IA,
            &["lead angle = 2"],
        );

        // Path functions: samples, each struct argument, out; count 0.
        let g = gv.as_mut_ptr();
        expect(
            strake_check_gouge_path(ns, n, ALONG, &cut, &ANG, g),
            NP,
            &["`samples`"],
        );
        expect(
            strake_check_gouge_path(sp, n, ALONG, nc, &ANG, g),
            NP,
            &["`cutter`"],
        );
        expect(
            strake_check_gouge_path(sp, n, ALONG, &cut, na, g),
            NP,
            &["`angles`"],
        );
        expect(
            strake_check_gouge_path(sp, n, ALONG, &cut, &ANG, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        expect(
            strake_check_gouge_path(sp, 0, ALONG, &cut, &ANG, g),
            IA,
            &["sample_count"],
        );
        expect(
            strake_check_gouge_path(sp, n, 9, &cut, &ANG, g),
            IA,
            &["`tool_side` = 9"],
        );
        let r = rv.as_mut_ptr();
        expect(
            strake_check_rear_gouge_path(ns, n, ALONG, &cut, &ANG, r),
            NP,
            &["`samples`"],
        );
        expect(
            strake_check_rear_gouge_path(sp, n, ALONG, nc, &ANG, r),
            NP,
            &["`cutter`"],
        );
        expect(
            strake_check_rear_gouge_path(sp, n, ALONG, &cut, na, r),
            NP,
            &["`angles`"],
        );
        expect(
            strake_check_rear_gouge_path(sp, n, ALONG, &cut, &ANG, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        let s = sv.as_mut_ptr();
        expect(
            strake_check_scallop_path(ns, n, ALONG, 1.0, 0.1, s),
            NP,
            &["`samples`"],
        );
        expect(
            strake_check_scallop_path(sp, n, ALONG, 1.0, 0.1, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        expect(
            strake_check_scallop_path(sp, n, ALONG, 0.0, 0.1, s),
            IA,
            &["cutter radius = 0"],
        );
        let o = ov.as_mut_ptr();
        expect(
            strake_check_step_over_cutter_path(ns, n, ALONG, &cut, &ANG, 0.1, o),
            NP,
            &["`samples`"],
        );
        expect(
            strake_check_step_over_cutter_path(sp, n, ALONG, nc, &ANG, 0.1, o),
            NP,
            &["`cutter`"],
        );
        expect(
            strake_check_step_over_cutter_path(sp, n, ALONG, &cut, na, 0.1, o),
            NP,
            &["`angles`"],
        );
        expect(
            strake_check_step_over_cutter_path(sp, n, ALONG, &cut, &ANG, 0.1, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        let d = dv.as_mut_ptr();
        expect(strake_check_feed_path(ns, n, &feed, d), NP, &["`samples`"]);
        expect(
            strake_check_feed_path(sp, n, ptr::null(), d),
            NP,
            &["`limits`"],
        );
        expect(
            strake_check_feed_path(sp, n, &feed, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        let bad_feed = StrakeFeedLimits {
            max_jerk: -1.0,
            ..feed
        };
        expect(
            strake_check_feed_path(sp, n, &bad_feed, d),
            IA,
            &["max_jerk = -1"],
        );
        let fp = fv.as_mut_ptr();
        expect(
            strake_check_fibre_path(ns, n, &fibre, fp),
            NP,
            &["`samples`"],
        );
        expect(
            strake_check_fibre_path(sp, n, ptr::null(), fp),
            NP,
            &["`limits`"],
        );
        expect(
            strake_check_fibre_path(sp, n, &fibre, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        let t = tv.as_mut_ptr();
        expect(
            strake_check_tow_edges_path(ns, n, 1.0, t),
            NP,
            &["`samples`"],
        );
        expect(
            strake_check_tow_edges_path(sp, n, 1.0, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        let a = av.as_mut_ptr();
        expect(
            strake_tool_axis_path(ns, n, ALONG, &ANG, a),
            NP,
            &["`samples`"],
        );
        expect(
            strake_tool_axis_path(sp, n, ALONG, na, a),
            NP,
            &["`angles`"],
        );
        expect(
            strake_tool_axis_path(sp, n, ALONG, &ANG, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        expect(
            strake_tool_axis_path(sp, usize::MAX, ALONG, &ANG, a),
            IA,
            &["too large"],
        );
    }
    assert!(gv.iter().all(|g| *g == StrakeGougeState::default()));
}

// Issue 16 through the C ABI: a non-orthonormal frame gives no non-unit axis (refused, named);
// a subnormal cutter radius no NaN margin (refused, named); a tow width of 1e300 no infinite
// strain (NON_FINITE, named); a huge ball radius on a convex cross-section keeps its digits.
#[test]
fn extreme_inputs_through_the_c_abi_are_refused_or_exact() {
    let (samples, frames) = path();
    let mut f = samples[3].frame;
    let mut axis = StrakeToolAxis {
        local: [S; 3],
        space: [S; 3],
    };
    // Tilt the tangent toward N by 1e-3 (still unit): T·N = 1e-3.
    let (t, n) = (f.tangent, f.normal);
    let c = (1.0f64 - 1e-6).sqrt();
    f.tangent = [0, 1, 2].map(|k| c * t[k] + 1e-3 * n[k]);
    let keep = axis;
    // SAFETY: valid pointers.
    let st = unsafe { strake_tool_axis(&f, ALONG, &ANG, &mut axis) };
    expect(st, IA, &["not orthogonal"]);
    assert_eq!(axis, keep);
    let tiny = StrakeCutter {
        kind: StrakeCutterKind::Ball as u32,
        radius: 4e-320,
        corner_radius: 0.0,
    };
    let mut g = StrakeGougeState::default();
    // SAFETY: valid pointers.
    let st = unsafe { strake_check_gouge(&samples[3].frame, ALONG, &tiny, &ANG, &mut g) };
    expect(st, IA, &["cutter radius", "subnormal"]);
    let limits = StrakeFibreLimits {
        tow_width: 1e300,
        min_steering_radius: 1.0,
        max_twist_rate: 1.0,
    };
    let mut fs = StrakeFibreState::default();
    // SAFETY: valid pointers.
    let st = unsafe { strake_check_fibre(&samples[3].frame, &limits, &mut fs) };
    expect(st, NF, &["edge strain"]);
    // Huge ball on this torus path: the C result equals the Rust one, which keeps its digits
    // (tests/checks_cutter.rs), and is finite.
    // With the tool on the −N side the cross-section is convex wherever it is concave from the
    // N side; take a sample where it is convex as the tool sees it.
    let side = [ToolSide::AlongNormal, ToolSide::AgainstNormal];
    let (i, code, k) = (0..frames.len())
        .flat_map(|i| {
            side.map(|s| {
                (
                    i,
                    u32::from(s == ToolSide::AgainstNormal),
                    cross_path_curvature(&frames[i], s),
                )
            })
        })
        .find(|&(_, _, k)| k < -1e-4)
        .expect("a convex cross-section");
    let mut sc = StrakeScallop::default();
    // SAFETY: valid pointers.
    let st = unsafe { strake_check_scallop(&samples[i].frame, code, 1e200, 0.5, &mut sc) };
    assert_eq!(st, OK, "{}", message());
    // A ball of radius 1e200 is a straight line across the path at this scale: tangent lines of
    // adjacent passes on a circle of radius ρ meet at h = ρ (1/cos(θ/2) − 1), θ = w/ρ (circle
    // geometry; the ball's own curvature changes it by O(ρ/r) = 1e-198).
    let rho = -1.0 / k;
    let want = rho * (1.0 / (0.25 / rho).cos() - 1.0);
    assert!(
        (sc.height - want).abs() < 1e-9 * want,
        "{} vs {want}",
        sc.height
    );
}

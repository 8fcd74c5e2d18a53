//! The batched host callback (`strake_surface_from_batch_callback`) and the parallel batch
//! (`strake_frames_at_parallel`) through the C ABI, called as a host would: the same frames as
//! the one-point callback and the serial batch, bit for bit (common practice: two routes to the
//! same numbers must agree), a closed form (the sphere, do Carmo §3-2: every normal curvature is
//! 1/R with the inward normal), every status with its message, and outputs untouched on failure.

#[path = "support/ffi_util.rs"]
mod ffi_util;

use ffi_util::*;
use std::ffi::c_void;
use std::ptr;
use std::sync::Mutex;
use strake::ffi::*;

/// What a batch callback saw: the sizes of its calls.
#[derive(Default)]
struct Host {
    /// Radius of the sphere it evaluates.
    radius: f64,
    /// u at or above which the host fails the whole call with code 77.
    fail_from_u: f64,
    /// u band [lo, hi) in which the host writes a NaN into Suv.y.
    nan_band: (f64, f64),
    /// Sizes of the calls, in order.
    calls: Mutex<Vec<usize>>,
}

impl Host {
    fn sphere(radius: f64) -> Host {
        Host {
            radius,
            fail_from_u: f64::INFINITY,
            nan_band: (f64::INFINITY, f64::INFINITY),
            calls: Mutex::new(Vec::new()),
        }
    }
    fn ptr(&self) -> *mut c_void {
        self as *const Host as *mut c_void
    }
}

/// The batch form of `ffi_util::sphere`: the same jets, many points per call.
unsafe extern "C" fn sphere_batch(
    user_data: *mut c_void,
    u: *const f64,
    v: *const f64,
    count: usize,
    order: i32,
    out: *mut StrakeSurfaceJet,
) -> i32 {
    // SAFETY: user_data is a live Host; strake passes `count` points and jets.
    let host = unsafe { &*(user_data as *const Host) };
    let (u, v) = unsafe {
        (
            std::slice::from_raw_parts(u, count),
            std::slice::from_raw_parts(v, count),
        )
    };
    host.calls.lock().unwrap().push(count);
    if u.iter().any(|&x| x >= host.fail_from_u) {
        return 77;
    }
    let mut r = host.radius;
    for i in 0..count {
        // SAFETY: as above; ffi_util::sphere reads the radius through its user_data.
        let st = unsafe { sphere((&mut r as *mut f64).cast(), u[i], v[i], order, out.add(i)) };
        assert_eq!(st, 0);
        if (host.nan_band.0..host.nan_band.1).contains(&u[i]) {
            // SAFETY: as above.
            unsafe { (*out.add(i)).suv[1] = f64::NAN };
        }
    }
    0
}

fn batch_surface(host: &Host, flip: i32) -> *mut StrakeSurface {
    let mut out = ptr::null_mut();
    // SAFETY: valid callback, user data and output slot.
    let st = unsafe {
        strake_surface_from_batch_callback(
            Some(sphere_batch),
            host.ptr(),
            0.0,
            6.0,
            0.1,
            3.0,
            flip,
            &mut out,
        )
    };
    assert_eq!(st, StrakeStatus::Ok, "{}", message());
    out
}

fn bits(f: &StrakeFrame) -> Vec<u64> {
    let mut all = vec![
        f.curve_param,
        f.u,
        f.v,
        f.normal_curvature,
        f.geodesic_curvature,
        f.geodesic_torsion,
        f.speed,
        f.k1,
        f.k2,
        f.mean_curvature,
        f.gaussian_curvature,
        f.surface_conditioning,
        f.curve_speed_figure,
    ];
    for a in [f.point, f.tangent, f.side, f.normal, f.dir1, f.dir2] {
        all.extend(a);
    }
    all.into_iter().map(f64::to_bits).collect()
}

fn frames_at(s: *const StrakeSurface, c: *const StrakeCurve, ts: &[f64]) -> Vec<StrakeFrame> {
    let mut out = vec![sentinel(); ts.len()];
    // SAFETY: live handles, `ts.len()` parameters and frames.
    let st = unsafe { strake_frames_at(s, c, ts.as_ptr(), ts.len(), out.as_mut_ptr()) };
    assert_eq!(st, StrakeStatus::Ok, "{}", message());
    out
}

fn frames_parallel(
    s: *const StrakeSurface,
    c: *const StrakeCurve,
    ts: &[f64],
    threads: u32,
) -> Vec<StrakeFrame> {
    let mut out = vec![sentinel(); ts.len()];
    // SAFETY: as above.
    let st = unsafe {
        strake_frames_at_parallel(s, c, ts.as_ptr(), ts.len(), threads, out.as_mut_ptr())
    };
    assert_eq!(st, StrakeStatus::Ok, "{}", message());
    out
}

/// A slanted path across the sphere's domain (u from 0.5 to 5.5).
fn path() -> *mut StrakeCurve {
    nurbs(
        2,
        &[0.0, 0.0, 0.0, 0.5, 1.0, 1.0, 1.0],
        &[[0.5, 0.4], [2.0, 2.5], [4.0, 0.6], [5.5, 2.6]],
        Some(&[1.0, 0.7, 1.3, 1.0]),
    )
}

fn even(n: usize) -> Vec<f64> {
    (0..n).map(|i| i as f64 / (n - 1) as f64).collect()
}

#[test]
fn batch_callback_gives_the_frames_of_the_point_callback() {
    let host = Host::sphere(2.0);
    let mut r = 2.0f64;
    let c = path();
    for flip in [0, 1] {
        let point = surface(
            Some(sphere),
            (&mut r as *mut f64).cast(),
            (0.0, 6.0),
            (0.1, 3.0),
            flip,
        );
        let batch = batch_surface(&host, flip);
        for n in [2, 9, 64, 65, 150, 1000] {
            let ts = even(n);
            host.calls.lock().unwrap().clear();
            let a = frames_at(point, c, &ts);
            let b = frames_at(batch, c, &ts);
            // Block-wise: calls of 64 points in path order, the last one shorter.
            let calls = host.calls.lock().unwrap().clone();
            assert_eq!(calls.iter().sum::<usize>(), n, "{calls:?}");
            assert!(
                calls[..calls.len() - 1].iter().all(|&k| k == 64),
                "{calls:?}"
            );
            for (x, y) in a.iter().zip(&b) {
                assert_eq!(bits(x), bits(y));
                // do Carmo §3-2: on a sphere every normal section has curvature 1/R; Su x Sv
                // points inward here, so kn = +1/R (−1/R flipped); and tg = 0.
                let kn = if flip == 0 { 0.5 } else { -0.5 };
                close("kn", x.normal_curvature, kn, 1e-14, 1.0);
                close("tg", x.geodesic_torsion, 0.0, 1e-14, 1.0);
            }
            // strake_frames_even and strake_frame_at (one point per call) agree as well.
            let mut e = vec![sentinel(); n];
            // SAFETY: live handles and n frames.
            let st = unsafe { strake_frames_even(batch, c, n, e.as_mut_ptr()) };
            assert_eq!(st, StrakeStatus::Ok, "{}", message());
            for (x, y) in a.iter().zip(&e) {
                assert_eq!(bits(x), bits(y));
            }
            host.calls.lock().unwrap().clear();
            let one = frame_at(batch, c, ts[n / 2]);
            assert_eq!(bits(&one), bits(&a[n / 2]));
            assert_eq!(*host.calls.lock().unwrap(), vec![1]);
        }
        free(point, ptr::null_mut());
        free(batch, ptr::null_mut());
    }
    free(ptr::null_mut(), c);
}

#[test]
fn batch_callback_constructor_statuses() {
    let host = Host::sphere(1.0);
    let mut out = ptr::dangling_mut::<StrakeSurface>();
    let dangling = out;
    let make = |f: StrakeSurfaceBatchFn, u: (f64, f64), flip: i32, out: *mut *mut StrakeSurface| {
        // SAFETY: valid or NULL arguments, as each case states.
        unsafe { strake_surface_from_batch_callback(f, host.ptr(), u.0, u.1, 0.0, 1.0, flip, out) }
    };
    expect(
        make(None, (0.0, 1.0), 0, &mut out),
        StrakeStatus::NullPointer,
        &["strake_surface_from_batch_callback", "`f`"],
    );
    expect(
        make(Some(sphere_batch), (0.0, 1.0), 0, ptr::null_mut()),
        StrakeStatus::NullPointer,
        &["`out`"],
    );
    expect(
        make(Some(sphere_batch), (0.0, f64::NAN), 0, &mut out),
        StrakeStatus::NonFinite,
        &["u_max"],
    );
    expect(
        make(Some(sphere_batch), (1.0, 0.0), 0, &mut out),
        StrakeStatus::InvalidArgument,
        &["u range [1, 0]"],
    );
    expect(
        make(Some(sphere_batch), (0.0, 1.0), 2, &mut out),
        StrakeStatus::InvalidArgument,
        &["`flip_normal` = 2"],
    );
    assert_eq!(out, dangling, "out must be untouched on failure");
}

#[test]
fn batch_callback_failures_name_the_block_and_the_sample() {
    let c = path();
    let ts = even(200);
    // u(t) passes 3.0 somewhere in the middle of the path: find the first sample there.
    let reference = {
        let mut r = 2.0f64;
        let s = surface(
            Some(sphere),
            (&mut r as *mut f64).cast(),
            (0.0, 6.0),
            (0.1, 3.0),
            0,
        );
        let f = frames_at(s, c, &ts);
        free(s, ptr::null_mut());
        f
    };
    let first_over = reference.iter().position(|f| f.u >= 3.0).unwrap();
    let block_start = first_over / 64 * 64;

    // The host fails the call (code 77): the status, the code, the first sample of the block.
    let mut host = Host::sphere(2.0);
    host.fail_from_u = 3.0;
    let s = batch_surface(&host, 0);
    let mut out = vec![sentinel(); ts.len()];
    for parallel in [false, true] {
        // SAFETY: live handles, 200 parameters and frames.
        let st = unsafe {
            if parallel {
                strake_frames_at_parallel(s, c, ts.as_ptr(), ts.len(), 2, out.as_mut_ptr())
            } else {
                strake_frames_at(s, c, ts.as_ptr(), ts.len(), out.as_mut_ptr())
            }
        };
        expect(
            st,
            StrakeStatus::SurfaceCallbackFailed,
            &[
                "host surface batch callback failed with code 77",
                &format!("sample {block_start} "),
            ],
        );
        assert_eq!(strake_last_callback_code(), 77);
        assert!(out.iter().all(|f| bits(f) == bits(&sentinel())));
    }
    let mut one = sentinel();
    // SAFETY: live handles and one frame.
    let st = unsafe { strake_frame_at(s, c, ts[first_over], &mut one) };
    expect(st, StrakeStatus::SurfaceCallbackFailed, &["code 77"]);
    assert_eq!(bits(&one), bits(&sentinel()));
    free(s, ptr::null_mut());

    // A non-finite entry: the status names the sample and the entry.
    let mut host = Host::sphere(2.0);
    host.nan_band = (3.0, 3.1);
    let s = batch_surface(&host, 0);
    // SAFETY: as above.
    let st = unsafe { strake_frames_at(s, c, ts.as_ptr(), ts.len(), out.as_mut_ptr()) };
    expect(
        st,
        StrakeStatus::NonFinite,
        &[&format!("sample {first_over} "), "Suv = NaN"],
    );
    assert!(out.iter().all(|f| bits(f) == bits(&sentinel())));
    free(s, c);
}

#[test]
fn parallel_batch_agrees_with_the_serial_one_and_checks_its_arguments() {
    let host = Host::sphere(2.0);
    let mut r = 2.0f64;
    let c = path();
    let point = surface(
        Some(sphere),
        (&mut r as *mut f64).cast(),
        (0.0, 6.0),
        (0.1, 3.0),
        0,
    );
    let batch = batch_surface(&host, 0);
    let ts = even(3001);
    for s in [point, batch] {
        let serial = frames_at(s, c, &ts);
        for threads in [1, 2, 3, 8] {
            let par = frames_parallel(s, c, &ts, threads);
            for (x, y) in par.iter().zip(&serial) {
                assert_eq!(bits(x), bits(y), "threads = {threads}");
            }
        }
    }
    // The lowest failing index wins, whichever thread finds it; out stays untouched.
    let mut bad = ts.clone();
    bad[2500] = 7.0;
    bad[1600] = -1.0;
    let mut out = vec![sentinel(); bad.len()];
    // SAFETY: live handles, 3001 parameters and frames.
    let st = unsafe {
        strake_frames_at_parallel(point, c, bad.as_ptr(), bad.len(), 2, out.as_mut_ptr())
    };
    expect(
        st,
        StrakeStatus::OutOfDomain,
        &["strake_frames_at_parallel", "sample 1600 ", "t = -1"],
    );
    assert!(out.iter().all(|f| bits(f) == bits(&sentinel())));
    // Arguments.
    let n = ts.len();
    let o = out.as_mut_ptr();
    // SAFETY: every pointer is valid or NULL, as each case states.
    unsafe {
        expect(
            strake_frames_at_parallel(point, c, ts.as_ptr(), n, 0, o),
            StrakeStatus::InvalidArgument,
            &["`threads` is 0"],
        );
        expect(
            strake_frames_at_parallel(ptr::null(), c, ts.as_ptr(), n, 2, o),
            StrakeStatus::NullPointer,
            &["`surface`"],
        );
        expect(
            strake_frames_at_parallel(point, ptr::null(), ts.as_ptr(), n, 2, o),
            StrakeStatus::NullPointer,
            &["`curve`"],
        );
        expect(
            strake_frames_at_parallel(point, c, ptr::null(), n, 2, o),
            StrakeStatus::NullPointer,
            &["`ts`"],
        );
        expect(
            strake_frames_at_parallel(point, c, ts.as_ptr(), n, 2, ptr::null_mut()),
            StrakeStatus::NullPointer,
            &["`out`"],
        );
        expect(
            strake_frames_at_parallel(point, c, ts.as_ptr(), 0, 2, o),
            StrakeStatus::InvalidArgument,
            &["`count` is 0"],
        );
    }
    assert!(out.iter().all(|f| bits(f) == bits(&sentinel())));
    free(point, ptr::null_mut());
    free(batch, c);
}

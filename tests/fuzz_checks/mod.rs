//! The invariants the fuzz targets assert, shared by the cargo-fuzz crate in `fuzz/` (nightly,
//! coverage-guided) and by `tests/fuzz_corpus.rs` (stable, replays the committed corpus).
//!
//! Each `run_*` function decodes one input (any bytes: a short or empty input reads as zeros),
//! drives the C ABI and the Rust API with it, and panics when an invariant breaks:
//! - no panic anywhere (a panic caught at the C boundary shows as `InternalPanic`, also a
//!   failure here);
//! - every failure is a known status other than `InternalPanic` with a non-empty message;
//! - every result returned under `STRAKE_STATUS_OK` is finite (a few fields documented as
//!   possibly `INFINITY`, such as radii along a geodesic, may be `+inf`, never NaN), unit vectors
//!   have unit length and frames are orthonormal;
//! - the batch paths agree with the one-point paths bit for bit, and the Rust API with the C ABI.
//!
//! The decoder (`Input`) favours values that reach deep code: small numbers, exact domain ends
//! and points a few ulps from them, alongside NaN, ±inf, ±MAX, huge, tiny and denormal values.

#![allow(dead_code)]

use std::ffi::c_char;
use std::ptr;

use strake::ffi::*;

/// Bytes read as the fuzz targets' arguments.
pub struct Input<'a> {
    data: &'a [u8],
    at: usize,
}

/// The special values an `f64` read from the input may take.
const SPECIAL: [f64; 14] = [
    f64::NAN,
    f64::INFINITY,
    f64::NEG_INFINITY,
    0.0,
    -0.0,
    f64::MIN_POSITIVE,
    5e-324,
    f64::MAX,
    -f64::MAX,
    1e300,
    1e-300,
    1e150,
    1e-150,
    1e-13,
];

impl<'a> Input<'a> {
    /// Reads `data` from its start.
    pub fn new(data: &'a [u8]) -> Self {
        Input { data, at: 0 }
    }

    /// The next byte (0 once the input is used up).
    pub fn u8(&mut self) -> u8 {
        let b = self.data.get(self.at).copied().unwrap_or(0);
        self.at += 1;
        b
    }

    /// Eight bytes, little-endian.
    pub fn u64(&mut self) -> u64 {
        let mut x = 0u64;
        for k in 0..8 {
            x |= u64::from(self.u8()) << (8 * k);
        }
        x
    }

    /// Any f64: mostly small multiples of 1/8 in [−16, 16), else a special value or raw bits.
    pub fn f64(&mut self) -> f64 {
        let tag = self.u8() % 32;
        match tag {
            0..=17 => f64::from(self.u8() as i8) / 8.0,
            18..=29 => SPECIAL[usize::from(self.u8()) % SPECIAL.len()],
            _ => f64::from_bits(self.u64()),
        }
    }

    /// A parameter for the interval [lo, hi]: inside it, exactly on or a few ulps beside an end,
    /// or any f64.
    pub fn param(&mut self, lo: f64, hi: f64) -> f64 {
        match self.u8() % 8 {
            0..=3 => {
                let s = f64::from(self.u8()) / 255.0;
                lo + s * (hi - lo)
            }
            4 => lo,
            5 => hi,
            6 => {
                let k = self.u8() as i8;
                let end = if k >= 0 { hi } else { lo };
                step_ulps(end, i32::from(k % 8))
            }
            _ => self.f64(),
        }
    }

    /// A small count in [0, max].
    pub fn small(&mut self, max: usize) -> usize {
        usize::from(self.u8()) % (max + 1)
    }

    /// A degree: mostly 1 to 5, sometimes 0, 24, 25 or `u32::MAX`.
    pub fn degree(&mut self) -> u32 {
        let b = self.u8();
        if b < 240 {
            1 + u32::from(b % 5)
        } else {
            [0, 24, 25, u32::MAX][usize::from(b % 4)]
        }
    }

    /// `n` knots for `count` control points of degree `degree`: clamped uniform over a fuzzed
    /// range, clamped with fuzzed (sorted) interior knots, or all fuzzed.
    pub fn knots(&mut self, n: usize, degree: usize) -> Vec<f64> {
        let mode = self.u8() % 4;
        if mode == 3 || n < 2 {
            return (0..n).map(|_| self.f64()).collect();
        }
        let (a, w) = if self.u8().is_multiple_of(4) {
            (self.f64(), self.f64())
        } else {
            (0.0, 1.0)
        };
        let p = degree.min(n / 2);
        let interior = n.saturating_sub(2 * (p + 1));
        let mut mids: Vec<f64> = (0..interior)
            .map(|i| {
                if mode == 0 {
                    (i + 1) as f64 / (interior + 1) as f64
                } else {
                    f64::from(self.u8()) / 255.0
                }
            })
            .collect();
        mids.sort_by(f64::total_cmp);
        let mut k = Vec::with_capacity(n);
        k.extend(std::iter::repeat_n(a, p + 1));
        k.extend(mids.iter().map(|s| a + s * w));
        while k.len() < n {
            k.push(a + w);
        }
        k
    }
}

/// `x` moved by `k` ulps (toward +inf for k > 0).
pub fn step_ulps(mut x: f64, k: i32) -> f64 {
    for _ in 0..k.unsigned_abs() {
        x = if k > 0 { x.next_up() } else { x.next_down() };
    }
    x
}

/// This thread's last error message, through the C function (twice: size query, then copy).
pub fn message() -> String {
    // SAFETY: NULL with length 0 asks for the size only.
    let need = unsafe { strake_last_error_message(ptr::null_mut(), 0) };
    assert!(need >= 1, "strake_last_error_message returned 0");
    let mut buf = vec![0 as c_char; need];
    // SAFETY: `buf` holds `need` writable bytes.
    let again = unsafe { strake_last_error_message(buf.as_mut_ptr(), need) };
    assert_eq!(again, need, "message size changed between calls");
    assert_eq!(buf[need - 1], 0, "message not NUL-terminated");
    let bytes: Vec<u8> = buf[..need - 1].iter().map(|&c| c as u8).collect();
    String::from_utf8(bytes).expect("message is UTF-8")
}

/// Every non-OK status: known, not a caught panic, with a message. Returns whether it was OK.
pub fn status(what: &str, s: StrakeStatus) -> bool {
    if s == StrakeStatus::Ok {
        return true;
    }
    assert!(
        StrakeStatus::ALL.contains(&s),
        "{what}: unknown status {s:?}"
    );
    let m = message();
    assert!(
        s != StrakeStatus::InternalPanic,
        "{what}: panic caught at the C boundary: {m}"
    );
    assert!(!m.trim().is_empty(), "{what}: {s:?} with an empty message");
    false
}

/// An error of the Rust API: its status is not a panic and its message is not empty.
pub fn rust_error(what: &str, e: &strake::StrakeError) {
    let s = StrakeStatus::of(e);
    assert!(
        s != StrakeStatus::Ok && s != StrakeStatus::InternalPanic,
        "{what}: {e:?}"
    );
    assert!(
        !e.to_string().trim().is_empty(),
        "{what}: empty message for {e:?}"
    );
}

/// Fails unless `x` is finite.
pub fn finite(what: &str, field: &str, x: f64) {
    assert!(x.is_finite(), "{what}: {field} = {x} under STATUS_OK");
}

/// Fails unless `x` is finite or +inf (fields documented as INFINITY in a limit case).
pub fn finite_or_inf(what: &str, field: &str, x: f64) {
    assert!(
        x.is_finite() || x == f64::INFINITY,
        "{what}: {field} = {x} under STATUS_OK"
    );
}

fn dot(a: &[f64; 3], b: &[f64; 3]) -> f64 {
    a[0] * b[0] + a[1] * b[1] + a[2] * b[2]
}

/// Fails unless `v` is finite with unit length (to 1e-12).
pub fn unit(what: &str, field: &str, v: &[f64; 3]) {
    for (k, x) in v.iter().enumerate() {
        finite(what, &format!("{field}[{k}]"), *x);
    }
    let len = dot(v, v).sqrt();
    assert!(
        (len - 1.0).abs() <= 1e-12,
        "{what}: |{field}| = {len:e} under STATUS_OK ({v:?})"
    );
}

/// Fails unless `a` and `b` are perpendicular (to 1e-9).
fn perpendicular(what: &str, names: &str, a: &[f64; 3], b: &[f64; 3]) {
    let d = dot(a, b);
    assert!(d.abs() <= 1e-9, "{what}: {names} = {d:e} under STATUS_OK");
}

/// The invariants of a frame returned under STATUS_OK.
pub fn frame(what: &str, f: &StrakeFrame) {
    let scalars = [
        ("curve_param", f.curve_param),
        ("u", f.u),
        ("v", f.v),
        ("normal_curvature", f.normal_curvature),
        ("geodesic_curvature", f.geodesic_curvature),
        ("geodesic_torsion", f.geodesic_torsion),
        ("speed", f.speed),
        ("k1", f.k1),
        ("k2", f.k2),
        ("mean_curvature", f.mean_curvature),
        ("gaussian_curvature", f.gaussian_curvature),
        ("surface_conditioning", f.surface_conditioning),
        ("curve_speed_figure", f.curve_speed_figure),
    ];
    for (name, x) in scalars {
        finite(what, name, x);
    }
    for (k, x) in f.point.iter().enumerate() {
        finite(what, &format!("point[{k}]"), *x);
    }
    unit(what, "tangent", &f.tangent);
    unit(what, "side", &f.side);
    unit(what, "normal", &f.normal);
    unit(what, "dir1", &f.dir1);
    unit(what, "dir2", &f.dir2);
    perpendicular(what, "T.N", &f.tangent, &f.normal);
    perpendicular(what, "T.B", &f.tangent, &f.side);
    perpendicular(what, "B.N", &f.side, &f.normal);
    perpendicular(what, "dir1.N", &f.dir1, &f.normal);
    perpendicular(what, "dir1.dir2", &f.dir1, &f.dir2);
    assert!(f.k1 >= f.k2, "{what}: k1 = {} < k2 = {}", f.k1, f.k2);
    assert!(f.speed > 0.0, "{what}: speed = {}", f.speed);
    assert!(
        f.surface_conditioning > 0.0 && f.surface_conditioning <= 1.0 + 1e-12,
        "{what}: surface_conditioning = {}",
        f.surface_conditioning
    );
    assert!(
        f.curve_speed_figure > 0.0,
        "{what}: curve_speed_figure = {}",
        f.curve_speed_figure
    );
}

fn jet_c(what: &str, j: &StrakeSurfaceJet) {
    for (name, v) in [
        ("p", &j.p),
        ("su", &j.su),
        ("sv", &j.sv),
        ("suu", &j.suu),
        ("suv", &j.suv),
        ("svv", &j.svv),
    ] {
        for (k, x) in v.iter().enumerate() {
            finite(what, &format!("{name}[{k}]"), *x);
        }
    }
}

/// Owns a surface handle.
pub struct Surface(pub *mut StrakeSurface);

impl Drop for Surface {
    fn drop(&mut self) {
        // SAFETY: the handle came from strake and is freed once.
        unsafe { strake_surface_free(self.0) };
    }
}

/// Owns a curve handle.
pub struct Curve(pub *mut StrakeCurve);

impl Drop for Curve {
    fn drop(&mut self) {
        // SAFETY: the handle came from strake and is freed once.
        unsafe { strake_curve_free(self.0) };
    }
}

/// A NURBS surface's arrays, decoded from the input.
pub struct SurfaceArrays {
    pub degree_u: u32,
    pub degree_v: u32,
    pub count_u: usize,
    pub count_v: usize,
    pub knots_u: Vec<f64>,
    pub knots_v: Vec<f64>,
    pub points: Vec<[f64; 3]>,
    pub weights: Option<Vec<f64>>,
}

fn count_for(inp: &mut Input, degree: u32) -> usize {
    let p = (degree as usize).min(6);
    match inp.u8() % 16 {
        0 => p,                          // one too few
        1 => 0,                          // empty
        b => p + 1 + usize::from(b % 4), // enough
    }
}

fn knot_count(inp: &mut Input, count: usize, degree: u32) -> usize {
    let want = count + (degree as usize).min(8) + 1;
    match inp.u8() % 16 {
        0 => want.saturating_sub(1),
        1 => want + 1,
        _ => want,
    }
}

impl SurfaceArrays {
    /// Decodes a surface (degrees, counts, knots, net, weights) from the input.
    pub fn read(inp: &mut Input) -> Self {
        let degree_u = inp.degree();
        let degree_v = inp.degree();
        let count_u = count_for(inp, degree_u);
        let count_v = count_for(inp, degree_v);
        let nku = knot_count(inp, count_u, degree_u);
        let nkv = knot_count(inp, count_v, degree_v);
        let knots_u = inp.knots(nku, degree_u as usize);
        let knots_v = inp.knots(nkv, degree_v as usize);
        let shape = inp.u8() % 4;
        let points = (0..count_u * count_v)
            .map(|k| {
                let (i, j) = ((k / count_v.max(1)) as f64, (k % count_v.max(1)) as f64);
                if shape == 0 {
                    [inp.f64(), inp.f64(), inp.f64()]
                } else {
                    // A graph z = f(i, j) over a grid scaled by a fuzzed factor: mostly regular.
                    let s = if shape == 1 { inp.f64() } else { 1.0 };
                    [i * s, j * s, inp.f64()]
                }
            })
            .collect();
        let weights = match inp.u8() % 3 {
            0 => None,
            1 => Some(
                (0..count_u * count_v)
                    .map(|_| 0.5 + f64::from(inp.u8()) / 128.0)
                    .collect(),
            ),
            _ => Some((0..count_u * count_v).map(|_| inp.f64()).collect()),
        };
        SurfaceArrays {
            degree_u,
            degree_v,
            count_u,
            count_v,
            knots_u,
            knots_v,
            points,
            weights,
        }
    }

    /// The C description of these arrays (valid while `self` lives).
    pub fn data(&self) -> StrakeNurbsSurfaceData {
        StrakeNurbsSurfaceData {
            degree_u: self.degree_u,
            degree_v: self.degree_v,
            count_u: self.count_u,
            count_v: self.count_v,
            knots_u: self.knots_u.as_ptr(),
            knot_count_u: self.knots_u.len(),
            knots_v: self.knots_v.as_ptr(),
            knot_count_v: self.knots_v.len(),
            points: self.points.as_ptr().cast(),
            weights: self.weights.as_ref().map_or(ptr::null(), |w| w.as_ptr()),
        }
    }

    /// The surface through the C ABI, checked.
    pub fn build(&self, flip: i32) -> Option<Surface> {
        let mut out = ptr::null_mut();
        let data = self.data();
        // SAFETY: `data` describes arrays of the stated sizes; `out` is writable.
        let s = unsafe { strake_surface_new_nurbs(&data, flip, &mut out) };
        if status("strake_surface_new_nurbs", s) {
            assert!(!out.is_null(), "OK with a NULL surface");
            Some(Surface(out))
        } else {
            assert!(out.is_null(), "surface written on failure");
            None
        }
    }
}

/// A fixed, regular test surface for the curve targets: a wavy bicubic over [0, 1]² (rational
/// when `rational`), or the degree-(1, 1) plane.
pub fn fixed_surface(kind: u8) -> Surface {
    let (p, n) = if kind % 3 == 2 {
        (1usize, 2usize)
    } else {
        (3, 5)
    };
    let mut knots = vec![0.0; p + 1];
    for i in 1..n - p {
        knots.push(i as f64 / (n - p) as f64);
    }
    knots.extend(std::iter::repeat_n(1.0, p + 1));
    let mut points = Vec::new();
    let mut weights = Vec::new();
    for i in 0..n {
        for j in 0..n {
            let (x, y) = (i as f64 / (n - 1) as f64, j as f64 / (n - 1) as f64);
            let z = if p == 1 {
                0.0
            } else {
                0.3 * ((i * 7 + j * 3) % 5) as f64 / 5.0
            };
            points.push([x * 2.0, y * 1.5, z]);
            weights.push(1.0 + 0.25 * ((i + 2 * j) % 3) as f64);
        }
    }
    let arrays = SurfaceArrays {
        degree_u: p as u32,
        degree_v: p as u32,
        count_u: n,
        count_v: n,
        knots_u: knots.clone(),
        knots_v: knots,
        points,
        weights: (kind % 3 == 1).then_some(weights),
    };
    arrays.build(0).expect("the fixed surface is valid")
}

fn surface_domain(a: &SurfaceArrays) -> ([f64; 2], [f64; 2]) {
    let du = a.degree_u as usize;
    let dv = a.degree_v as usize;
    (
        [a.knots_u[du], a.knots_u[a.count_u]],
        [a.knots_v[dv], a.knots_v[a.count_v]],
    )
}

/// A straight curve (degree 1, two control points) in the parameter plane.
pub fn line(from: [f64; 2], to: [f64; 2]) -> Option<Curve> {
    let knots = [0.0, 0.0, 1.0, 1.0];
    let pts = [from, to];
    let mut out = ptr::null_mut();
    // SAFETY: arrays of the stated sizes; `out` is writable.
    let s = unsafe {
        strake_curve_new_nurbs(
            1,
            knots.as_ptr(),
            4,
            pts.as_ptr().cast(),
            2,
            ptr::null(),
            &mut out,
        )
    };
    status("strake_curve_new_nurbs (line)", s).then(|| Curve(out))
}

/// Frames at each t through the one-point call and the batch call: the same statuses and bits.
pub fn frames_both_ways(what: &str, s: &Surface, c: &Curve, ts: &[f64]) {
    let mut one = Vec::with_capacity(ts.len());
    for &t in ts {
        let mut f = StrakeFrame::default();
        // SAFETY: live handles, writable output.
        let st = unsafe { strake_frame_at(s.0, c.0, t, &mut f) };
        if status("strake_frame_at", st) {
            frame(&format!("{what}: frame_at({t:e})"), &f);
            one.push(Some(f));
        } else {
            one.push(None);
        }
    }
    if ts.is_empty() {
        return;
    }
    let mut batch = vec![StrakeFrame::default(); ts.len()];
    // SAFETY: `ts.len()` readable doubles and writable frames.
    let st = unsafe { strake_frames_at(s.0, c.0, ts.as_ptr(), ts.len(), batch.as_mut_ptr()) };
    let ok = status("strake_frames_at", st);
    let all_one_ok = one.iter().all(Option::is_some);
    assert_eq!(
        ok, all_one_ok,
        "{what}: strake_frames_at {st:?} but frame_at per point ok = {all_one_ok} (ts {ts:?})"
    );
    if ok {
        for (i, (b, o)) in batch.iter().zip(&one).enumerate() {
            let o = o.as_ref().expect("checked above");
            assert!(
                bits(b) == bits(o),
                "{what}: batch frame {i} differs from the one-point frame\n{b:?}\n{o:?}"
            );
        }
    }
}

/// The rates of change of the invariants at each of `ts`, one point at a time and as one path
/// call: every OK result finite (frame and rates), the path call OK exactly when every point
/// is, and then the same bits, frames and rates (on a crease too: the side of travel is chosen
/// the same way by both).
pub fn rates_both_ways(what: &str, s: &Surface, c: &Curve, ts: &[f64]) {
    let rbits = |r: &StrakeInvariantRates| {
        [
            r.normal_curvature_rate,
            r.geodesic_curvature_rate,
            r.geodesic_torsion_rate,
            r.curvature_rate,
        ]
        .map(f64::to_bits)
    };
    let mut one = Vec::with_capacity(ts.len());
    for &t in ts {
        let mut f = StrakeFrame::default();
        let mut r = StrakeInvariantRates::default();
        // SAFETY: live handles, writable outputs.
        let st = unsafe { strake_invariant_rates_at(s.0, c.0, t, &mut f, &mut r) };
        if status("strake_invariant_rates_at", st) {
            let w = format!("{what}: invariant_rates_at({t:e})");
            frame(&w, &f);
            finite(&w, "normal_curvature_rate", r.normal_curvature_rate);
            finite(&w, "geodesic_curvature_rate", r.geodesic_curvature_rate);
            finite(&w, "geodesic_torsion_rate", r.geodesic_torsion_rate);
            finite(&w, "curvature_rate", r.curvature_rate);
            one.push(Some((f, r)));
        } else {
            one.push(None);
        }
    }
    if ts.is_empty() {
        return;
    }
    let mut frames = vec![StrakeFrame::default(); ts.len()];
    let mut rates = vec![StrakeInvariantRates::default(); ts.len()];
    // SAFETY: `ts.len()` readable doubles, writable frames and rates.
    let st = unsafe {
        strake_invariant_rates_path(
            s.0,
            c.0,
            ts.as_ptr(),
            ts.len(),
            frames.as_mut_ptr(),
            rates.as_mut_ptr(),
        )
    };
    let ok = status("strake_invariant_rates_path", st);
    let all_one_ok = one.iter().all(Option::is_some);
    assert_eq!(
        ok, all_one_ok,
        "{what}: strake_invariant_rates_path {st:?} but rates_at per point ok = {all_one_ok} \
         (ts {ts:?})"
    );
    if ok {
        for (i, ((f, r), o)) in frames.iter().zip(&rates).zip(&one).enumerate() {
            let (of, or) = o.as_ref().expect("checked above");
            assert!(
                bits(f) == bits(of) && rbits(r) == rbits(or),
                "{what}: path sample {i} differs from the one-point call\n{f:?} {r:?}\n{of:?} {or:?}"
            );
        }
    }
}

fn bits(f: &StrakeFrame) -> Vec<u64> {
    let mut v = vec![
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
        v.extend(a);
    }
    v.into_iter().map(f64::to_bits).collect()
}

/// Target `surface`: a NURBS surface from arbitrary arrays through the C ABI and the Rust API;
/// evaluation at arbitrary (u, v) (C and Rust, same bits); frames and the rates of change of
/// the invariants along a straight curve through the domain (one point and batch, same bits).
pub fn run_surface(data: &[u8]) {
    let mut inp = Input::new(data);
    let a = SurfaceArrays::read(&mut inp);
    let flip = match inp.u8() % 8 {
        0 => 2,
        1 => 1,
        _ => 0,
    };
    let built = a.build(flip);

    // The Rust API on the same arrays: accepted exactly when the C ABI accepts them.
    let rust = strake::NurbsSurface::new(&strake::NurbsSurfaceData {
        degree_u: a.degree_u as usize,
        degree_v: a.degree_v as usize,
        count_u: a.count_u,
        count_v: a.count_v,
        knots_u: &a.knots_u,
        knots_v: &a.knots_v,
        points: &a.points,
        weights: a.weights.as_deref(),
    });
    if let Err(e) = &rust {
        rust_error("NurbsSurface::new", e);
    }
    if flip <= 1 {
        assert_eq!(
            built.is_some(),
            rust.is_ok(),
            "C and Rust disagree on validity"
        );
    }
    let (Some(s), Ok(rs)) = (built, rust) else {
        return;
    };
    let ([u0, u1], [v0, v1]) = surface_domain(&a);

    // Evaluation at arbitrary parameters, C against Rust.
    let n = inp.small(6);
    let uv: Vec<[f64; 2]> = (0..n)
        .map(|_| [inp.param(u0, u1), inp.param(v0, v1)])
        .collect();
    let order = match inp.u8() % 8 {
        0 => 3,
        b => u32::from(b % 3),
    };
    if n > 0 {
        let mut jets = vec![StrakeSurfaceJet::default(); n];
        // SAFETY: 2n readable doubles, n writable jets.
        let st = unsafe {
            strake_surface_evaluate(s.0, uv.as_ptr().cast(), n, order, jets.as_mut_ptr())
        };
        if status("strake_surface_evaluate", st) {
            let o = match order {
                0 => strake::DerivOrder::Position,
                1 => strake::DerivOrder::First,
                _ => strake::DerivOrder::Second,
            };
            for (k, (j, p)) in jets.iter().zip(&uv).enumerate() {
                jet_c(&format!("strake_surface_evaluate point {k}"), j);
                let mut hint = strake::SurfaceHint::default();
                let r = rs
                    .jet(p[0], p[1], o, &mut hint)
                    .expect("Rust refuses a point the C ABI evaluated");
                assert_eq!(
                    r.p.x.to_bits(),
                    j.p[0].to_bits(),
                    "point {k}: Rust and C give different bits"
                );
            }
        }
    }

    // Frames along a straight curve between two parameters of the domain.
    let from = [inp.param(u0, u1), inp.param(v0, v1)];
    let to = [inp.param(u0, u1), inp.param(v0, v1)];
    let Some(c) = line(from, to) else {
        return;
    };
    let m = inp.small(5);
    let ts: Vec<f64> = (0..m).map(|_| inp.param(0.0, 1.0)).collect();
    frames_both_ways("surface", &s, &c, &ts);
    rates_both_ways("surface", &s, &c, &ts);
}

/// A NURBS curve in the parameter plane, decoded from the input (control points mostly in
/// [0, 1]²).
pub fn read_curve(inp: &mut Input) -> Option<(Curve, f64, f64)> {
    let degree = inp.degree();
    let count = count_for(inp, degree);
    let nk = knot_count(inp, count, degree);
    let knots = inp.knots(nk, degree as usize);
    let pts: Vec<[f64; 2]> = (0..count)
        .map(|_| [inp.param(0.0, 1.0), inp.param(0.0, 1.0)])
        .collect();
    let weights: Option<Vec<f64>> = match inp.u8() % 3 {
        0 => None,
        1 => Some(
            (0..count)
                .map(|_| 0.5 + f64::from(inp.u8()) / 128.0)
                .collect(),
        ),
        _ => Some((0..count).map(|_| inp.f64()).collect()),
    };
    let mut out = ptr::null_mut();
    // SAFETY: arrays of the stated sizes; `out` writable.
    let st = unsafe {
        strake_curve_new_nurbs(
            degree,
            knots.as_ptr(),
            knots.len(),
            pts.as_ptr().cast(),
            pts.len(),
            weights.as_ref().map_or(ptr::null(), |w| w.as_ptr()),
            &mut out,
        )
    };
    let rust = strake::NurbsCurve::<2>::new(degree as usize, &knots, &pts, weights.as_deref());
    if let Err(e) = &rust {
        rust_error("NurbsCurve::new", e);
    }
    let ok = status("strake_curve_new_nurbs", st);
    assert_eq!(
        ok,
        rust.is_ok(),
        "C and Rust disagree on the curve's validity"
    );
    if !ok {
        return None;
    }
    let d = rust.expect("checked").domain();
    Some((Curve(out), d.lo, d.hi))
}

fn samples(what: &str, st: StrakeStatus, buf: &[StrakeSample], count: usize, capacity: usize) {
    if st == StrakeStatus::BufferTooSmall {
        assert!(
            count > capacity,
            "{what}: BUFFER_TOO_SMALL with count {count} <= {capacity}"
        );
        return;
    }
    if !status(what, st) {
        return;
    }
    assert!(
        count <= capacity,
        "{what}: count {count} > capacity {capacity}"
    );
    // The sampling rules place samples in increasing t; `strake_samples_at` takes the host's t
    // in any order, its arc length signed (a t below the one before gives a smaller s).
    let ordered = what != "strake_samples_at";
    for (i, s) in buf[..count].iter().enumerate() {
        frame(&format!("{what} sample {i}"), &s.frame);
        finite(what, "arc_length", s.arc_length);
        if i == 0 {
            continue;
        }
        let p = &buf[i - 1];
        let (dt, ds) = (
            s.frame.curve_param - p.frame.curve_param,
            s.arc_length - p.arc_length,
        );
        assert!(!ordered || dt >= 0.0, "{what}: t decreases at sample {i}");
        assert!(
            (dt >= 0.0 || ds <= 0.0) && (dt <= 0.0 || ds >= 0.0),
            "{what}: arc length moves against t at sample {i} (dt {dt:e}, ds {ds:e})"
        );
    }
}

/// A tolerance: mostly reasonable, sometimes extreme.
fn tolerance(inp: &mut Input) -> f64 {
    match inp.u8() % 4 {
        0 => inp.f64(),
        b => 10f64.powi(-(i32::from(b) * 3)),
    }
}

/// Target `curve`: a NURBS curve from arbitrary arrays on a fixed surface; frames at arbitrary
/// t and the rates of change there (one point and batch), even frames, the three sampling rules with arbitrary options, arc
/// length between arbitrary parameters, samples at arbitrary t.
pub fn run_curve(data: &[u8]) {
    let mut inp = Input::new(data);
    let s = fixed_surface(inp.u8());
    let Some((c, t0, t1)) = read_curve(&mut inp) else {
        return;
    };
    let m = inp.small(5);
    let ts: Vec<f64> = (0..m).map(|_| inp.param(t0, t1)).collect();
    frames_both_ways("curve", &s, &c, &ts);
    rates_both_ways("curve", &s, &c, &ts);

    let n = inp.small(20);
    let mut even = vec![StrakeFrame::default(); n.max(1)];
    // SAFETY: n writable frames.
    let st = unsafe { strake_frames_even(s.0, c.0, n, even.as_mut_ptr()) };
    if status("strake_frames_even", st) {
        for (i, f) in even[..n].iter().enumerate() {
            frame(&format!("frames_even {i}"), f);
        }
    }

    for rule in 0..4 {
        if inp.u8().is_multiple_of(2) {
            continue;
        }
        let capacity = inp.small(40);
        let mut buf = vec![StrakeSample::default(); capacity.max(1)];
        let mut count = usize::MAX;
        let n = inp.small(30);
        let arc_tol = tolerance(&mut inp);
        // SAFETY: live handles, `capacity` writable samples, writable count.
        let (what, st) = unsafe {
            match rule {
                0 => (
                    "strake_sample_even_t",
                    strake_sample_even_t(
                        s.0,
                        c.0,
                        n,
                        arc_tol,
                        buf.as_mut_ptr(),
                        capacity,
                        &mut count,
                    ),
                ),
                1 => (
                    "strake_sample_even_arc",
                    strake_sample_even_arc(
                        s.0,
                        c.0,
                        n,
                        arc_tol,
                        buf.as_mut_ptr(),
                        capacity,
                        &mut count,
                    ),
                ),
                2 => {
                    let chord = match inp.u8() % 3 {
                        0 => inp.f64(),
                        _ => 10f64.powi(-1 - i32::from(inp.u8() % 4)),
                    };
                    let max_step = match inp.u8() % 3 {
                        0 => inp.f64(),
                        1 => 0.0,
                        _ => 0.5,
                    };
                    (
                        "strake_sample_chordal",
                        strake_sample_chordal(
                            s.0,
                            c.0,
                            chord,
                            max_step,
                            arc_tol,
                            buf.as_mut_ptr(),
                            capacity,
                            &mut count,
                        ),
                    )
                }
                _ => {
                    let ts: Vec<f64> = (0..capacity).map(|_| inp.param(t0, t1)).collect();
                    count = capacity;
                    (
                        "strake_samples_at",
                        strake_samples_at(
                            s.0,
                            c.0,
                            ts.as_ptr(),
                            capacity,
                            arc_tol,
                            buf.as_mut_ptr(),
                        ),
                    )
                }
            }
        };
        samples(what, st, &buf, count, capacity);
    }

    let (a, b) = (inp.param(t0, t1), inp.param(t0, t1));
    let rel = tolerance(&mut inp);
    let mut len = f64::NAN;
    // SAFETY: live handles, writable output.
    let st = unsafe { strake_arc_length(s.0, c.0, a, b, rel, &mut len) };
    if status("strake_arc_length", st) {
        finite("strake_arc_length", "length", len);
    }
}

fn projection_options(inp: &mut Input) -> StrakeProjectionOptions {
    StrakeProjectionOptions {
        tolerance: match inp.u8() % 3 {
            0 => inp.f64(),
            1 => f64::INFINITY,
            _ => 1.0,
        },
        periodic_u: i32::from(inp.u8().is_multiple_of(3))
            * if inp.u8().is_multiple_of(5) { 2 } else { 1 },
        periodic_v: i32::from(inp.u8().is_multiple_of(3)),
        grid: match inp.u8() % 4 {
            0 => u32::from(inp.u8()),
            _ => 0,
        },
        max_iterations: match inp.u8() % 4 {
            0 => u32::from(inp.u8()),
            _ => 0,
        },
    }
}

/// Target `fit`: interpolation of arbitrary (u, v) points (C ABI and Rust API), projection of
/// arbitrary points in space onto a fixed surface, a curve through projected points, and the
/// frame from arbitrary jets.
pub fn run_fit(data: &[u8]) {
    let mut inp = Input::new(data);
    let s = fixed_surface(inp.u8());

    // Interpolation through (u, v) points.
    let n = inp.small(8);
    let pts: Vec<[f64; 2]> = (0..n)
        .map(|_| [inp.param(0.0, 1.0), inp.param(0.0, 1.0)])
        .collect();
    let degree = inp.degree();
    let method = u32::from(inp.u8() % 3);
    let ends =
        (inp.u8().is_multiple_of(3)).then(|| [[inp.f64(), inp.f64()], [inp.f64(), inp.f64()]]);
    let mut out = ptr::null_mut();
    // SAFETY: 2n readable doubles, optional 2-double ends, writable out.
    let st = unsafe {
        strake_curve_through_uv_points(
            pts.as_ptr().cast(),
            n,
            degree,
            method,
            ends.as_ref().map_or(ptr::null(), |e| e[0].as_ptr()),
            ends.as_ref().map_or(ptr::null(), |e| e[1].as_ptr()),
            &mut out,
        )
    };
    if status("strake_curve_through_uv_points", st) {
        let c = Curve(out);
        let ts: Vec<f64> = (0..inp.small(3)).map(|_| inp.param(0.0, 1.0)).collect();
        frames_both_ways("through_uv_points", &s, &c, &ts);
    }
    if method < 2 {
        let m = if method == 0 {
            strake::Parametrization::ChordLength
        } else {
            strake::Parametrization::Centripetal
        };
        let e = ends.map(|e| strake::EndDerivatives {
            start: e[0],
            end: e[1],
        });
        match strake::interpolate(&pts, degree as usize, m, e.as_ref()) {
            Ok(c) => {
                for (k, p) in c.control_points().iter().enumerate() {
                    finite("interpolate", &format!("control point {k}"), p[0]);
                    finite("interpolate", &format!("control point {k}"), p[1]);
                }
                assert_eq!(st, StrakeStatus::Ok, "Rust interpolates what C refused");
            }
            Err(e) => {
                rust_error("interpolate", &e);
                assert_ne!(st, StrakeStatus::Ok, "C interpolates what Rust refused");
            }
        }
    }

    // Projection of points in space.
    let n = inp.small(6);
    let space: Vec<[f64; 3]> = (0..n)
        .map(|_| match inp.u8() % 4 {
            0 => [inp.f64(), inp.f64(), inp.f64()],
            _ => [
                inp.param(0.0, 2.0),
                inp.param(0.0, 1.5),
                inp.param(-0.5, 0.8),
            ],
        })
        .collect();
    let opts = projection_options(&mut inp);
    let mut proj = vec![StrakeProjection::default(); n.max(1)];
    // SAFETY: 3n readable doubles, n writable projections.
    let st = unsafe {
        strake_surface_project_points(s.0, space.as_ptr().cast(), n, &opts, proj.as_mut_ptr())
    };
    if status("strake_surface_project_points", st) {
        for (k, p) in proj[..n].iter().enumerate() {
            let what = format!("projection {k}");
            for (name, x) in [("u", p.u), ("v", p.v), ("distance", p.distance)] {
                finite(&what, name, x);
            }
            for x in p.foot {
                finite(&what, "foot", x);
            }
            assert!(
                (0.0..=1.0).contains(&p.u) && (0.0..=1.0).contains(&p.v),
                "{what}: {p:?}"
            );
            assert!(p.distance >= 0.0, "{what}: distance {}", p.distance);
            assert!(
                p.signed_distance.abs() <= p.distance * (1.0 + 1e-12),
                "{what}: |signed distance| {} > distance {}",
                p.signed_distance,
                p.distance
            );
            let q = space[k];
            let gap = ((p.foot[0] - q[0]).powi(2)
                + (p.foot[1] - q[1]).powi(2)
                + (p.foot[2] - q[2]).powi(2))
            .sqrt();
            assert!(
                (gap - p.distance).abs() <= 1e-9 * (1.0 + gap),
                "{what}: distance {} but |foot - point| = {gap}",
                p.distance
            );
        }
    }
    let degree = inp.degree();
    let mut out = ptr::null_mut();
    let mut proj2 = vec![StrakeProjection::default(); n.max(1)];
    // SAFETY: as above, plus a writable curve slot.
    let st = unsafe {
        strake_curve_through_space_points(
            s.0,
            space.as_ptr().cast(),
            n,
            &opts,
            degree,
            method,
            proj2.as_mut_ptr(),
            &mut out,
        )
    };
    if status("strake_curve_through_space_points", st) {
        let c = Curve(out);
        let ts: Vec<f64> = (0..inp.small(3)).map(|_| inp.param(0.0, 1.0)).collect();
        frames_both_ways("through_space_points", &s, &c, &ts);
    }

    // The frame from arbitrary jets.
    let v3 = |inp: &mut Input| [inp.f64(), inp.f64(), inp.f64()];
    let sj = StrakeSurfaceJet {
        p: v3(&mut inp),
        su: if inp.u8().is_multiple_of(2) {
            [1.0, 0.0, 0.0]
        } else {
            v3(&mut inp)
        },
        sv: if inp.u8().is_multiple_of(2) {
            [0.0, 1.0, 0.0]
        } else {
            v3(&mut inp)
        },
        suu: v3(&mut inp),
        suv: v3(&mut inp),
        svv: v3(&mut inp),
    };
    let cj = StrakeCurveJet {
        u: inp.f64(),
        v: inp.f64(),
        du: inp.f64(),
        dv: inp.f64(),
        ddu: inp.f64(),
        ddv: inp.f64(),
    };
    let scales = StrakeParamScales {
        u_extent: if inp.u8().is_multiple_of(2) {
            1.0
        } else {
            inp.f64()
        },
        v_extent: if inp.u8().is_multiple_of(2) {
            1.0
        } else {
            inp.f64()
        },
        t_extent: if inp.u8().is_multiple_of(2) {
            1.0
        } else {
            inp.f64()
        },
    };
    let flip = i32::from(inp.u8() % 2);
    let mut f = StrakeFrame::default();
    // SAFETY: valid inputs and a writable frame.
    let st = unsafe { strake_frame_from_jets(&sj, &cj, flip, &scales, &mut f) };
    if status("strake_frame_from_jets", st) {
        frame("strake_frame_from_jets", &f);
    }
}

/// A frame for the checks: computed from arbitrary jets (so usually valid), then maybe with
/// one field replaced by an arbitrary value.
pub fn read_frame(inp: &mut Input) -> StrakeFrame {
    let g = |inp: &mut Input| match inp.u8() % 4 {
        0 => inp.f64(),
        _ => f64::from(inp.u8() as i8) / 32.0,
    };
    let sj = StrakeSurfaceJet {
        p: [g(inp), g(inp), g(inp)],
        su: [1.0, g(inp), g(inp)],
        sv: [g(inp), 1.0, g(inp)],
        suu: [g(inp), g(inp), g(inp)],
        suv: [g(inp), g(inp), g(inp)],
        svv: [g(inp), g(inp), g(inp)],
    };
    let cj = StrakeCurveJet {
        u: 0.5,
        v: 0.5,
        du: 1.0 + g(inp).abs(),
        dv: g(inp),
        ddu: g(inp),
        ddv: g(inp),
    };
    let scales = StrakeParamScales {
        u_extent: 1.0,
        v_extent: 1.0,
        t_extent: 1.0,
    };
    let mut f = StrakeFrame::default();
    if std::env::var("FUZZ_DEBUG").is_ok() {
        eprintln!("{sj:?}\n{cj:?}");
    }
    // SAFETY: valid inputs and a writable frame.
    let st = unsafe { strake_frame_from_jets(&sj, &cj, i32::from(inp.u8() % 2), &scales, &mut f) };
    if status("strake_frame_from_jets", st) {
        frame("checks: frame_from_jets", &f);
    }
    if inp.u8().is_multiple_of(4) {
        let x = inp.f64();
        let field = inp.u8() % 14;
        match field {
            0 => f.normal_curvature = x,
            1 => f.geodesic_curvature = x,
            2 => f.geodesic_torsion = x,
            3 => f.k1 = x,
            4 => f.k2 = x,
            5 => f.speed = x,
            6 => f.gaussian_curvature = x,
            7 => f.mean_curvature = x,
            8 => f.tangent[0] = x,
            9 => f.normal[2] = x,
            10 => f.dir1[1] = x,
            11 => f.point[0] = x,
            12 => f.surface_conditioning = x,
            _ => f.curve_param = x,
        }
    }
    f
}

fn cutter(inp: &mut Input) -> StrakeCutter {
    StrakeCutter {
        kind: match inp.u8() % 8 {
            7 => u32::from(inp.u8()),
            b => u32::from(b % 3),
        },
        radius: match inp.u8() % 3 {
            0 => inp.f64(),
            _ => 0.5 + f64::from(inp.u8()) / 64.0,
        },
        corner_radius: match inp.u8() % 3 {
            0 => inp.f64(),
            _ => f64::from(inp.u8()) / 256.0,
        },
    }
}

fn angles(inp: &mut Input) -> StrakeToolAngles {
    let a = |inp: &mut Input| match inp.u8() % 3 {
        0 => inp.f64(),
        _ => f64::from(inp.u8() as i8) / 128.0,
    };
    StrakeToolAngles {
        lead: a(inp),
        tilt: a(inp),
    }
}

fn side(inp: &mut Input) -> u32 {
    match inp.u8() % 8 {
        7 => u32::from(inp.u8()),
        b => u32::from(b % 2),
    }
}

fn positive(inp: &mut Input) -> f64 {
    match inp.u8() % 3 {
        0 => inp.f64(),
        _ => (1.0 + f64::from(inp.u8())) / 64.0,
    }
}

/// Target `checks`: every single-frame check and the path summaries with arbitrary frames,
/// cutters, angles, heights, limits, samples and values.
pub fn run_checks(data: &[u8]) {
    let mut inp = Input::new(data);
    let f = read_frame(&mut inp);
    for _ in 0..3 {
        match inp.u8() % 11 {
            0 => {
                let (c, a) = (cutter(&mut inp), angles(&mut inp));
                let mut o = StrakeGougeState::default();
                let ts = side(&mut inp);
                // SAFETY: valid inputs, writable output (same below).
                let st = unsafe { strake_check_gouge(&f, ts, &c, &a, &mut o) };
                if status("strake_check_gouge", st) {
                    let w = "strake_check_gouge";
                    finite(w, "concave_curvature", o.concave_curvature);
                    finite_or_inf(w, "concave_radius", o.concave_radius);
                    finite_or_inf(w, "effective_radius_cross", o.effective_radius_cross);
                    finite_or_inf(w, "effective_radius_along", o.effective_radius_along);
                    finite_or_inf(w, "margin", o.margin);
                    finite(w, "min_lead", o.min_lead);
                }
            }
            1 => {
                let (ts, r, h) = (side(&mut inp), positive(&mut inp), positive(&mut inp));
                let mut o = StrakeScallop::default();
                let st = unsafe { strake_check_scallop(&f, ts, r, h, &mut o) };
                if status("strake_check_scallop", st) {
                    let w = "strake_check_scallop";
                    finite(w, "cross_curvature", o.cross_curvature);
                    finite(w, "height", o.height);
                    finite(w, "height_approx", o.height_approx);
                    assert!(o.height >= 0.0, "{w}: height {}", o.height);
                }
            }
            2 => {
                let (ts, r, h) = (side(&mut inp), positive(&mut inp), positive(&mut inp));
                let mut o = StrakeStepOver::default();
                let st = unsafe { strake_check_step_over(&f, ts, r, h, &mut o) };
                if status("strake_check_step_over", st) {
                    let w = "strake_check_step_over";
                    finite(w, "cross_curvature", o.cross_curvature);
                    finite(w, "step_over", o.step_over);
                    finite(w, "step_over_approx", o.step_over_approx);
                    assert!(o.step_over > 0.0, "{w}: step_over {}", o.step_over);
                }
            }
            3 => {
                let l = StrakeFeedLimits {
                    feed: positive(&mut inp),
                    max_acceleration: positive(&mut inp),
                    max_jerk: if inp.u8().is_multiple_of(2) {
                        0.0
                    } else {
                        positive(&mut inp)
                    },
                };
                let mut o = f64::NAN;
                let st = unsafe { strake_check_feed(&f, &l, &mut o) };
                if status("strake_check_feed", st) {
                    finite("strake_check_feed", "feed", o);
                    assert!(o >= 0.0 && o <= l.feed, "feed {o} outside [0, {}]", l.feed);
                }
            }
            4 => {
                let l = StrakeFibreLimits {
                    tow_width: positive(&mut inp),
                    min_steering_radius: positive(&mut inp),
                    max_twist_rate: positive(&mut inp),
                };
                let mut o = StrakeFibreState::default();
                let st = unsafe { strake_check_fibre(&f, &l, &mut o) };
                if status("strake_check_fibre", st) {
                    let w = "strake_check_fibre";
                    finite(w, "steering_curvature", o.steering_curvature);
                    finite_or_inf(w, "steering_radius", o.steering_radius);
                    finite(w, "edge_strain", o.edge_strain);
                    finite(w, "twist_rate", o.twist_rate);
                }
            }
            5 => {
                let (ts, a) = (side(&mut inp), angles(&mut inp));
                let mut o = StrakeToolAxis::default();
                let st = unsafe { strake_tool_axis(&f, ts, &a, &mut o) };
                if status("strake_tool_axis", st) {
                    unit("strake_tool_axis", "local", &o.local);
                    unit("strake_tool_axis", "space", &o.space);
                }
            }
            6 => {
                let (c, a) = (cutter(&mut inp), angles(&mut inp));
                let mut o = StrakeCutterRadii::default();
                let st = unsafe { strake_cutter_radii(&c, &a, &mut o) };
                if status("strake_cutter_radii", st) {
                    let w = "strake_cutter_radii";
                    finite_or_inf(w, "across_path", o.across_path);
                    finite_or_inf(w, "across_section", o.across_section);
                    finite_or_inf(w, "along_path", o.along_path);
                    // INFINITY for an upright flat or toroidal cutter (its flat bottom
                    // touches) and where R/sin β exceeds DBL_MAX (documented).
                    finite_or_inf(w, "inclination_plane", o.inclination_plane);
                    finite(w, "inclination", o.inclination);
                }
            }
            7 => {
                let (ts, c, a) = (side(&mut inp), cutter(&mut inp), angles(&mut inp));
                let mut o = StrakeRearGouge::default();
                let st = unsafe { strake_check_rear_gouge(&f, ts, &c, &a, &mut o) };
                if status("strake_check_rear_gouge", st) {
                    let w = "strake_check_rear_gouge";
                    finite_or_inf(w, "margin", o.margin);
                    finite(w, "depth", o.depth);
                    finite(w, "worst_angle", o.worst_angle);
                }
            }
            8 => {
                let w = positive(&mut inp);
                let mut o = StrakeTowEdges::default();
                let st = unsafe { strake_check_tow_edges(&f, w, &mut o) };
                if status("strake_check_tow_edges", st) {
                    let w = "strake_check_tow_edges";
                    finite(w, "left", o.left);
                    finite(w, "right", o.right);
                    finite(w, "steering_term", o.steering_term);
                    finite(w, "gaussian_term", o.gaussian_term);
                }
            }
            9 => {
                let (ts, c, a, h) = (
                    side(&mut inp),
                    cutter(&mut inp),
                    angles(&mut inp),
                    positive(&mut inp),
                );
                let mut o = StrakeCutterStepOver::default();
                let st = unsafe { strake_check_step_over_cutter(&f, ts, &c, &a, h, &mut o) };
                if status("strake_check_step_over_cutter", st) {
                    let w = "strake_check_step_over_cutter";
                    finite(w, "cross_curvature", o.cross_curvature);
                    finite_or_inf(w, "step_over", o.step_over);
                    finite_or_inf(w, "model", o.model);
                    finite_or_inf(w, "width_limit", o.width_limit);
                    finite_or_inf(w, "radius_across", o.radius_across);
                    assert!(o.step_over > 0.0, "{w}: step_over {}", o.step_over);
                }
            }
            _ => path_summaries(&mut inp),
        }
    }
}

fn path_summaries(inp: &mut Input) {
    let n = inp.small(8);
    let mut t = 0.0;
    let mut arc = 0.0;
    let mut samples = Vec::with_capacity(n);
    let mut values = Vec::with_capacity(n);
    for _ in 0..n {
        let mut s = StrakeSample::default();
        if inp.u8().is_multiple_of(4) {
            s.frame.curve_param = inp.f64();
            s.arc_length = inp.f64();
        } else {
            t += f64::from(inp.u8()) / 64.0;
            arc += f64::from(inp.u8()) / 16.0;
            s.frame.curve_param = t;
            s.arc_length = arc;
        }
        samples.push(s);
        values.push(inp.f64());
    }
    let mut e = StrakeExtremes::default();
    // SAFETY: n readable samples and values; writable output.
    let st = unsafe { strake_path_extremes(samples.as_ptr(), values.as_ptr(), n, &mut e) };
    if status("strake_path_extremes", st) {
        assert!(
            e.min_index < n && e.max_index < n,
            "extremes index out of range: {e:?}"
        );
        assert!(!e.min.is_nan() && !e.max.is_nan(), "NaN extreme: {e:?}");
    }
    let positions_finite = samples
        .iter()
        .all(|s| s.frame.curve_param.is_finite() && s.arc_length.is_finite());
    let limit = inp.f64();
    let capacity = inp.small(8);
    let mut buf = vec![StrakeViolation::default(); capacity.max(1)];
    let mut count = usize::MAX;
    // SAFETY: as above, `capacity` writable intervals and a writable count.
    let st = unsafe {
        strake_path_violations(
            samples.as_ptr(),
            values.as_ptr(),
            n,
            limit,
            buf.as_mut_ptr(),
            capacity,
            &mut count,
        )
    };
    if st == StrakeStatus::BufferTooSmall {
        assert!(
            count > capacity,
            "violations: BUFFER_TOO_SMALL with count {count}"
        );
    } else if status("strake_path_violations", st) {
        assert!(count <= capacity && count <= n, "violations: count {count}");
        for (k, v) in buf[..count].iter().enumerate() {
            let w = format!("violation {k}");
            for (name, x) in [
                ("start_arc_length", v.start_arc_length),
                ("end_arc_length", v.end_arc_length),
                ("start_t", v.start_t),
                ("end_t", v.end_t),
            ] {
                if positions_finite {
                    finite(&w, name, x);
                }
                assert!(!x.is_nan(), "{w}: {name} NaN");
            }
            assert!(!v.worst.is_nan(), "{w}: worst NaN");
            assert!(
                v.first_index <= v.last_index && v.last_index < n,
                "{w}: {v:?}"
            );
        }
    }
}

/// A fuzz target: one input in, panics on a broken invariant.
pub type Target = fn(&[u8]);

/// The fuzz targets by name, for the corpus replay.
pub const TARGETS: [(&str, Target); 4] = [
    ("surface", run_surface),
    ("curve", run_curve),
    ("fit", run_fit),
    ("checks", run_checks),
];

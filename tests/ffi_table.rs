//! The table test of the C ABI: every function exported in `include/strake.h` (the list is read
//! from the header, so a new function that is not in the table below fails this test), called
//! once with valid arguments (which must succeed), then once per argument with that argument
//! replaced by a hostile value:
//! - every pointer NULL (refused with STRAKE_STATUS_NULL_POINTER naming it, unless the header
//!   documents NULL as allowed);
//! - every `double` NaN, ±inf, ±DBL_MAX, 1e300, a denormal (±5e-324, 1e-310);
//! - every `size_t` 0, 1 and SIZE_MAX; every `uint32_t` 1, 2, UINT32_MAX; every `int32_t` −1, 2,
//!   INT32_MIN, INT32_MAX.
//!
//! For every call: no panic crosses the boundary (never STRAKE_STATUS_INTERNAL_PANIC); on
//! failure every output (pre-filled with a sentinel byte pattern) is untouched, except `*count`
//! on STRAKE_STATUS_BUFFER_TOO_SMALL, and the message starts with the function's name and names
//! the argument that was replaced; a NaN argument is never accepted; on success no output holds
//! a NaN. Every message seen is kept and scanned for the old number layouts (`0e0`, 17-digit
//! mantissas such as `4.9947054245269523e-1`): numbers print as `%g` does (src/numfmt.rs).

#[path = "support/ffi_util.rs"]
mod ffi_util;

use ffi_util::*;
use std::collections::BTreeSet;
use std::ffi::c_void;
use std::ptr;
use strake::ffi::*;

// ---------------------------------------------------------------------------------------------
// The header's list of functions and their parameters.

#[derive(Debug, Clone, Copy, PartialEq)]
enum Kind {
    Ptr,
    F64,
    Size,
    U32,
    I32,
}

#[derive(Debug)]
struct Param {
    name: String,
    kind: Kind,
}

#[derive(Debug)]
struct Decl {
    name: String,
    params: Vec<Param>,
}

/// Every function declared in `include/strake.h`, with its parameters, in header order.
fn header_functions() -> Vec<Decl> {
    let text = std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/include/strake.h"))
        .expect("include/strake.h");
    let mut out = Vec::new();
    let mut lines = text.lines();
    while let Some(line) = lines.next() {
        let starts_decl = !line.starts_with([' ', '*', '/', '#', '\t', '}', '{'])
            && !line.starts_with("typedef")
            && line.contains("strake_")
            && line.contains('(');
        if !starts_decl {
            continue;
        }
        let mut decl = line.to_string();
        while !decl.contains(';') {
            decl.push(' ');
            decl.push_str(lines.next().expect("declaration ends").trim());
        }
        let open = decl.find('(').unwrap();
        let head = &decl[..open];
        let name = head.rsplit([' ', '*']).next().unwrap().to_string();
        assert!(name.starts_with("strake_"), "{decl}");
        let inner = &decl[open + 1..decl.rfind(')').unwrap()];
        let mut params = Vec::new();
        if inner.trim() != "void" {
            for p in inner.split(',') {
                let p = p.trim();
                let pname = p.rsplit([' ', '*']).next().unwrap().to_string();
                let ty = p[..p.len() - pname.len()].trim();
                let kind = if ty.contains('*') || ty.ends_with("Fn") {
                    Kind::Ptr
                } else {
                    match ty {
                        "double" => Kind::F64,
                        "size_t" => Kind::Size,
                        "uint32_t" => Kind::U32,
                        "int32_t" => Kind::I32,
                        other => panic!("{name}: parameter type `{other}` not handled"),
                    }
                };
                params.push(Param { name: pname, kind });
            }
        }
        out.push(Decl { name, params });
    }
    out
}

// ---------------------------------------------------------------------------------------------
// Arguments, outputs and the table.

#[derive(Debug, Clone, Copy)]
enum A {
    P(*mut c_void),
    F(f64),
    Z(usize),
    U(u32),
    I(i32),
}
use A::*;

impl A {
    fn p<T>(self) -> *mut T {
        match self {
            P(p) => p.cast(),
            other => panic!("not a pointer: {other:?}"),
        }
    }
    fn f(self) -> f64 {
        match self {
            F(x) => x,
            other => panic!("not a double: {other:?}"),
        }
    }
    fn z(self) -> usize {
        match self {
            Z(x) => x,
            other => panic!("not a size_t: {other:?}"),
        }
    }
    fn u(self) -> u32 {
        match self {
            U(x) => x,
            other => panic!("not a uint32_t: {other:?}"),
        }
    }
    fn i(self) -> i32 {
        match self {
            I(x) => x,
            other => panic!("not an int32_t: {other:?}"),
        }
    }
    /// A callback pointer (`Option<extern fn>` has the layout of a nullable pointer).
    fn func<F: Copy>(self) -> F {
        assert_eq!(std::mem::size_of::<F>(), std::mem::size_of::<*mut c_void>());
        let p = self.p::<c_void>();
        // SAFETY: F is an `Option` of an `extern "C"` function pointer; NULL is `None`, any
        // other value was made from such a function.
        unsafe { std::mem::transmute_copy(&p) }
    }
}

const SENTINEL_BYTE: u8 = 0xA5;
const SENTINEL_WORD: u64 = 0xA5A5_A5A5_A5A5_A5A5;

/// One output of a call: a sentinel-filled buffer, how to free a handle written there on
/// success, and whether it is the `*count` of the buffer pattern.
struct Out {
    words: Vec<u64>,
    bytes: usize,
    free: Option<fn(*mut c_void)>,
    is_count: bool,
}

/// The outputs of one call (and handles the call consumes).
#[derive(Default)]
struct Scratch {
    outs: Vec<Out>,
    drops: Vec<Box<dyn FnOnce()>>,
}

impl Scratch {
    fn buffer(&mut self, bytes: usize, free: Option<fn(*mut c_void)>, is_count: bool) -> A {
        let mut words = vec![SENTINEL_WORD; bytes.div_ceil(8)];
        let p = words.as_mut_ptr().cast::<c_void>();
        self.outs.push(Out {
            words,
            bytes,
            free,
            is_count,
        });
        P(p)
    }
    /// Room for `n` values of `T`, pre-filled with the sentinel.
    fn out<T>(&mut self, n: usize) -> A {
        self.buffer(std::mem::size_of::<T>() * n, None, false)
    }
    /// The `size_t *count` of the buffer pattern.
    fn count(&mut self) -> A {
        self.buffer(8, None, true)
    }
    /// A handle output slot (`T **out`), freed with `free` after a success.
    fn handle(&mut self, free: fn(*mut c_void)) -> A {
        self.buffer(8, Some(free), false)
    }
    fn untouched(&self, out: &Out) -> bool {
        let b: &[u8] =
            // SAFETY: a Vec<u64> seen as its bytes.
            unsafe { std::slice::from_raw_parts(out.words.as_ptr().cast(), out.bytes) };
        b.iter().all(|&x| x == SENTINEL_BYTE)
    }
}

impl Drop for Scratch {
    fn drop(&mut self) {
        for d in self.drops.drain(..) {
            d();
        }
    }
}

fn free_curve(p: *mut c_void) {
    // SAFETY: a handle strake wrote.
    unsafe { strake_curve_free(p.cast()) }
}
fn free_surface(p: *mut c_void) {
    // SAFETY: a handle strake wrote.
    unsafe { strake_surface_free(p.cast()) }
}
fn free_offset(p: *mut c_void) {
    // SAFETY: a handle strake wrote.
    unsafe { strake_offset_free(p.cast()) }
}
fn free_drive(p: *mut c_void) {
    // SAFETY: a handle strake wrote.
    unsafe { strake_drive_result_free(p.cast()) }
}
fn free_plan(p: *mut c_void) {
    // SAFETY: a handle strake wrote.
    unsafe { strake_pass_plan_free(p.cast()) }
}

type Build = fn(&Fix, &mut Scratch) -> Vec<A>;
/// Calls the function; `None` for the few that return a value instead of a status.
type Call = fn(&[A]) -> Option<StrakeStatus>;

struct Case {
    name: &'static str,
    build: Build,
    call: Call,
    /// Pointer arguments the header documents as allowed to be NULL.
    nullable: &'static [&'static str],
}

// ---------------------------------------------------------------------------------------------
// Fixtures: one cylinder (radius 10, a host callback) and the handles built on it.

unsafe extern "C" fn plane_batch(
    _: *mut c_void,
    u: *const f64,
    v: *const f64,
    count: usize,
    order: i32,
    out: *mut StrakeSurfaceJet,
) -> i32 {
    for i in 0..count {
        // SAFETY: strake passes `count` parameters and jets.
        unsafe { plane(ptr::null_mut(), *u.add(i), *v.add(i), order, out.add(i)) };
    }
    0
}

/// The line of `line_curve` with its derivatives to fourth order (all zero above the first).
unsafe extern "C" fn high_line_curve(
    _: *mut c_void,
    t: f64,
    _order: i32,
    out: *mut StrakeCurveHighJet,
) -> i32 {
    // SAFETY: strake passes a valid jet.
    let j = unsafe { &mut *out };
    *j = StrakeCurveHighJet {
        u: 0.5,
        v: t,
        dv: 1.0,
        ..Default::default()
    };
    0
}

unsafe extern "C" fn line_curve(_: *mut c_void, t: f64, out: *mut StrakeCurveJet) -> i32 {
    // SAFETY: strake passes a valid jet.
    let j = unsafe { &mut *out };
    *j = StrakeCurveJet {
        u: 0.5,
        v: t,
        du: 0.0,
        dv: 1.0,
        ddu: 0.0,
        ddv: 0.0,
    };
    0
}

/// The cylinder of `ffi_util::cylinder` (radius *user_data) with its partials to fourth order.
unsafe extern "C" fn high_cylinder(
    user_data: *mut c_void,
    u: f64,
    v: f64,
    _order: i32,
    out: *mut StrakeSurfaceHighJet,
) -> i32 {
    // SAFETY: user_data is the fixture's radius; out is a valid jet.
    let (r, j) = unsafe { (*(user_data as *const f64), &mut *out) };
    let (sn, c) = u.sin_cos();
    *j = StrakeSurfaceHighJet {
        p: [r * c, r * sn, v],
        su: [-r * sn, r * c, 0.0],
        sv: [0.0, 0.0, 1.0],
        suu: [-r * c, -r * sn, 0.0],
        suuu: [r * sn, -r * c, 0.0],
        suuuu: [r * c, r * sn, 0.0],
        ..Default::default()
    };
    0
}

struct Fix {
    _radius: Box<f64>,
    cyl: *mut StrakeSurface,
    /// The same cylinder from `strake_surface_from_high_callback` (partials to fourth order).
    hcyl: *mut StrakeSurface,
    /// The tool-centre point of `cutter` at `angles` at t = 0.5 of `line` on `hcyl` (order 4).
    centre_point: StrakeCentrePoint,
    centre_limits: StrakeCentreFeedLimits,
    /// The ruling u = 0.6 over v in [−2.5, 2.5].
    line: *mut StrakeCurve,
    first: *mut StrakeCurve,
    course: *mut StrakeCurve,
    adjacent: *mut StrakeCurve,
    pattern: *mut StrakeCurve,
    offset: *mut StrakeOffset,
    adjacent_offset: *mut StrakeOffset,
    drive: *mut StrakeDriveResult,
    plan: *mut StrakePassPlan,
    piece_points: usize,
    frame: StrakeFrame,
    samples: Vec<StrakeSample>,
    values: Vec<f64>,
    ts: Vec<f64>,
    uv: Vec<f64>,
    knots: Vec<f64>,
    uv_points: Vec<f64>,
    space_points: Vec<f64>,
    derivative: [f64; 2],
    centre: [f64; 2],
    axis: [f64; 3],
    direction: [f64; 3],
    theta: f64,
    distance: f64,
    surface_data: StrakeNurbsSurfaceData,
    _bilinear: Vec<f64>,
    unit_knots: Vec<f64>,
    surface_jet: StrakeSurfaceJet,
    curve_jet: StrakeCurveJet,
    scales: StrakeParamScales,
    projection: StrakeProjectionOptions,
    /// For a straight chord between two points of the cylinder (0.0094 off it at most).
    loose_projection: StrakeProjectionOptions,
    geodesic: StrakeGeodesicOptions,
    offset_options: StrakeOffsetOptions,
    drive_plane: StrakeDrivePlane,
    drive_options: StrakeDriveOptions,
    pass_options: StrakePassOptions,
    cutter: StrakeCutter,
    angles: StrakeToolAngles,
    feed: StrakeFeedLimits,
    fibre: StrakeFibreLimits,
    report: &'static std::ffi::CStr,
}

fn ok(st: StrakeStatus) {
    assert_eq!(st, StrakeStatus::Ok, "{}", message());
}

impl Fix {
    fn new() -> Fix {
        let mut radius = Box::new(10.0f64);
        let cyl = surface(
            Some(cylinder),
            (&mut *radius as *mut f64).cast(),
            (0.0, 1.2),
            (-3.0, 3.0),
            0,
        );
        let line = uv_line([0.6, -2.5], [0.6, 2.5]);
        let first = uv_line([0.05, -2.5], [0.05, 2.5]);
        let pattern = uv_line([1.0, 0.0], [5.0, 0.0]);
        let frame = frame_at(cyl, line, 0.5);
        let mut hcyl = ptr::null_mut();
        // SAFETY: a valid callback, its user data outlives the handle, a valid output slot.
        ok(unsafe {
            strake_surface_from_high_callback(
                Some(high_cylinder),
                (&mut *radius as *mut f64).cast(),
                4,
                0.0,
                1.2,
                -3.0,
                3.0,
                0,
                &mut hcyl,
            )
        });
        let cutter = StrakeCutter {
            kind: StrakeCutterKind::Ball as u32,
            radius: 1.0,
            corner_radius: 0.0,
        };
        let angles = StrakeToolAngles {
            lead: 0.1,
            tilt: 0.05,
        };
        let mut centre_point = StrakeCentrePoint::default();
        // SAFETY: live handles, valid inputs and output.
        ok(unsafe {
            strake_centre_point_at(
                hcyl,
                line,
                0.5,
                StrakeToolSide::AlongNormal as u32,
                &cutter,
                &angles,
                4,
                &mut centre_point,
            )
        });
        let projection = StrakeProjectionOptions {
            tolerance: 1e-9,
            periodic_u: 0,
            periodic_v: 0,
            grid: 0,
            max_iterations: 0,
        };
        let geodesic = StrakeGeodesicOptions {
            tolerance: 1e-9,
            max_steps: 0,
        };
        let offset_options = StrakeOffsetOptions {
            chord_tolerance: 1e-6,
            ..Default::default()
        };
        let drive_plane = StrakeDrivePlane {
            origin: [20.0, 0.0, 0.0],
            x_axis: [0.0, 1.0, 0.0],
            y_axis: [0.0, 0.0, 1.0],
        };
        let drive_options = StrakeDriveOptions {
            projection,
            samples: 0,
            fit_tolerance: 1e-7,
            locate_tolerance: 0.0,
        };
        let pass_options = StrakePassOptions {
            ball_radius: 3.0,
            tool_side: StrakeToolSide::AlongNormal as u32,
            rule: StrakeStepRule::IsoScallop as u32,
            scallop_height: 0.05,
            step_over: 0.0,
            advance: 1,
            chord_tolerance: 1e-6,
            distance_samples: 0,
            scallop_samples: 0,
            max_passes: 0,
            max_rows: 2,
            use_cutter: 0,
            cutter: StrakeCutter::default(),
            angles: StrakeToolAngles::default(),
            max_jets: 0,
            max_offset_jets: 0,
        };
        let mut samples = vec![StrakeSample::default(); 5];
        let mut n = 0;
        let direction = [-1.0, 0.0, 0.0];
        let axis = [0.0, 0.0, 1.0];
        let theta = 0.4;
        let distance = 0.3;
        let mut offset = ptr::null_mut();
        let mut course = ptr::null_mut();
        let mut adjacent_offset = ptr::null_mut();
        let mut adjacent = ptr::null_mut();
        let mut drive = ptr::null_mut();
        let mut plan = ptr::null_mut();
        let mut info = StrakeGeodesicInfo::default();
        let mut piece_points = 0;
        // SAFETY: live handles, valid options and output slots.
        unsafe {
            ok(strake_sample_even_t(
                cyl,
                line,
                5,
                1e-9,
                samples.as_mut_ptr(),
                5,
                &mut n,
            ));
            ok(strake_offset_new(
                cyl,
                line,
                0,
                ptr::null(),
                &distance,
                1,
                &offset_options,
                &mut offset,
            ));
            let st = strake_offset_piece_points(offset, 0, ptr::null_mut(), 0, &mut piece_points);
            assert_eq!(st, StrakeStatus::BufferTooSmall, "{}", message());
            ok(strake_course_fixed_angle(
                cyl,
                0.6,
                -1.0,
                axis.as_ptr(),
                0.5,
                1.0,
                &geodesic,
                &mut course,
                &mut info,
            ));
            ok(strake_course_adjacent(
                cyl,
                course,
                0.2,
                0,
                &offset_options,
                &mut adjacent_offset,
            ));
            ok(strake_offset_piece_curve(adjacent_offset, 0, &mut adjacent));
            ok(strake_drive_project(
                cyl,
                &drive_plane,
                direction.as_ptr(),
                pattern,
                &drive_options,
                &mut drive,
            ));
            ok(strake_plan_passes(cyl, first, &pass_options, &mut plan));
        }
        let bilinear = vec![0.0, 0.0, 0.0, 0.0, 2.0, 1.0, 3.0, 0.0, -1.0, 3.0, 2.0, 4.0];
        let unit_knots = vec![0.0, 0.0, 1.0, 1.0];
        let surface_data = StrakeNurbsSurfaceData {
            degree_u: 1,
            degree_v: 1,
            count_u: 2,
            count_v: 2,
            knots_u: unit_knots.as_ptr(),
            knot_count_u: 4,
            knots_v: unit_knots.as_ptr(),
            knot_count_v: 4,
            points: bilinear.as_ptr(),
            weights: ptr::null(),
        };
        // Points on the cylinder x = 10 cos u, y = 10 sin u, z = v.
        let on_cyl = |u: f64, v: f64| [10.0 * u.cos(), 10.0 * u.sin(), v];
        let space_points = [
            on_cyl(0.3, -1.0),
            on_cyl(0.4, -0.3),
            on_cyl(0.5, 0.4),
            on_cyl(0.6, 1.0),
        ]
        .concat();
        Fix {
            _radius: radius,
            cyl,
            hcyl,
            centre_point,
            centre_limits: StrakeCentreFeedLimits {
                feed: 100.0,
                max_acceleration: 1000.0,
                max_jerk: 1e5,
                max_angular_speed: 1.0,
            },
            line,
            first,
            course,
            adjacent,
            pattern,
            offset,
            adjacent_offset,
            drive,
            plan,
            piece_points,
            frame,
            samples,
            values: vec![1.0, 2.0, 3.0, 2.0, 1.0],
            ts: vec![0.0, 0.5, 1.0],
            uv: vec![0.5, 0.0, 0.7, 1.0],
            knots: vec![0.0, 0.0, 0.0, 0.0, 1.0, 1.0, 1.0, 1.0],
            uv_points: vec![0.1, 0.1, 0.3, 0.5, 0.6, 0.4, 0.9, 0.9],
            space_points,
            derivative: [1.0, 1.0],
            centre: [0.0, 0.0],
            axis,
            direction,
            theta,
            distance,
            surface_data,
            _bilinear: bilinear,
            unit_knots,
            surface_jet: StrakeSurfaceJet {
                p: [0.5, 0.5, 0.0],
                su: [1.0, 0.0, 0.0],
                sv: [0.0, 1.0, 0.0],
                suu: [0.0, 0.0, 0.1],
                ..Default::default()
            },
            curve_jet: StrakeCurveJet {
                u: 0.5,
                v: 0.5,
                du: 1.0,
                dv: 0.5,
                ddu: 0.0,
                ddv: 0.0,
            },
            scales: StrakeParamScales {
                u_extent: 1.0,
                v_extent: 1.0,
                t_extent: 1.0,
            },
            projection,
            loose_projection: StrakeProjectionOptions {
                tolerance: 0.1,
                ..projection
            },
            geodesic,
            offset_options,
            drive_plane,
            drive_options,
            pass_options,
            cutter,
            angles,
            feed: StrakeFeedLimits {
                feed: 100.0,
                max_acceleration: 1000.0,
                max_jerk: 1e5,
            },
            fibre: StrakeFibreLimits {
                tow_width: 0.1,
                min_steering_radius: 10.0,
                max_twist_rate: 1.0,
            },
            report: c"host says hello",
        }
    }
}

impl Drop for Fix {
    fn drop(&mut self) {
        // SAFETY: handles made in `new`, freed once.
        unsafe {
            strake_pass_plan_free(self.plan);
            strake_drive_result_free(self.drive);
            strake_offset_free(self.offset);
            strake_offset_free(self.adjacent_offset);
            for c in [
                self.line,
                self.first,
                self.course,
                self.adjacent,
                self.pattern,
            ] {
                strake_curve_free(c);
            }
            strake_surface_free(self.cyl);
            strake_surface_free(self.hcyl);
        }
    }
}

fn cp<T>(r: &T) -> A {
    P((r as *const T).cast_mut().cast())
}
fn sp<T>(r: &[T]) -> A {
    P(r.as_ptr().cast_mut().cast())
}
fn hp<T>(h: *mut T) -> A {
    P(h.cast())
}
fn st(s: StrakeStatus) -> Option<StrakeStatus> {
    Some(s)
}

macro_rules! case {
    ($name:ident, [$($nullable:literal),*], |$f:ident, $s:ident| $build:expr, |$a:ident| $call:expr) => {
        Case {
            name: stringify!($name),
            build: |$f: &Fix, $s: &mut Scratch| $build,
            // SAFETY: the arguments are valid as built, or hostile in exactly the way the
            // table test means (NULL where the header allows the check, a hostile number).
            #[allow(unused_unsafe)]
            call: |$a: &[A]| unsafe { $call },
            nullable: &[$($nullable),*],
        }
    };
}

fn table() -> Vec<Case> {
    vec![
        // --- version and errors
        case!(strake_version, [], |_f, _s| vec![], |_a| {
            strake_version();
            None
        }),
        case!(strake_status_name, [], |_f, _s| vec![U(3)], |a| {
            strake_status_name(a[0].u());
            None
        }),
        case!(
            strake_last_error_message,
            ["buf"],
            |_f, s| vec![s.out::<u8>(8192), Z(8192)],
            |a| {
                strake_last_error_message(a[0].p(), a[1].z());
                None
            }
        ),
        case!(strake_last_callback_code, [], |_f, _s| vec![], |_a| {
            strake_last_callback_code();
            None
        }),
        case!(
            strake_callback_report,
            ["message"],
            |f, _s| vec![P(f.report.as_ptr().cast_mut().cast())],
            |a| {
                strake_callback_report(a[0].p());
                strake_callback_report(ptr::null());
                None
            }
        ),
        // --- surfaces
        case!(
            strake_surface_set_knot_lines,
            [],
            |_f, s| {
                let own = surface(Some(plane), ptr::null_mut(), (0.0, 1.0), (0.0, 1.0), 0);
                s.drops.push(Box::new(move || free_surface(own.cast())));
                static U_LINES: [f64; 2] = [0.25, 0.5];
                static V_LINES: [f64; 1] = [0.5];
                vec![hp(own), sp(&U_LINES), Z(2), sp(&V_LINES), Z(1)]
            },
            |a| st(strake_surface_set_knot_lines(
                a[0].p(),
                a[1].p(),
                a[2].z(),
                a[3].p(),
                a[4].z()
            ))
        ),
        case!(
            strake_surface_from_callback,
            ["user_data"],
            |f, s| vec![
                P(cylinder as *mut c_void),
                P((&*f._radius as *const f64).cast_mut().cast()),
                F(0.0),
                F(1.0),
                F(-1.0),
                F(1.0),
                I(0),
                s.handle(free_surface)
            ],
            |a| st(strake_surface_from_callback(
                a[0].func(),
                a[1].p(),
                a[2].f(),
                a[3].f(),
                a[4].f(),
                a[5].f(),
                a[6].i(),
                a[7].p()
            ))
        ),
        case!(
            strake_surface_free,
            ["surface"],
            |_f, _s| {
                vec![hp(surface(
                    Some(plane),
                    ptr::null_mut(),
                    (0.0, 1.0),
                    (0.0, 1.0),
                    0,
                ))]
            },
            |a| {
                strake_surface_free(a[0].p());
                None
            }
        ),
        case!(
            strake_surface_new_nurbs,
            [],
            |f, s| vec![cp(&f.surface_data), I(1), s.handle(free_surface)],
            |a| st(strake_surface_new_nurbs(a[0].p(), a[1].i(), a[2].p()))
        ),
        case!(
            strake_surface_from_batch_callback,
            ["user_data"],
            |_f, s| vec![
                P(plane_batch as *mut c_void),
                P(ptr::null_mut()),
                F(0.0),
                F(1.0),
                F(-1.0),
                F(1.0),
                I(0),
                s.handle(free_surface)
            ],
            |a| st(strake_surface_from_batch_callback(
                a[0].func(),
                a[1].p(),
                a[2].f(),
                a[3].f(),
                a[4].f(),
                a[5].f(),
                a[6].i(),
                a[7].p()
            ))
        ),
        case!(
            strake_surface_evaluate,
            [],
            |f, s| vec![
                hp(f.cyl),
                sp(&f.uv),
                Z(2),
                U(2),
                s.out::<StrakeSurfaceJet>(2)
            ],
            |a| st(strake_surface_evaluate(
                a[0].p(),
                a[1].p(),
                a[2].z(),
                a[3].u(),
                a[4].p()
            ))
        ),
        // --- curves
        case!(
            strake_curve_new_nurbs,
            ["weights"],
            |f, s| vec![
                U(3),
                sp(&f.knots),
                Z(8),
                sp(&f.uv_points),
                Z(4),
                sp(&[1.0, 2.0, 1.0, 1.0][..]),
                s.handle(free_curve)
            ],
            |a| st(strake_curve_new_nurbs(
                a[0].u(),
                a[1].p(),
                a[2].z(),
                a[3].p(),
                a[4].z(),
                a[5].p(),
                a[6].p()
            ))
        ),
        case!(
            strake_curve_from_callback,
            ["user_data"],
            |_f, s| vec![
                P(line_curve as *mut c_void),
                P(ptr::null_mut()),
                F(-1.0),
                F(1.0),
                s.handle(free_curve)
            ],
            |a| st(strake_curve_from_callback(
                a[0].func(),
                a[1].p(),
                a[2].f(),
                a[3].f(),
                a[4].p()
            ))
        ),
        case!(
            strake_curve_from_high_callback,
            ["user_data"],
            |_f, s| vec![
                P(high_line_curve as *mut c_void),
                P(ptr::null_mut()),
                U(4),
                F(-1.0),
                F(1.0),
                s.handle(free_curve)
            ],
            |a| st(strake_curve_from_high_callback(
                a[0].func(),
                a[1].p(),
                a[2].u(),
                a[3].f(),
                a[4].f(),
                a[5].p()
            ))
        ),
        case!(
            strake_curve_free,
            ["curve"],
            |_f, _s| vec![hp(uv_line([0.0, 0.0], [1.0, 1.0]))],
            |a| {
                strake_curve_free(a[0].p());
                None
            }
        ),
        case!(
            strake_curve_through_uv_points,
            ["start_derivative", "end_derivative"],
            |f, s| vec![
                sp(&f.uv_points),
                Z(4),
                U(3),
                U(0),
                sp(&f.derivative),
                sp(&f.derivative),
                s.handle(free_curve)
            ],
            |a| st(strake_curve_through_uv_points(
                a[0].p(),
                a[1].z(),
                a[2].u(),
                a[3].u(),
                a[4].p(),
                a[5].p(),
                a[6].p()
            ))
        ),
        case!(
            strake_curve_through_space_points,
            ["projections"],
            |f, s| vec![
                hp(f.cyl),
                sp(&f.space_points),
                Z(4),
                cp(&f.projection),
                U(3),
                U(0),
                s.out::<StrakeProjection>(4),
                s.handle(free_curve)
            ],
            |a| st(strake_curve_through_space_points(
                a[0].p(),
                a[1].p(),
                a[2].z(),
                a[3].p(),
                a[4].u(),
                a[5].u(),
                a[6].p(),
                a[7].p()
            ))
        ),
        case!(
            strake_curve_project_nurbs,
            ["weights"],
            |f, s| vec![
                hp(f.cyl),
                U(1),
                sp(&f.unit_knots),
                Z(4),
                sp(&f.space_points[..6]),
                Z(2),
                sp(&[1.0, 1.0][..]),
                cp(&f.loose_projection),
                F(1e-6),
                s.handle(free_curve)
            ],
            |a| st(strake_curve_project_nurbs(
                a[0].p(),
                a[1].u(),
                a[2].p(),
                a[3].z(),
                a[4].p(),
                a[5].z(),
                a[6].p(),
                a[7].p(),
                a[8].f(),
                a[9].p()
            ))
        ),
        case!(
            strake_surface_project_points,
            [],
            |f, s| vec![
                hp(f.cyl),
                sp(&f.space_points),
                Z(4),
                cp(&f.projection),
                s.out::<StrakeProjection>(4)
            ],
            |a| st(strake_surface_project_points(
                a[0].p(),
                a[1].p(),
                a[2].z(),
                a[3].p(),
                a[4].p()
            ))
        ),
        // --- frames
        case!(
            strake_frame_at,
            [],
            |f, s| vec![hp(f.cyl), hp(f.line), F(0.5), s.out::<StrakeFrame>(1)],
            |a| st(strake_frame_at(a[0].p(), a[1].p(), a[2].f(), a[3].p()))
        ),
        case!(
            strake_frames_at,
            [],
            |f, s| vec![
                hp(f.cyl),
                hp(f.line),
                sp(&f.ts),
                Z(3),
                s.out::<StrakeFrame>(3)
            ],
            |a| st(strake_frames_at(
                a[0].p(),
                a[1].p(),
                a[2].p(),
                a[3].z(),
                a[4].p()
            ))
        ),
        case!(
            strake_frames_even,
            [],
            |f, s| vec![hp(f.cyl), hp(f.line), Z(3), s.out::<StrakeFrame>(3)],
            |a| st(strake_frames_even(a[0].p(), a[1].p(), a[2].z(), a[3].p()))
        ),
        case!(
            strake_frame_from_jets,
            [],
            |f, s| vec![
                cp(&f.surface_jet),
                cp(&f.curve_jet),
                I(0),
                cp(&f.scales),
                s.out::<StrakeFrame>(1)
            ],
            |a| st(strake_frame_from_jets(
                a[0].p(),
                a[1].p(),
                a[2].i(),
                a[3].p(),
                a[4].p()
            ))
        ),
        case!(
            strake_frames_at_parallel,
            [],
            |f, s| vec![
                hp(f.cyl),
                hp(f.line),
                sp(&f.ts),
                Z(3),
                U(2),
                s.out::<StrakeFrame>(3)
            ],
            |a| st(strake_frames_at_parallel(
                a[0].p(),
                a[1].p(),
                a[2].p(),
                a[3].z(),
                a[4].u(),
                a[5].p()
            ))
        ),
        case!(
            strake_knot_line_flags,
            [],
            |f, s| vec![hp(f.cyl), hp(f.line), sp(&f.ts), Z(3), s.out::<u32>(3)],
            |a| st(strake_knot_line_flags(
                a[0].p(),
                a[1].p(),
                a[2].p(),
                a[3].z(),
                a[4].p()
            ))
        ),
        // --- the tool-centre path
        case!(
            strake_surface_from_high_callback,
            ["user_data"],
            |f, s| vec![
                P(high_cylinder as *mut c_void),
                P((&*f._radius as *const f64).cast_mut().cast()),
                U(4),
                F(0.0),
                F(1.0),
                F(-1.0),
                F(1.0),
                I(0),
                s.handle(free_surface)
            ],
            |a| st(strake_surface_from_high_callback(
                a[0].func(),
                a[1].p(),
                a[2].u(),
                a[3].f(),
                a[4].f(),
                a[5].f(),
                a[6].f(),
                a[7].i(),
                a[8].p()
            ))
        ),
        case!(
            strake_invariant_rates_at,
            [],
            |f, s| vec![
                hp(f.hcyl),
                hp(f.line),
                F(0.5),
                s.out::<StrakeFrame>(1),
                s.out::<StrakeInvariantRates>(1)
            ],
            |a| st(strake_invariant_rates_at(
                a[0].p(),
                a[1].p(),
                a[2].f(),
                a[3].p(),
                a[4].p()
            ))
        ),
        case!(
            strake_invariant_rates_path,
            [],
            |f, s| vec![
                hp(f.hcyl),
                hp(f.line),
                sp(&f.ts),
                Z(3),
                s.out::<StrakeFrame>(3),
                s.out::<StrakeInvariantRates>(3)
            ],
            |a| st(strake_invariant_rates_path(
                a[0].p(),
                a[1].p(),
                a[2].p(),
                a[3].z(),
                a[4].p(),
                a[5].p()
            ))
        ),
        case!(
            strake_centre_point_at,
            [],
            |f, s| vec![
                hp(f.hcyl),
                hp(f.line),
                F(0.5),
                U(0),
                cp(&f.cutter),
                cp(&f.angles),
                U(4),
                s.out::<StrakeCentrePoint>(1)
            ],
            |a| st(strake_centre_point_at(
                a[0].p(),
                a[1].p(),
                a[2].f(),
                a[3].u(),
                a[4].p(),
                a[5].p(),
                a[6].u(),
                a[7].p()
            ))
        ),
        case!(
            strake_centre_path_at,
            [],
            |f, s| vec![
                hp(f.hcyl),
                hp(f.line),
                sp(&f.ts),
                Z(3),
                U(0),
                cp(&f.cutter),
                cp(&f.angles),
                U(3),
                s.out::<StrakeCentrePoint>(3)
            ],
            |a| st(strake_centre_path_at(
                a[0].p(),
                a[1].p(),
                a[2].p(),
                a[3].z(),
                a[4].u(),
                a[5].p(),
                a[6].p(),
                a[7].u(),
                a[8].p()
            ))
        ),
        case!(
            strake_centre_feed,
            [],
            |f, s| vec![
                cp(&f.centre_point),
                cp(&f.centre_limits),
                s.out::<StrakeCentreFeed>(1)
            ],
            |a| st(strake_centre_feed(a[0].p(), a[1].p(), a[2].p()))
        ),
        case!(
            strake_centre_feed_path,
            [],
            |f, s| vec![
                cp(&f.centre_point),
                Z(1),
                cp(&f.centre_limits),
                s.out::<StrakeCentreFeed>(1)
            ],
            |a| st(strake_centre_feed_path(
                a[0].p(),
                a[1].z(),
                a[2].p(),
                a[3].p()
            ))
        ),
        case!(
            strake_sample_chordal_centre,
            [],
            |f, s| vec![
                hp(f.hcyl),
                hp(f.line),
                F(1e-3),
                F(1.0),
                F(1e-9),
                U(0),
                cp(&f.cutter),
                cp(&f.angles),
                s.out::<StrakeSample>(64),
                Z(64),
                s.count()
            ],
            |a| st(strake_sample_chordal_centre(
                a[0].p(),
                a[1].p(),
                a[2].f(),
                a[3].f(),
                a[4].f(),
                a[5].u(),
                a[6].p(),
                a[7].p(),
                a[8].p(),
                a[9].z(),
                a[10].p()
            ))
        ),
        // --- sampling
        case!(
            strake_sample_even_t,
            [],
            |f, s| vec![
                hp(f.cyl),
                hp(f.line),
                Z(5),
                F(1e-9),
                s.out::<StrakeSample>(8),
                Z(8),
                s.count()
            ],
            |a| st(strake_sample_even_t(
                a[0].p(),
                a[1].p(),
                a[2].z(),
                a[3].f(),
                a[4].p(),
                a[5].z(),
                a[6].p()
            ))
        ),
        case!(
            strake_sample_even_arc,
            [],
            |f, s| vec![
                hp(f.cyl),
                hp(f.line),
                Z(5),
                F(1e-9),
                s.out::<StrakeSample>(8),
                Z(8),
                s.count()
            ],
            |a| st(strake_sample_even_arc(
                a[0].p(),
                a[1].p(),
                a[2].z(),
                a[3].f(),
                a[4].p(),
                a[5].z(),
                a[6].p()
            ))
        ),
        case!(
            strake_sample_chordal,
            [],
            |f, s| vec![
                hp(f.cyl),
                hp(f.line),
                F(1e-3),
                F(1.0),
                F(1e-9),
                s.out::<StrakeSample>(64),
                Z(64),
                s.count()
            ],
            |a| st(strake_sample_chordal(
                a[0].p(),
                a[1].p(),
                a[2].f(),
                a[3].f(),
                a[4].f(),
                a[5].p(),
                a[6].z(),
                a[7].p()
            ))
        ),
        case!(
            strake_arc_length,
            [],
            |f, s| vec![
                hp(f.cyl),
                hp(f.line),
                F(0.0),
                F(1.0),
                F(1e-9),
                s.out::<f64>(1)
            ],
            |a| st(strake_arc_length(
                a[0].p(),
                a[1].p(),
                a[2].f(),
                a[3].f(),
                a[4].f(),
                a[5].p()
            ))
        ),
        case!(
            strake_samples_at,
            [],
            |f, s| vec![
                hp(f.cyl),
                hp(f.line),
                sp(&f.ts),
                Z(3),
                F(1e-9),
                s.out::<StrakeSample>(3)
            ],
            |a| st(strake_samples_at(
                a[0].p(),
                a[1].p(),
                a[2].p(),
                a[3].z(),
                a[4].f(),
                a[5].p()
            ))
        ),
        // --- checks at one frame
        case!(
            strake_check_gouge,
            [],
            |f, s| vec![
                cp(&f.frame),
                U(0),
                cp(&f.cutter),
                cp(&f.angles),
                s.out::<StrakeGougeState>(1)
            ],
            |a| st(strake_check_gouge(
                a[0].p(),
                a[1].u(),
                a[2].p(),
                a[3].p(),
                a[4].p()
            ))
        ),
        case!(
            strake_check_scallop,
            [],
            |f, s| vec![
                cp(&f.frame),
                U(0),
                F(1.0),
                F(0.5),
                s.out::<StrakeScallop>(1)
            ],
            |a| st(strake_check_scallop(
                a[0].p(),
                a[1].u(),
                a[2].f(),
                a[3].f(),
                a[4].p()
            ))
        ),
        case!(
            strake_check_step_over,
            [],
            |f, s| vec![
                cp(&f.frame),
                U(0),
                F(1.0),
                F(0.01),
                s.out::<StrakeStepOver>(1)
            ],
            |a| st(strake_check_step_over(
                a[0].p(),
                a[1].u(),
                a[2].f(),
                a[3].f(),
                a[4].p()
            ))
        ),
        case!(
            strake_check_feed,
            [],
            |f, s| vec![cp(&f.frame), cp(&f.feed), s.out::<f64>(1)],
            |a| st(strake_check_feed(a[0].p(), a[1].p(), a[2].p()))
        ),
        case!(
            strake_check_fibre,
            [],
            |f, s| vec![cp(&f.frame), cp(&f.fibre), s.out::<StrakeFibreState>(1)],
            |a| st(strake_check_fibre(a[0].p(), a[1].p(), a[2].p()))
        ),
        case!(
            strake_tool_axis,
            [],
            |f, s| vec![
                cp(&f.frame),
                U(0),
                cp(&f.angles),
                s.out::<StrakeToolAxis>(1)
            ],
            |a| st(strake_tool_axis(a[0].p(), a[1].u(), a[2].p(), a[3].p()))
        ),
        case!(
            strake_path_extremes,
            [],
            |f, s| vec![
                sp(&f.samples),
                sp(&f.values),
                Z(5),
                s.out::<StrakeExtremes>(1)
            ],
            |a| st(strake_path_extremes(a[0].p(), a[1].p(), a[2].z(), a[3].p()))
        ),
        case!(
            strake_path_violations,
            [],
            |f, s| vec![
                sp(&f.samples),
                sp(&f.values),
                Z(5),
                F(1.5),
                s.out::<StrakeViolation>(8),
                Z(8),
                s.count()
            ],
            |a| st(strake_path_violations(
                a[0].p(),
                a[1].p(),
                a[2].z(),
                a[3].f(),
                a[4].p(),
                a[5].z(),
                a[6].p()
            ))
        ),
        case!(
            strake_cutter_radii,
            [],
            |f, s| vec![cp(&f.cutter), cp(&f.angles), s.out::<StrakeCutterRadii>(1)],
            |a| st(strake_cutter_radii(a[0].p(), a[1].p(), a[2].p()))
        ),
        case!(
            strake_check_rear_gouge,
            [],
            |f, s| vec![
                cp(&f.frame),
                U(0),
                cp(&f.cutter),
                cp(&f.angles),
                s.out::<StrakeRearGouge>(1)
            ],
            |a| st(strake_check_rear_gouge(
                a[0].p(),
                a[1].u(),
                a[2].p(),
                a[3].p(),
                a[4].p()
            ))
        ),
        case!(
            strake_check_tow_edges,
            [],
            |f, s| vec![cp(&f.frame), F(0.1), s.out::<StrakeTowEdges>(1)],
            |a| st(strake_check_tow_edges(a[0].p(), a[1].f(), a[2].p()))
        ),
        case!(
            strake_check_step_over_cutter,
            [],
            |f, s| vec![
                cp(&f.frame),
                U(0),
                cp(&f.cutter),
                cp(&f.angles),
                F(0.01),
                s.out::<StrakeCutterStepOver>(1)
            ],
            |a| st(strake_check_step_over_cutter(
                a[0].p(),
                a[1].u(),
                a[2].p(),
                a[3].p(),
                a[4].f(),
                a[5].p()
            ))
        ),
        // --- checks along a path
        case!(
            strake_check_gouge_path,
            [],
            |f, s| vec![
                sp(&f.samples),
                Z(5),
                U(0),
                cp(&f.cutter),
                cp(&f.angles),
                s.out::<StrakeGougeState>(5)
            ],
            |a| st(strake_check_gouge_path(
                a[0].p(),
                a[1].z(),
                a[2].u(),
                a[3].p(),
                a[4].p(),
                a[5].p()
            ))
        ),
        case!(
            strake_check_rear_gouge_path,
            [],
            |f, s| vec![
                sp(&f.samples),
                Z(5),
                U(0),
                cp(&f.cutter),
                cp(&f.angles),
                s.out::<StrakeRearGouge>(5)
            ],
            |a| st(strake_check_rear_gouge_path(
                a[0].p(),
                a[1].z(),
                a[2].u(),
                a[3].p(),
                a[4].p(),
                a[5].p()
            ))
        ),
        case!(
            strake_check_scallop_path,
            [],
            |f, s| vec![
                sp(&f.samples),
                Z(5),
                U(0),
                F(1.0),
                F(0.5),
                s.out::<StrakeScallop>(5)
            ],
            |a| st(strake_check_scallop_path(
                a[0].p(),
                a[1].z(),
                a[2].u(),
                a[3].f(),
                a[4].f(),
                a[5].p()
            ))
        ),
        case!(
            strake_check_step_over_cutter_path,
            [],
            |f, s| vec![
                sp(&f.samples),
                Z(5),
                U(0),
                cp(&f.cutter),
                cp(&f.angles),
                F(0.01),
                s.out::<StrakeCutterStepOver>(5)
            ],
            |a| st(strake_check_step_over_cutter_path(
                a[0].p(),
                a[1].z(),
                a[2].u(),
                a[3].p(),
                a[4].p(),
                a[5].f(),
                a[6].p()
            ))
        ),
        case!(
            strake_check_feed_path,
            [],
            |f, s| vec![sp(&f.samples), Z(5), cp(&f.feed), s.out::<f64>(5)],
            |a| st(strake_check_feed_path(
                a[0].p(),
                a[1].z(),
                a[2].p(),
                a[3].p()
            ))
        ),
        case!(
            strake_check_fibre_path,
            [],
            |f, s| vec![
                sp(&f.samples),
                Z(5),
                cp(&f.fibre),
                s.out::<StrakeFibreState>(5)
            ],
            |a| st(strake_check_fibre_path(
                a[0].p(),
                a[1].z(),
                a[2].p(),
                a[3].p()
            ))
        ),
        case!(
            strake_check_tow_edges_path,
            [],
            |f, s| vec![sp(&f.samples), Z(5), F(0.1), s.out::<StrakeTowEdges>(5)],
            |a| st(strake_check_tow_edges_path(
                a[0].p(),
                a[1].z(),
                a[2].f(),
                a[3].p()
            ))
        ),
        case!(
            strake_tool_axis_path,
            [],
            |f, s| vec![
                sp(&f.samples),
                Z(5),
                U(0),
                cp(&f.angles),
                s.out::<StrakeToolAxis>(5)
            ],
            |a| st(strake_tool_axis_path(
                a[0].p(),
                a[1].z(),
                a[2].u(),
                a[3].p(),
                a[4].p()
            ))
        ),
        // --- geodesics and offsets
        case!(
            strake_geodesic_trace,
            ["out_info"],
            |f, s| vec![
                hp(f.cyl),
                F(0.6),
                F(0.0),
                U(0),
                cp(&f.theta),
                F(1.0),
                cp(&f.geodesic),
                s.handle(free_curve),
                s.out::<StrakeGeodesicInfo>(1)
            ],
            |a| st(strake_geodesic_trace(
                a[0].p(),
                a[1].f(),
                a[2].f(),
                a[3].u(),
                a[4].p(),
                a[5].f(),
                a[6].p(),
                a[7].p(),
                a[8].p()
            ))
        ),
        case!(
            strake_geodesic_between,
            ["out_curve"],
            |f, s| vec![
                hp(f.cyl),
                F(0.5),
                F(-1.0),
                F(0.7),
                F(1.0),
                cp(&f.geodesic),
                s.handle(free_curve),
                s.out::<f64>(1)
            ],
            |a| st(strake_geodesic_between(
                a[0].p(),
                a[1].f(),
                a[2].f(),
                a[3].f(),
                a[4].f(),
                a[5].p(),
                a[6].p(),
                a[7].p()
            ))
        ),
        case!(
            strake_offset_new,
            ["distance_t"],
            |f, s| vec![
                hp(f.cyl),
                hp(f.line),
                U(0),
                sp(&[0.0][..]),
                cp(&f.distance),
                Z(1),
                cp(&f.offset_options),
                s.handle(free_offset)
            ],
            |a| st(strake_offset_new(
                a[0].p(),
                a[1].p(),
                a[2].u(),
                a[3].p(),
                a[4].p(),
                a[5].z(),
                a[6].p(),
                a[7].p()
            ))
        ),
        case!(
            strake_offset_free,
            ["offset"],
            |f, _s| {
                let mut off = ptr::null_mut();
                // SAFETY: as in Fix::new.
                ok(unsafe {
                    strake_offset_new(
                        f.cyl,
                        f.line,
                        0,
                        ptr::null(),
                        &f.distance,
                        1,
                        &f.offset_options,
                        &mut off,
                    )
                });
                vec![hp(off)]
            },
            |a| {
                strake_offset_free(a[0].p());
                None
            }
        ),
        case!(
            strake_offset_summary,
            [],
            |f, s| vec![hp(f.offset), s.out::<StrakeOffsetSummary>(1)],
            |a| st(strake_offset_summary(a[0].p(), a[1].p()))
        ),
        case!(
            strake_offset_piece_curve,
            [],
            |f, s| vec![hp(f.offset), Z(0), s.handle(free_curve)],
            |a| st(strake_offset_piece_curve(a[0].p(), a[1].z(), a[2].p()))
        ),
        case!(
            strake_offset_piece_points,
            [],
            |f, s| vec![
                hp(f.offset),
                Z(0),
                s.out::<StrakeOffsetPoint>(f.piece_points),
                Z(f.piece_points),
                s.count()
            ],
            |a| st(strake_offset_piece_points(
                a[0].p(),
                a[1].z(),
                a[2].p(),
                a[3].z(),
                a[4].p()
            ))
        ),
        case!(
            strake_offset_exits,
            [],
            |f, s| vec![
                hp(f.offset),
                s.out::<StrakePathInterval>(8),
                Z(8),
                s.count()
            ],
            |a| st(strake_offset_exits(a[0].p(), a[1].p(), a[2].z(), a[3].p()))
        ),
        case!(
            strake_offset_loops,
            [],
            |f, s| vec![
                hp(f.offset),
                s.out::<StrakePathInterval>(8),
                Z(8),
                s.count()
            ],
            |a| st(strake_offset_loops(a[0].p(), a[1].p(), a[2].z(), a[3].p()))
        ),
        // --- courses
        case!(
            strake_course_fixed_angle,
            ["out_info"],
            |f, s| vec![
                hp(f.cyl),
                F(0.6),
                F(-1.0),
                sp(&f.axis),
                F(0.5),
                F(1.0),
                cp(&f.geodesic),
                s.handle(free_curve),
                s.out::<StrakeGeodesicInfo>(1)
            ],
            |a| st(strake_course_fixed_angle(
                a[0].p(),
                a[1].f(),
                a[2].f(),
                a[3].p(),
                a[4].f(),
                a[5].f(),
                a[6].p(),
                a[7].p(),
                a[8].p()
            ))
        ),
        case!(
            strake_course_adjacent,
            [],
            |f, s| vec![
                hp(f.cyl),
                hp(f.course),
                F(0.2),
                U(0),
                cp(&f.offset_options),
                s.handle(free_offset)
            ],
            |a| st(strake_course_adjacent(
                a[0].p(),
                a[1].p(),
                a[2].f(),
                a[3].u(),
                a[4].p(),
                a[5].p()
            ))
        ),
        case!(
            strake_course_gaps,
            ["unmatched"],
            |f, s| vec![
                hp(f.cyl),
                hp(f.course),
                hp(f.adjacent),
                U(0),
                F(0.2),
                Z(21),
                F(1e-6),
                cp(&f.geodesic),
                s.out::<StrakeCourseGap>(8),
                Z(8),
                s.count(),
                s.out::<usize>(1)
            ],
            |a| st(strake_course_gaps(
                a[0].p(),
                a[1].p(),
                a[2].p(),
                a[3].u(),
                a[4].f(),
                a[5].z(),
                a[6].f(),
                a[7].p(),
                a[8].p(),
                a[9].z(),
                a[10].p(),
                a[11].p()
            ))
        ),
        case!(
            strake_course_check,
            [],
            |f, s| vec![
                hp(f.cyl),
                hp(f.course),
                cp(&f.fibre),
                Z(20),
                s.out::<StrakeCourseCheck>(1)
            ],
            |a| st(strake_course_check(
                a[0].p(),
                a[1].p(),
                a[2].p(),
                a[3].z(),
                a[4].p()
            ))
        ),
        // --- planning
        case!(
            strake_curve_new_spiral,
            [],
            |f, s| vec![sp(&f.centre), F(1.0), F(3.0), F(0.5), s.handle(free_curve)],
            |a| st(strake_curve_new_spiral(
                a[0].p(),
                a[1].f(),
                a[2].f(),
                a[3].f(),
                a[4].p()
            ))
        ),
        case!(
            strake_drive_project,
            [],
            |f, s| vec![
                hp(f.cyl),
                cp(&f.drive_plane),
                sp(&f.direction),
                hp(f.pattern),
                cp(&f.drive_options),
                s.handle(free_drive)
            ],
            |a| st(strake_drive_project(
                a[0].p(),
                a[1].p(),
                a[2].p(),
                a[3].p(),
                a[4].p(),
                a[5].p()
            ))
        ),
        case!(
            strake_drive_result_piece_count,
            [],
            |f, s| vec![hp(f.drive), s.out::<usize>(1)],
            |a| st(strake_drive_result_piece_count(a[0].p(), a[1].p()))
        ),
        case!(
            strake_drive_result_piece,
            ["pattern_range"],
            |f, s| vec![hp(f.drive), Z(0), s.out::<f64>(2), s.handle(free_curve)],
            |a| st(strake_drive_result_piece(
                a[0].p(),
                a[1].z(),
                a[2].p(),
                a[3].p()
            ))
        ),
        case!(
            strake_drive_result_intervals,
            [],
            |f, s| vec![
                hp(f.drive),
                s.out::<StrakePatternInterval>(8),
                Z(8),
                s.count()
            ],
            |a| st(strake_drive_result_intervals(
                a[0].p(),
                a[1].p(),
                a[2].z(),
                a[3].p()
            ))
        ),
        case!(
            strake_drive_result_free,
            ["result"],
            |f, _s| {
                let mut r = ptr::null_mut();
                // SAFETY: as in Fix::new.
                ok(unsafe {
                    strake_drive_project(
                        f.cyl,
                        &f.drive_plane,
                        f.direction.as_ptr(),
                        f.pattern,
                        &f.drive_options,
                        &mut r,
                    )
                });
                vec![hp(r)]
            },
            |a| {
                strake_drive_result_free(a[0].p());
                None
            }
        ),
        case!(
            strake_plan_passes,
            [],
            |f, s| vec![
                hp(f.cyl),
                hp(f.first),
                cp(&f.pass_options),
                s.handle(free_plan)
            ],
            |a| st(strake_plan_passes(a[0].p(), a[1].p(), a[2].p(), a[3].p()))
        ),
        case!(
            strake_pass_plan_summary,
            [],
            |f, s| vec![hp(f.plan), s.out::<StrakePassSummary>(1)],
            |a| st(strake_pass_plan_summary(a[0].p(), a[1].p()))
        ),
        case!(
            strake_pass_plan_passes,
            [],
            |f, s| vec![hp(f.plan), s.out::<StrakePassInfo>(16), Z(16), s.count()],
            |a| st(strake_pass_plan_passes(
                a[0].p(),
                a[1].p(),
                a[2].z(),
                a[3].p()
            ))
        ),
        case!(
            strake_pass_plan_curve,
            [],
            |f, s| vec![hp(f.plan), Z(0), s.handle(free_curve)],
            |a| st(strake_pass_plan_curve(a[0].p(), a[1].z(), a[2].p()))
        ),
        case!(
            strake_pass_plan_free,
            ["plan"],
            |f, _s| {
                let mut p = ptr::null_mut();
                // SAFETY: as in Fix::new.
                ok(unsafe { strake_plan_passes(f.cyl, f.first, &f.pass_options, &mut p) });
                vec![hp(p)]
            },
            |a| {
                strake_pass_plan_free(a[0].p());
                None
            }
        ),
    ]
}

// ---------------------------------------------------------------------------------------------
// The hostile values and the run.

fn hostile(kind: Kind) -> Vec<A> {
    match kind {
        Kind::Ptr => vec![P(ptr::null_mut())],
        Kind::F64 => [
            f64::NAN,
            f64::INFINITY,
            f64::NEG_INFINITY,
            f64::MAX,
            -f64::MAX,
            1e300,
            5e-324,
            -5e-324,
            1e-310,
        ]
        .map(F)
        .to_vec(),
        Kind::Size => vec![Z(0), Z(1), Z(usize::MAX)],
        Kind::U32 => vec![U(1), U(2), U(u32::MAX)],
        Kind::I32 => vec![I(-1), I(2), I(i32::MIN), I(i32::MAX)],
    }
}

/// Does the message name the argument? As a word of its own, backticked or not, with `_`
/// read as a space or a hyphen (`scallop_height`: "scallop height"), or by the words the
/// Rust layer uses for it (`u_min`: "u range", `rel_tol`: "arc length tolerance").
fn names(m: &str, name: &str) -> bool {
    let aliases: &[&str] = match name {
        "u_min" | "u_max" => &["u range"],
        "v_min" | "v_max" => &["v range"],
        "t_min" | "t_max" => &["t range"],
        "arc_tolerance" | "rel_tol" => &["arc length tolerance"],
        "knot_count" => &["knots"],
        "point_count" | "count" => &["points", "control points"],
        "u0" | "u1" => &["u"],
        "v0" | "v1" => &["v"],
        "t0" | "t1" => &["t"],
        _ => &[],
    };
    let mut words = vec![
        name.to_string(),
        name.replace('_', " "),
        name.replace('_', "-"),
    ];
    words.extend(aliases.iter().map(|a| a.to_string()));
    words.iter().any(|w| {
        m.match_indices(w.as_str()).any(|(i, _)| {
            let before = m[..i].chars().next_back();
            let after = m[i + w.len()..].chars().next();
            let edge = |c: Option<char>| c.is_none_or(|c| !(c.is_alphanumeric() || c == '_'));
            edge(before) && edge(after)
        })
    })
}

/// The first number in `m` printed in a layout C's `%g` never gives: Rust's `{:e}` (`1e-9`,
/// `4.9947054245269523e-1`, `0e0`: no sign or one digit in the exponent), `{}` of a huge or
/// tiny f64 (hundreds of digits), `{:?}` (`1.0`), or more than 17 digits after the point.
fn old_number_layout(m: &str) -> Option<String> {
    let b = m.as_bytes();
    let mut i = 0;
    while i < b.len() {
        let starts = b[i].is_ascii_digit()
            && (i == 0
                || !(b[i - 1].is_ascii_alphanumeric() || b[i - 1] == b'_' || b[i - 1] == b'.'));
        if !starts {
            i += 1;
            continue;
        }
        let s = i;
        while i < b.len() && (b[i].is_ascii_digit() || b[i] == b'.') {
            i += 1;
        }
        let mantissa = &m[s..i];
        let mut exp = None;
        if i < b.len() && b[i] == b'e' {
            let e = i + 1;
            let mut j = e;
            if j < b.len() && (b[j] == b'+' || b[j] == b'-') {
                j += 1;
            }
            let d = j;
            while j < b.len() && b[j].is_ascii_digit() {
                j += 1;
            }
            if j > d {
                exp = Some(&m[e..j]);
                i = j;
            }
        }
        let token = &m[s..i];
        let digits = mantissa.chars().filter(char::is_ascii_digit).count();
        let fraction = mantissa.split_once('.').map_or(0, |(_, f)| f.len());
        let bad = digits > 20
            || fraction > 17
            || (exp.is_none() && mantissa.ends_with(".0"))
            || exp.is_some_and(|e| !(e.starts_with(['+', '-']) && e.len() >= 3));
        if bad {
            return Some(token.to_string());
        }
    }
    None
}

#[test]
fn the_old_number_layouts_are_recognised() {
    for old in [
        "4.9947054245269523e-1 away",
        "x = 0e0",
        "t = 1e-9",
        "[1.0, 2]",
        "1e300",
    ] {
        assert!(old_number_layout(old).is_some(), "{old}");
    }
    for new in [
        "4.99471e-01 away",
        "x = 0",
        "t = 1e-09",
        "[1, 2]",
        "1e+300",
        "0.49947054245269523",
    ] {
        assert_eq!(old_number_layout(new), None, "{new}");
    }
    assert_eq!(
        old_number_layout("samples = 18446744073709551615, degree 1..=24"),
        None
    );
}

struct Run {
    problems: Vec<String>,
    messages: Vec<String>,
    calls: usize,
}

impl Run {
    fn one(&mut self, fix: &Fix, case: &Case, decl: &Decl, replace: Option<(usize, A)>) {
        let mut scratch = Scratch::default();
        let mut args = (case.build)(fix, &mut scratch);
        assert_eq!(
            args.len(),
            decl.params.len(),
            "{}: the table has {} arguments, the header {}",
            case.name,
            args.len(),
            decl.params.len()
        );
        let what = match replace {
            None => "valid arguments".to_string(),
            Some((i, v)) => {
                args[i] = v;
                format!("`{}` = {v:?}", decl.params[i].name)
            }
        };
        self.calls += 1;
        let Some(status) = (case.call)(&args) else {
            return;
        };
        let mut problem = |p: String| {
            self.problems
                .push(format!("{} with {what}: {p}", case.name))
        };
        if status == StrakeStatus::InternalPanic {
            problem(format!("panic: {}", message()));
            return;
        }
        if status == StrakeStatus::Ok {
            for out in &scratch.outs {
                let written = !scratch.untouched(out);
                if let (Some(free), true) = (out.free, written) {
                    free(out.words[0] as *mut c_void);
                    continue;
                }
                // A NaN in a written output is never OK. (Lengths and indices are small
                // integers, which read as finite doubles.)
                if written
                    && out.words[..out.bytes / 8]
                        .iter()
                        .any(|&w| w != SENTINEL_WORD && f64::from_bits(w).is_nan())
                {
                    problem("STATUS_OK with a NaN in an output".into());
                }
            }
            if replace.is_none() {
                return;
            }
            let (i, v) = replace.unwrap();
            let p = &decl.params[i];
            let nullable = case.nullable.contains(&p.name.as_str());
            match v {
                P(_) if !nullable => problem("NULL accepted".into()),
                F(x) if x.is_nan() => problem("NaN accepted".into()),
                _ => {}
            }
            return;
        }
        let m = message();
        self.messages.push(m.clone());
        if !m.starts_with(&format!("{}: ", case.name)) {
            problem(format!("message does not start with the name: {m}"));
        }
        for out in &scratch.outs {
            let may_change = out.is_count && status == StrakeStatus::BufferTooSmall;
            if !may_change && !scratch.untouched(out) {
                problem(format!("an output was written on failure {status:?}: {m}"));
            }
        }
        match replace {
            None => problem(format!("valid arguments refused: {status:?}: {m}")),
            Some((i, v)) => {
                let p = &decl.params[i];
                let nullable = case.nullable.contains(&p.name.as_str());
                if matches!(v, P(_)) && !nullable && status != StrakeStatus::NullPointer {
                    problem(format!("NULL gave {status:?}, not NULL_POINTER: {m}"));
                }
                // A refusal of the argument must name it; a geometric outcome (the offset
                // leaves the surface, no geodesic found, ...) names the geometry instead.
                let refusal = matches!(
                    status,
                    StrakeStatus::NullPointer
                        | StrakeStatus::InvalidArgument
                        | StrakeStatus::NonFinite
                        | StrakeStatus::OutOfDomain
                        | StrakeStatus::InvalidDegree
                        | StrakeStatus::InvalidKnots
                );
                if refusal && !names(&m, &p.name) {
                    problem(format!("{status:?} does not name `{}`: {m}", p.name));
                }
            }
        }
    }
}

#[test]
fn every_exported_function_against_hostile_arguments() {
    let decls = header_functions();
    let table = table();
    let in_header: BTreeSet<&str> = decls.iter().map(|d| d.name.as_str()).collect();
    let in_table: BTreeSet<&str> = table.iter().map(|c| c.name).collect();
    assert_eq!(
        table.len(),
        in_table.len(),
        "a function is listed twice in the table"
    );
    let missing: Vec<_> = in_header.difference(&in_table).collect();
    let stale: Vec<_> = in_table.difference(&in_header).collect();
    assert!(
        missing.is_empty() && stale.is_empty(),
        "exported functions missing from the table: {missing:?}; in the table but not \
         exported: {stale:?}"
    );
    let fix = Fix::new();
    let mut run = Run {
        problems: Vec::new(),
        messages: Vec::new(),
        calls: 0,
    };
    for case in &table {
        let decl = decls.iter().find(|d| d.name == case.name).unwrap();
        for n in case.nullable {
            assert!(
                decl.params.iter().any(|p| p.name == *n),
                "{}: no parameter `{n}`",
                case.name
            );
        }
        run.one(&fix, case, decl, None);
        for (i, p) in decl.params.iter().enumerate() {
            for v in hostile(p.kind) {
                let start = std::time::Instant::now();
                run.one(&fix, case, decl, Some((i, v)));
                if std::env::var_os("STRAKE_TABLE_TRACE").is_some() {
                    eprintln!("{} {} {v:?}: {:?}", case.name, p.name, start.elapsed());
                }
            }
        }
    }
    if std::env::var_os("STRAKE_TABLE_TRACE").is_some() {
        for m in &run.messages {
            if let Some(n) = old_number_layout(m) {
                eprintln!("OLD `{n}` in: {m}");
            }
        }
    }
    assert!(
        run.problems.is_empty(),
        "{} problems in {} calls:\n{}",
        run.problems.len(),
        run.calls,
        run.problems.join("\n")
    );
    let old: Vec<String> = run
        .messages
        .iter()
        .filter_map(|m| old_number_layout(m).map(|n| format!("`{n}` in: {m}")))
        .collect();
    assert!(
        old.is_empty(),
        "{} messages print numbers in an old layout:\n{}",
        old.len(),
        old.join("\n")
    );
    assert!(run.calls > 500, "{} calls", run.calls);
    assert!(run.messages.len() > 300, "{} messages", run.messages.len());
}

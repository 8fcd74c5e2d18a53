//! The C ABI of pass planning: patterns projected along a direction and plans of passes, with
//! every status they return, NULL for each pointer, outputs untouched on failure, and the
//! buffer protocol. The expected geometry is the closed form of the Rust tests
//! (tests/drive_pattern.rs, tests/passes.rs): a line projected onto a cylinder along −x lands
//! on x = √(R² − y²); iso-scallop passes on a cylinder are rulings θ = w/R apart, w from the
//! two-circle scallop (Suresh & Yang 1994; Lin & Koren 1996).

#[path = "support/ffi_util.rs"]
mod ffi_util;

use ffi_util::*;
use std::ffi::c_void;
use std::ptr;
use strake::ffi::*;

fn drive_options() -> StrakeDriveOptions {
    StrakeDriveOptions {
        projection: StrakeProjectionOptions {
            tolerance: 1e-9,
            periodic_u: 1,
            periodic_v: 0,
            grid: 0,
            max_iterations: 0,
        },
        samples: 0,
        fit_tolerance: 1e-7,
        locate_tolerance: 0.0,
    }
}

fn drive_plane() -> StrakeDrivePlane {
    StrakeDrivePlane {
        origin: [6.0, 0.0, 0.0],
        x_axis: [0.0, 1.0, 0.0],
        y_axis: [0.0, 0.0, 1.0],
    }
}

#[test]
fn a_line_projected_onto_a_cylinder_through_the_c_abi() {
    let mut r0 = 2.0_f64;
    let s = surface(
        Some(cylinder),
        (&mut r0 as *mut f64).cast::<c_void>(),
        (0.0, std::f64::consts::TAU),
        (-20.0, 20.0),
        0,
    );
    let line = uv_line([-3.0, 1.0], [3.0, 1.0]);
    let (plane, opts, dir) = (drive_plane(), drive_options(), [-1.0, 0.0, 0.0]);
    let mut res: *mut StrakeDriveResult = ptr::null_mut();
    // SAFETY (all calls): live handles, valid structs and slots, or NULL where tested.
    unsafe {
        let st = strake_drive_project(s, &plane, dir.as_ptr(), line, &opts, &mut res);
        assert_eq!(st, StrakeStatus::Ok, "{}", message());
        let mut n = 99;
        assert_eq!(
            strake_drive_result_piece_count(res, &mut n),
            StrakeStatus::Ok
        );
        assert_eq!(n, 1);
        // The buffer protocol: a size query, then the copy.
        let mut count = 0;
        let st = strake_drive_result_intervals(res, ptr::null_mut(), 0, &mut count);
        expect(st, StrakeStatus::BufferTooSmall, &["3 intervals needed"]);
        assert_eq!(count, 3);
        let mut buf = [StrakePatternInterval::default(); 3];
        let st = strake_drive_result_intervals(res, buf.as_mut_ptr(), 3, &mut count);
        assert_eq!(st, StrakeStatus::Ok);
        let kinds: Vec<u32> = buf.iter().map(|i| i.kind).collect();
        assert_eq!(
            kinds,
            [
                StrakePatternIntervalKind::Miss as u32,
                StrakePatternIntervalKind::SeveralHits as u32,
                StrakePatternIntervalKind::Miss as u32
            ]
        );
        // y = −3 + 6 t: |y| = R = 2 at t = 1/6 and 5/6.
        close("miss end", buf[0].end, 1.0 / 6.0, 1e-6, 1.0);
        close("miss start", buf[2].start, 5.0 / 6.0, 1e-6, 1.0);
        let mut piece: *mut StrakeCurve = ptr::null_mut();
        let mut range = [0.0; 2];
        let st = strake_drive_result_piece(res, 0, range.as_mut_ptr(), &mut piece);
        assert_eq!(st, StrakeStatus::Ok, "{}", message());
        close("range lo", range[0], 1.0 / 6.0, 1e-6, 1.0);
        close("range hi", range[1], 5.0 / 6.0, 1e-6, 1.0);
        // The piece is a curve handle like any other: the middle of the arc is (2, 0, 1).
        let f = frame_at(s, piece, 0.5);
        close("x", f.point[0], 2.0, 1e-7, 1.0);
        close("y", f.point[1], 0.0, 1e-7, 1.0);
        close("z", f.point[2], 1.0, 1e-7, 1.0);
        strake_curve_free(piece);
        let mut untouched: *mut StrakeCurve = ptr::null_mut();
        let st = strake_drive_result_piece(res, 1, ptr::null_mut(), &mut untouched);
        expect(
            st,
            StrakeStatus::InvalidArgument,
            &["`index` = 1", "1 pieces"],
        );
        assert!(untouched.is_null());
        // NULLs.
        expect(
            strake_drive_result_piece_count(ptr::null(), &mut n),
            StrakeStatus::NullPointer,
            &["`result`"],
        );
        expect(
            strake_drive_result_piece_count(res, ptr::null_mut()),
            StrakeStatus::NullPointer,
            &["`count`"],
        );
        expect(
            strake_drive_result_piece(res, 0, ptr::null_mut(), ptr::null_mut()),
            StrakeStatus::NullPointer,
            &["`out`"],
        );
        expect(
            strake_drive_result_piece(ptr::null(), 0, ptr::null_mut(), &mut untouched),
            StrakeStatus::NullPointer,
            &["`result`"],
        );
        expect(
            strake_drive_result_intervals(res, ptr::null_mut(), 3, &mut count),
            StrakeStatus::NullPointer,
            &["`buf`"],
        );
        expect(
            strake_drive_result_intervals(res, buf.as_mut_ptr(), 3, ptr::null_mut()),
            StrakeStatus::NullPointer,
            &["`count`"],
        );
        expect(
            strake_drive_result_intervals(ptr::null(), buf.as_mut_ptr(), 3, &mut count),
            StrakeStatus::NullPointer,
            &["`result`"],
        );
        strake_drive_result_free(res);
        strake_drive_result_free(ptr::null_mut());

        // Refusals leave *out untouched.
        let mut out: *mut StrakeDriveResult = ptr::null_mut();
        let zero = [0.0; 3];
        expect(
            strake_drive_project(s, &plane, zero.as_ptr(), line, &opts, &mut out),
            StrakeStatus::InvalidArgument,
            &["zero length"],
        );
        let mut bad_plane = plane;
        bad_plane.origin[1] = f64::NAN;
        expect(
            strake_drive_project(s, &bad_plane, dir.as_ptr(), line, &opts, &mut out),
            StrakeStatus::NonFinite,
            &["plane.origin"],
        );
        bad_plane = plane;
        bad_plane.y_axis = [0.0, 2.0, 0.0];
        expect(
            strake_drive_project(s, &bad_plane, dir.as_ptr(), line, &opts, &mut out),
            StrakeStatus::InvalidArgument,
            &["parallel"],
        );
        let mut bad = opts;
        bad.fit_tolerance = -1.0;
        expect(
            strake_drive_project(s, &plane, dir.as_ptr(), line, &bad, &mut out),
            StrakeStatus::InvalidArgument,
            &["fit_tolerance = -1"],
        );
        bad = opts;
        bad.samples = 1;
        expect(
            strake_drive_project(s, &plane, dir.as_ptr(), line, &bad, &mut out),
            StrakeStatus::InvalidArgument,
            &["samples = 1"],
        );
        bad = opts;
        bad.projection.periodic_u = 3;
        expect(
            strake_drive_project(s, &plane, dir.as_ptr(), line, &bad, &mut out),
            StrakeStatus::InvalidArgument,
            &["periodic_u"],
        );
        for (k, name) in [
            "`surface`",
            "`plane`",
            "`direction`",
            "`pattern`",
            "`options`",
            "`out`",
        ]
        .iter()
        .enumerate()
        {
            let st = strake_drive_project(
                if k == 0 { ptr::null() } else { s },
                if k == 1 { ptr::null() } else { &plane },
                if k == 2 { ptr::null() } else { dir.as_ptr() },
                if k == 3 { ptr::null() } else { line },
                if k == 4 { ptr::null() } else { &opts },
                if k == 5 { ptr::null_mut() } else { &mut out },
            );
            expect(st, StrakeStatus::NullPointer, &[name]);
        }
        assert!(out.is_null());
    }
    free(s, line);
}

#[test]
fn spiral_constructor_statuses() {
    let mut out: *mut StrakeCurve = ptr::null_mut();
    let c = [0.0, 0.0];
    // SAFETY: valid pointers, or NULL where tested.
    unsafe {
        assert_eq!(
            strake_curve_new_spiral(c.as_ptr(), 0.0, 3.0, 0.5, &mut out),
            StrakeStatus::Ok
        );
        assert!(!out.is_null());
        strake_curve_free(out);
        let mut untouched: *mut StrakeCurve = ptr::null_mut();
        expect(
            strake_curve_new_spiral(c.as_ptr(), 2.0, 1.0, 0.5, &mut untouched),
            StrakeStatus::InvalidArgument,
            &["r_end = 1"],
        );
        expect(
            strake_curve_new_spiral(c.as_ptr(), 0.0, 1.0, 0.0, &mut untouched),
            StrakeStatus::InvalidArgument,
            &["pitch = 0"],
        );
        expect(
            strake_curve_new_spiral(ptr::null(), 0.0, 1.0, 0.5, &mut untouched),
            StrakeStatus::NullPointer,
            &["`centre`"],
        );
        expect(
            strake_curve_new_spiral(c.as_ptr(), 0.0, 1.0, 0.5, ptr::null_mut()),
            StrakeStatus::NullPointer,
            &["`out`"],
        );
        assert!(untouched.is_null());
    }
}

fn pass_options() -> StrakePassOptions {
    StrakePassOptions {
        ball_radius: 3.0,
        tool_side: StrakeToolSide::AlongNormal as u32,
        rule: StrakeStepRule::IsoScallop as u32,
        scallop_height: 0.05,
        step_over: 0.0,
        advance: 1,
        chord_tolerance: 1e-7,
        distance_samples: 0,
        scallop_samples: 0,
        max_passes: 0,
        max_rows: 0,
        use_cutter: 0,
        cutter: StrakeCutter::default(),
        angles: StrakeToolAngles::default(),
        max_jets: 0,
        max_offset_jets: 0,
    }
}

#[test]
fn iso_scallop_passes_on_a_cylinder_through_the_c_abi() {
    let mut r0 = 10.0_f64;
    let s = surface(
        Some(cylinder),
        (&mut r0 as *mut f64).cast::<c_void>(),
        (0.0, 1.2),
        (-3.0, 3.0),
        0,
    );
    let first = uv_line([0.05, -2.5], [0.05, 2.5]);
    let opts = pass_options();
    // Two-circle width for h = 0.05, r = 3 on the convex cylinder of radius 10 (bisection on
    // the closed form, as in tests/passes.rs).
    let two = |w: f64| {
        let (rc, half) = (13.0, 0.5 * w / 10.0);
        rc * half.cos() - (9.0 - (rc * half.sin()).powi(2)).sqrt() - 10.0
    };
    let (mut lo, mut hi) = (0.0, 5.0);
    for _ in 0..200 {
        let m = 0.5 * (lo + hi);
        if two(m) < 0.05 { lo = m } else { hi = m }
    }
    let du = 0.5 * (lo + hi) / 10.0;
    let expected = 1 + ((1.2 - 0.05) / du).floor() as usize;
    // SAFETY (all calls): live handles, valid structs and slots, or NULL where tested.
    unsafe {
        let mut plan: *mut StrakePassPlan = ptr::null_mut();
        let st = strake_plan_passes(s, first, &opts, &mut plan);
        assert_eq!(st, StrakeStatus::Ok, "{}", message());
        let mut sum = StrakePassSummary::default();
        assert_eq!(strake_pass_plan_summary(plan, &mut sum), StrakeStatus::Ok);
        assert_eq!(sum.count, expected);
        close("scallop max", sum.scallop_max, 0.05, 1e-5, 1.0);
        close("scallop min", sum.scallop_min, 0.05, 1e-5, 1.0);
        close(
            "total length",
            sum.total_length,
            5.0 * expected as f64,
            1e-6,
            1.0,
        );
        assert!(sum.offset_points > 0 && sum.trace_jets > 0);
        assert_eq!(sum.covered, 1);
        let mut count = 0;
        let st = strake_pass_plan_passes(plan, ptr::null_mut(), 0, &mut count);
        expect(st, StrakeStatus::BufferTooSmall, &["passes needed"]);
        assert_eq!(count, expected - 1);
        let mut info = vec![StrakePassInfo::default(); count];
        let st = strake_pass_plan_passes(plan, info.as_mut_ptr(), count, &mut count);
        assert_eq!(st, StrakeStatus::Ok);
        assert_eq!((info[0].row, info[0].has_parent), (1, 0));
        assert_eq!((info[1].row, info[1].has_parent, info[1].parent), (2, 1, 0));
        close("length", info[3].length, 5.0, 1e-6, 1.0);
        let mut c: *mut StrakeCurve = ptr::null_mut();
        assert_eq!(strake_pass_plan_curve(plan, 2, &mut c), StrakeStatus::Ok);
        let f = frame_at(s, c, 0.5);
        close("u of pass 3", f.u, 0.05 + 3.0 * du, 1e-6, 1.0);
        strake_curve_free(c);
        let mut untouched: *mut StrakeCurve = ptr::null_mut();
        expect(
            strake_pass_plan_curve(plan, count, &mut untouched),
            StrakeStatus::InvalidArgument,
            &[&format!("`index` = {count}")],
        );
        expect(
            strake_pass_plan_curve(ptr::null(), 0, &mut untouched),
            StrakeStatus::NullPointer,
            &["`plan`"],
        );
        expect(
            strake_pass_plan_curve(plan, 0, ptr::null_mut()),
            StrakeStatus::NullPointer,
            &["`out`"],
        );
        assert!(untouched.is_null());
        expect(
            strake_pass_plan_summary(ptr::null(), &mut sum),
            StrakeStatus::NullPointer,
            &["`plan`"],
        );
        expect(
            strake_pass_plan_summary(plan, ptr::null_mut()),
            StrakeStatus::NullPointer,
            &["`out`"],
        );
        expect(
            strake_pass_plan_passes(ptr::null(), info.as_mut_ptr(), 1, &mut count),
            StrakeStatus::NullPointer,
            &["`plan`"],
        );
        expect(
            strake_pass_plan_passes(plan, info.as_mut_ptr(), 1, ptr::null_mut()),
            StrakeStatus::NullPointer,
            &["`count`"],
        );
        strake_pass_plan_free(plan);
        strake_pass_plan_free(ptr::null_mut());
        // A band of 3 rows: 4 passes, not covering.
        let band = StrakePassOptions {
            max_rows: 3,
            ..opts
        };
        let st = strake_plan_passes(s, first, &band, &mut plan);
        assert_eq!(st, StrakeStatus::Ok, "{}", message());
        assert_eq!(strake_pass_plan_summary(plan, &mut sum), StrakeStatus::Ok);
        assert_eq!((sum.count, sum.rows, sum.covered), (4, 4, 0));
        strake_pass_plan_free(plan);

        // Refusals, each naming the value, with *out untouched.
        let mut out: *mut StrakePassPlan = ptr::null_mut();
        let cases: Vec<(StrakePassOptions, StrakeStatus, &str)> = vec![
            (
                StrakePassOptions {
                    scallop_height: 0.0,
                    ..opts
                },
                StrakeStatus::InvalidArgument,
                "target scallop height = 0",
            ),
            (
                StrakePassOptions {
                    scallop_height: f64::NAN,
                    ..opts
                },
                StrakeStatus::InvalidArgument,
                "target scallop height = NaN",
            ),
            (
                StrakePassOptions {
                    ball_radius: 12.0,
                    tool_side: StrakeToolSide::AgainstNormal as u32,
                    ..opts
                },
                StrakeStatus::CutterTooLarge,
                "radius across the path 12",
            ),
            (
                StrakePassOptions {
                    max_passes: 3,
                    ..opts
                },
                StrakeStatus::PassLimit,
                "max_passes = 3",
            ),
            (
                StrakePassOptions {
                    rule: StrakeStepRule::ConstantStepOver as u32,
                    step_over: 0.0,
                    ..opts
                },
                StrakeStatus::InvalidArgument,
                "step-over = 0",
            ),
            (
                StrakePassOptions {
                    rule: StrakeStepRule::ConstantStepOver as u32,
                    step_over: 7.0,
                    ..opts
                },
                StrakeStatus::InvalidArgument,
                "do not overlap",
            ),
            (
                StrakePassOptions { rule: 7, ..opts },
                StrakeStatus::InvalidArgument,
                "`options->rule` = 7",
            ),
            (
                StrakePassOptions { advance: 2, ..opts },
                StrakeStatus::InvalidArgument,
                "`options->advance` = 2",
            ),
            (
                StrakePassOptions {
                    tool_side: 5,
                    ..opts
                },
                StrakeStatus::InvalidArgument,
                "`tool_side` = 5",
            ),
            (
                StrakePassOptions {
                    chord_tolerance: 0.0,
                    ..opts
                },
                StrakeStatus::InvalidArgument,
                "chord_tolerance` = 0",
            ),
            (
                StrakePassOptions {
                    use_cutter: 2,
                    ..opts
                },
                StrakeStatus::InvalidArgument,
                "`options->use_cutter` = 2",
            ),
            (
                StrakePassOptions {
                    use_cutter: 1,
                    cutter: StrakeCutter {
                        kind: StrakeCutterKind::Toroidal as u32,
                        radius: 1.0,
                        corner_radius: 2.0,
                    },
                    ..opts
                },
                StrakeStatus::InvalidArgument,
                "corner_radius = 2 exceeds the tool radius 1",
            ),
            (
                StrakePassOptions {
                    use_cutter: 1,
                    cutter: StrakeCutter {
                        kind: StrakeCutterKind::Flat as u32,
                        radius: 5.0,
                        corner_radius: 0.0,
                    },
                    angles: StrakeToolAngles {
                        lead: 2.0,
                        tilt: 0.0,
                    },
                    ..opts
                },
                StrakeStatus::InvalidArgument,
                "lead angle = 2 rad",
            ),
            (
                StrakePassOptions {
                    max_jets: 50,
                    ..opts
                },
                StrakeStatus::NotConverged,
                "max_jets = 50",
            ),
        ];
        for (o, status, needle) in cases {
            expect(
                strake_plan_passes(s, first, &o, &mut out),
                status,
                &[needle],
            );
        }
        for (k, name) in ["`surface`", "`first`", "`options`", "`out`"]
            .iter()
            .enumerate()
        {
            let st = strake_plan_passes(
                if k == 0 { ptr::null() } else { s },
                if k == 1 { ptr::null() } else { first },
                if k == 2 { ptr::null() } else { &opts },
                if k == 3 { ptr::null_mut() } else { &mut out },
            );
            expect(st, StrakeStatus::NullPointer, &[name]);
        }
        assert!(out.is_null());
    }
    assert_eq!(StrakeStatus::CutterTooLarge as u32, 55);
    assert_eq!(StrakeStatus::PassLimit as u32, 56);
    free(s, first);
}

// The cutter fields added at the end of StrakePassOptions: a toroidal cutter (5/1 mm) at 6°
// lead and 8° tilt outside a cylinder of radius 10 plans rulings at the step-over of the exact
// two-profile cusp, the same as the Rust API (whose cusp tests/scallop_cutter.rs checks against
// brute force); the summary's offset attempts and unmeasured probes.
#[test]
fn toroidal_cutter_passes_on_a_cylinder_through_the_c_abi() {
    let mut r0 = 10.0_f64;
    let s = surface(
        Some(cylinder),
        (&mut r0 as *mut f64).cast::<c_void>(),
        (0.0, 1.2),
        (-3.0, 3.0),
        0,
    );
    let first = uv_line([0.05, -2.5], [0.05, 2.5]);
    let (lead, tilt) = (6f64.to_radians(), 8f64.to_radians());
    let opts = StrakePassOptions {
        scallop_height: 0.02,
        distance_samples: 9,
        scallop_samples: 3,
        use_cutter: 1,
        cutter: StrakeCutter {
            kind: StrakeCutterKind::Toroidal as u32,
            radius: 5.0,
            corner_radius: 1.0,
        },
        angles: StrakeToolAngles { lead, tilt },
        max_offset_jets: 1_000_000,
        ..pass_options()
    };
    let w = strake::step_over_for_cutter_scallop(
        &strake::checks::Cutter::Toroidal {
            radius: 5.0,
            corner_radius: 1.0,
        },
        &strake::checks::ToolAngles { lead, tilt },
        0.02,
        -0.1,
    )
    .unwrap()
    .step_over;
    let expected = 1 + ((1.2 - 0.05) / (w / 10.0)).floor() as usize;
    // SAFETY (all calls): live handles, valid structs and slots.
    unsafe {
        let mut plan: *mut StrakePassPlan = ptr::null_mut();
        let st = strake_plan_passes(s, first, &opts, &mut plan);
        assert_eq!(st, StrakeStatus::Ok, "{}", message());
        let mut sum = StrakePassSummary::default();
        assert_eq!(strake_pass_plan_summary(plan, &mut sum), StrakeStatus::Ok);
        assert_eq!(sum.count, expected, "step-over {w}");
        close("scallop max", sum.scallop_max, 0.02, 1e-5, 1.0);
        close("scallop min", sum.scallop_min, 0.02, 1e-5, 1.0);
        // One offset per pass after the first, the corrections on top.
        assert!(sum.offset_attempts >= expected - 1, "{sum:?}");
        assert_eq!(sum.unmeasured, 0);
        let mut info = vec![StrakePassInfo::default(); expected - 1];
        let mut count = 0;
        let st = strake_pass_plan_passes(plan, info.as_mut_ptr(), info.len(), &mut count);
        assert_eq!(st, StrakeStatus::Ok);
        close("step-over", info[0].step_over_max, w, 1e-9, 1.0);
        strake_pass_plan_free(plan);
        strake_curve_free(first);
        strake_surface_free(s);
    }
}

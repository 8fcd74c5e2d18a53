//! Regression: passes on the demo's mould cavity (`tests/support/cavity.rs`).
//!
//! - Full-coverage plans on the cavity used to run for tens of seconds without a bound on
//!   their work; every offset and every plan now has a work cap in surface jets
//!   (`OffsetOptions::max_jets`, `PassOptions::max_jets`) that ends it with `NotConverged`
//!   naming the path parameter or the pass it had reached.
//! - The iso-scallop rule chose each step-over from the curvature at the current pass alone:
//!   the demo's band of passes left scallops of 0.045–0.052 against a 0.05 target. The
//!   correction iteration now brings the measured scallop within the target.

#[path = "support/cavity.rs"]
mod cavity;

use strake::checks::ToolSide;
use strake::{
    OffsetDistance, OffsetOptions, OffsetSide, PassOptions, StepRule, StrakeError, offset_path,
    plan_passes,
};

#[test]
fn an_offset_out_of_work_ends_with_a_status_naming_the_path_parameter() {
    let s = cavity::cavity();
    let first = cavity::host_pass();
    let mut opts = OffsetOptions::new(0.01);
    opts.max_jets = 500;
    let e = offset_path(
        &s,
        &first,
        OffsetSide::Left,
        &OffsetDistance::Constant(5.0),
        &opts,
    )
    .unwrap_err();
    match &e {
        StrakeError::NotConverged { what, .. } => {
            assert!(what.contains("max_jets = 500"), "{what}");
            assert!(what.contains("path parameter t ="), "{what}");
        }
        other => panic!("{other}"),
    }
    opts.max_jets = 0;
    assert!(matches!(
        offset_path(&s, &first, OffsetSide::Left, &OffsetDistance::Constant(5.0), &opts),
        Err(StrakeError::InvalidArgument(m)) if m.contains("max_jets = 0")
    ));
}

#[test]
fn a_plan_out_of_work_ends_with_a_status_naming_the_pass() {
    let s = cavity::cavity();
    let first = cavity::host_pass();
    let mut opts =
        PassOptions::iso_scallop(2.5, ToolSide::AlongNormal, 0.05, OffsetSide::Left, 0.01);
    opts.rule = StepRule::ConstantStepOver { step_over: 1.0 };
    opts.max_jets = 20_000;
    match plan_passes(&s, &first, &opts).unwrap_err() {
        StrakeError::NotConverged { what, .. } => {
            assert!(what.contains("max_jets = 20000"), "{what}");
            assert!(what.contains("neighbour of pass"), "{what}");
            assert!(what.contains("passes made"), "{what}");
        }
        other => panic!("{other}"),
    }
}

#[test]
fn corrected_iso_scallop_band_on_the_cavity_stays_within_the_target() {
    let s = cavity::cavity();
    let first = cavity::host_pass();
    let h = 0.05;
    let mut opts = PassOptions::iso_scallop(4.0, ToolSide::AlongNormal, h, OffsetSide::Left, 0.01);
    opts.max_rows = Some(3);
    let plan = plan_passes(&s, &first, &opts).unwrap();
    eprintln!(
        "corrected: {} passes, scallop {}..{}, {} offsets, {} unmeasured",
        plan.count, plan.scallop_min, plan.scallop_max, plan.offset_attempts, plan.unmeasured
    );
    assert_eq!(plan.unmeasured, 0);
    assert!(plan.scallop_max <= h * (1.0 + 0.01), "{}", plan.scallop_max);
    assert!(plan.scallop_min >= h * 0.9, "{}", plan.scallop_min);
    // The per-point rule alone (no corrections) left more than the target.
    opts.scallop_corrections = 0;
    let plain = plan_passes(&s, &first, &opts).unwrap();
    eprintln!(
        "plain: scallop {}..{}",
        plain.scallop_min, plain.scallop_max
    );
    assert!(plain.scallop_max > h, "{}", plain.scallop_max);
}

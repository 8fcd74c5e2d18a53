//! Passes across a surface, one beside the other, from a first pass: iso-scallop (each next
//! pass where a ball leaves a target scallop height with its neighbour, point by point) or at a
//! constant step-over, until the surface is covered.
//!
//! **The rule, point by point** (iso-scallop; the method of Suresh & Yang, J. Eng. Ind. 116
//! (1994) 253–259, and Lin & Koren, J. Eng. Ind. 118 (1996) 20–28, derived here): at
//! [`PassOptions::distance_samples`] even parameters t of the current pass the frame gives the
//! curvature across the path κ = s κn(B) (positive concave toward the tool), and the exact
//! two-circle inverse gives the step-over w(t) for the target height h with the ball's radius r
//! ([`super::scallop_left::step_over_at`]). The next pass is the geodesic parallel of the
//! current one at the distance w(t) (tabulated at those parameters, linear between them) on
//! the side [`PassOptions::advance`] ([`crate::geodesics::offset::offset_path`], which also
//! trims loops and ends pieces where they leave the surface). In the constant mode w is the
//! same everywhere.
//!
//! **The correction** ([`PassOptions::scallop_corrections`], iso-scallop only): the
//! per-point rule sees the curvature at the current pass only, so where it changes between
//! the two passes the scallop differs from the target (on the demo's cavity 0.047–0.050 for a
//! 0.05 target with the rule alone). After each parallel, the scallop is measured by the
//! direct construction at every distance sample (from the sample of the parallel made from
//! that parameter) and each distance scaled by √(aim/h) (h ∝ w² to leading order, aim =
//! target (1 − tolerance/4)), until every measured scallop lies in
//! [(1 − [`PassOptions::scallop_tolerance`]) target, target (1 + [`SCALLOP_MEASURE_TOLERANCE`])]
//! or the corrections are used up. Between the distance samples the distance is linear in t,
//! so the scallop there is only what the report measures (on the cavity's band, 129 samples:
//! 0.0495–0.04999 for a 0.05 target, `tests/regression_cavity_coverage.rs`).
//!
//! **Stopping.** A pass whose parallel has no point on the surface ([`StrakeError::LeavesSurface`]
//! from the offset) is the last of its line: the strip between it and the boundary is narrower
//! than its step-over. When the parallel of a pass breaks into several pieces (the boundary
//! cuts it, a loop is cut out), each piece is a pass and is carried on by itself. The plan
//! ends when no pass of the last row has a parallel on the surface; more than
//! [`PassOptions::max_passes`] passes is [`StrakeError::PassLimit`] (a closed surface, or a
//! step-over too small for the surface).
//!
//! **The scallop left.** Between every pass and the pass it was made from, the scallop is
//! measured at [`PassOptions::scallop_samples`] points of the new pass by the direct
//! construction of [`super::scallop_left::scallop_between`] (the two swept balls), not by the
//! formula the distances came from: where the surface's curvature across the path changes
//! between the two passes, or the parallel is bent by a varying distance, the measured value
//! differs from the target, and the report shows by how much.
//!
//! What it does not see: the scallop between passes of different lines that meet (pieces of
//! a broken parallel, passes of two lines that end up side by side), the strip left between
//! the last pass and the boundary (narrower than one step-over, its scallop not measured).
//!
//! **Other cutters** ([`PassOptions::cutter`]): a flat-end or toroidal cutter at lead and tilt
//! takes the step-over of the exact cusp of its two profiles across the path
//! ([`super::scallop_cutter::cutter_step_over_at`], limited by the width the cutter cuts by
//! construction) instead of the ball's two circles, and its scallop left is measured by the
//! same cusp at the distance the offsets actually made, over the mean curvature across the
//! path of the two passes ([`super::scallop_cutter::scallop_between_cutter_passes`]: the
//! cross-section model, not a construction in space like the ball's tubes). All passes run
//! the same way, so every pass has the same lead and tilt relative to its travel.

use super::scallop_cutter::{PassCutter, cutter_step_over_at, scallop_between_cutter_passes};
use super::scallop_left::{check_target_scallop, scallop_between, step_over_at};
use crate::checks::cutter::ToolSide;
use crate::curve::UvCurve;
use crate::error::{Result, StrakeError};
use crate::geodesics::offset::{
    OffsetDistance, OffsetOptions, OffsetPiece, OffsetSide, PathInterval, offset_path,
};
use crate::nurbs::{NurbsCurve, Parametrization};
use crate::paths::curve_on_surface::{CurveOnSurface, Hints};
use crate::paths::sampling::arc_length;
use crate::surface::SurfaceSource;

/// Relative accuracy of a measured scallop ([`super::scallop_left::scallop_between`]): a
/// corrected scallop up to target · (1 + this) counts as on target.
pub const SCALLOP_MEASURE_TOLERANCE: f64 = 1e-6;

/// Relative tolerance of the pass lengths.
pub const PASS_LENGTH_TOLERANCE: f64 = 1e-9;

/// How far apart neighbouring passes are.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum StepRule {
    /// Each next pass where the ball leaves this scallop height (host length unit, > 0) by the
    /// point-by-point rule of the module docs.
    IsoScallop {
        /// The target scallop height.
        height: f64,
    },
    /// Each next pass this geodesic distance away (host length unit, > 0).
    ConstantStepOver {
        /// The step-over, arc length on the surface across the path.
        step_over: f64,
    },
}

/// Options of a pass plan.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PassOptions {
    /// Radius of the ball-end mill (host length unit, > 0); not used when [`PassOptions::cutter`]
    /// is given.
    pub ball_radius: f64,
    /// The cutter at lead and tilt (`None`: the ball of [`PassOptions::ball_radius`]). A flat or
    /// toroidal cutter spaces iso-scallop passes by the exact cusp of its two profiles across
    /// the path ([`super::scallop_cutter::step_over_for_cutter_scallop`]: the width it cuts
    /// included) and measures the scallop left by
    /// [`super::scallop_cutter::scallop_between_cutter_passes`]; a ball-end mill is planned as
    /// the ball of its radius (its profile does not depend on lead and tilt).
    pub cutter: Option<PassCutter>,
    /// The side of the surface the tool is on.
    pub tool_side: ToolSide,
    /// The rule for the distance between neighbours.
    pub rule: StepRule,
    /// The side of each pass on which the next one is laid (left: toward B = N × T).
    pub advance: OffsetSide,
    /// Options of the offsets (geodesic traces, sampling and fit).
    pub offset: OffsetOptions,
    /// Parameters of each pass at which the step-over is computed (2..=10000; default 129).
    pub distance_samples: usize,
    /// Points of each new pass at which the scallop left is measured (1..=10000; default 9).
    pub scallop_samples: usize,
    /// Most passes, the first included (1..=100000; default 1000).
    pub max_passes: usize,
    /// Most rows of passes beside the first (`None`: until the surface is covered). A plan
    /// stopped by it is a band around the first pass; [`PassPlan::covered`] says so.
    pub max_rows: Option<usize>,
    /// Iso-scallop: most corrections of the distances of each pass against the scallop
    /// measured between it and its parent (0..=20; default 4; 0: the per-point rule alone).
    pub scallop_corrections: usize,
    /// Iso-scallop: the relative band the corrected scallops are brought into,
    /// [(1 − tolerance) target, target] at every distance sample (0 < tolerance < 1; default
    /// 0.02).
    pub scallop_tolerance: f64,
    /// Most surface jets the geodesic traces of the whole plan may evaluate (≥ 1; default
    /// [`DEFAULT_PLAN_JETS`]): the work cap that ends any plan with `NotConverged` naming the
    /// pass it was making.
    pub max_jets: usize,
}

/// Default [`PassOptions::max_jets`]: two hundred million surface jets (minutes of work).
pub const DEFAULT_PLAN_JETS: usize = 200_000_000;

impl PassOptions {
    /// Iso-scallop passes of a ball of `ball_radius` on `tool_side` for the target `height`,
    /// laid toward `advance`, offsets fitted to `chord_tolerance`.
    pub fn iso_scallop(
        ball_radius: f64,
        tool_side: ToolSide,
        height: f64,
        advance: OffsetSide,
        chord_tolerance: f64,
    ) -> Self {
        PassOptions {
            ball_radius,
            cutter: None,
            tool_side,
            rule: StepRule::IsoScallop { height },
            advance,
            offset: OffsetOptions::new(chord_tolerance),
            distance_samples: 129,
            scallop_samples: 9,
            max_passes: 1000,
            max_rows: None,
            scallop_corrections: 4,
            scallop_tolerance: 0.02,
            max_jets: DEFAULT_PLAN_JETS,
        }
    }

    /// Fails naming the field and value unless every option is in range.
    pub fn check(&self) -> Result<()> {
        if let Some(c) = &self.cutter {
            c.validate()?;
        } else if !(self.ball_radius.is_finite() && self.ball_radius > 0.0) {
            return Err(StrakeError::InvalidArgument(format!(
                "ball radius = {}: it must be positive and finite",
                crate::numfmt::Exact(self.ball_radius)
            )));
        }
        match self.rule {
            StepRule::IsoScallop { height } => check_target_scallop(height)?,
            StepRule::ConstantStepOver { step_over } => {
                if !(step_over.is_finite() && step_over > 0.0) {
                    return Err(StrakeError::InvalidArgument(format!(
                        "step-over = {step_over}: it must be positive and finite",
                        step_over = crate::numfmt::Exact(step_over)
                    )));
                }
            }
        }
        self.offset.check()?;
        for (name, x, lo, hi) in [
            ("distance_samples", self.distance_samples, 2, 10_000),
            ("scallop_samples", self.scallop_samples, 1, 10_000),
            ("max_passes", self.max_passes, 1, 100_000),
        ] {
            if !(lo..=hi).contains(&x) {
                return Err(StrakeError::InvalidArgument(format!(
                    "{name} = {x}: it must lie in {lo}..={hi}"
                )));
            }
        }
        if self.scallop_corrections > 20 {
            return Err(StrakeError::InvalidArgument(format!(
                "scallop_corrections = {}: it must lie in 0..=20",
                self.scallop_corrections
            )));
        }
        if !(self.scallop_tolerance > 0.0 && self.scallop_tolerance < 1.0) {
            return Err(StrakeError::InvalidArgument(format!(
                "scallop_tolerance = {}: it must lie in (0, 1)",
                self.scallop_tolerance
            )));
        }
        if self.max_jets == 0 {
            return Err(StrakeError::InvalidArgument(
                "max_jets = 0: the plan needs at least one surface jet".into(),
            ));
        }
        if self.max_rows == Some(0) {
            return Err(StrakeError::InvalidArgument(
                "max_rows = 0: give at least one row, or no limit".into(),
            ));
        }
        Ok(())
    }
}

/// One planned pass after the first.
#[derive(Debug, Clone, PartialEq)]
pub struct PlannedPass {
    /// The pass in the parameter plane (t in [0, 1]).
    pub curve: NurbsCurve<2>,
    /// Its row: 1 for the neighbours of the first pass, 2 for theirs, ...
    pub row: usize,
    /// The pass it was laid beside: `None` for the first pass, else its index in
    /// [`PassPlan::passes`].
    pub parent: Option<usize>,
    /// Its length on the surface (host length unit).
    pub length: f64,
    /// Smallest and largest step-over from its parent (geodesic distance).
    pub step_over: (f64, f64),
    /// Largest scallop measured between it and its parent (NaN when no probe of it could be
    /// measured, see [`PassPlan::unmeasured`]).
    pub scallop_max: f64,
    /// Smallest scallop measured between it and its parent (NaN likewise).
    pub scallop_min: f64,
    /// Intervals of the parent's parameter whose parallel left the surface.
    pub exits: Vec<PathInterval>,
    /// Intervals of the parent's parameter whose parallel looped and was cut.
    pub loops: Vec<PathInterval>,
}

/// A plan of passes.
#[derive(Debug, Clone, PartialEq)]
pub struct PassPlan {
    /// The passes after the first, row by row.
    pub passes: Vec<PlannedPass>,
    /// Length of the first pass.
    pub first_length: f64,
    /// Length of all passes, the first included.
    pub total_length: f64,
    /// Number of passes, the first included.
    pub count: usize,
    /// Rows: 1 + the row of the last pass.
    pub rows: usize,
    /// Largest scallop measured between neighbours (0 with a single pass).
    pub scallop_max: f64,
    /// Smallest scallop measured between neighbours (0 with a single pass).
    pub scallop_min: f64,
    /// Points of all the parallels (offset samples kept), for the cost per output point.
    pub offset_points: usize,
    /// Surface jets evaluated by the geodesic traces of the offsets.
    pub trace_jets: usize,
    /// Offsets computed, the corrections included (a plan without corrections makes one
    /// per pass that has a neighbour).
    pub offset_attempts: usize,
    /// Probes of the scallop left at which the construction found no cusp although the
    /// balls overlap (the two balls' circles in the section of the new pass's tube do not
    /// meet: the passes are not side by side there; balls that do not overlap at all are an
    /// error instead). Their scallop is not in [`PassPlan::scallop_max`]: a plan
    /// with unmeasured probes has scallops it does not report.
    pub unmeasured: usize,
    /// True when the plan ran until no parallel lay on the surface; false when it stopped at
    /// [`PassOptions::max_rows`] before trying the parallels of its last row.
    pub covered: bool,
}

fn length<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(s: &S, c: &C) -> Result<f64> {
    let d = c.domain();
    arc_length(
        &CurveOnSurface::new(s, c),
        d.lo,
        d.hi,
        PASS_LENGTH_TOLERANCE,
    )
}

fn at_pass(pass: usize, t: f64, error: StrakeError) -> StrakeError {
    match error {
        e @ StrakeError::CutterTooLarge { .. } => e,
        e => StrakeError::InvalidArgument(format!(
            "pass {pass}, t = {}: {e}",
            crate::numfmt::Exact(t)
        )),
    }
}

/// The chord-length parameters of a piece's samples, as its curve was fitted with.
fn piece_parameters(piece: &OffsetPiece) -> Result<Vec<f64>> {
    let uv: Vec<[f64; 2]> = piece.samples.iter().map(|s| [s.u, s.v]).collect();
    crate::nurbs::interpolate::interpolation_parameters(&uv, Parametrization::ChordLength)
}

/// The piece, sample index and piece parameter of the sample made from the parent parameter
/// nearest `t`, among the pieces whose parent range covers `t`.
fn facing_sample(pieces: &[OffsetPiece], t: f64) -> Option<(&OffsetPiece, usize, f64)> {
    for piece in pieces {
        let (a, b) = (piece.samples[0].t, piece.samples[piece.samples.len() - 1].t);
        if !(t >= a.min(b) && t <= a.max(b)) {
            continue;
        }
        let j = (0..piece.samples.len()).min_by(|&x, &y| {
            let dx = (piece.samples[x].t - t).abs();
            let dy = (piece.samples[y].t - t).abs();
            dx.total_cmp(&dy)
        })?;
        let params = piece_parameters(piece).ok()?;
        return Some((piece, j, params[j]));
    }
    None
}

/// The error that ends a plan whose work cap is used up.
fn plan_budget_spent(opts: &PassOptions, pass: usize, row: usize, plan: &PassPlan) -> StrakeError {
    StrakeError::NotConverged {
        what: format!(
            "pass plan: the work cap max_jets = {} surface jets was used up making the \
             neighbour of pass {pass} (row {row}), with {} passes made ({} rows)",
            opts.max_jets, plan.count, plan.rows
        ),
        iterations: plan.count,
    }
}

/// The scallop left at parameter `tau` of pass `a` by its neighbour `b` (searched from `t_b0`):
/// the ball's swept tubes ([`scallop_between`]) for a ball of radius `tool.0`, the two
/// profiles at the measured step-over ([`scallop_between_cutter_passes`]) for a cutter.
fn measure<S: SurfaceSource + ?Sized, A: UvCurve + ?Sized, B: UvCurve + ?Sized>(
    surface: &S,
    a: &A,
    b: &B,
    tool: (f64, Option<&PassCutter>),
    side: ToolSide,
    tau: f64,
    t_b0: f64,
) -> Result<f64> {
    match tool.1 {
        None => scallop_between(surface, a, b, tool.0, side, &[tau], t_b0).map(|v| v[0].height),
        Some(c) => {
            scallop_between_cutter_passes(surface, a, b, c, side, &[tau], t_b0).map(|v| v[0].height)
        }
    }
}

/// Plans passes across `surface` from `first` (see the module docs).
///
/// Errors: `InvalidArgument` naming the field for bad options (a target scallop of zero or
/// NaN, a radius or step-over that is not positive and finite); [`StrakeError::CutterTooLarge`]
/// where the ball does not fit the concave curvature across a pass; [`StrakeError::PassLimit`]
/// when more than `max_passes` passes would be needed; every error of the offsets (except
/// `LeavesSurface`, which ends a line of passes), of the frames and of the scallop measurement
/// (passes that do not overlap: the constant step-over too wide for the ball), wrapped with the
/// pass index and parameter where that helps.
pub fn plan_passes<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    surface: &S,
    first: &C,
    opts: &PassOptions,
) -> Result<PassPlan> {
    opts.check()?;
    let first_length = length(surface, first)?;
    let mut plan = PassPlan {
        passes: Vec::new(),
        first_length,
        total_length: first_length,
        count: 1,
        rows: 1,
        scallop_max: 0.0,
        scallop_min: 0.0,
        offset_points: 0,
        trace_jets: 0,
        offset_attempts: 0,
        unmeasured: 0,
        covered: true,
    };
    // The ball's radius, or the flat or toroidal cutter whose profiles are measured.
    let (r, profile) = match &opts.cutter {
        None => (opts.ball_radius, None),
        Some(c) => match c.ball_radius() {
            Some(radius) => (radius, None),
            None => (f64::NAN, Some(*c)),
        },
    };
    // The passes of the current row: None = the first pass, Some(i) = plan.passes[i].
    let mut row: Vec<Option<usize>> = vec![None];
    let mut row_number = 0;
    let mut scallops = (f64::INFINITY, 0.0_f64);
    while !row.is_empty() {
        if opts.max_rows.is_some_and(|m| row_number >= m) {
            plan.covered = false;
            break;
        }
        row_number += 1;
        let mut next = Vec::new();
        for &parent in &row {
            let pass_index = parent.map_or(0, |i| i + 1);
            let curve: &dyn UvCurve = match parent {
                None => &first,
                Some(i) => &plan.passes[i].curve,
            };
            let dom = curve.domain();
            let n = opts.distance_samples;
            let path = CurveOnSurface::new(surface, curve);
            let mut hints = Hints::default();
            let mut ts = Vec::with_capacity(n);
            let mut ds = Vec::with_capacity(n);
            for k in 0..n {
                let t = dom.even(k, n);
                let w = match opts.rule {
                    StepRule::ConstantStepOver { step_over } => step_over,
                    StepRule::IsoScallop { height } => {
                        let f = path
                            .frame(t, &mut hints)
                            .map_err(|e| at_pass(pass_index, t, e))?;
                        match &profile {
                            None => step_over_at(&f, r, opts.tool_side, height),
                            Some(c) => cutter_step_over_at(&f, c, opts.tool_side, height),
                        }
                        .map_err(|e| at_pass(pass_index, t, e))?
                    }
                };
                ts.push(t);
                ds.push(w);
            }
            // The correction iteration (iso-scallop): the parallel at the distances ds, the
            // scallop measured against it at each table parameter, each distance scaled by
            // √(aim/h) (h ∝ w² to leading order), until every measured scallop lies in
            // [(1 − scallop_tolerance) target, target].
            let corrections = match opts.rule {
                StepRule::IsoScallop { .. } => opts.scallop_corrections,
                StepRule::ConstantStepOver { .. } => 0,
            };
            let mut attempt = 0;
            let off = loop {
                let left = opts.max_jets.saturating_sub(plan.trace_jets);
                if left == 0 {
                    return Err(plan_budget_spent(opts, pass_index, row_number, &plan));
                }
                let mut offset_opts = opts.offset;
                offset_opts.max_jets = offset_opts.max_jets.min(left);
                let distance = OffsetDistance::Table {
                    t: ts.clone(),
                    d: ds.clone(),
                };
                let off = match offset_path(surface, curve, opts.advance, &distance, &offset_opts) {
                    Ok(o) => o,
                    Err(StrakeError::LeavesSurface { .. }) => break None,
                    Err(StrakeError::NotConverged { .. })
                        if offset_opts.max_jets < opts.offset.max_jets =>
                    {
                        return Err(plan_budget_spent(opts, pass_index, row_number, &plan));
                    }
                    Err(e) => return Err(e),
                };
                plan.trace_jets += off.jets;
                plan.offset_attempts += 1;
                let StepRule::IsoScallop { height } = opts.rule else {
                    break Some(off);
                };
                if attempt >= corrections {
                    break Some(off);
                }
                attempt += 1;
                let aim = height * (1.0 - 0.25 * opts.scallop_tolerance);
                let mut settled = true;
                for k in 0..n {
                    let Some((piece, j, tau)) = facing_sample(&off.pieces, ts[k]) else {
                        continue;
                    };
                    let sample_t = piece.samples[j].t;
                    let h = measure(
                        surface,
                        &piece.curve,
                        curve,
                        (r, profile.as_ref()),
                        opts.tool_side,
                        tau,
                        sample_t,
                    );
                    match h {
                        Ok(h) => {
                            if h > height * (1.0 + SCALLOP_MEASURE_TOLERANCE)
                                || h < height * (1.0 - opts.scallop_tolerance)
                            {
                                settled = false;
                                let factor = if h > 0.0 {
                                    (aim / h).sqrt().clamp(0.5, 2.0)
                                } else {
                                    2.0
                                };
                                ds[k] *= factor;
                            }
                        }
                        Err(StrakeError::NotConverged { .. }) => {}
                        Err(StrakeError::InvalidArgument(_)) => {
                            // The balls do not meet there: the step-over is too wide.
                            settled = false;
                            ds[k] *= 0.7;
                        }
                        Err(e) => return Err(at_pass(pass_index, ts[k], e)),
                    }
                }
                if settled {
                    break Some(off);
                }
            };
            let Some(off) = off else { continue };
            let step = ds
                .iter()
                .fold((f64::INFINITY, 0.0_f64), |(a, b), &w| (a.min(w), b.max(w)));
            let mut made = Vec::with_capacity(off.pieces.len());
            for piece in off.pieces {
                if plan.count >= opts.max_passes {
                    return Err(StrakeError::PassLimit {
                        passes: plan.count + 1,
                        limit: opts.max_passes,
                    });
                }
                plan.offset_points += piece.samples.len();
                // Probes at samples of the piece spread evenly over it, each searched from
                // the parent parameter it was made from.
                let params = piece_parameters(&piece)?;
                let m = opts.scallop_samples.min(piece.samples.len());
                let (mut lo, mut hi) = (f64::INFINITY, 0.0_f64);
                for q in 0..m {
                    let j = ((2 * q + 1) * piece.samples.len()) / (2 * m);
                    let t_parent = piece.samples[j].t;
                    match measure(
                        surface,
                        &piece.curve,
                        curve,
                        (r, profile.as_ref()),
                        opts.tool_side,
                        params[j],
                        t_parent,
                    ) {
                        Ok(h) => {
                            lo = lo.min(h);
                            hi = hi.max(h);
                        }
                        // No cusp found in the section of this pass's tube (the balls'
                        // circles there do not meet): counted, not hidden.
                        Err(StrakeError::NotConverged { .. }) => plan.unmeasured += 1,
                        Err(e) => return Err(at_pass(pass_index, t_parent, e)),
                    }
                }
                if lo <= hi {
                    scallops = (scallops.0.min(lo), scallops.1.max(hi));
                } else {
                    (lo, hi) = (f64::NAN, f64::NAN);
                }
                let len = length(surface, &piece.curve)?;
                plan.total_length += len;
                plan.count += 1;
                plan.rows = row_number + 1;
                next.push(Some(plan.passes.len() + made.len()));
                made.push(PlannedPass {
                    curve: piece.curve,
                    row: row_number,
                    parent,
                    length: len,
                    step_over: step,
                    scallop_max: hi,
                    scallop_min: lo,
                    exits: off.exits.clone(),
                    loops: off.loops.clone(),
                });
            }
            plan.passes.extend(made);
        }
        row = next;
    }
    if plan.count > 1 {
        plan.scallop_min = scallops.0;
        plan.scallop_max = scallops.1;
    }
    Ok(plan)
}

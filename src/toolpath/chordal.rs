//! Chord-tolerance sampling judged on the tool-centre path: the machine's controller
//! interpolates the cutter-location points, so the chord error that matters is that of the
//! centre path, not of the contact path.
//!
//! The step rule and its verification are those of [`crate::paths::sampling`] (the longest
//! chord on a circle of the local curvature, then the deviation measured at the quarters of
//! the step and the step shrunk until it is within the tolerance), applied to the centre path
//! CL(t) = c + d_T T + d_B B + d_N N ([`super::centre`]): its curvature κc (exact, from
//! third-order jets) proposes the step, converted to the curve parameter with the centre
//! path's speed |c'| ds_c/ds, and the deviation is measured from the centre points at the
//! quarters to the chord between the centre points of the two samples. The samples are those
//! of the contact path (t, arc length along the contact path, frame); the maximum step is in
//! contact-path arc length. Where the centre path folds back at a sample,
//! [`StrakeError::CentrePathFolds`] names it; between samples only the chord's deviation is
//! seen.

use super::centre::{ToolSetup, centre_of_frame, centre_point};
use crate::curve::UvCurve;
use crate::error::{Result, StrakeError};
use crate::geometry::math::Vec3;
use crate::paths::curve_on_surface::{CurveOnSurface, Hints, PathSample, SampleError};
use crate::paths::sampling::{ChordTarget, ChordalOptions, SampleSink, sample_chordal_on};
use crate::surface::SurfaceSource;

/// Chords judged on the tool-centre path of `setup`.
struct CentreTarget<'a>(&'a ToolSetup);

impl ChordTarget for CentreTarget<'_> {
    fn sample_point<S, C>(
        &self,
        _: &CurveOnSurface<'_, S, C>,
        sample: &PathSample,
        _: &mut Hints,
    ) -> Result<Vec3>
    where
        S: SurfaceSource + ?Sized,
        C: UvCurve + ?Sized,
    {
        centre_of_frame(&sample.frame, self.0)
    }
    fn point<S, C>(
        &self,
        path: &CurveOnSurface<'_, S, C>,
        t: f64,
        hints: &mut Hints,
    ) -> Result<Vec3>
    where
        S: SurfaceSource + ?Sized,
        C: UvCurve + ?Sized,
    {
        centre_of_frame(&path.frame(t, hints)?, self.0)
    }
    fn bend<S, C>(
        &self,
        path: &CurveOnSurface<'_, S, C>,
        sample: &PathSample,
        hints: &mut Hints,
    ) -> Result<(f64, f64)>
    where
        S: SurfaceSource + ?Sized,
        C: UvCurve + ?Sized,
    {
        // On a crease, the partials of the side the frame was taken on.
        let (sp, cp, _) = path.partials_at(sample.t, 3, hints)?;
        let orientation = path.surface().orientation();
        let p = centre_point(&sample.frame, &sp, &cp, orientation, self.0, sample.t)?;
        Ok((p.curvature, sample.frame.speed * p.speed_ratio))
    }
}

/// Samples the contact path `path` so that the chord between the cutter-location points of
/// consecutive samples stays within `opts.chord_tolerance` of the tool-centre path of `setup`
/// (see the module docs), and their contact-path arc-length spacing within `opts.max_step`.
/// The first sample is at the start of the curve's domain, the last at its end; output and
/// count as for [`crate::paths::sampling::sample_chordal`]. The centre points at the samples
/// follow from [`super::centre::centre_path_at`] at their t.
///
/// Errors: those of [`crate::paths::sampling::sample_chordal`] and of [`ToolSetup::validate`]
/// (index 0, before any sample); `OrderUnavailable` for a surface or curve without third
/// derivatives; [`StrakeError::CentrePathFolds`] at the first sample where the centre path
/// folds back (its index and t named).
pub fn sample_chordal_centre<S, C, K>(
    path: &CurveOnSurface<'_, S, C>,
    opts: &ChordalOptions,
    setup: &ToolSetup,
    sink: &mut K,
) -> std::result::Result<usize, SampleError>
where
    S: SurfaceSource + ?Sized,
    C: UvCurve + ?Sized,
    K: SampleSink + ?Sized,
{
    setup.validate().map_err(|error| SampleError {
        index: 0,
        t: f64::NAN,
        error,
    })?;
    sample_chordal_on(path, opts, &CentreTarget(setup), sink).map_err(|mut e| {
        if let StrakeError::CentrePathFolds { index, .. } = &mut e.error {
            *index = e.index;
        }
        e
    })
}

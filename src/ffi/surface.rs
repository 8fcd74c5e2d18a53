//! The opaque surface handle and the adapter that turns a host callback into a
//! [`SurfaceSource`].
//!
//! The handle holds a `Box<dyn SurfaceSource>`, so any surface of the Rust API can be offered to
//! C by one more constructor in a file of its own (e.g. a native NURBS surface):
//! build the source, then `publish(StrakeSurface::new(Box::new(source)), out)`. Evaluation,
//! freeing and the batch calls need no change.

use super::guard::{Failure, guard, input_slice, non_null, output};
use super::status::StrakeStatus;
use super::types::StrakeSurfaceJet;
use crate::error::{NonFiniteSource, Result, StrakeError};
use crate::geometry::jet::{DerivOrder, Interval, SurfaceJet, SurfacePartials};
use crate::geometry::principal::Orientation;
use crate::surface::{SurfaceHint, SurfaceSource};
use std::ffi::c_void;

/// A host surface evaluator.
///
/// Called with the host's `user_data`, a point (u, v) inside the domain given at creation,
/// the highest derivative order needed (0: point; 1: also su, sv; 2: also suu, suv, svv) and a
/// jet that strake has set to zero. Fill the entries up to `order` and return 0; return any
/// non-zero code to report a failure: strake then returns
/// `STRAKE_STATUS_SURFACE_CALLBACK_FAILED` and passes the code back (message and
/// `strake_last_callback_code`). Entries must be finite (a NaN or infinity gives
/// `STRAKE_STATUS_NON_FINITE` naming the entry).
///
/// The callback must not unwind (no C++ exception, no longjmp) out of the call. It may be
/// called from several threads at once when the host evaluates one handle from several
/// threads; `user_data` must allow that.
pub type StrakeSurfaceFn = Option<
    unsafe extern "C" fn(
        user_data: *mut c_void,
        u: f64,
        v: f64,
        order: i32,
        out: *mut StrakeSurfaceJet,
    ) -> i32,
>;

/// An opaque surface: created by `strake_surface_from_callback`, released by
/// `strake_surface_free`.
///
/// Immutable after creation: one handle may be evaluated from many threads at once (each call
/// keeps its own state). The host must keep whatever `user_data` points to alive until the
/// handle is freed, and must not free the handle while another thread uses it.
pub struct StrakeSurface {
    source: Box<dyn SurfaceSource>,
    /// Knot lines the host declared (`strake_surface_set_knot_lines`); empty: the source's own.
    u_lines: Vec<f64>,
    v_lines: Vec<f64>,
}

impl StrakeSurface {
    /// A handle around any surface of the Rust API.
    pub fn new(source: Box<dyn SurfaceSource>) -> Self {
        StrakeSurface {
            source,
            u_lines: Vec::new(),
            v_lines: Vec::new(),
        }
    }

    /// The surface behind the handle, with the knot lines the host declared, if any.
    pub fn source(&self) -> &dyn SurfaceSource {
        self
    }
}

/// The handle's surface: its source, with the host's knot lines in place of the source's own
/// where the host declared some.
impl SurfaceSource for StrakeSurface {
    fn u_domain(&self) -> Interval {
        self.source.u_domain()
    }
    fn v_domain(&self) -> Interval {
        self.source.v_domain()
    }
    fn orientation(&self) -> Orientation {
        self.source.orientation()
    }
    fn u_breaks(&self) -> &[f64] {
        if self.u_lines.is_empty() {
            self.source.u_breaks()
        } else {
            &self.u_lines
        }
    }
    fn v_breaks(&self) -> &[f64] {
        if self.v_lines.is_empty() {
            self.source.v_breaks()
        } else {
            &self.v_lines
        }
    }
    #[inline]
    fn jet_in_domain(
        &self,
        u: f64,
        v: f64,
        order: DerivOrder,
        hint: &mut SurfaceHint,
    ) -> Result<SurfaceJet> {
        self.source.jet_in_domain(u, v, order, hint)
    }
    #[inline]
    fn jets_and_third_block(
        &self,
        u: &[f64],
        v: &[f64],
        hint: &mut SurfaceHint,
        jets: &mut [SurfaceJet],
        third: &mut [crate::geometry::rates::ThirdPartials],
    ) -> bool {
        self.source.jets_and_third_block(u, v, hint, jets, third)
    }
    fn u_creases(&self) -> &[crate::surface::crease::KnotLine] {
        self.source.u_creases()
    }
    fn v_creases(&self) -> &[crate::surface::crease::KnotLine] {
        self.source.v_creases()
    }
    fn u_knot_lines(&self) -> &[crate::surface::crease::KnotLine] {
        self.source.u_knot_lines()
    }
    fn v_knot_lines(&self) -> &[crate::surface::crease::KnotLine] {
        self.source.v_knot_lines()
    }
    fn jet_in_domain_sided(
        &self,
        u: f64,
        v: f64,
        sides: crate::surface::KnotSides,
        order: DerivOrder,
        hint: &mut SurfaceHint,
    ) -> Result<SurfaceJet> {
        self.source.jet_in_domain_sided(u, v, sides, order, hint)
    }
    fn jets_in_domain_block(
        &self,
        u: &[f64],
        v: &[f64],
        order: DerivOrder,
        hint: &mut SurfaceHint,
        out: &mut [SurfaceJet],
    ) -> Result<()> {
        self.source.jets_in_domain_block(u, v, order, hint, out)
    }
    fn max_order(&self) -> usize {
        self.source.max_order()
    }
    fn partials_in_domain(
        &self,
        u: f64,
        v: f64,
        order: usize,
        hint: &mut SurfaceHint,
    ) -> Result<SurfacePartials> {
        self.source.partials_in_domain(u, v, order, hint)
    }
    fn partials_in_domain_sided(
        &self,
        u: f64,
        v: f64,
        sides: crate::surface::KnotSides,
        order: usize,
        hint: &mut SurfaceHint,
    ) -> Result<SurfacePartials> {
        self.source
            .partials_in_domain_sided(u, v, sides, order, hint)
    }
}

/// Checks declared knot lines: finite, strictly inside `domain`, strictly ascending.
fn checked_lines(
    lines: *const f64,
    count: usize,
    name: &'static str,
    count_name: &str,
    domain: Interval,
) -> std::result::Result<Vec<f64>, Failure> {
    if count == 0 {
        return Ok(Vec::new());
    }
    // SAFETY: the caller passes `count` readable doubles at `lines` (or NULL, refused).
    let xs = unsafe { input_slice(lines, count, name, count_name)? };
    for (i, &x) in xs.iter().enumerate() {
        if !x.is_finite() {
            return Err(StrakeError::NonFinite {
                source: NonFiniteSource::Parameter,
                what: name,
                value: x,
            }
            .into());
        }
        if !(domain.lo < x && x < domain.hi) {
            return Err(Failure::invalid(format!(
                "{name}[{i}] = {x} is not strictly inside the domain [{}, {}]",
                crate::numfmt::Exact(domain.lo),
                crate::numfmt::Exact(domain.hi),
                x = crate::numfmt::Exact(x)
            )));
        }
        if i > 0 && x <= xs[i - 1] {
            return Err(Failure::invalid(format!(
                "{name}[{i}] = {} does not exceed {name}[{}] = {}: knot lines must be strictly ascending",
                crate::numfmt::Exact(x),
                i - 1,
                crate::numfmt::Exact(xs[i - 1])
            )));
        }
    }
    Ok(xs.to_vec())
}

/// Declares where the surface's derivatives may jump: the distinct interior knots of the host's
/// NURBS in u (`u_lines`, `u_count` values) and in v (`v_lines`, `v_count`), each finite,
/// strictly inside the domain and strictly ascending. Arc length (`strake_arc_length` and the
/// sampling calls) then splits its quadrature where a curve crosses these lines; without them a
/// callback surface with repeated knots (e.g. rational conics) can fall short of a very tight
/// tolerance there (about 1e-8 relative on a quadratic circle). A count of 0 (the pointer may
/// then be NULL) goes back to what the surface knows itself: nothing for a callback surface,
/// the knots of a native NURBS surface. Frames do not depend on it.
///
/// Returns `STRAKE_STATUS_OK` and replaces both lists; otherwise the handle is unchanged.
/// Errors: NULL_POINTER (`surface`, or a list with a count above 0); NON_FINITE (a value);
/// INVALID_ARGUMENT (a value outside the open domain, or not above its predecessor). Not
/// thread-safe on the same handle: no other call may use `surface` meanwhile.
///
/// # Safety
/// `surface` NULL or a live handle not in use by another thread; each list NULL or `count`
/// readable doubles.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_surface_set_knot_lines(
    surface: *mut StrakeSurface,
    u_lines: *const f64,
    u_count: usize,
    v_lines: *const f64,
    v_count: usize,
) -> StrakeStatus {
    guard("strake_surface_set_knot_lines", || {
        let nn = non_null(surface.cast_const(), "surface")?;
        // SAFETY: a live handle that no other thread uses during the call (the contract).
        let s = unsafe { &mut *nn.as_ptr() };
        let u = checked_lines(u_lines, u_count, "u_lines", "u_count", s.source.u_domain())?;
        let v = checked_lines(v_lines, v_count, "v_lines", "v_count", s.source.v_domain())?;
        s.u_lines = u;
        s.v_lines = v;
        Ok(())
    })
}

pub(crate) fn publish(
    surface: StrakeSurface,
    out: *mut *mut StrakeSurface,
) -> std::result::Result<(), Failure> {
    let slot = output(out, "out")?;
    // SAFETY: `out` was checked non-null and aligned; the caller provides a writable slot.
    unsafe {
        slot.as_ptr()
            .write(std::mem::MaybeUninit::new(Box::into_raw(Box::new(surface))))
    };
    Ok(())
}

/// A surface evaluated by a host callback.
struct CallbackSurface {
    f: unsafe extern "C" fn(*mut c_void, f64, f64, i32, *mut StrakeSurfaceJet) -> i32,
    user_data: *mut c_void,
    u: Interval,
    v: Interval,
    orientation: Orientation,
}

// SAFETY: strake never dereferences `user_data`; it only hands it back to the host's callback.
// The documented contract of `StrakeSurfaceFn` puts thread safety of the callback and its
// `user_data` on the host, which is what sharing the handle between threads requires.
unsafe impl Send for CallbackSurface {}
// SAFETY: as above; the struct itself is never mutated after creation.
unsafe impl Sync for CallbackSurface {}

impl SurfaceSource for CallbackSurface {
    fn u_domain(&self) -> Interval {
        self.u
    }
    fn v_domain(&self) -> Interval {
        self.v
    }
    fn orientation(&self) -> Orientation {
        self.orientation
    }
    #[inline]
    fn jet_in_domain(
        &self,
        u: f64,
        v: f64,
        order: DerivOrder,
        _hint: &mut SurfaceHint,
    ) -> Result<SurfaceJet> {
        let mut jet = StrakeSurfaceJet::default();
        // SAFETY: the host promised a callback with this signature; `jet` is a valid, zeroed,
        // exclusively borrowed jet for the duration of the call.
        let code = unsafe { (self.f)(self.user_data, u, v, order as i32, &mut jet) };
        if code != 0 {
            return Err(super::message::callback_error("surface", code));
        }
        Ok(SurfaceJet::from(&jet))
    }
}

/// A finite parameter passed by the host, or `STRAKE_STATUS_NON_FINITE` naming it.
pub(crate) fn finite(name: &'static str, value: f64) -> std::result::Result<f64, Failure> {
    if value.is_finite() {
        Ok(value)
    } else {
        Err(StrakeError::NonFinite {
            source: NonFiniteSource::Parameter,
            what: name,
            value,
        }
        .into())
    }
}

/// The domain [u_min, u_max] x [v_min, v_max] and orientation of a host-callback surface,
/// validated as every callback constructor requires (finite, non-empty ranges; flag 0 or 1).
pub(crate) fn callback_domain(
    u_min: f64,
    u_max: f64,
    v_min: f64,
    v_max: f64,
    flip_normal: i32,
) -> std::result::Result<(Interval, Interval, Orientation), Failure> {
    let u = Interval::new("u", finite("u_min", u_min)?, finite("u_max", u_max)?)?;
    let v = Interval::new("v", finite("v_min", v_min)?, finite("v_max", v_max)?)?;
    Ok((u, v, orientation(flip_normal)?))
}

/// The orientation for a `flip_normal` flag, which must be 0 or 1.
pub(crate) fn orientation(flip_normal: i32) -> std::result::Result<Orientation, Failure> {
    match flip_normal {
        0 => Ok(Orientation::Forward),
        1 => Ok(Orientation::Reversed),
        x => Err(Failure::invalid(format!(
            "`flip_normal` = {x}; it must be 0 (N along Su x Sv) or 1 (reversed)"
        ))),
    }
}

/// Creates a surface evaluated by the host's callback `f` over [u_min, u_max] x [v_min, v_max].
///
/// `flip_normal` = 0 takes N along Su x Sv, 1 takes N = -(Su x Sv)/|Su x Sv| (e.g. to put the
/// normal on the tool side). `user_data` is handed back to `f` unchanged and may be NULL. strake
/// calls `f` only with (u, v) inside the domain; a curve that leaves the domain gives
/// `STRAKE_STATUS_OUT_OF_DOMAIN` (no clamping).
///
/// Returns `STRAKE_STATUS_OK` and writes a new handle to `*out` (free it with
/// `strake_surface_free`); otherwise `*out` is left untouched. Errors: NULL_POINTER (`f`,
/// `out`), NON_FINITE (a domain end), INVALID_ARGUMENT (an empty or reversed range,
/// `flip_normal` not 0 or 1).
///
/// # Safety
/// `f` must be NULL or a function with the signature of [`StrakeSurfaceFn`] honouring its
/// contract; `out` must be NULL or point to a writable `StrakeSurface *`.
#[unsafe(no_mangle)]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn strake_surface_from_callback(
    f: StrakeSurfaceFn,
    user_data: *mut c_void,
    u_min: f64,
    u_max: f64,
    v_min: f64,
    v_max: f64,
    flip_normal: i32,
    out: *mut *mut StrakeSurface,
) -> StrakeStatus {
    guard("strake_surface_from_callback", || {
        let f = f.ok_or_else(|| Failure::null("f"))?;
        output(out, "out")?;
        let (u, v, orientation) = callback_domain(u_min, u_max, v_min, v_max, flip_normal)?;
        let source = CallbackSurface {
            f,
            user_data,
            u,
            v,
            orientation,
        };
        publish(StrakeSurface::new(Box::new(source)), out)
    })
}

/// Releases a surface. NULL is a no-op. The handle must not be used afterwards, nor be in use
/// by another thread.
///
/// # Safety
/// `surface` must be NULL or a handle returned by a strake surface constructor and not yet
/// freed.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_surface_free(surface: *mut StrakeSurface) {
    let _ = guard("strake_surface_free", || {
        if !surface.is_null() {
            // SAFETY: the caller passes a handle made by `Box::into_raw` in `publish`.
            drop(unsafe { Box::from_raw(surface) });
        }
        Ok(())
    });
}

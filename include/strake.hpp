/*
 * strake.hpp: a header-only C++17 wrapper over the C ABI of strake.h.
 *
 * - Handles (strake::Surface, strake::Curve, strake::Offset, strake::DriveResult,
 *   strake::PassPlan) are move-only and free themselves.
 * - Every failing call throws a strake::Error, carrying the StrakeStatus, strake's message
 *   (which argument, index, value or sample was wrong) and, for a failed host callback, the
 *   callback's code. The class thrown says the status family (catch strake::Error for all):
 *   ArgumentError (1-9), NurbsDataError (10-19), EvaluationError (20-29 and 32,
 *   ORDER_UNAVAILABLE), CallbackError (30, 31), ToolPathError (40-49), PlanningError (50-59),
 *   InternalError (90-99).
 * - Options structs come from the *_options() helpers, which value-initialise them: every
 *   field not set is 0, the header's default, also a field a later version adds at the end.
 * - Arrays go in and out as strake::View<T>: a pointer and a size (std::span in spirit; build
 *   one from a std::vector, a std::array, a C array or a pointer and a count). Functions that
 *   return a std::vector allocate it; the View overloads write into the caller's memory.
 * - Host surfaces and curves can be lambdas. An exception thrown by the lambda is caught at
 *   the C boundary (it never unwinds through strake), its what() is handed to strake with
 *   strake_callback_report, and the strake call then throws strake::Error with
 *   STRAKE_STATUS_SURFACE_CALLBACK_FAILED (or _CURVE_) and that text in its message. The
 *   callable lives as long as the handle. With Surface/Curve used from several threads at
 *   once (frames_at_parallel), the callable is called concurrently and must allow that.
 *
 * Frames, samples and the check results are the C structs (strake::Frame = StrakeFrame, ...):
 * see strake.h for the meaning, units and sign conventions of each field.
 */
#ifndef STRAKE_HPP
#define STRAKE_HPP

#include "strake.h"

#include <array>
#include <cstddef>
#include <cstdint>
#include <exception>
#include <memory>
#include <stdexcept>
#include <string>
#include <type_traits>
#include <utility>
#include <vector>

namespace strake {

using Frame = StrakeFrame;
using Sample = StrakeSample;
using SurfaceJet = StrakeSurfaceJet;
using CurveJet = StrakeCurveJet;
using CurveHighJet = StrakeCurveHighJet;
using Cutter = StrakeCutter;
using ToolAngles = StrakeToolAngles;
using ToolAxis = StrakeToolAxis;
using GougeState = StrakeGougeState;
using Scallop = StrakeScallop;
using StepOver = StrakeStepOver;
using FeedLimits = StrakeFeedLimits;
using FibreLimits = StrakeFibreLimits;
using FibreState = StrakeFibreState;
using Extremes = StrakeExtremes;
using Violation = StrakeViolation;
using RearGouge = StrakeRearGouge;
using CutterStepOver = StrakeCutterStepOver;
using CutterRadii = StrakeCutterRadii;
using TowEdges = StrakeTowEdges;
using SurfaceHighJet = StrakeSurfaceHighJet;
using ParamScales = StrakeParamScales;
using ProjectionOptions = StrakeProjectionOptions;
using Projection = StrakeProjection;
using InvariantRates = StrakeInvariantRates;
using CentrePoint = StrakeCentrePoint;
using CentreFeedLimits = StrakeCentreFeedLimits;
using CentreFeed = StrakeCentreFeed;
using GeodesicOptions = StrakeGeodesicOptions;
using GeodesicInfo = StrakeGeodesicInfo;
using OffsetOptions = StrakeOffsetOptions;
using OffsetSummary = StrakeOffsetSummary;
using OffsetPoint = StrakeOffsetPoint;
using PathInterval = StrakePathInterval;
using CourseGap = StrakeCourseGap;
using CourseCheck = StrakeCourseCheck;
using DrivePlane = StrakeDrivePlane;
using DriveOptions = StrakeDriveOptions;
using PatternInterval = StrakePatternInterval;
using PassOptions = StrakePassOptions;
using PassSummary = StrakePassSummary;
using PassInfo = StrakePassInfo;

/** A pointer and a count: the elements a call reads (View<const T>) or writes (View<T>). */
template <class T>
class View {
public:
    constexpr View() noexcept = default;
    constexpr View(T *data, std::size_t size) noexcept : data_(data), size_(size) {}
    template <std::size_t N>
    constexpr View(T (&array)[N]) noexcept : data_(array), size_(N) {}
    /** Any contiguous container with data() and size() (std::vector, std::array, ...). */
    template <class C, class = std::enable_if_t<std::is_convertible_v<
                           decltype(std::declval<C &>().data()), T *>>>
    constexpr View(C &c) noexcept : data_(c.data()), size_(c.size()) {}
    constexpr T *data() const noexcept { return data_; }
    constexpr std::size_t size() const noexcept { return size_; }
    constexpr bool empty() const noexcept { return size_ == 0; }
    constexpr T *begin() const noexcept { return data_; }
    constexpr T *end() const noexcept { return data_ + size_; }
    constexpr T &operator[](std::size_t i) const noexcept { return data_[i]; }

private:
    T *data_ = nullptr;
    std::size_t size_ = 0;
};

/** What a failing strake call throws: its status, strake's message and the callback code. */
class Error : public std::runtime_error {
public:
    Error(StrakeStatus status, const std::string &message, std::int32_t callback_code)
        : std::runtime_error(message), status_(status), callback_code_(callback_code) {}
    /** The status the C call returned (never STRAKE_STATUS_OK). */
    StrakeStatus status() const noexcept { return status_; }
    /** The status's C name, e.g. "STRAKE_STATUS_OUT_OF_DOMAIN". */
    const char *status_name() const noexcept { return strake_status_name(status_); }
    /** The host callback's code for the callback failures, else 0. */
    std::int32_t callback_code() const noexcept { return callback_code_; }

private:
    StrakeStatus status_;
    std::int32_t callback_code_;
};

/** This thread's message of the last failed strake call. */
inline std::string last_error_message() {
    std::size_t needed = strake_last_error_message(nullptr, 0);
    std::string text(needed, '\0');
    strake_last_error_message(&text[0], text.size());
    text.resize(needed > 0 ? needed - 1 : 0);
    return text;
}

/** Statuses 1-9: a NULL or misaligned pointer, an invalid or non-finite argument. */
class ArgumentError : public Error {
public:
    using Error::Error;
};
/** Statuses 10-19: degree, knots, control points or weights that do not make a NURBS. */
class NurbsDataError : public Error {
public:
    using Error::Error;
};
/** Statuses 20-29 and 32 (ORDER_UNAVAILABLE): evaluation (domain, degenerate point, stalled
 * curve, too far from the surface, no convergence, a derivative order the source lacks). */
class EvaluationError : public Error {
public:
    using Error::Error;
};
/** Statuses 30 and 31: a host callback failed (callback_code() has its code). */
class CallbackError : public Error {
public:
    using Error::Error;
};
/** Statuses 40-49: the tool-centre path cannot be made (it folds back). */
class ToolPathError : public Error {
public:
    using Error::Error;
};
/** Statuses 50-59: geodesics, offsets and passes (incomplete trace, no geodesic, leaves the
 * surface, cutter too large, pass limit). */
class PlanningError : public Error {
public:
    using Error::Error;
};
/** Statuses 90-99: a bug in strake (a panic caught at the C boundary). */
class InternalError : public Error {
public:
    using Error::Error;
};

/** The C name of a status, e.g. "STRAKE_STATUS_OUT_OF_DOMAIN". */
inline const char *status_name(StrakeStatus status) noexcept { return strake_status_name(status); }

/** The host callback's code of the last callback failure on this thread (0 if none). */
inline std::int32_t last_callback_code() noexcept { return strake_last_callback_code(); }

/** Throws the strake::Error subclass of its family unless `status` is STRAKE_STATUS_OK. */
inline void check(StrakeStatus status) {
    if (status == STRAKE_STATUS_OK) return;
    const auto n = static_cast<std::uint32_t>(status);
    std::int32_t code = 0;
    if (status == STRAKE_STATUS_SURFACE_CALLBACK_FAILED ||
        status == STRAKE_STATUS_CURVE_CALLBACK_FAILED)
        code = strake_last_callback_code();
    std::string message = last_error_message();
    if (status == STRAKE_STATUS_ORDER_UNAVAILABLE) throw EvaluationError(status, message, code);
    if (n >= 1 && n <= 9) throw ArgumentError(status, message, code);
    if (n >= 10 && n <= 19) throw NurbsDataError(status, message, code);
    if (n >= 20 && n <= 29) throw EvaluationError(status, message, code);
    if (n >= 30 && n <= 39) throw CallbackError(status, message, code);
    if (n >= 40 && n <= 49) throw ToolPathError(status, message, code);
    if (n >= 50 && n <= 59) throw PlanningError(status, message, code);
    if (n >= 90 && n <= 99) throw InternalError(status, message, code);
    throw Error(status, message, code);
}

/** The library's version string (compare with STRAKE_VERSION_STRING of the header). */
inline std::string version() { return strake_version(); }

/* ---- Options (value-initialised: every field not set is 0, the header's default) ------ */

/** Projection options: the largest accepted distance (INFINITY: any), seams, grid, iterations. */
inline ProjectionOptions projection_options(double tolerance, bool periodic_u = false,
                                            bool periodic_v = false) {
    ProjectionOptions o{};
    o.tolerance = tolerance;
    o.periodic_u = periodic_u ? 1 : 0;
    o.periodic_v = periodic_v ? 1 : 0;
    return o;
}

/** Options of a geodesic trace (error per step in space) or of a geodesic between points. */
inline GeodesicOptions geodesic_options(double tolerance, std::size_t max_steps = 0) {
    GeodesicOptions o{};
    o.tolerance = tolerance;
    o.max_steps = max_steps;
    return o;
}

/** Options of an offset: its chord tolerance; the other fields at their defaults. */
inline OffsetOptions offset_options(double chord_tolerance) {
    OffsetOptions o{};
    o.chord_tolerance = chord_tolerance;
    return o;
}

/**
 * Options of a drive projection: the fit tolerance of its pieces and the hit tolerance of its
 * rays (host length unit); the other fields at their defaults.
 */
inline DriveOptions drive_options(double fit_tolerance, double hit_tolerance = 1e-9) {
    DriveOptions o{};
    o.projection.tolerance = hit_tolerance;
    o.fit_tolerance = fit_tolerance;
    return o;
}

/** Options of iso-scallop passes of a ball of `ball_radius` leaving `scallop_height`. */
inline PassOptions iso_scallop_options(double ball_radius, double scallop_height,
                                       double chord_tolerance,
                                       std::uint32_t advance = STRAKE_OFFSET_SIDE_LEFT,
                                       std::uint32_t tool_side = STRAKE_TOOL_SIDE_ALONG_NORMAL) {
    PassOptions o{};
    o.ball_radius = ball_radius;
    o.tool_side = tool_side;
    o.rule = STRAKE_STEP_RULE_ISO_SCALLOP;
    o.scallop_height = scallop_height;
    o.advance = advance;
    o.chord_tolerance = chord_tolerance;
    return o;
}

/** Options of passes of a ball of `ball_radius` a constant geodesic `step_over` apart. */
inline PassOptions constant_step_over_options(double ball_radius, double step_over,
                                              double chord_tolerance,
                                              std::uint32_t advance = STRAKE_OFFSET_SIDE_LEFT,
                                              std::uint32_t tool_side =
                                                  STRAKE_TOOL_SIDE_ALONG_NORMAL) {
    PassOptions o{};
    o.ball_radius = ball_radius;
    o.tool_side = tool_side;
    o.rule = STRAKE_STEP_RULE_CONSTANT_STEP_OVER;
    o.step_over = step_over;
    o.advance = advance;
    o.chord_tolerance = chord_tolerance;
    return o;
}

namespace detail {

/* The code a wrapped callback returns when the host's callable throws. */
constexpr std::int32_t thrown = -1;

template <class F>
std::int32_t guarded(F &&body) noexcept {
    try {
        body();
        return 0;
    } catch (const std::exception &e) {
        strake_callback_report(e.what());
    } catch (...) {
        strake_callback_report("a C++ exception that is not a std::exception");
    }
    return thrown;
}

struct Holder {
    virtual ~Holder() = default;
};

template <class F>
struct SurfaceFn final : Holder {
    explicit SurfaceFn(F f) : f(std::move(f)) {}
    F f;
    static std::int32_t call(void *user_data, double u, double v, std::int32_t order,
                             StrakeSurfaceJet *out) noexcept {
        auto *self = static_cast<SurfaceFn *>(user_data);
        return guarded([&] { self->f(u, v, static_cast<int>(order), *out); });
    }
};

template <class F>
struct CurveFn final : Holder {
    explicit CurveFn(F f) : f(std::move(f)) {}
    F f;
    static std::int32_t call(void *user_data, double t, StrakeCurveJet *out) noexcept {
        auto *self = static_cast<CurveFn *>(user_data);
        return guarded([&] { self->f(t, *out); });
    }
};

template <class F>
struct CurveHighFn final : Holder {
    explicit CurveHighFn(F f) : f(std::move(f)) {}
    F f;
    static std::int32_t call(void *user_data, double t, std::int32_t order,
                             StrakeCurveHighJet *out) noexcept {
        auto *self = static_cast<CurveHighFn *>(user_data);
        return guarded([&] { self->f(t, static_cast<int>(order), *out); });
    }
};

template <class F>
struct SurfaceBatchFn final : Holder {
    explicit SurfaceBatchFn(F f) : f(std::move(f)) {}
    F f;
    static std::int32_t call(void *user_data, const double *u, const double *v, std::size_t count,
                             std::int32_t order, StrakeSurfaceJet *out) noexcept {
        auto *self = static_cast<SurfaceBatchFn *>(user_data);
        return guarded([&] {
            self->f(View<const double>(u, count), View<const double>(v, count),
                    static_cast<int>(order), View<StrakeSurfaceJet>(out, count));
        });
    }
};

template <class F>
struct SurfaceHighFn final : Holder {
    explicit SurfaceHighFn(F f) : f(std::move(f)) {}
    F f;
    static std::int32_t call(void *user_data, double u, double v, std::int32_t order,
                             StrakeSurfaceHighJet *out) noexcept {
        auto *self = static_cast<SurfaceHighFn *>(user_data);
        return guarded([&] { self->f(u, v, static_cast<int>(order), *out); });
    }
};

/* A move-only owner of a C handle released by Free (NULL is never freed twice). */
template <class T, void (*Free)(T *)>
class Owned {
public:
    Owned() noexcept = default;
    explicit Owned(T *handle) noexcept : handle_(handle) {}
    Owned(Owned &&o) noexcept : handle_(std::exchange(o.handle_, nullptr)) {}
    Owned &operator=(Owned &&o) noexcept {
        if (this != &o) {
            Free(handle_);
            handle_ = std::exchange(o.handle_, nullptr);
        }
        return *this;
    }
    Owned(const Owned &) = delete;
    Owned &operator=(const Owned &) = delete;
    ~Owned() { Free(handle_); }
    /** The C handle (still owned by this object). */
    const T *get() const noexcept { return handle_; }
    explicit operator bool() const noexcept { return handle_ != nullptr; }

private:
    T *handle_ = nullptr;
};

}  // namespace detail

/** A surface strake holds: native NURBS or the host's callable. Move-only. */
class Surface {
public:
    Surface() noexcept = default;
    /** Takes ownership of a handle made through the C API (may be NULL). */
    explicit Surface(StrakeSurface *handle) noexcept : handle_(handle) {}
    Surface(Surface &&o) noexcept
        : handle_(std::exchange(o.handle_, nullptr)), holder_(std::move(o.holder_)) {}
    Surface &operator=(Surface &&o) noexcept {
        if (this != &o) {
            strake_surface_free(handle_);
            handle_ = std::exchange(o.handle_, nullptr);
            holder_ = std::move(o.holder_);
        }
        return *this;
    }
    Surface(const Surface &) = delete;
    Surface &operator=(const Surface &) = delete;
    ~Surface() { strake_surface_free(handle_); }

    /**
     * A NURBS surface (strake.h, StrakeNurbsSurfaceData: control point (i, j) at
     * points[3 (i count_v + j)]; weights empty for a non-rational surface).
     */
    static Surface nurbs(std::uint32_t degree_u, std::uint32_t degree_v, std::size_t count_u,
                         std::size_t count_v, View<const double> knots_u,
                         View<const double> knots_v, View<const double> points,
                         View<const double> weights = {}, bool flip_normal = false) {
        StrakeNurbsSurfaceData d{degree_u,       degree_v,      count_u,
                                 count_v,        knots_u.data(), knots_u.size(),
                                 knots_v.data(), knots_v.size(), points.data(),
                                 weights.empty() ? nullptr : weights.data()};
        StrakeSurface *h = nullptr;
        check(strake_surface_new_nurbs(&d, flip_normal ? 1 : 0, &h));
        return Surface(h);
    }

    /**
     * A surface evaluated by the host's callable f(u, v, order, jet): it fills jet.p and, for
     * order >= 1, jet.su, jet.sv, for order 2 jet.suu, jet.suv, jet.svv (strake zeroes the
     * jet first and asks for order 2 when it needs the frame). To fail, throw.
     */
    template <class F>
    static Surface from_function(F f, double u_min, double u_max, double v_min, double v_max,
                                 bool flip_normal = false) {
        using H = detail::SurfaceFn<std::decay_t<F>>;
        auto holder = std::make_unique<H>(std::move(f));
        StrakeSurface *h = nullptr;
        check(strake_surface_from_callback(&H::call, holder.get(), u_min, u_max, v_min, v_max,
                                           flip_normal ? 1 : 0, &h));
        Surface s(h);
        s.holder_ = std::move(holder);
        return s;
    }

    /**
     * A surface evaluated by the host's callable for many points per call
     * (strake_surface_from_batch_callback): f(u, v, order, out) with u, v and out Views of
     * the same size (blocks of up to 64 points of a path); it fills out[i] for (u[i], v[i])
     * as from_function does for one point. To fail, throw.
     */
    template <class F>
    static Surface from_batch_function(F f, double u_min, double u_max, double v_min,
                                       double v_max, bool flip_normal = false) {
        using H = detail::SurfaceBatchFn<std::decay_t<F>>;
        auto holder = std::make_unique<H>(std::move(f));
        StrakeSurface *h = nullptr;
        check(strake_surface_from_batch_callback(&H::call, holder.get(), u_min, u_max, v_min,
                                                 v_max, flip_normal ? 1 : 0, &h));
        Surface s(h);
        s.holder_ = std::move(holder);
        return s;
    }

    /**
     * A surface evaluated by the host's callable f(u, v, order, jet) with partials up to
     * `max_order` (3 or 4) in a SurfaceHighJet (strake_surface_from_high_callback), for the
     * calls that need them (invariant rates, the tool-centre path). To fail, throw.
     */
    template <class F>
    static Surface from_high_function(F f, std::uint32_t max_order, double u_min, double u_max,
                                      double v_min, double v_max, bool flip_normal = false) {
        using H = detail::SurfaceHighFn<std::decay_t<F>>;
        auto holder = std::make_unique<H>(std::move(f));
        StrakeSurface *h = nullptr;
        check(strake_surface_from_high_callback(&H::call, holder.get(), max_order, u_min, u_max,
                                                v_min, v_max, flip_normal ? 1 : 0, &h));
        Surface s(h);
        s.holder_ = std::move(holder);
        return s;
    }

    /**
     * Declares the interior knots of the host's NURBS in u and v (strictly ascending, inside
     * the domain), where arc length splits its quadrature (strake_surface_set_knot_lines);
     * empty lists go back to what the surface knows itself. Not thread-safe on this surface.
     */
    void set_knot_lines(View<const double> u_lines, View<const double> v_lines) {
        check(strake_surface_set_knot_lines(handle_, u_lines.empty() ? nullptr : u_lines.data(),
                                            u_lines.size(),
                                            v_lines.empty() ? nullptr : v_lines.data(),
                                            v_lines.size()));
    }

    /**
     * The point and partials to `order` (0, 1 or 2) at the pairs uv = (u0, v0, u1, v1, ...)
     * into out (one jet per pair; entries above `order` are zero).
     */
    void evaluate(View<const double> uv, int order, View<SurfaceJet> out) const {
        if (uv.size() % 2 != 0 || out.size() != uv.size() / 2)
            throw std::invalid_argument(
                "strake::Surface::evaluate: uv must hold (u, v) pairs and out one jet per pair");
        check(strake_surface_evaluate(handle_, uv.data(), out.size(),
                                      static_cast<std::uint32_t>(order), out.data()));
    }
    /** As above, into a new vector. */
    std::vector<SurfaceJet> evaluate(View<const double> uv, int order = 2) const {
        std::vector<SurfaceJet> out(uv.size() / 2);
        evaluate(uv, order, out);
        return out;
    }
    /** The jet at one (u, v). */
    SurfaceJet evaluate(double u, double v, int order = 2) const {
        const double uv[2] = {u, v};
        SurfaceJet j{};
        evaluate(uv, order, View<SurfaceJet>(&j, 1));
        return j;
    }

    /** The C handle (still owned by this object). */
    const StrakeSurface *get() const noexcept { return handle_; }
    explicit operator bool() const noexcept { return handle_ != nullptr; }

private:
    StrakeSurface *handle_ = nullptr;
    std::unique_ptr<detail::Holder> holder_;
};

/** A curve (u(t), v(t)) in a surface's parameter plane. Move-only. */
class Curve {
public:
    Curve() noexcept = default;
    /** Takes ownership of a handle made through the C API (may be NULL). */
    explicit Curve(StrakeCurve *handle) noexcept : handle_(handle) {}
    Curve(Curve &&o) noexcept
        : handle_(std::exchange(o.handle_, nullptr)), holder_(std::move(o.holder_)) {}
    Curve &operator=(Curve &&o) noexcept {
        if (this != &o) {
            strake_curve_free(handle_);
            handle_ = std::exchange(o.handle_, nullptr);
            holder_ = std::move(o.holder_);
        }
        return *this;
    }
    Curve(const Curve &) = delete;
    Curve &operator=(const Curve &) = delete;
    ~Curve() { strake_curve_free(handle_); }

    /** A NURBS curve of `degree`; uv_points = (u0, v0, u1, v1, ...); weights may be empty. */
    static Curve nurbs(std::uint32_t degree, View<const double> knots,
                       View<const double> uv_points, View<const double> weights = {}) {
        StrakeCurve *h = nullptr;
        check(strake_curve_new_nurbs(degree, knots.data(), knots.size(), uv_points.data(),
                                     uv_points.size() / 2,
                                     weights.empty() ? nullptr : weights.data(), &h));
        return Curve(h);
    }

    /** The straight line from (u0, v0) at t = 0 to (u1, v1) at t = 1. */
    static Curve line(double u0, double v0, double u1, double v1) {
        const double knots[] = {0, 0, 1, 1}, uv[] = {u0, v0, u1, v1};
        return nurbs(1, knots, uv);
    }

    /**
     * The interpolating curve through uv_points (u0, v0, u1, v1, ...) of `degree` (3: C2
     * cubic), parametrization STRAKE_PARAMETRIZATION_CHORD_LENGTH or _CENTRIPETAL.
     */
    static Curve through_uv_points(View<const double> uv_points, std::uint32_t degree = 3,
                                   std::uint32_t parametrization =
                                       STRAKE_PARAMETRIZATION_CHORD_LENGTH) {
        StrakeCurve *h = nullptr;
        check(strake_curve_through_uv_points(uv_points.data(), uv_points.size() / 2, degree,
                                             parametrization, nullptr, nullptr, &h));
        return Curve(h);
    }

    /**
     * As above with the end derivatives (du/dt, dv/dt) the curve must have at t = 0 and t = 1.
     */
    static Curve through_uv_points(View<const double> uv_points,
                                   const std::array<double, 2> &start_derivative,
                                   const std::array<double, 2> &end_derivative,
                                   std::uint32_t degree = 3,
                                   std::uint32_t parametrization =
                                       STRAKE_PARAMETRIZATION_CHORD_LENGTH) {
        StrakeCurve *h = nullptr;
        check(strake_curve_through_uv_points(uv_points.data(), uv_points.size() / 2, degree,
                                             parametrization, start_derivative.data(),
                                             end_derivative.data(), &h));
        return Curve(h);
    }

    /**
     * The curve on `surface` through points in space (x0, y0, z0, x1, ...) in path order,
     * projected (options: projection_options()) and interpolated in the parameter plane
     * (strake_curve_through_space_points). When `projections` is not NULL it receives each
     * point's projection.
     */
    static Curve through_space_points(const Surface &surface, View<const double> points,
                                      const ProjectionOptions &options, std::uint32_t degree = 3,
                                      std::uint32_t parametrization =
                                          STRAKE_PARAMETRIZATION_CHORD_LENGTH,
                                      std::vector<Projection> *projections = nullptr) {
        if (points.size() % 3 != 0)
            throw std::invalid_argument(
                "strake::Curve::through_space_points: points must hold (x, y, z) triples");
        std::vector<Projection> proj(projections ? points.size() / 3 : 0);
        StrakeCurve *h = nullptr;
        check(strake_curve_through_space_points(surface.get(), points.data(), points.size() / 3,
                                                &options, degree, parametrization,
                                                projections ? proj.data() : nullptr, &h));
        if (projections) *projections = std::move(proj);
        return Curve(h);
    }

    /**
     * A NURBS curve in space (control points x, y, z each; weights may be empty) projected
     * onto `surface` and fitted in its parameter plane to `fit_tolerance`
     * (strake_curve_project_nurbs).
     */
    static Curve project_nurbs(const Surface &surface, std::uint32_t degree,
                               View<const double> knots, View<const double> points,
                               View<const double> weights, const ProjectionOptions &options,
                               double fit_tolerance) {
        StrakeCurve *h = nullptr;
        check(strake_curve_project_nurbs(surface.get(), degree, knots.data(), knots.size(),
                                         points.data(), points.size() / 3,
                                         weights.empty() ? nullptr : weights.data(), &options,
                                         fit_tolerance, &h));
        return Curve(h);
    }

    /**
     * An Archimedean spiral in a plane (u, v read as x, y) about `centre`:
     * r = r_start + pitch theta / (2 pi), theta the parameter (strake_curve_new_spiral).
     */
    static Curve spiral(const std::array<double, 2> &centre, double r_start, double r_end,
                        double pitch) {
        StrakeCurve *h = nullptr;
        check(strake_curve_new_spiral(centre.data(), r_start, r_end, pitch, &h));
        return Curve(h);
    }

    /**
     * A curve evaluated by the host's callable f(t, jet) over [t_min, t_max]: it fills jet.u,
     * jet.v and their first and second derivatives in t. To fail, throw.
     */
    template <class F>
    static Curve from_function(F f, double t_min, double t_max) {
        using H = detail::CurveFn<std::decay_t<F>>;
        auto holder = std::make_unique<H>(std::move(f));
        StrakeCurve *h = nullptr;
        check(strake_curve_from_callback(&H::call, holder.get(), t_min, t_max, &h));
        Curve c(h);
        c.holder_ = std::move(holder);
        return c;
    }

    /**
     * A curve evaluated by the host's callable f(t, order, jet) over [t_min, t_max] with
     * derivatives up to `max_order` (3 or 4) in a CurveHighJet
     * (strake_curve_from_high_callback): fill the entries up to `order` (u, v; du, dv; ddu,
     * ddv; d3u, d3v; d4u, d4v). The calls that need the curve's third or fourth derivatives
     * (invariant rates, the tool-centre path) then work. To fail, throw.
     */
    template <class F>
    static Curve from_high_function(F f, std::uint32_t max_order, double t_min, double t_max) {
        using H = detail::CurveHighFn<std::decay_t<F>>;
        auto holder = std::make_unique<H>(std::move(f));
        StrakeCurve *h = nullptr;
        check(strake_curve_from_high_callback(&H::call, holder.get(), max_order, t_min, t_max,
                                              &h));
        Curve c(h);
        c.holder_ = std::move(holder);
        return c;
    }

    /** The C handle (still owned by this object). */
    const StrakeCurve *get() const noexcept { return handle_; }
    explicit operator bool() const noexcept { return handle_ != nullptr; }

private:
    StrakeCurve *handle_ = nullptr;
    std::unique_ptr<detail::Holder> holder_;
};

/* ---- Frames --------------------------------------------------------------------------- */

/** The frame of `curve` on `surface` at t. */
inline Frame frame_at(const Surface &surface, const Curve &curve, double t) {
    Frame f{};
    check(strake_frame_at(surface.get(), curve.get(), t, &f));
    return f;
}

/** The frames at the parameters ts into out (out.size() == ts.size()). */
inline void frames_at(const Surface &surface, const Curve &curve, View<const double> ts,
                      View<Frame> out) {
    if (out.size() != ts.size())
        throw std::invalid_argument("strake::frames_at: out must hold one frame per t");
    check(strake_frames_at(surface.get(), curve.get(), ts.data(), ts.size(), out.data()));
}

/** The frames at the parameters ts. */
inline std::vector<Frame> frames_at(const Surface &surface, const Curve &curve,
                                    View<const double> ts) {
    std::vector<Frame> out(ts.size());
    frames_at(surface, curve, ts, out);
    return out;
}

/** As frames_at, on `threads` threads (the calling thread and threads - 1 more). */
inline void frames_at_parallel(const Surface &surface, const Curve &curve,
                               View<const double> ts, unsigned threads, View<Frame> out) {
    if (out.size() != ts.size())
        throw std::invalid_argument("strake::frames_at_parallel: out must hold one frame per t");
    check(strake_frames_at_parallel(surface.get(), curve.get(), ts.data(), ts.size(), threads,
                                    out.data()));
}

/** The frames at `count` evenly spaced parameters over the curve's domain (ends included). */
inline std::vector<Frame> frames_even(const Surface &surface, const Curve &curve,
                                      std::size_t count) {
    std::vector<Frame> out(count);
    check(strake_frames_even(surface.get(), curve.get(), count, out.data()));
    return out;
}

/* ---- Sampling ------------------------------------------------------------------------- */

/** The frames at ts, each with its arc length from the start of the curve's domain. */
inline std::vector<Sample> samples_at(const Surface &surface, const Curve &curve,
                                      View<const double> ts, double arc_tolerance = 1e-10) {
    std::vector<Sample> out(ts.size());
    check(strake_samples_at(surface.get(), curve.get(), ts.data(), ts.size(), arc_tolerance,
                            out.data()));
    return out;
}

namespace detail {
/* Runs a buffer-filling call (buf, capacity, count): asks the size, then fills. */
template <class T, class Call>
std::vector<T> fill(Call call) {
    std::size_t count = 0;
    StrakeStatus st = call(static_cast<T *>(nullptr), std::size_t{0}, &count);
    if (st != STRAKE_STATUS_BUFFER_TOO_SMALL) check(st);
    std::vector<T> out(count);
    if (count > 0) check(call(out.data(), out.size(), &count));
    out.resize(count);
    return out;
}
}  // namespace detail

/** n samples evenly spaced in t, each with its arc length. */
inline std::vector<Sample> sample_even_t(const Surface &surface, const Curve &curve,
                                         std::size_t n, double arc_tolerance = 1e-10) {
    return detail::fill<Sample>([&](Sample *buf, std::size_t cap, std::size_t *count) {
        return strake_sample_even_t(surface.get(), curve.get(), n, arc_tolerance, buf, cap,
                                    count);
    });
}

/** n samples evenly spaced in arc length. */
inline std::vector<Sample> sample_even_arc(const Surface &surface, const Curve &curve,
                                           std::size_t n, double arc_tolerance = 1e-10) {
    return detail::fill<Sample>([&](Sample *buf, std::size_t cap, std::size_t *count) {
        return strake_sample_even_arc(surface.get(), curve.get(), n, arc_tolerance, buf, cap,
                                      count);
    });
}

/** Samples spaced so that the chord leaves the path by at most chord_tolerance. */
inline std::vector<Sample> sample_chordal(const Surface &surface, const Curve &curve,
                                          double chord_tolerance, double max_step,
                                          double arc_tolerance = 1e-10) {
    return detail::fill<Sample>([&](Sample *buf, std::size_t cap, std::size_t *count) {
        return strake_sample_chordal(surface.get(), curve.get(), chord_tolerance, max_step,
                                     arc_tolerance, buf, cap, count);
    });
}

/** Arc length between t0 and t1 (signed). */
inline double arc_length(const Surface &surface, const Curve &curve, double t0, double t1,
                         double rel_tol = 1e-10) {
    double s = 0;
    check(strake_arc_length(surface.get(), curve.get(), t0, t1, rel_tol, &s));
    return s;
}

/* ---- Checks --------------------------------------------------------------------------- */

/** Local gouging of `cutter` with the tool on `tool_side` (STRAKE_TOOL_SIDE_...). */
inline GougeState check_gouge(const Frame &f, std::uint32_t tool_side, const Cutter &cutter,
                              const ToolAngles &angles) {
    GougeState g{};
    check(strake_check_gouge(&f, tool_side, &cutter, &angles, &g));
    return g;
}

/** Scallop height between passes step_over apart. */
inline Scallop check_scallop(const Frame &f, std::uint32_t tool_side, double cutter_radius,
                             double step_over) {
    Scallop s{};
    check(strake_check_scallop(&f, tool_side, cutter_radius, step_over, &s));
    return s;
}

/** The largest step-over for a scallop height. */
inline StepOver check_step_over(const Frame &f, std::uint32_t tool_side, double cutter_radius,
                                double scallop_height) {
    StepOver s{};
    check(strake_check_step_over(&f, tool_side, cutter_radius, scallop_height, &s));
    return s;
}

/** The highest feed at the sample. */
inline double check_feed(const Frame &f, const FeedLimits &limits) {
    double v = 0;
    check(strake_check_feed(&f, &limits, &v));
    return v;
}

/** Steering and twist of a fibre course. */
inline FibreState check_fibre(const Frame &f, const FibreLimits &limits) {
    FibreState s{};
    check(strake_check_fibre(&f, &limits, &s));
    return s;
}

/** The tool axis for lead and tilt angles. */
inline ToolAxis tool_axis(const Frame &f, std::uint32_t tool_side, const ToolAngles &angles) {
    ToolAxis a{};
    check(strake_tool_axis(&f, tool_side, &angles, &a));
    return a;
}

/** Where values (one per sample) are smallest and largest. */
inline Extremes path_extremes(View<const Sample> samples, View<const double> values) {
    if (samples.size() != values.size())
        throw std::invalid_argument("strake::path_extremes: one value per sample");
    Extremes e{};
    check(strake_path_extremes(samples.data(), values.data(), samples.size(), &e));
    return e;
}

/** Every interval where values (one per sample) exceed limit. */
inline std::vector<Violation> path_violations(View<const Sample> samples,
                                              View<const double> values, double limit) {
    if (samples.size() != values.size())
        throw std::invalid_argument("strake::path_violations: one value per sample");
    return detail::fill<Violation>([&](Violation *buf, std::size_t cap, std::size_t *count) {
        return strake_path_violations(samples.data(), values.data(), samples.size(), limit, buf,
                                      cap, count);
    });
}

/* ---- Checks along a whole path (one result per sample, one call) --------------------- */

namespace detail {
template <class R>
void same_size(View<const Sample> samples, View<R> out, const char *what) {
    if (out.size() != samples.size())
        throw std::invalid_argument(std::string("strake::") + what +
                                    ": out must hold one result per sample");
}
}  // namespace detail

/** check_gouge at every sample, into out (one result per sample). */
inline void check_gouge_path(View<const Sample> samples, std::uint32_t tool_side,
                             const Cutter &cutter, const ToolAngles &angles,
                             View<GougeState> out) {
    detail::same_size(samples, out, "check_gouge_path");
    check(strake_check_gouge_path(samples.data(), samples.size(), tool_side, &cutter, &angles,
                                  out.data()));
}
inline std::vector<GougeState> check_gouge_path(View<const Sample> samples,
                                                std::uint32_t tool_side, const Cutter &cutter,
                                                const ToolAngles &angles) {
    std::vector<GougeState> out(samples.size());
    check_gouge_path(samples, tool_side, cutter, angles, out);
    return out;
}

/** Rear (heel) gouging of a flat or toroidal cutter at every sample. */
inline void check_rear_gouge_path(View<const Sample> samples, std::uint32_t tool_side,
                                  const Cutter &cutter, const ToolAngles &angles,
                                  View<RearGouge> out) {
    detail::same_size(samples, out, "check_rear_gouge_path");
    check(strake_check_rear_gouge_path(samples.data(), samples.size(), tool_side, &cutter,
                                       &angles, out.data()));
}
inline std::vector<RearGouge> check_rear_gouge_path(View<const Sample> samples,
                                                    std::uint32_t tool_side,
                                                    const Cutter &cutter,
                                                    const ToolAngles &angles) {
    std::vector<RearGouge> out(samples.size());
    check_rear_gouge_path(samples, tool_side, cutter, angles, out);
    return out;
}

/** check_scallop at every sample. */
inline void check_scallop_path(View<const Sample> samples, std::uint32_t tool_side,
                               double cutter_radius, double step_over, View<Scallop> out) {
    detail::same_size(samples, out, "check_scallop_path");
    check(strake_check_scallop_path(samples.data(), samples.size(), tool_side, cutter_radius,
                                    step_over, out.data()));
}
inline std::vector<Scallop> check_scallop_path(View<const Sample> samples,
                                               std::uint32_t tool_side, double cutter_radius,
                                               double step_over) {
    std::vector<Scallop> out(samples.size());
    check_scallop_path(samples, tool_side, cutter_radius, step_over, out);
    return out;
}

/** The largest step-over for a scallop height, for a cutter, at every sample. */
inline void check_step_over_cutter_path(View<const Sample> samples, std::uint32_t tool_side,
                                        const Cutter &cutter, const ToolAngles &angles,
                                        double scallop_height, View<CutterStepOver> out) {
    detail::same_size(samples, out, "check_step_over_cutter_path");
    check(strake_check_step_over_cutter_path(samples.data(), samples.size(), tool_side,
                                             &cutter, &angles, scallop_height, out.data()));
}
inline std::vector<CutterStepOver> check_step_over_cutter_path(View<const Sample> samples,
                                                               std::uint32_t tool_side,
                                                               const Cutter &cutter,
                                                               const ToolAngles &angles,
                                                               double scallop_height) {
    std::vector<CutterStepOver> out(samples.size());
    check_step_over_cutter_path(samples, tool_side, cutter, angles, scallop_height, out);
    return out;
}

/** The highest feed at every sample. */
inline void check_feed_path(View<const Sample> samples, const FeedLimits &limits,
                            View<double> out) {
    detail::same_size(samples, out, "check_feed_path");
    check(strake_check_feed_path(samples.data(), samples.size(), &limits, out.data()));
}
inline std::vector<double> check_feed_path(View<const Sample> samples,
                                           const FeedLimits &limits) {
    std::vector<double> out(samples.size());
    check_feed_path(samples, limits, out);
    return out;
}

/** Steering and twist of a fibre course at every sample. */
inline void check_fibre_path(View<const Sample> samples, const FibreLimits &limits,
                             View<FibreState> out) {
    detail::same_size(samples, out, "check_fibre_path");
    check(strake_check_fibre_path(samples.data(), samples.size(), &limits, out.data()));
}
inline std::vector<FibreState> check_fibre_path(View<const Sample> samples,
                                                const FibreLimits &limits) {
    std::vector<FibreState> out(samples.size());
    check_fibre_path(samples, limits, out);
    return out;
}

/** The strain of a tow's two edges at every sample. */
inline void check_tow_edges_path(View<const Sample> samples, double tow_width,
                                 View<TowEdges> out) {
    detail::same_size(samples, out, "check_tow_edges_path");
    check(strake_check_tow_edges_path(samples.data(), samples.size(), tow_width, out.data()));
}
inline std::vector<TowEdges> check_tow_edges_path(View<const Sample> samples, double tow_width) {
    std::vector<TowEdges> out(samples.size());
    check_tow_edges_path(samples, tow_width, out);
    return out;
}

/** The tool axis at every sample. */
inline void tool_axis_path(View<const Sample> samples, std::uint32_t tool_side,
                           const ToolAngles &angles, View<ToolAxis> out) {
    detail::same_size(samples, out, "tool_axis_path");
    check(strake_tool_axis_path(samples.data(), samples.size(), tool_side, &angles, out.data()));
}
inline std::vector<ToolAxis> tool_axis_path(View<const Sample> samples, std::uint32_t tool_side,
                                            const ToolAngles &angles) {
    std::vector<ToolAxis> out(samples.size());
    tool_axis_path(samples, tool_side, angles, out);
    return out;
}

/** The cutter's radii across and along the path for its axis inclination. */
inline CutterRadii cutter_radii(const Cutter &cutter, const ToolAngles &angles) {
    CutterRadii r{};
    check(strake_cutter_radii(&cutter, &angles, &r));
    return r;
}

/** The step-over for a scallop height with a cutter at its axis, limited by its cut width. */
inline CutterStepOver check_step_over_cutter(const Frame &f, std::uint32_t tool_side,
                                             const Cutter &cutter, const ToolAngles &angles,
                                             double scallop_height) {
    CutterStepOver s{};
    check(strake_check_step_over_cutter(&f, tool_side, &cutter, &angles, scallop_height, &s));
    return s;
}

/** Rear (heel) gouging of a flat or toroidal cutter at the sample. */
inline RearGouge check_rear_gouge(const Frame &f, std::uint32_t tool_side, const Cutter &cutter,
                                  const ToolAngles &angles) {
    RearGouge r{};
    check(strake_check_rear_gouge(&f, tool_side, &cutter, &angles, &r));
    return r;
}

/** The strain of the two edges of a tow of `tow_width` at the sample. */
inline TowEdges check_tow_edges(const Frame &f, double tow_width) {
    TowEdges e{};
    check(strake_check_tow_edges(&f, tow_width, &e));
    return e;
}

/* ---- Surfaces and frames without a path ---------------------------------------------- */

/** Projects points in space (x, y, z each, in order) onto the surface, into out. */
inline void project_points(const Surface &surface, View<const double> points,
                           const ProjectionOptions &options, View<Projection> out) {
    if (points.size() % 3 != 0 || out.size() != points.size() / 3)
        throw std::invalid_argument(
            "strake::project_points: points must hold (x, y, z) triples and out one per point");
    check(strake_surface_project_points(surface.get(), points.data(), out.size(), &options,
                                        out.data()));
}
inline std::vector<Projection> project_points(const Surface &surface, View<const double> points,
                                              const ProjectionOptions &options) {
    std::vector<Projection> out(points.size() / 3);
    project_points(surface, points, options, out);
    return out;
}

/** The frame from jets the host evaluated itself (no handles). */
inline Frame frame_from_jets(const SurfaceJet &surface_jet, const CurveJet &curve_jet,
                             const ParamScales &scales, bool flip_normal = false) {
    Frame f{};
    check(strake_frame_from_jets(&surface_jet, &curve_jet, flip_normal ? 1 : 0, &scales, &f));
    return f;
}

/** The crease flags (OR of STRAKE_KNOT_LINE_FLAG_... bits, 0: smooth) at ts, into out. */
inline void knot_line_flags(const Surface &surface, const Curve &curve, View<const double> ts,
                            View<std::uint32_t> out) {
    if (out.size() != ts.size())
        throw std::invalid_argument("strake::knot_line_flags: out must hold one flag per t");
    check(strake_knot_line_flags(surface.get(), curve.get(), ts.data(), ts.size(), out.data()));
}
inline std::vector<std::uint32_t> knot_line_flags(const Surface &surface, const Curve &curve,
                                                  View<const double> ts) {
    std::vector<std::uint32_t> out(ts.size());
    knot_line_flags(surface, curve, ts, out);
    return out;
}

/** Samples spaced so that the chords of the tool-centre path stay within chord_tolerance. */
inline std::vector<Sample> sample_chordal_centre(const Surface &surface, const Curve &curve,
                                                 double chord_tolerance, double max_step,
                                                 std::uint32_t tool_side, const Cutter &cutter,
                                                 const ToolAngles &angles,
                                                 double arc_tolerance = 1e-10) {
    return detail::fill<Sample>([&](Sample *buf, std::size_t cap, std::size_t *count) {
        return strake_sample_chordal_centre(surface.get(), curve.get(), chord_tolerance,
                                            max_step, arc_tolerance, tool_side, &cutter, &angles,
                                            buf, cap, count);
    });
}

/* ---- Tool-centre path ----------------------------------------------------------------- */

/** A frame and the rates of change of its invariants along arc length. */
struct FrameRates {
    Frame frame;
    InvariantRates rates;
};

/** The rates of change of the invariants at t, with the frame there (third order). */
inline FrameRates invariant_rates_at(const Surface &surface, const Curve &curve, double t) {
    FrameRates r{};
    check(strake_invariant_rates_at(surface.get(), curve.get(), t, &r.frame, &r.rates));
    return r;
}

/** The frames and rates at every t, into frames and rates (one each per t). */
inline void invariant_rates_path(const Surface &surface, const Curve &curve,
                                 View<const double> ts, View<Frame> frames,
                                 View<InvariantRates> rates) {
    if (frames.size() != ts.size() || rates.size() != ts.size())
        throw std::invalid_argument(
            "strake::invariant_rates_path: frames and rates must hold one entry per t");
    check(strake_invariant_rates_path(surface.get(), curve.get(), ts.data(), ts.size(),
                                      frames.data(), rates.data()));
}
/** Frames and the rates of change of their invariants along a path (one each per t). */
struct PathRates {
    std::vector<Frame> frames;
    std::vector<InvariantRates> rates;
};
inline PathRates invariant_rates_path(const Surface &surface, const Curve &curve,
                                      View<const double> ts) {
    PathRates r{std::vector<Frame>(ts.size()), std::vector<InvariantRates>(ts.size())};
    invariant_rates_path(surface, curve, ts, r.frames, r.rates);
    return r;
}

/** The tool-centre path at t for the cutter at its axis, from derivatives of `order` 3 or 4. */
inline CentrePoint centre_point_at(const Surface &surface, const Curve &curve, double t,
                                   std::uint32_t tool_side, const Cutter &cutter,
                                   const ToolAngles &angles, std::uint32_t order = 4) {
    CentrePoint p{};
    check(strake_centre_point_at(surface.get(), curve.get(), t, tool_side, &cutter, &angles,
                                 order, &p));
    return p;
}

/** The tool-centre path at every t, into out (one point per t). */
inline void centre_path_at(const Surface &surface, const Curve &curve, View<const double> ts,
                           std::uint32_t tool_side, const Cutter &cutter,
                           const ToolAngles &angles, std::uint32_t order,
                           View<CentrePoint> out) {
    if (out.size() != ts.size())
        throw std::invalid_argument("strake::centre_path_at: out must hold one point per t");
    check(strake_centre_path_at(surface.get(), curve.get(), ts.data(), ts.size(), tool_side,
                                &cutter, &angles, order, out.data()));
}
inline std::vector<CentrePoint> centre_path_at(const Surface &surface, const Curve &curve,
                                               View<const double> ts, std::uint32_t tool_side,
                                               const Cutter &cutter, const ToolAngles &angles,
                                               std::uint32_t order = 4) {
    std::vector<CentrePoint> out(ts.size());
    centre_path_at(surface, curve, ts, tool_side, cutter, angles, order, out);
    return out;
}

/** The feed allowed at a centre-path point and which bound gives it. */
inline CentreFeed centre_feed(const CentrePoint &point, const CentreFeedLimits &limits) {
    CentreFeed f{};
    check(strake_centre_feed(&point, &limits, &f));
    return f;
}

/** centre_feed at every point, into out (one per point). */
inline void centre_feed_path(View<const CentrePoint> points, const CentreFeedLimits &limits,
                             View<CentreFeed> out) {
    if (out.size() != points.size())
        throw std::invalid_argument("strake::centre_feed_path: out must hold one feed per point");
    check(strake_centre_feed_path(points.data(), points.size(), &limits, out.data()));
}
inline std::vector<CentreFeed> centre_feed_path(View<const CentrePoint> points,
                                                const CentreFeedLimits &limits) {
    std::vector<CentreFeed> out(points.size());
    centre_feed_path(points, limits, out);
    return out;
}

/* ---- Geodesics ------------------------------------------------------------------------ */

/** A traced geodesic or course: the curve (t = arc length) and why the trace ended. */
struct Geodesic {
    Curve curve;
    GeodesicInfo info;
};

/**
 * The geodesic from (u, v) for arc length `length`; `direction_kind` a
 * STRAKE_DIRECTION_KIND_... value with 1 (angle), 3 (space) or 2 ((du, dv)) doubles.
 */
inline Geodesic geodesic_trace(const Surface &surface, double u, double v,
                               std::uint32_t direction_kind, View<const double> direction,
                               double length, const GeodesicOptions &options) {
    const std::size_t need = direction_kind == STRAKE_DIRECTION_KIND_ANGLE       ? 1
                             : direction_kind == STRAKE_DIRECTION_KIND_PARAMETER ? 2
                             : direction_kind == STRAKE_DIRECTION_KIND_SPACE     ? 3
                                                                                 : 0;
    if (need != 0 && direction.size() != need)
        throw std::invalid_argument(
            "strake::geodesic_trace: direction must hold 1 (angle), 2 (du, dv) or 3 (space) "
            "doubles for its kind");
    Geodesic g{};
    StrakeCurve *h = nullptr;
    check(strake_geodesic_trace(surface.get(), u, v, direction_kind, direction.data(), length,
                                &options, &h, &g.info));
    g.curve = Curve(h);
    return g;
}

/** The geodesic from (u, v) leaving at `angle` from Su/|Su| toward N x Su/|Su|. */
inline Geodesic geodesic_trace(const Surface &surface, double u, double v, double angle,
                               double length, const GeodesicOptions &options) {
    return geodesic_trace(surface, u, v, STRAKE_DIRECTION_KIND_ANGLE, View<const double>(&angle, 1),
                          length, options);
}

/** The geodesic between two points of the parameter plane and its length. */
struct GeodesicPath {
    Curve curve;
    double distance;
};

/** The geodesic from (u0, v0) to (u1, v1) by shooting, and the geodesic distance. */
inline GeodesicPath geodesic_between(const Surface &surface, double u0, double v0, double u1,
                                     double v1, const GeodesicOptions &options) {
    GeodesicPath g{};
    StrakeCurve *h = nullptr;
    check(strake_geodesic_between(surface.get(), u0, v0, u1, v1, &options, &h, &g.distance));
    g.curve = Curve(h);
    return g;
}

/* ---- Offsets and courses -------------------------------------------------------------- */

/** An offset of a path on a surface (geodesic parallel): pieces, points, exits, loops. */
class Offset : public detail::Owned<StrakeOffset, strake_offset_free> {
public:
    using Owned::Owned;

    /** The offset of `curve` at the constant geodesic distance `distance` to `side`. */
    static Offset make(const Surface &surface, const Curve &curve, std::uint32_t side,
                       double distance, const OffsetOptions &options) {
        StrakeOffset *h = nullptr;
        check(strake_offset_new(surface.get(), curve.get(), side, nullptr, &distance, 1,
                                &options, &h));
        return Offset(h);
    }
    /** The offset at distances given at strictly increasing path parameters. */
    static Offset make(const Surface &surface, const Curve &curve, std::uint32_t side,
                       View<const double> distance_t, View<const double> distances,
                       const OffsetOptions &options) {
        if (distance_t.size() != distances.size())
            throw std::invalid_argument("strake::Offset::make: one distance per parameter");
        StrakeOffset *h = nullptr;
        check(strake_offset_new(surface.get(), curve.get(), side, distance_t.data(),
                                distances.data(), distances.size(), &options, &h));
        return Offset(h);
    }

    /** Counts and figures. */
    OffsetSummary summary() const {
        OffsetSummary s{};
        check(strake_offset_summary(get(), &s));
        return s;
    }
    /** Piece `index` as a curve in (u, v), t in [0, 1] (it outlives the offset). */
    Curve piece_curve(std::size_t index) const {
        StrakeCurve *h = nullptr;
        check(strake_offset_piece_curve(get(), index, &h));
        return Curve(h);
    }
    /** The points of piece `index`, in path order. */
    std::vector<OffsetPoint> piece_points(std::size_t index) const {
        return detail::fill<OffsetPoint>([&](OffsetPoint *b, std::size_t cap, std::size_t *n) {
            return strake_offset_piece_points(get(), index, b, cap, n);
        });
    }
    /** The path intervals whose offset leaves the surface. */
    std::vector<PathInterval> exits() const {
        return detail::fill<PathInterval>([&](PathInterval *b, std::size_t cap, std::size_t *n) {
            return strake_offset_exits(get(), b, cap, n);
        });
    }
    /** The path intervals whose offset looped and was cut. */
    std::vector<PathInterval> loops() const {
        return detail::fill<PathInterval>([&](PathInterval *b, std::size_t cap, std::size_t *n) {
            return strake_offset_loops(get(), b, cap, n);
        });
    }
};

/** The fibre course from (u, v) at the fixed `angle` to the projected `axis`. */
inline Geodesic course_fixed_angle(const Surface &surface, double u, double v,
                                   const std::array<double, 3> &axis, double angle,
                                   double length, const GeodesicOptions &options) {
    Geodesic g{};
    StrakeCurve *h = nullptr;
    check(strake_course_fixed_angle(surface.get(), u, v, axis.data(), angle, length, &options,
                                    &h, &g.info));
    g.curve = Curve(h);
    return g;
}

/** The adjacent course one band `band_width` to `side` of `course`, as an offset. */
inline Offset course_adjacent(const Surface &surface, const Curve &course, double band_width,
                              std::uint32_t side, const OffsetOptions &options) {
    StrakeOffset *h = nullptr;
    check(strake_course_adjacent(surface.get(), course.get(), band_width, side, &options, &h));
    return Offset(h);
}

/** Gaps and overlaps between neighbouring courses' bands, and the unmatched samples. */
struct CourseGaps {
    std::vector<CourseGap> gaps;
    std::size_t unmatched;
};

/** The gaps and overlaps wider than `tolerance` between the bands on courses a and b. */
inline CourseGaps course_gaps(const Surface &surface, const Curve &a, const Curve &b,
                              std::uint32_t side, double band_width, std::size_t samples,
                              double tolerance, const GeodesicOptions &options) {
    CourseGaps r{};
    r.gaps = detail::fill<CourseGap>([&](CourseGap *buf, std::size_t cap, std::size_t *n) {
        return strake_course_gaps(surface.get(), a.get(), b.get(), side, band_width, samples,
                                  tolerance, &options, buf, cap, n, &r.unmatched);
    });
    return r;
}

/** Steering and twist along a course at `samples` even parameters, summarised. */
inline CourseCheck course_check(const Surface &surface, const Curve &course,
                                const FibreLimits &limits, std::size_t samples) {
    CourseCheck c{};
    check(strake_course_check(surface.get(), course.get(), &limits, samples, &c));
    return c;
}

/* ---- Drive patterns and passes --------------------------------------------------------- */

/** A piece of a projected pattern: its curve and the pattern parameters it spans. */
struct DrivePiece {
    Curve curve;
    double pattern_start;
    double pattern_end;
};

/** A planar pattern projected onto a surface: pieces and intervals (misses, folds, ...). */
class DriveResult : public detail::Owned<StrakeDriveResult, strake_drive_result_free> {
public:
    using Owned::Owned;

    /** The number of pieces (0 when every ray misses). */
    std::size_t piece_count() const {
        std::size_t n = 0;
        check(strake_drive_result_piece_count(get(), &n));
        return n;
    }
    /** Piece `index` (its curve outlives the result). */
    DrivePiece piece(std::size_t index) const {
        double range[2] = {0, 0};
        StrakeCurve *h = nullptr;
        check(strake_drive_result_piece(get(), index, range, &h));
        return DrivePiece{Curve(h), range[0], range[1]};
    }
    /** The intervals of misses, folds and multiple hits, ordered by start. */
    std::vector<PatternInterval> intervals() const {
        return detail::fill<PatternInterval>(
            [&](PatternInterval *b, std::size_t cap, std::size_t *n) {
                return strake_drive_result_intervals(get(), b, cap, n);
            });
    }
};

/** Projects the planar curve `pattern` onto the surface along `direction`. */
inline DriveResult drive_project(const Surface &surface, const DrivePlane &plane,
                                 const std::array<double, 3> &direction, const Curve &pattern,
                                 const DriveOptions &options) {
    StrakeDriveResult *h = nullptr;
    check(strake_drive_project(surface.get(), &plane, direction.data(), pattern.get(), &options,
                               &h));
    return DriveResult(h);
}

/** A plan of passes across a surface. */
class PassPlan : public detail::Owned<StrakePassPlan, strake_pass_plan_free> {
public:
    using Owned::Owned;

    /** The totals. */
    PassSummary summary() const {
        PassSummary s{};
        check(strake_pass_plan_summary(get(), &s));
        return s;
    }
    /** One entry per pass after the first, in plan order. */
    std::vector<PassInfo> passes() const {
        return detail::fill<PassInfo>([&](PassInfo *b, std::size_t cap, std::size_t *n) {
            return strake_pass_plan_passes(get(), b, cap, n);
        });
    }
    /** Pass `index` after the first as a curve in (u, v) (it outlives the plan). */
    Curve curve(std::size_t index) const {
        StrakeCurve *h = nullptr;
        check(strake_pass_plan_curve(get(), index, &h));
        return Curve(h);
    }
};

/** Plans passes across the surface from the pass `first` (iso_scallop_options, ...). */
inline PassPlan plan_passes(const Surface &surface, const Curve &first,
                            const PassOptions &options) {
    StrakePassPlan *h = nullptr;
    check(strake_plan_passes(surface.get(), first.get(), &options, &h));
    return PassPlan(h);
}

}  // namespace strake

#endif /* STRAKE_HPP */

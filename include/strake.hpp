/*
 * strake.hpp: a header-only C++17 wrapper over the C ABI of strake.h.
 *
 * - Handles (strake::Surface, strake::Curve) are move-only and free themselves.
 * - Every failing call throws strake::Error, carrying the StrakeStatus, strake's message
 *   (which argument, index, value or sample was wrong) and, for a failed host callback, the
 *   callback's code.
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

/** Throws strake::Error unless `status` is STRAKE_STATUS_OK. */
inline void check(StrakeStatus status) {
    if (status == STRAKE_STATUS_OK) return;
    std::int32_t code = 0;
    if (status == STRAKE_STATUS_SURFACE_CALLBACK_FAILED ||
        status == STRAKE_STATUS_CURVE_CALLBACK_FAILED)
        code = strake_last_callback_code();
    throw Error(status, last_error_message(), code);
}

/** The library's version string (compare with STRAKE_VERSION_STRING of the header). */
inline std::string version() { return strake_version(); }

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

}  // namespace strake

#endif /* STRAKE_HPP */

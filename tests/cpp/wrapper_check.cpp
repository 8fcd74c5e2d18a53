// Checks of include/strake.hpp, compiled by tests/install.rs against the installed library
// with -std=c++17 and -std=c++20, -Wall -Wextra -Werror -pedantic. Exits non-zero, naming the
// failed check, when one fails.
#include <strake.hpp>

#include <array>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <stdexcept>
#include <string>
#include <type_traits>
#include <vector>

static_assert(!std::is_copy_constructible_v<strake::Surface>, "Surface is move-only");
static_assert(!std::is_copy_assignable_v<strake::Curve>, "Curve is move-only");
static_assert(std::is_nothrow_move_constructible_v<strake::Surface>, "Surface moves");
static_assert(std::is_nothrow_move_assignable_v<strake::Curve>, "Curve moves");

static int failures = 0;
static int passed = 0;
#define CHECK(cond)                                                          \
    do {                                                                     \
        if (cond) {                                                          \
            ++passed;                                                        \
        } else {                                                             \
            ++failures;                                                      \
            std::fprintf(stderr, "%s:%d: check failed: %s\n", __FILE__, __LINE__, #cond); \
        }                                                                    \
    } while (0)

static bool contains(const std::string &hay, const char *needle) {
    return hay.find(needle) != std::string::npos;
}

// The bowl z = (u^2 + v^2)/2: kn of the u-line through the origin is 1 (N = +z).
static void bowl(double u, double v, int, strake::SurfaceJet &j) {
    j.p[0] = u; j.p[1] = v; j.p[2] = 0.5 * (u * u + v * v);
    j.su[0] = 1; j.su[2] = u;
    j.sv[1] = 1; j.sv[2] = v;
    j.suu[2] = 1; j.svv[2] = 1;
}

int main() {
    CHECK(strake::version() == STRAKE_VERSION_STRING);

    strake::Surface s = strake::Surface::from_function(bowl, -1, 1, -1, 1);
    strake::Curve line = strake::Curve::line(-0.5, 0.0, 0.5, 0.0);
    strake::Frame f = strake::frame_at(s, line, 0.5);
    CHECK(std::fabs(f.normal_curvature - 1.0) < 1e-14 && f.geodesic_torsion == 0.0);

    // Moves hand the handle (and the callable) over; the moved-from object is empty.
    strake::Surface moved = std::move(s);
    CHECK(!s && moved);
    s = std::move(moved);
    CHECK(s && !moved);

    // Ranges in and out: a caller's array reused across calls.
    std::array<double, 5> ts{0.0, 0.25, 0.5, 0.75, 1.0};
    std::vector<strake::Frame> out(ts.size());
    strake::frames_at(s, line, ts, out);
    strake::frames_at(s, line, ts, out);
    CHECK(out[2].curve_param == 0.5 && out[2].normal_curvature == f.normal_curvature);
    strake::View<const double> first_two(ts.data(), 2);
    CHECK(strake::frames_at(s, line, first_two).size() == 2);

    // Surface evaluation gives the callable's own values; entries above the order are zero.
    const double uv[] = {0.25, -0.5};
    strake::SurfaceJet j = s.evaluate(0.25, -0.5, 1);
    strake::SurfaceJet want{};
    bowl(uv[0], uv[1], 2, want);
    CHECK(std::memcmp(j.p, want.p, sizeof j.p) == 0 && j.su[2] == 0.25 && j.suu[2] == 0.0);

    // Samples with arc length from the frame call feed the path summaries directly.
    std::vector<strake::Sample> samples = strake::samples_at(s, line, ts);
    std::vector<double> kn;
    for (const strake::Sample &x : samples) kn.push_back(x.frame.normal_curvature);
    strake::Extremes e = strake::path_extremes(samples, kn);
    CHECK(e.max_index == 2 && std::fabs(samples[4].arc_length - strake::arc_length(s, line, 0, 1)) < 1e-12);
    CHECK(strake::path_violations(samples, kn, 0.9).size() == 1);
    CHECK(strake::sample_even_t(s, line, 7).size() == 7);

    // The whole-path checks give, sample for sample, what the one-frame checks give.
    const strake::Cutter ball{STRAKE_CUTTER_KIND_BALL, 0.25, 0.0};
    const strake::ToolAngles angles{0.05, 0.0};
    std::vector<strake::GougeState> gouge =
        strake::check_gouge_path(samples, STRAKE_TOOL_SIDE_ALONG_NORMAL, ball, angles);
    std::vector<strake::ToolAxis> axes(samples.size());
    strake::tool_axis_path(samples, STRAKE_TOOL_SIDE_ALONG_NORMAL, angles, axes);
    bool agree = gouge.size() == samples.size();
    for (std::size_t i = 0; agree && i < samples.size(); ++i) {
        strake::GougeState one =
            strake::check_gouge(samples[i].frame, STRAKE_TOOL_SIDE_ALONG_NORMAL, ball, angles);
        strake::ToolAxis a = strake::tool_axis(samples[i].frame, STRAKE_TOOL_SIDE_ALONG_NORMAL, angles);
        agree = one.margin == gouge[i].margin && one.concave_radius == gouge[i].concave_radius &&
                one.gouges == gouge[i].gouges && one.min_lead == gouge[i].min_lead &&
                std::memcmp(&a, &axes[i], sizeof a) == 0;
    }
    CHECK(agree);
    CHECK(strake::check_scallop_path(samples, STRAKE_TOOL_SIDE_ALONG_NORMAL, 0.25, 0.1).size() == 5);
    try {
        std::vector<strake::TowEdges> few(2);
        strake::check_tow_edges_path(samples, 0.01, few);
        CHECK(false);
    } catch (const std::invalid_argument &) {
        CHECK(true);
    }

    // Failures throw strake::Error with the status and strake's message.
    try {
        strake::frame_at(s, line, 1.5);
        CHECK(false);
    } catch (const strake::Error &err) {
        CHECK(err.status() == STRAKE_STATUS_OUT_OF_DOMAIN);
        CHECK(contains(err.what(), "strake_frame_at") && contains(err.what(), "1.5"));
        CHECK(std::string(err.status_name()) == "STRAKE_STATUS_OUT_OF_DOMAIN");
    }

    // A lambda that throws: caught at the C boundary, its text in strake's message.
    int calls = 0;
    strake::Surface picky = strake::Surface::from_function(
        [&calls](double u, double v, int order, strake::SurfaceJet &jet) {
            ++calls;
            if (u > 0.25) throw std::range_error("host kernel: no face at u > 0.25");
            bowl(u, v, order, jet);
        },
        -1, 1, -1, 1);
    try {
        strake::frames_even(picky, line, 9);
        CHECK(false);
    } catch (const strake::Error &err) {
        CHECK(err.status() == STRAKE_STATUS_SURFACE_CALLBACK_FAILED);
        CHECK(contains(err.what(), "host kernel: no face at u > 0.25"));
        CHECK(err.callback_code() == -1);
    }
    CHECK(calls > 0);
    strake::Curve bad_curve = strake::Curve::from_function(
        [](double t, strake::CurveJet &c) {
            if (t > 0.5) throw 42;  // not a std::exception
            c.u = t - 0.5; c.du = 1;
        },
        0, 1);
    try {
        strake::frames_even(s, bad_curve, 3);
        CHECK(false);
    } catch (const strake::Error &err) {
        CHECK(err.status() == STRAKE_STATUS_CURVE_CALLBACK_FAILED);
        CHECK(contains(err.what(), "not a std::exception"));
    }

    // A native NURBS surface: the bilinear patch with corners at height 0, 0, 0, 1 is z = u v.
    const double knots[] = {0, 0, 1, 1};
    const double pts[] = {0, 0, 0, 0, 1, 0, 1, 0, 0, 1, 1, 1};
    strake::Surface patch = strake::Surface::nurbs(1, 1, 2, 2, knots, knots, pts);
    std::vector<double> grid = {0.5, 0.5, 0.25, 0.75};
    std::vector<strake::SurfaceJet> jets = patch.evaluate(grid, 2);
    CHECK(jets.size() == 2 && std::fabs(jets[1].p[2] - 0.1875) < 1e-15 && jets[1].suv[2] == 1.0);

    std::printf("wrapper_check (C++%ld): %d passed, %d failed\n", static_cast<long>(__cplusplus / 100 % 100), passed, failures);
    return failures == 0 ? 0 : 1;
}

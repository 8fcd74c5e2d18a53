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
static_assert(!std::is_copy_constructible_v<strake::Offset>, "Offset is move-only");
static_assert(std::is_nothrow_move_constructible_v<strake::DriveResult>, "DriveResult moves");
static_assert(std::is_nothrow_move_assignable_v<strake::PassPlan>, "PassPlan moves");
static_assert(std::is_base_of_v<strake::Error, strake::PlanningError>, "one base for all");

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

static bool near(double a, double b, double tol) { return std::fabs(a - b) <= tol; }

// The sphere of radius R = 2, S = R (cos u cos v, sin u cos v, sin v), with its partials to
// fourth order: d^a/du^a d^b/dv^b of cos u cos v is cos(u + a pi/2) cos(v + b pi/2), and so
// on (the derivatives of cos and sin shift the argument by pi/2). N = S/R points outward.
static const double sphere_r = 2.0;
static void sphere_high(double u, double v, int order, strake::SurfaceHighJet &j) {
    double *rows[15] = {j.p,    j.su,   j.sv,   j.suu,   j.suv,   j.svv,   j.suuu,  j.suuv,
                        j.suvv, j.svvv, j.suuuu, j.suuuv, j.suuvv, j.suvvv, j.svvvv};
    const double h = std::acos(-1.0) / 2;
    int k = 0;
    for (int n = 0; n <= order; ++n)
        for (int b = 0; b <= n; ++b, ++k) {
            const int a = n - b;
            rows[k][0] = sphere_r * std::cos(u + a * h) * std::cos(v + b * h);
            rows[k][1] = sphere_r * std::sin(u + a * h) * std::cos(v + b * h);
            rows[k][2] = a == 0 ? sphere_r * std::sin(v + b * h) : 0.0;
        }
}
static std::array<double, 3> on_sphere(double u, double v) {
    return {sphere_r * std::cos(u) * std::cos(v), sphere_r * std::sin(u) * std::cos(v),
            sphere_r * std::sin(v)};
}
static double dot(const double *a, const double *b) { return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]; }

// The plane patch S(u, v) = (10 u, 10 v, 0) over [0, 1]^2 (bilinear NURBS): N = +z, and along
// a u-line B = N x T = +y, so "left" is +y.
static strake::Surface plane_patch() {
    const double knots[] = {0, 0, 1, 1};
    const double pts[] = {0, 0, 0, 0, 10, 0, 10, 0, 0, 10, 10, 0};
    return strake::Surface::nurbs(1, 1, 2, 2, knots, knots, pts);
}

static void error_family_checks(const strake::Surface &bowl_surface) {
    strake::Curve line = strake::Curve::line(-0.5, 0.0, 0.5, 0.0);
    try {
        strake::frame_at(bowl_surface, line, 1.5);
        CHECK(false);
    } catch (const strake::EvaluationError &e) {
        CHECK(e.status() == STRAKE_STATUS_OUT_OF_DOMAIN);
    }
    try {
        const double knots[] = {0, 1, 0, 1}, uv[] = {0, 0, 1, 1};
        strake::Curve::nurbs(1, knots, uv);
        CHECK(false);
    } catch (const strake::NurbsDataError &e) {
        CHECK(e.status() == STRAKE_STATUS_INVALID_KNOTS);
    }
    // A second-order callback surface has no third derivatives: ORDER_UNAVAILABLE (32) is an
    // evaluation error.
    try {
        strake::invariant_rates_at(bowl_surface, line, 0.5);
        CHECK(false);
    } catch (const strake::EvaluationError &e) {
        CHECK(e.status() == STRAKE_STATUS_ORDER_UNAVAILABLE && contains(e.what(), "order"));
    }
    try {
        strake::geodesic_between(bowl_surface, 0.1, 0.1, 0.1, 0.1, strake::geodesic_options(1e-8));
        CHECK(false);
    } catch (const strake::ArgumentError &e) {
        CHECK(e.status() == STRAKE_STATUS_INVALID_ARGUMENT);
    }
    try {
        strake::Surface s = plane_patch();
        strake::Curve mid = strake::Curve::line(0.2, 0.5, 0.8, 0.5);
        strake::Offset::make(s, mid, STRAKE_OFFSET_SIDE_RIGHT, 6.0, strake::offset_options(1e-6));
        CHECK(false);
    } catch (const strake::PlanningError &e) {
        CHECK(e.status() == STRAKE_STATUS_LEAVES_SURFACE);
    }
    CHECK(std::string(strake::status_name(STRAKE_STATUS_CENTRE_PATH_FOLDS)) ==
          "STRAKE_STATUS_CENTRE_PATH_FOLDS");
}

static void sphere_checks() {
    strake::Surface s = strake::Surface::from_high_function(sphere_high, 4, -3.0, 3.0, -1.2, 1.2);
    // A geodesic is a great circle (any differential geometry text): after arc length L from
    // p0 its end p1 lies at the central angle L/R, p0.p1 = R^2 cos(L/R), and kg = 0, kn = -1/R
    // (the sphere bends away from the outward N).
    const double length = 2.5;
    strake::Geodesic g = strake::geodesic_trace(s, 0.2, 0.1, 0.7, length,
                                                strake::geodesic_options(1e-11));
    CHECK(g.info.end == STRAKE_GEODESIC_END_LENGTH && near(g.info.length, length, 1e-12));
    const std::array<double, 3> p0 = on_sphere(0.2, 0.1);
    CHECK(near(dot(p0.data(), g.info.point) / (sphere_r * sphere_r), std::cos(length / sphere_r), 1e-9));
    std::vector<strake::Frame> along = strake::frames_even(s, g.curve, 9);
    bool geodesic = true;
    for (const strake::Frame &f : along)
        geodesic = geodesic && std::fabs(f.geodesic_curvature) < 1e-6 &&
                   near(f.normal_curvature, -1.0 / sphere_r, 1e-12);
    CHECK(geodesic);
    // Between two points: the distance is R times the central angle.
    strake::GeodesicPath between = strake::geodesic_between(s, -0.5, 0.2, 0.7, -0.3,
                                                            strake::geodesic_options(1e-9));
    const std::array<double, 3> a = on_sphere(-0.5, 0.2), b = on_sphere(0.7, -0.3);
    const double angle = std::acos(dot(a.data(), b.data()) / (sphere_r * sphere_r));
    CHECK(near(between.distance, sphere_r * angle, 1e-7));
    CHECK(near(strake::arc_length(s, between.curve, 0, between.distance), between.distance, 1e-8));

    // A circle of latitude v0: kn, kg = tan(v0)/R and tg are constant, so every rate is 0.
    const double v0 = 0.3;
    strake::Curve lat = strake::Curve::line(-1.0, v0, 1.0, v0);
    strake::FrameRates fr = strake::invariant_rates_at(s, lat, 0.4);
    CHECK(near(fr.frame.geodesic_curvature, std::tan(v0) / sphere_r, 1e-13));
    CHECK(std::fabs(fr.rates.normal_curvature_rate) < 1e-12 &&
          std::fabs(fr.rates.geodesic_curvature_rate) < 1e-12 &&
          std::fabs(fr.rates.geodesic_torsion_rate) < 1e-12);
    // The same circle run at a varying speed by a host curve of third order,
    // u(t) = t + 0.3 t^3 (d3u = 1.8): the rates stay 0 whatever the parametrisation; the same
    // curve of second order only is refused by the third-order call.
    auto lat_jet = [v0](double t, int order, strake::CurveHighJet &j) {
        j.u = t + 0.3 * t * t * t;
        j.v = v0;
        if (order >= 1) j.du = 1 + 0.9 * t * t;
        if (order >= 2) j.ddu = 1.8 * t;
        if (order >= 3) j.d3u = 1.8;
    };
    strake::Curve lat3 = strake::Curve::from_high_function(lat_jet, 3, -0.8, 0.8);
    strake::FrameRates fr3 = strake::invariant_rates_at(s, lat3, 0.5);
    CHECK(near(fr3.frame.geodesic_curvature, std::tan(v0) / sphere_r, 1e-13));
    CHECK(std::fabs(fr3.rates.normal_curvature_rate) < 1e-12 &&
          std::fabs(fr3.rates.geodesic_curvature_rate) < 1e-12 &&
          std::fabs(fr3.rates.geodesic_torsion_rate) < 1e-12 &&
          std::fabs(fr3.rates.curvature_rate) < 1e-12);
    strake::Curve lat2 = strake::Curve::from_function(
        [&](double t, strake::CurveJet &j) {
            strake::CurveHighJet h{};
            lat_jet(t, 2, h);
            j.u = h.u;
            j.v = h.v;
            j.du = h.du;
            j.dv = h.dv;
            j.ddu = h.ddu;
            j.ddv = h.ddv;
        },
        -0.8, 0.8);
    try {
        strake::invariant_rates_at(s, lat2, 0.5);
        CHECK(false);
    } catch (const strake::EvaluationError &e) {
        CHECK(e.status() == STRAKE_STATUS_ORDER_UNAVAILABLE);
    }
    const std::array<double, 4> ts{0.0, 0.3, 0.6, 1.0};
    strake::PathRates rates = strake::invariant_rates_path(s, lat, ts);
    CHECK(rates.rates.size() == 4 && std::fabs(rates.rates[3].curvature_rate) < 1e-12 &&
          rates.frames[2].curve_param == 0.6 &&
          near(rates.frames[2].geodesic_curvature, std::tan(v0) / sphere_r, 1e-13));

    // A ball of radius r outside the sphere: its centre runs on the sphere of radius R + r, the
    // latitude circle of radius (R + r) cos v0, so kc = 1/((R + r) cos v0) and
    // ds_c/ds = (R + r)/R.
    const double r = 0.5;
    const strake::Cutter ball{STRAKE_CUTTER_KIND_BALL, r, 0.0};
    const strake::ToolAngles upright{0.0, 0.0};
    strake::CentrePoint c = strake::centre_point_at(s, lat, 0.25, STRAKE_TOOL_SIDE_ALONG_NORMAL, ball, upright);
    CHECK(c.order == 4 && near(c.speed_ratio, (sphere_r + r) / sphere_r, 1e-12));
    CHECK(near(c.curvature, 1.0 / ((sphere_r + r) * std::cos(v0)), 1e-12));
    CHECK(near(std::hypot(c.centre[0], c.centre[1]), (sphere_r + r) * std::cos(v0), 1e-12));
    std::vector<strake::CentrePoint> path =
        strake::centre_path_at(s, lat, ts, STRAKE_TOOL_SIDE_ALONG_NORMAL, ball, upright);
    // The acceleration bound sqrt(a/kc) (the circle's centripetal acceleration v^2 kc).
    const strake::CentreFeedLimits limits{100.0, 50.0, 0.0, 0.0};
    std::vector<strake::CentreFeed> feeds = strake::centre_feed_path(path, limits);
    strake::CentreFeed one = strake::centre_feed(path[1], limits);
    CHECK(feeds.size() == 4 && feeds[1].feed == one.feed && one.bound == STRAKE_FEED_BOUND_ACCELERATION);
    CHECK(near(one.feed, std::sqrt(50.0 / path[1].curvature), 1e-10));
    std::vector<strake::Sample> centre_samples = strake::sample_chordal_centre(
        s, lat, 1e-4, 0.0, STRAKE_TOOL_SIDE_ALONG_NORMAL, ball, upright);
    CHECK(centre_samples.size() > 2 &&
          near(centre_samples.back().arc_length, 2.0 * sphere_r * std::cos(v0), 1e-9));
}

static void plane_checks() {
    strake::Surface s = plane_patch();
    strake::Curve mid = strake::Curve::line(0.2, 0.5, 0.8, 0.5);  // (2, 5) to (8, 5)

    // The offset of a line on a plane at geodesic distance d is the parallel line d away.
    strake::Offset off = strake::Offset::make(s, mid, STRAKE_OFFSET_SIDE_LEFT, 1.5,
                                              strake::offset_options(1e-6));
    strake::OffsetSummary sum = off.summary();
    CHECK(sum.pieces == 1 && sum.exits == 0 && sum.loops == 0);
    std::vector<strake::OffsetPoint> pts = off.piece_points(0);
    bool parallel = pts.size() == sum.points && pts.size() >= 2;
    for (const strake::OffsetPoint &p : pts)
        parallel = parallel && near(p.distance, 1.5, 1e-9) && near(p.point[1], 6.5, 1e-9) &&
                   p.point[2] == 0.0;
    CHECK(parallel);
    strake::Frame mid_frame = strake::frame_at(s, off.piece_curve(0), 0.5);
    CHECK(near(mid_frame.point[1], 6.5, 1e-9) && near(mid_frame.point[0], 5.0, 1e-6));
    CHECK(off.exits().empty() && off.loops().empty());
    const double dt[] = {0.0, 1.0}, dd[] = {1.0, 2.0};
    strake::Offset ramp = strake::Offset::make(s, mid, STRAKE_OFFSET_SIDE_LEFT, dt, dd,
                                               strake::offset_options(1e-6));
    std::vector<strake::OffsetPoint> rp = ramp.piece_points(0);
    CHECK(!rp.empty() && near(rp.back().distance, 2.0, 1e-9) && near(rp.front().distance, 1.0, 1e-9));

    // Passes a constant step-over of 2 apart from y = 5 to the left (+y): y = 7 and 9 (rows 1
    // and 2), then the parallel at y = 11 is off the patch. A ball of radius 3 leaves
    // 3 - sqrt(3^2 - 1^2) between passes 2 apart on a plane (circle geometry).
    strake::Curve first = strake::Curve::line(0.1, 0.5, 0.9, 0.5);
    strake::PassPlan plan =
        strake::plan_passes(s, first, strake::constant_step_over_options(3.0, 2.0, 1e-7));
    strake::PassSummary ps = plan.summary();
    CHECK(ps.count == 3 && ps.rows == 3 && ps.covered == 1);
    CHECK(near(ps.scallop_max, 3.0 - std::sqrt(8.0), 1e-9) &&
          near(ps.scallop_min, 3.0 - std::sqrt(8.0), 1e-9) && near(ps.total_length, 24.0, 1e-9));
    std::vector<strake::PassInfo> info = plan.passes();
    CHECK(info.size() == 2 && near(info[1].step_over_min, 2.0, 1e-7) && info[1].row == 2);
    CHECK(near(strake::frame_at(s, plan.curve(1), 0.3).point[1], 9.0, 1e-6));

    // A line of a drive plane at z = 5 projected along -z onto the patch lands under itself;
    // the part beyond x = 10 misses.
    const strake::DrivePlane above{{0, 0, 5}, {1, 0, 0}, {0, 1, 0}};
    const double knots[] = {0, 0, 1, 1}, line_xy[] = {5, 5, 15, 5};
    strake::Curve pattern = strake::Curve::nurbs(1, knots, line_xy);
    strake::DriveResult drive =
        strake::drive_project(s, above, {0, 0, -1}, pattern, strake::drive_options(1e-8));
    CHECK(drive.piece_count() == 1);
    strake::DrivePiece piece = drive.piece(0);
    CHECK(piece.pattern_start == 0.0 && near(piece.pattern_end, 0.5, 1e-7));
    strake::Frame landed = strake::frame_at(s, piece.curve, 0.5);
    CHECK(near(landed.point[0], 7.5, 1e-6) && near(landed.point[1], 5.0, 1e-8));
    std::vector<strake::PatternInterval> misses = drive.intervals();
    CHECK(misses.size() == 1 && misses[0].kind == STRAKE_PATTERN_INTERVAL_KIND_MISS &&
          near(misses[0].start, 0.5, 1e-7) && misses[0].end == 1.0);
    // An Archimedean spiral of pitch 0.5 from radius 0.5 to 3 turns 5 times: theta ends at
    // 2 pi (3 - 0.5)/0.5.
    strake::Curve spiral = strake::Curve::spiral({5, 5}, 0.5, 3.0, 0.5);
    strake::DriveResult sd = strake::drive_project(s, above, {0, 0, -1}, spiral, strake::drive_options(1e-6));
    CHECK(sd.piece_count() == 1 && near(sd.piece(0).pattern_end, 10.0 * std::acos(-1.0), 1e-9));

    // Courses: a fixed-angle course on a plane is a straight line at that angle to the axis;
    // the adjacent course one band away is the parallel line; the bands of a line and of
    // its neighbour 1.0 away with width 0.8 leave a gap of 0.2 all along.
    strake::Geodesic course = strake::course_fixed_angle(s, 0.2, 0.2, {1, 0, 0}, 0.3, 4.0,
                                                         strake::geodesic_options(1e-10));
    CHECK(course.info.end == STRAKE_GEODESIC_END_LENGTH &&
          near(course.info.point[0], 2.0 + 4.0 * std::cos(0.3), 1e-8) &&
          near(course.info.point[1], 2.0 + 4.0 * std::sin(0.3), 1e-8));
    strake::Offset next = strake::course_adjacent(s, mid, 1.0, STRAKE_OFFSET_SIDE_LEFT,
                                                  strake::offset_options(1e-6));
    strake::Curve next_curve = next.piece_curve(0);
    CHECK(near(strake::frame_at(s, next_curve, 0.5).point[1], 6.0, 1e-9));
    strake::CourseGaps gaps = strake::course_gaps(s, mid, next_curve, STRAKE_OFFSET_SIDE_LEFT,
                                                  0.8, 9, 1e-6, strake::geodesic_options(1e-9));
    CHECK(gaps.unmatched == 0 && gaps.gaps.size() == 1 && gaps.gaps[0].overlap == 0 &&
          near(gaps.gaps[0].worst, 0.2, 1e-7));
    const strake::FibreLimits tow{0.5, 100.0, 0.1};
    strake::CourseCheck cc = strake::course_check(s, mid, tow, 11);
    CHECK(near(cc.length, 6.0, 1e-12) && cc.max_steering_curvature == 0.0 && cc.steering_violations == 0);

    // Projection onto the plane: the foot of (3, 4, 2) is (u, v) = (0.3, 0.4), 2 above.
    const double pts3[] = {3, 4, 2, 6, 4, -1};
    std::vector<strake::Projection> pr =
        strake::project_points(s, pts3, strake::projection_options(INFINITY));
    CHECK(near(pr[0].u, 0.3, 1e-12) && near(pr[0].v, 0.4, 1e-12) && near(pr[0].signed_distance, 2.0, 1e-12) &&
          near(pr[1].signed_distance, -1.0, 1e-12));
    const double xyz[] = {1, 1, 0.5, 4, 2, 0.5, 7, 4, 0.5, 9, 5, 0.5};
    std::vector<strake::Projection> kept;
    strake::Curve through = strake::Curve::through_space_points(
        s, xyz, strake::projection_options(1.0), 3, STRAKE_PARAMETRIZATION_CHORD_LENGTH, &kept);
    CHECK(kept.size() == 4 && near(kept[2].distance, 0.5, 1e-12) &&
          near(strake::frame_at(s, through, 1.0).point[0], 9.0, 1e-9));
    const double space_knots[] = {0, 0, 1, 1}, space_pts[] = {2, 2, 1, 8, 8, 1};
    strake::Curve projected = strake::Curve::project_nurbs(s, 1, space_knots, space_pts, {},
                                                           strake::projection_options(2.0), 1e-8);
    strake::Frame pf = strake::frame_at(s, projected, 0.5);
    CHECK(near(pf.point[0], 5.0, 1e-7) && near(pf.point[1], 5.0, 1e-7) && pf.point[2] == 0.0);
}

static void surface_and_check_extras() {
    // Batch and one-point callbacks computing the same jets give the same frames, bit for bit.
    strake::Surface one = strake::Surface::from_function(bowl, -1, 1, -1, 1);
    strake::Surface many = strake::Surface::from_batch_function(
        [](strake::View<const double> u, strake::View<const double> v, int order,
           strake::View<strake::SurfaceJet> out) {
            for (std::size_t i = 0; i < u.size(); ++i) bowl(u[i], v[i], order, out[i]);
        },
        -1, 1, -1, 1);
    strake::Curve line = strake::Curve::line(-0.8, -0.3, 0.7, 0.6);
    std::vector<strake::Frame> a = strake::frames_even(one, line, 100), b = strake::frames_even(many, line, 100);
    CHECK(std::memcmp(a.data(), b.data(), a.size() * sizeof(strake::Frame)) == 0);
    const double lines[] = {0.5};
    many.set_knot_lines(lines, {});
    try {
        const double outside[] = {2.0};
        many.set_knot_lines(outside, {});
        CHECK(false);
    } catch (const strake::ArgumentError &e) {
        CHECK(e.status() == STRAKE_STATUS_INVALID_ARGUMENT);
    }

    // The frame from two jets: the bowl at the origin along u has kn = 1 (its osculating
    // circle z = u^2/2 has radius 1 there).
    strake::SurfaceJet sj{};
    bowl(0, 0, 2, sj);
    const strake::CurveJet cj{0, 0, 1, 0, 0, 0};
    strake::Frame f = strake::frame_from_jets(sj, cj, strake::ParamScales{2, 2, 1});
    CHECK(f.normal_curvature == 1.0 && f.geodesic_curvature == 0.0);

    // Crease flags: a degree-1 patch with an interior u knot at 0.5 is only C0 there.
    const double ku[] = {0, 0, 0.5, 1, 1}, kv[] = {0, 0, 1, 1};
    const double pts[] = {0, 0, 0, 0, 1, 0, 0.5, 0, 0.2, 0.5, 1, 0.2, 1, 0, 0, 1, 1, 0};
    strake::Surface roof = strake::Surface::nurbs(1, 1, 3, 2, ku, kv, pts);
    strake::Curve across = strake::Curve::line(0.0, 0.5, 1.0, 0.5);
    const double ts[] = {0.25, 0.5};
    std::vector<std::uint32_t> flags = strake::knot_line_flags(roof, across, ts);
    CHECK(flags[0] == 0 && (flags[1] & STRAKE_KNOT_LINE_FLAG_U_LINE) &&
          (flags[1] & STRAKE_KNOT_LINE_FLAG_U_ONLY_C0));

    // A curve from a lambda and one through (u, v) points with end derivatives.
    strake::Curve lam = strake::Curve::from_function(
        [](double t, strake::CurveJet &c) { c.u = t - 0.5; c.du = 1; }, 0, 1);
    CHECK(strake::frame_at(one, lam, 0.5).normal_curvature == 1.0);
    const double uvp[] = {-0.5, 0, 0, 0.1, 0.5, 0};
    strake::Curve ends = strake::Curve::through_uv_points(uvp, {1, 0}, {1, 0});
    CHECK(strake::frames_even(one, ends, 5).size() == 5);

    // Single-sample checks agree with the whole-path ones.
    std::vector<strake::Sample> s = strake::sample_even_t(one, line, 5);
    const strake::Cutter torus{STRAKE_CUTTER_KIND_TOROIDAL, 0.2, 0.05};
    const strake::ToolAngles lean{0.1, 0.05};
    std::vector<strake::RearGouge> rear = strake::check_rear_gouge_path(s, STRAKE_TOOL_SIDE_AGAINST_NORMAL, torus, lean);
    std::vector<strake::CutterStepOver> step =
        strake::check_step_over_cutter_path(s, STRAKE_TOOL_SIDE_AGAINST_NORMAL, torus, lean, 0.001);
    std::vector<strake::TowEdges> edges = strake::check_tow_edges_path(s, 0.05);
    bool same = true;
    for (std::size_t i = 0; i < s.size(); ++i) {
        strake::RearGouge r = strake::check_rear_gouge(s[i].frame, STRAKE_TOOL_SIDE_AGAINST_NORMAL, torus, lean);
        strake::CutterStepOver c = strake::check_step_over_cutter(s[i].frame, STRAKE_TOOL_SIDE_AGAINST_NORMAL, torus, lean, 0.001);
        strake::TowEdges e = strake::check_tow_edges(s[i].frame, 0.05);
        same = same && r.margin == rear[i].margin && r.depth == rear[i].depth &&
               r.gouges == rear[i].gouges && c.step_over == step[i].step_over &&
               c.limited_by_width == step[i].limited_by_width && e.left == edges[i].left &&
               e.right == edges[i].right && e.left_compressed == edges[i].left_compressed;
    }
    CHECK(same);
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

    error_family_checks(s);
    sphere_checks();
    plane_checks();
    surface_and_check_extras();

    std::printf("wrapper_check (C++%ld): %d passed, %d failed\n", static_cast<long>(__cplusplus / 100 % 100), passed, failures);
    return failures == 0 ? 0 : 1;
}

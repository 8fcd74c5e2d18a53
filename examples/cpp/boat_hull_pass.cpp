// A finishing pass along a boat hull, the way a CAM host would call strake from C++.
//
// The host evaluates its own hull surface (here a lambda: a smooth invented hull shape,
// half-breadth y(x, z) over length x and height z, parametrised by (u, v) in [0, 1]^2); strake
// holds it as a callback surface, takes the pass as a cubic through the host's contact
// points in (u, v), and returns at each sample the Darboux frame, the invariants, the ball-end
// mill's gouge margin and the tool axis for a 3-degree lead. Exceptions thrown by the host
// evaluator come back as strake::Error with the host's text.
#include <strake.hpp>

#include <cmath>
#include <cstdio>
#include <stdexcept>
#include <vector>

int main() {
    const double length = 12.0, beam = 1.8, depth = 2.2;  // metres: an invented hull
    auto hull = [=](double u, double v, int order, strake::SurfaceJet &j) {
        // x = L u, z = D v, y = B (1 - (2u - 1)^2) sqrt-free bulge v (2 - v)
        const double a = 1.0 - (2.0 * u - 1.0) * (2.0 * u - 1.0), da = -4.0 * (2.0 * u - 1.0);
        const double b = v * (2.0 - v), db = 2.0 - 2.0 * v;
        j.p[0] = length * u;
        j.p[1] = beam * a * b;
        j.p[2] = depth * v;
        if (order >= 1) {
            j.su[0] = length;
            j.su[1] = beam * da * b;
            j.sv[1] = beam * a * db;
            j.sv[2] = depth;
        }
        if (order >= 2) {
            j.suu[1] = beam * -8.0 * b;
            j.suv[1] = beam * da * db;
            j.svv[1] = beam * a * -2.0;
        }
    };
    try {
        strake::Surface surface = strake::Surface::from_function(hull, 0.0, 1.0, 0.0, 1.0);
        const std::vector<double> contact_uv = {0.10, 0.30, 0.35, 0.42, 0.60, 0.45, 0.90, 0.38};
        strake::Curve pass = strake::Curve::through_uv_points(contact_uv);

        std::vector<strake::Sample> samples = strake::sample_even_arc(surface, pass, 9);
        const strake::Cutter ball{STRAKE_CUTTER_KIND_BALL, 0.012, 0.0};  // 12 mm ball
        const double degree = 3.14159265358979323846 / 180.0;
        const strake::ToolAngles lead{3.0 * degree, 0.0};
        std::vector<double> concave_radius;
        std::printf("   s [m]     kn [1/m]   kg [1/m]   tg [1/m]   gouge margin   tool axis\n");
        for (const strake::Sample &s : samples) {
            const strake::Frame &f = s.frame;
            strake::GougeState g =
                strake::check_gouge(f, STRAKE_TOOL_SIDE_ALONG_NORMAL, ball, lead);
            strake::ToolAxis axis = strake::tool_axis(f, STRAKE_TOOL_SIDE_ALONG_NORMAL, lead);
            concave_radius.push_back(g.concave_radius);
            std::printf("%8.4f %11.5f %10.5f %10.5f %14.4f   (%.3f, %.3f, %.3f)\n",
                        s.arc_length, f.normal_curvature, f.geodesic_curvature,
                        f.geodesic_torsion, g.margin, axis.space[0], axis.space[1],
                        axis.space[2]);
        }
        strake::Extremes e = strake::path_extremes(samples, concave_radius);
        std::printf("tightest concave radius %.4f m at s = %.4f m\n", e.min, e.min_arc_length);

        // The host's evaluator refuses a point: its exception's text reaches the caller.
        strake::Surface picky = strake::Surface::from_function(
            [&](double u, double v, int order, strake::SurfaceJet &j) {
                if (u > 0.8) throw std::runtime_error("hull data ends at the transom (u > 0.8)");
                hull(u, v, order, j);
            },
            0.0, 1.0, 0.0, 1.0);
        try {
            strake::frames_even(picky, pass, 5);
        } catch (const strake::Error &err) {
            std::printf("refused as expected: %s\n", err.what());
        }
    } catch (const strake::Error &err) {
        std::fprintf(stderr, "strake failed (%s): %s\n", err.status_name(), err.what());
        return 1;
    }
    return 0;
}

/* The same B-spline surface given to strake twice, from C: as native NURBS data
 * (strake_surface_new_nurbs) and as a host callback evaluating it with the host's own code
 * (bspline_patch.h, written from The NURBS Book A2.1/A2.3/A3.6). The frames along a path must
 * agree to 1e-12 relative. Driven by tests/c_nurbs.rs. */
#include <math.h>
#include <stdio.h>
#include "strake.h"
#include "bspline_patch.h"

#define CU 5
#define CV 4
static const double KU[CU + 4] = {0, 0, 0, 0, 0.4, 1, 1, 1, 1};
static const double KV[CV + 4] = {0, 0, 0, 0, 1, 1, 1, 1};

static int32_t host_surface(void *user_data, double u, double v, int32_t order, StrakeSurfaceJet *out)
{
    const BsplinePatch *patch = (const BsplinePatch *)user_data;
    double d[3][3][3];
    int c;
    if (patch_derivs(patch, u, v, (int)order, d) != 0) return 5;
    for (c = 0; c < 3; c++) {
        out->p[c] = d[0][0][c];
        out->su[c] = d[1][0][c];
        out->sv[c] = d[0][1][c];
        out->suu[c] = d[2][0][c];
        out->suv[c] = d[1][1][c];
        out->svv[c] = d[0][2][c];
    }
    return 0;
}

static double rel(double a, double b, double scale)
{
    return fabs(a - b) / (fabs(b) > scale ? fabs(b) : scale);
}

int main(void)
{
    double net[3 * CU * CV];
    const double path_knots[8] = {0, 0, 0, 0, 1, 1, 1, 1};
    const double path_uv[8] = {0.05, 0.1, 0.4, 0.9, 0.7, 0.05, 0.95, 0.8};
    StrakeSurface *native = NULL, *callback = NULL;
    StrakeCurve *path = NULL;
    StrakeFrame a[101], b[101];
    StrakeNurbsSurfaceData data;
    BsplinePatch patch;
    double worst = 0.0;
    int i, j, fails = 0;
    char msg[512];

    /* A wavy sheet (invented data), 120 x 90 mm. */
    for (i = 0; i < CU; i++) {
        for (j = 0; j < CV; j++) {
            double *p = &net[3 * (i * CV + j)];
            p[0] = 30.0 * i;
            p[1] = 30.0 * j + 2.0 * i;
            p[2] = 6.0 * sin(1.3 * i + 0.7 * j);
        }
    }
    data.degree_u = 3;
    data.degree_v = 3;
    data.count_u = CU;
    data.count_v = CV;
    data.knots_u = KU;
    data.knot_count_u = CU + 4;
    data.knots_v = KV;
    data.knot_count_v = CV + 4;
    data.points = net;
    data.weights = NULL;
    patch.degree_u = 3;
    patch.degree_v = 3;
    patch.count_u = CU;
    patch.count_v = CV;
    patch.knots_u = KU;
    patch.knots_v = KV;
    patch.net = net;

    if (strake_surface_new_nurbs(&data, 0, &native) != STRAKE_STATUS_OK ||
        strake_surface_from_callback(host_surface, &patch, 0, 1, 0, 1, 0, &callback) != STRAKE_STATUS_OK ||
        strake_curve_new_nurbs(3, path_knots, 8, path_uv, 4, NULL, &path) != STRAKE_STATUS_OK ||
        strake_frames_even(native, path, 101, a) != STRAKE_STATUS_OK ||
        strake_frames_even(callback, path, 101, b) != STRAKE_STATUS_OK) {
        strake_last_error_message(msg, sizeof msg);
        fprintf(stderr, "nurbs_agree: %s\n", msg);
        return 1;
    }
    for (i = 0; i < 101; i++) {
        double scale = 1e-3; /* 1/mm: curvatures below this count as zero-ish */
        double d[6];
        int k;
        d[0] = rel(a[i].normal_curvature, b[i].normal_curvature, scale);
        d[1] = rel(a[i].geodesic_curvature, b[i].geodesic_curvature, scale);
        d[2] = rel(a[i].geodesic_torsion, b[i].geodesic_torsion, scale);
        d[3] = rel(a[i].k1, b[i].k1, scale);
        d[4] = rel(a[i].k2, b[i].k2, scale);
        d[5] = rel(a[i].point[2], b[i].point[2], 1.0);
        for (k = 0; k < 6; k++) {
            if (d[k] > worst) worst = d[k];
            if (d[k] > 1e-12) fails++;
        }
    }
    printf("nurbs_agree: 101 frames, worst relative difference %.3g, %d above 1e-12\n", worst, fails);
    strake_curve_free(path);
    strake_surface_free(native);
    strake_surface_free(callback);
    return fails == 0 ? 0 : 1;
}

/*
 * mould_cavity: a finishing pass across a mould cavity, seen through strake.
 *
 * The scenario (invented): a shallow injection-mould pocket, 160 mm x 100 mm and about 12 mm
 * deep, with a gently raised island in its floor, is finished with a ball-end mill along one
 * S-shaped pass drawn in the surface's parameter plane. The host (this program) owns the
 * surface: a bicubic B-spline patch evaluated by its own code (bspline_patch.h) and handed to
 * strake as a callback. The pass is a cubic B-spline curve in (u, v). strake returns, along the
 * pass, the Darboux frame (T, B, N), the normal curvature kn, geodesic curvature kg, geodesic
 * torsion tg and the principal curvatures k1 >= k2 of the cavity.
 *
 * N = Su x Sv / |Su x Sv| points up, out of the cavity, toward the spindle. A curvature is
 * positive where the surface bends toward N, i.e. where it is concave as the tool sees it.
 * Lengths in mm, curvatures in 1/mm, torsion in rad/mm.
 *
 * Usage: mould_cavity          prints the table and a summary
 *        mould_cavity --raw    prints the data and every frame field at full precision
 *                              (read by tests/c_demo.rs)
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "strake.h"
#include "bspline_patch.h"

#define COUNT_U 7
#define COUNT_V 6
#define SAMPLES 25

/* Clamped uniform cubic knot vectors on [0, 1]. */
static const double KNOTS_U[COUNT_U + 4] = {0, 0, 0, 0, 0.25, 0.5, 0.75, 1, 1, 1, 1};
static const double KNOTS_V[COUNT_V + 4] = {0, 0, 0, 0, 1.0 / 3.0, 2.0 / 3.0, 1, 1, 1, 1};

/* Depth of each control point (mm): the rim at z = 0, the floor 11-14.5 mm down and deepest
 * toward +x, with a raised island around the middle row. Row i is the u index (along x). */
static const double DEPTH[COUNT_U][COUNT_V] = {
    {0.0, 0.0, 0.0, 0.0, 0.0, 0.0},
    {0.0, -6.0, -8.0, -8.0, -5.5, 0.0},
    {0.0, -9.0, -12.0, -12.5, -9.0, 0.0},
    {0.0, -9.5, -11.0, -11.5, -10.0, 0.0},
    {0.0, -10.0, -13.5, -14.5, -11.0, 0.0},
    {0.0, -7.0, -9.5, -10.0, -7.5, 0.0},
    {0.0, 0.0, 0.0, 0.0, 0.0, 0.0},
};

/* The pass: a cubic B-spline in the parameter plane, (u, v) per control point. */
#define PATH_COUNT 5
static const double PATH_KNOTS[PATH_COUNT + 4] = {0, 0, 0, 0, 0.5, 1, 1, 1, 1};
static const double PATH_UV[2 * PATH_COUNT] = {
    0.03, 0.15, 0.30, 0.75, 0.55, 0.25, 0.75, 0.80, 0.97, 0.55,
};

/* Greville abscissae of a clamped cubic knot vector: control points placed there make x and y
 * exactly linear in u and v (x = 160 u, y = 100 v). */
static double greville(const double *knots, int i)
{
    return (knots[i + 1] + knots[i + 2] + knots[i + 3]) / 3.0;
}

static void build_net(double *net)
{
    int i, j;
    for (i = 0; i < COUNT_U; i++) {
        for (j = 0; j < COUNT_V; j++) {
            double *p = &net[3 * (i * COUNT_V + j)];
            p[0] = 160.0 * greville(KNOTS_U, i);
            p[1] = 100.0 * greville(KNOTS_V, j);
            p[2] = DEPTH[i][j];
        }
    }
}

/* The StrakeSurfaceFn: strake passes the patch back as user_data. */
static int32_t cavity_surface(void *user_data, double u, double v, int32_t order, StrakeSurfaceJet *out)
{
    const BsplinePatch *patch = (const BsplinePatch *)user_data;
    double d[3][3][3];
    int c;
    if (patch_derivs(patch, u, v, (int)order, d) != 0) {
        return 7; /* our own error code; strake hands it back */
    }
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

static int fail(const char *what, StrakeStatus status)
{
    char message[512];
    strake_last_error_message(message, sizeof message);
    fprintf(stderr, "mould_cavity: %s failed: %s\n  %s\n", what, strake_status_name(status), message);
    return 1;
}

/* Index of the smallest (sign -1: largest) value of field `f` over the samples. */
typedef double (*FieldFn)(const StrakeFrame *);
static double f_kn(const StrakeFrame *f) { return f->normal_curvature; }
static double f_kg(const StrakeFrame *f) { return f->geodesic_curvature; }
static double f_tg(const StrakeFrame *f) { return f->geodesic_torsion; }
static double f_k1(const StrakeFrame *f) { return f->k1; }

static size_t extreme(const StrakeFrame *frames, size_t n, FieldFn f, int sign)
{
    size_t i, best = 0;
    for (i = 1; i < n; i++) {
        if (sign * f(&frames[i]) > sign * f(&frames[best])) {
            best = i;
        }
    }
    return best;
}

static const struct {
    const char *name;
    const char *label;
    FieldFn f;
} FIELDS[4] = {
    {"kn", "normal curvature kn  ", f_kn},
    {"kg", "geodesic curvature kg", f_kg},
    {"tg", "geodesic torsion tg  ", f_tg},
    {"k1", "principal curvature k1", f_k1},
};

static void print_raw(const double *net, const StrakeFrame *frames, size_t n)
{
    int i, k;
    size_t s;
    printf("surface_degree 3 3\nsurface_count %d %d\n", COUNT_U, COUNT_V);
    printf("knots_u");
    for (i = 0; i < COUNT_U + 4; i++) printf(" %.17g", KNOTS_U[i]);
    printf("\nknots_v");
    for (i = 0; i < COUNT_V + 4; i++) printf(" %.17g", KNOTS_V[i]);
    printf("\nnet");
    for (i = 0; i < 3 * COUNT_U * COUNT_V; i++) printf(" %.17g", net[i]);
    printf("\npath_degree 3\npath_knots");
    for (i = 0; i < PATH_COUNT + 4; i++) printf(" %.17g", PATH_KNOTS[i]);
    printf("\npath_uv");
    for (i = 0; i < 2 * PATH_COUNT; i++) printf(" %.17g", PATH_UV[i]);
    printf("\n");
    for (s = 0; s < n; s++) {
        const StrakeFrame *f = &frames[s];
        printf("frame %zu %.17g %.17g %.17g", s, f->curve_param, f->u, f->v);
        for (k = 0; k < 3; k++) printf(" %.17g", f->point[k]);
        for (k = 0; k < 3; k++) printf(" %.17g", f->tangent[k]);
        for (k = 0; k < 3; k++) printf(" %.17g", f->side[k]);
        for (k = 0; k < 3; k++) printf(" %.17g", f->normal[k]);
        printf(" %.17g %.17g %.17g %.17g %.17g %.17g", f->normal_curvature, f->geodesic_curvature,
               f->geodesic_torsion, f->speed, f->k1, f->k2);
        for (k = 0; k < 3; k++) printf(" %.17g", f->dir1[k]);
        for (k = 0; k < 3; k++) printf(" %.17g", f->dir2[k]);
        printf(" %.17g %.17g %.17g %.17g\n", f->mean_curvature, f->gaussian_curvature, f->surface_conditioning,
               f->curve_speed_figure);
    }
    for (k = 0; k < 4; k++) {
        printf("extreme %s min %zu\n", FIELDS[k].name, extreme(frames, n, FIELDS[k].f, -1));
        printf("extreme %s max %zu\n", FIELDS[k].name, extreme(frames, n, FIELDS[k].f, 1));
    }
}

static void print_table(const StrakeFrame *frames, size_t n)
{
    size_t s;
    int k;
    printf("Finishing pass across a mould cavity (160 x 100 mm pocket, bicubic B-spline floor)\n");
    printf("N points out of the cavity toward the tool; curvature > 0 = concave as the tool sees it.\n");
    printf("Lengths in mm, curvatures in 1/mm, torsion in rad/mm.\n\n");
    printf("%5s %6s %6s | %8s %8s %8s | %10s %10s %10s | %10s %10s | %7s %7s\n", "t", "u", "v", "x", "y", "z",
           "kn", "kg", "tg", "k1", "k2", "T.z", "N.z");
    printf("------------------------------------------------------------------------------------------"
           "------------------------------\n");
    for (s = 0; s < n; s++) {
        const StrakeFrame *f = &frames[s];
        printf("%5.3f %6.4f %6.4f | %8.3f %8.3f %8.3f | %10.6f %10.6f %10.6f | %10.6f %10.6f | %7.4f %7.4f\n",
               f->curve_param, f->u, f->v, f->point[0], f->point[1], f->point[2], f->normal_curvature,
               f->geodesic_curvature, f->geodesic_torsion, f->k1, f->k2, f->tangent[2], f->normal[2]);
    }
    printf("\nSummary over %zu samples (value, then where: t and the point in mm)\n", n);
    for (k = 0; k < 4; k++) {
        size_t lo = extreme(frames, n, FIELDS[k].f, -1);
        size_t hi = extreme(frames, n, FIELDS[k].f, 1);
        printf("  %-22s min %10.6f at t = %5.3f (%7.2f, %7.2f, %7.2f)\n", FIELDS[k].label, FIELDS[k].f(&frames[lo]),
               frames[lo].curve_param, frames[lo].point[0], frames[lo].point[1], frames[lo].point[2]);
        printf("  %-22s max %10.6f at t = %5.3f (%7.2f, %7.2f, %7.2f)\n", "", FIELDS[k].f(&frames[hi]),
               frames[hi].curve_param, frames[hi].point[0], frames[hi].point[1], frames[hi].point[2]);
    }
    {
        /* A ball-end mill of radius r is free of local gouging where r k <= 1 for the largest
         * curvature that is concave toward the tool (common practice). */
        size_t hi = extreme(frames, n, f_k1, 1);
        if (frames[hi].k1 > 0.0) {
            printf("  largest ball-end radius free of local gouging at these samples: %.2f mm (at t = %5.3f)\n",
                   1.0 / frames[hi].k1, frames[hi].curve_param);
        } else {
            printf("  the floor is nowhere concave toward the tool at these samples\n");
        }
    }
}

int main(int argc, char **argv)
{
    double net[3 * COUNT_U * COUNT_V];
    BsplinePatch patch;
    StrakeSurface *surface = NULL;
    StrakeCurve *path = NULL;
    StrakeFrame frames[SAMPLES];
    StrakeStatus status;
    int raw = argc > 1 && strcmp(argv[1], "--raw") == 0;

    if (strcmp(strake_version(), STRAKE_VERSION_STRING) != 0) {
        fprintf(stderr, "mould_cavity: header %s but library %s\n", STRAKE_VERSION_STRING, strake_version());
        return 1;
    }
    build_net(net);
    patch.degree_u = 3;
    patch.degree_v = 3;
    patch.count_u = COUNT_U;
    patch.count_v = COUNT_V;
    patch.knots_u = KNOTS_U;
    patch.knots_v = KNOTS_V;
    patch.net = net;

    status = strake_surface_from_callback(cavity_surface, &patch, 0.0, 1.0, 0.0, 1.0, 0, &surface);
    if (status != STRAKE_STATUS_OK) {
        return fail("strake_surface_from_callback", status);
    }
    status = strake_curve_new_nurbs(3, PATH_KNOTS, PATH_COUNT + 4, PATH_UV, PATH_COUNT, NULL, &path);
    if (status != STRAKE_STATUS_OK) {
        strake_surface_free(surface);
        return fail("strake_curve_new_nurbs", status);
    }
    status = strake_frames_even(surface, path, SAMPLES, frames);
    if (status != STRAKE_STATUS_OK) {
        strake_curve_free(path);
        strake_surface_free(surface);
        return fail("strake_frames_even", status);
    }

    if (raw) {
        print_raw(net, frames, SAMPLES);
    } else {
        StrakeFrame beyond;
        char message[256];
        print_table(frames, SAMPLES);
        /* What a mistake looks like: a parameter past the end of the pass is refused. */
        status = strake_frame_at(surface, path, 1.25, &beyond);
        strake_last_error_message(message, sizeof message);
        printf("\nAsking for t = 1.25 (past the end of the pass) gives %s:\n  %s\n", strake_status_name(status),
               message);
    }
    strake_curve_free(path);
    strake_surface_free(surface);
    return 0;
}

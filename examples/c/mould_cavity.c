/*
 * mould_cavity: a host program that uses strake to check a milling pass across a mould cavity
 * and a fibre course on a wing skin. Both scenarios are invented.
 *
 * 1. The mould cavity. A 160 mm x 100 mm injection-mould pocket, about 12 mm deep with
 *    filleted walls and a raised island in its floor, is a bicubic B-spline patch that the host
 *    (this program) evaluates with its own code (bspline_patch.h) and hands to strake as a
 *    callback. The host's finishing pass is what a CAM host has: contact points it computed on
 *    its own surface, here under an S-shaped drive curve in the XY plane. strake projects them
 *    onto the surface and interpolates a curve through them, then gives the Darboux frame along
 *    it (T, B, N, normal curvature kn, geodesic curvature kg, geodesic torsion tg, principal
 *    curvatures k1 >= k2), samples the pass to a chord tolerance, and checks it for a ball-end
 *    mill: local gouging, scallop height for the step-over, and the feed the machine's
 *    acceleration and jerk allow on the path's curvature.
 *    N = Su x Sv / |Su x Sv| points up, out of the cavity, toward the tool; a curvature is
 *    positive where the surface bends toward N, i.e. where it is concave as the tool sees it.
 *
 * 2. The wing skin. The upper skin of a wing panel in closed form (wing_skin.h). A fibre
 *    course designed by the host as a cubic B-spline in space is projected onto the skin by
 *    strake and checked for automated fibre placement: steering radius, tow-edge strain and
 *    twist rate against the process's limits.
 *
 * The limits below are invented so that some of them are exceeded; real ones come from the
 * machine builder and the material supplier, and paths planned with these local checks must
 * still be verified by simulation. Lengths in mm, curvatures in 1/mm, torsion in rad/mm.
 *
 * Usage: mould_cavity          prints tables and summaries
 *        mould_cavity --raw    prints the data and results at full precision
 *                              (read by tests/c_demo.rs)
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "strake.h"
#include "bspline_patch.h"
#include "wing_skin.h"

/* ----------------------------------------------------------------------------------------- */
/* The mould cavity: the host's bicubic B-spline patch over [0, 1]^2, x = 160 u, y = 100 v.   */

#define COUNT_U 11
#define COUNT_V 9

/* Clamped cubic knot vectors, dense near the walls so that the fillets are tight. */
static const double KNOTS_U[COUNT_U + 4] = {0, 0, 0, 0, 0.025, 0.07, 0.22, 0.5, 0.78, 0.93, 0.975, 1, 1, 1, 1};
static const double KNOTS_V[COUNT_V + 4] = {0, 0, 0, 0, 0.06, 0.2, 0.5, 0.8, 0.94, 1, 1, 1, 1};

/* Depth of each control point (mm): the rim at z = 0, steep walls, a floor 11-15 mm down and
 * deepest toward +x, with a raised island in the middle. Row i is the u index (along x). */
static const double DEPTH[COUNT_U][COUNT_V] = {
    {0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0},
    {0.0, -5.0, -6.0, -6.0, -6.0, -6.0, -6.0, -5.0, 0.0},
    {0.0, -6.0, -11.0, -11.5, -11.5, -11.5, -11.0, -6.0, 0.0},
    {0.0, -6.0, -11.5, -13.0, -13.0, -13.0, -11.5, -6.0, 0.0},
    {0.0, -6.0, -11.5, -13.0, -12.0, -12.5, -11.5, -6.0, 0.0},
    {0.0, -6.0, -11.5, -11.0, -7.5, -11.0, -11.5, -6.0, 0.0},
    {0.0, -6.0, -11.5, -13.5, -13.0, -14.0, -12.0, -6.0, 0.0},
    {0.0, -6.0, -12.0, -14.5, -15.0, -14.5, -12.0, -6.0, 0.0},
    {0.0, -6.0, -11.5, -12.0, -12.0, -12.0, -11.5, -6.0, 0.0},
    {0.0, -5.0, -6.0, -6.0, -6.0, -6.0, -6.0, -5.0, 0.0},
    {0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0},
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

/* The same surface to fourth order, as a StrakeSurfaceHighFn: what the tool-centre path needs
 * (its curvature from third derivatives, the curvature's rate of change from fourth). */
static int32_t cavity_surface_high(void *user_data, double u, double v, int32_t order, StrakeSurfaceHighJet *out)
{
    const BsplinePatch *patch = (const BsplinePatch *)user_data;
    double d[PATCH_MAX_DERIV + 1][PATCH_MAX_DERIV + 1][3];
    int c;
    if (patch_derivs_high(patch, u, v, (int)order, d) != 0) {
        return 7;
    }
    for (c = 0; c < 3; c++) {
        out->p[c] = d[0][0][c];
        out->su[c] = d[1][0][c];
        out->sv[c] = d[0][1][c];
        out->suu[c] = d[2][0][c];
        out->suv[c] = d[1][1][c];
        out->svv[c] = d[0][2][c];
        out->suuu[c] = d[3][0][c];
        out->suuv[c] = d[2][1][c];
        out->suvv[c] = d[1][2][c];
        out->svvv[c] = d[0][3][c];
        out->suuuu[c] = d[4][0][c];
        out->suuuv[c] = d[3][1][c];
        out->suuvv[c] = d[2][2][c];
        out->suvvv[c] = d[1][3][c];
        out->svvvv[c] = d[0][4][c];
    }
    return 0;
}

/* The pass: contact points under the drive curve y = 50 + 22 sin(2 pi (x - 4)/152), x from 4 to
 * 156 mm. The host finds each point on its own surface (x = 160 u, y = 100 v). */
#define PASS_POINTS 41
#define PASS_TOLERANCE 1e-6 /* mm: the points are on the surface; anything farther is a bug */

static void make_pass(const BsplinePatch *patch, double *points)
{
    const double pi = 3.14159265358979323846;
    int i;
    for (i = 0; i < PASS_POINTS; i++) {
        double x = 4.0 + 152.0 * i / (PASS_POINTS - 1);
        double y = 50.0 + 22.0 * sin(2.0 * pi * (x - 4.0) / 152.0);
        double d[3][3][3];
        patch_derivs(patch, x / 160.0, y / 100.0, 0, d);
        points[3 * i + 0] = d[0][0][0];
        points[3 * i + 1] = d[0][0][1];
        points[3 * i + 2] = d[0][0][2];
    }
}

/* The milling set-up (invented): a 20 mm ball-end mill planned for a fast floor finish. */
#define BALL_RADIUS 10.0      /* mm */
#define STEP_OVER 1.25        /* mm between adjacent passes */
#define SCALLOP_LIMIT 0.020   /* mm */
#define FEED_MM_MIN 15000.0   /* programmed feed, mm/min */
#define MAX_ACCELERATION 2000 /* mm/s^2 (2 m/s^2) */
#define MAX_JERK 20000        /* mm/s^3 (20 m/s^3) */
#define CHORD_TOLERANCE 0.005 /* mm */
#define MAX_STEP 5.0          /* mm */
#define ARC_TOLERANCE 1e-10   /* relative */
#define FRAME_SAMPLES 13
#define CENTRE_FEED_EVERY 8 /* rows of the centre-feed table: every 8th milling sample */

/* ----------------------------------------------------------------------------------------- */
/* The wing skin and the fibre course (invented).                                             */

static const WingSkin WING = {2400.0, 900.0, 90.0, 0.35, 0.12}; /* span, chord, crown, taper, twist */

/* The course: a clamped cubic B-spline whose control points the host placed over the skin. */
#define COURSE_COUNT 9
static const double COURSE_KNOTS[COURSE_COUNT + 4] = {0, 0, 0, 0, 1.0 / 6, 2.0 / 6, 3.0 / 6, 4.0 / 6, 5.0 / 6, 1, 1, 1, 1};
static const double COURSE_XY[2 * COURSE_COUNT] = {
    20.0, 450.0, 300.0, 450.0, 600.0, 450.0, 900.0, 440.0, 1200.0, 520.0,
    1500.0, 600.0, 1800.0, 590.0, 2100.0, 590.0, 2380.0, 590.0,
};
#define COURSE_TOLERANCE 5.0      /* mm: the spline may lie this far off the skin */
#define COURSE_FIT_TOLERANCE 0.01 /* mm */
#define COURSE_SPACING 20.0       /* mm between samples */

/* The placement limits (invented): 6.35 mm (1/4 in) tows. */
static const StrakeFibreLimits FIBRE = {6.35, 1350.0, 1.0e-4}; /* width, radius (mm), rad/mm */

/* ----------------------------------------------------------------------------------------- */

static int fail(const char *what, StrakeStatus status)
{
    char message[512];
    strake_last_error_message(message, sizeof message);
    fprintf(stderr, "mould_cavity: %s failed: %s\n  %s\n", what, strake_status_name(status), message);
    return 1;
}

static int out_of_memory(void)
{
    fprintf(stderr, "mould_cavity: out of memory\n");
    return 1;
}

static void print_numbers(const char *key, const double *x, size_t n)
{
    size_t i;
    printf("%s", key);
    for (i = 0; i < n; i++) {
        printf(" %.17g", x[i]);
    }
    printf("\n");
}

/* Samples a curve to the chord tolerance into a new array (*out, *count; free it). The number
 * of samples is known only once the curve has been sampled, so the host offers the buffer it
 * has; when strake answers STRAKE_STATUS_BUFFER_TOO_SMALL, *count holds the number needed, and
 * a second call with that much room gives exactly those samples. *first_guess tells how much
 * room was offered first. Returns 0, or 1 after printing what failed. */
static int sample_chordal(const StrakeSurface *surface, const StrakeCurve *curve, StrakeSample **out, size_t *count,
                          size_t *first_guess)
{
    size_t capacity = 64;
    StrakeSample *buf = malloc(capacity * sizeof *buf);
    StrakeStatus status;
    *first_guess = capacity;
    if (buf == NULL) {
        return out_of_memory();
    }
    status = strake_sample_chordal(surface, curve, CHORD_TOLERANCE, MAX_STEP, ARC_TOLERANCE, buf, capacity, count);
    if (status == STRAKE_STATUS_BUFFER_TOO_SMALL) {
        StrakeSample *bigger = realloc(buf, *count * sizeof *buf);
        if (bigger == NULL) {
            free(buf);
            return out_of_memory();
        }
        buf = bigger;
        capacity = *count;
        status = strake_sample_chordal(surface, curve, CHORD_TOLERANCE, MAX_STEP, ARC_TOLERANCE, buf, capacity,
                                       count);
    }
    if (status != STRAKE_STATUS_OK) {
        free(buf);
        return fail("strake_sample_chordal", status);
    }
    *out = buf;
    return 0;
}

/* How a limit is shown: the quantity checked is `values` (strake flags values above `limit`);
 * `show` turns a value into what a person reads (e.g. a curvature into a radius). */
typedef double (*ShowFn)(double);
static double as_is(double x) { return x; }
static double inverse(double x) { return 1.0 / x; }
static double feed_drop(double x) { return FEED_MM_MIN - 60.0 * x; }
static double per_metre(double x) { return 1000.0 * x; }

/* Finds and prints the intervals along the path where values exceed limit. A small buffer
 * first; a larger one if strake says it is too small (the same protocol as sampling). */
static int report_violations(int raw, const char *key, const char *label, const char *worst_label, ShowFn show,
                             int decimals, const char *unit, const StrakeSample *samples, const double *values,
                             size_t n, double limit)
{
    StrakeViolation small[2];
    StrakeViolation *found = small;
    size_t count = 0, i;
    StrakeStatus status = strake_path_violations(samples, values, n, limit, small, 2, &count);
    if (status == STRAKE_STATUS_BUFFER_TOO_SMALL) {
        found = malloc(count * sizeof *found);
        if (found == NULL) {
            return out_of_memory();
        }
        status = strake_path_violations(samples, values, n, limit, found, count, &count);
    }
    if (status != STRAKE_STATUS_OK) {
        if (found != small) {
            free(found);
        }
        return fail("strake_path_violations", status);
    }
    if (!raw && count == 0) {
        printf("    %-32s nowhere\n", label);
    }
    for (i = 0; i < count; i++) {
        const StrakeViolation *v = &found[i];
        if (raw) {
            printf("violation %s %.17g %.17g %.17g %.17g %zu %zu %.17g\n", key, v->start_arc_length,
                   v->end_arc_length, v->start_t, v->end_t, v->first_index, v->last_index, v->worst);
        } else {
            printf("    %-32s s = %7.1f .. %7.1f   %s %.*f %s\n", i == 0 ? label : "", v->start_arc_length,
                   v->end_arc_length, worst_label, decimals, show(v->worst), unit);
        }
    }
    if (found != small) {
        free(found);
    }
    return 0;
}

/* Extremes of a quantity along sampled samples: strake_path_extremes. */
static int extremes(const StrakeSample *samples, const double *values, size_t n, StrakeExtremes *out)
{
    StrakeStatus status = strake_path_extremes(samples, values, n, out);
    return status == STRAKE_STATUS_OK ? 0 : fail("strake_path_extremes", status);
}

/* ----------------------------------------------------------------------------------------- */
/* What the pictures need (--raw only; read by examples/plots/ and tests/c_demo.rs).          */

/* Where a sample is and how the surface bends there: u, v, the point, the normal N (the tool
 * axis of the upright tool), kn, kg, tg, k1, k2. */
static void print_sample_geometry(const char *key, size_t i, const StrakeFrame *f)
{
    printf("%s %zu %.17g %.17g %.17g %.17g %.17g %.17g %.17g %.17g %.17g %.17g %.17g %.17g %.17g\n", key, i, f->u,
           f->v, f->point[0], f->point[1], f->point[2], f->normal[0], f->normal[1], f->normal[2], f->normal_curvature,
           f->geodesic_curvature, f->geodesic_torsion, f->k1, f->k2);
}

#define GRID_PER_SPAN 4 /* grid lines per knot span of the cavity patch */

/* One coordinate of the grid: each knot span [a, b) of `knots` cut into GRID_PER_SPAN pieces,
 * so the grid follows the tight fillets near the walls. Returns the number of values. */
static int grid_values(const double *knots, int count, double *out)
{
    int i, k, n = 0;
    for (i = 3; i < count; i++) {
        if (knots[i + 1] > knots[i]) {
            for (k = 0; k < GRID_PER_SPAN; k++) {
                out[n++] = knots[i] + (knots[i + 1] - knots[i]) * k / GRID_PER_SPAN;
            }
        }
    }
    out[n++] = knots[count];
    return n;
}

/* The cavity on a grid in (u, v): the point and strake's principal, mean and Gaussian
 * curvatures there, from the host's own jets through strake_frame_from_jets (the direction of
 * the curve jet, along u, does not change k1, k2, H, K). Returns 0, or 1 after printing what
 * failed. */
static int print_cavity_grid(const BsplinePatch *patch)
{
    double us[GRID_PER_SPAN * COUNT_U + 1], vs[GRID_PER_SPAN * COUNT_V + 1];
    int nu = grid_values(KNOTS_U, COUNT_U, us), nv = grid_values(KNOTS_V, COUNT_V, vs), i, j;
    const StrakeParamScales scales = {1.0, 1.0, 1.0};
    printf("cavity_grid_size %d %d\n", nu, nv);
    for (i = 0; i < nu; i++) {
        for (j = 0; j < nv; j++) {
            StrakeSurfaceJet jet;
            StrakeCurveJet curve = {us[i], vs[j], 1.0, 0.0, 0.0, 0.0};
            StrakeFrame f;
            StrakeStatus status;
            if (cavity_surface((void *)patch, us[i], vs[j], 2, &jet) != 0) {
                fprintf(stderr, "mould_cavity: the patch cannot be evaluated at (%g, %g)\n", us[i], vs[j]);
                return 1;
            }
            status = strake_frame_from_jets(&jet, &curve, 0, &scales, &f);
            if (status != STRAKE_STATUS_OK) {
                return fail("strake_frame_from_jets (cavity grid)", status);
            }
            printf("cavity_grid %d %d %.17g %.17g %.17g %.17g %.17g %.17g %.17g %.17g %.17g\n", i, j, us[i], vs[j],
                   f.point[0], f.point[1], f.point[2], f.k1, f.k2, f.mean_curvature, f.gaussian_curvature);
        }
    }
    return 0;
}

#define WING_GRID_U 25
#define WING_GRID_V 10

/* The wing skin on an even grid: x, y, z. */
static void print_wing_grid(const WingSkin *wing)
{
    int i, j;
    printf("wing_grid_size %d %d\n", WING_GRID_U, WING_GRID_V);
    for (i = 0; i < WING_GRID_U; i++) {
        for (j = 0; j < WING_GRID_V; j++) {
            double x = wing->span * i / (WING_GRID_U - 1), y = wing->chord * j / (WING_GRID_V - 1), d[6];
            wing_height(wing, x, y, d);
            printf("wing_grid %d %d %.17g %.17g %.17g\n", i, j, x, y, d[0]);
        }
    }
}

/* ----------------------------------------------------------------------------------------- */
/* The frames along the pass.                                                                */

typedef double (*FieldFn)(const StrakeFrame *);
static double f_kn(const StrakeFrame *f) { return f->normal_curvature; }
static double f_kg(const StrakeFrame *f) { return f->geodesic_curvature; }
static double f_tg(const StrakeFrame *f) { return f->geodesic_torsion; }
static double f_k1(const StrakeFrame *f) { return f->k1; }

static const struct {
    const char *name;
    const char *label;
    FieldFn f;
} FIELDS[4] = {
    {"kn", "normal curvature kn", f_kn},
    {"kg", "geodesic curvature kg", f_kg},
    {"tg", "geodesic torsion tg", f_tg},
    {"k1", "principal curvature k1", f_k1},
};

static void print_frame_raw(size_t i, const StrakeSample *s)
{
    const StrakeFrame *f = &s->frame;
    int k;
    printf("frame %zu %.17g %.17g %.17g", i, f->curve_param, f->u, f->v);
    for (k = 0; k < 3; k++) printf(" %.17g", f->point[k]);
    for (k = 0; k < 3; k++) printf(" %.17g", f->tangent[k]);
    for (k = 0; k < 3; k++) printf(" %.17g", f->side[k]);
    for (k = 0; k < 3; k++) printf(" %.17g", f->normal[k]);
    printf(" %.17g %.17g %.17g %.17g %.17g %.17g", f->normal_curvature, f->geodesic_curvature, f->geodesic_torsion,
           f->speed, f->k1, f->k2);
    for (k = 0; k < 3; k++) printf(" %.17g", f->dir1[k]);
    for (k = 0; k < 3; k++) printf(" %.17g", f->dir2[k]);
    printf(" %.17g %.17g %.17g %.17g %.17g\n", f->mean_curvature, f->gaussian_curvature, f->surface_conditioning,
           f->curve_speed_figure, s->arc_length);
}

static int report_frames(int raw, const StrakeSample *s, size_t n)
{
    double values[FRAME_SAMPLES];
    StrakeExtremes e[4];
    size_t i;
    int k;
    for (k = 0; k < 4; k++) {
        for (i = 0; i < n; i++) {
            values[i] = FIELDS[k].f(&s[i].frame);
        }
        if (extremes(s, values, n, &e[k]) != 0) {
            return 1;
        }
    }
    if (raw) {
        for (i = 0; i < n; i++) {
            print_frame_raw(i, &s[i]);
        }
        for (k = 0; k < 4; k++) {
            printf("extreme %s min %zu\nextreme %s max %zu\n", FIELDS[k].name, e[k].min_index, FIELDS[k].name,
                   e[k].max_index);
        }
        return 0;
    }
    printf("\nThe frame along the pass, every %.2f mm of arc length:\n\n", s[n - 1].arc_length / (double)(n - 1));
    printf("%6s %5s %6s %6s | %8s %8s %8s | %10s %10s %10s | %10s %10s | %7s %7s\n", "s", "t", "u", "v", "x", "y",
           "z", "kn", "kg", "tg", "k1", "k2", "T.z", "N.z");
    printf("---------------------------------------------------------------------------------------------"
           "---------------------------------------\n");
    for (i = 0; i < n; i++) {
        const StrakeFrame *f = &s[i].frame;
        printf("%6.2f %5.3f %6.4f %6.4f | %8.3f %8.3f %8.3f | %10.6f %10.6f %10.6f | %10.6f %10.6f | %7.4f %7.4f\n",
               s[i].arc_length, f->curve_param, f->u, f->v, f->point[0], f->point[1], f->point[2],
               f->normal_curvature, f->geodesic_curvature, f->geodesic_torsion, f->k1, f->k2, f->tangent[2],
               f->normal[2]);
    }
    printf("\n  %-24s %10s  %9s   %10s  %9s\n", "extremes", "min", "at s (mm)", "max", "at s (mm)");
    for (k = 0; k < 4; k++) {
        printf("  %-24s %10.6f  %9.2f   %10.6f  %9.2f\n", FIELDS[k].label, e[k].min, e[k].min_arc_length, e[k].max,
               e[k].max_arc_length);
    }
    return 0;
}

/* ----------------------------------------------------------------------------------------- */
/* The milling checks along the pass.                                                        */

static int check_milling(int raw, const StrakeSurface *surface, const StrakeSurface *high, const StrakeCurve *pass)
{
    const StrakeCutter ball = {STRAKE_CUTTER_KIND_BALL, BALL_RADIUS, 0.0};
    const StrakeToolAngles upright = {0.0, 0.0};
    const StrakeFeedLimits machine = {FEED_MM_MIN / 60.0, MAX_ACCELERATION, MAX_JERK};
    const StrakeCentreFeedLimits centre_machine = {FEED_MM_MIN / 60.0, MAX_ACCELERATION, MAX_JERK, 0.0};
    StrakeSample *s = NULL;
    double *concave = NULL, *scallop = NULL, *feed = NULL, *feed_cut = NULL;
    double *ts = NULL, *centre_feed = NULL, *centre_curvature = NULL;
    StrakeCentrePoint *centre = NULL;
    StrakeCentreFeed *centre_limit = NULL;
    size_t n = 0, first_guess = 0, i;
    StrakeExtremes e_concave, e_scallop, e_feed, e_centre_feed, e_centre_curvature;
    StrakeStatus status;
    char gouge_label[64], scallop_label[64], feed_label[64];
    int bad = 0;

    if (sample_chordal(surface, pass, &s, &n, &first_guess) != 0) {
        return 1;
    }
    concave = malloc(n * sizeof *concave);
    scallop = malloc(n * sizeof *scallop);
    feed = malloc(n * sizeof *feed);
    feed_cut = malloc(n * sizeof *feed_cut);
    ts = malloc(n * sizeof *ts);
    centre_feed = malloc(n * sizeof *centre_feed);
    centre_curvature = malloc(n * sizeof *centre_curvature);
    centre = malloc(n * sizeof *centre);
    centre_limit = malloc(n * sizeof *centre_limit);
    if (concave == NULL || scallop == NULL || feed == NULL || feed_cut == NULL || ts == NULL ||
        centre_feed == NULL || centre_curvature == NULL || centre == NULL || centre_limit == NULL) {
        bad = out_of_memory();
        goto done;
    }
    for (i = 0; i < n && !bad; i++) {
        StrakeGougeState g;
        StrakeScallop h;
        const StrakeFrame *f = &s[i].frame;
        /* The tool is above the floor, on the side N points to. */
        status = strake_check_gouge(f, STRAKE_TOOL_SIDE_ALONG_NORMAL, &ball, &upright, &g);
        if (status != STRAKE_STATUS_OK) {
            bad = fail("strake_check_gouge", status);
            break;
        }
        concave[i] = g.concave_curvature;
        status = strake_check_scallop(f, STRAKE_TOOL_SIDE_ALONG_NORMAL, BALL_RADIUS, STEP_OVER, &h);
        if (status == STRAKE_STATUS_OK) {
            scallop[i] = h.height;
        } else if (g.gouges) {
            scallop[i] = HUGE_VAL; /* the ball does not fit across the path: it gouges there */
        } else {
            bad = fail("strake_check_scallop", status);
            break;
        }
        status = strake_check_feed(f, &machine, &feed[i]);
        if (status != STRAKE_STATUS_OK) {
            bad = fail("strake_check_feed", status);
            break;
        }
        feed_cut[i] = machine.feed - feed[i]; /* mm/s below the programmed feed */
    }
    /* The path the machine runs: the ball's centre, r above the contact point along N. Its feed
     * limit comes from its own curvature (and the curvature's rate of change for jerk). */
    for (i = 0; i < n && !bad; i++) {
        ts[i] = s[i].frame.curve_param;
    }
    if (!bad) {
        status = strake_centre_path_at(high, pass, ts, n, STRAKE_TOOL_SIDE_ALONG_NORMAL, &ball, &upright, 4, centre);
        if (status != STRAKE_STATUS_OK) {
            bad = fail("strake_centre_path_at", status);
        }
    }
    if (!bad) {
        status = strake_centre_feed_path(centre, n, &centre_machine, centre_limit);
        if (status != STRAKE_STATUS_OK) {
            bad = fail("strake_centre_feed_path", status);
        }
    }
    for (i = 0; i < n && !bad; i++) {
        centre_feed[i] = centre_limit[i].feed;
        centre_curvature[i] = centre[i].curvature;
    }
    if (bad || extremes(s, concave, n, &e_concave) || extremes(s, scallop, n, &e_scallop) ||
        extremes(s, feed, n, &e_feed) || extremes(s, centre_feed, n, &e_centre_feed) ||
        extremes(s, centre_curvature, n, &e_centre_curvature)) {
        bad = 1;
        goto done;
    }
    if (raw) {
        printf("mill_setup %.17g %.17g %.17g %.17g %.17g %.17g %.17g %.17g %.17g\n", BALL_RADIUS, STEP_OVER,
               SCALLOP_LIMIT, machine.feed, machine.max_acceleration, machine.max_jerk, CHORD_TOLERANCE, MAX_STEP,
               ARC_TOLERANCE);
        for (i = 0; i < n; i++) {
            printf("mill_sample %zu %.17g %.17g %.17g %.17g %.17g\n", i, s[i].frame.curve_param, s[i].arc_length,
                   concave[i], scallop[i], feed[i]);
        }
        for (i = 0; i < n; i++) {
            print_sample_geometry("mill_frame", i, &s[i].frame);
        }
        for (i = 0; i < n; i++) {
            printf("centre_feed %zu %.17g\n", i, centre_feed[i]);
        }
    } else {
        printf("\nMilling pass: %.0f mm ball-end mill (r = %.0f mm), step-over %.2f mm, feed %.0f mm/min,\n"
               "  machine limits %.0f m/s^2 and %.0f m/s^3\n",
               2.0 * BALL_RADIUS, BALL_RADIUS, STEP_OVER, FEED_MM_MIN, MAX_ACCELERATION / 1000.0, MAX_JERK / 1000.0);
        printf("  sampled to a chord tolerance of %.3f mm with steps up to %.0f mm: %zu samples over %.2f mm\n",
               CHORD_TOLERANCE, MAX_STEP, n, s[n - 1].arc_length);
        if (n > first_guess) {
            printf("  (the first buffer of %zu samples was too small: strake asked for %zu, and the second call "
                   "filled them)\n",
                   first_guess, n);
        }
        printf("\n  %-28s %10s  %9s   %10s  %9s\n", "along the pass", "lowest", "at s (mm)", "highest", "at s (mm)");
        printf("  %-28s %10.2f  %9.2f   %10s  %9s\n", "concave radius (mm)", 1.0 / e_concave.max,
               e_concave.max_arc_length, "-", "-");
        printf("  %-28s %10.4f  %9.2f   %10.4f  %9.2f\n", "scallop height (mm)", e_scallop.min, e_scallop.min_arc_length,
               e_scallop.max, e_scallop.max_arc_length);
        printf("  %-28s %10.0f  %9.2f   %10.0f  %9.2f\n", "feed limit (mm/min)", 60.0 * e_feed.min,
               e_feed.min_arc_length, 60.0 * e_feed.max, e_feed.max_arc_length);
        printf("  %-28s %10.0f  %9.2f   %10.0f  %9.2f\n", "feed on the centre path", 60.0 * e_centre_feed.min,
               e_centre_feed.min_arc_length, 60.0 * e_centre_feed.max, e_centre_feed.max_arc_length);
        printf("\n  largest ball-end radius free of local gouging along the pass: %.2f mm (at s = %.2f mm)\n",
               1.0 / e_concave.max, e_concave.max_arc_length);
        printf("\n  The machine runs the ball's centre, not the contact point: its path's tightest radius is\n"
               "  %.2f mm (at s = %.2f mm). Judged on that path, the acceleration and jerk limits allow\n"
               "  %.0f mm/min at s = %.2f mm, where the contact path's curvature alone allowed %.0f mm/min;\n"
               "  the centre-path feed is the one to program (mm/min, every %zuth sample):\n",
               1.0 / e_centre_curvature.max, e_centre_curvature.max_arc_length, 60.0 * e_centre_feed.min,
               e_centre_feed.min_arc_length, 60.0 * feed[e_centre_feed.min_index], (size_t)CENTRE_FEED_EVERY);
        printf("  %9s %14s %14s\n", "s (mm)", "centre path", "contact path");
        for (i = 0; i < n; i += CENTRE_FEED_EVERY) {
            printf("  %9.2f %14.0f %14.0f\n", s[i].arc_length, 60.0 * centre_feed[i], 60.0 * feed[i]);
        }
        printf("\n  Where the plan fails (arc length along the pass, mm):\n");
    }
    snprintf(gouge_label, sizeof gouge_label, "r = %.0f mm ball gouges", BALL_RADIUS);
    snprintf(scallop_label, sizeof scallop_label, "scallop above %.3f mm", SCALLOP_LIMIT);
    snprintf(feed_label, sizeof feed_label, "feed held below %.0f mm/min", FEED_MM_MIN);
    if (report_violations(raw, "gouge", gouge_label, "concave radius down to", inverse, 2, "mm", s, concave, n,
                          1.0 / BALL_RADIUS) ||
        report_violations(raw, "scallop", scallop_label, "up to", as_is, 4, "mm", s, scallop, n, SCALLOP_LIMIT) ||
        report_violations(raw, "feed", feed_label, "down to", feed_drop, 0, "mm/min", s, feed_cut, n, 0.0)) {
        bad = 1;
    }
done:
    free(centre_limit);
    free(centre);
    free(centre_curvature);
    free(centre_feed);
    free(ts);
    free(feed_cut);
    free(feed);
    free(scallop);
    free(concave);
    free(s);
    return bad;
}

/* ----------------------------------------------------------------------------------------- */
/* The fibre course on the wing skin.                                                        */

static int check_course(int raw)
{
    WingSkin wing = WING; /* the callback's user_data */
    StrakeSurface *skin = NULL;
    StrakeCurve *course = NULL;
    StrakeSample *s = NULL;
    double *steer = NULL, *twist = NULL;
    double points[3 * COURSE_COUNT], length = 0.0, max_strain = 0.0, at_strain = 0.0;
    size_t n = 0, count = 0, i;
    StrakeExtremes e_steer, e_twist;
    StrakeProjectionOptions options = {COURSE_TOLERANCE, 0, 0, 0, 0};
    StrakeStatus status;
    char steer_label[64], twist_label[64];
    int bad = 0;

    /* The host lifts its course's control points onto its skin; the spline between them then
     * lies close to, not on, the skin, and strake projects it. */
    for (i = 0; i < COURSE_COUNT; i++) {
        double d[6];
        wing_height(&wing, COURSE_XY[2 * i], COURSE_XY[2 * i + 1], d);
        points[3 * i + 0] = COURSE_XY[2 * i];
        points[3 * i + 1] = COURSE_XY[2 * i + 1];
        points[3 * i + 2] = d[0];
    }
    status = strake_surface_from_callback(wing_surface, &wing, 0.0, wing.span, 0.0, wing.chord, 0, &skin);
    if (status != STRAKE_STATUS_OK) {
        return fail("strake_surface_from_callback (wing skin)", status);
    }
    status = strake_curve_project_nurbs(skin, 3, COURSE_KNOTS, COURSE_COUNT + 4, points, COURSE_COUNT, NULL,
                                        &options, COURSE_FIT_TOLERANCE, &course);
    if (status != STRAKE_STATUS_OK) {
        bad = fail("strake_curve_project_nurbs", status);
        goto done;
    }
    status = strake_arc_length(skin, course, 0.0, 1.0, ARC_TOLERANCE, &length);
    if (status != STRAKE_STATUS_OK) {
        bad = fail("strake_arc_length", status);
        goto done;
    }
    /* Evenly in arc length: the number of samples is the host's choice, so it sizes the buffer. */
    n = (size_t)ceil(length / COURSE_SPACING) + 1;
    s = malloc(n * sizeof *s);
    steer = malloc(n * sizeof *steer);
    twist = malloc(n * sizeof *twist);
    if (s == NULL || steer == NULL || twist == NULL) {
        bad = out_of_memory();
        goto done;
    }
    status = strake_sample_even_arc(skin, course, n, ARC_TOLERANCE, s, n, &count);
    if (status != STRAKE_STATUS_OK) {
        bad = fail("strake_sample_even_arc", status);
        goto done;
    }
    for (i = 0; i < n; i++) {
        StrakeFibreState f;
        status = strake_check_fibre(&s[i].frame, &FIBRE, &f);
        if (status != STRAKE_STATUS_OK) {
            bad = fail("strake_check_fibre", status);
            goto done;
        }
        steer[i] = f.steering_curvature;
        twist[i] = fabs(f.twist_rate);
        if (f.edge_strain > max_strain) {
            max_strain = f.edge_strain;
            at_strain = s[i].arc_length;
        }
        if (raw) {
            printf("course_sample %zu %.17g %.17g %.17g %.17g %.17g\n", i, s[i].frame.curve_param, s[i].arc_length,
                   f.steering_curvature, f.edge_strain, f.twist_rate);
        }
        if (raw) {
            print_sample_geometry("course_frame", i, &s[i].frame);
        }
    }
    if (extremes(s, steer, n, &e_steer) || extremes(s, twist, n, &e_twist)) {
        bad = 1;
        goto done;
    }
    if (raw) {
        printf("wing %.17g %.17g %.17g %.17g %.17g\n", wing.span, wing.chord, wing.crown, wing.taper, wing.twist);
        print_numbers("course_knots", COURSE_KNOTS, COURSE_COUNT + 4);
        print_numbers("course_points", points, 3 * COURSE_COUNT);
        printf("course_setup %.17g %.17g %.17g %.17g %.17g %.17g\n", COURSE_TOLERANCE, COURSE_FIT_TOLERANCE,
               length, FIBRE.tow_width, FIBRE.min_steering_radius, FIBRE.max_twist_rate);
        print_wing_grid(&wing);
    } else {
        printf("\nFibre course on a wing skin (%.0f x %.0f mm panel, crown %.0f mm at the root and %.0f %% less at the "
               "tip,\n  chord line turned by %.2f rad at the tip)\n",
               wing.span, wing.chord, wing.crown, 100.0 * wing.taper, wing.twist);
        printf("  the course: a cubic B-spline of %d control points lifted onto the skin, projected by strake\n"
               "  (fitted within %.2f mm): %.1f mm long, %zu samples every %.2f mm\n",
               COURSE_COUNT, COURSE_FIT_TOLERANCE, length, n, length / (double)(n - 1));
        printf("  %.2f mm tows; smallest steering radius %.0f mm; largest twist rate %.3f rad/m\n\n", FIBRE.tow_width,
               FIBRE.min_steering_radius, 1000.0 * FIBRE.max_twist_rate);
        printf("  %-28s %10.0f mm      at s = %7.1f mm\n", "smallest steering radius", 1.0 / e_steer.max,
               e_steer.max_arc_length);
        printf("  %-28s %10.3f %%       at s = %7.1f mm\n", "largest tow-edge strain", 100.0 * max_strain, at_strain);
        printf("  %-28s %10.4f rad/m   at s = %7.1f mm\n", "largest twist rate |tg|", 1000.0 * e_twist.max,
               e_twist.max_arc_length);
        printf("\n  Where the limits are exceeded (arc length along the course, mm):\n");
    }
    snprintf(steer_label, sizeof steer_label, "steering radius below %.0f mm", FIBRE.min_steering_radius);
    snprintf(twist_label, sizeof twist_label, "twist rate above %.3f rad/m", 1000.0 * FIBRE.max_twist_rate);
    if (report_violations(raw, "steering", steer_label, "down to", inverse, 0, "mm", s, steer, n,
                          1.0 / FIBRE.min_steering_radius) ||
        report_violations(raw, "twist", twist_label, "up to", per_metre, 4, "rad/m", s, twist, n,
                          FIBRE.max_twist_rate)) {
        bad = 1;
    }
done:
    free(twist);
    free(steer);
    free(s);
    strake_curve_free(course);
    strake_surface_free(skin);
    return bad;
}

/* ----------------------------------------------------------------------------------------- */
/* The finishing passes planned across the cavity from the host's pass: iso-scallop passes of a */
/* smaller ball (it must fit the fillets) to both sides, and the same at the constant           */
/* step-over a flat floor would give, for comparison.                                         */

#define PLAN_BALL_RADIUS 4.0 /* mm */
#define PLAN_SCALLOP 0.05     /* mm, the target */
#define PLAN_CHORD 0.01       /* mm, sampling and fit of each pass */
#define PLAN_ROWS 8           /* rows to each side: a band across the floor around the host's pass */

static int plan_cavity_passes(int raw, const StrakeSurface *surface, const StrakeCurve *pass)
{
    /* On a plane the step-over for the target: w = 2 sqrt(h (2r - h)). */
    const double flat_step = 2.0 * sqrt(PLAN_SCALLOP * (2.0 * PLAN_BALL_RADIUS - PLAN_SCALLOP));
    static const char *const side_name[2] = {"left (+B)", "right (-B)"};
    static const char *const rule_name[2] = {"iso-scallop", "constant step-over"};
    uint32_t rule, side;
    if (!raw) {
        printf("\nPasses across the cavity floor, %d rows to each side of the host's pass: %.0f mm ball-end mill,\n"
               "  target scallop %.3f mm (a flat floor would take a step-over of %.3f mm)\n\n",
               PLAN_ROWS, 2.0 * PLAN_BALL_RADIUS, PLAN_SCALLOP, flat_step);
        printf("  %-19s %-10s %6s %5s %12s %10s %10s %9s\n", "rule", "side", "passes", "rows", "length (mm)",
               "h min (mm)", "h max (mm)", "pts/pass");
    }
    for (rule = 0; rule < 2; rule++) {
        for (side = 0; side < 2; side++) {
            StrakePassOptions options = {PLAN_BALL_RADIUS, STRAKE_TOOL_SIDE_ALONG_NORMAL, rule, PLAN_SCALLOP,
                                         flat_step, side, PLAN_CHORD, 0, 0, 0, PLAN_ROWS,
                                         0, {STRAKE_CUTTER_KIND_BALL, 0.0, 0.0}, {0.0, 0.0}, 0, 0};
            StrakePassPlan *plan = NULL;
            StrakePassSummary sum;
            StrakePassInfo *info = NULL;
            size_t count = 0, i;
            StrakeStatus status = strake_plan_passes(surface, pass, &options, &plan);
            if (status != STRAKE_STATUS_OK) {
                return fail("strake_plan_passes", status);
            }
            status = strake_pass_plan_summary(plan, &sum);
            if (status == STRAKE_STATUS_OK) {
                /* The buffer protocol: ask for the size, then fetch. */
                status = strake_pass_plan_passes(plan, NULL, 0, &count);
                if (status == STRAKE_STATUS_BUFFER_TOO_SMALL || status == STRAKE_STATUS_OK) {
                    info = malloc((count > 0 ? count : 1) * sizeof *info);
                    status = info == NULL ? STRAKE_STATUS_INVALID_ARGUMENT
                                          : strake_pass_plan_passes(plan, info, count, &count);
                }
            }
            if (status != STRAKE_STATUS_OK) {
                free(info);
                strake_pass_plan_free(plan);
                return fail("strake_pass_plan_passes", status);
            }
            if (raw) {
                printf("plan %u %u %zu %zu %.17g %.17g %.17g %.17g %zu %zu %d\n", rule, side, sum.count, sum.rows,
                       sum.first_length, sum.total_length, sum.scallop_min, sum.scallop_max, sum.offset_points,
                       sum.trace_jets, sum.covered);
                for (i = 0; i < count; i++) {
                    printf("plan_pass %u %u %zu %zu %d %zu %.17g %.17g %.17g %.17g %.17g\n", rule, side, i, info[i].row,
                           info[i].has_parent, info[i].parent, info[i].length, info[i].step_over_min,
                           info[i].step_over_max, info[i].scallop_min, info[i].scallop_max);
                }
            } else {
                printf("  %-19s %-10s %6zu %5zu %12.1f %10.4f %10.4f %9.1f\n", rule_name[rule], side_name[side],
                       sum.count, sum.rows, sum.total_length, sum.scallop_min, sum.scallop_max,
                       sum.count > 1 ? (double)sum.offset_points / (double)(sum.count - 1) : 0.0);
            }
            free(info);
            strake_pass_plan_free(plan);
        }
    }
    if (!raw) {
        printf("  (passes counted with the host's pass; h = the scallop left between neighbours, measured by\n"
               "   the meeting of the two balls' swept tubes; the strip at the edge is not measured)\n");
    }
    return 0;
}

/* ----------------------------------------------------------------------------------------- */
/* Courses across the wing skin: natural (geodesic) courses laid one tow band apart at their  */
/* start, the gaps and overlaps they leave, and the parallel course that leaves none.        */

#define BAND_TOWS 8
#define BAND_WIDTH (BAND_TOWS * 6.35) /* mm: eight 6.35 mm tows */
#define PLAN_COURSES 4
#define PLAN_START_U 80.0  /* mm along the span */
#define PLAN_START_V 120.0 /* mm from the leading edge */
#define PLAN_ANGLE 0.08    /* rad from the span direction, toward the trailing edge */
#define PLAN_TOLERANCE 1e-6 /* mm per step */
#define PLAN_GAP_SAMPLES 41
#define PLAN_GAP_TOLERANCE 0.05 /* mm: narrower gaps and overlaps are not reported */
#define PLAN_EDGE_SAMPLES 41    /* band edge points per course, for the pictures */

static int plan_courses(int raw)
{
    WingSkin wing = WING; /* the callback's user_data */
    StrakeSurface *skin = NULL;
    StrakeCurve *course[PLAN_COURSES] = {NULL};
    StrakeCurve *across = NULL, *parallel_curve = NULL;
    StrakeOffset *parallel = NULL;
    StrakeGeodesicOptions options = {PLAN_TOLERANCE, 0};
    StrakeOffsetOptions offset_options = {1e-3, 0.0, 0, 0};
    StrakeGeodesicInfo info[PLAN_COURSES];
    StrakeCourseGap gaps[16];
    StrakeCourseCheck check;
    StrakeFrame f;
    StrakeStatus status;
    double u = PLAN_START_U, v = PLAN_START_V, angle = PLAN_ANGLE;
    size_t count = 0, unmatched = 0, j;
    int k, bad = 0;

    status = strake_surface_from_callback(wing_surface, &wing, 0.0, wing.span, 0.0, wing.chord, 0, &skin);
    if (status != STRAKE_STATUS_OK) {
        return fail("strake_surface_from_callback (courses)", status);
    }
    if (!raw) {
        printf("\nCourses across the wing skin: natural (geodesic) courses of %d x 6.35 mm tows (a %.1f mm band),\n"
               "  each started one band width across the start of the one before (lengths in mm)\n",
               BAND_TOWS, BAND_WIDTH);
    } else {
        printf("plan_setup %.17g %.17g %.17g %.17g %.17g %.17g\n", BAND_WIDTH, PLAN_START_U, PLAN_START_V, PLAN_ANGLE,
               PLAN_TOLERANCE, PLAN_GAP_TOLERANCE);
    }
    for (k = 0; k < PLAN_COURSES && !bad; k++) {
        if (k == 0) {
            status = strake_geodesic_trace(skin, u, v, STRAKE_DIRECTION_KIND_ANGLE, &angle, 4.0 * wing.span, &options,
                                           &course[k], &info[k]);
        } else {
            /* One band across the previous start, along its B side, then on in the direction
             * carried along that short geodesic (T = g x N). */
            double carried[3];
            status = strake_frame_at(skin, course[k - 1], 0.0, &f);
            if (status == STRAKE_STATUS_OK) {
                status = strake_geodesic_trace(skin, f.u, f.v, STRAKE_DIRECTION_KIND_SPACE, f.side, BAND_WIDTH,
                                               &options, &across, NULL);
            }
            if (status == STRAKE_STATUS_OK) {
                status = strake_frame_at(skin, across, BAND_WIDTH, &f);
            }
            strake_curve_free(across);
            across = NULL;
            if (status == STRAKE_STATUS_OK) {
                carried[0] = f.tangent[1] * f.normal[2] - f.tangent[2] * f.normal[1];
                carried[1] = f.tangent[2] * f.normal[0] - f.tangent[0] * f.normal[2];
                carried[2] = f.tangent[0] * f.normal[1] - f.tangent[1] * f.normal[0];
                status = strake_geodesic_trace(skin, f.u, f.v, STRAKE_DIRECTION_KIND_SPACE, carried, 4.0 * wing.span,
                                               &options, &course[k], &info[k]);
            }
        }
        if (status != STRAKE_STATUS_OK) {
            bad = fail("strake_geodesic_trace (course)", status);
            break;
        }
        status = strake_frame_at(skin, course[k], 0.0, &f);
        if (status != STRAKE_STATUS_OK) {
            bad = fail("strake_frame_at (course start)", status);
            break;
        }
        /* The steering and twist checks on every course. */
        status = strake_course_check(skin, course[k], &FIBRE, 101, &check);
        if (status != STRAKE_STATUS_OK) {
            bad = fail("strake_course_check", status);
            break;
        }
        if (raw) {
            printf("plan_course %d %.17g %.17g %.17g %u %u %.17g %.17g\n", k, f.u, f.v, info[k].length, info[k].end,
                   info[k].side, info[k].u, info[k].v);
            printf("plan_check %d %.17g %.17g %zu %zu\n", k, check.max_steering_curvature, check.max_twist_rate,
                   check.steering_violations, check.twist_violations);
        } else {
            printf("  course %d: from (%6.1f, %5.1f) to (%6.1f, %5.1f), %7.1f mm, ends %s\n", k, f.u, f.v, info[k].u,
                   info[k].v, info[k].length,
                   info[k].end == STRAKE_GEODESIC_END_BOUNDARY ? "at the panel edge" : "at its length");
            printf("            |kg| up to %.1e 1/mm (geodesic), twist up to %.4f rad/m, %zu of 101 samples above "
                   "the twist limit\n",
                   check.max_steering_curvature, 1000.0 * check.max_twist_rate, check.twist_violations);
        }
    }
    /* The band edges (--raw only, for the pictures): at PLAN_EDGE_SAMPLES even arc lengths of
     * each course, the ends of the geodesics of length w/2 along -B (right) and +B (left), the
     * edges' own construction in strake_course_gaps. A sample whose band reaches past the
     * panel's edge on either side is left out. */
    for (k = 0; k < PLAN_COURSES && !bad && raw; k++) {
        int i, side, printed = 0;
        for (i = 0; i < PLAN_EDGE_SAMPLES && !bad; i++) {
            double s = info[k].length * i / (PLAN_EDGE_SAMPLES - 1), across_dir[3];
            StrakeFrame c, e[2];
            StrakeGeodesicInfo reach;
            int inside = 1;
            status = strake_frame_at(skin, course[k], s, &c);
            for (side = 0; side < 2 && status == STRAKE_STATUS_OK && inside; side++) {
                for (j = 0; j < 3; j++) {
                    across_dir[j] = side == 0 ? -c.side[j] : c.side[j];
                }
                status = strake_geodesic_trace(skin, c.u, c.v, STRAKE_DIRECTION_KIND_SPACE, across_dir,
                                               0.5 * BAND_WIDTH, &options, &across, &reach);
                if (status == STRAKE_STATUS_LEAVES_SURFACE ||
                    (status == STRAKE_STATUS_OK && reach.end == STRAKE_GEODESIC_END_BOUNDARY)) {
                    inside = 0;
                    status = STRAKE_STATUS_OK;
                } else if (status == STRAKE_STATUS_OK) {
                    status = strake_frame_at(skin, across, 0.5 * BAND_WIDTH, &e[side]);
                }
                strake_curve_free(across);
                across = NULL;
            }
            if (status != STRAKE_STATUS_OK) {
                bad = fail("strake_geodesic_trace (course edge)", status);
            } else if (inside) {
                for (side = 0; side < 2; side++) {
                    printf("course_edge %d %s %d %.17g %.17g %.17g %.17g %.17g %.17g\n", k,
                           side == 0 ? "right" : "left", printed, s, e[side].u, e[side].v, e[side].point[0],
                           e[side].point[1], e[side].point[2]);
                }
                printed++;
            }
        }
    }
    for (k = 1; k < PLAN_COURSES && !bad; k++) {
        status = strake_course_gaps(skin, course[k - 1], course[k], STRAKE_OFFSET_SIDE_LEFT, BAND_WIDTH,
                                    PLAN_GAP_SAMPLES, PLAN_GAP_TOLERANCE, &options, gaps, 16, &count, &unmatched);
        if (status != STRAKE_STATUS_OK) {
            bad = fail("strake_course_gaps", status);
            break;
        }
        if (!raw) {
            printf("  between courses %d and %d (%zu of %d samples without a neighbour):\n", k - 1, k, unmatched,
                   PLAN_GAP_SAMPLES);
            if (count == 0) {
                printf("    no gap or overlap above %.2f mm\n", PLAN_GAP_TOLERANCE);
            }
        }
        for (j = 0; j < count; j++) {
            if (raw) {
                printf("plan_gap %d %zu %.17g %.17g %d %.17g\n", k, j, gaps[j].t0, gaps[j].t1, gaps[j].overlap,
                       gaps[j].worst);
                printf("%s %d %.17g %.17g %.17g\n", gaps[j].overlap ? "course_overlap" : "course_gap", k - 1,
                       gaps[j].t0, gaps[j].t1, gaps[j].worst);
            } else {
                printf("    %-7s from s = %7.1f to %7.1f mm along course %d, up to %.2f mm\n",
                       gaps[j].overlap ? "overlap" : "gap", gaps[j].t0, gaps[j].t1, k - 1, gaps[j].worst);
            }
        }
    }
    /* The parallel course: the geodesic parallel of course 0 one band across. It closes the
     * gaps by construction, at the price of steering. */
    if (!bad) {
        status = strake_course_adjacent(skin, course[0], BAND_WIDTH, STRAKE_OFFSET_SIDE_LEFT, &offset_options,
                                        &parallel);
        if (status == STRAKE_STATUS_OK) {
            status = strake_offset_piece_curve(parallel, 0, &parallel_curve);
        }
        if (status == STRAKE_STATUS_OK) {
            status = strake_course_check(skin, parallel_curve, &FIBRE, 101, &check);
        }
        if (status != STRAKE_STATUS_OK) {
            bad = fail("strake_course_adjacent / strake_course_check", status);
        } else if (raw) {
            printf("plan_parallel %.17g %.17g %.17g %zu\n", check.length, check.min_steering_radius,
                   check.max_twist_rate, check.steering_violations);
        } else {
            printf("  the parallel of course 0 one band across: %.1f mm, smallest steering radius %.0f mm, largest\n"
                   "    twist %.4f rad/m, %zu of 101 samples below the %.0f mm steering limit\n",
                   check.length, check.min_steering_radius, 1000.0 * check.max_twist_rate, check.steering_violations,
                   FIBRE.min_steering_radius);
        }
    }
    strake_curve_free(parallel_curve);
    strake_offset_free(parallel);
    for (k = 0; k < PLAN_COURSES; k++) {
        strake_curve_free(course[k]);
    }
    strake_surface_free(skin);
    return bad;
}

/* ----------------------------------------------------------------------------------------- */

/* What mistakes look like: a parameter past the end, and a contact point off the surface. */
static void show_refusals(const StrakeSurface *surface, const StrakeCurve *pass, const double *points)
{
    double moved[3 * PASS_POINTS];
    StrakeFrame beyond;
    StrakeCurve *never = NULL;
    StrakeProjectionOptions options = {PASS_TOLERANCE, 0, 0, 0, 0};
    char message[256];
    StrakeStatus status = strake_frame_at(surface, pass, 1.25, &beyond);
    strake_last_error_message(message, sizeof message);
    printf("\nAsking for t = 1.25 (past the end of the pass) gives %s:\n  %s\n", strake_status_name(status), message);
    memcpy(moved, points, sizeof moved);
    moved[3 * 17 + 2] += 0.5; /* contact point 17 lifted 0.5 mm off the floor */
    status = strake_curve_through_space_points(surface, moved, PASS_POINTS, &options, 3,
                                               STRAKE_PARAMETRIZATION_CHORD_LENGTH, NULL, &never);
    strake_last_error_message(message, sizeof message);
    printf("A contact point lifted 0.5 mm off the surface gives %s:\n  %s\n", strake_status_name(status), message);
    strake_curve_free(never); /* still NULL: nothing was created */
}

/* ----------------------------------------------------------------------------------------- */
/* A toroidal pass along the same path: rear (heel) gouging, a whole path per call.           */

#define BULL_RADIUS 5.0  /* 10 mm bull-nose cutter ... */
#define BULL_CORNER 1.0  /* ... with 1 mm corners */
#define BULL_LEAD_DEG 3.0 /* lead angle of the pass */

static double negate(double x) { return -x; }

/* The same pass with a bull-nose cutter leaning 3 degrees forward: where its heel (the back of
 * its flat bottom) dips into the floor, and the smallest lead that would avoid local and rear
 * gouging there. Every check of the pass is one call for the whole path (the _path functions).
 * What the checks do not see: the holder and shank, the flank, the cutter against the part
 * away from each sample, the floor between samples. */
static int check_rear_gouge(int raw, const StrakeSurface *surface, const StrakeCurve *pass)
{
    const StrakeCutter bull = {STRAKE_CUTTER_KIND_TOROIDAL, BULL_RADIUS, BULL_CORNER};
    const StrakeToolAngles lean = {BULL_LEAD_DEG * 3.14159265358979323846 / 180.0, 0.0};
    StrakeSample *s = NULL;
    StrakeRearGouge *rear = NULL;
    StrakeGougeState *gouge = NULL;
    double *deficit = NULL;
    StrakeCutterRadii radii;
    size_t n = 0, first_guess = 0, i, worst = 0;
    StrakeStatus status;
    char label[64];
    int bad = 0;

    if (sample_chordal(surface, pass, &s, &n, &first_guess) != 0) {
        return 1;
    }
    rear = malloc(n * sizeof *rear);
    gouge = malloc(n * sizeof *gouge);
    deficit = malloc(n * sizeof *deficit);
    if (rear == NULL || gouge == NULL || deficit == NULL) {
        bad = out_of_memory();
        goto done;
    }
    status = strake_cutter_radii(&bull, &lean, &radii);
    if (status != STRAKE_STATUS_OK) {
        bad = fail("strake_cutter_radii", status);
        goto done;
    }
    status = strake_check_rear_gouge_path(s, n, STRAKE_TOOL_SIDE_ALONG_NORMAL, &bull, &lean, rear);
    if (status != STRAKE_STATUS_OK) {
        bad = fail("strake_check_rear_gouge_path", status);
        goto done;
    }
    status = strake_check_gouge_path(s, n, STRAKE_TOOL_SIDE_ALONG_NORMAL, &bull, &lean, gouge);
    if (status != STRAKE_STATUS_OK) {
        bad = fail("strake_check_gouge_path", status);
        goto done;
    }
    for (i = 0; i < n; i++) {
        deficit[i] = -rear[i].margin; /* above 0 where the heel is in the material */
        if (gouge[i].has_min_lead && (!gouge[worst].has_min_lead || gouge[i].min_lead > gouge[worst].min_lead)) {
            worst = i;
        }
    }
    if (raw) {
        printf("rear_setup %.17g %.17g %.17g %.17g %.17g %.17g\n", BULL_RADIUS, BULL_CORNER, lean.lead, lean.tilt,
               radii.across_path, radii.inclination_plane);
        for (i = 0; i < n; i++) {
            printf("rear_sample %zu %.17g %.17g %.17g %.17g %d %d %.17g\n", i, s[i].frame.curve_param,
                   s[i].arc_length, rear[i].margin, rear[i].depth, rear[i].gouges, gouge[i].has_min_lead,
                   gouge[i].min_lead);
        }
    } else {
        printf("\nThe same pass with a %.0f mm bull-nose cutter (%.0f mm corners) leaning %.0f degrees forward:\n",
               2.0 * BULL_RADIUS, BULL_CORNER, BULL_LEAD_DEG);
        printf("  it cuts a profile of radius %.1f mm across the path (%.1f mm across its inclination plane)\n",
               radii.across_path, radii.inclination_plane);
        if (gouge[worst].has_min_lead) {
            printf("  smallest lead free of local and rear gouging everywhere on the pass: %.2f degrees (at s = "
                   "%.2f mm)\n",
                   gouge[worst].min_lead * 180.0 / 3.14159265358979323846, s[worst].arc_length);
        } else {
            printf("  no lead angle avoids gouging at s = %.2f mm\n", s[worst].arc_length);
        }
        printf("\n  Where the heel is in the floor (arc length along the pass, mm):\n");
    }
    snprintf(label, sizeof label, "heel gouges at %.0f deg lead", BULL_LEAD_DEG);
    if (report_violations(raw, "rear", label, "rim margin down to", negate, 3, "", s, deficit, n, 0.0)) {
        bad = 1;
    }
done:
    free(deficit);
    free(gouge);
    free(rear);
    free(s);
    return bad;
}

int main(int argc, char **argv)
{
    double net[3 * COUNT_U * COUNT_V];
    double points[3 * PASS_POINTS];
    StrakeProjection feet[PASS_POINTS];
    StrakeProjectionOptions options = {PASS_TOLERANCE, 0, 0, 0, 0};
    StrakeSample frames[FRAME_SAMPLES];
    BsplinePatch patch;
    StrakeSurface *surface = NULL, *high = NULL;
    StrakeCurve *pass = NULL;
    StrakeStatus status;
    size_t count = 0, i;
    double farthest = 0.0;
    int raw = argc > 1 && strcmp(argv[1], "--raw") == 0;
    int bad = 0;

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
    make_pass(&patch, points);

    status = strake_surface_from_callback(cavity_surface, &patch, 0.0, 1.0, 0.0, 1.0, 0, &surface);
    if (status != STRAKE_STATUS_OK) {
        return fail("strake_surface_from_callback", status);
    }
    status = strake_surface_from_high_callback(cavity_surface_high, &patch, 4, 0.0, 1.0, 0.0, 1.0, 0, &high);
    if (status != STRAKE_STATUS_OK) {
        strake_surface_free(surface);
        return fail("strake_surface_from_high_callback", status);
    }
    /* The pass as strake sees it: the contact points projected onto the surface and joined by a
     * C2 cubic in the surface's parameter plane. */
    status = strake_curve_through_space_points(surface, points, PASS_POINTS, &options, 3,
                                               STRAKE_PARAMETRIZATION_CHORD_LENGTH, feet, &pass);
    if (status != STRAKE_STATUS_OK) {
        strake_surface_free(high);
        strake_surface_free(surface);
        return fail("strake_curve_through_space_points", status);
    }
    for (i = 0; i < PASS_POINTS; i++) {
        farthest = feet[i].distance > farthest ? feet[i].distance : farthest;
    }
    status = strake_sample_even_arc(surface, pass, FRAME_SAMPLES, ARC_TOLERANCE, frames, FRAME_SAMPLES, &count);
    if (status != STRAKE_STATUS_OK) {
        bad = fail("strake_sample_even_arc", status);
    }

    if (!bad && raw) {
        printf("surface_degree 3 3\nsurface_count %d %d\n", COUNT_U, COUNT_V);
        print_numbers("knots_u", KNOTS_U, COUNT_U + 4);
        print_numbers("knots_v", KNOTS_V, COUNT_V + 4);
        print_numbers("net", net, 3 * COUNT_U * COUNT_V);
        print_numbers("pass_points", points, 3 * PASS_POINTS);
        printf("pass_tolerance %.17g\n", PASS_TOLERANCE);
        for (i = 0; i < PASS_POINTS; i++) {
            printf("pass_foot %zu %.17g %.17g %.17g %.17g\n", i, feet[i].u, feet[i].v, feet[i].distance,
                   feet[i].signed_distance);
        }
        bad = print_cavity_grid(&patch);
    } else if (!bad) {
        printf("Finishing pass across a mould cavity (160 x 100 mm pocket, bicubic B-spline floor)\n");
        printf("N points out of the cavity toward the tool; curvature > 0 = concave as the tool sees it.\n");
        printf("Lengths in mm, curvatures in 1/mm, torsion in rad/mm.\n\n");
        printf("The host's pass: %d contact points on its own surface, made a curve by strake\n", PASS_POINTS);
        printf("  (projected, the farthest %.1e mm from the surface, and interpolated in (u, v)): %.2f mm long\n",
               farthest, frames[FRAME_SAMPLES - 1].arc_length);
    }
    bad = bad || report_frames(raw, frames, FRAME_SAMPLES) || check_milling(raw, surface, high, pass) || check_course(raw) ||
          check_rear_gouge(raw, surface, pass) || plan_cavity_passes(raw, surface, pass) ||
          plan_courses(raw);
    if (!bad && !raw) {
        show_refusals(surface, pass, points);
    }
    strake_curve_free(pass);
    strake_surface_free(high);
    strake_surface_free(surface);
    return bad;
}

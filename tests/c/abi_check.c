/*
 * abi_check: uses the C ABI the way a C host does, through include/strake.h only: version,
 * statuses and messages, callback failure codes, free(NULL), one closed form through
 * strake_frame_from_jets, and the curves, sampling (with its buffer protocol) and checks on a
 * plane, where every answer is elementary. Built with -std=c11 -Wall -Wextra -Wpedantic -Werror (and under
 * AddressSanitizer/UBSan) by tests/c_demo.rs. Prints one line per failed check and exits 1 if
 * any failed.
 */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "strake.h"

static int failures = 0;
static int checks = 0;

#define CHECK(cond)                                                              \
    do {                                                                         \
        checks++;                                                                \
        if (!(cond)) {                                                           \
            failures++;                                                          \
            printf("FAILED %s:%d: %s\n", __FILE__, __LINE__, #cond);             \
        }                                                                        \
    } while (0)

static int message_contains(const char *needle)
{
    char buf[1024];
    strake_last_error_message(buf, sizeof buf);
    return strstr(buf, needle) != NULL;
}

/* A plane z = 0 with S(u, v) = (u, v, 0). */
static int32_t plane(void *user_data, double u, double v, int32_t order, StrakeSurfaceJet *out)
{
    (void)user_data;
    (void)order;
    out->p[0] = u;
    out->p[1] = v;
    out->su[0] = 1.0;
    out->sv[1] = 1.0;
    return 0;
}

/* A surface callback that always fails with the host's code stored in user_data. */
static int32_t failing(void *user_data, double u, double v, int32_t order, StrakeSurfaceJet *out)
{
    (void)u;
    (void)v;
    (void)order;
    (void)out;
    return *(const int32_t *)user_data;
}

int main(void)
{
    StrakeSurface *surface = NULL;
    StrakeSurface *bad_surface = NULL;
    StrakeCurve *line = NULL;
    StrakeFrame frame;
    StrakeStatus status;
    int32_t host_code = 4242;
    size_t needed;
    char small[8];

    /* Version: header macros and library agree (common practice for C libraries). */
    {
        char expected[64];
        snprintf(expected, sizeof expected, "%d.%d.%d", STRAKE_VERSION_MAJOR, STRAKE_VERSION_MINOR,
                 STRAKE_VERSION_PATCH);
        CHECK(strcmp(strake_version(), STRAKE_VERSION_STRING) == 0);
        CHECK(strcmp(expected, STRAKE_VERSION_STRING) == 0);
    }

    /* Status numbers are part of the ABI. */
    CHECK(STRAKE_STATUS_OK == 0);
    CHECK(STRAKE_STATUS_NULL_POINTER == 1);
    CHECK(STRAKE_STATUS_OUT_OF_DOMAIN == 20);
    CHECK(STRAKE_STATUS_SURFACE_CALLBACK_FAILED == 30);
    CHECK(STRAKE_STATUS_INTERNAL_PANIC == 90);
    CHECK(sizeof(StrakeStatus) == 4);
    CHECK(strcmp(strake_status_name(STRAKE_STATUS_STALLED_CURVE), "STRAKE_STATUS_STALLED_CURVE") == 0);
    CHECK(STRAKE_STATUS_BUFFER_TOO_SMALL == 4);
    CHECK(strcmp(strake_status_name(5), "STRAKE_STATUS_UNKNOWN") == 0);

    /* free(NULL) is a no-op. */
    strake_surface_free(NULL);
    strake_curve_free(NULL);

    /* NULL output pointer: refused, named, and nothing else happens. */
    status = strake_surface_from_callback(plane, NULL, 0.0, 1.0, 0.0, 1.0, 0, NULL);
    CHECK(status == STRAKE_STATUS_NULL_POINTER);
    CHECK(message_contains("`out`"));

    /* The message can be sized first, and is cut to fit a small buffer. */
    needed = strake_last_error_message(NULL, 0);
    CHECK(needed > sizeof small);
    memset(small, 'x', sizeof small);
    CHECK(strake_last_error_message(small, sizeof small) == needed);
    CHECK(small[sizeof small - 1] == '\0');
    CHECK(strlen(small) == sizeof small - 1);

    /* A plane and a straight line: kn = kg = tg = 0 (do Carmo ch. 3: a plane has II = 0, and a
     * straight line has zero curvature). */
    status = strake_surface_from_callback(plane, NULL, -2.0, 2.0, -2.0, 2.0, 0, &surface);
    CHECK(status == STRAKE_STATUS_OK);
    {
        const double knots[4] = {0.0, 0.0, 1.0, 1.0};
        const double uv[4] = {-1.0, -1.0, 1.0, 0.5};
        status = strake_curve_new_nurbs(1, knots, 4, uv, 2, NULL, &line);
        CHECK(status == STRAKE_STATUS_OK);
    }
    if (surface != NULL && line != NULL) {
        StrakeFrame frames[3];
        const double ts[3] = {0.0, 0.5, 1.0};
        status = strake_frames_at(surface, line, ts, 3, frames);
        CHECK(status == STRAKE_STATUS_OK);
        CHECK(fabs(frames[1].normal_curvature) < 1e-15 && fabs(frames[1].geodesic_curvature) < 1e-15);
        CHECK(fabs(frames[1].geodesic_torsion) < 1e-15);
        CHECK(frames[2].normal[2] == 1.0);
        /* Out of domain: refused, output untouched. */
        frame.k1 = 123.0;
        status = strake_frame_at(surface, line, 1.5, &frame);
        CHECK(status == STRAKE_STATUS_OUT_OF_DOMAIN);
        CHECK(frame.k1 == 123.0);
        CHECK(message_contains("t = 1.5"));
    }

    /* The host's own failure code comes back. */
    status = strake_surface_from_callback(failing, &host_code, 0.0, 1.0, 0.0, 1.0, 0, &bad_surface);
    CHECK(status == STRAKE_STATUS_OK);
    if (bad_surface != NULL && line != NULL) {
        /* The line runs over [-1, 1] x [-1, 0.5]; t = 1 is at (1, 0.5), inside [0, 1]^2. */
        status = strake_frame_at(bad_surface, line, 1.0, &frame);
        CHECK(status == STRAKE_STATUS_SURFACE_CALLBACK_FAILED);
        CHECK(strake_last_callback_code() == 4242);
        CHECK(message_contains("4242"));
    }

    /* A circle of radius 2 in the plane, as jets: kg = 1/2 turning left (do Carmo ch. 1: the
     * signed curvature of a counter-clockwise circle is 1/r). At angle 0: (u, v) = (2, 0),
     * velocity (0, 2), acceleration (-2, 0) for the parametrisation (2 cos s, 2 sin s). */
    {
        StrakeSurfaceJet sj;
        StrakeCurveJet cj;
        StrakeParamScales scales = {4.0, 4.0, 6.283185307179586};
        memset(&sj, 0, sizeof sj);
        sj.p[0] = 2.0;
        sj.su[0] = 1.0;
        sj.sv[1] = 1.0;
        cj.u = 2.0;
        cj.v = 0.0;
        cj.du = 0.0;
        cj.dv = 2.0;
        cj.ddu = -2.0;
        cj.ddv = 0.0;
        status = strake_frame_from_jets(&sj, &cj, 0, &scales, &frame);
        CHECK(status == STRAKE_STATUS_OK);
        CHECK(fabs(frame.geodesic_curvature - 0.5) < 1e-15);
        CHECK(frame.normal_curvature == 0.0);
        CHECK(fabs(frame.speed - 2.0) < 1e-15);
        /* Reversing N flips kg (REFERENCES: what flips). */
        status = strake_frame_from_jets(&sj, &cj, 1, &scales, &frame);
        CHECK(status == STRAKE_STATUS_OK);
        CHECK(fabs(frame.geodesic_curvature + 0.5) < 1e-15);
    }

    /* The enum values hosts pass as uint32_t are part of the ABI. */
    CHECK(STRAKE_PARAMETRIZATION_CENTRIPETAL == 1);
    CHECK(STRAKE_TOOL_SIDE_AGAINST_NORMAL == 1);
    CHECK(STRAKE_CUTTER_KIND_TOROIDAL == 2);

    /* Curves from points, sampling and checks on the plane z = 0 over [-2, 2]^2. */
    if (surface != NULL) {
        /* Evenly spaced points on a line: the interpolating cubic is the line itself, u(t) = -1 +
         * 3t, v(t) = -1 + 2t (B-splines reproduce polynomials up to their degree; common
         * practice), so its length is sqrt(13). */
        const double uv[10] = {-1.0, -1.0, -0.25, -0.5, 0.5, 0.0, 1.25, 0.5, 2.0, 1.0};
        const double above[6] = {0.5, -0.25, 3.0, -1.0, 1.5, -0.5};
        const StrakeProjectionOptions options = {5.0, 0, 0, 0, 0};
        StrakeProjection feet[2];
        StrakeCurve *fitted = NULL;
        StrakeSample samples[16];
        size_t count = 99;
        double length = 0.0;
        status = strake_curve_through_uv_points(uv, 5, 3, STRAKE_PARAMETRIZATION_CHORD_LENGTH, NULL, NULL, &fitted);
        CHECK(status == STRAKE_STATUS_OK);
        if (fitted != NULL) {
            status = strake_frame_at(surface, fitted, 0.5, &frame);
            CHECK(status == STRAKE_STATUS_OK && fabs(frame.u - 0.5) < 1e-14 && fabs(frame.v) < 1e-14);
            status = strake_arc_length(surface, fitted, 0.0, 1.0, 1e-12, &length);
            CHECK(status == STRAKE_STATUS_OK && fabs(length - sqrt(13.0)) < 1e-12);

            /* The buffer protocol: ask for the size, then fill. */
            status = strake_sample_even_arc(surface, fitted, 5, 1e-12, NULL, 0, &count);
            CHECK(status == STRAKE_STATUS_BUFFER_TOO_SMALL && count == 5);
            samples[0].arc_length = -1.0;
            status = strake_sample_even_arc(surface, fitted, 5, 1e-12, samples, 4, &count);
            CHECK(status == STRAKE_STATUS_BUFFER_TOO_SMALL && count == 5 && samples[0].arc_length == -1.0);
            status = strake_sample_even_arc(surface, fitted, 5, 1e-12, samples, 16, &count);
            CHECK(status == STRAKE_STATUS_OK && count == 5);
            CHECK(fabs(samples[2].arc_length - 0.5 * sqrt(13.0)) < 1e-12);
            /* A straight line has no chord error: only the maximum step (0.5) sets the spacing. */
            status = strake_sample_chordal(surface, fitted, 1e-3, 0.5, 1e-12, samples, 16, &count);
            CHECK(status == STRAKE_STATUS_OK && count >= 9 && count <= 16);
            CHECK(count <= 16 && fabs(samples[count - 1].arc_length - sqrt(13.0)) < 1e-12);
            status = strake_sample_chordal(surface, fitted, 1e-3, 0.5, 1e-12, samples, 2, &count);
            CHECK(status == STRAKE_STATUS_BUFFER_TOO_SMALL && count >= 9);

            /* Scallop on a plane: h = r - sqrt(r^2 - w^2/4) (common practice). */
            {
                StrakeScallop h;
                status = strake_check_scallop(&samples[0].frame, STRAKE_TOOL_SIDE_ALONG_NORMAL, 5.0, 2.0, &h);
                CHECK(status == STRAKE_STATUS_OK && fabs(h.height - (5.0 - sqrt(24.0))) < 1e-14);
                CHECK(h.cross_curvature == 0.0);
            }
            /* No violation anywhere: no buffer needed. */
            {
                double zero[2] = {0.0, 0.0};
                status = strake_path_violations(samples, zero, 2, 1.0, NULL, 0, &count);
                CHECK(status == STRAKE_STATUS_OK && count == 0);
            }
        }
        strake_curve_free(fitted);

        /* Points above the plane land straight below it, at their height. */
        status = strake_surface_project_points(surface, above, 2, &options, feet);
        CHECK(status == STRAKE_STATUS_OK);
        CHECK(fabs(feet[0].u - 0.5) < 1e-14 && fabs(feet[0].v + 0.25) < 1e-14);
        CHECK(fabs(feet[0].signed_distance - 3.0) < 1e-14 && fabs(feet[1].signed_distance + 0.5) < 1e-14);
    }

    /* A check refuses a frame that is not one, and leaves its output alone. */
    {
        StrakeFrame zero;
        StrakeGougeState g;
        const StrakeCutter ball = {STRAKE_CUTTER_KIND_BALL, 3.0, 0.0};
        const StrakeToolAngles angles = {0.0, 0.0};
        memset(&zero, 0, sizeof zero);
        g.margin = 42.0;
        status = strake_check_gouge(&zero, STRAKE_TOOL_SIDE_ALONG_NORMAL, &ball, &angles, &g);
        CHECK(status == STRAKE_STATUS_INVALID_ARGUMENT && g.margin == 42.0);
        CHECK(message_contains("frame.tangent"));
    }

    /* Feed on the circle of radius 2 from the jets above: v = sqrt(a rho) (physics). */
    {
        StrakeSurfaceJet sj;
        StrakeCurveJet cj = {2.0, 0.0, 0.0, 2.0, -2.0, 0.0};
        StrakeParamScales scales = {4.0, 4.0, 6.283185307179586};
        StrakeFeedLimits limits = {100.0, 50.0, 0.0};
        double feed = 0.0;
        memset(&sj, 0, sizeof sj);
        sj.p[0] = 2.0;
        sj.su[0] = 1.0;
        sj.sv[1] = 1.0;
        status = strake_frame_from_jets(&sj, &cj, 0, &scales, &frame);
        CHECK(status == STRAKE_STATUS_OK);
        status = strake_check_feed(&frame, &limits, &feed);
        CHECK(status == STRAKE_STATUS_OK && fabs(feed - 10.0) < 1e-13);
    }

    strake_curve_free(line);
    strake_surface_free(bad_surface);
    strake_surface_free(surface);

    printf("abi_check: %d checks, %d failed\n", checks, failures);
    return failures == 0 ? 0 : 1;
}

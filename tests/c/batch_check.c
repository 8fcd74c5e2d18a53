/*
 * batch_check: the batched surface callback and the parallel batch used from C through
 * include/strake.h only. A host evaluates the bowl z = (u^2 + v^2)/2 one point per call and many
 * points per call; strake_frames_at must give the same frames (byte for byte) with either, and
 * strake_frames_at_parallel the same frames on 1 or 2 threads; a failing batch callback's code
 * comes back, and the output array stays untouched on failure. Built with -std=c11 -Wall -Wextra
 * -Wpedantic -Werror (and under AddressSanitizer/UBSan) by tests/c_batch.rs. Prints one line per
 * failed check and exits 1 if any failed.
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

#define N 500

static void bowl_jet(double u, double v, StrakeSurfaceJet *j)
{
    j->p[0] = u;
    j->p[1] = v;
    j->p[2] = 0.5 * (u * u + v * v);
    j->su[0] = 1.0;
    j->su[2] = u;
    j->sv[1] = 1.0;
    j->sv[2] = v;
    j->suu[2] = 1.0;
    j->svv[2] = 1.0;
}

static int32_t bowl(void *user_data, double u, double v, int32_t order, StrakeSurfaceJet *out)
{
    (void)user_data;
    (void)order;
    bowl_jet(u, v, out);
    return 0;
}

/* user_data: the number of calls so far (int); fails with code 55 when u > 0.25 if asked. */
typedef struct {
    int calls;
    int fail;
} Host;

static int32_t bowl_batch(void *user_data, const double *u, const double *v, size_t count,
                          int32_t order, StrakeSurfaceJet *out)
{
    Host *host = (Host *)user_data;
    (void)order;
    host->calls++;
    for (size_t i = 0; i < count; i++) {
        if (host->fail && u[i] > 0.25)
            return 55;
        bowl_jet(u[i], v[i], &out[i]);
    }
    return 0;
}

int main(void)
{
    static StrakeFrame a[N], b[N], c[N], keep[N];
    double ts[N];
    const double knots[] = {0, 0, 1, 1}, uv[] = {-0.5, -0.5, 0.5, 0.5};
    StrakeSurface *point = NULL, *batch = NULL;
    StrakeCurve *line = NULL;
    Host host = {0, 0};

    for (int i = 0; i < N; i++)
        ts[i] = (double)i / (N - 1);
    CHECK(strake_surface_from_callback(bowl, NULL, -1, 1, -1, 1, 0, &point) == STRAKE_STATUS_OK);
    CHECK(strake_surface_from_batch_callback(bowl_batch, &host, -1, 1, -1, 1, 0, &batch) ==
          STRAKE_STATUS_OK);
    CHECK(strake_curve_new_nurbs(1, knots, 4, uv, 2, NULL, &line) == STRAKE_STATUS_OK);
    if (!point || !batch || !line) {
        printf("%d checks, %d failed\n", checks, failures);
        return 1;
    }

    /* The same frames from both callbacks; the batch one is called once per block. */
    CHECK(strake_frames_at(point, line, ts, N, a) == STRAKE_STATUS_OK);
    CHECK(strake_frames_at(batch, line, ts, N, b) == STRAKE_STATUS_OK);
    CHECK(memcmp(a, b, sizeof a) == 0);
    CHECK(host.calls > 1 && host.calls < N / 4);
    /* At the bowl's vertex (t = 1/2 lies between samples 249 and 250; evaluate it exactly):
     * I and II are both the identity there, so k1 = k2 = 1 and kn = 1 in every direction
     * (do Carmo §3-3, curvatures from the fundamental forms; derived for this surface). */
    {
        StrakeFrame f;
        CHECK(strake_frame_at(batch, line, 0.5, &f) == STRAKE_STATUS_OK);
        CHECK(fabs(f.normal_curvature - 1.0) < 1e-14);
        CHECK(fabs(f.k1 - 1.0) < 1e-14 && fabs(f.k2 - 1.0) < 1e-14);
    }

    /* The parallel batch: 1 and 2 threads give the serial frames; 0 threads is refused. */
    CHECK(strake_frames_at_parallel(batch, line, ts, N, 1, c) == STRAKE_STATUS_OK);
    CHECK(memcmp(a, c, sizeof a) == 0);
    memset(c, 0, sizeof c);
    CHECK(strake_frames_at_parallel(point, line, ts, N, 2, c) == STRAKE_STATUS_OK);
    CHECK(memcmp(a, c, sizeof a) == 0);
    memcpy(keep, c, sizeof c);
    CHECK(strake_frames_at_parallel(point, line, ts, N, 0, c) == STRAKE_STATUS_INVALID_ARGUMENT);
    CHECK(memcmp(keep, c, sizeof c) == 0);

    /* A failing batch callback: its code comes back, the output stays untouched. */
    host.fail = 1;
    memcpy(keep, b, sizeof b);
    CHECK(strake_frames_at(batch, line, ts, N, b) == STRAKE_STATUS_SURFACE_CALLBACK_FAILED);
    CHECK(strake_last_callback_code() == 55);
    CHECK(memcmp(keep, b, sizeof b) == 0);
    {
        char msg[512];
        strake_last_error_message(msg, sizeof msg);
        CHECK(strstr(msg, "code 55") != NULL);
    }

    strake_curve_free(line);
    strake_surface_free(batch);
    strake_surface_free(point);
    printf("%d checks, %d failed\n", checks, failures);
    return failures == 0 ? 0 : 1;
}

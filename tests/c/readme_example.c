/* The C usage example of the README, compiled and run by tests/c_demo.rs so that it stays true. */
#include <stdio.h>
#include "strake.h"

/* The host's surface: the bowl z = (u^2 + v^2)/2 over [-1, 1]^2 (x = u, y = v). */
static int32_t bowl(void *user_data, double u, double v, int32_t order, StrakeSurfaceJet *j)
{
    (void)user_data; (void)order;   /* strake zeroes *j and asks for order 2 */
    j->p[0] = u;  j->p[1] = v;  j->p[2] = 0.5 * (u * u + v * v);
    j->su[0] = 1; j->su[2] = u;
    j->sv[1] = 1; j->sv[2] = v;
    j->suu[2] = 1; j->svv[2] = 1;
    return 0;                        /* non-zero: STRAKE_STATUS_SURFACE_CALLBACK_FAILED */
}

int main(void)
{
    const double knots[] = {0, 0, 1, 1}, uv[] = {-0.5, -0.5, 0.8, 0.3}; /* a line in (u, v) */
    StrakeSurface *surface = NULL;
    StrakeCurve *path = NULL;
    StrakeFrame f[5];
    char msg[256];
    int ok = strake_surface_from_callback(bowl, NULL, -1, 1, -1, 1, 0, &surface) == STRAKE_STATUS_OK
          && strake_curve_new_nurbs(1, knots, 4, uv, 2, NULL, &path) == STRAKE_STATUS_OK
          && strake_frames_even(surface, path, 5, f) == STRAKE_STATUS_OK;
    if (!ok) {
        strake_last_error_message(msg, sizeof msg);
        fprintf(stderr, "strake: %s\n", msg);
    }
    for (int i = 0; ok && i < 5; i++)
        printf("t=%.2f kn=%.4f kg=%.4f tg=%.4f\n", f[i].curve_param, f[i].normal_curvature,
               f[i].geodesic_curvature, f[i].geodesic_torsion);
    strake_curve_free(path);        /* NULL is a no-op */
    strake_surface_free(surface);
    return ok ? 0 : 1;
}

/*
 * The upper skin of a wing panel, as a host might describe it in closed form (invented shape):
 * x runs along the span (0 .. span), y along the chord (0 at the leading edge .. chord), and the
 * skin rises by z(x, y) above the chord plane:
 *
 *   z = h(x) 4 e (1 - e) + a(x) y,   e = y / chord,
 *   h(x) = crown (1 - taper x / span)   (the crown shrinks toward the tip),
 *   a(x) = twist x / span               (the chord line turns by `twist` radians at the tip;
 *                                         small angles, so a rotation is a slope).
 *
 * The surface handed to strake is S(u, v) = (u, v, z(u, v)) with u = x and v = y in mm, so
 * Su x Sv = (-z_x, -z_y, 1) points up, out of the wing. Its derivatives are exact:
 *   z_x  = h' 4 e (1 - e) + a' y        z_y  = h 4 (1 - 2 e) / chord + a
 *   z_xx = 0 (h and a are linear in x)  z_xy = h' 4 (1 - 2 e) / chord + a'
 *   z_yy = -8 h / chord^2
 * Header-only (static functions) so the demo stays one translation unit.
 */
#ifndef MOULD_WING_SKIN_H
#define MOULD_WING_SKIN_H

#include <stdint.h>

#include "strake.h"

typedef struct {
    double span;  /* mm */
    double chord; /* mm */
    double crown; /* mm: height of the skin above the chord line at the root, mid-chord */
    double taper; /* fraction of the crown lost at the tip */
    double twist; /* rad: turn of the chord line at the tip */
} WingSkin;

/* z and its derivatives at (x, y): d[0] = z, d[1] = z_x, d[2] = z_y, d[3] = z_xx, d[4] = z_xy,
 * d[5] = z_yy. */
static void wing_height(const WingSkin *w, double x, double y, double d[6])
{
    double e = y / w->chord;
    double h = w->crown * (1.0 - w->taper * x / w->span);
    double dh = -w->crown * w->taper / w->span;
    double a = w->twist * x / w->span;
    double da = w->twist / w->span;
    double bump = 4.0 * e * (1.0 - e);
    double slope = 4.0 * (1.0 - 2.0 * e) / w->chord;
    d[0] = h * bump + a * y;
    d[1] = dh * bump + da * y;
    d[2] = h * slope + a;
    d[3] = 0.0;
    d[4] = dh * slope + da;
    d[5] = -8.0 * h / (w->chord * w->chord);
}

/* The StrakeSurfaceFn: strake passes the WingSkin back as user_data. */
static int32_t wing_surface(void *user_data, double u, double v, int32_t order, StrakeSurfaceJet *out)
{
    double d[6];
    (void)order; /* strake zeroes *out; filling every order is cheap here */
    wing_height((const WingSkin *)user_data, u, v, d);
    out->p[0] = u;
    out->p[1] = v;
    out->p[2] = d[0];
    out->su[0] = 1.0;
    out->su[2] = d[1];
    out->sv[1] = 1.0;
    out->sv[2] = d[2];
    out->suu[2] = d[3];
    out->suv[2] = d[4];
    out->svv[2] = d[5];
    return 0;
}

#endif /* MOULD_WING_SKIN_H */

/*
 * A small evaluator for a non-rational tensor-product B-spline surface: the point and its
 * partial derivatives up to second order (patch_derivs) or fourth (patch_derivs_high). This
 * is the host's own code (a CAM host has its own surface kernel); strake only sees it through
 * the StrakeSurfaceFn and StrakeSurfaceHighFn callbacks.
 *
 * Algorithms from L. Piegl, W. Tiller, The NURBS Book, 2nd ed. (1997):
 *   A2.1 FindSpan (p. 68), A2.3 DersBasisFuns (p. 72), A3.6 SurfaceDerivsAlg1 (p. 111).
 *
 * Header-only (static functions) so a demo is one translation unit.
 */
#ifndef MOULD_BSPLINE_PATCH_H
#define MOULD_BSPLINE_PATCH_H

#define PATCH_MAX_DEGREE 5
#define PATCH_MAX_ORDER (PATCH_MAX_DEGREE + 1)
#define PATCH_MAX_DERIV 4 /* highest partial derivative order of patch_derivs_high */

/* A B-spline patch: count_u x count_v control points, row-major by u index:
 * point (i, j) is net[3 * (i * count_v + j) + 0..2]. Knot vectors have count + degree + 1
 * entries and must be clamped (first and last knot repeated degree + 1 times). */
typedef struct {
    int degree_u, degree_v;
    int count_u, count_v;
    const double *knots_u;
    const double *knots_v;
    const double *net;
} BsplinePatch;

/* A2.1: the knot span index i with knots[i] <= x < knots[i + 1]; the last span at the upper
 * end of the domain. */
static int patch_find_span(int count, int degree, double x, const double *knots)
{
    int n = count - 1;
    int low = degree, high = n + 1, mid;
    if (x >= knots[n + 1]) {
        return n;
    }
    if (x <= knots[degree]) {
        return degree;
    }
    mid = (low + high) / 2;
    while (x < knots[mid] || x >= knots[mid + 1]) {
        if (x < knots[mid]) {
            high = mid;
        } else {
            low = mid;
        }
        mid = (low + high) / 2;
    }
    return mid;
}

/* A2.3: ders[k][r] = k-th derivative of N_{span-degree+r, degree} at x, k = 0..n_ders. */
static void patch_basis_derivs(int span, double x, int degree, int n_ders, const double *knots,
                               double ders[PATCH_MAX_DERIV + 1][PATCH_MAX_ORDER])
{
    double ndu[PATCH_MAX_ORDER][PATCH_MAX_ORDER];
    double a[2][PATCH_MAX_ORDER];
    double left[PATCH_MAX_ORDER], right[PATCH_MAX_ORDER];
    int j, r, k;

    ndu[0][0] = 1.0;
    for (j = 1; j <= degree; j++) {
        double saved = 0.0;
        left[j] = x - knots[span + 1 - j];
        right[j] = knots[span + j] - x;
        for (r = 0; r < j; r++) {
            double temp;
            ndu[j][r] = right[r + 1] + left[j - r];          /* knot differences, lower triangle */
            temp = ndu[r][j - 1] / ndu[j][r];
            ndu[r][j] = saved + right[r + 1] * temp;        /* basis functions, upper triangle */
            saved = left[j - r] * temp;
        }
        ndu[j][j] = saved;
    }
    for (j = 0; j <= degree; j++) {
        ders[0][j] = ndu[j][degree];
    }
    for (k = 1; k <= n_ders; k++) {
        for (j = 0; j <= degree; j++) {
            ders[k][j] = 0.0;
        }
    }
    for (r = 0; r <= degree; r++) {
        int s1 = 0, s2 = 1;
        a[0][0] = 1.0;
        for (k = 1; k <= n_ders && k <= degree; k++) {
            double d = 0.0;
            int rk = r - k, pk = degree - k, j1, j2, t;
            if (r >= k) {
                a[s2][0] = a[s1][0] / ndu[pk + 1][rk];
                d = a[s2][0] * ndu[rk][pk];
            }
            j1 = (rk >= -1) ? 1 : -rk;
            j2 = (r - 1 <= pk) ? k - 1 : degree - r;
            for (j = j1; j <= j2; j++) {
                a[s2][j] = (a[s1][j] - a[s1][j - 1]) / ndu[pk + 1][rk + j];
                d += a[s2][j] * ndu[rk + j][pk];
            }
            if (r <= pk) {
                a[s2][k] = -a[s1][k - 1] / ndu[pk + 1][r];
                d += a[s2][k] * ndu[r][pk];
            }
            ders[k][r] = d;
            t = s1;
            s1 = s2;
            s2 = t;
        }
    }
    /* Multiply by the factors degree!/(degree - k)! (eq. 2.10). */
    {
        double f = degree;
        for (k = 1; k <= n_ders; k++) {
            for (j = 0; j <= degree; j++) {
                ders[k][j] *= f;
            }
            f *= degree - k;
        }
    }
}

/* A3.6: skl[k][l] = d^(k+l) S / du^k dv^l at (u, v) for k + l <= order (order 0..4).
 * Returns 0, or -1 when the patch or order is out of range. (u, v) must lie in the domain. */
static int patch_derivs_high(const BsplinePatch *s, double u, double v, int order,
                             double skl[PATCH_MAX_DERIV + 1][PATCH_MAX_DERIV + 1][3])
{
    double nu[PATCH_MAX_DERIV + 1][PATCH_MAX_ORDER], nv[PATCH_MAX_DERIV + 1][PATCH_MAX_ORDER];
    int p = s->degree_u, q = s->degree_v;
    int uspan, vspan, k, l, r, c, du, dv;

    if (order < 0 || order > PATCH_MAX_DERIV || p < 1 || q < 1 || p > PATCH_MAX_DEGREE || q > PATCH_MAX_DEGREE) {
        return -1;
    }
    for (k = 0; k <= PATCH_MAX_DERIV; k++) {
        for (l = 0; l <= PATCH_MAX_DERIV; l++) {
            for (c = 0; c < 3; c++) {
                skl[k][l][c] = 0.0;
            }
        }
    }
    du = order < p ? order : p;
    dv = order < q ? order : q;
    uspan = patch_find_span(s->count_u, p, u, s->knots_u);
    vspan = patch_find_span(s->count_v, q, v, s->knots_v);
    patch_basis_derivs(uspan, u, p, du, s->knots_u, nu);
    patch_basis_derivs(vspan, v, q, dv, s->knots_v, nv);
    for (k = 0; k <= du; k++) {
        double temp[PATCH_MAX_ORDER][3];
        int dd = (order - k) < dv ? (order - k) : dv;
        for (l = 0; l <= q; l++) {
            for (c = 0; c < 3; c++) {
                temp[l][c] = 0.0;
            }
            for (r = 0; r <= p; r++) {
                const double *pt = &s->net[3 * ((uspan - p + r) * s->count_v + (vspan - q + l))];
                for (c = 0; c < 3; c++) {
                    temp[l][c] += nu[k][r] * pt[c];
                }
            }
        }
        for (l = 0; l <= dd; l++) {
            for (r = 0; r <= q; r++) {
                for (c = 0; c < 3; c++) {
                    skl[k][l][c] += nv[l][r] * temp[r][c];
                }
            }
        }
    }
    return 0;
}

/* The same to second order: skl[k][l] for k + l <= order (order 0..2). Returns 0, or -1 when
 * the patch or order is out of range. */
static int patch_derivs(const BsplinePatch *s, double u, double v, int order, double skl[3][3][3])
{
    double high[PATCH_MAX_DERIV + 1][PATCH_MAX_DERIV + 1][3];
    int k, l, c;
    if (order > 2 || patch_derivs_high(s, u, v, order, high) != 0) {
        return -1;
    }
    for (k = 0; k < 3; k++) {
        for (l = 0; l < 3; l++) {
            for (c = 0; c < 3; c++) {
                skl[k][l][c] = high[k][l][c];
            }
        }
    }
    return 0;
}

#endif /* MOULD_BSPLINE_PATCH_H */

//! The embedded Runge–Kutta pair of the geodesic tracer: the 7-stage 5(4) pair of Dormand and
//! Prince (J. R. Dormand, P. J. Prince, "A family of embedded Runge–Kutta formulae",
//! J. Comput. Appl. Math. 6 (1980) 19–26; tabulated in Hairer, Nørsett, Wanner, *Solving
//! Ordinary Differential Equations I*, §II.5). The last stage is evaluated at the fifth-order
//! solution ("first same as last"), so an accepted step costs six new evaluations: six
//! surface jets. The unit tests check the order conditions up to order 5 for the fifth-order
//! weights and up to order 4 for the embedded ones, so a mistyped coefficient cannot pass.

// `!(x > 0.0)` and the like are meant: they refuse NaN too. Index loops follow the formulas
// (Butcher tableaux, stage sums) term by term.
#![allow(clippy::neg_cmp_op_on_partial_ord, clippy::needless_range_loop)]

/// Number of stages.
pub const STAGES: usize = 7;

/// Nodes cᵢ.
pub const C: [f64; STAGES] = [0.0, 1.0 / 5.0, 3.0 / 10.0, 4.0 / 5.0, 8.0 / 9.0, 1.0, 1.0];

/// Coupling coefficients aᵢⱼ (row i, j < i).
pub const A: [[f64; 6]; STAGES] = [
    [0.0; 6],
    [1.0 / 5.0, 0.0, 0.0, 0.0, 0.0, 0.0],
    [3.0 / 40.0, 9.0 / 40.0, 0.0, 0.0, 0.0, 0.0],
    [44.0 / 45.0, -56.0 / 15.0, 32.0 / 9.0, 0.0, 0.0, 0.0],
    [
        19372.0 / 6561.0,
        -25360.0 / 2187.0,
        64448.0 / 6561.0,
        -212.0 / 729.0,
        0.0,
        0.0,
    ],
    [
        9017.0 / 3168.0,
        -355.0 / 33.0,
        46732.0 / 5247.0,
        49.0 / 176.0,
        -5103.0 / 18656.0,
        0.0,
    ],
    [
        35.0 / 384.0,
        0.0,
        500.0 / 1113.0,
        125.0 / 192.0,
        -2187.0 / 6784.0,
        11.0 / 84.0,
    ],
];

/// Fifth-order weights bᵢ (the last row of [`A`], so the seventh stage is at the solution).
pub const B5: [f64; STAGES] = [
    35.0 / 384.0,
    0.0,
    500.0 / 1113.0,
    125.0 / 192.0,
    -2187.0 / 6784.0,
    11.0 / 84.0,
    0.0,
];

/// Embedded fourth-order weights b̂ᵢ.
pub const B4: [f64; STAGES] = [
    5179.0 / 57600.0,
    0.0,
    7571.0 / 16695.0,
    393.0 / 640.0,
    -92097.0 / 339200.0,
    187.0 / 2100.0,
    1.0 / 40.0,
];

/// Error weights eᵢ = bᵢ − b̂ᵢ: the error estimate of a step of length h is h Σ eᵢ kᵢ.
pub const E: [f64; STAGES] = [
    B5[0] - B4[0],
    B5[1] - B4[1],
    B5[2] - B4[2],
    B5[3] - B4[3],
    B5[4] - B4[4],
    B5[5] - B4[5],
    B5[6] - B4[6],
];

/// The stages of one attempted step that every stage evaluation accepted.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Stages<const N: usize, J> {
    /// The stage derivatives kᵢ (four components each: the state's derivative and, beyond the
    /// state's N components, whatever else the evaluation returns, such as the second
    /// derivatives a curve node needs).
    pub k: [[f64; 4]; STAGES],
    /// The fifth-order solution y + h Σ bᵢ kᵢ.
    pub y5: [f64; N],
    /// The error estimate h Σ eᵢ kᵢ.
    pub err: [f64; N],
    /// What the last stage's evaluation returned with its derivative (the jet there: by
    /// "first same as last" the jet at `y5`).
    pub last: J,
}

/// One attempted Dormand–Prince step of length `h` from the state `y` whose derivative is
/// `k0` (the first N components), with the stages evaluated by `eval`: the geodesic tracer
/// and the fixed-angle course share it, so both sum the tableau in the same order (each stage
/// yᵢ = y + h Σⱼ aᵢⱼ kⱼ, the sums from j = 0 up; y5 and the estimate likewise from i = 0).
/// `Ok(Err(r))`: `eval` refused a stage with `r` (outside the domain, degenerate); the
/// step is to be retried shorter. Errors: those of `eval`.
pub(crate) fn attempt_step<const N: usize, J, R, E>(
    y: &[f64; N],
    k0: [f64; 4],
    h: f64,
    first: J,
    mut eval: impl FnMut(&[f64; N]) -> Result<Result<([f64; 4], J), R>, E>,
) -> Result<Result<Stages<N, J>, R>, E> {
    let mut k = [[0.0; 4]; STAGES];
    k[0] = k0;
    let mut last = first;
    for i in 1..STAGES {
        let mut yi = *y;
        for (c, yc) in yi.iter_mut().enumerate() {
            let mut acc = 0.0;
            for j in 0..i {
                acc += A[i][j] * k[j][c];
            }
            *yc += h * acc;
        }
        match eval(&yi)? {
            Ok((fi, ji)) => {
                k[i] = fi;
                last = ji;
            }
            Err(r) => return Ok(Err(r)),
        }
    }
    let mut y5 = *y;
    let mut err = [0.0; N];
    for c in 0..N {
        let (mut a5, mut ae) = (0.0, 0.0);
        for i in 0..STAGES {
            a5 += B5[i] * k[i][c];
            ae += E[i] * k[i][c];
        }
        y5[c] += h * a5;
        err[c] = h * ae;
    }
    Ok(Ok(Stages { k, y5, err, last }))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn a(i: usize, j: usize) -> f64 {
        if j < 6 { A[i][j] } else { 0.0 }
    }

    /// The shared step sums the tableau in the order the tracer and the course did when each
    /// had its own loop (written out here once more): the same bits, for a state of four
    /// components and of two, and a refusal passed through at the stage that refused.
    #[test]
    fn attempt_step_keeps_the_summation_order() {
        // y' = (y1, -y0, y3, -y2) + a small nonlinearity.
        let f = |y: &[f64]| -> [f64; 4] {
            let g = |i: usize| y.get(i).copied().unwrap_or(0.0);
            [g(1), -g(0) + 0.1 * g(1) * g(1), g(0) * 0.3, -g(1) * g(0)]
        };
        fn written_out<const N: usize>(
            y: [f64; N],
            h: f64,
            f: &dyn Fn(&[f64]) -> [f64; 4],
        ) -> ([f64; N], [f64; N]) {
            let mut k = [[0.0; 4]; STAGES];
            k[0] = f(&y);
            for i in 1..STAGES {
                let mut yi = y;
                for (c, yc) in yi.iter_mut().enumerate() {
                    let mut acc = 0.0;
                    for j in 0..i {
                        acc += A[i][j] * k[j][c];
                    }
                    *yc += h * acc;
                }
                k[i] = f(&yi);
            }
            let mut y5 = y;
            let mut d = [0.0; N];
            for c in 0..N {
                let (mut a5, mut ae) = (0.0, 0.0);
                for i in 0..STAGES {
                    a5 += B5[i] * k[i][c];
                    ae += E[i] * k[i][c];
                }
                y5[c] += h * a5;
                d[c] = h * ae;
            }
            (y5, d)
        }
        let y4 = [0.3, -1.1, 0.7, 0.2];
        let st = attempt_step(&y4, f(&y4), 0.37, 0, |yi| {
            Ok::<_, ()>(Ok::<_, ()>((f(yi), 1)))
        })
        .unwrap()
        .unwrap();
        let (y5, d) = written_out(y4, 0.37, &f);
        assert_eq!(st.y5.map(f64::to_bits), y5.map(f64::to_bits));
        assert_eq!(st.err.map(f64::to_bits), d.map(f64::to_bits));
        assert_eq!(st.last, 1);
        let y2 = [0.3, -1.1];
        let st = attempt_step(&y2, f(&y2), 0.21, 0, |yi| {
            Ok::<_, ()>(Ok::<_, ()>((f(yi), 2)))
        })
        .unwrap()
        .unwrap();
        let (y5, d) = written_out(y2, 0.21, &f);
        assert_eq!(st.y5.map(f64::to_bits), y5.map(f64::to_bits));
        assert_eq!(st.err.map(f64::to_bits), d.map(f64::to_bits));
        let mut calls = 0;
        let r = attempt_step(&y2, f(&y2), 0.21, 0, |yi| {
            calls += 1;
            Ok::<_, ()>(if calls == 3 {
                Err("outside")
            } else {
                Ok((f(yi), 0))
            })
        })
        .unwrap();
        assert!(matches!(r, Err("outside")) && calls == 3);
    }

    /// Row sums: cᵢ = Σⱼ aᵢⱼ (the usual simplifying condition).
    #[test]
    fn nodes_are_row_sums() {
        for i in 0..STAGES {
            let s: f64 = (0..STAGES).map(|j| a(i, j)).sum();
            assert!((s - C[i]).abs() < 1e-14, "row {i}: {s} vs {}", C[i]);
        }
    }

    /// Order conditions (Butcher trees) up to order 5 for B5 and up to order 4 for B4
    /// (Hairer, Nørsett, Wanner, §II.2, Table 2.2).
    #[test]
    fn order_conditions_hold() {
        let ac = |i: usize, f: &dyn Fn(usize) -> f64| (0..STAGES).map(|j| a(i, j) * f(j)).sum();
        let check = |b: &[f64; STAGES], order: usize| {
            let sum = |f: &dyn Fn(usize) -> f64| -> f64 { (0..STAGES).map(|i| b[i] * f(i)).sum() };
            let mut conds: Vec<(f64, f64)> = vec![(sum(&|_| 1.0), 1.0), (sum(&|i| C[i]), 0.5)];
            if order >= 3 {
                conds.push((sum(&|i| C[i] * C[i]), 1.0 / 3.0));
                conds.push((sum(&|i| ac(i, &|j| C[j])), 1.0 / 6.0));
            }
            if order >= 4 {
                conds.push((sum(&|i| C[i].powi(3)), 0.25));
                conds.push((sum(&|i| C[i] * ac(i, &|j| C[j])), 1.0 / 8.0));
                conds.push((sum(&|i| ac(i, &|j| C[j] * C[j])), 1.0 / 12.0));
                conds.push((sum(&|i| ac(i, &|j| ac(j, &|k| C[k]))), 1.0 / 24.0));
            }
            if order >= 5 {
                conds.push((sum(&|i| C[i].powi(4)), 0.2));
                conds.push((sum(&|i| C[i] * C[i] * ac(i, &|j| C[j])), 0.1));
                conds.push((sum(&|i| ac(i, &|j| C[j]).powi(2)), 1.0 / 20.0));
                conds.push((sum(&|i| C[i] * ac(i, &|j| C[j] * C[j])), 1.0 / 15.0));
                conds.push((sum(&|i| ac(i, &|j| C[j].powi(3))), 1.0 / 20.0));
                conds.push((sum(&|i| C[i] * ac(i, &|j| ac(j, &|k| C[k]))), 1.0 / 30.0));
                conds.push((sum(&|i| ac(i, &|j| C[j] * ac(j, &|k| C[k]))), 1.0 / 40.0));
                conds.push((sum(&|i| ac(i, &|j| ac(j, &|k| C[k] * C[k]))), 1.0 / 60.0));
                conds.push((
                    sum(&|i| ac(i, &|j| ac(j, &|k| ac(k, &|l| C[l])))),
                    1.0 / 120.0,
                ));
            }
            for (n, (got, want)) in conds.iter().enumerate() {
                assert!(
                    (got - want).abs() < 1e-14,
                    "order {order}, condition {n}: {got} vs {want}"
                );
            }
        };
        check(&B5, 5);
        check(&B4, 4);
        // The embedded weights are not fifth order (else the estimate would be blind).
        let s: f64 = (0..STAGES).map(|i| B4[i] * C[i].powi(4)).sum();
        assert!((s - 0.2).abs() > 1e-6);
        // First same as last: the seventh stage row equals the fifth-order weights.
        for j in 0..6 {
            assert_eq!(A[6][j], B5[j]);
        }
    }
}

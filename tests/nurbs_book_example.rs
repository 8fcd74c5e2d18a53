//! The worked basis-function example of The NURBS Book, 2nd ed., ch. 2 (§2.2–2.3):
//! U = {0, 0, 0, 1, 2, 3, 4, 4, 5, 5, 5}, p = 2, u = 5/2.
//!
//! The example numbers are [memory; values recomputed] (../shared/REFERENCES.md). Recomputed by
//! hand here from the Cox–de Boor recursion (eq. 2.5) and the derivative formula (eq. 2.7):
//!
//! u = 5/2 lies in [u_4, u_5) = [2, 3): span 4, so N_{4,0} = 1 and every other N_{i,0} = 0.
//! - Degree 1: N_{3,1} = (u_5 − u)/(u_5 − u_4) N_{4,0} = 1/2; N_{4,1} = (u − u_4)/(u_5 − u_4) = 1/2.
//! - Degree 2: N_{2,2} = (u_5 − u)/(u_5 − u_3) N_{3,1} = (1/2)/2 · 1/2 = 1/8;
//!   N_{3,2} = (u − u_3)/(u_5 − u_3) N_{3,1} + (u_6 − u)/(u_6 − u_4) N_{4,1}
//!   = (3/2)/2 · 1/2 + (3/2)/2 · 1/2 = 6/8;
//!   N_{4,2} = (u − u_4)/(u_6 − u_4) N_{4,1} = (1/2)/2 · 1/2 = 1/8.
//! - First derivatives, N'_{i,2} = 2 [N_{i,1}/(u_{i+2} − u_i) − N_{i+1,1}/(u_{i+3} − u_{i+1})]:
//!   N'_{2,2} = 2 [0 − (1/2)/2] = −1/2; N'_{3,2} = 2 [(1/2)/2 − (1/2)/2] = 0;
//!   N'_{4,2} = 2 [(1/2)/2 − 0] = 1/2.
//! - Second derivatives: N'_{3,1} = N_{3,0}/(u_4 − u_3) − N_{4,0}/(u_5 − u_4) = −1,
//!   N'_{4,1} = N_{4,0}/(u_5 − u_4) − N_{5,0}/(u_6 − u_5) = 1, N'_{2,1} = N'_{5,1} = 0;
//!   N''_{2,2} = 2 [0 − (−1)/2] = 1; N''_{3,2} = 2 [(−1)/2 − 1/2] = −2; N''_{4,2} = 2 [1/2 − 0] = 1.

use strake::nurbs::{KnotVector, SpanHint, basis_rows};

const U: [f64; 11] = [0.0, 0.0, 0.0, 1.0, 2.0, 3.0, 4.0, 4.0, 5.0, 5.0, 5.0];

fn close(got: f64, want: f64) -> bool {
    (got - want).abs() <= 1e-14 * want.abs().max(1.0)
}

// Source: The NURBS Book 2nd ed., ch. 2 worked example (A2.1 FindSpan p. 68) [memory; values
// recomputed above].
#[test]
fn span_of_the_worked_example_is_4() {
    let kv = KnotVector::new("u knots", &U, 2, 8).unwrap();
    assert_eq!(kv.find_span(2.5, &mut SpanHint::default()), 4);
    // A stale hint must not change it.
    assert_eq!(kv.find_span(2.5, &mut SpanHint(Some(7))), 4);
    assert_eq!(kv.find_span(2.5, &mut SpanHint(Some(2))), 4);
}

// Source: The NURBS Book 2nd ed., ch. 2 worked example (A2.2 BasisFuns p. 70, A2.3
// DersBasisFuns p. 72) [memory; values recomputed above].
#[test]
fn basis_values_and_derivatives_of_the_worked_example() {
    let rows = basis_rows(&U, 2, 4, 2.5, 2);
    let want = [
        [1.0 / 8.0, 6.0 / 8.0, 1.0 / 8.0],
        [-0.5, 0.0, 0.5],
        [1.0, -2.0, 1.0],
    ];
    for (k, w) in want.iter().enumerate() {
        for (r, &want_r) in w.iter().enumerate() {
            assert!(
                close(rows.d[k][r], want_r),
                "d{k}[{r}] = {} (want {want_r})",
                rows.d[k][r]
            );
        }
    }
    // Partition of unity (The NURBS Book §2.2, properties of the basis functions) and hence
    // of its derivatives: the row sums are 1, 0, 0.
    let sums: Vec<f64> = (0..3).map(|k| rows.d[k][..3].iter().sum()).collect();
    assert!(
        close(sums[0], 1.0) && sums[1].abs() <= 1e-14 && sums[2].abs() <= 1e-14,
        "{sums:?}"
    );
}

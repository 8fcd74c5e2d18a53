//! The block evaluation of curve jets (`UvCurve::jets_in_domain_block`, lane-wide for NURBS
//! curves of degree 1 to 3) gives the bits of the one-point evaluation (`UvCurve::checked_jet`)
//! and carries the span hint as the one-point evaluations do; the batch entry points report the
//! failure of a point-by-point loop when a chunk holds a bad sample.

use strake::analytic::torus;
use strake::{
    CurveJet, CurveOnSurface, FnCurve, Hints, Interval, NurbsCurve, SpanHint, StrakeError, UvCurve,
};

#[path = "support/lcg.rs"]
mod lcg;
use lcg::Lcg;

/// A curve of degree `p` with 9 control points: clamped or not, a double interior knot, random
/// knot spacing and control points, weights when `rational`.
fn random_curve(p: usize, rational: bool, clamped: bool, rng: &mut Lcg) -> NurbsCurve<2> {
    let n = 9;
    let mut knots = Vec::new();
    let mut x = -0.7;
    for i in 0..n + p + 1 {
        let repeat = (clamped && (i <= p || i > n)) || i == p + 3;
        if !repeat {
            x += 0.05 + rng.next();
        }
        knots.push(x);
    }
    let pts: Vec<[f64; 2]> = (0..n)
        .map(|_| [4.0 * rng.next() - 1.0, 3.0 * rng.next() - 2.0])
        .collect();
    let ws: Vec<f64> = (0..n).map(|_| 0.3 + 2.0 * rng.next()).collect();
    NurbsCurve::new(p, &knots, &pts, rational.then_some(&ws[..])).unwrap()
}

fn bits(j: &CurveJet) -> [u64; 6] {
    [j.u, j.v, j.du, j.dv, j.ddu, j.ddv].map(f64::to_bits)
}

/// A parameter of the domain: mostly random, often exactly a knot inside or at the ends of the
/// domain, sometimes the domain ends themselves.
fn pick_t(c: &NurbsCurve<2>, rng: &mut Lcg) -> f64 {
    let dom = c.domain();
    let knots = c.knot_vector().knots();
    match rng.below(8) {
        0 => dom.lo,
        1 => dom.hi,
        2 | 3 => {
            let inside: Vec<f64> = knots
                .iter()
                .copied()
                .filter(|&k| dom.lo <= k && k <= dom.hi)
                .collect();
            inside[rng.below(inside.len())]
        }
        _ => dom.lo + dom.width() * rng.next(),
    }
}

// Common practice: a block evaluation must be the one-point evaluation repeated, bit for bit.
// Degrees 1–3 take the lane-wide path (groups of four, a short last group), degrees 4 and 5
// the point-by-point fallback; chunks of every length 1..=64, marching (sorted) and random
// order, rational and not, clamped and unclamped knot vectors.
#[test]
fn block_jets_are_the_bits_of_one_point_jets() {
    let mut rng = Lcg(42);
    let mut checked = 0;
    for p in 1..=5 {
        for rational in [false, true] {
            for clamped in [true, false] {
                let c = random_curve(p, rational, clamped, &mut rng);
                for len in 1..=64 {
                    let mut ts: Vec<f64> = (0..len).map(|_| pick_t(&c, &mut rng)).collect();
                    if len % 2 == 0 {
                        ts.sort_by(f64::total_cmp);
                    }
                    // Hints as left by an earlier block (or none), carried the same way.
                    let start = if len % 3 == 0 {
                        SpanHint::default()
                    } else {
                        let mut h = SpanHint::default();
                        c.checked_jet(pick_t(&c, &mut rng), &mut h).unwrap();
                        h
                    };
                    let mut h_one = start;
                    let one: Vec<CurveJet> = ts
                        .iter()
                        .map(|&t| c.checked_jet(t, &mut h_one).unwrap())
                        .collect();
                    let mut h_block = start;
                    let mut block = vec![CurveJet::default(); len];
                    c.jets_in_domain_block(&ts, &mut h_block, &mut block)
                        .unwrap();
                    for (i, (a, b)) in block.iter().zip(&one).enumerate() {
                        assert_eq!(
                            bits(a),
                            bits(b),
                            "degree {p}, rational {rational}, clamped {clamped}, chunk of \
                             {len}, point {i} at t = {}: {a:?} vs {b:?}",
                            ts[i]
                        );
                        checked += 1;
                    }
                    assert_eq!(h_block, h_one, "degree {p}: hint after the block");
                    // Through a reference (the forwarding impl) the same.
                    let mut again = vec![CurveJet::default(); len];
                    let mut h_ref = start;
                    let by_ref: &NurbsCurve<2> = &c;
                    <&NurbsCurve<2> as UvCurve>::jets_in_domain_block(
                        &by_ref, &ts, &mut h_ref, &mut again,
                    )
                    .unwrap();
                    assert_eq!(again, block);
                }
            }
        }
    }
    assert_eq!(checked, 5 * 2 * 2 * (64 * 65 / 2));
}

// The default block evaluation (one point after the other) reports a source failure at its
// index, with the points before it written.
#[test]
fn default_block_reports_the_failing_point() {
    let c = FnCurve::new(Interval::new("t", 0.0, 1.0).unwrap(), |t| {
        if t > 0.5 {
            Err(StrakeError::InvalidArgument(format!("refused t = {t}")))
        } else {
            Ok(CurveJet {
                u: t,
                v: 2.0 * t,
                du: 1.0,
                dv: 2.0,
                ddu: 0.0,
                ddv: 0.0,
            })
        }
    });
    let ts: Vec<f64> = (0..10).map(|i| i as f64 / 12.0).collect();
    let mut out = vec![CurveJet::default(); 10];
    let e = c
        .jets_in_domain_block(&ts, &mut SpanHint::default(), &mut out)
        .unwrap_err();
    // ts[7] = 7/12 is the first above 0.5.
    match e {
        StrakeError::AtPoint { index, error } => {
            assert_eq!(index, 7);
            assert!(matches!(*error, StrakeError::InvalidArgument(_)));
        }
        other => panic!("expected AtPoint, got {other:?}"),
    }
    for (i, j) in out[..7].iter().enumerate() {
        assert_eq!(j.u, ts[i]);
    }
    assert_eq!(out[7], CurveJet::default());
}

/// The first failure of a point-by-point loop over `CurveOnSurface::frame`: index, t, error.
fn first_failure<S: strake::SurfaceSource, C: UvCurve>(
    cs: &CurveOnSurface<'_, S, C>,
    ts: &[f64],
) -> Option<(usize, f64, StrakeError)> {
    let mut h = Hints::default();
    ts.iter()
        .enumerate()
        .find_map(|(i, &t)| cs.frame(t, &mut h).err().map(|e| (i, t, e)))
}

// A chunk holding a bad t (outside the curve's domain, NaN), a curve jet leaving the surface's
// domain, a non-finite curve jet or a failing source, alone and several in one chunk: the batch
// reports the sample, t and error a point-by-point loop meets first, and has emitted every
// frame before it.
#[test]
fn batch_reports_the_first_bad_sample_of_a_chunk() {
    let s = torus(5.0, 1.5);
    // u = 4 t, v = 1 + t on t in [0, 2]: u leaves the torus domain [0, 2π] for t > π/2; the
    // source refuses t in (1.9, 1.95) and gives a NaN jet for t in (1.2, 1.25).
    let fc = FnCurve::new(Interval::new("t", 0.0, 2.0).unwrap(), |t| {
        if t > 1.9 && t < 1.95 {
            return Err(StrakeError::InvalidArgument(format!("refused t = {t}")));
        }
        let ddv = if t > 1.2 && t < 1.25 { f64::NAN } else { 0.0 };
        Ok(CurveJet {
            u: 4.0 * t,
            v: 1.0 + t,
            du: 4.0,
            dv: 1.0,
            ddu: 0.0,
            ddv,
        })
    });
    // The NURBS line from (0.5, 1) to (7, 2): u leaves the domain near t = 0.89.
    let line = strake::uv_line(0.5, 1.0, 7.0, 2.0).unwrap();
    let cs_f = CurveOnSurface::new(&s, &fc);
    let cs_n = CurveOnSurface::new(&s, &line);
    let n = 200;
    let base: Vec<f64> = (0..n).map(|i| 0.3 * i as f64 / n as f64).collect();
    type Edit = fn(&mut [f64]);
    let edits: [(&str, Edit); 9] = [
        ("u outside (line)", |ts| ts[50] = 0.95),
        ("u outside (line) in the last lanes", |ts| {
            ts[62] = 0.95;
            ts[63] = f64::INFINITY
        }),
        ("t above the domain", |ts| ts[100] = 2.5),
        ("NaN t", |ts| ts[137] = f64::NAN),
        ("u outside, then a bad t", |ts| {
            ts[70] = 1.6;
            ts[90] = f64::NAN
        }),
        ("bad t, then u outside", |ts| {
            ts[70] = -1.0;
            ts[90] = 1.6
        }),
        ("NaN jet before a bad t", |ts| {
            ts[130] = 1.22;
            ts[140] = 3.0
        }),
        ("source failure then u outside", |ts| {
            ts[64] = 1.92;
            ts[65] = 1.6
        }),
        ("u outside in two chunks", |ts| {
            ts[127] = 1.6;
            ts[128] = 1.7
        }),
    ];
    for (what, edit) in edits {
        let mut ts = base.clone();
        edit(&mut ts);
        let mut failures = 0;
        for (name, failure, result) in [
            ("closure curve", first_failure(&cs_f, &ts), {
                let mut out = vec![cs_f.frame(0.0, &mut Hints::default()).unwrap(); n];
                cs_f.frames_at(&ts, &mut out).map(|()| out)
            }),
            ("NURBS line", first_failure(&cs_n, &ts), {
                let mut out = vec![cs_n.frame(0.0, &mut Hints::default()).unwrap(); n];
                cs_n.frames_at(&ts, &mut out).map(|()| out)
            }),
        ] {
            let Some((index, t, error)) = failure else {
                assert!(result.is_ok(), "{name}, {what}: {result:?}");
                continue;
            };
            failures += 1;
            let e = result.expect_err(what);
            assert_eq!(e.index, index, "{name}, {what}");
            assert_eq!(e.t.to_bits(), t.to_bits(), "{name}, {what}");
            // Debug text: exact for every value (shortest round trip) and equal for NaNs.
            assert_eq!(
                format!("{:?}", e.error),
                format!("{error:?}"),
                "{name}, {what}"
            );
        }
        assert!(failures > 0, "{what}: no sample fails");
    }
    // The samples before the failure are written, bit for bit those of `frame`.
    let mut ts = base.clone();
    ts[77] = 0.95;
    let mut out = vec![cs_n.frame(0.0, &mut Hints::default()).unwrap(); n];
    let e = cs_n.frames_at(&ts, &mut out).unwrap_err();
    assert_eq!(e.index, 77);
    let mut h = Hints::default();
    for (i, (f, &t)) in out.iter().zip(&ts).take(77).enumerate() {
        assert_eq!(*f, cs_n.frame(t, &mut h).unwrap(), "sample {i}");
    }
}

//! Reader for the reference frames in `tests/reference/frames.txt` (written by
//! `tests/reference/gen_frames.py`, sympy + mpmath), and the comparison rule every pass over
//! them uses (the Rust API here; the C ABI can include this file too with
//! `#[path = "support/reference.rs"] mod reference;`).
//!
//! File format: lines starting with `#` are comments; the first other line names the columns,
//! separated by white space; every further line is one sample with one token per column. The
//! first two columns are words (surface and path names), the rest decimal numbers with 30
//! significant digits. Columns are looked up by name, so their order may change.

#![allow(dead_code)]

use std::collections::HashMap;

/// Relative tolerance of the reference comparison (issue 4: "all reference samples agree to
/// 1e-12 relative, or 1e-12 absolute where the expected value is 0").
pub const REFERENCE_TOL: f64 = 1e-12;

/// One reference sample: a point of a curve on a surface with everything expected there.
#[derive(Debug, Clone, PartialEq)]
pub struct ReferenceSample {
    /// Surface name (`ellipsoid`, `torus`, ...).
    pub surface: String,
    /// Path name on that surface (`slanted`, `asymptotic-x`, ...). Names starting with
    /// `asymptotic` are asymptotic lines (kn = 0).
    pub path: String,
    /// Widths of the surface's u and v domains and of the curve's t domain (they enter the
    /// conditioning figures only).
    pub u_extent: f64,
    /// See `u_extent`.
    pub v_extent: f64,
    /// See `u_extent`.
    pub t_extent: f64,
    /// Curve parameter of the sample.
    pub t: f64,
    /// Surface jet at (u, v): S, Su, Sv, Suu, Suv, Svv.
    pub jet: [[f64; 3]; 6],
    /// Curve jet: u, v, u', v', u'', v''.
    pub curve: [f64; 6],
    /// Expected unit tangent T.
    pub tangent: [f64; 3],
    /// Expected B = N x T.
    pub binormal: [f64; 3],
    /// Expected unit normal N = Su x Sv / |Su x Sv|.
    pub normal: [f64; 3],
    /// Expected normal curvature.
    pub kn: f64,
    /// Expected geodesic curvature.
    pub kg: f64,
    /// Expected geodesic torsion.
    pub tg: f64,
    /// Expected principal curvatures k1 >= k2.
    pub k1: f64,
    /// See `k1`.
    pub k2: f64,
    /// Expected mean curvature.
    pub mean: f64,
    /// Expected Gaussian curvature.
    pub gaussian: f64,
    /// Expected surface conditioning figure.
    pub cond_surface: f64,
    /// Expected curve speed figure.
    pub cond_curve: f64,
}

impl ReferenceSample {
    /// `surface/path t=...`, for messages.
    pub fn label(&self) -> String {
        format!("{}/{} t={}", self.surface, self.path, self.t)
    }

    /// True on an asymptotic line (kn = 0 there, and tg^2 = -K).
    pub fn is_asymptotic(&self) -> bool {
        self.path.starts_with("asymptotic")
    }
}

/// Path of the committed reference file.
pub fn reference_path() -> std::path::PathBuf {
    std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/reference/frames.txt")
}

/// Reads and parses the committed reference file; panics with the reason if it cannot.
pub fn load_reference() -> Vec<ReferenceSample> {
    let path = reference_path();
    let text = std::fs::read_to_string(&path)
        .unwrap_or_else(|e| panic!("cannot read {}: {e}", path.display()));
    parse_reference(&text).unwrap_or_else(|e| panic!("{}: {e}", path.display()))
}

/// Parses the text of a reference file. Errors name the line and column that is wrong.
pub fn parse_reference(text: &str) -> Result<Vec<ReferenceSample>, String> {
    let mut lines = text
        .lines()
        .enumerate()
        .filter(|(_, l)| !l.trim_start().starts_with('#') && !l.trim().is_empty());
    let (_, header) = lines.next().ok_or("no column header line")?;
    let columns: Vec<&str> = header.split_whitespace().collect();
    let index: HashMap<&str, usize> = columns.iter().enumerate().map(|(i, c)| (*c, i)).collect();
    if index.len() != columns.len() {
        return Err("duplicate column name in the header".into());
    }
    let col = |name: &str| {
        index
            .get(name)
            .copied()
            .ok_or_else(|| format!("missing column `{name}`"))
    };
    let vec_cols = |name: &str| -> Result<[usize; 3], String> {
        Ok([
            col(&format!("{name}.x"))?,
            col(&format!("{name}.y"))?,
            col(&format!("{name}.z"))?,
        ])
    };
    let jet_cols = [
        vec_cols("S")?,
        vec_cols("Su")?,
        vec_cols("Sv")?,
        vec_cols("Suu")?,
        vec_cols("Suv")?,
        vec_cols("Svv")?,
    ];
    let curve_cols = [
        col("u")?,
        col("v")?,
        col("du")?,
        col("dv")?,
        col("ddu")?,
        col("ddv")?,
    ];
    let (t_cols, b_cols, n_cols) = (vec_cols("T")?, vec_cols("B")?, vec_cols("N")?);
    let (surface_col, path_col) = (col("surface")?, col("path")?);
    let scalar_names = [
        "u_extent",
        "v_extent",
        "t_extent",
        "t",
        "kn",
        "kg",
        "tg",
        "k1",
        "k2",
        "H",
        "K",
        "cond_surface",
        "cond_curve",
    ];
    let mut scalar_cols = [0usize; 13];
    for (slot, name) in scalar_cols.iter_mut().zip(scalar_names) {
        *slot = col(name)?;
    }

    let mut out = Vec::new();
    for (lineno, line) in lines {
        let tokens: Vec<&str> = line.split_whitespace().collect();
        if tokens.len() != columns.len() {
            return Err(format!(
                "line {}: {} fields, expected {}",
                lineno + 1,
                tokens.len(),
                columns.len()
            ));
        }
        let num = |c: usize| -> Result<f64, String> {
            let x: f64 = tokens[c].parse().map_err(|e| {
                format!(
                    "line {}, column `{}`: `{}` is not a number ({e})",
                    lineno + 1,
                    columns[c],
                    tokens[c]
                )
            })?;
            if x.is_finite() {
                Ok(x)
            } else {
                Err(format!(
                    "line {}, column `{}`: `{}` is not finite",
                    lineno + 1,
                    columns[c],
                    tokens[c]
                ))
            }
        };
        let vec3 = |c: [usize; 3]| -> Result<[f64; 3], String> {
            Ok([num(c[0])?, num(c[1])?, num(c[2])?])
        };
        let mut jet = [[0.0; 3]; 6];
        for (slot, c) in jet.iter_mut().zip(jet_cols) {
            *slot = vec3(c)?;
        }
        let mut curve = [0.0; 6];
        for (slot, c) in curve.iter_mut().zip(curve_cols) {
            *slot = num(c)?;
        }
        let mut s = [0.0; 13];
        for (slot, c) in s.iter_mut().zip(scalar_cols) {
            *slot = num(c)?;
        }
        out.push(ReferenceSample {
            surface: tokens[surface_col].to_string(),
            path: tokens[path_col].to_string(),
            u_extent: s[0],
            v_extent: s[1],
            t_extent: s[2],
            t: s[3],
            jet,
            curve,
            tangent: vec3(t_cols)?,
            binormal: vec3(b_cols)?,
            normal: vec3(n_cols)?,
            kn: s[4],
            kg: s[5],
            tg: s[6],
            k1: s[7],
            k2: s[8],
            mean: s[9],
            gaussian: s[10],
            cond_surface: s[11],
            cond_curve: s[12],
        });
    }
    if out.is_empty() {
        return Err("no samples".into());
    }
    Ok(out)
}

/// The error of a scalar under the reference rule: |got − want| / |want|, or |got − want|
/// where the expected value is exactly 0 (issue 4's rule). Passes when ≤ [`REFERENCE_TOL`].
pub fn scalar_error(got: f64, want: f64) -> f64 {
    let diff = (got - want).abs();
    if want == 0.0 { diff } else { diff / want.abs() }
}

/// The error of a vector under the reference rule: max over components of
/// |got_i − want_i| / |want|. Each component is judged against the vector's length, not its own
/// size: a component that is small by accident (a tangent nearly along an axis) carries the
/// absolute error of the whole vector, so a per-component relative rule would fail on correct
/// results (common practice in numerical linear algebra: normwise, not componentwise, error).
/// For the unit vectors T, B, N this is an absolute error per component.
pub fn vector_error(got: [f64; 3], want: [f64; 3]) -> f64 {
    let len = (want[0] * want[0] + want[1] * want[1] + want[2] * want[2]).sqrt();
    let diff = (0..3).map(|i| (got[i] - want[i]).abs()).fold(0.0, f64::max);
    if len == 0.0 { diff } else { diff / len }
}

/// Collects named errors of one sample and formats those above the tolerance.
#[derive(Debug, Default)]
pub struct ErrorLog {
    /// Worst error seen per field name, over all samples.
    pub worst: Vec<(String, f64, String)>,
    /// One line per failed field.
    pub failures: Vec<String>,
}

impl ErrorLog {
    /// Records the error `err` of field `field` at sample `label`; a failure when above `tol`
    /// or NaN.
    pub fn record(&mut self, label: &str, field: &str, err: f64, tol: f64) {
        if err.is_nan() || err > tol {
            self.failures
                .push(format!("{label}: {field} error {err:.3e} > {tol:.0e}"));
        }
        match self.worst.iter_mut().find(|(f, _, _)| f == field) {
            Some(entry) => {
                if err.is_nan() || err > entry.1 {
                    *entry = (field.to_string(), err, label.to_string());
                }
            }
            None => self.worst.push((field.to_string(), err, label.to_string())),
        }
    }

    /// Panics listing every failure, after printing the worst error per field.
    pub fn finish(&self, what: &str) {
        for (field, err, label) in &self.worst {
            println!("{what}: worst {field} error {err:.2e} at {label}");
        }
        assert!(
            self.failures.is_empty(),
            "{what}: {} failures:\n{}",
            self.failures.len(),
            self.failures.join("\n")
        );
    }
}

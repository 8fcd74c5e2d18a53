//! Numbers in messages, printed the way C users read them (the rules of C's `%g`):
//!
//! - [`Num`]: an explanatory value (a tolerance, a distance, a conditioning figure) with at
//!   most 6 significant digits, trailing zeros dropped, plain decimal when the decimal exponent
//!   is in −4 ..= 5 and `d.ddddde±XX` otherwise: `0.499471`, `4.99471e-07`, `1e-100`, `0`.
//! - [`Exact`]: a value the host may need to find again exactly (a parameter, a knot, a value
//!   at fault): the shortest digits that read back to the same f64 (up to 17), in the same
//!   layout: `0.49947054245269523`, `1e+300`, `-3.5`, `0`.
//!
//! - [`ExactVec`]: a vector or point (a direction, an axis, a frame vector at fault) as the
//!   tuple of its components, each as [`Exact`]: `(1, 0, 2.5e-300)`.
//!
//! All print `inf`, `-inf` and `NaN` (spelt as the rest of the messages always have, so that
//! a host matching on it keeps working), and −0 as `-0`.

use std::fmt;

/// An explanatory number: 6 significant digits at most, `%g` layout.
#[derive(Debug, Clone, Copy)]
pub struct Num(pub f64);

/// An exact number: the shortest round-trip digits, `%g` layout.
#[derive(Debug, Clone, Copy)]
pub struct Exact(pub f64);

impl fmt::Display for Num {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write_g(f, self.0, Some(6))
    }
}

impl fmt::Display for Exact {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write_g(f, self.0, None)
    }
}

/// Exact components of a vector or point: `(x, y, z)`, each as [`Exact`] prints it.
#[derive(Debug, Clone, Copy)]
pub struct ExactVec<'a>(pub &'a [f64]);

impl fmt::Display for ExactVec<'_> {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str("(")?;
        for (i, &x) in self.0.iter().enumerate() {
            if i > 0 {
                f.write_str(", ")?;
            }
            write_g(f, x, None)?;
        }
        f.write_str(")")
    }
}

/// Writes `x` in `%g` layout with `digits` significant digits (`None`: shortest round trip).
fn write_g(f: &mut fmt::Formatter<'_>, x: f64, digits: Option<usize>) -> fmt::Result {
    if x.is_nan() {
        return f.write_str("NaN");
    }
    if x.is_infinite() {
        return f.write_str(if x < 0.0 { "-inf" } else { "inf" });
    }
    if x == 0.0 {
        return f.write_str(if x.is_sign_negative() { "-0" } else { "0" });
    }
    // Rust's `{:e}` gives the digits and the decimal exponent: "4.9947e-1".
    let sci = match digits {
        Some(d) => format!("{:.*e}", d - 1, x),
        None => format!("{x:e}"),
    };
    let (mantissa, exp) = sci.split_once('e').expect("{:e} has an exponent");
    let exp: i32 = exp.parse().expect("{:e} exponent is an integer");
    let (sign, mantissa) = match mantissa.strip_prefix('-') {
        Some(m) => ("-", m),
        None => ("", mantissa),
    };
    let digits: String = mantissa.chars().filter(|c| *c != '.').collect();
    let digits = digits.trim_end_matches('0');
    let digits = if digits.is_empty() { "0" } else { digits };
    f.write_str(sign)?;
    if (-4..=5).contains(&exp) || (digits.len() as i32 > exp + 1 && (-4..17).contains(&exp)) {
        // Plain decimal: the digits with the point placed by the exponent.
        if exp < 0 {
            f.write_str("0.")?;
            for _ in 0..(-exp - 1) {
                f.write_str("0")?;
            }
            f.write_str(digits)
        } else {
            let int_len = exp as usize + 1;
            if digits.len() <= int_len {
                f.write_str(digits)?;
                for _ in digits.len()..int_len {
                    f.write_str("0")?;
                }
                Ok(())
            } else {
                write!(f, "{}.{}", &digits[..int_len], &digits[int_len..])
            }
        }
    } else {
        let (first, rest) = digits.split_at(1);
        f.write_str(first)?;
        if !rest.is_empty() {
            write!(f, ".{rest}")?;
        }
        write!(
            f,
            "e{}{:02}",
            if exp < 0 { '-' } else { '+' },
            exp.unsigned_abs()
        )
    }
}

#[cfg(test)]
#[allow(clippy::excessive_precision)]
mod tests {
    use super::*;

    // The layout of C's `%g` (C11 7.21.6.1: style e when the exponent is below −4 or at least
    // the precision, trailing zeros removed); the values below are what `printf("%g")` prints
    // (checked by hand against the rule).
    #[test]
    fn explanatory_numbers_read_as_c_prints_them() {
        let cases = [
            (0.49947054245269523, "0.499471"),
            (4.9947054245269523e-7, "4.99471e-07"),
            (1e-100, "1e-100"),
            (0.0, "0"),
            (-0.0, "-0"),
            (123456.0, "123456"),
            (1234567.0, "1.23457e+06"),
            (0.0001, "0.0001"),
            (0.00001, "1e-05"),
            (-2.5, "-2.5"),
            (1e300, "1e+300"),
            (f64::INFINITY, "inf"),
            (f64::NEG_INFINITY, "-inf"),
            (f64::NAN, "NaN"),
            (999999.7, "1e+06"),
        ];
        for (x, want) in cases {
            assert_eq!(Num(x).to_string(), want, "{x:e}");
        }
    }

    // Vectors: the components as `Exact` prints them, in parentheses (the layout of the
    // messages' "(u, v) = (0, 0.25)").
    #[test]
    fn vectors_print_their_components_exactly() {
        assert_eq!(
            ExactVec(&[1.0, 0.0, -2.5e-300]).to_string(),
            "(1, 0, -2.5e-300)"
        );
        assert_eq!(ExactVec(&[f64::NAN, 1e300]).to_string(), "(NaN, 1e+300)");
        assert_eq!(ExactVec(&[0.1]).to_string(), "(0.1)");
        assert_eq!(ExactVec(&[]).to_string(), "()");
    }

    // Exact values keep every digit needed to read the same f64 back.
    #[test]
    fn exact_numbers_round_trip() {
        assert_eq!(
            Exact(0.49947054245269523).to_string(),
            "0.49947054245269523"
        );
        assert_eq!(Exact(0.0).to_string(), "0");
        assert_eq!(Exact(1e300).to_string(), "1e+300");
        assert_eq!(Exact(0.7).to_string(), "0.7");
        assert_eq!(Exact(1.5e-10).to_string(), "1.5e-10");
        assert_eq!(Exact(-12345678.25).to_string(), "-12345678.25");
        let mut x = 0.1_f64;
        for _ in 0..2000 {
            x = x * 1.37 + 1e-3 * x.sin();
            if !x.is_finite() {
                x = 3.3e-200;
            }
            for y in [x, 1.0 / x, -x] {
                let s = Exact(y).to_string();
                assert_eq!(s.parse::<f64>().unwrap(), y, "{s}");
            }
        }
    }
}

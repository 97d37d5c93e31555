//! One-dimensional minimisation by Brent's method (R. P. Brent, *Algorithms for
//! Minimization without Derivatives*, 1973, ch. 5): golden-section steps safeguarded
//! with parabolic interpolation.

const GOLDEN: f64 = 0.381_966_011_250_105_1; // (3 − √5)/2

/// Minimises `f` on [a, b]; `tol` is the relative tolerance on the abscissa. Returns
/// (x, f(x)). A minimum on the boundary is returned as the boundary.
pub fn minimize(mut f: impl FnMut(f64) -> f64, a: f64, b: f64, tol: f64) -> (f64, f64) {
    let (mut a, mut b) = (a.min(b), a.max(b));
    let mut x = a + GOLDEN * (b - a);
    let (mut w, mut v) = (x, x);
    let mut fx = f(x);
    let (mut fw, mut fv) = (fx, fx);
    let (mut d, mut e) = (0.0f64, 0.0f64);
    for _ in 0..500 {
        let xm = 0.5 * (a + b);
        let tol1 = tol * x.abs() + 1e-14;
        let tol2 = 2.0 * tol1;
        if (x - xm).abs() <= tol2 - 0.5 * (b - a) {
            break;
        }
        let mut golden = true;
        if e.abs() > tol1 {
            let r = (x - w) * (fx - fv);
            let mut q = (x - v) * (fx - fw);
            let mut p = (x - v) * q - (x - w) * r;
            q = 2.0 * (q - r);
            if q > 0.0 {
                p = -p;
            } else {
                q = -q;
            }
            let e_old = e;
            if p.abs() < (0.5 * q * e_old).abs() && p > q * (a - x) && p < q * (b - x) {
                e = d;
                d = p / q;
                let u = x + d;
                if u - a < tol2 || b - u < tol2 {
                    d = tol1.copysign(xm - x);
                }
                golden = false;
            }
        }
        if golden {
            e = if x >= xm { a - x } else { b - x };
            d = GOLDEN * e;
        }
        let u = if d.abs() >= tol1 {
            x + d
        } else {
            x + tol1.copysign(d)
        };
        let fu = f(u);
        if fu <= fx {
            if u >= x {
                a = x;
            } else {
                b = x;
            }
            (v, fv, w, fw, x, fx) = (w, fw, x, fx, u, fu);
        } else {
            if u < x {
                a = u;
            } else {
                b = u;
            }
            if fu <= fw || w == x {
                (v, fv, w, fw) = (w, fw, u, fu);
            } else if fu <= fv || v == x || v == w {
                (v, fv) = (u, fu);
            }
        }
    }
    (x, fx)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn finds_known_minima() {
        // (x − 1.234)² + 3 has its minimum at 1.234 (exact by construction).
        let (x, fx) = minimize(|x| (x - 1.234).powi(2) + 3.0, 0.0, 5.0, 1e-10);
        assert!((x - 1.234).abs() < 1e-8 && (fx - 3.0).abs() < 1e-15);
        // cos has its minimum at π on [2, 4].
        let (x, _) = minimize(f64::cos, 2.0, 4.0, 1e-10);
        assert!((x - std::f64::consts::PI).abs() < 1e-7);
        // A monotone function ends at the boundary.
        let (x, _) = minimize(|x| x, 1.0, 2.0, 1e-10);
        assert!((x - 1.0).abs() < 1e-8);
    }
}

//! Small numerical tools: adaptive Gauss-Kronrod quadrature, Brent's root
//! finder and golden-section search. They are written here rather than taken
//! from a crate to keep the dependency tree lean; each is a textbook method
//! with a stated tolerance.

/// Relative tolerance of [`integrate`]: the adaptive quadrature stops when the
/// Gauss/Kronrod error estimate is below this fraction of the integral.
pub const QUADRATURE_TOLERANCE: f64 = 1e-10;

// Gauss-Kronrod 7-15 nodes and weights on [-1, 1] (the QUADPACK QK15 table).
// Index 7 is the centre node; odd indices 1, 3, 5 are also Gauss nodes.
const XGK: [f64; 8] = [
    0.991_455_371_120_812_6,
    0.949_107_912_342_758_5,
    0.864_864_423_359_769_1,
    0.741_531_185_599_394_4,
    0.586_087_235_467_691_1,
    0.405_845_151_377_397_2,
    0.207_784_955_007_898_5,
    0.0,
];
const WGK: [f64; 8] = [
    0.022_935_322_010_529_22,
    0.063_092_092_629_978_55,
    0.104_790_010_322_250_2,
    0.140_653_259_715_525_9,
    0.169_004_726_639_267_9,
    0.190_350_578_064_785_4,
    0.204_432_940_075_298_9,
    0.209_482_141_084_727_8,
];
// Weights of the embedded 7-point Gauss rule, for nodes XGK[1], XGK[3], XGK[5], XGK[7].
const WG: [f64; 4] =
    [0.129_484_966_168_869_7, 0.279_705_391_489_276_7, 0.381_830_050_505_118_9, 0.417_959_183_673_469_4];

/// One Gauss-Kronrod 7-15 step on [a, b]: (Kronrod estimate, |Kronrod − Gauss|).
fn gk15<F: Fn(f64) -> f64>(f: &F, a: f64, b: f64) -> (f64, f64) {
    let c = 0.5 * (a + b);
    let h = 0.5 * (b - a);
    let fc = f(c);
    let mut k = WGK[7] * fc;
    let mut g = WG[3] * fc;
    for i in 0..7 {
        let dx = h * XGK[i];
        let s = f(c - dx) + f(c + dx);
        k += WGK[i] * s;
        if i % 2 == 1 {
            g += WG[i / 2] * s;
        }
    }
    (k * h, ((k - g) * h).abs())
}

/// Integrates `f` over [a, b] by adaptive Gauss-Kronrod 7-15 bisection until
/// the error estimate is below [`QUADRATURE_TOLERANCE`] relative to the
/// result (or 1e-300 absolute for a zero integral). The integrand must be
/// finite on [a, b]; smooth integrands converge in a handful of panels.
pub fn integrate<F: Fn(f64) -> f64>(f: F, a: f64, b: f64) -> f64 {
    let (whole, err) = gk15(&f, a, b);
    let tol = (QUADRATURE_TOLERANCE * whole.abs()).max(1e-300);
    if err <= tol {
        return whole;
    }
    refine(&f, a, b, whole, tol, 0)
}

fn refine<F: Fn(f64) -> f64>(f: &F, a: f64, b: f64, whole: f64, tol: f64, depth: u32) -> f64 {
    let m = 0.5 * (a + b);
    let (left, el) = gk15(f, a, m);
    let (right, er) = gk15(f, m, b);
    // Stop on a converged pair, or at a depth where the panels are so narrow
    // that more bisection cannot help (the estimate is then already accurate
    // to rounding for any integrand finite on the interval).
    if el + er <= tol || depth >= 40 || (left + right - whole).abs() <= tol * 1e-3 {
        return left + right;
    }
    refine(f, a, m, left, 0.5 * tol, depth + 1) + refine(f, m, b, right, 0.5 * tol, depth + 1)
}

/// Finds a root of `f` in [a, b] by Brent's method (bisection, secant and
/// inverse quadratic interpolation). `f(a)` and `f(b)` must not have the same
/// sign; when they do, the end with the smaller |f| is returned. Converges to
/// `tol` in the argument.
pub fn brent_root<F: Fn(f64) -> f64>(f: F, a: f64, b: f64, tol: f64) -> f64 {
    let (mut a, mut b) = (a, b);
    let (mut fa, mut fb) = (f(a), f(b));
    if fa == 0.0 {
        return a;
    }
    if fb == 0.0 {
        return b;
    }
    if fa.signum() == fb.signum() {
        return if fa.abs() < fb.abs() { a } else { b };
    }
    let (mut c, mut fc) = (a, fa);
    let mut d = b - a;
    let mut e = d;
    for _ in 0..200 {
        if fb.signum() == fc.signum() {
            c = a;
            fc = fa;
            d = b - a;
            e = d;
        }
        if fc.abs() < fb.abs() {
            a = b;
            b = c;
            c = a;
            fa = fb;
            fb = fc;
            fc = fa;
        }
        let tol1 = 2.0 * f64::EPSILON * b.abs() + 0.5 * tol;
        let xm = 0.5 * (c - b);
        if xm.abs() <= tol1 || fb == 0.0 {
            return b;
        }
        if e.abs() >= tol1 && fa.abs() > fb.abs() {
            let s = fb / fa;
            let (mut p, mut q);
            if a == c {
                p = 2.0 * xm * s;
                q = 1.0 - s;
            } else {
                let qq = fa / fc;
                let r = fb / fc;
                p = s * (2.0 * xm * qq * (qq - r) - (b - a) * (r - 1.0));
                q = (qq - 1.0) * (r - 1.0) * (s - 1.0);
            }
            if p > 0.0 {
                q = -q;
            }
            p = p.abs();
            let min1 = 3.0 * xm * q - (tol1 * q).abs();
            let min2 = (e * q).abs();
            if 2.0 * p < min1.min(min2) {
                e = d;
                d = p / q;
            } else {
                d = xm;
                e = d;
            }
        } else {
            d = xm;
            e = d;
        }
        a = b;
        fa = fb;
        b += if d.abs() > tol1 { d } else { tol1.copysign(xm) };
        fb = f(b);
    }
    b
}

/// Maximises a unimodal `f` on [a, b] by golden-section search to `tol` in
/// the argument; returns (argument, value). The ends are compared too, so a
/// maximum at an end of the bracket is found.
pub fn golden_max<F: Fn(f64) -> f64>(f: F, a: f64, b: f64, tol: f64) -> (f64, f64) {
    let inv_phi = (5f64.sqrt() - 1.0) / 2.0;
    let (mut lo, mut hi) = (a, b);
    let mut x1 = hi - inv_phi * (hi - lo);
    let mut x2 = lo + inv_phi * (hi - lo);
    let (mut f1, mut f2) = (f(x1), f(x2));
    for _ in 0..200 {
        if (hi - lo).abs() <= tol {
            break;
        }
        if f1 < f2 {
            lo = x1;
            x1 = x2;
            f1 = f2;
            x2 = lo + inv_phi * (hi - lo);
            f2 = f(x2);
        } else {
            hi = x2;
            x2 = x1;
            f2 = f1;
            x1 = hi - inv_phi * (hi - lo);
            f1 = f(x1);
        }
    }
    let mut best = if f1 >= f2 { (x1, f1) } else { (x2, f2) };
    for x in [a, b] {
        let v = f(x);
        if v > best.1 {
            best = (x, v);
        }
    }
    best
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn kronrod_weights_integrate_polynomials_exactly() {
        // ∫_{-1}^{1} x^n dx = 2/(n+1) for even n (mathematics handbook); the
        // 15-point Kronrod rule is exact to degree 22, the 7-point Gauss rule to 13.
        for n in [0, 2, 4, 10, 20, 22] {
            let (k, _) = gk15(&|x: f64| x.powi(n), -1.0, 1.0);
            assert!((k - 2.0 / (n as f64 + 1.0)).abs() < 1e-14, "degree {n}: {k}");
        }
    }

    #[test]
    fn adaptive_quadrature_meets_its_tolerance() {
        // ∫_0^π sin x dx = 2 and ∫_0^1 sqrt(x) dx = 2/3 (mathematics handbook).
        let a = integrate(f64::sin, 0.0, std::f64::consts::PI);
        assert!((a - 2.0).abs() < 2e-10);
        let b = integrate(f64::sqrt, 0.0, 1.0);
        assert!((b - 2.0 / 3.0).abs() < 1e-9, "{b}");
    }

    #[test]
    fn brent_finds_square_root_of_two() {
        let r = brent_root(|x| x * x - 2.0, 0.0, 2.0, 1e-15);
        assert!((r - std::f64::consts::SQRT_2).abs() < 1e-14);
    }

    #[test]
    fn golden_section_finds_a_parabola_top() {
        let (x, v) = golden_max(|x| -(x - 0.3) * (x - 0.3) + 1.0, 0.0, 1.0, 1e-12);
        assert!((x - 0.3).abs() < 1e-6 && (v - 1.0).abs() < 1e-12);
    }
}

//! Output formats: the package as bytes.
//!
//! Renderers never compute engineering values; they only present what the
//! earlier stages recorded.

pub mod context;
pub mod pdf;
pub mod svg;
pub mod templates;

/// Appends `v` rounded to a thousandth, by integer arithmetic (float
/// formatting was most of the time of writing drawings and PDF pages).
/// `trim` drops trailing zeros of the fraction (and the point); never "-0".
/// Values beyond ±1e12 are clamped: they are not coordinates on paper.
pub(crate) fn push_thousandths(out: &mut String, v: f64, trim: bool) {
    let v = if v.is_finite() { v } else { 0.0 };
    let m = (v.clamp(-1e12, 1e12) * 1000.0).round() as i64;
    if m < 0 {
        out.push('-');
    }
    let m = m.unsigned_abs();
    let (int, frac) = (m / 1000, m % 1000);
    let mut digits = [0u8; 20];
    let mut n = 0;
    let mut i = int;
    loop {
        digits[n] = b'0' + (i % 10) as u8;
        n += 1;
        i /= 10;
        if i == 0 {
            break;
        }
    }
    for k in (0..n).rev() {
        out.push(digits[k] as char);
    }
    let d = [frac / 100, frac / 10 % 10, frac % 10];
    let keep = if !trim || d[2] != 0 {
        3
    } else if d[1] != 0 {
        2
    } else if d[0] != 0 {
        1
    } else {
        0
    };
    if keep > 0 {
        out.push('.');
        for x in &d[..keep] {
            out.push((b'0' + *x as u8) as char);
        }
    }
}

//! CIEDE2000 colour difference.
//!
//! Implemented as written out by G. Sharma, W. Wu and E. N. Dalal, "The CIEDE2000 color-difference
//! formula: implementation notes, supplementary test data, and mathematical observations", Color
//! Research and Application 30(1), 2005, equations (1) to (22), with their notes on hue angles: the
//! hue of a neutral colour is 0, and the mean hue wraps round 360 degrees. Parametric factors
//! kL = kC = kH = 1 (reference conditions).

use super::space::Lab;

/// The CIEDE2000 difference ΔE00 between two CIELAB colours (symmetric, 0 for equal colours).
///
/// # Complexity
/// Constant time.
pub fn ciede2000(first: Lab, second: Lab) -> f64 {
    let (l1, a1, b1) = (first.l, first.a, first.b);
    let (l2, a2, b2) = (second.l, second.a, second.b);
    // Step 1: C', h' (equations 2 to 7).
    let c1 = a1.hypot(b1);
    let c2 = a2.hypot(b2);
    let c_mean = (c1 + c2) / 2.0;
    let c7 = c_mean.powi(7);
    let g = 0.5 * (1.0 - (c7 / (c7 + 25f64.powi(7))).sqrt());
    let a1p = (1.0 + g) * a1;
    let a2p = (1.0 + g) * a2;
    let c1p = a1p.hypot(b1);
    let c2p = a2p.hypot(b2);
    let hue = |b: f64, ap: f64| {
        if b == 0.0 && ap == 0.0 {
            0.0
        } else {
            let h = b.atan2(ap).to_degrees();
            if h < 0.0 { h + 360.0 } else { h }
        }
    };
    let h1p = hue(b1, a1p);
    let h2p = hue(b2, a2p);
    // Step 2: ΔL', ΔC', ΔH' (equations 8 to 11).
    let dlp = l2 - l1;
    let dcp = c2p - c1p;
    let dhp = if c1p * c2p == 0.0 {
        0.0
    } else if (h2p - h1p).abs() <= 180.0 {
        h2p - h1p
    } else if h2p - h1p > 180.0 {
        h2p - h1p - 360.0
    } else {
        h2p - h1p + 360.0
    };
    let d_hp = 2.0 * (c1p * c2p).sqrt() * (dhp.to_radians() / 2.0).sin();
    // Step 3: the weighting functions (equations 12 to 22).
    let lp_mean = (l1 + l2) / 2.0;
    let cp_mean = (c1p + c2p) / 2.0;
    let hp_mean = if c1p * c2p == 0.0 {
        h1p + h2p
    } else if (h1p - h2p).abs() <= 180.0 {
        (h1p + h2p) / 2.0
    } else if h1p + h2p < 360.0 {
        (h1p + h2p + 360.0) / 2.0
    } else {
        (h1p + h2p - 360.0) / 2.0
    };
    let t = 1.0 - 0.17 * (hp_mean - 30.0).to_radians().cos()
        + 0.24 * (2.0 * hp_mean).to_radians().cos()
        + 0.32 * (3.0 * hp_mean + 6.0).to_radians().cos()
        - 0.20 * (4.0 * hp_mean - 63.0).to_radians().cos();
    let d_theta = 30.0 * (-((hp_mean - 275.0) / 25.0).powi(2)).exp();
    let cp7 = cp_mean.powi(7);
    let r_c = 2.0 * (cp7 / (cp7 + 25f64.powi(7))).sqrt();
    let l50 = (lp_mean - 50.0).powi(2);
    let s_l = 1.0 + 0.015 * l50 / (20.0 + l50).sqrt();
    let s_c = 1.0 + 0.045 * cp_mean;
    let s_h = 1.0 + 0.015 * cp_mean * t;
    let r_t = -(2.0 * d_theta).to_radians().sin() * r_c;
    let (tl, tc, th) = (dlp / s_l, dcp / s_c, d_hp / s_h);
    (tl * tl + tc * tc + th * th + r_t * tc * th)
        .max(0.0)
        .sqrt()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn is_zero_for_equal_colours_and_symmetric() {
        let a = Lab {
            l: 61.0,
            a: -5.0,
            b: 29.0,
        };
        let b = Lab {
            l: 50.0,
            a: 2.5,
            b: 0.0,
        };
        assert_eq!(ciede2000(a, a), 0.0);
        assert!((ciede2000(a, b) - ciede2000(b, a)).abs() < 1e-12);
    }
}

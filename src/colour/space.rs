//! sRGB, linear RGB, CIE XYZ (D65) and CIELAB conversions, and CIE lightness for greyscale.
//!
//! The sRGB transfer function and the RGB-to-XYZ matrix are those of IEC 61966-2-1:1999 (sRGB),
//! with the D65 reference white the matrix maps RGB (1, 1, 1) to. CIELAB follows CIE 15:2004
//! (the `f(t)` with the linear segment below `(6/29)^3`).

/// An sRGB colour with 8 bits per channel, in the order red, green, blue.
pub type Srgb8 = [u8; 3];

/// A CIELAB colour (D65 reference white): lightness `l` in 0..=100, and the opponent axes `a`, `b`.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Lab {
    pub l: f64,
    pub a: f64,
    pub b: f64,
}

/// Linear RGB (0..=1) to CIE XYZ (Y of white = 1): IEC 61966-2-1, equation 5.
const RGB_TO_XYZ: [[f64; 3]; 3] = [
    [0.4124, 0.3576, 0.1805],
    [0.2126, 0.7152, 0.0722],
    [0.0193, 0.1192, 0.9505],
];

/// The inverse matrix, computed from [`RGB_TO_XYZ`] so that the round trip is exact to rounding
/// (the standard's printed inverse has four decimals and does not quite invert the forward one).
const XYZ_TO_RGB: [[f64; 3]; 3] = invert3(RGB_TO_XYZ);

/// The reference white: XYZ of RGB (1, 1, 1), the row sums of the matrix (D65 to four decimals).
const WHITE: [f64; 3] = [
    RGB_TO_XYZ[0][0] + RGB_TO_XYZ[0][1] + RGB_TO_XYZ[0][2],
    RGB_TO_XYZ[1][0] + RGB_TO_XYZ[1][1] + RGB_TO_XYZ[1][2],
    RGB_TO_XYZ[2][0] + RGB_TO_XYZ[2][1] + RGB_TO_XYZ[2][2],
];

const fn invert3(m: [[f64; 3]; 3]) -> [[f64; 3]; 3] {
    let c00 = m[1][1] * m[2][2] - m[1][2] * m[2][1];
    let c01 = m[1][2] * m[2][0] - m[1][0] * m[2][2];
    let c02 = m[1][0] * m[2][1] - m[1][1] * m[2][0];
    let det = m[0][0] * c00 + m[0][1] * c01 + m[0][2] * c02;
    [
        [
            c00 / det,
            (m[0][2] * m[2][1] - m[0][1] * m[2][2]) / det,
            (m[0][1] * m[1][2] - m[0][2] * m[1][1]) / det,
        ],
        [
            c01 / det,
            (m[0][0] * m[2][2] - m[0][2] * m[2][0]) / det,
            (m[0][2] * m[1][0] - m[0][0] * m[1][2]) / det,
        ],
        [
            c02 / det,
            (m[0][1] * m[2][0] - m[0][0] * m[2][1]) / det,
            (m[0][0] * m[1][1] - m[0][1] * m[1][0]) / det,
        ],
    ]
}

pub(crate) fn mul3(m: &[[f64; 3]; 3], v: [f64; 3]) -> [f64; 3] {
    [
        m[0][0] * v[0] + m[0][1] * v[1] + m[0][2] * v[2],
        m[1][0] * v[0] + m[1][1] * v[1] + m[1][2] * v[2],
        m[2][0] * v[0] + m[2][1] * v[1] + m[2][2] * v[2],
    ]
}

/// The sRGB decoding function (IEC 61966-2-1, equation 3): an encoded value in 0..=1 to linear light.
pub fn srgb_to_linear(encoded: f64) -> f64 {
    if encoded <= 0.04045 {
        encoded / 12.92
    } else {
        ((encoded + 0.055) / 1.055).powf(2.4)
    }
}

/// The sRGB encoding function (IEC 61966-2-1, equation 6): linear light in 0..=1 to an encoded value.
pub fn linear_to_srgb(linear: f64) -> f64 {
    if linear <= 0.0031308 {
        linear * 12.92
    } else {
        1.055 * linear.powf(1.0 / 2.4) - 0.055
    }
}

/// An 8-bit sRGB colour to linear RGB in 0..=1.
pub fn srgb8_to_linear(rgb: Srgb8) -> [f64; 3] {
    rgb.map(|c| srgb_to_linear(f64::from(c) / 255.0))
}

/// Linear RGB to the nearest 8-bit sRGB colour; values outside 0..=1 are clipped first (the colour
/// is out of the sRGB gamut, as some simulated colours are).
pub fn linear_to_srgb8(linear: [f64; 3]) -> Srgb8 {
    linear.map(|c| {
        let encoded = linear_to_srgb(c.clamp(0.0, 1.0));
        (encoded * 255.0).round().clamp(0.0, 255.0) as u8
    })
}

/// Linear RGB to CIE XYZ (IEC 61966-2-1, equation 5).
pub fn linear_to_xyz(linear: [f64; 3]) -> [f64; 3] {
    mul3(&RGB_TO_XYZ, linear)
}

/// CIE XYZ to linear RGB (the inverse of [`linear_to_xyz`]); may leave 0..=1 for colours outside sRGB.
pub fn xyz_to_linear(xyz: [f64; 3]) -> [f64; 3] {
    mul3(&XYZ_TO_RGB, xyz)
}

const EPSILON: f64 = 216.0 / 24389.0; // (6/29)^3
const KAPPA: f64 = 24389.0 / 27.0; // (29/3)^3

fn lab_f(t: f64) -> f64 {
    if t > EPSILON {
        t.cbrt()
    } else {
        (KAPPA * t + 16.0) / 116.0
    }
}

fn lab_f_inverse(f: f64) -> f64 {
    let cube = f * f * f;
    if cube > EPSILON {
        cube
    } else {
        (116.0 * f - 16.0) / KAPPA
    }
}

/// CIE XYZ to CIELAB relative to the D65 white of the sRGB matrix (CIE 15:2004, section 8.2.1).
pub fn xyz_to_lab(xyz: [f64; 3]) -> Lab {
    let [fx, fy, fz] = [0, 1, 2].map(|i| lab_f(xyz[i] / WHITE[i]));
    Lab {
        l: 116.0 * fy - 16.0,
        a: 500.0 * (fx - fy),
        b: 200.0 * (fy - fz),
    }
}

/// CIELAB back to CIE XYZ (the inverse of [`xyz_to_lab`]).
pub fn lab_to_xyz(lab: Lab) -> [f64; 3] {
    let fy = (lab.l + 16.0) / 116.0;
    let fx = fy + lab.a / 500.0;
    let fz = fy - lab.b / 200.0;
    [
        lab_f_inverse(fx) * WHITE[0],
        lab_f_inverse(fy) * WHITE[1],
        lab_f_inverse(fz) * WHITE[2],
    ]
}

/// Linear RGB to CIELAB.
pub fn linear_to_lab(linear: [f64; 3]) -> Lab {
    xyz_to_lab(linear_to_xyz(linear))
}

/// An 8-bit sRGB colour to CIELAB.
pub fn srgb8_to_lab(rgb: Srgb8) -> Lab {
    linear_to_lab(srgb8_to_linear(rgb))
}

/// CIELAB to the nearest 8-bit sRGB colour (clipped when outside the gamut), and whether it was
/// inside the gamut before clipping.
pub fn lab_to_srgb8(lab: Lab) -> (Srgb8, bool) {
    let linear = xyz_to_linear(lab_to_xyz(lab));
    let inside = linear.iter().all(|c| (-1e-9..=1.0 + 1e-9).contains(c));
    (linear_to_srgb8(linear), inside)
}

/// CIE lightness L* (0 black to 100 white): what a colour keeps in a greyscale copy made by
/// luminance, as photocopiers and greyscale printing approximately do.
pub fn lightness(rgb: Srgb8) -> f64 {
    let y = linear_to_xyz(srgb8_to_linear(rgb))[1] / WHITE[1];
    116.0 * lab_f(y) - 16.0
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn white_and_black_are_the_ends_of_lightness() {
        // By the definition of CIELAB (CIE 15:2004): the reference white has L* 100, a* = b* = 0.
        let white = srgb8_to_lab([255, 255, 255]);
        assert!((white.l - 100.0).abs() < 1e-9 && white.a.abs() < 1e-9 && white.b.abs() < 1e-9);
        assert!(lightness([0, 0, 0]).abs() < 1e-12);
    }

    #[test]
    fn round_trips_through_lab() {
        for rgb in [
            [0, 0, 0],
            [12, 200, 99],
            [255, 0, 128],
            [17, 17, 17],
            [250, 251, 2],
        ] {
            let (back, inside) = lab_to_srgb8(srgb8_to_lab(rgb));
            assert_eq!(back, rgb);
            assert!(inside);
        }
    }

    #[test]
    fn transfer_function_is_continuous_at_the_joint() {
        // IEC 61966-2-1: the two pieces meet at 0.04045 (encoded) / 0.0031308 (linear).
        let below = srgb_to_linear(0.04045);
        let above = ((0.04045f64 + 0.055) / 1.055).powf(2.4);
        assert!((below - above).abs() < 1e-6);
        assert!((linear_to_srgb(srgb_to_linear(0.5)) - 0.5).abs() < 1e-12);
    }
}

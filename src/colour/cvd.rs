//! Simulated colour-vision deficiencies: protanopia, deuteranopia and tritanopia.
//!
//! We use the physiologically based model of G. M. Machado, M. M. Oliveira and L. A. F. Fernandes,
//! "A physiologically-based model for simulation of color vision deficiency", IEEE Transactions on
//! Visualization and Computer Graphics 15(6), 2009: one 3x3 matrix per deficiency, applied to
//! linear RGB. We take the matrices for severity 1.0 (dichromacy) from the paper's table, as also
//! shipped by reference libraries (colorspacious, colour-science), and check them against those
//! libraries in `tests/colour.rs`. We chose Machado over Brettel, Viénot and Mollon (1997)
//! because it covers all three deficiencies with one linear map each (no half-plane projection
//! to choose per colour), which is cheap enough to run on every palette edit and easy to check.
//! Simulations approximate the average dichromat; real readers vary. The tritan matrices are the
//! weakest part of the model: the paper derives them by shifting the short-wavelength cone, an
//! approximation its authors (and colour-science's documentation) point out.

use super::space::{Srgb8, linear_to_srgb8, mul3, srgb8_to_linear};

/// A way of seeing colour: normal trichromatic vision or one of the three dichromacies.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Vision {
    Normal,
    /// No long-wavelength (red) cones.
    Protanopia,
    /// No medium-wavelength (green) cones.
    Deuteranopia,
    /// No short-wavelength (blue) cones.
    Tritanopia,
}

impl Vision {
    /// Every vision the distinctness checks look at, normal first.
    pub const ALL: [Vision; 4] = [
        Vision::Normal,
        Vision::Protanopia,
        Vision::Deuteranopia,
        Vision::Tritanopia,
    ];

    /// The word used in messages and JSON.
    pub fn as_str(self) -> &'static str {
        match self {
            Vision::Normal => "normal",
            Vision::Protanopia => "protanopia",
            Vision::Deuteranopia => "deuteranopia",
            Vision::Tritanopia => "tritanopia",
        }
    }

    /// Who sees this way, for messages: "readers with deuteranopia".
    pub fn readers(self) -> &'static str {
        match self {
            Vision::Normal => "readers with normal colour vision",
            Vision::Protanopia => "readers with protanopia (red-blind)",
            Vision::Deuteranopia => "readers with deuteranopia (green-blind)",
            Vision::Tritanopia => "readers with tritanopia (blue-blind)",
        }
    }

    /// The Machado et al. (2009) matrix for severity 1.0, for linear RGB; `None` for normal vision.
    pub fn matrix(self) -> Option<[[f64; 3]; 3]> {
        match self {
            Vision::Normal => None,
            Vision::Protanopia => Some([
                [0.152286, 1.052583, -0.204868],
                [0.114503, 0.786281, 0.099216],
                [-0.003882, -0.048116, 1.051998],
            ]),
            Vision::Deuteranopia => Some([
                [0.367322, 0.860646, -0.227968],
                [0.280085, 0.672501, 0.047413],
                [-0.011820, 0.042940, 0.968881],
            ]),
            Vision::Tritanopia => Some([
                [1.255528, -0.076749, -0.178779],
                [-0.078411, 0.930809, 0.147602],
                [0.004733, 0.691367, 0.303900],
            ]),
        }
    }

    /// The simulated colour in linear RGB, not clipped (it may leave 0..=1 slightly).
    pub fn simulate_linear(self, linear: [f64; 3]) -> [f64; 3] {
        match self.matrix() {
            None => linear,
            Some(m) => mul3(&m, linear),
        }
    }

    /// The simulated colour as 8-bit sRGB (clipped to the gamut), for showing a palette side by side.
    pub fn simulate(self, rgb: Srgb8) -> Srgb8 {
        match self {
            Vision::Normal => rgb,
            _ => linear_to_srgb8(self.simulate_linear(srgb8_to_linear(rgb))),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn greys_stay_grey() {
        // Each row of every Machado matrix sums to 1 (to the table's six decimals), so neutral
        // colours are unchanged: a property stated in the paper.
        for v in Vision::ALL {
            if let Some(m) = v.matrix() {
                for row in m {
                    assert!((row.iter().sum::<f64>() - 1.0).abs() < 2e-6, "{v:?}");
                }
            }
            assert_eq!(v.simulate([128, 128, 128]), [128, 128, 128]);
        }
    }
}

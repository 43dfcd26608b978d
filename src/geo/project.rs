//! Longitude/latitude detection: telling longitude/latitude data from planar data. The
//! projections themselves, and the choice of one for the data, live in [`crate::projection`].

use super::Point;
pub use crate::projection::AUTHALIC_RADIUS_M;

/// True when every point lies within the longitude/latitude range (longitudes up to 360 are
/// accepted, as some files use 0..360).
pub fn looks_like_lon_lat(points: impl Iterator<Item = Point>) -> bool {
    let mut any = false;
    for [x, y] in points {
        if !(-180.0..=360.0).contains(&x) || !(-90.0..=90.0).contains(&y) {
            return false;
        }
        any = true;
    }
    any
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn detects_lon_lat_ranges() {
        assert!(looks_like_lon_lat(
            [[-120.0, 45.0], [10.0, -80.0]].into_iter()
        ));
        assert!(!looks_like_lon_lat([[500_000.0, 4_000_000.0]].into_iter()));
    }
}

//! Longitude/latitude detection, and the centring of the Lambert azimuthal equal-area projection
//! on the data.
//!
//! The projection formulas live in [`crate::projection`]; this file keeps the test that tells
//! longitude/latitude data from planar data, and the first way Tinct centred its projection: the
//! middle of the latitude range and of the longitude span found by the largest empty longitude
//! gap, so data around the 180-degree meridian (Fiji, Chukotka) gets a centre near it rather
//! than at 0.

use super::Point;
pub use crate::projection::AUTHALIC_RADIUS_M;
use crate::projection::Projection;

/// Spherical Lambert azimuthal equal-area projection about `(lon0_deg, lat0_deg)`.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct LambertAzimuthalEqualArea {
    pub lon0_deg: f64,
    pub lat0_deg: f64,
}

impl LambertAzimuthalEqualArea {
    pub fn new(lon0_deg: f64, lat0_deg: f64) -> Self {
        Self { lon0_deg, lat0_deg }
    }

    /// Centres the projection on the data: the middle of the latitude range and of the longitude
    /// span left after removing the largest empty longitude gap. `None` without finite points.
    pub fn fit(points: impl Iterator<Item = Point>) -> Option<Self> {
        let mut lons = Vec::new();
        let (mut lat_min, mut lat_max) = (f64::INFINITY, f64::NEG_INFINITY);
        for [lon, lat] in points {
            if !lon.is_finite() || !lat.is_finite() {
                continue;
            }
            lons.push(normalise_lon(lon));
            lat_min = lat_min.min(lat);
            lat_max = lat_max.max(lat);
        }
        if lons.is_empty() {
            return None;
        }
        lons.sort_by(f64::total_cmp);
        lons.dedup();
        // The gap after the last longitude wraps round to the first.
        let n = lons.len();
        let mut best_gap = lons[0] + 360.0 - lons[n - 1];
        let mut span_start = lons[0];
        let mut span_end = lons[n - 1];
        for i in 0..n.saturating_sub(1) {
            let gap = lons[i + 1] - lons[i];
            if gap > best_gap {
                best_gap = gap;
                span_start = lons[i + 1];
                span_end = lons[i] + 360.0;
            }
        }
        let lon0 = normalise_lon((span_start + span_end) / 2.0);
        Some(Self::new(
            lon0,
            ((lat_min + lat_max) / 2.0).clamp(-90.0, 90.0),
        ))
    }

    /// The same projection as a [`Projection`].
    pub fn projection(&self) -> Projection {
        Projection::LambertAzimuthal {
            lon0: self.lon0_deg,
            lat0: self.lat0_deg,
        }
    }

    /// Projects `[lon, lat]` in degrees to `[x, y]` in metres.
    pub fn project(&self, p: Point) -> Point {
        self.projection().project(p)
    }

    /// The inverse: `[x, y]` in metres back to `[lon, lat]` in degrees.
    pub fn unproject(&self, p: Point) -> Point {
        self.projection().unproject(p)
    }

    /// Great-circle distance in metres between two projected points (see
    /// [`Projection::distance_m`]).
    pub fn distance_m(&self, a: Point, b: Point) -> f64 {
        self.projection().distance_m(a, b)
    }

    /// Projects a ring in place.
    pub fn project_ring(&self, ring: &mut [Point]) {
        self.projection().project_ring(ring)
    }
}

/// Longitude in `[-180, 180)`.
fn normalise_lon(lon: f64) -> f64 {
    (lon + 180.0).rem_euclid(360.0) - 180.0
}

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
    fn fit_centres_data_around_the_180_degree_meridian() {
        let points = [
            [178.0, -17.0],
            [179.9, -16.0],
            [-179.9, -16.5],
            [-178.5, -18.0],
        ];
        let proj = LambertAzimuthalEqualArea::fit(points.into_iter()).unwrap();
        assert!((proj.lon0_deg.abs() - 179.75).abs() < 1e-9, "{proj:?}");
        // The two sides of the meridian stay close together.
        let a = proj.project([179.999, -17.0]);
        let b = proj.project([-179.999, -17.0]);
        assert!((a[0] - b[0]).hypot(a[1] - b[1]) < 300.0);
    }

    #[test]
    fn detects_lon_lat_ranges() {
        assert!(looks_like_lon_lat(
            [[-120.0, 45.0], [10.0, -80.0]].into_iter()
        ));
        assert!(!looks_like_lon_lat([[500_000.0, 4_000_000.0]].into_iter()));
    }
}

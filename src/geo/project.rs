//! Longitude/latitude detection and the Lambert azimuthal equal-area projection.
//!
//! Longitude/latitude data is projected to metres so that tolerances, shared lengths and areas
//! mean the same everywhere on the map. We use the spherical Lambert azimuthal equal-area
//! projection (Snyder, *Map Projections: A Working Manual*, USGS Professional Paper 1395, 1987,
//! chapter 24, equations 24-2 to 24-4) centred on the data, on a sphere of the GRS 80 authalic
//! radius. It preserves area exactly and keeps shapes good within a continent-sized area.
//!
//! The 180-degree meridian: the formulas use only `sin` and `cos` of `lon - lon0`, so a ring that
//! runs from 179 to -179 degrees projects as one continuous ring, and parts cut at +180 and -180
//! land on the same line; nothing is smeared across the map. The centre is placed in the middle
//! of the data's longitude span found by the largest empty longitude gap, so data around the
//! 180-degree meridian (Fiji, Chukotka) gets a centre near it rather than at 0.
//! Whole-world data is sheared near the antipode of the centre; adjacency is unaffected unless a
//! single region contains that antipode.

use super::Point;

/// Authalic (equal-area) radius of the GRS 80 ellipsoid in metres (from memory: 6371007.181 m,
/// the value used by equal-area grids on a sphere).
pub const AUTHALIC_RADIUS_M: f64 = 6_371_007.181;

/// Spherical Lambert azimuthal equal-area projection about `(lon0_deg, lat0_deg)`.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct LambertAzimuthalEqualArea {
    pub lon0_deg: f64,
    pub lat0_deg: f64,
    pub radius_m: f64,
}

impl LambertAzimuthalEqualArea {
    pub fn new(lon0_deg: f64, lat0_deg: f64) -> Self {
        Self {
            lon0_deg,
            lat0_deg,
            radius_m: AUTHALIC_RADIUS_M,
        }
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

    /// Projects `[lon, lat]` in degrees to `[x, y]` in metres.
    pub fn project(&self, [lon, lat]: Point) -> Point {
        let (phi, phi1) = (lat.to_radians(), self.lat0_deg.to_radians());
        let dl = (lon - self.lon0_deg).to_radians();
        let (sin_phi, cos_phi) = phi.sin_cos();
        let (sin_phi1, cos_phi1) = phi1.sin_cos();
        let (sin_dl, cos_dl) = dl.sin_cos();
        // Snyder eq. 24-2; the antipode (denominator 0) maps to the bounding circle, so we keep
        // the denominator away from zero instead of dividing by it.
        let denominator = (1.0 + sin_phi1 * sin_phi + cos_phi1 * cos_phi * cos_dl).max(1e-15);
        let k = (2.0 / denominator).sqrt();
        let x = self.radius_m * k * cos_phi * sin_dl; // eq. 24-3
        let y = self.radius_m * k * (cos_phi1 * sin_phi - sin_phi1 * cos_phi * cos_dl); // eq. 24-4
        [x, y]
    }

    /// The inverse: `[x, y]` in metres back to `[lon, lat]` in degrees (Snyder eqs. 20-14, 24-16
    /// and 20-15 with `c = 2 asin(rho / 2R)`).
    pub fn unproject(&self, [x, y]: Point) -> Point {
        let rho = x.hypot(y);
        if rho == 0.0 {
            return [self.lon0_deg, self.lat0_deg];
        }
        let c = 2.0 * (rho / (2.0 * self.radius_m)).clamp(-1.0, 1.0).asin();
        let (sin_c, cos_c) = c.sin_cos();
        let (sin_phi1, cos_phi1) = self.lat0_deg.to_radians().sin_cos();
        let phi = (cos_c * sin_phi1 + y * sin_c * cos_phi1 / rho)
            .clamp(-1.0, 1.0)
            .asin();
        let dl = (x * sin_c).atan2(rho * cos_phi1 * cos_c - y * sin_phi1 * sin_c);
        [
            normalise_lon(self.lon0_deg + dl.to_degrees()),
            phi.to_degrees(),
        ]
    }

    /// Great-circle distance in metres between two projected points, on the projection's sphere
    /// (haversine formula). Equal-area projections do not keep lengths, so shared border
    /// lengths are measured with this instead.
    pub fn distance_m(&self, a: Point, b: Point) -> f64 {
        let ([l1, p1], [l2, p2]) = (self.unproject(a), self.unproject(b));
        let (p1, p2) = (p1.to_radians(), p2.to_radians());
        let (dp, dl) = (p2 - p1, (l2 - l1).to_radians());
        let h = (dp / 2.0).sin().powi(2) + p1.cos() * p2.cos() * (dl / 2.0).sin().powi(2);
        2.0 * self.radius_m * h.sqrt().min(1.0).asin()
    }

    /// Projects a ring in place.
    pub fn project_ring(&self, ring: &mut [Point]) {
        for p in ring {
            *p = self.project(*p);
        }
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

    fn shoelace(ring: &[Point]) -> f64 {
        ring.windows(2)
            .map(|w| w[0][0] * w[1][1] - w[1][0] * w[0][1])
            .sum::<f64>()
            / 2.0
    }

    /// A latitude/longitude cell, densified so that its projected outline follows the curves.
    fn cell(lon1: f64, lon2: f64, lat1: f64, lat2: f64) -> Vec<Point> {
        let n = 400;
        let mut ring = Vec::new();
        for i in 0..n {
            ring.push([lon1 + (lon2 - lon1) * i as f64 / n as f64, lat1]);
        }
        for i in 0..n {
            ring.push([lon2, lat1 + (lat2 - lat1) * i as f64 / n as f64]);
        }
        for i in 0..n {
            ring.push([lon2 - (lon2 - lon1) * i as f64 / n as f64, lat2]);
        }
        for i in 0..=n {
            ring.push([lon1, lat2 - (lat2 - lat1) * i as f64 / n as f64]);
        }
        ring
    }

    #[test]
    fn preserves_area_of_a_latitude_longitude_cell() {
        // The area of a cell on a sphere is R^2 (lon2 - lon1) (sin lat2 - sin lat1) (Archimedes'
        // hat-box theorem); an equal-area projection must reproduce it.
        let proj = LambertAzimuthalEqualArea::new(-100.0, 40.0);
        for (lon1, lon2, lat1, lat2) in [
            (-110.0, -100.0, 35.0, 45.0),
            (-60.0, -40.0, -10.0, 5.0),
            (120.0, 125.0, 60.0, 62.0),
        ] {
            let mut ring = cell(lon1, lon2, lat1, lat2);
            proj.project_ring(&mut ring);
            let expected = AUTHALIC_RADIUS_M.powi(2)
                * (lon2 - lon1).to_radians()
                * (lat2.to_radians().sin() - lat1.to_radians().sin());
            let got = shoelace(&ring).abs();
            assert!(
                (got - expected).abs() / expected < 1e-4,
                "cell {lon1},{lon2},{lat1},{lat2}: {got} vs {expected}"
            );
        }
    }

    #[test]
    fn centre_maps_to_origin_and_scale_is_true_there() {
        // Snyder ch. 24: the projection is azimuthal, true to scale at the centre.
        let proj = LambertAzimuthalEqualArea::new(10.0, 50.0);
        let c = proj.project([10.0, 50.0]);
        assert!(c[0].abs() < 1e-6 && c[1].abs() < 1e-6);
        let p = proj.project([10.0, 50.001]);
        let expected = AUTHALIC_RADIUS_M * 0.001f64.to_radians();
        assert!((p[1] - expected).abs() / expected < 1e-5);
    }

    #[test]
    fn unproject_inverts_project_and_distance_is_great_circle() {
        let proj = LambertAzimuthalEqualArea::new(-100.0, 40.0);
        for p in [[-120.0, 45.0], [-80.0, 25.5], [-100.0, 40.0], [170.0, 60.0]] {
            let q = proj.unproject(proj.project(p));
            assert!(
                (q[0] - p[0]).abs() < 1e-9 && (q[1] - p[1]).abs() < 1e-9,
                "{p:?} {q:?}"
            );
        }
        // One degree of a meridian is R * pi / 180 on the sphere.
        let d = proj.distance_m(proj.project([-110.0, 30.0]), proj.project([-110.0, 31.0]));
        assert!((d - AUTHALIC_RADIUS_M * 1f64.to_radians()).abs() < 1e-6);
    }

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

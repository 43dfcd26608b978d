//! Map projections from longitude/latitude (degrees) to metres on a sphere, and their inverses.
//!
//! Tinct keeps geographic maps in metres so that tolerances, shared lengths and areas mean the same
//! everywhere on the map. Every projection here is **equal-area**, so the sizes of regions keep their
//! true proportions; what differs between them is how shapes are bent, which depends on the map's
//! extent (see [`MainMass`] for the choice). All work on a sphere of the GRS 80 authalic radius
//! ([`AUTHALIC_RADIUS_M`]); latitudes read from WGS 84 data are used on the sphere as they are, as
//! Tinct has always done, so coordinates come back exactly as they were read.
//!
//! - [`Projection::LambertAzimuthal`]: Lambert azimuthal equal-area (Snyder, *Map Projections: A
//!   Working Manual*, USGS Professional Paper 1395, 1987, chapter 24, eqs. 24-2 to 24-4 forward,
//!   20-14, 24-16 and 20-15 inverse). Best for compact and polar areas.
//! - [`Projection::AlbersEqualArea`]: Albers equal-area conic (Snyder 1987, chapter 14, eqs. 14-1 to
//!   14-6 forward, 14-8 to 14-11 inverse, on the sphere). Best for mid-latitude areas wider east-west
//!   than north-south.
//! - [`Projection::EqualEarth`]: Equal Earth (Šavrič, Patterson and Jenny, "The Equal Earth map
//!   projection", *International Journal of Geographical Information Science* 33(3), 2019 (online
//!   2018), eqs. 1 and 2; the inverse by Newton's method as the paper describes). For world maps.
//!
//! The 180-degree meridian: every formula uses the longitude only as `lon - lon0` brought into
//! `[-180, 180)`, so data written in 0..360 or across the meridian projects the same way. A leaf:
//! it uses nothing else in the crate (the document records a [`Projection`]; the importers choose one).

mod choose;
mod edge;

pub use choose::{Extent, MainMass, REACH_DEG, outlying_parts};
pub use edge::split_at_edge;

/// `[longitude, latitude]` in degrees, or `[x, y]` in metres once projected.
pub type LonLat = [f64; 2];

/// The outline of a longitude/latitude box as an open ring (south edge eastwards, then east,
/// north and west), each edge split into `steps` equal parts (`[along longitude, along
/// latitude]`, at least one each), so that its projected outline follows the curves.
pub fn lon_lat_box(west: f64, east: f64, south: f64, north: f64, steps: [usize; 2]) -> Vec<LonLat> {
    let [n_lon, n_lat] = steps.map(|n| n.max(1));
    let along = |from: f64, to: f64, i: usize, n: usize| from + (to - from) * i as f64 / n as f64;
    let mut ring = Vec::with_capacity(2 * (n_lon + n_lat));
    ring.extend((0..n_lon).map(|i| [along(west, east, i, n_lon), south]));
    ring.extend((0..n_lat).map(|i| [east, along(south, north, i, n_lat)]));
    ring.extend((0..n_lon).map(|i| [along(east, west, i, n_lon), north]));
    ring.extend((0..n_lat).map(|i| [west, along(north, south, i, n_lat)]));
    ring
}

/// Authalic (equal-area) radius of the GRS 80 ellipsoid in metres (from memory: 6371007.181 m,
/// the value used by equal-area grids on a sphere).
pub const AUTHALIC_RADIUS_M: f64 = 6_371_007.181;

/// An equal-area map projection on the sphere of [`AUTHALIC_RADIUS_M`]; every angle in degrees.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Projection {
    /// Lambert azimuthal equal-area centred on `(lon0, lat0)`.
    LambertAzimuthal { lon0: f64, lat0: f64 },
    /// Albers equal-area conic with standard parallels `lat1` and `lat2`, central meridian `lon0`
    /// and origin latitude `lat0` (where `y = 0` on the central meridian).
    AlbersEqualArea {
        lon0: f64,
        lat0: f64,
        lat1: f64,
        lat2: f64,
    },
    /// Equal Earth with central meridian `lon0`.
    EqualEarth { lon0: f64 },
}

/// Why a projection's parameters cannot be used.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
pub enum ProjectionError {
    #[error("{name} = {value} is not a finite number")]
    NotFinite { name: &'static str, value: f64 },
    #[error("{name} = {value} is not a latitude (it must lie between -90 and 90)")]
    NotALatitude { name: &'static str, value: f64 },
    #[error(
        "the standard parallels {lat1} and {lat2} lie symmetrically about the equator, which no conic projection can use"
    )]
    SymmetricParallels { lat1: f64, lat2: f64 },
}

// Equal Earth's polynomial coefficients (Šavrič et al., eq. 1 and table 1).
const EE_A1: f64 = 1.340264;
const EE_A2: f64 = -0.081106;
const EE_A3: f64 = 0.000893;
const EE_A4: f64 = 0.003796;
/// sqrt(3) / 2, Equal Earth's `M` (the parametric latitude is `asin(M sin lat)`).
const EE_M: f64 = 0.866_025_403_784_438_6;

/// Longitude difference in `[-180, 180)` degrees.
pub fn normalise_lon(lon: f64) -> f64 {
    (lon + 180.0).rem_euclid(360.0) - 180.0
}

/// The constants of a spherical Albers projection in units of the radius: `n`, `C` and `rho0`
/// (Snyder eqs. 14-6, 14-5 and 14-3a).
fn albers_constants(lat0: f64, lat1: f64, lat2: f64) -> (f64, f64, f64) {
    let (sin1, cos1) = lat1.to_radians().sin_cos();
    let n = (sin1 + lat2.to_radians().sin()) / 2.0;
    let c = cos1 * cos1 + 2.0 * n * sin1;
    let rho0 = (c - 2.0 * n * lat0.to_radians().sin()).max(0.0).sqrt() / n;
    (n, c, rho0)
}

/// Equal Earth's `y / R` and its derivative with respect to the parametric latitude `theta`.
fn equal_earth_y(theta: f64) -> (f64, f64) {
    let t2 = theta * theta;
    let t6 = t2 * t2 * t2;
    let y = theta * (EE_A1 + EE_A2 * t2 + t6 * (EE_A3 + EE_A4 * t2));
    let dy = EE_A1 + 3.0 * EE_A2 * t2 + t6 * (7.0 * EE_A3 + 9.0 * EE_A4 * t2);
    (y, dy)
}

impl Projection {
    /// The central meridian in degrees.
    pub fn lon0(&self) -> f64 {
        match *self {
            Projection::LambertAzimuthal { lon0, .. }
            | Projection::AlbersEqualArea { lon0, .. }
            | Projection::EqualEarth { lon0 } => lon0,
        }
    }

    /// Checks the parameters: finite, latitudes within +-90 degrees, and for Albers standard
    /// parallels that define a cone (not symmetric about the equator, where `n` would be 0).
    /// Projections read from a file are checked with this before use; [`MainMass::projection`]
    /// only makes valid ones.
    pub fn check(&self) -> Result<(), ProjectionError> {
        let finite = |name, value: f64| {
            if value.is_finite() {
                Ok(())
            } else {
                Err(ProjectionError::NotFinite { name, value })
            }
        };
        let latitude = |name, value: f64| {
            finite(name, value)?;
            if (-90.0..=90.0).contains(&value) {
                Ok(())
            } else {
                Err(ProjectionError::NotALatitude { name, value })
            }
        };
        match *self {
            Projection::LambertAzimuthal { lon0, lat0 } => {
                finite("lon0", lon0)?;
                latitude("lat0", lat0)
            }
            Projection::AlbersEqualArea {
                lon0,
                lat0,
                lat1,
                lat2,
            } => {
                finite("lon0", lon0)?;
                latitude("lat0", lat0)?;
                latitude("lat1", lat1)?;
                latitude("lat2", lat2)?;
                let (n, _, _) = albers_constants(lat0, lat1, lat2);
                if n.abs() < 1e-9 {
                    return Err(ProjectionError::SymmetricParallels { lat1, lat2 });
                }
                Ok(())
            }
            Projection::EqualEarth { lon0 } => finite("lon0", lon0),
        }
    }

    /// Projects `[lon, lat]` in degrees to `[x, y]` in metres.
    pub fn project(&self, [lon, lat]: LonLat) -> LonLat {
        // A point on the meridian opposite the central one keeps the side its longitude names.
        let offset = lon - self.lon0();
        let dl = if (-180.0..=180.0).contains(&offset) {
            offset
        } else {
            normalise_lon(offset)
        };
        self.project_offset(dl, lat)
    }

    /// Projects the point `dl` degrees east of the central meridian (in `[-180, 180]`) at
    /// latitude `lat`.
    fn project_offset(&self, dl: f64, lat: f64) -> LonLat {
        let r = AUTHALIC_RADIUS_M;
        let dl = dl.to_radians();
        let phi = lat.to_radians();
        match *self {
            Projection::LambertAzimuthal { lat0, .. } => {
                let (sin_phi, cos_phi) = phi.sin_cos();
                let (sin_phi1, cos_phi1) = lat0.to_radians().sin_cos();
                let (sin_dl, cos_dl) = dl.sin_cos();
                // Snyder eq. 24-2; the antipode (denominator 0) maps to the bounding circle, so we
                // keep the denominator away from zero instead of dividing by it.
                let denominator =
                    (1.0 + sin_phi1 * sin_phi + cos_phi1 * cos_phi * cos_dl).max(1e-15);
                let k = (2.0 / denominator).sqrt();
                let x = r * k * cos_phi * sin_dl; // eq. 24-3
                let y = r * k * (cos_phi1 * sin_phi - sin_phi1 * cos_phi * cos_dl); // eq. 24-4
                [x, y]
            }
            Projection::AlbersEqualArea {
                lat0, lat1, lat2, ..
            } => {
                let (n, c, rho0) = albers_constants(lat0, lat1, lat2);
                // C - 2n sin(lat) = (1 - sin lat1)(1 - sin lat2) >= 0 at the pole the cone points
                // to, so it is never negative but for rounding.
                let rho = (c - 2.0 * n * phi.sin()).max(0.0).sqrt() / n; // eq. 14-3
                let theta = n * dl; // eq. 14-4
                [r * rho * theta.sin(), r * (rho0 - rho * theta.cos())] // eqs. 14-1, 14-2
            }
            Projection::EqualEarth { .. } => {
                let theta = (EE_M * phi.sin()).asin();
                let (y, dy) = equal_earth_y(theta);
                [r * dl * theta.cos() / (EE_M * dy), r * y]
            }
        }
    }

    /// The inverse: `[x, y]` in metres back to `[lon, lat]` in degrees, the longitude in
    /// `[-180, 180)`. Points outside the projection's image are clamped onto its edge.
    pub fn unproject(&self, [x, y]: LonLat) -> LonLat {
        let r = AUTHALIC_RADIUS_M;
        let lon0 = self.lon0();
        match *self {
            Projection::LambertAzimuthal { lat0, .. } => {
                // Snyder eqs. 20-14, 24-16 and 20-15 with c = 2 asin(rho / 2R).
                let rho = x.hypot(y);
                if rho == 0.0 {
                    return [normalise_lon(lon0), lat0];
                }
                let c = 2.0 * (rho / (2.0 * r)).clamp(-1.0, 1.0).asin();
                let (sin_c, cos_c) = c.sin_cos();
                let (sin_phi1, cos_phi1) = lat0.to_radians().sin_cos();
                let phi = (cos_c * sin_phi1 + y * sin_c * cos_phi1 / rho)
                    .clamp(-1.0, 1.0)
                    .asin();
                let dl = (x * sin_c).atan2(rho * cos_phi1 * cos_c - y * sin_phi1 * sin_c);
                [normalise_lon(lon0 + dl.to_degrees()), phi.to_degrees()]
            }
            Projection::AlbersEqualArea {
                lat0, lat1, lat2, ..
            } => {
                let (n, c, rho0) = albers_constants(lat0, lat1, lat2);
                let (x, dy) = (x / r, rho0 - y / r);
                // Eqs. 14-10 and 14-11: with n negative, rho and the arguments of the arctangent
                // change sign.
                let sign = n.signum();
                let rho = sign * x.hypot(dy);
                let theta = (sign * x).atan2(sign * dy);
                let sin_phi = ((c - (rho * n).powi(2)) / (2.0 * n)).clamp(-1.0, 1.0); // eq. 14-8
                let dl = (theta / n).to_degrees().clamp(-180.0, 180.0); // eq. 14-9
                [normalise_lon(lon0 + dl), sin_phi.asin().to_degrees()]
            }
            Projection::EqualEarth { .. } => {
                let (y_max, _) = equal_earth_y(std::f64::consts::FRAC_PI_3);
                let target = (y / r).clamp(-y_max, y_max);
                // Newton's method on y(theta) = target; y is odd and increasing, and y / A1 is
                // within 0.1 of the root, so a dozen steps reach full precision.
                let mut theta = target / EE_A1;
                for _ in 0..12 {
                    let (f, df) = equal_earth_y(theta);
                    let step = (f - target) / df;
                    theta -= step;
                    if step.abs() < 1e-15 {
                        break;
                    }
                }
                let (_, dy) = equal_earth_y(theta);
                let dl = (x / r) * EE_M * dy / theta.cos();
                let lat = (theta.sin() / EE_M).clamp(-1.0, 1.0).asin();
                [
                    normalise_lon(lon0 + dl.to_degrees().clamp(-180.0, 180.0)),
                    lat.to_degrees(),
                ]
            }
        }
    }

    /// Great-circle distance in metres between two projected points, on the projection's sphere
    /// (haversine formula). Equal-area projections do not keep lengths, so shared border lengths
    /// are measured with this instead.
    pub fn distance_m(&self, a: LonLat, b: LonLat) -> f64 {
        let ([l1, p1], [l2, p2]) = (self.unproject(a), self.unproject(b));
        let (p1, p2) = (p1.to_radians(), p2.to_radians());
        let (dp, dl) = (p2 - p1, (l2 - l1).to_radians());
        let h = (dp / 2.0).sin().powi(2) + p1.cos() * p2.cos() * (dl / 2.0).sin().powi(2);
        2.0 * AUTHALIC_RADIUS_M * h.sqrt().min(1.0).asin()
    }

    /// Projects a ring in place.
    pub fn project_ring(&self, ring: &mut [LonLat]) {
        // Points on the meridian opposite the central one (the edge of a world map) go to the
        // side of the edge the ring comes from. World data sets cut rings there, but write the
        // cut as +180 in some points and -180 in others of one ring (Russia and Fiji in Natural
        // Earth's 1:50m countries); taken at their word, the ring would cross the whole map.
        let lon0 = self.lon0();
        let off_edge = |lon: f64| {
            let d = normalise_lon(lon - lon0);
            (d > -180.0 + 1e-9).then_some(d)
        };
        let mut previous = ring.iter().find_map(|p| off_edge(p[0])).unwrap_or(-180.0);
        for p in ring {
            let dl = off_edge(p[0]).unwrap_or(if previous > 0.0 { 180.0 } else { -180.0 });
            previous = dl;
            *p = self.project_offset(dl, p[1]);
        }
    }

    /// The projection's name with its parameters, for people: for example "Albers equal-area
    /// conic (standard parallels 29.5° N and 45.5° N)".
    pub fn name(&self) -> String {
        match *self {
            Projection::LambertAzimuthal { lon0, lat0 } => format!(
                "Lambert azimuthal equal-area (centred on {}, {})",
                degrees(lat0, "N", "S"),
                degrees(normalise_lon(lon0), "E", "W")
            ),
            Projection::AlbersEqualArea { lat1, lat2, .. } => format!(
                "Albers equal-area conic (standard parallels {} and {})",
                degrees(lat1, "N", "S"),
                degrees(lat2, "N", "S")
            ),
            Projection::EqualEarth { lon0 } => format!(
                "Equal Earth (central meridian {})",
                degrees(normalise_lon(lon0), "E", "W")
            ),
        }
    }

    /// The projection as a PROJ string (`+proj=... +R=6371007.181`), for GIS software that is told
    /// what the metres are.
    pub fn proj_string(&self) -> String {
        let tail = format!("+x_0=0 +y_0=0 +R={AUTHALIC_RADIUS_M} +units=m +no_defs");
        match *self {
            Projection::LambertAzimuthal { lon0, lat0 } => {
                format!("+proj=laea +lat_0={lat0} +lon_0={lon0} {tail}")
            }
            Projection::AlbersEqualArea {
                lon0,
                lat0,
                lat1,
                lat2,
            } => {
                format!("+proj=aea +lat_0={lat0} +lon_0={lon0} +lat_1={lat1} +lat_2={lat2} {tail}")
            }
            Projection::EqualEarth { lon0 } => format!("+proj=eqearth +lon_0={lon0} {tail}"),
        }
    }
}

/// An angle for people: to a tenth of a degree, whole degrees without the decimal, and the
/// hemisphere letter (none at zero).
fn degrees(value: f64, positive: &str, negative: &str) -> String {
    let tenths = (value * 10.0).round();
    let text = if tenths % 10.0 == 0.0 {
        format!("{}", (tenths / 10.0).abs())
    } else {
        format!("{:.1}", (tenths / 10.0).abs())
    };
    if tenths == 0.0 {
        format!("{text}°")
    } else if tenths > 0.0 {
        format!("{text}° {positive}")
    } else {
        format!("{text}° {negative}")
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    #[test]
    fn points_on_the_edge_of_a_world_map_stay_on_their_rings_side() {
        // Natural Earth's 1:50m countries (world-atlas 2.0.2) write the cut at 180 degrees as
        // -180 in places: Russia's ring runs 179.87 E, then -180 twice, then 179.83 E. Those
        // points belong on the east edge, beside their neighbours, not across the map.
        let p = Projection::EqualEarth { lon0: 0.0 };
        let mut ring = vec![
            [179.87, 69.0],
            [-180.0, 68.98],
            [-180.0, 65.07],
            [179.83, 65.03],
        ];
        p.project_ring(&mut ring);
        assert!(ring.iter().all(|q| q[0] > 0.0), "{ring:?}");
        // A ring on the west side keeps -180 (and a ring that starts on the edge looks ahead).
        let mut west = vec![[-180.0, -16.5], [-179.9, -16.6], [-180.0, -16.7]];
        p.project_ring(&mut west);
        assert!(west.iter().all(|q| q[0] < 0.0), "{west:?}");
        // A single point takes the side its longitude names.
        assert!(p.project([180.0, 0.0])[0] > 0.0);
        assert!(p.project([-180.0, 0.0])[0] < 0.0);
    }

    /// Signed area of an open ring (the shoelace formula).
    pub(super) fn shoelace(ring: &[LonLat]) -> f64 {
        let n = ring.len();
        (0..n)
            .map(|i| {
                let (a, b) = (ring[i], ring[(i + 1) % n]);
                a[0] * b[1] - b[0] * a[1]
            })
            .sum::<f64>()
            / 2.0
    }

    /// A latitude/longitude cell, densified so that its projected outline follows the curves.
    fn cell(lon1: f64, lon2: f64, lat1: f64, lat2: f64) -> Vec<LonLat> {
        lon_lat_box(lon1, lon2, lat1, lat2, [400, 400])
    }

    const ALL: [Projection; 5] = [
        Projection::LambertAzimuthal {
            lon0: -100.0,
            lat0: 40.0,
        },
        Projection::LambertAzimuthal {
            lon0: 20.0,
            lat0: -90.0,
        },
        Projection::AlbersEqualArea {
            lon0: -96.0,
            lat0: 23.0,
            lat1: 29.5,
            lat2: 45.5,
        },
        Projection::AlbersEqualArea {
            lon0: 100.0,
            lat0: 0.0,
            lat1: -18.0,
            lat2: -36.0,
        },
        Projection::EqualEarth { lon0: 10.0 },
    ];

    #[test]
    fn each_projection_preserves_the_area_of_latitude_longitude_cells() {
        // The area of a cell on a sphere is R^2 (lon2 - lon1) (sin lat2 - sin lat1) (Archimedes'
        // hat-box theorem); an equal-area projection must reproduce it.
        for projection in ALL {
            for (lon1, lon2, lat1, lat2) in [
                (-110.0, -100.0, 35.0, 45.0),
                (-60.0, -40.0, -10.0, 5.0),
                (120.0, 125.0, 60.0, 62.0),
                (140.0, 150.0, -30.0, -20.0),
            ] {
                let mut ring = cell(lon1, lon2, lat1, lat2);
                projection.project_ring(&mut ring);
                let expected = AUTHALIC_RADIUS_M.powi(2)
                    * (lon2 - lon1).to_radians()
                    * (lat2.to_radians().sin() - lat1.to_radians().sin());
                let got = shoelace(&ring).abs();
                assert!(
                    (got - expected).abs() / expected < 1e-4,
                    "{projection:?} cell {lon1},{lon2},{lat1},{lat2}: {got} vs {expected}"
                );
            }
        }
    }

    #[test]
    fn snyder_albers_example() {
        // Snyder 1987, appendix A, numerical example for the Albers equal-area conic on the
        // sphere (values quoted from memory): R = 1, standard parallels 29.5 and 45.5 N, origin
        // 23 N 96 W; the point 35 N 75 W gives x = 0.2952720, y = 0.2416774 (n = 0.6028370,
        // C = 1.3512213, rho0 = 1.5562263, rho = 1.3473026, theta = 12.6595771 degrees).
        let p = Projection::AlbersEqualArea {
            lon0: -96.0,
            lat0: 23.0,
            lat1: 29.5,
            lat2: 45.5,
        };
        let (n, c, rho0) = albers_constants(23.0, 29.5, 45.5);
        assert!((n - 0.6028370).abs() < 5e-8, "{n}");
        assert!((c - 1.3512213).abs() < 5e-8, "{c}");
        assert!((rho0 - 1.5562263).abs() < 5e-8, "{rho0}");
        let [x, y] = p.project([-75.0, 35.0]);
        let (x, y) = (x / AUTHALIC_RADIUS_M, y / AUTHALIC_RADIUS_M);
        assert!((x - 0.2952720).abs() < 5e-8, "{x}");
        assert!((y - 0.2416774).abs() < 5e-8, "{y}");
        // The book's inverse example runs the same numbers backwards.
        let [lon, lat] =
            p.unproject([0.2952720 * AUTHALIC_RADIUS_M, 0.2416774 * AUTHALIC_RADIUS_M]);
        assert!(
            (lon + 75.0).abs() < 1e-5 && (lat - 35.0).abs() < 1e-5,
            "{lon} {lat}"
        );
    }

    #[test]
    fn snyder_lambert_azimuthal_example() {
        // Snyder 1987, appendix A, numerical example for the Lambert azimuthal equal-area on the
        // sphere (values quoted from memory): R = 3, centre 40 N 100 W; the point 20 S 100 E
        // gives k' = 4.3912175, x = -4.2339303, y = 4.0257775.
        let p = Projection::LambertAzimuthal {
            lon0: -100.0,
            lat0: 40.0,
        };
        let scale = 3.0 / AUTHALIC_RADIUS_M;
        let [x, y] = p.project([100.0, -20.0]);
        assert!((x * scale + 4.2339303).abs() < 5e-7, "{}", x * scale);
        assert!((y * scale - 4.0257775).abs() < 5e-7, "{}", y * scale);
        let [lon, lat] = p.unproject([-4.2339303 / scale, 4.0257775 / scale]);
        assert!(
            (lon - 100.0).abs() < 1e-5 && (lat + 20.0).abs() < 1e-5,
            "{lon} {lat}"
        );
    }

    #[test]
    fn centre_maps_to_origin_and_scale_is_true_there() {
        // Snyder ch. 24: the azimuthal projection is true to scale at the centre; ch. 14: Albers
        // is true to scale along the standard parallels (fact of the trade, both).
        let lambert = Projection::LambertAzimuthal {
            lon0: 10.0,
            lat0: 50.0,
        };
        let c = lambert.project([10.0, 50.0]);
        assert!(c[0].abs() < 1e-6 && c[1].abs() < 1e-6);
        let p = lambert.project([10.0, 50.001]);
        let expected = AUTHALIC_RADIUS_M * 0.001f64.to_radians();
        assert!((p[1] - expected).abs() / expected < 1e-5);

        let albers = ALL[2];
        for lat in [29.5f64, 45.5] {
            let a = albers.project([-96.0, lat]);
            let b = albers.project([-95.999, lat]);
            let along = (b[0] - a[0]).hypot(b[1] - a[1]);
            let expected = AUTHALIC_RADIUS_M * lat.to_radians().cos() * 0.001f64.to_radians();
            assert!((along - expected).abs() / expected < 1e-6, "{lat}");
        }
        // Albers: the origin latitude on the central meridian is y = 0.
        assert!(albers.project([-96.0, 23.0])[1].abs() < 1e-6);
    }

    #[test]
    fn equal_earth_proportions() {
        // Šavrič et al. 2018: the width of the map is about 2.05 times its height (the paper's
        // stated ratio, from memory), the poles are lines, and the central meridian is straight.
        let p = Projection::EqualEarth { lon0: 0.0 };
        let width = p.project([179.999_999, 0.0])[0] - p.project([-179.999_999, 0.0])[0];
        let height = p.project([0.0, 90.0])[1] - p.project([0.0, -90.0])[1];
        assert!((width / height - 2.05).abs() < 0.01, "{}", width / height);
        let pole = p.project([90.0, 90.0]);
        assert!(pole[0] > 0.0, "the pole is a line, not a point");
        assert!(p.project([0.0, 40.0])[0].abs() < 1e-9);
    }

    #[test]
    fn the_180_degree_meridian_is_continuous_around_the_centre() {
        // Data written across the meridian, or in 0..360, lands in the same place.
        for p in ALL {
            let p = match p {
                Projection::LambertAzimuthal { lat0, .. } => {
                    Projection::LambertAzimuthal { lon0: 179.0, lat0 }
                }
                Projection::AlbersEqualArea {
                    lat0, lat1, lat2, ..
                } => Projection::AlbersEqualArea {
                    lon0: 179.0,
                    lat0,
                    lat1,
                    lat2,
                },
                Projection::EqualEarth { .. } => Projection::EqualEarth { lon0: 179.0 },
            };
            let a = p.project([181.5, -17.0]);
            let b = p.project([-178.5, -17.0]);
            assert!((a[0] - b[0]).hypot(a[1] - b[1]) < 1e-6, "{p:?}");
            let c = p.project([179.999, -17.0]);
            let d = p.project([-179.999, -17.0]);
            assert!((c[0] - d[0]).hypot(c[1] - d[1]) < 300.0, "{p:?}");
        }
    }

    #[test]
    fn distance_is_great_circle() {
        // One degree of a meridian is R * pi / 180 on the sphere.
        for p in ALL {
            let d = p.distance_m(p.project([-110.0, 30.0]), p.project([-110.0, 31.0]));
            assert!(
                (d - AUTHALIC_RADIUS_M * 1f64.to_radians()).abs() < 1e-6,
                "{p:?}"
            );
        }
    }

    #[test]
    fn names_and_proj_strings() {
        assert_eq!(
            ALL[2].name(),
            "Albers equal-area conic (standard parallels 29.5° N and 45.5° N)"
        );
        assert_eq!(
            ALL[0].name(),
            "Lambert azimuthal equal-area (centred on 40° N, 100° W)"
        );
        assert_eq!(ALL[4].name(), "Equal Earth (central meridian 10° E)");
        assert_eq!(
            Projection::EqualEarth { lon0: 0.0 }.name(),
            "Equal Earth (central meridian 0°)"
        );
        assert_eq!(
            ALL[2].proj_string(),
            "+proj=aea +lat_0=23 +lon_0=-96 +lat_1=29.5 +lat_2=45.5 +x_0=0 +y_0=0 +R=6371007.181 +units=m +no_defs"
        );
    }

    #[test]
    fn check_refuses_unusable_parameters() {
        for p in ALL {
            assert_eq!(p.check(), Ok(()));
        }
        assert_eq!(
            Projection::AlbersEqualArea {
                lon0: 0.0,
                lat0: 0.0,
                lat1: -30.0,
                lat2: 30.0
            }
            .check(),
            Err(ProjectionError::SymmetricParallels {
                lat1: -30.0,
                lat2: 30.0
            })
        );
        assert!(matches!(
            Projection::LambertAzimuthal {
                lon0: 0.0,
                lat0: 91.0
            }
            .check(),
            Err(ProjectionError::NotALatitude { .. })
        ));
        assert!(matches!(
            Projection::EqualEarth { lon0: f64::NAN }.check(),
            Err(ProjectionError::NotFinite { .. })
        ));
    }

    /// Longitudes equal up to a whole turn.
    fn same_lon(a: f64, b: f64, tolerance: f64) -> bool {
        let d = (a - b).rem_euclid(360.0);
        d.min(360.0 - d) < tolerance
    }

    proptest! {
        #[test]
        fn random_cells_keep_their_area(
            which in 0..ALL.len(),
            lon_offset in -150.0f64..130.0,
            d_lon in 0.5f64..20.0,
            lat1 in -80.0f64..60.0,
            d_lat in 0.5f64..20.0,
        ) {
            // Archimedes' hat-box theorem, as in the fixed cells above; cells placed relative to
            // the central meridian so that none straddles the map's edge, and for the azimuthal
            // projections within 120 degrees of the centre.
            let projection = ALL[which];
            let lon1 = projection.lon0() + lon_offset;
            let (lon2, lat2) = (lon1 + d_lon, lat1 + d_lat);
            if let Projection::LambertAzimuthal { lon0, lat0 } = projection {
                for [lon, lat] in [[lon1, lat1], [lon2, lat1], [lon1, lat2], [lon2, lat2]] {
                    let (p, p0) = (lat.to_radians(), lat0.to_radians());
                    let cos_distance =
                        p.sin() * p0.sin() + p.cos() * p0.cos() * (lon - lon0).to_radians().cos();
                    prop_assume!(cos_distance > (120f64).to_radians().cos());
                }
            }
            let mut ring = cell(lon1, lon2, lat1, lat2);
            projection.project_ring(&mut ring);
            let expected = AUTHALIC_RADIUS_M.powi(2)
                * d_lon.to_radians()
                * (lat2.to_radians().sin() - lat1.to_radians().sin());
            let got = shoelace(&ring).abs();
            prop_assert!(
                (got - expected).abs() / expected < 1e-4,
                "{:?} cell {},{},{},{}: {} vs {}", projection, lon1, lon2, lat1, lat2, got, expected
            );
        }

        #[test]
        fn unproject_inverts_project(
            which in 0..ALL.len(),
            lon in -179.999f64..179.999,
            lat in -89.9f64..89.9,
        ) {
            let projection = ALL[which];
            let [lon, lat] = match projection {
                // The antipode of an azimuthal projection is its whole bounding circle: stay
                // 10 degrees away from it, where the inverse is still well conditioned.
                Projection::LambertAzimuthal { lon0, lat0 } => {
                    let (p, p0) = (lat.to_radians(), lat0.to_radians());
                    let cos_distance =
                        p.sin() * p0.sin() + p.cos() * p0.cos() * (lon - lon0).to_radians().cos();
                    prop_assume!(cos_distance > (170f64).to_radians().cos());
                    [lon, lat]
                }
                _ => [lon, lat],
            };
            let q = projection.unproject(projection.project([lon, lat]));
            prop_assert!(
                same_lon(q[0], lon, 1e-9) && (q[1] - lat).abs() < 1e-9,
                "{:?}: {:?} came back as {:?}", projection, [lon, lat], q
            );
        }
    }
}

//! Choosing a projection for the data's extent: the main mass of the data, the parts that lie away
//! from it, and the projection that suits the main mass.
//!
//! **The main mass.** Outlying parts (Alaska, Hawaii and Puerto Rico beside the conterminous US;
//! overseas territories; a far island group) should not move the projection's centre, or the main
//! area ends up rotated and bent at the edge of a projection centred on the ocean. So the data is
//! first split into groups that lie close together, and the heaviest group wins:
//!
//! 1. Each part (a ring: a polygon's outline) is traced onto a grid of 1-degree longitude/latitude
//!    cells, its edges followed the short way round (so across the 180-degree meridian when that is
//!    shorter). All cells one part touches belong together.
//! 2. Cells with data that lie within [`REACH_DEG`] (2 degrees, about 220 km) of each other belong
//!    together too; east-west the reach is widened by `1 / cos(latitude)` so that it stays a
//!    distance on the ground, up to the whole parallel near a pole. Gaps narrower than that (straits
//!    between islands, the Bering Strait at this resolution) keep land together; wider gaps
//!    (Alaska's panhandle to Washington is over 5 degrees of latitude) separate it.
//! 3. Each group weighs the area on the sphere of its parts (their signed area on the cylindrical
//!    equal-area plane `(lon, sin lat)`), or, when no part has an area (points and lines), its
//!    number of positions. The heaviest group is the main mass; the others are *outlying*, the
//!    candidates for inset frames.
//!
//! It is linear in the number of positions (plus a constant for the 64,800 cells), so it scales
//! to the million-region maps the importers handle.
//!
//! **The projection** for the main mass's extent (longitude span taken after the largest empty
//! longitude gap, so data around the 180-degree meridian is one span; latitudes from its
//! southernmost to its northernmost position). The thresholds are rules of thumb, documented here
//! rather than sourced: Snyder (1987, "Choosing a projection", p. 33-34) recommends azimuthal
//! projections for areas of roughly circular or polar extent, conics for mid-latitude areas
//! extending east-west, and world projections for the whole world.
//! - **Polar cap**: all of it poleward of 40 degrees and more than half-way round the pole ->
//!   Lambert azimuthal centred on the pole.
//! - **World-wide**: longitude span over 200 degrees or latitude span over 120 -> Equal Earth on
//!   the Greenwich meridian, or, if some ring of the data crosses the 180-degree meridian, with its
//!   edge in the middle of the widest longitude gap in the data, so that no region is cut in two.
//! - **Polar**: reaches 80 degrees north or south -> Lambert azimuthal centred on the main mass.
//! - **Mid-latitude, wider east-west than north-south, and not small**: the middle latitude
//!   between 15 and 65 degrees, the east-west extent (`span * cos(middle latitude)`) larger than the
//!   north-south one, and the larger at least 10 degrees -> Albers with standard parallels at one
//!   sixth and five sixths of the latitude span (Snyder 1987, p. 99, rule of thumb for conics),
//!   the central meridian in the middle of the longitude span and the origin at the middle
//!   latitude.
//! - **Anything else** (compact, tall, equatorial) -> Lambert azimuthal centred on the main mass
//!   (the middle of its longitude span and of its latitude range).

use std::collections::BTreeMap;

use super::{LonLat, Projection, normalise_lon};

/// Cells of one degree: 360 columns of longitude from -180, 180 rows of latitude from -90.
const COLUMNS: usize = 360;
const ROWS: usize = 180;

/// How close (in degrees of latitude, or the same distance east-west) data must lie to belong to
/// the same group.
pub const REACH_DEG: usize = 2;

/// A longitude/latitude box in degrees. `east` may exceed 180 when the box crosses the 180-degree
/// meridian (`west` is in `[-180, 180)` and `east >= west`).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Extent {
    pub west: f64,
    pub east: f64,
    pub south: f64,
    pub north: f64,
}

impl Extent {
    /// East-west span in degrees of longitude.
    pub fn lon_span(&self) -> f64 {
        self.east - self.west
    }

    /// North-south span in degrees of latitude.
    pub fn lat_span(&self) -> f64 {
        self.north - self.south
    }

    /// The middle `[longitude, latitude]`, the longitude in `[-180, 180)`.
    pub fn centre(&self) -> LonLat {
        [
            normalise_lon((self.west + self.east) / 2.0),
            (self.south + self.north) / 2.0,
        ]
    }
}

/// The main mass of some longitude/latitude data and what lies away from it (see the module
/// documentation for how it is found).
#[derive(Clone, Debug, PartialEq)]
pub struct MainMass {
    /// The extent of the main mass.
    pub extent: Extent,
    /// For each part given to [`MainMass::find`]: true when it lies away from the main mass. A part
    /// with no finite position is not outlying (it has no place).
    pub outlying: Vec<bool>,
    /// The central meridian for a world map: 0, unless some part crosses the 180-degree meridian.
    world_lon0: f64,
}

/// Union-find over the cells, the smaller index as the root so that the result does not depend
/// on the order of the unions.
struct Cells {
    parent: Vec<u32>,
    marked: Vec<bool>,
}

impl Cells {
    fn new() -> Self {
        Cells {
            parent: (0..(COLUMNS * ROWS) as u32).collect(),
            marked: vec![false; COLUMNS * ROWS],
        }
    }

    fn find(&mut self, mut c: u32) -> u32 {
        while self.parent[c as usize] != c {
            let grandparent = self.parent[self.parent[c as usize] as usize];
            self.parent[c as usize] = grandparent;
            c = grandparent;
        }
        c
    }

    fn union(&mut self, a: u32, b: u32) {
        let (ra, rb) = (self.find(a), self.find(b));
        if ra != rb {
            let (low, high) = (ra.min(rb), ra.max(rb));
            self.parent[high as usize] = low;
        }
    }
}

/// The cell of a position.
fn cell([lon, lat]: LonLat) -> u32 {
    let column = ((normalise_lon(lon) + 180.0).floor() as usize).min(COLUMNS - 1);
    let row = ((lat.clamp(-90.0, 90.0) + 90.0).floor() as usize).min(ROWS - 1);
    (row * COLUMNS + column) as u32
}

fn finite(p: &&LonLat) -> bool {
    p[0].is_finite() && p[1].is_finite()
}

/// The widest run of unmarked columns, as `(first empty column, length)`; `None` when every
/// column holds data.
fn widest_empty_run(occupied: &[bool; COLUMNS]) -> Option<(usize, usize)> {
    let start = occupied.iter().position(|&o| o)?;
    let mut best: Option<(usize, usize)> = None;
    let mut run = 0;
    // Walk once round from an occupied column, so runs that wrap past column 359 are whole.
    for k in 1..=COLUMNS {
        let column = (start + k) % COLUMNS;
        if occupied[column] {
            if run > 0 && best.is_none_or(|(_, len)| run > len) {
                best = Some(((column + COLUMNS - run) % COLUMNS, run));
            }
            run = 0;
        } else {
            run += 1;
        }
    }
    best
}

/// The central meridian for a world map of parts with these longitude `spans` (`(west, east)`,
/// west in `[-180, 180)`, open intervals): 0 when no span crosses the 180-degree meridian, else
/// the one whose opposite meridian lies in the middle of the widest stretch of longitudes that no
/// span crosses (0 when every longitude is crossed).
fn world_lon0(mut spans: Vec<(f64, f64)>) -> f64 {
    let crosses = |meridian: f64| {
        spans.iter().any(|&(w, e)| {
            let d = (meridian - w).rem_euclid(360.0);
            d > 0.0 && d < e - w
        })
    };
    if !crosses(180.0) {
        return 0.0;
    }
    spans.sort_by(|a, b| a.0.total_cmp(&b.0).then(a.1.total_cmp(&b.1)));
    let first = spans[0].0;
    // Sweep once round the circle from the first span's west end (or from where the spans that
    // run on past 180 east end, if they reach further). A stretch between the reach of the spans
    // so far and the next span's west end is free; it may be a single meridian where one part
    // ends and the next begins. The last stretch runs up to the first span's west end, a turn on.
    let max_east = spans.iter().map(|s| s.1).fold(f64::NEG_INFINITY, f64::max);
    let mut reach = first.max(max_east - 360.0);
    let mut best: Option<(f64, f64)> = None;
    let end = (first + 360.0, first + 360.0);
    for &(w, e) in spans.iter().chain(std::iter::once(&end)) {
        if w >= reach && best.is_none_or(|(a, b)| w - reach > b - a) {
            best = Some((reach, w));
        }
        reach = reach.max(e);
    }
    best.map_or(0.0, |(a, b)| normalise_lon((a + b) / 2.0 + 180.0))
}

impl MainMass {
    /// Finds the main mass of `parts` (rings of `[longitude, latitude]` in degrees, open or
    /// closed; a single position is a part too). `None` when no part has a finite position.
    pub fn find<P: AsRef<[LonLat]>>(parts: &[P]) -> Option<MainMass> {
        let mut cells = Cells::new();
        let mut first_cells: Vec<Option<u32>> = Vec::with_capacity(parts.len());
        let mut areas: Vec<f64> = Vec::with_capacity(parts.len());
        let mut counts: Vec<usize> = Vec::with_capacity(parts.len());
        // Each part's longitude span, unwrapped along its edges, where an Equal Earth map's edge
        // would cut it (parts that go right round a pole are left out: any edge meets them).
        let mut spans: Vec<(f64, f64)> = Vec::new();
        for part in parts {
            let mut points = part.as_ref().iter().filter(finite);
            let Some(&first) = points.next() else {
                first_cells.push(None);
                areas.push(0.0);
                counts.push(0);
                continue;
            };
            let first_cell = cell(first);
            cells.marked[first_cell as usize] = true;
            let (mut area, mut count, mut previous) = (0.0, 1, first);
            // The part's longitudes unwrapped along its edges, to tell whether it crosses the
            // 180-degree meridian (touching it, as data cut there does, is not crossing).
            let mut lon = normalise_lon(first[0]);
            let (mut lon_min, mut lon_max) = (lon, lon);
            let edge = |a: LonLat, b: LonLat, cells: &mut Cells| -> (f64, f64) {
                // The short way round, as the projections draw it.
                let d_lon = normalise_lon(b[0] - a[0]);
                let d_lat = b[1] - a[1];
                let steps = d_lon.abs().max(d_lat.abs()).ceil().clamp(1.0, 720.0) as usize;
                for k in 1..=steps {
                    let t = k as f64 / steps as f64;
                    let c = cell([a[0] + t * d_lon, a[1] + t * d_lat]);
                    cells.marked[c as usize] = true;
                    cells.union(first_cell, c);
                }
                // Twice the trapezoid under the edge on the (lon, sin lat) plane.
                let area = d_lon.to_radians() * (a[1].to_radians().sin() + b[1].to_radians().sin());
                (area, d_lon)
            };
            for &p in points {
                let (a, d_lon) = edge(previous, p, &mut cells);
                area += a;
                lon += d_lon;
                lon_min = lon_min.min(lon);
                lon_max = lon_max.max(lon);
                previous = p;
                count += 1;
            }
            if count > 1 {
                let (a, d_lon) = edge(previous, first, &mut cells);
                area += a;
                lon += d_lon;
            }
            // A ring that goes right round a pole (Antarctica, cut at the 180-degree meridian
            // and closed along the pole) winds once: the trapezoids then measure the area between
            // it and the equator. Its own area lies between it and the pole:
            // 2 (s W - S) for winding W (radians), pole s = +-1 and trapezoid sum 2 S.
            let winding = (lon - normalise_lon(first[0])).to_radians();
            if winding.abs() > std::f64::consts::PI {
                let pole = if area / winding < 0.0 { -1.0 } else { 1.0 };
                area = 2.0 * pole * winding - area;
            }
            if lon_max - lon_min > 0.0 && lon_max - lon_min < 360.0 {
                let start = normalise_lon(lon_min);
                spans.push((start, start + (lon_max - lon_min)));
            }
            first_cells.push(Some(first_cell));
            areas.push(area.abs() / 2.0);
            counts.push(count);
        }

        // Cells within reach of each other belong together; east-west the reach in columns grows
        // as the parallels shorten. Only forward neighbours: the relation is symmetric.
        for row in 0..ROWS {
            for column in 0..COLUMNS {
                let here = row * COLUMNS + column;
                if !cells.marked[here] {
                    continue;
                }
                for d_row in 0..=REACH_DEG {
                    let other_row = row + d_row;
                    if other_row >= ROWS {
                        break;
                    }
                    let poleward = (row as f64 - 89.5)
                        .abs()
                        .max((other_row as f64 - 89.5).abs())
                        + 0.5;
                    let cos = poleward.to_radians().cos();
                    let reach = if cos * (COLUMNS as f64) <= REACH_DEG as f64 {
                        COLUMNS / 2
                    } else {
                        ((REACH_DEG as f64 / cos).ceil() as usize).min(COLUMNS / 2)
                    };
                    let from = if d_row == 0 { 1 } else { -(reach as isize) };
                    for d_column in from..=reach as isize {
                        let other_column =
                            (column as isize + d_column).rem_euclid(COLUMNS as isize) as usize;
                        let there = other_row * COLUMNS + other_column;
                        if cells.marked[there] {
                            cells.union(here as u32, there as u32);
                        }
                    }
                }
            }
        }

        // Weigh the groups; the heaviest (the lowest root on a tie) is the main mass.
        let by_area = areas.iter().sum::<f64>() > 0.0;
        let mut roots: Vec<Option<u32>> = Vec::with_capacity(parts.len());
        let mut weights: BTreeMap<u32, f64> = BTreeMap::new();
        for (i, first) in first_cells.iter().enumerate() {
            let root = first.map(|c| cells.find(c));
            if let Some(root) = root {
                *weights.entry(root).or_default() +=
                    if by_area { areas[i] } else { counts[i] as f64 };
            }
            roots.push(root);
        }
        let main = weights
            .iter()
            .fold(
                None,
                |best: Option<(u32, f64)>, (&root, &weight)| match best {
                    Some((_, w)) if w >= weight => best,
                    _ => Some((root, weight)),
                },
            )?
            .0;

        // The main mass's columns.
        let mut main_columns = [false; COLUMNS];
        for c in 0..COLUMNS * ROWS {
            if cells.marked[c] && cells.find(c as u32) == main {
                main_columns[c % COLUMNS] = true;
            }
        }
        let main_gap = widest_empty_run(&main_columns);
        let base = match main_gap {
            Some((gap_start, len)) => ((gap_start + len) % COLUMNS) as f64 - 180.0,
            None => -180.0,
        };
        let full_circle = main_gap.is_none();
        let (mut west, mut east) = (f64::INFINITY, f64::NEG_INFINITY);
        let (mut south, mut north) = (f64::INFINITY, f64::NEG_INFINITY);
        for (part, root) in parts.iter().zip(&roots) {
            if *root != Some(main) {
                continue;
            }
            for p in part.as_ref().iter().filter(finite) {
                let offset = (normalise_lon(p[0]) - base).rem_euclid(360.0);
                west = west.min(offset);
                east = east.max(offset);
                south = south.min(p[1]);
                north = north.max(p[1]);
            }
        }
        let (west, east) = if full_circle {
            (-180.0, 180.0)
        } else {
            let w = normalise_lon(base + west);
            (w, w + (east - west))
        };
        Some(MainMass {
            extent: Extent {
                west,
                east,
                south: south.clamp(-90.0, 90.0),
                north: north.clamp(-90.0, 90.0),
            },
            outlying: roots.iter().map(|r| r.is_some_and(|r| r != main)).collect(),
            world_lon0: world_lon0(spans),
        })
    }

    /// The three projections a user may choose among for this data, each fitted to the main
    /// mass as the rules in the module documentation would fit it: Albers equal-area conic
    /// (standard parallels at one sixth and five sixths of the latitude span), Lambert azimuthal
    /// equal-area centred on the main mass, and Equal Earth (centred on the main mass, or with its
    /// edge where a world map would have it for world-wide data). [`MainMass::projection`] picks one of them, or a polar azimuthal.
    pub fn choices(&self) -> [Projection; 3] {
        let e = &self.extent;
        let [lon0, lat0] = e.centre();
        let mut albers = Projection::AlbersEqualArea {
            lon0,
            lat0,
            lat1: e.south + e.lat_span() / 6.0,
            lat2: e.south + e.lat_span() * 5.0 / 6.0,
        };
        // A span symmetric about the equator has no conic; nudge its parallels north.
        if albers.check().is_err() {
            albers = Projection::AlbersEqualArea {
                lon0,
                lat0,
                lat1: e.south + e.lat_span() / 6.0 + 1.0,
                lat2: e.south + e.lat_span() * 5.0 / 6.0,
            };
        }
        [
            albers,
            Projection::LambertAzimuthal { lon0, lat0 },
            // Centred on the main mass, unless the data is world-wide (then its edge goes where
            // it cuts the least, as at import).
            Projection::EqualEarth {
                lon0: if e.lon_span() > 200.0 || e.lat_span() > 120.0 {
                    self.world_lon0
                } else {
                    lon0
                },
            },
        ]
    }

    /// The projection for the main mass's extent (the rules are in the module documentation).
    pub fn projection(&self) -> Projection {
        let e = &self.extent;
        let (lon_span, lat_span) = (e.lon_span(), e.lat_span());
        let [centre_lon, centre_lat] = e.centre();
        let lambert = Projection::LambertAzimuthal {
            lon0: centre_lon,
            lat0: centre_lat,
        };
        if (e.south >= 40.0 || e.north <= -40.0) && lon_span > 180.0 {
            return Projection::LambertAzimuthal {
                lon0: if lon_span >= 359.0 { 0.0 } else { centre_lon },
                lat0: if e.south >= 40.0 { 90.0 } else { -90.0 },
            };
        }
        if lon_span > 200.0 || lat_span > 120.0 {
            return Projection::EqualEarth {
                lon0: self.world_lon0,
            };
        }
        if e.south.abs().max(e.north.abs()) >= 80.0 {
            return lambert;
        }
        let east_west = lon_span * centre_lat.to_radians().cos();
        if east_west > lat_span && east_west >= 10.0 && (15.0..=65.0).contains(&centre_lat.abs()) {
            return Projection::AlbersEqualArea {
                lon0: centre_lon,
                lat0: centre_lat,
                lat1: e.south + lat_span / 6.0,
                lat2: e.south + lat_span * 5.0 / 6.0,
            };
        }
        lambert
    }
}

impl Projection {
    /// The projection Tinct chooses for longitude/latitude `parts` (rings, or single positions):
    /// see [`MainMass`]. `None` when no part has a finite position.
    pub fn choose<P: AsRef<[LonLat]>>(parts: &[P]) -> Option<Projection> {
        MainMass::find(parts).map(|m| m.projection())
    }
}

/// For each part, whether it lies away from the main mass of all of them (a candidate for an
/// inset frame; the caller decides). See [`MainMass`].
pub fn outlying_parts<P: AsRef<[LonLat]>>(parts: &[P]) -> Vec<bool> {
    MainMass::find(parts).map_or_else(|| vec![false; parts.len()], |m| m.outlying)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A longitude/latitude box as an open ring, its edges split into steps of at most a degree.
    fn lon_lat_box(west: f64, east: f64, south: f64, north: f64) -> Vec<LonLat> {
        let steps = [
            (east - west).abs().ceil() as usize,
            (north - south).abs().ceil() as usize,
        ];
        super::super::lon_lat_box(west, east, south, north, steps)
    }

    /// Rough continents as boxes (coordinates of the trade, from memory, to a few degrees), split
    /// at the 180-degree meridian as world data sets are.
    fn world() -> Vec<Vec<LonLat>> {
        vec![
            lon_lat_box(-168.0, -52.0, 15.0, 72.0),   // North America
            lon_lat_box(-92.0, -77.0, 7.0, 18.0),     // Central America
            lon_lat_box(-81.0, -35.0, -55.0, 12.0),   // South America
            lon_lat_box(-10.0, 180.0, 1.0, 77.0),     // Eurasia
            lon_lat_box(-180.0, -170.0, 60.0, 70.0),  // Chukotka
            lon_lat_box(-17.0, 51.0, -35.0, 37.0),    // Africa
            lon_lat_box(95.0, 141.0, -10.0, 6.0),     // the Malay archipelago
            lon_lat_box(113.0, 153.0, -39.0, -11.0),  // Australia
            lon_lat_box(-180.0, 180.0, -90.0, -63.0), // Antarctica
        ]
    }

    #[test]
    fn a_ring_round_the_pole_weighs_its_own_area() {
        // Antarctica as world data sets draw it: along its coast from -180 to 180 degrees, then
        // down to the pole and straight back, an edge of no length on the sphere. Its weight is
        // the cap south of 75 degrees, 2 pi (1 - sin 75) = 0.21 on the (lon, sin lat) plane (the
        // area of a spherical cap, common knowledge), not the band from 75 S to the equator (6.07).
        let mut ring: Vec<LonLat> = (0..=360).map(|k| [k as f64 - 180.0, -75.0]).collect();
        ring.push([180.0, -90.0]);
        ring.push([-180.0, -90.0]);
        let europe = lon_lat_box(-10.0, 40.0, 35.0, 70.0);
        let m = MainMass::find(&[ring, europe]).unwrap();
        // Europe, 50 degrees by 35 (0.873 (sin 70 - sin 35) = 0.32), outweighs the cap.
        assert_eq!(m.outlying, [true, false]);
        // And a real world keeps Equal Earth with such an Antarctica.
        let mut parts = world();
        parts.pop();
        let mut antarctica: Vec<LonLat> = (0..=360).map(|k| [k as f64 - 180.0, -66.0]).collect();
        antarctica.push([180.0, -90.0]);
        antarctica.push([-180.0, -90.0]);
        parts.push(antarctica);
        assert!(matches!(
            Projection::choose(&parts),
            Some(Projection::EqualEarth { .. })
        ));
    }

    #[test]
    fn a_world_map_gets_equal_earth_on_greenwich() {
        let m = MainMass::find(&world()).unwrap();
        assert_eq!(m.projection(), Projection::EqualEarth { lon0: 0.0 });
        // Antarctica lies beyond the Drake Passage (over 7 degrees from South America).
        assert_eq!(
            m.outlying,
            [false, false, false, false, false, false, false, false, true]
        );
    }

    #[test]
    fn a_world_map_with_a_ring_across_the_180_degree_meridian_keeps_it_whole() {
        // Eurasia unsplit, running on to 190 E: the edge of an Equal Earth map on Greenwich would
        // cut it; the edge goes into the widest empty longitudes instead.
        let mut parts = world();
        parts[3] = lon_lat_box(-10.0, 190.0, 1.0, 77.0);
        parts.remove(4);
        let projection = Projection::choose(&parts).unwrap();
        let Projection::EqualEarth { lon0 } = projection else {
            panic!("{projection:?}")
        };
        let seam = normalise_lon(lon0 + 180.0);
        // Antarctica (last) goes right round the pole: every edge meets it.
        for part in &parts[..parts.len() - 1] {
            for p in part {
                // Every position lies at least a degree from the edge of the map.
                let d = normalise_lon(p[0] - seam).abs();
                assert!(d >= 1.0, "{p:?} lies on the edge at {seam}");
            }
        }
    }

    #[test]
    fn data_around_the_180_degree_meridian_is_centred_on_it() {
        // Fiji-like positions on both sides of the meridian: one span, centred near it.
        let points = [
            [178.0, -17.0],
            [179.9, -16.0],
            [-179.9, -16.5],
            [-178.5, -18.0],
        ];
        let parts: Vec<Vec<LonLat>> = points.iter().map(|p| vec![*p]).collect();
        let m = MainMass::find(&parts).unwrap();
        assert!((m.extent.west - 178.0).abs() < 1e-9 && (m.extent.east - 181.5).abs() < 1e-9);
        let Projection::LambertAzimuthal { lon0, lat0 } = m.projection() else {
            panic!("{:?}", m.projection())
        };
        assert!((lon0.abs() - 179.75).abs() < 1e-9 && (lat0 + 17.0).abs() < 1e-9);
    }

    #[test]
    fn a_small_country_gets_lambert_azimuthal_on_its_middle() {
        // A Switzerland-sized box (5.9 to 10.5 E, 45.8 to 47.8 N): wider than tall, but small,
        // so no conic.
        let p = Projection::choose(&[lon_lat_box(5.9, 10.5, 45.8, 47.8)]).unwrap();
        let Projection::LambertAzimuthal { lon0, lat0 } = p else {
            panic!("{p:?}")
        };
        assert!(
            (lon0 - 8.2).abs() < 1e-9 && (lat0 - 46.8).abs() < 1e-9,
            "{p:?}"
        );
    }

    #[test]
    fn a_tall_country_gets_lambert_azimuthal() {
        // Chile-like: 18 to 56 S, 66 to 76 W.
        let p = Projection::choose(&[lon_lat_box(-76.0, -66.0, -56.0, -18.0)]).unwrap();
        assert!(matches!(p, Projection::LambertAzimuthal { .. }), "{p:?}");
    }

    #[test]
    fn a_polar_cap_gets_lambert_azimuthal_on_the_pole() {
        let p = Projection::choose(&[lon_lat_box(-180.0, 180.0, -90.0, -63.0)]).unwrap();
        assert_eq!(
            p,
            Projection::LambertAzimuthal {
                lon0: 0.0,
                lat0: -90.0
            }
        );
        // Islands scattered round the north pole at 85 N are one group: near the pole the
        // east-west reach grows with 1 / cos(latitude).
        let islands: Vec<Vec<LonLat>> = (0..12)
            .map(|k| {
                lon_lat_box(
                    -180.0 + 30.0 * k as f64,
                    -179.0 + 30.0 * k as f64,
                    85.0,
                    85.5,
                )
            })
            .collect();
        let m = MainMass::find(&islands).unwrap();
        assert!(m.outlying.iter().all(|o| !o));
        assert!(matches!(
            m.projection(),
            Projection::LambertAzimuthal { lat0: 90.0, .. }
        ));
    }

    #[test]
    fn albers_parallels_follow_snyders_rule_of_thumb() {
        // A mid-latitude band 30 to 48 N, 60 degrees wide: parallels at 33 and 45 N
        // (one sixth and five sixths of the span, Snyder 1987 p. 99).
        let p = Projection::choose(&[lon_lat_box(10.0, 70.0, 30.0, 48.0)]).unwrap();
        assert_eq!(
            p,
            Projection::AlbersEqualArea {
                lon0: 40.0,
                lat0: 39.0,
                lat1: 33.0,
                lat2: 45.0
            }
        );
        assert_eq!(p.check(), Ok(()));
    }

    #[test]
    fn the_heaviest_group_wins_and_small_far_groups_are_outlying() {
        // A large block and a smaller one 10 degrees away: the large one decides the centre,
        // whatever the order.
        let large = lon_lat_box(0.0, 20.0, 40.0, 50.0);
        let small = lon_lat_box(30.0, 35.0, 40.0, 45.0);
        for parts in [vec![large.clone(), small.clone()], vec![small, large]] {
            let m = MainMass::find(&parts).unwrap();
            assert_eq!(m.extent.west, 0.0);
            assert_eq!(m.extent.east, 20.0);
            let small_is_first = m.extent.west == 0.0 && parts[0].len() < parts[1].len();
            assert_eq!(m.outlying, [small_is_first, !small_is_first]);
        }
        // Parts two degrees apart stay together.
        let near = [
            lon_lat_box(0.0, 5.0, 40.0, 45.0),
            lon_lat_box(6.5, 9.0, 40.0, 45.0),
        ];
        assert_eq!(outlying_parts(&near), [false, false]);
    }

    #[test]
    fn nothing_finite_chooses_nothing() {
        let parts: Vec<Vec<LonLat>> = vec![vec![[f64::NAN, 1.0]], vec![]];
        assert_eq!(Projection::choose(&parts), None);
        assert_eq!(outlying_parts(&parts), [false, false]);
    }
}

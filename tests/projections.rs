//! The projections against outside references: PROJ (through pyproj, values committed in
//! `tests/data/projections/reference.csv`, see its PROVENANCE.md), and the choice of projection
//! on real boundary data (us-atlas states, `tests/data/geo/PROVENANCE.md`).

use std::path::PathBuf;

use tinct::projection::{AUTHALIC_RADIUS_M, LonLat, MainMass, Projection};

fn data(path: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("tests/data")
        .join(path)
}

struct Reference {
    projection: Projection,
    proj: String,
    lon_lat: LonLat,
    xy: LonLat,
}

fn references() -> Vec<Reference> {
    let text = std::fs::read_to_string(data("projections/reference.csv")).unwrap();
    let mut rows = Vec::new();
    for line in text.lines().skip(1) {
        let cells: Vec<&str> = line.split(',').collect();
        assert_eq!(cells.len(), 10, "{line}");
        let number = |i: usize| cells[i].parse::<f64>().unwrap();
        let projection = match cells[0] {
            "laea" => Projection::LambertAzimuthal {
                lon0: number(1),
                lat0: number(2),
            },
            "aea" => Projection::AlbersEqualArea {
                lon0: number(1),
                lat0: number(2),
                lat1: number(3),
                lat2: number(4),
            },
            "eqearth" => Projection::EqualEarth { lon0: number(1) },
            other => panic!("unknown projection {other}"),
        };
        rows.push(Reference {
            projection,
            proj: cells[5].to_string(),
            lon_lat: [number(6), number(7)],
            xy: [number(8), number(9)],
        });
    }
    rows
}

#[test]
fn forward_agrees_with_proj_within_a_millimetre() {
    // Source: PROJ 9.5.1 via pyproj 3.7.2, `laea`, `aea` and `eqearth` on the sphere of radius
    // 6371007.181 m (tests/data/projections/PROVENANCE.md).
    let rows = references();
    assert!(rows.len() >= 100, "{} rows", rows.len());
    for kind in ["laea", "aea", "eqearth"] {
        assert!(rows.iter().any(|r| r.proj.contains(kind)), "no {kind} rows");
    }
    for r in &rows {
        let [x, y] = r.projection.project(r.lon_lat);
        let error = (x - r.xy[0]).hypot(y - r.xy[1]);
        assert!(
            error < 1e-3,
            "{}: {:?} -> [{x}, {y}], PROJ says {:?} ({error} m apart)",
            r.proj,
            r.lon_lat,
            r.xy
        );
    }
}

#[test]
fn inverse_agrees_with_proj_within_a_nanodegree() {
    // Source: as above; Tinct's inverse of PROJ's forward result gives back PROJ's input.
    for r in references() {
        let [lon, lat] = r.projection.unproject(r.xy);
        let d_lon = (lon - r.lon_lat[0] + 180.0).rem_euclid(360.0) - 180.0;
        assert!(
            d_lon.abs() < 1e-9 && (lat - r.lon_lat[1]).abs() < 1e-9,
            "{}: {:?} -> [{lon}, {lat}], expected {:?}",
            r.proj,
            r.xy,
            r.lon_lat
        );
    }
}

#[test]
fn proj_strings_are_the_ones_proj_was_given() {
    // Source: the PROJ strings the reference values were computed with.
    for r in references() {
        assert_eq!(r.projection.proj_string(), r.proj);
    }
    assert!(
        references()[0]
            .proj
            .contains(&format!("+R={AUTHALIC_RADIUS_M}"))
    );
}

/// The polygons (exterior rings, `[lon, lat]`) of each feature of a GeoJSON file, with the
/// feature's `name` property.
fn features(path: &str) -> Vec<(String, Vec<Vec<LonLat>>)> {
    let text = std::fs::read_to_string(data(path)).unwrap();
    let json: serde_json::Value = serde_json::from_str(&text).unwrap();
    let ring = |v: &serde_json::Value| -> Vec<LonLat> {
        v.as_array()
            .unwrap()
            .iter()
            .map(|p| [p[0].as_f64().unwrap(), p[1].as_f64().unwrap()])
            .collect()
    };
    json["features"]
        .as_array()
        .unwrap()
        .iter()
        .map(|f| {
            let g = &f["geometry"];
            let polygons = match g["type"].as_str().unwrap() {
                "Polygon" => vec![ring(&g["coordinates"][0])],
                "MultiPolygon" => g["coordinates"]
                    .as_array()
                    .unwrap()
                    .iter()
                    .map(|p| ring(&p[0]))
                    .collect(),
                other => panic!("{other}"),
            };
            (
                f["properties"]["name"].as_str().unwrap().to_string(),
                polygons,
            )
        })
        .collect()
}

/// The conterminous United States as a coarse outline: coastal and border points to about half
/// a degree, written down from memory of a general atlas (not from a data set).
fn conterminous_us() -> Vec<LonLat> {
    vec![
        [-124.7, 48.4],
        [-123.0, 49.0],
        [-95.2, 49.0],
        [-95.2, 49.4],
        [-89.6, 48.0],
        [-84.8, 46.5],
        [-83.0, 42.0],
        [-79.0, 43.3],
        [-76.0, 44.2],
        [-74.7, 45.0],
        [-71.5, 45.0],
        [-69.2, 47.4],
        [-67.8, 47.1],
        [-67.0, 44.8],
        [-70.0, 41.7],
        [-74.0, 40.5],
        [-75.5, 35.2],
        [-81.4, 30.3],
        [-80.0, 26.0],
        [-81.0, 25.1],
        [-82.7, 27.8],
        [-84.0, 30.0],
        [-89.0, 30.2],
        [-89.4, 29.0],
        [-94.0, 29.6],
        [-97.2, 26.0],
        [-99.5, 27.5],
        [-101.4, 29.8],
        [-103.0, 29.0],
        [-104.5, 29.6],
        [-106.5, 31.8],
        [-108.2, 31.3],
        [-111.1, 31.3],
        [-114.8, 32.5],
        [-117.1, 32.5],
        [-118.5, 34.0],
        [-120.6, 34.5],
        [-122.5, 37.8],
        [-124.2, 40.4],
        [-124.5, 42.8],
        [-124.0, 46.2],
    ]
}

/// A small box, standing in for an island.
fn island(lon: f64, lat: f64, half_deg: f64) -> Vec<LonLat> {
    vec![
        [lon - half_deg, lat - half_deg],
        [lon + half_deg, lat - half_deg],
        [lon + half_deg, lat + half_deg],
        [lon - half_deg, lat + half_deg],
    ]
}

#[test]
fn alaska_hawaii_and_puerto_rico_do_not_move_the_us_centre() {
    // Regression: the 3,231 US counties (with Alaska, Hawaii and Puerto Rico) came out rotated
    // about 30 degrees, centred in the Pacific. Stand-in: the conterminous outline above, Alaska's
    // real polygons (us-atlas 3.0.1, Aleutians across the 180-degree meridian included), and
    // Hawaii's and Puerto Rico's main islands as boxes at their places (from memory).
    let alaska = features("geo/us_states_subset.geojson")
        .into_iter()
        .find(|(name, _)| name == "Alaska")
        .unwrap()
        .1;
    let mut parts = vec![conterminous_us()];
    parts.extend(alaska.iter().cloned());
    let hawaii = [
        island(-155.5, 19.6, 0.5),
        island(-156.3, 20.8, 0.3),
        island(-157.0, 21.5, 0.3),
        island(-159.5, 22.1, 0.2),
    ];
    parts.extend(hawaii.iter().cloned());
    parts.push(island(-66.5, 18.2, 0.4));
    let m = MainMass::find(&parts).unwrap();
    assert!(!m.outlying[0], "the conterminous states are the main mass");
    assert!(
        m.outlying[1..].iter().all(|&o| o),
        "Alaska, Hawaii, Puerto Rico: {:?}",
        m.outlying
    );
    let projection = m.projection();
    // Snyder 1987 (ch. 14) gives standard parallels 29.5 and 45.5 N, central meridian 96 W, as
    // the usual Albers for the conterminous US; the brief's tolerance is 6 degrees of longitude
    // about 100 W and 4 degrees on each parallel.
    let Projection::AlbersEqualArea {
        lon0, lat1, lat2, ..
    } = projection
    else {
        panic!("{projection:?}")
    };
    assert!((lon0 + 100.0).abs() <= 6.0, "{projection:?}");
    assert!(
        (lat1 - 29.5).abs() <= 4.0 && (lat2 - 45.5).abs() <= 4.0,
        "{projection:?}"
    );
}

#[test]
fn the_us_states_fixture_centres_on_its_conterminous_states() {
    // us-atlas 3.0.1, 13 western and central states and Alaska (tests/data/geo/PROVENANCE.md).
    // The main mass is the 13 states; Alaska's polygons are outlying; the centre lies in the
    // middle of the 13 states' own longitude span, whatever Alaska does across the meridian.
    let states = features("geo/us_states_subset.geojson");
    let mut parts = Vec::new();
    let mut is_alaska = Vec::new();
    for (name, polygons) in &states {
        for p in polygons {
            parts.push(p.clone());
            is_alaska.push(name == "Alaska");
        }
    }
    let m = MainMass::find(&parts).unwrap();
    assert_eq!(m.outlying, is_alaska);
    let lower: Vec<&LonLat> = parts
        .iter()
        .zip(&is_alaska)
        .filter(|(_, a)| !**a)
        .flat_map(|(p, _)| p)
        .collect();
    let west = lower.iter().map(|p| p[0]).fold(f64::INFINITY, f64::min);
    let east = lower.iter().map(|p| p[0]).fold(f64::NEG_INFINITY, f64::max);
    let south = lower.iter().map(|p| p[1]).fold(f64::INFINITY, f64::min);
    let north = lower.iter().map(|p| p[1]).fold(f64::NEG_INFINITY, f64::max);
    assert_eq!(
        (m.extent.west, m.extent.east, m.extent.south, m.extent.north),
        (west, east, south, north)
    );
    let projection = m.projection();
    assert!(
        (projection.lon0() - (west + east) / 2.0).abs() < 1e-9,
        "{projection:?}"
    );
    // Alaska alone: Albers across the 180-degree meridian, centred on Alaska (its span runs
    // from the Aleutians west of 180 to the panhandle near 130 W).
    let alaska: Vec<Vec<LonLat>> = parts
        .iter()
        .zip(&is_alaska)
        .filter(|(_, a)| **a)
        .map(|(p, _)| p.clone())
        .collect();
    let projection = Projection::choose(&alaska).unwrap();
    let Projection::AlbersEqualArea { lon0, .. } = projection else {
        panic!("{projection:?}")
    };
    assert!((-165.0..=-145.0).contains(&lon0), "{projection:?}");
}

#[test]
fn the_whole_world_gets_equal_earth_and_nothing_is_drawn_across_its_edge() {
    // Natural Earth 1:110m countries (npm world-atlas 2.0.2, tests/data/geo/PROVENANCE.md). A
    // world map takes Equal Earth (Šavrič, Patterson and Jenny 2018), the projection made for
    // world maps; Antarctica, whose ring runs round the south pole, must not pass for the main
    // mass (it once did, and the world came out as one polar disc).
    let doc = tinct::geo::import_path(&data("geo/world110m.topojson"), &Default::default())
        .unwrap()
        .into_document("world");
    let projection = doc.settings().projection.unwrap();
    assert!(
        matches!(projection, Projection::EqualEarth { .. }),
        "{projection:?}"
    );
    // No outline has an edge spanning half the map: nothing runs from one side to the other,
    // but along a pole line (Equal Earth draws the poles as lines; Antarctica closes along the
    // south one).
    let [lo, hi] = doc.bounds().unwrap();
    let width = hi[0] - lo[0];
    let poles = [
        projection.project([0.0, 90.0])[1],
        projection.project([0.0, -90.0])[1],
    ];
    let on_pole_line = |p: [f64; 2]| poles.iter().any(|y| (p[1] - y).abs() < 1.0);
    for region in doc.regions().values() {
        let Some(g) = &region.geometry else { continue };
        for polygon in &g.polygons {
            let ring = &polygon.exterior;
            for i in 0..ring.len() {
                let (a, b) = (ring[i], ring[(i + 1) % ring.len()]);
                assert!(
                    (a[0] - b[0]).abs() < width / 2.0 || (on_pole_line(a) && on_pole_line(b)),
                    "{}: an edge from {a:?} to {b:?} crosses the map",
                    region.name
                );
            }
        }
    }
}

#[test]
fn rings_across_the_edge_of_a_world_map_are_cut_there() {
    // Fiji at 1:50m (world-atlas 2.0.2): some of its rings cross the 180-degree meridian. Read
    // as plain coordinates (longitude, latitude), then cut at a world map's edge.
    let options = tinct::geo::ImportOptions {
        coordinates: tinct::geo::CoordinateMode::Planar,
        ..Default::default()
    };
    let fiji = tinct::geo::import_path(&data("geo/world50m_fiji.topojson"), &options).unwrap();
    let mut crossing = 0;
    for region in &fiji.regions {
        for polygon in &region.parts {
            let ring = &polygon.exterior;
            let pieces = tinct::projection::split_at_edge(ring, 0.0);
            // Unwrapped the short way round, the ring's area on the (lon, lat) plane; the pieces
            // must add up to it.
            let mut unwrapped = vec![ring[0]];
            for p in &ring[1..] {
                let last = unwrapped[unwrapped.len() - 1];
                let step = (p[0] - last[0] + 180.0).rem_euclid(360.0) - 180.0;
                unwrapped.push([last[0] + step, p[1]]);
            }
            let area = |r: &[LonLat]| {
                (0..r.len())
                    .map(|i| {
                        let (a, b) = (r[i], r[(i + 1) % r.len()]);
                        a[0] * b[1] - b[0] * a[1]
                    })
                    .sum::<f64>()
                    / 2.0
            };
            let crosses = unwrapped.iter().any(|p| p[0].abs() > 180.0 + 1e-9)
                && unwrapped.iter().any(|p| p[0].abs() < 180.0 - 1e-9);
            if !crosses {
                continue;
            }
            crossing += 1;
            assert!(pieces.len() >= 2);
            let total: f64 = pieces.iter().map(|p| area(p)).sum();
            assert!(
                (total - area(&unwrapped)).abs() < 1e-9 * area(&unwrapped).abs().max(1.0),
                "{total} against {}",
                area(&unwrapped)
            );
            for piece in &pieces {
                assert!(piece.iter().all(|p| p[0].abs() <= 180.0));
                let east = piece.iter().all(|p| p[0] >= 0.0);
                let west = piece.iter().all(|p| p[0] <= 0.0);
                assert!(east || west, "a piece on one side: {piece:?}");
            }
        }
    }
    assert!(crossing > 0, "the fixture has rings across the meridian");
}

#[test]
fn a_map_can_be_drawn_in_another_projection_and_undo_takes_it_back() {
    // 14 US states (us-atlas 3.0.1, tests/data/geo/PROVENANCE.md), imported in Albers.
    let mut doc =
        tinct::geo::import_path(&data("geo/us_states_subset.geojson"), &Default::default())
            .unwrap()
            .into_document("states");
    let before = doc.clone();
    let albers = doc.settings().projection.unwrap();
    assert!(matches!(albers, Projection::AlbersEqualArea { .. }));
    let choices = tinct::geo::document::projection_choices(&doc);
    assert_eq!(choices.len(), 3);
    assert!(
        choices.contains(&albers),
        "the chosen one is among the choices"
    );
    // Equal Earth for a map that is not world-wide is centred on it too (the 13 states span
    // about 124 W to 94 W).
    assert!(choices.iter().any(|p| matches!(
        p,
        Projection::EqualEarth { lon0 } if (-115.0..=-100.0).contains(lon0)
    )));
    let lambert = *choices
        .iter()
        .find(|p| matches!(p, Projection::LambertAzimuthal { .. }))
        .unwrap();
    let undo = doc
        .apply(tinct::geo::document::reproject(&doc, lambert).unwrap())
        .unwrap();
    assert_eq!(doc.settings().projection, Some(lambert));
    // Every vertex is the same place on the globe: back through each projection's inverse
    // (the inverses agree with PROJ, see above), within a micro-degree.
    let utah = doc.region_by_name("Utah").unwrap();
    let (old, new) = (
        before.regions()[&utah].geometry.clone().unwrap(),
        doc.regions()[&utah].geometry.clone().unwrap(),
    );
    assert_ne!(old, new);
    for (a, b) in old.polygons[0]
        .exterior
        .iter()
        .zip(&new.polygons[0].exterior)
    {
        let (p, q) = (albers.unproject(*a), lambert.unproject(*b));
        assert!(
            (p[0] - q[0]).abs() < 1e-6 && (p[1] - q[1]).abs() < 1e-6,
            "{p:?} {q:?}"
        );
    }
    // Borders, their lengths (on the sphere) and the tolerances stay.
    assert_eq!(doc.borders(), before.borders());
    // Saved and read back, the projection is kept.
    let text = tinct::doc::file::to_string(&doc);
    assert_eq!(
        tinct::doc::file::from_str(&text)
            .unwrap()
            .settings()
            .projection,
        Some(lambert)
    );
    // One undo step restores the map exactly.
    doc.apply(undo).unwrap();
    assert_eq!(doc, before);
    // Nothing to do for the projection it already has, or for a map without one.
    assert!(tinct::geo::document::reproject(&before, albers).is_none());
    let sketch =
        tinct::doc::file::load(&super::support::root().join("sample-maps/three-valleys.tinct"))
            .unwrap();
    assert!(tinct::geo::document::projection_choices(&sketch).is_empty());
    assert!(tinct::geo::document::reproject(&sketch, lambert).is_none());
}

#[test]
fn the_49th_parallel_runs_level_at_the_central_meridian_and_bends_as_the_conic_says() {
    // Source data: all states of us-atlas 3.0.1 (US Census Bureau; tests/data/geo/PROVENANCE.md).
    // Washington to Minnesota, the border with Canada follows 49 N. On an Albers conic the
    // parallels are arcs of circles about the cone's apex and the meridians are its radii: a
    // point at longitude lon sits at the polar angle theta = n (lon - lon0) (Snyder 1987, USGS
    // Professional Paper 1395, eq. 14-4), so a parallel runs level where it crosses the central
    // meridian and its direction at lon is turned by theta. The export draws the map with no
    // turn (map units to the page are a translation and a flip of y), so directions measured on
    // the projected geometry are the export's.
    let path = data("geo/us_states10m.topojson");
    let doc = tinct::geo::import_path(&path, &tinct::geo::ImportOptions::default())
        .unwrap()
        .into_document("us");
    let projection = doc
        .settings()
        .projection
        .expect("imported from longitude/latitude");
    let Projection::AlbersEqualArea {
        lon0, lat1, lat2, ..
    } = projection
    else {
        panic!("the conterminous US take a conic: {projection:?}")
    };
    // Snyder's n for the sphere (eq. 14-6); the ellipsoid's differs by far less than the
    // tolerance below. Angles in degrees throughout (theta = n (lon - lon0) holds in any unit).
    let n = (lat1.to_radians().sin() + lat2.to_radians().sin()) / 2.0;
    // Each state's vertices on 49 N (the file is quantised to about 0.005 degrees, so the
    // direction is measured over each state's whole stretch, and over all of it).
    let mut all: Vec<(LonLat, LonLat)> = Vec::new();
    let mut level_near_centre = 0;
    let chord = |points: &[(LonLat, LonLat)]| {
        let west = points
            .iter()
            .min_by(|a, b| a.0[0].total_cmp(&b.0[0]))
            .unwrap();
        let east = points
            .iter()
            .max_by(|a, b| a.0[0].total_cmp(&b.0[0]))
            .unwrap();
        let (p, q) = (west.1, east.1);
        // Eastward, with y growing north.
        let angle = (q[1] - p[1]).atan2(q[0] - p[0]).to_degrees();
        (west.0[0], east.0[0], angle)
    };
    for name in [
        "Washington",
        "Idaho",
        "Montana",
        "North Dakota",
        "Minnesota",
    ] {
        let region = doc
            .regions()
            .values()
            .find(|r| r.name == name)
            .unwrap_or_else(|| panic!("{name}"));
        let on_49: Vec<(LonLat, LonLat)> = region
            .geometry
            .as_ref()
            .unwrap()
            .polygons
            .iter()
            .flat_map(|p| p.exterior.iter())
            .map(|&xy| (projection.unproject(xy), xy))
            .filter(|(ll, _)| (ll[1] - 49.0).abs() <= 0.006)
            .collect();
        let (west, east, angle) = chord(&on_49);
        assert!(east - west >= 0.9, "{name}: {west} to {east}");
        // A chord of the arc turns by theta at its middle; within a quarter degree, plus what
        // the vertices' quantisation (0.006 degrees of latitude at each end) allows.
        let theta = n * ((west + east) / 2.0 - lon0);
        let tolerance = 0.25
            + (0.012 / ((east - west) * 49f64.to_radians().cos()))
                .atan()
                .to_degrees();
        assert!(
            (angle - theta).abs() <= tolerance,
            "{name}: 49 N from {west:.2} to {east:.2} runs at {angle:.2} degrees; the conic \
             says {theta:.2}"
        );
        if ((west + east) / 2.0 - lon0).abs() <= 4.5 {
            level_near_centre += 1;
            assert!(angle.abs() <= 3.0, "{name} at {angle}");
        }
        all.extend(on_49);
    }
    // Washington to Minnesota as one chord.
    let (west, east, angle) = chord(&all);
    let theta = n * ((west + east) / 2.0 - lon0);
    assert!(
        (angle - theta).abs() <= 0.5,
        "49 N from {west:.2} to {east:.2} runs at {angle:.2}; the conic says {theta:.2}"
    );
    assert!(
        level_near_centre >= 1,
        "none near the central meridian {lon0}"
    );
}

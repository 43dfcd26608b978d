//! Geometry import and adjacency, checked against RFC 7946, open boundary datasets and libpysal.

use std::collections::BTreeSet;
use std::path::{Path, PathBuf};

use proptest::prelude::*;
use tinct::geo::{
    self, AdjacencyOptions, BorderKind, CoordinateMode, DiagnosticKind, ImportError, ImportOptions,
    ImportedMap, ImportedRegion, Polygon, Rule, Units,
};

fn data(name: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("tests/data/geo")
        .join(name)
}

fn options(rule: Rule) -> ImportOptions {
    ImportOptions {
        rule,
        ..ImportOptions::default()
    }
}

fn planar(rule: Rule) -> ImportOptions {
    ImportOptions {
        rule,
        coordinates: CoordinateMode::Planar,
        ..ImportOptions::default()
    }
}

fn import_text(text: &str, options: &ImportOptions) -> ImportedMap {
    match geo::import_json(text.as_bytes(), options) {
        Ok(map) => map,
        Err(e) => panic!("import failed: {e}"),
    }
}

/// Border pairs by region name, each pair sorted.
fn named_edges(map: &ImportedMap) -> BTreeSet<(String, String)> {
    map.borders
        .iter()
        .map(|b| {
            let (x, y) = (map.regions[b.a].name.clone(), map.regions[b.b].name.clone());
            if x <= y { (x, y) } else { (y, x) }
        })
        .collect()
}

/// Reference edges from tests/data/geo/reference_edges.txt (libpysal, see make_fixtures.py).
fn reference(fixture: &str, rule: &str) -> BTreeSet<(String, String)> {
    let text = std::fs::read_to_string(data("reference_edges.txt")).unwrap();
    text.lines()
        .filter(|l| !l.starts_with('#'))
        .filter_map(|l| {
            let mut words = l.splitn(3, ' ');
            let (f, r, pair) = (words.next()?, words.next()?, words.next()?);
            if f != fixture || r != rule {
                return None;
            }
            let (a, b) = pair.split_once('|')?;
            Some((a.to_string(), b.to_string()))
        })
        .collect()
}

fn square(x: f64, y: f64, size: f64) -> Vec<[f64; 2]> {
    vec![
        [x, y],
        [x + size, y],
        [x + size, y + size],
        [x, y + size],
        [x, y],
    ]
}

fn region(name: &str, ring: Vec<[f64; 2]>) -> ImportedRegion {
    ImportedRegion {
        source_index: 0,
        name: name.to_string(),
        parts: vec![Polygon {
            exterior: ring,
            holes: vec![],
        }],
        properties: Default::default(),
        position: None,
    }
}

fn shoelace(ring: &[[f64; 2]]) -> f64 {
    tinct::geometry::signed_area(ring).abs()
}

// ---------------------------------------------------------------------------------------------
// RFC 7946

/// The example document of RFC 7946 section 1.5 (reproduced from memory).
const RFC7946_EXAMPLE: &str = r#"{
  "type": "FeatureCollection",
  "features": [{
      "type": "Feature",
      "geometry": {"type": "Point", "coordinates": [102.0, 0.5]},
      "properties": {"prop0": "value0"}
    }, {
      "type": "Feature",
      "geometry": {"type": "LineString",
        "coordinates": [[102.0, 0.0], [103.0, 1.0], [104.0, 0.0], [105.0, 1.0]]},
      "properties": {"prop0": "value0", "prop1": 0.0}
    }, {
      "type": "Feature",
      "geometry": {"type": "Polygon",
        "coordinates": [[[100.0, 0.0], [101.0, 0.0], [101.0, 1.0], [100.0, 1.0], [100.0, 0.0]]]},
      "properties": {"prop0": "value0", "prop1": {"this": "that"}}
    }]
}"#;

#[test]
fn rfc7946_section_1_5_example_imports_the_polygon_and_skips_the_rest() {
    let map = import_text(RFC7946_EXAMPLE, &options(Rule::Rook));
    // RFC 7946 section 1.5: one Point, one LineString, one Polygon feature.
    assert_eq!(map.regions.len(), 1);
    assert_eq!(map.regions[0].source_index, 2);
    assert_eq!(map.regions[0].name, "#2");
    assert_eq!(
        map.diagnostics_of(DiagnosticKind::SkippedGeometry).count(),
        2
    );
    // Longitude/latitude per RFC 7946 section 4, so projected to metres.
    assert_eq!(map.units, Units::Metres);
    // A 1 x 1 degree cell at the equator: R^2 * (pi/180) * sin(1 degree) (spherical zone area).
    let r = geo::project::AUTHALIC_RADIUS_M;
    let expected = r * r * 1f64.to_radians() * 1f64.to_radians().sin();
    let got = shoelace(&map.regions[0].parts[0].exterior);
    assert!(
        (got - expected).abs() / expected < 1e-3,
        "{got} vs {expected}"
    );
}

#[test]
fn rfc7946_appendix_a_polygon_with_hole_and_multipolygon() {
    // RFC 7946 appendix A.3 (polygon with a hole) and A.6 (multipolygon), from memory.
    let text = r#"{"type":"FeatureCollection","features":[
      {"type":"Feature","properties":{"name":"holed"},"geometry":{"type":"Polygon","coordinates":[
        [[100.0,0.0],[101.0,0.0],[101.0,1.0],[100.0,1.0],[100.0,0.0]],
        [[100.8,0.8],[100.8,0.2],[100.2,0.2],[100.2,0.8],[100.8,0.8]]]}},
      {"type":"Feature","properties":{"name":"multi"},"geometry":{"type":"MultiPolygon","coordinates":[
        [[[102.0,2.0],[103.0,2.0],[103.0,3.0],[102.0,3.0],[102.0,2.0]]],
        [[[100.0,0.0],[101.0,0.0],[101.0,1.0],[100.0,1.0],[100.0,0.0]],
         [[100.2,0.2],[100.2,0.8],[100.8,0.8],[100.8,0.2],[100.2,0.2]]]]}}]}"#;
    let map = import_text(text, &planar(Rule::Rook));
    assert_eq!(map.units, Units::MapUnits);
    let holed = &map.regions[0].parts;
    assert_eq!(holed.len(), 1);
    assert_eq!(holed[0].holes.len(), 1);
    // Area arithmetic: 1 - 0.6 * 0.6.
    let area = shoelace(&holed[0].exterior) - shoelace(&holed[0].holes[0]);
    assert!((area - 0.64).abs() < 1e-9);
    assert_eq!(map.regions[1].parts.len(), 2);
    // The second part of "multi" coincides with "holed": their whole outlines are shared, which
    // the geometric pass reports as a border along both outlines: 4 + 4 * 0.6 units.
    assert_eq!(map.borders.len(), 1);
    assert!((map.borders[0].length() - 6.4).abs() < 1e-6);
    // The same area twice is an overlap.
    let overlaps: Vec<_> = map.diagnostics_of(DiagnosticKind::Overlap).collect();
    assert_eq!(overlaps.len(), 1, "{:?}", map.diagnostics);
    assert_eq!(overlaps[0].regions, vec![0, 1]);
}

#[test]
fn missing_name_field_lists_the_available_fields() {
    let err = geo::import_json(
        RFC7946_EXAMPLE.as_bytes(),
        &ImportOptions {
            name_field: Some("title".into()),
            ..ImportOptions::default()
        },
    )
    .unwrap_err();
    match &err {
        ImportError::MissingNameField { field, available } => {
            assert_eq!(field, "title");
            assert_eq!(available, &vec!["prop0".to_string(), "prop1".to_string()]);
        }
        other => panic!("wrong error {other:?}"),
    }
    assert!(err.to_string().contains("available fields: prop0, prop1"));
}

#[test]
fn invalid_documents_give_clear_errors() {
    type Check = fn(&ImportError) -> bool;
    let cases: [(&str, Check); 6] = [
        ("{\"type\": \"FeatureCollection\", \"features\": [", |e| {
            matches!(e, ImportError::Json { line: 1, .. })
        }),
        ("not json at all", |e| matches!(e, ImportError::Json { .. })),
        ("[1, 2, 3]", |e| matches!(e, ImportError::NotGeoJson { .. })),
        ("{\"type\": \"Banana\"}", |e| {
            matches!(e, ImportError::NotGeoJson { .. })
        }),
        ("{\"type\": \"FeatureCollection\"}", |e| {
            matches!(e, ImportError::NotGeoJson { .. })
        }),
        (
            r#"{"type":"Topology","objects":{"a":{"type":"Polygon","arcs":[[0]]}},"arcs":[]}"#,
            |e| matches!(e, ImportError::Topology { .. }),
        ),
    ];
    for (text, check) in cases {
        let err = geo::import_json(text.as_bytes(), &ImportOptions::default()).unwrap_err();
        assert!(check(&err), "{text}: {err:?}");
        assert!(!err.to_string().is_empty());
    }
}

#[test]
fn truncated_geojson_file_reports_where_it_stopped() {
    let text = std::fs::read_to_string(data("us_states_subset.geojson")).unwrap();
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("cut.geojson");
    std::fs::write(&path, &text[..text.len() / 2]).unwrap();
    let err = geo::import_path(&path, &ImportOptions::default()).unwrap_err();
    assert!(matches!(err, ImportError::Json { .. }), "{err:?}");
    assert!(err.to_string().contains("EOF"), "{err}");
}

#[test]
fn truncated_or_missing_shapefile_is_an_error_not_a_panic() {
    let dir = tempfile::tempdir().unwrap();
    let shp = std::fs::read(data("columbus.shp")).unwrap();
    std::fs::write(dir.path().join("cut.shp"), &shp[..shp.len() / 3]).unwrap();
    std::fs::copy(data("columbus.dbf"), dir.path().join("cut.dbf")).unwrap();
    let err = geo::import_path(&dir.path().join("cut.shp"), &ImportOptions::default()).unwrap_err();
    assert!(matches!(err, ImportError::Shapefile { .. }), "{err:?}");
    let err =
        geo::import_path(&dir.path().join("none.shp"), &ImportOptions::default()).unwrap_err();
    assert!(matches!(err, ImportError::Io { .. }), "{err:?}");
    let err = geo::import_path(&dir.path().join("x.kml"), &ImportOptions::default()).unwrap_err();
    assert!(matches!(err, ImportError::UnknownFormat { .. }), "{err:?}");
}

// ---------------------------------------------------------------------------------------------
// Open datasets against libpysal

#[test]
fn us_atlas_topojson_matches_libpysal_rook_and_queen() {
    // us-atlas 3.0.1 states-10m.json (US Census, public domain), 14 states; reference edges by
    // libpysal 4.14.1 Rook/Queen (tests/data/geo/make_fixtures.py). No differences.
    for (rule, name) in [(Rule::Rook, "rook"), (Rule::Queen, "queen")] {
        let map = geo::import_path(&data("us_states_subset.topojson"), &options(rule)).unwrap();
        assert_eq!(map.regions.len(), 14);
        assert_eq!(named_edges(&map), reference("us_states", name), "{name}");
    }
}

#[test]
fn us_atlas_geojson_geometric_adjacency_matches_libpysal() {
    // The same 14 states as GeoJSON, so borders come from the geometric pass, not from arcs.
    for (rule, name) in [(Rule::Rook, "rook"), (Rule::Queen, "queen")] {
        let map = geo::import_path(&data("us_states_subset.geojson"), &options(rule)).unwrap();
        assert_eq!(named_edges(&map), reference("us_states", name), "{name}");
    }
}

#[test]
fn four_corners_rook_is_a_four_cycle_and_queen_is_k4() {
    // Utah, Colorado, New Mexico and Arizona meet at the Four Corners quadripoint; rook
    // contiguity gives the 4-cycle UT-CO-NM-AZ and queen the complete graph K4 (common practice).
    let four = ["Utah", "Colorado", "New Mexico", "Arizona"];
    for file in ["us_states_subset.topojson", "us_states_subset.geojson"] {
        for (rule, expected_pairs) in [(Rule::Rook, 4), (Rule::Queen, 6)] {
            let map = geo::import_path(&data(file), &options(rule)).unwrap();
            let idx: Vec<usize> = four.iter().map(|n| map.region_named(n).unwrap()).collect();
            let among: Vec<_> = map
                .borders
                .iter()
                .filter(|b| idx.contains(&b.a) && idx.contains(&b.b))
                .collect();
            assert_eq!(among.len(), expected_pairs, "{file} {rule:?}");
            let corners: Vec<_> = among
                .iter()
                .filter(|b| b.kind == BorderKind::Corner)
                .collect();
            match rule {
                Rule::Rook => assert!(corners.is_empty()),
                // The two diagonal pairs, Utah-New Mexico and Colorado-Arizona, touch at a point.
                Rule::Queen => assert_eq!(corners.len(), 2, "{file}"),
            }
        }
    }
}

#[test]
fn us_atlas_shared_lengths_follow_the_surveyed_lines() {
    // Colorado-Utah runs along a meridian from 37 N to 41 N, and Colorado-Wyoming along 41 N from
    // 104.05 W to 109.05 W (state boundary descriptions, from memory). On the sphere these are
    // R * 4 degrees and R * cos(41 degrees) * 5 degrees; the data follows the surveyed lines
    // with small deviations, hence the 1.5% allowance.
    let r = geo::project::AUTHALIC_RADIUS_M;
    let map = geo::import_path(&data("us_states_subset.topojson"), &options(Rule::Rook)).unwrap();
    let length = |a: &str, b: &str| {
        let (a, b) = (map.region_named(a).unwrap(), map.region_named(b).unwrap());
        map.borders
            .iter()
            .find(|x| (x.a, x.b) == (a.min(b), a.max(b)))
            .unwrap()
            .length()
    };
    let ut_co = r * 4f64.to_radians();
    let wy_co = r * 41f64.to_radians().cos() * 5f64.to_radians();
    let (got_ut_co, got_wy_co) = (length("Utah", "Colorado"), length("Wyoming", "Colorado"));
    assert!(
        (got_ut_co - ut_co).abs() / ut_co < 0.015,
        "{got_ut_co} vs {ut_co}"
    );
    assert!(
        (got_wy_co - wy_co).abs() / wy_co < 0.015,
        "{got_wy_co} vs {wy_co}"
    );
    // The geometric pass measures the same borders.
    let g = geo::import_path(&data("us_states_subset.geojson"), &options(Rule::Rook)).unwrap();
    let (ut, co) = (
        g.region_named("Utah").unwrap(),
        g.region_named("Colorado").unwrap(),
    );
    let border = g
        .borders
        .iter()
        .find(|x| (x.a, x.b) == (ut.min(co), ut.max(co)))
        .unwrap();
    assert!(
        (border.length() - got_ut_co).abs() / ut_co < 1e-3,
        "{}",
        border.length()
    );
}

#[test]
fn alaska_across_the_180_degree_meridian_stays_whole() {
    // us-atlas Alaska has Aleutian islands on both sides of 180 degrees. Alaska spans about
    // 57 degrees of longitude around 55 N (172 E to 130 W), about 4,000 km; smeared across the
    // map it would span some 20,000 km.
    let map = geo::import_path(&data("us_states_subset.topojson"), &options(Rule::Rook)).unwrap();
    let alaska = &map.regions[map.region_named("Alaska").unwrap()];
    let xs: Vec<f64> = alaska
        .parts
        .iter()
        .flat_map(|p| p.exterior.iter().map(|q| q[0]))
        .collect();
    let width = xs.iter().cloned().fold(f64::NEG_INFINITY, f64::max)
        - xs.iter().cloned().fold(f64::INFINITY, f64::min);
    assert!(width < 5.0e6, "Alaska is {width} m wide");
    assert!(
        map.borders
            .iter()
            .all(|b| b.a != map.region_named("Alaska").unwrap()
                && b.b != map.region_named("Alaska").unwrap())
    );
}

#[test]
fn world_atlas_matches_libpysal_and_keeps_fiji_and_russia_whole() {
    // world-atlas 2.0.2 countries-110m.json (Natural Earth, public domain): Russia, its land
    // neighbours, and Fiji; reference edges by libpysal 4.14.1. No differences.
    for (rule, name) in [(Rule::Rook, "rook"), (Rule::Queen, "queen")] {
        let map = geo::import_path(&data("world_subset.topojson"), &options(rule)).unwrap();
        assert_eq!(map.regions.len(), 16);
        assert_eq!(named_edges(&map), reference("world", name), "{name}");
    }
    let map = geo::import_path(&data("world_subset.topojson"), &options(Rule::Rook)).unwrap();
    // Fiji's islands lie on both sides of 180 degrees within about 600 km (from memory).
    let fiji = &map.regions[map.region_named("Fiji").unwrap()];
    let xs: Vec<f64> = fiji
        .parts
        .iter()
        .flat_map(|p| p.exterior.iter().map(|q| q[0]))
        .collect();
    let width = xs.iter().cloned().fold(f64::NEG_INFINITY, f64::max)
        - xs.iter().cloned().fold(f64::INFINITY, f64::min);
    assert!(
        fiji.parts.len() >= 2 && width < 1.0e6,
        "Fiji is {width} m wide"
    );
}

fn columbus_edges(rule: Rule) -> BTreeSet<(String, String)> {
    columbus_edges_in("columbus.shp", rule)
}

/// Columbus read from `file` (the shapefile or a GDAL-written copy), named by POLYID.
fn columbus_edges_in(file: &str, rule: Rule) -> BTreeSet<(String, String)> {
    let map = geo::import_path(
        &data(file),
        &ImportOptions {
            rule,
            name_field: Some("POLYID".into()),
            coordinates: CoordinateMode::Planar,
            ..ImportOptions::default()
        },
    )
    .unwrap();
    assert_eq!(map.regions.len(), 49);
    named_edges(&map)
}

/// Reads a GAL file (header line `n`, then `id count` and a line of neighbour ids).
fn read_gal(path: &Path) -> BTreeSet<(String, String)> {
    let text = std::fs::read_to_string(path).unwrap();
    let mut lines = text.lines().skip(1);
    let mut edges = BTreeSet::new();
    while let (Some(head), Some(neighbours)) = (lines.next(), lines.next()) {
        let id = head.split_whitespace().next().unwrap().to_string();
        for n in neighbours.split_whitespace() {
            let n = n.to_string();
            edges.insert(if id <= n {
                (id.clone(), n)
            } else {
                (n, id.clone())
            });
        }
    }
    edges
}

#[test]
fn columbus_shapefile_queen_matches_the_published_gal_file() {
    // libpysal example "columbus" (Anselin 1988, Spatial Econometrics, table 12.1): columbus.gal
    // is the published queen contiguity, ids are POLYID. Differences: none.
    let published = read_gal(&data("columbus.gal"));
    assert_eq!(columbus_edges(Rule::Queen), published);
    assert_eq!(published, reference("columbus", "queen"));
}

#[test]
fn columbus_shapefile_rook_matches_libpysal() {
    // Rook reference computed by libpysal 4.14.1 (make_fixtures.py). Differences: none.
    assert_eq!(columbus_edges(Rule::Rook), reference("columbus", "rook"));
}

// ---------------------------------------------------------------------------------------------
// GeoPackage files written by GDAL (ogr2ogr, see PROVENANCE.md) against the same references

#[test]
fn geopackages_written_by_gdal_give_the_adjacency_of_their_sources() {
    // columbus.gpkg: ogr2ogr from columbus.shp (no coordinate system: GDAL records the
    // undefined one). Rook and queen equal libpysal's and the published columbus.gal.
    for (rule, name) in [(Rule::Rook, "rook"), (Rule::Queen, "queen")] {
        assert_eq!(
            columbus_edges_in("columbus.gpkg", rule),
            reference("columbus", name),
            "columbus {name}"
        );
    }
    let columbus = geo::import_path(&data("columbus.gpkg"), &planar(Rule::Rook)).unwrap();
    assert_eq!(columbus.crs, None);
    // us_states_subset.gpkg: ogr2ogr from the GeoJSON, EPSG:4326, MULTIPOLYGON layer.
    for (rule, name) in [(Rule::Rook, "rook"), (Rule::Queen, "queen")] {
        let map = geo::import_path(&data("us_states_subset.gpkg"), &options(rule)).unwrap();
        assert_eq!(map.regions.len(), 14);
        assert_eq!(
            map.units,
            Units::Metres,
            "EPSG:4326 is read as longitude/latitude"
        );
        assert_eq!(
            named_edges(&map),
            reference("us_states", name),
            "us states {name}"
        );
    }
}

#[test]
fn flatgeobuf_files_written_by_gdal_give_the_adjacency_of_their_sources() {
    // columbus.fgb and us_states_subset.fgb: ogr2ogr -f FlatGeobuf from the shapefile and the
    // GeoJSON (PROVENANCE.md); the same libpysal references as the sources.
    for (rule, name) in [(Rule::Rook, "rook"), (Rule::Queen, "queen")] {
        assert_eq!(
            columbus_edges_in("columbus.fgb", rule),
            reference("columbus", name),
            "columbus {name}"
        );
        let map = geo::import_path(&data("us_states_subset.fgb"), &options(rule)).unwrap();
        assert_eq!(map.regions.len(), 14);
        assert_eq!(
            map.units,
            Units::Metres,
            "EPSG:4326 is read as longitude/latitude"
        );
        assert_eq!(
            named_edges(&map),
            reference("us_states", name),
            "us states {name}"
        );
    }
    // Attributes come through with their types: POLYID is an integer column in the .dbf.
    let map = geo::import_path(&data("columbus.fgb"), &planar(Rule::Rook)).unwrap();
    let first = &map.regions[0].properties;
    assert!(
        first.get("POLYID").is_some_and(|v| v.is_number()),
        "{first:?}"
    );
}

#[test]
fn a_projected_geopackage_keeps_its_units_and_records_its_coordinate_system() {
    // us_states_albers.gpkg: the same 14 states reprojected by ogr2ogr to EPSG:5070 (NAD83 /
    // Conus Albers). Shared vertices stay shared, so the adjacency is libpysal's again.
    for (rule, name) in [(Rule::Rook, "rook"), (Rule::Queen, "queen")] {
        let map = geo::import_path(&data("us_states_albers.gpkg"), &options(rule)).unwrap();
        assert_eq!(map.units, Units::MapUnits);
        let crs = map.crs.as_ref().expect("the layer's coordinate system");
        assert_eq!(crs.epsg, Some(5070));
        assert_eq!(crs.name, "NAD83 / Conus Albers");
        assert!(crs.wkt.as_deref().unwrap_or("").starts_with("PROJCS"));
        assert_eq!(named_edges(&map), reference("us_states", name), "{name}");
    }
}

#[test]
fn a_geopackage_with_several_polygon_layers_asks_which() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("two.gpkg");
    std::fs::copy(data("columbus.gpkg"), &path).unwrap();
    {
        let db = rusqlite::Connection::open(&path).unwrap();
        db.execute_batch(
            "CREATE TABLE copy AS SELECT * FROM columbus WHERE fid <= 10;
             INSERT INTO gpkg_contents (table_name, data_type, identifier, srs_id)
               VALUES ('copy', 'features', 'copy', 0);
             INSERT INTO gpkg_geometry_columns VALUES ('copy', 'geom', 'POLYGON', 0, 0, 0);",
        )
        .unwrap();
    }
    let e = geo::import_path(&path, &planar(Rule::Rook)).unwrap_err();
    let text = e.to_string();
    assert!(text.contains("2 polygon layers"), "{text}");
    assert!(text.contains("columbus (POLYGON, 49 features)"), "{text}");
    assert!(text.contains("copy (POLYGON, 10 features)"), "{text}");
    assert!(text.contains("--layer"), "{text}");
    let pick = |layer: &str| ImportOptions {
        layer: Some(layer.into()),
        ..planar(Rule::Rook)
    };
    assert_eq!(
        geo::import_path(&path, &pick("copy"))
            .unwrap()
            .regions
            .len(),
        10
    );
    assert_eq!(
        geo::import_path(&path, &pick("columbus"))
            .unwrap()
            .regions
            .len(),
        49
    );
    let e = geo::import_path(&path, &pick("roads")).unwrap_err();
    assert!(matches!(e, ImportError::MissingLayer { .. }), "{e}");
    assert!(e.to_string().contains("copy (POLYGON, 10 features)"), "{e}");
}

// ---------------------------------------------------------------------------------------------
// Synthetic maps: rules, tolerance and diagnostics

#[test]
fn quadripoint_of_four_squares() {
    // Four unit squares meeting at (1, 1): rook 4-cycle, queen K4 (common practice).
    let regions = vec![
        region("sw", square(0.0, 0.0, 1.0)),
        region("se", square(1.0, 0.0, 1.0)),
        region("ne", square(1.0, 1.0, 1.0)),
        region("nw", square(0.0, 1.0, 1.0)),
    ];
    let rook = AdjacencyOptions::default();
    let (borders, _) = geo::derive_borders(&regions, &rook);
    let edges: Vec<_> = borders.iter().map(|b| (b.a, b.b)).collect();
    assert_eq!(edges, vec![(0, 1), (0, 3), (1, 2), (2, 3)]);
    assert!(borders.iter().all(|b| (b.length() - 1.0).abs() < 1e-9));
    let queen = AdjacencyOptions {
        rule: Rule::Queen,
        ..AdjacencyOptions::default()
    };
    let (borders, _) = geo::derive_borders(&regions, &queen);
    let edges: Vec<_> = borders
        .iter()
        .map(|b| (b.a, b.b, b.kind == BorderKind::Corner))
        .collect();
    assert_eq!(
        edges,
        vec![
            (0, 1, false),
            (0, 2, true),
            (0, 3, false),
            (1, 2, false),
            (1, 3, true),
            (2, 3, false)
        ]
    );
}

/// Is the graph on `n` vertices 3-colourable? Brute force over all 3^n colourings.
fn three_colourable(n: usize, edges: &[(usize, usize)]) -> bool {
    (0..3usize.pow(n as u32)).any(|mut code| {
        let mut colour = vec![0; n];
        for c in colour.iter_mut() {
            *c = code % 3;
            code /= 3;
        }
        edges.iter().all(|&(a, b)| colour[a] != colour[b])
    })
}

#[test]
fn hub_inside_an_odd_ring_needs_four_colours() {
    // A hub square surrounded by five regions in a ring (an odd wheel W5): an odd cycle needs
    // three colours and the hub touches all of them, so three colours cannot do (common practice).
    let hub = square(1.0, 1.0, 1.0);
    let ring = vec![
        region(
            "s",
            vec![[0.0, 0.0], [3.0, 0.0], [3.0, 1.0], [0.0, 1.0], [0.0, 0.0]],
        ),
        region(
            "e",
            vec![[3.0, 1.0], [3.0, 3.0], [2.0, 3.0], [2.0, 1.0], [3.0, 1.0]],
        ),
        region(
            "n",
            vec![[2.0, 3.0], [1.0, 3.0], [1.0, 2.0], [2.0, 2.0], [2.0, 3.0]],
        ),
        region(
            "nw",
            vec![[1.0, 3.0], [0.0, 3.0], [0.0, 1.5], [1.0, 1.5], [1.0, 3.0]],
        ),
        region(
            "w",
            vec![[0.0, 1.5], [0.0, 1.0], [1.0, 1.0], [1.0, 1.5], [0.0, 1.5]],
        ),
    ];
    let mut regions = vec![region("hub", hub)];
    regions.extend(ring);
    let (borders, _) = geo::derive_borders(&regions, &AdjacencyOptions::default());
    let edges: Vec<_> = borders.iter().map(|b| (b.a, b.b)).collect();
    assert_eq!(
        edges,
        vec![
            (0, 1),
            (0, 2),
            (0, 3),
            (0, 4),
            (0, 5),
            (1, 2),
            (1, 5),
            (2, 3),
            (3, 4),
            (4, 5)
        ]
    );
    assert!(!three_colourable(6, &edges));
    assert!(three_colourable(
        5,
        &[(0, 1), (1, 2), (2, 3), (3, 4), (0, 4)]
    ));
}

#[test]
fn gap_within_tolerance_is_a_border_and_beyond_it_a_gap_diagnostic() {
    let regions = vec![
        region("a", square(0.0, 0.0, 1.0)),
        region("b", square(1.01, 0.0, 1.0)),
    ];
    let tolerant = AdjacencyOptions {
        tolerance: 0.02,
        ..AdjacencyOptions::default()
    };
    let (borders, diagnostics) = geo::derive_borders(&regions, &tolerant);
    assert_eq!(borders.len(), 1);
    assert!(
        (borders[0].length() - 1.0).abs() < 0.05,
        "{}",
        borders[0].length()
    );
    assert!(diagnostics.is_empty(), "{diagnostics:?}");
    let exact = AdjacencyOptions {
        gap_width: Some(0.1),
        ..AdjacencyOptions::default()
    };
    let (borders, diagnostics) = geo::derive_borders(&regions, &exact);
    assert!(borders.is_empty());
    assert_eq!(diagnostics.len(), 1);
    assert_eq!(diagnostics[0].kind, DiagnosticKind::Gap);
    assert_eq!(diagnostics[0].regions, vec![0, 1]);
}

#[test]
fn overlap_beyond_tolerance_is_reported() {
    let regions = vec![
        region("a", square(0.0, 0.0, 1.0)),
        region("b", square(0.95, 0.25, 1.0)),
    ];
    // b reaches 0.05 into a.
    let (_, diagnostics) = geo::derive_borders(&regions, &AdjacencyOptions::default());
    let overlaps: Vec<_> = diagnostics
        .iter()
        .filter(|d| d.kind == DiagnosticKind::Overlap)
        .collect();
    assert_eq!(overlaps.len(), 1, "{diagnostics:?}");
    assert_eq!(overlaps[0].regions, vec![0, 1]);
    // Within a 0.1 tolerance the same overlap is only a sliver along a shared border.
    let lenient = AdjacencyOptions {
        tolerance: 0.1,
        ..AdjacencyOptions::default()
    };
    let (borders, diagnostics) = geo::derive_borders(&regions, &lenient);
    assert_eq!(borders.len(), 1);
    assert!(
        diagnostics
            .iter()
            .all(|d| d.kind != DiagnosticKind::Overlap)
    );
}

#[test]
fn ring_problems_empty_geometry_and_duplicate_names_are_diagnostics() {
    let text = r#"{"type":"FeatureCollection","features":[
      {"type":"Feature","properties":{"name":"bow tie"},"geometry":{"type":"Polygon","coordinates":[
        [[0,0],[2,2],[2,0],[0,2],[0,0]]]}},
      {"type":"Feature","properties":{"name":"open"},"geometry":{"type":"Polygon","coordinates":[
        [[5,0],[6,0],[6,1],[5,1]]]}},
      {"type":"Feature","properties":{"name":"nothing"},"geometry":null},
      {"type":"Feature","properties":{"name":"twin"},"geometry":{"type":"Polygon","coordinates":[
        [[10,0],[11,0],[11,1],[10,0]]]}},
      {"type":"Feature","properties":{"name":"twin"},"geometry":{"type":"Polygon","coordinates":[
        [[20,0],[21,0],[21,1],[20,0]]]}}]}"#;
    let map = import_text(text, &planar(Rule::Rook));
    assert_eq!(map.regions.len(), 5);
    let kinds = |k| {
        map.diagnostics_of(k)
            .map(|d| d.regions.clone())
            .collect::<Vec<_>>()
    };
    assert_eq!(kinds(DiagnosticKind::SelfIntersection), vec![vec![0]]);
    assert_eq!(kinds(DiagnosticKind::UnclosedRing), vec![vec![1]]);
    assert_eq!(kinds(DiagnosticKind::EmptyGeometry), vec![vec![2]]);
    assert_eq!(kinds(DiagnosticKind::DuplicateName), vec![vec![3, 4]]);
    assert!(map.regions[2].parts.is_empty());
}

#[test]
fn min_border_length_drops_short_borders_with_a_diagnostic() {
    // Two 1 x 1 squares sharing a 0.1 long piece of edge.
    let regions = vec![
        region("a", square(0.0, 0.0, 1.0)),
        region("b", square(1.0, 0.9, 1.0)),
    ];
    let opts = AdjacencyOptions {
        min_border_length: 0.5,
        ..AdjacencyOptions::default()
    };
    let (borders, diagnostics) = geo::derive_borders(&regions, &opts);
    assert!(borders.is_empty());
    assert_eq!(diagnostics[0].kind, DiagnosticKind::ShortBorder);
    // Exact up to the rounding reach (1e-9 of the map's diagonal) at the two T-junctions.
    let (borders, _) = geo::derive_borders(&regions, &AdjacencyOptions::default());
    assert!(
        (borders[0].length() - 0.1).abs() < 1e-7,
        "{}",
        borders[0].length()
    );
}

#[test]
fn split_parts_makes_one_region_per_part() {
    let text = r#"{"type":"Feature","properties":{"name":"isles"},"geometry":{"type":"MultiPolygon",
      "coordinates":[[[[0,0],[1,0],[1,1],[0,1],[0,0]]],[[[1,0],[2,0],[2,1],[1,1],[1,0]]]]}}"#;
    let whole = import_text(text, &planar(Rule::Rook));
    assert_eq!(whole.regions.len(), 1);
    assert!(whole.borders.is_empty());
    let split = import_text(
        text,
        &ImportOptions {
            split_parts: true,
            ..planar(Rule::Rook)
        },
    );
    let names: Vec<_> = split.regions.iter().map(|r| r.name.as_str()).collect();
    assert_eq!(names, vec!["isles (1)", "isles (2)"]);
    assert_eq!(split.edges(), vec![(0, 1)]);
}

#[test]
fn synthetic_grid_rook_and_queen_are_grid_neighbours() {
    let (cols, rows) = (7, 5);
    let regions = super::support::generators::jittered_grid(cols, rows, 4, 0.2, 11);
    let (rook, diagnostics) = geo::derive_borders(&regions, &AdjacencyOptions::default());
    assert!(diagnostics.is_empty(), "{diagnostics:?}");
    let mut expected_rook = Vec::new();
    let mut expected_queen = BTreeSet::new();
    for r in 0..rows {
        for c in 0..cols {
            let i = r * cols + c;
            for (dc, dr) in [(1i64, 0i64), (0, 1), (1, 1), (-1, 1)] {
                let (c2, r2) = (c as i64 + dc, r as i64 + dr);
                if c2 < 0 || c2 >= cols as i64 || r2 >= rows as i64 {
                    continue;
                }
                let j = r2 as usize * cols + c2 as usize;
                expected_queen.insert((i.min(j), i.max(j)));
                if dc == 0 || dr == 0 {
                    expected_rook.push((i.min(j), i.max(j)));
                }
            }
        }
    }
    expected_rook.sort();
    assert_eq!(
        rook.iter().map(|b| (b.a, b.b)).collect::<Vec<_>>(),
        expected_rook
    );
    let queen = AdjacencyOptions {
        rule: Rule::Queen,
        ..AdjacencyOptions::default()
    };
    let (queen, _) = geo::derive_borders(&regions, &queen);
    assert_eq!(
        queen.iter().map(|b| (b.a, b.b)).collect::<BTreeSet<_>>(),
        expected_queen
    );
}

#[test]
fn output_is_deterministic() {
    let text = std::fs::read(data("us_states_subset.geojson")).unwrap();
    let a = geo::import_json(&text, &options(Rule::Queen)).unwrap();
    let b = geo::import_json(&text, &options(Rule::Queen)).unwrap();
    assert_eq!(a, b);
}

// ---------------------------------------------------------------------------------------------
// Property tests

/// Two unit squares sharing the edge x = 1, each with its own copy of the edge split into
/// `points` pieces, every copy's inner vertex moved by up to `jitter` in x and along the edge.
fn jittered_pair(points: &[(f64, f64, f64, f64)], jitter: f64, shift: f64) -> Vec<ImportedRegion> {
    let n = points.len() + 1;
    let y = |k: usize| k as f64 / n as f64;
    let mut left = vec![[0.0, 0.0], [1.0, 0.0]];
    for (k, (dx, dy, _, _)) in points.iter().enumerate() {
        left.push([1.0 + jitter * dx, y(k + 1) + jitter * dy / (2.0 * n as f64)]);
    }
    left.extend([[1.0, 1.0], [0.0, 1.0], [0.0, 0.0]]);
    let mut right = vec![
        [1.0 + shift, 0.0],
        [2.0 + shift, 0.0],
        [2.0 + shift, 1.0],
        [1.0 + shift, 1.0],
    ];
    for (k, (_, _, dx, dy)) in points.iter().enumerate().rev() {
        right.push([
            1.0 + shift + jitter * dx,
            y(k + 1) + jitter * dy / (2.0 * n as f64),
        ]);
    }
    right.push([1.0 + shift, 0.0]);
    vec![region("left", left), region("right", right)]
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(64))]

    /// Jittering the two copies of a shared boundary, each by less than half the tolerance (so
    /// they stay within the tolerance of each other), never loses the border, and its measured
    /// length stays close to the true length 1.
    #[test]
    fn jitter_below_tolerance_keeps_the_border(
        points in prop::collection::vec((-1.0f64..1.0, -1.0f64..1.0, -1.0f64..1.0, -1.0f64..1.0), 1..12),
        tolerance in 0.001f64..0.03,
        fraction in 0.0f64..0.49,
    ) {
        let regions = jittered_pair(&points, tolerance * fraction, 0.0);
        let opts = AdjacencyOptions { tolerance, ..AdjacencyOptions::default() };
        let (borders, _) = geo::derive_borders(&regions, &opts);
        prop_assert_eq!(borders.len(), 1);
        prop_assert!((borders[0].length() - 1.0).abs() < 4.0 * tolerance,
            "length {}", borders[0].length());
    }

    /// Shifting one region away by more than the tolerance (plus the jitter) removes the border.
    #[test]
    fn shifting_away_beyond_tolerance_removes_the_border(
        points in prop::collection::vec((-1.0f64..1.0, -1.0f64..1.0, -1.0f64..1.0, -1.0f64..1.0), 1..12),
        tolerance in 0.001f64..0.05,
        extra in 1.001f64..3.0,
    ) {
        let jitter = tolerance * 0.2;
        // Each copy may lean towards the other by up to `jitter`.
        let shift = tolerance * extra + 2.0 * jitter;
        let regions = jittered_pair(&points, jitter, shift);
        let opts = AdjacencyOptions { tolerance, rule: Rule::Queen, ..AdjacencyOptions::default() };
        let (borders, _) = geo::derive_borders(&regions, &opts);
        prop_assert!(borders.is_empty(), "{:?}", borders);
    }

    /// Jittered grids (shared vertices) give exactly the grid's four-neighbour rook graph.
    #[test]
    fn jittered_grids_give_the_grid_graph(
        cols in 1usize..6, rows in 1usize..6, steps in 1usize..5, jitter in 0.0f64..0.2, seed in 0u64..1000,
    ) {
        let regions = super::support::generators::jittered_grid(cols, rows, steps, jitter, seed);
        let (borders, _) = geo::derive_borders(&regions, &AdjacencyOptions::default());
        let expected = (rows * (cols - 1)) + (cols * (rows - 1));
        prop_assert_eq!(borders.len(), expected);
        for b in &borders {
            let (ca, ra, cb, rb) = (b.a % cols, b.a / cols, b.b % cols, b.b / cols);
            prop_assert_eq!(ca.abs_diff(cb) + ra.abs_diff(rb), 1);
        }
    }
}

// ---------------------------------------------------------------------------------------------
// Invented sample maps, documents and the adjacency report

fn sample(name: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("sample-maps")
        .join(name)
}

#[test]
fn sample_maps_match_their_shapely_borders() {
    // Each sample map lists its borders in `tinct_borders`, computed with shapely 2.2.0 by
    // sample-maps/tools/make_samples.py (kind and length rounded to 0.1 m). Queen keeps all.
    for file in [
        "vessland-province.geojson",
        "three-valleys.geojson",
        "exclave-coast.geojson",
    ] {
        let text = std::fs::read_to_string(sample(file)).unwrap();
        let json: serde_json::Value = serde_json::from_str(&text).unwrap();
        let ids: Vec<u64> = json["features"]
            .as_array()
            .unwrap()
            .iter()
            .map(|f| f["id"].as_u64().unwrap())
            .collect();
        let mut expected: Vec<(u64, u64, String, f64)> = json["tinct_borders"]
            .as_array()
            .unwrap()
            .iter()
            .map(|b| {
                (
                    b["a"].as_u64().unwrap(),
                    b["b"].as_u64().unwrap(),
                    b["kind"].as_str().unwrap().to_string(),
                    b["length"].as_f64().unwrap(),
                )
            })
            .collect();
        expected.sort_by_key(|x| (x.0, x.1));
        let map = geo::import_path(&sample(file), &options(Rule::Queen)).unwrap();
        let mut got: Vec<(u64, u64, String, f64)> = map
            .borders
            .iter()
            .map(|b| {
                let (x, y) = (
                    ids[map.regions[b.a].source_index],
                    ids[map.regions[b.b].source_index],
                );
                let kind = if b.kind == BorderKind::Corner {
                    "corner"
                } else {
                    "shared"
                };
                (x.min(y), x.max(y), kind.to_string(), b.length())
            })
            .collect();
        got.sort_by_key(|x| (x.0, x.1));
        assert_eq!(got.len(), expected.len(), "{file}");
        for (g, e) in got.iter().zip(&expected) {
            assert_eq!((g.0, g.1, &g.2), (e.0, e.1, &e.2), "{file}");
            assert!((g.3 - e.3).abs() <= 0.06, "{file} {g:?} vs {e:?}");
        }
        // The maps are valid planar subdivisions; the only remark allowed is a near miss
        // (three-valleys: Pollenstead and The Longwater come within 0.27 m without touching,
        // and shapely agrees that they do not touch).
        assert!(
            map.diagnostics
                .iter()
                .all(|d| d.kind == DiagnosticKind::Gap),
            "{file}: {:?}",
            map.diagnostics
        );
    }
}

#[test]
fn into_document_records_every_contact_and_the_rule() {
    // Vessland has two districts that meet only at a quadripoint (sample-maps/README.md).
    let map = geo::import_path(&sample("vessland-province.geojson"), &options(Rule::Rook)).unwrap();
    let (borders, excluded) = (map.borders.len(), map.excluded.len());
    assert_eq!(excluded, 2);
    let doc = map.into_document("Vessland");
    assert_eq!(doc.regions().len(), 34);
    assert_eq!(doc.borders().len(), borders + excluded);
    assert!(!doc.settings().corners_count);
    let water = doc
        .regions()
        .values()
        .filter(|r| r.role == tinct::doc::Role::Water)
        .count();
    assert_eq!(water, 3);
    assert_eq!(
        doc.regions().values().filter(|r| r.pin.is_some()).count(),
        1
    );
    // Active borders under rook are exactly the shared ones.
    assert_eq!(
        doc.active_borders()
            .filter(|(p, _)| {
                let land = |id| doc.regions()[&id].role == tinct::doc::Role::Land;
                land(p.a()) && land(p.b())
            })
            .count(),
        doc.active_borders().count()
    );
    assert!(
        doc.active_borders()
            .all(|(_, b)| b.kind == tinct::doc::BorderKind::Shared)
    );
    // Exclave Coast: Aldwyn and Port Tessary share the group "Aldwyn".
    let doc = geo::import_path(&sample("exclave-coast.geojson"), &options(Rule::Rook))
        .unwrap()
        .into_document("Exclave Coast");
    let group = doc
        .groups()
        .iter()
        .find(|(_, g)| g.name == "Aldwyn")
        .map(|(id, _)| *id)
        .unwrap();
    assert_eq!(doc.group_members(group).len(), 2);
}

#[test]
fn adjacency_report_names_regions_by_import_id() {
    let map = geo::import_path(&data("us_states_subset.topojson"), &options(Rule::Queen)).unwrap();
    let report = tinct::cli::import::report("us.topojson", &map);
    let json = serde_json::to_value(&report).unwrap();
    assert_eq!(json["schema"], 1);
    assert_eq!(json["rule"], "queen");
    assert_eq!(json["units"], "metres");
    // The 13 states decide the projection, not Alaska (see tests/projections.rs).
    let projection = json["projection"].as_str().unwrap();
    assert!(
        projection.starts_with("Albers equal-area conic (standard parallels "),
        "{projection}"
    );
    assert!(json["proj"].as_str().unwrap().starts_with("+proj=aea "));
    assert_eq!(json["regions"][0]["id"], 1);
    assert_eq!(json["regions"][0]["name"], "Utah");
    assert_eq!(json["regions"][0]["source_index"], 0);
    // Utah (1) and New Mexico (4) touch only at the Four Corners.
    let corner = json["borders"]
        .as_array()
        .unwrap()
        .iter()
        .find(|b| b["a"] == 1 && b["b"] == 4)
        .unwrap();
    assert_eq!(corner["kind"], "corner");
    assert_eq!(corner["length"], 0.0);
}

// ---------------------------------------------------------------------------------------------
// Command line

fn tinct(args: &[&std::ffi::OsStr]) -> std::process::Output {
    std::process::Command::new(env!("CARGO_BIN_EXE_tinct"))
        .args(args)
        .output()
        .unwrap()
}

#[test]
fn cli_import_then_analyse_a_real_dataset() {
    let dir = tempfile::tempdir().unwrap();
    let project = dir.path().join("us.tinct");
    let input = data("us_states_subset.topojson");
    let out = tinct(&[
        "import".as_ref(),
        input.as_os_str(),
        "--out".as_ref(),
        project.as_os_str(),
        "--rule".as_ref(),
        "queen".as_ref(),
    ]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let out = tinct(&["analyse".as_ref(), project.as_os_str(), "--json".as_ref()]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let report: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(report["summary"]["regions"], 14);
    // 25 rook borders (libpysal, reference_edges.txt) plus the two Four Corners diagonals.
    assert_eq!(report["borders"]["recorded"], 27);
    assert_eq!(report["borders"]["corner"], 2);
    assert_eq!(report["borders"]["active"], 27);
}

#[test]
fn cli_analyse_reads_a_sample_map_directly_and_adjacency_prints_json() {
    let map = sample("three-valleys.geojson");
    let out = tinct(&["analyse".as_ref(), map.as_os_str(), "--json".as_ref()]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let report: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let text = std::fs::read_to_string(&map).unwrap();
    let json: serde_json::Value = serde_json::from_str(&text).unwrap();
    let features = json["features"].as_array().unwrap().len();
    assert_eq!(report["summary"]["regions"], features);
    let out = tinct(&["adjacency".as_ref(), map.as_os_str(), "--json".as_ref()]);
    assert!(out.status.success());
    let adjacency: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let shared = json["tinct_borders"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|b| b["kind"] == "shared")
        .count();
    assert_eq!(adjacency["borders"].as_array().unwrap().len(), shared);
}

#[test]
fn cli_missing_name_field_exits_with_bad_input_and_lists_fields() {
    let input = data("columbus.shp");
    let out = tinct(&[
        "adjacency".as_ref(),
        input.as_os_str(),
        "--name-field".as_ref(),
        "NAMEX".as_ref(),
    ]);
    assert_eq!(out.status.code(), Some(2));
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(
        stderr.contains("available fields: AREA, PERIMETER"),
        "{stderr}"
    );
}

#[test]
fn us_atlas_with_independently_jittered_vertices_needs_the_tolerance() {
    // Move every vertex of every state by up to 50 m on its own, so that neighbours no longer
    // share vertices (as when states are digitised separately). With a 200 m tolerance and a
    // 1 km minimum the rook borders still equal libpysal's on the clean data. With no tolerance
    // the two copies of each border cross back and forth: only the stretches near crossings
    // count (a small part of the length) and the overlaps are reported.
    let map = geo::import_path(&data("us_states_subset.geojson"), &options(Rule::Rook)).unwrap();
    let mut rng = super::support::generators::Rng::new(5);
    let mut regions = map.regions.clone();
    for region in &mut regions {
        for polygon in &mut region.parts {
            // Imported rings are open (tinct::geometry), so every position moves once.
            for ring in std::iter::once(&mut polygon.exterior).chain(polygon.holes.iter_mut()) {
                for p in ring.iter_mut() {
                    p[0] += 50.0 * rng.symmetric();
                    p[1] += 50.0 * rng.symmetric();
                }
            }
        }
    }
    let name_pairs = |borders: &[geo::ImportedBorder]| -> BTreeSet<(String, String)> {
        borders
            .iter()
            .map(|b| {
                let (x, y) = (regions[b.a].name.clone(), regions[b.b].name.clone());
                if x <= y { (x, y) } else { (y, x) }
            })
            .collect()
    };
    let tolerant = AdjacencyOptions {
        tolerance: 200.0,
        min_border_length: 1000.0,
        ..AdjacencyOptions::default()
    };
    let (borders, _) = geo::derive_borders(&regions, &tolerant);
    assert_eq!(name_pairs(&borders), reference("us_states", "rook"));
    let tolerant_length: f64 = borders.iter().map(|b| b.length()).sum();
    let (borders, diagnostics) = geo::derive_borders(&regions, &AdjacencyOptions::default());
    let exact_length: f64 = borders.iter().map(|b| b.length()).sum();
    assert!(
        exact_length < 0.2 * tolerant_length,
        "{exact_length} vs {tolerant_length}"
    );
    let overlaps = diagnostics
        .iter()
        .filter(|d| d.kind == DiagnosticKind::Overlap)
        .count();
    assert!(overlaps >= 20, "{diagnostics:?}");
}

#[test]
fn topojson_split_parts_keeps_arc_borders_per_part() {
    // With split parts, multi-part states (Alaska's islands, California's and Texas's islands)
    // become one region per part, in one same-colour group per state; mapping each part back to
    // its state gives the libpysal rook edges again.
    let opts = ImportOptions {
        split_parts: true,
        ..options(Rule::Rook)
    };
    let map = geo::import_path(&data("us_states_subset.topojson"), &opts).unwrap();
    let base = |name: &str| name.rsplit_once(" (").map_or(name, |(b, _)| b).to_string();
    let alaska_parts = map
        .regions
        .iter()
        .filter(|r| base(&r.name) == "Alaska")
        .count();
    assert!(alaska_parts > 10, "{alaska_parts}");
    let split_states: BTreeSet<String> = map
        .regions
        .iter()
        .filter(|r| r.name.contains(" ("))
        .map(|r| base(&r.name))
        .collect();
    let doc = map.clone().into_document("split");
    assert_eq!(doc.groups().len(), split_states.len());
    let by_state: BTreeSet<(String, String)> = named_edges(&map)
        .into_iter()
        .map(|(a, b)| (base(&a), base(&b)))
        .filter(|(a, b)| a != b)
        .collect();
    assert_eq!(by_state, reference("us_states", "rook"));
}

#[test]
fn enclave_is_a_border_and_a_nested_region_is_an_overlap() {
    // An enclave fills a hole of its neighbour: a border along the whole hole, no overlap.
    let outer = ImportedRegion {
        parts: vec![Polygon {
            exterior: square(0.0, 0.0, 10.0),
            holes: vec![square(4.0, 4.0, 2.0)],
        }],
        ..region("outer", vec![])
    };
    let regions = vec![outer.clone(), region("enclave", square(4.0, 4.0, 2.0))];
    let (borders, diagnostics) = geo::derive_borders(&regions, &AdjacencyOptions::default());
    assert_eq!(borders.len(), 1);
    assert!((borders[0].length() - 8.0).abs() < 1e-9);
    assert!(diagnostics.is_empty(), "{diagnostics:?}");
    // A region drawn on top of another without touching its boundary.
    let regions = vec![
        region("big", square(0.0, 0.0, 10.0)),
        region("inside", square(1.0, 1.0, 2.0)),
    ];
    let (borders, diagnostics) = geo::derive_borders(&regions, &AdjacencyOptions::default());
    assert!(borders.is_empty());
    assert_eq!(diagnostics.len(), 1, "{diagnostics:?}");
    assert_eq!(diagnostics[0].kind, DiagnosticKind::Overlap);
    assert_eq!(diagnostics[0].regions, vec![0, 1]);
    // An island inside the hole of another region is neither.
    let regions = vec![outer, region("island", square(4.5, 4.5, 1.0))];
    let (borders, diagnostics) = geo::derive_borders(&regions, &AdjacencyOptions::default());
    assert!(borders.is_empty());
    assert!(
        diagnostics.iter().all(|d| d.kind == DiagnosticKind::Gap),
        "{diagnostics:?}"
    );
}

#[test]
fn topojson_specification_example_decodes_the_quantised_polygon() {
    // The example topology of the TopoJSON Format Specification (section 1.1, reproduced from
    // memory): a Point, a LineString and a Polygon; the polygon's delta-encoded arc decodes to the
    // square with corners (100, 0) and (101, 1), up to quantisation.
    let text = r#"{
      "type": "Topology",
      "transform": {"scale": [0.0005000500050005, 0.00010001000100010001], "translate": [100, 0]},
      "objects": {"example": {"type": "GeometryCollection", "geometries": [
        {"type": "Point", "properties": {"prop0": "value0"}, "coordinates": [4000, 5000]},
        {"type": "LineString", "properties": {"prop0": "value0", "prop1": 0}, "arcs": [0]},
        {"type": "Polygon", "properties": {"prop0": "value0", "prop1": {"this": "that"}}, "arcs": [[1]]}
      ]}},
      "arcs": [
        [[4000, 0], [1999, 9999], [2000, -9999], [2000, 9999]],
        [[0, 0], [0, 9999], [2000, 0], [0, -9999], [-2000, 0]]
      ]
    }"#;
    let map = import_text(text, &planar(Rule::Rook));
    assert_eq!(map.regions.len(), 1);
    assert_eq!(map.regions[0].source_index, 2);
    assert_eq!(
        map.diagnostics_of(DiagnosticKind::SkippedGeometry).count(),
        2
    );
    let ring = &map.regions[0].parts[0].exterior;
    // Open, as Tinct keeps rings (the file's closing position is not repeated).
    let expected = [[100.0, 0.0], [100.0, 1.0], [101.0, 1.0], [101.0, 0.0]];
    assert_eq!(ring.len(), expected.len());
    for (got, want) in ring.iter().zip(expected) {
        assert!(
            (got[0] - want[0]).abs() < 1e-3 && (got[1] - want[1]).abs() < 1e-3,
            "{got:?}"
        );
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(48))]

    /// Cut or corrupted files give a value or an error, never a panic (house rule: no panics
    /// on user input).
    #[test]
    fn damaged_files_never_panic_and_what_comes_back_makes_sense(cut in 0.0f64..1.0, flips in prop::collection::vec((0.0f64..1.0, any::<u8>()), 0..8)) {
        let damage = |mut bytes: Vec<u8>| {
            let keep = ((bytes.len() as f64) * cut) as usize;
            for (at, value) in &flips {
                let i = ((bytes.len() as f64) * at) as usize;
                if i < bytes.len() {
                    bytes[i] = *value;
                }
            }
            bytes.truncate(keep.max(1));
            bytes
        };
        // What comes back must make sense: an import whose coordinates are all finite numbers,
        // or an error that says something; a JSON text cut short with nothing else changed is
        // never valid JSON, so it must be refused with the line where it stops.
        let sane = |result: Result<geo::ImportedMap, geo::ImportError>| -> Option<geo::ImportError> {
            match result {
                Ok(map) => {
                    let finite = map.regions.iter().flat_map(|r| &r.parts).all(|p| {
                        std::iter::once(&p.exterior)
                            .chain(&p.holes)
                            .flatten()
                            .all(|q| q[0].is_finite() && q[1].is_finite())
                    });
                    assert!(finite, "an import with a coordinate that is not a number");
                    None
                }
                Err(e) => {
                    assert!(!e.to_string().trim().is_empty(), "an error without words");
                    Some(e)
                }
            }
        };
        let truncated_only = flips.is_empty() && cut < 0.99;
        for file in ["world_subset.topojson", "us_states_subset.geojson"] {
            let bytes = damage(std::fs::read(data(file)).unwrap());
            let error = sane(geo::import_json(&bytes, &ImportOptions::default()));
            if truncated_only {
                prop_assert!(
                    matches!(error, Some(geo::ImportError::Json { line, .. }) if line >= 1),
                    "{file} cut at {cut}: {error:?}"
                );
            }
        }
        let dir = tempfile::tempdir().unwrap();
        let shp = damage(std::fs::read(data("columbus.shp")).unwrap());
        std::fs::write(dir.path().join("d.shp"), shp).unwrap();
        std::fs::copy(data("columbus.dbf"), dir.path().join("d.dbf")).unwrap();
        let error = sane(geo::import_path(&dir.path().join("d.shp"), &ImportOptions::default()));
        if truncated_only {
            // The header says how long the file is: a shorter file is refused.
            prop_assert!(error.is_some(), "columbus.shp cut at {cut} was accepted");
        }
    }
}

#[test]
fn real_data_quirks_are_reported() {
    // us-atlas: Oregon's ring has a spike at the California-Nevada-Oregon tripoint; shapely 2.2.0
    // explain_validity says "Self-intersection[-119.999364 41.994196]" (PROVENANCE.md).
    for file in ["us_states_subset.geojson", "us_states_subset.topojson"] {
        let map = geo::import_path(&data(file), &options(Rule::Rook)).unwrap();
        let oregon = map.region_named("Oregon").unwrap();
        let selfx: Vec<_> = map
            .diagnostics_of(DiagnosticKind::SelfIntersection)
            .collect();
        assert_eq!(selfx.len(), 1, "{file}: {:?}", map.diagnostics);
        assert_eq!(selfx[0].regions, vec![oregon]);
    }
    // world-atlas 110m: North Korea's ring [47, 47, 47] over a zero-length arc is degenerate.
    let map = geo::import_path(&data("world_subset.topojson"), &options(Rule::Rook)).unwrap();
    let nk = map.region_named("North Korea").unwrap();
    let degenerate: Vec<_> = map.diagnostics_of(DiagnosticKind::DegenerateRing).collect();
    assert_eq!(degenerate.len(), 1);
    assert_eq!(degenerate[0].regions, vec![nk]);
    assert_eq!(map.regions[nk].parts.len(), 1);
}

#[test]
fn the_synthetic_grid_has_shared_corners_and_the_expected_size() {
    // (The generator in tests/support/generators.rs is ours; this checks its construction.)
    let regions = super::support::generators::jittered_grid(3, 2, 4, 0.1, 7);
    assert_eq!(regions.len(), 6);
    for region in &regions {
        assert_eq!(region.parts[0].exterior.len(), 4 * 4 + 1);
    }
    // Cell 0,0 and cell 1,0 share their common edge in reverse order.
    let a = &regions[0].parts[0].exterior;
    let b = &regions[1].parts[0].exterior;
    assert_eq!(
        a[4..=8].iter().rev().collect::<Vec<_>>(),
        b[12..=16].iter().collect::<Vec<_>>()
    );
}

#[test]
fn enclaves_of_each_other_are_not_the_same_outline() {
    // Regression: world-atlas 2.0.2 countries-50m (Natural Earth 1:50m, PROVENANCE.md): Azerbaijan
    // and Armenia each hold small enclaves of the other, so each has an outer ring lying wholly
    // along the other's boundary. They were reported as "the same outline: one covers the
    // other", though they share a border of about 684 km and have different shapes.
    let map = geo::import_path(&data("world50m_caucasus.topojson"), &options(Rule::Rook)).unwrap();
    assert!(
        map.diagnostics_of(DiagnosticKind::Overlap).next().is_none(),
        "{:?}",
        map.diagnostics
    );
    let (a, b) = (
        map.region_named("Azerbaijan").unwrap(),
        map.region_named("Armenia").unwrap(),
    );
    let border = map
        .borders
        .iter()
        .find(|x| (x.a, x.b) == (a.min(b), a.max(b)))
        .expect("they border each other");
    // About 684 km along the 1:50m generalisation (the real border is longer, roughly 1,000 km
    // from memory: generalisation straightens wiggles), checked loosely.
    assert!(
        (600_000.0..800_000.0).contains(&border.length()),
        "{}",
        border.length()
    );
}

#[test]
fn regions_of_the_same_name_are_told_apart_by_a_second_field() {
    // Invented data: two counties called Shelby in different states, and one that is unique.
    let text = r#"{"type":"FeatureCollection","features":[
      {"type":"Feature","properties":{"name":"Shelby","STATE":"Tennessee"},"geometry":{"type":"Polygon","coordinates":[[[0,0],[1,0],[1,1],[0,1],[0,0]]]}},
      {"type":"Feature","properties":{"name":"Shelby","STATE":"Texas"},"geometry":{"type":"Polygon","coordinates":[[[5,0],[6,0],[6,1],[5,1],[5,0]]]}},
      {"type":"Feature","properties":{"name":"Marrow","STATE":"Texas"},"geometry":{"type":"Polygon","coordinates":[[[1,0],[2,0],[2,1],[1,1],[1,0]]]}}]}"#;
    // Without the field the note says which field would tell them apart.
    let map = import_text(text, &planar(Rule::Rook));
    let note = map
        .diagnostics_of(DiagnosticKind::DuplicateName)
        .next()
        .expect("a duplicate-name note");
    assert!(
        note.message.contains("--qualify-field STATE"),
        "{}",
        note.message
    );
    // With it, only the names that collide gain the state.
    let options = ImportOptions {
        qualify_field: Some("STATE".into()),
        ..planar(Rule::Rook)
    };
    let map = geo::import_json(text.as_bytes(), &options).unwrap();
    let names: Vec<&str> = map.regions.iter().map(|r| r.name.as_str()).collect();
    assert_eq!(names, ["Shelby (Tennessee)", "Shelby (Texas)", "Marrow"]);
    assert!(
        map.diagnostics_of(DiagnosticKind::DuplicateName)
            .next()
            .is_none()
    );
    // A field the file does not have is refused, naming the fields it has.
    let options = ImportOptions {
        qualify_field: Some("COUNTY".into()),
        ..planar(Rule::Rook)
    };
    let error = geo::import_json(text.as_bytes(), &options)
        .unwrap_err()
        .to_string();
    assert!(
        error.contains("COUNTY") && error.contains("STATE"),
        "{error}"
    );
}

#[test]
fn a_region_whose_outline_is_degenerate_stands_where_its_positions_are() {
    // Regression: us-atlas 3.0.1 counties-10m gives Falls Church, Virginia, an outline of two
    // distinct positions; it was kept as a marker at the projection centre (in the Pacific).
    // Invented data in the same shape: a proper square, one far away (so the projection's
    // centre lies between them, away from both), and a feature whose ring degenerates.
    let text = r#"{"type":"FeatureCollection","features":[
      {"type":"Feature","properties":{"name":"Square"},"geometry":{"type":"Polygon","coordinates":[[[-77.3,38.8],[-77.1,38.8],[-77.1,39.0],[-77.3,39.0],[-77.3,38.8]]]}},
      {"type":"Feature","properties":{"name":"Far away"},"geometry":{"type":"Polygon","coordinates":[[[-60.3,38.8],[-60.1,38.8],[-60.1,39.0],[-60.3,39.0],[-60.3,38.8]]]}},
      {"type":"Feature","properties":{"name":"Sliver"},"geometry":{"type":"Polygon","coordinates":[[[-77.18,38.88],[-77.17,38.89],[-77.18,38.88]]]}}]}"#;
    let map = import_text(text, &options(Rule::Rook));
    let sliver = map.region_named("Sliver").unwrap();
    assert!(map.regions[sliver].parts.is_empty());
    let at = map.regions[sliver]
        .position
        .expect("placed by its own positions");
    // Inside the square's projected box, not at the origin of the projection.
    let square = &map.regions[map.region_named("Square").unwrap()].parts[0].exterior;
    let (xs, ys): (Vec<f64>, Vec<f64>) = square.iter().map(|p| (p[0], p[1])).unzip();
    let within = |v: f64, vs: &[f64]| {
        vs.iter().copied().fold(f64::INFINITY, f64::min) < v
            && v < vs.iter().copied().fold(f64::NEG_INFINITY, f64::max)
    };
    assert!(within(at[0], &xs) && within(at[1], &ys), "{at:?}");
    let doc = map.into_document("t");
    let region = doc.regions().values().find(|r| r.name == "Sliver").unwrap();
    assert_eq!(region.anchor, at);
}

#[test]
fn deriving_borders_again_with_a_tolerance_matches_importing_with_it() {
    // The 14 US states (us-atlas; PROVENANCE.md), imported exactly, then derived again in the
    // project with a 2 km tolerance: the same contacts as importing with 2 km; borders added by
    // hand and suppressed ones keep what the user made of them; undo restores the first state.
    let source = data("us_states_subset.geojson");
    let exact = geo::import_path(&source, &options(Rule::Queen)).unwrap();
    let mut doc = exact.into_document("states");
    let first = doc.clone();
    // A border by hand between two states that do not touch, and one derived border suppressed.
    let id = |doc: &tinct::doc::Document, name: &str| {
        *doc.regions()
            .iter()
            .find(|(_, r)| r.name == name)
            .unwrap()
            .0
    };
    let by_hand = tinct::doc::RegionPair::new(id(&doc, "Alaska"), id(&doc, "Texas")).unwrap();
    let suppressed = tinct::doc::RegionPair::new(id(&doc, "Utah"), id(&doc, "Colorado")).unwrap();
    doc.apply(tinct::doc::Edit::PutBorder {
        pair: by_hand,
        border: Some(tinct::doc::Border::manual()),
    })
    .unwrap();
    let mut off = *doc.borders().get(&suppressed).unwrap();
    off.suppressed = true;
    doc.apply(tinct::doc::Edit::PutBorder {
        pair: suppressed,
        border: Some(off),
    })
    .unwrap();
    let before = doc.clone();

    let edit = geo::document::rederive_borders(&doc, 2000.0).expect("the map has outlines");
    let undo = doc.apply(edit).unwrap();
    assert_eq!(doc.settings().tolerance, 2000.0);
    let with_tolerance = geo::import_path(
        &source,
        &ImportOptions {
            rule: Rule::Queen,
            tolerance: 2000.0,
            ..ImportOptions::default()
        },
    )
    .unwrap()
    .into_document("states");
    // Pairs, kinds and shared lengths to the metre (the tolerance shortens each shared stretch).
    let derived = |d: &tinct::doc::Document| -> BTreeSet<(u64, u64, bool, i64)> {
        d.borders()
            .iter()
            .filter(|(_, b)| b.kind != tinct::doc::BorderKind::Manual)
            .map(|(p, b)| {
                let corner = b.kind == tinct::doc::BorderKind::Corner;
                (p.a().0, p.b().0, corner, b.length.round() as i64)
            })
            .collect()
    };
    assert_eq!(derived(&doc), derived(&with_tolerance));
    assert_ne!(
        derived(&doc),
        derived(&first),
        "2 km changes the measured lengths"
    );
    assert_eq!(
        doc.borders().get(&by_hand).unwrap().kind,
        tinct::doc::BorderKind::Manual
    );
    assert!(doc.borders().get(&suppressed).unwrap().suppressed);
    doc.apply(undo).unwrap();
    assert_eq!(doc, before);
    // The same tolerance again changes no border.
    let again = geo::document::rederive_borders(&first, 0.0).unwrap();
    let mut same = first.clone();
    same.apply(again).unwrap();
    assert_eq!(same.borders(), first.borders());
}

/// A GeoJSON polygon feature for a longitude/latitude box, its edges split every degree.
fn box_feature(name: &str, west: f64, east: f64, south: f64, north: f64) -> String {
    let steps = [
        (east - west).ceil() as usize,
        (north - south).ceil() as usize,
    ];
    let mut ring = tinct::projection::lon_lat_box(west, east, south, north, steps);
    ring.push(ring[0]);
    let coordinates: Vec<String> = ring
        .iter()
        .map(|p| format!("[{},{}]", p[0], p[1]))
        .collect();
    format!(
        r#"{{"type":"Feature","properties":{{"name":"{name}"}},"geometry":{{"type":"Polygon","coordinates":[[{}]]}}}}"#,
        coordinates.join(",")
    )
}

#[test]
fn a_world_map_is_imported_on_equal_earth_and_exports_its_coordinates_back() {
    // Regression: a world map was one azimuthal disc with the Americas smeared round its rim.
    // Rough continents as boxes (from memory, to a few degrees); the Bering Strait and Panama
    // keep them one mass.
    let continents = [
        ("North America", -168.0, -52.0, 15.0, 72.0),
        ("Central America", -92.0, -77.0, 7.0, 18.0),
        ("South America", -81.0, -35.0, -55.0, 12.0),
        ("Eurasia", -10.0, 179.5, 1.0, 77.0),
        ("Chukotka", -179.5, -170.0, 60.0, 70.0),
        ("Africa", -17.0, 51.0, -35.0, 37.0),
        ("Australia", 113.0, 153.0, -39.0, -11.0),
    ];
    let features: Vec<String> = continents
        .iter()
        .map(|&(name, w, e, s, n)| box_feature(name, w, e, s, n))
        .collect();
    let text = format!(
        r#"{{"type":"FeatureCollection","features":[{}]}}"#,
        features.join(",")
    );
    let map = import_text(&text, &options(Rule::Rook));
    assert_eq!(
        map.projection,
        Some(tinct::projection::Projection::EqualEarth { lon0: 0.0 })
    );
    let doc = map.into_document("World");
    assert_eq!(
        doc.settings().projection,
        Some(tinct::projection::Projection::EqualEarth { lon0: 0.0 })
    );
    // The GeoJSON export unprojects with the recorded projection: each box comes back with its
    // own extent, to the export's 7 decimals.
    let out: serde_json::Value =
        serde_json::from_str(&tinct::export::to_geojson(&doc).unwrap()).unwrap();
    for (feature, &(name, w, e, s, n)) in
        out["features"].as_array().unwrap().iter().zip(&continents)
    {
        assert_eq!(feature["properties"]["name"], name);
        let ring = feature["geometry"]["coordinates"][0].as_array().unwrap();
        let lons: Vec<f64> = ring.iter().map(|p| p[0].as_f64().unwrap()).collect();
        let lats: Vec<f64> = ring.iter().map(|p| p[1].as_f64().unwrap()).collect();
        let min = |v: &[f64]| v.iter().copied().fold(f64::INFINITY, f64::min);
        let max = |v: &[f64]| v.iter().copied().fold(f64::NEG_INFINITY, f64::max);
        for (got, expected) in [
            (min(&lons), w),
            (max(&lons), e),
            (min(&lats), s),
            (max(&lats), n),
        ] {
            assert!((got - expected).abs() < 2e-7, "{name}: {got} vs {expected}");
        }
    }
}

#[test]
fn the_us_states_are_projected_for_the_conterminous_states_not_alaska() {
    // Regression: with Alaska (whose Aleutians cross the 180-degree meridian) the centre went
    // into the Pacific and the states came out rotated. us-atlas 3.0.1 (PROVENANCE.md): the 13
    // states other than Alaska span about 124.4 W to 93.5 W, so the central meridian lies near
    // 109 W, and north stays up: Colorado's north border (41 N, a parallel) tilts by only the
    // conic's convergence, n times its 3.5 degrees from the central meridian (about 2 degrees),
    // where the old centre in the Pacific turned the map about 30 degrees.
    let map = import_text(
        &std::fs::read_to_string(data("us_states_subset.geojson")).unwrap(),
        &options(Rule::Rook),
    );
    let projection = map.projection.unwrap();
    assert!(
        matches!(
            projection,
            tinct::projection::Projection::AlbersEqualArea { .. }
        ),
        "{projection:?}"
    );
    assert!(
        (-112.0..=-106.0).contains(&projection.lon0()),
        "{projection:?}"
    );
    let a = projection.project([-109.05, 41.0]);
    let b = projection.project([-102.05, 41.0]);
    let tilt = (b[1] - a[1]).atan2(b[0] - a[0]).to_degrees();
    assert!(tilt.abs() < 5.0, "{tilt}");
}

#[test]
fn rings_cut_at_the_180_degree_meridian_stay_open_once_projected() {
    // Regression: world-atlas 110m (PROVENANCE.md) has Russia's rings cut at the 180-degree
    // meridian, with positions at both 180 and -180 on one parallel; projected, they are one
    // point, and a ring came into the document closed (a debug assertion stopped the import).
    let map = geo::import_path(&data("world_subset.topojson"), &options(Rule::Rook)).unwrap();
    for region in &map.regions {
        for polygon in &region.parts {
            for ring in std::iter::once(&polygon.exterior).chain(&polygon.holes) {
                assert!(ring.len() >= 3, "{}", region.name);
                assert_ne!(ring.first(), ring.last(), "{}", region.name);
                assert!(ring.windows(2).all(|w| w[0] != w[1]), "{}", region.name);
            }
        }
    }
    let doc = map.into_document("World subset");
    assert!(doc.regions().values().any(|r| r.name == "Russia"));
}

#[test]
fn markers_alone_are_placed_at_their_own_coordinates() {
    // Every feature's outline is degenerate (fewer than three distinct positions): the
    // projection is chosen from where their positions lie, and each marker stands at the
    // projection of its own positions' average, not at the projection's centre. Invented data.
    let text = r#"{"type":"FeatureCollection","features":[
      {"type":"Feature","properties":{"name":"West"},"geometry":{"type":"Polygon","coordinates":[[[-77.18,38.88],[-77.17,38.89],[-77.18,38.88]]]}},
      {"type":"Feature","properties":{"name":"East"},"geometry":{"type":"Polygon","coordinates":[[[-70.0,41.0],[-70.2,41.2],[-70.0,41.0]]]}}]}"#;
    let map = import_text(text, &options(Rule::Rook));
    let projection = map.projection.expect("chosen from the positions");
    for (name, average) in [
        (
            "West",
            [(-77.18 * 2.0 - 77.17) / 3.0, (38.88 * 2.0 + 38.89) / 3.0],
        ),
        (
            "East",
            [(-70.0 * 2.0 - 70.2) / 3.0, (41.0 * 2.0 + 41.2) / 3.0],
        ),
    ] {
        let region = &map.regions[map.region_named(name).unwrap()];
        assert!(region.parts.is_empty());
        let [lon, lat] = projection.unproject(region.position.unwrap());
        assert!(
            (lon - average[0]).abs() < 1e-9 && (lat - average[1]).abs() < 1e-9,
            "{name}: {lon}, {lat} vs {average:?}"
        );
    }
}

#[test]
fn screen_coordinates_that_grow_downward_are_turned_over_so_north_stays_up() {
    // 14 US states (npm us-atlas 3.0.1, tests/data/geo/PROVENANCE.md) as plain coordinates, and
    // the same file with every y negated, as maps made for web pages store them (us-atlas's own
    // `*-albers-10m.json` files count y downward from the top of a 975 x 610 picture).
    let source = super::support::root().join("tests/data/geo/us_states_subset.geojson");
    let text = std::fs::read_to_string(&source).unwrap();
    let mut json: serde_json::Value = serde_json::from_str(&text).unwrap();
    fn negate_y(v: &mut serde_json::Value) {
        match v {
            serde_json::Value::Array(items) if items.len() == 2 && items[0].is_f64() => {
                let y = items[1].as_f64().unwrap();
                items[1] = serde_json::json!(-y);
            }
            serde_json::Value::Array(items) => items.iter_mut().for_each(negate_y),
            _ => {}
        }
    }
    for feature in json["features"].as_array_mut().unwrap() {
        negate_y(&mut feature["geometry"]["coordinates"]);
    }
    let dir = tempfile::tempdir().unwrap();
    let down = dir.path().join("down.geojson");
    std::fs::write(&down, serde_json::to_string(&json).unwrap()).unwrap();
    let planar = ImportOptions {
        coordinates: CoordinateMode::Planar,
        ..ImportOptions::default()
    };
    let upright = geo::import_path(&source, &planar).unwrap();
    let turned = geo::import_path(
        &down,
        &ImportOptions {
            coordinates: CoordinateMode::PlanarDown,
            ..ImportOptions::default()
        },
    )
    .unwrap();
    // The same borders, and every region where it was: north up.
    let pairs = |m: &geo::ImportedMap| -> BTreeSet<(String, String)> {
        m.borders
            .iter()
            .map(|b| {
                let (a, c) = (&m.regions[b.a].name, &m.regions[b.b].name);
                (a.min(c).clone(), a.max(c).clone())
            })
            .collect()
    };
    assert_eq!(pairs(&upright), pairs(&turned));
    // Each region's box (the lowest and highest corner of its outlines).
    let position = |m: &geo::ImportedMap, name: &str| {
        let r = m.regions.iter().find(|r| r.name == name).unwrap();
        let points = r.parts.iter().flat_map(|p| p.exterior.iter());
        let lo = points
            .clone()
            .fold([f64::INFINITY; 2], |a, p| [a[0].min(p[0]), a[1].min(p[1])]);
        let hi = points.fold([f64::NEG_INFINITY; 2], |a, p| {
            [a[0].max(p[0]), a[1].max(p[1])]
        });
        [lo[0], lo[1], hi[0], hi[1]]
    };
    for name in ["Idaho", "Texas", "Alaska"] {
        let (a, b) = (position(&upright, name), position(&turned, name));
        assert!(
            a.iter().zip(&b).all(|(x, y)| (x - y).abs() < 1e-9),
            "{name}: {a:?} {b:?}"
        );
    }
    assert!(position(&turned, "Idaho")[1] > position(&turned, "Texas")[1]);
    // Read as they are, the same file puts Texas north of Idaho: the map upside down.
    let as_is = geo::import_path(&down, &planar).unwrap();
    assert!(position(&as_is, "Idaho")[1] < position(&as_is, "Texas")[1]);
}

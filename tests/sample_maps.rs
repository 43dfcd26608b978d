//! The sample projects in `sample-maps/` are built from their GeoJSON sources (written by
//! `sample-maps/tools/make_samples.py`, whose `tinct_borders` member lists the exact shared
//! boundaries). This test rebuilds each project and compares it with the committed `.tinct` file;
//! run with `TINCT_WRITE_SAMPLES=1` to rewrite them after regenerating the GeoJSON.

use std::collections::BTreeMap;
use std::sync::Arc;

use serde_json::Value;
use tinct::doc::{
    self, Border, Document, Edit, Geometry, GroupId, Polygon, Region, RegionId, RegionPair, Role,
    Units,
};

use super::support::root;

/// The scenarios: (GeoJSON source, project file).
pub const SAMPLES: [&str; 3] = ["vessland-province", "three-valleys", "exclave-coast"];

fn ring(value: &Value) -> Vec<[f64; 2]> {
    let mut points: Vec<[f64; 2]> = value
        .as_array()
        .expect("a ring is an array")
        .iter()
        .map(|p| [p[0].as_f64().expect("x"), p[1].as_f64().expect("y")])
        .collect();
    // GeoJSON repeats the first point at the end; the document does not.
    if points.len() > 1 && points.first() == points.last() {
        points.pop();
    }
    points
}

fn polygon(rings: &Value) -> Polygon {
    let mut it = rings.as_array().expect("rings").iter().map(ring);
    Polygon {
        exterior: it.next().unwrap_or_default(),
        holes: it.collect(),
    }
}

/// Builds a project from one of the sample GeoJSON files, through edits as a user would.
pub fn build(name: &str) -> Document {
    let text = std::fs::read_to_string(root().join("sample-maps").join(format!("{name}.geojson")))
        .unwrap();
    let json: Value = serde_json::from_str(&text).unwrap();
    let mut doc = Document::new(json["name"].as_str().unwrap_or(name));
    let mut settings = *doc.settings();
    settings.units = Units::Metres;
    doc.apply(Edit::SetSettings(settings)).unwrap();
    let mut groups: BTreeMap<String, GroupId> = BTreeMap::new();
    for (index, feature) in json["features"].as_array().unwrap().iter().enumerate() {
        let id = RegionId(feature["id"].as_u64().unwrap());
        let props = &feature["properties"];
        let geometry = &feature["geometry"];
        let polygons = match geometry["type"].as_str().unwrap() {
            "Polygon" => vec![polygon(&geometry["coordinates"])],
            "MultiPolygon" => geometry["coordinates"]
                .as_array()
                .unwrap()
                .iter()
                .map(polygon)
                .collect(),
            other => panic!("unexpected geometry {other}"),
        };
        let geometry = Geometry { polygons };
        let mut region = Region::new(
            props["name"].as_str().unwrap(),
            geometry.label_point().unwrap(),
        );
        region.geometry = Some(Arc::new(geometry));
        region.role = if props["role"] == "water" {
            Role::Water
        } else {
            Role::Land
        };
        region.source_index = Some(index as u64);
        region.pin = props["pin"].as_u64().map(|p| p as u32);
        if let Some(g) = props["group"].as_str() {
            let gid = match groups.get(g) {
                Some(gid) => *gid,
                None => {
                    let (gid, edit) = doc.add_group_edit(g);
                    doc.apply(edit).unwrap();
                    groups.insert(g.to_string(), gid);
                    gid
                }
            };
            region.group = Some(gid);
        }
        doc.apply(Edit::PutRegion {
            id,
            region: Some(region),
        })
        .unwrap();
    }
    for b in json["tinct_borders"].as_array().unwrap() {
        let pair = RegionPair::new(
            RegionId(b["a"].as_u64().unwrap()),
            RegionId(b["b"].as_u64().unwrap()),
        )
        .unwrap();
        let border = match b["kind"].as_str().unwrap() {
            "shared" => Border::shared(b["length"].as_f64().unwrap()),
            "corner" => Border::corner(),
            other => panic!("unexpected border kind {other}"),
        };
        doc.apply(Edit::PutBorder {
            pair,
            border: Some(border),
        })
        .unwrap();
    }
    doc
}

#[test]
fn sample_projects_match_their_geojson_sources() {
    for name in SAMPLES {
        let built = build(name);
        let path = root().join("sample-maps").join(format!("{name}.tinct"));
        if std::env::var_os("TINCT_WRITE_SAMPLES").is_some() {
            doc::file::save(&built, &path).unwrap();
        }
        let committed =
            doc::file::load(&path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
        assert_eq!(
            committed, built,
            "{name}.tinct is out of date: run with TINCT_WRITE_SAMPLES=1"
        );
    }
}

#[test]
fn every_label_point_lies_inside_its_region() {
    // A point-in-polygon test by ray casting (even-odd rule), written here independently of the
    // label-point code.
    fn inside(p: [f64; 2], g: &Geometry) -> bool {
        let mut crossings = 0;
        for poly in &g.polygons {
            for ring in std::iter::once(&poly.exterior).chain(poly.holes.iter()) {
                for i in 0..ring.len() {
                    let (a, b) = (ring[i], ring[(i + 1) % ring.len()]);
                    if (a[1] > p[1]) != (b[1] > p[1])
                        && p[0] < a[0] + (p[1] - a[1]) / (b[1] - a[1]) * (b[0] - a[0])
                    {
                        crossings += 1;
                    }
                }
            }
        }
        crossings % 2 == 1
    }
    for name in SAMPLES {
        let doc = build(name);
        for (id, r) in doc.regions() {
            let g = r.geometry.as_ref().unwrap();
            assert!(
                inside(r.anchor, g),
                "{name}: label of {} ({id}) is outside it",
                r.name
            );
        }
    }
}

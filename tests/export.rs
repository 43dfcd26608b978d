//! Export against outside references: the SVG parses as XML 1.0 (roxmltree), the PNG rendered from
//! it shows each region's fill at the region's label point, the GeoJSON re-imports through the
//! importer with the same regions, colours, borders and (to 1e-6 degrees) the coordinates of an
//! open dataset (US Census state boundaries via npm us-atlas, see tests/data/geo/PROVENANCE.md),
//! the CSV parses back under RFC 4180. Also the palette glue on documents and the CLI.

use serde_json::Value;
use tinct::colour::Thresholds;
use tinct::doc::palette_check::{palette_report, slot_assignment_edit, slot_border_counts};
use tinct::doc::{Border, Document, Edit, Region, RegionChange, RegionId, RegionPair, Rgb};
use tinct::export::{self, ExportError, MapFrame, PngSize, SvgOptions};
use tinct::geo::{self, ImportOptions};

use super::support::{greedy_colour, root, stderr, stdout, tinct_path};

fn sample(name: &str) -> Document {
    let path = root().join("sample-maps").join(format!("{name}.tinct"));
    tinct::doc::file::load(&path).expect("sample project loads")
}

#[test]
fn svg_is_well_formed_xml_with_every_region_and_escaped_names() {
    let mut doc = sample("vessland-province");
    greedy_colour(&mut doc);
    // A name with every character XML reserves.
    let first = *doc.regions().keys().next().unwrap();
    doc.apply(Edit::UpdateRegion {
        id: first,
        change: RegionChange::Name("Fenn & <Marsh> \"Old\" 'Mill'".into()),
    })
    .unwrap();
    let options = SvgOptions {
        labels: true,
        legend: true,
        ..SvgOptions::default()
    };
    let svg = export::to_svg(&doc, &options).expect("svg");
    // Source: XML 1.0 well-formedness, as checked by roxmltree (a general-purpose XML parser).
    let tree = roxmltree::Document::parse(&svg).expect("well-formed XML");
    let root_el = tree.root_element();
    assert_eq!(root_el.tag_name().name(), "svg");
    assert_eq!(root_el.attribute("width"), Some("180mm"));
    assert!(root_el.attribute("height").unwrap().ends_with("mm"));
    let paths: Vec<_> = tree
        .descendants()
        .filter(|n| n.has_tag_name("path"))
        .collect();
    let with_geometry = doc
        .regions()
        .values()
        .filter(|r| r.geometry.is_some())
        .count();
    assert_eq!(paths.len(), with_geometry);
    for p in &paths {
        assert_eq!(p.attribute("fill-rule"), Some("evenodd"));
    }
    let title = tree
        .descendants()
        .find(|n| n.attribute("id") == Some(&*format!("region-{first}")))
        .and_then(|n| n.children().find(|c| c.has_tag_name("title")))
        .and_then(|t| t.text());
    assert_eq!(title, Some("Fenn & <Marsh> \"Old\" 'Mill'"));
    // The legend (asked for: it is off by default) lists every slot in use.
    let used: std::collections::BTreeSet<u32> = doc.colouring().values().copied().collect();
    let legend = tree
        .descendants()
        .find(|n| n.attribute("id") == Some("legend"))
        .expect("a legend");
    assert_eq!(
        legend.children().filter(|c| c.has_tag_name("rect")).count(),
        used.len()
    );
}

#[test]
fn png_shows_each_region_in_its_fill_at_its_label_point() {
    let mut doc = sample("vessland-province");
    greedy_colour(&mut doc);
    let options = SvgOptions::default();
    let width_px = 1400u32;
    let png = export::to_png(&doc, &options, PngSize::WidthPx(width_px)).expect("png");
    // Decoded by tiny-skia's PNG reader (the png crate), independent of our encoder call.
    let pixmap = resvg::tiny_skia::Pixmap::decode_png(&png).expect("a valid PNG");
    assert_eq!(pixmap.width(), width_px);
    let frame = MapFrame::new(&doc, &options, None).unwrap();
    let px_per_mm = f64::from(width_px) / options.width_mm;
    let mut checked = 0;
    for (id, region) in doc.land_regions() {
        let Some(point) = region.geometry.as_ref().and_then(|g| g.label_point()) else {
            continue;
        };
        let [x_mm, y_mm] = frame.to_page_mm(point);
        let (x, y) = ((x_mm * px_per_mm) as u32, (y_mm * px_per_mm) as u32);
        let pixel = pixmap.pixel(x, y).expect("inside the picture");
        // The colour the palette gives this region's slot, worked out here, not taken from the
        // exporter (whose own choice would make a wrong slot mapping pass).
        let slot = doc.colouring()[&id] as usize;
        let want = doc.palette().slots[slot].colour.0;
        let got = [pixel.red(), pixel.green(), pixel.blue()];
        for c in 0..3 {
            assert!(
                got[c].abs_diff(want[c]) <= 2,
                "{} at ({x}, {y}): {got:?}, want {want:?}",
                region.name
            );
        }
        checked += 1;
    }
    assert_eq!(checked, doc.land_regions().count());
    // By DPI: 180 mm at 254 dpi is 1800 pixels (25.4 mm to the inch).
    let png = export::to_png(&doc, &options, PngSize::Dpi(254.0)).unwrap();
    assert_eq!(
        resvg::tiny_skia::Pixmap::decode_png(&png).unwrap().width(),
        1800
    );
}

#[test]
fn sketch_markers_are_circles_and_empty_maps_are_refused() {
    let mut doc = Document::new("Sketch");
    for (i, name) in ["North", "South"].iter().enumerate() {
        doc.apply(Edit::PutRegion {
            id: RegionId(i as u64 + 1),
            region: Some(Region::new(*name, [0.0, 10.0 * i as f64])),
        })
        .unwrap();
    }
    doc.apply(Edit::PutBorder {
        pair: RegionPair::new(RegionId(1), RegionId(2)).unwrap(),
        border: Some(Border::manual()),
    })
    .unwrap();
    greedy_colour(&mut doc);
    let svg = export::to_svg(&doc, &SvgOptions::default()).unwrap();
    let tree = roxmltree::Document::parse(&svg).unwrap();
    let circles: Vec<_> = tree
        .descendants()
        .filter(|n| n.has_tag_name("circle"))
        .collect();
    assert_eq!(circles.len(), 2);
    // North (y = 10) is drawn above South: the y axis is flipped for SVG.
    let cy = |i: usize| circles[i].attribute("cy").unwrap().parse::<f64>().unwrap();
    assert!(cy(1) < cy(0));
    assert_eq!(
        export::to_svg(&Document::new("empty"), &SvgOptions::default()),
        Err(ExportError::EmptyMap)
    );
    // A sketch has no place on the globe: GeoJSON says so rather than writing wrong degrees.
    assert!(matches!(
        export::to_geojson(&doc),
        Err(ExportError::NotGeographic(_))
    ));
}

fn features(text: &str) -> Vec<Value> {
    let v: Value = serde_json::from_str(text).expect("JSON");
    v["features"].as_array().expect("features").clone()
}

fn positions(geometry: &Value) -> Vec<[f64; 2]> {
    fn walk(v: &Value, out: &mut Vec<[f64; 2]>) {
        match v.as_array() {
            Some(a) if a.len() == 2 && a[0].is_number() => {
                out.push([a[0].as_f64().unwrap(), a[1].as_f64().unwrap()])
            }
            Some(a) => a.iter().for_each(|x| walk(x, out)),
            None => {}
        }
    }
    let mut out = Vec::new();
    walk(&geometry["coordinates"], &mut out);
    out
}

#[test]
fn geojson_reimports_with_the_same_regions_colours_borders_and_coordinates() {
    // Source data: 14 US states (US Census Bureau via npm us-atlas 3.0.1), longitude/latitude,
    // including Alaska across the 180-degree meridian.
    let source_path = root().join("tests/data/geo/us_states_subset.geojson");
    let source_text = std::fs::read_to_string(&source_path).unwrap();
    let imported = geo::import_json(source_text.as_bytes(), &ImportOptions::default()).unwrap();
    let mut doc = imported.into_document("States");
    assert!(
        doc.settings().projection.is_some(),
        "import records the projection"
    );
    greedy_colour(&mut doc);

    let text = export::to_geojson(&doc).expect("geographic map exports");
    let out = features(&text);
    assert_eq!(out.len(), doc.regions().len());
    for (f, (id, region)) in out.iter().zip(doc.regions()) {
        assert_eq!(f["type"], "Feature");
        assert_eq!(f["id"], id.0);
        assert_eq!(f["properties"]["name"], region.name.as_str());
        let slot = doc.colouring()[id];
        assert_eq!(f["properties"]["tinct_colour"], slot);
        assert_eq!(
            f["properties"]["tinct_fill"],
            doc.palette().slots[slot as usize].colour.to_hex()
        );
        // RFC 7946 section 3.1.1: longitude within -180..180 and latitude within -90..90.
        for [lon, lat] in positions(&f["geometry"]) {
            assert!((-180.0..=180.0).contains(&lon) && (-90.0..=90.0).contains(&lat));
        }
    }

    // Coordinates: every exported position lies within 1e-6 degrees of a position of the same
    // state in the source file, or on the 180-degree meridian where a crossing part was cut.
    let source = features(&source_text);
    for f in &out {
        let name = f["properties"]["name"].as_str().unwrap();
        let original = source
            .iter()
            .find(|s| s["properties"]["name"] == name)
            .expect("the state is in the source");
        let theirs = positions(&original["geometry"]);
        for [lon, lat] in positions(&f["geometry"]) {
            let near = theirs.iter().any(|[x, y]| {
                let dx = (lon - x)
                    .abs()
                    .min((lon - x).abs() - 360.0)
                    .abs()
                    .min((lon - x).abs());
                dx < 1e-6 && (lat - y).abs() < 1e-6
            });
            assert!(
                near || (lon.abs() - 180.0).abs() < 1e-9,
                "{name}: ({lon}, {lat})"
            );
        }
    }

    // Re-import: the same regions in the same order, the same borders, the colours as properties.
    let again = geo::import_json(text.as_bytes(), &ImportOptions::default()).unwrap();
    let doc2 = again.into_document("States again");
    let names = |d: &Document| {
        d.regions()
            .values()
            .map(|r| r.name.clone())
            .collect::<Vec<_>>()
    };
    assert_eq!(names(&doc2), names(&doc));
    let pairs = |d: &Document| d.borders().keys().copied().collect::<Vec<_>>();
    assert_eq!(pairs(&doc2), pairs(&doc));
    for (id, region) in doc2.regions() {
        let slot = region.attributes.get("tinct_colour");
        assert_eq!(
            slot,
            Some(&tinct::doc::AttrValue::Number(f64::from(
                doc.colouring()[id]
            ))),
            "{}",
            region.name
        );
        let a = doc.regions()[id].geometry.as_ref().unwrap().area();
        let b = region.geometry.as_ref().unwrap().area();
        assert!((a - b).abs() / a < 1e-6, "{}: area {a} vs {b}", region.name);
    }
}

/// An RFC 4180 reader, written for the test: quoted fields, doubled quotes, CRLF records.
fn parse_csv(text: &str) -> Vec<Vec<String>> {
    let mut rows = Vec::new();
    let mut row = Vec::new();
    let mut field = String::new();
    let mut chars = text.chars().peekable();
    let mut quoted = false;
    while let Some(c) = chars.next() {
        if quoted {
            match c {
                '"' if chars.peek() == Some(&'"') => {
                    chars.next();
                    field.push('"');
                }
                '"' => quoted = false,
                c => field.push(c),
            }
        } else {
            match c {
                '"' => quoted = true,
                ',' => row.push(std::mem::take(&mut field)),
                '\r' if chars.peek() == Some(&'\n') => {
                    chars.next();
                    row.push(std::mem::take(&mut field));
                    rows.push(std::mem::take(&mut row));
                }
                c => field.push(c),
            }
        }
    }
    assert!(
        field.is_empty() && row.is_empty(),
        "every record ends with CRLF"
    );
    rows
}

#[test]
fn csv_round_trips_under_rfc_4180() {
    let mut doc = sample("exclave-coast");
    greedy_colour(&mut doc);
    let awkward = "Cape \"North\", upper\nand lower";
    let first = *doc.regions().keys().next().unwrap();
    doc.apply(Edit::UpdateRegion {
        id: first,
        change: RegionChange::Name(awkward.into()),
    })
    .unwrap();
    let rows = parse_csv(&export::to_csv(&doc));
    assert_eq!(
        rows[0],
        ["id", "name", "colour", "fill", "group", "pinned", "role"]
    );
    assert_eq!(rows.len(), doc.regions().len() + 1);
    for (row, (id, region)) in rows[1..].iter().zip(doc.regions()) {
        assert_eq!(row[0], id.to_string());
        assert_eq!(row[1], region.name);
        let slot = doc.colouring().get(id);
        assert_eq!(row[2], slot.map(|s| s.to_string()).unwrap_or_default());
        let fill = slot.map(|&s| doc.palette().slots[s as usize].colour.to_hex());
        assert_eq!(row[3], fill.unwrap_or_default());
        let group = region.group.map(|g| doc.groups()[&g].name.clone());
        assert_eq!(row[4], group.unwrap_or_default());
        assert_eq!(row[5], region.pin.is_some().to_string());
        assert_eq!(row[6], region.role.as_str());
    }
    assert_eq!(rows[1][1], awkward);
}

#[test]
fn palette_report_and_slot_assignment_on_a_document() {
    // Three regions in a row, A - B - C, and a palette where slots 0 and 1 look alike (two greens
    // about 3 ΔE00 apart) and slot 2 is far from both. A and B border; B and C border.
    let mut doc = Document::new("row");
    for (i, name) in ["A", "B", "C"].iter().enumerate() {
        doc.apply(Edit::PutRegion {
            id: RegionId(i as u64 + 1),
            region: Some(Region::new(*name, [i as f64, 0.0])),
        })
        .unwrap();
    }
    for (a, b) in [(1, 2), (2, 3)] {
        doc.apply(Edit::PutBorder {
            pair: RegionPair::new(RegionId(a), RegionId(b)).unwrap(),
            border: Some(Border::manual()),
        })
        .unwrap();
    }
    let mut palette = doc.palette().clone();
    palette.slots.truncate(3);
    palette.slots[0].colour = Rgb([0x70, 0xa0, 0x60]);
    palette.slots[1].colour = Rgb([0x78, 0xa8, 0x64]);
    palette.slots[2].colour = Rgb([0xf0, 0xe0, 0xf8]);
    doc.apply(Edit::SetPalette(palette)).unwrap();
    // A=0, B=1, C=0: the look-alike pair {0, 1} meets on both borders.
    doc.apply(Edit::SetColouring(
        [(RegionId(1), 0), (RegionId(2), 1), (RegionId(3), 0)].into(),
    ))
    .unwrap();
    assert_eq!(slot_border_counts(&doc), [((0, 1), 2)].into());
    let t = Thresholds::default();
    let report = palette_report(&doc, &t);
    assert!(
        report
            .warnings
            .iter()
            .any(|w| w.slots == (0, 1) && w.message.contains("readers with normal colour vision")),
        "{:?}",
        report.warnings
    );
    // By hand: the only bordering class pair is {class 0, class 1}, so it should take the most
    // distinct pair of slots. Slot 2 (very light) is farther from the darker slot 0 than from slot
    // 1 (a larger lightness step), so that pair is {0, 2}. Of the two ways to use it, the heavy
    // green of slot 0 may not go to class 0, which has the most regions (A and C; the rule on the
    // heaviest fill comes first), so class 0 moves to slot 2 and B's class to slot 0.
    let edit = slot_assignment_edit(&doc, &t)
        .unwrap()
        .expect("a better assignment");
    let before = doc.clone();
    let undo = doc.apply(edit).unwrap();
    assert_eq!(doc.colouring()[&RegionId(1)], 2);
    assert_eq!(doc.colouring()[&RegionId(2)], 0);
    assert_eq!(doc.colouring()[&RegionId(3)], 2);
    assert!(
        palette_report(&doc, &t)
            .warnings
            .iter()
            .all(|w| w.slots != (0, 1))
    );
    assert_eq!(
        slot_assignment_edit(&doc, &t).unwrap(),
        None,
        "already the best"
    );
    doc.apply(undo).unwrap();
    assert_eq!(doc, before);
    // Pinned: with B pinned to slot 1, its class stays; class 0 (A, C) moves to slot 2 instead.
    doc.apply(Edit::UpdateRegion {
        id: RegionId(2),
        change: RegionChange::Pin(Some(1)),
    })
    .unwrap();
    doc.apply(slot_assignment_edit(&doc, &t).unwrap().unwrap())
        .unwrap();
    assert_eq!(doc.colouring()[&RegionId(2)], 1);
    assert_eq!(doc.colouring()[&RegionId(1)], 2);
    assert_eq!(doc.colouring()[&RegionId(3)], 2);
}

#[test]
fn cli_exports_and_reports_with_the_usual_exit_codes() {
    let dir = tempfile::tempdir().unwrap();
    let project = root().join("sample-maps/three-valleys.tinct");
    let svg = dir.path().join("map.svg");
    let csv = dir.path().join("map.csv");
    let o = tinct_path(
        &["export"],
        &project,
        &[
            "--svg",
            svg.to_str().unwrap(),
            "--csv",
            csv.to_str().unwrap(),
            "--labels",
        ],
    );
    assert!(o.status.success(), "{}", stderr(&o));
    assert!(roxmltree::Document::parse(&std::fs::read_to_string(&svg).unwrap()).is_ok());
    assert!(
        std::fs::read_to_string(&csv)
            .unwrap()
            .starts_with("id,name,")
    );
    // No output named: bad input (2).
    assert_eq!(
        tinct_path(&["export"], &project, &[]).status.code(),
        Some(2)
    );
    // A planar sample map cannot become GeoJSON: bad input (2), with the reason.
    let o = tinct_path(
        &["export"],
        &project,
        &["--geojson", dir.path().join("m.geojson").to_str().unwrap()],
    );
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("longitude/latitude"), "{}", stderr(&o));
    // A folder that does not exist: cannot write (3).
    let o = tinct_path(
        &["export"],
        &project,
        &[
            "--csv",
            dir.path().join("no/such/dir/m.csv").to_str().unwrap(),
        ],
    );
    assert_eq!(o.status.code(), Some(3));
    // The palette report as JSON.
    let o = tinct_path(&["palette"], &project, &["--json"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let v: Value = serde_json::from_str(&stdout(&o)).unwrap();
    assert!(v["warnings"].is_array() && v["slots"].is_array());
    assert_eq!(v["thresholds"]["delta_e00"], 10.0);
}

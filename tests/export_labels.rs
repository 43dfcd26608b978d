//! Exported maps fit to publish, checked on the exported SVG itself: the labels as a renderer
//! lays them out (resvg's usvg with the embedded Ubuntu Light, the font of the PNG export) never
//! overlap; each lies inside its region or is joined to it by a leader line; each meets the WCAG
//! 2.1 contrast ratio of 4.5:1 against its fill and its halo; the line hierarchy matches the
//! borders the importer derived independently; and the print layout (title, source, scale bar,
//! legend) follows the options. Real data: 14 US states (US Census Bureau via npm us-atlas 3.0.1)
//! and Columbus, Ohio neighbourhoods (GeoDa sample data), see tests/data/geo/PROVENANCE.md; and
//! the invented sample maps.

use std::collections::BTreeMap;

use resvg::usvg;
use tinct::doc::{Document, Role};
use tinct::export::svg::{SvgOptions, render};
use tinct::geo::{self, ImportOptions};

use super::support::{greedy_colour, root, stderr, tinct_path};

/// WCAG 2.1 relative luminance and contrast ratio, written out again from the standard's
/// glossary for the test (independent of the exporter's own copy).
fn luminance(hex: &str) -> f64 {
    let h = hex.trim_start_matches('#');
    let channel = |i: usize| {
        let c = f64::from(u8::from_str_radix(&h[i..i + 2], 16).unwrap()) / 255.0;
        if c <= 0.03928 {
            c / 12.92
        } else {
            ((c + 0.055) / 1.055).powf(2.4)
        }
    };
    0.2126 * channel(0) + 0.7152 * channel(2) + 0.0722 * channel(4)
}

fn contrast(a: &str, b: &str) -> f64 {
    let (x, y) = (luminance(a), luminance(b));
    (x.max(y) + 0.05) / (x.min(y) + 0.05)
}

#[test]
fn the_tests_own_wcag_formula_gives_the_standards_known_values() {
    // WCAG 2.1: black on white 21:1, a colour on itself 1:1; #777777 on white about 4.48:1 (a
    // commonly quoted example, from memory).
    assert!((contrast("#000000", "#ffffff") - 21.0).abs() < 1e-9);
    assert!((contrast("#ffffff", "#ffffff") - 1.0).abs() < 1e-12);
    assert!((contrast("#777777", "#ffffff") - 4.48).abs() < 0.01);
}

type Ring = Vec<[f64; 2]>;

/// Parses the `M x y L x y ... Z` paths the exporter writes.
fn parse_path(d: &str) -> Vec<Ring> {
    let mut rings = Vec::new();
    let mut ring: Ring = Vec::new();
    let tokens: Vec<&str> = d.split_whitespace().collect();
    let mut i = 0;
    while i < tokens.len() {
        let t = tokens[i];
        if t == "Z" {
            rings.push(std::mem::take(&mut ring));
            i += 1;
            continue;
        }
        let x: f64 = t.trim_start_matches(['M', 'L']).parse().unwrap();
        let y: f64 = tokens[i + 1].parse().unwrap();
        ring.push([x, y]);
        i += 2;
    }
    rings
}

fn inside(rings: &[Ring], p: [f64; 2]) -> bool {
    let mut c = false;
    for ring in rings {
        let n = ring.len();
        for k in 0..n {
            let (a, b) = (ring[k], ring[(k + 1) % n]);
            if (a[1] > p[1]) != (b[1] > p[1])
                && p[0] < a[0] + (p[1] - a[1]) / (b[1] - a[1]) * (b[0] - a[0])
            {
                c = !c;
            }
        }
    }
    c
}

/// True when two convex quadrilaterals overlap with area: the separating axis theorem, each
/// edge normal of either as a candidate axis (common practice in collision tests).
fn quads_overlap(a: &Quad, b: &Quad) -> bool {
    let sides = |q: &Quad| (0..4).map(|k| (q[k], q[(k + 1) % 4])).collect::<Vec<_>>();
    sides(a).into_iter().chain(sides(b)).all(|(p, q)| {
        let n = [q[1] - p[1], p[0] - q[0]];
        let span = |r: &Quad| {
            let d: Vec<f64> = r.iter().map(|v| v[0] * n[0] + v[1] * n[1]).collect();
            (
                d.iter().cloned().fold(f64::INFINITY, f64::min),
                d.iter().cloned().fold(f64::NEG_INFINITY, f64::max),
            )
        };
        let ((a0, a1), (b0, b1)) = (span(a), span(b));
        a1 > b0 && b1 > a0
    })
}

/// True when `p` lies strictly inside the convex quad (corners in order either way round).
fn in_quad(q: &Quad, p: [f64; 2]) -> bool {
    let signs: Vec<f64> = (0..4)
        .map(|k| {
            let (a, b) = (q[k], q[(k + 1) % 4]);
            (b[0] - a[0]) * (p[1] - a[1]) - (b[1] - a[1]) * (p[0] - a[0])
        })
        .collect();
    signs.iter().all(|s| *s > 0.0) || signs.iter().all(|s| *s < 0.0)
}

/// True when segment `a b` crosses the interior of the quad.
fn segment_hits_quad(a: [f64; 2], b: [f64; 2], q: &Quad) -> bool {
    (0..=64).any(|k| {
        let t = f64::from(k) / 64.0;
        in_quad(q, [a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1])])
    })
}

type Quad = [[f64; 2]; 4];

/// The corners of `b` turned by the label's `rotate(a x y)` transform, if it has one.
fn turned_corners(b: [[f64; 2]; 2], transform: Option<&str>) -> (Quad, f64) {
    let corners = [b[0], [b[1][0], b[0][1]], b[1], [b[0][0], b[1][1]]];
    let Some(args) = transform
        .and_then(|t| t.split("rotate(").nth(1))
        .and_then(|t| t.split(')').next())
    else {
        return (corners, 0.0);
    };
    let v: Vec<f64> = args
        .split([' ', ','])
        .filter(|t| !t.is_empty())
        .map(|t| t.parse().unwrap())
        .collect();
    let (angle, c) = (v[0], [v[1], v[2]]);
    let (sin, cos) = angle.to_radians().sin_cos();
    let quad = corners.map(|p| {
        let (x, y) = (p[0] - c[0], p[1] - c[1]);
        [c[0] + x * cos - y * sin, c[1] + x * sin + y * cos]
    });
    (quad, angle)
}

struct Label {
    id: String,
    text: String,
    ink: String,
    halo: String,
    italic: bool,
    /// The text's layout box as usvg computes it with the PNG's font, in SVG units, before the
    /// label's turn.
    bbox: [[f64; 2]; 2],
    /// That box turned as the label is (its corners), and the turn in degrees.
    quad: Quad,
    angle: f64,
}

struct Checked {
    svg: String,
    labels: Vec<Label>,
    report: tinct::export::LabelReport,
    units_per_mm: f64,
}

/// SVG user units per millimetre of the printed page: the viewBox's width over the width in mm.
fn units_per_mm(xml: &roxmltree::Document) -> f64 {
    let root_el = xml.root_element();
    let width_mm: f64 = root_el
        .attribute("width")
        .unwrap()
        .trim_end_matches("mm")
        .parse()
        .unwrap();
    let view_w: f64 = root_el
        .attribute("viewBox")
        .unwrap()
        .split_whitespace()
        .nth(2)
        .unwrap()
        .parse()
        .unwrap();
    view_w / width_mm
}

/// Exports `doc` with labels and checks every label rule; returns what it found.
fn check_labels(doc: &Document, options: &SvgOptions) -> Checked {
    let made = render(doc, options).expect("exports");
    let svg = made.svg.clone();
    let xml = roxmltree::Document::parse(&svg).expect("well-formed XML");
    let units_per_mm = units_per_mm(&xml);
    let water_ground = xml
        .descendants()
        .find(|n| n.attribute("id") == Some("water"))
        .and_then(|p| p.children().find(|c| c.has_tag_name("rect")))
        .and_then(|r| r.attribute("fill"))
        .unwrap()
        .to_string();
    // Regions: id -> (fill, rings).
    let mut regions: BTreeMap<String, (String, Vec<Ring>)> = BTreeMap::new();
    for n in xml.descendants().filter(|n| n.has_tag_name("path")) {
        let id = n
            .attribute("id")
            .unwrap()
            .trim_start_matches("region-")
            .to_string();
        // Each region is one element with a title naming it.
        let title = n.children().find(|c| c.has_tag_name("title")).unwrap();
        assert!(title.text().is_some());
        regions.insert(
            id,
            (
                n.attribute("fill").unwrap().to_string(),
                parse_path(n.attribute("d").unwrap()),
            ),
        );
    }
    let leaders: BTreeMap<String, [[f64; 2]; 2]> = xml
        .descendants()
        .filter(|n| {
            n.has_tag_name("line") && n.attribute("id").is_some_and(|i| i.starts_with("leader-"))
        })
        .map(|n| {
            let f = |a: &str| n.attribute(a).unwrap().parse::<f64>().unwrap();
            (
                n.attribute("id")
                    .unwrap()
                    .trim_start_matches("leader-")
                    .to_string(),
                [[f("x1"), f("y1")], [f("x2"), f("y2")]],
            )
        })
        .collect();

    // The renderer's view of every label, with the PNG export's font.
    let opt = usvg::Options {
        fontdb: std::sync::Arc::new(tinct::export::png::font_database()),
        ..Default::default()
    };
    let tree = usvg::Tree::from_str(&svg, &opt).expect("usvg parses the SVG");
    let mut labels = Vec::new();
    for n in xml.descendants().filter(|n| n.has_tag_name("text")) {
        let Some(id) = n.attribute("id").filter(|i| i.starts_with("label-")) else {
            continue;
        };
        let node = tree.node_by_id(id).expect("usvg keeps the label's id");
        let usvg::Node::Text(text) = node else {
            panic!("{id} is not text in usvg");
        };
        let b = text.bounding_box();
        let parent = n.parent().unwrap();
        let attr = |a: &str| n.attribute(a).or_else(|| parent.attribute(a));
        let bbox = [
            [f64::from(b.left()), f64::from(b.top())],
            [f64::from(b.right()), f64::from(b.bottom())],
        ];
        let (quad, angle) = turned_corners(bbox, n.attribute("transform"));
        if angle != 0.0 {
            // usvg reports a text's box in its own frame, before the turn: a name is wider
            // than tall there.
            assert!(bbox[1][0] - bbox[0][0] > bbox[1][1] - bbox[0][1], "{id}");
        }
        labels.push(Label {
            id: id.trim_start_matches("label-").to_string(),
            text: n
                .descendants()
                .filter(|d| d.is_text())
                .filter_map(|d| d.text())
                .collect::<Vec<_>>()
                .join(" "),
            ink: attr("fill").unwrap().to_string(),
            halo: attr("stroke").unwrap().to_string(),
            italic: attr("font-style") == Some("italic"),
            bbox,
            quad,
            angle,
        });
        assert_eq!(
            attr("paint-order"),
            Some("stroke"),
            "the halo is under the text"
        );
    }

    // 1. No two label boxes overlap (turned as they are drawn).
    for (i, a) in labels.iter().enumerate() {
        for b in &labels[i + 1..] {
            assert!(
                !quads_overlap(&a.quad, &b.quad),
                "labels {:?} and {:?} overlap",
                a.text,
                b.text
            );
        }
    }
    for l in &labels {
        let region = doc
            .regions()
            .iter()
            .find(|(id, _)| id.to_string() == l.id)
            .map(|(_, r)| r)
            .unwrap();
        // 3. Contrast (WCAG 2.1, 4.5:1): against the halo always; inside a region, against its
        // fill (the water pattern's ground for water).
        assert!(
            contrast(&l.ink, &l.halo) >= 4.5,
            "{}: {} on halo {}",
            l.text,
            l.ink,
            l.halo
        );
        if region.role == Role::Water {
            assert!(l.italic, "{}: water names are italic", l.text);
        }
        let Some((fill, rings)) = regions.get(&l.id) else {
            continue; // a region without an outline: its name stands above its marker
        };
        let [lo, hi] = l.bbox;
        let q = l.quad;
        let corners = [
            q[0],
            q[1],
            q[2],
            q[3],
            [(q[0][0] + q[2][0]) / 2.0, (q[0][1] + q[2][1]) / 2.0],
        ];
        match leaders.get(&l.id) {
            None => {
                // 2. Inside its region: corners and centre inside, no outline edge through it.
                for c in corners {
                    assert!(
                        inside(rings, c),
                        "{}: corner {c:?} outside its region",
                        l.text
                    );
                }
                for ring in rings {
                    for k in 0..ring.len() {
                        assert!(
                            !segment_hits_quad(ring[k], ring[(k + 1) % ring.len()], &l.quad),
                            "{}: its region's outline runs through it",
                            l.text
                        );
                    }
                }
                let ground = if fill.starts_with('#') {
                    fill.as_str()
                } else {
                    water_ground.as_str()
                };
                assert!(
                    contrast(&l.ink, ground) >= 4.5,
                    "{}: {} on {}",
                    l.text,
                    l.ink,
                    ground
                );
            }
            Some([start, end]) => {
                // 2'. Or joined by a leader line from inside the region to the label (set level).
                assert_eq!(
                    l.angle, 0.0,
                    "{}: a name with a leader line is level",
                    l.text
                );
                assert!(
                    inside(rings, *start),
                    "{}: the leader starts outside",
                    l.text
                );
                let dx = (lo[0] - end[0]).max(end[0] - hi[0]).max(0.0);
                let dy = (lo[1] - end[1]).max(end[1] - hi[1]).max(0.0);
                // The line ends on the box the exporter reserved, which is the estimated text
                // box (wider than Ubuntu Light's) plus the halo: within 1 mm and a fifth of the
                // name's width of the real text.
                let slack = 1.0 * units_per_mm + 0.2 * (hi[0] - lo[0]);
                assert!(
                    dx.hypot(dy) <= slack,
                    "{}: the leader ends away from it",
                    l.text
                );
            }
        }
    }
    let r = &made.labels;
    assert_eq!(r.inside + r.with_leader + r.beside_marker, labels.len());
    assert_eq!(r.with_leader, leaders.len());
    assert_eq!(r.named, labels.len() + r.left_out.len());
    Checked {
        svg,
        labels,
        report: made.labels,
        units_per_mm,
    }
}

fn sample(name: &str) -> Document {
    let mut doc =
        tinct::doc::file::load(&root().join("sample-maps").join(format!("{name}.tinct"))).unwrap();
    greedy_colour(&mut doc);
    doc
}

fn imported(file: &str) -> Document {
    let path = root().join("tests/data/geo").join(file);
    let mut doc = geo::import_path(&path, &ImportOptions::default())
        .unwrap()
        .into_document(file);
    greedy_colour(&mut doc);
    doc
}

fn labelled() -> SvgOptions {
    SvgOptions {
        labels: true,
        ..SvgOptions::default()
    }
}

#[test]
fn labels_on_the_sample_maps_fit_do_not_overlap_and_read() {
    for name in ["vessland-province", "three-valleys", "exclave-coast"] {
        let doc = sample(name);
        let c = check_labels(&doc, &labelled());
        // Most names of these hand-drawn maps fit at 180 mm (a low bar that a placement which
        // gives up too early fails).
        assert!(
            c.labels.len() * 4 >= c.report.named * 3,
            "{name}: {:?}",
            c.report
        );
        // Largest region first: the largest land region is labelled, inside.
        let largest = doc
            .land_regions()
            .filter_map(|(id, r)| r.geometry.as_ref().map(|g| (g.area(), id)))
            .max_by(|a, b| a.0.total_cmp(&b.0))
            .unwrap()
            .1;
        assert!(
            c.labels.iter().any(|l| l.id == largest.to_string()),
            "{name}"
        );
    }
}

#[test]
fn labels_on_us_states_and_columbus_fit_do_not_overlap_and_read() {
    // Source data: US Census Bureau states via us-atlas 3.0.1 (longitude/latitude), and the
    // Columbus, Ohio neighbourhoods of the GeoDa sample data (planar).
    for (file, width_mm) in [
        ("us_states_subset.geojson", 180.0),
        ("us_states_subset.geojson", 90.0),
        ("columbus.shp", 180.0),
    ] {
        let doc = imported(file);
        let options = SvgOptions {
            width_mm,
            ..labelled()
        };
        let c = check_labels(&doc, &options);
        assert!(!c.labels.is_empty(), "{file}");
        // Sizes step with area: on the states at 180 mm Texas (the largest in the contiguous
        // set) has a larger size than the smallest labelled state.
        let sizes: Vec<f64> = xml_sizes(&c.svg);
        if width_mm == 180.0 && file.starts_with("us_") {
            let max = sizes.iter().cloned().fold(0.0, f64::max);
            let min = sizes.iter().cloned().fold(f64::INFINITY, f64::min);
            assert!(max > min, "{sizes:?}");
            // Sizes are written to 3 decimals.
            assert!(min >= (options.label_min_mm - 1e-3) * c.units_per_mm);
            assert!(max <= (options.label_max_mm + 1e-3) * c.units_per_mm);
        }
    }
}

fn xml_sizes(svg: &str) -> Vec<f64> {
    let xml = roxmltree::Document::parse(svg).unwrap();
    xml.descendants()
        .filter(|n| {
            n.has_tag_name("text") && n.attribute("id").is_some_and(|i| i.starts_with("label-"))
        })
        .map(|n| n.attribute("font-size").unwrap().parse().unwrap())
        .collect()
}

fn polylines(svg: &str, group: &str) -> (Option<String>, Option<f64>, Vec<Vec<[f64; 2]>>) {
    let xml = roxmltree::Document::parse(svg).unwrap();
    let Some(g) = xml.descendants().find(|n| n.attribute("id") == Some(group)) else {
        return (None, None, Vec::new());
    };
    let lines = g
        .children()
        .filter(|c| c.has_tag_name("polyline"))
        .map(|c| {
            c.attribute("points")
                .unwrap()
                .split_whitespace()
                .map(|p| {
                    let (x, y) = p.split_once(',').unwrap();
                    [x.parse().unwrap(), y.parse().unwrap()]
                })
                .collect()
        })
        .collect();
    (
        g.attribute("stroke").map(str::to_string),
        g.attribute("stroke-width").map(|w| w.parse().unwrap()),
        lines,
    )
}

fn length(lines: &[Vec<[f64; 2]>]) -> f64 {
    lines
        .iter()
        .flat_map(|l| l.windows(2))
        .map(|w| (w[1][0] - w[0][0]).hypot(w[1][1] - w[0][1]))
        .sum()
}

#[test]
fn line_hierarchy_coast_heavier_than_borders_and_borders_match_the_derived_lengths() {
    // The importer derives each shared border's length on its own (an R-tree over every ring
    // edge, src/geo/adjacency.rs); the exporter's border lines must add up to the same total.
    for file in ["us_states_subset.geojson", "columbus.shp"] {
        let doc = imported(file);
        // Everything where it lies (no inset for Alaska), so that lengths compare directly.
        let options = SvgOptions {
            insets: false,
            ..SvgOptions::default()
        };
        let svg = render(&doc, &options).unwrap().svg;
        let (coast_ink, coast_w, coast) = polylines(&svg, "coast");
        let (border_ink, border_w, borders) = polylines(&svg, "borders");
        assert!(coast_w.unwrap() > 2.0 * border_w.unwrap(), "{file}");
        assert_ne!(coast_ink, border_ink);
        // Widths are the options' millimetres at print size (the SVG units are map units, so a
        // millimetre is the page width in units over the width in millimetres).
        let frame = tinct::export::MapFrame::new(&doc, &options, None).unwrap();
        let unit = 1.0 / frame.mm_per_unit;
        assert!((coast_w.unwrap() - options.coast_mm * unit).abs() <= 0.01 * unit);
        assert!((border_w.unwrap() - options.border_mm * unit).abs() <= 0.01 * unit);
        // SVG units are map units shifted, so lengths compare directly.
        let derived: f64 = doc
            .borders()
            .iter()
            .filter(|(_, b)| b.kind == tinct::doc::BorderKind::Shared)
            .map(|(_, b)| b.length)
            .sum();
        let drawn = length(&borders);
        assert!(
            (drawn - derived).abs() <= 0.01 * derived,
            "{file}: borders drawn {drawn}, derived {derived}"
        );
        // The coast is the rest of the outline: every land perimeter once, shared stretches twice.
        let perimeter: f64 = doc
            .regions()
            .values()
            .filter_map(|r| r.geometry.as_ref())
            .flat_map(|g| g.polygons.iter())
            .flat_map(|p| std::iter::once(&p.exterior).chain(p.holes.iter()))
            .map(|ring| {
                (0..ring.len())
                    .map(|k| {
                        let (a, b) = (ring[k], ring[(k + 1) % ring.len()]);
                        (b[0] - a[0]).hypot(b[1] - a[1])
                    })
                    .sum::<f64>()
            })
            .sum();
        // Islets (whole islands under 2.5 mm across on the page) are drawn at half the coast's
        // width, and count as coast.
        let (islet_ink, islet_w, islets) = polylines(&svg, "islets");
        if !islets.is_empty() {
            assert_eq!(islet_ink, coast_ink);
            assert!((islet_w.unwrap() - coast_w.unwrap() / 2.0).abs() <= 0.01 * unit);
            for islet in &islets {
                assert_eq!(
                    islet.first(),
                    islet.last(),
                    "{file}: an islet is a whole ring"
                );
                let span = |k: usize| {
                    let v: Vec<f64> = islet.iter().map(|p| p[k]).collect();
                    v.iter().cloned().fold(f64::NEG_INFINITY, f64::max)
                        - v.iter().cloned().fold(f64::INFINITY, f64::min)
                };
                assert!(span(0).max(span(1)) < 2.5 * unit, "{file}");
            }
        }
        if file.starts_with("us_") {
            // The Aleutians: many islets at 180 mm.
            assert!(islets.len() >= 10, "{file}: {} islets", islets.len());
        }
        let coast_len = length(&coast) + length(&islets);
        assert!(
            (coast_len - (perimeter - 2.0 * derived)).abs() <= 0.01 * perimeter,
            "{file}: coast {coast_len}, perimeter {perimeter}, borders {derived}"
        );
    }
    // Water: Vessland has a sound and lakes; lines with water on both sides are blue-grey and
    // thinner than borders.
    let doc = sample("vessland-province");
    let svg = render(&doc, &SvgOptions::default()).unwrap().svg;
    let (ink, w, lines) = polylines(&svg, "water-lines");
    let (_, border_w, _) = polylines(&svg, "borders");
    assert!(!lines.is_empty());
    let ink = ink.unwrap();
    let channel = |i: usize| u8::from_str_radix(&ink[1 + 2 * i..3 + 2 * i], 16).unwrap();
    assert!(channel(2) > channel(0), "blue-grey: {ink}");
    assert!(w.unwrap() < border_w.unwrap());
}

#[test]
fn print_layout_title_source_scale_bar_and_an_optional_legend() {
    let doc = imported("us_states_subset.geojson");
    // Plain map colouring by default: no legend, no title, no scale bar.
    let plain = render(&doc, &SvgOptions::default()).unwrap().svg;
    for id in ["legend", "map-title", "source", "scale-bar"] {
        assert!(!plain.contains(&format!("id=\"{id}\"")), "{id}");
    }
    let options = SvgOptions {
        title: Some("Fourteen states".into()),
        source: Some("US Census Bureau".into()),
        scale_bar: true,
        legend: true,
        legend_heading: "Fills".into(),
        ..SvgOptions::default()
    };
    let svg = render(&doc, &options).unwrap().svg;
    let xml = roxmltree::Document::parse(&svg).unwrap();
    let by_id = |id: &str| xml.descendants().find(|n| n.attribute("id") == Some(id));
    assert_eq!(by_id("map-title").unwrap().text(), Some("Fourteen states"));
    assert_eq!(
        by_id("source").unwrap().text(),
        Some("Source: US Census Bureau")
    );
    // The map's width in metres, from the region outlines as drawn.
    let xs: Vec<f64> = xml
        .descendants()
        .filter(|n| n.has_tag_name("path"))
        .flat_map(|n| parse_path(n.attribute("d").unwrap()).into_iter().flatten())
        .map(|p| p[0])
        .collect();
    let width =
        xs.iter().cloned().fold(f64::MIN, f64::max) - xs.iter().cloned().fold(f64::MAX, f64::min);
    let bar = by_id("scale-bar").unwrap();
    let bar_len: f64 = bar
        .children()
        .filter(|c| c.has_tag_name("rect"))
        .map(|r| r.attribute("width").unwrap().parse::<f64>().unwrap())
        .sum();
    // A round length (1, 2 or 5 times a power of ten metres) near a fifth of the width: the
    // 1-2-5 series steps by at most 2.5, so it lies between a fifth and a twelfth and a half.
    let mantissa = bar_len / 10f64.powf(bar_len.log10().floor());
    assert!(
        [1.0, 2.0, 5.0].iter().any(|m| (mantissa - m).abs() < 1e-6),
        "{bar_len}"
    );
    assert!(
        bar_len <= width / 5.0 && bar_len > width / 12.5,
        "{bar_len} of {width}"
    );
    // Its words: the length in kilometres (digits grouped by commas).
    let km = (bar_len / 1000.0).round() as u64;
    assert!(
        bar.children()
            .filter_map(|c| c.text())
            .any(|w| w.replace(',', "") == format!("{km} km")),
        "{km} km"
    );
    // The legend: the heading, then a swatch and the slot's own name for every slot in use.
    let legend = by_id("legend").unwrap();
    let texts: Vec<&str> = legend
        .children()
        .filter(|c| c.has_tag_name("text"))
        .filter_map(|c| c.text())
        .collect();
    assert_eq!(texts[0], "Fills");
    let used: std::collections::BTreeSet<u32> = doc.colouring().values().copied().collect();
    let names: Vec<String> = used
        .iter()
        .map(|s| doc.palette().slots[*s as usize].name.clone())
        .collect();
    assert_eq!(
        texts[1..].iter().map(|t| t.to_string()).collect::<Vec<_>>(),
        names
    );
    // A map in free units has no true scale: no scale bar.
    let mut sketch = sample("three-valleys");
    let mut settings = *sketch.settings();
    settings.units = tinct::doc::Units::Unitless;
    sketch
        .apply(tinct::doc::Edit::SetSettings(settings))
        .unwrap();
    let svg = render(&sketch, &options).unwrap().svg;
    assert!(!svg.contains("id=\"scale-bar\""));
}

#[test]
fn cli_export_takes_the_layout_flags_and_says_how_many_names_were_left_out() {
    let dir = tempfile::tempdir().unwrap();
    let project = root().join("sample-maps/three-valleys.tinct");
    let svg = dir.path().join("map.svg");
    let o = tinct_path(
        &["export"],
        &project,
        &[
            "--svg",
            svg.to_str().unwrap(),
            "--labels",
            "--title",
            "Three Valleys",
            "--source",
            "invented",
            "--legend",
            "--legend-heading",
            "Key",
            "--width-mm",
            "60",
        ],
    );
    assert!(o.status.success(), "{}", stderr(&o));
    let text = std::fs::read_to_string(&svg).unwrap();
    let placed = xml_sizes(&text).len();
    let err = stderr(&o);
    // "labels: P of N placed ...; K left out because they do not fit: ..."
    let line = err.lines().find(|l| l.contains("labels: ")).expect(&err);
    let numbers: Vec<usize> = line
        .split(|c: char| !c.is_ascii_digit())
        .filter_map(|t| t.parse().ok())
        .collect();
    assert_eq!(numbers[0], placed, "{line}");
    // At 60 mm not every name of the 31 regions fits, and the count says how many did not.
    assert!(numbers[1] > placed, "{line}");
    assert!(
        line.contains(&format!("{} left out", numbers[1] - placed)),
        "{line}"
    );
    assert!(text.contains("Three Valleys") && text.contains("Source: invented"));

    // Name sizes in points: 9 pt everywhere.
    let nine = dir.path().join("nine.svg");
    let o = tinct_path(
        &["export"],
        &project,
        &[
            "--svg",
            nine.to_str().unwrap(),
            "--labels",
            "--name-size",
            "9",
        ],
    );
    assert!(o.status.success(), "{}", stderr(&o));
    let text = std::fs::read_to_string(&nine).unwrap();
    let xml = roxmltree::Document::parse(&text).unwrap();
    let per_mm = units_per_mm(&xml);
    let sizes = xml_sizes(&text);
    assert!(!sizes.is_empty());
    for s in sizes {
        let pt = s / per_mm * 72.0 / 25.4;
        assert!((pt - 9.0).abs() < 0.01, "{pt} pt");
    }
    // Sizes the CLI refuses, with the reason.
    for (bad, says) in [
        ("12-8", "larger than the largest"),
        ("1-8", "from 3 to 36 points"),
        ("big", "not a size in points"),
    ] {
        let o = tinct_path(
            &["export"],
            &project,
            &[
                "--svg",
                nine.to_str().unwrap(),
                "--labels",
                "--name-size",
                bad,
            ],
        );
        assert_eq!(o.status.code(), Some(2), "{bad}");
        assert!(stderr(&o).contains(says), "{bad}: {}", stderr(&o));
    }
}

#[test]
fn the_same_map_exports_to_the_same_bytes() {
    // The exporter keys shared segments in hash maps (each with its own random seed): the output
    // must depend only on the document, never on hash order.
    let doc = imported("columbus.shp");
    let options = SvgOptions {
        labels: true,
        title: Some("Columbus".into()),
        ..SvgOptions::default()
    };
    let first = render(&doc, &options).unwrap();
    for _ in 0..3 {
        assert_eq!(render(&doc, &options).unwrap(), first);
    }
    // The PNG renders the same labels (its water names slanted by a transform instead of an
    // italic face): it decodes, and its report matches the SVG's.
    let (png, report) = tinct::export::png::to_png_with_report(
        &doc,
        &options,
        tinct::export::PngSize::WidthPx(600),
    )
    .unwrap();
    assert!(resvg::tiny_skia::Pixmap::decode_png(&png).is_ok());
    assert_eq!(report, first.labels);
}

/// The `d` of each region's path in an exported SVG, as points (SVG units), by region id.
fn region_points(svg: &str) -> BTreeMap<String, Vec<[f64; 2]>> {
    let xml = roxmltree::Document::parse(svg).unwrap();
    xml.descendants()
        .filter(|n| n.has_tag_name("path"))
        .filter_map(|n| Some((n.attribute("id")?.to_string(), n.attribute("d")?)))
        .filter(|(id, _)| id.starts_with("region-"))
        .map(|(id, d)| {
            let numbers: Vec<f64> = d
                .split(|c: char| c.is_whitespace() || c == 'M' || c == 'L' || c == 'Z')
                .filter(|t| !t.is_empty())
                .map(|t| t.parse().unwrap())
                .collect();
            (id, numbers.chunks_exact(2).map(|p| [p[0], p[1]]).collect())
        })
        .collect()
}

#[test]
fn far_parts_go_into_inset_frames_that_cover_no_land_and_hold_their_names() {
    // Alaska beside twelve conterminous states (us-atlas 3.0.1, see PROVENANCE.md): drawn where
    // it lies, it takes the page's north-west and shrinks the rest. Inset frames are common atlas
    // practice for it.
    let doc = imported("us_states_subset.geojson");
    let alaska = doc.region_by_name("Alaska").unwrap();
    let arranged = tinct::export::insets::arrange(&doc).expect("an inset for Alaska");
    assert_eq!(arranged.insets.len(), 1);
    let inset = &arranged.insets[0];
    assert_eq!(inset.regions, [alaska]);
    assert!(
        inset.scale < 1.0,
        "Alaska is shrunk to fit: {}",
        inset.scale
    );
    // The main map is drawn larger than without the inset.
    let options = SvgOptions {
        labels: true,
        ..SvgOptions::default()
    };
    let plain = SvgOptions {
        insets: false,
        ..options.clone()
    };
    let with = tinct::export::MapFrame::new(&arranged.doc, &options, arranged.extent()).unwrap();
    let without = tinct::export::MapFrame::new(&doc, &plain, None).unwrap();
    assert!(
        with.mm_per_unit > 1.3 * without.mm_per_unit,
        "{} against {}",
        with.mm_per_unit,
        without.mm_per_unit
    );
    // In the SVG: one frame; Alaska inside it, every other state outside it; the caption gives
    // Alaska's scale; its name lies in the frame.
    let made = render(&doc, &options).unwrap();
    let xml = roxmltree::Document::parse(&made.svg).unwrap();
    let group = xml
        .descendants()
        .find(|n| n.attribute("id") == Some("insets"))
        .expect("an insets group");
    let rects: Vec<[f64; 4]> = group
        .children()
        .filter(|c| c.has_tag_name("rect"))
        .map(|r| {
            let a = |k| r.attribute(k).unwrap().parse::<f64>().unwrap();
            [a("x"), a("y"), a("x") + a("width"), a("y") + a("height")]
        })
        .collect();
    assert_eq!(rects.len(), 1);
    let [x0, y0, x1, y1] = rects[0];
    let inside = |p: &[f64; 2]| p[0] >= x0 && p[0] <= x1 && p[1] >= y0 && p[1] <= y1;
    let strictly_out = |p: &[f64; 2]| p[0] < x0 || p[0] > x1 || p[1] < y0 || p[1] > y1;
    for (id, points) in region_points(&made.svg) {
        if id == format!("region-{alaska}") {
            assert!(points.iter().all(inside), "Alaska lies in its frame");
        } else {
            assert!(
                points.iter().all(strictly_out),
                "{id} lies outside the frame"
            );
        }
    }
    let caption = group
        .descendants()
        .find(|n| n.has_tag_name("text"))
        .and_then(|t| t.text())
        .unwrap();
    assert!(caption.starts_with("scale ×0."), "{caption}");
    assert!(made.labels.left_out.iter().all(|n| n != "Alaska"));
    // Without insets, nothing moves.
    assert!(!render(&doc, &plain).unwrap().svg.contains(r#"id="insets""#));
}

#[test]
fn maps_without_far_parts_or_without_a_place_on_the_globe_get_no_insets() {
    // Columbus (one city, no far parts; GeoDa sample data via libpysal) and the invented sample
    // maps (no projection) are drawn as they are.
    assert!(tinct::export::insets::arrange(&imported("columbus.shp")).is_none());
    for name in ["three-valleys", "vessland-province", "exclave-coast"] {
        let doc =
            tinct::doc::file::load(&root().join(format!("sample-maps/{name}.tinct"))).unwrap();
        assert!(tinct::export::insets::arrange(&doc).is_none(), "{name}");
    }
    // Russia and its neighbours with Fiji (world-atlas 2.0.2): Russia runs across the
    // 180-degree meridian and stays whole in the main map; only Fiji, far away in the south
    // Pacific, goes into an inset.
    let world = imported("world_subset.topojson");
    let a = tinct::export::insets::arrange(&world).expect("an inset for Fiji");
    let fiji = world.region_by_name("Fiji").unwrap();
    assert_eq!(a.insets.len(), 1);
    assert_eq!(a.insets[0].regions, [fiji]);
}

#[test]
fn inset_captions_give_the_scale_as_a_factor() {
    use tinct::export::svg::inset_caption;
    assert_eq!(inset_caption(0.41), "scale ×0.41");
    assert_eq!(inset_caption(0.4123), "scale ×0.41");
    assert_eq!(inset_caption(3.06), "scale ×3.1");
    assert_eq!(inset_caption(2.0), "scale ×2");
    assert_eq!(inset_caption(0.085), "scale ×0.085");
}

#[test]
fn names_follow_long_narrow_states_and_large_coastal_ones_take_a_leader_on_the_whole_us() {
    // Source: all 56 states and territories of us-atlas 3.0.1 (US Census Bureau), at the
    // default 180 mm. Before names could turn, Florida, Indiana, Louisiana, Michigan and
    // Mississippi were all left out here: their level names are wider than the states.
    let doc = imported("us_states10m.topojson");
    let c = check_labels(&doc, &labelled());
    let placed = |name: &str| c.labels.iter().find(|l| l.text == name);
    for name in ["Florida", "Indiana", "Louisiana", "Michigan", "Mississippi"] {
        assert!(placed(name).is_some(), "{name}: {:?}", c.report);
    }
    // Indiana and Mississippi are tall and narrow: their names run along them, near upright.
    for name in ["Indiana", "Mississippi"] {
        let angle = placed(name).unwrap().angle;
        assert!(angle.abs() > 60.0, "{name} at {angle} degrees");
    }
    // Wide states keep level names.
    for name in ["Texas", "Montana", "Kansas"] {
        assert_eq!(placed(name).unwrap().angle, 0.0, "{name}");
    }
    assert!(
        c.labels.len() >= 48,
        "{} of 56 placed: {:?}",
        c.labels.len(),
        c.report.left_out
    );
}

#[test]
fn name_sizes_follow_the_range_asked_for() {
    // Points are 1/72 inch (25.4/72 mm), the printer's unit for type (common practice).
    let doc = imported("us_states_subset.geojson");
    let mm = |pt: f64| pt * 25.4 / 72.0;
    let options = SvgOptions {
        label_min_mm: mm(8.0),
        label_max_mm: mm(12.0),
        ..labelled()
    };
    let c = check_labels(&doc, &options);
    let sizes = xml_sizes(&c.svg);
    assert!(!sizes.is_empty());
    for s in &sizes {
        let s_mm = s / c.units_per_mm;
        assert!(
            s_mm >= mm(8.0) - 1e-3 && s_mm <= mm(12.0) + 1e-3,
            "{s_mm} mm"
        );
    }
    // Larger names, fewer fit than at 6 to 10 pt.
    let default = check_labels(&doc, &labelled());
    assert!(
        c.report.left_out.len() >= default.report.left_out.len(),
        "{:?} against {:?}",
        c.report,
        default.report
    );
}

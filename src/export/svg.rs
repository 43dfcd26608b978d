//! SVG export: a map for print. Filled regions (even-odd, so holes stay holes), a line hierarchy
//! (coast and outer boundary heavier than borders between regions, lines on water in blue-grey),
//! markers for regions without outlines, placed labels, and an optional title, scale bar, source
//! line and legend, all sized in millimetres at print size.
//!
//! Coordinates are map units, shifted so the page starts at the origin and with the y axis
//! flipped (maps grow north, SVG grows down): `x_svg = x - min_x + margin`, `y_svg = max_y - y +
//! top`, where `top` is the margin plus the title's height. The `viewBox` is therefore in map
//! units and `width`/`height` in millimetres, so a layout program places the map at its true
//! print size. Shifting keeps the numbers small, which matters to renderers that work in single
//! precision.
//!
//! Each region stays one element (`<path id="region-N">`, or a `<circle>` for a region without an
//! outline) with a `<title>` of its name, so screen readers and other tools can tell regions
//! apart. Lines are `<polyline>`s in the groups `coast`, `islets` (the whole coast of islands
//! under [`ISLET_MM`] across, at half the coast's width), `borders` and `water-lines`; labels are
//! `<text id="label-N">` in the group `labels` (turned by a `rotate(...)` transform when set along
//! a long narrow region), and leader lines `<line id="leader-N">`.

use std::fmt::Write as _;

use crate::doc::{Document, Point, RegionId, Role, Units};

use super::ExportError;
use super::labels::{
    self, BASELINE_BELOW_CENTRE_EM, HALO_MM, LINE_ADVANCE_EM, LabelReport, MARKER_RADIUS_MM,
};
use super::lines::{self, LineClass};

/// Fill of land regions without a colour (or with a slot the palette lacks).
pub const UNCOLOURED_FILL: &str = "#f4f4f2";
/// Water is drawn as fine horizontal lines on a pale ground (the `water` pattern), so it never
/// looks like a palette colour, whatever the palette; this is the ground colour.
pub const WATER_GROUND: &str = "#f3f7fa";
/// The water pattern's lines: the blue the palette check keeps land fills away from.
const WATER_PATTERN_LINE: crate::doc::Rgb = crate::doc::Rgb(crate::colour::WATER_BLUE);
const WATER_FILL: &str = "url(#water)";
/// Coast and outer boundary.
const COAST_INK: &str = "#262626";
/// Borders between land regions.
const BORDER_INK: &str = "#555555";
/// Lines with water on both sides.
const WATER_LINE_INK: &str = "#6d8ca3";
/// Titles, scale bar and legend text: a soft black on the white page.
const PAGE_INK: &str = "#1b1b1b";
/// The source line: a dark grey that still reaches 7:1 on white (WCAG 2.1; see the tests).
const SOURCE_INK: &str = "#4a4a4a";

/// What the SVG shows and how big it is. All lengths are millimetres at print size.
#[derive(Clone, Debug, PartialEq)]
pub struct SvgOptions {
    /// The page width (the height follows from the map's shape, the title, the scale bar, the
    /// source line and the legend).
    pub width_mm: f64,
    /// Region names, placed so that none overlap; names that do not fit are left out and counted.
    pub labels: bool,
    /// A legend under the map: one swatch per palette slot in use, with the slot's name. Off by
    /// default: in a plain map colouring the fills carry no meaning.
    pub legend: bool,
    /// The legend's heading; empty for none.
    pub legend_heading: String,
    /// A title above the map.
    pub title: Option<String>,
    /// A source line under the map, written as "Source: ..." (the text given is what follows).
    pub source: Option<String>,
    /// A scale bar under the map, for maps in true units (projected metres); ignored for maps in
    /// free units, where a length would mean nothing.
    pub scale_bar: bool,
    /// The coast and the map's outer boundary: outlines of land not shared with other land.
    pub coast_mm: f64,
    /// Borders between two land regions.
    pub border_mm: f64,
    /// Lines with water on both sides (between water regions, or water's outer edge).
    pub water_line_mm: f64,
    /// The smallest and largest label size (em height); labels come in three steps between.
    pub label_min_mm: f64,
    pub label_max_mm: f64,
    /// Small islands, enclaves and coastal regions whose name does not fit inside may have it
    /// placed nearby with a leader line.
    pub leaders: bool,
    /// Regions far from the main mass of a map imported from longitude/latitude (Alaska and
    /// Hawaii beside the conterminous US) drawn in inset frames beside it, when that saves room
    /// (see [`super::insets`]).
    pub insets: bool,
}

impl Default for SvgOptions {
    fn default() -> SvgOptions {
        SvgOptions {
            width_mm: 180.0,
            labels: false,
            legend: false,
            legend_heading: String::new(),
            title: None,
            source: None,
            scale_bar: false,
            coast_mm: 0.5,
            border_mm: 0.2,
            water_line_mm: 0.15,
            // 6 and 10 points: the usual range for place names on a page map (common practice).
            label_min_mm: 6.0 * MM_PER_POINT,
            label_max_mm: 10.0 * MM_PER_POINT,
            leaders: true,
            insets: true,
        }
    }
}

/// A typographic point (1/72 inch), in millimetres: name sizes are given in points.
pub const MM_PER_POINT: f64 = 25.4 / 72.0;

/// An island whose outline is less than this across on the page (millimetres) is an islet: its
/// coast is drawn at half the coast's width.
pub const ISLET_MM: f64 = 2.5;

/// The SVG and what label placement did.
#[derive(Clone, Debug, PartialEq)]
pub struct SvgExport {
    pub svg: String,
    /// Label counts; all zero when labels were not asked for.
    pub labels: LabelReport,
}

/// The white space the SVG leaves around its drawing, in millimetres.
pub const MARGIN_MM: f64 = 6.0;
const TITLE_SIZE_MM: f64 = 5.0;
const TITLE_BLOCK_MM: f64 = 9.0;
const FOOTER_SIZE_MM: f64 = 2.4;
const FOOTER_ROW_MM: f64 = 7.0;
const LEGEND_ROW_MM: f64 = 6.0;
const LEGEND_COLUMN_MM: f64 = 58.0;
const LEGEND_SIZE_MM: f64 = 2.8;

pub(crate) fn nonempty(text: &Option<String>) -> Option<&str> {
    text.as_deref().map(str::trim).filter(|t| !t.is_empty())
}

/// Where the map sits on the page: the mapping from map units to SVG units and millimetres.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct MapFrame {
    /// The map's bounding box `[min, max]` in map units.
    pub bounds: [Point; 2],
    /// Millimetres per map unit.
    pub mm_per_unit: f64,
    /// Page size in millimetres.
    pub page_mm: [f64; 2],
    /// Page size in SVG user units (map units).
    pub page_units: [f64; 2],
    /// The map's top edge on the page, in millimetres (the margin and the title above it).
    pub map_top_mm: f64,
    /// The map's size on the page, in millimetres.
    pub map_mm: [f64; 2],
    /// The scale bar's row and the source line's row (their tops, in millimetres), if shown.
    scale_row_mm: Option<f64>,
    source_row_mm: Option<f64>,
    /// The legend's top edge in millimetres, and its columns.
    legend_top_mm: f64,
    legend_columns: usize,
}

impl MapFrame {
    /// Lays out `doc` for `options`, over `bounds` when given (else the document's); `None` for
    /// an empty map.
    pub fn new(
        doc: &Document,
        options: &SvgOptions,
        bounds: Option<[Point; 2]>,
    ) -> Option<MapFrame> {
        let bounds = bounds.or_else(|| doc.bounds())?;
        let size = [bounds[1][0] - bounds[0][0], bounds[1][1] - bounds[0][1]];
        let content_mm = (options.width_mm - 2.0 * MARGIN_MM).max(1.0);
        // A single point or a line has no width: give it a nominal one so the scale is finite.
        let span = if size[0] > 0.0 {
            size[0]
        } else if size[1] > 0.0 {
            size[1]
        } else {
            1.0
        };
        let mm_per_unit = content_mm / span;
        let map_mm = [content_mm, size[1] * mm_per_unit];
        let map_top_mm = MARGIN_MM
            + if nonempty(&options.title).is_some() {
                TITLE_BLOCK_MM
            } else {
                0.0
            };
        let mut y = map_top_mm + map_mm[1];
        let scale_row_mm = scale_bar_length(doc, options, size[0]).map(|_| {
            y += FOOTER_ROW_MM;
            y - FOOTER_ROW_MM
        });
        let source_row_mm = nonempty(&options.source).map(|_| {
            y += FOOTER_ROW_MM;
            y - FOOTER_ROW_MM
        });
        let legend_columns = ((content_mm / LEGEND_COLUMN_MM).floor() as usize).max(1);
        let rows = if options.legend {
            legend_entries(doc).len().div_ceil(legend_columns)
        } else {
            0
        };
        let heading = options.legend && rows > 0 && !options.legend_heading.trim().is_empty();
        let legend_top_mm = y + 4.0 + if heading { LEGEND_ROW_MM } else { 0.0 };
        if rows > 0 {
            y = legend_top_mm + rows as f64 * LEGEND_ROW_MM;
        }
        let page_mm = [options.width_mm, y + MARGIN_MM];
        Some(MapFrame {
            bounds,
            mm_per_unit,
            page_mm,
            page_units: [page_mm[0] / mm_per_unit, page_mm[1] / mm_per_unit],
            map_top_mm,
            map_mm,
            scale_row_mm,
            source_row_mm,
            legend_top_mm,
            legend_columns,
        })
    }

    /// A map point in SVG user units.
    pub fn to_svg(&self, p: Point) -> [f64; 2] {
        [
            p[0] - self.bounds[0][0] + MARGIN_MM / self.mm_per_unit,
            self.bounds[1][1] - p[1] + self.map_top_mm / self.mm_per_unit,
        ]
    }

    /// A map point in millimetres from the page's top-left corner.
    pub fn to_page_mm(&self, p: Point) -> [f64; 2] {
        let [x, y] = self.to_svg(p);
        [x * self.mm_per_unit, y * self.mm_per_unit]
    }

    /// The area names may use, in page millimetres: the map's box widened by half the margin.
    pub fn map_box_mm(&self) -> [[f64; 2]; 2] {
        let m = MARGIN_MM / 2.0;
        [
            [MARGIN_MM - m, self.map_top_mm - m],
            [
                MARGIN_MM + self.map_mm[0] + m,
                self.map_top_mm + self.map_mm[1] + m,
            ],
        ]
    }

    fn units(&self, mm: f64) -> f64 {
        mm / self.mm_per_unit
    }
}

/// The scale bar's length in map units (metres): 1, 2 or 5 times a power of ten, the largest such
/// length not over a fifth of the map's width. `None` when no scale bar is shown.
pub fn scale_bar_length(doc: &Document, options: &SvgOptions, width_units: f64) -> Option<f64> {
    if !options.scale_bar || doc.settings().units != Units::Metres {
        return None;
    }
    round_length(width_units / 5.0)
}

/// The largest of 1, 2 and 5 times a power of ten that is not over `target`; `None` for a target
/// that is not a positive finite number.
pub fn round_length(target: f64) -> Option<f64> {
    if !(target.is_finite() && target > 0.0) {
        return None;
    }
    let power = 10f64.powf(target.log10().floor());
    // Guard the floor against rounding (log10(1000) may come out as 2.9999...).
    let power = if power * 10.0 <= target {
        power * 10.0
    } else {
        power
    };
    [5.0, 2.0, 1.0]
        .iter()
        .map(|m| m * power)
        .find(|l| *l <= target * (1.0 + 1e-12))
}

/// A length in metres as a scale bar writes it: "500 m", "2 km", "1,000 km".
pub fn length_words(metres: f64) -> String {
    let (value, unit) = if metres >= 1000.0 {
        (metres / 1000.0, "km")
    } else {
        (metres, "m")
    };
    let whole = value.round() as u64;
    let digits = whole.to_string();
    let mut grouped = String::new();
    for (i, c) in digits.chars().enumerate() {
        if i > 0 && (digits.len() - i).is_multiple_of(3) {
            grouped.push(',');
        }
        grouped.push(c);
    }
    format!("{grouped} {unit}")
}

/// Slots in use with their region counts, in slot order; land regions only.
/// The legend's rows: the slots in use and the row's words. One slot per row, named after the
/// slot; with a palette of families (colours that follow a hierarchy), one row per family with
/// a swatch for each of its tints in use, named after the family.
fn legend_entries(doc: &Document) -> Vec<(Vec<u32>, String)> {
    let mut used = std::collections::BTreeSet::new();
    for (id, _) in doc.land_regions() {
        if let Some(&s) = doc.colouring().get(&id) {
            used.insert(s);
        }
    }
    let slots = &doc.palette().slots;
    let name = |s: u32| match slots.get(s as usize) {
        Some(slot) => slot.name.clone(),
        None => format!("Slot {} (not in palette)", s + 1),
    };
    let colours: Vec<crate::colour::Srgb8> = slots.iter().map(|s| s.colour.0).collect();
    match crate::colour::families::family_shape(&colours) {
        Some((_, tints)) => {
            let mut rows: std::collections::BTreeMap<usize, Vec<u32>> = Default::default();
            for &s in &used {
                rows.entry(s as usize / tints).or_default().push(s);
            }
            rows.into_values()
                .map(|row| {
                    // "Plum 2" is a tint of the family "Plum".
                    let family = name(row[0]);
                    let family = family
                        .rsplit_once(' ')
                        .map_or(family.clone(), |(f, _)| f.to_string());
                    (row, family)
                })
                .collect()
        }
        None => used.into_iter().map(|s| (vec![s], name(s))).collect(),
    }
}

/// Escapes text for XML character data and attribute values, dropping characters XML 1.0 forbids.
pub fn escape(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for c in text.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&apos;"),
            '\t' | '\n' | '\r' => out.push(c),
            c if (c as u32) < 0x20 || c == '\u{FFFE}' || c == '\u{FFFF}' => {}
            c => out.push(c),
        }
    }
    out
}

/// Formats numbers to a fixed number of decimals, without trailing zeros.
struct Num(usize);

impl Num {
    fn f(&self, v: f64) -> String {
        let mut s = format!("{v:.*}", self.0);
        if s.contains('.') {
            while s.ends_with('0') {
                s.pop();
            }
            if s.ends_with('.') {
                s.pop();
            }
        }
        if s == "-0" { "0".to_string() } else { s }
    }
}

/// The fill of one region: `#rrggbb`, or `url(#water)` for water.
pub fn fill_of(doc: &Document, id: RegionId) -> String {
    let Some(region) = doc.regions().get(&id) else {
        return UNCOLOURED_FILL.to_string();
    };
    if region.role == Role::Water {
        return WATER_FILL.to_string();
    }
    labels::land_fill(doc, id).to_hex()
}

/// The map as an SVG document.
pub fn to_svg(doc: &Document, options: &SvgOptions) -> Result<String, ExportError> {
    render(doc, options).map(|e| e.svg)
}

fn check_options(options: &SvgOptions) -> Result<(), ExportError> {
    if !(options.width_mm.is_finite() && options.width_mm >= 20.0 && options.width_mm <= 10_000.0) {
        return Err(ExportError::BadOption(format!(
            "the page width must be between 20 and 10000 mm, not {}",
            options.width_mm
        )));
    }
    for (name, v) in [
        ("coast line width", options.coast_mm),
        ("border line width", options.border_mm),
        ("water line width", options.water_line_mm),
    ] {
        if !(v.is_finite() && (0.0..=10.0).contains(&v)) {
            return Err(ExportError::BadOption(format!(
                "the {name} must be between 0 and 10 mm, not {v}"
            )));
        }
    }
    let (lo, hi) = (options.label_min_mm, options.label_max_mm);
    if !(lo.is_finite() && hi.is_finite() && lo >= 0.5 && lo <= hi && hi <= 50.0) {
        return Err(ExportError::BadOption(format!(
            "label sizes must satisfy 0.5 <= smallest <= largest <= 50 mm, not {lo} and {hi}"
        )));
    }
    Ok(())
}

/// The map as an SVG document, with what label placement did.
pub fn render(doc: &Document, options: &SvgOptions) -> Result<SvgExport, ExportError> {
    render_with(doc, options, false)
}

/// [`render`]; with `synthetic_oblique`, italic names are slanted by a skew instead of asking for
/// an italic face, for a renderer whose only font has none (the PNG export's).
pub(crate) fn render_with(
    doc: &Document,
    options: &SvgOptions,
    synthetic_oblique: bool,
) -> Result<SvgExport, ExportError> {
    check_options(options)?;
    let arranged = if options.insets {
        super::insets::arrange(doc)
    } else {
        None
    };
    let (doc, insets, bounds) = match &arranged {
        Some(a) => (&a.doc, &a.insets[..], a.extent()),
        None => (doc, &[][..], None),
    };
    let frame = MapFrame::new(doc, options, bounds).ok_or(ExportError::EmptyMap)?;
    // Hundredths of a millimetre are finer than any printer resolves.
    let step = 0.01 / frame.mm_per_unit;
    let num = Num((-step.log10()).ceil().clamp(0.0, 12.0) as usize);
    let mm = |v: f64| num.f(frame.units(v));
    let mut out = String::new();
    let [pw, ph] = frame.page_units;
    let _ = writeln!(out, r#"<?xml version="1.0" encoding="UTF-8"?>"#);
    let _ = writeln!(
        out,
        r#"<svg xmlns="http://www.w3.org/2000/svg" version="1.1" width="{}mm" height="{}mm" viewBox="0 0 {} {}">"#,
        Num(2).f(frame.page_mm[0]),
        Num(2).f(frame.page_mm[1]),
        num.f(pw),
        num.f(ph)
    );
    let title = nonempty(&options.title).unwrap_or(doc.title());
    let _ = writeln!(out, "<title>{}</title>", escape(title));
    let _ = writeln!(
        out,
        r##"<rect x="0" y="0" width="{}" height="{}" fill="#ffffff"/>"##,
        num.f(pw),
        num.f(ph)
    );
    // The water pattern: a 1.2 mm tile with one 0.25 mm line.
    let tile = mm(1.2);
    let _ = writeln!(
        out,
        r#"<defs><pattern id="water" patternUnits="userSpaceOnUse" width="{tile}" height="{tile}"><rect width="{tile}" height="{tile}" fill="{WATER_GROUND}"/><rect y="{}" width="{tile}" height="{}" fill="{}"/></pattern></defs>"#,
        mm(0.475),
        mm(0.25),
        WATER_PATTERN_LINE.to_hex()
    );

    // Region fills, one element each; their lines are drawn after, once per shared boundary.
    let _ = writeln!(out, r#"<g id="regions" stroke="none">"#);
    for (id, region) in doc.regions() {
        let Some(geometry) = &region.geometry else {
            continue;
        };
        let mut d = String::new();
        for polygon in &geometry.polygons {
            for ring in std::iter::once(&polygon.exterior).chain(polygon.holes.iter()) {
                for (i, p) in ring.iter().enumerate() {
                    let [x, y] = frame.to_svg(*p);
                    let _ = write!(
                        d,
                        "{}{} {} ",
                        if i == 0 { "M" } else { "L" },
                        num.f(x),
                        num.f(y)
                    );
                }
                if !ring.is_empty() {
                    d.push_str("Z ");
                }
            }
        }
        let _ = writeln!(
            out,
            r#"<path id="region-{id}" fill="{}" fill-rule="evenodd" d="{}"><title>{}</title></path>"#,
            fill_of(doc, *id),
            d.trim_end(),
            escape(&region.name)
        );
    }
    let _ = writeln!(out, "</g>");

    // The line hierarchy: water lines under borders under the coast. The whole coast of an
    // islet (a ring less than ISLET_MM across on the page) is drawn at half the coast's width, so
    // that a speck of land stays a shape and does not become a blot.
    let lines = lines::classify(doc);
    let islet = |points: &Vec<Point>| {
        let (Some(first), Some(last)) = (points.first(), points.last()) else {
            return false;
        };
        let (mut lo, mut hi) = (*first, *first);
        for p in points {
            lo = [lo[0].min(p[0]), lo[1].min(p[1])];
            hi = [hi[0].max(p[0]), hi[1].max(p[1])];
        }
        first == last && (hi[0] - lo[0]).max(hi[1] - lo[1]) * frame.mm_per_unit < ISLET_MM
    };
    for (class, group, ink, width) in [
        (
            LineClass::Water,
            "water-lines",
            WATER_LINE_INK,
            options.water_line_mm,
        ),
        (LineClass::Border, "borders", BORDER_INK, options.border_mm),
        (LineClass::Coast, "coast", COAST_INK, options.coast_mm),
        (
            LineClass::Coast,
            "islets",
            COAST_INK,
            (options.coast_mm / 2.0).max(options.border_mm.min(options.coast_mm)),
        ),
    ] {
        let chains: Vec<&Vec<Point>> = lines
            .chains
            .iter()
            .filter(|(c, p)| {
                *c == class && (class != LineClass::Coast || (group == "islets") == islet(p))
            })
            .map(|(_, p)| p)
            .collect();
        if chains.is_empty() || width <= 0.0 {
            continue;
        }
        let _ = writeln!(
            out,
            r#"<g id="{group}" fill="none" stroke="{ink}" stroke-width="{}" stroke-linejoin="round" stroke-linecap="round">"#,
            mm(width)
        );
        for chain in chains {
            let mut points = String::new();
            for p in chain {
                let [x, y] = frame.to_svg(*p);
                let _ = write!(points, "{},{} ", num.f(x), num.f(y));
            }
            let _ = writeln!(out, r#"<polyline points="{}"/>"#, points.trim_end());
        }
        let _ = writeln!(out, "</g>");
    }

    // Regions without outlines (sketches): their borders as lines, then markers on top.
    let stroke = mm(options.border_mm);
    let sketched: Vec<RegionId> = doc
        .regions()
        .iter()
        .filter(|(_, r)| r.geometry.is_none())
        .map(|(id, _)| *id)
        .collect();
    if !sketched.is_empty() {
        let _ = writeln!(
            out,
            r#"<g id="links" stroke="{BORDER_INK}" stroke-width="{stroke}" fill="none">"#
        );
        for (pair, _) in doc.active_borders() {
            let (Some(a), Some(b)) = (doc.regions().get(&pair.a()), doc.regions().get(&pair.b()))
            else {
                continue;
            };
            if a.geometry.is_some() && b.geometry.is_some() {
                continue;
            }
            let ([x1, y1], [x2, y2]) = (frame.to_svg(a.anchor), frame.to_svg(b.anchor));
            let _ = writeln!(
                out,
                r#"<line x1="{}" y1="{}" x2="{}" y2="{}"/>"#,
                num.f(x1),
                num.f(y1),
                num.f(x2),
                num.f(y2)
            );
        }
        let _ = writeln!(out, "</g>");
        let _ = writeln!(
            out,
            r#"<g id="markers" stroke="{COAST_INK}" stroke-width="{stroke}">"#
        );
        let r = mm(MARKER_RADIUS_MM);
        for id in &sketched {
            let region = &doc.regions()[id];
            let [x, y] = frame.to_svg(region.anchor);
            let _ = writeln!(
                out,
                r#"<circle id="region-{id}" cx="{}" cy="{}" r="{r}" fill="{}"><title>{}</title></circle>"#,
                num.f(x),
                num.f(y),
                fill_of(doc, *id),
                escape(&region.name)
            );
        }
        let _ = writeln!(out, "</g>");
    }

    // Inset frames, with their scale when it is not the main map's.
    if !insets.is_empty() {
        let _ = writeln!(
            out,
            r#"<g id="insets" fill="none" stroke="{BORDER_INK}" stroke-width="{}">"#,
            mm(0.25)
        );
        for inset in insets {
            let [a, b] = [
                frame.to_svg([inset.frame[0][0], inset.frame[1][1]]),
                frame.to_svg([inset.frame[1][0], inset.frame[0][1]]),
            ];
            let _ = writeln!(
                out,
                r#"<rect x="{}" y="{}" width="{}" height="{}"/>"#,
                num.f(a[0]),
                num.f(a[1]),
                num.f(b[0] - a[0]),
                num.f(b[1] - a[1])
            );
            if inset_caption_box(inset, [0.0; 2], [0.0; 2]).is_some() {
                let _ = writeln!(
                    out,
                    r#"<text x="{}" y="{}" stroke="none" fill="{SOURCE_INK}" font-family="sans-serif" font-size="{}">{}</text>"#,
                    num.f(a[0] + frame.units(CAPTION_INSET_MM)),
                    num.f(b[1] - frame.units(CAPTION_INSET_MM)),
                    mm(CAPTION_SIZE_MM),
                    escape(&inset_caption(inset.scale))
                );
            }
        }
        let _ = writeln!(out, "</g>");
    }

    let mut report = LabelReport::default();
    if options.labels {
        let boxes: Vec<labels::InsetBox> = insets
            .iter()
            .map(|inset| {
                let a = frame.to_page_mm([inset.frame[0][0], inset.frame[1][1]]);
                let b = frame.to_page_mm([inset.frame[1][0], inset.frame[0][1]]);
                let inner = 0.4;
                labels::InsetBox {
                    box_mm: [[a[0] + inner, a[1] + inner], [b[0] - inner, b[1] - inner]],
                    regions: inset.regions.iter().copied().collect(),
                    caption_mm: inset_caption_box(inset, a, b),
                }
            })
            .collect();
        let (placements, r) = labels::place(doc, &frame, options, &lines, &boxes);
        report = r;
        let to_units = |p: [f64; 2]| [frame.units(p[0]), frame.units(p[1])];
        let leaders: Vec<_> = placements
            .iter()
            .filter(|p| p.leader_mm.is_some())
            .collect();
        if !leaders.is_empty() {
            let _ = writeln!(
                out,
                r#"<g id="leaders" stroke="{COAST_INK}" stroke-width="{}" stroke-linecap="round">"#,
                mm(0.15)
            );
            for p in leaders {
                if let Some([a, b]) = p.leader_mm {
                    let ([x1, y1], [x2, y2]) = (to_units(a), to_units(b));
                    let _ = writeln!(
                        out,
                        r#"<line id="leader-{}" x1="{}" y1="{}" x2="{}" y2="{}"/>"#,
                        p.id,
                        num.f(x1),
                        num.f(y1),
                        num.f(x2),
                        num.f(y2)
                    );
                }
            }
            let _ = writeln!(out, "</g>");
        }
        // The halo is the text's own stroke, painted under the fill (`paint-order="stroke"`).
        let _ = writeln!(
            out,
            r#"<g id="labels" font-family="sans-serif" text-anchor="middle" stroke-width="{}" stroke-linejoin="round" paint-order="stroke">"#,
            mm(HALO_MM)
        );
        for p in &placements {
            let [x, y] = to_units(p.centre_mm);
            // The first baseline: the block of lines is centred on the label's centre.
            let advance = frame.units(LINE_ADVANCE_EM * p.size_mm);
            let extra_lines = p.lines.len().saturating_sub(1) as f64;
            let baseline =
                y + frame.units(BASELINE_BELOW_CENTRE_EM * p.size_mm) - extra_lines * advance / 2.0;
            let line_x = if p.italic && synthetic_oblique {
                "0".to_string()
            } else {
                num.f(x)
            };
            let body = if p.lines.len() > 1 {
                p.lines
                    .iter()
                    .enumerate()
                    .map(|(i, l)| {
                        format!(
                            r#"<tspan x="{line_x}" dy="{}">{}</tspan>"#,
                            if i == 0 {
                                "0".to_string()
                            } else {
                                num.f(advance)
                            },
                            escape(l)
                        )
                    })
                    .collect::<String>()
            } else {
                escape(&p.text)
            };
            // A name along a long narrow region turns about its centre.
            let turn = if p.angle_deg == 0.0 {
                String::new()
            } else {
                format!("rotate({} {} {})", num.f(p.angle_deg), num.f(x), num.f(y))
            };
            let position = if p.italic && synthetic_oblique {
                // 12 degrees, about the slant of a typical italic.
                format!(
                    r#"x="0" y="0" transform="{turn}{}translate({} {}) skewX(-12)""#,
                    if turn.is_empty() { "" } else { " " },
                    num.f(x),
                    num.f(baseline)
                )
            } else {
                let turn = if turn.is_empty() {
                    turn
                } else {
                    format!(r#" transform="{turn}""#)
                };
                let style = if p.italic {
                    r#" font-style="italic""#
                } else {
                    ""
                };
                format!(r#"x="{}" y="{}"{style}{turn}"#, num.f(x), num.f(baseline))
            };
            let _ = writeln!(
                out,
                r#"<text id="label-{}" {position} font-size="{}" fill="{}" stroke="{}">{body}</text>"#,
                p.id,
                mm(p.size_mm),
                p.ink.to_hex(),
                p.halo.to_hex(),
            );
        }
        let _ = writeln!(out, "</g>");
    }

    write_layout(&mut out, doc, options, &frame, &num);
    let _ = writeln!(out, "</svg>");
    Ok(SvgExport {
        svg: out,
        labels: report,
    })
}

/// The caption of an inset drawn at another scale than the main map, as a factor of the main
/// map's scale to two significant figures: "scale ×0.41", "scale ×3".
pub fn inset_caption(scale: f64) -> String {
    let digits = (1 - scale.abs().max(1e-9).log10().floor() as i32).max(0) as usize;
    let text = format!("{scale:.digits$}");
    let text = if text.contains('.') {
        text.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        text
    };
    format!("scale ×{text}")
}

const CAPTION_SIZE_MM: f64 = 2.0;
const CAPTION_INSET_MM: f64 = 0.8;

/// The page box (mm) of an inset's scale caption, bottom left inside its frame whose top-left and
/// bottom-right corners on the page are `a` and `b`; `None` when the inset keeps the map's scale.
fn inset_caption_box(
    inset: &super::insets::Inset,
    a: [f64; 2],
    b: [f64; 2],
) -> Option<[[f64; 2]; 2]> {
    if (inset.scale - 1.0).abs() <= 0.005 {
        return None;
    }
    let width = labels::text_width_mm(&inset_caption(inset.scale), CAPTION_SIZE_MM);
    let x = a[0] + CAPTION_INSET_MM;
    let y = b[1] - CAPTION_INSET_MM;
    Some([[x - 0.3, y - CAPTION_SIZE_MM], [x + width + 0.3, y + 0.5]])
}

/// The title, the scale bar, the source line and the legend.
fn write_layout(
    out: &mut String,
    doc: &Document,
    options: &SvgOptions,
    frame: &MapFrame,
    num: &Num,
) {
    let mm = |v: f64| num.f(frame.units(v));
    let text_attrs = |size: f64| format!(r#"font-family="sans-serif" font-size="{}""#, mm(size));
    if let Some(title) = nonempty(&options.title) {
        let _ = writeln!(
            out,
            r#"<text id="map-title" x="{}" y="{}" {} font-weight="bold" fill="{PAGE_INK}">{}</text>"#,
            mm(MARGIN_MM),
            mm(MARGIN_MM + TITLE_SIZE_MM * 0.8),
            text_attrs(TITLE_SIZE_MM),
            escape(title)
        );
    }
    let size = [
        frame.bounds[1][0] - frame.bounds[0][0],
        frame.bounds[1][1] - frame.bounds[0][1],
    ];
    if let (Some(top), Some(length)) = (frame.scale_row_mm, scale_bar_length(doc, options, size[0]))
    {
        // Two halves, dark then light, 1.2 mm high, with "0" and the length beneath the ends.
        let (x0, y0, h) = (
            frame.units(MARGIN_MM),
            frame.units(top + 1.0),
            frame.units(1.2),
        );
        let half = length / 2.0;
        let _ = writeln!(
            out,
            r#"<g id="scale-bar" stroke="{PAGE_INK}" stroke-width="{}">"#,
            mm(0.15)
        );
        let _ = writeln!(
            out,
            r#"<rect x="{}" y="{}" width="{}" height="{}" fill="{PAGE_INK}"/>"#,
            num.f(x0),
            num.f(y0),
            num.f(half),
            num.f(h)
        );
        let _ = writeln!(
            out,
            r##"<rect x="{}" y="{}" width="{}" height="{}" fill="#ffffff"/>"##,
            num.f(x0 + half),
            num.f(y0),
            num.f(half),
            num.f(h)
        );
        let baseline = num.f(y0 + h + frame.units(FOOTER_SIZE_MM + 0.6));
        let _ = writeln!(
            out,
            r#"<text x="{}" y="{baseline}" {} text-anchor="middle" fill="{PAGE_INK}" stroke="none">0</text>"#,
            num.f(x0),
            text_attrs(FOOTER_SIZE_MM)
        );
        let _ = writeln!(
            out,
            r#"<text x="{}" y="{baseline}" {} text-anchor="middle" fill="{PAGE_INK}" stroke="none">{}</text>"#,
            num.f(x0 + length),
            text_attrs(FOOTER_SIZE_MM),
            length_words(length)
        );
        let _ = writeln!(out, "</g>");
    }
    if let (Some(top), Some(source)) = (frame.source_row_mm, nonempty(&options.source)) {
        let _ = writeln!(
            out,
            r#"<text id="source" x="{}" y="{}" {} fill="{SOURCE_INK}">Source: {}</text>"#,
            mm(MARGIN_MM),
            mm(top + 4.0),
            text_attrs(FOOTER_SIZE_MM),
            escape(source)
        );
    }
    if options.legend {
        let entries = legend_entries(doc);
        if !entries.is_empty() {
            let _ = writeln!(
                out,
                r#"<g id="legend" {} fill="{PAGE_INK}">"#,
                text_attrs(LEGEND_SIZE_MM)
            );
            let heading = options.legend_heading.trim();
            if !heading.is_empty() {
                let _ = writeln!(
                    out,
                    r#"<text x="{}" y="{}" font-weight="bold">{}</text>"#,
                    mm(MARGIN_MM),
                    mm(frame.legend_top_mm - LEGEND_ROW_MM + 4.0),
                    escape(heading)
                );
            }
            let rows = entries.len().div_ceil(frame.legend_columns);
            for (k, (row_slots, name)) in entries.iter().enumerate() {
                let (col, row) = (k / rows, k % rows);
                let x = MARGIN_MM + col as f64 * LEGEND_COLUMN_MM;
                let y = frame.legend_top_mm + row as f64 * LEGEND_ROW_MM;
                // One swatch per slot of the row, side by side.
                for (i, slot) in row_slots.iter().enumerate() {
                    let fill = doc
                        .palette()
                        .slots
                        .get(*slot as usize)
                        .map_or_else(|| UNCOLOURED_FILL.to_string(), |s| s.colour.to_hex());
                    let _ = writeln!(
                        out,
                        r#"<rect x="{}" y="{}" width="{s}" height="{s}" fill="{fill}" stroke="{BORDER_INK}" stroke-width="{}"/>"#,
                        mm(x + i as f64 * 4.5),
                        mm(y),
                        mm(options.border_mm),
                        s = mm(4.0)
                    );
                }
                let _ = writeln!(
                    out,
                    r#"<text x="{}" y="{}">{}</text>"#,
                    mm(x + 6.0 + (row_slots.len() as f64 - 1.0) * 4.5),
                    mm(y + 2.0 + 0.35 * LEGEND_SIZE_MM),
                    escape(name)
                );
            }
            let _ = writeln!(out, "</g>");
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::doc::Rgb;
    use crate::export::contrast::{WHITE, contrast_ratio};

    #[test]
    fn escapes_markup_and_drops_forbidden_characters() {
        // XML 1.0 section 2.2 (allowed characters) and 2.4 (markup characters).
        assert_eq!(
            escape("A & B <C> \"d\" 'e'\u{1}"),
            "A &amp; B &lt;C&gt; &quot;d&quot; &apos;e&apos;"
        );
    }

    #[test]
    fn numbers_lose_trailing_zeros() {
        assert_eq!(Num(3).f(1.5), "1.5");
        assert_eq!(Num(3).f(2.0), "2");
        assert_eq!(Num(2).f(-0.001), "0");
    }

    #[test]
    fn scale_bar_lengths_are_one_two_or_five_times_a_power_of_ten() {
        // The 1-2-5 series of round lengths (a convention of the trade, from memory).
        assert_eq!(round_length(1000.0), Some(1000.0));
        assert_eq!(round_length(999.0), Some(500.0));
        assert_eq!(round_length(480_000.0), Some(200_000.0));
        assert_eq!(round_length(0.3), Some(0.2));
        assert_eq!(round_length(0.0), None);
        assert_eq!(length_words(200_000.0), "200 km");
        assert_eq!(length_words(500.0), "500 m");
        assert_eq!(length_words(1_000_000.0), "1,000 km");
    }

    #[test]
    fn page_text_reaches_the_wcag_ratio_on_white() {
        // WCAG 2.1 success criteria 1.4.3 (4.5:1) and 1.4.6 (7:1, level AAA) for the source line.
        let ratio = |hex: &str| contrast_ratio(Rgb::from_hex(hex).unwrap(), WHITE);
        assert!(ratio(SOURCE_INK) >= 7.0);
        assert!(ratio(PAGE_INK) >= 7.0);
    }
}

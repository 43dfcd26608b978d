//! SVG export: filled regions (even-odd, so holes stay holes), outlines, markers for regions
//! without outlines, optional labels and a legend, sized in millimetres for print.
//!
//! Coordinates are map units, shifted so the page starts at the origin and with the y axis
//! flipped (maps grow north, SVG grows down): `x_svg = x - min_x + margin`, `y_svg = max_y - y +
//! margin`. The `viewBox` is therefore in map units and `width`/`height` in millimetres, so a
//! layout program places the map at its true print size. Shifting keeps the numbers small, which
//! matters to renderers that work in single precision.

use std::fmt::Write as _;

use crate::doc::{Document, Point, RegionId, Role};

use super::ExportError;

/// Fill of land regions without a colour (or with a slot the palette lacks).
pub const UNCOLOURED_FILL: &str = "#f4f4f2";
/// Water is drawn as fine horizontal lines on a pale ground (the `water` pattern), so it never
/// looks like a palette colour, whatever the palette; this is the ground colour.
pub const WATER_GROUND: &str = "#f3f7fa";
const WATER_LINE: &str = "#8fb3cc";
const WATER_FILL: &str = "url(#water)";
const OUTLINE: &str = "#3a3a3a";
const LABEL_INK: &str = "#1b1b1b";

/// What the SVG shows and how big it is.
#[derive(Clone, Debug, PartialEq)]
pub struct SvgOptions {
    /// The page width in millimetres (the height follows from the map's shape and the legend).
    pub width_mm: f64,
    /// Region names at their label points.
    pub labels: bool,
    /// A legend under the map: one swatch per slot in use, with its name and region count.
    pub legend: bool,
    /// Outline width in millimetres.
    pub outline_mm: f64,
    /// Label text size in millimetres (the height of the em box).
    pub label_size_mm: f64,
}

impl Default for SvgOptions {
    fn default() -> SvgOptions {
        SvgOptions {
            width_mm: 180.0,
            labels: false,
            legend: true,
            outline_mm: 0.25,
            label_size_mm: 2.8,
        }
    }
}

const MARGIN_MM: f64 = 6.0;
const MARKER_RADIUS_MM: f64 = 2.2;
const LEGEND_ROW_MM: f64 = 6.0;
const LEGEND_COLUMN_MM: f64 = 58.0;

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
    /// The legend's top edge in SVG units, and its rows and columns.
    legend_top: f64,
    legend_columns: usize,
}

impl MapFrame {
    /// Lays out `doc` for `options`; `None` for an empty map.
    pub fn new(doc: &Document, options: &SvgOptions) -> Option<MapFrame> {
        let bounds = doc.bounds()?;
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
        let legend_columns = ((content_mm / LEGEND_COLUMN_MM).floor() as usize).max(1);
        let rows = if options.legend {
            legend_entries(doc).len().div_ceil(legend_columns)
        } else {
            0
        };
        let legend_mm = if rows > 0 {
            4.0 + rows as f64 * LEGEND_ROW_MM
        } else {
            0.0
        };
        let page_mm = [options.width_mm, map_mm[1] + 2.0 * MARGIN_MM + legend_mm];
        Some(MapFrame {
            bounds,
            mm_per_unit,
            page_mm,
            page_units: [page_mm[0] / mm_per_unit, page_mm[1] / mm_per_unit],
            legend_top: (MARGIN_MM + map_mm[1] + 4.0) / mm_per_unit,
            legend_columns,
        })
    }

    /// A map point in SVG user units.
    pub fn to_svg(&self, p: Point) -> [f64; 2] {
        let margin = MARGIN_MM / self.mm_per_unit;
        [
            p[0] - self.bounds[0][0] + margin,
            self.bounds[1][1] - p[1] + margin,
        ]
    }

    /// A map point in millimetres from the page's top-left corner.
    pub fn to_page_mm(&self, p: Point) -> [f64; 2] {
        let [x, y] = self.to_svg(p);
        [x * self.mm_per_unit, y * self.mm_per_unit]
    }

    fn units(&self, mm: f64) -> f64 {
        mm / self.mm_per_unit
    }
}

/// Slots in use with their region counts, in slot order; land regions only.
fn legend_entries(doc: &Document) -> Vec<(u32, usize)> {
    let mut counts = std::collections::BTreeMap::new();
    for (id, _) in doc.land_regions() {
        if let Some(&s) = doc.colouring().get(&id) {
            *counts.entry(s).or_insert(0usize) += 1;
        }
    }
    counts.into_iter().collect()
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
    doc.colouring()
        .get(&id)
        .and_then(|&s| doc.palette().slots.get(s as usize))
        .map_or_else(|| UNCOLOURED_FILL.to_string(), |s| s.colour.to_hex())
}

/// The map as an SVG document.
pub fn to_svg(doc: &Document, options: &SvgOptions) -> Result<String, ExportError> {
    if !(options.width_mm.is_finite() && options.width_mm >= 20.0 && options.width_mm <= 10_000.0) {
        return Err(ExportError::BadOption(format!(
            "the page width must be between 20 and 10000 mm, not {}",
            options.width_mm
        )));
    }
    let frame = MapFrame::new(doc, options).ok_or(ExportError::EmptyMap)?;
    // Hundredths of a millimetre are finer than any printer resolves.
    let step = 0.01 / frame.mm_per_unit;
    let num = Num((-step.log10()).ceil().clamp(0.0, 12.0) as usize);
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
    let _ = writeln!(out, "<title>{}</title>", escape(doc.title()));
    let _ = writeln!(
        out,
        r##"<rect x="0" y="0" width="{}" height="{}" fill="#ffffff"/>"##,
        num.f(pw),
        num.f(ph)
    );
    // The water pattern: a 1.2 mm tile with one 0.25 mm line.
    let tile = num.f(frame.units(1.2));
    let _ = writeln!(
        out,
        r#"<defs><pattern id="water" patternUnits="userSpaceOnUse" width="{tile}" height="{tile}"><rect width="{tile}" height="{tile}" fill="{WATER_GROUND}"/><rect y="{}" width="{tile}" height="{}" fill="{WATER_LINE}"/></pattern></defs>"#,
        num.f(frame.units(0.475)),
        num.f(frame.units(0.25))
    );

    // Regions with outlines.
    let stroke = num.f(frame.units(options.outline_mm));
    let _ = writeln!(
        out,
        r#"<g id="regions" stroke="{OUTLINE}" stroke-width="{stroke}" stroke-linejoin="round">"#
    );
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

    // Regions without outlines (sketches): their borders as lines, then markers on top.
    let sketched: Vec<RegionId> = doc
        .regions()
        .iter()
        .filter(|(_, r)| r.geometry.is_none())
        .map(|(id, _)| *id)
        .collect();
    if !sketched.is_empty() {
        let _ = writeln!(
            out,
            r#"<g id="links" stroke="{OUTLINE}" stroke-width="{stroke}" fill="none">"#
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
            r#"<g id="markers" stroke="{OUTLINE}" stroke-width="{stroke}">"#
        );
        let r = num.f(frame.units(MARKER_RADIUS_MM));
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

    let size = frame.units(options.label_size_mm);
    let text_style = format!(
        r#"font-family="sans-serif" font-size="{}" fill="{LABEL_INK}""#,
        num.f(size)
    );
    if options.labels {
        // A white halo under each label keeps it legible on any fill and across outlines.
        let _ = writeln!(
            out,
            r##"<g id="labels" {text_style} text-anchor="middle" stroke="#ffffff" stroke-width="{}" stroke-linejoin="round" paint-order="stroke">"##,
            num.f(frame.units(0.5))
        );
        for region in doc.regions().values() {
            let (point, lift) = match region.geometry.as_ref().and_then(|g| g.label_point()) {
                Some(p) => (p, 0.0),
                None => (region.anchor, frame.units(MARKER_RADIUS_MM + 1.0)),
            };
            let [x, y] = frame.to_svg(point);
            // Centre the text vertically on the point: the baseline sits about 0.35 em below.
            let baseline = y - lift + if lift > 0.0 { 0.0 } else { 0.35 * size };
            let _ = writeln!(
                out,
                r#"<text x="{}" y="{}">{}</text>"#,
                num.f(x),
                num.f(baseline),
                escape(&region.name)
            );
        }
        let _ = writeln!(out, "</g>");
    }

    if options.legend {
        let entries = legend_entries(doc);
        if !entries.is_empty() {
            let _ = writeln!(out, r#"<g id="legend" {text_style}>"#);
            let rows = entries.len().div_ceil(frame.legend_columns);
            let swatch = frame.units(4.0);
            for (k, (slot, count)) in entries.iter().enumerate() {
                let (col, row) = (k / rows, k % rows);
                let x = frame.units(MARGIN_MM + col as f64 * LEGEND_COLUMN_MM);
                let y = frame.legend_top + frame.units(row as f64 * LEGEND_ROW_MM);
                let (name, fill) = match doc.palette().slots.get(*slot as usize) {
                    Some(s) => (s.name.clone(), s.colour.to_hex()),
                    None => (
                        format!("Slot {} (not in palette)", slot + 1),
                        UNCOLOURED_FILL.into(),
                    ),
                };
                let noun = if *count == 1 { "region" } else { "regions" };
                let _ = writeln!(
                    out,
                    r#"<rect x="{}" y="{}" width="{s}" height="{s}" fill="{fill}" stroke="{OUTLINE}" stroke-width="{stroke}"/>"#,
                    num.f(x),
                    num.f(y),
                    s = num.f(swatch)
                );
                let _ = writeln!(
                    out,
                    r#"<text x="{}" y="{}">{} · {count} {noun}</text>"#,
                    num.f(x + swatch + frame.units(2.0)),
                    num.f(y + swatch * 0.5 + 0.35 * size),
                    escape(&name)
                );
            }
            let _ = writeln!(out, "</g>");
        }
    }
    let _ = writeln!(out, "</svg>");
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

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
}

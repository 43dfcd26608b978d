//! PDF export: the SVG export converted by svg2pdf (pure Rust, vector, no rasterising) and placed
//! on a sheet of paper of a chosen size, so the PDF, the SVG and the PNG always agree.
//!
//! The drawing (title, map, scale bar, source line, legend) is made as large as fits inside the
//! margins: its width is found so that its height, which follows from the map's shape and the
//! rows under it, fits too. It is centred on the page, at print size (a millimetre in the SVG is
//! a millimetre on paper, so names keep their sizes). Paper is portrait or landscape, whichever
//! gives the larger map, unless the caller says. Labels use the same embedded font as the PNG
//! ([`super::png::font_database`]); svg2pdf embeds the subset of it that the page uses and keeps
//! text as text, so it can be searched and copied.

use std::sync::Arc;

use pdf_writer::{Content, Finish, Name, Pdf, Rect, Ref, TextStr};
use svg2pdf::usvg;

use crate::doc::Document;

use super::ExportError;
use super::labels::LabelReport;
use super::svg::{self, MapFrame, SvgOptions, render_with};

/// Points (PDF's unit, 1/72 inch) per millimetre: an inch is 25.4 mm exactly.
pub const PT_PER_MM: f64 = 72.0 / 25.4;

/// The smallest and largest side of a custom page, in millimetres. The largest keeps within the
/// 14,400 units a side that the PDF reference gives as the page size limit of Acrobat (PDF 1.7,
/// Annex C; from memory): 200 inches, 5,080 mm.
pub const MIN_SIDE_MM: f64 = 20.0;
pub const MAX_SIDE_MM: f64 = 5000.0;

/// A sheet of paper.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum PageSize {
    /// ISO 216 A4, 210 × 297 mm.
    A4,
    /// ISO 216 A3, 297 × 420 mm.
    A3,
    /// ANSI Letter, 8.5 × 11 inches (215.9 × 279.4 mm).
    Letter,
    /// Any other sheet, in millimetres (either side may be the longer one).
    Custom { width_mm: f64, height_mm: f64 },
}

impl PageSize {
    /// The named sizes, for menus.
    pub const NAMED: [PageSize; 3] = [PageSize::A4, PageSize::A3, PageSize::Letter];

    /// The sides in millimetres as given (portrait for the named sizes).
    pub fn sides_mm(self) -> [f64; 2] {
        match self {
            PageSize::A4 => [210.0, 297.0],
            PageSize::A3 => [297.0, 420.0],
            PageSize::Letter => [215.9, 279.4],
            PageSize::Custom {
                width_mm,
                height_mm,
            } => [width_mm, height_mm],
        }
    }

    /// The sides in millimetres in an orientation: portrait is taller than wide.
    pub fn oriented_mm(self, orientation: Orientation) -> [f64; 2] {
        let [a, b] = self.sides_mm();
        let (short, long) = (a.min(b), a.max(b));
        match orientation {
            Orientation::Portrait => [short, long],
            Orientation::Landscape => [long, short],
        }
    }

    /// A name for people: "A4", "Letter", "200 × 300 mm".
    pub fn name(self) -> String {
        match self {
            PageSize::A4 => "A4".into(),
            PageSize::A3 => "A3".into(),
            PageSize::Letter => "Letter".into(),
            PageSize::Custom {
                width_mm,
                height_mm,
            } => format!("{width_mm} × {height_mm} mm"),
        }
    }

    /// Reads `a4`, `a3`, `letter` (any case) or `WIDTHxHEIGHT` in millimetres (`200x300`; `×`
    /// and `*` work too, and an `mm` after either number is allowed).
    pub fn parse(text: &str) -> Result<PageSize, ExportError> {
        let t = text.trim().to_lowercase();
        let named = match t.as_str() {
            "a4" => Some(PageSize::A4),
            "a3" => Some(PageSize::A3),
            "letter" | "us-letter" | "usletter" => Some(PageSize::Letter),
            _ => None,
        };
        if let Some(page) = named {
            return Ok(page);
        }
        let unknown = || {
            ExportError::BadOption(format!(
                "unknown page size \"{}\": use a4, a3, letter, or a width and height in \
                 millimetres such as 200x300",
                text.trim()
            ))
        };
        let mut parts = t.splitn(2, ['x', '×', '*']);
        let (Some(w), Some(h)) = (parts.next(), parts.next()) else {
            return Err(unknown());
        };
        let number = |s: &str| {
            s.trim()
                .trim_end_matches("mm")
                .trim()
                .parse::<f64>()
                .map_err(|_| unknown())
        };
        let page = PageSize::Custom {
            width_mm: number(w)?,
            height_mm: number(h)?,
        };
        page.check()?;
        Ok(page)
    }

    fn check(self) -> Result<(), ExportError> {
        let [w, h] = self.sides_mm();
        for side in [w, h] {
            if !(side.is_finite() && (MIN_SIDE_MM..=MAX_SIDE_MM).contains(&side)) {
                return Err(ExportError::BadOption(format!(
                    "a page side must be between {MIN_SIDE_MM} and {MAX_SIDE_MM} mm, not {side}"
                )));
            }
        }
        Ok(())
    }
}

/// Which way up the paper is.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Orientation {
    /// Taller than wide.
    Portrait,
    /// Wider than tall.
    Landscape,
}

/// The paper and the margins of a PDF.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PdfOptions {
    pub page: PageSize,
    /// Portrait or landscape; `None` for whichever gives the larger map.
    pub orientation: Option<Orientation>,
    /// The white space between the paper's edge and the drawing, on every side, in millimetres.
    pub margin_mm: f64,
}

impl Default for PdfOptions {
    fn default() -> PdfOptions {
        PdfOptions {
            page: PageSize::A4,
            orientation: None,
            margin_mm: 15.0,
        }
    }
}

/// Where the drawing goes on the paper.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PdfLayout {
    /// The paper in millimetres, width and height, as oriented.
    pub paper_mm: [f64; 2],
    pub orientation: Orientation,
    /// The SVG's page width (its `width_mm`), which makes the drawing fill the space inside the
    /// margins.
    pub svg_width_mm: f64,
    /// The SVG page's size in millimetres.
    pub svg_mm: [f64; 2],
    /// The SVG page's top-left corner on the paper, in millimetres from the paper's top-left.
    pub svg_origin_mm: [f64; 2],
}

impl PdfLayout {
    /// The drawing's box on the paper (the SVG page less its own white margin), top-left and
    /// bottom-right in millimetres from the paper's top-left.
    pub fn drawing_box_mm(&self) -> [[f64; 2]; 2] {
        let m = svg::MARGIN_MM;
        let [x, y] = self.svg_origin_mm;
        [
            [x + m, y + m],
            [x + self.svg_mm[0] - m, y + self.svg_mm[1] - m],
        ]
    }
}

/// How big the drawing can be on `paper_mm` inside `margin_mm`: the SVG width and page size.
fn fit(
    doc: &Document,
    options: &SvgOptions,
    paper_mm: [f64; 2],
    margin_mm: f64,
) -> Result<(f64, [f64; 2]), ExportError> {
    let m = svg::MARGIN_MM;
    let room = [paper_mm[0] - 2.0 * margin_mm, paper_mm[1] - 2.0 * margin_mm];
    // The SVG refuses pages under 20 mm wide; with its own margin that is 8 mm of drawing.
    let min_width = 20.0;
    if room[0] + 2.0 * m < min_width || room[1] <= 0.0 {
        return Err(ExportError::BadOption(format!(
            "margins of {margin_mm} mm leave no room for the map on a {} × {} mm page",
            paper_mm[0], paper_mm[1]
        )));
    }
    // Laid out as the SVG lays it out: far parts in insets when asked (the arrangement does not
    // depend on the width).
    let arranged = if options.insets {
        super::insets::arrange(doc)
    } else {
        None
    };
    let (doc, bounds) = match &arranged {
        Some(a) => (&a.doc, a.extent()),
        None => (doc, None),
    };
    let frame = |width_mm: f64| {
        MapFrame::new(
            doc,
            &SvgOptions {
                width_mm,
                ..options.clone()
            },
            bounds,
        )
        .ok_or(ExportError::EmptyMap)
    };
    // The drawing's height is the map's (in proportion to the width) plus rows for the title,
    // the scale bar, the source line and the legend; the legend has fewer rows on a wider page.
    // Start as wide as the room allows and narrow the page until the height fits: each step
    // solves for the width at which the map takes the height the other rows leave, and the
    // widths only shrink, so the rows only grow and it settles within a few steps.
    let mut width = room[0] + 2.0 * m;
    for _ in 0..32 {
        let f = frame(width)?;
        let drawing_height = f.page_mm[1] - 2.0 * m;
        if drawing_height <= room[1] + 1e-9 {
            return Ok((width, f.page_mm));
        }
        let others = drawing_height - f.map_mm[1];
        let per_width = f.map_mm[1] / f.map_mm[0];
        if others >= room[1] || per_width <= 0.0 {
            break;
        }
        let next = 2.0 * m + (room[1] - others) / per_width;
        if next < min_width {
            break;
        }
        // Never widen: a narrower page can only add legend rows.
        width = next.min(width - 1e-9);
    }
    Err(ExportError::BadOption(format!(
        "margins of {margin_mm} mm leave too little room on a {} × {} mm page for the map with \
         its title, scale bar, source line and legend",
        paper_mm[0], paper_mm[1]
    )))
}

/// Chooses the orientation (unless given) and the drawing's size and place on the paper.
pub fn layout(
    doc: &Document,
    options: &SvgOptions,
    pdf: &PdfOptions,
) -> Result<PdfLayout, ExportError> {
    pdf.page.check()?;
    if !(pdf.margin_mm.is_finite() && pdf.margin_mm >= 0.0) {
        return Err(ExportError::BadOption(format!(
            "the margin must be zero or a positive number of millimetres, not {}",
            pdf.margin_mm
        )));
    }
    if doc.bounds().is_none() {
        return Err(ExportError::EmptyMap);
    }
    let orientations = match pdf.orientation {
        Some(o) => vec![o],
        None => vec![Orientation::Portrait, Orientation::Landscape],
    };
    let mut best: Option<(Orientation, [f64; 2], f64, [f64; 2])> = None;
    let mut first_error = None;
    for orientation in orientations {
        let paper_mm = pdf.page.oriented_mm(orientation);
        match fit(doc, options, paper_mm, pdf.margin_mm) {
            // The wider drawing has the larger map: the map's scale is in proportion to it.
            // On a tie (a square sheet) the first, portrait, stays.
            Ok((width, svg_mm)) => {
                if best.is_none_or(|(_, _, w, _)| width > w + 1e-9) {
                    best = Some((orientation, paper_mm, width, svg_mm));
                }
            }
            Err(e) => {
                first_error.get_or_insert(e);
            }
        }
    }
    let Some((orientation, paper_mm, svg_width_mm, svg_mm)) = best else {
        return Err(first_error.unwrap_or(ExportError::EmptyMap));
    };
    Ok(PdfLayout {
        paper_mm,
        orientation,
        svg_width_mm,
        svg_mm,
        svg_origin_mm: [
            (paper_mm[0] - svg_mm[0]) / 2.0,
            (paper_mm[1] - svg_mm[1]) / 2.0,
        ],
    })
}

/// The map as PDF bytes: [`super::svg::to_svg`] with `options` (its `width_mm` is replaced by
/// the width that fills the page), on the paper of `pdf`.
pub fn to_pdf(
    doc: &Document,
    options: &SvgOptions,
    pdf: &PdfOptions,
) -> Result<Vec<u8>, ExportError> {
    to_pdf_with_report(doc, options, pdf).map(|(bytes, _)| bytes)
}

/// [`to_pdf`], with what label placement did.
pub fn to_pdf_with_report(
    doc: &Document,
    options: &SvgOptions,
    pdf: &PdfOptions,
) -> Result<(Vec<u8>, LabelReport), ExportError> {
    let placed = layout(doc, options, pdf)?;
    let options = SvgOptions {
        width_mm: placed.svg_width_mm,
        ..options.clone()
    };
    // Ubuntu Light has no italic face: slant water names with a skew, as the PNG does.
    let made = render_with(doc, &options, true)?;
    let title = svg::nonempty(&options.title).unwrap_or(doc.title());
    let bytes = svg_on_paper(&made.svg, &placed, title)?;
    Ok((bytes, made.labels))
}

/// Converts the SVG with svg2pdf into a form and draws it on one page of the layout's paper.
fn svg_on_paper(svg_text: &str, placed: &PdfLayout, title: &str) -> Result<Vec<u8>, ExportError> {
    let usvg_options = usvg::Options {
        fontdb: Arc::new(super::png::font_database()),
        ..Default::default()
    };
    let tree = usvg::Tree::from_str(svg_text, &usvg_options)
        .map_err(|e| ExportError::Render(e.to_string()))?;
    // Text stays text (embedded as a font subset); content streams are compressed.
    let conversion = svg2pdf::ConversionOptions {
        embed_text: true,
        compress: true,
        ..Default::default()
    };
    let (chunk, form) =
        svg2pdf::to_chunk(&tree, conversion).map_err(|e| ExportError::Render(e.to_string()))?;

    // Our own objects first, then the converted drawing renumbered after them.
    let mut next = Ref::new(1);
    let catalog = next.bump();
    let pages = next.bump();
    let page = next.bump();
    let content_id = next.bump();
    let info = next.bump();
    let mut renumbered = std::collections::HashMap::new();
    let chunk = chunk.renumber(|old| *renumbered.entry(old).or_insert_with(|| next.bump()));
    let form = renumbered.get(&form).copied().ok_or_else(|| {
        ExportError::Render("the converted drawing lost its form object".to_string())
    })?;

    // The form is one unit square; it is stretched to the SVG's size, in points. Its size is
    // the one usvg read (CSS pixels, 96 to the inch), which is the SVG's millimetres rounded to
    // hundredths, so nothing is distorted.
    let size = tree.size();
    let svg_pt = [
        f64::from(size.width()) * 72.0 / 96.0,
        f64::from(size.height()) * 72.0 / 96.0,
    ];
    let paper_pt = [
        placed.paper_mm[0] * PT_PER_MM,
        placed.paper_mm[1] * PT_PER_MM,
    ];
    // Centred on the paper; PDF's y axis grows upwards from the bottom edge.
    let left_pt = (paper_pt[0] - svg_pt[0]) / 2.0;
    let bottom_pt = (paper_pt[1] - svg_pt[1]) / 2.0;

    let drawing = Name(b"Map");
    let mut content = Content::new();
    content.save_state();
    content.transform([
        svg_pt[0] as f32,
        0.0,
        0.0,
        svg_pt[1] as f32,
        left_pt as f32,
        bottom_pt as f32,
    ]);
    content.x_object(drawing);
    content.restore_state();
    let content = content.finish();

    let mut out = Pdf::new();
    out.catalog(catalog).pages(pages);
    out.pages(pages).kids([page]).count(1);
    let mut p = out.page(page);
    p.media_box(Rect::new(0.0, 0.0, paper_pt[0] as f32, paper_pt[1] as f32));
    p.parent(pages);
    p.contents(content_id);
    p.resources().x_objects().pair(drawing, form);
    p.finish();
    out.stream(content_id, &content);
    out.document_info(info)
        .title(TextStr(title))
        .producer(TextStr("Tinct"));
    out.extend(&chunk);
    Ok(out.finish())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn page_names_and_sizes_parse_or_say_what_is_wrong() {
        // ISO 216 (A series) and ANSI/ASME Y14.1 (Letter, 8.5 × 11 in).
        assert_eq!(PageSize::parse("A4").unwrap().sides_mm(), [210.0, 297.0]);
        assert_eq!(PageSize::parse(" a3 ").unwrap().sides_mm(), [297.0, 420.0]);
        let [w, h] = PageSize::parse("Letter").unwrap().sides_mm();
        assert!((w - 8.5 * 25.4).abs() < 1e-9 && (h - 11.0 * 25.4).abs() < 1e-9);
        assert_eq!(
            PageSize::parse("200x300").unwrap(),
            PageSize::Custom {
                width_mm: 200.0,
                height_mm: 300.0
            }
        );
        assert_eq!(
            PageSize::parse("420mm × 297mm").unwrap().sides_mm(),
            [420.0, 297.0]
        );
        let unknown = PageSize::parse("b5").unwrap_err().to_string();
        assert!(unknown.contains("unknown page size \"b5\""), "{unknown}");
        assert!(PageSize::parse("200x").is_err());
        let tiny = PageSize::parse("5x300").unwrap_err().to_string();
        assert!(tiny.contains("between 20 and 5000 mm"), "{tiny}");
    }

    #[test]
    fn orientation_puts_the_long_side_where_it_says() {
        assert_eq!(
            PageSize::A4.oriented_mm(Orientation::Landscape),
            [297.0, 210.0]
        );
        let custom = PageSize::Custom {
            width_mm: 300.0,
            height_mm: 200.0,
        };
        assert_eq!(custom.oriented_mm(Orientation::Portrait), [200.0, 300.0]);
    }
}

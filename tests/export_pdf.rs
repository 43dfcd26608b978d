//! PDF export, read back by readers Tinct does not use to write it: lopdf (a Rust PDF library,
//! a dev-dependency) checks the page count, the paper size, the embedded fonts and the text;
//! Poppler's `pdfinfo`, `pdffonts` and `pdftotext` (the reference readers behind many Linux PDF
//! viewers) check the same from outside. CI installs Poppler (Debian `poppler-utils`) and sets
//! `TINCT_REQUIRE_POPPLER=1`, so there its half cannot be skipped; elsewhere it runs when the
//! tools are on the path.
//!
//! Paper sizes: ISO 216 (A4 210 × 297 mm, A3 297 × 420 mm) and ANSI/ASME Y14.1 (Letter, 8.5 × 11
//! inches), in PDF points of 1/72 inch (ISO 32000-1, 8.3.2.3: default user space unit).
//! Maps: the invented sample maps and the 14 US states of tests/data/geo (US Census Bureau via
//! npm us-atlas 3.0.1; see PROVENANCE.md).

use std::collections::BTreeMap;
use std::path::Path;
use std::process::Command;

use lopdf::{Dictionary, Object, ObjectId};
use tinct::doc::Document;
use tinct::export::pdf::{self, Orientation, PageSize, PdfOptions};
use tinct::export::{ExportError, SvgOptions};
use tinct::geo::{self, ImportOptions};

use super::support::{greedy_colour, root, stderr, tinct_path};

fn sample(name: &str) -> Document {
    let path = root().join("sample-maps").join(format!("{name}.tinct"));
    let mut doc = tinct::doc::file::load(&path).expect("sample project loads");
    greedy_colour(&mut doc);
    doc
}

fn states() -> Document {
    let path = root().join("tests/data/geo/us_states_subset.geojson");
    let map = geo::import_path(&path, &ImportOptions::default()).unwrap();
    let mut doc = map.into_document("states");
    greedy_colour(&mut doc);
    doc
}

/// Everything on: the page a cartographer would print.
fn full_options(title: &str) -> SvgOptions {
    SvgOptions {
        labels: true,
        legend: true,
        legend_heading: "Colours".into(),
        title: Some(title.into()),
        source: Some("invented for Tinct's tests".into()),
        scale_bar: true,
        ..SvgOptions::default()
    }
}

fn paper(page: PageSize, orientation: Option<Orientation>) -> PdfOptions {
    PdfOptions {
        page,
        orientation,
        ..PdfOptions::default()
    }
}

/// The one page of a PDF, read by lopdf; fails unless there is exactly one.
fn only_page(bytes: &[u8]) -> (lopdf::Document, ObjectId) {
    assert!(
        bytes.starts_with(b"%PDF-"),
        "PDF header (ISO 32000-1, 7.5.2)"
    );
    let doc = lopdf::Document::load_mem(bytes).expect("lopdf reads the PDF");
    let pages = doc.get_pages();
    assert_eq!(pages.len(), 1, "one page");
    let id = pages[&1];
    (doc, id)
}

fn numbers(object: &Object) -> Vec<f64> {
    object
        .as_array()
        .expect("an array")
        .iter()
        .map(|n| f64::from(n.as_float().expect("a number")))
        .collect()
}

/// The page's MediaBox as width and height in points.
fn media_box(doc: &lopdf::Document, page: ObjectId) -> [f64; 2] {
    let b = numbers(
        doc.get_dictionary(page)
            .unwrap()
            .get(b"MediaBox")
            .expect("the page has a MediaBox"),
    );
    assert_eq!(b.len(), 4);
    [b[2] - b[0], b[3] - b[1]]
}

fn assert_size(found: [f64; 2], expected: [f64; 2], what: &str) {
    assert!(
        (found[0] - expected[0]).abs() < 0.01 && (found[1] - expected[1]).abs() < 0.01,
        "{what}: the page is {found:?} points, not {expected:?}"
    );
}

fn dict<'a>(doc: &'a lopdf::Document, object: &'a Object) -> &'a Dictionary {
    doc.dereference(object)
        .and_then(|(_, o)| o.as_dict())
        .expect("a dictionary")
}

/// The text drawn on a page and in the forms it draws (to any depth), decoded through each
/// font's encoding and ToUnicode map by lopdf. Pieces shown apart are joined by spaces.
fn page_text(doc: &lopdf::Document, page: ObjectId) -> String {
    let content = doc.get_page_content(page);
    let resources = doc
        .get_dictionary(page)
        .unwrap()
        .get(b"Resources")
        .map(|r| dict(doc, r).clone())
        .unwrap_or_default();
    let mut out = String::new();
    stream_text(doc, &content, &resources, &mut out, 0);
    out
}

fn stream_text(
    doc: &lopdf::Document,
    content: &[u8],
    resources: &Dictionary,
    out: &mut String,
    depth: usize,
) {
    assert!(depth < 16, "forms nested too deep");
    let fonts = resources.get(b"Font").ok().map(|f| dict(doc, f).clone());
    let forms = resources.get(b"XObject").ok().map(|x| dict(doc, x).clone());
    let operations = lopdf::content::Content::decode(content)
        .expect("the content stream parses")
        .operations;
    let mut encoding = None;
    for op in operations {
        match op.operator.as_str() {
            "Tf" => {
                let name = op.operands[0].as_name().unwrap();
                let font = fonts
                    .as_ref()
                    .and_then(|f| f.get(name).ok())
                    .map(|f| dict(doc, f))
                    .expect("the font is in the resources");
                encoding = Some(font.get_font_encoding(doc).expect("a known encoding"));
            }
            "Tj" | "TJ" => {
                let encoding = encoding.as_ref().expect("a font before text");
                let mut strings = Vec::new();
                for operand in &op.operands {
                    match operand {
                        Object::String(bytes, _) => strings.push(bytes.clone()),
                        Object::Array(items) => strings.extend(
                            items
                                .iter()
                                .filter_map(|i| i.as_str().ok().map(<[u8]>::to_vec)),
                        ),
                        _ => {}
                    }
                }
                for bytes in strings {
                    out.push_str(&lopdf::Document::decode_text(encoding, &bytes).unwrap());
                }
                out.push(' ');
            }
            "Do" => {
                let name = op.operands[0].as_name().unwrap();
                let Some(Ok(object)) = forms.as_ref().map(|f| f.get(name)) else {
                    panic!("the drawn object is in the resources");
                };
                let stream = doc
                    .dereference(object)
                    .and_then(|(_, o)| o.as_stream())
                    .expect("a form is a stream");
                let inner = stream
                    .dict
                    .get(b"Resources")
                    .map(|r| dict(doc, r).clone())
                    .unwrap_or_default();
                let bytes = stream
                    .decompressed_content()
                    .unwrap_or_else(|_| stream.content.clone());
                stream_text(doc, &bytes, &inner, out, depth + 1);
            }
            _ => {}
        }
    }
}

/// Every font dictionary in the file, with its own FontDescriptor or, for a composite (Type0)
/// font, its descendant's.
fn font_descriptors(doc: &lopdf::Document) -> Vec<(String, Dictionary)> {
    let mut found = Vec::new();
    for object in doc.objects.values() {
        let Ok(d) = object.as_dict() else { continue };
        if d.get(b"Type").and_then(Object::as_name).ok() != Some(b"Font".as_slice()) {
            continue;
        }
        let subtype = d.get(b"Subtype").and_then(Object::as_name).unwrap();
        if subtype == b"Type0" {
            // Its descendant CIDFont is a font dictionary of its own and is checked as one.
            continue;
        }
        let name = String::from_utf8_lossy(d.get(b"BaseFont").unwrap().as_name().unwrap());
        let descriptor = d
            .get(b"FontDescriptor")
            .map(|fd| dict(doc, fd).clone())
            .unwrap_or_else(|_| panic!("font {name} has no FontDescriptor"));
        found.push((name.into_owned(), descriptor));
    }
    found
}

/// An object written out with every dictionary's keys sorted and streams decompressed, so two
/// files can be compared whatever order their dictionaries list keys in.
fn canonical(object: &Object) -> String {
    fn dictionary(d: &Dictionary) -> String {
        let mut entries: Vec<String> = d
            .iter()
            .map(|(k, v)| format!("/{} {}", String::from_utf8_lossy(k), canonical(v)))
            .collect();
        entries.sort();
        format!("<<{}>>", entries.join(" "))
    }
    match object {
        Object::Dictionary(d) => dictionary(d),
        Object::Array(items) => format!(
            "[{}]",
            items.iter().map(canonical).collect::<Vec<_>>().join(" ")
        ),
        Object::Stream(s) => {
            let bytes = s
                .decompressed_content()
                .unwrap_or_else(|_| s.content.clone());
            format!("{} stream {bytes:?}", dictionary(&s.dict))
        }
        other => format!("{other:?}"),
    }
}

/// The transformation the page's content applies before drawing the map (`a 0 0 d e f cm`).
fn placement(doc: &lopdf::Document, page: ObjectId) -> [f64; 6] {
    let content = lopdf::content::Content::decode(&doc.get_page_content(page)).unwrap();
    let cm = content
        .operations
        .iter()
        .find(|op| op.operator == "cm")
        .expect("the page places its drawing with cm");
    let v: Vec<f64> = cm
        .operands
        .iter()
        .map(|n| f64::from(n.as_float().unwrap()))
        .collect();
    [v[0], v[1], v[2], v[3], v[4], v[5]]
}

const A4_PT: [f64; 2] = [595.276, 841.890];
const A3_PT: [f64; 2] = [841.890, 1190.551];
const LETTER_PT: [f64; 2] = [612.0, 792.0];

#[test]
fn pdf_pages_have_the_paper_sizes_of_iso_216_and_ansi_letter() {
    let doc = sample("vessland-province");
    let options = SvgOptions::default();
    for (page, orientation, expected) in [
        (PageSize::A4, Orientation::Portrait, A4_PT),
        (PageSize::A4, Orientation::Landscape, [A4_PT[1], A4_PT[0]]),
        (PageSize::A3, Orientation::Portrait, A3_PT),
        (PageSize::A3, Orientation::Landscape, [A3_PT[1], A3_PT[0]]),
        (PageSize::Letter, Orientation::Portrait, LETTER_PT),
        (
            PageSize::Letter,
            Orientation::Landscape,
            [LETTER_PT[1], LETTER_PT[0]],
        ),
        // 500 × 700 mm: 1417.323 × 1984.252 points (1 in = 25.4 mm = 72 pt).
        (
            PageSize::Custom {
                width_mm: 500.0,
                height_mm: 700.0,
            },
            Orientation::Portrait,
            [1417.323, 1984.252],
        ),
    ] {
        let bytes = pdf::to_pdf(&doc, &options, &paper(page, Some(orientation))).unwrap();
        let (pdf, id) = only_page(&bytes);
        assert_size(
            media_box(&pdf, id),
            expected,
            &format!("{} {orientation:?}", page.name()),
        );
    }
}

#[test]
fn pdf_drawing_fills_the_room_inside_the_margins_and_is_centred() {
    // Geometry checked on the PDF itself: the cm operator scales the drawing (an SVG page with
    // its own 6 mm white margin) to its size in points and moves it to its place.
    let mm = 72.0 / 25.4;
    for doc in [
        sample("vessland-province"),
        sample("three-valleys"),
        sample("exclave-coast"),
        states(),
    ] {
        for (options, margin_mm) in [
            (SvgOptions::default(), 15.0),
            (full_options("Fit check"), 15.0),
            (full_options("Fit check"), 0.0),
            (full_options("Fit check"), 40.0),
        ] {
            for page in [PageSize::A4, PageSize::Letter] {
                let pdf_options = PdfOptions {
                    page,
                    orientation: None,
                    margin_mm,
                };
                let bytes = pdf::to_pdf(&doc, &options, &pdf_options).unwrap();
                let (pdf, id) = only_page(&bytes);
                let [w, h] = media_box(&pdf, id);
                let [a, b, c, d, e, f] = placement(&pdf, id);
                assert_eq!([b, c], [0.0, 0.0], "no rotation or skew");
                // The drawing inside the SVG's own margin, in points.
                let inner = 6.0 * mm;
                let (left, right) = (e + inner, w - (e + a - inner));
                let (bottom, top) = (f + inner, h - (f + d - inner));
                let what = format!(
                    "{} margin {margin_mm}: {left} {right} {top} {bottom}",
                    page.name()
                );
                assert!((left - right).abs() < 0.05, "centred across: {what}");
                assert!((top - bottom).abs() < 0.05, "centred up and down: {what}");
                let margin = margin_mm * mm;
                assert!(
                    left >= margin - 0.05 && top >= margin - 0.05,
                    "inside the margins: {what}"
                );
                // One pair of margins is exactly the one asked for: nothing larger fits.
                assert!(
                    (left - margin).abs() < 0.05 || (top - margin).abs() < 0.05,
                    "fills the room: {what}"
                );
            }
        }
    }
}

/// Two regions side by side (lon/lat, a few degrees from the equator, so the projection keeps
/// the shape), `columns` squares wide and `rows` tall. Invented.
fn rectangle_map(dir: &Path, columns: u32, rows: u32) -> Document {
    let square = |x: u32, y: u32, name: &str| {
        let (x0, y0) = (f64::from(x), f64::from(y));
        format!(
            r#"{{"type":"Feature","properties":{{"name":"{name}"}},"geometry":{{"type":"Polygon","coordinates":[[[{x0},{y0}],[{},{y0}],[{},{}],[{x0},{}],[{x0},{y0}]]]}}}}"#,
            x0 + 1.0,
            x0 + 1.0,
            y0 + 1.0,
            y0 + 1.0
        )
    };
    let mut features = Vec::new();
    for x in 0..columns {
        for y in 0..rows {
            features.push(square(x, y, &format!("Plot {x}-{y}")));
        }
    }
    let path = dir.join(format!("rect-{columns}x{rows}.geojson"));
    std::fs::write(
        &path,
        format!(
            r#"{{"type":"FeatureCollection","features":[{}]}}"#,
            features.join(",")
        ),
    )
    .unwrap();
    let mut doc = geo::import_path(&path, &ImportOptions::default())
        .unwrap()
        .into_document("plots");
    greedy_colour(&mut doc);
    doc
}

#[test]
fn pdf_paper_turns_to_give_the_larger_map_unless_told() {
    let dir = tempfile::tempdir().unwrap();
    let wide = rectangle_map(dir.path(), 4, 1);
    let tall = rectangle_map(dir.path(), 1, 4);
    let options = SvgOptions::default();
    let best = |doc: &Document| pdf::layout(doc, &options, &PdfOptions::default()).unwrap();
    assert_eq!(best(&wide).orientation, Orientation::Landscape);
    assert_eq!(best(&tall).orientation, Orientation::Portrait);
    // Told: the paper stays as told, and the map is smaller than on the better side.
    let told = pdf::layout(
        &wide,
        &options,
        &paper(PageSize::A4, Some(Orientation::Portrait)),
    )
    .unwrap();
    assert_eq!(told.paper_mm, [210.0, 297.0]);
    assert!(told.svg_width_mm < best(&wide).svg_width_mm);
    // On the real maps too, the chosen side's map is at least as large as the other's.
    for doc in [sample("vessland-province"), states()] {
        let chosen = best(&doc);
        for o in [Orientation::Portrait, Orientation::Landscape] {
            let fixed = pdf::layout(&doc, &options, &paper(PageSize::A4, Some(o))).unwrap();
            assert!(chosen.svg_width_mm >= fixed.svg_width_mm - 1e-9);
        }
    }
    // The PDF's page agrees with the layout: a landscape A4.
    let bytes = pdf::to_pdf(&wide, &options, &PdfOptions::default()).unwrap();
    let (pdf, id) = only_page(&bytes);
    assert_size(media_box(&pdf, id), [A4_PT[1], A4_PT[0]], "wide map");
}

#[test]
fn pdf_fonts_are_embedded_and_text_stays_text() {
    let doc = sample("vessland-province");
    let title = "Vessland Province: Kärrvik & Östmoor";
    let options = full_options(title);
    let (bytes, report) = pdf::to_pdf_with_report(&doc, &options, &PdfOptions::default()).unwrap();
    let (pdf, id) = only_page(&bytes);
    // ISO 32000-1, 9.8 and 9.9: an embedded TrueType font program is FontFile2, a CFF or
    // OpenType one FontFile3; a subset's BaseFont starts with six capitals and a plus (9.6.4).
    let fonts = font_descriptors(&pdf);
    assert!(!fonts.is_empty(), "labels need a font");
    for (name, descriptor) in &fonts {
        assert!(
            descriptor.has(b"FontFile2") || descriptor.has(b"FontFile3"),
            "{name} is not embedded"
        );
        let (tag, rest) = name.split_at(7.min(name.len()));
        assert!(
            tag.len() == 7
                && tag.ends_with('+')
                && tag[..6].chars().all(|c| c.is_ascii_uppercase())
                && !rest.is_empty(),
            "{name} is not named as a subset"
        );
    }
    // The text, decoded through the fonts' ToUnicode maps: the title, the source line, the
    // legend's heading and every region name that was placed.
    let text = page_text(&pdf, id);
    let squeezed: String = text.split_whitespace().collect();
    let squeeze = |s: &str| s.split_whitespace().collect::<String>();
    for wanted in [title, "Source: invented for Tinct's tests", "Colours"] {
        assert!(
            squeezed.contains(&squeeze(wanted)),
            "{wanted:?} not in {text:?}"
        );
    }
    assert!(report.inside + report.with_leader > 0, "names were placed");
    let mut placed = 0;
    for region in doc.regions().values() {
        if region.name.trim().is_empty() || report.left_out.contains(&region.name) {
            continue;
        }
        placed += 1;
        assert!(
            squeezed.contains(&squeeze(&region.name)),
            "{:?} not in {text:?}",
            region.name
        );
    }
    assert_eq!(
        placed,
        report.inside + report.with_leader + report.beside_marker
    );
    // Without labels, no region name is drawn (the text is the labels, not a side effect).
    let plain = pdf::to_pdf(&doc, &SvgOptions::default(), &PdfOptions::default()).unwrap();
    let (pdf, id) = only_page(&plain);
    assert_eq!(page_text(&pdf, id).trim(), "");
}

#[test]
fn pdf_of_real_boundaries_keeps_names_title_and_scale_bar() {
    let doc = states();
    let options = full_options("Fourteen states");
    let (bytes, report) = pdf::to_pdf_with_report(&doc, &options, &PdfOptions::default()).unwrap();
    let (pdf, id) = only_page(&bytes);
    let text: String = page_text(&pdf, id).split_whitespace().collect();
    assert!(text.contains("Fourteenstates"), "{text}");
    // The scale bar's ends: "0" and a round length in kilometres.
    assert!(text.contains("km"), "{text}");
    // US Census state names (PROVENANCE.md); at A4 most of them fit.
    assert!(report.inside > 0);
    for region in doc.regions().values() {
        if !report.left_out.contains(&region.name) {
            let name: String = region.name.split_whitespace().collect();
            assert!(text.contains(&name), "{} not in {text}", region.name);
        }
    }
}

#[test]
fn pdf_of_the_same_map_has_the_same_objects() {
    // svg2pdf keeps some resources in a hash map, so the order of keys in one resource
    // dictionary can change from run to run; everything else, drawing and font subset included,
    // must be the same.
    let doc = sample("vessland-province");
    let make = || {
        let bytes = pdf::to_pdf(&doc, &full_options("Twice"), &PdfOptions::default()).unwrap();
        let pdf = lopdf::Document::load_mem(&bytes).unwrap();
        let objects: BTreeMap<ObjectId, String> = pdf
            .objects
            .iter()
            .map(|(id, o)| (*id, canonical(o)))
            .collect();
        (bytes.len(), objects)
    };
    let (first, second) = (make(), make());
    assert_eq!(first.0, second.0, "the same length");
    assert_eq!(first.1.len(), second.1.len());
    for (id, object) in &first.1 {
        assert_eq!(Some(object), second.1.get(id), "object {id:?} differs");
    }
}

#[test]
fn pdf_refuses_margins_without_room_and_empty_maps_in_plain_words() {
    let doc = sample("three-valleys");
    let options = SvgOptions::default();
    let too_wide = PdfOptions {
        margin_mm: 110.0,
        ..PdfOptions::default()
    };
    let e = pdf::to_pdf(&doc, &options, &too_wide).unwrap_err();
    assert!(
        matches!(&e, ExportError::BadOption(m) if m.contains("margins of 110 mm leave no room")),
        "{e}"
    );
    let negative = PdfOptions {
        margin_mm: -1.0,
        ..PdfOptions::default()
    };
    assert!(matches!(
        pdf::to_pdf(&doc, &options, &negative),
        Err(ExportError::BadOption(_))
    ));
    // Room for the width, but the title, scale bar, source and legend rows alone are taller than
    // the room on a strip of paper.
    let strip = PdfOptions {
        page: PageSize::Custom {
            width_mm: 420.0,
            height_mm: 40.0,
        },
        orientation: Some(Orientation::Landscape),
        margin_mm: 10.0,
    };
    let e = pdf::to_pdf(&doc, &full_options("Strip"), &strip).unwrap_err();
    assert!(e.to_string().contains("too little room"), "{e}");
    assert_eq!(
        pdf::to_pdf(&Document::default(), &options, &PdfOptions::default()),
        Err(ExportError::EmptyMap)
    );
}

#[test]
fn cli_writes_pdfs_with_the_page_it_is_told_and_refuses_bad_pages() {
    let dir = tempfile::tempdir().unwrap();
    let project = root().join("sample-maps/exclave-coast.tinct");
    let out = dir.path().join("coast.pdf");
    let o = tinct_path(
        &["export"],
        &project,
        &[
            "--pdf",
            out.to_str().unwrap(),
            "--page",
            "letter",
            "--landscape",
            "--margin-mm",
            "10",
            "--labels",
            "--title",
            "Exclave Coast",
            "--legend",
        ],
    );
    assert!(o.status.success(), "{}", stderr(&o));
    assert!(stderr(&o).contains("labels:"), "{}", stderr(&o));
    let bytes = std::fs::read(&out).unwrap();
    let (pdf, id) = only_page(&bytes);
    assert_size(
        media_box(&pdf, id),
        [LETTER_PT[1], LETTER_PT[0]],
        "--page letter --landscape",
    );
    let text: String = page_text(&pdf, id).split_whitespace().collect();
    assert!(text.contains("ExclaveCoast"), "{text}");
    // A custom size in millimetres.
    let o = tinct_path(
        &["export"],
        &project,
        &[
            "--pdf",
            out.to_str().unwrap(),
            "--page",
            "300x200",
            "--portrait",
        ],
    );
    assert!(o.status.success(), "{}", stderr(&o));
    let (pdf, id) = only_page(&std::fs::read(&out).unwrap());
    assert_size(media_box(&pdf, id), [566.929, 850.394], "300x200 portrait");
    // Bad input is exit status 2 with the reason in words, and writes nothing.
    let refused = dir.path().join("refused.pdf");
    for (args, words) in [
        (vec!["--page", "b5"], "unknown page size \"b5\""),
        (vec!["--margin-mm", "120"], "leave no room"),
        (vec!["--landscape", "--portrait"], "cannot be used with"),
    ] {
        let mut all = vec!["--pdf", refused.to_str().unwrap()];
        all.extend(args);
        let o = tinct_path(&["export"], &project, &all);
        assert_eq!(o.status.code(), Some(2), "{all:?}: {}", stderr(&o));
        assert!(stderr(&o).contains(words), "{all:?}: {}", stderr(&o));
        assert!(!refused.exists());
    }
}

/// Runs a Poppler tool on `path`; `None` when Poppler is not installed and not required.
fn poppler(tool: &str, args: &[&str], path: &Path) -> Option<String> {
    match Command::new(tool).args(args).arg(path).output() {
        Ok(out) => {
            assert!(out.status.success(), "{tool} failed: {}", stderr(&out));
            Some(String::from_utf8_lossy(&out.stdout).into_owned())
        }
        Err(e) => {
            assert!(
                std::env::var_os("TINCT_REQUIRE_POPPLER").is_none(),
                "TINCT_REQUIRE_POPPLER is set but {tool} cannot run: {e}"
            );
            eprintln!("{tool} not found (Debian poppler-utils): Poppler's check was skipped");
            None
        }
    }
}

/// `pdfinfo`'s fields, with runs of spaces in the values made single.
fn pdfinfo(path: &Path) -> Option<BTreeMap<String, String>> {
    let text = poppler("pdfinfo", &[], path)?;
    Some(
        text.lines()
            .filter_map(|l| l.split_once(':'))
            .map(|(k, v)| {
                (
                    k.trim().to_string(),
                    v.split_whitespace().collect::<Vec<_>>().join(" "),
                )
            })
            .collect(),
    )
}

/// `pdffonts`' rows as (name, emb, uni), read at the header's column positions.
fn pdffonts(path: &Path) -> Option<Vec<(String, String, String)>> {
    let text = poppler("pdffonts", &[], path)?;
    let mut lines = text.lines();
    let header = lines.next().expect("a header");
    let column = |name: &str| header.find(name).expect("a known column");
    let (emb, uni) = (column(" emb ") + 1, column(" uni ") + 1);
    lines.next(); // the dashes under the header
    Some(
        lines
            .filter(|l| !l.trim().is_empty())
            .map(|l| {
                let name = l.split_whitespace().next().unwrap_or_default().to_string();
                (
                    name,
                    l[emb..emb + 3].to_string(),
                    l[uni..uni + 3].to_string(),
                )
            })
            .collect(),
    )
}

#[test]
fn poppler_reads_the_paper_size_and_finds_every_font_embedded() {
    let dir = tempfile::tempdir().unwrap();
    // pdfinfo prints the size with C's %g (six significant digits: A4 is "595.276 x 841.89 pts"
    // in Poppler 22.12) and names the paper it matches, so the numbers are compared within
    // 0.01 point and the name exactly.
    for (doc, name, page, expected, paper_name) in [
        (
            sample("vessland-province"),
            "vessland-a4.pdf",
            PageSize::A4,
            A4_PT,
            "(A4)",
        ),
        (
            states(),
            "states-letter.pdf",
            PageSize::Letter,
            LETTER_PT,
            "(letter)",
        ),
    ] {
        let title = format!("Print check {name}");
        let bytes = pdf::to_pdf(
            &doc,
            &full_options(&title),
            &paper(page, Some(Orientation::Portrait)),
        )
        .unwrap();
        let path = dir.path().join(name);
        std::fs::write(&path, &bytes).unwrap();
        let Some(info) = pdfinfo(&path) else { return };
        assert_eq!(info.get("Pages").map(String::as_str), Some("1"), "{info:?}");
        let size = info.get("Page size").expect("pdfinfo gives the page size");
        let words: Vec<&str> = size.split(' ').collect();
        assert!(
            words.len() == 5 && words[1] == "x" && words[3] == "pts" && words[4] == paper_name,
            "pdfinfo: {size}"
        );
        let read = [words[0].parse().unwrap(), words[2].parse().unwrap()];
        assert_size(read, expected, &format!("pdfinfo: {size}"));
        assert_eq!(info.get("Title"), Some(&title), "{info:?}");
        let fonts = pdffonts(&path).expect("Poppler is there");
        assert!(!fonts.is_empty(), "pdffonts lists the label font");
        for (font, emb, uni) in &fonts {
            assert_eq!(emb, "yes", "{font} is not embedded");
            assert_eq!(
                uni, "yes",
                "{font} has no ToUnicode map, so its text cannot be read"
            );
        }
        let text = poppler("pdftotext", &["-layout"], &path.clone())
            .map(|_| std::fs::read_to_string(path.with_extension("txt")).unwrap())
            .expect("Poppler is there");
        assert!(text.contains(&title), "pdftotext: {text}");
    }
}

//! `tinct export` (SVG, PNG, PDF, GeoJSON, GeoPackage, Shapefile, CSV) and `tinct palette` (the distinctness report; a
//! default palette and the slot assignment, written to a project).
//!
//! `tinct palette --json` prints an object that only ever grows:
//! - `palette`: name; `slots`: `[{slot, name, fill, lightness, simulated: {protanopia,
//!   deuteranopia, tritanopia, greyscale}}]` (slots 0-based, colours `#rrggbb`);
//! - `thresholds`: `{delta_e00, grey_delta_l}`; `pairs_checked`: `colouring` (the slot pairs that
//!   adjacent regions use) or `all_slots` (nothing coloured yet);
//! - `pairs`: `[{slots: [a, b], borders, delta_e00: {normal, protanopia, deuteranopia,
//!   tritanopia}, delta_l}]`;
//! - `warnings`: `[{slots: [a, b], view, value, threshold, message}]`; `missing_slots`: slots the
//!   colouring uses that the palette lacks.

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use anyhow::anyhow;
use clap::Args;
use serde_json::json;

use super::{CommandResult, Failure, OrFail, Outcome};
use crate::colour::{self, Thresholds, Vision};
use crate::doc::palette_check::{
    PairsChecked, palette_report, simulated_palettes, slot_assignment_edit,
};
use crate::doc::{Document, palette_edit};
use crate::export::{self, ExportFormat, Orientation, PageSize, PdfOptions, PngSize, SvgOptions};

/// What `tinct export` writes; at least one output is required.
#[derive(Args, Debug, Clone)]
#[group(id = "outputs", required = true, multiple = true)]
pub struct Outputs {
    /// Write an SVG picture (sizes in millimetres for print).
    #[arg(long, value_name = "OUT")]
    pub svg: Option<PathBuf>,
    /// Write a PNG picture (see --dpi and --width).
    #[arg(long, value_name = "OUT")]
    pub png: Option<PathBuf>,
    /// Write a PDF for print (see --page, --landscape, --portrait and --margin-mm): vector, with
    /// the font embedded and names kept as text.
    #[arg(long, value_name = "OUT")]
    pub pdf: Option<PathBuf>,
    /// Write GeoJSON (RFC 7946, longitude/latitude) with the colours as properties.
    #[arg(long, value_name = "OUT")]
    pub geojson: Option<PathBuf>,
    /// Write a GeoPackage (one layer named after the file, with an R-tree index) with the source
    /// attributes and the colouring columns.
    #[arg(long, value_name = "OUT")]
    pub gpkg: Option<PathBuf>,
    /// Write a Shapefile (OUT.shp with its .shx, .dbf, .cpg and .prj); the colouring fields are
    /// tinct_col (slot) and tinct_fill (#rrggbb).
    #[arg(long, value_name = "OUT")]
    pub shp: Option<PathBuf>,
    /// Write a CSV table: id, name, colour, fill, group, pinned, role.
    #[arg(long, value_name = "OUT")]
    pub csv: Option<PathBuf>,
}

/// Options of `tinct export`.
#[derive(Args, Debug, Clone)]
pub struct ExportArgs {
    #[command(flatten)]
    pub outputs: Outputs,
    /// PNG resolution in dots per inch at the print width (default 150).
    #[arg(long, value_name = "N", conflicts_with = "width")]
    pub dpi: Option<f64>,
    /// PNG width in pixels (instead of --dpi).
    #[arg(long, value_name = "PX")]
    pub width: Option<u32>,
    /// Print width of the SVG (and of the PNG at --dpi), in millimetres. The PDF's drawing is as
    /// wide as its page allows.
    #[arg(long = "width-mm", value_name = "MM", default_value_t = 180.0)]
    pub width_mm: f64,
    /// The PDF's paper: a4, a3, letter, or WIDTHxHEIGHT in millimetres (such as 500x700).
    #[arg(long, value_name = "SIZE", default_value = "a4", value_parser = parse_page)]
    pub page: PageSize,
    /// Lay the PDF's paper landscape (wider than tall); by default, whichever way gives the
    /// larger map.
    #[arg(long, conflicts_with = "portrait")]
    pub landscape: bool,
    /// Lay the PDF's paper portrait (taller than wide).
    #[arg(long)]
    pub portrait: bool,
    /// The white space around the PDF's drawing, in millimetres.
    #[arg(long = "margin-mm", value_name = "MM", default_value_t = 15.0)]
    pub margin_mm: f64,
    /// Write region names on the map (names that do not fit are left out, and counted).
    #[arg(long)]
    pub labels: bool,
    /// The size of the names, in points (1/72 inch): "6-10" steps from 6 pt for the smallest
    /// regions to 10 pt for the largest; one number sets every name alike.
    #[arg(long = "name-size", value_name = "PT[-PT]", default_value = "6-10", value_parser = parse_name_size)]
    pub name_size: NameSize,
    /// A title above the map.
    #[arg(long, value_name = "TEXT")]
    pub title: Option<String>,
    /// A source line under the map, printed as "Source: TEXT".
    #[arg(long, value_name = "TEXT")]
    pub source: Option<String>,
    /// A scale bar under the map (maps in metres only, such as imported longitude/latitude data).
    #[arg(long = "scale-bar")]
    pub scale_bar: bool,
    /// A legend under the map: a swatch and the palette slot's name for each colour in use.
    #[arg(long)]
    pub legend: bool,
    /// The legend's heading (with --legend).
    #[arg(long = "legend-heading", value_name = "TEXT", requires = "legend")]
    pub legend_heading: Option<String>,
    /// Draw regions far from the main mass where they lie, instead of in inset frames beside it
    /// (inset frames are used for maps imported from longitude/latitude when they save room).
    #[arg(long = "no-insets")]
    pub no_insets: bool,
    /// Accepted for older scripts: the legend is now off unless --legend is given.
    #[arg(long = "no-legend", hide = true, conflicts_with = "legend")]
    pub no_legend: bool,
}

/// The range of name sizes, in points.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct NameSize {
    pub min_pt: f64,
    pub max_pt: f64,
}

/// Reads `--name-size`: "6-10" or "8", each from 3 to 36 points.
pub fn parse_name_size(text: &str) -> Result<NameSize, String> {
    let number = |t: &str| {
        t.trim()
            .trim_end_matches("pt")
            .trim()
            .parse::<f64>()
            .ok()
            .filter(|v| v.is_finite())
            .ok_or_else(|| format!("{t:?} is not a size in points (such as 6-10 or 8)"))
    };
    let (min_pt, max_pt) = match text.split_once('-') {
        Some((a, b)) => (number(a)?, number(b)?),
        None => {
            let v = number(text)?;
            (v, v)
        }
    };
    if !(3.0..=36.0).contains(&min_pt) || !(3.0..=36.0).contains(&max_pt) {
        return Err(format!(
            "name sizes go from 3 to 36 points, not {min_pt} and {max_pt}"
        ));
    }
    if min_pt > max_pt {
        return Err(format!(
            "the smallest name size ({min_pt} pt) is larger than the largest ({max_pt} pt)"
        ));
    }
    Ok(NameSize { min_pt, max_pt })
}

/// Reads `--page` (clap reports the message and exits with the usage status, 2).
fn parse_page(text: &str) -> Result<PageSize, String> {
    PageSize::parse(text).map_err(|e| e.to_string())
}

fn write(path: &Path, bytes: &[u8]) -> anyhow::Result<()> {
    crate::atomic::write_atomically(path, bytes).map_err(|e| anyhow!("{e}"))
}

/// Runs `tinct export`.
pub fn run_export(file: &Path, args: &ExportArgs, geo: &super::import::GeoArgs) -> CommandResult {
    let loaded = super::load(file, geo)?;
    let doc = &loaded.doc;
    let options = SvgOptions {
        width_mm: args.width_mm,
        labels: args.labels,
        legend: args.legend,
        legend_heading: args.legend_heading.clone().unwrap_or_default(),
        title: args.title.clone(),
        source: args.source.clone(),
        scale_bar: args.scale_bar,
        insets: !args.no_insets,
        label_min_mm: args.name_size.min_pt * crate::export::svg::MM_PER_POINT,
        label_max_mm: args.name_size.max_pt * crate::export::svg::MM_PER_POINT,
        ..SvgOptions::default()
    };
    let mut notes = Vec::new();
    if args.scale_bar && doc.settings().units != crate::doc::Units::Metres {
        notes.push(
            "no scale bar: the map's units are not metres (only maps imported from \
             longitude/latitude or a projected file have a true scale)"
                .to_string(),
        );
    }
    let size = match (args.width, args.dpi) {
        (Some(px), _) => PngSize::WidthPx(px),
        (None, Some(dpi)) => PngSize::Dpi(dpi),
        (None, None) => PngSize::Dpi(150.0),
    };
    let paper = PdfOptions {
        page: args.page,
        orientation: if args.landscape {
            Some(Orientation::Landscape)
        } else if args.portrait {
            Some(Orientation::Portrait)
        } else {
            None
        },
        margin_mm: args.margin_mm,
    };
    // Make every requested output first, so bad input writes nothing.
    let mut files: Vec<(PathBuf, Vec<u8>)> = Vec::new();
    let mut label_report = None;
    let o = &args.outputs;
    let wanted = [
        (&o.svg, ExportFormat::Svg),
        (&o.png, ExportFormat::Png(size)),
        (&o.pdf, ExportFormat::Pdf(paper)),
        (&o.geojson, ExportFormat::GeoJson),
        (&o.gpkg, ExportFormat::GeoPackage),
        (&o.shp, ExportFormat::Shapefile),
        (&o.csv, ExportFormat::Csv),
    ];
    for (path, format) in wanted {
        if let Some(path) = path {
            let (made, report) = export::export_files_with_report(doc, format, &options, path)
                .map_err(|e| anyhow!("{}: {e}", file.display()))
                .bad_input()?;
            files.extend(made);
            label_report = label_report.or(report);
        }
    }
    if let (true, Some(r)) = (args.labels, &label_report) {
        notes.push(r.summary());
    }
    for (path, bytes) in files {
        write(&path, &bytes).cannot_write()?;
        notes.push(format!("wrote {}", path.display()));
    }
    Ok(Outcome::notes(notes))
}

/// Options of `tinct palette`.
#[derive(Args, Debug, Clone)]
pub struct PaletteArgs {
    /// Print machine-readable JSON (shape in src/cli/export.rs and the README).
    #[arg(long)]
    pub json: bool,
    /// Switch to Tinct's default palette for this many colours (3 to 8) before checking: fills
    /// of equal weight for colour output, or with --greyscale-safe the one that survives a
    /// greyscale copy (one of its fills is dark).
    #[arg(long = "default-palette", value_name = "COLOURS")]
    pub default_palette: Option<usize>,
    /// With --default-palette: the greyscale-safe palette.
    #[arg(long = "greyscale-safe", requires = "default_palette")]
    pub greyscale_safe: bool,
    /// Give the colour classes that share the most borders the most distinct slots (pinned
    /// colours keep theirs) before checking.
    #[arg(long)]
    pub assign: bool,
    /// Write the project with these changes (needed with --default-palette or --assign).
    #[arg(long, value_name = "OUT")]
    pub out: Option<PathBuf>,
}

/// The report as JSON (see the module documentation).
pub fn report_json(doc: &Document, thresholds: &Thresholds) -> serde_json::Value {
    let report = palette_report(doc, thresholds);
    let rows = simulated_palettes(doc.palette());
    let slots: Vec<_> = doc
        .palette()
        .slots
        .iter()
        .enumerate()
        .map(|(i, s)| {
            let simulated: BTreeMap<String, String> = rows
                .iter()
                .filter(|(name, _)| name != "normal")
                .map(|(name, row)| (name.clone(), row[i].to_hex()))
                .collect();
            json!({
                "slot": i,
                "name": s.name,
                "fill": s.colour.to_hex(),
                "lightness": (colour::lightness(s.colour.0) * 10.0).round() / 10.0,
                "simulated": simulated,
            })
        })
        .collect();
    let pairs: Vec<_> = report
        .pairs
        .iter()
        .filter(|p| p.slots.1 < doc.palette().slots.len())
        .map(|p| {
            let d = colour::pair_difference(
                doc.palette().slots[p.slots.0].colour.0,
                doc.palette().slots[p.slots.1].colour.0,
            );
            let by_vision: BTreeMap<&str, f64> = Vision::ALL
                .iter()
                .map(|v| {
                    (
                        v.as_str(),
                        (d.delta_e00[*v as usize] * 100.0).round() / 100.0,
                    )
                })
                .collect();
            json!({
                "slots": [p.slots.0, p.slots.1],
                "borders": p.borders,
                "delta_e00": by_vision,
                "delta_l": (d.delta_l * 100.0).round() / 100.0,
            })
        })
        .collect();
    let warnings: Vec<_> = report
        .warnings
        .iter()
        .map(|w| {
            json!({
                "slots": [w.slots.0, w.slots.1],
                "view": w.view.as_str(),
                "value": (w.value * 100.0).round() / 100.0,
                "threshold": w.threshold,
                "message": w.message,
            })
        })
        .collect();
    json!({
        "palette": doc.palette().name,
        "slots": slots,
        "thresholds": { "delta_e00": thresholds.delta_e00, "grey_delta_l": thresholds.grey_delta_l },
        "pairs_checked": match report.pairs_checked {
            PairsChecked::Colouring => "colouring",
            PairsChecked::AllSlots => "all_slots",
        },
        "pairs": pairs,
        "warnings": warnings,
        "missing_slots": report.missing_slots,
        "fill_warnings": report.fills.iter().map(|w| json!({
            "slot": w.slot,
            "problem": w.problem.as_str(),
            "message": w.message,
        })).collect::<Vec<_>>(),
    })
}

/// The report in words.
pub fn report_text(doc: &Document, thresholds: &Thresholds) -> String {
    let report = palette_report(doc, thresholds);
    let mut out = format!(
        "Palette \"{}\", {} slots\n",
        doc.palette().name,
        doc.palette().slots.len()
    );
    let rows = simulated_palettes(doc.palette());
    out.push_str("  slot  name              fill     L*    protan.  deutan.  tritan.  grey\n");
    for (i, s) in doc.palette().slots.iter().enumerate() {
        let sim = |k: usize| rows[k].1[i].to_hex();
        out.push_str(&format!(
            "  {:>4}  {:<16}  {}  {:>4.1}  {}  {}  {}  {}\n",
            i + 1,
            s.name,
            s.colour.to_hex(),
            colour::lightness(s.colour.0),
            sim(1),
            sim(2),
            sim(3),
            sim(4)
        ));
    }
    out.push_str(&match report.pairs_checked {
        PairsChecked::Colouring => format!(
            "Checked the {} slot pairs that neighbouring regions use in the current colouring.\n",
            report.pairs.len()
        ),
        PairsChecked::AllSlots => {
            "Nothing is coloured yet, so every pair of slots was checked.\n".to_string()
        }
    });
    out.push_str(&format!(
        "Thresholds: ΔE00 {} under normal vision and simulated protanopia, deuteranopia and \
         tritanopia (Machado et al. 2009); {}.\n",
        thresholds.delta_e00,
        if thresholds.greyscale {
            format!("{} L* in greyscale", thresholds.grey_delta_l)
        } else {
            "greyscale not checked (the project does not expect greyscale copies)".to_string()
        }
    ));
    for s in &report.missing_slots {
        out.push_str(&format!(
            "Problem: the colouring uses slot {}, which the palette does not have.\n",
            s + 1
        ));
    }
    if report.warnings.is_empty() {
        out.push_str("Every checked pair is clearly distinct in every view.\n");
    } else {
        for w in &report.warnings {
            out.push_str(&format!("Warning: {}.\n", w.message));
        }
    }
    for w in &report.fills {
        out.push_str(&format!("Warning: {}.\n", w.message));
    }
    out.push_str(
        "Simulations approximate typical readers; check a printed proof by eye before publishing.\n",
    );
    out
}

/// Runs `tinct palette`.
pub fn run_palette(file: &Path, args: &PaletteArgs) -> CommandResult {
    let loaded = crate::formats::load(file, &crate::geo::ImportOptions::default()).bad_input()?;
    let mut doc = loaded.doc;
    let thresholds = crate::doc::palette_check::thresholds(&doc);
    let changes = args.default_palette.is_some() || args.assign;
    if changes != args.out.is_some() {
        return Err(Failure::BadInput(anyhow!(
            "--default-palette and --assign change the project: name the result with --out"
        )));
    }
    let mut notes = Vec::new();
    if let Some(colours) = args.default_palette {
        let purpose = if args.greyscale_safe {
            colour::Purpose::Greyscale
        } else {
            colour::Purpose::Colour
        };
        let Some(index) = colour::DEFAULT_PALETTES
            .iter()
            .position(|p| p.slots.len() == colours && p.purpose == purpose)
        else {
            return Err(Failure::BadInput(anyhow!(
                "there are default palettes for 3 to 8 colours, not {colours}"
            )));
        };
        let edit = palette_edit::use_default_palette(&doc, index).bad_input()?;
        doc.apply(edit).bad_input()?;
    }
    if args.assign {
        match slot_assignment_edit(&doc, &thresholds)
            .map_err(|e| anyhow!("{}: {e}", file.display()))
            .bad_input()?
        {
            Some(edit) => {
                doc.apply(edit).bad_input()?;
                notes.push("moved colours to the slots that suit their borders best".into());
            }
            None => notes.push("the colours already sit on the best slots".into()),
        }
    }
    if let Some(out) = &args.out {
        super::save(&doc, out)?;
    }
    let text = if args.json {
        let mut t = report_json(&doc, &thresholds).to_string();
        t.push('\n');
        t
    } else {
        report_text(&doc, &thresholds)
    };
    Ok(Outcome {
        stdout: text,
        notes,
        problems: false,
    })
}

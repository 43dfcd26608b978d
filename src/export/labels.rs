//! Label placement for the picture exports: where each region's name goes, how big, in which ink,
//! and which names are left out because they do not fit.
//!
//! Everything here works in page millimetres with y growing down, the units of the printed page,
//! so that sizes, gaps and the text width estimate mean the same on every map.
//!
//! The rules, in order:
//! - **Anchor**: the pole of inaccessibility of the region's largest part
//!   ([`super::polylabel`]), the interior point farthest from its outline.
//! - **Size** steps with the region's area on the page ([`size_step`]): three sizes from
//!   `label_min_mm` to `label_max_mm`. A name that does not fit at its size tries the smaller steps;
//!   at each size a name of several words may also be set on two lines ([`layouts`]).
//! - **Order**: largest region first, so the big names take their places before the small ones.
//! - **Inside**: the label's box (the estimated text box plus the halo, widened by
//!   [`INSIDE_MARGIN_MM`]) must lie inside the region: its corners and centre inside, and no edge
//!   of the region's outline through it. Positions
//!   around the pole are tried when the pole itself does not work.
//! - **No overlap**: no two label boxes overlap (they keep [`LABEL_GAP_MM`] apart).
//! - **Leader lines**: a small region whose name does not fit inside, and which is an island, an
//!   enclave or on the coast, may have its name placed nearby outside (on empty page or water, or
//!   for an enclave inside the region around it) with a thin line from inside the region to it.
//! - Otherwise the name is **left out**, and counted in the [`LabelReport`].
//!
//! **Text width** is estimated, not measured (the SVG may be shown with any sans-serif font): the
//! advance of each printable ASCII character is the larger of its advance in Ubuntu Light (the font
//! the PNG export embeds) and in DejaVu Sans (a wide and common sans-serif), rounded up to a
//! hundredth of an em ([`char_width_em`]); any other character counts as 1.1 em, wider than any
//! Latin letter in either font. The box is 1.18 em tall: both fonts' ascent plus their deepest
//! descent. So the estimate errs on the wide side for any common sans-serif.

use rstar::primitives::{GeomWithData, Line, Rectangle};
use rstar::{AABB, RTree};

use super::contrast::{self, DARK_INK, WHITE};
use super::lines::Lines;
use super::polylabel::pole_of_inaccessibility;
use super::svg::{MapFrame, SvgOptions};
use crate::doc::{Document, Point, RegionId, Rgb, Role};
use crate::geometry::{point_in_rings, signed_area};

/// Label boxes keep this far apart, in millimetres.
pub const LABEL_GAP_MM: f64 = 0.4;
/// The halo's stroke width, in millimetres (half of it shows outside the letters).
pub const HALO_MM: f64 = 0.35;
/// A label inside its region keeps this far from the region's outline, in millimetres.
pub const INSIDE_MARGIN_MM: f64 = 0.3;
/// Page area (mm²) from which a region's label takes the middle size, and the largest.
pub const AREA_MEDIUM_MM2: f64 = 250.0;
pub const AREA_LARGE_MM2: f64 = 1000.0;
/// Regions smaller than this on the page (mm²) may take a leader line.
pub const LEADER_MAX_AREA_MM2: f64 = 120.0;
/// The radius of the marker drawn for a region without an outline.
pub const MARKER_RADIUS_MM: f64 = 2.2;
/// Text box height as a multiple of the font size, and the baseline below the box's centre.
pub const BOX_HEIGHT_EM: f64 = 1.18;
/// Baseline to baseline in a name set on two lines, as a multiple of the font size.
pub const LINE_ADVANCE_EM: f64 = 1.15;
pub const BASELINE_BELOW_CENTRE_EM: f64 = 0.35;
/// Water names: a deep blue that reaches 4.5:1 against the water's ground colour (see the tests).
pub const WATER_INK: Rgb = Rgb([0x1f, 0x4e, 0x6e]);
/// The ground colour of water (the `water` pattern's background).
pub const WATER_GROUND: Rgb = Rgb([0xf3, 0xf7, 0xfa]);

/// Advances of the printable ASCII characters (space to tilde) in hundredths of an em: the larger
/// of Ubuntu Light and DejaVu Sans, rounded up (read from the fonts' `hmtx` tables).
const ASCII_WIDTHS: [u8; 95] = [
    32, 41, 46, 84, 64, 96, 78, 28, 40, 40, 50, 84, 32, 37, 32, 36, 64, 64, 64, 64, 64, 64, 64, 64,
    64, 64, 34, 34, 84, 84, 84, 54, 100, 69, 69, 70, 78, 64, 58, 78, 76, 30, 49, 66, 56, 87, 75,
    79, 61, 79, 70, 64, 62, 74, 69, 99, 69, 62, 69, 40, 36, 40, 84, 50, 50, 62, 64, 55, 64, 62, 38,
    64, 64, 28, 28, 58, 28, 98, 64, 62, 64, 64, 42, 53, 40, 64, 60, 82, 60, 60, 53, 64, 34, 64, 84,
];

/// The estimated advance of `c` in ems (see the module documentation).
pub fn char_width_em(c: char) -> f64 {
    match c {
        ' '..='~' => f64::from(ASCII_WIDTHS[c as usize - 32]) / 100.0,
        _ => 1.1,
    }
}

/// The estimated width of `text` set at `size_mm`, in millimetres.
pub fn text_width_mm(text: &str, size_mm: f64) -> f64 {
    text.chars().map(char_width_em).sum::<f64>() * size_mm
}

/// The size step (0, 1 or 2, smallest first) of a region covering `area_mm2` of the page.
pub fn size_step(area_mm2: f64) -> usize {
    if area_mm2 >= AREA_LARGE_MM2 {
        2
    } else if area_mm2 >= AREA_MEDIUM_MM2 {
        1
    } else {
        0
    }
}

/// The three label sizes in millimetres, smallest first.
pub fn sizes_mm(options: &SvgOptions) -> [f64; 3] {
    let (lo, hi) = (
        options.label_min_mm,
        options.label_max_mm.max(options.label_min_mm),
    );
    [lo, (lo + hi) / 2.0, hi]
}

/// An axis-aligned box in page millimetres: `[min, max]`.
pub type BoxMm = [[f64; 2]; 2];

/// One placed label.
#[derive(Clone, Debug, PartialEq)]
pub struct Placement {
    pub id: RegionId,
    pub text: String,
    /// The name as set: one line, or two when a name of several words fits better so.
    pub lines: Vec<String>,
    /// The centre of the text box, in page millimetres.
    pub centre_mm: [f64; 2],
    pub size_mm: f64,
    /// The box it reserves (text box plus halo), in page millimetres.
    pub box_mm: BoxMm,
    pub ink: Rgb,
    pub halo: Rgb,
    /// Set in italic: a water name.
    pub italic: bool,
    /// From a point inside the region to the label's box, when the label sits outside.
    pub leader_mm: Option<[[f64; 2]; 2]>,
}

/// What label placement did, for the exporter's caller to report.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct LabelReport {
    /// Regions with a name to place.
    pub named: usize,
    /// Names placed inside their region.
    pub inside: usize,
    /// Names placed outside with a leader line.
    pub with_leader: usize,
    /// Names of regions without outlines, placed above their markers.
    pub beside_marker: usize,
    /// Names left out because they did not fit, largest region first.
    pub left_out: Vec<String>,
}

impl LabelReport {
    /// What label placement did, in one line: "labels: 40 of 49 placed (3 with a leader line); 9 left
    /// out because they do not fit: A, B, ...".
    pub fn summary(&self) -> String {
        let r = self;
        let placed = r.inside + r.with_leader + r.beside_marker;
        let mut note = format!("labels: {placed} of {} placed", r.named);
        if r.with_leader > 0 {
            note.push_str(&format!(" ({} with a leader line)", r.with_leader));
        }
        if r.left_out.is_empty() {
            note.push_str("; none left out");
        } else {
            const SHOWN: usize = 8;
            let names: Vec<&str> = r.left_out.iter().take(SHOWN).map(String::as_str).collect();
            let more = r.left_out.len().saturating_sub(SHOWN);
            note.push_str(&format!(
                "; {} left out because they do not fit: {}{}",
                r.left_out.len(),
                names.join(", "),
                if more > 0 {
                    format!(" and {more} more")
                } else {
                    String::new()
                }
            ));
        }
        note
    }
}

/// One region prepared for placement.
struct Candidate {
    id: RegionId,
    name: String,
    area_mm2: f64,
    /// All rings of the region in page millimetres (even-odd).
    rings: Vec<Vec<Point>>,
    /// The pole of the largest part and its distance to the outline, in millimetres.
    pole: Option<(Point, f64)>,
    /// The largest part's bounding box, in millimetres.
    part_box: BoxMm,
    water: bool,
    fill: Option<Rgb>,
}

fn boxes_overlap(a: &BoxMm, b: &BoxMm) -> bool {
    a[0][0] < b[1][0] && b[0][0] < a[1][0] && a[0][1] < b[1][1] && b[0][1] < a[1][1]
}

/// True when the segment `p q` meets the box (Liang-Barsky clipping).
pub fn segment_meets_box(p: Point, q: Point, b: &BoxMm) -> bool {
    let d = [q[0] - p[0], q[1] - p[1]];
    let (mut t0, mut t1) = (0.0f64, 1.0f64);
    for axis in 0..2 {
        if d[axis] == 0.0 {
            if p[axis] < b[0][axis] || p[axis] > b[1][axis] {
                return false;
            }
        } else {
            let (mut a, mut c) = (
                (b[0][axis] - p[axis]) / d[axis],
                (b[1][axis] - p[axis]) / d[axis],
            );
            if a > c {
                std::mem::swap(&mut a, &mut c);
            }
            t0 = t0.max(a);
            t1 = t1.min(c);
            if t0 > t1 {
                return false;
            }
        }
    }
    true
}

fn box_points(b: &BoxMm) -> [Point; 5] {
    [
        b[0],
        [b[1][0], b[0][1]],
        b[1],
        [b[0][0], b[1][1]],
        [(b[0][0] + b[1][0]) / 2.0, (b[0][1] + b[1][1]) / 2.0],
    ]
}

/// True when the box lies inside the rings: corners and centre inside, no outline edge through it.
pub fn box_inside(rings: &[Vec<Point>], b: &BoxMm) -> bool {
    let inside = |p: Point| point_in_rings(rings.iter().map(Vec::as_slice), p);
    box_points(b).iter().all(|p| inside(*p)) && !rings_meet_box(rings, b)
}

fn rings_meet_box(rings: &[Vec<Point>], b: &BoxMm) -> bool {
    rings.iter().any(|ring| {
        crate::geometry::edges(ring).any(|(p, q)| {
            p[0].max(q[0]) >= b[0][0]
                && p[0].min(q[0]) <= b[1][0]
                && p[1].max(q[1]) >= b[0][1]
                && p[1].min(q[1]) <= b[1][1]
                && segment_meets_box(p, q, b)
        })
    })
}

/// The ways to set a name: on one line, then (for a name of several words) on two lines broken
/// at the space that makes the longer line shortest.
pub fn layouts(name: &str) -> Vec<Vec<String>> {
    let mut out = vec![vec![name.to_string()]];
    let best = name
        .char_indices()
        .filter(|(_, c)| *c == ' ')
        .map(|(i, _)| {
            let (a, b) = (name[..i].trim(), name[i..].trim());
            (text_width_mm(a, 1.0).max(text_width_mm(b, 1.0)), a, b)
        })
        .filter(|(_, a, b)| !a.is_empty() && !b.is_empty())
        .min_by(|x, y| x.0.total_cmp(&y.0));
    if let Some((_, a, b)) = best {
        out.push(vec![a.to_string(), b.to_string()]);
    }
    out
}

fn label_box(centre: Point, lines: &[String], size_mm: f64) -> BoxMm {
    let widest = lines
        .iter()
        .map(|l| text_width_mm(l, size_mm))
        .fold(0.0, f64::max);
    let extra_lines = lines.len().saturating_sub(1) as f64;
    let half_w = widest / 2.0 + HALO_MM / 2.0;
    let half_h = (BOX_HEIGHT_EM + extra_lines * LINE_ADVANCE_EM) * size_mm / 2.0 + HALO_MM / 2.0;
    [
        [centre[0] - half_w, centre[1] - half_h],
        [centre[0] + half_w, centre[1] + half_h],
    ]
}

fn grown(b: &BoxMm, by: f64) -> BoxMm {
    [[b[0][0] - by, b[0][1] - by], [b[1][0] + by, b[1][1] + by]]
}

type Placed = RTree<GeomWithData<Rectangle<[f64; 2]>, usize>>;

fn collides(placed: &Placed, b: &BoxMm) -> bool {
    // Boxes keep the gap apart: grow the new one by the gap and ask for any overlap.
    let g = grown(b, LABEL_GAP_MM);
    placed
        .locate_in_envelope_intersecting(AABB::from_corners(g[0], g[1]))
        .any(|r| {
            let e = r.geom().envelope_box();
            boxes_overlap(&g, &e)
        })
}

trait EnvelopeBox {
    fn envelope_box(&self) -> BoxMm;
}
impl EnvelopeBox for Rectangle<[f64; 2]> {
    fn envelope_box(&self) -> BoxMm {
        let l = self.lower();
        let u = self.upper();
        [l, u]
    }
}

/// The fill colour of a land region as an sRGB colour (uncoloured regions use the exporter's
/// light grey).
pub fn land_fill(doc: &Document, id: RegionId) -> Rgb {
    doc.colouring()
        .get(&id)
        .and_then(|&s| doc.palette().slots.get(s as usize))
        .map_or(Rgb([0xf4, 0xf4, 0xf2]), |s| s.colour)
}

/// An inset frame on the page: the names of its regions stay inside it, and no other name or
/// leader line enters it.
#[derive(Clone, Debug)]
pub struct InsetBox {
    pub box_mm: BoxMm,
    pub regions: std::collections::BTreeSet<RegionId>,
    /// Where the inset's scale caption is written, if it has one: no name may cover it.
    pub caption_mm: Option<BoxMm>,
}

/// Places the names of `doc`'s outlined regions for a page laid out as `frame`, keeping the
/// names of inset regions inside their `insets` frames and every other name out of them.
pub fn place(
    doc: &Document,
    frame: &MapFrame,
    options: &SvgOptions,
    lines: &Lines,
    insets: &[InsetBox],
) -> (Vec<Placement>, LabelReport) {
    let mut report = LabelReport::default();
    let mm2_per_unit2 = frame.mm_per_unit * frame.mm_per_unit;
    let mut candidates: Vec<Candidate> = Vec::new();
    for (id, region) in doc.regions() {
        let Some(geometry) = &region.geometry else {
            continue;
        };
        let name = region.name.trim();
        if name.is_empty() {
            continue;
        }
        let rings: Vec<Vec<Point>> = geometry
            .polygons
            .iter()
            .flat_map(|p| std::iter::once(&p.exterior).chain(p.holes.iter()))
            .map(|r| r.iter().map(|p| frame.to_page_mm(*p)).collect())
            .collect();
        let largest = geometry.polygons.iter().max_by(|a, b| {
            let area = |p: &crate::doc::Polygon| signed_area(&p.exterior).abs();
            area(a).total_cmp(&area(b))
        });
        let mut part_box = [[f64::INFINITY; 2], [f64::NEG_INFINITY; 2]];
        let pole = largest.and_then(|p| {
            let part: Vec<Vec<Point>> = std::iter::once(&p.exterior)
                .chain(p.holes.iter())
                .map(|r| r.iter().map(|q| frame.to_page_mm(*q)).collect())
                .collect();
            for q in &part[0] {
                part_box = [
                    [part_box[0][0].min(q[0]), part_box[0][1].min(q[1])],
                    [part_box[1][0].max(q[0]), part_box[1][1].max(q[1])],
                ];
            }
            let refs: Vec<&[Point]> = part.iter().map(Vec::as_slice).collect();
            pole_of_inaccessibility(&refs, 0.05)
        });
        let water = region.role == Role::Water;
        candidates.push(Candidate {
            id: *id,
            name: name.to_string(),
            area_mm2: geometry.area() * mm2_per_unit2,
            rings,
            pole,
            part_box,
            water,
            fill: (!water).then(|| land_fill(doc, *id)),
        });
    }
    report.named = candidates.len();
    // Largest first; ties by id, so the result never depends on anything but the document.
    candidates.sort_by(|a, b| b.area_mm2.total_cmp(&a.area_mm2).then(a.id.cmp(&b.id)));

    let sizes = sizes_mm(options);
    let mut placed: Placed = RTree::new();
    // The markers of regions without outlines are drawn over the map: no name may cover one.
    for region in doc.regions().values().filter(|r| r.geometry.is_none()) {
        let [x, y] = frame.to_page_mm(region.anchor);
        let r = MARKER_RADIUS_MM;
        placed.insert(GeomWithData::new(
            Rectangle::from_corners([x - r, y - r], [x + r, y + r]),
            usize::MAX,
        ));
    }
    for caption in insets.iter().filter_map(|i| i.caption_mm) {
        placed.insert(GeomWithData::new(
            Rectangle::from_corners(caption[0], caption[1]),
            usize::MAX,
        ));
    }
    let mut out: Vec<Placement> = Vec::new();
    let mut pending: Vec<&Candidate> = Vec::new();
    for c in &candidates {
        match place_inside(c, &sizes, &placed) {
            Some((centre, size, b, set)) => {
                let (ink, halo) = inks(c);
                placed.insert(GeomWithData::new(
                    Rectangle::from_corners(b[0], b[1]),
                    out.len(),
                ));
                out.push(Placement {
                    id: c.id,
                    text: c.name.clone(),
                    lines: set,
                    centre_mm: centre,
                    size_mm: size,
                    box_mm: b,
                    ink,
                    halo,
                    italic: c.water,
                    leader_mm: None,
                });
                report.inside += 1;
            }
            None => pending.push(c),
        }
    }

    // Leader lines, for what is left, largest first again.
    let land = LandIndex::new(&candidates);
    let page_box: BoxMm = frame.map_box_mm();
    let inset_boxes: Vec<BoxMm> = insets.iter().map(|i| i.box_mm).collect();
    let mut leaders: Vec<[[f64; 2]; 2]> = Vec::new();
    // Coastal regions (not islands or enclaves) take leader lines only on a map where at least a
    // quarter of the names went inside: there a few small coastal names finish the picture, while
    // on a map too dense for names (counties on a page) names along the coast alone would look
    // like a random choice.
    let coastal_leaders = report.inside * 4 >= report.named;
    for c in pending {
        let placement = if options.leaders && c.area_mm2 < LEADER_MAX_AREA_MM2 {
            lines
                .touches
                .get(&c.id)
                .and_then(|t| {
                    let host = t
                        .enclosed_by()
                        .and_then(|h| candidates.iter().find(|o| o.id == h));
                    let coastal = t.unshared_segments > 0
                        || t.neighbours
                            .iter()
                            .any(|n| doc.regions().get(n).is_some_and(|r| r.role == Role::Water));
                    // Water takes a leader only as a lake inside one region.
                    let open = !c.water && (t.is_island() || (coastal_leaders && coastal));
                    (host.is_some() || open).then_some(host)
                })
                .and_then(|host| {
                    let rings = host.map(|h| h.rings.as_slice());
                    // An inset region's name stays in its frame; others keep out of every frame.
                    let (page, avoid) = match insets.iter().find(|i| i.regions.contains(&c.id)) {
                        Some(inset) => (inset.box_mm, &[][..]),
                        None => (page_box, inset_boxes.as_slice()),
                    };
                    let bounds = Bounds { page: &page, avoid };
                    place_with_leader(c, sizes[0], rings, &placed, &land, &bounds, &leaders)
                        .map(|found| (found, host))
                })
        } else {
            None
        };
        match placement {
            Some(((centre, b, leader, set), host)) => {
                let (ink, halo) = leader_inks(c, host);
                placed.insert(GeomWithData::new(
                    Rectangle::from_corners(b[0], b[1]),
                    out.len(),
                ));
                leaders.push(leader);
                out.push(Placement {
                    id: c.id,
                    text: c.name.clone(),
                    lines: set,
                    centre_mm: centre,
                    size_mm: sizes[0],
                    box_mm: b,
                    ink,
                    halo,
                    italic: c.water,
                    leader_mm: Some(leader),
                });
                report.with_leader += 1;
            }
            None => report.left_out.push(c.name.clone()),
        }
    }

    // Regions without outlines (sketches): the name above the marker, if it is clear.
    for (id, region) in doc.regions() {
        let name = region.name.trim();
        if region.geometry.is_some() || name.is_empty() {
            continue;
        }
        report.named += 1;
        let size = sizes[0];
        let [x, y] = frame.to_page_mm(region.anchor);
        let centre = [
            x,
            y - MARKER_RADIUS_MM - 1.0 - BASELINE_BELOW_CENTRE_EM * size,
        ];
        let set = vec![name.to_string()];
        let b = label_box(centre, &set, size);
        if collides(&placed, &b) {
            report.left_out.push(name.to_string());
            continue;
        }
        placed.insert(GeomWithData::new(
            Rectangle::from_corners(b[0], b[1]),
            out.len(),
        ));
        out.push(Placement {
            id: *id,
            text: name.to_string(),
            lines: set,
            centre_mm: centre,
            size_mm: size,
            box_mm: b,
            ink: DARK_INK,
            halo: WHITE,
            italic: false,
            leader_mm: None,
        });
        report.beside_marker += 1;
    }
    (out, report)
}

/// Ink and halo of a name placed outside its region: inside a host region (an enclave's or a
/// lake's surroundings) the host's fill decides, as for the host's own name, with water names in
/// their blue when it reaches the ratio there; on the open page or water, dark ink (deep blue for
/// water) on a white halo.
fn leader_inks(c: &Candidate, host: Option<&Candidate>) -> (Rgb, Rgb) {
    match host.and_then(|h| h.fill) {
        Some(fill) => {
            let ink = if c.water
                && contrast::contrast_ratio(WATER_INK, fill) >= contrast::MIN_TEXT_CONTRAST
            {
                WATER_INK
            } else {
                contrast::ink_for(fill)
            };
            (ink, contrast::halo_for(ink, fill))
        }
        None if c.water => (WATER_INK, WHITE),
        None => (DARK_INK, WHITE),
    }
}

fn inks(c: &Candidate) -> (Rgb, Rgb) {
    match c.fill {
        None => (WATER_INK, WATER_GROUND),
        Some(fill) => {
            let ink = contrast::ink_for(fill);
            (ink, contrast::halo_for(ink, fill))
        }
    }
}

/// Where a name goes inside its region: centre, size, box and lines.
type Inside = (Point, f64, BoxMm, Vec<String>);

fn place_inside(c: &Candidate, sizes: &[f64; 3], placed: &Placed) -> Option<Inside> {
    let (pole, distance) = c.pole?;
    let step = size_step(c.area_mm2);
    let sets = layouts(&c.name);
    for &size in sizes[..=step].iter().rev() {
        for set in &sets {
            let b0 = label_box([0.0, 0.0], set, size);
            let (w, h) = (b0[1][0] - b0[0][0], b0[1][1] - b0[0][1]);
            // A box inside the region keeps its centre at least half its smaller side from the
            // outline, so when even the pole is closer than that, no position can work.
            if distance < w.min(h) / 2.0 + INSIDE_MARGIN_MM {
                continue;
            }
            // Near the pole first (in steps of a quarter of the box's width and half its height),
            // then anywhere in the largest part on a grid of at most about 600 points, nearest the
            // pole first: a long name may fit only along a part's widest stretch.
            let mut centres: Vec<Point> = Vec::new();
            for dy in [0.0, -0.5, 0.5, -1.0, 1.0, -1.5, 1.5] {
                for dx in [0.0, -0.25, 0.25, -0.5, 0.5] {
                    centres.push([pole[0] + dx * w, pole[1] + dy * h]);
                }
            }
            let pb = &c.part_box;
            let span = [pb[1][0] - pb[0][0] - w, pb[1][1] - pb[0][1] - h];
            if span[0] > 0.0 && span[1] > 0.0 {
                let cell = (span[0] * span[1] / 600.0).sqrt().max(h / 2.0);
                let mut grid = Vec::new();
                let (nx, ny) = ((span[0] / cell) as usize, (span[1] / cell) as usize);
                for i in 0..=nx {
                    for j in 0..=ny {
                        grid.push([
                            pb[0][0] + w / 2.0 + i as f64 * cell,
                            pb[0][1] + h / 2.0 + j as f64 * cell,
                        ]);
                    }
                }
                let d2 = |p: &Point| (p[0] - pole[0]).powi(2) + (p[1] - pole[1]).powi(2);
                grid.sort_by(|a, b| d2(a).total_cmp(&d2(b)));
                centres.extend(grid);
            }
            for centre in centres {
                let b = label_box(centre, set, size);
                if !collides(placed, &b) && box_inside(&c.rings, &grown(&b, INSIDE_MARGIN_MM)) {
                    return Some((centre, size, b, set.clone()));
                }
            }
        }
    }
    None
}

/// The land outlines in page millimetres, for keeping names with leader lines off the land.
struct LandIndex<'a> {
    segments: RTree<Line<[f64; 2]>>,
    regions: RTree<GeomWithData<Rectangle<[f64; 2]>, usize>>,
    candidates: &'a [Candidate],
}

impl<'a> LandIndex<'a> {
    fn new(candidates: &'a [Candidate]) -> LandIndex<'a> {
        let mut segments = Vec::new();
        let mut regions = Vec::new();
        for (k, c) in candidates.iter().enumerate() {
            if c.water {
                continue;
            }
            let mut lo = [f64::INFINITY; 2];
            let mut hi = [f64::NEG_INFINITY; 2];
            for ring in &c.rings {
                for (p, q) in crate::geometry::edges(ring) {
                    segments.push(Line::new(p, q));
                    lo = [lo[0].min(p[0]), lo[1].min(p[1])];
                    hi = [hi[0].max(p[0]), hi[1].max(p[1])];
                }
            }
            if lo[0] <= hi[0] {
                regions.push(GeomWithData::new(Rectangle::from_corners(lo, hi), k));
            }
        }
        LandIndex {
            segments: RTree::bulk_load(segments),
            regions: RTree::bulk_load(regions),
            candidates,
        }
    }

    /// True when the box touches no land: no land outline through it, its centre on no land.
    fn clear_of_land(&self, b: &BoxMm) -> bool {
        let env = AABB::from_corners(b[0], b[1]);
        if self
            .segments
            .locate_in_envelope_intersecting(env)
            .any(|l| segment_meets_box(l.from, l.to, b))
        {
            return false;
        }
        let centre = box_points(b)[4];
        !self.regions.locate_all_at_point(centre).any(|r| {
            point_in_rings(
                self.candidates[r.data].rings.iter().map(Vec::as_slice),
                centre,
            )
        })
    }
}

/// Where a name with a leader line may go: inside `page`, clear of every `avoid` box.
struct Bounds<'a> {
    page: &'a BoxMm,
    avoid: &'a [BoxMm],
}

fn place_with_leader(
    c: &Candidate,
    size: f64,
    host: Option<&[Vec<Point>]>,
    placed: &Placed,
    land: &LandIndex,
    page: &Bounds,
    leaders: &[[[f64; 2]; 2]],
) -> Option<Outside> {
    // Start the line at the pole (inside the region by construction).
    let (start, _) = c.pole?;
    for set in layouts(&c.name) {
        if let Some(found) =
            place_set_with_leader(c, &set, start, size, host, placed, land, page, leaders)
        {
            return Some(found);
        }
    }
    None
}

/// Where a name with a leader line goes: centre, box, the line, and the lines of the name.
type Outside = (Point, BoxMm, [[f64; 2]; 2], Vec<String>);

#[allow(clippy::too_many_arguments)]
fn place_set_with_leader(
    c: &Candidate,
    set: &[String],
    start: Point,
    size: f64,
    host: Option<&[Vec<Point>]>,
    placed: &Placed,
    land: &LandIndex,
    bounds: &Bounds,
    leaders: &[[[f64; 2]; 2]],
) -> Option<Outside> {
    let page = bounds.page;
    let b0 = label_box([0.0, 0.0], set, size);
    let (half_w, half_h) = ((b0[1][0] - b0[0][0]) / 2.0, (b0[1][1] - b0[0][1]) / 2.0);
    // Sixteen directions, right and left first (a name beside its place reads best), at growing
    // distances from the region.
    let mut directions: Vec<f64> = (0..16)
        .map(|k| f64::from(k) * std::f64::consts::PI / 8.0)
        .collect();
    directions.sort_by(|a, b| a.sin().abs().total_cmp(&b.sin().abs()).then(a.total_cmp(b)));
    for gap in [1.5, 3.0, 5.0, 8.0] {
        for &angle in &directions {
            let (dx, dy) = (angle.cos(), angle.sin());
            // From the pole to the box's near side: the gap plus the half-extent along the ray.
            let reach = gap + half_w * dx.abs() + half_h * dy.abs();
            let centre = [start[0] + dx * reach, start[1] + dy * reach];
            let b = label_box(centre, set, size);
            let inside_page = b[0][0] >= page[0][0]
                && b[0][1] >= page[0][1]
                && b[1][0] <= page[1][0]
                && b[1][1] <= page[1][1];
            let in_an_inset = bounds.avoid.iter().any(|a| {
                b[0][0] < a[1][0] && a[0][0] < b[1][0] && b[0][1] < a[1][1] && a[0][1] < b[1][1]
            });
            if !inside_page || in_an_inset || collides(placed, &b) {
                continue;
            }
            let ok_ground = match host {
                Some(rings) => box_inside(rings, &b) && !box_meets_region(&c.rings, &b),
                None => land.clear_of_land(&b),
            };
            if !ok_ground {
                continue;
            }
            // The line runs from the pole to the nearest point of the box, and must not cross
            // another name or another leader line.
            let end = [
                centre[0].clamp(b[0][0], b[1][0]),
                centre[1].clamp(b[0][1], b[1][1]),
            ];
            let end = nearest_on_box(start, &b).unwrap_or(end);
            let line = [start, end];
            let env = AABB::from_corners(
                [start[0].min(end[0]), start[1].min(end[1])],
                [start[0].max(end[0]), start[1].max(end[1])],
            );
            let crosses_label = placed
                .locate_in_envelope_intersecting(env)
                .any(|r| segment_meets_box(start, end, &r.geom().envelope_box()));
            let crosses_leader = leaders
                .iter()
                .any(|l| crate::geometry::segments_intersect(l[0], l[1], start, end));
            let crosses_inset = bounds
                .avoid
                .iter()
                .any(|a| segment_meets_box(start, end, a));
            if crosses_label || crosses_leader || crosses_inset {
                continue;
            }
            return Some((centre, b, line, set.to_vec()));
        }
    }
    None
}

fn box_meets_region(rings: &[Vec<Point>], b: &BoxMm) -> bool {
    rings_meet_box(rings, b)
        || box_points(b)
            .iter()
            .any(|p| point_in_rings(rings.iter().map(Vec::as_slice), *p))
}

/// The point of the box's outline nearest to `p` (for `p` outside the box).
fn nearest_on_box(p: Point, b: &BoxMm) -> Option<Point> {
    let q = [p[0].clamp(b[0][0], b[1][0]), p[1].clamp(b[0][1], b[1][1])];
    (q != p).then_some(q)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::export::contrast::{MIN_TEXT_CONTRAST, contrast_ratio};

    #[test]
    fn water_ink_reaches_the_text_contrast_on_the_water_ground() {
        // WCAG 2.1 success criterion 1.4.3: 4.5:1 for normal text.
        assert!(contrast_ratio(WATER_INK, WATER_GROUND) >= MIN_TEXT_CONTRAST);
        // And it is blue: the blue channel leads.
        assert!(WATER_INK.0[2] > WATER_INK.0[0] && WATER_INK.0[2] > WATER_INK.0[1]);
    }

    #[test]
    fn width_estimate_is_never_narrower_than_either_font() {
        // Spot values from the two fonts' hmtx tables (advance / unitsPerEm, read with a small
        // script): Ubuntu Light "W" 0.886 em and DejaVu Sans "W" 0.989 em; "i" 0.237 and 0.278.
        assert!(char_width_em('W') >= 0.989);
        assert!(char_width_em('i') >= 0.278);
        assert!(char_width_em('é') >= 1.0);
        assert!((text_width_mm("ii", 2.0) - 2.0 * 2.0 * 0.28).abs() < 1e-12);
    }

    #[test]
    fn names_of_several_words_may_take_two_lines_broken_where_the_longer_line_is_shortest() {
        assert_eq!(layouts("Texas"), vec![vec!["Texas".to_string()]]);
        let two = layouts("Lake and Peninsula");
        // By hand from the width table: "Lake and" is 4.60 em and "Peninsula" 4.86 em, while
        // "Lake" and "and Peninsula" would make a 7.08 em line.
        assert_eq!(
            two[1],
            vec!["Lake and".to_string(), "Peninsula".to_string()]
        );
        let b1 = label_box([0.0, 0.0], &two[0], 2.0);
        let b2 = label_box([0.0, 0.0], &two[1], 2.0);
        assert!(b2[1][0] < b1[1][0] && b2[1][1] > b1[1][1]);
    }

    #[test]
    fn segment_and_box() {
        let b = [[0.0, 0.0], [2.0, 1.0]];
        assert!(segment_meets_box([-1.0, 0.5], [3.0, 0.5], &b));
        assert!(segment_meets_box([1.0, 0.5], [1.5, 0.6], &b));
        assert!(!segment_meets_box([-1.0, 2.0], [3.0, 2.0], &b));
        assert!(!segment_meets_box([-1.0, -1.0], [-0.1, 3.0], &b));
        let square = vec![vec![[0.0, 0.0], [10.0, 0.0], [10.0, 10.0], [0.0, 10.0]]];
        assert!(box_inside(&square, &[[1.0, 1.0], [9.0, 2.0]]));
        assert!(!box_inside(&square, &[[1.0, 1.0], [11.0, 2.0]]));
        assert_eq!(size_step(AREA_LARGE_MM2), 2);
        assert_eq!(size_step(AREA_MEDIUM_MM2 - 1.0), 0);
    }
}

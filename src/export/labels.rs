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
//! - **Turned names**: when no level name fits and the largest part is long and narrow
//!   ([`long_axis`]: its long axis at least [`TURN_MIN_ELONGATION`] times its short one and at
//!   least [`TURN_MIN_DEGREES`] from level), the name is set along the long axis (and 12 degrees
//!   either side), never upside down: between -90 degrees (reading upwards) and 90.
//! - **No overlap**: no two label boxes overlap (they keep [`LABEL_GAP_MM`] apart), tested on the
//!   turned boxes themselves ([`quads_overlap`]).
//! - **Leader lines**: a small region whose name does not fit inside, and which is an island, an
//!   enclave or on the coast, may have its name placed nearby outside (on empty page or water, or
//!   for an enclave inside the region around it) with a thin line from inside the region to it.
//!   A larger coastal region may too, on a map where most names go inside: its line starts just
//!   inside the coast ([`LEADER_FROM_COAST_MM`]) and its name sits offshore. Names with leader
//!   lines are level.
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
    /// The box it reserves (text box plus halo), in page millimetres, before it is turned.
    pub box_mm: BoxMm,
    /// The turn of the name about its centre, in degrees clockwise on the page: 0 for a level
    /// name; a name set along a long narrow region follows the region's long axis.
    pub angle_deg: f64,
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
    /// Which of `rings` is the largest part's outline.
    part_ring: usize,
    /// The long axis of the largest part, when it is long and narrow ([`long_axis`]).
    axis: Option<f64>,
    water: bool,
    fill: Option<Rgb>,
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

/// A box turned about its centre: the corners in order round it, in page millimetres.
pub type Quad = [Point; 4];

/// The corners of `b` turned by `angle` (radians, clockwise on the page as y grows down) about
/// its centre.
pub fn turned(b: &BoxMm, angle: f64) -> Quad {
    let c = [(b[0][0] + b[1][0]) / 2.0, (b[0][1] + b[1][1]) / 2.0];
    let (sin, cos) = angle.sin_cos();
    [b[0], [b[1][0], b[0][1]], b[1], [b[0][0], b[1][1]]].map(|p| {
        let (x, y) = (p[0] - c[0], p[1] - c[1]);
        [c[0] + x * cos - y * sin, c[1] + x * sin + y * cos]
    })
}

/// The smallest upright box round a quad.
pub fn quad_box(q: &Quad) -> BoxMm {
    let mut b = [[f64::INFINITY; 2], [f64::NEG_INFINITY; 2]];
    for p in q {
        b = [
            [b[0][0].min(p[0]), b[0][1].min(p[1])],
            [b[1][0].max(p[0]), b[1][1].max(p[1])],
        ];
    }
    b
}

/// True when two convex quads overlap with area (separating axis test on their edge normals).
pub fn quads_overlap(a: &Quad, b: &Quad) -> bool {
    for quad in [a, b] {
        for k in 0..4 {
            let (p, q) = (quad[k], quad[(k + 1) % 4]);
            let axis = [q[1] - p[1], p[0] - q[0]];
            let project = |r: &Quad| {
                r.iter()
                    .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), v| {
                        let d = v[0] * axis[0] + v[1] * axis[1];
                        (lo.min(d), hi.max(d))
                    })
            };
            let (alo, ahi) = project(a);
            let (blo, bhi) = project(b);
            if ahi <= blo || bhi <= alo {
                return false;
            }
        }
    }
    true
}

/// The labels, markers and captions placed so far: their upright boxes in an R-tree for the
/// search, and their true (possibly turned) outlines for the test.
struct Placed {
    tree: RTree<GeomWithData<Rectangle<[f64; 2]>, usize>>,
    quads: Vec<Quad>,
}

impl Placed {
    fn new() -> Placed {
        Placed {
            tree: RTree::new(),
            quads: Vec::new(),
        }
    }

    /// Reserves the box `b` turned by `angle` about its centre.
    fn insert(&mut self, b: &BoxMm, angle: f64) {
        let quad = turned(b, angle);
        let bb = quad_box(&quad);
        self.tree.insert(GeomWithData::new(
            Rectangle::from_corners(bb[0], bb[1]),
            self.quads.len(),
        ));
        self.quads.push(quad);
    }

    /// True when the box `b` turned by `angle` comes within the label gap of anything placed.
    fn collides(&self, b: &BoxMm, angle: f64) -> bool {
        // Boxes keep the gap apart: grow the new one by the gap and ask for any overlap.
        let g = turned(&grown(b, LABEL_GAP_MM), angle);
        let gb = quad_box(&g);
        self.tree
            .locate_in_envelope_intersecting(AABB::from_corners(gb[0], gb[1]))
            .any(|r| quads_overlap(&g, &self.quads[r.data]))
    }

    /// True when the segment `p q` meets the upright box of anything placed.
    fn crossed_by(&self, p: Point, q: Point) -> bool {
        let env = AABB::from_corners(
            [p[0].min(q[0]), p[1].min(q[1])],
            [p[0].max(q[0]), p[1].max(q[1])],
        );
        self.tree
            .locate_in_envelope_intersecting(env)
            .any(|r| segment_meets_box(p, q, &r.geom().envelope_box()))
    }
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
        // The largest part, and where its outline sits among `rings`.
        let largest = geometry
            .polygons
            .iter()
            .enumerate()
            .max_by(|(_, a), (_, b)| {
                let area = |p: &crate::doc::Polygon| signed_area(&p.exterior).abs();
                area(a).total_cmp(&area(b))
            })
            .map(|(k, _)| k);
        let part_ring: usize = geometry.polygons[..largest.unwrap_or(0)]
            .iter()
            .map(|p| 1 + p.holes.len())
            .sum();
        let pole = largest.and_then(|k| {
            let p = &geometry.polygons[k];
            let part = &rings[part_ring..part_ring + 1 + p.holes.len()];
            let refs: Vec<&[Point]> = part.iter().map(Vec::as_slice).collect();
            pole_of_inaccessibility(&refs, 0.05)
        });
        let axis = largest.and_then(|_| long_axis(&rings[part_ring]));
        let water = region.role == Role::Water;
        candidates.push(Candidate {
            id: *id,
            name: name.to_string(),
            area_mm2: geometry.area() * mm2_per_unit2,
            rings,
            pole,
            part_ring,
            axis,
            water,
            fill: (!water).then(|| land_fill(doc, *id)),
        });
    }
    report.named = candidates.len();
    // Largest first; ties by id, so the result never depends on anything but the document.
    candidates.sort_by(|a, b| b.area_mm2.total_cmp(&a.area_mm2).then(a.id.cmp(&b.id)));

    let sizes = sizes_mm(options);
    let mut placed = Placed::new();
    // The markers of regions without outlines are drawn over the map: no name may cover one.
    for region in doc.regions().values().filter(|r| r.geometry.is_none()) {
        let [x, y] = frame.to_page_mm(region.anchor);
        let r = MARKER_RADIUS_MM;
        placed.insert(&[[x - r, y - r], [x + r, y + r]], 0.0);
    }
    for caption in insets.iter().filter_map(|i| i.caption_mm) {
        placed.insert(&caption, 0.0);
    }
    let mut out: Vec<Placement> = Vec::new();
    let mut pending: Vec<&Candidate> = Vec::new();
    for c in &candidates {
        match place_inside(c, &sizes, &placed) {
            Some(Inside {
                centre,
                size,
                b,
                lines: set,
                angle,
            }) => {
                let (ink, halo) = inks(c);
                placed.insert(&b, angle);
                out.push(Placement {
                    id: c.id,
                    text: c.name.clone(),
                    lines: set,
                    centre_mm: centre,
                    size_mm: size,
                    box_mm: b,
                    angle_deg: angle.to_degrees(),
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
        // A larger region takes a leader line only from its coast, on a map where names go
        // inside: its name then sits offshore, beside the coast.
        let small = c.area_mm2 < LEADER_MAX_AREA_MM2;
        let placement = if options.leaders && (small || coastal_leaders) {
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
                    let open =
                        !c.water && ((small && t.is_island()) || (coastal_leaders && coastal));
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
                placed.insert(&b, 0.0);
                leaders.push(leader);
                out.push(Placement {
                    id: c.id,
                    text: c.name.clone(),
                    lines: set,
                    centre_mm: centre,
                    size_mm: sizes[0],
                    box_mm: b,
                    angle_deg: 0.0,
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
        if placed.collides(&b, 0.0) {
            report.left_out.push(name.to_string());
            continue;
        }
        placed.insert(&b, 0.0);
        out.push(Placement {
            id: *id,
            text: name.to_string(),
            lines: set,
            centre_mm: centre,
            size_mm: size,
            box_mm: b,
            angle_deg: 0.0,
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

/// Where a name goes inside its region.
struct Inside {
    /// The centre on the page.
    centre: Point,
    size: f64,
    /// The box round `centre` before it is turned.
    b: BoxMm,
    lines: Vec<String>,
    /// The turn, in radians clockwise on the page.
    angle: f64,
}

/// A turn by `angle` about `origin`, and back.
#[derive(Clone, Copy)]
struct Turn {
    origin: Point,
    sin: f64,
    cos: f64,
}

impl Turn {
    fn new(origin: Point, angle: f64) -> Turn {
        let (sin, cos) = angle.sin_cos();
        Turn { origin, sin, cos }
    }
    /// Page to the turned frame (where the name is level).
    fn in_frame(&self, p: Point) -> Point {
        let (x, y) = (p[0] - self.origin[0], p[1] - self.origin[1]);
        [
            self.origin[0] + x * self.cos + y * self.sin,
            self.origin[1] - x * self.sin + y * self.cos,
        ]
    }
    /// The turned frame back to the page.
    fn onto_page(&self, p: Point) -> Point {
        let (x, y) = (p[0] - self.origin[0], p[1] - self.origin[1]);
        [
            self.origin[0] + x * self.cos - y * self.sin,
            self.origin[1] + x * self.sin + y * self.cos,
        ]
    }
}

/// A long narrow part counts as one whose long axis is at least this many times its short one
/// (square roots of the second moments of its area).
pub const TURN_MIN_ELONGATION: f64 = 1.5;
/// A name is turned only when the long axis is at least this far from level, in degrees.
pub const TURN_MIN_DEGREES: f64 = 10.0;

/// The long axis of a ring, in radians clockwise from level on the page and within [-90°, 90°),
/// when the ring is long and narrow enough for a turned name ([`TURN_MIN_ELONGATION`]).
pub fn long_axis(ring: &[Point]) -> Option<f64> {
    // Second moments of the area (the standard polygon sums, over each edge's cross product).
    let (mut a, mut cx, mut cy, mut sxx, mut syy, mut sxy) = (0.0, 0.0, 0.0, 0.0, 0.0, 0.0);
    let o = *ring.first()?;
    for (p, q) in crate::geometry::edges(ring) {
        let (x0, y0, x1, y1) = (p[0] - o[0], p[1] - o[1], q[0] - o[0], q[1] - o[1]);
        let c = x0 * y1 - x1 * y0;
        a += c;
        cx += (x0 + x1) * c;
        cy += (y0 + y1) * c;
        sxx += c * (x0 * x0 + x0 * x1 + x1 * x1);
        syy += c * (y0 * y0 + y0 * y1 + y1 * y1);
        sxy += c * (x0 * y1 + 2.0 * x0 * y0 + 2.0 * x1 * y1 + x1 * y0);
    }
    if a.abs() < 1e-12 {
        return None;
    }
    let area = a / 2.0;
    let (cx, cy) = (cx / (6.0 * area), cy / (6.0 * area));
    let mxx = sxx / 12.0 / area - cx * cx;
    let myy = syy / 12.0 / area - cy * cy;
    let mxy = sxy / 24.0 / area - cx * cy;
    let mean = (mxx + myy) / 2.0;
    let spread = (((mxx - myy) / 2.0).powi(2) + mxy * mxy).sqrt();
    let (long, short) = (mean + spread, mean - spread);
    if short <= 0.0 || (long / short).sqrt() < TURN_MIN_ELONGATION {
        return None;
    }
    let angle = 0.5 * (2.0 * mxy).atan2(mxx - myy);
    // Into [-90°, 90°): a name never reads upside down, and an upright one reads upwards.
    let half = std::f64::consts::FRAC_PI_2;
    let angle = (angle + half).rem_euclid(std::f64::consts::PI) - half;
    (angle.abs().to_degrees() >= TURN_MIN_DEGREES).then_some(angle)
}

fn place_inside(c: &Candidate, sizes: &[f64; 3], placed: &Placed) -> Option<Inside> {
    let (pole, _) = c.pole?;
    if let Some(found) = place_in_frame(c, sizes, placed, Turn::new(pole, 0.0), 0.0, &c.rings) {
        return Some(found);
    }
    // Level names did not fit: along the long axis of a long narrow part, whole degrees.
    let axis = c.axis?.to_degrees().round();
    let (lo, hi) = (-90.0, 90.0 - 1e-9);
    let mut angles = vec![axis];
    for delta in [-12.0f64, 12.0] {
        let a = axis + delta;
        if (lo..=hi).contains(&a) && a.abs() >= TURN_MIN_DEGREES {
            angles.push(a);
        }
    }
    for degrees in angles {
        let angle = f64::to_radians(degrees);
        let turn = Turn::new(pole, angle);
        let rings: Vec<Vec<Point>> = c
            .rings
            .iter()
            .map(|r| r.iter().map(|p| turn.in_frame(*p)).collect())
            .collect();
        if let Some(found) = place_in_frame(c, sizes, placed, turn, angle, &rings) {
            return Some(found);
        }
    }
    None
}

/// Searches for a level box in the frame turned by `turn` (where `rings` are the region's
/// outlines), testing collisions on the page with the box turned back.
fn place_in_frame(
    c: &Candidate,
    sizes: &[f64; 3],
    placed: &Placed,
    turn: Turn,
    angle: f64,
    rings: &[Vec<Point>],
) -> Option<Inside> {
    let (pole, distance) = c.pole?;
    let step = size_step(c.area_mm2);
    let sets = layouts(&c.name);
    let mut pb = [[f64::INFINITY; 2], [f64::NEG_INFINITY; 2]];
    for q in &rings[c.part_ring] {
        pb = [
            [pb[0][0].min(q[0]), pb[0][1].min(q[1])],
            [pb[1][0].max(q[0]), pb[1][1].max(q[1])],
        ];
    }
    for &size in sizes[..=step].iter().rev() {
        for set in &sets {
            let b0 = label_box([0.0, 0.0], set, size);
            let (w, h) = (b0[1][0] - b0[0][0], b0[1][1] - b0[0][1]);
            // A box inside the region keeps its centre at least half its smaller side from the
            // outline, so when even the pole is closer than that, no position can work; nor can
            // one when the part is narrower than the box along its level.
            if distance < w.min(h) / 2.0 + INSIDE_MARGIN_MM || pb[1][0] - pb[0][0] < w {
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
                let page_centre = turn.onto_page(centre);
                let on_page = label_box(page_centre, set, size);
                if !placed.collides(&on_page, angle)
                    && box_inside(
                        rings,
                        &grown(&label_box(centre, set, size), INSIDE_MARGIN_MM),
                    )
                {
                    return Some(Inside {
                        centre: page_centre,
                        size,
                        b: on_page,
                        lines: set.clone(),
                        angle,
                    });
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
    let (pole, _) = c.pole?;
    for set in layouts(&c.name) {
        if let Some(found) =
            place_set_with_leader(c, &set, pole, size, host, placed, land, page, leaders)
        {
            return Some(found);
        }
    }
    None
}

/// How far a ray from `origin` along `dir` (a unit vector) runs before it leaves `ring` for the
/// last time: the largest distance at which it crosses the outline.
fn last_exit(ring: &[Point], origin: Point, dir: [f64; 2]) -> f64 {
    let mut far = 0.0f64;
    for (p, q) in crate::geometry::edges(ring) {
        let e = [q[0] - p[0], q[1] - p[1]];
        let denom = dir[0] * e[1] - dir[1] * e[0];
        if denom.abs() < 1e-12 {
            continue;
        }
        let w = [p[0] - origin[0], p[1] - origin[1]];
        let t = (w[0] * e[1] - w[1] * e[0]) / denom;
        let u = (w[0] * dir[1] - w[1] * dir[0]) / denom;
        if t > 0.0 && (0.0..=1.0).contains(&u) {
            far = far.max(t);
        }
    }
    far
}

/// A leader line starts at the pole unless the region reaches farther than this from it along
/// the line's direction (millimetres); then it starts this far inside the coast.
pub const LEADER_FROM_COAST_MM: f64 = 1.2;

/// Where a name with a leader line goes: centre, box, the line, and the lines of the name.
type Outside = (Point, BoxMm, [[f64; 2]; 2], Vec<String>);

#[allow(clippy::too_many_arguments)]
fn place_set_with_leader(
    c: &Candidate,
    set: &[String],
    pole: Point,
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
    for gap in [1.5, 3.0, 5.0, 8.0, 12.0] {
        for &angle in &directions {
            let (dx, dy) = (angle.cos(), angle.sin());
            // A small region's line starts at its pole; a larger one's just inside the coast
            // where the ray leaves the region's largest part for the last time.
            let exit = last_exit(&c.rings[c.part_ring], pole, [dx, dy]);
            let start = if exit > 3.0 * LEADER_FROM_COAST_MM {
                let s = exit - LEADER_FROM_COAST_MM;
                [pole[0] + dx * s, pole[1] + dy * s]
            } else {
                pole
            };
            if start != pole && !point_in_rings(c.rings.iter().map(Vec::as_slice), start) {
                continue;
            }
            // From the start to the box's near side: the gap plus the half-extent along the ray.
            let from = if start == pole { 0.0 } else { exit };
            let reach = from + gap + half_w * dx.abs() + half_h * dy.abs();
            let centre = [pole[0] + dx * reach, pole[1] + dy * reach];
            let b = label_box(centre, set, size);
            let inside_page = b[0][0] >= page[0][0]
                && b[0][1] >= page[0][1]
                && b[1][0] <= page[1][0]
                && b[1][1] <= page[1][1];
            let in_an_inset = bounds.avoid.iter().any(|a| {
                b[0][0] < a[1][0] && a[0][0] < b[1][0] && b[0][1] < a[1][1] && a[0][1] < b[1][1]
            });
            if !inside_page || in_an_inset || placed.collides(&b, 0.0) {
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
            let crosses_label = placed.crossed_by(start, end);
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
    fn a_long_narrow_ring_gives_its_long_axis_and_a_compact_one_none() {
        // A 10 by 2 rectangle turned by `deg` (clockwise on the page): its long axis is the
        // turn (the principal axes of a rectangle are its sides; common practice).
        for deg in [-75.0f64, -30.0, 20.0, 60.0, 89.0] {
            let (s, c) = deg.to_radians().sin_cos();
            let ring: Vec<Point> = [[-5.0, -1.0], [5.0, -1.0], [5.0, 1.0], [-5.0, 1.0]]
                .iter()
                .map(|p: &[f64; 2]| [40.0 + p[0] * c - p[1] * s, 7.0 + p[0] * s + p[1] * c])
                .collect();
            let axis = long_axis(&ring).unwrap().to_degrees();
            assert!((axis - deg).abs() < 1e-6, "{deg}: {axis}");
            // Either way round.
            let back: Vec<Point> = ring.iter().rev().copied().collect();
            assert!((long_axis(&back).unwrap().to_degrees() - deg).abs() < 1e-6);
        }
        // Straight up reads upwards: -90, never +90.
        let upright = vec![[0.0, 0.0], [2.0, 0.0], [2.0, 10.0], [0.0, 10.0]];
        assert!((long_axis(&upright).unwrap().to_degrees() + 90.0).abs() < 1e-9);
        // Level, or too compact: no turn.
        assert_eq!(
            long_axis(&[[0.0, 0.0], [10.0, 0.0], [10.0, 2.0], [0.0, 2.0]]),
            None
        );
        assert_eq!(
            long_axis(&[[0.0, 0.0], [10.0, 0.0], [10.0, 8.0], [0.0, 8.0]]),
            None
        );
    }

    #[test]
    fn turned_boxes_overlap_only_where_they_meet() {
        let b = [[0.0, 0.0], [10.0, 2.0]];
        let level = turned(&b, 0.0);
        assert!(quads_overlap(
            &level,
            &turned(&[[9.0, 1.0], [12.0, 3.0]], 0.0)
        ));
        assert!(!quads_overlap(
            &level,
            &turned(&[[10.5, 0.0], [12.0, 2.0]], 0.0)
        ));
        // A name turned upright at its centre (5, 1) crosses the level one. One turned 45
        // degrees past the level one's corner (10, 0) misses it (every point of it has x - y of
        // at least 11.29, every point of the level box at most 10), though their upright boxes
        // meet.
        assert!(quads_overlap(
            &level,
            &turned(&b, std::f64::consts::FRAC_PI_2)
        ));
        let beyond = [[7.0, -1.5], [15.0, -0.5]];
        let upright = turned(&beyond, std::f64::consts::FRAC_PI_4);
        assert!(!quads_overlap(&level, &upright));
        let q = quad_box(&upright);
        assert!(
            q[0][0] < 10.0 && q[1][1] > 0.0,
            "their upright boxes meet: {q:?}"
        );
    }

    #[test]
    fn a_ray_leaves_a_square_at_its_far_side() {
        let square = vec![[0.0, 0.0], [10.0, 0.0], [10.0, 10.0], [0.0, 10.0]];
        assert!((last_exit(&square, [2.0, 5.0], [1.0, 0.0]) - 8.0).abs() < 1e-12);
        assert!((last_exit(&square, [2.0, 5.0], [-1.0, 0.0]) - 2.0).abs() < 1e-12);
        let d = std::f64::consts::FRAC_1_SQRT_2;
        assert!((last_exit(&square, [5.0, 5.0], [d, d]) - 50f64.sqrt()).abs() < 1e-9);
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

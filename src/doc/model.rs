//! The project document: regions, borders, groups, pins, palette, colouring and settings.
//!
//! This is the single source of truth for a map. It changes only through [`crate::doc::Edit`]s applied
//! with [`Document::apply`]; its fields are private and read through methods, and a fresh document
//! is made by [`crate::doc::DocumentBuilder`]. Regions and borders sit in dense sorted vectors
//! (`store.rs`), so reading a million regions costs what reading a vector does.

use std::collections::BTreeMap;
use std::fmt;
use std::sync::{Arc, OnceLock};

use super::store::{BorderIndex, Borders, Colouring, Regions};
use crate::projection::Projection;

/// A region's stable identifier. Chosen by Tinct, saved in project files, never reused within a
/// document (the counter only grows), and independent of any graph library's indices.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub struct RegionId(pub u64);

impl fmt::Display for RegionId {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}", self.0)
    }
}

/// A same-colour group's stable identifier.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub struct GroupId(pub u64);

impl fmt::Display for GroupId {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}", self.0)
    }
}

/// A point in projected world units (metres for imported geographic data, free units for sketches).
pub type Point = [f64; 2];

/// One polygon: an exterior ring and any holes. Rings are stored without repeating the first point.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct Polygon {
    pub exterior: Vec<Point>,
    pub holes: Vec<Vec<Point>>,
}

/// A region's area on the map: one or more polygons (a multi-polygon).
#[derive(Clone, Debug, PartialEq, Default)]
pub struct Geometry {
    pub polygons: Vec<Polygon>,
}

impl Geometry {
    /// The axis-aligned bounding box `[min, max]`, or `None` when there are no points.
    pub fn bounds(&self) -> Option<[Point; 2]> {
        let mut points = self
            .polygons
            .iter()
            .flat_map(|p| p.exterior.iter().chain(p.holes.iter().flatten()));
        let first = *points.next()?;
        let mut lo = first;
        let mut hi = first;
        for p in points {
            lo = [lo[0].min(p[0]), lo[1].min(p[1])];
            hi = [hi[0].max(p[0]), hi[1].max(p[1])];
        }
        Some([lo, hi])
    }

    /// Total area (exterior minus holes), by the shoelace formula.
    pub fn area(&self) -> f64 {
        self.polygons
            .iter()
            .map(|p| {
                ring_area(&p.exterior).abs()
                    - p.holes.iter().map(|h| ring_area(h).abs()).sum::<f64>()
            })
            .sum()
    }

    /// True when every coordinate is a finite number.
    pub fn is_finite(&self) -> bool {
        self.polygons
            .iter()
            .flat_map(|p| p.exterior.iter().chain(p.holes.iter().flatten()))
            .all(|p| p[0].is_finite() && p[1].is_finite())
    }

    /// A point inside the region for its label: the middle of the widest horizontal run through the
    /// interior, over a few scan lines. Unlike the vertex average it always falls inside, even for
    /// concave outlines and rings with holes. `None` when there is no area.
    pub fn label_point(&self) -> Option<Point> {
        let [lo, hi] = self.bounds()?;
        let rings: Vec<&Vec<Point>> = self
            .polygons
            .iter()
            .flat_map(|p| std::iter::once(&p.exterior).chain(p.holes.iter()))
            .collect();
        let mut best: Option<(f64, Point)> = None;
        const LINES: usize = 15;
        for k in 0..LINES {
            // Offset the scan lines a little so they do not run exactly along horizontal edges.
            let y = lo[1] + (hi[1] - lo[1]) * (k as f64 + 0.5 + 1e-7) / LINES as f64;
            let mut xs = Vec::new();
            for ring in &rings {
                let n = ring.len();
                for i in 0..n {
                    let a = ring[i];
                    let b = ring[(i + 1) % n];
                    if (a[1] <= y) != (b[1] <= y) {
                        xs.push(a[0] + (y - a[1]) / (b[1] - a[1]) * (b[0] - a[0]));
                    }
                }
            }
            xs.sort_by(f64::total_cmp);
            for pair in xs.chunks_exact(2) {
                let width = pair[1] - pair[0];
                // Prefer runs near the vertical middle when widths are close.
                let centrality = 1.0 - ((k as f64 + 0.5) / LINES as f64 - 0.5).abs();
                let score = width * (0.75 + 0.25 * centrality);
                if best.is_none_or(|(s, _)| score > s) {
                    best = Some((score, [(pair[0] + pair[1]) / 2.0, y]));
                }
            }
        }
        best.map(|(_, p)| p)
    }

    /// Number of vertices over all rings.
    pub fn vertex_count(&self) -> usize {
        self.polygons
            .iter()
            .map(|p| p.exterior.len() + p.holes.iter().map(Vec::len).sum::<usize>())
            .sum()
    }
}

/// Signed area of a ring (positive when counter-clockwise); see [`crate::geometry::signed_area`].
pub use crate::geometry::signed_area as ring_area;

/// Whether a region takes a fill colour.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash, Default)]
pub enum Role {
    /// Land: takes a colour and must differ from its land neighbours.
    #[default]
    Land,
    /// Water or background: drawn, but takes no colour and constrains nothing.
    Water,
}

impl Role {
    /// The word used in files, JSON and the interface.
    pub fn as_str(self) -> &'static str {
        match self {
            Role::Land => "land",
            Role::Water => "water",
        }
    }
}

/// A value kept from an imported feature's attributes, so that exports can give them back.
#[derive(Clone, Debug, PartialEq)]
pub enum AttrValue {
    Null,
    Bool(bool),
    Number(f64),
    Text(String),
}

/// A region's attributes: names to values, in name order. A sorted vector rather than a tree:
/// most regions carry a handful, and a million of them cost a million small vectors, not a
/// million tree nodes.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Attributes(Vec<(String, AttrValue)>);

impl Attributes {
    /// No attributes.
    pub fn new() -> Attributes {
        Attributes(Vec::new())
    }
    /// Sets `name` to `value`; returns the value it replaces.
    pub fn insert(&mut self, name: String, value: AttrValue) -> Option<AttrValue> {
        match self.0.binary_search_by(|(k, _)| k.as_str().cmp(&name)) {
            Ok(i) => Some(std::mem::replace(&mut self.0[i].1, value)),
            Err(i) => {
                self.0.insert(i, (name, value));
                None
            }
        }
    }
    /// Removes `name`; returns its value.
    pub fn remove(&mut self, name: &str) -> Option<AttrValue> {
        self.0
            .binary_search_by(|(k, _)| k.as_str().cmp(name))
            .ok()
            .map(|i| self.0.remove(i).1)
    }
    /// The value of `name`.
    pub fn get(&self, name: &str) -> Option<&AttrValue> {
        self.0
            .binary_search_by(|(k, _)| k.as_str().cmp(name))
            .ok()
            .map(|i| &self.0[i].1)
    }
    /// `(name, value)` in name order.
    pub fn iter(&self) -> impl ExactSizeIterator<Item = (&String, &AttrValue)> {
        self.0.iter().map(|(k, v)| (k, v))
    }
    pub fn len(&self) -> usize {
        self.0.len()
    }
    pub fn is_empty(&self) -> bool {
        self.0.is_empty()
    }
}

impl FromIterator<(String, AttrValue)> for Attributes {
    /// Later values win for a name given twice, as inserting one by one would.
    fn from_iter<I: IntoIterator<Item = (String, AttrValue)>>(iter: I) -> Attributes {
        let mut items: Vec<(String, AttrValue)> = iter.into_iter().collect();
        if !items.is_sorted_by(|a, b| a.0 < b.0) {
            // Stable: among equal names the last given comes last and is kept below.
            items.sort_by(|a, b| a.0.cmp(&b.0));
            let mut kept: Vec<(String, AttrValue)> = Vec::with_capacity(items.len());
            for item in items {
                match kept.last_mut() {
                    Some(last) if last.0 == item.0 => *last = item,
                    _ => kept.push(item),
                }
            }
            items = kept;
        }
        Attributes(items)
    }
}

impl IntoIterator for Attributes {
    type Item = (String, AttrValue);
    type IntoIter = std::vec::IntoIter<(String, AttrValue)>;
    fn into_iter(self) -> Self::IntoIter {
        self.0.into_iter()
    }
}

/// One region of the map.
#[derive(Clone, Debug, PartialEq)]
pub struct Region {
    /// The name shown on the map and in lists.
    pub name: String,
    pub role: Role,
    /// Where the label or the marker of a schematic region sits, in world units.
    pub anchor: Point,
    /// The outline, if the region has one; schematic regions have none and are drawn as markers.
    /// Shared so that edits which do not touch the outline copy it cheaply.
    pub geometry: Option<Arc<Geometry>>,
    /// A fixed colour: the palette slot this region must take.
    pub pin: Option<u32>,
    /// A same-colour group (exclaves, multi-part units): all members take one colour.
    pub group: Option<GroupId>,
    /// The 0-based position of the feature in the file it was imported from.
    pub source_index: Option<u64>,
    /// Attributes carried over from the imported feature.
    pub attributes: Attributes,
}

impl Region {
    /// A land region with a name and an anchor point, and nothing else set.
    pub fn new(name: impl Into<String>, anchor: Point) -> Region {
        Region {
            name: name.into(),
            role: Role::Land,
            anchor,
            geometry: None,
            pin: None,
            group: None,
            source_index: None,
            attributes: Attributes::new(),
        }
    }
}

/// An unordered pair of distinct regions, stored with the smaller id first.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub struct RegionPair {
    a: RegionId,
    b: RegionId,
}

impl RegionPair {
    /// The pair `{x, y}`, or `None` when `x == y` (a region cannot border itself).
    pub fn new(x: RegionId, y: RegionId) -> Option<RegionPair> {
        match x.cmp(&y) {
            std::cmp::Ordering::Less => Some(RegionPair { a: x, b: y }),
            std::cmp::Ordering::Greater => Some(RegionPair { a: y, b: x }),
            std::cmp::Ordering::Equal => None,
        }
    }
    /// The smaller id.
    pub fn a(self) -> RegionId {
        self.a
    }
    /// The larger id.
    pub fn b(self) -> RegionId {
        self.b
    }
    /// True when `id` is one of the two.
    pub fn contains(self, id: RegionId) -> bool {
        self.a == id || self.b == id
    }
    /// The other region of the pair, if `id` is one of them.
    pub fn other(self, id: RegionId) -> Option<RegionId> {
        if self.a == id {
            Some(self.b)
        } else if self.b == id {
            Some(self.a)
        } else {
            None
        }
    }
}

/// How two regions came to border each other.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum BorderKind {
    /// Derived from geometry: the boundaries share a stretch of positive length.
    Shared,
    /// Derived from geometry: the regions touch only at points (a corner contact).
    Corner,
    /// Added by hand: the two must differ, whatever the geometry says.
    Manual,
}

impl BorderKind {
    /// The word used in files, JSON and the interface.
    pub fn as_str(self) -> &'static str {
        match self {
            BorderKind::Shared => "shared",
            BorderKind::Corner => "corner",
            BorderKind::Manual => "manual",
        }
    }
}

/// A border between two regions.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Border {
    pub kind: BorderKind,
    /// Length of the shared boundary in world units (0 for corner and hand-made borders).
    pub length: f64,
    /// The user removed this border: it stays on record (so re-deriving adjacency does not bring it
    /// back unnoticed) but constrains nothing.
    pub suppressed: bool,
}

impl Border {
    /// A border added by hand.
    pub fn manual() -> Border {
        Border {
            kind: BorderKind::Manual,
            length: 0.0,
            suppressed: false,
        }
    }
    /// A shared boundary of the given length.
    pub fn shared(length: f64) -> Border {
        Border {
            kind: BorderKind::Shared,
            length,
            suppressed: false,
        }
    }
    /// A corner contact.
    pub fn corner() -> Border {
        Border {
            kind: BorderKind::Corner,
            length: 0.0,
            suppressed: false,
        }
    }
}

/// A same-colour group.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Group {
    pub name: String,
}

/// An sRGB colour with 8 bits per channel.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub struct Rgb(pub [u8; 3]);

impl Rgb {
    /// `#rrggbb`, lower case.
    pub fn to_hex(self) -> String {
        format!("#{:02x}{:02x}{:02x}", self.0[0], self.0[1], self.0[2])
    }

    /// Parses `#rrggbb` or `rrggbb` (either case).
    pub fn from_hex(text: &str) -> Option<Rgb> {
        let digits = text.strip_prefix('#').unwrap_or(text);
        if digits.len() != 6 || !digits.is_ascii() {
            return None;
        }
        let channel = |i: usize| u8::from_str_radix(&digits[i..i + 2], 16).ok();
        Some(Rgb([channel(0)?, channel(2)?, channel(4)?]))
    }
}

/// One named colour of the palette.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Slot {
    pub name: String,
    pub colour: Rgb,
}

/// The fill colours a map may use, in slot order. Colourings and pins refer to slots by index.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Palette {
    pub name: String,
    pub slots: Vec<Slot>,
}

impl Default for Palette {
    /// Tinct's own default, listed in the order the colouring uses them: the four colours of the
    /// "Tinct 4" palette (fills of equal visual weight for maps in colour; every pair passes the
    /// distinctness checks of `crate::colour` in normal vision and the three simulated
    /// dichromacies), then two reserves of the same weight for maps that need more than four.
    fn default() -> Palette {
        use crate::colour::{Purpose, TINCT_4_RESERVES, default_palette_for};
        let four = default_palette_for(4, Purpose::Colour).map_or(&[][..], |p| p.slots);
        Palette {
            name: "Tinct 4 with two reserves".to_string(),
            slots: four
                .iter()
                .chain(TINCT_4_RESERVES.iter())
                .map(|(n, c)| Slot {
                    name: n.to_string(),
                    colour: Rgb(*c),
                })
                .collect(),
        }
    }
}

/// What world units mean.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum Units {
    /// Projected metres (imported geographic data).
    Metres,
    /// Free units of a sketch or of a graph loaded without geometry.
    #[default]
    Unitless,
}

impl Units {
    /// The word used in files and the interface.
    pub fn as_str(self) -> &'static str {
        match self {
            Units::Metres => "metres",
            Units::Unitless => "unitless",
        }
    }

    /// A length for people to read: metres up to 1 km, then kilometres ("850 m", "12.4 km",
    /// "335 km"); free units with three significant decimals at most.
    pub fn length_text(self, x: f64) -> String {
        match self {
            Units::Metres if x.abs() >= 100_000.0 => format!("{:.0} km", x / 1000.0),
            Units::Metres if x.abs() >= 1000.0 => format!("{:.1} km", x / 1000.0),
            Units::Metres => format!("{x:.0} m"),
            Units::Unitless if x.abs() >= 100.0 => format!("{x:.0}"),
            Units::Unitless => format!("{:.3}", x)
                .trim_end_matches('0')
                .trim_end_matches('.')
                .to_string(),
        }
    }
}

/// A coordinate reference system as a source file named it: the system of a planar map's world
/// units, written back by the GIS exports.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct Crs {
    /// Its name (for example "NAD83 / Conus Albers"); may be empty.
    pub name: String,
    /// Its EPSG code, when the file gave one.
    pub epsg: Option<u32>,
    /// Its definition as well-known text, when the file had one.
    pub wkt: Option<String>,
}

impl Crs {
    /// Whether the system is longitude/latitude (`Some(true)`), projected (`Some(false)`), or
    /// not known from its definition: by its EPSG code 4326, else by the keyword that opens its
    /// well-known text (WKT 1 `GEOGCS`/`PROJCS`, WKT 2 `GEOGCRS`/`PROJCRS` and their long forms).
    pub fn is_geographic(&self) -> Option<bool> {
        if self.epsg == Some(4326) {
            return Some(true);
        }
        let upper = self.wkt.as_deref()?.trim_start().to_ascii_uppercase();
        let opens = |words: &[&str]| words.iter().any(|w| upper.starts_with(w));
        if opens(&["GEOGCS", "GEOGCRS", "GEOGRAPHICCRS"]) {
            Some(true)
        } else if opens(&["PROJCS", "PROJCRS", "PROJECTEDCRS"]) {
            Some(false)
        } else {
            None
        }
    }
}

/// A note about questionable data found when the map was imported (a gap, an overlap, a
/// duplicate name), with the regions it is about; kept with the project.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct Note {
    pub message: String,
    pub regions: Vec<RegionId>,
}

/// Project settings that decide which recorded borders constrain the colouring.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Settings {
    /// Count corner (point) contacts as borders (queen contiguity) rather than ignoring them (rook).
    pub corners_count: bool,
    /// Shared boundaries shorter than this (in world units) count as corner contacts.
    pub min_border_length: f64,
    /// Boundaries closer than this (in world units) are treated as touching when deriving borders.
    pub tolerance: f64,
    pub units: Units,
    /// For maps imported from longitude/latitude: the equal-area projection (on the GRS 80
    /// authalic sphere) that turned them into metres, so exports can give longitude/latitude back
    /// and shared lengths can be measured on the sphere. `None` for sketches, planar data, and
    /// projects saved before Tinct recorded it. (Projects saved before Tinct chose among several
    /// projections recorded only the centre of a Lambert azimuthal one; they load as that.)
    pub projection: Option<Projection>,
    /// The map will also be copied in greyscale (photocopied, or printed in black): the palette
    /// check then also asks for lightness steps between neighbouring fills. Off by default: a
    /// map meant for colour should not pay for a copy it will never get (a greyscale-safe
    /// palette needs one dark fill, which outweighs the rest in colour).
    pub greyscale_copies: bool,
}

impl Default for Settings {
    fn default() -> Settings {
        Settings {
            corners_count: false,
            min_border_length: 0.0,
            tolerance: 0.0,
            units: Units::Unitless,
            projection: None,
            greyscale_copies: false,
        }
    }
}

/// The whole project.
#[derive(Clone, Debug, Default)]
pub struct Document {
    pub(super) title: String,
    pub(super) settings: Settings,
    pub(super) palette: Palette,
    pub(super) groups: BTreeMap<GroupId, Group>,
    /// The regions in id order, with the current colouring beside them.
    pub(super) regions: Regions,
    pub(super) borders: Borders,
    /// The next region id to hand out; only grows, so ids are never reused.
    pub(super) next_region_id: u64,
    /// The next group id to hand out; only grows.
    pub(super) next_group_id: u64,
    /// Increases on every change; not saved. Analysis results carry the revision they were made for.
    pub(super) revision: u64,
    /// The coordinate system of a planar map imported from a file that named one; set when the
    /// document is built, never edited.
    pub(super) crs: Option<Crs>,
    /// Notes from importing the map, set when the document is built.
    pub(super) notes: Vec<Note>,
    /// Derived from regions and borders when first asked for after a change.
    pub(super) index: OnceLock<Arc<BorderIndex>>,
}

/// Two documents are equal when their content is: the revision counter, the id counters and the
/// derived index are bookkeeping, not content.
impl PartialEq for Document {
    fn eq(&self, other: &Document) -> bool {
        self.title == other.title
            && self.settings == other.settings
            && self.palette == other.palette
            && self.groups == other.groups
            && self.regions == other.regions
            && self.borders == other.borders
            && self.crs == other.crs
            && self.notes == other.notes
    }
}

impl Document {
    /// An empty project with the default palette and settings.
    pub fn new(title: impl Into<String>) -> Document {
        Document {
            title: title.into(),
            next_region_id: 1,
            next_group_id: 1,
            ..Default::default()
        }
    }

    /// The project's title.
    pub fn title(&self) -> &str {
        &self.title
    }
    /// Which recorded borders constrain the colouring, and what world units mean.
    pub fn settings(&self) -> &Settings {
        &self.settings
    }
    /// The coordinate system of the world units of a planar map imported from a file that named
    /// one (a projected GeoPackage layer, a Shapefile's `.prj`); `None` otherwise.
    pub fn crs(&self) -> Option<&Crs> {
        self.crs.as_ref()
    }
    /// Notes about questionable data found when the map was imported.
    pub fn notes(&self) -> &[Note] {
        &self.notes
    }
    /// The fill colours.
    pub fn palette(&self) -> &Palette {
        &self.palette
    }
    /// The same-colour groups.
    pub fn groups(&self) -> &BTreeMap<GroupId, Group> {
        &self.groups
    }
    /// The regions, in id order.
    pub fn regions(&self) -> &Regions {
        &self.regions
    }
    /// The recorded borders (active or not), in pair order.
    pub fn borders(&self) -> &Borders {
        &self.borders
    }
    /// The current colouring: region to palette slot.
    pub fn colouring(&self) -> Colouring<'_> {
        Colouring::of(&self.regions)
    }
    /// The slots of every border's regions and the borders of every region, derived once per
    /// revision (on first use after a change).
    pub fn border_index(&self) -> &BorderIndex {
        self.index
            .get_or_init(|| Arc::new(BorderIndex::build(&self.regions, &self.borders)))
    }

    /// The revision counter: it increases on every applied edit.
    pub fn revision(&self) -> u64 {
        self.revision
    }

    /// The id the next new region will get.
    pub fn peek_region_id(&self) -> RegionId {
        RegionId(
            self.next_region_id
                .max(self.regions.keys().next_back().map_or(1, |id| id.0 + 1)),
        )
    }

    /// The id the next new group will get.
    pub fn peek_group_id(&self) -> GroupId {
        GroupId(
            self.next_group_id
                .max(self.groups.keys().next_back().map_or(1, |id| id.0 + 1)),
        )
    }

    /// Whether a recorded border constrains the colouring under the current settings: it is not
    /// suppressed, both regions are land, and it is a hand-made border, a shared boundary at least the
    /// minimum length, or a corner contact (or too-short boundary) while corners count.
    pub fn border_is_active(&self, pair: RegionPair, border: &Border) -> bool {
        if border.suppressed {
            return false;
        }
        let land = |id: RegionId| self.regions.get(&id).is_some_and(|r| r.role == Role::Land);
        if !land(pair.a()) || !land(pair.b()) {
            return false;
        }
        match border.kind {
            BorderKind::Manual => true,
            BorderKind::Shared if border.length >= self.settings.min_border_length => true,
            BorderKind::Shared | BorderKind::Corner => self.settings.corners_count,
        }
    }

    /// The active borders, in pair order.
    pub fn active_borders(&self) -> impl Iterator<Item = (RegionPair, &Border)> + '_ {
        let index = self.border_index();
        self.borders
            .iter()
            .zip(index.ends.iter())
            .filter(|((_, border), ends)| self.border_is_active_at(border, ends.0, ends.1))
            .map(|((pair, border), _)| (*pair, border))
    }

    /// [`Document::border_is_active`] for a border whose regions sit at slots `a` and `b`.
    #[inline]
    pub fn border_is_active_at(&self, border: &Border, a: u32, b: u32) -> bool {
        if border.suppressed {
            return false;
        }
        let land = |s: u32| self.regions.at(s as usize).1.role == Role::Land;
        if !land(a) || !land(b) {
            return false;
        }
        match border.kind {
            BorderKind::Manual => true,
            BorderKind::Shared if border.length >= self.settings.min_border_length => true,
            BorderKind::Shared | BorderKind::Corner => self.settings.corners_count,
        }
    }

    /// Every recorded border of one region (active or not), with the neighbour's id, in the
    /// neighbours' id order.
    pub fn borders_of(&self, id: RegionId) -> Vec<(RegionId, RegionPair, Border)> {
        let Some(slot) = self.regions.slot(&id) else {
            return Vec::new();
        };
        self.border_index()
            .of_slot(slot)
            .iter()
            .map(|&i| {
                let (pair, border) = self.borders.at(i as usize);
                (pair.other(id).unwrap_or(id), pair, *border)
            })
            .collect()
    }

    /// The land regions, in id order.
    pub fn land_regions(&self) -> impl Iterator<Item = (RegionId, &Region)> + '_ {
        self.regions
            .iter()
            .filter(|(_, r)| r.role == Role::Land)
            .map(|(id, r)| (*id, r))
    }

    /// The bounding box of all geometry and anchors, or `None` for an empty map.
    pub fn bounds(&self) -> Option<[Point; 2]> {
        let mut out: Option<[Point; 2]> = None;
        let mut grow = |b: [Point; 2]| {
            out = Some(match out {
                None => b,
                Some([lo, hi]) => [
                    [lo[0].min(b[0][0]), lo[1].min(b[0][1])],
                    [hi[0].max(b[1][0]), hi[1].max(b[1][1])],
                ],
            })
        };
        for region in self.regions.values() {
            grow([region.anchor, region.anchor]);
            if let Some(b) = region.geometry.as_ref().and_then(|g| g.bounds()) {
                grow(b);
            }
        }
        out
    }

    /// The members of a group, in id order.
    pub fn group_members(&self, group: GroupId) -> Vec<RegionId> {
        self.regions
            .iter()
            .filter(|(_, r)| r.group == Some(group))
            .map(|(id, _)| *id)
            .collect()
    }

    /// Finds a region by exact name (the first in id order).
    pub fn region_by_name(&self, name: &str) -> Option<RegionId> {
        self.regions
            .iter()
            .find(|(_, r)| r.name == name)
            .map(|(id, _)| *id)
    }
}

#[cfg(test)]
mod default_palette_tests {
    use super::*;

    #[test]
    fn the_first_four_default_colours_pass_every_distinctness_check() {
        // Four colours suffice for any planar map without pins (the four colour theorem), so
        // these four must be told apart in every colour view the palette check knows. The
        // default is for maps in colour: greyscale is checked only for projects that expect
        // greyscale copies (the greyscale-safe palettes are for those).
        let named = crate::doc::palette_check::named_colours(&Palette::default());
        let pairs: Vec<(usize, usize)> = (0..4)
            .flat_map(|i| (i + 1..4).map(move |j| (i, j)))
            .collect();
        let thresholds = crate::colour::Thresholds {
            greyscale: false,
            ..Default::default()
        };
        let warnings = crate::colour::distinctness_warnings(&named, &pairs, &thresholds);
        assert!(warnings.is_empty(), "{warnings:#?}");
        // And the reserves too, against each other and the four.
        let all: Vec<(usize, usize)> = (0..6)
            .flat_map(|i| (i + 1..6).map(move |j| (i, j)))
            .collect();
        let warnings = crate::colour::distinctness_warnings(&named, &all, &thresholds);
        assert!(warnings.is_empty(), "{warnings:#?}");
    }
}

#[cfg(test)]
mod length_text_tests {
    use super::Units;

    #[test]
    fn lengths_read_in_metres_then_kilometres() {
        assert_eq!(Units::Metres.length_text(850.2), "850 m");
        assert_eq!(Units::Metres.length_text(12_449.0), "12.4 km");
        assert_eq!(Units::Metres.length_text(334_721.0), "335 km");
        assert_eq!(Units::Unitless.length_text(2.5), "2.5");
        assert_eq!(Units::Unitless.length_text(250.4), "250");
        assert_eq!(Units::Unitless.length_text(0.0), "0");
    }
}

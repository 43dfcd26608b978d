//! The map canvas: filled regions, outlines, names, markers, the border links and highlights; pan,
//! zoom and the editing tools. Geometry stays in world units; `Camera` maps it to the screen once
//! per frame, and hit-testing happens in world space (`view::hit_test`).

use egui::epaint::{Mesh, Shape};
use egui::{Align2, Color32, FontId, Pos2, Sense, Stroke};

use crate::doc::{BorderKind, Document, Edit, Region, RegionChange, RegionId, RegionPair, Role};

use crate::analysis::PlanarityVerdict;
use crate::ui::commands::Tool;
use crate::ui::frame::{Action, Frame};
use crate::ui::mesh::Scene;
use crate::ui::state::Highlight;
use crate::ui::style;
use crate::ui::view::{Camera, bounds_of, hit_test};
use crate::ui::widgets::colour32;

/// Below this size on screen (in points) a region is drawn as a box and without an outline.
const LOD_PIXELS: f64 = 3.0;

/// Outline points closer than this to the previous drawn point (in points) are skipped.
const DECIMATE_PX: f32 = 1.5;

/// Border links are drawn once a typical region is this wide on screen (in points); below it
/// thousands of short links only hide the map, and the canvas says to zoom in instead.
const LINK_MIN_PIXELS: f64 = 16.0;

/// Screen radius of a marker, in points.
const MARKER_RADIUS: f32 = 7.0;

fn fill_of(doc: &Document, id: RegionId, region: &Region) -> Color32 {
    if region.role == Role::Water {
        return style::WATER;
    }
    match doc
        .colouring()
        .get(&id)
        .and_then(|s| doc.palette().slots.get(*s as usize))
    {
        Some(slot) => colour32(slot.colour),
        None => style::UNCOLOURED,
    }
}

/// The canvas's own state: the view of the map, what the pointer is over, a marker being
/// dragged, and the drawing caches (the tessellated scene and the last base layer).
pub struct Canvas {
    pub camera: Camera,
    /// The canvas needs fitting to the map on its next frame.
    pub fit_pending: bool,
    /// The canvas moves to these regions on its next frame (something was gone to).
    pub go_to: Option<Vec<RegionId>>,
    /// The view shows the whole map as Fit left it: when the canvas changes size, it fits
    /// again (until the user pans, zooms or goes somewhere).
    pub fitted: bool,
    pub hover: Option<RegionId>,
    /// A marker being dragged: its region and the drag offset in world units so far.
    pub dragging: Option<(RegionId, [f64; 2])>,
    /// Where the canvas was drawn last frame (screen points), so tests and tools can aim at regions.
    pub rect: Option<egui::Rect>,
    /// The document's regions prepared for drawing and hit-testing (kept in step by the app).
    pub scene: Scene,
    /// The fills and outlines drawn last, reused while only the view moves.
    pub base_layer: Option<BaseLayer>,
}

impl Default for Canvas {
    fn default() -> Canvas {
        Canvas {
            camera: Camera::default(),
            fit_pending: true,
            go_to: None,
            fitted: false,
            hover: None,
            dragging: None,
            rect: None,
            scene: Scene::default(),
            base_layer: None,
        }
    }
}

impl Canvas {
    /// Where a world point is on screen, given the canvas drawn last frame (for tests and tools).
    pub fn screen_of(&self, p: [f64; 2]) -> Option<Pos2> {
        let rect = self.rect?;
        Some(pos(self
            .camera
            .to_screen([rect.center().x, rect.center().y], p)))
    }

    /// Forgets the view and the drawings (another document is on show); the scene stays, to be
    /// brought in step with the new document.
    pub fn reset(&mut self) {
        let scene = std::mem::take(&mut self.scene);
        *self = Canvas {
            scene,
            ..Canvas::default()
        };
    }
}

/// The fills and outlines of the map, tessellated for one view. Drawing them is most of a
/// frame's work on a large map, so a frame reuses them when nothing has changed, and while the
/// view moves (pan, zoom) it moves the last drawing instead, redrawing once the view rests or
/// has moved too far for the old drawing to stand in.
pub struct BaseLayer {
    mesh: std::sync::Arc<Mesh>,
    generation: u64,
    camera: Camera,
    rect: egui::Rect,
    /// The world rectangle the drawing covers (the view at the time, with a margin).
    covers: [[f64; 2]; 2],
    /// The view of the previous frame, to tell a moving view from one at rest.
    last_camera: Camera,
    /// Regions too small to draw one by one, as an image, and where it goes on screen.
    raster: Option<(egui::TextureHandle, egui::Rect)>,
}

impl BaseLayer {
    /// Whether small regions were painted as an image (the coarsest level of detail).
    pub fn uses_raster(&self) -> bool {
        self.raster.is_some()
    }

    /// Triangles in the tessellated part (fills and outlines).
    pub fn triangle_count(&self) -> usize {
        self.mesh.indices.len() / 3
    }
}

fn pos(p: [f32; 2]) -> Pos2 {
    Pos2::new(p[0], p[1])
}

/// Draws the canvas and handles its input.
pub fn show(frame: &Frame, canvas: &mut Canvas, ui: &mut egui::Ui) {
    let size = ui.available_size();
    let (response, painter) = ui.allocate_painter(size, Sense::click_and_drag());
    response.widget_info(|| egui::WidgetInfo::labeled(egui::Role::Canvas, true, "Map canvas"));
    let rect = response.rect;
    if canvas.fitted && canvas.rect.is_some_and(|r| r.size() != rect.size()) {
        canvas.fit_pending = true;
    }
    canvas.rect = Some(rect);
    painter.rect_filled(rect, 0.0, style::BACKGROUND);
    let centre = [rect.center().x, rect.center().y];

    if canvas.fit_pending && rect.width() > 10.0 {
        if let Some(bounds) = frame.session.doc().bounds() {
            canvas.camera = Camera::fit(bounds, [rect.width(), rect.height()]);
        }
        canvas.fit_pending = false;
        canvas.fitted = true;
    }
    if let Some(ids) = canvas.go_to.take()
        && rect.width() > 10.0
        && let Some(bounds) = bounds_of(frame.session.doc(), &ids)
    {
        // Never closer than a twentieth of the map, so a tiny region shows among neighbours.
        let context = frame
            .session
            .doc()
            .bounds()
            .map_or(0.0, |[lo, hi]| (hi[0] - lo[0]).max(hi[1] - lo[1]) / 20.0);
        canvas.camera = Camera::go_to(bounds, [rect.width(), rect.height()], context);
        canvas.fitted = false;
    }

    // Zoom with the wheel (or a pinch) around the pointer.
    if let Some(p) = response.hover_pos() {
        let (scroll, pinch) = ui.input(|i| (i.smooth_scroll_delta.y, i.zoom_delta()));
        let factor = (scroll as f64 * 0.0015).exp() * pinch as f64;
        if (factor - 1.0).abs() > 1e-6 {
            canvas.camera.zoom_at(centre, [p.x, p.y], factor);
            canvas.fitted = false;
        }
    }

    let camera = canvas.camera;
    let marker_radius_world = MARKER_RADIUS as f64 / camera.pixels_per_unit;
    let pointer_world = response
        .hover_pos()
        .map(|p| camera.to_world(centre, [p.x, p.y]));
    canvas.hover = pointer_world.and_then(|w| {
        hit_test(
            frame.session.doc(),
            canvas.scene.hit_boxes(),
            w,
            marker_radius_world,
        )
    });

    // Dragging: moves a marker in the select tool, otherwise pans. A move is one edit, on release.
    if response.drag_started()
        && frame.view.tool == Tool::Select
        && let Some(id) = canvas.hover
        && frame
            .session
            .doc()
            .regions()
            .get(&id)
            .is_some_and(|r| r.geometry.is_none())
    {
        canvas.dragging = Some((id, [0.0, 0.0]));
    }
    if response.dragged() {
        let d = response.drag_delta();
        match &mut canvas.dragging {
            Some((_, offset)) => {
                offset[0] += d.x as f64 / camera.pixels_per_unit;
                offset[1] -= d.y as f64 / camera.pixels_per_unit;
            }
            None => {
                canvas.camera.pan_by([d.x, d.y]);
                canvas.fitted = false;
            }
        }
    }
    if response.drag_stopped()
        && let Some((id, offset)) = canvas.dragging.take()
        && let Some(region) = frame.session.doc().regions().get(&id)
    {
        let to = [region.anchor[0] + offset[0], region.anchor[1] + offset[1]];
        frame.edit(Edit::UpdateRegion {
            id,
            change: RegionChange::Anchor(to),
        });
    }
    if response.clicked()
        && let Some(world) = pointer_world
    {
        let hit = canvas.hover;
        click(frame, hit, world);
    }

    draw(frame, canvas, &painter, centre, rect);

    if let Some(id) = canvas.hover
        && let Some(r) = frame.session.doc().regions().get(&id)
    {
        let text = match (r.role, frame.session.doc().colouring().get(&id)) {
            (Role::Water, _) => format!("{} (water)", r.name),
            (_, Some(s)) => format!(
                "{} — colour {}",
                r.name,
                frame
                    .session
                    .doc()
                    .palette()
                    .slots
                    .get(*s as usize)
                    .map_or_else(|| format!("{}", s + 1), |slot| slot.name.clone())
            ),
            (_, None) => format!("{} — no colour yet", r.name),
        };
        response.on_hover_text_at_pointer(text);
    }
}

/// What a click does with the current tool.
fn click(frame: &Frame, hit: Option<RegionId>, world: [f64; 2]) {
    let doc = frame.doc();
    match frame.view.tool {
        Tool::Select => frame.send(Action::Select(hit)),
        Tool::Place => {
            let id = doc.peek_region_id();
            let (id, edit) = doc.add_region_edit(Region::new(format!("Region {id}"), world));
            frame.edit(edit);
            frame.send(Action::Select(Some(id)));
        }
        Tool::Border => match (frame.view.border_first, hit) {
            (None, Some(h)) => frame.send(Action::BorderFrom(Some(h))),
            (Some(a), Some(b)) if a != b => {
                frame.send(Action::BorderFrom(None));
                if let Some(pair) = RegionPair::new(a, b) {
                    let active = doc.borders().get(&pair).is_some_and(|bd| !bd.suppressed);
                    let edit = if active {
                        doc.remove_border_edit(pair)
                    } else {
                        doc.add_border_edit(pair)
                    };
                    if let Some(edit) = edit {
                        frame.edit(edit);
                    }
                }
            }
            _ => frame.send(Action::BorderFrom(None)),
        },
        Tool::Pin => {
            if let Some(h) = hit
                && let Some(region) = doc.regions().get(&h)
            {
                let slot = frame.view.pin_slot;
                let pin = if region.pin == Some(slot) {
                    None
                } else {
                    Some(slot)
                };
                frame.edit(Edit::UpdateRegion {
                    id: h,
                    change: RegionChange::Pin(pin),
                });
                frame.send(Action::Select(Some(h)));
            }
        }
        Tool::Group => {
            if let Some(h) = hit
                && let Some(region) = doc.regions().get(&h)
            {
                match frame.view.group.filter(|g| doc.groups().contains_key(g)) {
                    Some(g) => {
                        let to = if region.group == Some(g) {
                            None
                        } else {
                            Some(g)
                        };
                        frame.edit(Edit::UpdateRegion {
                            id: h,
                            change: RegionChange::Group(to),
                        });
                    }
                    None => {
                        let (g, create) = doc.add_group_edit(format!("{} group", region.name));
                        let join = Edit::UpdateRegion {
                            id: h,
                            change: RegionChange::Group(Some(g)),
                        };
                        frame.edit(Edit::Batch {
                            label: "Start a same-colour group".into(),
                            edits: vec![create, join],
                        });
                        frame.send(Action::SetGroup(Some(g)));
                    }
                }
                frame.send(Action::Select(Some(h)));
            }
        }
        Tool::Water => {
            if let Some(h) = hit
                && let Some(region) = doc.regions().get(&h)
            {
                let role = if region.role == Role::Water {
                    Role::Land
                } else {
                    Role::Water
                };
                frame.edit(Edit::UpdateRegion {
                    id: h,
                    change: RegionChange::Role(role),
                });
            }
        }
    }
}

fn draw(
    frame: &Frame,
    canvas: &mut Canvas,
    painter: &egui::Painter,
    centre: [f32; 2],
    rect: egui::Rect,
) {
    let base = base_layer(frame, canvas, painter.ctx(), canvas.camera, centre, rect);
    let canvas = &*canvas;
    if let Some((texture, at)) = base.raster {
        let uv = egui::Rect::from_min_max(Pos2::ZERO, Pos2::new(1.0, 1.0));
        painter.image(texture, at, uv, Color32::WHITE);
    }
    let doc = frame.session.doc();
    let camera = canvas.camera;
    let to_screen = |p: [f64; 2]| pos(camera.to_screen(centre, p));
    let anchor_of = |id: RegionId| -> Option<[f64; 2]> {
        let r = doc.regions().get(&id)?;
        Some(match canvas.dragging {
            Some((d, off)) if d == id => [r.anchor[0] + off[0], r.anchor[1] + off[1]],
            _ => r.anchor,
        })
    };

    let ppu = camera.pixels_per_unit;
    let typical_px = canvas.scene.typical_size * ppu;
    painter.add(Shape::Mesh(base.mesh));

    // Border links between anchors, styled by kind (once they are long enough to tell apart).
    let links_readable = canvas.scene.outlined.is_empty() || typical_px >= LINK_MIN_PIXELS;
    if frame.view.show_borders && !links_readable {
        painter.text(
            rect.left_bottom() + egui::vec2(8.0, -8.0),
            Align2::LEFT_BOTTOM,
            "Zoom in to see the border links",
            FontId::proportional(12.0),
            style::LABEL,
        );
    }
    if frame.view.show_borders && links_readable {
        for (pair, border) in doc.borders() {
            let (Some(a), Some(b)) = (anchor_of(pair.a()), anchor_of(pair.b())) else {
                continue;
            };
            let (a, b) = (to_screen(a), to_screen(b));
            let active = doc.border_is_active(*pair, border);
            let (colour, width, dashed) = match (border.suppressed, border.kind) {
                (true, _) => (style::LINK_SUPPRESSED, 1.0, true),
                (false, BorderKind::Shared) => (style::LINK_SHARED, 1.2, !active),
                (false, BorderKind::Corner) => (style::LINK_CORNER, 1.2, true),
                (false, BorderKind::Manual) => (style::LINK_MANUAL, 2.0, false),
            };
            let stroke = Stroke::new(width, colour);
            if dashed {
                painter.extend(Shape::dashed_line(&[a, b], stroke, 5.0, 4.0));
            } else {
                painter.line_segment([a, b], stroke);
            }
        }
    }

    // Same-colour groups: a dotted chain through the members of the group being built or selected.
    let focus_group = frame.view.group.or_else(|| {
        frame
            .view
            .selection
            .and_then(|s| doc.regions().get(&s))
            .and_then(|r| r.group)
    });
    if let Some(g) = focus_group {
        let members: Vec<Pos2> = doc
            .group_members(g)
            .iter()
            .filter_map(|id| anchor_of(*id))
            .map(to_screen)
            .collect();
        for w in members.windows(2) {
            painter.extend(Shape::dotted_line(&[w[0], w[1]], style::GROUP, 8.0, 2.0));
        }
    }

    // Clashes are always shown: a red link and red outlines.
    for clash in &frame.session.rules().colouring.clashes {
        let (Some(a), Some(b)) = (anchor_of(clash.pair.a()), anchor_of(clash.pair.b())) else {
            continue;
        };
        painter.line_segment([to_screen(a), to_screen(b)], Stroke::new(3.0, style::CLASH));
        for id in [clash.pair.a(), clash.pair.b()] {
            outline_region(doc, id, painter, &to_screen, Stroke::new(2.0, style::CLASH));
        }
    }

    // Evidence asked for: the regions that cannot be drawn flat, or that cannot take three colours.
    let colouring = frame.analysis.and_then(|a| a.colouring.as_ref());
    // The rules to drop for one colour fewer: their regions, and each dropped border as a link.
    let answer = match frame.view.highlight {
        Some(Highlight::FlatRelaxations) => frame.relax_flat,
        _ => frame.relax,
    };
    let relaxed: Option<(Vec<RegionId>, Vec<RegionPair>)> =
        answer.filter(|a| a.revision == doc.revision()).map(|a| {
            let links = a
                .relaxations
                .iter()
                .filter_map(|r| match r {
                    crate::analysis::relax::Relaxation::Border { pair, .. } => Some(*pair),
                    _ => None,
                })
                .collect();
            (a.regions(), links)
        });
    let evidence = match (
        frame.view.highlight,
        frame.analysis.and_then(|a| a.planarity.as_ref()),
    ) {
        (Some(Highlight::NotPlanar), Some(PlanarityVerdict::NotPlanar(o))) => Some((
            &o.regions,
            &o.links,
            &o.branch_regions[..],
            style::CERTIFICATE,
        )),
        (Some(Highlight::NotThreeColourable), _) => colouring
            .and_then(|c| c.three_impossible.as_ref())
            .map(|why| (&why.regions, &why.links, &[][..], style::OBSTRUCTION)),
        (Some(Highlight::NotFewerColourable), _) => colouring
            .and_then(|c| c.minimum_impossible.as_ref())
            .map(|why| (&why.regions, &why.links, &[][..], style::OBSTRUCTION)),
        (Some(Highlight::Relaxations | Highlight::FlatRelaxations), _) => relaxed
            .as_ref()
            .map(|(regions, links)| (regions, links, &[][..], style::RELAXED)),
        _ => None,
    };
    if let Some((regions, links, corners, colour)) = evidence {
        for id in regions {
            outline_region(doc, *id, painter, &to_screen, Stroke::new(2.5, colour));
        }
        for link in links {
            let (Some(a), Some(b)) = (anchor_of(link.a()), anchor_of(link.b())) else {
                continue;
            };
            painter.line_segment([to_screen(a), to_screen(b)], Stroke::new(2.5, colour));
        }
        for id in corners {
            if let Some(a) = anchor_of(*id) {
                painter.circle_filled(to_screen(a), 6.0, colour);
            }
        }
    }

    // Markers for regions without an outline.
    for id in &canvas.scene.markers {
        let Some(region) = doc.regions().get(id) else {
            continue;
        };
        let Some(a) = anchor_of(*id) else { continue };
        let p = to_screen(a);
        if !rect.expand(MARKER_RADIUS).contains(p) {
            continue;
        }
        painter.circle(
            p,
            MARKER_RADIUS,
            fill_of(doc, *id, region),
            Stroke::new(1.0, style::OUTLINE),
        );
    }

    // Pins: a small dark square at the label point.
    for region in canvas
        .scene
        .pinned
        .iter()
        .filter_map(|id| doc.regions().get(id))
    {
        if region.pin.is_some() {
            let p = to_screen(region.anchor) + egui::vec2(0.0, -13.0);
            painter.rect_filled(
                egui::Rect::from_center_size(p, egui::vec2(6.0, 6.0)),
                1.0,
                style::LABEL,
            );
        }
    }

    // Selection and the first end of a half-made border.
    for (id, colour) in [
        (frame.view.selection, style::SELECTION),
        (frame.view.border_first, style::LINK_MANUAL),
    ] {
        if let Some(id) = id {
            outline_region(doc, id, painter, &to_screen, Stroke::new(3.0, colour));
        }
    }

    // Names, where the region is big enough on screen to hold them.
    if frame.view.show_labels {
        let font = FontId::proportional(12.0);
        let label = |region: &Region, width_px: f32, offset: egui::Vec2| {
            if width_px < 6.0 * region.name.chars().count() as f32 {
                return;
            }
            let p = to_screen(region.anchor);
            if rect.contains(p) {
                painter.text(
                    p + offset,
                    Align2::CENTER_CENTER,
                    &region.name,
                    font.clone(),
                    style::LABEL,
                );
            }
        };
        // Outlined regions: skipped as a whole when a typical one is too small for a short name.
        if typical_px >= 24.0 {
            for o in &canvas.scene.outlined {
                if let Some(region) = doc.regions().get(&o.id) {
                    let width_px = ((o.bounds[1][0] - o.bounds[0][0]) * ppu) as f32;
                    label(region, width_px, egui::vec2(0.0, 0.0));
                }
            }
        }
        for region in canvas
            .scene
            .markers
            .iter()
            .filter_map(|id| doc.regions().get(id))
        {
            label(region, 80.0, egui::vec2(0.0, MARKER_RADIUS + 8.0));
        }
    }
}

/// What a frame draws of the base layer.
struct BaseDrawing {
    mesh: std::sync::Arc<Mesh>,
    raster: Option<(egui::TextureId, egui::Rect)>,
}

/// With more than this many regions smaller than `LOD_PIXELS` in view, they are painted into an
/// image (a pixel or a few each) instead of a box of two triangles each.
const RASTER_MIN: usize = 20_000;

/// The largest side of that image, in pixels.
const RASTER_MAX_SIDE: usize = 4096;

/// How far beyond the view the base layer is drawn, as a fraction of the view's size, so that a
/// pan can reuse it for a while.
const BASE_MARGIN: f64 = 0.25;

fn base_layer(
    frame: &Frame,
    canvas: &mut Canvas,
    ctx: &egui::Context,
    camera: Camera,
    centre: [f32; 2],
    rect: egui::Rect,
) -> BaseDrawing {
    let generation = canvas.scene.generation;
    let view = [
        camera.to_world(centre, [rect.left(), rect.bottom()]),
        camera.to_world(centre, [rect.right(), rect.top()]),
    ];
    if let Some(old) = &mut canvas.base_layer
        && old.generation == generation
        && old.rect == rect
    {
        let moving = old.last_camera != camera;
        old.last_camera = camera;
        if old.camera == camera {
            return BaseDrawing {
                mesh: old.mesh.clone(),
                raster: old.raster.as_ref().map(|(t, r)| (t.id(), *r)),
            };
        }
        let scale = camera.pixels_per_unit / old.camera.pixels_per_unit;
        let inside = view[0][0] >= old.covers[0][0]
            && view[0][1] >= old.covers[0][1]
            && view[1][0] <= old.covers[1][0]
            && view[1][1] <= old.covers[1][1];
        if moving && inside && (0.8..=1.25).contains(&scale) {
            // Screen positions under the old view map affinely to the new one.
            let k = scale as f32;
            let o = camera.to_screen(centre, old.camera.to_world(centre, [0.0, 0.0]));
            let moved = |p: Pos2| Pos2::new(p.x * k + o[0], p.y * k + o[1]);
            let mut mesh = (*old.mesh).clone();
            for v in &mut mesh.vertices {
                v.pos = moved(v.pos);
            }
            return BaseDrawing {
                mesh: std::sync::Arc::new(mesh),
                raster: old
                    .raster
                    .as_ref()
                    .map(|(t, r)| (t.id(), egui::Rect::from_min_max(moved(r.min), moved(r.max)))),
            };
        }
    }
    let (w, h) = (view[1][0] - view[0][0], view[1][1] - view[0][1]);
    let covers = [
        [view[0][0] - w * BASE_MARGIN, view[0][1] - h * BASE_MARGIN],
        [view[1][0] + w * BASE_MARGIN, view[1][1] + h * BASE_MARGIN],
    ];
    // Only what this drawing shows at full detail needs triangles and outline chains.
    let ppu = camera.pixels_per_unit;
    canvas.scene.triangulate_where(|o| {
        let [lo, hi] = o.bounds;
        (hi[0] - lo[0]).max(hi[1] - lo[1]) * ppu >= LOD_PIXELS
            && hi[0] >= covers[0][0]
            && lo[0] <= covers[1][0]
            && hi[1] >= covers[0][1]
            && lo[1] <= covers[1][1]
    });
    if canvas.scene.typical_size * ppu >= LOD_PIXELS {
        canvas.scene.ensure_chains();
    }
    let hint = canvas
        .base_layer
        .as_ref()
        .map_or((0, 0), |b| (b.mesh.vertices.len(), b.mesh.indices.len()));
    let (mesh, image) = draw_base(frame, &canvas.scene, ctx, camera, centre, covers, hint);
    let mesh = std::sync::Arc::new(mesh);
    // Reuse the texture of the previous drawing when there is one (egui frees it when dropped).
    let old_texture = canvas
        .base_layer
        .take()
        .and_then(|b| b.raster)
        .map(|(t, _)| t);
    let raster = image.map(|(image, at)| {
        let options = egui::TextureOptions::NEAREST;
        let texture = match old_texture {
            Some(mut t) => {
                t.set(image, options);
                t
            }
            None => ctx.load_texture("tinct-small-regions", image, options),
        };
        (texture, at)
    });
    let drawing = BaseDrawing {
        mesh: mesh.clone(),
        raster: raster.as_ref().map(|(t, r)| (t.id(), *r)),
    };
    canvas.base_layer = Some(BaseLayer {
        mesh,
        generation,
        camera,
        rect,
        covers,
        last_camera: camera,
        raster,
    });
    drawing
}

/// Tessellates fills and outlines of everything within `covers` (world units).
#[allow(clippy::too_many_arguments)]
fn draw_base(
    frame: &Frame,
    scene: &Scene,
    ctx: &egui::Context,
    camera: Camera,
    centre: [f32; 2],
    covers: [[f64; 2]; 2],
    capacity: (usize, usize),
) -> (Mesh, Option<(egui::ColorImage, egui::Rect)>) {
    let doc = frame.session.doc();
    let to_screen = |p: [f64; 2]| pos(camera.to_screen(centre, p));
    let visible = |b: &[[f64; 2]; 2]| {
        b[1][0] >= covers[0][0]
            && b[0][0] <= covers[1][0]
            && b[1][1] >= covers[0][1]
            && b[0][1] <= covers[1][1]
    };
    let ppu = camera.pixels_per_unit;
    let typical_px = scene.typical_size * ppu;

    // Fills. A region smaller than a few pixels on screen is drawn as its bounding box (level of
    // detail: its triangles would cover the same pixels).
    // Sized like the last drawing: growing a mesh of a million vertices by doubling copies it.
    let mut mesh = Mesh {
        vertices: Vec::with_capacity(capacity.0),
        indices: Vec::with_capacity(capacity.1),
        ..Mesh::default()
    };
    let mut tiny: Vec<(egui::Rect, Color32)> = Vec::new();
    for o in &scene.outlined {
        if !visible(&o.bounds) {
            continue;
        }
        let Some(region) = doc.regions().get(&o.id) else {
            continue;
        };
        let colour = fill_of(doc, o.id, region);
        let [lo, hi] = o.bounds;
        let size_px = ((hi[0] - lo[0]).max(hi[1] - lo[1])) * ppu;
        if size_px < LOD_PIXELS {
            tiny.push((
                egui::Rect::from_two_pos(to_screen(lo), to_screen(hi)),
                colour,
            ));
            continue;
        }
        let Some(tris) = &o.triangles else {
            continue;
        };
        let base = mesh.vertices.len() as u32;
        mesh.vertices.reserve(tris.vertices.len());
        for v in &tris.vertices {
            mesh.colored_vertex(to_screen(*v), colour);
        }
        mesh.indices.extend(tris.indices.iter().map(|i| base + i));
        if region.role == Role::Water
            && let Some(g) = &region.geometry
        {
            // Water is hatched, so it never reads as a pale palette colour.
            let rings: Vec<Vec<Pos2>> = g
                .polygons
                .iter()
                .flat_map(|p| std::iter::once(&p.exterior).chain(p.holes.iter()))
                .map(|ring| ring.iter().map(|p| to_screen(*p)).collect())
                .collect();
            for [a, b] in hatch_segments(&rings, WATER_HATCH_PX) {
                add_segment(&mut mesh, a, b, 1.0, style::WATER_HATCH);
            }
        }
    }

    // Outlines: each boundary once, with points closer than `DECIMATE_PX` merged; none for
    // regions too small to show one.
    if typical_px >= LOD_PIXELS {
        let options = ctx.tessellation_options(|o| *o);
        let mut tessellator =
            egui::epaint::Tessellator::new(ctx.pixels_per_point(), options, [1, 1], Vec::new());
        let outline = Stroke::new(if typical_px < 12.0 { 0.5 } else { 1.0 }, style::OUTLINE);
        let mut points: Vec<Pos2> = Vec::new();
        for chain in &scene.chains {
            if !visible(&chain.bounds) {
                continue;
            }
            let [lo, hi] = chain.bounds;
            if ((hi[0] - lo[0]).max(hi[1] - lo[1])) * ppu < 1.0 {
                continue;
            }
            let ring = &scene.chain_points[chain.points.clone()];
            points.clear();
            for (k, p) in ring.iter().enumerate() {
                let s = to_screen(*p);
                let last = k + 1 == ring.len();
                match points.last() {
                    Some(q) if !last && (s - *q).length_sq() < DECIMATE_PX * DECIMATE_PX => {}
                    _ => points.push(s),
                }
            }
            tessellate_outline(&mut tessellator, &points, chain.closed, outline, &mut mesh);
        }
    }
    if tiny.len() <= RASTER_MIN {
        for (r, colour) in tiny {
            let r = r.expand(0.5);
            let base = mesh.vertices.len() as u32;
            for p in [
                r.left_top(),
                r.right_top(),
                r.right_bottom(),
                r.left_bottom(),
            ] {
                mesh.colored_vertex(p, colour);
            }
            mesh.add_triangle(base, base + 1, base + 2);
            mesh.add_triangle(base, base + 2, base + 3);
        }
        return (mesh, None);
    }
    let at = egui::Rect::from_two_pos(to_screen(covers[0]), to_screen(covers[1]));
    let image = paint_small_regions(&tiny, at);
    (mesh, Some((image, at)))
}

/// Spacing of the hatching of water, in points.
const WATER_HATCH_PX: f32 = 5.0;

/// Horizontal segments inside the polygon made of `rings` (even-odd rule), one row every
/// `spacing` points: a scanline fill, clipped exactly to the outline and its holes.
fn hatch_segments(rings: &[Vec<Pos2>], spacing: f32) -> Vec<[Pos2; 2]> {
    let (mut top, mut bottom) = (f32::INFINITY, f32::NEG_INFINITY);
    for p in rings.iter().flatten() {
        top = top.min(p.y);
        bottom = bottom.max(p.y);
    }
    let mut out = Vec::new();
    if !(top.is_finite() && bottom.is_finite()) {
        return out;
    }
    let mut xs: Vec<f32> = Vec::new();
    let mut y = (top / spacing).floor() * spacing + spacing / 2.0;
    while y < bottom {
        xs.clear();
        for ring in rings {
            for (i, a) in ring.iter().enumerate() {
                let b = ring[(i + 1) % ring.len()];
                // Half-open in y, so a vertex on the row is counted once.
                if (a.y <= y) != (b.y <= y) {
                    xs.push(a.x + (y - a.y) / (b.y - a.y) * (b.x - a.x));
                }
            }
        }
        xs.sort_by(f32::total_cmp);
        for pair in xs.chunks_exact(2) {
            out.push([Pos2::new(pair[0], y), Pos2::new(pair[1], y)]);
        }
        y += spacing;
    }
    out
}

/// A plain line segment of `width` points as two triangles (no feathering: hatching is a
/// texture, not an outline).
/// Outline joins sharper than this (the cosine of the turn between two segments) start a new
/// path. A stroke joined at a hairpin, or at a turn between two sub-pixel segments, grows a
/// spike: merging nearby points at a coarse zoom makes such turns out of small islands and
/// wiggly coasts, and their spikes crossed the canvas at Fit (345 pixels long on the US states).
const SHARP_TURN_COS: f32 = 0.0;

/// Segments shorter than this many pixels are merged into their neighbours before drawing.
const MIN_SEGMENT_PX: f32 = 0.5;

/// The pieces of an outline to draw as separate paths: its points with sub-pixel steps merged,
/// cut at every sharp turn, so that no join is sharp. A ring without sharp turns stays closed.
fn outline_pieces(points: &[Pos2], closed: bool) -> Vec<(Vec<Pos2>, bool)> {
    let mut p: Vec<Pos2> = Vec::with_capacity(points.len());
    for (k, &q) in points.iter().enumerate() {
        let last = k + 1 == points.len();
        match p.last() {
            Some(&r) if (q - r).length() < MIN_SEGMENT_PX => {
                if last
                    && p.len() > 1
                    && let Some(end) = p.last_mut()
                {
                    // Keep the chain's end where it is (it meets another chain there).
                    *end = q;
                }
            }
            _ => p.push(q),
        }
    }
    if closed {
        while p.len() > 1 && (p[p.len() - 1] - p[0]).length() < MIN_SEGMENT_PX {
            p.pop();
        }
    }
    let n = p.len();
    if n < 2 {
        return Vec::new();
    }
    let closed = closed && n >= 3;
    let sharp =
        |a: Pos2, b: Pos2, c: Pos2| (b - a).normalized().dot((c - b).normalized()) < SHARP_TURN_COS;
    let cut: Vec<bool> = (0..n)
        .map(|i| {
            if i > 0 && i + 1 < n {
                sharp(p[i - 1], p[i], p[i + 1])
            } else if closed {
                sharp(p[(i + n - 1) % n], p[i], p[(i + 1) % n])
            } else {
                false
            }
        })
        .collect();
    let Some(first_cut) = cut.iter().position(|&c| c) else {
        return vec![(p, closed)];
    };
    // Walk from a cut (round the ring back to it), starting a new piece at each cut.
    let (start, steps) = if closed { (first_cut, n + 1) } else { (0, n) };
    let mut pieces = Vec::new();
    let mut piece: Vec<Pos2> = Vec::new();
    for k in 0..steps {
        let i = (start + k) % n;
        piece.push(p[i]);
        if cut[i] && piece.len() >= 2 {
            pieces.push((std::mem::take(&mut piece), false));
            piece.push(p[i]);
        }
    }
    if piece.len() >= 2 {
        pieces.push((piece, false));
    }
    pieces
}

/// Tessellates one outline chain in pieces without sharp joins (see [`outline_pieces`]).
fn tessellate_outline(
    tessellator: &mut egui::epaint::Tessellator,
    points: &[Pos2],
    closed: bool,
    stroke: Stroke,
    mesh: &mut Mesh,
) {
    for (piece, closed) in outline_pieces(points, closed) {
        let path = if closed {
            egui::epaint::PathShape::closed_line(piece, stroke)
        } else {
            egui::epaint::PathShape::line(piece, stroke)
        };
        tessellator.tessellate_path(&path, mesh);
    }
}

fn add_segment(mesh: &mut Mesh, a: Pos2, b: Pos2, width: f32, colour: Color32) {
    let d = b - a;
    let len = d.length();
    if len < 1e-3 {
        return;
    }
    let n = egui::vec2(-d.y, d.x) / len * (width / 2.0);
    let base = mesh.vertices.len() as u32;
    for p in [a - n, a + n, b + n, b - n] {
        mesh.colored_vertex(p, colour);
    }
    mesh.add_triangle(base, base + 1, base + 2);
    mesh.add_triangle(base, base + 2, base + 3);
}

/// Paints regions (screen rectangles and fills) into an image covering `at`, each at least one
/// pixel, so that a map of a million regions seen whole is one texture rather than millions of
/// triangles.
fn paint_small_regions(tiny: &[(egui::Rect, Color32)], at: egui::Rect) -> egui::ColorImage {
    let w = (at.width().ceil() as usize).clamp(1, RASTER_MAX_SIDE);
    let h = (at.height().ceil() as usize).clamp(1, RASTER_MAX_SIDE);
    let (sx, sy) = (
        w as f32 / at.width().max(1.0),
        h as f32 / at.height().max(1.0),
    );
    let mut pixels = vec![Color32::TRANSPARENT; w * h];
    for (r, colour) in tiny {
        let x0 = ((r.min.x - at.min.x) * sx).floor().max(0.0) as usize;
        let y0 = ((r.min.y - at.min.y) * sy).floor().max(0.0) as usize;
        let x1 = (((r.max.x - at.min.x) * sx).ceil() as usize).clamp(x0 + 1, w);
        let y1 = (((r.max.y - at.min.y) * sy).ceil() as usize).clamp(y0 + 1, h);
        for y in y0.min(h)..y1 {
            pixels[y * w + x0.min(w)..y * w + x1].fill(*colour);
        }
    }
    egui::ColorImage::new([w, h], pixels)
}

fn outline_region(
    doc: &Document,
    id: RegionId,
    painter: &egui::Painter,
    to_screen: &dyn Fn([f64; 2]) -> Pos2,
    stroke: Stroke,
) {
    let Some(region) = doc.regions().get(&id) else {
        return;
    };
    match &region.geometry {
        Some(g) => {
            for poly in &g.polygons {
                let points: Vec<Pos2> = poly.exterior.iter().map(|p| to_screen(*p)).collect();
                painter.add(Shape::closed_line(points, stroke));
            }
        }
        None => {
            painter.circle_stroke(to_screen(region.anchor), MARKER_RADIUS + 3.0, stroke);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn outlines_of_real_boundaries_draw_no_spikes_at_any_zoom() {
        // 14 US states from npm us-atlas 3.0.1 (tests/data/geo/PROVENANCE.md), with Alaska's
        // islands: at Fit, merging nearby points turned small islands into slivers whose joins
        // drew spikes up to 345 pixels long. Every outline must stay within a few pixels of
        // its own points.
        let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
            .join("tests/data/geo/us_states_subset.topojson");
        let doc = crate::geo::import_path(&path, &Default::default())
            .unwrap()
            .into_document("states");
        let mut scene = crate::ui::mesh::Scene::default();
        scene.sync(&doc);
        scene.ensure_chains();
        let mut tessellator = egui::epaint::Tessellator::new(
            1.0,
            egui::epaint::TessellationOptions::default(),
            [1, 1],
            Vec::new(),
        );
        for (canvas, zoom) in [(700.0, 1.0), (700.0, 3.0), (300.0, 1.0), (1400.0, 8.0)] {
            let mut camera = Camera::fit(doc.bounds().unwrap(), [canvas, canvas]);
            camera.pixels_per_unit *= zoom;
            let centre = [canvas / 2.0, canvas / 2.0];
            let mut worst = 0.0f32;
            for chain in &scene.chains {
                let ring = &scene.chain_points[chain.points.clone()];
                let mut points: Vec<Pos2> = Vec::new();
                for (k, p) in ring.iter().enumerate() {
                    let s = pos(camera.to_screen(centre, *p));
                    let last = k + 1 == ring.len();
                    match points.last() {
                        Some(q) if !last && (s - *q).length_sq() < DECIMATE_PX * DECIMATE_PX => {}
                        _ => points.push(s),
                    }
                }
                let lo = points
                    .iter()
                    .fold(Pos2::new(f32::MAX, f32::MAX), |m, p| m.min(*p));
                let hi = points
                    .iter()
                    .fold(Pos2::new(f32::MIN, f32::MIN), |m, p| m.max(*p));
                let mut mesh = Mesh::default();
                let stroke = Stroke::new(0.5, Color32::BLACK);
                tessellate_outline(&mut tessellator, &points, chain.closed, stroke, &mut mesh);
                for v in &mesh.vertices {
                    let dx = (lo.x - v.pos.x).max(v.pos.x - hi.x).max(0.0);
                    let dy = (lo.y - v.pos.y).max(v.pos.y - hi.y).max(0.0);
                    worst = worst.max(dx.max(dy));
                }
            }
            assert!(
                worst <= 3.0,
                "canvas {canvas}, zoom {zoom}: {worst} pixels out"
            );
        }
        // A plain ring stays one closed path; a hairpin is cut in two.
        let square = [
            Pos2::new(0.0, 0.0),
            Pos2::new(10.0, 0.0),
            Pos2::new(10.0, 10.0),
            Pos2::new(0.0, 10.0),
        ];
        assert_eq!(outline_pieces(&square, true), vec![(square.to_vec(), true)]);
        let hairpin = [
            Pos2::new(0.0, 0.0),
            Pos2::new(50.0, 0.0),
            Pos2::new(0.0, 1.0),
        ];
        assert_eq!(outline_pieces(&hairpin, false).len(), 2);
    }

    #[test]
    fn hatching_stays_inside_the_outline_and_out_of_holes() {
        // A 20 x 20 square with a 10 x 10 hole in the middle (screen points).
        let ring = |x0: f32, y0: f32, s: f32| {
            vec![
                Pos2::new(x0, y0),
                Pos2::new(x0 + s, y0),
                Pos2::new(x0 + s, y0 + s),
                Pos2::new(x0, y0 + s),
            ]
        };
        let segments = hatch_segments(&[ring(0.0, 0.0, 20.0), ring(5.0, 5.0, 10.0)], 5.0);
        // Rows at y = 2.5, 7.5, 12.5, 17.5; the middle two are cut in two by the hole.
        assert_eq!(segments.len(), 6);
        for [a, b] in &segments {
            assert!(a.x >= 0.0 && b.x <= 20.0 && a.x < b.x);
            let in_hole_row = (5.0..15.0).contains(&a.y);
            if in_hole_row {
                assert!(b.x <= 5.0 || a.x >= 15.0, "{a:?} {b:?} crosses the hole");
            }
        }
    }

    #[test]
    fn small_regions_paint_at_least_one_pixel_each_in_their_colour() {
        let at = egui::Rect::from_min_max(Pos2::new(100.0, 50.0), Pos2::new(110.0, 60.0));
        let red = Color32::from_rgb(200, 0, 0);
        let blue = Color32::from_rgb(0, 0, 200);
        let tiny = [
            // Smaller than a pixel: still one pixel, at (2, 3).
            (
                egui::Rect::from_min_max(Pos2::new(102.2, 53.1), Pos2::new(102.4, 53.3)),
                red,
            ),
            // Two by two pixels at (6..8, 6..8).
            (
                egui::Rect::from_min_max(Pos2::new(106.0, 56.0), Pos2::new(108.0, 58.0)),
                blue,
            ),
            // Partly outside the image: clipped, not a panic.
            (
                egui::Rect::from_min_max(Pos2::new(108.5, 58.5), Pos2::new(130.0, 90.0)),
                blue,
            ),
        ];
        let image = paint_small_regions(&tiny, at);
        assert_eq!(image.size, [10, 10]);
        let px = |x: usize, y: usize| image.pixels[y * 10 + x];
        assert_eq!(px(2, 3), red);
        assert_eq!(px(3, 3), Color32::TRANSPARENT);
        for (x, y) in [(6, 6), (7, 6), (6, 7), (7, 7), (9, 9)] {
            assert_eq!(px(x, y), blue, "({x}, {y})");
        }
        assert_eq!(px(5, 5), Color32::TRANSPARENT);
        let painted = image
            .pixels
            .iter()
            .filter(|c| **c != Color32::TRANSPARENT)
            .count();
        assert_eq!(painted, 1 + 4 + 4);
    }
}

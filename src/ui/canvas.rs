//! The map canvas: filled regions, outlines, names, markers, the border links and highlights; pan,
//! zoom and the editing tools. Geometry stays in world units; `Camera` maps it to the screen once
//! per frame, and hit-testing happens in world space (`view::hit_test`).

use egui::epaint::{Mesh, Shape};
use egui::{Align2, Color32, FontId, Pos2, Sense, Stroke};

use crate::doc::{BorderKind, Document, Edit, Region, RegionChange, RegionId, RegionPair, Role};

use super::app::{App, Highlight};
use super::commands::Tool;
use super::view::{Camera, hit_test, outline_bounds};
use crate::worker::analysis::PlanarityVerdict;

/// Colours of the canvas (our own choices: quiet neutrals, with strong colours kept for warnings).
pub mod style {
    use egui::Color32;
    pub const BACKGROUND: Color32 = Color32::from_rgb(0xf4, 0xf2, 0xec);
    pub const UNCOLOURED: Color32 = Color32::from_rgb(0xe4, 0xe1, 0xd8);
    pub const WATER: Color32 = Color32::from_rgb(0xcf, 0xe0, 0xea);
    pub const OUTLINE: Color32 = Color32::from_rgb(0x55, 0x55, 0x55);
    pub const SELECTION: Color32 = Color32::from_rgb(0x17, 0x45, 0x8f);
    pub const CLASH: Color32 = Color32::from_rgb(0xc4, 0x1e, 0x3a);
    pub const LINK_SHARED: Color32 = Color32::from_rgb(0x4a, 0x4a, 0x4a);
    pub const LINK_CORNER: Color32 = Color32::from_rgb(0x8a, 0x6d, 0x3b);
    pub const LINK_MANUAL: Color32 = Color32::from_rgb(0xd0, 0x6a, 0x10);
    pub const LINK_SUPPRESSED: Color32 = Color32::from_rgb(0xb0, 0xb0, 0xb0);
    pub const GROUP: Color32 = Color32::from_rgb(0x6b, 0x2f, 0x9e);
    pub const LABEL: Color32 = Color32::from_rgb(0x22, 0x22, 0x22);
    pub const CERTIFICATE: Color32 = Color32::from_rgb(0xa3, 0x1a, 0x8c);
    pub const OBSTRUCTION: Color32 = Color32::from_rgb(0xb3, 0x4a, 0x00);
}

/// Screen radius of a marker, in points.
const MARKER_RADIUS: f32 = 7.0;

fn fill_of(doc: &Document, id: RegionId, region: &Region) -> Color32 {
    if region.role == Role::Water {
        return style::WATER;
    }
    match doc
        .colouring
        .get(&id)
        .and_then(|s| doc.palette.slots.get(*s as usize))
    {
        Some(slot) => Color32::from_rgb(slot.colour.0[0], slot.colour.0[1], slot.colour.0[2]),
        None => style::UNCOLOURED,
    }
}

/// Where a world point is on screen, given the canvas drawn last frame (for tests and tools).
pub fn screen_of(app: &App, p: [f64; 2]) -> Option<Pos2> {
    let rect = app.view.canvas_rect?;
    Some(pos(app
        .view
        .camera
        .to_screen([rect.center().x, rect.center().y], p)))
}

fn pos(p: [f32; 2]) -> Pos2 {
    Pos2::new(p[0], p[1])
}

/// Draws the canvas and handles its input.
pub fn canvas_ui(app: &mut App, ui: &mut egui::Ui) {
    let size = ui.available_size();
    let (response, painter) = ui.allocate_painter(size, Sense::click_and_drag());
    response.widget_info(|| egui::WidgetInfo::labeled(egui::Role::Canvas, true, "Map canvas"));
    let rect = response.rect;
    app.view.canvas_rect = Some(rect);
    painter.rect_filled(rect, 0.0, style::BACKGROUND);
    let centre = [rect.center().x, rect.center().y];

    if app.view.fit_pending && rect.width() > 10.0 {
        if let Some(bounds) = app.session.doc.bounds() {
            app.view.camera = Camera::fit(bounds, [rect.width(), rect.height()]);
        }
        app.view.fit_pending = false;
    }

    // Zoom with the wheel (or a pinch) around the pointer.
    if let Some(p) = response.hover_pos() {
        let (scroll, pinch) = ui.input(|i| (i.smooth_scroll_delta.y, i.zoom_delta()));
        let factor = (scroll as f64 * 0.0015).exp() * pinch as f64;
        if (factor - 1.0).abs() > 1e-6 {
            app.view.camera.zoom_at(centre, [p.x, p.y], factor);
        }
    }

    let camera = app.view.camera;
    let bounds = outline_bounds(&app.session.doc);
    let marker_radius_world = MARKER_RADIUS as f64 / camera.pixels_per_unit;
    let pointer_world = response
        .hover_pos()
        .map(|p| camera.to_world(centre, [p.x, p.y]));
    app.view.hover =
        pointer_world.and_then(|w| hit_test(&app.session.doc, &bounds, w, marker_radius_world));

    // Dragging: moves a marker in the select tool, otherwise pans. A move is one edit, on release.
    if response.drag_started()
        && app.view.tool == Tool::Select
        && let Some(id) = app.view.hover
        && app
            .session
            .doc
            .regions
            .get(&id)
            .is_some_and(|r| r.geometry.is_none())
    {
        app.view.dragging = Some((id, [0.0, 0.0]));
    }
    if response.dragged() {
        let d = response.drag_delta();
        match &mut app.view.dragging {
            Some((_, offset)) => {
                offset[0] += d.x as f64 / camera.pixels_per_unit;
                offset[1] -= d.y as f64 / camera.pixels_per_unit;
            }
            None => app.view.camera.pan_by([d.x, d.y]),
        }
    }
    if response.drag_stopped()
        && let Some((id, offset)) = app.view.dragging.take()
        && let Some(region) = app.session.doc.regions.get(&id)
    {
        let to = [region.anchor[0] + offset[0], region.anchor[1] + offset[1]];
        app.edit(Edit::UpdateRegion {
            id,
            change: RegionChange::Anchor(to),
        });
    }
    if response.clicked()
        && let Some(world) = pointer_world
    {
        let hit = app.view.hover;
        click(app, hit, world);
    }

    draw(app, &painter, centre, rect);

    if let Some(id) = app.view.hover
        && let Some(r) = app.session.doc.regions.get(&id)
    {
        let text = match (r.role, app.session.doc.colouring.get(&id)) {
            (Role::Water, _) => format!("{} (water)", r.name),
            (_, Some(s)) => format!(
                "{} — colour {}",
                r.name,
                app.session
                    .doc
                    .palette
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
fn click(app: &mut App, hit: Option<RegionId>, world: [f64; 2]) {
    let doc = &app.session.doc;
    match app.view.tool {
        Tool::Select => app.view.selection = hit,
        Tool::Place => {
            let id = doc.peek_region_id();
            let (id, edit) = doc.add_region_edit(Region::new(format!("Region {id}"), world));
            app.edit(edit);
            app.view.selection = Some(id);
        }
        Tool::Border => match (app.view.border_first, hit) {
            (None, Some(h)) => app.view.border_first = Some(h),
            (Some(a), Some(b)) if a != b => {
                app.view.border_first = None;
                if let Some(pair) = RegionPair::new(a, b) {
                    let active = doc.borders.get(&pair).is_some_and(|bd| !bd.suppressed);
                    let edit = if active {
                        doc.remove_border_edit(pair)
                    } else {
                        doc.add_border_edit(pair)
                    };
                    if let Some(edit) = edit {
                        app.edit(edit);
                    }
                }
            }
            _ => app.view.border_first = None,
        },
        Tool::Pin => {
            if let Some(h) = hit
                && let Some(region) = doc.regions.get(&h)
            {
                let slot = app.view.pin_slot;
                let pin = if region.pin == Some(slot) {
                    None
                } else {
                    Some(slot)
                };
                app.edit(Edit::UpdateRegion {
                    id: h,
                    change: RegionChange::Pin(pin),
                });
                app.view.selection = Some(h);
            }
        }
        Tool::Group => {
            if let Some(h) = hit
                && let Some(region) = doc.regions.get(&h)
            {
                match app.view.group.filter(|g| doc.groups.contains_key(g)) {
                    Some(g) => {
                        let to = if region.group == Some(g) {
                            None
                        } else {
                            Some(g)
                        };
                        app.edit(Edit::UpdateRegion {
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
                        app.edit(Edit::Batch {
                            label: "Start a same-colour group".into(),
                            edits: vec![create, join],
                        });
                        app.view.group = Some(g);
                    }
                }
                app.view.selection = Some(h);
            }
        }
        Tool::Water => {
            if let Some(h) = hit
                && let Some(region) = doc.regions.get(&h)
            {
                let role = if region.role == Role::Water {
                    Role::Land
                } else {
                    Role::Water
                };
                app.edit(Edit::UpdateRegion {
                    id: h,
                    change: RegionChange::Role(role),
                });
            }
        }
    }
}

fn draw(app: &App, painter: &egui::Painter, centre: [f32; 2], rect: egui::Rect) {
    let doc = &app.session.doc;
    let camera = app.view.camera;
    let to_screen = |p: [f64; 2]| pos(camera.to_screen(centre, p));
    let anchor_of = |id: RegionId| -> Option<[f64; 2]> {
        let r = doc.regions.get(&id)?;
        Some(match app.view.dragging {
            Some((d, off)) if d == id => [r.anchor[0] + off[0], r.anchor[1] + off[1]],
            _ => r.anchor,
        })
    };

    // Fills: one mesh for all outlined regions.
    let mut mesh = Mesh::default();
    for (id, region) in &doc.regions {
        let Some(tris) = app.meshes.get(*id) else {
            continue;
        };
        let colour = fill_of(doc, *id, region);
        let base = mesh.vertices.len() as u32;
        for v in &tris.vertices {
            mesh.colored_vertex(to_screen(*v), colour);
        }
        for t in tris.indices.chunks_exact(3) {
            mesh.add_triangle(base + t[0], base + t[1], base + t[2]);
        }
    }
    painter.add(Shape::mesh(mesh));

    // Outlines, thinner when zoomed far out.
    let outline = Stroke::new(
        if camera.pixels_per_unit * 1000.0 < 0.02 {
            0.5
        } else {
            1.0
        },
        style::OUTLINE,
    );
    for region in doc.regions.values() {
        let Some(g) = &region.geometry else { continue };
        for poly in &g.polygons {
            for ring in std::iter::once(&poly.exterior).chain(poly.holes.iter()) {
                let points: Vec<Pos2> = ring.iter().map(|p| to_screen(*p)).collect();
                painter.add(Shape::closed_line(points, outline));
            }
        }
    }

    // Border links between anchors, styled by kind.
    if app.view.show_borders {
        for (pair, border) in &doc.borders {
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
    let focus_group = app.view.group.or_else(|| {
        app.view
            .selection
            .and_then(|s| doc.regions.get(&s))
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
    for clash in &app.checks.colouring.clashes {
        let (Some(a), Some(b)) = (anchor_of(clash.pair.a()), anchor_of(clash.pair.b())) else {
            continue;
        };
        painter.line_segment([to_screen(a), to_screen(b)], Stroke::new(3.0, style::CLASH));
        for id in [clash.pair.a(), clash.pair.b()] {
            outline_region(doc, id, painter, &to_screen, Stroke::new(2.0, style::CLASH));
        }
    }

    // Evidence asked for: the regions that cannot be drawn flat, or that cannot take three colours.
    let colouring = app.analysis.as_ref().and_then(|a| a.colouring.as_ref());
    let evidence = match (
        app.view.highlight,
        app.analysis.as_ref().map(|a| &a.planarity),
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
    for (id, region) in &doc.regions {
        if region.geometry.is_some() {
            continue;
        }
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
    for region in doc.regions.values() {
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
        (app.view.selection, style::SELECTION),
        (app.view.border_first, style::LINK_MANUAL),
    ] {
        if let Some(id) = id {
            outline_region(doc, id, painter, &to_screen, Stroke::new(3.0, colour));
        }
    }

    // Names, where the region is big enough on screen to hold them.
    if app.view.show_labels {
        let font = FontId::proportional(12.0);
        for region in doc.regions.values() {
            let width_px = match region.geometry.as_ref().and_then(|g| g.bounds()) {
                Some([lo, hi]) => ((hi[0] - lo[0]) * camera.pixels_per_unit) as f32,
                None => 80.0,
            };
            if width_px < 6.0 * region.name.chars().count() as f32 {
                continue;
            }
            let p = to_screen(region.anchor);
            if !rect.contains(p) {
                continue;
            }
            let offset = if region.geometry.is_none() {
                egui::vec2(0.0, MARKER_RADIUS + 8.0)
            } else {
                egui::vec2(0.0, 0.0)
            };
            painter.text(
                p + offset,
                Align2::CENTER_CENTER,
                &region.name,
                font.clone(),
                style::LABEL,
            );
        }
    }
}

fn outline_region(
    doc: &Document,
    id: RegionId,
    painter: &egui::Painter,
    to_screen: &dyn Fn([f64; 2]) -> Pos2,
    stroke: Stroke,
) {
    let Some(region) = doc.regions.get(&id) else {
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

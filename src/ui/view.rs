//! The map view's geometry, free of any GUI type: the camera (world <-> screen), fitting, and
//! hit-testing in world space. Pure functions, unit-tested without a window.

use crate::doc::{Document, Geometry, Point, RegionId};

/// Where the view looks: the world point at the centre of the canvas and the zoom.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Camera {
    pub centre_world: Point,
    /// Screen pixels per world unit.
    pub pixels_per_unit: f64,
}

impl Default for Camera {
    fn default() -> Camera {
        Camera {
            centre_world: [0.0, 0.0],
            pixels_per_unit: 1.0,
        }
    }
}

impl Camera {
    /// Screen position of a world point, for a canvas whose centre is at `canvas_centre` (pixels).
    /// World y grows northwards; screen y grows downwards.
    #[inline]
    pub fn to_screen(&self, canvas_centre: [f32; 2], p: Point) -> [f32; 2] {
        [
            canvas_centre[0] + ((p[0] - self.centre_world[0]) * self.pixels_per_unit) as f32,
            canvas_centre[1] - ((p[1] - self.centre_world[1]) * self.pixels_per_unit) as f32,
        ]
    }

    /// World point under a screen position.
    pub fn to_world(&self, canvas_centre: [f32; 2], s: [f32; 2]) -> Point {
        [
            self.centre_world[0] + (s[0] - canvas_centre[0]) as f64 / self.pixels_per_unit,
            self.centre_world[1] - (s[1] - canvas_centre[1]) as f64 / self.pixels_per_unit,
        ]
    }

    /// Zooms by `factor` keeping the world point under `screen` fixed.
    pub fn zoom_at(&mut self, canvas_centre: [f32; 2], screen: [f32; 2], factor: f64) {
        let before = self.to_world(canvas_centre, screen);
        self.pixels_per_unit = (self.pixels_per_unit * factor).clamp(1e-9, 1e9);
        let after = self.to_world(canvas_centre, screen);
        self.centre_world[0] += before[0] - after[0];
        self.centre_world[1] += before[1] - after[1];
    }

    /// Moves the view by a screen-space drag.
    pub fn pan_by(&mut self, drag_pixels: [f32; 2]) {
        self.centre_world[0] -= drag_pixels[0] as f64 / self.pixels_per_unit;
        self.centre_world[1] += drag_pixels[1] as f64 / self.pixels_per_unit;
    }

    /// A camera that shows `bounds` inside a canvas of `size` pixels, leaving a twentieth of
    /// the canvas, and at least [`FIT_MARGIN`] pixels, free on every side.
    pub fn fit(bounds: [Point; 2], size: [f32; 2]) -> Camera {
        let [lo, hi] = bounds;
        let w = (hi[0] - lo[0]).max(1e-9);
        let h = (hi[1] - lo[1]).max(1e-9);
        let room = |pixels: f32| {
            let pixels = pixels as f64;
            (pixels - 2.0 * FIT_MARGIN.max(0.05 * pixels)).max(1.0)
        };
        let scale = (room(size[0]) / w).min(room(size[1]) / h).clamp(1e-9, 1e9);
        Camera {
            centre_world: [(lo[0] + hi[0]) / 2.0, (lo[1] + hi[1]) / 2.0],
            pixels_per_unit: scale,
        }
    }

    /// A camera that goes to `bounds` (a region or a few) and shows some of what surrounds
    /// them: they fill about half the canvas, never less than `min_extent` world units across
    /// (so a tiny region is seen among its neighbours).
    pub fn go_to(bounds: [Point; 2], size: [f32; 2], min_extent: f64) -> Camera {
        let [lo, hi] = bounds;
        let centre = [(lo[0] + hi[0]) / 2.0, (lo[1] + hi[1]) / 2.0];
        // Half the box's size on each side of the centre: the box fills about half the view.
        let half = [
            (hi[0] - lo[0]).max(min_extent),
            (hi[1] - lo[1]).max(min_extent),
        ];
        Camera::fit(
            [
                [centre[0] - half[0], centre[1] - half[1]],
                [centre[0] + half[0], centre[1] + half[1]],
            ],
            size,
        )
    }
}

/// The least room, in pixels, between the map and the canvas edge at Fit.
pub const FIT_MARGIN: f64 = 24.0;

/// The box around the given regions: their outlines, or their markers' positions.
pub fn bounds_of(doc: &Document, ids: &[RegionId]) -> Option<[Point; 2]> {
    let mut out: Option<[Point; 2]> = None;
    for id in ids {
        let Some(region) = doc.regions().get(id) else {
            continue;
        };
        let b = region
            .geometry
            .as_ref()
            .and_then(|g| g.bounds())
            .unwrap_or([region.anchor, region.anchor]);
        out = Some(match out {
            None => b,
            Some([lo, hi]) => [
                [lo[0].min(b[0][0]), lo[1].min(b[0][1])],
                [hi[0].max(b[1][0]), hi[1].max(b[1][1])],
            ],
        });
    }
    out
}

/// True when `p` lies inside the geometry (even-odd rule over all rings, so holes are outside).
pub fn contains(geometry: &Geometry, p: Point) -> bool {
    crate::geometry::point_in_rings(
        geometry
            .polygons
            .iter()
            .flat_map(|polygon| std::iter::once(&polygon.exterior).chain(&polygon.holes))
            .map(|ring| ring.as_slice()),
        p,
    )
}

/// The region under world point `p`: the smallest-area outline containing it, or failing that the
/// nearest marker (anchor) within `marker_radius_world`.
pub fn hit_test(
    doc: &Document,
    bounds: impl IntoIterator<Item = (RegionId, [Point; 2], f64)>,
    p: Point,
    marker_radius_world: f64,
) -> Option<RegionId> {
    let mut best: Option<(f64, RegionId)> = None;
    for (id, [lo, hi], area) in bounds {
        if p[0] < lo[0] || p[0] > hi[0] || p[1] < lo[1] || p[1] > hi[1] {
            continue;
        }
        let Some(g) = doc.regions().get(&id).and_then(|r| r.geometry.as_ref()) else {
            continue;
        };
        if contains(g, p) && best.is_none_or(|(a, _)| area < a) {
            best = Some((area, id));
        }
    }
    if let Some((_, id)) = best {
        return Some(id);
    }
    let mut nearest: Option<(f64, RegionId)> = None;
    for (id, r) in doc.regions() {
        if r.geometry.is_some() {
            continue;
        }
        let d = ((r.anchor[0] - p[0]).powi(2) + (r.anchor[1] - p[1]).powi(2)).sqrt();
        if d <= marker_radius_world && nearest.is_none_or(|(best_d, _)| d < best_d) {
            nearest = Some((d, *id));
        }
    }
    nearest.map(|(_, id)| id)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::doc::Region;
    use crate::doc::fixtures::square;
    use std::sync::Arc;

    /// Bounding boxes and areas of every outlined region, for [`hit_test`].
    fn outline_bounds(doc: &Document) -> Vec<(RegionId, [Point; 2], f64)> {
        doc.regions()
            .iter()
            .filter_map(|(id, r)| {
                let g = r.geometry.as_ref()?;
                Some((*id, g.bounds()?, g.area()))
            })
            .collect()
    }

    #[test]
    fn screen_and_world_are_inverse_and_zoom_keeps_the_point_under_the_cursor() {
        let mut cam = Camera {
            centre_world: [10.0, 20.0],
            pixels_per_unit: 2.0,
        };
        let c = [400.0, 300.0];
        let w = cam.to_world(c, [123.0, 45.0]);
        let s = cam.to_screen(c, w);
        assert!((s[0] - 123.0).abs() < 1e-3 && (s[1] - 45.0).abs() < 1e-3);
        cam.zoom_at(c, [123.0, 45.0], 3.0);
        let w2 = cam.to_world(c, [123.0, 45.0]);
        assert!((w2[0] - w[0]).abs() < 1e-9 && (w2[1] - w[1]).abs() < 1e-9);
    }

    #[test]
    fn hit_test_prefers_the_smaller_region_and_respects_holes() {
        let mut doc = Document::new("t");
        let mut big = Region::new("big", [5.0, 5.0]);
        let mut g = square(0.0, 0.0, 10.0);
        g.polygons[0]
            .holes
            .push(vec![[6.0, 6.0], [8.0, 6.0], [8.0, 8.0], [6.0, 8.0]]);
        big.geometry = Some(Arc::new(g));
        let mut small = Region::new("small", [2.0, 2.0]);
        small.geometry = Some(Arc::new(square(1.0, 1.0, 2.0)));
        let marker = Region::new("marker", [20.0, 20.0]);
        for r in [big, small, marker] {
            let (_, e) = doc.add_region_edit(r);
            doc.apply(e).unwrap();
        }
        let b = outline_bounds(&doc);
        assert_eq!(
            hit_test(&doc, b.iter().copied(), [2.0, 2.0], 0.5),
            Some(RegionId(2))
        );
        assert_eq!(
            hit_test(&doc, b.iter().copied(), [5.0, 2.0], 0.5),
            Some(RegionId(1))
        );
        assert_eq!(
            hit_test(&doc, b.iter().copied(), [7.0, 7.0], 0.5),
            None,
            "inside the hole"
        );
        assert_eq!(
            hit_test(&doc, b.iter().copied(), [20.3, 20.0], 0.5),
            Some(RegionId(3))
        );
        assert_eq!(hit_test(&doc, b.iter().copied(), [30.0, 30.0], 0.5), None);
    }
}

//! Synthetic maps for tests and benchmarks: jittered grids whose neighbours share boundaries.
//!
//! A `cols x rows` lattice of cells; every lattice corner is moved by a seeded random offset and
//! every cell edge is split into `steps` pieces whose inner points are moved sideways, so cells
//! look like irregular districts. Both cells on an edge use the same points, so the map has exact
//! shared boundaries and four-way corners; rook neighbours are the four grid neighbours and queen
//! adds the diagonal ones. Deterministic for a given seed.

use std::collections::BTreeMap;

use super::{ImportedRegion, Point, Polygon};

/// A small deterministic generator (xorshift64*, Vigna 2016); explicit seeds, no dependency.
#[derive(Clone, Debug)]
pub struct XorShift(u64);

impl XorShift {
    pub fn new(seed: u64) -> Self {
        Self(seed.wrapping_mul(0x9E37_79B9_7F4A_7C15) | 1)
    }

    pub fn next_u64(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545_F491_4F6C_DD1D)
    }

    /// Uniform in `[-1, 1)`.
    pub fn symmetric(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 / (1u64 << 53) as f64 * 2.0 - 1.0
    }
}

/// A jittered grid of `cols * rows` unit cells; region `r * cols + c` is named `"cell c,r"`.
/// `jitter` is a fraction of the cell size (below 0.25 keeps cells simple polygons).
pub fn jittered_grid(
    cols: usize,
    rows: usize,
    steps: usize,
    jitter: f64,
    seed: u64,
) -> Vec<ImportedRegion> {
    let steps = steps.max(1);
    let mut rng = XorShift::new(seed);
    let mut corner = vec![[0.0; 2]; (cols + 1) * (rows + 1)];
    for r in 0..=rows {
        for c in 0..=cols {
            // Keep the outer frame straight so the map is a rectangle.
            let dx = if c == 0 || c == cols {
                0.0
            } else {
                jitter * rng.symmetric()
            };
            let dy = if r == 0 || r == rows {
                0.0
            } else {
                jitter * rng.symmetric()
            };
            corner[r * (cols + 1) + c] = [c as f64 + dx, r as f64 + dy];
        }
    }
    let at = |c: usize, r: usize| corner[r * (cols + 1) + c];
    // Points of each lattice edge from its lower-numbered corner to the other, inner points only.
    let mut edges: BTreeMap<(usize, usize), Vec<Point>> = BTreeMap::new();
    let edge = |a: (usize, usize), b: (usize, usize), rng: &mut XorShift| {
        let (p, q) = (at(a.0, a.1), at(b.0, b.1));
        let normal = [-(q[1] - p[1]), q[0] - p[0]];
        let border =
            (a.0 == b.0 && (a.0 == 0 || a.0 == cols)) || (a.1 == b.1 && (a.1 == 0 || a.1 == rows));
        (1..steps)
            .map(|k| {
                let t = k as f64 / steps as f64;
                let side = if border {
                    0.0
                } else {
                    jitter * 0.5 * rng.symmetric()
                };
                [
                    p[0] + t * (q[0] - p[0]) + side * normal[0],
                    p[1] + t * (q[1] - p[1]) + side * normal[1],
                ]
            })
            .collect::<Vec<_>>()
    };
    for r in 0..=rows {
        for c in 0..=cols {
            if c < cols {
                let pts = edge((c, r), (c + 1, r), &mut rng);
                edges.insert((r * (cols + 1) + c, r * (cols + 1) + c + 1), pts);
            }
            if r < rows {
                let pts = edge((c, r), (c, r + 1), &mut rng);
                edges.insert((r * (cols + 1) + c, (r + 1) * (cols + 1) + c), pts);
            }
        }
    }
    let mut regions = Vec::with_capacity(cols * rows);
    for r in 0..rows {
        for c in 0..cols {
            let ids = [
                r * (cols + 1) + c,
                r * (cols + 1) + c + 1,
                (r + 1) * (cols + 1) + c + 1,
                (r + 1) * (cols + 1) + c,
            ];
            let mut ring = Vec::with_capacity(4 * steps + 1);
            for k in 0..4 {
                let (a, b) = (ids[k], ids[(k + 1) % 4]);
                ring.push(corner[a]);
                if a < b {
                    ring.extend(edges[&(a, b)].iter().copied());
                } else {
                    ring.extend(edges[&(b, a)].iter().rev().copied());
                }
            }
            ring.push(ring[0]);
            regions.push(ImportedRegion {
                source_index: regions.len(),
                name: format!("cell {c},{r}"),
                parts: vec![Polygon {
                    exterior: ring,
                    holes: vec![],
                }],
                properties: super::Properties::new(),
            });
        }
    }
    regions
}

/// Writes regions as a GeoJSON FeatureCollection (planar coordinates, `name` property).
pub fn to_geojson(regions: &[ImportedRegion]) -> String {
    let mut out = String::from("{\"type\":\"FeatureCollection\",\"features\":[\n");
    for (i, region) in regions.iter().enumerate() {
        if i > 0 {
            out.push_str(",\n");
        }
        let ring_text = |ring: &[Point]| {
            let pts: Vec<String> = ring
                .iter()
                .map(|p| format!("[{},{}]", p[0], p[1]))
                .collect();
            format!("[{}]", pts.join(","))
        };
        let polys: Vec<String> = region
            .parts
            .iter()
            .map(|p| {
                let rings: Vec<String> = std::iter::once(&p.exterior)
                    .chain(&p.holes)
                    .map(|r| ring_text(r))
                    .collect();
                format!("[{}]", rings.join(","))
            })
            .collect();
        let name = serde_json::Value::String(region.name.clone());
        out.push_str(&format!(
            "{{\"type\":\"Feature\",\"properties\":{{\"name\":{name}}},\"geometry\":{{\"type\":\"MultiPolygon\",\"coordinates\":[{}]}}}}",
            polys.join(",")
        ));
    }
    out.push_str("\n]}\n");
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn grid_has_shared_corners_and_expected_size() {
        let regions = jittered_grid(3, 2, 4, 0.1, 7);
        assert_eq!(regions.len(), 6);
        for region in &regions {
            assert_eq!(region.parts[0].exterior.len(), 4 * 4 + 1);
        }
        // Cell 0,0 and cell 1,0 share their common edge in reverse order.
        let a = &regions[0].parts[0].exterior;
        let b = &regions[1].parts[0].exterior;
        assert_eq!(
            a[4..=8].iter().rev().collect::<Vec<_>>(),
            b[12..=16].iter().collect::<Vec<_>>()
        );
    }
}

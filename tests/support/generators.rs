//! Seeded generators shared by the tests and the benchmarks (one place for all of them, kept out
//! of the library): a random number generator, random planar triangulations and the families
//! built from them, Eulerian triangulations, and synthetic maps (jittered grids whose neighbours
//! share boundaries) with their GeoJSON text. The benchmarks include this file by path.
#![allow(dead_code)]

use std::collections::{BTreeMap, HashMap, HashSet};

use tinct::geo::{ImportedRegion, Point, Polygon};

/// SplitMix64 (S. Vigna, public-domain reference code): small, fast and reproducible.
#[derive(Clone, Debug)]
pub struct Rng(u64);

impl Rng {
    pub fn new(seed: u64) -> Rng {
        Rng(seed)
    }
    pub fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9e37_79b9_7f4a_7c15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xbf58_476d_1ce4_e5b9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94d0_49bb_1331_11eb);
        z ^ (z >> 31)
    }
    /// Uniform in `0..bound` (bound > 0); the tiny modulo bias does not matter here.
    pub fn below(&mut self, bound: u64) -> u64 {
        self.next_u64() % bound
    }
    /// A uniform position in `0..len` (len > 0).
    pub fn index(&mut self, len: usize) -> usize {
        self.below(len as u64) as usize
    }
    /// Uniform in `[-1, 1)`.
    pub fn symmetric(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 / (1u64 << 53) as f64 * 2.0 - 1.0
    }
    /// Fisher-Yates.
    pub fn shuffle<T>(&mut self, v: &mut [T]) {
        for i in (1..v.len()).rev() {
            let j = self.index(i + 1);
            v.swap(i, j);
        }
    }
}

/// A random maximal planar graph (triangulation) on `n >= 3` vertices: vertices are inserted one
/// at a time into a random triangular face (which alone gives an Apollonian network), then
/// `flips` random edge flips make the degrees less regular. Every step keeps a plane
/// triangulation, so the result has exactly 3n - 6 edges.
pub fn random_triangulation(n: usize, flips: usize, rng: &mut Rng) -> Vec<(u32, u32)> {
    assert!(n >= 3);
    // Faces are oriented triples; `face_of[(a, b)]` is the face containing the dart a -> b.
    let mut faces: Vec<[u32; 3]> = vec![[0, 1, 2], [0, 2, 1]];
    let mut face_of: HashMap<(u32, u32), usize> = HashMap::with_capacity(6 * n);
    let register = |face_of: &mut HashMap<(u32, u32), usize>, f: usize, t: [u32; 3]| {
        face_of.insert((t[0], t[1]), f);
        face_of.insert((t[1], t[2]), f);
        face_of.insert((t[2], t[0]), f);
    };
    register(&mut face_of, 0, faces[0]);
    register(&mut face_of, 1, faces[1]);
    for v in 3..n as u32 {
        let f = rng.below(faces.len() as u64) as usize;
        let [a, b, c] = faces[f];
        let t0 = [a, b, v];
        let t1 = [b, c, v];
        let t2 = [c, a, v];
        faces[f] = t0;
        faces.push(t1);
        faces.push(t2);
        let (f1, f2) = (faces.len() - 2, faces.len() - 1);
        register(&mut face_of, f, t0);
        register(&mut face_of, f1, t1);
        register(&mut face_of, f2, t2);
    }
    let mut edges: Vec<(u32, u32)> = face_of.keys().filter(|&&(a, b)| a < b).copied().collect();
    edges.sort_unstable();
    for _ in 0..flips {
        let (a, b) = edges[rng.below(edges.len() as u64) as usize];
        let (Some(&f1), Some(&f2)) = (face_of.get(&(a, b)), face_of.get(&(b, a))) else {
            continue;
        };
        let third = |t: [u32; 3]| t.into_iter().find(|&x| x != a && x != b).unwrap();
        let (c, d) = (third(faces[f1]), third(faces[f2]));
        if c == d || face_of.contains_key(&(c, d)) {
            continue;
        }
        // Quadrilateral a -> d -> b -> c -> a; replace diagonal a-b by c-d.
        face_of.remove(&(a, b));
        face_of.remove(&(b, a));
        let t1 = [a, d, c];
        let t2 = [d, b, c];
        faces[f1] = t1;
        faces[f2] = t2;
        register(&mut face_of, f1, t1);
        register(&mut face_of, f2, t2);
    }
    let mut edges: Vec<(u32, u32)> = face_of.keys().filter(|&&(a, b)| a < b).copied().collect();
    edges.sort_unstable();
    edges
}

/// A random permutation of `0..n` (Fisher-Yates).
pub fn permutation(n: usize, rng: &mut Rng) -> Vec<u32> {
    let mut p: Vec<u32> = (0..n as u32).collect();
    for i in (1..n).rev() {
        let j = rng.below(i as u64 + 1) as usize;
        p.swap(i, j);
    }
    p
}

/// Renames every vertex `v` to `p[v]` and shuffles the edge order.
pub fn relabel(edges: &[(u32, u32)], p: &[u32], rng: &mut Rng) -> Vec<(u32, u32)> {
    let mut out: Vec<(u32, u32)> = edges
        .iter()
        .map(|&(a, b)| (p[a as usize], p[b as usize]))
        .collect();
    for i in (1..out.len()).rev() {
        let j = rng.below(i as u64 + 1) as usize;
        out.swap(i, j);
    }
    out
}

/// A pair of distinct vertices that is not an edge yet.
pub fn random_non_edge(n: usize, edges: &[(u32, u32)], rng: &mut Rng) -> (u32, u32) {
    let present: HashSet<(u32, u32)> = edges.iter().map(|&(a, b)| (a.min(b), a.max(b))).collect();
    loop {
        let a = rng.below(n as u64) as u32;
        let b = rng.below(n as u64) as u32;
        if a != b && !present.contains(&(a.min(b), a.max(b))) {
            return (a.min(b), a.max(b));
        }
    }
}

/// Removes one random edge and adds one random non-edge (other than the removed one).
pub fn move_one_edge(n: usize, edges: &[(u32, u32)], rng: &mut Rng) -> Vec<(u32, u32)> {
    let mut out = edges.to_vec();
    let i = rng.below(out.len() as u64) as usize;
    let removed = out.swap_remove(i);
    loop {
        let e = random_non_edge(n, &out, rng);
        if e != (removed.0.min(removed.1), removed.0.max(removed.1)) {
            out.push(e);
            return out;
        }
    }
}

/// Replaces every edge by a path with 0..=max_extra new inner vertices; returns the new vertex
/// count and edges.
pub fn subdivide(
    n: usize,
    edges: &[(u32, u32)],
    max_extra: u64,
    rng: &mut Rng,
) -> (usize, Vec<(u32, u32)>) {
    let mut next = n as u32;
    let mut out = Vec::new();
    for &(a, b) in edges {
        let extra = rng.below(max_extra + 1);
        let mut previous = a;
        for _ in 0..extra {
            out.push((previous, next));
            previous = next;
            next += 1;
        }
        out.push((previous, b));
    }
    (next as usize, out)
}

/// A ring of crossing chords: a cycle on `2k` vertices plus the `k` chords `(2i, 2i + 3 mod 2k)`.
/// Each chord crosses exactly the previous and the next one when drawn inside the cycle, so the
/// chords' conflict graph is a cycle of length `k`: for odd `k >= 3` the graph is not planar (a
/// Hamiltonian cycle plus chords is planar exactly when the chords can be split between the
/// inside and the outside without crossings, i.e. when their conflict graph is bipartite; common
/// practice), and deleting any one chord makes it planar. For `k = 3` it is K3,3 itself.
/// Every Kuratowski subgraph therefore contains all `k` chords, which is what makes the family
/// hard for isolation schemes whose cost grows with the number of pieces a certificate needs.
///
/// `padding` more vertices form a random triangulation glued to the ring at one vertex, so the
/// obstruction sits inside a large planar graph. Labels and edge order are shuffled.
pub fn crossing_chord_ring(k: usize, padding: usize, rng: &mut Rng) -> (usize, Vec<(u32, u32)>) {
    assert!(k >= 3);
    let ring = 2 * k;
    let mut edges: Vec<(u32, u32)> = Vec::with_capacity(3 * k + 3 * padding);
    for i in 0..ring {
        edges.push((i as u32, ((i + 1) % ring) as u32));
    }
    for i in 0..k {
        edges.push(((2 * i) as u32, ((2 * i + 3) % ring) as u32));
    }
    let mut n = ring;
    if padding >= 3 {
        // Triangulation vertices ring-1 .. ring-1+padding: its vertex 0 is the ring's last vertex.
        let base = (ring - 1) as u32;
        for (a, b) in random_triangulation(padding, padding, rng) {
            edges.push((a + base, b + base));
        }
        n = ring - 1 + padding;
    }
    let p = permutation(n, rng);
    (n, relabel(&edges, &p, rng))
}

/// A random triangulation on `n` vertices with `flips` edge flips, labels and edge order
/// shuffled, from a seed.
pub fn triangulation(n: usize, flips: usize, seed: u64) -> Vec<(u32, u32)> {
    let mut rng = Rng::new(seed);
    let edges = random_triangulation(n, flips, &mut rng);
    let p = permutation(n, &mut rng);
    relabel(&edges, &p, &mut rng)
}

/// An Eulerian (all degrees even) triangulation: the octahedron after `rounds` midpoint
/// subdivisions (each face split into four; new vertices get degree 6, old degrees double),
/// with labels shuffled. Returns the vertex count and the edges.
pub fn even_triangulation(rounds: u32, seed: u64) -> (usize, Vec<(u32, u32)>) {
    // Octahedron: poles 0 and 5, equator 1-2-3-4.
    let mut faces: Vec<[u32; 3]> = vec![
        [0, 1, 2],
        [0, 2, 3],
        [0, 3, 4],
        [0, 4, 1],
        [5, 2, 1],
        [5, 3, 2],
        [5, 4, 3],
        [5, 1, 4],
    ];
    let mut n = 6u32;
    for _ in 0..rounds {
        let mut mid: HashMap<(u32, u32), u32> = HashMap::new();
        let mut next = Vec::with_capacity(faces.len() * 4);
        for f in &faces {
            let mut m = [0u32; 3];
            for j in 0..3 {
                let (a, b) = (f[j].min(f[(j + 1) % 3]), f[j].max(f[(j + 1) % 3]));
                m[j] = *mid.entry((a, b)).or_insert_with(|| {
                    n += 1;
                    n - 1
                });
            }
            next.push([f[0], m[0], m[2]]);
            next.push([f[1], m[1], m[0]]);
            next.push([f[2], m[2], m[1]]);
            next.push([m[0], m[1], m[2]]);
        }
        faces = next;
    }
    let mut rng = Rng::new(seed);
    let mut label: Vec<u32> = (0..n).collect();
    rng.shuffle(&mut label);
    let mut edges = Vec::new();
    for f in &faces {
        for j in 0..3 {
            let (x, y) = (f[j], f[(j + 1) % 3]);
            if x < y {
                edges.push((label[x as usize], label[y as usize]));
            }
        }
    }
    (n as usize, edges)
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
    let mut rng = Rng::new(seed);
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
    let edge = |a: (usize, usize), b: (usize, usize), rng: &mut Rng| {
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
                properties: tinct::geo::Properties::new(),
                position: None,
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

/// The complete graph on `n` vertices.
pub fn complete(n: u32) -> Vec<(u32, u32)> {
    (0..n)
        .flat_map(|i| ((i + 1)..n).map(move |j| (i, j)))
        .collect()
}

/// The wheel: hub 0 joined to every vertex of a cycle 1..=rim.
pub fn wheel(rim: u32) -> Vec<(u32, u32)> {
    (1..=rim)
        .flat_map(|i| [(0, i), (i, if i == rim { 1 } else { i + 1 })])
        .collect()
}

/// The Mycielskian (Mycielski 1955): vertices v_i, shadows u_i, and a root w; u_i is joined to
/// the neighbours of v_i and to w. It keeps the graph triangle-free and adds one colour.
/// The Mycielskian of a graph (Mycielski 1955): doubles the vertices and adds one.
pub fn mycielskian(n: usize, edges: &[(u32, u32)]) -> (usize, Vec<(u32, u32)>) {
    let n32 = n as u32;
    let mut out = edges.to_vec();
    for &(a, b) in edges {
        out.push((a, n32 + b));
        out.push((b, n32 + a));
    }
    for i in 0..n32 {
        out.push((n32 + i, 2 * n32));
    }
    (2 * n + 1, out)
}

/// The Mycielski graph M_order: M2 = K2, M3 = C5 (5 vertices), M4 = Grötzsch (11), M5 (23),
/// M6 (47), M7 (95); M_k is triangle-free and needs k colours (Mycielski 1955). The DIMACS
/// benchmark files number them one lower (myciel3 has 11 vertices).
pub fn mycielski(order: u32) -> (usize, Vec<(u32, u32)>) {
    // M2 = K2; M3 = C5 (5 vertices), M4 = Grötzsch (11), M5 (23), M6 (47).
    let mut g = (2usize, vec![(0u32, 1u32)]);
    for _ in 2..order {
        g = mycielskian(g.0, &g.1);
    }
    g
}

/// The queen graph of an n x n board: squares joined when a queen moves between them.
pub fn queen(n: u32) -> (usize, Vec<(u32, u32)>) {
    let mut edges = Vec::new();
    for a in 0..n * n {
        for b in (a + 1)..n * n {
            let (r1, c1, r2, c2) = (a / n, a % n, b / n, b % n);
            if r1 == r2 || c1 == c2 || r1 + c2 == r2 + c1 || r1 + c1 == r2 + c2 {
                edges.push((a, b));
            }
        }
    }
    ((n * n) as usize, edges)
}

//! Generators shared by the colouring tests and benchmark: random maximal planar graphs (random
//! face insertions followed by random edge flips, labels shuffled) and Eulerian triangulations.

use std::collections::HashMap;

/// SplitMix64 (Steele, Lea and Flood 2014): a small seeded generator, so runs repeat exactly.
pub struct Rng(pub u64);

impl Rng {
    pub fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }
    pub fn below(&mut self, n: usize) -> usize {
        (self.next_u64() % n as u64) as usize
    }
    pub fn shuffle<T>(&mut self, v: &mut [T]) {
        for i in (1..v.len()).rev() {
            let j = self.below(i + 1);
            v.swap(i, j);
        }
    }
}

fn key(u: u32, v: u32) -> u64 {
    ((u as u64) << 32) | v as u64
}

/// Edges of a random maximal planar graph on `n >= 4` vertices (3n - 6 edges): insert each
/// vertex into a random face, then make `flips` random edge flips (each keeps the graph a simple
/// triangulation), then shuffle the labels.
pub fn random_triangulation(n: usize, flips: usize, seed: u64) -> Vec<(u32, u32)> {
    assert!(n >= 4);
    let mut rng = Rng(seed);
    let mut faces: Vec<[u32; 3]> = vec![[0, 1, 2], [0, 2, 1]];
    for x in 3..n as u32 {
        let f = rng.below(faces.len());
        let [a, b, c] = faces[f];
        faces[f] = [a, b, x];
        faces.push([b, c, x]);
        faces.push([c, a, x]);
    }
    let mut degree = vec![0u32; n];
    let mut owner: HashMap<u64, u32> = HashMap::with_capacity(faces.len() * 3);
    for (i, f) in faces.iter().enumerate() {
        for j in 0..3 {
            owner.insert(key(f[j], f[(j + 1) % 3]), i as u32);
            degree[f[j] as usize] += 1; // each vertex appears once per incident face = degree
        }
    }
    for _ in 0..flips {
        let f = rng.below(faces.len());
        let j = rng.below(3);
        let (u, v, a) = (faces[f][j], faces[f][(j + 1) % 3], faces[f][(j + 2) % 3]);
        let Some(&g) = owner.get(&key(v, u)) else {
            continue;
        };
        let gf = faces[g as usize];
        let b = (0..3).map(|i| gf[i]).find(|&w| w != u && w != v).unwrap();
        if a == b
            || owner.contains_key(&key(a, b))
            || degree[u as usize] <= 3
            || degree[v as usize] <= 3
        {
            continue;
        }
        for e in [
            key(u, v),
            key(v, a),
            key(a, u),
            key(v, u),
            key(u, b),
            key(b, v),
        ] {
            owner.remove(&e);
        }
        faces[f] = [u, b, a];
        faces[g as usize] = [b, v, a];
        for (face, idx) in [([u, b, a], f as u32), ([b, v, a], g)] {
            for i in 0..3 {
                owner.insert(key(face[i], face[(i + 1) % 3]), idx);
            }
        }
        degree[u as usize] -= 1;
        degree[v as usize] -= 1;
        degree[a as usize] += 1;
        degree[b as usize] += 1;
    }
    let mut label: Vec<u32> = (0..n as u32).collect();
    rng.shuffle(&mut label);
    let mut edges: Vec<(u32, u32)> = Vec::with_capacity(3 * n);
    for f in &faces {
        for j in 0..3 {
            let (x, y) = (f[j], f[(j + 1) % 3]);
            if x < y {
                edges.push((label[x as usize], label[y as usize]));
            }
        }
    }
    rng.shuffle(&mut edges);
    edges
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
    let mut rng = Rng(seed);
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

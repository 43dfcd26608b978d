//! Connected components of a [`Graph`].

use super::graph::{Graph, Vertex};

/// The connected components of a graph.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Components {
    /// `component[v]` is the component number of vertex `v`; components are numbered `0..count`
    /// in order of their smallest vertex.
    pub component: Vec<u32>,
    /// Number of components.
    pub count: usize,
}

impl Components {
    /// The vertices of each component, each list ascending.
    pub fn members(&self) -> Vec<Vec<Vertex>> {
        let mut out = vec![Vec::new(); self.count];
        for (v, &c) in self.component.iter().enumerate() {
            out[c as usize].push(v as Vertex);
        }
        out
    }
}

/// Labels the connected components of `g` by breadth-first search.
///
/// # Complexity
/// O(n + m) time, O(n) extra space.
pub fn connected_components(g: &Graph) -> Components {
    let n = g.vertex_count();
    let mut component = vec![u32::MAX; n];
    let mut queue = Vec::new();
    let mut count = 0u32;
    for start in 0..n as u32 {
        if component[start as usize] != u32::MAX {
            continue;
        }
        component[start as usize] = count;
        queue.clear();
        queue.push(start);
        let mut head = 0;
        while head < queue.len() {
            let v = queue[head];
            head += 1;
            for &w in g.neighbours(v) {
                if component[w as usize] == u32::MAX {
                    component[w as usize] = count;
                    queue.push(w);
                }
            }
        }
        count += 1;
    }
    Components {
        component,
        count: count as usize,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn counts_components_including_isolated_vertices() {
        let (g, _) = Graph::from_edges(6, &[(0, 1), (1, 2), (4, 5)]).unwrap();
        let c = connected_components(&g);
        assert_eq!(c.count, 3);
        assert_eq!(c.members(), vec![vec![0, 1, 2], vec![3], vec![4, 5]]);
    }
}

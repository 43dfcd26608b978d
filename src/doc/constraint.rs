//! The constraint graph handed to the engines, and the way back from their answers to regions.
//!
//! Vertices are the land regions, with every same-colour group merged into one vertex; edges are the
//! active borders; pins become precoloured vertices. Contradictions in the rules themselves (two
//! members of one group that border each other, a group pinned to two colours, a pin to a slot the
//! palette lacks) cannot be expressed as a graph and are reported beside it.

use std::collections::BTreeMap;

use crate::engine::{Graph, Vertex};

use super::model::{Document, GroupId, RegionId};

/// A contradiction in the map's rules: no colouring can satisfy them.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum RuleConflict {
    /// Two regions of one same-colour group border each other, so they must both share and differ.
    GroupMembersBorder {
        group: GroupId,
        a: RegionId,
        b: RegionId,
    },
    /// Members of one group are pinned to different colours.
    GroupPinsDisagree {
        group: GroupId,
        pins: Vec<(RegionId, u32)>,
    },
    /// A region is pinned to a slot the palette does not have.
    PinOutsidePalette {
        region: RegionId,
        slot: u32,
        slots: usize,
    },
}

impl RuleConflict {
    /// A stable machine-readable kind.
    pub fn kind(&self) -> &'static str {
        match self {
            RuleConflict::GroupMembersBorder { .. } => "group_members_border",
            RuleConflict::GroupPinsDisagree { .. } => "group_pins_disagree",
            RuleConflict::PinOutsidePalette { .. } => "pin_outside_palette",
        }
    }

    /// The regions involved, ascending.
    pub fn regions(&self) -> Vec<RegionId> {
        let mut out = match self {
            RuleConflict::GroupMembersBorder { a, b, .. } => vec![*a, *b],
            RuleConflict::GroupPinsDisagree { pins, .. } => pins.iter().map(|(r, _)| *r).collect(),
            RuleConflict::PinOutsidePalette { region, .. } => vec![*region],
        };
        out.sort();
        out
    }

    /// A sentence for the user, naming regions by name.
    pub fn describe(&self, doc: &Document) -> String {
        let name = |id: &RegionId| {
            doc.regions
                .get(id)
                .map_or_else(|| format!("#{id}"), |r| r.name.clone())
        };
        let group = |g: &GroupId| {
            doc.groups
                .get(g)
                .map_or_else(|| format!("#{g}"), |g| g.name.clone())
        };
        match self {
            RuleConflict::GroupMembersBorder { group: g, a, b } => format!(
                "{} and {} border each other but are both in group \"{}\", which must share one colour",
                name(a),
                name(b),
                group(g)
            ),
            RuleConflict::GroupPinsDisagree { group: g, pins } => format!(
                "group \"{}\" must share one colour but its members are pinned to different colours ({})",
                group(g),
                pins.iter()
                    .map(|(r, s)| format!("{} to slot {}", name(r), s + 1))
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
            RuleConflict::PinOutsidePalette {
                region,
                slot,
                slots,
            } => format!(
                "{} is pinned to colour slot {} but the palette has only {} slots",
                name(region),
                slot + 1,
                slots
            ),
        }
    }
}

/// The engines' view of a document.
#[derive(Clone, Debug)]
pub struct ConstraintGraph {
    pub graph: Graph,
    /// The regions each vertex stands for, ascending; a vertex stands for several when they form a group.
    pub vertex_regions: Vec<Vec<RegionId>>,
    /// The fixed colour of each vertex, if any.
    pub pins: Vec<Option<u32>>,
    /// Which vertex each land region belongs to.
    pub region_vertex: BTreeMap<RegionId, Vertex>,
    /// Contradictions in the rules; when non-empty, no colouring satisfies every rule.
    pub conflicts: Vec<RuleConflict>,
}

impl ConstraintGraph {
    /// Builds the constraint graph of `doc`. Vertices are numbered in order of their smallest region id.
    ///
    /// # Complexity
    /// O((R + B) log R) for R regions and B borders.
    pub fn build(doc: &Document) -> ConstraintGraph {
        let mut vertex_regions: Vec<Vec<RegionId>> = Vec::new();
        let mut region_vertex = BTreeMap::new();
        let mut group_vertex: BTreeMap<GroupId, Vertex> = BTreeMap::new();
        for (id, region) in doc.land_regions() {
            let vertex = match region.group {
                Some(g) => *group_vertex.entry(g).or_insert_with(|| {
                    vertex_regions.push(Vec::new());
                    (vertex_regions.len() - 1) as Vertex
                }),
                None => {
                    vertex_regions.push(Vec::new());
                    (vertex_regions.len() - 1) as Vertex
                }
            };
            vertex_regions[vertex as usize].push(id);
            region_vertex.insert(id, vertex);
        }

        let mut conflicts = Vec::new();
        let slots = doc.palette.slots.len();
        let mut pins = vec![None; vertex_regions.len()];
        for (v, members) in vertex_regions.iter().enumerate() {
            let pinned: Vec<(RegionId, u32)> = members
                .iter()
                .filter_map(|id| doc.regions[id].pin.map(|s| (*id, s)))
                .collect();
            for &(region, slot) in &pinned {
                if slot as usize >= slots {
                    conflicts.push(RuleConflict::PinOutsidePalette {
                        region,
                        slot,
                        slots,
                    });
                }
            }
            if let Some(&(_, first)) = pinned.first() {
                if pinned.iter().any(|&(_, s)| s != first) {
                    let group = doc.regions[&members[0]].group.unwrap_or(GroupId(0));
                    conflicts.push(RuleConflict::GroupPinsDisagree {
                        group,
                        pins: pinned.clone(),
                    });
                }
                pins[v] = Some(first);
            }
        }

        let mut edges = Vec::new();
        for (pair, _) in doc.active_borders() {
            let (Some(&u), Some(&v)) = (region_vertex.get(&pair.a()), region_vertex.get(&pair.b()))
            else {
                continue;
            };
            if u == v {
                let group = doc.regions[&pair.a()].group.unwrap_or(GroupId(0));
                conflicts.push(RuleConflict::GroupMembersBorder {
                    group,
                    a: pair.a(),
                    b: pair.b(),
                });
            } else {
                edges.push((u, v));
            }
        }
        // Vertices come from our own numbering, so from_edges cannot fail; parallel edges (two
        // members of a group bordering one region) are expected and simply merged.
        let graph = match Graph::from_edges(vertex_regions.len(), &edges) {
            Ok((g, _)) => g,
            Err(_) => Graph::empty(vertex_regions.len()),
        };
        ConstraintGraph {
            graph,
            vertex_regions,
            pins,
            region_vertex,
            conflicts,
        }
    }

    /// Spreads a per-vertex colouring back onto the regions (every member of a group gets its
    /// vertex's colour). Vertices without a colour leave their regions out.
    pub fn to_region_colouring(&self, vertex_colours: &[Option<u32>]) -> BTreeMap<RegionId, u32> {
        let mut out = BTreeMap::new();
        for (members, colour) in self.vertex_regions.iter().zip(vertex_colours) {
            if let Some(c) = colour {
                for id in members {
                    out.insert(*id, *c);
                }
            }
        }
        out
    }

    /// The document's current colouring seen per vertex: the colour of the vertex's first coloured
    /// region, or `None`.
    pub fn vertex_colouring(&self, doc: &Document) -> Vec<Option<u32>> {
        self.vertex_regions
            .iter()
            .map(|members| members.iter().find_map(|id| doc.colouring.get(id).copied()))
            .collect()
    }

    /// A short label for a vertex: its region's name, or the names of the group's members.
    pub fn vertex_label(&self, doc: &Document, v: Vertex) -> String {
        let members = &self.vertex_regions[v as usize];
        let names: Vec<&str> = members
            .iter()
            .filter_map(|id| doc.regions.get(id).map(|r| r.name.as_str()))
            .collect();
        match members.first().and_then(|id| doc.regions[id].group) {
            Some(g) if members.len() > 1 => {
                format!(
                    "{} ({})",
                    doc.groups.get(&g).map_or("group", |g| g.name.as_str()),
                    names.join(" + ")
                )
            }
            _ => names.join(" + "),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::doc::edit::{Edit, RegionChange};
    use crate::doc::model::{Border, Region, RegionPair, Role};

    fn pair(a: u64, b: u64) -> RegionPair {
        RegionPair::new(RegionId(a), RegionId(b)).unwrap()
    }

    #[test]
    fn groups_merge_water_drops_and_group_border_is_a_conflict() {
        let mut doc = Document::new("t");
        for name in ["A", "B", "C", "Lake", "A2"] {
            let (_, e) = doc.add_region_edit(Region::new(name, [0.0, 0.0]));
            doc.apply(e).unwrap();
        }
        let (g, e) = doc.add_group_edit("A and its exclave");
        doc.apply(e).unwrap();
        for id in [1, 5] {
            doc.apply(Edit::UpdateRegion {
                id: RegionId(id),
                change: RegionChange::Group(Some(g)),
            })
            .unwrap();
        }
        doc.apply(Edit::UpdateRegion {
            id: RegionId(4),
            change: RegionChange::Role(Role::Water),
        })
        .unwrap();
        for (a, b) in [(1, 2), (2, 3), (3, 5), (1, 4), (4, 3)] {
            doc.apply(Edit::PutBorder {
                pair: pair(a, b),
                border: Some(Border::shared(1.0)),
            })
            .unwrap();
        }
        let cg = ConstraintGraph::build(&doc);
        assert_eq!(
            cg.vertex_regions,
            vec![
                vec![RegionId(1), RegionId(5)],
                vec![RegionId(2)],
                vec![RegionId(3)]
            ]
        );
        assert_eq!(
            cg.graph.edges().collect::<Vec<_>>(),
            vec![(0, 1), (0, 2), (1, 2)]
        );
        assert!(cg.conflicts.is_empty());

        doc.apply(Edit::PutBorder {
            pair: pair(1, 5),
            border: Some(Border::manual()),
        })
        .unwrap();
        let cg = ConstraintGraph::build(&doc);
        assert_eq!(
            cg.conflicts,
            vec![RuleConflict::GroupMembersBorder {
                group: g,
                a: RegionId(1),
                b: RegionId(5)
            }]
        );

        let colours = cg.to_region_colouring(&[Some(0), Some(1), None]);
        assert_eq!(
            colours.into_iter().collect::<Vec<_>>(),
            vec![(RegionId(1), 0), (RegionId(2), 1), (RegionId(5), 0)]
        );
    }
}

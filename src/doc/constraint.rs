//! The constraint graph handed to the engines, and the way back from their answers to regions.
//!
//! Vertices are the land regions, with every same-colour group merged into one vertex; edges are the
//! active borders; pins become precoloured vertices. Contradictions in the rules themselves (two
//! members of one group that border each other, a group pinned to two colours, a pin to a slot the
//! palette lacks) cannot be expressed as a graph and are reported beside it.

use std::collections::BTreeMap;

use crate::engine::{Graph, Vertex};

use super::model::{Document, GroupId, RegionId, Role};

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
    /// Vertex `v` stands for `members[member_start[v]..member_start[v + 1]]`, ascending; a vertex
    /// stands for several regions when they form a group.
    member_start: Vec<u32>,
    members: Vec<RegionId>,
    /// The fixed colour of each vertex, if any.
    pub pins: Vec<Option<u32>>,
    /// Every region's id (the document's, in slot order) and its vertex (`NO_VERTEX` for water).
    ids: Vec<RegionId>,
    slot_vertex: Vec<Vertex>,
    /// Contradictions in the rules; when non-empty, no colouring satisfies every rule.
    pub conflicts: Vec<RuleConflict>,
}

const NO_VERTEX: Vertex = Vertex::MAX;

impl ConstraintGraph {
    /// Builds the constraint graph of `doc`. Vertices are numbered in order of their smallest
    /// region id.
    ///
    /// # Complexity
    /// O(R + B + G log G) for R regions, B borders and G groups (plus the graph's own build).
    pub fn build(doc: &Document) -> ConstraintGraph {
        let regions = doc.regions();
        let n = regions.len();
        let mut slot_vertex = vec![NO_VERTEX; n];
        let mut group_vertex: BTreeMap<GroupId, Vertex> = BTreeMap::new();
        let mut vertices = 0u32;
        let mut size: Vec<u32> = Vec::new();
        for (slot, region) in regions.values().enumerate() {
            if region.role != Role::Land {
                continue;
            }
            let vertex = match region.group {
                Some(g) => *group_vertex.entry(g).or_insert_with(|| {
                    vertices += 1;
                    size.push(0);
                    vertices - 1
                }),
                None => {
                    vertices += 1;
                    size.push(0);
                    vertices - 1
                }
            };
            slot_vertex[slot] = vertex;
            size[vertex as usize] += 1;
        }
        let mut member_start = Vec::with_capacity(size.len() + 1);
        member_start.push(0u32);
        for &k in &size {
            member_start.push(member_start[member_start.len() - 1] + k);
        }
        let mut fill: Vec<u32> = member_start[..size.len()].to_vec();
        let mut members = vec![RegionId(0); regions.len()];
        let mut member_slots = vec![0u32; regions.len()];
        for (slot, &v) in slot_vertex.iter().enumerate() {
            if v != NO_VERTEX {
                let at = fill[v as usize] as usize;
                members[at] = regions.ids()[slot];
                member_slots[at] = slot as u32;
                fill[v as usize] += 1;
            }
        }
        let land = member_start[size.len()] as usize;
        members.truncate(land);
        member_slots.truncate(land);

        let mut conflicts = Vec::new();
        let palette_slots = doc.palette().slots.len();
        let mut pins = vec![None; size.len()];
        for v in 0..size.len() {
            let range = member_start[v] as usize..member_start[v + 1] as usize;
            let pinned: Vec<(RegionId, u32)> = range
                .filter_map(|i| {
                    let (id, region) = regions.at(member_slots[i] as usize);
                    region.pin.map(|s| (id, s))
                })
                .collect();
            for &(region, slot) in &pinned {
                if slot as usize >= palette_slots {
                    conflicts.push(RuleConflict::PinOutsidePalette {
                        region,
                        slot,
                        slots: palette_slots,
                    });
                }
            }
            if let Some(&(_, first)) = pinned.first() {
                if pinned.iter().any(|&(_, s)| s != first) {
                    let first_member = regions.at(member_slots[member_start[v] as usize] as usize);
                    conflicts.push(RuleConflict::GroupPinsDisagree {
                        group: first_member.1.group.unwrap_or(GroupId(0)),
                        pins: pinned.clone(),
                    });
                }
                pins[v] = Some(first);
            }
        }

        let index = doc.border_index();
        let mut edges = Vec::new();
        for (i, border) in doc.borders().values().enumerate() {
            let (a, b) = index.ends[i];
            if !doc.border_is_active_at(border, a, b) {
                continue;
            }
            let (u, v) = (slot_vertex[a as usize], slot_vertex[b as usize]);
            if u == v {
                let (pair, _) = doc.borders().at(i);
                conflicts.push(RuleConflict::GroupMembersBorder {
                    group: regions.at(a as usize).1.group.unwrap_or(GroupId(0)),
                    a: pair.a(),
                    b: pair.b(),
                });
            } else {
                edges.push((u, v));
            }
        }
        // Vertices come from our own numbering, so from_edges cannot fail; parallel edges (two
        // members of a group bordering one region) are expected and simply merged.
        let graph = match Graph::from_edges(size.len(), &edges) {
            Ok((g, _)) => g,
            Err(_) => Graph::empty(size.len()),
        };
        ConstraintGraph {
            graph,
            member_start,
            members,
            pins,
            ids: regions.ids().to_vec(),
            slot_vertex,
            conflicts,
        }
    }

    /// Number of vertices.
    pub fn vertex_count(&self) -> usize {
        self.pins.len()
    }

    /// The regions vertex `v` stands for, ascending.
    pub fn members(&self, v: Vertex) -> &[RegionId] {
        &self.members
            [self.member_start[v as usize] as usize..self.member_start[v as usize + 1] as usize]
    }

    /// The first (smallest) region of vertex `v`: the one that names it in certificates.
    pub fn first_member(&self, v: Vertex) -> RegionId {
        self.members[self.member_start[v as usize] as usize]
    }

    /// The vertex a land region belongs to.
    pub fn vertex_of(&self, id: RegionId) -> Option<Vertex> {
        let slot = self.ids.binary_search(&id).ok()?;
        Some(self.slot_vertex[slot]).filter(|&v| v != NO_VERTEX)
    }

    /// `(region, vertex)` for every land region, in region id order.
    pub fn region_vertices(&self) -> impl Iterator<Item = (RegionId, Vertex)> + '_ {
        self.ids
            .iter()
            .zip(&self.slot_vertex)
            .filter(|(_, v)| **v != NO_VERTEX)
            .map(|(id, v)| (*id, *v))
    }

    /// Spreads a per-vertex colouring back onto the regions (every member of a group gets its
    /// vertex's colour). Vertices without a colour leave their regions out.
    pub fn to_region_colouring(&self, vertex_colours: &[Option<u32>]) -> BTreeMap<RegionId, u32> {
        let mut out = BTreeMap::new();
        for (v, colour) in vertex_colours.iter().enumerate() {
            if let Some(c) = colour {
                for id in self.members(v as Vertex) {
                    out.insert(*id, *c);
                }
            }
        }
        out
    }

    /// The document's current colouring seen per vertex: the colour of the vertex's first coloured
    /// region, or `None`.
    pub fn vertex_colouring(&self, doc: &Document) -> Vec<Option<u32>> {
        (0..self.vertex_count() as Vertex)
            .map(|v| {
                self.members(v)
                    .iter()
                    .find_map(|id| doc.colouring().get(id).copied())
            })
            .collect()
    }

    /// A short label for a vertex: its region's name, or the names of the group's members.
    pub fn vertex_label(&self, doc: &Document, v: Vertex) -> String {
        let members = self.members(v);
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
        let members: Vec<&[RegionId]> = (0..3).map(|v| cg.members(v)).collect();
        assert_eq!(
            members,
            vec![
                &[RegionId(1), RegionId(5)][..],
                &[RegionId(2)][..],
                &[RegionId(3)][..]
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

//! What a map's rules and its current colouring say, without any engine: counts of regions and
//! borders, contradictions between rules, and the colouring's problems (clashes, uncoloured land,
//! pins not honoured, groups split). The editor shows it after every change, `tinct analyse`
//! prints it.

use std::collections::{BTreeMap, BTreeSet, HashMap};

use crate::doc::checks::{Clash, PinBroken};
use crate::doc::{
    BorderKind, ColouringCheck, ConstraintGraph, Document, GroupId, RegionId, RegionPair, Role,
    RuleConflict, Touched,
};

/// How many recorded borders there are of each kind.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub struct BorderCounts {
    pub recorded: usize,
    /// Those that constrain the colouring under the current settings.
    pub active: usize,
    pub shared: usize,
    pub corner: usize,
    pub manual: usize,
    pub suppressed: usize,
}

/// The rules and the current colouring of one revision.
#[derive(Clone, Debug, PartialEq)]
pub struct Rules {
    pub revision: u64,
    pub regions: usize,
    pub land: usize,
    pub water: usize,
    pub groups: usize,
    /// Regions with a pin.
    pub pinned: usize,
    /// Regions with a colour.
    pub coloured: usize,
    /// Distinct slots the colouring uses.
    pub colours_used: usize,
    /// Coloured regions per palette slot.
    pub slot_use: Vec<usize>,
    pub borders: BorderCounts,
    /// Size of the constraint graph (land regions, groups merged, active borders).
    pub graph_vertices: usize,
    pub graph_edges: usize,
    pub colouring: ColouringCheck,
    /// Contradictions no colouring can satisfy.
    pub conflicts: Vec<RuleConflict>,
}

impl Rules {
    /// The rules of `doc`, whose constraint graph is `cg`.
    ///
    /// # Complexity
    /// O(R + B + G log G) for R regions, B borders and G groups.
    pub fn of(doc: &Document, cg: &ConstraintGraph) -> Rules {
        let regions = doc.regions();
        let land = regions.values().filter(|r| r.role == Role::Land).count();
        let mut borders = BorderCounts {
            recorded: doc.borders().len(),
            ..BorderCounts::default()
        };
        let index = doc.border_index();
        for (border, &(a, b)) in doc.borders().values().zip(&index.ends) {
            match border.kind {
                BorderKind::Shared => borders.shared += 1,
                BorderKind::Corner => borders.corner += 1,
                BorderKind::Manual => borders.manual += 1,
            }
            borders.suppressed += usize::from(border.suppressed);
            borders.active += usize::from(doc.border_is_active_at(border, a, b));
        }
        let mut slot_use = vec![0usize; doc.palette().slots.len()];
        let mut used = BTreeSet::new();
        for &slot in doc.colouring().values() {
            used.insert(slot);
            if let Some(n) = slot_use.get_mut(slot as usize) {
                *n += 1;
            }
        }
        Rules {
            revision: doc.revision(),
            regions: regions.len(),
            land,
            water: regions.len() - land,
            groups: doc.groups().len(),
            pinned: regions.values().filter(|r| r.pin.is_some()).count(),
            coloured: doc.colouring().len(),
            colours_used: used.len(),
            slot_use,
            borders,
            graph_vertices: cg.graph.vertex_count(),
            graph_edges: cg.graph.edge_count(),
            colouring: crate::doc::check_colouring(doc),
            conflicts: {
                let mut c = cg.conflicts.clone();
                sort_conflicts(&mut c);
                c
            },
        }
    }

    /// True when the colouring is complete, breaks no rule, and the rules do not contradict.
    pub fn ok(&self) -> bool {
        self.colouring.is_clean() && self.conflicts.is_empty()
    }
}

/// A vertex of the constraint graph, named so that the name survives edits: a same-colour group
/// by its group id, any other land region by its own id.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
enum Unit {
    Region(RegionId),
    Group(GroupId),
}

/// What one region adds to the rules.
#[derive(Clone, Debug, PartialEq)]
struct RegionRecord {
    land: bool,
    pin: Option<u32>,
    colour: Option<u32>,
    group: Option<GroupId>,
}

/// What one recorded border adds to the rules.
#[derive(Clone, Copy, Debug, PartialEq)]
struct BorderRecord {
    kind: BorderKind,
    suppressed: bool,
    active: bool,
    /// Both regions have this colour and the border is active.
    clash: Option<u32>,
    /// The two units it joins, when active and different (smaller first).
    units: Option<(Unit, Unit)>,
    /// Active between two members of this group: a contradiction.
    inside_group: Option<GroupId>,
}

/// [`Rules`] kept up to date edit by edit: each edit re-examines only the regions and borders
/// it touched (and the borders and groups of those regions), instead of the whole map.
///
/// `Rules::of` stays the reference: a property test holds the two equal after every edit.
#[derive(Clone, Debug)]
pub struct LiveRules {
    rules: Rules,
    palette_slots: usize,
    regions: HashMap<RegionId, RegionRecord>,
    borders: HashMap<RegionPair, BorderRecord>,
    group_members: BTreeMap<GroupId, BTreeSet<RegionId>>,
    colour_use: BTreeMap<u32, usize>,
    unit_pairs: HashMap<(Unit, Unit), u32>,
    clashes: BTreeMap<RegionPair, u32>,
    uncoloured: BTreeSet<RegionId>,
    slots_missing: BTreeSet<RegionId>,
    pins_broken: BTreeMap<RegionId, PinBroken>,
    inside_group: BTreeMap<RegionPair, GroupId>,
    pins_outside: BTreeMap<RegionId, u32>,
    counts: Counts,
}

#[derive(Clone, Copy, Debug, Default)]
struct Counts {
    regions: usize,
    land: usize,
    pinned: usize,
    coloured: usize,
    ungrouped_land: usize,
    borders: BorderCounts,
}

impl LiveRules {
    /// Builds everything from `doc`.
    pub fn new(doc: &Document) -> LiveRules {
        let mut live = LiveRules {
            rules: Rules::of(doc, &ConstraintGraph::build(doc)),
            palette_slots: doc.palette().slots.len(),
            regions: HashMap::new(),
            borders: HashMap::new(),
            group_members: BTreeMap::new(),
            colour_use: BTreeMap::new(),
            unit_pairs: HashMap::new(),
            clashes: BTreeMap::new(),
            uncoloured: BTreeSet::new(),
            slots_missing: BTreeSet::new(),
            pins_broken: BTreeMap::new(),
            inside_group: BTreeMap::new(),
            pins_outside: BTreeMap::new(),
            counts: Counts::default(),
        };
        for (id, region) in doc.regions() {
            let record = region_record(doc, *id, region);
            live.add_region(*id, &record);
            live.regions.insert(*id, record);
        }
        let index = doc.border_index();
        for (i, (pair, border)) in doc.borders().iter().enumerate() {
            let (a, b) = index.ends[i];
            let record = border_record(doc, border, a, b);
            live.add_border(*pair, &record);
            live.borders.insert(*pair, record);
        }
        live
    }

    /// The rules of the document as of the last update.
    pub fn rules(&self) -> &Rules {
        &self.rules
    }

    /// Brings the rules up to date after an edit that touched `touched` (the document is
    /// already changed).
    ///
    /// # Complexity
    /// O((t + b) log R) for t touched regions and pairs and the b borders of those regions,
    /// plus the size of the problem lists; a change of settings or palette rebuilds.
    pub fn update(&mut self, doc: &Document, touched: &Touched) {
        if touched.everything || doc.palette().slots.len() != self.palette_slots {
            *self = LiveRules::new(doc);
            return;
        }
        let mut pairs = touched.pairs.clone();
        for id in &touched.regions {
            if let Some(old) = self.regions.remove(id) {
                self.remove_region(*id, &old);
            }
            if let Some(region) = doc.regions().get(id) {
                let record = region_record(doc, *id, region);
                self.add_region(*id, &record);
                self.regions.insert(*id, record);
            }
            pairs.extend(doc.borders_of(*id).into_iter().map(|(_, pair, _)| pair));
        }
        for pair in &pairs {
            if let Some(old) = self.borders.remove(pair) {
                self.remove_border(*pair, &old);
            }
            if let (Some(border), Some(a), Some(b)) = (
                doc.borders().get(pair),
                doc.regions().slot(&pair.a()),
                doc.regions().slot(&pair.b()),
            ) {
                let record = border_record(doc, border, a as u32, b as u32);
                self.add_border(*pair, &record);
                self.borders.insert(*pair, record);
            }
        }
        self.publish(doc);
    }

    fn add_region(&mut self, id: RegionId, r: &RegionRecord) {
        self.counts.regions += 1;
        self.counts.pinned += usize::from(r.pin.is_some());
        if let Some(c) = r.colour {
            self.counts.coloured += 1;
            *self.colour_use.entry(c).or_insert(0) += 1;
        }
        if let Some(g) = r.group {
            self.group_members.entry(g).or_default().insert(id);
        }
        if !r.land {
            return;
        }
        self.counts.land += 1;
        self.counts.ungrouped_land += usize::from(r.group.is_none());
        match r.colour {
            None => {
                self.uncoloured.insert(id);
            }
            Some(c) if c as usize >= self.palette_slots => {
                self.slots_missing.insert(id);
            }
            Some(_) => {}
        }
        if let Some(pinned) = r.pin {
            if r.colour != Some(pinned) {
                self.pins_broken.insert(
                    id,
                    PinBroken {
                        region: id,
                        pinned,
                        coloured: r.colour,
                    },
                );
            }
            if pinned as usize >= self.palette_slots {
                self.pins_outside.insert(id, pinned);
            }
        }
    }

    fn remove_region(&mut self, id: RegionId, r: &RegionRecord) {
        self.counts.regions -= 1;
        self.counts.pinned -= usize::from(r.pin.is_some());
        if let Some(c) = r.colour {
            self.counts.coloured -= 1;
            if let Some(n) = self.colour_use.get_mut(&c) {
                *n -= 1;
                if *n == 0 {
                    self.colour_use.remove(&c);
                }
            }
        }
        if let Some(g) = r.group
            && let Some(members) = self.group_members.get_mut(&g)
        {
            members.remove(&id);
            if members.is_empty() {
                self.group_members.remove(&g);
            }
        }
        if !r.land {
            return;
        }
        self.counts.land -= 1;
        self.counts.ungrouped_land -= usize::from(r.group.is_none());
        self.uncoloured.remove(&id);
        self.slots_missing.remove(&id);
        self.pins_broken.remove(&id);
        self.pins_outside.remove(&id);
    }

    fn add_border(&mut self, pair: RegionPair, b: &BorderRecord) {
        let c = &mut self.counts.borders;
        c.recorded += 1;
        match b.kind {
            BorderKind::Shared => c.shared += 1,
            BorderKind::Corner => c.corner += 1,
            BorderKind::Manual => c.manual += 1,
        }
        c.suppressed += usize::from(b.suppressed);
        c.active += usize::from(b.active);
        if let Some(slot) = b.clash {
            self.clashes.insert(pair, slot);
        }
        if let Some(units) = b.units {
            *self.unit_pairs.entry(units).or_insert(0) += 1;
        }
        if let Some(g) = b.inside_group {
            self.inside_group.insert(pair, g);
        }
    }

    fn remove_border(&mut self, pair: RegionPair, b: &BorderRecord) {
        let c = &mut self.counts.borders;
        c.recorded -= 1;
        match b.kind {
            BorderKind::Shared => c.shared -= 1,
            BorderKind::Corner => c.corner -= 1,
            BorderKind::Manual => c.manual -= 1,
        }
        c.suppressed -= usize::from(b.suppressed);
        c.active -= usize::from(b.active);
        self.clashes.remove(&pair);
        if let Some(units) = b.units
            && let Some(n) = self.unit_pairs.get_mut(&units)
        {
            *n -= 1;
            if *n == 0 {
                self.unit_pairs.remove(&units);
            }
        }
        self.inside_group.remove(&pair);
    }

    /// Writes the public [`Rules`] from the kept state.
    fn publish(&mut self, doc: &Document) {
        let mut slot_use = vec![0usize; self.palette_slots];
        for (&slot, &n) in &self.colour_use {
            if let Some(s) = slot_use.get_mut(slot as usize) {
                *s = n;
            }
        }
        // Groups: split colourings and disagreeing pins, from the members' records.
        let mut groups_split = Vec::new();
        let mut group_units = 0;
        let mut conflicts = Vec::new();
        for (&g, members) in &self.group_members {
            let land: Vec<(RegionId, &RegionRecord)> = members
                .iter()
                .filter_map(|id| self.regions.get(id).map(|r| (*id, r)))
                .filter(|(_, r)| r.land)
                .collect();
            if land.is_empty() {
                continue;
            }
            group_units += 1;
            if land.iter().any(|(_, r)| r.colour != land[0].1.colour) {
                groups_split.push((g, land.iter().map(|(id, _)| *id).collect()));
            }
            let pinned: Vec<(RegionId, u32)> = land
                .iter()
                .filter_map(|(id, r)| r.pin.map(|p| (*id, p)))
                .collect();
            if pinned.iter().any(|&(_, p)| p != pinned[0].1) {
                conflicts.push(RuleConflict::GroupPinsDisagree {
                    group: g,
                    pins: pinned,
                });
            }
        }
        for (&region, &slot) in &self.pins_outside {
            conflicts.push(RuleConflict::PinOutsidePalette {
                region,
                slot,
                slots: self.palette_slots,
            });
        }
        for (pair, &group) in &self.inside_group {
            conflicts.push(RuleConflict::GroupMembersBorder {
                group,
                a: pair.a(),
                b: pair.b(),
            });
        }
        sort_conflicts(&mut conflicts);
        let c = &self.counts;
        self.rules = Rules {
            revision: doc.revision(),
            regions: c.regions,
            land: c.land,
            water: c.regions - c.land,
            groups: doc.groups().len(),
            pinned: c.pinned,
            coloured: c.coloured,
            colours_used: self.colour_use.len(),
            slot_use,
            borders: c.borders,
            graph_vertices: c.ungrouped_land + group_units,
            graph_edges: self.unit_pairs.len(),
            colouring: ColouringCheck {
                clashes: self
                    .clashes
                    .iter()
                    .map(|(&pair, &slot)| Clash { pair, slot })
                    .collect(),
                uncoloured: self.uncoloured.iter().copied().collect(),
                pins_broken: self.pins_broken.values().copied().collect(),
                groups_split,
                slots_missing: self.slots_missing.iter().copied().collect(),
            },
            conflicts,
        };
    }
}

fn region_record(doc: &Document, id: RegionId, region: &crate::doc::Region) -> RegionRecord {
    RegionRecord {
        land: region.role == Role::Land,
        pin: region.pin,
        colour: doc.colouring().get(&id).copied(),
        group: region.group,
    }
}

fn border_record(doc: &Document, border: &crate::doc::Border, a: u32, b: u32) -> BorderRecord {
    let regions = doc.regions();
    let active = doc.border_is_active_at(border, a, b);
    let (ida, ra) = regions.at(a as usize);
    let (idb, rb) = regions.at(b as usize);
    let (ca, cb) = (regions.colour_at(a as usize), regions.colour_at(b as usize));
    let unit = |id: RegionId, r: &crate::doc::Region| match r.group {
        Some(g) => Unit::Group(g),
        None => Unit::Region(id),
    };
    let (ua, ub) = (unit(ida, ra), unit(idb, rb));
    BorderRecord {
        kind: border.kind,
        suppressed: border.suppressed,
        active,
        clash: if active && ca.is_some() && ca == cb {
            ca
        } else {
            None
        },
        units: (active && ua != ub).then(|| (ua.min(ub), ua.max(ub))),
        inside_group: if active && ua == ub { ra.group } else { None },
    }
}

/// The order conflicts are listed in: by kind, then by the regions they name.
pub(crate) fn sort_conflicts(conflicts: &mut [RuleConflict]) {
    conflicts.sort_by_key(|c| (c.kind(), c.regions()));
}

//! Helpers shared by the integration tests.

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

/// A proper colouring by a plain greedy pass in id order (written here, not taken from the
/// engine): enough colours for any test map, always valid.
pub fn greedy_colour(doc: &mut tinct::doc::Document) {
    use tinct::doc::RegionId;
    let mut colouring: std::collections::BTreeMap<RegionId, u32> = Default::default();
    let land: Vec<RegionId> = doc.land_regions().map(|(id, _)| id).collect();
    for id in land {
        let taken: Vec<u32> = doc
            .active_borders()
            .filter_map(|(p, _)| p.other(id))
            .filter_map(|n| colouring.get(&n).copied())
            .collect();
        colouring.insert(id, (0..).find(|s| !taken.contains(s)).unwrap_or(0));
    }
    doc.apply(tinct::doc::Edit::SetColouring(colouring))
        .expect("colouring applies");
}

/// The repository root.
pub fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// Runs the `tinct` binary with `args`.
pub fn tinct(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_tinct"))
        .args(args)
        .output()
        .expect("the tinct binary runs")
}

/// Runs `tinct` with one path argument among others.
pub fn tinct_path(before: &[&str], path: &Path, after: &[&str]) -> Output {
    let path = path.to_string_lossy().into_owned();
    let mut args: Vec<&str> = before.to_vec();
    args.push(&path);
    args.extend_from_slice(after);
    tinct(&args)
}

/// Standard output as text.
pub fn stdout(o: &Output) -> String {
    String::from_utf8_lossy(&o.stdout).into_owned()
}

/// Standard error as text.
pub fn stderr(o: &Output) -> String {
    String::from_utf8_lossy(&o.stderr).into_owned()
}

/// All `.rs` files below `dir`, sorted.
pub fn rust_files(dir: &Path) -> Vec<PathBuf> {
    let mut out = Vec::new();
    let mut stack = vec![dir.to_path_buf()];
    while let Some(d) = stack.pop() {
        let Ok(entries) = std::fs::read_dir(&d) else {
            continue;
        };
        for e in entries.flatten() {
            let p = e.path();
            if p.is_dir() {
                stack.push(p);
            } else if p.extension().is_some_and(|x| x == "rs") {
                out.push(p);
            }
        }
    }
    out.sort();
    out
}

/// Seeded generators (graphs, triangulations, synthetic maps), shared with the benchmarks.
pub mod generators;
#[cfg(feature = "gui")]
pub mod gui;

pub mod arb {
    //! Random documents and edits for property tests, built only through edits.

    use std::sync::Arc;

    use proptest::prelude::*;
    use tinct::doc::{
        AttrValue, Border, BorderKind, Document, Edit, Geometry, GroupId, Palette, Polygon, Region,
        RegionChange, RegionId, RegionPair, Rgb, Role, Settings, Slot, Units,
    };
    use tinct::projection::Projection;

    /// One random step, with indices that are resolved against the document when it is applied.
    #[derive(Clone, Debug)]
    pub enum Op {
        AddRegion {
            name: String,
            anchor: (f64, f64),
            rings: Option<Vec<Vec<(f64, f64)>>>,
            water: bool,
            attr: Option<f64>,
        },
        AddGroup(String),
        Border {
            i: usize,
            j: usize,
            kind: u8,
            length: f64,
            suppressed: bool,
        },
        RemoveBorder {
            i: usize,
            j: usize,
        },
        Colour {
            i: usize,
            slot: Option<u32>,
        },
        Pin {
            i: usize,
            slot: Option<u32>,
        },
        Group {
            i: usize,
            g: Option<usize>,
        },
        Rename {
            i: usize,
            name: String,
        },
        Move {
            i: usize,
            to: (f64, f64),
        },
        Role {
            i: usize,
            water: bool,
        },
        DeleteRegion(usize),
        DeleteGroup(usize),
        Settings {
            corners: bool,
            min: f64,
            tol: f64,
            metres: bool,
            /// Which projection a geographic map records (0 to 2).
            projection: u8,
            greyscale: bool,
        },
        Palette(Vec<(String, [u8; 3])>),
        Title(String),
        Recolour(Vec<(usize, u32)>),
        Batch(Vec<Op>),
    }

    fn coord() -> impl Strategy<Value = f64> {
        prop_oneof![
            -1.0e6..1.0e6f64,
            (-1000i32..1000).prop_map(|i| i as f64 / 10.0)
        ]
    }

    fn point() -> impl Strategy<Value = (f64, f64)> {
        (coord(), coord())
    }

    fn name() -> impl Strategy<Value = String> {
        prop_oneof![
            "[A-Za-z][a-z]{0,8}",
            "[^\u{0}]{0,6}",
            Just("quote\" and \\ back".to_string())
        ]
    }

    fn leaf_op() -> impl Strategy<Value = Op> {
        let idx = 0usize..12;
        prop_oneof![
            3 => (name(), point(), proptest::option::of(proptest::collection::vec(proptest::collection::vec(point(), 3..6), 1..3)), any::<bool>(), proptest::option::of(coord()))
                .prop_map(|(name, anchor, rings, water, attr)| Op::AddRegion { name, anchor, rings, water, attr }),
            1 => name().prop_map(Op::AddGroup),
            3 => (idx.clone(), idx.clone(), 0u8..3, 0.0..1000.0f64, any::<bool>())
                .prop_map(|(i, j, kind, length, suppressed)| Op::Border { i, j, kind, length, suppressed }),
            1 => (idx.clone(), idx.clone()).prop_map(|(i, j)| Op::RemoveBorder { i, j }),
            2 => (idx.clone(), proptest::option::of(0u32..8)).prop_map(|(i, slot)| Op::Colour { i, slot }),
            1 => (idx.clone(), proptest::option::of(0u32..8)).prop_map(|(i, slot)| Op::Pin { i, slot }),
            1 => (idx.clone(), proptest::option::of(0usize..3)).prop_map(|(i, g)| Op::Group { i, g }),
            1 => (idx.clone(), name()).prop_map(|(i, name)| Op::Rename { i, name }),
            1 => (idx.clone(), point()).prop_map(|(i, to)| Op::Move { i, to }),
            1 => (idx.clone(), any::<bool>()).prop_map(|(i, water)| Op::Role { i, water }),
            1 => idx.clone().prop_map(Op::DeleteRegion),
            1 => (0usize..3).prop_map(Op::DeleteGroup),
            1 => (any::<bool>(), 0.0..50.0f64, 0.0..5.0f64, any::<bool>(), 0u8..3, any::<bool>())
                .prop_map(|(corners, min, tol, metres, projection, greyscale)| Op::Settings { corners, min, tol, metres, projection, greyscale }),
            1 => proptest::collection::vec((name(), any::<[u8; 3]>()), 1..8).prop_map(Op::Palette),
            1 => name().prop_map(Op::Title),
            1 => proptest::collection::vec((idx, 0u32..6), 0..6).prop_map(Op::Recolour),
        ]
    }

    /// A random step, sometimes a batch of steps.
    pub fn op() -> impl Strategy<Value = Op> {
        prop_oneof![8 => leaf_op(), 1 => proptest::collection::vec(leaf_op(), 0..5).prop_map(Op::Batch)]
    }

    fn region_at(doc: &Document, i: usize) -> Option<RegionId> {
        let n = doc.regions().len();
        if n == 0 {
            None
        } else {
            doc.regions().keys().nth(i % n).copied()
        }
    }

    fn group_at(doc: &Document, g: usize) -> Option<GroupId> {
        let n = doc.groups().len();
        if n == 0 {
            None
        } else {
            doc.groups().keys().nth(g % n).copied()
        }
    }

    /// The edit a step stands for in `doc`, or `None` when it does not apply (say, no regions yet).
    pub fn edit_for(doc: &Document, op: &Op) -> Option<Edit> {
        Some(match op {
            Op::AddRegion {
                name,
                anchor,
                rings,
                water,
                attr,
            } => {
                let mut region = Region::new(name.clone(), [anchor.0, anchor.1]);
                region.role = if *water { Role::Water } else { Role::Land };
                region.geometry = rings.as_ref().map(|rings| {
                    let mut it = rings
                        .iter()
                        .map(|r| r.iter().map(|p| [p.0, p.1]).collect::<Vec<_>>());
                    let exterior = it.next().unwrap_or_default();
                    Arc::new(Geometry {
                        polygons: vec![Polygon {
                            exterior,
                            holes: it.collect(),
                        }],
                    })
                });
                if let Some(a) = attr {
                    region
                        .attributes
                        .insert("value".into(), AttrValue::Number(*a));
                    region
                        .attributes
                        .insert("label".into(), AttrValue::Text(name.clone()));
                    region
                        .attributes
                        .insert("flag".into(), AttrValue::Bool(*a > 0.0));
                    region.attributes.insert("nothing".into(), AttrValue::Null);
                }
                region.source_index = attr.map(|a| a.abs() as u64);
                doc.add_region_edit(region).1
            }
            Op::AddGroup(name) => doc.add_group_edit(name.clone()).1,
            Op::Border {
                i,
                j,
                kind,
                length,
                suppressed,
            } => {
                let pair = RegionPair::new(region_at(doc, *i)?, region_at(doc, *j)?)?;
                let kind = [BorderKind::Shared, BorderKind::Corner, BorderKind::Manual]
                    [*kind as usize % 3];
                Edit::PutBorder {
                    pair,
                    border: Some(Border {
                        kind,
                        length: *length,
                        suppressed: *suppressed,
                    }),
                }
            }
            Op::RemoveBorder { i, j } => {
                let pair = RegionPair::new(region_at(doc, *i)?, region_at(doc, *j)?)?;
                doc.remove_border_edit(pair)?
            }
            Op::Colour { i, slot } => Edit::PutColour {
                id: region_at(doc, *i)?,
                slot: *slot,
            },
            Op::Pin { i, slot } => Edit::UpdateRegion {
                id: region_at(doc, *i)?,
                change: RegionChange::Pin(*slot),
            },
            Op::Group { i, g } => {
                let group = match g {
                    Some(g) => Some(group_at(doc, *g)?),
                    None => None,
                };
                Edit::UpdateRegion {
                    id: region_at(doc, *i)?,
                    change: RegionChange::Group(group),
                }
            }
            Op::Rename { i, name } => Edit::UpdateRegion {
                id: region_at(doc, *i)?,
                change: RegionChange::Name(name.clone()),
            },
            Op::Move { i, to } => Edit::UpdateRegion {
                id: region_at(doc, *i)?,
                change: RegionChange::Anchor([to.0, to.1]),
            },
            Op::Role { i, water } => Edit::UpdateRegion {
                id: region_at(doc, *i)?,
                change: RegionChange::Role(if *water { Role::Water } else { Role::Land }),
            },
            Op::DeleteRegion(i) => Edit::PutRegion {
                id: region_at(doc, *i)?,
                region: None,
            },
            Op::DeleteGroup(g) => Edit::PutGroup {
                id: group_at(doc, *g)?,
                group: None,
            },
            Op::Settings {
                corners,
                min,
                tol,
                metres,
                projection,
                greyscale,
            } => Edit::SetSettings(Settings {
                corners_count: *corners,
                min_border_length: *min,
                tolerance: *tol,
                units: if *metres {
                    Units::Metres
                } else {
                    Units::Unitless
                },
                // Geographic maps record their projection (optional fields of format 1: the
                // centre of a Lambert azimuthal one, or any other).
                projection: metres.then_some(match projection {
                    0 => Projection::LambertAzimuthal {
                        lon0: 12.5,
                        lat0: -47.25,
                    },
                    1 => Projection::AlbersEqualArea {
                        lon0: -96.0,
                        lat0: 23.0,
                        lat1: 29.5,
                        lat2: 45.5,
                    },
                    _ => Projection::EqualEarth { lon0: 150.0 },
                }),
                greyscale_copies: *greyscale,
            }),
            Op::Palette(slots) => Edit::SetPalette(Palette {
                name: "random".into(),
                slots: slots
                    .iter()
                    .map(|(n, c)| Slot {
                        name: n.clone(),
                        colour: Rgb(*c),
                    })
                    .collect(),
            }),
            Op::Title(t) => Edit::SetTitle(t.clone()),
            Op::Recolour(pairs) => Edit::SetColouring(
                pairs
                    .iter()
                    .filter_map(|(i, s)| Some((region_at(doc, *i)?, *s)))
                    .collect(),
            ),
            Op::Batch(ops) => {
                // Resolve against the document as it is now; later steps may then fail, which
                // exercises the batch roll-back.
                Edit::Batch {
                    label: "random batch".into(),
                    edits: ops.iter().filter_map(|o| edit_for(doc, o)).collect(),
                }
            }
        })
    }

    /// A document built from random steps (steps that do not apply are skipped).
    pub fn document() -> impl Strategy<Value = Document> {
        proptest::collection::vec(op(), 0..40).prop_map(|ops| {
            let mut doc = Document::new("generated");
            for op in &ops {
                if let Some(edit) = edit_for(&doc, op) {
                    let _ = doc.apply(edit);
                }
            }
            doc
        })
    }
}

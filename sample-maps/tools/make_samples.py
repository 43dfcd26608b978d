#!/usr/bin/env python3
"""Generate Tinct's invented sample maps as GeoJSON, and prove what each one demonstrates.

Every place, district and body of water here is invented. Coordinates are in metres on an
invented local grid (roughly 0..60,000 m east and north), not longitude/latitude.

Each map is a true planar subdivision: a Voronoi diagram of seeded points (shapely.ops.voronoi_diagram)
whose edges are roughened by midpoint displacement, clipped to an invented coastline, noded with
snap-rounding on a 0.1 m grid (shapely.union_all with grid_size) and polygonised. Regions are unions of
the resulting faces, dissolved by cancelling shared directed edges, so two neighbouring regions always
carry exactly the same boundary vertices. The script checks that edge by edge before writing anything.

Output, one FeatureCollection per scenario:
  top level   "type", "name" (scenario title), "features",
              "tinct_borders": [{"a", "b", "kind": "shared"|"corner", "length"}] with a < b
              (a foreign member, allowed by RFC 7946 section 6.1)
  Feature     "id" (integer from 1), "properties": {"name", "role": "land"|"water",
              "group": null|string, "pin": null|int}, "geometry": Polygon|MultiPolygon
              (exterior rings counter-clockwise, holes clockwise, coordinates rounded to 0.1 m)

Run from the repository root:
  pip install shapely networkx numpy          (matplotlib too, only for --preview)
  python3 sample-maps/tools/make_samples.py [--preview /tmp]

Written and run with Python 3.11.7, shapely 2.2.0 (GEOS bundled with the wheel), networkx 3.6.1,
numpy 2.4.6 and matplotlib 3.11.2. The random generator is numpy's PCG64 with fixed seeds, so reruns
give byte-identical files with these versions.
"""

from __future__ import annotations

import argparse
import json
import math
import pathlib
from collections import Counter, defaultdict

import networkx as nx
import numpy as np
import shapely
from shapely import affinity
from shapely.geometry import LineString, MultiPoint, MultiPolygon, Point, Polygon, box
from shapely.geometry.polygon import orient
from shapely.ops import polygonize, polylabel, voronoi_diagram

OUT_DIR = pathlib.Path(__file__).resolve().parent.parent
SCALE = 10  # internal integer unit: decimetres, so the 0.1 m output grid is exact


# ---------------------------------------------------------------------------------------------
# Shapes
# ---------------------------------------------------------------------------------------------


def displace(rng, a, b, rough, min_len):
    """Midpoint displacement from a to b; returns the points from a (included) to b (excluded)."""
    (ax, ay), (bx, by) = a, b
    length = math.hypot(bx - ax, by - ay)
    if length < min_len:
        return [a]
    nx_, ny_ = -(by - ay) / length, (bx - ax) / length
    # Clip the offset so a single unlucky draw cannot fold the line back over itself.
    off = float(np.clip(rng.normal(0.0, rough * length), -2 * rough * length, 2 * rough * length))
    m = ((ax + bx) / 2 + nx_ * off, (ay + by) / 2 + ny_ * off)
    return displace(rng, a, m, rough * 0.85, min_len) + displace(rng, m, b, rough * 0.85, min_len)


def rough_polyline(rng, pts, rough, min_len):
    out = []
    for a, b in zip(pts, pts[1:]):
        out += displace(rng, a, b, rough, min_len)
    return out + [pts[-1]]


def largest(geom):
    """The largest polygon of a (multi)polygon result, dropping crumbs from boolean operations."""
    if geom.geom_type == "Polygon":
        return geom
    return max(geom.geoms, key=lambda g: g.area)


def rough_blob(rng, centre, radius, stretch=(1.0, 1.0), rough=0.22, min_len=250.0, n=9):
    cx, cy = centre
    pts = []
    for i in range(n):
        t = 2 * math.pi * i / n
        r = radius * (1 + rng.uniform(-0.2, 0.2))
        pts.append((cx + r * stretch[0] * math.cos(t), cy + r * stretch[1] * math.sin(t)))
    ring = rough_polyline(rng, pts + [pts[0]], rough, min_len)
    return largest(shapely.make_valid(Polygon(ring)))


def rough_outline(rng, pts, rough=0.22, min_len=300.0):
    ring = rough_polyline(rng, pts + [pts[0]], rough, min_len)
    return largest(shapely.make_valid(Polygon(ring)))


def best_candidate_seeds(rng, area, count, fixed=(), keep_clear=None, tries=30):
    """Mitchell's best-candidate sampling: well spread but irregular points inside `area`."""
    minx, miny, maxx, maxy = area.bounds
    seeds = list(fixed)
    while len(seeds) < count:
        best, best_d = None, -1.0
        for _ in range(tries):
            p = (rng.uniform(minx, maxx), rng.uniform(miny, maxy))
            if not area.contains(Point(p)):
                continue
            if keep_clear is not None and keep_clear.contains(Point(p)):
                continue
            d = min((math.dist(p, s) for s in seeds), default=1e18)
            d = min(d, area.exterior.distance(Point(p)) * 2.2)  # stay off the coast a little
            if d > best_d:
                best, best_d = p, d
        if best is not None:
            seeds.append(best)
    return seeds


def lloyd(seeds, area, frame, rounds, n_fixed=0, keep_clear=None):
    """Lloyd relaxation (move each seed to its cell's centroid); the first n_fixed seeds stay put."""
    for _ in range(rounds):
        cells = voronoi_cells(seeds, frame)
        new = list(seeds[:n_fixed])
        for s, cell in zip(seeds[n_fixed:], cells[n_fixed:]):
            part = cell.intersection(area)
            c = part.centroid if not part.is_empty else Point(s)
            if not area.contains(c) or (keep_clear is not None and keep_clear.contains(c)):
                c = Point(s)
            new.append((c.x, c.y))
        seeds = new
    return seeds


def voronoi_cells(seeds, frame):
    """Voronoi cells in the order of `seeds`."""
    cells = list(voronoi_diagram(MultiPoint(seeds), envelope=frame.buffer(50000)).geoms)
    ordered = []
    for s in seeds:
        p = Point(s)
        ordered.append(next(c for c in cells if c.covers(p)))
    return ordered


# ---------------------------------------------------------------------------------------------
# Planar subdivision
# ---------------------------------------------------------------------------------------------


def ring_ints(coords):
    return [(int(round(x)), int(round(y))) for x, y in coords]


def signed_area(ring):
    return 0.5 * sum(x0 * y1 - x1 * y0 for (x0, y0), (x1, y1) in zip(ring, ring[1:]))


def build_subdivision(rng, mainland, seeds, fixed, frame, rough=0.16, min_len=700.0):
    """Regions from roughened Voronoi edges inside `mainland` plus fixed polygons (water, islands).

    mainland: Polygon (lakes already removed) split among `seeds`.
    fixed: list of (key, Polygon) that become regions as they are (must not overlap mainland).
    Returns {key: Polygon|MultiPolygon in metres}; seed regions are keyed by seed index.
    """
    edges = voronoi_diagram(MultiPoint(seeds), envelope=frame.buffer(50000), edges=True)
    segs = []
    for g in getattr(edges, "geoms", [edges]):
        for line in getattr(g, "geoms", [g]):
            cs = list(line.coords)
            segs += list(zip(cs, cs[1:]))
    segs = sorted({tuple(sorted(s)) for s in segs})  # deterministic order, each edge once
    lines = []
    for a, b in segs:
        if not LineString([a, b]).intersects(mainland):
            continue
        wiggly = LineString(rough_polyline(rng, [a, b], rough, min_len))
        clipped = wiggly.intersection(mainland)
        if not clipped.is_empty:
            lines.append(clipped)
    lines.append(mainland.boundary)
    lines += [poly.boundary for _, poly in fixed]

    def up(g):
        return affinity.scale(g, SCALE, SCALE, origin=(0, 0))

    noded = shapely.union_all([up(g) for g in lines], grid_size=1.0)
    faces = []
    for poly in polygonize(list(noded.geoms)):
        poly = orient(poly, 1.0)
        rings = [ring_ints(poly.exterior.coords)] + [ring_ints(r.coords) for r in poly.interiors]
        faces.append({"rings": rings, "poly": Polygon(rings[0], rings[1:])})

    up_main = up(mainland)
    up_fixed = [(k, up(p)) for k, p in fixed]
    up_cells = [up(c) for c in voronoi_cells(seeds, frame)]
    assign = [None] * len(faces)
    for i, f in enumerate(faces):
        rp = f["poly"].representative_point()
        f["land"] = up_main.contains(rp)
        fixed_hit = [k for k, p in up_fixed if p.contains(rp)]
        if fixed_hit:
            assign[i] = fixed_hit[0]
        elif f["land"]:
            # Roughening may push a border past a seed, so go by the larger overlap with the straight cells.
            overlap = [(f["poly"].intersection(c).area, k) for k, c in enumerate(up_cells)]
            area, k = max(overlap)
            if area > 0:
                assign[i] = k

    # Face adjacency from the shared integer edges (exact, no floating-point overlay).
    edge_faces = defaultdict(list)
    for i, f in enumerate(faces):
        for ring in f["rings"]:
            for a, b in zip(ring, ring[1:]):
                edge_faces[(min(a, b), max(a, b))].append(i)
    nbrs = defaultdict(Counter)
    for (a, b), fs in edge_faces.items():
        assert len(fs) <= 2, "an edge bounds more than two faces"
        if len(fs) == 2:
            i, j = fs
            nbrs[i][j] += math.dist(a, b)
            nbrs[j][i] += math.dist(a, b)

    def settle_orphans():
        # Crumbs left where roughened edges crossed each other go to the neighbour sharing most border.
        while any(a is None for a in assign):
            progress = False
            for i, f in enumerate(faces):
                if assign[i] is not None:
                    continue
                votes = Counter()
                for j, w in nbrs[i].items():
                    if assign[j] is not None and (not f["land"] or isinstance(assign[j], int)):
                        votes[assign[j]] += w
                if votes:
                    assign[i] = max(sorted(votes.items(), key=str), key=lambda kv: kv[1])[0]
                    progress = True
            assert progress, "orphan faces with no neighbour"

    for _ in range(10):
        settle_orphans()
        changed = False
        for k in range(len(seeds)):  # every seed region must be one connected piece: keep the largest
            mine = {i for i, a in enumerate(assign) if a == k}
            assert mine, f"seed {k} lost its region"
            start = max(mine, key=lambda i: (faces[i]["poly"].area, -i))
            seen, todo = {start}, [start]
            while todo:
                i = todo.pop()
                for j in nbrs[i]:
                    if j in mine and j not in seen:
                        seen.add(j)
                        todo.append(j)
            for i in mine - seen:
                assign[i] = None
                changed = True
        if not changed:
            break

    regions = {}
    for key in sorted(set(assign), key=str):
        regions[key] = dissolve([faces[i] for i, a in enumerate(assign) if a == key])
    return regions


def place_tarn(rng, regions, radius):
    """A small lake at the pole of inaccessibility of the largest district, so it becomes a hole."""
    host = max((k for k in regions if isinstance(k, int)), key=lambda k: regions[k].area)
    centre = polylabel(regions[host], tolerance=10)
    room = regions[host].exterior.distance(centre)
    tarn = rough_blob(rng, (centre.x, centre.y), min(radius, room * 0.35), rough=0.15, min_len=150)
    return host, tarn


def dissolve(faces):
    """Union of faces by cancelling directed edges that occur in both directions; keeps every vertex."""
    directed = Counter()
    for f in faces:
        for ring in f["rings"]:
            for a, b in zip(ring, ring[1:]):
                directed[(a, b)] += 1
    outline = [LineString([a, b]) for (a, b) in directed if (b, a) not in directed]
    parts = []
    for poly in polygonize(outline):
        rp = poly.representative_point()
        if any(f["poly"].contains(rp) for f in faces):
            parts.append(orient(poly, 1.0))
    parts.sort(key=lambda p: -p.area)
    geom = parts[0] if len(parts) == 1 else MultiPolygon(parts)
    return affinity.scale(geom, 1 / SCALE, 1 / SCALE, origin=(0, 0))


# ---------------------------------------------------------------------------------------------
# Checks on the finished map
# ---------------------------------------------------------------------------------------------


def polys_of(geom):
    return [geom] if geom.geom_type == "Polygon" else list(geom.geoms)


def rings_of(geom):
    for p in polys_of(geom):
        yield "exterior", list(p.exterior.coords)
        for r in p.interiors:
            yield "hole", list(r.coords)


def check_subdivision(regions):
    """Edge-by-edge proof that the regions form a planar subdivision with identical shared vertices.

    Every directed edge (on the 0.1 m grid) must occur once; its reverse occurs in exactly one other
    region (a shared border) or nowhere (the map's outer edge). Returns the shared length per pair,
    measured from those matched edges, to cross-check the shapely border computation.
    """
    owner = {}
    for rid, geom in regions.items():
        assert geom.is_valid, f"region {rid} is not a valid polygon: {shapely.is_valid_reason(geom)}"
        for kind, ring in rings_of(geom):
            assert ring[0] == ring[-1], "ring not closed"
            ring = ring_ints([(x * SCALE, y * SCALE) for x, y in ring])
            area = signed_area(ring)
            assert (area > 0) == (kind == "exterior"), f"region {rid}: {kind} ring wrongly oriented"
            for a, b in zip(ring, ring[1:]):
                assert a != b, "repeated vertex"
                assert (a, b) not in owner, f"directed edge {a}->{b} used twice"
                owner[(a, b)] = rid
    shared = Counter()
    for (a, b), rid in owner.items():
        other = owner.get((b, a))
        assert other != rid, f"region {rid} borders itself"
        if other is not None and rid < other:
            shared[(rid, other)] += math.dist(a, b) / SCALE
    # No overlaps: the parts add up to the union.
    total = sum(g.area for g in regions.values())
    union = shapely.union_all(list(regions.values())).area
    assert abs(total - union) < 1.0, f"regions overlap: {total} vs {union}"
    return shared


def borders_from_shapely(regions):
    """Shared borders (boundary intersection has positive length) and corners (touch in points only)."""
    ids = sorted(regions)
    out = []
    for i, a in enumerate(ids):
        for b in ids[i + 1 :]:
            ga, gb = regions[a], regions[b]
            if not ga.intersects(gb):
                continue
            assert ga.intersection(gb).area < 1e-6, f"regions {a} and {b} overlap"
            inter = ga.boundary.intersection(gb.boundary)
            length = inter.length
            kind = "shared" if length > 0 else "corner"
            out.append({"a": a, "b": b, "kind": kind, "length": round(length, 1) if length > 0 else 0})
    return out


def colour_search(adj, k, pins):
    """Exact backtracking k-colouring, DSATUR vertex order; returns {v: colour} or None.

    Colour classes are interchangeable when nothing is pinned, so a vertex may only open the next
    unused colour; this prunes symmetric branches without losing solutions.
    """
    colours = {}
    for v, p in pins.items():
        if p >= k or any(colours.get(u) == p for u in adj[v]):
            return None
        colours[v] = p
    verts = sorted(adj)

    def step():
        free = [v for v in verts if v not in colours]
        if not free:
            return True
        v = max(free, key=lambda v: (len({colours[u] for u in adj[v] if u in colours}), len(adj[v]), -v))
        used = {colours[u] for u in adj[v] if u in colours}
        top = max(colours.values(), default=-1)
        for c in range(k):
            if c in used:
                continue
            if not pins and c > top + 1:
                break
            colours[v] = c
            if step():
                return True
            del colours[v]
        return False

    return dict(colours) if step() else None


def chromatic_number(graph, pins=None):
    """Smallest k with a proper colouring (exhaustive search proves k-1 impossible), plus the colouring."""
    pins = pins or {}
    adj = {v: set(graph[v]) for v in graph}
    for k in range(1, len(adj) + 1):
        col = colour_search(adj, k, pins)
        if col is not None:
            # Independent check of the colouring the search returned.
            assert all(col[u] != col[v] for u, v in graph.edges), "improper colouring"
            assert all(col[v] == p for v, p in pins.items()), "pin ignored"
            assert len(set(col.values())) <= k
            return k, col
    return 0, {}


def odd_cycle(graph):
    """An odd cycle (list of vertices) if the graph is not bipartite, found by BFS layering."""
    for root in sorted(graph):
        depth, parent = {root: 0}, {root: None}
        order = [root]
        for v in order:
            for u in sorted(graph[v]):
                if u not in depth:
                    depth[u], parent[u] = depth[v] + 1, v
                    order.append(u)
        for v in order:
            for u in sorted(graph[v]):
                if depth[u] == depth[v]:  # same layer: closing the tree paths gives an odd cycle
                    pu, pv = [u], [v]
                    while pu[-1] != pv[-1]:
                        pu.append(parent[pu[-1]])
                        pv.append(parent[pv[-1]])
                    return pv + pu[-2::-1]
    return None


def odd_wheel(graph):
    """A hub whose neighbours contain an odd cycle: hub + rim needs 4 colours (rim 3, hub a 4th)."""
    for hub in sorted(graph):
        rim = odd_cycle(graph.subgraph(graph[hub]))
        if rim:
            return hub, rim
    return None


def kuratowski_summary(graph, names):
    planar, cert = nx.check_planarity(graph, counterexample=True)
    assert not planar
    branch = sorted(v for v in cert if cert.degree(v) >= 3)
    degs = sorted(cert.degree(v) for v in branch)
    if len(branch) == 5 and degs == [4] * 5:
        kind, detail = "K5", "branch vertices " + ", ".join(names[v] for v in branch)
    else:
        assert len(branch) == 6 and degs == [3] * 6, f"unexpected certificate degrees {degs}"
        # Suppress degree-2 vertices to recover the K3,3 and its two sides.
        core = nx.Graph()
        for b in branch:
            for nxt in cert[b]:
                prev, cur = b, nxt
                while cur not in branch:
                    prev, cur = cur, next(w for w in cert[cur] if w != prev)
                core.add_edge(b, cur)
        left, right = nx.bipartite.sets(core)
        kind = "K3,3"
        detail = "sides {" + ", ".join(names[v] for v in sorted(left)) + "} and {"
        detail += ", ".join(names[v] for v in sorted(right)) + "}"
    return kind, detail, cert


# ---------------------------------------------------------------------------------------------
# Writing
# ---------------------------------------------------------------------------------------------


def coords_out(ring):
    return [[round(x, 1), round(y, 1)] for x, y in ring]


def geometry_out(geom):
    def poly(p):
        return [coords_out(p.exterior.coords)] + [coords_out(r.coords) for r in p.interiors]

    if geom.geom_type == "Polygon":
        return {"type": "Polygon", "coordinates": poly(geom)}
    return {"type": "MultiPolygon", "coordinates": [poly(p) for p in geom.geoms]}


def write_geojson(path, title, features, borders):
    dump = lambda x: json.dumps(x, separators=(",", ":"), ensure_ascii=False)
    lines = ['{"type":"FeatureCollection",', '"name":' + dump(title) + ",", '"features":[']
    lines.append(",\n".join(dump(f) for f in features))
    lines.append("],")
    lines.append('"tinct_borders":[')
    lines.append(",\n".join(dump(b) for b in borders))
    lines.append("]}")
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    size = path.stat().st_size
    assert size < 200_000, f"{path.name} is {size} bytes"
    return size


def finish(slug, title, regions, meta, preview_dir, expect_corner=False):
    """Number the regions, check the subdivision, compute borders, write the file.

    regions: {key: geometry}; meta: {key: (name, role, group, pin)}.
    Land regions are numbered north to south in 8 km bands, west to east; water comes last.
    """

    def order(key):
        g = regions[key]
        c = g.representative_point()
        return (meta[key][1] == "water", -int(c.y // 8000), c.x)

    keys = sorted(regions, key=order)
    ids = {k: i + 1 for i, k in enumerate(keys)}
    by_id = {ids[k]: regions[k] for k in keys}
    props = {
        ids[k]: {"name": meta[k][0], "role": meta[k][1], "group": meta[k][2], "pin": meta[k][3]}
        for k in keys
    }
    matched = check_subdivision(by_id)
    borders = borders_from_shapely(by_id)
    for b in borders:  # shapely's answer must agree with the edge matching
        want = matched.get((b["a"], b["b"]), 0.0)
        assert abs(b["length"] - want) < 0.5, f"border {b} vs matched length {want}"
    assert {(b["a"], b["b"]) for b in borders if b["kind"] == "shared"} == set(matched)
    corners = [b for b in borders if b["kind"] == "corner"]
    if expect_corner:
        assert corners, "expected at least one corner-only contact"
    names = {i: p["name"] for i, p in props.items()}
    assert len(set(names.values())) == len(names), "duplicate names"

    features = [
        {"type": "Feature", "id": i, "properties": props[i], "geometry": geometry_out(by_id[i])}
        for i in sorted(by_id)
    ]
    path = OUT_DIR / f"{slug}.geojson"
    size = write_geojson(path, title, features, borders)
    by_id, props, borders = reload_and_check(path, title, features, borders)

    land = [i for i in by_id if props[i]["role"] == "land"]
    graph = nx.Graph()
    graph.add_nodes_from(land)
    graph.add_edges_from(
        (b["a"], b["b"]) for b in borders if b["kind"] == "shared" and b["a"] in land and b["b"] in land
    )
    holes = sum(len(p.interiors) for g in by_id.values() for p in polys_of(g))
    print(f"\n== {slug}.geojson: {title} ({size} bytes)")
    print(
        f"   {len(land)} land + {len(by_id) - len(land)} water regions; "
        f"{sum(b['kind'] == 'shared' for b in borders)} shared borders, {len(corners)} corner contacts, "
        f"{holes} holes; land adjacency: {graph.number_of_edges()} edges"
    )
    for b in corners:
        print(f"   corner only: {names[b['a']]} / {names[b['b']]}")
    for i, p in props.items():
        if p["pin"] is not None:
            print(f"   pinned: {p['name']} to colour slot {p['pin']}")
        if p["group"] is not None:
            print(f"   group {p['group']!r}: {p['name']} (id {i})")
    if preview_dir:
        render(preview_dir / f"{slug}.png", title, by_id, props, graph, borders)
    return by_id, props, graph, names


def reload_and_check(path, title, features, borders):
    """Read the written file back and prove the claims again from its text alone."""
    doc = json.loads(path.read_text(encoding="utf-8"))
    assert list(doc) == ["type", "name", "features", "tinct_borders"] and doc["name"] == title
    assert doc["features"] == features and doc["tinct_borders"] == borders
    by_id, props = {}, {}
    for i, f in enumerate(doc["features"]):
        assert f["id"] == i + 1 and list(f["properties"]) == ["name", "role", "group", "pin"]
        assert f["properties"]["role"] in ("land", "water")
        by_id[f["id"]] = shapely.geometry.shape(f["geometry"])
        props[f["id"]] = f["properties"]
    check_subdivision(by_id)
    assert borders_from_shapely(by_id) == doc["tinct_borders"], "borders differ when recomputed from the file"
    for b in doc["tinct_borders"]:
        assert b["a"] < b["b"] and (b["kind"] == "shared") == (b["length"] > 0)
    return by_id, props, doc["tinct_borders"]


def render(path, title, by_id, props, graph, borders):
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt
    from matplotlib.patches import PathPatch
    from matplotlib.path import Path as MPath

    _, col = chromatic_number(graph)
    palette = ["#e8c170", "#a8c686", "#d98c7a", "#b9a3cf", "#8fb8c9", "#e0a0c0"]
    fig, ax = plt.subplots(figsize=(11, 9))
    for i, g in by_id.items():
        colour = "#9cc3e6" if props[i]["role"] == "water" else palette[col[i] % len(palette)]
        for p in polys_of(g):
            verts, codes = [], []
            for ring in [p.exterior, *p.interiors]:
                cs = list(ring.coords)
                verts += cs
                codes += [MPath.MOVETO] + [MPath.LINETO] * (len(cs) - 2) + [MPath.CLOSEPOLY]
            ax.add_patch(PathPatch(MPath(verts, codes), facecolor=colour, edgecolor="#333", lw=0.6))
        rp = polylabel(largest(g), tolerance=50)
        ax.text(rp.x, rp.y, f"{i}\n{props[i]['name']}", ha="center", va="center", fontsize=6)
    for b in borders:
        if b["kind"] == "corner":
            pt = by_id[b["a"]].boundary.intersection(by_id[b["b"]].boundary)
            ax.plot(*pt.centroid.xy, "r*", ms=10)
    ax.autoscale()
    ax.set_aspect("equal")
    ax.set_title(title)
    fig.savefig(path, dpi=110, bbox_inches="tight")
    plt.close(fig)


# ---------------------------------------------------------------------------------------------
# Scenario 1: Vessland Province (needs four colours)
# ---------------------------------------------------------------------------------------------

VESSLAND_NAMES = [
    "Quillhaven", "Brannoch", "Estermoor", "Cailvenn", "Droskeld", "Fennimark", "Gorrowby",
    "Halvercombe", "Iskerdale", "Jessomire", "Keldrath", "Lowmarrin", "Morvaine", "Nethercaul",
    "Orrisholm", "Pellandry", "Ravensoke", "Saltreve", "Tamberlow", "Ulverrin", "Varrowgate",
    "Wyndelholt", "Yarrowmead", "Zennick", "Ambrelay", "Birchallow", "Corrowen", "Dunmarrick",
    "Eskelvane", "Farrowdene", "Glimmerstead", "Hollinsway",
]


def vessland(preview_dir):
    rng = np.random.default_rng(20260101)
    frame = box(0, 0, 60000, 50000)
    province = rough_outline(
        rng,
        [(6000, 9000), (15000, 4000), (27000, 6500), (36000, 3500), (44000, 7000), (47500, 15000),
         (45000, 24000), (49000, 33000), (44000, 42000), (34000, 46500), (22000, 45000),
         (12000, 41500), (5000, 33000), (7500, 22000), (3500, 15000)],
    )
    sea = largest(Polygon([(42500, 0), (60000, 0), (60000, 50000), (39000, 50000)]).difference(province))
    isle = rough_blob(rng, (54500, 29000), 2200, stretch=(0.8, 1.3))
    sea = sea.difference(isle)
    lake = rough_blob(rng, (22000, 23000), 3300, stretch=(1.35, 0.8))
    mainland = province.difference(lake)

    # Four seeds on a square around `quad` make a quadripoint: diagonal districts touch in a point only.
    quad, d = (31000, 34000), 3000
    four = [(quad[0] - d, quad[1] - d), (quad[0] + d, quad[1] - d), (quad[0] + d, quad[1] + d),
            (quad[0] - d, quad[1] + d)]
    clear = Point(quad).buffer(d * math.sqrt(2) * 1.35)
    seeds = best_candidate_seeds(rng, mainland, 30, fixed=four, keep_clear=clear)
    seeds = lloyd(seeds, mainland, frame, 2, n_fixed=4, keep_clear=clear)
    fixed = [("sea", sea), ("lake", lake), ("isle", isle)]
    regions = build_subdivision(np.random.default_rng(7), mainland, seeds, fixed, frame)

    # A tarn set well inside one district shows a hole: the district's polygon has an interior ring.
    host, tarn = place_tarn(rng, regions, 1100.0)
    fixed.append(("tarn", tarn))
    # Same generator seed, so the district borders are roughened exactly as in the first pass.
    regions = build_subdivision(np.random.default_rng(7), mainland, seeds, fixed, frame)

    names = iter(VESSLAND_NAMES)
    meta = {k: (next(names), "land", None, None) for k in sorted(k for k in regions if isinstance(k, int))}
    meta["isle"] = ("Skarra Isle", "land", None, None)
    meta["sea"] = ("Vess Sound", "water", None, None)
    meta["lake"] = ("Lake Merrowin", "water", None, None)
    meta["tarn"] = ("Ossel Tarn", "water", None, None)
    # The provincial seat is pinned to colour slot 0 (a single pin cannot change the colour count).
    seat = min((k for k in regions if isinstance(k, int)), key=lambda k: Point(seeds[k]).distance(Point(27000, 12000)))
    meta[seat] = (meta[seat][0], "land", None, 0)
    title = "Vessland Province, Kingdom of Estmarrow"
    by_id, props, graph, names = finish("vessland-province", title, regions, meta, preview_dir, expect_corner=True)

    assert any(len(p.interiors) for p in polys_of(by_id[next(i for i in by_id if props[i]["name"] == meta[host][0])]))
    planar, _ = nx.check_planarity(graph)
    assert planar, "land adjacency of a map with connected districts must be planar"
    k, col = chromatic_number(graph)
    pins = {i: p["pin"] for i, p in props.items() if p["pin"] is not None}
    k_pinned, _ = chromatic_number(graph, pins)
    hub, rim = odd_wheel(graph)
    print(f"   planar: yes; chromatic number {k} ({k - 1} colours refuted by exhaustive search); with pins {k_pinned}")
    print(f"   4-colour witness (odd wheel): hub {names[hub]}, rim " + " - ".join(names[v] for v in rim))
    assert k == 4 and k_pinned == 4 and len(rim) % 2 == 1


# ---------------------------------------------------------------------------------------------
# Scenario 2: The Three Valleys (three colours, not two)
# ---------------------------------------------------------------------------------------------

VALLEY_NAMES = [
    "Skarrowdel", "Tumbrelmoor", "Venhallow", "Orlenmouth", "Cragmorrow", "Dunnelsby", "Eddervane",
    "Fallowick", "Gristhorne", "Harlequay", "Innisvar", "Jendrell", "Kirrowmere", "Marrowdown",
    "Ombervale", "Pollenstead", "Rillwater", "Thistlecombe", "Umberlin", "Vantrell", "Yelverin",
    "Brackenhold", "Corriebray", "Lathermoss", "Wendlecote", "Ashgrimmel",
]


def three_valleys(preview_dir, seed=36):
    rng = np.random.default_rng(seed)
    frame = box(0, 0, 52000, 44000)
    outline = rough_outline(
        rng,
        [(4000, 6000), (18000, 2500), (34000, 4500), (48000, 3000), (50000, 16000), (47000, 30000),
         (49500, 41000), (33000, 42500), (20000, 40000), (5000, 41500), (2500, 25000)],
    )
    lake = rough_blob(rng, (24500, 21500), 2300, stretch=(1.9, 0.55))
    mainland = outline.difference(lake)
    s = 8600.0
    seeds = []
    for row in range(8):
        for col in range(8):
            x = 1500 + col * s + (s / 2 if row % 2 else 0) + rng.normal(0, 0.05 * s)
            y = 2500 + row * s * math.sqrt(3) / 2 + rng.normal(0, 0.05 * s)
            if mainland.buffer(-1500).contains(Point(x, y)):
                seeds.append((x, y))
    fixed = [("lake", lake)]
    regions = build_subdivision(np.random.default_rng(34), mainland, seeds, fixed, frame, rough=0.14)
    host, tarn = place_tarn(rng, regions, 900.0)
    fixed.append(("tarn", tarn))
    regions = build_subdivision(np.random.default_rng(34), mainland, seeds, fixed, frame, rough=0.14)

    names = iter(VALLEY_NAMES)
    meta = {k: (next(names), "land", None, None) for k in sorted(k for k in regions if isinstance(k, int))}
    meta["lake"] = ("The Longwater", "water", None, None)
    meta["tarn"] = ("Hob Tarn", "water", None, None)
    title = "The Three Valleys of Orlen"
    by_id, props, graph, names = finish("three-valleys", title, regions, meta, preview_dir)

    planar, _ = nx.check_planarity(graph)
    k, col = chromatic_number(graph)
    cycle = odd_cycle(graph)
    print(f"   planar: {planar}; chromatic number {k} ({k - 1} colours refuted by exhaustive search); bipartite (networkx): {nx.is_bipartite(graph)}")
    print("   odd cycle (so 2 colours are impossible): " + " - ".join(names[v] for v in cycle))
    assert planar and k == 3 and not nx.is_bipartite(graph) and len(cycle) % 2 == 1


# ---------------------------------------------------------------------------------------------
# Scenario 3: The Exclave Coast (a group that breaks planarity)
# ---------------------------------------------------------------------------------------------

COAST_NAMES = [
    "Aldwyn", "Brisketh", "Calloway Reach", "Dellamore", "Embervale", "Fenwarrow", "Garnoch",
    "Heskith", "Ivorsend", "Jarrowcliff", "Kestwold", "Lanternby", "Meddrow", "Norrowind",
    "Oskerbay", "Pennacombe", "Rudderhale", "Sallowmere", "Tresskin", "Wimberholt", "Selkirrow",
    "Hobbenthwaite", "Cresswinder", "Quennock",
]


def exclave_coast(preview_dir):
    rng = np.random.default_rng(4411)
    frame = box(0, 0, 60000, 36000)
    coast = rough_polyline(
        rng, [(60000, 9000), (46000, 12500), (33000, 8500), (20000, 13000), (9000, 9500), (0, 12000)],
        0.2, 300.0,
    )
    land = largest(shapely.make_valid(Polygon(coast + [(0, 36000), (60000, 36000), coast[0]])))
    sea = largest(frame.difference(land))
    lake = rough_blob(rng, (41000, 25000), 1800, stretch=(1.3, 0.9))
    mainland = land.difference(lake)
    seeds = best_candidate_seeds(rng, mainland, 22)
    seeds = lloyd(seeds, mainland, frame, 2)
    fixed = [("sea", sea), ("lake", lake)]
    regions = build_subdivision(rng, mainland, seeds, fixed, frame)

    # Unmerged adjacency (by region key) to choose the exclave pair.
    keys = sorted(k for k in regions if isinstance(k, int))
    g = nx.Graph()
    g.add_nodes_from(keys)
    for i, a in enumerate(keys):
        for b in keys[i + 1 :]:
            if regions[a].boundary.intersection(regions[b].boundary).length > 0:
                g.add_edge(a, b)
    coastal = [k for k in keys if regions[k].boundary.intersection(regions["sea"].boundary).length > 0]
    # Two parts that both lie on the coast share the sea-side outer face, so merging them keeps the
    # graph planar; the main part must therefore sit inland, enclosed by other districts.
    pairs = []
    for u in keys:
        for v in coastal:
            if u == v or g.has_edge(u, v):
                continue
            merged = nx.contracted_nodes(g, u, v, self_loops=False)
            if not nx.check_planarity(merged)[0]:
                # Prefer the smallest exclave (in whole km²), then the one farthest from its main part.
                far = Point(seeds[u]).distance(Point(seeds[v]))
                pairs.append((round(regions[v].area / 1e6), -far, u, v))
    assert pairs, "no exclave placement breaks planarity"
    _, _, main, excl = min(pairs)

    names = iter(n for n in COAST_NAMES if n != "Aldwyn")
    meta = {}
    for k in keys:
        if k == main:
            meta[k] = ("Aldwyn", "land", "Aldwyn", None)
        elif k == excl:
            meta[k] = ("Port Tessary (Aldwyn exclave)", "land", "Aldwyn", None)
        else:
            meta[k] = (next(names), "land", None, None)
    meta["sea"] = ("Gullet Sea", "water", None, None)
    meta["lake"] = ("Tallow Mere", "water", None, None)
    title = "The Exclave Coast of Pellory"
    by_id, props, graph, names = finish("exclave-coast", title, regions, meta, preview_dir)

    planar, _ = nx.check_planarity(graph)
    assert planar, "without merging, the land adjacency must be planar"
    k_split, _ = chromatic_number(graph)
    group = sorted(i for i, p in props.items() if p["group"] == "Aldwyn")
    assert len(group) == 2
    merged = nx.contracted_nodes(graph, group[0], group[1], self_loops=False)
    mnames = dict(names)
    mnames[group[0]] = "Aldwyn+Port Tessary"
    kind, detail, cert = kuratowski_summary(merged, mnames)
    k_merged, col = chromatic_number(merged)
    wheel = odd_wheel(merged)
    if wheel:
        print(f"   odd wheel in the merged graph: hub {mnames[wheel[0]]}, rim " + " - ".join(mnames[v] for v in wheel[1]))
    print(f"   without merging: planar, chromatic number {k_split}")
    print(f"   group 'Aldwyn' merged into one vertex: NOT planar; Kuratowski subgraph is a {kind} subdivision, {detail}")
    print("   certificate edges: " + "; ".join(f"{mnames[a]}-{mnames[b]}" for a, b in sorted(cert.edges)))
    print(f"   chromatic number with the group merged: {k_merged}")
    assert k_merged >= k_split


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--preview", type=pathlib.Path, help="also write PNG previews into this folder")
    args = ap.parse_args()
    vessland(args.preview)
    three_valleys(args.preview)
    exclave_coast(args.preview)


if __name__ == "__main__":
    main()

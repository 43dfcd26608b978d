"""Derives the small geo test fixtures and their reference adjacency.

Run from the repository root with the packages installed:
    npm pack us-atlas@3.0.1 world-atlas@2.0.2   (unpack to $US_ATLAS and $WORLD_ATLAS)
    pip install libpysal==4.14.1 shapely==2.2.0 geopandas==1.2.0
    US_ATLAS=... WORLD_ATLAS=... python3 tests/data/geo/make_fixtures.py

Outputs (all in tests/data/geo/):
  us_states_subset.topojson  14 states of us-atlas states-10m.json, arcs renumbered, same
                             quantisation transform and delta encoding as the source.
  us_states_subset.geojson   the same 14 states decoded to longitude/latitude GeoJSON.
  world_subset.topojson      Russia, its land neighbours, and Fiji from world-atlas
                             countries-110m.json.
  world50m_caucasus.topojson Azerbaijan, Armenia, Georgia, Turkey and Iran from world-atlas
                             countries-50m.json (each of the first two holds enclaves of the
                             other). `python3 make_fixtures.py caucasus` writes only this file and
                             needs nothing but the unpacked world-atlas package.
  world110m.topojson         world-atlas countries-110m.json, unchanged (the whole world, for
                             the choice of a world projection).
  world50m_fiji.topojson     Fiji from world-atlas countries-50m.json: rings that cross the
                             180-degree meridian. `python3 make_fixtures.py edge` writes these two
                             and needs nothing but the unpacked world-atlas package.
  us_states10m.topojson      us-atlas states-10m.json with its "nation" object removed: all 56
                             states and territories, arcs unchanged. `python3 make_fixtures.py
                             states` writes only this file and needs only the us-atlas package.
  columbus.shp/.shx/.dbf/.gal  copied unchanged from libpysal's bundled example.
  us_counties_queen.txt      the adjacency of all 3,231 counties of us-atlas counties-10m.json
                             under the queen rule, as Tinct's own import derives it
                             (`tinct adjacency --rule queen --json`): one line per border,
                             "<FIPS a> <FIPS b> <s|c>" (shared boundary or corner contact).
                             `TINCT=target/debug/tinct python3 make_fixtures.py counties` writes
                             only this file and needs the unpacked us-atlas package and a build.
  reference_edges.txt        rook and queen edges computed by libpysal (a general-purpose
                             spatial-weights library) for each fixture: "<fixture> <rule> <a>|<b>".
"""
import json
import os
import shutil
import sys

HERE = os.path.dirname(os.path.abspath(__file__))


def decode_arcs(topology):
    arcs = []
    t = topology.get("transform")
    for arc in topology["arcs"]:
        x = y = 0
        out = []
        for p in arc:
            if t:
                x += p[0]
                y += p[1]
                out.append((x * t["scale"][0] + t["translate"][0], y * t["scale"][1] + t["translate"][1]))
            else:
                out.append((p[0], p[1]))
        arcs.append(out)
    return arcs


def ring_coords(ring, arcs):
    coords = []
    for i in ring:
        pts = arcs[~i][::-1] if i < 0 else arcs[i]
        coords.extend(pts if not coords else pts[1:])
    return coords


def geometry_to_shapely(g, arcs):
    from shapely.geometry import MultiPolygon, Polygon

    polys = []
    if g["type"] == "Polygon":
        parts = [g["arcs"]]
    elif g["type"] == "MultiPolygon":
        parts = g["arcs"]
    else:
        return None
    for rings in parts:
        ext = ring_coords(rings[0], arcs)
        holes = [ring_coords(r, arcs) for r in rings[1:]]
        polys.append(Polygon(ext, holes))
    return MultiPolygon(polys) if len(polys) > 1 else polys[0]


def subset_topology(topology, object_name, keep):
    """Keeps the geometries whose name is in `keep`, renumbering arcs (quantised, delta-encoded)."""
    geoms = [g for g in topology["objects"][object_name]["geometries"] if g["properties"]["name"] in keep]
    geoms.sort(key=lambda g: keep.index(g["properties"]["name"]))
    used = sorted({(~i if i < 0 else i) for g in geoms for part in
                   ([g["arcs"]] if g["type"] == "Polygon" else g["arcs"]) for ring in part for i in ring})
    new_index = {old: new for new, old in enumerate(used)}

    def remap(i):
        return ~new_index[~i] if i < 0 else new_index[i]

    out_geoms = []
    for g in geoms:
        if g["type"] == "Polygon":
            arcs = [[remap(i) for i in ring] for ring in g["arcs"]]
        else:
            arcs = [[[remap(i) for i in ring] for ring in part] for part in g["arcs"]]
        out_geoms.append({"type": g["type"], "arcs": arcs, "id": g.get("id"), "properties": g["properties"]})
    return {
        "type": "Topology",
        "transform": topology["transform"],
        "objects": {object_name: {"type": "GeometryCollection", "geometries": out_geoms}},
        "arcs": [topology["arcs"][i] for i in used],
    }


def reference_edges(label, names, shapes):
    import geopandas as gpd
    from libpysal.weights import Queen, Rook

    gdf = gpd.GeoDataFrame({"name": names}, geometry=shapes)
    lines = []
    for rule, cls in (("rook", Rook), ("queen", Queen)):
        w = cls.from_dataframe(gdf, use_index=False, silence_warnings=True)
        edges = sorted({tuple(sorted((names[i], names[j]))) for i, js in w.neighbors.items() for j in js})
        lines += [f"{label} {rule} {a}|{b}" for a, b in edges]
    return lines


def caucasus():
    world = json.load(open(os.path.join(os.environ["WORLD_ATLAS"], "countries-50m.json")))
    keep = ["Azerbaijan", "Armenia", "Georgia", "Turkey", "Iran"]
    sub = subset_topology(world, "countries", keep)
    with open(os.path.join(HERE, "world50m_caucasus.topojson"), "w") as f:
        json.dump(sub, f, separators=(",", ":"))


def edge():
    shutil.copy(os.path.join(os.environ["WORLD_ATLAS"], "countries-110m.json"),
                os.path.join(HERE, "world110m.topojson"))
    world = json.load(open(os.path.join(os.environ["WORLD_ATLAS"], "countries-50m.json")))
    sub = subset_topology(world, "countries", ["Fiji"])
    with open(os.path.join(HERE, "world50m_fiji.topojson"), "w") as f:
        json.dump(sub, f, separators=(",", ":"))


def states():
    us = json.load(open(os.path.join(os.environ["US_ATLAS"], "states-10m.json")))
    # The states object only (the nation object is the same arcs merged); arcs unchanged.
    del us["objects"]["nation"]
    with open(os.path.join(HERE, "us_states10m.topojson"), "w") as f:
        json.dump(us, f, separators=(",", ":"))


def main():
    import geopandas as gpd
    import libpysal

    lines = []
    caucasus()
    edge()
    states()

    us = json.load(open(os.path.join(os.environ["US_ATLAS"], "states-10m.json")))
    keep = ["Utah", "Colorado", "Arizona", "New Mexico", "Nevada", "California", "Oregon", "Idaho",
            "Wyoming", "Nebraska", "Kansas", "Oklahoma", "Texas", "Alaska"]
    sub = subset_topology(us, "states", keep)
    with open(os.path.join(HERE, "us_states_subset.topojson"), "w") as f:
        json.dump(sub, f, separators=(",", ":"))
    arcs = decode_arcs(sub)
    shapes = [geometry_to_shapely(g, arcs) for g in sub["objects"]["states"]["geometries"]]
    names = [g["properties"]["name"] for g in sub["objects"]["states"]["geometries"]]
    # Rounded to 1e-6 degrees (about 0.1 m): shared vertices round alike, so topology is kept.
    features = [{"type": "Feature", "properties": {"name": n},
                 "geometry": json.loads(json.dumps(s.__geo_interface__), parse_float=lambda v: round(float(v), 6))}
                for n, s in zip(names, shapes)]
    with open(os.path.join(HERE, "us_states_subset.geojson"), "w") as f:
        json.dump({"type": "FeatureCollection", "features": features}, f, separators=(",", ":"))
    lines += reference_edges("us_states", names, shapes)

    world = json.load(open(os.path.join(os.environ["WORLD_ATLAS"], "countries-110m.json")))
    keep = ["Russia", "Norway", "Finland", "Estonia", "Latvia", "Lithuania", "Poland", "Belarus",
            "Ukraine", "Georgia", "Azerbaijan", "Kazakhstan", "China", "Mongolia", "North Korea", "Fiji"]
    sub = subset_topology(world, "countries", keep)
    with open(os.path.join(HERE, "world_subset.topojson"), "w") as f:
        json.dump(sub, f, separators=(",", ":"))
    arcs = decode_arcs(sub)
    shapes = [geometry_to_shapely(g, arcs) for g in sub["objects"]["countries"]["geometries"]]
    names = [g["properties"]["name"] for g in sub["objects"]["countries"]["geometries"]]
    lines += reference_edges("world", names, shapes)

    src = os.path.join(os.path.dirname(libpysal.__file__), "examples", "columbus")
    for ext in ("shp", "shx", "dbf", "gal"):
        shutil.copy(os.path.join(src, "columbus." + ext), os.path.join(HERE, "columbus." + ext))
    gdf = gpd.read_file(os.path.join(HERE, "columbus.shp"))
    names = [str(int(v)) for v in gdf["POLYID"]]
    lines += reference_edges("columbus", names, list(gdf.geometry))

    with open(os.path.join(HERE, "reference_edges.txt"), "w") as f:
        f.write("# rook and queen edges from libpysal %s (see make_fixtures.py)\n" % libpysal.__version__)
        f.write("\n".join(lines) + "\n")


def counties():
    """The county adjacency under the queen rule, from Tinct's own import, as FIPS pairs."""
    import subprocess

    path = os.path.join(os.environ["US_ATLAS"], "counties-10m.json")
    tinct = os.environ.get("TINCT", "target/debug/tinct")
    report = json.loads(subprocess.run([tinct, "adjacency", path, "--rule", "queen", "--json"],
                                       check=True, capture_output=True, text=True).stdout)
    topology = json.load(open(path))
    geometries = topology["objects"]["counties"]["geometries"]
    fips = {r["id"]: geometries[r["source_index"]]["id"] for r in report["regions"]}
    lines = sorted("%s %s %s" % (min(fips[b["a"]], fips[b["b"]]), max(fips[b["a"]], fips[b["b"]]),
                                 "c" if b["kind"] == "corner" else "s")
                   for b in report["borders"])
    with open(os.path.join(HERE, "us_counties_queen.txt"), "w") as f:
        f.write("# us-atlas 3.0.1 counties-10m.json, queen rule, %d counties, %d borders "
                "(see make_fixtures.py)\n" % (len(fips), len(lines)))
        f.write("\n".join(lines) + "\n")


if __name__ == "__main__":
    if sys.argv[1:] == ["counties"]:
        counties()
    elif sys.argv[1:] == ["caucasus"]:
        caucasus()
    elif sys.argv[1:] == ["edge"]:
        edge()
    elif sys.argv[1:] == ["states"]:
        states()
    else:
        main()

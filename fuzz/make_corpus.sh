#!/usr/bin/env bash
# Seeds fuzz/corpus/TARGET from the repository's own files (tests/golden, tests/data, sample-maps)
# and the committed regression inputs. The corpora stay local (fuzz/.gitignore).
set -euo pipefail
cd "$(dirname "$0")/.."
c=fuzz/corpus
mkdir -p "$c"/{project_file,geojson,topojson,shapefile,dbf,dimacs,edge_list,geopackage,flatgeobuf}
cp tests/golden/v1/*.tinct sample-maps/*.tinct "$c/project_file/"
cp sample-maps/*.geojson tests/data/geo/*.geojson "$c/geojson/"
cp tests/data/geo/*.topojson "$c/topojson/"
cp tests/data/geo/*.dbf "$c/dbf/"
cp tests/data/geo/*.gpkg "$c/geopackage/"
cp tests/data/geo/*.fgb "$c/flatgeobuf/"
# Shapefile inputs: a 4-byte little-endian .shp length, the .shp, then the .dbf (see shapefile.rs).
python3 - "$c/shapefile" <<'PY'
import struct, sys, pathlib
out = pathlib.Path(sys.argv[1])
shp = pathlib.Path("tests/data/geo/columbus.shp").read_bytes()
dbf = pathlib.Path("tests/data/geo/columbus.dbf").read_bytes()
(out / "columbus-with-dbf").write_bytes(struct.pack("<I", len(shp)) + shp + dbf)
(out / "columbus-alone").write_bytes(struct.pack("<I", len(shp)) + shp)
PY
# Graph files: the sample projects' constraint graphs, written by tinct itself.
for f in sample-maps/*.tinct tests/golden/v1/*.tinct; do
  b=$(basename "$f" .tinct)
  cargo run -q --no-default-features -- convert "$f" "$c/dimacs/$b.col"
  cargo run -q --no-default-features -- convert "$f" "$c/edge_list/$b.edges"
done
if [ -d tests/data/fuzz-regressions ]; then
  for t in project_file geojson topojson shapefile dbf dimacs edge_list geopackage flatgeobuf; do
    cp tests/data/fuzz-regressions/"$t"-* "$c/$t/" 2>/dev/null || true
  done
fi
echo "corpora in $c:"; for d in "$c"/*; do echo "  $(basename "$d"): $(ls "$d" | wc -l) files"; done

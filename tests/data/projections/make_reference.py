"""Reference coordinates for Tinct's projections, computed by PROJ through pyproj.

Run:  python3 -m venv /tmp/venv && /tmp/venv/bin/pip install pyproj
      /tmp/venv/bin/python make_reference.py > reference.csv

Each row: the projection's parameters, the PROJ string given to PROJ (Tinct's
`Projection::proj_string` must produce the same text), a longitude/latitude in degrees and
PROJ's forward result in metres. Tinct's tests check their forward results against x, y and
their inverse of x, y against lon, lat. Values are printed with repr (17 significant digits).
"""

import math

import pyproj

R = "6371007.181"
TAIL = f"+x_0=0 +y_0=0 +R={R} +units=m +no_defs"


def fmt(v):
    """A number as Rust's `{}` formats an f64 (shortest round-trip text, no trailing .0)."""
    text = repr(float(v))
    return text[:-2] if text.endswith(".0") else text


PROJECTIONS = [
    ("laea", -100.0, 40.0, None, None),
    ("laea", 20.0, -90.0, None, None),
    ("laea", 179.75, -17.0, None, None),
    ("aea", -96.0, 23.0, 29.5, 45.5),
    ("aea", 132.0, -27.0, -18.0, -36.0),
    ("aea", -153.5, 61.0, 54.5, 67.5),
    ("eqearth", 0.0, None, None, None),
    ("eqearth", 150.0, None, None, None),
]

POINTS = [
    (-75.0, 35.0),
    (-122.4, 37.8),
    (-100.0, 40.0),
    (-68.0, 47.0),
    (-150.0, 61.2),
    (178.4, -18.1),
    (-179.9, -16.5),
    (151.2, -33.9),
    (2.35, 48.85),
    (0.0, 0.0),
    (-58.4, -34.6),
    (37.6, 55.75),
    (120.0, 80.0),
    (-10.0, -60.0),
]


def proj_string(kind, lon0, lat0, lat1, lat2):
    if kind == "laea":
        return f"+proj=laea +lat_0={fmt(lat0)} +lon_0={fmt(lon0)} {TAIL}"
    if kind == "aea":
        return (f"+proj=aea +lat_0={fmt(lat0)} +lon_0={fmt(lon0)} +lat_1={fmt(lat1)} "
                f"+lat_2={fmt(lat2)} {TAIL}")
    return f"+proj=eqearth +lon_0={fmt(lon0)} {TAIL}"


def main():
    print("kind,lon0,lat0,lat1,lat2,proj,lon,lat,x,y")
    for kind, lon0, lat0, lat1, lat2 in PROJECTIONS:
        text = proj_string(kind, lon0, lat0, lat1, lat2)
        transformer = pyproj.Transformer.from_crs("+proj=longlat +R=" + R + " +no_defs", text,
                                                  always_xy=True)
        for lon, lat in POINTS:
            if kind == "laea":
                # Stay well away from the antipode, where the azimuthal projection is singular.
                p, p0 = math.radians(lat), math.radians(lat0)
                cos_d = (math.sin(p) * math.sin(p0)
                         + math.cos(p) * math.cos(p0) * math.cos(math.radians(lon - lon0)))
                if cos_d < math.cos(math.radians(150.0)):
                    continue
            x, y = transformer.transform(lon, lat, errcheck=True)
            cells = [kind, fmt(lon0), "" if lat0 is None else fmt(lat0),
                     "" if lat1 is None else fmt(lat1), "" if lat2 is None else fmt(lat2), text,
                     fmt(lon), fmt(lat), repr(x), repr(y)]
            print(",".join(cells))


if __name__ == "__main__":
    main()

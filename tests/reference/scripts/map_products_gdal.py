"""Reads a map folder back with GDAL's Python bindings (Debian python3-gdal) and checks what a
GIS needs to open each product on its own: the class rasters' palette, colour table and category
names; units, level metadata and statistics of every band; overviews; PHOTOMETRIC=MINISBLACK on
multi-band products; the SLD styles as well-formed XML. Prints one line per check that fails
and "ok" when none does. Usage: map_products_gdal.py MAP_FOLDER LEVEL_COUNT"""
import sys
import xml.etree.ElementTree as ET
from pathlib import Path

from osgeo import gdal

gdal.UseExceptions()
folder = Path(sys.argv[1])
levels = int(sys.argv[2])
failures = []


def check(condition, text):
    if not condition:
        failures.append(text)


# The extent classes and colours the tool documents (docs/map.md).
classes = {0: ("Dry", (235, 231, 223)), 1: ("Flooded, connected to the sea", (0, 114, 178)),
           2: ("Low ground cut off from the sea", (204, 121, 167)), 3: ("Sea (today's water)", (219, 230, 238))}
for k in range(1, levels + 1):
    ds = gdal.Open(str(folder / f"extent_level_{k}.tif"))
    check(ds.RasterCount == 1, f"extent_level_{k}.tif: {ds.RasterCount} bands")
    b = ds.GetRasterBand(1)
    check(b.DataType == gdal.GDT_Byte, f"extent_level_{k}.tif: not Byte")
    check(b.GetColorInterpretation() == gdal.GCI_PaletteIndex, f"extent_level_{k}.tif: not a palette")
    ct = b.GetColorTable()
    names = b.GetCategoryNames() or []
    for code, (name, rgb) in classes.items():
        check(ct is not None and ct.GetColorEntry(code)[:3] == rgb, f"extent_level_{k}.tif: colour of {code}")
        check(len(names) > code and names[code] == name, f"extent_level_{k}.tif: name of {code}: {names}")
    check(ct is not None and ct.GetColorEntry(255)[3] == 0, f"extent_level_{k}.tif: nodata not transparent")
    md = b.GetMetadata()
    check("LEVEL_M" in md, f"extent_level_{k}.tif: no LEVEL_M")
    for key in ("TIDEWRIGHT_METHOD", "TIDEWRIGHT_VERTICAL", "TIDEWRIGHT_CAUTIONS"):
        check(ds.GetMetadataItem(key) is not None, f"extent_level_{k}.tif: no {key}")

for name, unit in (("depth.tif", "m"), ("threshold.tif", "m"), ("extent.tif", "")):
    ds = gdal.Open(str(folder / name))
    if ds.RasterCount > 1:
        check(ds.GetMetadataItem("PHOTOMETRIC", "IMAGE_STRUCTURE") in (None, "MINISBLACK"), f"{name}: photometric")
        check(ds.GetRasterBand(1).GetColorInterpretation() != gdal.GCI_RedBand, f"{name}: tagged RGB")
    for i in range(1, ds.RasterCount + 1):
        b = ds.GetRasterBand(i)
        check(b.GetUnitType() == unit, f"{name} band {i}: unit {b.GetUnitType()!r}")
        check(b.GetOverviewCount() >= 1, f"{name} band {i}: no overviews")
        if name == "depth.tif":
            check("LEVEL_M" in b.GetMetadata(), f"{name} band {i}: no LEVEL_M")
        check(b.GetMetadataItem("STATISTICS_MAXIMUM") is not None, f"{name} band {i}: no statistics")

for name in ("extent.sld", "depth.sld"):
    root = ET.parse(folder / name).getroot()
    entries = root.findall(".//{http://www.opengis.net/sld}ColorMapEntry")
    check(len(entries) >= 4, f"{name}: {len(entries)} colour map entries")
    if name == "extent.sld":
        got = {int(float(e.get("quantity"))): e.get("color") for e in entries}
        check(got.get(1) == "#0072b2" and got.get(2) == "#cc79a7", f"{name}: class colours {got}")

print("\n".join(failures) if failures else "ok")

#!/usr/bin/python3
"""Outside references for the terrain module (called by tests/reference/terrain_reference_test.cpp).

generate DEM SEED ROWS COLS
    Write a seeded fractal DEM (spectral synthesis, power spectrum ~ f^-2.4, chosen here) as a
    float32 GeoTIFF in UTM 33N with 10 m cells, a seaward slope, elevations rounded to 0.01 m
    (many ties) and about 2% nodata (-9999, declared in the file).
units DEM KIND COPY
    Write a copy of DEM (as written by generate) in other vertical units, as GIS users meet
    them: KIND "ft" (float32, metres / 0.3048, band unit type "ft"), "cm" (Int16 centimetres with
    GDAL scale 0.01 and nodata -32768, no unit type), "usft-crs" (float32 in US survey feet,
    1200/3937 m, no band unit, CRS UTM 33N + NAVD88 height (ftUS), EPSG:32633+6360).
check DEM OUT_DIR CONNECTIVITY SPREAD LEVEL...
    Compare the map outputs in OUT_DIR with
      - the flood threshold by morphological reconstruction by erosion
        (skimage.morphology.reconstruction, scikit-image), seeded from the sea cells;
      - the extent classes by connected-component labelling below each level
        (scipy.ndimage.label), keeping the components that contain a sea cell;
      - the GeoTIFF record read back with GDAL (gdal.Info JSON, as gdalinfo -json).
    Sea: the cells at or below 0 m on the edge of the valid data (the map was run with
    --sea-edge-below 0): on the raster's frame, or 4-adjacent to nodata that a 4-connected
    component of nodata joins to the frame (ndimage.label); with
    SPREAD a number (the map run with --sea-spread-to SPREAD), also every cell of the
    components of {z <= SPREAD} (ndimage.label) that hold such a cell; SPREAD "none" otherwise.
    With SPREAD, the depth, AEP and first-year rasters' records are read back too.
    Prints one JSON object with the counts of cells compared and of mismatches.
"""
import json
import sys

import numpy as np
from osgeo import gdal, osr
from scipy import ndimage
from skimage.morphology import reconstruction

gdal.UseExceptions()
NODATA = -9999.0


def generate(path, seed, rows, cols):
    rng = np.random.default_rng(seed)
    noise = rng.normal(size=(rows, cols))
    fy = np.fft.fftfreq(rows)[:, None]
    fx = np.fft.fftfreq(cols)[None, :]
    f = np.sqrt(fx * fx + fy * fy)
    f[0, 0] = 1.0
    spectrum = np.fft.fft2(noise) * f ** (-2.4 / 2.0)
    spectrum[0, 0] = 0.0
    z = np.real(np.fft.ifft2(spectrum))
    z = (z - z.mean()) / z.std() * 3.0
    z += np.linspace(-6.0, 10.0, cols)[None, :]
    z = np.round(z, 2)
    z[rng.random((rows, cols)) < 0.02] = NODATA
    drv = gdal.GetDriverByName("GTiff")
    ds = drv.Create(path, cols, rows, 1, gdal.GDT_Float32)
    ds.SetGeoTransform((500000.0, 10.0, 0.0, 6000000.0, 0.0, -10.0))
    srs = osr.SpatialReference()
    srs.ImportFromEPSG(32633)
    ds.SetProjection(srs.ExportToWkt())
    band = ds.GetRasterBand(1)
    band.SetNoDataValue(NODATA)
    band.WriteArray(z.astype(np.float32))
    ds = None


def units(dem_path, kind, copy_path):
    z = read(dem_path).astype(np.float64)
    valid = z != NODATA
    src = gdal.Open(dem_path)
    drv = gdal.GetDriverByName("GTiff")
    if kind == "cm":
        values = np.where(valid, np.round(z * 100.0), -32768).astype(np.int16)
        ds = drv.Create(copy_path, src.RasterXSize, src.RasterYSize, 1, gdal.GDT_Int16)
        nodata = -32768
    else:
        metres_per_unit = 0.3048 if kind == "ft" else 1200.0 / 3937.0
        values = np.where(valid, z / metres_per_unit, NODATA).astype(np.float32)
        ds = drv.Create(copy_path, src.RasterXSize, src.RasterYSize, 1, gdal.GDT_Float32)
        nodata = NODATA
    ds.SetGeoTransform(src.GetGeoTransform())
    srs = osr.SpatialReference()
    if kind == "usft-crs":
        srs.SetFromUserInput("EPSG:32633+6360")
    else:
        srs.ImportFromEPSG(32633)
    ds.SetProjection(srs.ExportToWkt())
    band = ds.GetRasterBand(1)
    band.SetNoDataValue(nodata)
    if kind == "ft":
        band.SetUnitType("ft")
    if kind == "cm":
        band.SetScale(0.01)
    band.WriteArray(values)
    ds = None


def read(path, band=1):
    # ReadRaster + frombuffer rather than ReadAsArray: on this Debian build ReadAsArray of a
    # megapixel band crashes once SciPy is loaded (seen with python3-gdal 3.6.2).
    ds = gdal.Open(path)
    b = ds.GetRasterBand(band)
    dtype = {gdal.GDT_Byte: np.uint8, gdal.GDT_Int16: np.int16, gdal.GDT_Float32: np.float32}[b.DataType]
    return np.frombuffer(b.ReadRaster(), dtype=dtype).reshape(ds.RasterYSize, ds.RasterXSize).copy()


def connected_to(cells, seeds, footprint):
    """The cells of the components of `cells | seeds` that hold a seed."""
    labels, _ = ndimage.label(cells | seeds, structure=footprint)
    seed_labels = np.unique(labels[seeds])
    return np.isin(labels, seed_labels[seed_labels > 0])


def check(dem_path, out_dir, connectivity, spread, levels):
    z = read(dem_path).astype(np.float64)
    valid = z != NODATA
    frame = np.zeros(z.shape, dtype=bool)
    frame[0, :] = frame[-1, :] = frame[:, 0] = frame[:, -1] = True
    cross = ndimage.generate_binary_structure(2, 1)
    holes, _ = ndimage.label(~valid, structure=cross)
    outer = np.isin(holes, np.unique(holes[frame & ~valid])) & ~valid
    edge = frame | ndimage.binary_dilation(outer, structure=cross)
    sea = edge & valid & (z <= 0.0)
    footprint = np.ones((3, 3)) if connectivity == 8 else ndimage.generate_binary_structure(2, 1)
    result = {"connectivity": connectivity}
    if spread is not None:
        seeds = sea.sum()
        sea = connected_to(valid & (z <= spread), sea, footprint)
        result["spread_cells"] = int(sea.sum() - seeds)
    land = valid & ~sea

    # Threshold: reconstruction by erosion of a marker that is low on the sea and high
    # elsewhere, under the DEM as mask; nodata cells are raised to a barrier height far above
    # the DEM, so a cell reached only through them gets at least that height (= never reached).
    barrier = 1.0e6
    low = z[valid].min() - 1.0
    mask = np.where(valid, z, barrier)
    mask[sea] = low
    marker = np.full(z.shape, barrier)
    marker[sea] = low
    filled = reconstruction(marker, mask, method="erosion", footprint=footprint)
    t = read(f"{out_dir}/threshold.tif").astype(np.float64)
    reached = land & (filled < barrier)
    unreached = land & (filled >= barrier)
    result["threshold_cells"] = int(reached.sum())
    result["threshold_mismatches"] = int(
        (reached & ~(np.float32(filled) == np.float32(t))).sum() + (unreached & ~np.isnan(t)).sum())
    result["threshold_max_abs_diff"] = float(np.nanmax(np.abs(filled[reached] - t[reached])))

    # Extents: components of {valid and z <= h} or sea that hold a sea cell.
    mismatches = 0
    compared = 0
    flooded = 0
    for i, h in enumerate(levels):
        connected = connected_to(valid & (z <= h), sea, footprint) & land
        want = np.zeros(z.shape, dtype=np.uint8)
        want[land & (z <= h)] = 2
        want[connected] = 1
        want[sea] = 3
        want[~valid] = 255
        got = read(f"{out_dir}/extent.tif", i + 1)
        mismatches += int((got != want).sum())
        compared += want.size
        flooded += int(connected.sum())
    result["extent_cells"] = compared
    result["extent_flooded_cells"] = flooded
    result["extent_mismatches"] = mismatches

    # The GeoTIFF record, as gdalinfo -json shows it.
    info = gdal.Info(f"{out_dir}/threshold.tif", format="json")
    dem_info = gdal.Info(dem_path, format="json")
    band = info["bands"][0]
    srs = osr.SpatialReference()
    srs.ImportFromWkt(info["coordinateSystem"]["wkt"])
    srs.AutoIdentifyEPSG()
    ext = gdal.Info(f"{out_dir}/extent.tif", format="json")
    meta = info["metadata"][""]
    result["record"] = {
        "epsg": srs.GetAuthorityCode(None),
        "same_geotransform": info["geoTransform"] == dem_info["geoTransform"],
        "nodata": str(band.get("noDataValue")),
        "block": band["block"],
        "compression": info["metadata"]["IMAGE_STRUCTURE"].get("COMPRESSION"),
        "description_has_threshold": "flood threshold" in band.get("description", ""),
        "unit": band.get("unit"),
        "method_cites_barnes": "Barnes" in meta.get("TIDEWRIGHT_METHOD", ""),
        "has_cautions": "licensed coastal engineer" in meta.get("TIDEWRIGHT_CAUTIONS", ""),
        "has_command": meta.get("TIDEWRIGHT_COMMAND", "").startswith("tidewright map"),
        "extent_bands": len(ext["bands"]),
        "extent_colour_interpretations": sorted({b.get("colorInterpretation", "") for b in ext["bands"]}),
        "extent_nodata": ext["bands"][0].get("noDataValue"),
        "extent_level_metadata": ext["bands"][0].get("metadata", {}).get("", {}).get("LEVEL_M"),
    }
    if spread is not None:
        result["record"]["sea_metadata"] = meta.get("TIDEWRIGHT_SEA", "")
        for name in ("depth", "aep", "first_year"):
            info = gdal.Info(f"{out_dir}/{name}.tif", format="json")
            b = info["bands"][0]
            result["record"][name] = {
                "bands": len(info["bands"]),
                "type": b["type"],
                "nodata": str(b.get("noDataValue")),
                "unit": b.get("unit"),
                "description": b.get("description", ""),
                "metadata": b.get("metadata", {}).get("", {}),
                "product": info["metadata"][""].get("TIDEWRIGHT_PRODUCT"),
                "same_geotransform": info["geoTransform"] == dem_info["geoTransform"],
            }
    print(json.dumps(result))


if __name__ == "__main__":
    if sys.argv[1] == "generate":
        generate(sys.argv[2], int(sys.argv[3]), int(sys.argv[4]), int(sys.argv[5]))
    elif sys.argv[1] == "units":
        units(sys.argv[2], sys.argv[3], sys.argv[4])
    elif sys.argv[1] == "check":
        check(sys.argv[2], sys.argv[3], int(sys.argv[4]),
              None if sys.argv[5] == "none" else float(sys.argv[5]), [float(v) for v in sys.argv[6:]])
    else:
        sys.exit("usage: terrain_reference.py generate|units|check ...")

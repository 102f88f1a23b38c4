#!/usr/bin/python3
"""In-process timer of GDAL's viewshed for tests/bench/mask.bench.ts.

Reads one JSON command per line on stdin and answers one JSON line on stdout:
  {"cmd": "load", "raw": PATH, "width": W, "height": H, "originX": X0, "originY": Y0, "cellSizeM": C, "tif": PATH}
      loads a raw little-endian Float32 DEM into a MEM dataset (UTM 33N, WGS 84) and also writes it as an
      uncompressed GeoTIFF at "tif" for the command-line tool; answers {"ok": true}.
  {"cmd": "viewshed", "observerX": X, "observerY": Y, "observerHeightM": H, "cc": CC, "mode": "normal"|"ground"}
      runs gdal.ViewshedGenerate on the MEM dataset into a MEM output and answers {"seconds": S}, the wall
      time of that call alone (no file I/O, no interpreter start-up).
  {"cmd": "quit"}
Tools: GDAL 3.6.2 (Debian python3-gdal), numpy 1.24.2.
"""

import json
import sys
import time

import numpy as np
from osgeo import gdal, osr

gdal.UseExceptions()


def main():
    src = None
    for line in sys.stdin:
        msg = json.loads(line)
        if msg["cmd"] == "quit":
            break
        if msg["cmd"] == "load":
            z = np.fromfile(msg["raw"], dtype="<f4").reshape(msg["height"], msg["width"])
            srs = osr.SpatialReference()
            srs.ImportFromEPSG(32633)
            gt = [msg["originX"], msg["cellSizeM"], 0, msg["originY"], 0, -msg["cellSizeM"]]
            src = gdal.GetDriverByName("MEM").Create("", msg["width"], msg["height"], 1, gdal.GDT_Float32)
            src.SetGeoTransform(gt)
            src.SetProjection(srs.ExportToWkt())
            src.GetRasterBand(1).WriteArray(z)
            tif = gdal.GetDriverByName("GTiff").CreateCopy(msg["tif"], src)
            tif = None
            print(json.dumps({"ok": True}), flush=True)
        elif msg["cmd"] == "viewshed":
            mode = gdal.GVOT_MIN_TARGET_HEIGHT_FROM_GROUND if msg.get("mode") == "ground" else gdal.GVOT_NORMAL
            t0 = time.perf_counter()
            out = gdal.ViewshedGenerate(
                src.GetRasterBand(1), "MEM", "", [], msg["observerX"], msg["observerY"], msg["observerHeightM"],
                0.0, 255, 0, 0, -1, msg["cc"], gdal.GVM_Edge, 0, heightMode=mode,
            )
            seconds = time.perf_counter() - t0
            out = None
            print(json.dumps({"seconds": seconds}), flush=True)


if __name__ == "__main__":
    main()

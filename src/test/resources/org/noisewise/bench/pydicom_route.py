"""The route a Python user takes with a DICOM folder of one series (a contender of DicomSeriesBenchmark):
read every file with pydicom, place it by its position along the slice normal and its temporal
position, stack the series as Z x T x rows x columns with each file's rescale, and (with "maps")
make the temporal mean, SD and SNR maps of every slice with numpy."""
import os
import sys

import numpy as np
import pydicom


def main(folder, maps):
    slices = {}
    normal = None
    for name in sorted(os.listdir(folder)):
        ds = pydicom.dcmread(os.path.join(folder, name))
        if normal is None:
            iop = np.array([float(v) for v in ds.ImageOrientationPatient])
            normal = np.cross(iop[:3], iop[3:])
        position = float(np.dot(normal, [float(v) for v in ds.ImagePositionPatient]))
        time = int(ds.get("TemporalPositionIdentifier", ds.InstanceNumber))
        slope = float(ds.get("RescaleSlope", 1))
        intercept = float(ds.get("RescaleIntercept", 0))
        image = ds.pixel_array.astype(np.float32) * slope + intercept
        slices.setdefault(round(position, 3), []).append((time, image))
    series = np.stack([np.stack([image for _, image in sorted(slices[z], key=lambda e: e[0])])
                       for z in sorted(slices)])
    total = 0.0
    if maps:
        mean = series.mean(axis=1)
        sd = series.std(axis=1, ddof=1)
        snr = np.divide(mean, sd, out=np.zeros_like(mean), where=sd > 0)
        total = float(snr[:, snr.shape[1] // 2, snr.shape[2] // 2].sum())
    print(series.shape, total)


if __name__ == "__main__":
    main(sys.argv[1], len(sys.argv) > 2 and sys.argv[2] == "maps")

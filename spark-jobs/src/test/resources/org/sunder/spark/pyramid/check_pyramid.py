# Checks a label pyramid written by Sunder with the reference libraries: zarr opens every level,
# each level is the mode downsampling of the one before (recomputed here with numpy, window by
# window, ties to the smallest label), and the group's attributes validate against the
# OME-NGFF 0.4 image and image-label JSON schemas (python3-jsonschema, draft 2020-12).
# Usage: check_pyramid.py ROOT FORMAT(zarr|n5) SCHEMA_DIR
import json
import os
import sys

import jsonschema
import numpy as np
import zarr

root, fmt, schema_dir = sys.argv[1:4]
store = zarr.N5FSStore(root) if fmt == "n5" else zarr.DirectoryStore(root)
group = zarr.open_group(store, mode="r")
attrs = group.attrs.asdict()
for name in ("ome-ngff-0.4-image.schema.json", "ome-ngff-0.4-image-label.schema.json"):
    with open(os.path.join(schema_dir, name)) as f:
        jsonschema.validate(attrs, json.load(f), cls=jsonschema.Draft202012Validator)

multiscale = attrs["multiscales"][0]
assert [a["name"] for a in multiscale["axes"]] == ["z", "y", "x"], multiscale["axes"]
assert attrs["image-label"]["version"] == "0.4"
datasets = multiscale["datasets"]
scales = [np.array(d["coordinateTransformations"][0]["scale"], dtype=float) for d in datasets]
levels = [group[d["path"]][...] for d in datasets]


def mode_downsample(a, factors):
    shape = tuple(-(-s // k) for s, k in zip(a.shape, factors))
    out = np.empty(shape, dtype=a.dtype)
    for index in np.ndindex(*shape):
        window = a[tuple(slice(i * k, min((i + 1) * k, s))
                         for i, k, s in zip(index, factors, a.shape))].ravel()
        values, counts = np.unique(window, return_counts=True)  # ascending
        out[index] = values[np.argmax(counts)]  # the first maximum: smallest label of a tie
    return out


for level in range(1, len(levels)):
    ratio = scales[level] / scales[level - 1]
    factors = tuple(int(round(r)) for r in ratio)
    assert all(f in (1, 2) for f in factors) and any(f == 2 for f in factors), (level, ratio)
    expected_shape = tuple(-(-s // f) for s, f in zip(levels[level - 1].shape, factors))
    assert levels[level].shape == expected_shape, (level, levels[level].shape, expected_shape)
    expected = mode_downsample(levels[level - 1], factors)
    mismatches = int(np.count_nonzero(expected != levels[level]))
    assert mismatches == 0, f"level {level}: {mismatches} voxels differ from the numpy mode"

print(json.dumps({"levels": len(levels), "shapes": [list(l.shape) for l in levels],
                  "scale0": scales[0].tolist(), "unit": multiscale["axes"][0].get("unit")}))

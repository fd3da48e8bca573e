# Reads arrays written by Sunder with zarr 2.13 / numcodecs (the reference implementation) and
# compares each with the little-endian C-order values Sunder meant to write.
import json
import math
import os
import sys
import warnings

import numpy as np
import zarr

warnings.simplefilter("ignore")
root = sys.argv[1]
with open(os.path.join(root, "manifest.json")) as f:
    manifest = json.load(f)
results = {}
for entry in manifest:
    name = entry["name"]
    try:
        location = os.path.join(root, entry["container"])
        if entry["format"] == "n5":
            store = zarr.N5FSStore(location)
        else:
            store = zarr.DirectoryStore(location)
        z = zarr.open_array(store=store, path=entry["path"], mode="r")
        problems = []
        if z.dtype.name != entry["dtype"]:
            problems.append("dtype %s, expected %s" % (z.dtype, entry["dtype"]))
        if list(z.shape) != entry["shape"]:
            problems.append("shape %s, expected %s" % (list(z.shape), entry["shape"]))
        if "order" in entry and z.order != entry["order"]:
            problems.append("order %s, expected %s" % (z.order, entry["order"]))
        if "byteorder" in entry and z.dtype.byteorder not in entry["byteorder"]:
            problems.append("byte order %s, expected %s" % (z.dtype.byteorder, entry["byteorder"]))
        attrs = z.attrs.asdict()
        if attrs != entry["attrs"]:
            problems.append("attributes %r, expected %r" % (attrs, entry["attrs"]))
        if "fill" in entry:
            want, got = entry["fill"], z.fill_value
            same = (want is None and got is None) or (
                want is not None and got is not None and (
                    (isinstance(want, str) and want == "NaN" and math.isnan(got))
                    or (want == "Infinity" and got == math.inf)
                    or (want == "-Infinity" and got == -math.inf)
                    or (not isinstance(want, str) and got == want)))
            if not same:
                problems.append("fill_value %r, expected %r" % (got, want))
        if not problems:
            expected = np.fromfile(os.path.join(root, "expected", name + ".bin"),
                                   dtype=np.dtype(entry["dtype"]).newbyteorder("<"))
            expected = expected.reshape(entry["shape"])
            actual = z[...]
            if not np.array_equal(actual, expected, equal_nan=(actual.dtype.kind == "f")):
                bad = np.argwhere(~((actual == expected) | (np.isnan(actual) & np.isnan(expected))
                                    if actual.dtype.kind == "f" else actual != expected))
                problems.append("values differ at %d positions, first %s (got %r, expected %r)"
                                % (len(bad), bad[0].tolist(), actual[tuple(bad[0])],
                                   expected[tuple(bad[0])]))
        results[name] = "ok" if not problems else "; ".join(problems)
    except Exception as e:  # a failure to open or decode is a result to report
        results[name] = "%s: %s" % (type(e).__name__, e)
print(json.dumps(results))

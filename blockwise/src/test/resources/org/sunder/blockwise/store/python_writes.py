# Writes Zarr v2 and N5 arrays with zarr 2.13 / numcodecs (the reference implementation) and,
# for each, the values zarr reads back as little-endian C-order bytes plus a manifest.
import json
import os
import sys
import warnings

import numpy as np
import numcodecs
import zarr

warnings.simplefilter("ignore")
root = sys.argv[1]
os.makedirs(os.path.join(root, "expected"), exist_ok=True)
rng = np.random.RandomState(13)
manifest = []


def content(shape, dtype, kind):
    dtype = np.dtype(dtype)
    grids = np.meshgrid(*[np.arange(s, dtype=np.float64) for s in shape], indexing="ij")
    smooth = sum(np.sin(g / (3.0 + i)) for i, g in enumerate(grids))
    if kind == "random":
        smooth = rng.standard_normal(shape) * 4
    if dtype.kind == "f":
        return (smooth + rng.standard_normal(shape) * 0.01).astype(dtype)
    info = np.iinfo(dtype)
    span = min(float(info.max) - float(info.min), 2.0 ** 52)
    low = max(float(info.min), -(2.0 ** 51))
    scaled = (smooth - smooth.min()) / max(np.ptp(smooth), 1e-9)
    values = low + scaled * span * 0.999
    values = values + rng.randint(0, 3, size=shape)
    out = values.astype(np.float64)
    out = np.clip(out, low, low + span)
    return out.astype(np.int64 if dtype.kind == "i" else np.uint64).astype(dtype)


def record(fmt, container, path, array, note):
    array.attrs.update({"axes": "zyx", "index": len(manifest), "scale": [40.0, 4.0, 4.0],
                        "nested": {"ok": True, "name": path}})
    back = array[...]
    le = back.astype(back.dtype.newbyteorder("<"), copy=False)
    name = "%s-%d" % (fmt, len(manifest))
    with open(os.path.join(root, "expected", name + ".bin"), "wb") as f:
        f.write(np.ascontiguousarray(le).tobytes(order="C"))
    manifest.append({"name": name, "format": fmt, "container": container, "path": path,
                     "dtype": back.dtype.name, "shape": list(back.shape), "note": note,
                     "attrs": array.attrs.asdict()})


def zarr_array(path, shape, chunks, dtype, compressor, order="C", sep=".", fill=0,
               partial=False, kind="smooth"):
    store = zarr.DirectoryStore(os.path.join(root, "zarr"), dimension_separator=sep)
    z = zarr.create(shape, chunks=chunks, dtype=dtype, compressor=compressor, order=order,
                    store=store, path=path, fill_value=fill, dimension_separator=sep,
                    overwrite=True)
    data = content(shape, dtype, kind)
    if partial:
        sub = tuple(slice(0, max(1, s // 2)) for s in shape)
        z[sub] = data[sub]
    else:
        z[...] = data
    record("zarr", "zarr", path, z, "%s %s order %s sep %s fill %s%s" % (
        np.dtype(dtype).str, compressor.get_config() if compressor else None, order, sep, fill,
        " partial" if partial else ""))


def n5_array(path, shape, chunks, dtype, compressor, partial=False, kind="smooth"):
    store = zarr.N5FSStore(os.path.join(root, "n5"))
    z = zarr.create(shape, chunks=chunks, dtype=dtype, compressor=compressor, store=store,
                    path=path, overwrite=True)
    data = content(shape, dtype, kind)
    if partial:
        sub = tuple(slice(0, max(1, s // 2)) for s in shape)
        z[sub] = data[sub]
    else:
        z[...] = data
    record("n5", "n5", path, z, "%s %s%s" % (
        np.dtype(dtype).str, compressor.get_config() if compressor else None,
        " partial" if partial else ""))


zarr.open_group(zarr.DirectoryStore(os.path.join(root, "zarr")), mode="a")
dtypes = ["|u1", "<u2", "<u4", "<u8", "|i1", "<i2", "<i4", "<i8", "<f4", "<f8"]
small, small_chunks = (7, 19, 33), (3, 8, 10)
big, big_chunks = (5, 60, 90), (3, 50, 70)
# 3 * 48 * 70 elements per chunk is a multiple of 8, so bit shuffle applies to whole blocks
# (blosc 1 leaves blocks whose element count is not a multiple of 8 unshuffled)
big8, big8_chunks = (5, 60, 90), (3, 48, 70)

# every numcodecs codec, each on a different element type
codecs = [None, numcodecs.Zstd(level=3), numcodecs.GZip(level=5), numcodecs.Zlib(level=4),
          numcodecs.LZ4(acceleration=1), numcodecs.BZ2(level=7), numcodecs.LZMA(preset=2)]
for i, codec in enumerate(codecs):
    for j in range(2):
        dtype = dtypes[(i * 3 + j * 5) % len(dtypes)]
        zarr_array("codec/%d-%d" % (i, j), small, small_chunks, dtype, codec,
                   sep="." if j == 0 else "/", partial=(i + j) % 3 == 0)

# blosc: every internal compressor and shuffle, on multi-block chunks with a leftover block
b = 0
for cname in ["blosclz", "lz4", "lz4hc", "zlib", "zstd", "snappy"]:
    for shuffle in [0, 1, 2]:
        for dtype in ["<u2", "<f4", "|u1", "<u8"]:
            compressor = numcodecs.Blosc(cname=cname, clevel=5, shuffle=shuffle)
            zarr_array("blosc/%s-%d-%s" % (cname, shuffle, dtype[1:]), big, big_chunks, dtype,
                       compressor, partial=b % 4 == 0)
            b += 1
            if shuffle > 0:
                zarr_array("blosc8/%s-%d-%s" % (cname, shuffle, dtype[1:]), big8, big8_chunks,
                           dtype, compressor, partial=b % 3 == 0)
    # forced small blocks: several blocks per frame and a shorter leftover block
    for shuffle in [1, 2]:
        for dtype in ["<u8", "<f8"]:
            zarr_array("blosc-blocks/%s-%d-%s" % (cname, shuffle, dtype[1:]), big8, big8_chunks,
                       dtype, numcodecs.Blosc(cname=cname, clevel=5, shuffle=shuffle,
                                              blocksize=4096))
    # incompressible data: stored memcpyed
    zarr_array("blosc/%s-random" % cname, small, small_chunks, "<f8",
               numcodecs.Blosc(cname=cname, clevel=5, shuffle=1), kind="random")

# byte order, C and F order, separators, fill values, on every element type
for i, dtype in enumerate(dtypes):
    for order in ["C", "F"]:
        for endian in ["<", ">"]:
            dt = np.dtype(dtype).newbyteorder(endian) if dtype[0] != "|" else np.dtype(dtype)
            sep = "/" if (i + (order == "F")) % 2 == 0 else "."
            fill = 3
            if dt.kind == "f":
                fill = ["NaN", "Infinity", "-Infinity", 1.5][(i + len(order)) % 4]
                fill = float(fill) if fill != "NaN" else float("nan")
            zarr_array("layout/%s-%s-%s" % (dt.str.replace("<", "le").replace(">", "be")
                                            .replace("|", ""), order, endian),
                       small, small_chunks, dt, numcodecs.Zstd(level=1), order=order, sep=sep,
                       fill=fill, partial=True)
zarr_array("layout/fill-none", small, small_chunks, "<i4", numcodecs.Zstd(level=1), fill=None)
# multi-channel affinities: channel first in Zarr's C order
zarr_array("affinities", (3, 9, 20, 26), (3, 4, 8, 8), "<f4", numcodecs.Blosc("lz4", 5, 1))

# N5 through zarr's N5FSStore: each codec it writes, border blocks, every element type
n5_codecs = [None, numcodecs.GZip(level=3), numcodecs.Zlib(level=3), numcodecs.Zstd(level=2),
             numcodecs.BZ2(level=5), numcodecs.LZMA(preset=1),
             numcodecs.Blosc(cname="lz4", clevel=5, shuffle=1),
             numcodecs.Blosc(cname="zstd", clevel=3, shuffle=2), numcodecs.LZ4()]
for i, codec in enumerate(n5_codecs):
    for j in range(2):
        dtype = np.dtype(dtypes[(i * 2 + j * 7) % len(dtypes)])
        n5_array("codec/%d-%d" % (i, j), small, small_chunks, dtype, codec, partial=j == 1)
for i, dtype in enumerate(dtypes):
    n5_array("types/%s" % np.dtype(dtype).name, (5, 11, 17), (2, 4, 8), dtype,
             numcodecs.GZip(level=1))

with open(os.path.join(root, "manifest.json"), "w") as f:
    json.dump(manifest, f, indent=1)
print(len(manifest))

#!/usr/bin/python3
"""Independent checks of a wallrans checkpoint with h5py and ElementTree, run by test_checkpoint.

  inspect_checkpoint.py dataset <file.h5> <dataset> <ny> <nx> <j> <i> <expected value>
  inspect_checkpoint.py boundary <file.h5> <dataset> <n faces> <id> <expected value>
  inspect_checkpoint.py xdmf <file.xmf>

Exits non-zero (with a message) if a check fails; `xdmf` prints the number of DataItems checked.
"""
import os
import sys
import xml.etree.ElementTree as ElementTree
import zlib

import h5py


def text(value):
    return value.decode() if isinstance(value, bytes) else str(value)


def check_crc32(data):
    """The dataset's attribute crc32 is zlib's CRC-32 of its values as little-endian doubles."""
    stored = int(data.attrs["crc32"])
    computed = zlib.crc32(data[()].astype("<f8").tobytes())
    assert stored == computed, (data.name, stored, computed)


def check_dataset(path, name, ny, nx, j, i, expected):
    with h5py.File(path, "r") as f:
        assert text(f.attrs["format"]) == "wallrans-checkpoint", f.attrs["format"]
        data = f[name]
        assert data.shape == (ny, nx), (name, data.shape)
        assert data.dtype.kind == "f" and data.dtype.itemsize == 8, data.dtype
        assert float(data[j, i]) == expected, (name, j, i, float(data[j, i]), expected)
        check_crc32(data)
        for coordinate in ("/grid/x", "/grid/y"):
            assert f[coordinate].shape == (ny + 1, nx + 1), (coordinate, f[coordinate].shape)
            check_crc32(f[coordinate])


def check_boundary(path, name, n_faces, face_id, expected):
    with h5py.File(path, "r") as f:
        assert text(f.attrs["format"]) == "wallrans-checkpoint", f.attrs["format"]
        assert int(f.attrs["format_version"]) == 3, f.attrs["format_version"]
        data = f[name]
        assert data.shape == (n_faces,), (name, data.shape)
        assert data.dtype.kind == "f" and data.dtype.itemsize == 8, data.dtype
        assert float(data[face_id]) == expected, (name, face_id, float(data[face_id]), expected)
        check_crc32(data)


def check_xdmf(path):
    root = ElementTree.parse(path).getroot()
    assert root.tag == "Xdmf", root.tag
    grid = root.find("Domain/Grid")
    assert grid is not None, "no Domain/Grid"
    assert grid.find("Topology").get("TopologyType") == "2DSMesh"
    # One interleaved coordinate array (ny+1, nx+1, 2): the form both XDMF readers of the common
    # viewer open (its XDMF-3 reader crashes on the two-array X_Y form), holding /grid/x and /grid/y.
    geometry = grid.find("Geometry")
    assert geometry.get("GeometryType") == "XY", geometry.attrib
    items = geometry.findall("DataItem")
    assert len(items) == 1, len(items)
    file_name, dataset = items[0].text.strip().split(":", 1)
    assert dataset == "/grid/xy", dataset
    with h5py.File(os.path.join(os.path.dirname(path), file_name), "r") as f:
        xy = f["/grid/xy"][...]
        assert xy.ndim == 3 and xy.shape[2] == 2, xy.shape
        assert (xy[:, :, 0] == f["/grid/x"][...]).all() and (xy[:, :, 1] == f["/grid/y"][...]).all()
    for attribute in grid.findall("Attribute"):
        assert attribute.get("Center") == "Cell", attribute.attrib
    n_items = 0
    for item in root.iter("DataItem"):
        file_name, dataset = item.text.strip().split(":", 1)
        assert file_name and "/" not in file_name, file_name
        dims = tuple(int(n) for n in item.get("Dimensions").split())
        with h5py.File(os.path.join(os.path.dirname(path), file_name), "r") as f:
            assert dataset in f, dataset
            assert f[dataset].shape == dims, (dataset, f[dataset].shape, dims)
        n_items += 1
    print(n_items)


if __name__ == "__main__":
    if sys.argv[1] == "dataset":
        path, name = sys.argv[2], sys.argv[3]
        ny, nx, j, i = (int(a) for a in sys.argv[4:8])
        check_dataset(path, name, ny, nx, j, i, float(sys.argv[8]))
    elif sys.argv[1] == "boundary":
        path, name = sys.argv[2], sys.argv[3]
        n_faces, face_id = (int(a) for a in sys.argv[4:6])
        check_boundary(path, name, n_faces, face_id, float(sys.argv[6]))
    elif sys.argv[1] == "xdmf":
        check_xdmf(sys.argv[2])
    else:
        sys.exit("unknown command " + sys.argv[1])

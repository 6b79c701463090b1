"""Opening a case for the report: the reader for its format, the files it is
made of (for checksums), its blocks (walls and volume) and its arrays.

Everything here asks ParaView for information gathered over all MPI ranks
(data information, the block hierarchy), never for one rank's piece, so the
answers are the same under `mpirun`.
"""
import fnmatch
import hashlib
import os
import xml.etree.ElementTree as ET

__all__ = ["CaseError", "open_case", "case_files", "Block", "blocks_of", "select_blocks", "arrays_of",
           "describe_arrays"]


class CaseError(Exception):
    """A case that cannot be reported (exit code 1 for that case)."""


#: Extensions read with a reader set up here (the others go to OpenDataFile).
CGNS_EXTENSIONS = (".cgns", ".cgn", ".adf", ".hdf")
EXODUS_EXTENSIONS = (".exo", ".e", ".ex2", ".exii", ".g", ".gen")
XML_COMPOSITES = (".vtm", ".vtmb", ".vtpc", ".pvd")


def _all(proxy, name):
    """Every entry a reader offers for a selection property."""
    prop = proxy.GetProperty(name)
    available = getattr(prop, "Available", None)
    return list(available) if available else []


def open_case(simple, path):
    """A reader proxy for `path` with every array, block, patch and side set
    enabled.  Raises CaseError when the file is missing, unreadable or of a
    format ParaView does not open."""
    if not os.path.exists(path):
        raise CaseError("case file %s not found" % path)
    if os.path.isdir(path):
        raise CaseError("case %s is a folder, not a file" % path)
    if not os.access(path, os.R_OK):
        raise CaseError("case file %s cannot be read (permissions)" % path)
    ext = os.path.splitext(path)[1].lower()
    if ext in CGNS_EXTENSIONS:
        reader = simple.CGNSSeriesReader(FileNames=[path])
        reader.UpdatePipelineInformation()
        reader.LoadPatches = 1        # boundary patches as their own blocks: the walls
        reader.LoadMesh = 1
        for name in ("Bases", "PointArrayStatus", "CellArrayStatus", "FaceArrayStatus"):
            setattr(reader, name, _all(reader, name))
        return reader, "CGNS (CGNSSeriesReader, patches loaded)"
    if ext in EXODUS_EXTENSIONS:
        reader = simple.ExodusIIReader(FileName=[path])
        reader.UpdatePipelineInformation()
        # Element blocks (the volume), side sets (the walls) and every variable.
        for name in ("ElementBlocks", "SideSetArrayStatus", "PointVariables", "ElementVariables",
                     "SideSetResultArrayStatus"):
            setattr(reader, name, _all(reader, name))
        return reader, "Exodus II (ExodusIIReader, side sets loaded)"
    try:
        reader = simple.OpenDataFile(path)
    except Exception as exc:  # ParaView raises when no reader takes the file
        if "No reader found" in str(exc):
            reader = None
        else:
            raise CaseError("case file %s cannot be opened: %s" % (path, exc)) from None
    if reader is None:
        raise CaseError("case file %s: no ParaView reader for files ending in '%s'" % (path, ext or path))
    return reader, "%s (%s)" % (_format_name(ext), reader.GetXMLName())


def _format_name(ext):
    return {".vtm": "VTK XML multiblock", ".vtp": "VTK XML polydata", ".vtu": "VTK XML unstructured grid",
            ".pvd": "ParaView data collection", ".vtpc": "VTK XML partitioned collection",
            ".vtk": "VTK legacy"}.get(ext, "file")


# ---------------------------------------------------------------------------
# Files and checksums
# ---------------------------------------------------------------------------

def _referenced(path):
    """Files named by a VTK XML composite (file="..." attributes), recursively."""
    ext = os.path.splitext(path)[1].lower()
    if ext not in XML_COMPOSITES:
        return []
    try:
        root = ET.parse(path).getroot()
    except (ET.ParseError, OSError):
        return []
    base = os.path.dirname(path)
    out = []
    for node in root.iter():
        name = node.get("file")
        if name:
            full = os.path.normpath(os.path.join(base, name))
            if os.path.isfile(full) and full not in out:
                out.append(full)
                out.extend(f for f in _referenced(full) if f not in out)
    return out


def _sha256(path):
    h = hashlib.sha256()
    with open(path, "rb") as handle:
        for chunk in iter(lambda: handle.read(1 << 20), b""):
            h.update(chunk)
    return h.hexdigest()


def case_files(path):
    """[{path, bytes, sha256}] of the case file and every file it references,
    and one combined sha256 over (relative path, sha256) of them all."""
    files = [os.path.abspath(path)] + _referenced(os.path.abspath(path))
    base = os.path.dirname(os.path.abspath(path))
    entries, combined = [], hashlib.sha256()
    for f in files:
        digest = _sha256(f)
        rel = os.path.relpath(f, base)
        entries.append({"path": f, "bytes": os.path.getsize(f), "sha256": digest})
        combined.update(("%s\0%s\n" % (rel, digest)).encode())
    return entries, combined.hexdigest()


# ---------------------------------------------------------------------------
# Blocks
# ---------------------------------------------------------------------------

class Block:
    """One leaf of the case: its name (label), label path, selector path, the
    highest cell dimension found on any rank (-1: empty) and its cell count."""

    def __init__(self, name, path, selector, dimension, cells):
        self.name, self.path, self.selector = name, path, selector
        self.dimension, self.cells = dimension, cells

    @property
    def kind(self):
        return {3: "volume", 2: "surface", 1: "lines", 0: "points"}.get(self.dimension, "empty")

    def __repr__(self):
        return "Block(%r, %s, %d cells)" % (self.path, self.kind, self.cells)


_PROBE = """
import builtins
from vtkmodules.vtkCommonCore import vtkIntArray
from vtkmodules.vtkCommonDataModel import vtkCellTypes, vtkDataObjectTree, vtkPolyData, vtkUnstructuredGrid

def dimension(ds):
    if ds is None or ds.GetNumberOfCells() == 0:
        return -1
    if isinstance(ds, vtkPolyData):
        if ds.GetNumberOfPolys() + ds.GetNumberOfStrips():
            return 2
        return 1 if ds.GetNumberOfLines() else 0
    if isinstance(ds, vtkUnstructuredGrid):
        types = ds.GetDistinctCellTypesArray()
        return builtins.max([vtkCellTypes.GetDimension(int(types.GetValue(i)))
                             for i in range(types.GetNumberOfTuples())] or [-1])
    return ds.GetCell(0).GetCellDimension()

def tag(ds, index):
    a = vtkIntArray()
    a.SetName("__wallloads_dimension_%d" % index)
    a.InsertNextValue(dimension(ds))
    ds.GetFieldData().AddArray(a)

inp = self.GetInputDataObject(0, 0)
out = self.GetOutputDataObject(0)
out.ShallowCopy(inp)
if isinstance(out, vtkDataObjectTree):
    it = out.NewTreeIterator()
    it.VisitOnlyLeavesOn()
    it.SkipEmptyNodesOn()
    it.InitTraversal()
    while not it.IsDoneWithTraversal():
        leaf = it.GetCurrentDataObject()
        copy = leaf.NewInstance()
        copy.ShallowCopy(leaf)
        tag(copy, it.GetCurrentFlatIndex())
        out.SetDataSet(it, copy)
        it.GoToNextItem()
else:
    tag(out, 0)
"""


def blocks_of(simple, reader, time):
    """The leaves of the case with their kind, from information gathered over all ranks."""
    probe = simple.ProgrammableFilter(Input=reader)
    probe.Script = _PROBE
    probe.CopyArrays = 0
    probe.UpdatePipeline(time)
    info = probe.GetDataInformation().DataInformation
    dims = {}
    fields = info.GetFieldDataInformation()
    for i in range(fields.GetNumberOfArrays()):
        a = fields.GetArrayInformation(i)
        name = a.GetName()
        if name.startswith("__wallloads_dimension_"):
            dims[int(name.rsplit("_", 1)[1])] = int(a.GetComponentRange(0)[1])
    blocks = []
    if not info.IsCompositeDataSet():
        blocks.append(Block(os.path.basename(reader.GetProperty("FileName")[0]
                                             if reader.GetProperty("FileName") else "dataset"),
                            "", None, dims.get(0, -1), info.GetNumberOfCells()))
        simple.Delete(probe)
        return blocks
    h = info.GetHierarchy()
    for node in [0] + list(h.GetChildNodes(0, True)):
        ids = list(h.GetDataSetIndices(node, False))
        if not ids or h.GetNumberOfChildren(node) > 0:
            continue
        labels, n = [], node
        while n > 0:
            labels.append(h.GetAttributeOrDefault(n, "label", h.GetNodeName(n)))
            n = h.GetParent(n)
        labels.reverse()
        name = labels[-1] if labels else h.GetAttributeOrDefault(0, "label", "root")
        sub = probe.SMProxy.GetSubsetDataInformation(0, h.GetNodePath(node), "Hierarchy")
        cells = sub.GetNumberOfCells() if sub is not None else 0
        # A partitioned dataset (in a .vtpc) is one dataset id whose partitions
        # are the leaves that follow it in flat order.
        parts = int(h.GetAttributeOrDefault(node, "number_of_partitions", 0))
        dim = max([dims.get(fid + k, -1) for fid in ids for k in range(parts + 1)] or [-1])
        blocks.append(Block(name, "/".join(labels), h.GetNodePath(node), dim, cells))
    simple.Delete(probe)
    return blocks


def describe_blocks(blocks):
    return ", ".join("'%s' (%s, %d cells)" % (b.path or b.name, b.kind, b.cells) for b in blocks)


def select_blocks(blocks, patterns):
    """(walls, volumes, notes) for the wall patterns (names or globs matched
    against a block's name and its path); empty patterns: every surface block.

    Raises CaseError for a pattern that matches no block (the blocks listed),
    or when no surface block is left."""
    surfaces = [b for b in blocks if b.dimension == 2]
    volumes = [b for b in blocks if b.dimension == 3]
    notes = []
    if not patterns:
        walls = surfaces
        if volumes and walls:
            notes.append("walls not selected: every surface block is taken as a wall (%s); name the "
                         "walls with walls.blocks / --walls" % ", ".join("'%s'" % (b.path or b.name)
                                                                          for b in walls))
    else:
        walls = []
        for pattern in patterns:
            hits = [b for b in blocks if fnmatch.fnmatchcase(b.name, pattern)
                    or (b.path and fnmatch.fnmatchcase(b.path, pattern))]
            if not hits:
                raise CaseError("wall block '%s' not found; the case has the blocks %s"
                                % (pattern, describe_blocks(blocks)))
            for b in hits:
                if b.dimension != 2:
                    if b.name == pattern or b.path == pattern:
                        raise CaseError("block '%s' holds %s cells, not wall faces; the surface blocks "
                                        "are %s" % (pattern, b.kind,
                                                    describe_blocks(surfaces) or "none"))
                    notes.append("block '%s' matched '%s' but holds %s cells: left out of the walls"
                                 % (b.path or b.name, pattern, b.kind))
                elif b not in walls:
                    walls.append(b)
    if not walls:
        raise CaseError("the case has no wall faces (no block with surface cells): its blocks are %s"
                        % describe_blocks(blocks))
    return walls, volumes, notes


# ---------------------------------------------------------------------------
# Arrays
# ---------------------------------------------------------------------------

_FLOAT_TYPES = (10, 11)  # VTK_FLOAT, VTK_DOUBLE


def arrays_of(proxy):
    """[(association 'CELLS'|'POINTS', name, components, floating, partial)] of a
    proxy's output (gathered over ranks and blocks), cell data first."""
    info = proxy.GetDataInformation().DataInformation
    out = []
    for assoc, attr in (("CELLS", info.GetCellDataInformation()), ("POINTS", info.GetPointDataInformation())):
        for i in range(attr.GetNumberOfArrays()):
            a = attr.GetArrayInformation(i)
            name = a.GetName()
            if name.startswith("vtk") or name.startswith("__wallloads"):
                continue
            out.append((assoc, name, a.GetNumberOfComponents(), a.GetDataType() in _FLOAT_TYPES,
                        bool(a.GetIsPartial())))
    return out


def describe_arrays(arrays):
    if not arrays:
        return "no arrays"
    parts = []
    for assoc in ("CELLS", "POINTS"):
        names = ["%s (%d)" % (n, c) for a, n, c, f, p in arrays if a == assoc]
        if names:
            parts.append("%s: %s" % ("cell" if assoc == "CELLS" else "point", ", ".join(names)))
    return "; ".join(parts)


def find_array(arrays, name, components, what, where="the walls"):
    """(association, name) of a named array with the right width, or CaseError
    naming it and listing the arrays that exist."""
    hits = [a for a in arrays if a[1] == name]
    if not hits:
        raise CaseError("%s array '%s' not found on %s; they have %s"
                        % (what, name, where, describe_arrays(arrays)))
    good = [a for a in hits if a[2] == components]
    if not good:
        raise CaseError("%s array '%s' has %d components, %d expected; %s have %s"
                        % (what, name, hits[0][2], components, where, describe_arrays(arrays)))
    return good[0][0], good[0][1]


def pick_array(arrays, components, hint, floating=True):
    """The first array (cell data first, whole arrays before partial ones) with
    `components` components whose name contains `hint` (case-insensitive), else
    the first with that width; None when there is none."""
    fits = [a for a in arrays if a[2] == components and (a[3] or not floating)]
    fits.sort(key=lambda a: a[4])   # arrays on every block first (stable)
    named = [a for a in fits if hint and hint in a[1].lower()]
    best = named[0] if named else (fits[0] if fits else None)
    return None if best is None else (best[0], best[1])

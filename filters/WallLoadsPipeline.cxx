// SPDX-License-Identifier: BSD-3-Clause
#include "WallLoadsPipeline.h"
#include "WallLoadsMeshCache.h"

#include "vtkAlgorithm.h"
#include "vtkCellData.h"
#include "vtkCommunicator.h"
#include "vtkCompositeDataSet.h"
#include "vtkDataObjectTree.h"
#include "vtkDataObjectTreeIterator.h"
#include "vtkDataSetAttributes.h"
#include "vtkDoubleArray.h"
#include "vtkFieldData.h"
#include "vtkFloatArray.h"
#include "vtkInformation.h"
#include "vtkMultiProcessController.h"
#include "vtkPartitionedDataSet.h"
#include "vtkPartitionedDataSetCollection.h"
#include "vtkPointData.h"
#include "vtkPoints.h"
#include "vtkPolyData.h"
#include "vtkSMPTools.h"
#include "vtkUnsignedCharArray.h"
#include "vtkIdTypeArray.h"
#include "vtkUnstructuredGrid.h"

#include <algorithm>
#include <atomic>
#include <sstream>

namespace wallloads
{

bool IsUnsetArrayName(const char* name)
{
  if (name == nullptr)
  {
    return true;
  }
  const std::string s(name);
  return s.empty() || s == "None" || s == "(none)";
}

const unsigned char* CellGhostMask(vtkDataSet* ds)
{
  vtkUnsignedCharArray* ghosts = ds->GetCellData()->GetGhostArray();
  if (!ghosts || ghosts->GetNumberOfTuples() != ds->GetNumberOfCells())
  {
    return nullptr;
  }
  return ghosts->GetPointer(0);
}

ArrayView MakeArrayView(vtkDataArray* array, bool onPoints)
{
  ArrayView view;
  if (!array)
  {
    return view;
  }
  view.NumComponents = array->GetNumberOfComponents();
  view.OnPoints = onPoints;
  if (auto* d = vtkDoubleArray::FastDownCast(array))
  {
    view.Data = d->GetPointer(0);
  }
  else if (auto* f = vtkFloatArray::FastDownCast(array))
  {
    view.Data = f->GetPointer(0);
    view.IsFloat = true;
  }
  else
  {
    // Integer or implicit arrays: one conversion, then the same fast path.
    auto copy = vtkSmartPointer<vtkDoubleArray>::New();
    copy->DeepCopy(array);
    view.Holder = copy;
    view.Data = copy->GetPointer(0);
  }
  return view;
}

std::string DescribeArrays(vtkDataSet* ds)
{
  std::ostringstream os;
  auto list = [&os](vtkDataSetAttributes* attrs) {
    bool first = true;
    for (int i = 0; i < attrs->GetNumberOfArrays(); ++i)
    {
      vtkAbstractArray* a = attrs->GetAbstractArray(i);
      if (!a || !a->GetName() || std::string(a->GetName()) == vtkDataSetAttributes::GhostArrayName())
      {
        continue;
      }
      os << (first ? "" : ", ") << "'" << a->GetName() << "' (" << a->GetNumberOfComponents()
         << ")";
      first = false;
    }
    if (first)
    {
      os << "none";
    }
  };
  os << "cell arrays: ";
  list(ds->GetCellData());
  os << "; point arrays: ";
  list(ds->GetPointData());
  return os.str();
}

vtkDataArray* FindSelectedArray(vtkDataSet* ds, const ArraySelection& sel, int wantComponents,
  const std::string& role, const std::string& blockName, std::string& error)
{
  vtkDataSetAttributes* attrs =
    sel.OnPoints ? static_cast<vtkDataSetAttributes*>(ds->GetPointData()) : ds->GetCellData();
  const char* kind = sel.OnPoints ? "point" : "cell";
  vtkAbstractArray* abstract = attrs->GetAbstractArray(sel.Name.c_str());
  vtkDataArray* array = vtkDataArray::SafeDownCast(abstract);
  std::ostringstream os;
  const std::string where = blockName.empty() ? std::string() : " on block '" + blockName + "'";
  os << role << " array '" << sel.Name << "'" << where;
  if (!abstract)
  {
    // Say so when the array exists with the other association.
    vtkDataSetAttributes* other =
      sel.OnPoints ? static_cast<vtkDataSetAttributes*>(ds->GetCellData()) : ds->GetPointData();
    os << " not found in " << kind << " data";
    if (other->GetAbstractArray(sel.Name.c_str()))
    {
      os << " (it exists in " << (sel.OnPoints ? "cell" : "point") << " data)";
    }
    os << "; available " << DescribeArrays(ds) << ".";
    error = os.str();
    return nullptr;
  }
  if (!array)
  {
    os << " is a " << abstract->GetClassName() << ", not numeric; available "
       << DescribeArrays(ds) << ".";
    error = os.str();
    return nullptr;
  }
  if (wantComponents > 0 && array->GetNumberOfComponents() != wantComponents)
  {
    os << " has " << array->GetNumberOfComponents() << " components; " << wantComponents
       << " expected.";
    error = os.str();
    return nullptr;
  }
  const vtkIdType expected = sel.OnPoints ? ds->GetNumberOfPoints() : ds->GetNumberOfCells();
  if (array->GetNumberOfTuples() != expected)
  {
    os << " holds " << array->GetNumberOfTuples() << " values for " << expected << " "
       << kind << "s; one per " << kind << " expected.";
    error = os.str();
    return nullptr;
  }
  return array;
}

bool CheckGhostArrays(vtkDataSet* ds, const std::string& blockName, std::string& error)
{
  const std::string where = blockName.empty() ? std::string() : " on block '" + blockName + "'";
  for (int onPoints = 0; onPoints < 2; ++onPoints)
  {
    vtkDataSetAttributes* attrs = onPoints ? static_cast<vtkDataSetAttributes*>(ds->GetPointData())
                                           : static_cast<vtkDataSetAttributes*>(ds->GetCellData());
    vtkAbstractArray* a = attrs->GetAbstractArray(vtkDataSetAttributes::GhostArrayName());
    if (!a)
    {
      continue;
    }
    const vtkIdType expected = onPoints ? ds->GetNumberOfPoints() : ds->GetNumberOfCells();
    std::ostringstream os;
    if (!vtkUnsignedCharArray::SafeDownCast(a) || a->GetNumberOfComponents() != 1)
    {
      os << "The " << (onPoints ? "point" : "cell") << " ghost array '"
         << vtkDataSetAttributes::GhostArrayName() << "'" << where << " is a "
         << a->GetClassName() << " of " << a->GetNumberOfComponents()
         << " components; VTK expects unsigned char, 1 component.";
    }
    else if (a->GetNumberOfTuples() != expected)
    {
      os << "The " << (onPoints ? "point" : "cell") << " ghost array '"
         << vtkDataSetAttributes::GhostArrayName() << "'" << where << " holds "
         << a->GetNumberOfTuples() << " values for " << expected << " "
         << (onPoints ? "points" : "cells") << ".";
    }
    if (!os.str().empty())
    {
      error = os.str();
      return false;
    }
  }
  return true;
}

namespace
{
/// Offsets of a cell array: from 0, never decreasing, ending at the
/// connectivity's size (VTK reads them unchecked).
template <typename A>
bool OffsetsWellFormed(A* offsets, vtkIdType connectivitySize)
{
  const vtkIdType n = offsets ? offsets->GetNumberOfValues() : 0;
  if (n == 0)
  {
    return connectivitySize == 0;
  }
  const auto* o = offsets->GetPointer(0);
  if (o[0] != 0 || static_cast<vtkIdType>(o[n - 1]) != connectivitySize)
  {
    return false;
  }
  // Non-decreasing: every offset against the one before it, threaded, with
  // no early exit in the inner loop (which then vectorizes): this runs on
  // every execution, before any cell is read.
  std::atomic<bool> decreasing(false);
  vtkSMPTools::For(1, n, [&](vtkIdType begin, vtkIdType end) {
    bool down = false;
    for (vtkIdType i = begin; i < end; ++i)
    {
      down |= o[i] < o[i - 1];
    }
    if (down)
    {
      decreasing = true;
    }
  });
  return !decreasing;
}

bool CellArrayWellFormed(vtkCellArray* cells)
{
  if (!cells)
  {
    return true;
  }
  const vtkIdType size = cells->GetConnectivityArray()->GetNumberOfValues();
  return cells->IsStorage64Bit() ? OffsetsWellFormed(cells->GetOffsetsArray64(), size)
                                 : OffsetsWellFormed(cells->GetOffsetsArray32(), size);
}
} // namespace

bool CheckPointIds(
  vtkDataSet* ds, const std::string& blockName, std::string& error, ValidatedCells* validated)
{
  const std::string of = blockName.empty() ? std::string() : " of block '" + blockName + "'";
  std::vector<vtkCellArray*> arrays;
  if (auto* pd = vtkPolyData::SafeDownCast(ds))
  {
    arrays = { pd->GetVerts(), pd->GetLines(), pd->GetPolys(), pd->GetStrips() };
  }
  else if (auto* ug = vtkUnstructuredGrid::SafeDownCast(ds))
  {
    arrays = { ug->GetCells() };
    vtkUnsignedCharArray* types = ug->GetCellTypesArray();
    const vtkIdType numTypes = types ? types->GetNumberOfValues() : 0;
    if (ug->GetCells() && numTypes != ug->GetCells()->GetNumberOfCells())
    {
      error = "The cell types array" + of + " holds " + std::to_string(numTypes) +
        " cell types for " + std::to_string(ug->GetCells()->GetNumberOfCells()) + " cells.";
      return false;
    }
  }
  for (vtkCellArray* cells : arrays)
  {
    if (validated && validated->Known(ds, cells))
    {
      continue;
    }
    if (CellArrayWellFormed(cells))
    {
      if (validated)
      {
        validated->Remember(ds, cells);
      }
    }
    else
    {
      error = "The cells" + of +
        " are malformed: their offsets do not run from 0 up to the size of the connectivity (" +
        std::to_string(cells->GetConnectivityArray()->GetNumberOfValues()) + " point ids).";
      return false;
    }
  }
  const vtkIdType numPoints = ds->GetNumberOfPoints();
  vtkIdType lo = 0, hi = -1;
  auto scan = [&](vtkDataArray* ids) {
    if (!ids || ids->GetNumberOfValues() == 0)
    {
      return;
    }
    double range[2];
    ids->GetRange(range, 0);
    lo = std::min(lo, static_cast<vtkIdType>(range[0]));
    hi = std::max(hi, static_cast<vtkIdType>(range[1]));
  };
  if (auto* pd = vtkPolyData::SafeDownCast(ds))
  {
    for (vtkCellArray* cells : { pd->GetVerts(), pd->GetLines(), pd->GetPolys(), pd->GetStrips() })
    {
      scan(cells ? cells->GetConnectivityArray() : nullptr);
    }
  }
  else if (auto* ug = vtkUnstructuredGrid::SafeDownCast(ds))
  {
    scan(ug->GetCells() ? ug->GetCells()->GetConnectivityArray() : nullptr);
    if (vtkIdTypeArray* faces = ug->GetFaces())
    {
      // The face stream holds counts and ids: check the ids only.
      const vtkIdType n = faces->GetNumberOfValues();
      const vtkIdType* f = faces->GetPointer(0);
      for (vtkIdType i = 0; i < n;)
      {
        const vtkIdType nfaces = f[i++];
        for (vtkIdType k = 0; k < nfaces && i < n; ++k)
        {
          const vtkIdType m = f[i++];
          for (vtkIdType j = 0; j < m && i < n; ++j, ++i)
          {
            lo = std::min(lo, f[i]);
            hi = std::max(hi, f[i]);
          }
        }
      }
    }
  }
  if (lo >= 0 && hi < numPoints)
  {
    return true;
  }
  std::ostringstream os;
  os << "Cells" << (blockName.empty() ? std::string() : " of block '" + blockName + "'")
     << " refer to point " << (lo < 0 ? lo : hi) << ", but there are " << numPoints
     << " points (ids 0 to " << numPoints - 1 << ").";
  error = os.str();
  return false;
}

ArraySelection SelectedArray(vtkAlgorithm* alg, int index)
{
  ArraySelection sel;
  vtkInformation* info = alg->GetInputArrayInformation(index);
  if (!info || !info->Has(vtkDataObject::FIELD_NAME()) ||
    IsUnsetArrayName(info->Get(vtkDataObject::FIELD_NAME())))
  {
    return sel;
  }
  sel.Name = info->Get(vtkDataObject::FIELD_NAME());
  sel.OnPoints = info->Has(vtkDataObject::FIELD_ASSOCIATION()) &&
    info->Get(vtkDataObject::FIELD_ASSOCIATION()) == vtkDataObject::FIELD_ASSOCIATION_POINTS;
  return sel;
}

std::string LeafName(vtkDataObjectTreeIterator* it)
{
  if (it->HasCurrentMetaData() && it->GetCurrentMetaData()->Has(vtkCompositeDataSet::NAME()))
  {
    const std::string name = it->GetCurrentMetaData()->Get(vtkCompositeDataSet::NAME());
    if (!name.empty())
    {
      return name;
    }
  }
  return "#" + std::to_string(it->GetCurrentFlatIndex());
}

double* NewCellDoubleArray(vtkDataSet* out, const char* name, int components)
{
  auto a = vtkSmartPointer<vtkDoubleArray>::New();
  a->SetName(name);
  a->SetNumberOfComponents(components);
  a->SetNumberOfTuples(out->GetNumberOfCells());
  out->GetCellData()->AddArray(a);
  return a->GetPointer(0);
}

PointView MakePointView(vtkDataSet* ds)
{
  PointView view;
  vtkPointSet* ps = vtkPointSet::SafeDownCast(ds);
  if (!ps || !ps->GetPoints())
  {
    return view;
  }
  vtkDataArray* data = ps->GetPoints()->GetData();
  if (auto* d = vtkDoubleArray::FastDownCast(data))
  {
    view.Data = d->GetPointer(0);
  }
  else if (auto* f = vtkFloatArray::FastDownCast(data))
  {
    view.Data = f->GetPointer(0);
    view.IsFloat = true;
  }
  else
  {
    auto copy = vtkSmartPointer<vtkDoubleArray>::New();
    copy->DeepCopy(data);
    view.Holder = copy;
    view.Data = copy->GetPointer(0);
  }
  return view;
}

namespace
{
vtkCellArray* FaceCells(vtkDataSet* ds)
{
  if (auto* pd = vtkPolyData::SafeDownCast(ds))
  {
    return pd->GetPolys();
  }
  if (auto* ug = vtkUnstructuredGrid::SafeDownCast(ds))
  {
    return ug->GetCells();
  }
  return nullptr;
}

template <typename I>
bool FillFrom(vtkCellArray* cells, FaceTopology<I>& topology);

template <>
bool FillFrom<vtkTypeInt32>(vtkCellArray* cells, FaceTopology<vtkTypeInt32>& topology)
{
  if (cells->IsStorage64Bit())
  {
    return false;
  }
  topology.Offsets = cells->GetOffsetsArray32()->GetPointer(0);
  topology.Connectivity = cells->GetConnectivityArray32()->GetPointer(0);
  return true;
}

template <>
bool FillFrom<vtkTypeInt64>(vtkCellArray* cells, FaceTopology<vtkTypeInt64>& topology)
{
  if (!cells->IsStorage64Bit())
  {
    return false;
  }
  topology.Offsets = cells->GetOffsetsArray64()->GetPointer(0);
  topology.Connectivity = cells->GetConnectivityArray64()->GetPointer(0);
  return true;
}
} // namespace

bool FacesUse64BitIds(vtkDataSet* ds)
{
  vtkCellArray* cells = FaceCells(ds);
  return cells && cells->IsStorage64Bit();
}

template <typename I>
bool MakeFaceTopology(vtkDataSet* ds, FaceTopology<I>& topology)
{
  vtkCellArray* cells = FaceCells(ds);
  if (!cells || !FillFrom<I>(cells, topology))
  {
    return false;
  }
  if (auto* pd = vtkPolyData::SafeDownCast(ds))
  {
    topology.FirstCell = pd->GetNumberOfVerts() + pd->GetNumberOfLines();
    topology.NumPolys = pd->GetNumberOfPolys();
    topology.Types = nullptr;
  }
  else
  {
    auto* ug = vtkUnstructuredGrid::SafeDownCast(ds);
    topology.Types = ug->GetCellTypesArray()->GetPointer(0);
  }
  return true;
}
template bool MakeFaceTopology<vtkTypeInt32>(vtkDataSet*, FaceTopology<vtkTypeInt32>&);
template bool MakeFaceTopology<vtkTypeInt64>(vtkDataSet*, FaceTopology<vtkTypeInt64>&);

namespace
{
std::string MetaName(vtkInformation* info)
{
  if (info && info->Has(vtkCompositeDataSet::NAME()))
  {
    return info->Get(vtkCompositeDataSet::NAME());
  }
  return std::string();
}
} // namespace

void ListLeaves(vtkDataObject* input, std::vector<Leaf>& leaves, std::vector<std::string>& regions)
{
  leaves.clear();
  regions.clear();
  if (auto* ds = vtkDataSet::SafeDownCast(input))
  {
    leaves.push_back({ ds, std::string(), 0 });
    regions.emplace_back("Surface");
    return;
  }
  if (auto* pdc = vtkPartitionedDataSetCollection::SafeDownCast(input))
  {
    // Ranks may hold different numbers of partitions: regions are the
    // partitioned datasets, which every rank lists alike.
    for (unsigned int i = 0; i < pdc->GetNumberOfPartitionedDataSets(); ++i)
    {
      std::string name = MetaName(pdc->HasMetaData(i) ? pdc->GetMetaData(i) : nullptr);
      if (name.empty())
      {
        name = "Block " + std::to_string(i);
      }
      regions.push_back(name);
      vtkPartitionedDataSet* pds = pdc->GetPartitionedDataSet(i);
      for (unsigned int j = 0; pds && j < pds->GetNumberOfPartitions(); ++j)
      {
        leaves.push_back({ pds->GetPartition(j), name, static_cast<int>(i) });
      }
    }
    return;
  }
  if (auto* pds = vtkPartitionedDataSet::SafeDownCast(input))
  {
    regions.emplace_back("Surface");
    for (unsigned int j = 0; j < pds->GetNumberOfPartitions(); ++j)
    {
      leaves.push_back({ pds->GetPartition(j), std::string(), 0 });
    }
    return;
  }
  if (auto* tree = vtkDataObjectTree::SafeDownCast(input))
  {
    vtkSmartPointer<vtkDataObjectTreeIterator> it;
    it.TakeReference(tree->NewTreeIterator());
    it->SkipEmptyNodesOff();
    it->VisitOnlyLeavesOn();
    it->TraverseSubTreeOn();
    int index = 0;
    for (it->InitTraversal(); !it->IsDoneWithTraversal(); it->GoToNextItem())
    {
      std::string name = MetaName(it->HasCurrentMetaData() ? it->GetCurrentMetaData() : nullptr);
      if (name.empty())
      {
        name = "Block " + std::to_string(it->GetCurrentFlatIndex());
      }
      regions.push_back(name);
      leaves.push_back({ vtkDataSet::SafeDownCast(it->GetCurrentDataObject()), name, index });
      ++index;
    }
  }
}

namespace
{
void Reduce(double* values, int count, int op)
{
  vtkMultiProcessController* controller = vtkMultiProcessController::GetGlobalController();
  if (!controller || controller->GetNumberOfProcesses() < 2 || count == 0)
  {
    return;
  }
  std::vector<double> local(values, values + count);
  controller->AllReduce(local.data(), values, count, op);
}
} // namespace

void GlobalSum(double* values, int count)
{
  Reduce(values, count, vtkCommunicator::SUM_OP);
}
void GlobalMin(double* values, int count)
{
  Reduce(values, count, vtkCommunicator::MIN_OP);
}
void GlobalMax(double* values, int count)
{
  Reduce(values, count, vtkCommunicator::MAX_OP);
}

int ProcessRank()
{
  vtkMultiProcessController* controller = vtkMultiProcessController::GetGlobalController();
  return controller ? controller->GetLocalProcessId() : 0;
}

int ProcessCount()
{
  vtkMultiProcessController* controller = vtkMultiProcessController::GetGlobalController();
  return controller ? controller->GetNumberOfProcesses() : 1;
}

void ReportAgreedFailure(vtkObject* self, const std::string& localError)
{
  if (!localError.empty())
  {
    vtkErrorWithObjectMacro(self, << localError);
  }
  else if (ProcessRank() == 0)
  {
    vtkErrorWithObjectMacro(self, "Bad input on another rank (see its message); no output.");
  }
}

void SetFieldValue(vtkFieldData* fd, const char* name, const double* values, int numComponents)
{
  auto array = vtkSmartPointer<vtkDoubleArray>::New();
  array->SetName(name);
  array->SetNumberOfComponents(numComponents);
  array->SetNumberOfTuples(1);
  for (int c = 0; c < numComponents; ++c)
  {
    array->SetValue(c, values[c]);
  }
  fd->AddArray(array);
}

} // namespace wallloads

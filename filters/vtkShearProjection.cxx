// SPDX-License-Identifier: BSD-3-Clause
#include "vtkShearProjection.h"

#include "WallAdjacency.h"
#include "WallLoadsColumns.h"
#include "WallLoadsDefaults.h"
#include "WallLoadsPipeline.h"
#include "WallShearFaces.h"

#include "vtkCellData.h"
#include "vtkDataSetAttributes.h"
#include "vtkDoubleArray.h"
#include "vtkCellTypes.h"
#include "vtkCompositeDataSet.h"
#include "vtkDataAssembly.h"
#include "vtkDataAssemblyUtilities.h"
#include "vtkDataObjectTree.h"
#include "vtkDataObjectTreeIterator.h"
#include "vtkIdList.h"
#include "vtkInformation.h"
#include "vtkInformationVector.h"
#include "vtkIntArray.h"
#include "vtkMultiBlockDataSet.h"
#include "vtkObjectFactory.h"
#include "vtkPointData.h"
#include "vtkPointSet.h"
#include "vtkPoints.h"
#include "vtkPolyData.h"
#include "vtkSmartPointer.h"
#include "vtkUnstructuredGrid.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <set>
#include <sstream>
#include <vector>

vtkStandardNewMacro(vtkShearProjection);

namespace
{
using namespace wallloads;

/// Faces per chunk of the face loop: progress and abort are checked between chunks.
constexpr vtkIdType ChunkFaces = 32768;

/// Whether a dataset holds a 3-D cell.
bool HasVolumeCells(vtkDataSet* ds)
{
  if (!ds)
  {
    return false;
  }
  if (auto* ug = vtkUnstructuredGrid::SafeDownCast(ds))
  {
    const vtkIdType n = ug->GetNumberOfCells();
    const unsigned char* types = n > 0 ? ug->GetCellTypesArray()->GetPointer(0) : nullptr;
    for (vtkIdType c = 0; c < n; ++c)
    {
      if (vtkCellTypes::GetDimension(types[c]) == 3)
      {
        return true;
      }
    }
    return false;
  }
  for (vtkIdType c = 0; c < ds->GetNumberOfCells(); ++c)
  {
    if (vtkCellTypes::GetDimension(static_cast<unsigned char>(ds->GetCellType(c))) == 3)
    {
      return true;
    }
  }
  return false;
}

/// The first 3-component numeric array of the first volume block that has
/// one, cell data before point data; unset if none.
ArraySelection FirstVector(const std::vector<vtkDataSet*>& volume)
{
  ArraySelection sel;
  for (vtkDataSet* ds : volume)
  {
    for (int onPoints = 0; onPoints < 2; ++onPoints)
    {
      vtkDataSetAttributes* attrs = onPoints
        ? static_cast<vtkDataSetAttributes*>(ds->GetPointData())
        : static_cast<vtkDataSetAttributes*>(ds->GetCellData());
      for (int i = 0; i < attrs->GetNumberOfArrays(); ++i)
      {
        vtkDataArray* a = attrs->GetArray(i);
        if (a && a->GetName() && a->GetNumberOfComponents() == 3 &&
          std::string(a->GetName()) != vtkDataSetAttributes::GhostArrayName())
        {
          sel.Name = a->GetName();
          sel.OnPoints = onPoints == 1;
          return sel;
        }
      }
    }
  }
  return sel;
}

/// Whether a volume block has an array of this name (cell or point data).
bool HasArrayNamed(const std::vector<vtkDataSet*>& volume, const std::string& name)
{
  for (vtkDataSet* ds : volume)
  {
    if (ds->GetCellData()->GetAbstractArray(name.c_str()) ||
      ds->GetPointData()->GetAbstractArray(name.c_str()))
    {
      return true;
    }
  }
  return false;
}

/// Absolute rounding of a dataset's coordinates: eps of the point type times the largest one.
double CoordinateRounding(vtkDataSet* ds)
{
  double bounds[6];
  ds->GetBounds(bounds);
  double reach = 0;
  for (double b : bounds)
  {
    reach = std::max(reach, std::isfinite(b) ? std::abs(b) : 0.0);
  }
  auto* ps = vtkPointSet::SafeDownCast(ds);
  const bool isFloat = ps && ps->GetPoints() && ps->GetPoints()->GetDataType() == VTK_FLOAT;
  return (isFloat ? std::numeric_limits<float>::epsilon() : std::numeric_limits<double>::epsilon()) *
    reach;
}

/// A wall dataset of the output.
struct WallBlock
{
  vtkSmartPointer<vtkDataSet> Out;
  std::string Name;
  int BoundaryOf = -1; ///< volume block whose boundary it is, or -1
  ArrayView WallVelocity;
};

/// The leaves of a composite input chosen by data-assembly selectors, in
/// flat (composite index) order, with their names.
void SelectedLeaves(vtkDataObject* input, const std::vector<std::string>& selectors,
  const char* assemblyName, std::vector<std::pair<vtkDataSet*, std::string>>& leaves,
  std::vector<unsigned int>& ids)
{
  auto* cds = vtkCompositeDataSet::SafeDownCast(input);
  if (!cds)
  {
    return;
  }
  vtkSmartPointer<vtkDataAssembly> assembly;
  const std::string name = assemblyName ? assemblyName : "";
  if (!name.empty() && name != vtkDataAssemblyUtilities::HierarchyName())
  {
    assembly = vtkDataAssemblyUtilities::GetDataAssembly(name.c_str(), cds);
  }
  if (!assembly)
  {
    assembly = vtkSmartPointer<vtkDataAssembly>::New();
    vtkDataAssemblyUtilities::GenerateHierarchy(cds, assembly);
  }
  ids = vtkDataAssemblyUtilities::GetSelectedCompositeIds(selectors, assembly, nullptr, true);
  const std::set<unsigned int> chosen(ids.begin(), ids.end());
  auto* tree = vtkDataObjectTree::SafeDownCast(input);
  if (!tree)
  {
    return;
  }
  vtkSmartPointer<vtkDataObjectTreeIterator> it;
  it.TakeReference(tree->NewTreeIterator());
  it->SkipEmptyNodesOff();
  it->VisitOnlyLeavesOn();
  it->TraverseSubTreeOn();
  for (it->InitTraversal(); !it->IsDoneWithTraversal(); it->GoToNextItem())
  {
    if (chosen.count(it->GetCurrentFlatIndex()))
    {
      leaves.emplace_back(vtkDataSet::SafeDownCast(it->GetCurrentDataObject()), LeafName(it));
    }
  }
}

/// The boundary faces of a volume block as an output dataset: the cached
/// geometry with the volume's point data and each face's adjacent-cell data.
vtkSmartPointer<vtkPolyData> BoundaryOutput(const VolumeBlock& vb)
{
  const WallAdjacency::Block& adj = *vb.Adjacency;
  auto pd = vtkSmartPointer<vtkPolyData>::New();
  pd->ShallowCopy(adj.Surface);
  const vtkIdType np = static_cast<vtkIdType>(adj.SurfacePointIds.size());
  const vtkIdType nf = adj.NumberOfFaces();
  auto from = vtkSmartPointer<vtkIdList>::New();
  from->SetNumberOfIds(np);
  std::copy(adj.SurfacePointIds.begin(), adj.SurfacePointIds.end(), from->GetPointer(0));
  pd->GetPointData()->CopyAllocate(vb.Data->GetPointData(), np);
  pd->GetPointData()->CopyData(vb.Data->GetPointData(), from.Get(), vtkIdType(0));
  from->SetNumberOfIds(nf);
  for (vtkIdType f = 0; f < nf; ++f)
  {
    from->SetId(f, adj.WallCellId[adj.FaceWallCell[f]]);
  }
  pd->GetCellData()->CopyAllocate(vb.Data->GetCellData(), nf);
  pd->GetCellData()->CopyData(vb.Data->GetCellData(), from.Get(), vtkIdType(0));
  return pd;
}
} // namespace

namespace
{
/// What one execution gathers before the face loop. Every check only
/// records the first problem in Error; the ranks agree on the outcome with
/// one collective before any of them fails.
struct Execution
{
  ShearSettings S;
  std::string Error;
  std::vector<Leaf> Leaves;
  std::vector<vtkDataSet*> VolumeLeaves;
  std::vector<std::string> VolumeNames;
  std::set<vtkDataSet*> PatchLeaves;
  double SurfaceCells = 0;
  std::vector<VolumeBlock> Volume;
  std::vector<WallBlock> Walls;
  std::vector<std::string> PatchNames;

  void Fail(const std::string& message)
  {
    if (this->Error.empty())
    {
      this->Error = message;
    }
  }
};

/// Sort the input's leaves into volume blocks and patches, after checking
/// each (before VTK is asked anything about its cells: a short ghost array
/// crashes VTK's structured cell types); pick the default velocity; fetch
/// and check the volume arrays.
void CollectVolume(Execution& x, vtkDataObject* volumeIn)
{
  std::vector<std::string> regionNames; // not used: volume blocks are not regions
  ListLeaves(volumeIn, x.Leaves, regionNames);
  for (const Leaf& leaf : x.Leaves)
  {
    if (!leaf.Data)
    {
      continue;
    }
    std::string leafError;
    if (!CheckGhostArrays(leaf.Data, leaf.Name, leafError) ||
      !CheckPointIds(leaf.Data, leaf.Name, leafError))
    {
      x.Fail(leafError);
      continue;
    }
    if (HasVolumeCells(leaf.Data))
    {
      x.VolumeLeaves.push_back(leaf.Data);
      x.VolumeNames.push_back(leaf.Name);
    }
    else
    {
      x.PatchLeaves.insert(leaf.Data);
      x.SurfaceCells += static_cast<double>(leaf.Data->GetNumberOfCells());
    }
  }
  ShearSettings& s = x.S;
  // ParaView fills the name with "0" when the proxy is created before its
  // input has data (its array list is empty then): not an array, unset.
  if (s.Velocity.Name == "0" && !HasArrayNamed(x.VolumeLeaves, s.Velocity.Name))
  {
    s.Velocity = ArraySelection();
  }
  if (!s.Velocity.Set())
  {
    // The default: the first 3-component array of the volume, cell data
    // first (what the panel preselects; a script may create the filter
    // before its input has data, when nothing can be preselected).
    s.Velocity = FirstVector(x.VolumeLeaves);
    if (!s.Velocity.Set() && !x.VolumeLeaves.empty())
    {
      x.Fail("Shear Projection needs a Velocity array (3 components) on the volume; the volume "
             "has none: " +
        DescribeArrays(x.VolumeLeaves.front()) + ".");
    }
  }
  for (std::size_t i = 0; i < x.VolumeLeaves.size(); ++i)
  {
    VolumeBlock vb;
    vb.Data = x.VolumeLeaves[i];
    vb.Name = x.VolumeNames[i];
    vb.Rounding = CoordinateRounding(vb.Data);
    auto fetch = [&](const ArraySelection& sel, int comps, const char* role, ArrayView& view) {
      if (!sel.Set())
      {
        return;
      }
      std::string arrayError;
      vtkDataArray* a = FindSelectedArray(vb.Data, sel, comps, role, vb.Name, arrayError);
      if (!a)
      {
        x.Fail(arrayError);
      }
      view = MakeArrayView(a, sel.OnPoints);
    };
    fetch(s.Velocity, 3, "Velocity", vb.Velocity);
    fetch(s.Gradient, 9, "Velocity Gradient", vb.Gradient);
    fetch(s.Viscosity, 1, "Viscosity Array", vb.Viscosity);
    fetch(s.TurbulentViscosity, 1, "Turbulent Viscosity Array", vb.TurbulentViscosity);
    fetch(s.Density, 1, "Density Array", vb.Density);
    x.Volume.push_back(vb);
  }
}

/// The Walls input, copied into the output.
void WallsFromInput(Execution& x, vtkDataObject* wallsIn, vtkDataObject* output)
{
  auto* tree = vtkDataObjectTree::SafeDownCast(wallsIn);
  if (!tree)
  {
    WallBlock wb;
    wb.Out = vtkDataSet::SafeDownCast(output);
    wb.Out->ShallowCopy(wallsIn);
    wb.Name = "walls";
    x.Walls.push_back(wb);
    return;
  }
  auto* outTree = vtkDataObjectTree::SafeDownCast(output);
  outTree->CopyStructure(tree);
  vtkSmartPointer<vtkDataObjectTreeIterator> it;
  it.TakeReference(tree->NewTreeIterator());
  it->VisitOnlyLeavesOn();
  it->TraverseSubTreeOn();
  for (it->InitTraversal(); !it->IsDoneWithTraversal(); it->GoToNextItem())
  {
    auto* leaf = vtkDataSet::SafeDownCast(it->GetCurrentDataObject());
    if (!leaf)
    {
      continue;
    }
    WallBlock wb;
    wb.Out.TakeReference(leaf->NewInstance());
    wb.Out->ShallowCopy(leaf);
    outTree->SetDataSet(it, wb.Out);
    wb.Name = LeafName(it);
    x.Walls.push_back(wb);
  }
}

/// The patch blocks of the input chosen by Wall Blocks, as output blocks.
void WallsFromBlocks(Execution& x, vtkDataObject* volumeIn, vtkDataObject* output,
  const std::vector<std::string>& selectors, const char* assembly)
{
  std::vector<std::pair<vtkDataSet*, std::string>> chosen;
  std::vector<unsigned int> ids;
  SelectedLeaves(volumeIn, selectors, assembly, chosen, ids);
  auto* mb = vtkMultiBlockDataSet::SafeDownCast(output);
  if (!mb || ids.empty())
  {
    std::ostringstream os;
    os << "Wall Blocks selects no block of the input (";
    for (std::size_t i = 0; i < selectors.size(); ++i)
    {
      os << (i ? ", " : "") << "'" << selectors[i] << "'";
    }
    os << "); pick the wall patches among the input's blocks.";
    x.Fail(os.str());
    return;
  }
  for (std::size_t i = 0; i < chosen.size(); ++i)
  {
    WallBlock wb;
    vtkDataSet* leaf = chosen[i].first;
    if (leaf && !x.PatchLeaves.count(leaf))
    {
      if (std::find(x.VolumeLeaves.begin(), x.VolumeLeaves.end(), leaf) == x.VolumeLeaves.end())
      {
        continue; // failed its checks (already reported)
      }
      x.Fail("Wall Blocks selects block '" + chosen[i].second +
        "', which holds 3-D cells (the volume); select its wall patches instead.");
    }
    if (leaf)
    {
      wb.Out.TakeReference(leaf->NewInstance());
      wb.Out->ShallowCopy(leaf);
    }
    else
    {
      wb.Out = vtkSmartPointer<vtkPolyData>::New(); // held by another rank
    }
    wb.Name = chosen[i].second;
    mb->SetBlock(static_cast<unsigned int>(i), wb.Out);
    mb->GetMetaData(static_cast<unsigned int>(i))->Set(vtkCompositeDataSet::NAME(), wb.Name);
    x.Walls.push_back(wb);
  }
}

/// The boundary of every volume block, as output blocks (or the output).
void WallsFromBoundary(Execution& x, vtkDataObject* output)
{
  auto* mb = vtkMultiBlockDataSet::SafeDownCast(output);
  for (std::size_t i = 0; i < x.Volume.size(); ++i)
  {
    WallBlock wb;
    auto pd = BoundaryOutput(x.Volume[i]);
    wb.Name = x.Volume[i].Name.empty() ? std::string("boundary") : x.Volume[i].Name + " boundary";
    wb.BoundaryOf = static_cast<int>(i);
    if (mb)
    {
      mb->SetBlock(static_cast<unsigned int>(i), pd);
      mb->GetMetaData(static_cast<unsigned int>(i))->Set(vtkCompositeDataSet::NAME(), wb.Name);
      wb.Out = pd;
    }
    else
    {
      vtkPolyData::SafeDownCast(output)->ShallowCopy(pd);
      wb.Out = vtkDataSet::SafeDownCast(output);
    }
    x.Walls.push_back(wb);
  }
  for (const Leaf& leaf : x.Leaves)
  {
    if (leaf.Data && x.PatchLeaves.count(leaf.Data) && leaf.Data->GetNumberOfCells() > 0)
    {
      x.PatchNames.push_back(leaf.Name);
    }
  }
}

/// Check every wall block and its wall velocity (before any rank may fail).
void CheckWalls(Execution& x)
{
  for (WallBlock& wb : x.Walls)
  {
    std::string wallError;
    if (!CheckGhostArrays(wb.Out, wb.Name, wallError) || !CheckPointIds(wb.Out, wb.Name, wallError))
    {
      x.Fail(wallError);
    }
    else if (x.S.WallVelocity.Set() && wb.Out->GetNumberOfCells() > 0)
    {
      vtkDataArray* a =
        FindSelectedArray(wb.Out, x.S.WallVelocity, 3, "Wall Velocity", wb.Name, wallError);
      if (!a)
      {
        x.Fail(wallError);
      }
      wb.WallVelocity = MakeArrayView(a, x.S.WallVelocity.OnPoints);
    }
  }
}

/// The output arrays of one wall dataset, allocated, with their units
/// (names and units from WallLoadsColumns.h, the list the help shows).
void AddOutputArrays(vtkDataSet* out)
{
  for (const columns::NamedUnit& a : columns::ShearArrays)
  {
    vtkSmartPointer<vtkDataArray> array;
    if (std::string(a.Name) == "Near-Wall Regime")
    {
      array = vtkSmartPointer<vtkIntArray>::New();
    }
    else
    {
      array = vtkSmartPointer<vtkDoubleArray>::New();
    }
    array->SetName(a.Name);
    array->SetNumberOfComponents(a.Components);
    array->SetNumberOfTuples(out->GetNumberOfCells());
    SetUnits(array, a.Unit);
    out->GetCellData()->AddArray(array);
  }
}

/// The warnings of one execution, from the counts summed over the ranks
/// (`global`, with the unsupported cells last) on rank 0; a rank holding
/// unmatched faces names its blocks.
void Report(vtkObject* self, const Execution& x, const double* global, const ShearCounts& local,
  const std::vector<double>& unmatchedPerBlock, bool defaultWalls)
{
  auto count = [global](int i) { return static_cast<vtkIdType>(global[i]); };
  const bool root = ProcessRank() == 0;
  if (root && defaultWalls)
  {
    std::ostringstream os;
    os << "Shear Projection: no walls chosen, so all " << count(ShearCounts::Faces)
       << " boundary faces of the volume are taken as walls (outer boundary, inlets and outlets "
          "included). Connect the wall surfaces to Walls";
    if (!x.PatchNames.empty())
    {
      os << ", or pick the wall patches in Wall Blocks (patch blocks of the input:";
      for (std::size_t i = 0; i < x.PatchNames.size() && i < 12; ++i)
      {
        os << (i ? ", '" : " '") << x.PatchNames[i] << "'";
      }
      os << (x.PatchNames.size() > 12 ? ", ...)" : ")");
    }
    os << ".";
    vtkWarningWithObjectMacro(self, << os.str());
  }
  if (root && global[ShearCounts::Planar] > 0)
  {
    vtkWarningWithObjectMacro(self, "Shear Projection: the neighbours of "
        << count(ShearCounts::Planar) << " of " << count(ShearCounts::Faces)
        << " wall faces span only a plane (a mesh one cell thick, as 2-D cases are stored): "
           "their gradient was taken in that plane, with derivatives across it set to zero.");
  }
  if (root &&
    global[ShearCounts::FitTooFewSamples] + global[ShearCounts::FitIllConditioned] +
        global[ShearCounts::FitNoSecondDistance] >
      0)
  {
    vtkWarningWithObjectMacro(self,
      "Shear Projection: the wall fit used the near-wall difference (first order) on "
        << count(ShearCounts::FitTooFewSamples)
        << " faces whose adjacent cell has fewer neighbours than a quadratic needs, "
        << count(ShearCounts::FitNoSecondDistance)
        << " faces with no neighbour at a second distance from the wall (one layer of cells), "
           "and "
        << count(ShearCounts::FitIllConditioned)
        << " faces whose neighbours do not determine a quadratic.");
  }
  if (root &&
    global[ShearCounts::NotFaces] + global[ShearCounts::Degenerate] +
        global[ShearCounts::Interfaces] >
      0)
  {
    vtkWarningWithObjectMacro(self, "Shear Projection: "
        << count(ShearCounts::NotFaces) << " wall cells that are not faces (vertices, lines), "
        << count(ShearCounts::Degenerate) << " degenerate wall faces (zero area) and "
        << count(ShearCounts::Interfaces)
        << " faces shared by two volume blocks (interfaces, not walls) carry NaN.");
  }
  if (global[ShearCounts::Unmatched] > 0 && (root || local.N[ShearCounts::Unmatched] > 0))
  {
    std::ostringstream where;
    for (std::size_t w = 0; w < x.Walls.size(); ++w)
    {
      if (unmatchedPerBlock[w] > 0)
      {
        where << " " << static_cast<vtkIdType>(unmatchedPerBlock[w]) << " of "
              << x.Walls[w].Out->GetNumberOfCells() << " faces of '" << x.Walls[w].Name << "'";
      }
    }
    vtkWarningWithObjectMacro(self, "Shear Projection: "
        << count(ShearCounts::Unmatched) << " of " << count(ShearCounts::Faces)
        << " wall faces match no boundary face of the volume (walls that do not touch it, or "
           "held by another rank) and carry NaN."
        << where.str());
  }
  if (root && global[ShearCounts::OffWall] + global[ShearCounts::Failed] > 0)
  {
    vtkWarningWithObjectMacro(self, "Shear Projection: "
        << count(ShearCounts::OffWall)
        << " faces whose adjacent cell centre is not off the wall (degenerate cells) and "
        << count(ShearCounts::Failed)
        << " faces whose reconstruction failed (values not finite) carry NaN.");
  }
  if (root && global[ShearCounts::BadDensity] > 0)
  {
    vtkWarningWithObjectMacro(self, "Shear Projection: Density Array '"
        << x.S.Density.Name << "' is not positive at the adjacent cell of "
        << count(ShearCounts::BadDensity)
        << " wall faces; they carry NaN shear, friction velocity and y+.");
  }
  if (root && global[ShearCounts::Size] > 0)
  {
    vtkWarningWithObjectMacro(self, "Shear Projection: "
        << count(ShearCounts::Size)
        << " 3-D cells of a kind without faces (convex point sets) were ignored.");
  }
  if (root && global[ShearCounts::NotComputed] > 0)
  {
    vtkWarningWithObjectMacro(self, "Shear Projection was aborted: "
        << count(ShearCounts::NotComputed) << " wall faces were not computed and carry NaN.");
  }
}
} // namespace

struct vtkShearProjection::AdjacencyCache
{
  WallAdjacency Blocks;
  std::vector<WallFaceCache> Walls; ///< per output wall dataset, in order
  std::string GradientNoted;        ///< the gradient array the user was warned about
};

//------------------------------------------------------------------------------
vtkShearProjection::vtkShearProjection()
  : Cache(new AdjacencyCache)
{
  this->SetNumberOfInputPorts(2);
  this->SetWallBlockAssembly(vtkDataAssemblyUtilities::HierarchyName());
  for (int i = VELOCITY_ARRAY; i <= DENSITY_ARRAY; ++i)
  {
    this->SetInputArrayToProcess(
      i, i == WALL_VELOCITY_ARRAY ? 1 : 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "");
  }
}

vtkShearProjection::~vtkShearProjection()
{
  this->SetWallBlockAssembly(nullptr);
}

void vtkShearProjection::AddWallBlockSelector(const char* selector)
{
  if (selector && *selector)
  {
    this->WallBlockSelectors.emplace_back(selector);
    this->Modified();
  }
}

void vtkShearProjection::ClearWallBlockSelectors()
{
  if (!this->WallBlockSelectors.empty())
  {
    this->WallBlockSelectors.clear();
    this->Modified();
  }
}

int vtkShearProjection::GetNumberOfWallBlockSelectors() const
{
  return static_cast<int>(this->WallBlockSelectors.size());
}

const char* vtkShearProjection::GetWallBlockSelector(int i) const
{
  return i >= 0 && i < this->GetNumberOfWallBlockSelectors() ? this->WallBlockSelectors[i].c_str()
                                                             : nullptr;
}

//------------------------------------------------------------------------------
int vtkShearProjection::FillInputPortInformation(int port, vtkInformation* info)
{
  info->Remove(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE());
  if (port == 0)
  {
    info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkDataSet");
    info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkDataObjectTree");
  }
  else
  {
    info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkPolyData");
    info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkUnstructuredGrid");
    info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkDataObjectTree");
    info->Set(vtkAlgorithm::INPUT_IS_OPTIONAL(), 1);
  }
  return 1;
}

//------------------------------------------------------------------------------
int vtkShearProjection::RequestDataObject(
  vtkInformation*, vtkInformationVector** inputVector, vtkInformationVector* outputVector)
{
  vtkDataObject* volume = vtkDataObject::GetData(inputVector[0], 0);
  vtkDataObject* walls =
    inputVector[1]->GetNumberOfInformationObjects() ? vtkDataObject::GetData(inputVector[1], 0) : nullptr;
  if (!volume)
  {
    return 0;
  }
  vtkInformation* info = outputVector->GetInformationObject(0);
  vtkDataObject* current = vtkDataObject::GetData(info);
  vtkSmartPointer<vtkDataObject> wanted;
  if (walls)
  {
    if (!current || !current->IsA(walls->GetClassName()))
    {
      wanted.TakeReference(walls->NewInstance());
    }
  }
  else if (vtkDataObjectTree::SafeDownCast(volume))
  {
    if (!vtkMultiBlockDataSet::SafeDownCast(current))
    {
      wanted = vtkSmartPointer<vtkMultiBlockDataSet>::New();
    }
  }
  else if (!vtkPolyData::SafeDownCast(current))
  {
    wanted = vtkSmartPointer<vtkPolyData>::New();
  }
  if (wanted)
  {
    info->Set(vtkDataObject::DATA_OBJECT(), wanted);
  }
  return 1;
}

//------------------------------------------------------------------------------
int vtkShearProjection::RequestData(
  vtkInformation*, vtkInformationVector** inputVector, vtkInformationVector* outputVector)
{
  vtkDataObject* volumeIn = vtkDataObject::GetData(inputVector[0], 0);
  vtkDataObject* wallsIn =
    inputVector[1]->GetNumberOfInformationObjects() ? vtkDataObject::GetData(inputVector[1], 0) : nullptr;
  vtkDataObject* output = vtkDataObject::GetData(outputVector, 0);

  // Fetch: the properties, the volume blocks and their arrays.
  Execution x;
  ShearSettings& s = x.S;
  s.Velocity = SelectedArray(this, VELOCITY_ARRAY);
  s.WallVelocity = SelectedArray(this, WALL_VELOCITY_ARRAY);
  s.Gradient = SelectedArray(this, VELOCITY_GRADIENT_ARRAY);
  s.Viscosity = SelectedArray(this, VISCOSITY_ARRAY);
  s.TurbulentViscosity = SelectedArray(this, TURBULENT_VISCOSITY_ARRAY);
  s.Density = SelectedArray(this, DENSITY_ARRAY);
  s.Method = this->Method;
  s.ViscosityValue = this->Viscosity;
  s.Kinematic = this->ViscosityKind == 1;
  s.DensityValue = this->Density;
  s.Kappa = this->WallLawKappa;
  s.B = this->WallLawB;
  if (!s.Density.Set() && !(this->Density > 0 && std::isfinite(this->Density)))
  {
    std::ostringstream os;
    os << "Density is " << this->Density
       << " kg/m^3; it must be positive (it divides the friction velocity and y+).";
    x.Fail(os.str());
  }
  if (!(this->Viscosity >= 0 && std::isfinite(this->Viscosity)))
  {
    std::ostringstream os;
    os << "Viscosity is " << this->Viscosity << "; it must not be negative.";
    x.Fail(os.str());
  }
  CollectVolume(x, volumeIn);
  this->UpdateProgress(0.05);

  // The adjacency of every volume block (cached while the geometry holds).
  WallAdjacency& adjacency = this->Cache->Blocks;
  double volumeCells = 0, unsupportedCells = 0;
  this->NumberOfAdjacencyBuilds += adjacency.Update(x.VolumeLeaves);
  for (std::size_t i = 0; i < x.Volume.size(); ++i)
  {
    x.Volume[i].Adjacency = &adjacency[i];
    volumeCells += static_cast<double>(adjacency[i].NumVolumeCells);
    unsupportedCells += static_cast<double>(adjacency[i].NumUnsupported);
  }
  this->UpdateProgress(0.3);

  // The wall datasets of the output: the Walls input, the chosen patch
  // blocks, or the boundary of every volume block; then validate them.
  const bool byBlocks = !wallsIn && !this->WallBlockSelectors.empty();
  if (wallsIn)
  {
    WallsFromInput(x, wallsIn, output);
  }
  else if (byBlocks)
  {
    WallsFromBlocks(x, volumeIn, output, this->WallBlockSelectors, this->WallBlockAssembly);
  }
  else
  {
    WallsFromBoundary(x, output);
  }
  CheckWalls(x);

  // One collective: the outcome of every check, and what the ranks hold.
  double agreed[3] = { x.Error.empty() ? 0.0 : 1.0, volumeCells, x.SurfaceCells };
  GlobalSum(agreed, 3);
  if (agreed[0] > 0)
  {
    ReportAgreedFailure(this, x.Error);
    output->Initialize();
    return 0;
  }
  if (agreed[1] == 0)
  {
    if (ProcessRank() == 0 && agreed[2] > 0)
    {
      vtkErrorMacro("Shear Projection needs the fluid volume (3-D cells) on Input; it holds "
        << static_cast<vtkIdType>(agreed[2])
        << " surface cells and no 3-D cell. Connect the volume to Input and the wall surfaces "
           "to Walls.");
    }
    else if (ProcessRank() == 0)
    {
      vtkErrorMacro("Shear Projection's Input holds no 3-D cells (no volume): nothing to project.");
    }
    output->Initialize();
    return 0;
  }

  // Dispatch: the per-face loop, in chunks (progress, abort).
  ShearCounts counts;
  std::vector<double> unmatchedPerBlock(x.Walls.size(), 0);
  vtkIdType totalFaces = 0, doneFaces = 0;
  for (const WallBlock& wb : x.Walls)
  {
    totalFaces += wb.Out->GetNumberOfCells();
  }
  this->Cache->Walls.resize(x.Walls.size());
  for (std::size_t w = 0; w < x.Walls.size(); ++w)
  {
    const WallBlock& wb = x.Walls[w];
    vtkDataSet* out = wb.Out;
    const vtkIdType nf = out->GetNumberOfCells();
    AddOutputArrays(out);
    ShearCounts blockCounts;
    WallFaceCache& faces = this->Cache->Walls[w];
    if (!this->GetAbortExecute())
    {
      PrepareWallFaces(s, x.Volume, adjacency, out, wb.BoundaryOf, faces);
    }
    for (vtkIdType begin = 0; begin < nf; begin += ChunkFaces)
    {
      const vtkIdType end = std::min(nf, begin + ChunkFaces);
      if (this->GetAbortExecute())
      {
        // Faces not computed carry NaN and are reported.
        MarkWallFacesNotComputed(out, begin, end);
        blockCounts.N[ShearCounts::NotComputed] += static_cast<double>(end - begin);
        continue;
      }
      ComputeWallFaces(s, x.Volume, out, wb.WallVelocity, faces, begin, end, blockCounts);
      doneFaces += end - begin;
      this->UpdateProgress(0.3 + 0.7 * static_cast<double>(doneFaces) /
          static_cast<double>(std::max<vtkIdType>(totalFaces, 1)));
    }
    unmatchedPerBlock[w] = blockCounts.N[ShearCounts::Unmatched];
    counts.Add(blockCounts);
  }

  // Attach: the reports, from counts summed over the ranks.
  double global[ShearCounts::Size + 1];
  std::copy(counts.N, counts.N + ShearCounts::Size, global);
  global[ShearCounts::Size] = unsupportedCells;
  GlobalSum(global, ShearCounts::Size + 1);
  Report(this, x, global, counts, unmatchedPerBlock, !wallsIn && !byBlocks);
  if (ProcessRank() == 0 && s.Method == GRADIENT_TENSOR && s.Gradient.Set() &&
    this->Cache->GradientNoted != s.Gradient.Name)
  {
    this->Cache->GradientNoted = s.Gradient.Name; // said once per filter and array
    vtkWarningMacro("Shear Projection: Velocity Gradient '"
      << s.Gradient.Name
      << "' is taken from the volume at each wall cell's centre. A gradient computed without the "
         "wall (e.g. by a gradient filter on the volume) is not a wall gradient and underestimates "
         "the wall shear on coarse near-wall cells (by up to half; see README). Wall fit (second "
         "order, with no slip at the wall) or Velocity Gradient = None (a least-squares gradient "
         "with the wall) include the wall.");
  }
  this->UpdateProgress(1.0);
  return 1;
}

//------------------------------------------------------------------------------
void vtkShearProjection::PrintSelf(ostream& os, vtkIndent indent)
{
  this->Superclass::PrintSelf(os, indent);
  os << indent << "Method: " << this->Method << "\n";
  os << indent << "Viscosity: " << this->Viscosity << "\n";
  os << indent << "ViscosityKind: " << this->ViscosityKind << "\n";
  os << indent << "Density: " << this->Density << "\n";
  os << indent << "WallLawKappa: " << this->WallLawKappa << "\n";
  os << indent << "WallLawB: " << this->WallLawB << "\n";
  os << indent << "WallBlockAssembly: "
     << (this->WallBlockAssembly ? this->WallBlockAssembly : "(none)") << "\n";
  for (const std::string& sel : this->WallBlockSelectors)
  {
    os << indent << "WallBlockSelector: " << sel << "\n";
  }
}

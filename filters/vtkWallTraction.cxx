// SPDX-License-Identifier: BSD-3-Clause
#include "vtkWallTraction.h"

#include "WallLoadsColumns.h"
#include "WallLoadsDefaults.h"
#include "WallLoadsMeshCache.h"
#include "WallLoadsPipeline.h"
#include "WallTractionFaces.h"
#include "wallloads/CompensatedSum.h"
#include "wallloads/EdgeBalance.h"
#include "wallloads/FaceGeometry.h"
#include "wallloads/OrientationCheck.h"
#include "wallloads/Traction.h"

#include "vtkCellData.h"
#include "vtkDataObjectTree.h"
#include "vtkDataObjectTreeIterator.h"
#include "vtkDataSet.h"
#include "vtkDoubleArray.h"
#include "vtkFieldData.h"
#include "vtkIdTypeArray.h"
#include "vtkInformation.h"
#include "vtkInformationVector.h"
#include "vtkObjectFactory.h"
#include "vtkPolyData.h"
#include "vtkUnstructuredGrid.h"
#include "vtkSMPThreadLocal.h"
#include "vtkSMPTools.h"
#include "vtkSmartPointer.h"

#include <cmath>
#include <cstdint>
#include <limits>
#include <sstream>
#include <vector>

vtkStandardNewMacro(vtkWallTraction);

// The automatic choices (WallLoadsDefaults) speak this class's codes.
static_assert(wallloads::ShearNone == vtkWallTraction::NO_SHEAR &&
    wallloads::ShearFromStressArray == vtkWallTraction::WALL_SHEAR_STRESS &&
    wallloads::ShearVelocityGradient == vtkWallTraction::VELOCITY_GRADIENT &&
    wallloads::OrientationStoredIntoWall == vtkWallTraction::STORED_INTO_WALL &&
    wallloads::OrientationWallNormalArray == vtkWallTraction::WALL_NORMAL_ARRAY,
  "WallLoadsDefaults.h codes");

namespace
{
using namespace wallloads;
using namespace wallloads::traction;

/// The per-face output arrays of a leaf, added to it: reused from the pool
/// when only the pool holds them (WallLoadsMeshCache.h), else new.
Outputs MakeOutputs(const Settings& s, vtkDataSet* out, const LeafCache& cache)
{
  double bytes = 0;     // of all output arrays
  bool aligned = true; // every one 64-byte aligned (StreamOutputs)
  auto NewCellDoubleArray = [&](vtkDataSet* ds, const char* name, int components) -> double* {
    double* data = nullptr;
    if (!cache.Pool)
    {
      data = wallloads::NewCellDoubleArray(ds, name, components);
    }
    else
    {
      vtkSmartPointer<vtkDoubleArray> a =
        cache.Pool->Get(cache.Slot, name, components, ds->GetNumberOfCells());
      ds->GetCellData()->AddArray(a);
      data = a->GetPointer(0);
    }
    bytes += 8.0 * components * static_cast<double>(ds->GetNumberOfCells());
    aligned = aligned && reinterpret_cast<std::uintptr_t>(data) % 64 == 0;
    return data;
  };
  Outputs o;
  o.Full = s.AllArrays;
  o.Area = NewCellDoubleArray(out, names::FaceArea, 1);
  o.ForceP = NewCellDoubleArray(out, names::PressureForce, 3);
  o.ForceV = NewCellDoubleArray(out, names::ViscousForce, 3);
  if (o.Full)
  {
    o.Normal = NewCellDoubleArray(out, names::WallNormal, 3);
    o.TractionP = NewCellDoubleArray(out, names::PressureTraction, 3);
    o.TractionV = NewCellDoubleArray(out, names::ViscousTraction, 3);
    o.Traction = NewCellDoubleArray(out, names::Traction, 3);
    o.Force = NewCellDoubleArray(out, names::Force, 3);
    o.NormalV = NewCellDoubleArray(out, names::NormalViscousStress, 1);
    o.Directional = NewCellDoubleArray(out, names::DirectionalTraction, 1);
  }
  if (s.DynamicPressure > 0 && o.Full)
  {
    o.Cp = NewCellDoubleArray(out, names::PressureCoefficient, 1);
    if (s.ShearSource != vtkWallTraction::NO_SHEAR)
    {
      o.Cf = NewCellDoubleArray(out, names::SkinFrictionCoefficient, 1);
    }
  }
  o.Stream = StreamOutputs(bytes, aligned);
  return o;
}

/// Process one leaf; returns false with `error` set on bad input.
bool ProcessLeaf(const Settings& s, vtkDataSet* in, vtkDataSet* out, const std::string& blockName,
  Tally& tally, std::string& error, const LeafCache& cache)
{
  if (!CheckGhostArrays(in, blockName, error))
  {
    return false;
  }
  if (in->GetNumberOfCells() == 0)
  {
    // An empty piece (common on some ranks) needs no arrays; it gets the
    // output arrays, empty, so that every piece has the same arrays.
    MakeOutputs(s, out, cache);
    return true;
  }
  if (!vtkPolyData::SafeDownCast(in) && !vtkUnstructuredGrid::SafeDownCast(in))
  {
    error = "Wall Traction takes polydata or unstructured grids of 2D cells; block '" +
      blockName + "' is a " + in->GetClassName() + ".";
    return false;
  }
  if (!CheckPointIds(in, blockName, error, cache.Cells))
  {
    return false;
  }
  Inputs inputs;
  auto fetch = [&](const ArraySelection& sel, int comps, const char* role, ArrayView& view) {
    if (!sel.Set())
    {
      return true;
    }
    vtkDataArray* a = FindSelectedArray(in, sel, comps, role, blockName, error);
    view = MakeArrayView(a, sel.OnPoints);
    return a != nullptr;
  };
  const bool gradient = s.ShearSource == vtkWallTraction::VELOCITY_GRADIENT;
  // Roles are the panel labels, so that messages point at the right field.
  if (!fetch(s.Pressure, 1, "Pressure", inputs.Pressure) ||
    !fetch(s.DensityArray, 1, "Density Array", inputs.Density) ||
    (s.ShearSource == vtkWallTraction::WALL_SHEAR_STRESS &&
      !fetch(s.ShearStressArray, 3, "Wall Shear Stress", inputs.Shear)) ||
    (gradient && !fetch(s.VelocityGradient, 9, "Velocity Gradient", inputs.Gradient)) ||
    (gradient && !fetch(s.ViscosityArray, 1, "Viscosity Array", inputs.Viscosity)) ||
    (gradient &&
      !fetch(s.TurbulentViscosity, 1, "Turbulent Viscosity Array", inputs.TurbulentViscosity)))
  {
    return false;
  }
  if (s.Orientation == vtkWallTraction::WALL_NORMAL_ARRAY)
  {
    ArraySelection normal{ names::WallNormal, false };
    if (!fetch(normal, 3, "Wall Normal (Orientation = Use Wall Normal array)", inputs.WallNormal))
    {
      return false;
    }
  }
  inputs.Points = MakePointView(in);
  inputs.Ghosts = CellGhostMask(in);

  const Outputs o = MakeOutputs(s, out, cache);
  if (!inputs.Points.Data)
  {
    // Cells without points (and so without point ids): nothing is a face;
    // every per-face value is NaN, as for any skipped face.
    for (const columns::NamedUnit& u : columns::FaceArrays)
    {
      vtkDataArray* a = out->GetCellData()->GetArray(u.Name);
      if (a && a != in->GetCellData()->GetArray(u.Name))
      {
        a->Fill(std::numeric_limits<double>::quiet_NaN());
      }
    }
    tally.NonSurface += static_cast<double>(in->GetNumberOfCells());
    return true;
  }
  LoadSums<double> loads;
  DispatchFaces(in, inputs.Points.IsFloat, [&](auto id, auto pt) {
    RunFaces<decltype(id), decltype(pt)>(s, inputs, o, in, tally, cache,
      inputs.WallNormal.Valid() ? in->GetCellData()->GetArray(names::WallNormal) : nullptr,
      loads);
  });
  vtkCellData* cd = out->GetCellData();
  HandOverLoadSums(out, cd->GetArray(names::PressureForce), cd->GetArray(names::ViscousForce),
    cd->GetArray(names::FaceArea), loads);
  return true;
}

void AddCount(vtkFieldData* fd, const char* name, double value)
{
  auto a = vtkSmartPointer<vtkIdTypeArray>::New();
  a->SetName(name);
  a->SetNumberOfTuples(1);
  a->SetValue(0, static_cast<vtkIdType>(value));
  SetUnits(a, columns::UnitOf(name));
  fd->AddArray(a);
}

void AddFieldValue(vtkFieldData* fd, const char* name, const double* values, int components)
{
  SetFieldValue(fd, name, values, components);
  SetUnits(fd->GetAbstractArray(name), columns::UnitOf(name));
}

/// Units on the per-face arrays this filter made (never on the input's).
void AttachFaceUnits(vtkDataSet* out, vtkDataSet* in)
{
  for (const columns::NamedUnit& u : columns::FaceArrays)
  {
    vtkAbstractArray* a = out->GetCellData()->GetAbstractArray(u.Name);
    if (a && a != in->GetCellData()->GetAbstractArray(u.Name))
    {
      SetUnits(a, u.Unit);
    }
  }
}

/// The warnings and notices of a finished execution, on rank 0.
void Report(vtkWallTraction* self, const Settings& s, const double* global,
  const std::vector<std::string>& passed, const std::string& notice)
{
  if (ProcessRank() != 0)
  {
    return;
  }
  std::ostringstream info;
  info << notice;
  if (global[11] > 0)
  {
    info << static_cast<vtkIdType>(global[11]) << " cells in blocks without 2D cells passed "
         << "through untouched (volume, lines or points: no wall faces)"
         << (passed.empty() ? std::string(" on other ranks") : ": " + QuotedList(passed, 12))
         << ".";
  }
  Notice(self, info.str());
  if (!s.Pressure.Set() && s.ShearSource == vtkWallTraction::NO_SHEAR && global[8] > 0)
  {
    vtkWarningWithObjectMacro(self,
      "Wall Traction has no load source: Pressure is "
        << (self->GetPressureKind() == vtkWallTraction::NO_PRESSURE ? "off (Pressure Kind None)"
                                                                     : "None")
        << " and Shear Source is None, so every traction and force is zero. Choose a Pressure "
           "array and a Shear Source.");
  }
}
} // namespace

/// Mesh results and output arrays kept between executions.
struct vtkWallTraction::Internals
{
  wallloads::MeshResultCache Results;
  wallloads::OutputArrayPool Pool;
  wallloads::ValidatedCells Cells;
};

//------------------------------------------------------------------------------
vtkWallTraction::~vtkWallTraction()
{
  delete this->Cache;
}

vtkIdType vtkWallTraction::GetMeshCacheHits()
{
  return this->Cache->Results.Hits + this->Cache->Results.ContentHits;
}
vtkIdType vtkWallTraction::GetMeshCacheContentHits()
{
  return this->Cache->Results.ContentHits;
}
vtkIdType vtkWallTraction::GetMeshCacheBuilds()
{
  return this->Cache->Results.Builds;
}
vtkIdType vtkWallTraction::GetMeshContentHashes()
{
  return this->Cache->Results.Hashes;
}
vtkIdType vtkWallTraction::GetCellOffsetScans()
{
  return this->Cache->Cells.Scans;
}
vtkIdType vtkWallTraction::GetOutputArraysReused()
{
  return this->Cache->Pool.Reused;
}
vtkIdType vtkWallTraction::GetOutputArraysAllocated()
{
  return this->Cache->Pool.Allocated;
}

//------------------------------------------------------------------------------
vtkWallTraction::vtkWallTraction()
  : Cache(new Internals)
{
  // Nothing selected until the caller (or the ParaView proxy) chooses arrays.
  for (int i = PRESSURE_ARRAY; i <= TURBULENT_VISCOSITY_ARRAY; ++i)
  {
    this->SetInputArrayToProcess(i, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "");
  }
}

//------------------------------------------------------------------------------
int vtkWallTraction::FillInputPortInformation(int, vtkInformation* info)
{
  info->Remove(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE());
  info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkPolyData");
  info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkUnstructuredGrid");
  info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkDataObjectTree");
  return 1;
}

//------------------------------------------------------------------------------
int vtkWallTraction::RequestData(
  vtkInformation*, vtkInformationVector** inputVector, vtkInformationVector* outputVector)
{
  vtkDataObject* input = vtkDataObject::GetData(inputVector[0], 0);
  vtkDataObject* output = vtkDataObject::GetData(outputVector, 0);
  if (!input || !output)
  {
    vtkErrorMacro("Missing input or output.");
    return 0;
  }

  Settings s;
  s.Pressure = SelectedArray(this, PRESSURE_ARRAY);
  s.DensityArray = SelectedArray(this, DENSITY_ARRAY);
  s.ShearStressArray = SelectedArray(this, WALL_SHEAR_STRESS_ARRAY);
  s.VelocityGradient = SelectedArray(this, VELOCITY_GRADIENT_ARRAY);
  s.ViscosityArray = SelectedArray(this, VISCOSITY_ARRAY);
  s.TurbulentViscosity = SelectedArray(this, TURBULENT_VISCOSITY_ARRAY);
  const bool autoPressure =
    this->PressureKind != NO_PRESSURE && s.Pressure.Name == AutomaticArrayName;
  if (this->PressureKind == NO_PRESSURE)
  {
    s.Pressure = ArraySelection();
  }
  s.PressurePerUnitDensity = this->PressureKind == PER_UNIT_DENSITY;
  s.ShearPerUnitDensity = this->ShearStressKind == PER_UNIT_DENSITY;
  s.Kinematic = this->ViscosityKind == PER_UNIT_DENSITY;
  s.ShearSource = this->ShearSource;
  s.Orientation = this->Orientation;
  s.IncludeNormal = this->IncludeNormalViscousStress;
  s.CheckOrientation = this->CheckOrientation;
  s.AllArrays = this->PerFaceArrays == ALL_ARRAYS;
  s.ReferencePressure = this->ReferencePressure;
  s.Density = this->Density;
  s.Viscosity = this->Viscosity;
  s.DynamicPressure = 0.5 * this->Density * this->ReferenceSpeed * this->ReferenceSpeed;
  const double ln = wallloads::Norm(this->LoadDirection);
  if (!(ln > 0) || !std::isfinite(ln))
  {
    vtkErrorMacro("Load Direction must be a non-zero finite vector.");
    output->Initialize(); // no stale input or totals passed on as a result
    return 0;
  }
  for (int k = 0; k < 3; ++k)
  {
    s.LoadDirection[k] = this->LoadDirection[k] / ln;
  }

  // Which leaves are wall surfaces; the automatic choices look at those.
  std::vector<Leaf> leaves;
  std::vector<std::string> regionNames;
  ListLeaves(input, leaves, regionNames);
  std::vector<vtkDataSet*> surfaces;
  double totalCells = 0;
  for (const Leaf& leaf : leaves)
  {
    if (ClassifyLeaf(leaf.Data) == LeafKind::Surface)
    {
      surfaces.push_back(leaf.Data);
    }
    totalCells += leaf.Data ? static_cast<double>(leaf.Data->GetNumberOfCells()) : 0.0;
  }
  std::string notice, autoWarning;
  {
    AutomaticChoices choices{ s.Pressure, s.ShearSource, s.ShearStressArray, s.VelocityGradient,
      s.Orientation };
    ResolveAutomatic(choices, autoPressure, this->ShearSource == AUTOMATIC_SHEAR,
      this->Orientation == AUTOMATIC_ORIENTATION, surfaces, this->Viscosity, s.Kinematic, notice,
      autoWarning);
  }
  if (!autoWarning.empty() && ProcessRank() == 0)
  {
    vtkWarningMacro(<< autoWarning);
  }
  if (s.ShearSource == WALL_SHEAR_STRESS && !s.ShearStressArray.Set())
  {
    vtkErrorMacro("Shear Source is 'Wall shear stress array' but no Wall Shear Stress array is "
                  "selected.");
    output->Initialize();
    return 0;
  }
  if (s.ShearSource == VELOCITY_GRADIENT && !s.VelocityGradient.Set())
  {
    vtkErrorMacro("Shear Source is 'Velocity gradient' but no Velocity Gradient array is "
                  "selected.");
    output->Initialize();
    return 0;
  }

  // Every leaf, locally: no collectives inside, so ranks holding different
  // blocks stay in step. One reduction at the end. Blocks without 2D cells
  // (the volume of a whole solver case) pass through untouched.
  Tally tally;
  std::string error;
  bool ok = true;
  bool aborted = false;
  double doneCells = 0, surfaceCells = 0, passedCells = 0;
  std::vector<std::string> passed;
  std::size_t leafSlot = 0;
  this->Cache->Pool.Begin();
  auto process = [&](vtkDataSet* in, vtkDataSet* out, const std::string& name) {
    const double cells = static_cast<double>(in->GetNumberOfCells());
    if (ClassifyLeaf(in) == LeafKind::NoFaces)
    {
      passed.push_back(name.empty() ? std::string(in->GetClassName()) : name);
      passedCells += cells;
    }
    else
    {
      surfaceCells += cells;
      LeafCache cache{ &this->Cache->Results, &this->Cache->Pool, &this->Cache->Cells, leafSlot++ };
      ok = ProcessLeaf(s, in, out, name, tally, error, cache);
      AttachFaceUnits(out, in);
    }
    doneCells += cells;
    this->UpdateProgress(totalCells > 0 ? doneCells / totalCells : 1.0);
  };
  this->UpdateProgress(0.0);
  if (auto* inTree = vtkDataObjectTree::SafeDownCast(input))
  {
    auto* outTree = vtkDataObjectTree::SafeDownCast(output);
    outTree->CopyStructure(inTree);
    vtkSmartPointer<vtkDataObjectTreeIterator> it;
    it.TakeReference(inTree->NewTreeIterator());
    it->VisitOnlyLeavesOn();
    it->TraverseSubTreeOn();
    for (it->InitTraversal(); ok && !it->IsDoneWithTraversal(); it->GoToNextItem())
    {
      auto* leaf = vtkDataSet::SafeDownCast(it->GetCurrentDataObject());
      if (!leaf)
      {
        continue;
      }
      if (this->GetAbortExecute())
      {
        aborted = true;
        break;
      }
      vtkSmartPointer<vtkDataSet> copy;
      copy.TakeReference(leaf->NewInstance());
      copy->ShallowCopy(leaf);
      outTree->SetDataSet(it, copy);
      process(leaf, copy, LeafName(it));
    }
  }
  else if (auto* ds = vtkDataSet::SafeDownCast(input))
  {
    auto* out = vtkDataSet::SafeDownCast(output);
    out->ShallowCopy(ds);
    process(ds, out, std::string());
  }
  else
  {
    error = std::string("Unsupported input type ") + input->GetClassName() + ".";
    ok = false;
  }

  this->Cache->Pool.End();
  this->Cache->Results.Resize(leafSlot);

  double global[12] = { ok ? 0.0 : 1.0, tally.WettedArea.Sum, tally.WettedArea.Carry,
    tally.NonSurface, tally.Degenerate, tally.NonFinite, tally.Inconsistent, tally.OpenEdges,
    tally.Faces, aborted ? 1.0 : 0.0, surfaceCells, passedCells };
  GlobalSum(global, 12);
  if (global[0] > 0)
  {
    ReportAgreedFailure(this, ok ? std::string() : error);
    output->Initialize();
    return 0;
  }
  if (global[9] > 0)
  {
    // Stopped on request (all ranks stop together): nothing partial is
    // passed on as a result.
    output->Initialize();
    return 1;
  }
  if (global[10] == 0 && global[11] > 0)
  {
    if (ProcessRank() == 0)
    {
      vtkErrorMacro("Wall Traction needs wall faces (2D cells), but its input holds only "
        << static_cast<vtkIdType>(global[11]) << " volume (or line and point) cells"
        << (passed.empty() ? std::string() : " in " + QuotedList(passed, 12))
        << ". For a fluid volume, use Shear Projection (it finds the wall faces and their "
           "shear stress) and feed its output to Wall Traction, or extract the wall patches "
           "first (Extract Block, or Extract Surface).");
    }
    output->Initialize();
    return 0;
  }

  vtkFieldData* fd = output->GetFieldData();
  const double wetted = global[1] + global[2];
  AddFieldValue(fd, names::WettedArea, &wetted, 1);
  const double speed = this->ReferenceSpeed;
  AddFieldValue(fd, "Reference Density", &s.Density, 1);
  AddFieldValue(fd, "Reference Speed", &speed, 1);
  AddFieldValue(fd, "Dynamic Pressure", &s.DynamicPressure, 1);
  AddFieldValue(fd, "Load Direction", s.LoadDirection, 3);
  AddCount(fd, names::SkippedNonSurfaceCells, global[3]);
  AddCount(fd, names::SkippedDegenerateFaces, global[4]);
  AddCount(fd, names::SkippedNonFiniteFaces, global[5]);
  if (s.CheckOrientation)
  {
    AddCount(fd, names::InconsistentlyOrientedFaces, global[6]);
    AddCount(fd, names::OpenBoundaryEdges, global[7]);
  }
  this->UpdateProgress(1.0);
  Report(this, s, global, passed, notice);

  if (ProcessRank() == 0)
  {
    if (global[8] == 0 && global[3] + global[4] + global[5] == 0)
    {
      vtkWarningMacro("The input holds no wall faces: all loads are zero.");
    }
    else if (global[8] == 0)
    {
      vtkWarningMacro("No wall face carries a load: every face was skipped (counts below).");
    }
    if (!std::isfinite(wetted))
    {
      vtkWarningMacro("The Wetted Area is not finite ("
        << wetted << "): the face areas sum beyond the range of double; it is not a result.");
    }
    std::ostringstream os;
    if (global[3] > 0)
    {
      os << " " << static_cast<vtkIdType>(global[3])
         << " non-surface cells (vertices, lines, strips or 3D cells) skipped;";
    }
    if (global[4] > 0)
    {
      os << " " << static_cast<vtkIdType>(global[4])
         << " degenerate faces (fewer than 3 corners or zero area) skipped;";
    }
    if (global[5] > 0)
    {
      os << " " << static_cast<vtkIdType>(global[5])
         << " faces with NaN/Inf coordinates or values skipped;";
    }
    if (global[6] > 0)
    {
      os << " " << static_cast<vtkIdType>(global[6])
         << " faces are oriented against their neighbours (check the normals);";
    }
    if (!os.str().empty())
    {
      vtkWarningMacro(<< "Wall Traction:" << os.str()
                      << " skipped faces carry NaN and no load.");
    }
  }
  return 1;
}

//------------------------------------------------------------------------------
const char* vtkWallTraction::GetArrayUnit(const char* name)
{
  return wallloads::columns::UnitOf(name);
}

//------------------------------------------------------------------------------
void vtkWallTraction::PrintSelf(ostream& os, vtkIndent indent)
{
  this->Superclass::PrintSelf(os, indent);
  os << indent << "PressureKind: " << this->PressureKind << "\n";
  os << indent << "ReferencePressure: " << this->ReferencePressure << "\n";
  os << indent << "Density: " << this->Density << "\n";
  os << indent << "ShearSource: " << this->ShearSource << "\n";
  os << indent << "ShearStressKind: " << this->ShearStressKind << "\n";
  os << indent << "Viscosity: " << this->Viscosity << "\n";
  os << indent << "ViscosityKind: " << this->ViscosityKind << "\n";
  os << indent << "IncludeNormalViscousStress: " << this->IncludeNormalViscousStress << "\n";
  os << indent << "Orientation: " << this->Orientation << "\n";
  os << indent << "CheckOrientation: " << this->CheckOrientation << "\n";
  os << indent << "LoadDirection: " << this->LoadDirection[0] << " " << this->LoadDirection[1]
     << " " << this->LoadDirection[2] << "\n";
  os << indent << "ReferenceSpeed: " << this->ReferenceSpeed << "\n";
  os << indent << "PerFaceArrays: " << this->PerFaceArrays << "\n";
}

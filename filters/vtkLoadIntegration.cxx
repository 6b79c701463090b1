// SPDX-License-Identifier: BSD-3-Clause
#include "vtkLoadIntegration.h"

#include "WallLoadsPipeline.h"
#include "wallloads/FaceGeometry.h"
#include "wallloads/LoadAxes.h"
#include "wallloads/LoadTotals.h"

#include "vtkCellData.h"
#include "vtkDataObjectTree.h"
#include "vtkDataSet.h"
#include "vtkDoubleArray.h"
#include "vtkFieldData.h"
#include "vtkIdTypeArray.h"
#include "vtkInformation.h"
#include "vtkInformationVector.h"
#include "vtkMath.h"
#include "vtkObjectFactory.h"
#include "vtkSMPThreadLocal.h"
#include "vtkSMPTools.h"
#include "vtkSmartPointer.h"
#include "vtkStringArray.h"
#include "vtkTable.h"

#include <cmath>
#include <sstream>

vtkStandardNewMacro(vtkLoadIntegration);

namespace
{
using namespace wallloads;
using Sums = LoadSums<double>;

struct LeafInputs
{
  ArrayView ForceP, ForceV, Area, Region;
  PointView Points;
  const unsigned char* Ghosts = nullptr;
  int FixedRegion = 0;  ///< region of the leaf when no region array is used
  long long RegionBase = 0; ///< smallest region-array value (global)
};

template <typename I, typename P>
struct SumLoop
{
  const LeafInputs& In;
  const FaceTopology<I>& Topo;
  const double* R0;
  std::size_t NumRegions;
  vtkSMPThreadLocal<std::vector<Sums>> Local;

  SumLoop(const LeafInputs& in, const FaceTopology<I>& topo, const double* r0, std::size_t n)
    : In(in)
    , Topo(topo)
    , R0(r0)
    , NumRegions(n)
  {
  }

  void Initialize() { this->Local.Local().assign(this->NumRegions, Sums()); }

  void operator()(vtkIdType begin, vtkIdType end)
  {
    std::vector<Sums>& sums = this->Local.Local();
    const P* points = static_cast<const P*>(In.Points.Data);
    for (vtkIdType c = begin; c < end; ++c)
    {
      if (!IsCountedCell(In.Ghosts, c))
      {
        continue;
      }
      std::size_t region = static_cast<std::size_t>(In.FixedRegion);
      if (In.Region.Valid())
      {
        region = static_cast<std::size_t>(std::llround(In.Region.Get(c, 0)) - In.RegionBase);
      }
      I buffer[4];
      const I* ids = nullptr;
      const int n = Topo.Corners(c, ids, buffer);
      if (n == 0)
      {
        continue; // not a face (vertex, line, 3D cell): Wall Traction counted it
      }
      Sums& s = sums[region];
      const double fp[3] = { In.ForceP.Get(c, 0), In.ForceP.Get(c, 1), In.ForceP.Get(c, 2) };
      const double fv[3] = { In.ForceV.Get(c, 0), In.ForceV.Get(c, 1), In.ForceV.Get(c, 2) };
      const double area = In.Area.Get(c, 0);
      if (!AllFinite(fp, 3) || !AllFinite(fv, 3) || !std::isfinite(area))
      {
        s.AddSkipped();
        continue;
      }
      FaceFrame<double> frame;
      if (ComputeFaceFrame<double>(points, ids, n, frame) != FaceStatus::Ok)
      {
        s.AddSkipped();
        continue;
      }
      s.AddFace(area, frame.Centroid, this->R0, fp, fv);
    }
  }

  void Reduce() {}
};

template <typename I, typename P>
void SumLeaf(const LeafInputs& in, vtkDataSet* ds, const double r0[3], std::vector<Sums>& total)
{
  FaceTopology<I> topo;
  MakeFaceTopology<I>(ds, topo);
  SumLoop<I, P> loop(in, topo, r0, total.size());
  vtkSMPTools::For(0, ds->GetNumberOfCells(), loop);
  for (const std::vector<Sums>& local : loop.Local)
  {
    for (std::size_t r = 0; r < total.size(); ++r)
    {
      total[r].Merge(local[r]);
    }
  }
}

/// Columns of the table, in order; the same names label the field data.
struct Column
{
  const char* Name;
  int Components;
  bool Coefficient;
};
const Column Columns[] = {
  { "Faces", 1, false },
  { "Skipped Faces", 1, false },
  { "Area", 1, false },
  { "Pressure Force", 3, false },
  { "Viscous Force", 3, false },
  { "Force", 3, false },
  { "Pressure Moment", 3, false },
  { "Viscous Moment", 3, false },
  { "Moment", 3, false },
  { "Drag", 1, false },
  { "Side Force", 1, false },
  { "Lift", 1, false },
  { "Rolling Moment", 1, false },
  { "Pitching Moment", 1, false },
  { "Yawing Moment", 1, false },
  { "Drag Coefficient", 1, true },
  { "Side Force Coefficient", 1, true },
  { "Lift Coefficient", 1, true },
  { "Rolling Moment Coefficient", 1, true },
  { "Pitching Moment Coefficient", 1, true },
  { "Yawing Moment Coefficient", 1, true },
  { "Line Of Action Point", 3, false },
  { "Residual Couple", 1, false },
};

/// Values of a finished region in column order.
std::vector<double> RowValues(const RegionLoads<double>& r, bool coefficients)
{
  std::vector<double> v;
  auto push = [&v](const double* x, int n) { v.insert(v.end(), x, x + n); };
  push(&r.FaceCount, 1);
  push(&r.SkippedCount, 1);
  push(&r.Area, 1);
  push(r.PressureForce, 3);
  push(r.ViscousForce, 3);
  push(r.Force, 3);
  push(r.PressureMoment, 3);
  push(r.ViscousMoment, 3);
  push(r.Moment, 3);
  push(&r.Drag, 1);
  push(&r.SideForce, 1);
  push(&r.Lift, 1);
  push(&r.RollingMoment, 1);
  push(&r.PitchingMoment, 1);
  push(&r.YawingMoment, 1);
  if (coefficients)
  {
    push(&r.DragCoefficient, 1);
    push(&r.SideForceCoefficient, 1);
    push(&r.LiftCoefficient, 1);
    push(&r.RollingMomentCoefficient, 1);
    push(&r.PitchingMomentCoefficient, 1);
    push(&r.YawingMomentCoefficient, 1);
  }
  push(r.LineOfActionPoint, 3);
  push(&r.ResidualCouple, 1);
  return v;
}
} // namespace

//------------------------------------------------------------------------------
vtkLoadIntegration::vtkLoadIntegration()
{
  this->SetNumberOfOutputPorts(2);
  this->SetInputArrayToProcess(REGION_ARRAY, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "");
}

//------------------------------------------------------------------------------
void vtkLoadIntegration::SetFlowAngles(double alpha, double beta)
{
  double drag[3], lift[3];
  wallloads::DirectionsFromFlowAngles(
    vtkMath::RadiansFromDegrees(alpha), vtkMath::RadiansFromDegrees(beta), drag, lift);
  this->SetDragDirection(drag);
  this->SetLiftDirection(lift);
}

//------------------------------------------------------------------------------
int vtkLoadIntegration::FillInputPortInformation(int, vtkInformation* info)
{
  info->Remove(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE());
  info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkPolyData");
  info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkUnstructuredGrid");
  info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkDataObjectTree");
  return 1;
}

//------------------------------------------------------------------------------
int vtkLoadIntegration::FillOutputPortInformation(int port, vtkInformation* info)
{
  info->Set(vtkDataObject::DATA_TYPE_NAME(), port == 0 ? "vtkDataObject" : "vtkTable");
  return 1;
}

//------------------------------------------------------------------------------
int vtkLoadIntegration::RequestDataObject(
  vtkInformation*, vtkInformationVector** inputVector, vtkInformationVector* outputVector)
{
  vtkDataObject* input = vtkDataObject::GetData(inputVector[0], 0);
  if (!input)
  {
    return 0;
  }
  vtkInformation* info0 = outputVector->GetInformationObject(0);
  vtkDataObject* out0 = vtkDataObject::GetData(info0);
  if (!out0 || !out0->IsA(input->GetClassName()))
  {
    vtkSmartPointer<vtkDataObject> fresh;
    fresh.TakeReference(input->NewInstance());
    info0->Set(vtkDataObject::DATA_OBJECT(), fresh);
  }
  vtkInformation* info1 = outputVector->GetInformationObject(1);
  if (!vtkTable::GetData(info1))
  {
    info1->Set(vtkDataObject::DATA_OBJECT(), vtkSmartPointer<vtkTable>::New());
  }
  return 1;
}

//------------------------------------------------------------------------------
int vtkLoadIntegration::RequestData(
  vtkInformation*, vtkInformationVector** inputVector, vtkInformationVector* outputVector)
{
  vtkDataObject* input = vtkDataObject::GetData(inputVector[0], 0);
  vtkDataObject* output = vtkDataObject::GetData(outputVector, 0);
  vtkTable* table = vtkTable::GetData(outputVector, 1);
  if (!input || !output || !table)
  {
    vtkErrorMacro("Missing input or output.");
    return 0;
  }
  LoadAxes<double> axes;
  if (!MakeLoadAxes(this->DragDirection, this->LiftDirection, axes))
  {
    vtkErrorMacro("DragDirection and LiftDirection must be non-zero and not parallel.");
    return 0;
  }
  ArraySelection regionSel = SelectedArray(this, REGION_ARRAY);
  regionSel.OnPoints = false; // regions are cells

  std::vector<Leaf> leaves;
  std::vector<std::string> regionNames;
  ListLeaves(input, leaves, regionNames);

  // Validate locally; agree on the outcome (and the region-value range) in
  // one collective so that every rank takes the same branch.
  std::string error;
  std::vector<LeafInputs> inputs(leaves.size());
  double localMin = VTK_DOUBLE_MAX, localMax = -VTK_DOUBLE_MAX;
  for (std::size_t i = 0; i < leaves.size() && error.empty(); ++i)
  {
    vtkDataSet* ds = leaves[i].Data;
    if (!ds || ds->GetNumberOfCells() == 0)
    {
      continue;
    }
    LeafInputs& in = inputs[i];
    if (!CheckGhostArrays(ds, leaves[i].Name, error))
    {
      break;
    }
    auto need = [&](const char* name, int comps, ArrayView& view) {
      if (!error.empty())
      {
        return;
      }
      vtkDataArray* a = FindSelectedArray(ds, ArraySelection{ name, false }, comps,
        "Load Integration needs the Wall Traction output:", leaves[i].Name, error);
      view = MakeArrayView(a, false);
    };
    need(names::PressureForce, 3, in.ForceP);
    need(names::ViscousForce, 3, in.ForceV);
    need(names::FaceArea, 1, in.Area);
    if (error.empty() && regionSel.Set())
    {
      vtkDataArray* a = FindSelectedArray(ds, regionSel, 1, "Region", leaves[i].Name, error);
      in.Region = MakeArrayView(a, false);
      if (a)
      {
        const unsigned char* ghosts = CellGhostMask(ds);
        for (vtkIdType c = 0; c < ds->GetNumberOfCells(); ++c)
        {
          const double v = in.Region.Get(c, 0);
          if (!IsCountedCell(ghosts, c))
          {
            continue;
          }
          if (!std::isfinite(v) || v != std::floor(v))
          {
            error = "Region array '" + regionSel.Name + "' holds a value that is not an integer.";
            break;
          }
          localMin = std::min(localMin, v);
          localMax = std::max(localMax, v);
        }
      }
    }
    in.Points = MakePointView(ds);
    in.Ghosts = CellGhostMask(ds);
    in.FixedRegion = leaves[i].Region;
    if (error.empty() && !in.Points.Data)
    {
      error = "Block '" + leaves[i].Name + "' has cells but no points.";
    }
  }
  double localCells = 0;
  for (const Leaf& leaf : leaves)
  {
    localCells += leaf.Data ? static_cast<double>(leaf.Data->GetNumberOfCells()) : 0.0;
  }
  double agreed[4] = { error.empty() ? 0.0 : 1.0, localMax, -localMin, localCells };
  GlobalMax(agreed, 4);
  if (agreed[0] == 0 && agreed[3] == 0 && !input->GetFieldData()->GetArray(names::WettedArea))
  {
    // An empty input that never went through Wall Traction (or that Wall
    // Traction refused): zero loads would be passed off as a result.
    error = "Load Integration's input holds no faces and no 'Wetted Area': it is not the output "
            "of Wall Traction, or Wall Traction failed upstream (see its error).";
    agreed[0] = 1;
  }
  if (agreed[0] > 0)
  {
    ReportAgreedFailure(this, error);
    return 0;
  }

  // Regions.
  long long regionBase = 0;
  std::size_t numRegions = regionNames.size();
  if (regionSel.Set())
  {
    if (agreed[1] < -agreed[2])
    {
      numRegions = 0; // no counted faces anywhere
    }
    else
    {
      regionBase = static_cast<long long>(-agreed[2]);
      const long long span = static_cast<long long>(agreed[1]) - regionBase + 1;
      if (span > MaximumRegionSpan)
      {
        vtkErrorMacro("Region array '" << regionSel.Name << "' spans " << span
                                       << " values; at most " << MaximumRegionSpan
                                       << " are supported.");
        return 0;
      }
      numRegions = static_cast<std::size_t>(span);
    }
  }
  std::vector<Sums> sums(numRegions);
  const double* r0 = this->MomentCentre;
  for (std::size_t i = 0; i < leaves.size(); ++i)
  {
    vtkDataSet* ds = leaves[i].Data;
    if (!ds || ds->GetNumberOfCells() == 0)
    {
      continue;
    }
    inputs[i].RegionBase = regionBase;
    DispatchFaces(ds, inputs[i].Points.IsFloat, [&](auto id, auto pt) {
      SumLeaf<decltype(id), decltype(pt)>(inputs[i], ds, r0, sums);
    });
  }

  // One reduction of every running sum and its compensation.
  std::vector<double> flat(numRegions * NumLoadSlots * 2);
  for (std::size_t r = 0; r < numRegions; ++r)
  {
    for (std::size_t k = 0; k < NumLoadSlots; ++k)
    {
      flat[(r * NumLoadSlots + k) * 2] = sums[r].Sums.Terms[k].Sum;
      flat[(r * NumLoadSlots + k) * 2 + 1] = sums[r].Sums.Terms[k].Carry;
    }
  }
  GlobalSum(flat.data(), static_cast<int>(flat.size()));

  ReferenceValues<double> ref;
  ref.Density = this->ReferenceDensity;
  ref.Speed = this->ReferenceSpeed;
  ref.Area = this->ReferenceArea;
  ref.Length = this->ReferenceLength;
  ref.Span = this->ReferenceSpan;
  const bool coefficients = ref.DynamicPressure() * ref.Area > 0;

  std::vector<std::string> rowNames;
  std::vector<long long> rowIds;
  std::vector<RegionLoads<double>> rows;
  CompensatedSum<double> totalSlots[NumLoadSlots];
  for (std::size_t r = 0; r < numRegions; ++r)
  {
    double slots[NumLoadSlots];
    for (std::size_t k = 0; k < NumLoadSlots; ++k)
    {
      CompensatedSum<double> s;
      s.Sum = flat[(r * NumLoadSlots + k) * 2];
      s.Carry = flat[(r * NumLoadSlots + k) * 2 + 1];
      slots[k] = s.Value();
      totalSlots[k].Merge(s);
    }
    if (regionSel.Set() && slots[FaceCountSlot] + slots[SkippedCountSlot] == 0)
    {
      continue; // a value that no face carries
    }
    RegionLoads<double> loads;
    FinishRegion(slots, r0, axes, ref, loads);
    rows.push_back(loads);
    if (regionSel.Set())
    {
      rowIds.push_back(regionBase + static_cast<long long>(r));
      rowNames.push_back(regionSel.Name + " " + std::to_string(rowIds.back()));
    }
    else
    {
      rowIds.push_back(static_cast<long long>(r));
      rowNames.push_back(regionNames[r]);
    }
  }
  double total[NumLoadSlots];
  for (std::size_t k = 0; k < NumLoadSlots; ++k)
  {
    total[k] = totalSlots[k].Value();
  }
  RegionLoads<double> totalLoads;
  FinishRegion(total, r0, axes, ref, totalLoads);

  // Port 0: the input plus the totals as field data (global on every rank).
  output->ShallowCopy(input);
  vtkSmartPointer<vtkFieldData> fd = vtkSmartPointer<vtkFieldData>::New();
  fd->ShallowCopy(input->GetFieldData());
  const std::vector<double> totalRow = RowValues(totalLoads, coefficients);
  {
    std::size_t at = 0;
    for (const Column& col : Columns)
    {
      if (col.Coefficient && !coefficients)
      {
        continue;
      }
      SetFieldValue(fd, col.Name, totalRow.data() + at, col.Components);
      at += col.Components;
    }
  }
  SetFieldValue(fd, "Moment Centre", r0, 3);
  SetFieldValue(fd, "Drag Direction", axes.Drag, 3);
  SetFieldValue(fd, "Side Direction", axes.Side, 3);
  SetFieldValue(fd, "Lift Direction", axes.Lift, 3);
  output->SetFieldData(fd);

  // Port 1: the table, on rank 0 only.
  table->Initialize();
  if (ProcessRank() == 0)
  {
    auto regionColumn = vtkSmartPointer<vtkStringArray>::New();
    regionColumn->SetName("Region");
    // Double, so that the Total row can be NaN and never equal a region value.
    auto idColumn = vtkSmartPointer<vtkDoubleArray>::New();
    idColumn->SetName("Region Id");
    const std::size_t numRows = rows.size() + 1;
    regionColumn->SetNumberOfValues(static_cast<vtkIdType>(numRows));
    idColumn->SetNumberOfValues(static_cast<vtkIdType>(numRows));
    for (std::size_t r = 0; r < rows.size(); ++r)
    {
      regionColumn->SetValue(static_cast<vtkIdType>(r), rowNames[r]);
      idColumn->SetValue(static_cast<vtkIdType>(r), static_cast<double>(rowIds[r]));
    }
    regionColumn->SetValue(static_cast<vtkIdType>(rows.size()), "Total");
    idColumn->SetValue(static_cast<vtkIdType>(rows.size()), std::nan(""));
    table->AddColumn(regionColumn);
    table->AddColumn(idColumn);
    std::vector<std::vector<double>> values;
    for (const RegionLoads<double>& r : rows)
    {
      values.push_back(RowValues(r, coefficients));
    }
    values.push_back(totalRow);
    std::size_t at = 0;
    for (const Column& col : Columns)
    {
      if (col.Coefficient && !coefficients)
      {
        continue;
      }
      auto column = vtkSmartPointer<vtkDoubleArray>::New();
      column->SetName(col.Name);
      column->SetNumberOfComponents(col.Components);
      column->SetNumberOfTuples(static_cast<vtkIdType>(numRows));
      for (std::size_t r = 0; r < numRows; ++r)
      {
        for (int k = 0; k < col.Components; ++k)
        {
          column->SetComponent(static_cast<vtkIdType>(r), k, values[r][at + k]);
        }
      }
      table->AddColumn(column);
      at += col.Components;
    }
    if (totalLoads.SkippedCount > 0)
    {
      vtkWarningMacro("Load Integration: " << static_cast<vtkIdType>(totalLoads.SkippedCount)
                                           << " faces carry no finite load or area and are "
                                              "left out of the totals (see 'Skipped Faces').");
    }
    if (totalLoads.FaceCount == 0)
    {
      vtkWarningMacro("Load Integration: the input holds no wall faces; all totals are zero.");
    }
  }
  return 1;
}

//------------------------------------------------------------------------------
void vtkLoadIntegration::PrintSelf(ostream& os, vtkIndent indent)
{
  this->Superclass::PrintSelf(os, indent);
  os << indent << "MomentCentre: " << this->MomentCentre[0] << " " << this->MomentCentre[1] << " "
     << this->MomentCentre[2] << "\n";
  os << indent << "DragDirection: " << this->DragDirection[0] << " " << this->DragDirection[1]
     << " " << this->DragDirection[2] << "\n";
  os << indent << "LiftDirection: " << this->LiftDirection[0] << " " << this->LiftDirection[1]
     << " " << this->LiftDirection[2] << "\n";
  os << indent << "ReferenceDensity: " << this->ReferenceDensity << "\n";
  os << indent << "ReferenceSpeed: " << this->ReferenceSpeed << "\n";
  os << indent << "ReferenceArea: " << this->ReferenceArea << "\n";
  os << indent << "ReferenceLength: " << this->ReferenceLength << "\n";
  os << indent << "ReferenceSpan: " << this->ReferenceSpan << "\n";
}

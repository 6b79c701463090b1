// SPDX-License-Identifier: BSD-3-Clause
#include "vtkLoadIntegration.h"

#include "WallLoadsColumns.h"
#include "WallLoadsDefaults.h"
#include "WallLoadsMeshCache.h"
#include "LoadIntegrationSums.h"
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
#include "vtkPolyData.h"
#include "vtkSMPThreadLocal.h"
#include "vtkSMPTools.h"
#include "vtkSmartPointer.h"
#include "vtkStringArray.h"
#include "vtkTable.h"
#include "vtkUnstructuredGrid.h"

#include <algorithm>
#include <cmath>
#include <iomanip>
#include <sstream>

vtkStandardNewMacro(vtkLoadIntegration);

namespace
{
using namespace wallloads;
using namespace wallloads::integration;

/// The reference values of one execution and where each came from.
struct ReferenceState
{
  ReferenceValues<double> Values;
  LoadAxes<double> Axes;
  double Centre[3] = { 0, 0, 0 };
  std::string DensityFrom, SpeedFrom, DragFrom, LiftFrom;
  double DynamicPressure() const { return this->Values.DynamicPressure(); }
};

/// The values used in the table, and the message that says so. Returns
/// false (with `error`) when the axes cannot be made.
bool ResolveReference(vtkLoadIntegration* self, vtkFieldData* upstream, ReferenceState& ref,
  std::string& error)
{
  const char* fromTraction = "from Wall Traction";
  ref.Values.Density = self->GetReferenceDensity();
  ref.DensityFrom = "set here";
  if (!(ref.Values.Density > 0))
  {
    ref.DensityFrom = fromTraction;
    if (!FieldVector(upstream, "Reference Density", &ref.Values.Density, 1) ||
      !(ref.Values.Density > 0))
    {
      ref.Values.Density = 1;
      ref.DensityFrom = "default";
    }
  }
  ref.Values.Speed = self->GetReferenceSpeed();
  ref.SpeedFrom = "set here";
  if (!(ref.Values.Speed > 0))
  {
    ref.SpeedFrom = fromTraction;
    if (!FieldVector(upstream, "Reference Speed", &ref.Values.Speed, 1) ||
      !(ref.Values.Speed >= 0))
    {
      ref.Values.Speed = 0;
      ref.SpeedFrom = "none set";
    }
  }
  ref.Values.Area = self->GetReferenceArea();
  ref.Values.Length = self->GetReferenceLength();
  ref.Values.Span = self->GetReferenceSpan();
  self->GetMomentCentre(ref.Centre);

  ResolvedAxes axes;
  if (!ResolveLoadAxes(self->GetDragDirection(), self->GetLiftDirection(), upstream, axes, error))
  {
    return false;
  }
  ref.Axes = axes.Axes;
  ref.DragFrom = axes.DragFrom;
  ref.LiftFrom = axes.LiftFrom;
  return true;
}

std::string Describe(const ReferenceState& ref, bool coefficients)
{
  std::ostringstream os;
  auto vec = [&os](const double* v) { os << "(" << v[0] << ", " << v[1] << ", " << v[2] << ")"; };
  os << "reference values used: density " << ref.Values.Density << " kg/m^3 (" << ref.DensityFrom
     << "), speed " << ref.Values.Speed << " m/s (" << ref.SpeedFrom << "), q = "
     << ref.DynamicPressure() << " Pa";
  if (coefficients)
  {
    os << ", area " << ref.Values.Area << " m^2, length " << ref.Values.Length << " m, span "
       << ref.Values.Span << " m";
  }
  else
  {
    os << " (no coefficients: set a reference speed here or in Wall Traction)";
  }
  os << "; drag direction ";
  vec(ref.Axes.Drag);
  os << " (" << ref.DragFrom << "), lift direction ";
  vec(ref.Axes.Lift);
  os << " (" << ref.LiftFrom << "); moments about ";
  vec(ref.Centre);
  os << " m.";
  return os.str();
}

/// The reference values as they appear in the table and field data, in the
/// order of columns::ReferenceColumns.
std::vector<double> ReferenceRow(const ReferenceState& ref)
{
  std::vector<double> v = { ref.Values.Density, ref.Values.Speed, ref.DynamicPressure(),
    ref.Values.Area, ref.Values.Length, ref.Values.Span };
  auto push = [&v](const double* x) { v.insert(v.end(), x, x + 3); };
  push(ref.Centre);
  push(ref.Axes.Drag);
  push(ref.Axes.Side);
  push(ref.Axes.Lift);
  return v;
}

vtkSmartPointer<vtkDoubleArray> NewColumn(
  const std::string& name, const char* unit, int components, vtkIdType rows)
{
  auto column = vtkSmartPointer<vtkDoubleArray>::New();
  column->SetName(name.c_str());
  column->SetNumberOfComponents(components);
  column->SetNumberOfTuples(rows);
  SetUnits(column, unit);
  return column;
}

/// Port 0's field data: the Total row and the reference values, with units.
void AddTotals(vtkFieldData* fd, const RegionLoads<double>& total, bool coefficients,
  const ReferenceState& ref)
{
  for (const columns::LoadColumn& col : columns::LoadColumns)
  {
    if ((col.Flags & columns::COEFFICIENT) && !coefficients)
    {
      continue;
    }
    SetFieldValue(fd, col.Name, col.Values(total), col.Components);
    SetUnits(fd->GetAbstractArray(col.Name), col.Unit);
  }
  const std::vector<double> refRow = ReferenceRow(ref);
  std::size_t at = 0;
  for (const columns::NamedUnit& col : columns::ReferenceColumns)
  {
    SetFieldValue(fd, col.Name, refRow.data() + at, col.Components);
    SetUnits(fd->GetAbstractArray(col.Name), col.Unit);
    at += static_cast<std::size_t>(col.Components);
  }
}

/**
 * The Load Table (every column, scripting names) and the Load Summary
 * (region and scalar loads, units in the names), from one column list.
 * `rows` ends with the Total row.
 */
void FillTables(vtkTable* table, vtkTable* summary, const std::vector<RegionLoads<double>>& rows,
  const std::vector<std::string>& rowNames, const std::vector<double>& rowIds, bool coefficients,
  const ReferenceState& ref)
{
  const vtkIdType n = static_cast<vtkIdType>(rows.size());
  auto regions = vtkSmartPointer<vtkStringArray>::New();
  regions->SetName("Region");
  regions->SetNumberOfValues(n);
  auto boundary = vtkSmartPointer<vtkStringArray>::New();
  boundary->SetName(columns::SummaryRegionColumn);
  boundary->SetNumberOfValues(n);
  // Double, so that the Total row can be NaN and never equal a region value.
  auto ids = NewColumn("Region Id", columns::UnitOf("Region Id"), 1, n);
  for (vtkIdType r = 0; r < n; ++r)
  {
    regions->SetValue(r, rowNames[static_cast<std::size_t>(r)]);
    boundary->SetValue(r, rowNames[static_cast<std::size_t>(r)]);
    ids->SetValue(r, rowIds[static_cast<std::size_t>(r)]);
  }
  table->AddColumn(regions);
  table->AddColumn(ids);
  summary->AddColumn(boundary);
  for (const columns::LoadColumn& col : columns::LoadColumns)
  {
    if ((col.Flags & columns::COEFFICIENT) && !coefficients)
    {
      continue;
    }
    auto column = NewColumn(col.Name, col.Unit, col.Components, n);
    for (vtkIdType r = 0; r < n; ++r)
    {
      column->SetTypedTuple(r, col.Values(rows[static_cast<std::size_t>(r)]));
    }
    table->AddColumn(column);
    if (col.SummaryName)
    {
      const std::string unit(col.Unit);
      const std::string label =
        unit == "-" ? std::string(col.SummaryName) : std::string(col.SummaryName) + " [" + unit + "]";
      auto brief = NewColumn(label, col.Unit, col.Components, n);
      brief->DeepCopy(column);
      brief->SetName(label.c_str());
      SetUnits(brief, col.Unit);
      summary->AddColumn(brief);
    }
  }
  const std::vector<double> refRow = ReferenceRow(ref);
  std::size_t at = 0;
  for (const columns::NamedUnit& col : columns::ReferenceColumns)
  {
    auto column = NewColumn(col.Name, col.Unit, col.Components, n);
    for (vtkIdType r = 0; r < n; ++r)
    {
      column->SetTypedTuple(r, refRow.data() + at);
    }
    table->AddColumn(column);
    at += static_cast<std::size_t>(col.Components);
  }
  if (coefficients)
  {
    auto q = NewColumn("Dynamic Pressure [Pa]", "Pa", 1, n);
    q->FillValue(ref.DynamicPressure());
    summary->AddColumn(q);
  }
}
/// A warning naming the totals that are not finite and the likely cause
/// (the line of action is NaN by design for a pure couple: not listed).
void WarnNonFinite(vtkLoadIntegration* self, const RegionLoads<double>& total, bool coefficients,
  const ReferenceState& ref)
{
  std::vector<std::string> bad;
  for (const columns::LoadColumn& col : columns::LoadColumns)
  {
    const std::string name(col.Name);
    if (((col.Flags & columns::COEFFICIENT) && !coefficients) || name == "Line Of Action Point" ||
      name == "Residual Couple")
    {
      continue;
    }
    if (!AllFinite(col.Values(total), col.Components))
    {
      bad.push_back(name);
    }
  }
  if (bad.empty())
  {
    return;
  }
  std::ostringstream os;
  os << "Load Integration: totals not finite: " << QuotedList(bad, 8) << ". ";
  bool cause = false;
  if (!AllFinite(ref.Centre, 3))
  {
    os << "The Moment Centre (" << ref.Centre[0] << ", " << ref.Centre[1] << ", "
       << ref.Centre[2] << ") is not finite. ";
    cause = true;
  }
  if (coefficients && !(ref.Values.Length > 0 && ref.Values.Span > 0))
  {
    os << "Moment coefficients need a positive Reference Length (" << ref.Values.Length
       << " m) and Reference Span (" << ref.Values.Span << " m). ";
    cause = true;
  }
  if (!cause)
  {
    os << "The sums left the range of double (face loads or moments near 1e308). ";
  }
  os << "These totals are not results.";
  vtkWarningWithObjectMacro(self, << os.str());
}
} // namespace

/// What is kept between executions: the cell arrays whose offsets were
/// found well formed (WallLoadsMeshCache.h).
struct vtkLoadIntegration::Internals
{
  wallloads::ValidatedCells Cells;
};

//------------------------------------------------------------------------------
vtkLoadIntegration::vtkLoadIntegration()
  : Cache(new Internals)
{
  this->SetNumberOfOutputPorts(3);
  this->SetInputArrayToProcess(REGION_ARRAY, 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "");
}

vtkLoadIntegration::~vtkLoadIntegration()
{
  delete this->Cache;
}

vtkIdType vtkLoadIntegration::GetCellOffsetScans()
{
  return this->Cache->Cells.Scans;
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
  for (int port = 1; port <= 2; ++port)
  {
    vtkInformation* info = outputVector->GetInformationObject(port);
    if (!vtkTable::GetData(info))
    {
      info->Set(vtkDataObject::DATA_OBJECT(), vtkSmartPointer<vtkTable>::New());
    }
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
  vtkTable* summary = vtkTable::GetData(outputVector, 2);
  if (!input || !output || !table || !summary)
  {
    vtkErrorMacro("Missing input or output.");
    return 0;
  }
  // The reference state: properties, else what Wall Traction recorded (the
  // same global field data on every rank, so all ranks agree).
  // A bad setting fails in the ranks' one agreement below, like bad input
  // (field data may differ between ranks).
  ReferenceState ref;
  std::string error;
  ResolveReference(this, input->GetFieldData(), ref, error);
  const LoadAxes<double>& axes = ref.Axes;
  ArraySelection regionSel = SelectedArray(this, REGION_ARRAY);
  regionSel.OnPoints = false; // regions are cells

  std::vector<Leaf> leaves;
  std::vector<std::string> regionNames;
  ListLeaves(input, leaves, regionNames);
  this->UpdateProgress(0.0);

  // Validate locally; agree on the outcome (and the region-value range, the
  // number of block regions, whether the input came from Wall Traction) in
  // one collective of fixed size, so that every rank takes the same branch
  // whatever blocks it holds. Which block regions hold surface or volume
  // cells travels with the sums (their count is agreed by then). Leaves
  // without 2D cells (volume blocks passed on by Wall Traction) are left out.
  std::vector<LeafInputs> inputs(leaves.size());
  std::vector<LeafKind> kinds(leaves.size(), LeafKind::Empty);
  std::vector<std::string> passed;
  double localMin = VTK_DOUBLE_MAX, localMax = -VTK_DOUBLE_MAX, localCells = 0;
  const std::size_t numBlockRegions = regionNames.size();
  // Per block region: has surface cells, has volume cells.
  std::vector<double> blockFlags(2 * numBlockRegions, 0.0);
  for (std::size_t i = 0; i < leaves.size(); ++i)
  {
    kinds[i] = ClassifyLeaf(leaves[i].Data);
    const std::size_t region = static_cast<std::size_t>(leaves[i].Region);
    if (kinds[i] == LeafKind::NoFaces)
    {
      passed.push_back(leaves[i].Name.empty() ? "block" : leaves[i].Name);
      if (region < numBlockRegions)
      {
        blockFlags[2 * region + 1] = 1;
      }
      continue;
    }
    if (kinds[i] != LeafKind::Surface || !error.empty())
    {
      continue;
    }
    if (region < numBlockRegions)
    {
      blockFlags[2 * region] = 1;
    }
    vtkDataSet* ds = leaves[i].Data;
    localCells += static_cast<double>(ds->GetNumberOfCells());
    LeafInputs& in = inputs[i];
    if (!CheckGhostArrays(ds, leaves[i].Name, error))
    {
      continue;
    }
    if (!vtkPolyData::SafeDownCast(ds) && !vtkUnstructuredGrid::SafeDownCast(ds))
    {
      error = "Load Integration takes Wall Traction's output (polydata or unstructured grids); "
              "block '" +
        leaves[i].Name + "' is a " + ds->GetClassName() + ".";
      continue;
    }
    auto need = [&](const char* name, int comps, ArrayView& view) -> vtkDataArray* {
      if (!error.empty())
      {
        return nullptr;
      }
      vtkDataArray* a = FindSelectedArray(ds, ArraySelection{ name, false }, comps,
        "Load Integration needs the Wall Traction output:", leaves[i].Name, error);
      view = MakeArrayView(a, false);
      return a;
    };
    in.ForcePArray = need(names::PressureForce, 3, in.ForceP);
    in.ForceVArray = need(names::ViscousForce, 3, in.ForceV);
    in.AreaArray = need(names::FaceArea, 1, in.Area);
    if (error.empty() && regionSel.Set())
    {
      vtkDataArray* a = FindSelectedArray(ds, regionSel, 1, "Region Array", leaves[i].Name, error);
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
            error = "Region Array '" + regionSel.Name + "' holds a value that is not an integer.";
            break;
          }
          // One rule on every rank: region values are integers a double
          // holds exactly (|v| < 2^53); larger ones would merge rows.
          if (std::fabs(v) >= MaximumExactRegionValue)
          {
            std::ostringstream os;
            os << "Region Array '" << regionSel.Name << "' holds the value " << std::setprecision(17)
               << v << "; region values must lie strictly between -2^53 and 2^53 ("
               << MaximumExactRegionValue << ").";
            error = os.str();
            break;
          }
          localMin = std::min(localMin, v);
          localMax = std::max(localMax, v);
        }
      }
    }
    // Straight from Wall Traction (its output unchanged): the sums it made
    // in its own face loop, over a mesh it checked; otherwise the faces are
    // summed here, after the same check.
    in.Handed = error.empty() && !regionSel.Set() &&
      FindHandedLoadSums(ds, in.ForcePArray, in.ForceVArray, in.AreaArray, in.HandedSums);
    if (error.empty() && !in.Handed &&
      !CheckPointIds(ds, leaves[i].Name, error, &this->Cache->Cells))
    {
      continue;
    }
    in.Points = MakePointView(ds);
    in.Ghosts = CellGhostMask(ds);
    in.FixedRegion = leaves[i].Region;
    if (error.empty() && !in.Points.Data)
    {
      error = "Block '" + leaves[i].Name + "' has cells but no points.";
    }
  }
  const bool noWettedArea = !input->GetFieldData()->GetArray(names::WettedArea);
  // agreed: failure, max, -min, surface cells, no Wetted Area, block
  // regions, -block regions (all by maximum).
  double agreed[7] = { error.empty() ? 0.0 : 1.0, localMax, -localMin, localCells,
    noWettedArea ? 1.0 : 0.0, static_cast<double>(numBlockRegions),
    -static_cast<double>(numBlockRegions) };
  GlobalMax(agreed, 7);
  if (agreed[0] == 0 && agreed[3] == 0 && agreed[4] > 0)
  {
    // An empty input that never went through Wall Traction (or that Wall
    // Traction refused): zero loads would be passed off as a result.
    if (noWettedArea)
    {
      error = "Load Integration's input holds no faces and no 'Wetted Area': it is not the "
              "output of Wall Traction, or Wall Traction failed upstream (see its error).";
    }
    agreed[0] = 1;
  }
  if (agreed[0] == 0 && !regionSel.Set() && agreed[5] != -agreed[6])
  {
    // Rows are blocks summed over all ranks: the ranks must list the same
    // blocks (empty where they hold no piece).
    std::ostringstream os;
    os << "The ranks hold different blocks (" << -agreed[6] << " to " << agreed[5]
       << " block regions; this rank " << numBlockRegions
       << "): Load Integration sums each block over all ranks, so every rank must hold the "
          "same blocks (empty where it has no piece). Select a Region Array to sum by region "
          "values instead.";
    error = os.str();
    agreed[0] = 1;
  }
  if (agreed[0] > 0)
  {
    ReportAgreedFailure(this, error);
    output->Initialize(); // nothing stale passed on as a result
    table->Initialize();
    summary->Initialize();
    return 0;
  }
  this->UpdateProgress(0.1);

  // Regions.
  long long regionBase = 0;
  std::size_t numRegions = numBlockRegions;
  if (regionSel.Set())
  {
    if (agreed[1] < -agreed[2])
    {
      numRegions = 0; // no counted faces anywhere
    }
    else
    {
      regionBase = static_cast<long long>(-agreed[2]);
      // Both ends lie within +-2^53 (checked above): exact in double.
      const double span = agreed[1] + agreed[2] + 1;
      if (span > static_cast<double>(MaximumRegionSpan))
      {
        vtkErrorMacro("Region Array '" << regionSel.Name << "' spans "
                                       << static_cast<long long>(span)
                                       << " values; at most " << MaximumRegionSpan
                                       << " are supported.");
        output->Initialize();
        table->Initialize();
        summary->Initialize();
        return 0;
      }
      numRegions = static_cast<std::size_t>(span);
    }
  }
  std::vector<Sums> sums(numRegions);
  const double* r0 = ref.Centre;
  double localCellsDone = 0;
  bool aborted = false;
  for (std::size_t i = 0; i < leaves.size() && !aborted; ++i)
  {
    vtkDataSet* ds = leaves[i].Data;
    if (kinds[i] != LeafKind::Surface)
    {
      continue;
    }
    if (this->GetAbortExecute())
    {
      aborted = true;
      break;
    }
    inputs[i].RegionBase = regionBase;
    if (inputs[i].Handed)
    {
      sums[static_cast<std::size_t>(inputs[i].FixedRegion)].Merge(
        MomentsAbout(inputs[i].HandedSums, r0));
      ++this->LeavesHandedOver;
    }
    else
    {
      DispatchFaces(ds, inputs[i].Points.IsFloat, [&](auto id, auto pt) {
        SumLeaf<decltype(id), decltype(pt)>(inputs[i], ds, r0, sums);
      });
      ++this->LeavesSummed;
    }
    localCellsDone += static_cast<double>(ds->GetNumberOfCells());
    this->UpdateProgress(0.1 + 0.8 * (localCells > 0 ? localCellsDone / localCells : 1.0));
  }

  // One reduction of every running sum and its compensation, and of the
  // abort request (the last value).
  const std::size_t numFlags = regionSel.Set() ? 0 : blockFlags.size();
  std::vector<double> flat(numRegions * NumLoadSlots * 2 + numFlags + 1);
  for (std::size_t r = 0; r < numRegions; ++r)
  {
    for (std::size_t k = 0; k < NumLoadSlots; ++k)
    {
      flat[(r * NumLoadSlots + k) * 2] = sums[r].Sums.Terms[k].Sum;
      flat[(r * NumLoadSlots + k) * 2 + 1] = sums[r].Sums.Terms[k].Carry;
    }
  }
  std::copy(blockFlags.begin(), blockFlags.begin() + static_cast<std::ptrdiff_t>(numFlags),
    flat.begin() + static_cast<std::ptrdiff_t>(numRegions * NumLoadSlots * 2));
  flat.back() = aborted ? 1.0 : 0.0;
  GlobalSum(flat.data(), static_cast<int>(flat.size()));
  if (flat.back() > 0)
  {
    // Stopped on request: nothing partial is passed on as a result.
    output->Initialize();
    table->Initialize();
    summary->Initialize();
    return 1;
  }

  const bool coefficients = ref.DynamicPressure() * ref.Values.Area > 0;
  std::vector<std::string> rowNames;
  std::vector<double> rowIds;
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
    const double* flags = flat.data() + numRegions * NumLoadSlots * 2 + 2 * r;
    if (!regionSel.Set() && flags[1] > 0 && flags[0] == 0)
    {
      continue; // a volume block: no wall faces, no row
    }
    RegionLoads<double> loads;
    FinishRegion(slots, r0, axes, ref.Values, loads);
    rows.push_back(loads);
    if (regionSel.Set())
    {
      const long long id = regionBase + static_cast<long long>(r);
      rowIds.push_back(static_cast<double>(id));
      rowNames.push_back(regionSel.Name + " " + std::to_string(id));
    }
    else
    {
      rowIds.push_back(static_cast<double>(r));
      rowNames.push_back(regionNames[r]);
    }
  }
  double total[NumLoadSlots];
  for (std::size_t k = 0; k < NumLoadSlots; ++k)
  {
    total[k] = totalSlots[k].Value();
  }
  RegionLoads<double> totalLoads;
  FinishRegion(total, r0, axes, ref.Values, totalLoads);

  // Port 0: the input plus the totals and reference values as field data
  // (global on every rank).
  output->ShallowCopy(input);
  vtkSmartPointer<vtkFieldData> fd = vtkSmartPointer<vtkFieldData>::New();
  fd->ShallowCopy(input->GetFieldData());
  AddTotals(fd, totalLoads, coefficients, ref);
  output->SetFieldData(fd);

  // Ports 1 and 2: the tables, on rank 0 only.
  table->Initialize();
  summary->Initialize();
  if (ProcessRank() == 0)
  {
    rows.push_back(totalLoads);
    rowNames.emplace_back("Total");
    rowIds.push_back(std::nan(""));
    FillTables(table, summary, rows, rowNames, rowIds, coefficients, ref);
    std::ostringstream info;
    info << Describe(ref, coefficients);
    if (!passed.empty())
    {
      info << " Blocks without 2D cells left out (no wall faces): " << QuotedList(passed, 12)
           << ".";
    }
    Notice(this, info.str());
    double upstreamSpeed = 0, upstreamQ = 0;
    if (FieldVector(input->GetFieldData(), "Reference Speed", &upstreamSpeed, 1) &&
      upstreamSpeed > 0 && FieldVector(input->GetFieldData(), "Dynamic Pressure", &upstreamQ, 1) &&
      std::fabs(upstreamQ - ref.DynamicPressure()) > 1e-9 * std::max(upstreamQ, ref.DynamicPressure()))
    {
      vtkWarningMacro("Load Integration's dynamic pressure q = "
        << ref.DynamicPressure() << " Pa (Reference Density " << ref.Values.Density
        << " kg/m^3, Reference Speed " << ref.Values.Speed
        << " m/s) differs from the q = " << upstreamQ
        << " Pa of Wall Traction's pressure and skin friction coefficients: set the density "
           "and speed in Wall Traction only, and leave them 0 here.");
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
    WarnNonFinite(this, totalLoads, coefficients, ref);
  }
  this->UpdateProgress(1.0);
  return 1;
}

//------------------------------------------------------------------------------
const char* vtkLoadIntegration::GetColumnUnit(const char* name)
{
  return wallloads::columns::UnitOf(name);
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

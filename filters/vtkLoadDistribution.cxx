// SPDX-License-Identifier: BSD-3-Clause
#include "vtkLoadDistribution.h"

#include "WallLoadsColumns.h"
#include "WallLoadsDefaults.h"
#include "WallLoadsPipeline.h"
#include "wallloads/CompensatedSum.h"
#include "wallloads/FaceGeometry.h"
#include "wallloads/PolygonBinning.h"

#include "vtkDataSet.h"
#include "vtkDoubleArray.h"
#include "vtkFieldData.h"
#include "vtkInformation.h"
#include "vtkInformationVector.h"
#include "vtkIntArray.h"
#include "vtkObjectFactory.h"
#include "vtkSMPThreadLocal.h"
#include "vtkSMPTools.h"
#include "vtkSmartPointer.h"
#include "vtkTable.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <sstream>
#include <string>
#include <utility>
#include <vector>

vtkStandardNewMacro(vtkLoadDistribution);

namespace
{
using namespace wallloads;
using Sum = CompensatedSum<double>;

/// Running sums of a bin, in the order they are reduced across ranks.
enum BinSlot : std::size_t
{
  BinAreaSlot = 0,
  BinPressureForceSlot = 1, // 3 slots
  BinViscousForceSlot = 4,  // 3 slots
  BinMomentSlot = 7,        // 3 slots
  NumBinSlots = 10
};
/// Running sums of the whole input, after the bins' slots.
enum GlobalSlot : std::size_t
{
  FacesSlot = 0,
  SkippedSlot = 1,
  OutsideAreaSlot = 2,
  NumGlobalSlots = 3
};

/// The settings of one execution (properties, checked and resolved).
struct Settings
{
  double Origin[3], Direction[3], Centre[3];
  int NumberOfBins = 0;
  bool CustomRange = false;
  double Range[2] = { 0, 0 };
  ResolvedAxes Axes;
};

/// The checked arrays of one surface leaf.
struct LeafInputs
{
  ArrayView ForceP, ForceV, Area;
  PointView Points;
  const unsigned char* Ghosts = nullptr;
};

/// A face that carries a load: counted (not a ghost), a 2D cell, with finite
/// forces and area. Returns 0 for cells that are not faces, -1 for faces left
/// out (skipped), 1 otherwise (with `ids`, `n`, the forces and the area).
template <typename I>
int AcceptFace(const LeafInputs& in, const FaceTopology<I>& topo, vtkIdType c, I buffer[4],
  const I*& ids, int& n, double fp[3], double fv[3], double& area)
{
  if (!IsCountedCell(in.Ghosts, c))
  {
    return 0;
  }
  n = topo.Corners(c, ids, buffer);
  if (n == 0)
  {
    return 0; // not a face (vertex, line, 3D cell): Wall Traction counted it
  }
  for (int k = 0; k < 3; ++k)
  {
    fp[k] = in.ForceP.Get(c, k);
    fv[k] = in.ForceV.Get(c, k);
  }
  area = in.Area.Get(c, 0);
  return AllFinite(fp, 3) && AllFinite(fv, 3) && std::isfinite(area) ? 1 : -1;
}

/// Extent along the axis of the corners of the faces that carry a load
/// (faces Wall Traction skipped carry NaN and are left out), per thread.
template <typename I, typename P>
struct ExtentLoop
{
  const LeafInputs& In;
  const FaceTopology<I>& Topo;
  const AxisBins<double>& Axis;
  vtkSMPThreadLocal<std::array<double, 2>> Local;

  ExtentLoop(const LeafInputs& in, const FaceTopology<I>& topo, const AxisBins<double>& axis)
    : In(in)
    , Topo(topo)
    , Axis(axis)
  {
  }

  void Initialize() { this->Local.Local() = { VTK_DOUBLE_MAX, -VTK_DOUBLE_MAX }; }

  void operator()(vtkIdType begin, vtkIdType end)
  {
    std::array<double, 2>& range = this->Local.Local();
    const P* points = static_cast<const P*>(In.Points.Data);
    for (vtkIdType c = begin; c < end; ++c)
    {
      I buffer[4];
      const I* ids = nullptr;
      int n = 0;
      double fp[3], fv[3], area;
      if (AcceptFace<I>(In, Topo, c, buffer, ids, n, fp, fv, area) != 1)
      {
        continue;
      }
      for (int k = 0; k < n; ++k)
      {
        const double s = this->Axis.Coordinate(points + 3 * ids[k]);
        if (std::isfinite(s))
        {
          range[0] = std::min(range[0], s);
          range[1] = std::max(range[1], s);
        }
      }
    }
  }

  void Reduce() {}
};

template <typename I, typename P>
void ExtentOfLeaf(const LeafInputs& in, vtkDataSet* ds, const AxisBins<double>& axis, double& lo,
  double& hi)
{
  FaceTopology<I> topo;
  MakeFaceTopology<I>(ds, topo);
  ExtentLoop<I, P> loop(in, topo, axis);
  vtkSMPTools::For(0, ds->GetNumberOfCells(), loop);
  for (const std::array<double, 2>& range : loop.Local)
  {
    lo = std::min(lo, range[0]);
    hi = std::max(hi, range[1]);
  }
}

/// The face loop: each face's force shared among the bins by clipped area.
template <typename I, typename P>
struct BinLoop
{
  const LeafInputs& In;
  const FaceTopology<I>& Topo;
  const AxisBins<double>& Bins;
  const double* R0;
  std::size_t Size;
  vtkSMPThreadLocal<std::vector<Sum>> Local;

  BinLoop(const LeafInputs& in, const FaceTopology<I>& topo, const AxisBins<double>& bins,
    const double* r0)
    : In(in)
    , Topo(topo)
    , Bins(bins)
    , R0(r0)
    , Size(static_cast<std::size_t>(bins.Count) * NumBinSlots + NumGlobalSlots)
  {
  }

  void Initialize() { this->Local.Local().assign(this->Size, Sum()); }

  void operator()(vtkIdType begin, vtkIdType end)
  {
    std::vector<Sum>& sums = this->Local.Local();
    Sum* global = sums.data() + static_cast<std::size_t>(this->Bins.Count) * NumBinSlots;
    const P* points = static_cast<const P*>(In.Points.Data);
    for (vtkIdType c = begin; c < end; ++c)
    {
      I buffer[4];
      const I* ids = nullptr;
      int n = 0;
      double fp[3], fv[3], area;
      FaceFrame<double> frame;
      int accepted = AcceptFace<I>(In, Topo, c, buffer, ids, n, fp, fv, area);
      if (accepted > 0 && ComputeFaceFrame<double>(points, ids, n, frame) != FaceStatus::Ok)
      {
        accepted = -1; // degenerate or not finite: Wall Traction skipped it too
      }
      if (accepted <= 0)
      {
        if (accepted < 0)
        {
          global[SkippedSlot].Add(1.0);
        }
        continue;
      }
      const double inside = BinFace<double>(points, ids, n, frame, this->Bins,
        [&](int b, const double*, double part, const double centroid[3]) {
          const double w = part / frame.Area;
          Sum* s = sums.data() + static_cast<std::size_t>(b) * NumBinSlots;
          const double arm[3] = { centroid[0] - R0[0], centroid[1] - R0[1], centroid[2] - R0[2] };
          const double f[3] = { (fp[0] + fv[0]) * w, (fp[1] + fv[1]) * w, (fp[2] + fv[2]) * w };
          double m[3];
          Cross(arm, f, m);
          s[BinAreaSlot].Add(area * w);
          for (std::size_t k = 0; k < 3; ++k)
          {
            s[BinPressureForceSlot + k].Add(fp[k] * w);
            s[BinViscousForceSlot + k].Add(fv[k] * w);
            s[BinMomentSlot + k].Add(m[k]);
          }
        });
      global[FacesSlot].Add(1.0);
      if (CrossesRangeEnds<double>(points, ids, n, this->Bins))
      {
        global[OutsideAreaSlot].Add(area * (frame.Area - inside) / frame.Area);
      }
    }
  }

  void Reduce() {}
};

template <typename I, typename P>
void BinLeaf(const LeafInputs& in, vtkDataSet* ds, const AxisBins<double>& bins, const double* r0,
  std::vector<Sum>& total)
{
  FaceTopology<I> topo;
  MakeFaceTopology<I>(ds, topo);
  BinLoop<I, P> loop(in, topo, bins, r0);
  vtkSMPTools::For(0, ds->GetNumberOfCells(), loop);
  for (const std::vector<Sum>& local : loop.Local)
  {
    for (std::size_t k = 0; k < total.size(); ++k)
    {
      total[k].Merge(local[k]);
    }
  }
}

/// Check the properties (the same on every rank) and resolve the load axes.
bool ResolveSettings(vtkLoadDistribution* self, vtkFieldData* upstream, Settings& s,
  std::string& error)
{
  self->GetAxisOrigin(s.Origin);
  self->GetAxisDirection(s.Direction);
  self->GetMomentCentre(s.Centre);
  s.NumberOfBins = self->GetNumberOfBins();
  s.CustomRange = self->GetUseCustomRange() != 0;
  self->GetRange(s.Range);
  // Scale the direction by its largest component first, so that its norm
  // neither overflows nor underflows (1e200 and 1e-200 are directions too).
  const double largest =
    std::max(std::fabs(s.Direction[0]), std::max(std::fabs(s.Direction[1]), std::fabs(s.Direction[2])));
  if (largest > 0 && std::isfinite(largest))
  {
    for (double& d : s.Direction)
    {
      d /= largest;
    }
  }
  std::ostringstream os;
  if (!(Norm(s.Direction) > 0) || !AllFinite(s.Direction, 3))
  {
    os << "Axis Direction (" << s.Direction[0] << ", " << s.Direction[1] << ", "
       << s.Direction[2] << ") must be finite and non-zero.";
  }
  else if (!AllFinite(s.Origin, 3) || !AllFinite(s.Centre, 3))
  {
    os << "Axis Origin and Moment Centre must be finite.";
  }
  else if (s.NumberOfBins < 1 || s.NumberOfBins > vtkLoadDistribution::MaximumNumberOfBins)
  {
    os << "Number Of Bins is " << s.NumberOfBins << "; it must be from 1 to "
       << vtkLoadDistribution::MaximumNumberOfBins << ".";
  }
  else if (s.CustomRange &&
    (!std::isfinite(s.Range[0]) || !std::isfinite(s.Range[1]) || !(s.Range[1] > s.Range[0])))
  {
    os << "Range (" << s.Range[0] << ", " << s.Range[1]
       << ") must be two finite positions along the axis (m), the second above the first.";
  }
  error = os.str();
  if (!error.empty())
  {
    return false;
  }
  return ResolveLoadAxes(self->GetDragDirection(), self->GetLiftDirection(), upstream, s.Axes,
    error);
}

/// Check every surface leaf's arrays (no collective). Returns the checked
/// inputs; `error` is set on the first failure.
void CheckLeaves(const std::vector<Leaf>& leaves, std::vector<LeafKind>& kinds,
  std::vector<LeafInputs>& inputs, std::string& error)
{
  kinds.assign(leaves.size(), LeafKind::Empty);
  inputs.assign(leaves.size(), LeafInputs());
  for (std::size_t i = 0; i < leaves.size() && error.empty(); ++i)
  {
    kinds[i] = ClassifyLeaf(leaves[i].Data);
    if (kinds[i] != LeafKind::Surface)
    {
      continue;
    }
    vtkDataSet* ds = leaves[i].Data;
    const std::string& name = leaves[i].Name;
    if (!CheckGhostArrays(ds, name, error) || !CheckPointIds(ds, name, error))
    {
      return;
    }
    LeafInputs& in = inputs[i];
    const char* role = "Load Distribution needs the Wall Traction output:";
    const std::pair<const char*, int> wanted[3] = { { names::PressureForce, 3 },
      { names::ViscousForce, 3 }, { names::FaceArea, 1 } };
    ArrayView* views[3] = { &in.ForceP, &in.ForceV, &in.Area };
    for (int k = 0; k < 3 && error.empty(); ++k)
    {
      vtkDataArray* a = FindSelectedArray(
        ds, ArraySelection{ wanted[k].first, false }, wanted[k].second, role, name, error);
      *views[k] = MakeArrayView(a, false);
    }
    in.Points = MakePointView(ds);
    in.Ghosts = CellGhostMask(ds);
    if (error.empty() && !in.Points.Data)
    {
      error = "Block '" + name + "' has cells but no points.";
    }
  }
}

constexpr const char* NotFromTraction =
  "Load Distribution's input holds no faces and no 'Wetted Area': it is not the output of Wall "
  "Traction, or Wall Traction failed upstream (see its error).";

/// After the per-bin and global sums: slots summed over the ranks in the
/// same reduction.
enum TailSlot : std::size_t
{
  FailuresSlot = 0, ///< ranks whose input is bad
  SurfacesSlot = 1, ///< surface leaves
  AbortSlot = 2,    ///< ranks asked to stop
  NumTailSlots = 3
};

enum class Agreement
{
  Ok,
  Failed,  ///< bad input on some rank
  NoFaces, ///< no face carries a load anywhere
  NoLength ///< the faces span no length along the axis
};

/// The default range: the extent of the faces along the axis, agreed over
/// all ranks in one collective with the validation outcome.
Agreement AgreeOnExtent(const std::vector<Leaf>& leaves, const std::vector<LeafKind>& kinds,
  const std::vector<LeafInputs>& inputs, const Settings& s, bool fromTraction, std::string& error,
  double range[2])
{
  AxisBins<double> axis;
  MakeAxisBins(s.Origin, s.Direction, 0.0, 1.0, 1, axis); // checked by ResolveSettings
  double lo = VTK_DOUBLE_MAX, hi = -VTK_DOUBLE_MAX, surfaces = 0;
  for (std::size_t i = 0; i < leaves.size(); ++i)
  {
    if (kinds[i] != LeafKind::Surface)
    {
      continue;
    }
    surfaces += 1;
    if (error.empty())
    {
      DispatchFaces(leaves[i].Data, inputs[i].Points.IsFloat, [&](auto id, auto pt) {
        ExtentOfLeaf<decltype(id), decltype(pt)>(inputs[i], leaves[i].Data, axis, lo, hi);
      });
    }
  }
  double agreed[4] = { error.empty() ? 0.0 : 1.0, hi, -lo, surfaces };
  GlobalMax(agreed, 4);
  if (agreed[0] == 0 && agreed[3] == 0 && !fromTraction)
  {
    // An empty input that never went through Wall Traction (or that Wall
    // Traction refused): zero loads would be passed off as a result.
    error = NotFromTraction;
    agreed[0] = 1;
  }
  range[0] = -agreed[2];
  range[1] = agreed[1];
  if (agreed[0] > 0)
  {
    return Agreement::Failed;
  }
  if (range[1] < range[0])
  {
    return Agreement::NoFaces;
  }
  return range[1] > range[0] ? Agreement::Ok : Agreement::NoLength;
}

/// The local pass over every surface leaf (none when `valid` is false), as
/// the flat vector that is reduced: per-bin and global sums with their
/// carries, then the tail slots.
std::vector<double> BinLeaves(vtkAlgorithm* self, const std::vector<Leaf>& leaves,
  const std::vector<LeafKind>& kinds, const std::vector<LeafInputs>& inputs,
  const AxisBins<double>& bins, const double* centre, bool valid)
{
  std::vector<Sum> sums(static_cast<std::size_t>(bins.Count) * NumBinSlots + NumGlobalSlots);
  double tail[NumTailSlots] = { valid ? 0.0 : 1.0, 0.0, 0.0 };
  for (std::size_t i = 0; i < leaves.size(); ++i)
  {
    if (kinds[i] != LeafKind::Surface)
    {
      continue;
    }
    tail[SurfacesSlot] += 1;
    if (!valid)
    {
      continue;
    }
    if (self->GetAbortExecute())
    {
      tail[AbortSlot] = 1;
      break;
    }
    DispatchFaces(leaves[i].Data, inputs[i].Points.IsFloat, [&](auto id, auto pt) {
      BinLeaf<decltype(id), decltype(pt)>(inputs[i], leaves[i].Data, bins, centre, sums);
    });
    self->UpdateProgress(0.1 + 0.8 * static_cast<double>(i + 1) / leaves.size());
  }
  std::vector<double> flat(2 * sums.size() + NumTailSlots);
  for (std::size_t k = 0; k < sums.size(); ++k)
  {
    flat[2 * k] = sums[k].Sum;
    flat[2 * k + 1] = sums[k].Carry;
  }
  std::copy(tail, tail + NumTailSlots, flat.end() - NumTailSlots);
  return flat;
}

/// A global slot of the reduced sums (value plus carry).
double GlobalValue(const std::vector<double>& flat, const AxisBins<double>& bins, std::size_t slot)
{
  const std::size_t at = 2 * (static_cast<std::size_t>(bins.Count) * NumBinSlots + slot);
  return flat[at] + flat[at + 1];
}

/// The information message: bins, axis, range, faces and load axes used.
std::string Summary(const AxisBins<double>& bins, const Settings& s, double faces)
{
  std::ostringstream info;
  const auto vec = [&info](const double* v) {
    info << "(" << v[0] << ", " << v[1] << ", " << v[2] << ")";
  };
  info << bins.Count << " bins from " << bins.Start << " to " << bins.End << " m along ";
  vec(bins.Axis);
  info << " through ";
  vec(bins.Origin);
  info << (s.CustomRange ? " (custom range)" : " (the extent of the faces)") << "; "
       << static_cast<vtkIdType>(faces) << " faces; drag direction ";
  vec(s.Axes.Axes.Drag);
  info << " (" << s.Axes.DragFrom << "), lift direction ";
  vec(s.Axes.Axes.Lift);
  info << " (" << s.Axes.LiftFrom << "); moments about ";
  vec(s.Centre);
  info << " m.";
  return info.str();
}

vtkSmartPointer<vtkDoubleArray> NewColumn(const char* name, int components, vtkIdType rows)
{
  auto column = vtkSmartPointer<vtkDoubleArray>::New();
  column->SetName(name);
  column->SetNumberOfComponents(components);
  column->SetNumberOfTuples(rows);
  SetUnits(column, columns::UnitOf(name));
  return column;
}

/// The table: one row per bin from the reduced sums (value and carry per
/// slot), and the field data that records how it was made.
void FillTable(vtkTable* table, const AxisBins<double>& bins, const Settings& s,
  const std::vector<double>& flat)
{
  const vtkIdType n = bins.Count;
  auto binIds = vtkSmartPointer<vtkIntArray>::New();
  binIds->SetName("Bin");
  binIds->SetNumberOfTuples(n);
  SetUnits(binIds, columns::UnitOf("Bin"));
  table->AddColumn(binIds);
  std::vector<vtkSmartPointer<vtkDoubleArray>> cols;
  for (const columns::NamedUnit& col : columns::DistributionColumns)
  {
    if (std::string(col.Name) != "Bin")
    {
      cols.push_back(NewColumn(col.Name, col.Components, n));
      table->AddColumn(cols.back());
    }
  }
  auto slot = [&](vtkIdType b, std::size_t k) {
    const std::size_t at = 2 * (static_cast<std::size_t>(b) * NumBinSlots + k);
    Sum v;
    v.Sum = flat[at];
    v.Carry = flat[at + 1];
    return v.Value();
  };
  CompensatedSum<double> cumulative[3];
  const LoadAxes<double>& axes = s.Axes.Axes;
  for (vtkIdType b = 0; b < n; ++b)
  {
    const double start = bins.Edge(static_cast<int>(b));
    const double end = bins.Edge(static_cast<int>(b) + 1);
    const double width = end - start;
    double fp[3], fv[3], f[3], m[3], cum[3];
    for (std::size_t k = 0; k < 3; ++k)
    {
      fp[k] = slot(b, BinPressureForceSlot + k);
      fv[k] = slot(b, BinViscousForceSlot + k);
      f[k] = fp[k] + fv[k];
      m[k] = slot(b, BinMomentSlot + k);
      cumulative[k].Add(f[k]);
      cum[k] = cumulative[k].Value();
    }
    const double fpl[3] = { fp[0] / width, fp[1] / width, fp[2] / width };
    const double fvl[3] = { fv[0] / width, fv[1] / width, fv[2] / width };
    const double fl[3] = { f[0] / width, f[1] / width, f[2] / width };
    binIds->SetValue(b, static_cast<int>(b));
    const double centre = 0.5 * (start + end);
    const double area = slot(b, BinAreaSlot);
    const double drag = Dot(fl, axes.Drag), side = Dot(fl, axes.Side), lift = Dot(fl, axes.Lift);
    // In the order of WALLLOADS_DISTRIBUTION_COLUMNS after Bin.
    const double* values[] = { &start, &end, &centre, &area, fpl, fvl, fl, &drag, &side, &lift,
      cum, m };
    static_assert(sizeof(values) / sizeof(values[0]) + 1 ==
        sizeof(columns::DistributionColumns) / sizeof(columns::NamedUnit),
      "one value per Load Distribution column");
    for (std::size_t c = 0; c < cols.size(); ++c)
    {
      cols[c]->SetTypedTuple(b, values[c]);
    }
  }
  const double width = bins.Edge(1) - bins.Edge(0);
  const double skipped = GlobalValue(flat, bins, SkippedSlot);
  const double outside = GlobalValue(flat, bins, OutsideAreaSlot);
  const double* fields[] = { bins.Origin, bins.Axis, &width, s.Centre, axes.Drag, axes.Side,
    axes.Lift, &skipped, &outside };
  vtkFieldData* fd = table->GetFieldData();
  std::size_t k = 0;
  for (const columns::NamedUnit& col : columns::DistributionFields)
  {
    SetFieldValue(fd, col.Name, fields[k++], col.Components);
    SetUnits(fd->GetAbstractArray(col.Name), col.Unit);
  }
}
} // namespace

//------------------------------------------------------------------------------
vtkLoadDistribution::vtkLoadDistribution() = default;

//------------------------------------------------------------------------------
int vtkLoadDistribution::FillInputPortInformation(int, vtkInformation* info)
{
  info->Remove(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE());
  info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkPolyData");
  info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkUnstructuredGrid");
  info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkDataObjectTree");
  return 1;
}

//------------------------------------------------------------------------------
int vtkLoadDistribution::RequestData(
  vtkInformation*, vtkInformationVector** inputVector, vtkInformationVector* outputVector)
{
  vtkDataObject* input = vtkDataObject::GetData(inputVector[0], 0);
  vtkTable* table = vtkTable::GetData(outputVector, 0);
  if (!input || !table)
  {
    vtkErrorMacro("Missing input or output.");
    return 0;
  }
  table->Initialize();
  // Fetch: the settings are the same on every rank (properties, and the
  // global field data of Wall Traction), so all ranks agree on failing here.
  Settings s;
  std::string error;
  if (!ResolveSettings(this, input->GetFieldData(), s, error))
  {
    vtkErrorMacro(<< error);
    return 0;
  }
  // Validate every leaf locally (no collective).
  std::vector<Leaf> leaves;
  std::vector<std::string> regionNames;
  ListLeaves(input, leaves, regionNames);
  std::vector<LeafKind> kinds;
  std::vector<LeafInputs> inputs;
  CheckLeaves(leaves, kinds, inputs, error);
  const bool fromTraction = input->GetFieldData()->GetArray(names::WettedArea) != nullptr;

  // The bins: a custom range is known now; the faces' extent is agreed with
  // the validation outcome in one collective.
  double range[2] = { s.Range[0], s.Range[1] };
  if (!s.CustomRange)
  {
    switch (AgreeOnExtent(leaves, kinds, inputs, s, fromTraction, error, range))
    {
      case Agreement::Failed:
        ReportAgreedFailure(this, error);
        return 0;
      case Agreement::NoFaces:
        if (ProcessRank() == 0)
        {
          vtkWarningMacro("Load Distribution: the input holds no wall faces with a load; the table "
                          "is empty (set Use Custom Range for empty bins).");
        }
        return 1;
      case Agreement::NoLength:
        vtkErrorMacro("The faces span no length along the axis (all at "
          << range[0] << " m): choose another Axis Direction, or set Use Custom Range and Range.");
        return 0;
      case Agreement::Ok:
        break;
    }
  }
  AxisBins<double> bins;
  if (!MakeAxisBins(s.Origin, s.Direction, range[0], range[1], s.NumberOfBins, bins))
  {
    // Reached only with a range that is not finite (faces near +-1e308): the
    // same on every rank, which all stop here.
    vtkErrorMacro("The bins cannot be made over (" << range[0] << ", " << range[1]
                                                   << ") m along the axis: set a finite Range.");
    return 0;
  }
  this->UpdateProgress(0.1);

  // Dispatch: one local pass over every leaf (none where the input is bad),
  // then one reduction of the sums with their carries, the failures, the
  // surface leaves and an abort request.
  std::vector<double> flat = BinLeaves(this, leaves, kinds, inputs, bins, s.Centre, error.empty());
  GlobalSum(flat.data(), static_cast<int>(flat.size()));
  double* tail = flat.data() + flat.size() - NumTailSlots;
  if (tail[FailuresSlot] == 0 && tail[SurfacesSlot] == 0 && !fromTraction)
  {
    error = NotFromTraction;
    tail[FailuresSlot] = 1;
  }
  if (tail[FailuresSlot] > 0)
  {
    ReportAgreedFailure(this, error);
    return 0;
  }
  if (tail[AbortSlot] > 0 || ProcessRank() != 0)
  {
    return 1; // stopped on request (no partial result), or not rank 0
  }

  // Attach: the table on rank 0, and what was done.
  FillTable(table, bins, s, flat);
  Notice(this, Summary(bins, s, GlobalValue(flat, bins, FacesSlot)));
  const double skipped = GlobalValue(flat, bins, SkippedSlot);
  const double outside = GlobalValue(flat, bins, OutsideAreaSlot);
  if (skipped > 0)
  {
    vtkWarningMacro("Load Distribution: " << static_cast<vtkIdType>(skipped)
                                          << " faces carry no finite load, area or geometry and "
                                             "are left out (see 'Skipped Faces').");
  }
  if (outside > 0)
  {
    vtkWarningMacro("Load Distribution: a wall area of "
      << outside << " m^2 lies outside the Range and is in no bin ('Area Outside Range').");
  }
  this->UpdateProgress(1.0);
  return 1;
}

//------------------------------------------------------------------------------
void vtkLoadDistribution::PrintSelf(ostream& os, vtkIndent indent)
{
  this->Superclass::PrintSelf(os, indent);
  auto vec = [&os](const char* name, const double* v) {
    os << name << ": " << v[0] << " " << v[1] << " " << v[2] << "\n";
  };
  os << indent;
  vec("AxisOrigin", this->AxisOrigin);
  os << indent;
  vec("AxisDirection", this->AxisDirection);
  os << indent << "NumberOfBins: " << this->NumberOfBins << "\n";
  os << indent << "UseCustomRange: " << this->UseCustomRange << "\n";
  os << indent << "Range: " << this->Range[0] << " " << this->Range[1] << "\n";
  os << indent;
  vec("MomentCentre", this->MomentCentre);
  os << indent;
  vec("DragDirection", this->DragDirection);
  os << indent;
  vec("LiftDirection", this->LiftDirection);
}

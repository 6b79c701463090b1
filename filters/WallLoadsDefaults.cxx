// SPDX-License-Identifier: BSD-3-Clause
#include "WallLoadsDefaults.h"

#include "WallLoadsColumns.h"
#include "WallLoadsPipeline.h"

#include "vtkAbstractArray.h"
#include "vtkCellData.h"
#include "vtkCellTypes.h"
#include "vtkDataArray.h"
#include "vtkDataSet.h"
#include "vtkFieldData.h"
#include "vtkInformation.h"
#include "vtkMultiProcessController.h"
#include "vtkObject.h"
#include "vtkPointData.h"
#include "vtkPolyData.h"
#include "vtkUnsignedCharArray.h"
#include "vtkUnstructuredGrid.h"
#include "vtkWeakPointer.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <map>
#include <mutex>
#include <sstream>

namespace wallloads
{

LeafKind ClassifyLeaf(vtkDataSet* ds)
{
  if (!ds || ds->GetNumberOfCells() == 0)
  {
    return LeafKind::Empty;
  }
  if (auto* pd = vtkPolyData::SafeDownCast(ds))
  {
    return pd->GetNumberOfPolys() + pd->GetNumberOfStrips() > 0 ? LeafKind::Surface
                                                                 : LeafKind::NoFaces;
  }
  if (auto* ug = vtkUnstructuredGrid::SafeDownCast(ds))
  {
    vtkUnsignedCharArray* types = ug->GetCellTypesArray();
    if (types && types->GetNumberOfTuples() == ug->GetNumberOfCells())
    {
      const unsigned char* t = types->GetPointer(0);
      for (vtkIdType c = 0, n = ug->GetNumberOfCells(); c < n; ++c)
      {
        if (vtkCellTypes::GetDimension(t[c]) == 2)
        {
          return LeafKind::Surface;
        }
      }
      return LeafKind::NoFaces;
    }
    return LeafKind::Surface; // malformed: let the surface checks report it
  }
  // Other dataset types (image data, structured grids): a 3D one is a
  // volume; anything else goes to the surface checks, which report it.
  // VTK reads the ghost arrays of structured data unchecked in GetCellType
  // (a short one crashes): a bad one goes to the surface checks too.
  std::string ghostError;
  if (!CheckGhostArrays(ds, std::string(), ghostError))
  {
    return LeafKind::Surface;
  }
  return ds->GetCellType(0) != VTK_EMPTY_CELL && vtkCellTypes::GetDimension(static_cast<unsigned char>(ds->GetCellType(0))) == 3
    ? LeafKind::NoFaces
    : LeafKind::Surface;
}

namespace
{
std::string Lower(const std::string& s)
{
  std::string out(s);
  std::transform(out.begin(), out.end(), out.begin(),
    [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
  return out;
}

bool Has(const std::string& s, const char* part)
{
  return s.find(part) != std::string::npos;
}

int PressureTier(const std::string& name)
{
  const std::string n = Lower(name);
  if (Has(n, "pressure") && Has(n, "static"))
  {
    return 0;
  }
  if (n == "p" || n == "pressure")
  {
    return 1;
  }
  if (Has(n, "pressure"))
  {
    for (const char* other :
      { "total", "dynamic", "stagnation", "coefficient", "grad", "ref", "cp" })
    {
      if (Has(n, other))
      {
        return 3;
      }
    }
    return 2;
  }
  return 4;
}

bool IsFloating(vtkDataArray* a)
{
  return a && (a->GetDataType() == VTK_FLOAT || a->GetDataType() == VTK_DOUBLE);
}

/// Visit the float/double arrays of `components` components of the leaves,
/// cell data first: fn(name, onPoints).
template <typename Fn>
void ForEachCandidate(const std::vector<vtkDataSet*>& leaves, int components, Fn&& fn)
{
  for (int onPoints = 0; onPoints < 2; ++onPoints)
  {
    for (vtkDataSet* ds : leaves)
    {
      vtkFieldData* attrs = onPoints ? static_cast<vtkFieldData*>(ds->GetPointData())
                                     : static_cast<vtkFieldData*>(ds->GetCellData());
      for (int i = 0; i < attrs->GetNumberOfArrays(); ++i)
      {
        vtkDataArray* a = attrs->GetArray(i);
        if (!IsFloating(a) || !a->GetName() || a->GetNumberOfComponents() != components ||
          columns::IsOurOutput(a->GetName()) || std::string(a->GetName()).rfind("vtk", 0) == 0)
        {
          continue;
        }
        fn(std::string(a->GetName()), onPoints != 0);
      }
    }
  }
}

void Consider(ArrayChoice& best, const std::string& name, bool onPoints, int tier)
{
  const bool better = !best.Found() || tier < best.Tier;
  if (better)
  {
    if (best.Found() && best.Name != name)
    {
      best.Others.push_back(best.Name);
    }
    best.Name = name;
    best.OnPoints = onPoints;
    best.Tier = tier;
  }
  else if (name != best.Name &&
    std::find(best.Others.begin(), best.Others.end(), name) == best.Others.end())
  {
    best.Others.push_back(name);
  }
}
} // namespace

ArrayChoice ChoosePressure(const std::vector<vtkDataSet*>& leaves)
{
  ArrayChoice best;
  ForEachCandidate(leaves, 1, [&](const std::string& name, bool onPoints) {
    Consider(best, name, onPoints, PressureTier(name));
  });
  return best;
}

ArrayChoice ChooseNamedArray(const std::vector<vtkDataSet*>& leaves, int components,
  const char* fragment, const char* preferred)
{
  ArrayChoice best;
  ForEachCandidate(leaves, components, [&](const std::string& name, bool onPoints) {
    if (preferred && name == preferred)
    {
      Consider(best, name, onPoints, 0);
    }
    else if (Has(Lower(name), fragment))
    {
      Consider(best, name, onPoints, 1);
    }
  });
  return best;
}

bool AllLeavesHaveCellArray(
  const std::vector<vtkDataSet*>& leaves, const char* name, int components)
{
  double all = 1;
  for (vtkDataSet* ds : leaves)
  {
    vtkDataArray* a = ds->GetCellData()->GetArray(name);
    if (!a || a->GetNumberOfComponents() != components)
    {
      all = 0;
    }
  }
  GlobalMin(&all, 1);
  return all > 0;
}

void AgreeOnChoice(ArrayChoice& choice)
{
  vtkMultiProcessController* controller = vtkMultiProcessController::GetGlobalController();
  if (!controller || controller->GetNumberOfProcesses() < 2)
  {
    return;
  }
  const double none = 1e9;
  const double key = choice.Found() ? choice.Tier * 2.0 + (choice.OnPoints ? 1.0 : 0.0) : none;
  double agreed[2] = { key, 0 };
  GlobalMin(agreed, 1);
  agreed[1] = key == agreed[0] ? controller->GetLocalProcessId() : none;
  GlobalMin(agreed + 1, 1);
  if (agreed[0] >= none)
  {
    choice = ArrayChoice();
    return;
  }
  const int root = static_cast<int>(agreed[1]);
  int length = static_cast<int>(choice.Name.size());
  controller->Broadcast(&length, 1, root);
  std::vector<char> buffer(static_cast<std::size_t>(length) + 1, '\0');
  std::copy(choice.Name.begin(), choice.Name.end(), buffer.begin());
  controller->Broadcast(buffer.data(), length + 1, root);
  const std::string name(buffer.data(), static_cast<std::size_t>(length));
  if (name != choice.Name && choice.Found())
  {
    choice.Others.push_back(choice.Name);
  }
  choice.Name = name;
  choice.Tier = static_cast<int>(agreed[0]) / 2;
  choice.OnPoints = static_cast<int>(agreed[0]) % 2 == 1;
}

bool FieldVector(vtkFieldData* fd, const char* name, double* out, int components)
{
  vtkDataArray* a = fd ? fd->GetArray(name) : nullptr;
  if (!a || a->GetNumberOfTuples() < 1 || a->GetNumberOfComponents() != components)
  {
    return false;
  }
  for (int k = 0; k < components; ++k)
  {
    out[k] = a->GetComponent(0, k);
    if (!std::isfinite(out[k]))
    {
      return false;
    }
  }
  return true;
}

bool ResolveLoadAxes(const double dragIn[3], const double liftIn[3], vtkFieldData* upstream,
  ResolvedAxes& out, std::string& error)
{
  double drag[3] = { dragIn[0], dragIn[1], dragIn[2] };
  double lift[3] = { liftIn[0], liftIn[1], liftIn[2] };
  out.DragFrom = "set here";
  if (Norm(drag) == 0)
  {
    out.DragFrom = "Wall Traction's Load Direction";
    if (!FieldVector(upstream, "Load Direction", drag, 3) || !(Norm(drag) > 0))
    {
      drag[0] = 1;
      drag[1] = drag[2] = 0;
      out.DragFrom = "default";
    }
  }
  out.LiftFrom = "set here";
  if (Norm(lift) == 0)
  {
    // +z made orthogonal to the drag, or +x when the drag is along z.
    const double nd = Norm(drag);
    const bool alongZ = nd > 0 && std::fabs(drag[2]) > (1 - 1e-9) * nd;
    lift[0] = alongZ ? 1 : 0;
    lift[1] = 0;
    lift[2] = alongZ ? 0 : 1;
    out.LiftFrom = alongZ ? "default: +x, the drag being along z" : "default: +z";
  }
  if (!MakeLoadAxes(drag, lift, out.Axes))
  {
    std::ostringstream os;
    os << "Drag Direction (" << drag[0] << ", " << drag[1] << ", " << drag[2] << ", "
       << out.DragFrom << ") and Lift Direction (" << lift[0] << ", " << lift[1] << ", "
       << lift[2] << ", " << out.LiftFrom
       << ") must be non-zero and not parallel: set Lift Direction.";
    error = os.str();
    return false;
  }
  return true;
}

void SetUnits(vtkAbstractArray* array, const char* unit)
{
  if (array && unit && *unit)
  {
    array->GetInformation()->Set(vtkDataArray::UNITS_LABEL(), unit);
  }
}

void AttachUnits(vtkFieldData* fd)
{
  for (int i = 0; fd && i < fd->GetNumberOfArrays(); ++i)
  {
    vtkAbstractArray* a = fd->GetAbstractArray(i);
    if (a && a->GetName())
    {
      SetUnits(a, columns::UnitOf(a->GetName()));
    }
  }
}

void AttachUnits(vtkDataSet* ds)
{
  if (ds)
  {
    AttachUnits(ds->GetCellData());
    AttachUnits(ds->GetFieldData());
  }
}

void Notice(vtkObject* self, const std::string& text)
{
  if (ProcessRank() != 0 || text.empty())
  {
    return;
  }
  // A time-step loop (Load History, the report command) re-executes the
  // filters once per step with the same settings: say it once, and again
  // only when it changes. Keyed by weak pointer, so that a new filter at a
  // freed filter's address is never taken for it.
  if (self)
  {
    static std::mutex guard;
    static std::map<const vtkObject*, std::pair<vtkWeakPointer<vtkObject>, std::string>> last;
    std::lock_guard<std::mutex> lock(guard);
    for (auto it = last.begin(); it != last.end();)
    {
      it = it->second.first ? std::next(it) : last.erase(it); // forget freed filters
    }
    auto& entry = last[self];
    if (entry.first == self && entry.second == text)
    {
      return;
    }
    entry = { vtkWeakPointer<vtkObject>(self), text };
  }
  std::ostringstream os;
  os << (self ? self->GetClassName() : "WallLoads") << ": " << text << "\n";
  vtkOutputWindowDisplayText(os.str().c_str());
}

namespace
{
const char* Where(const ArrayChoice& c)
{
  return c.OnPoints ? "point" : "cell";
}
} // namespace

void ResolveAutomatic(AutomaticChoices& s, bool autoPressure, bool autoShear, bool autoOrientation,
  const std::vector<vtkDataSet*>& surfaces, double viscosity, bool kinematic, std::string& notice,
  std::string& warning)
{
  std::ostringstream note, warn;
  if (autoPressure)
  {
    ArrayChoice p = ChoosePressure(surfaces);
    AgreeOnChoice(p);
    s.Pressure = ArraySelection();
    if (p.Found())
    {
      s.Pressure = ArraySelection{ p.Name, p.OnPoints };
      note << "Pressure (Automatic) is " << Where(p) << " array '" << p.Name << "'";
      if (!p.Others.empty())
      {
        note << " (other candidates: " << QuotedList(p.Others) << ")";
      }
      note << ". ";
      if (p.Tier >= 4)
      {
        warn << "No array is named like a pressure: '" << p.Name
             << "', the first 1-component floating-point array, is taken as the pressure; "
                "choose Pressure in the panel if it is not. ";
      }
    }
    else
    {
      note << "Pressure (Automatic): no 1-component floating-point array, no pressure load. ";
    }
  }
  if (autoShear)
  {
    // Both choices are made on every rank, in this order (collectives).
    // Shear Projection's output is preferred to other shear-like arrays
    // (the wall's own pass through it).
    ArrayChoice w = ChooseNamedArray(surfaces, 3, "shear", "Wall Shear Stress");
    AgreeOnChoice(w);
    ArrayChoice g = ChooseNamedArray(surfaces, 9, "grad");
    AgreeOnChoice(g);
    if (w.Found())
    {
      s.ShearSource = ShearFromStressArray;
      s.ShearStressArray = ArraySelection{ w.Name, w.OnPoints };
      note << "Shear Source (Automatic): wall shear stress " << Where(w) << " array '" << w.Name
           << "'";
      if (!w.Others.empty())
      {
        note << " (also named like one: " << QuotedList(w.Others) << ")";
      }
      note << ". ";
    }
    else if (g.Found())
    {
      s.ShearSource = ShearVelocityGradient;
      s.VelocityGradient = ArraySelection{ g.Name, g.OnPoints };
      note << "Shear Source (Automatic): velocity gradient " << Where(g) << " array '" << g.Name
           << "' with Viscosity " << viscosity << (kinematic ? " m^2/s" : " Pa s")
           << " (set Viscosity to your fluid's). ";
    }
    else
    {
      s.ShearSource = ShearNone;
      note << "Shear Source (Automatic): no 3-component array named like a wall shear stress "
              "and no 9-component one named like a velocity gradient, no viscous load. ";
    }
  }
  if (autoOrientation)
  {
    const bool useArray = AllLeavesHaveCellArray(surfaces, "Wall Normal", 3);
    s.Orientation =
      useArray ? OrientationWallNormalArray : OrientationStoredIntoWall;
    if (useArray)
    {
      note << "Orientation (Automatic): the 'Wall Normal' cell array (from the adjacent fluid "
              "cell). ";
    }
  }
  notice = note.str();
  warning = warn.str();
}

std::string QuotedList(const std::vector<std::string>& names, std::size_t limit)
{
  std::ostringstream os;
  const std::size_t shown = std::min(limit, names.size());
  for (std::size_t i = 0; i < shown; ++i)
  {
    if (i > 0)
    {
      os << (i + 1 == names.size() ? " and " : ", ");
    }
    os << "'" << names[i] << "'";
  }
  if (names.size() > shown)
  {
    os << " and " << names.size() - shown << " more";
  }
  return os.str();
}

} // namespace wallloads

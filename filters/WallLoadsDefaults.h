// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * What makes the filters right by default and tell the user what they did:
 * which blocks of a composite are wall surfaces, the automatic choice of the
 * pressure and shear arrays (agreed across MPI ranks), units on the output
 * arrays (from WallLoadsColumns.h), and information messages. Private to the
 * module.
 */
#include "WallLoadsPipeline.h" // ArraySelection
#include "wallloads/LoadAxes.h" // LoadAxes
#include "vtkType.h"

#include <string>
#include <vector>

class vtkAbstractArray;
class vtkAlgorithm;
class vtkDataObject;
class vtkDataSet;
class vtkFieldData;
class vtkObject;

namespace wallloads
{
/// The selection value that asks Wall Traction to choose the array itself
/// (the Pressure picker's first entry).
constexpr const char* AutomaticArrayName = "Automatic";

/// What a leaf of the input is, for the surface filters.
enum class LeafKind
{
  Empty,   ///< no cells (common on some MPI ranks)
  Surface, ///< holds at least one 2D cell (polygon, triangle, quad, pixel, strip)
  NoFaces  ///< cells but none 2D: a volume block (or lines and points only)
};
LeafKind ClassifyLeaf(vtkDataSet* ds);

/// An array picked automatically.
struct ArrayChoice
{
  std::string Name;
  bool OnPoints = false;
  int Tier = -1; ///< lower is a better match of the name; -1 nothing found
  std::vector<std::string> Others; ///< other candidates seen (for the message)
  bool Found() const { return this->Tier >= 0; }
};

/**
 * The pressure among the 1-component float/double arrays of `leaves` (never
 * integers, never WallLoads outputs), by tier: 0 names with 'static' and
 * 'pressure'; 1 'p' or 'pressure'; 2 other names with 'pressure' except
 * total, dynamic, stagnation, coefficient, gradient and reference ones; 3
 * those; 4 any other array (the first one: the caller warns). Cell data
 * before point data, then the order of the arrays in the first leaf that
 * has them.
 */
ArrayChoice ChoosePressure(const std::vector<vtkDataSet*>& leaves);

/**
 * An array of `components` float/double components named exactly `preferred`
 * (tier 0; e.g. Shear Projection's "Wall Shear Stress"), else whose
 * lower-case name contains `fragment` (tier 1; e.g. 3 and "shear", 9 and
 * "grad"); cell data first.
 */
ArrayChoice ChooseNamedArray(const std::vector<vtkDataSet*>& leaves, int components,
  const char* fragment, const char* preferred = nullptr);

/// Whether every leaf holds a cell array `name` of `components` components,
/// on every rank (collective).
bool AllLeavesHaveCellArray(
  const std::vector<vtkDataSet*>& leaves, const char* name, int components);

/**
 * Make every rank hold the same choice: the best (lowest tier, cell before
 * point) over all ranks, from the lowest rank holding it. Collective: every
 * rank must call it, in the same order.
 */
void AgreeOnChoice(ArrayChoice& choice);

/// What Wall Traction's automatic settings resolve to (its Settings
/// fields, by reference). Codes as in vtkWallTraction.
struct AutomaticChoices
{
  ArraySelection& Pressure;
  int& ShearSource;
  ArraySelection& ShearStressArray;
  ArraySelection& VelocityGradient;
  int& Orientation;
};
/// vtkWallTraction's ShearSources and Orientations codes.
constexpr int ShearNone = 0, ShearFromStressArray = 1, ShearVelocityGradient = 2;
constexpr int OrientationStoredIntoWall = 0, OrientationWallNormalArray = 2;

/**
 * Resolve Wall Traction's automatic choices (Pressure "Automatic", Shear
 * Source Automatic, Orientation Automatic) from the surface leaves, agreed
 * over all ranks (collective: every rank calls it with the same flags).
 * Appends what was chosen to `notice` and doubts to `warning`.
 */
void ResolveAutomatic(AutomaticChoices& choices, bool autoPressure, bool autoShear,
  bool autoOrientation, const std::vector<vtkDataSet*>& surfaces, double viscosity,
  bool kinematic, std::string& notice, std::string& warning);

/// A field value of `components` finite numbers (the first tuple of the
/// array `name` of `fd`); false when absent, of another width or not finite.
bool FieldVector(vtkFieldData* fd, const char* name, double* out, int components);

/// The load axes the integrators use, and where each direction came from.
struct ResolvedAxes
{
  LoadAxes<double> Axes;
  std::string DragFrom, LiftFrom;
};

/**
 * Load Integration's load axes from its DragDirection and LiftDirection:
 * a drag direction (0, 0, 0) takes Wall Traction's `Load Direction` from the
 * input's field data `upstream`, else (1, 0, 0); a lift direction (0, 0, 0)
 * is +z made orthogonal to the drag, or +x when the drag is along z. False,
 * with `error` naming both directions, when no axes can be made (zero or
 * parallel directions). Every filter that reports drag, side force and lift
 * resolves them here.
 */
bool ResolveLoadAxes(const double dragIn[3], const double liftIn[3], vtkFieldData* upstream,
  ResolvedAxes& out, std::string& error);

/// Set vtkDataArray::UNITS_LABEL() on an array.
void SetUnits(vtkAbstractArray* array, const char* unit);
/// Attach the units of every WallLoads name among the arrays of `fd`.
void AttachUnits(vtkFieldData* fd);
/// Attach units to WallLoads cell arrays and field data of a dataset.
void AttachUnits(vtkDataSet* ds);

/// An information message (neither warning nor error), on rank 0 only:
/// ParaView shows it in the Output Messages without raising the window.
void Notice(vtkObject* self, const std::string& text);

/// "'a', 'b' and 'c'" (at most `limit` names, then "and N more").
std::string QuotedList(const std::vector<std::string>& names, std::size_t limit = 6);

} // namespace wallloads

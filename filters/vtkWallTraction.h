// SPDX-License-Identifier: BSD-3-Clause
/**
 * @class   vtkWallTraction
 * @brief   Pressure and viscous traction and force on every wall face.
 *
 * vtkWallTraction takes wall surfaces (vtkPolyData, or a vtkUnstructuredGrid
 * of 2D cells; plain or composite) with a pressure and, optionally, a viscous
 * source, and adds per-face cell arrays (all double, SI units):
 *
 * - `Wall Normal` (unit normal out of the wall, into the fluid)
 * - `Face Area` (m^2)
 * - `Pressure Traction` = -(p - p_ref) n (Pa), `Viscous Traction` (Pa),
 *   `Traction` = sum (Pa)
 * - `Pressure Force`, `Viscous Force`, `Force` = traction times area (N)
 * - `Normal Viscous Stress` = (tau n).n (Pa), a diagnostic; left out of the
 *   viscous traction unless IncludeNormalViscousStress is on
 * - `Directional Traction` = Traction . e, e the unit LoadDirection (Pa)
 * - `Pressure Coefficient` (p - p_ref)/q and, with a viscous source,
 *   `Skin Friction Coefficient` |tau_w|/q, when ReferenceSpeed > 0,
 *   q = 0.5 Density ReferenceSpeed^2
 *
 * and field data `Wetted Area` (m^2, summed over all ranks) and the counts of
 * faces skipped by reason (`Skipped Non-Surface Cells` for vertices, lines,
 * strips and 3D cells; `Skipped Degenerate Faces` for faces of fewer than 3
 * corners or zero area; `Skipped Non-Finite Faces` for NaN/Inf coordinates or
 * values), `Inconsistently Oriented Faces` and `Open Boundary Edges`.
 * Skipped faces carry NaN in every per-face array.
 *
 * Pressure: a cell or point array (point values are averaged over the face
 * corners); static (Pa), or per unit density (m^2/s^2) times Density or a
 * density array. ReferencePressure (Pa) is subtracted.
 *
 * Viscous source (ShearSource): none; a wall shear stress array (Pa, or per
 * unit density); or a velocity gradient array, 9 components row-major
 * G[3i+j] = du_i/dx_j (the layout of vtkGradientFilter), with
 * tau = mu_eff (G + G^T) - (2/3) mu_eff tr(G) I, mu_eff = mu + mu_t from a
 * constant or arrays, dynamic or kinematic (times density).
 * The tangential part of tau n is the wall shear stress.
 *
 * Normals come from the geometry by Newell's method. Orientation: by default
 * the stored vertex order is taken to point out of the fluid (as exported by
 * most solvers) and is flipped; or as stored; or made to agree with an
 * existing `Wall Normal` cell array. With CheckOrientation on, faces whose
 * orientation disagrees with the majority of their connected patch (through
 * shared point ids) are counted and reported.
 *
 * Arrays to process (SetInputArrayToProcess index): 0 pressure, 1 density,
 * 2 wall shear stress, 3 velocity gradient, 4 viscosity, 5 turbulent
 * viscosity. An unset or "None" name means not used.
 *
 * Ghost and MPI policy: per-face arrays are computed on every face, ghosts
 * included; ghost faces (DUPLICATECELL or HIDDENCELL) are left out of
 * `Wetted Area` and of the counts. Field-data totals are reduced over all
 * ranks of the global controller, so every rank holds the global values.
 * Composite inputs are handled whole, so ranks holding different blocks
 * take part in the same collectives. The input is never modified.
 *
 * Composite inputs may hold blocks without 2D cells (the volume of a solver
 * case, or lines and points): they pass through untouched and are named in
 * one information message. An input with volume cells and no wall face at
 * all is an error that points to Shear Projection.
 *
 * Automatic choices (the ParaView proxy's defaults; the C++ defaults are
 * unset, i.e. no pressure and ShearSource NO_SHEAR): the pressure array name
 * "Automatic" picks the pressure among the 1-component float/double arrays
 * (wallloads::ChoosePressure: names with 'pressure' first, cell data before
 * point data, never integer arrays); ShearSource AUTOMATIC_SHEAR takes a
 * 3-component array named with 'shear' as the wall shear stress, else a
 * 9-component one named with 'grad' as the velocity gradient, else none.
 * Orientation AUTOMATIC_ORIENTATION follows a 3-component `Wall Normal` cell
 * array (Shear Projection's, from the adjacent fluid cell) when every
 * surface block holds one, and flips the stored order otherwise.
 * The choices are agreed across MPI ranks and reported in an information
 * message; when no load source is left a warning says the loads are zero.
 *
 * Field data also records the reference state that Load Integration takes
 * by default: `Reference Density` (Density), `Reference Speed`, `Dynamic
 * Pressure` and `Load Direction` (unit). Units are attached to every output
 * array (vtkDataArray::UNITS_LABEL(), from WallLoadsColumns.h).
 *
 * Progress is reported per block and the filter stops between blocks when
 * asked to abort (all ranks agree; no output then).
 *
 * Errors (no output): a selected array missing (the message lists the arrays
 * that exist) or of the wrong width; a zero Load Direction. Messages use the
 * panel labels (Wall Shear Stress, Load Direction, ...).
 */
#ifndef vtkWallTraction_h
#define vtkWallTraction_h

#include "WallLoadsFiltersModule.h" // for export macro
#include "vtkPassInputTypeAlgorithm.h"

class WALLLOADSFILTERS_EXPORT vtkWallTraction : public vtkPassInputTypeAlgorithm
{
public:
  static vtkWallTraction* New();
  vtkTypeMacro(vtkWallTraction, vtkPassInputTypeAlgorithm);
  void PrintSelf(ostream& os, vtkIndent indent) override;

  /// Indices for SetInputArrayToProcess.
  enum InputArrays
  {
    PRESSURE_ARRAY = 0,
    DENSITY_ARRAY = 1,
    WALL_SHEAR_STRESS_ARRAY = 2,
    VELOCITY_GRADIENT_ARRAY = 3,
    VISCOSITY_ARRAY = 4,
    TURBULENT_VISCOSITY_ARRAY = 5
  };
  enum QuantityKinds
  {
    STATIC = 0,           ///< Pa (pressure, stress) or Pa s (viscosity: dynamic)
    PER_UNIT_DENSITY = 1  ///< m^2/s^2 (pressure, stress) or m^2/s (viscosity: kinematic)
  };
  /// PressureKind beyond STATIC and PER_UNIT_DENSITY: no pressure load.
  static constexpr int NO_PRESSURE = 2;
  enum ShearSources
  {
    NO_SHEAR = 0,
    WALL_SHEAR_STRESS = 1,
    VELOCITY_GRADIENT = 2,
    AUTOMATIC_SHEAR = 3 ///< a wall shear stress array, else a velocity gradient, else none
  };
  enum Orientations
  {
    STORED_INTO_WALL = 0,  ///< stored order points out of the fluid: flip (default)
    STORED_INTO_FLUID = 1, ///< stored order points into the fluid: keep
    WALL_NORMAL_ARRAY = 2, ///< agree with the `Wall Normal` cell array
    AUTOMATIC_ORIENTATION = 3 ///< WALL_NORMAL_ARRAY when every surface block has one, else STORED_INTO_WALL
  };

  ///@{
  /// Pressure kind: STATIC (Pa, default), PER_UNIT_DENSITY (m^2/s^2, times
  /// density) or NO_PRESSURE (no pressure load, whatever array is selected).
  vtkSetClampMacro(PressureKind, int, STATIC, NO_PRESSURE);
  vtkGetMacro(PressureKind, int);
  ///@}

  ///@{
  /// Reference pressure p_ref in Pa, subtracted from the static pressure. Default 0.
  vtkSetMacro(ReferencePressure, double);
  vtkGetMacro(ReferencePressure, double);
  ///@}

  ///@{
  /// Density in kg/m^3 (default 1): multiplies per-unit-density pressure,
  /// stress and kinematic viscosity when no density array is selected, and
  /// sets the dynamic pressure of the coefficients.
  vtkSetMacro(Density, double);
  vtkGetMacro(Density, double);
  ///@}

  ///@{
  /// Viscous source: NO_SHEAR (default), WALL_SHEAR_STRESS, VELOCITY_GRADIENT
  /// or AUTOMATIC_SHEAR (the ParaView proxy's default).
  vtkSetClampMacro(ShearSource, int, NO_SHEAR, AUTOMATIC_SHEAR);
  vtkGetMacro(ShearSource, int);
  ///@}

  ///@{
  /// Kind of the wall shear stress array: STATIC (Pa, default) or PER_UNIT_DENSITY.
  vtkSetClampMacro(ShearStressKind, int, STATIC, PER_UNIT_DENSITY);
  vtkGetMacro(ShearStressKind, int);
  ///@}

  ///@{
  /// Molecular viscosity when no viscosity array is selected. Default 1.8e-5
  /// (dynamic, Pa s: air near 20 C, common practice).
  vtkSetMacro(Viscosity, double);
  vtkGetMacro(Viscosity, double);
  ///@}

  ///@{
  /// Viscosity kind, for the constant and both arrays: STATIC means dynamic
  /// (Pa s, default), PER_UNIT_DENSITY means kinematic (m^2/s, times density).
  vtkSetClampMacro(ViscosityKind, int, STATIC, PER_UNIT_DENSITY);
  vtkGetMacro(ViscosityKind, int);
  ///@}

  ///@{
  /// Keep the normal viscous stress in the viscous traction and force. Default off.
  vtkSetMacro(IncludeNormalViscousStress, bool);
  vtkGetMacro(IncludeNormalViscousStress, bool);
  vtkBooleanMacro(IncludeNormalViscousStress, bool);
  ///@}

  ///@{
  /// Orientation of the stored faces; default STORED_INTO_WALL (flip);
  /// AUTOMATIC_ORIENTATION is the ParaView proxy's default.
  vtkSetClampMacro(Orientation, int, STORED_INTO_WALL, AUTOMATIC_ORIENTATION);
  vtkGetMacro(Orientation, int);
  ///@}

  ///@{
  /// Count faces oriented against their neighbours. Default on.
  vtkSetMacro(CheckOrientation, bool);
  vtkGetMacro(CheckOrientation, bool);
  vtkBooleanMacro(CheckOrientation, bool);
  ///@}

  ///@{
  /// Direction of `Directional Traction` (normalised). Default (1, 0, 0).
  vtkSetVector3Macro(LoadDirection, double);
  vtkGetVector3Macro(LoadDirection, double);
  ///@}

  enum PerFaceArraySets
  {
    ALL_ARRAYS = 0, ///< every array listed above (default)
    FORCES_ONLY = 1 ///< `Face Area`, `Pressure Force`, `Viscous Force`: what Load Integration needs
  };

  ///@{
  /// Which per-face arrays to make. FORCES_ONLY writes 56 bytes per face
  /// instead of about 190, for batch runs that want totals only.
  vtkSetClampMacro(PerFaceArrays, int, ALL_ARRAYS, FORCES_ONLY);
  vtkGetMacro(PerFaceArrays, int);
  ///@}

  ///@{
  /// Reference speed in m/s for the coefficients; 0 (default) makes none.
  vtkSetMacro(ReferenceSpeed, double);
  vtkGetMacro(ReferenceSpeed, double);
  ///@}

  /// SI unit of a WallLoads output name (array, field value or table
  /// column; "-" for dimensionless), or nullptr for other names.
  static const char* GetArrayUnit(const char* name);

  ///@{
  /**
   * What is kept between executions (a time-step loop re-executes on the
   * same mesh), for tests and benchmarks. The orientation check's result is
   * kept per leaf while the mesh is unchanged: the same point, connectivity,
   * cell-type, ghost (and, for Orientation = Use Wall Normal array, Wall
   * Normal) arrays with unchanged modification times, or, after the exact
   * check ran (an open or inconsistent surface), new arrays with the same
   * 64-bit content hash (readers that make new objects for every step). A
   * surface certified closed and consistent in the face loop is not hashed:
   * new objects are certified again, which costs less than the hash.
   * MeshCacheHits counts leaves that reused the result (ContentHits: by
   * content), MeshCacheBuilds leaves where the check ran (certificate or
   * exact check), MeshContentHashes content hashes taken, CellOffsetScans
   * cell arrays whose offsets were scanned (not the same, unmodified arrays
   * found well formed in an earlier execution). Output arrays are
   * reused when their size matches and nothing but the filter holds them
   * (reference count 1); OutputArraysReused / Allocated count arrays. Each
   * execution also makes vtkLoadIntegration's sums of every leaf in the face
   * loop and hands them over in memory for exactly these output objects
   * (vtkLoadIntegration::GetLeavesHandedOver).
   */
  vtkIdType GetMeshCacheHits();
  vtkIdType GetMeshCacheContentHits();
  vtkIdType GetMeshCacheBuilds();
  vtkIdType GetMeshContentHashes();
  vtkIdType GetCellOffsetScans();
  vtkIdType GetOutputArraysReused();
  vtkIdType GetOutputArraysAllocated();
  ///@}

protected:
  vtkWallTraction();
  ~vtkWallTraction() override;

  int FillInputPortInformation(int port, vtkInformation* info) override;
  int RequestData(vtkInformation*, vtkInformationVector**, vtkInformationVector*) override;

  int PressureKind = STATIC;
  double ReferencePressure = 0.0;
  double Density = 1.0;
  int ShearSource = NO_SHEAR;
  int ShearStressKind = STATIC;
  double Viscosity = 1.8e-5;
  int ViscosityKind = STATIC;
  bool IncludeNormalViscousStress = false;
  int Orientation = STORED_INTO_WALL;
  bool CheckOrientation = true;
  double LoadDirection[3] = { 1.0, 0.0, 0.0 };
  double ReferenceSpeed = 0.0;
  int PerFaceArrays = ALL_ARRAYS;

private:
  struct Internals;
  Internals* Cache;
  vtkWallTraction(const vtkWallTraction&) = delete;
  void operator=(const vtkWallTraction&) = delete;
};

#endif

// SPDX-License-Identifier: BSD-3-Clause
/**
 * @class   vtkLoadIntegration
 * @brief   Totals, moments, load-axis components and coefficients of wall loads.
 *
 * vtkLoadIntegration sums the per-face `Pressure Force` and `Viscous Force`
 * (N) and `Face Area` (m^2) made by vtkWallTraction, per region and in
 * total, and reports:
 *
 * - area (m^2), pressure, viscous and total force (N);
 * - pressure, viscous and total moment about MomentCentre (N m),
 *   M = sum (c - r0) x f, c the face's area centroid;
 * - drag, side force and lift (N) along the load axes: e_D the normalised
 *   DragDirection, e_L the LiftDirection made orthogonal to e_D,
 *   e_S = e_L x e_D; rolling, pitching and yawing moments (N m) about
 *   e_D, e_S, e_L;
 * - when ReferenceSpeed > 0, coefficients C = F / (q A_ref) and
 *   C_M = M / (q A_ref L) with L = ReferenceSpan for rolling and yawing and
 *   ReferenceLength for pitching, q = 0.5 ReferenceDensity ReferenceSpeed^2;
 * - the line of action: the point of the load's central axis nearest the
 *   moment centre, r0 + F x M / |F|^2 (m), and the residual couple along F,
 *   (F . M)/|F| (N m). Both are NaN when F = 0.
 *
 * Regions: one per value of the integer cell array RegionArray when one is
 * selected (across all blocks); otherwise one per leaf block of a
 * multiblock input (named by the block names) or per partitioned dataset of
 * a collection; a plain dataset is one region. A `Total` row closes the table.
 *
 * Output port 0: the input, with the `Total` row as field data (arrays named
 * like the table columns) plus the reference values used. Output port 1
 * (Load Table): a vtkTable with `Region`, `Region Id`, one row per region
 * and the `Total` row, the load columns and the reference values used
 * (constant columns: Reference Density, Reference Speed, Dynamic Pressure,
 * Reference Area/Length/Span, Moment Centre, Drag/Side/Lift Direction).
 * Output port 2 (Load Summary): the same rows, region name and the scalar
 * loads with units in the column names ("Drag [N]"), for reading in
 * ParaView's spreadsheet view (which orders columns by name: the region
 * column is named "Boundary" so that it sorts first). Every column and
 * field value carries its unit (vtkDataArray::UNITS_LABEL()); names, units
 * and meanings come from the one list in WallLoadsColumns.h.
 *
 * Reference state: ReferenceDensity 0 (default) takes the input's field
 * value `Reference Density` (Wall Traction's Density), else 1;
 * ReferenceSpeed 0 (default) takes `Reference Speed`, else 0 (no
 * coefficients); DragDirection (0, 0, 0) (default) takes `Load Direction`,
 * else (1, 0, 0); LiftDirection (0, 0, 0) (default) is +z made orthogonal to
 * the drag direction, or +x when the drag is along z. An information
 * message says which values were used; a warning says when Wall Traction's
 * coefficients used another dynamic pressure.
 *
 * Composite inputs may hold blocks without 2D cells (volume blocks passed on
 * by Wall Traction): they are left out (no row) and named once in an
 * information message. Progress is reported per block; an abort request is
 * honoured between blocks (all ranks agree; no output then).
 *
 * Faces whose force or area is not finite (faces Wall Traction skipped) are
 * left out and counted in `Skipped Faces`; the filter warns when any are.
 *
 * Fed directly by vtkWallTraction, the filter takes the sums Wall Traction
 * made in its own face loop (same faces, same rule, moments about the origin
 * moved to MomentCentre) instead of reading every face again, as long as the
 * dataset, its mesh and the three arrays are the very objects Wall Traction
 * made, unmodified (WallLoadsMeshCache.h); otherwise, and always with a
 * RegionArray, it sums the faces itself. The results agree to round-off.
 *
 * Ghost and MPI policy: ghost faces (vtkGhostType DUPLICATECELL or
 * HIDDENCELL) are never counted. Sums are compensated per thread and reduced
 * over all ranks with one AllReduce; every rank gets the global field data;
 * the table is filled on rank 0 only (empty elsewhere). The input is never
 * modified.
 */
#ifndef vtkLoadIntegration_h
#define vtkLoadIntegration_h

#include "WallLoadsFiltersModule.h" // for export macro
#include "vtkDataObjectAlgorithm.h"

class WALLLOADSFILTERS_EXPORT vtkLoadIntegration : public vtkDataObjectAlgorithm
{
public:
  static vtkLoadIntegration* New();
  vtkTypeMacro(vtkLoadIntegration, vtkDataObjectAlgorithm);
  void PrintSelf(ostream& os, vtkIndent indent) override;

  /// Index for SetInputArrayToProcess: the optional integer region array.
  enum InputArrays
  {
    REGION_ARRAY = 0
  };

  ///@{
  /// Moment centre r0 (m). Default (0, 0, 0).
  vtkSetVector3Macro(MomentCentre, double);
  vtkGetVector3Macro(MomentCentre, double);
  ///@}

  ///@{
  /// Drag direction (normalised). Default (0, 0, 0): Wall Traction's Load
  /// Direction from the input's field data, else (1, 0, 0).
  vtkSetVector3Macro(DragDirection, double);
  vtkGetVector3Macro(DragDirection, double);
  ///@}

  ///@{
  /// Lift direction, made orthogonal to the drag direction. Default
  /// (0, 0, 0): +z, or +x when the drag direction is along z.
  vtkSetVector3Macro(LiftDirection, double);
  vtkGetVector3Macro(LiftDirection, double);
  ///@}

  /**
   * Set DragDirection and LiftDirection from an angle of attack and a
   * sideslip angle in degrees. With x the free stream and z the lift
   * direction at zero incidence, alpha turns the stream from x toward z and
   * beta toward +y: e_D = (cos a cos b, sin b, sin a cos b),
   * e_L = (-sin a, 0, cos a).
   */
  void SetFlowAngles(double angleOfAttackDegrees, double sideslipDegrees);

  ///@{
  /// Reference density in kg/m^3. Default 0: Wall Traction's Density from
  /// the input's field data, else 1.
  vtkSetMacro(ReferenceDensity, double);
  vtkGetMacro(ReferenceDensity, double);
  ///@}

  ///@{
  /// Reference speed in m/s. Default 0: Wall Traction's Reference Speed
  /// from the input's field data; no coefficients when that is 0 too.
  vtkSetMacro(ReferenceSpeed, double);
  vtkGetMacro(ReferenceSpeed, double);
  ///@}

  ///@{
  /// Reference area in m^2. Default 1.
  vtkSetMacro(ReferenceArea, double);
  vtkGetMacro(ReferenceArea, double);
  ///@}

  ///@{
  /// Reference length (pitching moment) in m. Default 1.
  vtkSetMacro(ReferenceLength, double);
  vtkGetMacro(ReferenceLength, double);
  ///@}

  ///@{
  /// Reference span (rolling and yawing moments) in m. Default 1.
  vtkSetMacro(ReferenceSpan, double);
  vtkGetMacro(ReferenceSpan, double);
  ///@}

  ///@{
  /// Leaves whose sums came from Wall Traction, and leaves summed here, over
  /// this filter's lifetime (for tests and benchmarks).
  vtkGetMacro(LeavesHandedOver, vtkIdType);
  vtkGetMacro(LeavesSummed, vtkIdType);
  ///@}

  /// Scans of cell offsets made by leaves summed here, over this filter's
  /// lifetime: a cell array unchanged since its last scan (the same objects,
  /// not marked Modified()) is not scanned again (for tests).
  vtkIdType GetCellOffsetScans();

  /// SI unit of a WallLoads output name (column, array or field value; "-"
  /// for dimensionless), or nullptr for other names.
  static const char* GetColumnUnit(const char* name);

  /// Largest span of region-array values accepted (max - min + 1).
  static constexpr long long MaximumRegionSpan = 1000000;
  /// Region-array values must lie strictly between -2^53 and 2^53 (integers
  /// that a double holds exactly, the same rule on every rank).
  static constexpr double MaximumExactRegionValue = 9007199254740992.0;

protected:
  vtkLoadIntegration();
  ~vtkLoadIntegration() override;

  int FillInputPortInformation(int port, vtkInformation* info) override;
  int FillOutputPortInformation(int port, vtkInformation* info) override;
  int RequestDataObject(vtkInformation*, vtkInformationVector**, vtkInformationVector*) override;
  int RequestData(vtkInformation*, vtkInformationVector**, vtkInformationVector*) override;

  double MomentCentre[3] = { 0.0, 0.0, 0.0 };
  double DragDirection[3] = { 0.0, 0.0, 0.0 };
  double LiftDirection[3] = { 0.0, 0.0, 0.0 };
  double ReferenceDensity = 0.0;
  double ReferenceSpeed = 0.0;
  double ReferenceArea = 1.0;
  double ReferenceLength = 1.0;
  double ReferenceSpan = 1.0;
  vtkIdType LeavesHandedOver = 0;
  vtkIdType LeavesSummed = 0;

private:
  struct Internals; ///< what is kept between executions
  Internals* Cache;
  vtkLoadIntegration(const vtkLoadIntegration&) = delete;
  void operator=(const vtkLoadIntegration&) = delete;
};

#endif

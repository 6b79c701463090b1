// SPDX-License-Identifier: BSD-3-Clause
/**
 * @class   vtkLoadDistribution
 * @brief   Wall loads along an axis: force per length, cumulative force and
 *          moment per bin.
 *
 * vtkLoadDistribution divides the range of an axis into NumberOfBins equal
 * bins and shares the per-face `Pressure Force` and `Viscous Force` (N) and
 * `Face Area` (m^2) made by vtkWallTraction among them. Each face polygon is
 * clipped exactly by the bin planes (planes perpendicular to the axis;
 * wallloads/PolygonBinning.h) and its force is shared in proportion to the
 * clipped areas, the traction being constant on a face; each part's force
 * acts at the part's area centroid. The bins therefore add up to
 * vtkLoadIntegration's totals to round-off, whatever the mesh.
 *
 * The axis: the unit AxisDirection (default (0, 0, 1)) through AxisOrigin
 * (default (0, 0, 0)); a point x is at s = (x - origin) . e along it (m).
 * The range: by default the extent of the counted faces along the axis
 * (over all blocks and MPI ranks); with UseCustomRange, Range (m along the
 * axis), and the parts of faces outside it are in no bin (their area is
 * reported). A face lying in a bin plane belongs to the bin above it (the
 * last bin at the end of the range).
 *
 * Output: a vtkTable, one row per bin: `Bin`, `Start`, `End`, `Centre`
 * (m along the axis from AxisOrigin), `Area` (m^2), `Pressure Force Per
 * Length`, `Viscous Force Per Length`, `Force Per Length` (N/m, 3
 * components; the bin's force over its width), `Drag Per Length`,
 * `Side Force Per Length`, `Lift Per Length` (N/m, along the load axes),
 * `Cumulative Force` (N, 3; the bins from the first up to this one) and
 * `Moment` (N m, 3; the bin's own moment about MomentCentre). The table's
 * field data records the axis, bin width, load axes, skipped faces and the
 * area outside the range. Names, units (vtkDataArray::UNITS_LABEL()) and
 * meanings come from WallLoadsColumns.h.
 *
 * Load axes as in vtkLoadIntegration: DragDirection (0, 0, 0) (default)
 * takes Wall Traction's `Load Direction` from the input's field data, else
 * (1, 0, 0); LiftDirection (0, 0, 0) (default) is +z made orthogonal to the
 * drag direction, or +x when the drag is along z; side = lift x drag.
 *
 * Faces whose force, area or geometry is not finite (faces Wall Traction
 * skipped, NaN) are left out, counted and warned about. Blocks without 2D
 * cells are left out.
 *
 * Ghost and MPI policy: ghost faces (vtkGhostType DUPLICATECELL or
 * HIDDENCELL) are never counted. One local pass visits every leaf of a
 * composite input (no collective inside), then one AllReduce sums the
 * compensated per-bin sums with their carries, the validity of every rank's
 * input and an abort request, so that all ranks fail or finish together.
 * The default range needs the extent of the faces before the pass: it is
 * agreed, with the validity, in one collective before it. The table is
 * filled on rank 0 only (empty elsewhere). The input is never modified.
 */
#ifndef vtkLoadDistribution_h
#define vtkLoadDistribution_h

#include "WallLoadsFiltersModule.h" // for export macro
#include "vtkTableAlgorithm.h"

class WALLLOADSFILTERS_EXPORT vtkLoadDistribution : public vtkTableAlgorithm
{
public:
  static vtkLoadDistribution* New();
  vtkTypeMacro(vtkLoadDistribution, vtkTableAlgorithm);
  void PrintSelf(ostream& os, vtkIndent indent) override;

  ///@{
  /// Point from which positions along the axis are measured (m). Default
  /// (0, 0, 0).
  vtkSetVector3Macro(AxisOrigin, double);
  vtkGetVector3Macro(AxisOrigin, double);
  ///@}

  ///@{
  /// Direction of the axis (normalised; must not be zero). Default (0, 0, 1).
  vtkSetVector3Macro(AxisDirection, double);
  vtkGetVector3Macro(AxisDirection, double);
  ///@}

  ///@{
  /// Number of equal bins, 1 to MaximumNumberOfBins. Default 50.
  vtkSetMacro(NumberOfBins, int);
  vtkGetMacro(NumberOfBins, int);
  ///@}

  ///@{
  /// Use Range instead of the extent of the faces along the axis. Default off.
  vtkSetMacro(UseCustomRange, vtkTypeBool);
  vtkGetMacro(UseCustomRange, vtkTypeBool);
  vtkBooleanMacro(UseCustomRange, vtkTypeBool);
  ///@}

  ///@{
  /// First and last position of the bins along the axis (m from AxisOrigin),
  /// used with UseCustomRange; finite, the second above the first. Default
  /// (0, 1).
  vtkSetVector2Macro(Range, double);
  vtkGetVector2Macro(Range, double);
  ///@}

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

  /// Largest NumberOfBins accepted (the per-thread sums grow with it).
  static constexpr int MaximumNumberOfBins = 100000;

protected:
  vtkLoadDistribution();
  ~vtkLoadDistribution() override = default;

  int FillInputPortInformation(int port, vtkInformation* info) override;
  int RequestData(vtkInformation*, vtkInformationVector**, vtkInformationVector*) override;

  double AxisOrigin[3] = { 0.0, 0.0, 0.0 };
  double AxisDirection[3] = { 0.0, 0.0, 1.0 };
  int NumberOfBins = 50;
  vtkTypeBool UseCustomRange = 0;
  double Range[2] = { 0.0, 1.0 };
  double MomentCentre[3] = { 0.0, 0.0, 0.0 };
  double DragDirection[3] = { 0.0, 0.0, 0.0 };
  double LiftDirection[3] = { 0.0, 0.0, 0.0 };

private:
  vtkLoadDistribution(const vtkLoadDistribution&) = delete;
  void operator=(const vtkLoadDistribution&) = delete;
};

#endif

// SPDX-License-Identifier: BSD-3-Clause
/**
 * @class   vtkLoadHistory
 * @brief   Loads over every time step of a transient run, and their statistics.
 *
 * vtkLoadHistory visits every time step of its upstream pipeline in one
 * Update (the CONTINUE_EXECUTING request pattern: the upstream executes
 * exactly once per visited step; progress is reported per step, and rank 0
 * prints one information line per step) and records one value per step of
 * every numeric quantity of its input:
 *
 * - a table that varies in time (Load Integration's Load Table, port 1):
 *   one quantity per row and numeric column, named "<Region>: <Column>"
 *   (e.g. "Total: Drag"), the region read from the string column `Region`
 *   (or `Boundary`, the Load Summary's); a table without a region column
 *   names its quantities "<Column>" (one row) or "<row>: <Column>";
 * - any other data object: the numeric field-data arrays of one tuple
 *   (Load Integration's port 0: the Total row), named "<Array>".
 * 3-component columns are split into "<name> X", " Y", " Z" (other widths
 * into " 0", " 1", ...). Left out as not being loads: `Region Id`, the
 * reference values Load Integration records (Reference Density, Speed, ...,
 * Drag/Side/Lift Direction), Wall Traction's `Load Direction`, and the
 * face counters (`Faces`, `Skipped Faces`, Wall Traction's skipped-face and
 * orientation counts). The set of quantities is fixed by the first visited
 * step; a quantity missing at a later step is NaN there.
 *
 * Output port 0 (history): `Time` (s) then one column per quantity, one row
 * per visited step, each column carrying its input's unit. Output port 1
 * (statistics): one row per quantity (`Quantity`), columns `Samples`,
 * `Statistics Start` (s), `Mean`, `Standard Deviation`, `Minimum`,
 * `Maximum`, `Standard Error Of Mean` (unit of the quantity),
 * `Integrated Autocorrelation Time` (s), `Dominant Frequency` (Hz),
 * `Amplitude` (semi-amplitude of the dominant sinusoid, unit of the
 * quantity) and `Strouhal Number` (f L / U; NaN unless ReferenceLength and
 * ReferenceSpeed are both > 0). Every statistic is computed over the
 * statistics window: from StatisticsStart (when UseCustomStatisticsStart
 * is on) or the MSER-5 truncation point of that quantity, to the end of the
 * time range. Non-finite samples are left out. The methods are those of
 * wallloads/TimeSeriesStatistics.h: MSER-5 (White 1997), integrated
 * autocorrelation time with Sokal's automatic window (c = 5; in seconds:
 * the time in samples times the mean sampling interval of the window, so
 * that SEM^2 = sigma^2 tau / (window duration)), the standard error of the
 * mean sigma sqrt(tau / n), and the Lomb-Scargle periodogram (Lomb 1976;
 * Scargle 1982) refined off its frequency grid. Undefined statistics
 * (fewer than 8 samples, a constant quantity, no autocorrelation window)
 * are NaN, with one warning naming the quantities.
 *
 * Time steps: those of the input within TimeRange (when UseCustomTimeRange
 * is on; default: all), then every Stride-th. An input without time steps
 * is recorded once (its data time, else 0). The output is not time
 * dependent (the time steps are removed from its information).
 *
 * An abort request is honoured between steps (no output then, with a
 * warning); an update that follows one stopped part way (an upstream error)
 * starts again from the first step.
 *
 * MPI: every rank drives its upstream through the same steps (the upstream
 * reduces across ranks at each step); the tables are filled on rank 0 only
 * (Load Integration's tables live on rank 0, its field-data totals are global
 * on every rank), empty elsewhere. Validity is checked at the first step and
 * agreed by all ranks in one reduction. The input is never modified.
 */
#ifndef vtkLoadHistory_h
#define vtkLoadHistory_h

#include "WallLoadsFiltersModule.h" // for export macro
#include "vtkTableAlgorithm.h"

#include <memory> // for std::unique_ptr

class vtkDataObject;
class vtkTable;

class WALLLOADSFILTERS_EXPORT vtkLoadHistory : public vtkTableAlgorithm
{
public:
  static vtkLoadHistory* New();
  vtkTypeMacro(vtkLoadHistory, vtkTableAlgorithm);
  void PrintSelf(ostream& os, vtkIndent indent) override;

  ///@{
  /// Visit only the steps with TimeRange[0] <= t <= TimeRange[1] (s).
  /// Default off: every step of the input.
  vtkSetMacro(UseCustomTimeRange, vtkTypeBool);
  vtkGetMacro(UseCustomTimeRange, vtkTypeBool);
  vtkBooleanMacro(UseCustomTimeRange, vtkTypeBool);
  vtkSetVector2Macro(TimeRange, double);
  vtkGetVector2Macro(TimeRange, double);
  ///@}

  ///@{
  /// Visit every Stride-th step of the range (the first one included).
  /// Default 1.
  vtkSetClampMacro(Stride, int, 1, VTK_INT_MAX);
  vtkGetMacro(Stride, int);
  ///@}

  ///@{
  /// Start the statistics window at StatisticsStart (s; the first step at
  /// or after it). Default off: each quantity's MSER-5 truncation point.
  vtkSetMacro(UseCustomStatisticsStart, vtkTypeBool);
  vtkGetMacro(UseCustomStatisticsStart, vtkTypeBool);
  vtkBooleanMacro(UseCustomStatisticsStart, vtkTypeBool);
  vtkSetMacro(StatisticsStart, double);
  vtkGetMacro(StatisticsStart, double);
  ///@}

  ///@{
  /// Reference length (m) and speed (m/s) of the Strouhal number f L / U.
  /// Default 0: no Strouhal number (NaN).
  vtkSetMacro(ReferenceLength, double);
  vtkGetMacro(ReferenceLength, double);
  vtkSetMacro(ReferenceSpeed, double);
  vtkGetMacro(ReferenceSpeed, double);
  ///@}

protected:
  vtkLoadHistory();
  ~vtkLoadHistory() override;

  int FillInputPortInformation(int port, vtkInformation* info) override;
  int RequestInformation(vtkInformation*, vtkInformationVector**, vtkInformationVector*) override;
  int RequestUpdateExtent(vtkInformation*, vtkInformationVector**, vtkInformationVector*) override;
  int RequestData(vtkInformation*, vtkInformationVector**, vtkInformationVector*) override;

  vtkTypeBool UseCustomTimeRange = 0;
  double TimeRange[2] = { 0.0, 0.0 };
  int Stride = 1;
  vtkTypeBool UseCustomStatisticsStart = 0;
  double StatisticsStart = 0.0;
  double ReferenceLength = 0.0;
  double ReferenceSpeed = 0.0;

private:
  vtkLoadHistory(const vtkLoadHistory&) = delete;
  void operator=(const vtkLoadHistory&) = delete;

  /// The state of the loop over time steps (steps to visit, the step being
  /// executed, what was recorded so far): kept between the passes of one
  /// Update, reset at its start and end.
  struct Loop;
  std::unique_ptr<Loop> Steps;

  /// The history and statistics tables from what was recorded (rank 0).
  void FillTables(vtkTable* history, vtkTable* statistics);
  /// First step: something to record (rank 0), agreed over all ranks.
  bool ValidateFirstStep(vtkDataObject* input, vtkTable* history, vtkTable* statistics);
  /// Whether an abort was requested on any rank (one reduction).
  bool AbortAgreed();
  /// Record the current step's values (rank 0) and report progress.
  void RecordStep(vtkDataObject* input);
};

#endif

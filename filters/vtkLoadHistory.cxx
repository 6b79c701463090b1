// SPDX-License-Identifier: BSD-3-Clause
#include "vtkLoadHistory.h"

#include "WallLoadsColumns.h"
#include "WallLoadsDefaults.h"
#include "WallLoadsPipeline.h"
#include "wallloads/TimeSeriesStatistics.h"

#include "vtkDataArray.h"
#include "vtkDoubleArray.h"
#include "vtkFieldData.h"
#include "vtkInformation.h"
#include "vtkInformationVector.h"
#include "vtkObjectFactory.h"
#include "vtkSMPTools.h"
#include "vtkSmartPointer.h"
#include "vtkStreamingDemandDrivenPipeline.h"
#include "vtkStringArray.h"
#include "vtkTable.h"

#include <algorithm>
#include <cmath>
#include <cstring>
#include <limits>
#include <map>
#include <sstream>
#include <string>
#include <vector>

vtkStandardNewMacro(vtkLoadHistory);

namespace
{
using namespace wallloads;
constexpr double NaN = std::numeric_limits<double>::quiet_NaN();

/// Names that are not loads: identifiers, reference values, face counters.
bool IsLeftOut(const char* name)
{
  static const char* const counters[] = { "Region Id", "Load Direction", "Faces", "Skipped Faces",
    "Skipped Non-Surface Cells", "Skipped Degenerate Faces", "Skipped Non-Finite Faces",
    "Inconsistently Oriented Faces", "Open Boundary Edges" };
  for (const char* c : counters)
  {
    if (std::strcmp(c, name) == 0)
    {
      return true;
    }
  }
  for (const columns::NamedUnit& u : columns::ReferenceColumns)
  {
    if (std::strcmp(u.Name, name) == 0)
    {
      return true;
    }
  }
  return false;
}

/// One sample of every quantity at one step: names, values and units.
struct Sample
{
  std::vector<std::string> Names, Units;
  std::vector<double> Values;
  std::map<std::string, int> Seen;

  void Add(const std::string& name, vtkDataArray* array, vtkIdType tuple)
  {
    const int nc = array->GetNumberOfComponents();
    const char* unit = array->GetInformation()->Get(vtkDataArray::UNITS_LABEL());
    static const char* const xyz[] = { " X", " Y", " Z" };
    for (int c = 0; c < nc; ++c)
    {
      std::string n = name;
      if (nc == 3)
      {
        n += xyz[c];
      }
      else if (nc > 1)
      {
        n += " " + std::to_string(c);
      }
      // Regions (or blocks) may share a name: the second "Wing: Drag" is
      // "Wing: Drag (2)", in the same order at every step.
      const int seen = ++this->Seen[n];
      if (seen > 1)
      {
        n += " (" + std::to_string(seen) + ")";
      }
      this->Names.push_back(n);
      this->Units.emplace_back(unit ? unit : "");
      this->Values.push_back(array->GetComponent(tuple, c));
    }
  }
};

/// The string column naming the rows of a table, or nullptr.
vtkStringArray* RegionColumn(vtkTable* table)
{
  for (const char* name : { "Region", columns::SummaryRegionColumn })
  {
    if (auto* s = vtkStringArray::SafeDownCast(table->GetColumnByName(name)))
    {
      return s;
    }
  }
  return nullptr;
}

/// Every numeric quantity of the input at this step (see the class doc).
void Collect(vtkDataObject* input, Sample& sample)
{
  if (auto* table = vtkTable::SafeDownCast(input))
  {
    vtkStringArray* regions = RegionColumn(table);
    const vtkIdType rows = table->GetNumberOfRows();
    for (vtkIdType r = 0; r < rows; ++r)
    {
      std::string prefix;
      if (regions && r < regions->GetNumberOfValues())
      {
        prefix = regions->GetValue(r) + ": ";
      }
      else if (rows > 1)
      {
        prefix = std::to_string(r) + ": ";
      }
      for (vtkIdType c = 0; c < table->GetNumberOfColumns(); ++c)
      {
        auto* array = vtkDataArray::SafeDownCast(table->GetColumn(c));
        // A column shorter than the table (malformed input) is left out.
        if (array && array->GetName() && array->GetNumberOfTuples() > r &&
          !IsLeftOut(array->GetName()))
        {
          sample.Add(prefix + array->GetName(), array, r);
        }
      }
    }
    return;
  }
  vtkFieldData* fd = input->GetFieldData();
  for (int i = 0; fd && i < fd->GetNumberOfArrays(); ++i)
  {
    vtkDataArray* array = fd->GetArray(i);
    if (array && array->GetName() && array->GetNumberOfTuples() == 1 &&
      !IsLeftOut(array->GetName()))
    {
      sample.Add(array->GetName(), array, 0);
    }
  }
}

/// The statistics of one quantity (a row of port 1).
struct Row
{
  double Values[11] = { 0, NaN, NaN, NaN, NaN, NaN, NaN, NaN, NaN, NaN, NaN };
  SeriesStatus Status = SeriesStatus::Ok;
};

/// Statistics of y over the window (kernels of TimeSeriesStatistics.h).
Row Analyse(const std::vector<double>& time, const std::vector<double>& series, bool customStart,
  double start, double length, double speed)
{
  std::vector<double> t, y;
  for (std::size_t i = 0; i < series.size(); ++i)
  {
    if (std::isfinite(series[i]) && std::isfinite(time[i]))
    {
      t.push_back(time[i]);
      y.push_back(series[i]);
    }
  }
  std::size_t first = 0;
  if (customStart)
  {
    first = static_cast<std::size_t>(std::lower_bound(t.begin(), t.end(), start) - t.begin());
  }
  else if (!ComputeBasicStatistics(y.data(), y.size()).Constant)
  {
    // White 1997; Franklin & White 2008. A series constant but for
    // round-off is not truncated (MSER would pick a point in the noise).
    first = Mser5Truncation(y.data(), y.size());
  }
  Row row;
  const std::size_t n = y.size() - std::min(first, y.size());
  row.Values[0] = static_cast<double>(n);
  if (n == 0)
  {
    row.Status = SeriesStatus::TooFewSamples;
    return row;
  }
  const double* ty = t.data() + first;
  const double* py = y.data() + first;
  const BasicStatistics<double> b = ComputeBasicStatistics(py, n);
  row.Values[1] = ty[0];
  row.Values[2] = b.Mean;
  row.Values[3] = b.StandardDeviation;
  row.Values[4] = b.Minimum;
  row.Values[5] = b.Maximum;
  // Sokal 1997: tau in samples, then in seconds by the mean sampling interval.
  const AutocorrelationTime<double> a = IntegratedAutocorrelation(py, n);
  const double interval = n > 1 ? (ty[n - 1] - ty[0]) / static_cast<double>(n - 1) : NaN;
  row.Values[6] = StandardErrorOfMean(b.StandardDeviation, a.Tau, n);
  row.Values[7] = a.Tau * interval;
  // Lomb 1976; Scargle 1982.
  const DominantSinusoid<double> d = DominantFrequency(ty, py, n);
  row.Values[8] = d.Frequency;
  row.Values[9] = d.Amplitude;
  row.Values[10] = length > 0 && speed > 0 ? d.Frequency * length / speed : NaN;
  row.Status = a.Status != SeriesStatus::Ok ? a.Status : d.Status;
  return row;
}
} // namespace

//------------------------------------------------------------------------------
struct vtkLoadHistory::Loop
{
  std::vector<double> Times; ///< steps to visit (empty: the input has no time steps)
  std::size_t InputSteps = 0; ///< time steps of the input
  double InputRange[2] = { 0, 0 };
  std::size_t Current = 0;   ///< index of the step being executed
  // Recorded on rank 0: quantity names, units, and a column per quantity.
  std::vector<double> SampleTimes;
  std::vector<std::string> Names, Units;
  std::map<std::string, std::size_t> Index;
  std::vector<std::vector<double>> Columns;
  std::size_t Unmatched = 0;

  void Reset()
  {
    this->Current = 0;
    this->SampleTimes.clear();
    this->Names.clear();
    this->Units.clear();
    this->Index.clear();
    this->Columns.clear();
    this->Unmatched = 0;
  }
  void Record(double time, const Sample& s)
  {
    if (this->SampleTimes.empty())
    {
      this->Names = s.Names;
      this->Units = s.Units;
      for (std::size_t q = 0; q < s.Names.size(); ++q)
      {
        this->Index.emplace(s.Names[q], q);
      }
      this->Columns.assign(s.Names.size(), {});
    }
    for (auto& c : this->Columns)
    {
      c.push_back(NaN);
    }
    for (std::size_t q = 0; q < s.Names.size(); ++q)
    {
      auto it = this->Index.find(s.Names[q]);
      if (it == this->Index.end())
      {
        ++this->Unmatched;
        continue;
      }
      this->Columns[it->second].back() = s.Values[q];
    }
    this->SampleTimes.push_back(time);
  }
};

//------------------------------------------------------------------------------
vtkLoadHistory::vtkLoadHistory()
  : Steps(new Loop)
{
  this->SetNumberOfOutputPorts(2);
}

vtkLoadHistory::~vtkLoadHistory() = default;

//------------------------------------------------------------------------------
void vtkLoadHistory::PrintSelf(ostream& os, vtkIndent indent)
{
  this->Superclass::PrintSelf(os, indent);
  os << indent << "UseCustomTimeRange: " << this->UseCustomTimeRange << "\n";
  os << indent << "TimeRange: " << this->TimeRange[0] << " " << this->TimeRange[1] << "\n";
  os << indent << "Stride: " << this->Stride << "\n";
  os << indent << "UseCustomStatisticsStart: " << this->UseCustomStatisticsStart << "\n";
  os << indent << "StatisticsStart: " << this->StatisticsStart << "\n";
  os << indent << "ReferenceLength: " << this->ReferenceLength << "\n";
  os << indent << "ReferenceSpeed: " << this->ReferenceSpeed << "\n";
}

//------------------------------------------------------------------------------
int vtkLoadHistory::FillInputPortInformation(int, vtkInformation* info)
{
  info->Set(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkDataObject");
  return 1;
}

//------------------------------------------------------------------------------
int vtkLoadHistory::RequestInformation(
  vtkInformation*, vtkInformationVector** inputVector, vtkInformationVector* outputVector)
{
  using SDDP = vtkStreamingDemandDrivenPipeline;
  vtkInformation* inInfo = inputVector[0]->GetInformationObject(0);
  Loop& loop = *this->Steps;
  loop.Reset();
  loop.Times.clear();
  loop.InputSteps = 0;
  if (inInfo->Has(SDDP::TIME_STEPS()))
  {
    const int count = inInfo->Length(SDDP::TIME_STEPS());
    const double* steps = inInfo->Get(SDDP::TIME_STEPS());
    loop.InputSteps = static_cast<std::size_t>(count);
    if (count > 0)
    {
      loop.InputRange[0] = steps[0];
      loop.InputRange[1] = steps[count - 1];
    }
    int kept = 0;
    for (int i = 0; i < count; ++i)
    {
      if (this->UseCustomTimeRange && (steps[i] < this->TimeRange[0] || steps[i] > this->TimeRange[1]))
      {
        continue;
      }
      if (kept++ % this->Stride == 0)
      {
        loop.Times.push_back(steps[i]);
      }
    }
  }
  // The output does not depend on time: it covers them all.
  for (int port = 0; port < this->GetNumberOfOutputPorts(); ++port)
  {
    vtkInformation* outInfo = outputVector->GetInformationObject(port);
    outInfo->Remove(SDDP::TIME_STEPS());
    outInfo->Remove(SDDP::TIME_RANGE());
  }
  return 1;
}

//------------------------------------------------------------------------------
int vtkLoadHistory::RequestUpdateExtent(
  vtkInformation*, vtkInformationVector** inputVector, vtkInformationVector*)
{
  const Loop& loop = *this->Steps;
  vtkInformation* inInfo = inputVector[0]->GetInformationObject(0);
  if (loop.Current < loop.Times.size())
  {
    inInfo->Set(vtkStreamingDemandDrivenPipeline::UPDATE_TIME_STEP(), loop.Times[loop.Current]);
  }
  return 1;
}

//------------------------------------------------------------------------------
int vtkLoadHistory::RequestData(
  vtkInformation* request, vtkInformationVector** inputVector, vtkInformationVector* outputVector)
{
  using SDDP = vtkStreamingDemandDrivenPipeline;
  vtkDataObject* input = vtkDataObject::GetData(inputVector[0], 0);
  vtkTable* history = vtkTable::GetData(outputVector, 0);
  vtkTable* statistics = vtkTable::GetData(outputVector, 1);
  Loop& loop = *this->Steps;
  if (!request->Has(SDDP::CONTINUE_EXECUTING()) && loop.Current != 0)
  {
    // A new update while the previous one stopped part way (an upstream
    // error): start again from the first step, recording nothing of this pass.
    loop.Reset();
    request->Set(SDDP::CONTINUE_EXECUTING(), 1);
    return 1;
  }
  if (loop.Current == 0 && !this->ValidateFirstStep(input, history, statistics))
  {
    request->Remove(SDDP::CONTINUE_EXECUTING());
    loop.Reset();
    return 0;
  }
  if (this->AbortAgreed())
  {
    request->Remove(SDDP::CONTINUE_EXECUTING());
    history->Initialize();
    statistics->Initialize();
    loop.Reset();
    return 1;
  }
  this->RecordStep(input);
  if (loop.Current + 1 < std::max<std::size_t>(1, loop.Times.size()))
  {
    ++loop.Current;
    request->Set(SDDP::CONTINUE_EXECUTING(), 1);
    return 1;
  }
  // Last step: the two tables (rank 0), then reset for the next update.
  request->Remove(SDDP::CONTINUE_EXECUTING());
  history->Initialize();
  statistics->Initialize();
  if (ProcessRank() == 0)
  {
    this->FillTables(history, statistics);
  }
  loop.Reset();
  return 1;
}

//------------------------------------------------------------------------------
bool vtkLoadHistory::ValidateFirstStep(vtkDataObject* input, vtkTable* history, vtkTable* statistics)
{
  // Checked once, at the first step, and agreed over all ranks (one
  // reduction) before any fails. Only rank 0 records (and checks).
  this->Steps->Reset();
  std::string error;
  const Loop& loop = *this->Steps;
  if (!input || !history || !statistics)
  {
    error = "Load History: missing input or output.";
  }
  else if (loop.InputSteps > 0 && loop.Times.empty())
  {
    std::ostringstream os;
    os << "Load History: Time Range [" << this->TimeRange[0] << ", " << this->TimeRange[1]
       << "] s holds none of the input's " << loop.InputSteps << " time steps ("
       << loop.InputRange[0] << " to " << loop.InputRange[1] << " s).";
    error = os.str();
  }
  else if (ProcessRank() == 0)
  {
    Sample first;
    Collect(input, first);
    if (first.Names.empty())
    {
      error = std::string("Load History: the input (") + input->GetClassName() +
        ") holds no numeric quantity: expected a table (Load Integration's Load Table) or "
        "numeric field data of one tuple (Load Integration's output port 0).";
    }
  }
  // A value set without its switch is a common scripting slip: say so.
  if (!this->UseCustomTimeRange && (this->TimeRange[0] != 0 || this->TimeRange[1] != 0))
  {
    Notice(this, "TimeRange is set but UseCustomTimeRange is off: every time step is visited.");
  }
  if (!this->UseCustomStatisticsStart && this->StatisticsStart != 0)
  {
    Notice(this, "StatisticsStart is set but UseCustomStatisticsStart is off: the statistics "
                 "start at each quantity's MSER-5 truncation point.");
  }
  double failed = error.empty() ? 0.0 : 1.0;
  GlobalMax(&failed, 1);
  if (failed > 0)
  {
    ReportAgreedFailure(this, error);
    return false;
  }
  return true;
}

//------------------------------------------------------------------------------
bool vtkLoadHistory::AbortAgreed()
{
  // An abort request (the GUI's progress bar) is honoured between steps, all
  // ranks agreeing (one reduction per step; the upstream reduces per step
  // anyway).
  double abort = this->GetAbortExecute() ? 1.0 : 0.0;
  GlobalMax(&abort, 1);
  if (abort > 0 && ProcessRank() == 0)
  {
    vtkWarningMacro("Load History: aborted at step "
      << this->Steps->Current + 1 << " of " << std::max<std::size_t>(1, this->Steps->Times.size())
      << "; no output.");
  }
  return abort > 0;
}

//------------------------------------------------------------------------------
void vtkLoadHistory::RecordStep(vtkDataObject* input)
{
  Loop& loop = *this->Steps;
  const std::size_t numSteps = std::max<std::size_t>(1, loop.Times.size());
  double time = loop.Current < loop.Times.size() ? loop.Times[loop.Current] : 0.0;
  if (input->GetInformation()->Has(vtkDataObject::DATA_TIME_STEP()))
  {
    time = input->GetInformation()->Get(vtkDataObject::DATA_TIME_STEP());
  }
  if (ProcessRank() == 0)
  {
    Sample sample;
    Collect(input, sample);
    loop.Record(time, sample);
    std::ostringstream os;
    os << "step " << loop.Current + 1 << " of " << numSteps << ", t = " << time << " s";
    Notice(this, os.str());
  }
  this->UpdateProgress(static_cast<double>(loop.Current + 1) / static_cast<double>(numSteps));
}

//------------------------------------------------------------------------------
void vtkLoadHistory::FillTables(vtkTable* history, vtkTable* statistics)
{
  const Loop& loop = *this->Steps;
  const vtkIdType rows = static_cast<vtkIdType>(loop.SampleTimes.size());
  auto time = vtkSmartPointer<vtkDoubleArray>::New();
  time->SetName("Time");
  time->SetNumberOfTuples(rows);
  std::copy(loop.SampleTimes.begin(), loop.SampleTimes.end(), time->GetPointer(0));
  SetUnits(time, "s");
  history->AddColumn(time);
  const std::size_t nq = loop.Names.size();
  for (std::size_t q = 0; q < nq; ++q)
  {
    auto column = vtkSmartPointer<vtkDoubleArray>::New();
    column->SetName(loop.Names[q].c_str());
    column->SetNumberOfTuples(rows);
    std::copy(loop.Columns[q].begin(), loop.Columns[q].end(), column->GetPointer(0));
    if (!loop.Units[q].empty())
    {
      SetUnits(column, loop.Units[q].c_str());
    }
    history->AddColumn(column);
  }

  // Statistics: the quantities are independent, analysed in parallel.
  std::vector<Row> stats(nq);
  const bool custom = this->UseCustomStatisticsStart != 0;
  const double start = this->StatisticsStart, length = this->ReferenceLength;
  const double speed = this->ReferenceSpeed;
  vtkSMPTools::For(0, static_cast<vtkIdType>(nq), [&](vtkIdType begin, vtkIdType end) {
    for (vtkIdType q = begin; q < end; ++q)
    {
      stats[q] = Analyse(loop.SampleTimes, loop.Columns[q], custom, start, length, speed);
    }
  });
  auto quantity = vtkSmartPointer<vtkStringArray>::New();
  quantity->SetName("Quantity");
  quantity->SetNumberOfValues(static_cast<vtkIdType>(nq));
  statistics->AddColumn(quantity);
  std::vector<double*> out;
  int k = 0;
  for (const columns::NamedUnit& u : columns::StatisticsColumns)
  {
    if (k++ == 0)
    {
      continue; // Quantity
    }
    auto column = vtkSmartPointer<vtkDoubleArray>::New();
    column->SetName(u.Name);
    column->SetNumberOfTuples(static_cast<vtkIdType>(nq));
    if (std::strcmp(u.Unit, "as quantity") != 0)
    {
      SetUnits(column, u.Unit);
    }
    statistics->AddColumn(column);
    out.push_back(column->GetPointer(0));
  }
  std::vector<std::string> constant, tooShort, noWindow;
  for (std::size_t q = 0; q < nq; ++q)
  {
    quantity->SetValue(static_cast<vtkIdType>(q), loop.Names[q]);
    for (std::size_t c = 0; c < out.size(); ++c)
    {
      out[c][q] = stats[q].Values[c];
    }
    switch (stats[q].Status)
    {
      case SeriesStatus::TooFewSamples:
        tooShort.push_back(loop.Names[q]);
        break;
      case SeriesStatus::Constant:
        constant.push_back(loop.Names[q]);
        break;
      case SeriesStatus::NoWindow:
      case SeriesStatus::NonPositive:
        noWindow.push_back(loop.Names[q]);
        break;
      default:
        break;
    }
  }
  std::ostringstream warn;
  if (!tooShort.empty())
  {
    warn << " Fewer than " << MinimumSeriesSamples << " samples in the statistics window of "
         << QuotedList(tooShort) << ": standard error, autocorrelation time, frequency and "
         << "amplitude are NaN.";
  }
  if (!constant.empty())
  {
    warn << " Constant over the statistics window: " << QuotedList(constant)
         << " (standard error, autocorrelation time, frequency and amplitude are NaN).";
  }
  if (!noWindow.empty())
  {
    warn << " The window is too short for the correlation of " << QuotedList(noWindow)
         << " (no autocorrelation window found in the first half): standard error and "
         << "autocorrelation time are NaN.";
  }
  if (loop.Unmatched > 0)
  {
    warn << " " << loop.Unmatched
         << " values of quantities that appeared after the first step were left out.";
  }
  if (!warn.str().empty())
  {
    vtkWarningMacro("Load History:" << warn.str());
  }
}

// SPDX-License-Identifier: BSD-3-Clause
#pragma once
// Small surfaces built in code, so the filter tests depend on nothing else.
#include "vtkSmartPointer.h"

#include <array>
#include <functional>
#include <string>
#include <vector>

class vtkAlgorithm;
class vtkDataObject;
class vtkDataSet;
class vtkPolyData;
class vtkUnstructuredGrid;

namespace wltest
{
using Vec = std::array<double, 3>;

/// Axis-aligned box [lo, hi] as 6 quads ordered into the fluid (outward).
vtkSmartPointer<vtkPolyData> Box(const Vec& lo, const Vec& hi);
/// Latitude-longitude sphere of quads and pole triangles, ordered outward.
vtkSmartPointer<vtkPolyData> Sphere(double radius, int nPolar, int nAzimuth);
/// Add a cell array f(centroid) of `comps` components (centroid = vertex mean).
void AddCellField(vtkPolyData* pd, const std::string& name, int comps,
  const std::function<void(const Vec&, double*)>& f);
/// Add a point array f(x).
void AddPointField(vtkPolyData* pd, const std::string& name, int comps,
  const std::function<void(const Vec&, double*)>& f);
/// Mark `cell` of `ds` a ghost (DUPLICATECELL), adding a ghost array if none.
void MarkGhost(vtkDataSet* ds, long long cell);
/// Field-data value (component k) of a data object.
double Field(vtkDataObject* d, const char* name, int k = 0);
/// Collects error and warning messages of an algorithm.
struct Messages
{
  std::vector<std::string> Errors;
  std::vector<std::string> Warnings;
  void Watch(vtkAlgorithm* alg);
  bool ErrorContains(const std::string& s) const;
  bool WarningContains(const std::string& s) const;
};
}

// SPDX-License-Identifier: BSD-3-Clause
#include "vtkShearProjection.h"

#include "WallAdjacency.h"
#include "WallLoadsPipeline.h"
#include "wallloads/FaceGeometry.h"
#include "wallloads/LeastSquaresGradient.h"
#include "wallloads/NearWallShear.h"
#include "wallloads/Traction.h"
#include "wallloads/WallLaw.h"
#include "wallloads/WallQuantities.h"

#include "vtkCell.h"
#include "vtkCellData.h"
#include "vtkCellTypes.h"
#include "vtkCompositeDataSet.h"
#include "vtkDataObjectTree.h"
#include "vtkDataObjectTreeIterator.h"
#include "vtkDoubleArray.h"
#include "vtkGenericCell.h"
#include "vtkIdList.h"
#include "vtkInformation.h"
#include "vtkInformationVector.h"
#include "vtkIntArray.h"
#include "vtkMultiBlockDataSet.h"
#include "vtkNew.h"
#include "vtkObjectFactory.h"
#include "vtkPointData.h"
#include "vtkPolyData.h"
#include "vtkSmartPointer.h"

#include <cmath>
#include <algorithm>
#include <limits>
#include <sstream>
#include <vector>

vtkStandardNewMacro(vtkShearProjection);

namespace
{
using namespace wallloads;
const double NaN = std::numeric_limits<double>::quiet_NaN();
} // namespace

struct vtkShearProjection::AdjacencyCache
{
  WallAdjacency Blocks;
};

namespace
{
struct VolumeBlock
{
  vtkDataSet* Data = nullptr;
  std::string Name;
  const WallAdjacency::Block* Index = nullptr;
  ArrayView Velocity, Gradient, Viscosity, TurbulentViscosity, Density;
};

struct Settings
{
  ArraySelection Velocity, WallVelocity, Gradient, Viscosity, TurbulentViscosity, Density;
  int Method = 0;
  double ViscosityValue = 1.8e-5;
  bool Kinematic = false;
  double DensityValue = 1;
  double Kappa = 0.41, B = 5.0;
};

struct Counts
{
  double Faces = 0, Unmatched = 0, OffWall = 0, FellBack = 0, Failed = 0;
  double NotFaces = 0, Degenerate = 0, Interfaces = 0;
};


bool IsVolume(vtkDataSet* ds)
{
  for (vtkIdType c = 0; ds && c < ds->GetNumberOfCells(); ++c)
  {
    if (vtkCellTypes::GetDimension(static_cast<unsigned char>(ds->GetCellType(c))) == 3)
    {
      return true;
    }
  }
  return false;
}


/// Value of a volume array at a cell: the cell value or the mean over its points.
void CellValue(const ArrayView& a, vtkIdList* cellPoints, vtkIdType cell, int comps, double* out)
{
  for (int k = 0; k < comps; ++k)
  {
    if (!a.OnPoints)
    {
      out[k] = a.Get(cell, k);
      continue;
    }
    double sum = 0;
    for (vtkIdType j = 0; j < cellPoints->GetNumberOfIds(); ++j)
    {
      sum += a.Get(cellPoints->GetId(j), k);
    }
    out[k] = sum / static_cast<double>(cellPoints->GetNumberOfIds());
  }
}

/// One wall face: its frame and the adjacent cell (block, id) or none.
struct WallFace
{
  FaceFrame<double> Frame;
  bool Valid = false;
  bool NotFace = false; ///< a vertex, line or 3D cell among the walls
  int Block = -1;
  vtkIdType Cell = -1;
  double WallVelocity[3] = { 0, 0, 0 };
  /// Gradient of the wall velocity in the face plane (row-major, du_i/dx_j),
  /// from corner values; zero without a point-data wall velocity.
  double WallGradient[9] = { 0, 0, 0, 0, 0, 0, 0, 0, 0 };
};

/// Work objects reused from face to face (no allocation per face).
struct Scratch
{
  vtkNew<vtkGenericCell> Cell;
  vtkNew<vtkIdList> CellPoints;
  vtkNew<vtkIdList> Neighbours;
  vtkNew<vtkIdList> NeighbourPoints;
  std::vector<double> Xk, Uk, Ds, Us;
};

/// Shear and wall quantities for one face.
void Reconstruct(const Settings& s, VolumeBlock& vb, const WallFace& face, Scratch& work,
  double out[9], int& regime, Counts& counts)
{
  for (int k = 0; k < 9; ++k)
  {
    out[k] = NaN;
  }
  regime = UnknownRegime;
  vtkDataSet* mesh = vb.Index->Mesh;
  vtkIdList* cellPoints = work.CellPoints;
  mesh->GetCellPoints(face.Cell, cellPoints);
  double xP[3], uP[3];
  CellCentre(mesh, cellPoints, xP);
  CellValue(vb.Velocity, cellPoints, face.Cell, 3, uP);
  const double* xf = face.Frame.Centroid;
  double n[3] = { face.Frame.Normal[0], face.Frame.Normal[1], face.Frame.Normal[2] };
  const double toP[3] = { xP[0] - xf[0], xP[1] - xf[1], xP[2] - xf[2] };
  double d = Dot(toP, n);
  if (d < 0)
  {
    for (double& v : n)
    {
      v = -v;
    }
    d = -d;
  }
  if (!(d > 0) || !std::isfinite(d))
  {
    ++counts.OffWall;
    return;
  }
  // Geometry is known even if the reconstruction below fails.
  for (int k = 0; k < 3; ++k)
  {
    out[3 + k] = n[k];
  }
  out[6] = d;
  double rho = s.DensityValue;
  if (vb.Density.Valid())
  {
    CellValue(vb.Density, cellPoints, face.Cell, 1, &rho);
  }
  double mu = s.ViscosityValue;
  if (vb.Viscosity.Valid())
  {
    CellValue(vb.Viscosity, cellPoints, face.Cell, 1, &mu);
  }
  double mut = 0;
  if (vb.TurbulentViscosity.Valid())
  {
    CellValue(vb.TurbulentViscosity, cellPoints, face.Cell, 1, &mut);
  }
  const double factor = s.Kinematic ? rho : 1.0;
  const double muMolecular = factor * mu;
  const double muEff = factor * (mu + mut);
  const double nu = muMolecular / rho;
  const double* uW = face.WallVelocity;

  // Face neighbours of the adjacent cell (gradient and wall fit).
  std::vector<double>& xk = work.Xk;
  std::vector<double>& uk = work.Uk;
  xk.clear();
  uk.clear();
  auto gather = [&]() {
    vtkGenericCell* scratch = work.Cell;
    mesh->GetCell(face.Cell, scratch);
    vtkIdList* neighbours = work.Neighbours;
    vtkIdList* nbPoints = work.NeighbourPoints;
    for (int f = 0; f < scratch->GetNumberOfFaces(); ++f)
    {
      vtkCell* cf = scratch->GetFace(f);
      mesh->GetCellNeighbors(face.Cell, cf->GetPointIds(), neighbours);
      for (vtkIdType j = 0; j < neighbours->GetNumberOfIds(); ++j)
      {
        const vtkIdType nb = neighbours->GetId(j);
        mesh->GetCellPoints(nb, nbPoints);
        double x[3], u[3];
        CellCentre(mesh, nbPoints, x);
        CellValue(vb.Velocity, nbPoints, nb, 3, u);
        xk.insert(xk.end(), x, x + 3);
        uk.insert(uk.end(), u, u + 3);
      }
    }
  };

  double tau[3] = { NaN, NaN, NaN };
  bool alongWall = false; // the method took only the wall-normal derivative
  switch (s.Method)
  {
    case vtkShearProjection::NEAR_WALL_DIFFERENCE:
      NearWallDifferenceShear(uP, uW, n, d, muEff, tau);
      alongWall = true;
      break;
    case vtkShearProjection::GRADIENT_TENSOR:
    {
      double G[9];
      if (vb.Gradient.Valid())
      {
        CellValue(vb.Gradient, cellPoints, face.Cell, 9, G);
      }
      else
      {
        gather();
        WallConstraint<double> wall;
        wall.Point = xf;
        wall.Value = uW;
        if (LeastSquaresGradient<double>(xP, uP, xk.data(), uk.data(), nullptr,
              static_cast<int>(xk.size() / 3), G, &wall) != GradientStatus::Ok)
        {
          ++counts.Failed;
          return;
        }
      }
      GradientWallShear(G, muEff, n, tau);
      break;
    }
    case vtkShearProjection::WALL_FIT:
    {
      gather();
      std::vector<double>& ds = work.Ds;
      std::vector<double>& us = work.Us;
      ds.assign(1, d);
      us.assign(uP, uP + 3);
      // Only neighbours stacked off the wall (NearWallShear.h).
      for (std::size_t j = 0; j < xk.size() / 3; ++j)
      {
        const double off[3] = { xk[3 * j] - xf[0], xk[3 * j + 1] - xf[1], xk[3 * j + 2] - xf[2] };
        double dj;
        if (StackedOffWall(off, n, d, dj))
        {
          ds.push_back(dj);
          us.insert(us.end(), &uk[3 * j], &uk[3 * j] + 3);
        }
      }
      const ShearStatus st = WallFitShear<double>(
        ds.data(), us.data(), nullptr, static_cast<int>(ds.size()), uW, n, muEff, tau);
      if (st == ShearStatus::Degenerate || st == ShearStatus::SingleSample)
      {
        ++counts.FellBack; // no distinct distances: the near-wall difference
        NearWallDifferenceShear(uP, uW, n, d, muEff, tau);
      }
      alongWall = true;
      break;
    }
    case vtkShearProjection::WALL_LAW:
      if (WallLawShear(uP, uW, n, d, nu, rho, s.Kappa, s.B, tau) != WallLawStatus::Ok)
      {
        ++counts.Failed;
        return;
      }
      break;
  }
  if (alongWall)
  {
    // The other half of tau n (WallQuantities.h); known only where the wall
    // velocity is point data (WallGradient is zero otherwise).
    AddAlongWallShear(face.WallGradient, n, muEff, tau);
  }
  if (!AllFinite(tau, 3))
  {
    ++counts.Failed;
    return;
  }
  double utau, yplus;
  FrictionVelocityAndYPlus(tau, rho, d, nu, utau, yplus);
  for (int k = 0; k < 3; ++k)
  {
    out[k] = tau[k];
    out[3 + k] = n[k];
  }
  out[6] = d;
  out[7] = utau;
  out[8] = yplus;
  regime = NearWallRegime(yplus);
}

template <typename I, typename P>
void FaceFrames(vtkDataSet* wall, std::vector<WallFace>& faces)
{
  FaceTopology<I> topo;
  MakeFaceTopology<I>(wall, topo);
  const PointView pv = MakePointView(wall);
  const P* pts = static_cast<const P*>(pv.Data);
  faces.assign(static_cast<std::size_t>(wall->GetNumberOfCells()), WallFace());
  for (vtkIdType c = 0; c < wall->GetNumberOfCells(); ++c)
  {
    I buffer[4];
    const I* ids = nullptr;
    const int n = topo.Corners(c, ids, buffer);
    faces[c].NotFace = n == 0;
    faces[c].Valid = n > 0 && pts && ComputeFaceFrame<double>(pts, ids, n, faces[c].Frame) == FaceStatus::Ok;
  }
}

} // namespace

//------------------------------------------------------------------------------
vtkShearProjection::vtkShearProjection()
  : Cache(new AdjacencyCache)
{
  this->SetNumberOfInputPorts(2);
  for (int i = VELOCITY_ARRAY; i <= DENSITY_ARRAY; ++i)
  {
    this->SetInputArrayToProcess(
      i, i == WALL_VELOCITY_ARRAY ? 1 : 0, 0, vtkDataObject::FIELD_ASSOCIATION_CELLS, "");
  }
}

vtkShearProjection::~vtkShearProjection() = default;

//------------------------------------------------------------------------------
int vtkShearProjection::FillInputPortInformation(int port, vtkInformation* info)
{
  info->Remove(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE());
  if (port == 0)
  {
    info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkDataSet");
    info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkDataObjectTree");
  }
  else
  {
    info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkPolyData");
    info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkUnstructuredGrid");
    info->Append(vtkAlgorithm::INPUT_REQUIRED_DATA_TYPE(), "vtkDataObjectTree");
    info->Set(vtkAlgorithm::INPUT_IS_OPTIONAL(), 1);
  }
  return 1;
}

//------------------------------------------------------------------------------
int vtkShearProjection::RequestDataObject(
  vtkInformation*, vtkInformationVector** inputVector, vtkInformationVector* outputVector)
{
  vtkDataObject* volume = vtkDataObject::GetData(inputVector[0], 0);
  vtkDataObject* walls =
    inputVector[1]->GetNumberOfInformationObjects() ? vtkDataObject::GetData(inputVector[1], 0) : nullptr;
  if (!volume)
  {
    return 0;
  }
  vtkInformation* info = outputVector->GetInformationObject(0);
  vtkDataObject* current = vtkDataObject::GetData(info);
  vtkSmartPointer<vtkDataObject> wanted;
  if (walls)
  {
    if (!current || !current->IsA(walls->GetClassName()))
    {
      wanted.TakeReference(walls->NewInstance());
    }
  }
  else if (vtkDataObjectTree::SafeDownCast(volume))
  {
    if (!vtkMultiBlockDataSet::SafeDownCast(current))
    {
      wanted = vtkSmartPointer<vtkMultiBlockDataSet>::New();
    }
  }
  else if (!vtkPolyData::SafeDownCast(current))
  {
    wanted = vtkSmartPointer<vtkPolyData>::New();
  }
  if (wanted)
  {
    info->Set(vtkDataObject::DATA_OBJECT(), wanted);
  }
  return 1;
}

//------------------------------------------------------------------------------
int vtkShearProjection::RequestData(
  vtkInformation*, vtkInformationVector** inputVector, vtkInformationVector* outputVector)
{
  vtkDataObject* volumeIn = vtkDataObject::GetData(inputVector[0], 0);
  vtkDataObject* wallsIn =
    inputVector[1]->GetNumberOfInformationObjects() ? vtkDataObject::GetData(inputVector[1], 0) : nullptr;
  vtkDataObject* output = vtkDataObject::GetData(outputVector, 0);

  Settings s;
  s.Velocity = SelectedArray(this, VELOCITY_ARRAY);
  s.WallVelocity = SelectedArray(this, WALL_VELOCITY_ARRAY);
  s.Gradient = SelectedArray(this, VELOCITY_GRADIENT_ARRAY);
  s.Viscosity = SelectedArray(this, VISCOSITY_ARRAY);
  s.TurbulentViscosity = SelectedArray(this, TURBULENT_VISCOSITY_ARRAY);
  s.Density = SelectedArray(this, DENSITY_ARRAY);
  s.Method = this->Method;
  s.ViscosityValue = this->Viscosity;
  s.Kinematic = this->ViscosityKind == 1;
  s.DensityValue = this->Density;
  s.Kappa = this->WallLawKappa;
  s.B = this->WallLawB;
  if (!s.Velocity.Set())
  {
    vtkErrorMacro("Shear Projection needs a Velocity array (3 components) on the volume.");
    return 0;
  }

  // Volume blocks, their arrays and their (cached) boundaries.
  std::vector<Leaf> all;
  std::vector<std::string> regionNames; // not used: volume blocks are not regions
  ListLeaves(volumeIn, all, regionNames);
  std::vector<VolumeBlock> volume;
  std::string error;
  WallAdjacency& cache = this->Cache->Blocks;
  for (const Leaf& leaf : all)
  {
    if (leaf.Data && error.empty() && !CheckGhostArrays(leaf.Data, leaf.Name, error))
    {
      continue;
    }
    if (!IsVolume(leaf.Data))
    {
      continue; // boundary patches of a composite reader, or empty pieces
    }
    VolumeBlock vb;
    vb.Data = leaf.Data;
    vb.Name = leaf.Name;
    auto fetch = [&](const ArraySelection& sel, int comps, const char* role, ArrayView& view) {
      if (!sel.Set() || !error.empty())
      {
        return;
      }
      vtkDataArray* a = FindSelectedArray(vb.Data, sel, comps, role, vb.Name, error);
      view = MakeArrayView(a, sel.OnPoints);
    };
    fetch(s.Velocity, 3, "Velocity", vb.Velocity);
    fetch(s.Gradient, 9, "Velocity gradient", vb.Gradient);
    fetch(s.Viscosity, 1, "Viscosity", vb.Viscosity);
    fetch(s.TurbulentViscosity, 1, "Turbulent viscosity", vb.TurbulentViscosity);
    fetch(s.Density, 1, "Density", vb.Density);
    volume.push_back(vb);
  }
  // Reuse a cached boundary for every block whose mesh is unchanged.
  {
    std::vector<vtkDataSet*> meshes;
    for (const VolumeBlock& vb : volume)
    {
      meshes.push_back(vb.Data);
    }
    this->NumberOfAdjacencyBuilds += cache.Update(meshes);
  }
  for (std::size_t i = 0; i < volume.size(); ++i)
  {
    volume[i].Index = &cache[i];
  }

  double failed[1] = { error.empty() ? 0.0 : 1.0 };
  GlobalMax(failed, 1);
  if (failed[0] > 0)
  {
    ReportAgreedFailure(this, error);
    return 0;
  }

  // The wall datasets of the output, each with its faces matched to cells.
  struct WallBlock
  {
    vtkSmartPointer<vtkDataSet> Out;
    std::string Name;
    std::vector<WallFace> Faces;
  };
  std::vector<WallBlock> walls;
  if (wallsIn)
  {
    if (auto* tree = vtkDataObjectTree::SafeDownCast(wallsIn))
    {
      auto* outTree = vtkDataObjectTree::SafeDownCast(output);
      outTree->CopyStructure(tree);
      vtkSmartPointer<vtkDataObjectTreeIterator> it;
      it.TakeReference(tree->NewTreeIterator());
      it->VisitOnlyLeavesOn();
      it->TraverseSubTreeOn();
      for (it->InitTraversal(); !it->IsDoneWithTraversal(); it->GoToNextItem())
      {
        auto* leaf = vtkDataSet::SafeDownCast(it->GetCurrentDataObject());
        if (!leaf)
        {
          continue;
        }
        WallBlock wb;
        wb.Out.TakeReference(leaf->NewInstance());
        wb.Out->ShallowCopy(leaf);
        outTree->SetDataSet(it, wb.Out);
        wb.Name = LeafName(it);
        walls.push_back(wb);
      }
    }
    else
    {
      WallBlock wb;
      wb.Out = vtkDataSet::SafeDownCast(output);
      wb.Out->ShallowCopy(wallsIn);
      wb.Name = "walls";
      walls.push_back(wb);
    }
  }
  else
  {
    auto* mb = vtkMultiBlockDataSet::SafeDownCast(output);
    for (std::size_t i = 0; i < volume.size(); ++i)
    {
      WallBlock wb;
      auto pd = vtkSmartPointer<vtkPolyData>::New();
      pd->ShallowCopy(volume[i].Index->Faces);
      pd->GetCellData()->RemoveArray("vtkOriginalCellIds");
      wb.Out = pd;
      wb.Name = volume[i].Name.empty() ? std::string("boundary") : volume[i].Name + " boundary";
      if (mb)
      {
        mb->SetBlock(static_cast<unsigned int>(i), pd);
        mb->GetMetaData(static_cast<unsigned int>(i))->Set(vtkCompositeDataSet::NAME(), wb.Name);
      }
      else
      {
        vtkPolyData::SafeDownCast(output)->ShallowCopy(pd);
        wb.Out = vtkDataSet::SafeDownCast(output);
      }
      walls.push_back(wb);
    }
  }

  Counts counts;
  std::ostringstream unmatchedReport;
  Scratch scratch;
  for (std::size_t w = 0; w < walls.size(); ++w)
  {
    WallBlock& wb = walls[w];
    vtkDataSet* out = wb.Out;
    const bool wallFloat = MakePointView(out).IsFloat;
    DispatchFaces(out, wallFloat, [&](auto id, auto pt) {
      FaceFrames<decltype(id), decltype(pt)>(out, wb.Faces);
    });
    // Wall velocity (optional, on the walls).
    ArrayView wallVelocity;
    if (s.WallVelocity.Set() && out->GetNumberOfCells() > 0)
    {
      std::string werror;
      vtkDataArray* a = FindSelectedArray(out, s.WallVelocity, 3, "Wall velocity", wb.Name, werror);
      if (!a)
      {
        vtkErrorMacro(<< werror);
        return 0;
      }
      wallVelocity = MakeArrayView(a, s.WallVelocity.OnPoints);
    }
    // Match faces to cells: directly for extracted boundaries, by centroid otherwise.
    double unmatched = 0;
    auto corners = vtkSmartPointer<vtkIdList>::New();
    auto found = vtkSmartPointer<vtkIdList>::New();
    std::vector<double> cornerXyz, cornerU;
    for (vtkIdType f = 0; f < out->GetNumberOfCells(); ++f)
    {
      WallFace& face = wb.Faces[f];
      if (face.NotFace)
      {
        ++counts.NotFaces;
        continue;
      }
      if (!face.Valid)
      {
        ++counts.Degenerate;
        continue;
      }
      // Match within 1e-4 of the face size, widened by the rounding of the
      // coordinates (float points far from the origin).
      const double* c = face.Frame.Centroid;
      const double reach = std::max(std::abs(c[0]), std::max(std::abs(c[1]), std::abs(c[2])));
      const double tol = 1e-4 * std::sqrt(face.Frame.Area) + (wallFloat ? 1e-6 : 1e-13) * reach;
      if (!wallsIn)
      {
        face.Block = static_cast<int>(w);
        face.Cell = cache[w].Cell[f];
        // A face that another volume block also has is an interface, not a wall.
        if (face.Cell >= 0 && cache.IsInterface(w, c, tol))
        {
          face.Cell = -1;
          ++counts.Interfaces;
        }
        if (face.Cell < 0)
        {
          continue;
        }
      }
      else
      {
        const WallAdjacency::Match m = cache.FindAdjacentCell(c, face.Frame.Normal, tol, found, corners);
        face.Block = m.Block;
        face.Cell = m.Cell;
      }
      if (face.Cell < 0)
      {
        ++unmatched;
        continue;
      }
      if (wallVelocity.Valid())
      {
        out->GetCellPoints(f, corners);
        const vtkIdType nc = corners->GetNumberOfIds();
        for (int k = 0; k < 3; ++k)
        {
          if (!wallVelocity.OnPoints)
          {
            face.WallVelocity[k] = wallVelocity.Get(f, k);
            continue;
          }
          double sum = 0;
          for (vtkIdType j = 0; j < nc; ++j)
          {
            sum += wallVelocity.Get(corners->GetId(j), k);
          }
          face.WallVelocity[k] = sum / static_cast<double>(nc);
        }
        if (wallVelocity.OnPoints)
        {
          cornerXyz.resize(3 * nc);
          cornerU.resize(3 * nc);
          for (vtkIdType j = 0; j < nc; ++j)
          {
            out->GetPoint(corners->GetId(j), &cornerXyz[3 * j]);
            for (int k = 0; k < 3; ++k)
            {
              cornerU[3 * j + k] = wallVelocity.Get(corners->GetId(j), k);
            }
          }
          FaceVelocityGradient(cornerXyz.data(), cornerU.data(), static_cast<int>(nc),
            face.Frame.Normal, face.Frame.Area, face.WallGradient);
        }
      }
    }
    if (unmatched > 0)
    {
      unmatchedReport << " " << static_cast<vtkIdType>(unmatched) << " of "
                      << out->GetNumberOfCells() << " faces of '" << wb.Name << "'";
    }
    counts.Unmatched += unmatched;
    counts.Faces += static_cast<double>(out->GetNumberOfCells());

    double* tau = NewCellDoubleArray(out, "Wall Shear Stress", 3);
    double* normal = NewCellDoubleArray(out, names::WallNormal, 3);
    double* distance = NewCellDoubleArray(out, "Wall Distance", 1);
    double* utau = NewCellDoubleArray(out, "Friction Velocity", 1);
    double* yplus = NewCellDoubleArray(out, "y+", 1);
    auto regimes = vtkSmartPointer<vtkIntArray>::New();
    regimes->SetName("Near-Wall Regime");
    regimes->SetNumberOfTuples(out->GetNumberOfCells());
    out->GetCellData()->AddArray(regimes);
    for (vtkIdType f = 0; f < out->GetNumberOfCells(); ++f)
    {
      const WallFace& face = wb.Faces[f];
      double r[9];
      int regime = UnknownRegime;
      if (face.Cell >= 0)
      {
        Reconstruct(s, volume[face.Block], face, scratch, r, regime, counts);
      }
      else
      {
        for (double& v : r)
        {
          v = NaN;
        }
      }
      for (int k = 0; k < 3; ++k)
      {
        tau[3 * f + k] = r[k];
        normal[3 * f + k] = r[3 + k];
      }
      distance[f] = r[6];
      utau[f] = r[7];
      yplus[f] = r[8];
      regimes->SetValue(f, regime);
    }
  }

  double global[8] = { counts.Faces, counts.Unmatched, counts.OffWall, counts.FellBack,
    counts.Failed, counts.NotFaces, counts.Degenerate, counts.Interfaces };
  GlobalSum(global, 8);
  if (global[5] + global[6] + global[7] > 0 && ProcessRank() == 0)
  {
    vtkWarningMacro("Shear Projection: "
      << static_cast<vtkIdType>(global[5]) << " wall cells that are not faces (vertices, lines), "
      << static_cast<vtkIdType>(global[6]) << " degenerate wall faces (zero area) and "
      << static_cast<vtkIdType>(global[7])
      << " faces shared by two volume blocks (interfaces, not walls) carry NaN.");
  }
  if (global[1] > 0 && (ProcessRank() == 0 || counts.Unmatched > 0))
  {
    // Rank 0 gives the global count; a rank that holds unmatched faces names its blocks.
    vtkWarningMacro("Shear Projection: " << static_cast<vtkIdType>(global[1]) << " of "
                                         << static_cast<vtkIdType>(global[0])
                                         << " wall faces match no boundary face of the volume "
                                            "(walls that do not touch it, or held by another rank) "
                                            "and carry NaN." << unmatchedReport.str());
  }
  if (global[2] + global[4] > 0 && ProcessRank() == 0)
  {
    vtkWarningMacro("Shear Projection: " << static_cast<vtkIdType>(global[2])
                                         << " faces whose adjacent cell centre is not off the wall "
                                            "(degenerate cells) and "
                                         << static_cast<vtkIdType>(global[4])
                                         << " faces whose reconstruction failed carry NaN.");
  }
  if (global[3] > 0 && ProcessRank() == 0)
  {
    vtkWarningMacro("Shear Projection: the wall fit found no second distinct wall distance on "
      << static_cast<vtkIdType>(global[3]) << " faces and used the near-wall difference there.");
  }
  return 1;
}

//------------------------------------------------------------------------------
void vtkShearProjection::PrintSelf(ostream& os, vtkIndent indent)
{
  this->Superclass::PrintSelf(os, indent);
  os << indent << "Method: " << this->Method << "\n";
  os << indent << "Viscosity: " << this->Viscosity << "\n";
  os << indent << "ViscosityKind: " << this->ViscosityKind << "\n";
  os << indent << "Density: " << this->Density << "\n";
  os << indent << "WallLawKappa: " << this->WallLawKappa << "\n";
  os << indent << "WallLawB: " << this->WallLawB << "\n";
}

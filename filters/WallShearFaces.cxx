// SPDX-License-Identifier: BSD-3-Clause
#include "WallShearFaces.h"

#include "vtkShearProjection.h"
#include "wallloads/FaceGeometry.h"
#include "wallloads/LeastSquaresGradient.h"
#include "wallloads/NearWallShear.h"
#include "wallloads/WallFit.h"
#include "wallloads/WallLaw.h"
#include "wallloads/WallQuantities.h"

#include "vtkCellData.h"
#include "vtkDataSet.h"
#include "vtkDoubleArray.h"
#include "vtkIntArray.h"
#include "vtkSMPThreadLocal.h"
#include "vtkSMPTools.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <type_traits>

namespace wallloads
{
namespace
{
const double NaN = std::numeric_limits<double>::quiet_NaN();

/// Work space of one thread, grown once and reused from face to face.
struct Scratch
{
  std::vector<double> Xc, Uc, Xw, Uw;
  std::vector<std::pair<int, vtkIdType>> Found;
  std::vector<vtkIdType> Ids;
};

double* DoubleArray(vtkDataSet* ds, const char* name)
{
  return vtkDoubleArray::SafeDownCast(ds->GetCellData()->GetArray(name))->GetPointer(0);
}

/// The wall dataset's faces as raw arrays (thread-safe to read).
template <typename I, typename P>
struct WallFaces
{
  FaceTopology<I> Topology;
  vtkSmartPointer<vtkDataArray> Holder;
  const P* Points = nullptr;

  explicit WallFaces(vtkDataSet* wall)
  {
    MakeFaceTopology<I>(wall, this->Topology);
    const PointView pv = MakePointView(wall);
    this->Holder = pv.Holder;
    this->Points = static_cast<const P*>(pv.Data);
  }
  /// Corner coordinates of face f into xyz (3 per corner); the corner count.
  int Corners(vtkIdType f, const I*& ids, I buffer[4], std::vector<double>& xyz) const
  {
    const int n = this->Topology.Corners(f, ids, buffer);
    xyz.resize(3 * static_cast<std::size_t>(n));
    for (int j = 0; j < n && this->Points; ++j)
    {
      const P* x = this->Points + 3 * static_cast<vtkIdType>(ids[j]);
      xyz[3 * j] = x[0];
      xyz[3 * j + 1] = x[1];
      xyz[3 * j + 2] = x[2];
    }
    return this->Points ? n : 0;
  }
};

/// Value of a volume array at a sample cell: the cell value, or the mean
/// over the cell's points.
void SampleValue(
  const WallAdjacency::Block& adj, const ArrayView& a, int s, int comps, double* out)
{
  if (!a.OnPoints)
  {
    const vtkIdType cell = adj.SampleCell[s];
    for (int k = 0; k < comps; ++k)
    {
      out[k] = a.Get(cell, k);
    }
    return;
  }
  const vtkIdType first = adj.SamplePointOffsets[s], last = adj.SamplePointOffsets[s + 1];
  for (int k = 0; k < comps; ++k)
  {
    double sum = 0;
    for (vtkIdType j = first; j < last; ++j)
    {
      sum += a.Get(adj.SamplePoints[j], k);
    }
    out[k] = sum / static_cast<double>(last - first);
  }
}

//------------------------------------------------------------------------------
// Pass 1 of the preparation: every face's match and geometry.
template <typename I, typename P>
class GeometryWorker
{
public:
  GeometryWorker(const std::vector<VolumeBlock>& volume, const WallAdjacency& adjacency,
    vtkDataSet* wall, int boundaryOf, WallFaceCache& cache)
    : Volume(volume)
    , Adjacency(adjacency)
    , Faces(wall)
    , BoundaryOf(boundaryOf)
    , Cache(cache)
    , RoundingOfWalls(std::is_same<P, float>::value ? 1e-6 : 1e-13)
  {
  }
  void Initialize() {}
  void Reduce() {}
  void operator()(vtkIdType begin, vtkIdType end)
  {
    Scratch& work = this->LocalScratch.Local();
    for (vtkIdType f = begin; f < end; ++f)
    {
      this->Cache.Block[f] = this->Face(f, work);
    }
  }

private:
  int Face(vtkIdType f, Scratch& work)
  {
    double* geometry = &this->Cache.Geometry[7 * f];
    std::fill(geometry, geometry + 7, NaN);
    I buffer[4];
    const I* ids = nullptr;
    const int numCorners = this->Faces.Corners(f, ids, buffer, work.Xw);
    if (numCorners == 0)
    {
      return WallFaceCache::NotFace;
    }
    FaceFrame<double> frame;
    if (ComputeFaceFrame<double>(this->Faces.Points, ids, numCorners, frame) != FaceStatus::Ok)
    {
      return WallFaceCache::Degenerate;
    }
    // Match within 1e-4 of the face size, widened by the rounding of the
    // coordinates (float points far from the origin).
    const double* c = frame.Centroid;
    const double reach = std::max(std::abs(c[0]), std::max(std::abs(c[1]), std::abs(c[2])));
    const double tol = 1e-4 * std::sqrt(frame.Area) + this->RoundingOfWalls * reach;
    work.Found.clear();
    this->Adjacency.FindFaces(c, tol, work.Found, work.Ids);
    std::pair<int, vtkIdType> pick{ -1, -1 };
    if (this->BoundaryOf >= 0)
    {
      // A face that another volume block also has is an interface, not a wall.
      for (const auto& m : work.Found)
      {
        if (m.first != this->BoundaryOf)
        {
          return WallFaceCache::Interface;
        }
      }
      pick = { this->BoundaryOf, f };
    }
    else
    {
      // Every boundary face at this centroid. Two (the sides of a
      // zero-thickness baffle) are told apart by the wall's stored
      // orientation, taken to point out of the fluid (as solvers export
      // walls): a candidate whose cell lies on the fluid side wins, then the
      // nearest.
      bool pickFluid = false;
      double pickDistance = 0;
      for (const auto& m : work.Found)
      {
        const WallAdjacency::Block& adj = this->Adjacency[m.first];
        const double* xb = &adj.FaceCentroid[3 * m.second];
        const double dx[3] = { xb[0] - c[0], xb[1] - c[1], xb[2] - c[2] };
        const double distance = Dot(dx, dx);
        const double* xP = &adj.SampleCentre[3 * adj.WallCellSample[adj.FaceWallCell[m.second]]];
        const double toP[3] = { xP[0] - c[0], xP[1] - c[1], xP[2] - c[2] };
        const bool fluid = work.Found.size() > 1 && Dot(toP, frame.Normal) < 0;
        if (pick.first < 0 || (fluid != pickFluid ? fluid : distance < pickDistance))
        {
          pick = m;
          pickFluid = fluid;
          pickDistance = distance;
        }
      }
      if (pick.first < 0)
      {
        return WallFaceCache::Unmatched;
      }
    }
    this->Cache.Face[f] = pick.second;
    const WallAdjacency::Block& adj = this->Adjacency[pick.first];
    const double* xP = &adj.SampleCentre[3 * adj.WallCellSample[adj.FaceWallCell[pick.second]]];
    double n[3] = { frame.Normal[0], frame.Normal[1], frame.Normal[2] };
    const double toP[3] = { xP[0] - c[0], xP[1] - c[1], xP[2] - c[2] };
    double d = Dot(toP, n);
    if (d < 0)
    {
      n[0] = -n[0];
      n[1] = -n[1];
      n[2] = -n[2];
      d = -d;
    }
    if (!(d > 0) || !std::isfinite(d))
    {
      return WallFaceCache::OffWall;
    }
    std::copy(c, c + 3, geometry);
    std::copy(n, n + 3, geometry + 3);
    geometry[6] = d;
    return pick.first;
  }

  const std::vector<VolumeBlock>& Volume;
  const WallAdjacency& Adjacency;
  WallFaces<I, P> Faces;
  const int BoundaryOf;
  WallFaceCache& Cache;
  const double RoundingOfWalls;
  vtkSMPThreadLocal<Scratch> LocalScratch;
};

//------------------------------------------------------------------------------
// Pass 2 of the preparation (wall fit): the weights of every matched face.
template <typename I, typename P>
class WeightsWorker
{
public:
  WeightsWorker(const std::vector<VolumeBlock>& volume, vtkDataSet* wall, WallFaceCache& cache)
    : Volume(volume)
    , Faces(wall)
    , Cache(cache)
  {
  }
  void Initialize() {}
  void Reduce() {}
  void operator()(vtkIdType begin, vtkIdType end)
  {
    Scratch& work = this->LocalScratch.Local();
    for (vtkIdType f = begin; f < end; ++f)
    {
      const int block = this->Cache.Block[f];
      if (block < 0)
      {
        continue;
      }
      const VolumeBlock& vb = this->Volume[block];
      const WallAdjacency::Block& adj = *vb.Adjacency;
      const int wallCell = adj.FaceWallCell[this->Cache.Face[f]];
      const int first = adj.StencilOffsets[wallCell], last = adj.StencilOffsets[wallCell + 1];
      const int numCells = last - first + 1;
      work.Xc.resize(3 * numCells);
      const int self = adj.WallCellSample[wallCell];
      std::copy(&adj.SampleCentre[3 * self], &adj.SampleCentre[3 * self] + 3, work.Xc.data());
      for (int j = first; j < last; ++j)
      {
        const int q = adj.Stencil[j];
        std::copy(&adj.SampleCentre[3 * q], &adj.SampleCentre[3 * q] + 3, &work.Xc[3 * (j - first + 1)]);
      }
      I buffer[4];
      const I* ids = nullptr;
      const int numCorners = this->Faces.Corners(f, ids, buffer, work.Xw);
      double* gamma = &this->Cache.Weights[3 * this->Cache.WeightOffsets[f]];
      const double* geometry = &this->Cache.Geometry[7 * f];
      WallFitInfo info;
      const WallFitStatus st = QuadraticWallFitWeights<double>(geometry, geometry + 3,
        work.Xc.data(), numCells, work.Xw.data(), numCorners, vb.Rounding, gamma,
        gamma + 3 * numCells, info);
      this->Cache.Fit[f] = st == WallFitStatus::Ok ? static_cast<signed char>(info.Dimension)
        : st == WallFitStatus::TooFewSamples     ? -1
        : st == WallFitStatus::IllConditioned    ? -2
        : st == WallFitStatus::NoNormalCurvature ? -4
                                                 : -3;
    }
  }

private:
  const std::vector<VolumeBlock>& Volume;
  WallFaces<I, P> Faces;
  WallFaceCache& Cache;
  vtkSMPThreadLocal<Scratch> LocalScratch;
};

//------------------------------------------------------------------------------
// The values: every face's shear from its cached match and geometry.
template <typename I, typename P>
class ValueWorker
{
public:
  ValueWorker(const ShearSettings& s, const std::vector<VolumeBlock>& volume, vtkDataSet* wall,
    const ArrayView& wallVelocity, const WallFaceCache& cache)
    : S(s)
    , Volume(volume)
    , Faces(wall)
    , WallVelocity(wallVelocity)
    , Cache(cache)
  {
    this->Tau = DoubleArray(wall, "Wall Shear Stress");
    this->Normal = DoubleArray(wall, names::WallNormal);
    this->Distance = DoubleArray(wall, "Wall Distance");
    this->Utau = DoubleArray(wall, "Friction Velocity");
    this->YPlus = DoubleArray(wall, "y+");
    this->Regime =
      vtkIntArray::SafeDownCast(wall->GetCellData()->GetArray("Near-Wall Regime"))->GetPointer(0);
  }

  void Initialize() {}

  void operator()(vtkIdType begin, vtkIdType end)
  {
    ShearCounts& counts = this->LocalCounts.Local();
    Scratch& work = this->LocalScratch.Local();
    for (vtkIdType f = begin; f < end; ++f)
    {
      this->Face(f, counts, work);
    }
  }

  void Reduce()
  {
    for (const ShearCounts& c : this->LocalCounts)
    {
      this->Total.Add(c);
    }
  }

  ShearCounts Total;

private:
  void Face(vtkIdType f, ShearCounts& counts, Scratch& work) const
  {
    ++counts.N[ShearCounts::Faces];
    for (int k = 0; k < 3; ++k)
    {
      this->Tau[3 * f + k] = NaN;
    }
    this->Utau[f] = this->YPlus[f] = NaN;
    this->Regime[f] = UnknownRegime;
    const double* geometry = &this->Cache.Geometry[7 * f];
    // Geometry is known even if the reconstruction below fails.
    for (int k = 0; k < 3; ++k)
    {
      this->Normal[3 * f + k] = geometry[3 + k];
    }
    this->Distance[f] = geometry[6];
    const int block = this->Cache.Block[f];
    switch (block)
    {
      case WallFaceCache::Unmatched:
        ++counts.N[ShearCounts::Unmatched];
        return;
      case WallFaceCache::NotFace:
        ++counts.N[ShearCounts::NotFaces];
        return;
      case WallFaceCache::Degenerate:
        ++counts.N[ShearCounts::Degenerate];
        return;
      case WallFaceCache::Interface:
        ++counts.N[ShearCounts::Interfaces];
        return;
      case WallFaceCache::OffWall:
        ++counts.N[ShearCounts::OffWall];
        return;
      default:
        break;
    }
    const VolumeBlock& vb = this->Volume[block];
    const WallAdjacency::Block& adj = *vb.Adjacency;
    const int wallCell = adj.FaceWallCell[this->Cache.Face[f]];
    const int self = adj.WallCellSample[wallCell];
    const double* xf = geometry;
    const double* n = geometry + 3;
    const double d = geometry[6];
    const ShearSettings& s = this->S;

    double uP[3];
    SampleValue(adj, vb.Velocity, self, 3, uP);
    double rho = s.DensityValue, mu = s.ViscosityValue, mut = 0;
    if (vb.Density.Valid())
    {
      SampleValue(adj, vb.Density, self, 1, &rho);
    }
    if (!(rho > 0) || !std::isfinite(rho))
    {
      ++counts.N[ShearCounts::BadDensity];
      return;
    }
    if (vb.Viscosity.Valid())
    {
      SampleValue(adj, vb.Viscosity, self, 1, &mu);
    }
    if (vb.TurbulentViscosity.Valid())
    {
      SampleValue(adj, vb.TurbulentViscosity, self, 1, &mut);
    }
    const double factor = s.Kinematic ? rho : 1.0;
    const double muEff = factor * (mu + mut);
    const double nu = factor * mu / rho;

    // Wall velocity at the face (mean of the corners for point data), at
    // each corner, and for point data its gradient in the face plane.
    double uW[3] = { 0, 0, 0 };
    double W[9] = { 0, 0, 0, 0, 0, 0, 0, 0, 0 };
    const ArrayView& wv = this->WallVelocity;
    I buffer[4];
    const I* ids = nullptr;
    const int numCorners = this->Faces.Corners(f, ids, buffer, work.Xw);
    work.Uw.assign(3 * static_cast<std::size_t>(numCorners), 0.0);
    if (wv.Valid())
    {
      for (int k = 0; k < 3; ++k)
      {
        uW[k] = wv.Face(f, ids, numCorners, k);
      }
      for (int j = 0; j < numCorners; ++j)
      {
        for (int k = 0; k < 3; ++k)
        {
          work.Uw[3 * j + k] = wv.OnPoints ? wv.Get(static_cast<vtkIdType>(ids[j]), k) : uW[k];
        }
      }
      FaceFrame<double> frame;
      if (wv.OnPoints &&
        ComputeFaceFrame<double>(this->Faces.Points, ids, numCorners, frame) == FaceStatus::Ok)
      {
        FaceVelocityGradient(work.Xw.data(), work.Uw.data(), numCorners, frame.Normal, frame.Area, W);
      }
    }

    const int first = adj.StencilOffsets[wallCell];
    const int last = adj.StencilOffsets[wallCell + 1];
    // Centres and velocities of the adjacent cell and the first `count` cells of its stencil.
    auto gather = [&](int count, bool centres) {
      work.Xc.resize(3 * (count + 1));
      work.Uc.resize(3 * (count + 1));
      std::copy(uP, uP + 3, work.Uc.data());
      if (centres)
      {
        std::copy(&adj.SampleCentre[3 * self], &adj.SampleCentre[3 * self] + 3, work.Xc.data());
      }
      for (int j = 0; j < count; ++j)
      {
        const int q = adj.Stencil[first + j];
        if (centres)
        {
          std::copy(&adj.SampleCentre[3 * q], &adj.SampleCentre[3 * q] + 3, &work.Xc[3 * (j + 1)]);
        }
        SampleValue(adj, vb.Velocity, q, 3, &work.Uc[3 * (j + 1)]);
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
          SampleValue(adj, vb.Gradient, self, 9, G);
        }
        else
        {
          // Face neighbours and the wall row (LeastSquaresGradient.h).
          const int faceNeighbours = adj.FaceNeighbours[wallCell];
          gather(faceNeighbours, true);
          WallConstraint<double> row;
          row.Point = xf;
          row.Value = uW;
          int rank = 0;
          if (LeastSquaresGradientInSpan<double>(work.Xc.data(), uP, work.Xc.data() + 3,
                work.Uc.data() + 3, nullptr, faceNeighbours, G, rank, &row) != GradientStatus::Ok)
          {
            ++counts.N[ShearCounts::Failed];
            return;
          }
          counts.N[ShearCounts::Planar] += rank < 3 ? 1 : 0;
        }
        GradientWallShear(G, muEff, n, tau);
        break;
      }
      case vtkShearProjection::WALL_FIT:
      {
        const signed char fit = this->Cache.Fit[f];
        if (fit > 0)
        {
          gather(last - first, false);
          const int numCells = last - first + 1;
          const double* gamma = &this->Cache.Weights[3 * this->Cache.WeightOffsets[f]];
          double G[9];
          ApplyWallFitWeights(gamma, work.Uc.data(), numCells, gamma + 3 * numCells,
            work.Uw.data(), numCorners, G);
          counts.N[ShearCounts::Planar] += fit < 3 ? 1 : 0;
          // The wall-normal part from the fit. The along-wall part is the wall
          // velocity's (exact: zero on a wall at rest, its face gradient for a
          // point wall velocity); with one wall velocity per face that
          // gradient is unknown, and the fit's own estimate is taken.
          NormalDerivativeShear(G, n, muEff, tau);
          if (wv.Valid() && !wv.OnPoints)
          {
            double along[3];
            GradientWallShear(G, muEff, n, along);
            double normalPart[3];
            NormalDerivativeShear(G, n, muEff, normalPart);
            for (int k = 0; k < 3; ++k)
            {
              tau[k] += along[k] - normalPart[k];
            }
          }
          else
          {
            alongWall = true;
          }
        }
        else if (fit == -3)
        {
          ++counts.N[ShearCounts::Failed];
          return;
        }
        else
        {
          // The neighbours do not determine a quadratic: the near-wall difference.
          ++counts.N[fit == -1 ? ShearCounts::FitTooFewSamples
              : fit == -4      ? ShearCounts::FitNoSecondDistance
                               : ShearCounts::FitIllConditioned];
          NearWallDifferenceShear(uP, uW, n, d, muEff, tau);
          alongWall = true;
        }
        break;
      }
      case vtkShearProjection::WALL_LAW:
        if (WallLawShear(uP, uW, n, d, nu, rho, s.Kappa, s.B, tau) != WallLawStatus::Ok)
        {
          ++counts.N[ShearCounts::Failed];
          return;
        }
        alongWall = true;
        break;
      default:
        break;
    }
    if (alongWall)
    {
      // The other half of tau n (WallQuantities.h); W is zero without a
      // point-data wall velocity.
      AddAlongWallShear(W, n, muEff, tau);
    }
    if (!AllFinite(tau, 3))
    {
      ++counts.N[ShearCounts::Failed];
      return;
    }
    double utau, yplus;
    FrictionVelocityAndYPlus(tau, rho, d, nu, utau, yplus);
    for (int k = 0; k < 3; ++k)
    {
      this->Tau[3 * f + k] = tau[k];
    }
    this->Utau[f] = utau;
    this->YPlus[f] = yplus;
    this->Regime[f] = NearWallRegime(yplus);
  }

  const ShearSettings& S;
  const std::vector<VolumeBlock>& Volume;
  WallFaces<I, P> Faces;
  const ArrayView& WallVelocity;
  const WallFaceCache& Cache;
  double *Tau, *Normal, *Distance, *Utau, *YPlus;
  int* Regime;
  vtkSMPThreadLocal<ShearCounts> LocalCounts;
  vtkSMPThreadLocal<Scratch> LocalScratch;
};
} // namespace

//------------------------------------------------------------------------------
void PrepareWallFaces(const ShearSettings& settings, const std::vector<VolumeBlock>& volume,
  const WallAdjacency& adjacency, vtkDataSet* wall, int boundaryOf, WallFaceCache& cache)
{
  const MeshKey key = MeshKey::Of(wall);
  std::vector<std::uint64_t> builds;
  for (std::size_t i = 0; i < adjacency.Size(); ++i)
  {
    builds.push_back(adjacency[i].BuildId);
  }
  const vtkIdType nf = wall->GetNumberOfCells();
  const bool wantWeights = settings.Method == vtkShearProjection::WALL_FIT;
  const bool same = key.SameAs(cache.Key) && builds == cache.Builds &&
    boundaryOf == cache.BoundaryOf && static_cast<vtkIdType>(cache.Block.size()) == nf;
  if (same)
  {
    // Hold this step's wall objects (see WallAdjacency::Update).
    key.StoreContentHash();
    cache.Key = key;
  }
  if (same && (cache.HasWeights || !wantWeights))
  {
    return;
  }
  const bool floatPoints = MakePointView(wall).IsFloat;
  if (!same)
  {
    cache = WallFaceCache();
    cache.Key = key;
    cache.Key.StoreContentHash();
    cache.Builds = builds;
    cache.BoundaryOf = boundaryOf;
    cache.Block.assign(nf, WallFaceCache::Unmatched);
    cache.Face.assign(nf, -1);
    cache.Geometry.assign(7 * static_cast<std::size_t>(nf), NaN);
    DispatchFaces(wall, floatPoints, [&](auto id, auto pt) {
      GeometryWorker<decltype(id), decltype(pt)> worker(volume, adjacency, wall, boundaryOf, cache);
      vtkSMPTools::For(0, nf, worker);
    });
  }
  if (wantWeights)
  {
    // Room for every face's weights: its cell samples and its corners.
    cache.WeightOffsets.assign(nf + 1, 0);
    cache.Fit.assign(nf, -3);
    DispatchFaces(wall, floatPoints, [&](auto id, auto) {
      using I = decltype(id);
      FaceTopology<I> topology;
      MakeFaceTopology<I>(wall, topology);
      for (vtkIdType f = 0; f < nf; ++f)
      {
        vtkIdType room = 0;
        if (cache.Block[f] >= 0)
        {
          const WallAdjacency::Block& adj = *volume[cache.Block[f]].Adjacency;
          const int wallCell = adj.FaceWallCell[cache.Face[f]];
          I buffer[4];
          const I* ids = nullptr;
          room = adj.StencilOffsets[wallCell + 1] - adj.StencilOffsets[wallCell] + 1 +
            topology.Corners(f, ids, buffer);
        }
        cache.WeightOffsets[f + 1] = cache.WeightOffsets[f] + room;
      }
    });
    cache.Weights.assign(3 * static_cast<std::size_t>(cache.WeightOffsets[nf]), 0.0);
    DispatchFaces(wall, floatPoints, [&](auto id, auto pt) {
      WeightsWorker<decltype(id), decltype(pt)> worker(volume, wall, cache);
      vtkSMPTools::For(0, nf, worker);
    });
    cache.HasWeights = true;
  }
}

void ComputeWallFaces(const ShearSettings& settings, const std::vector<VolumeBlock>& volume,
  vtkDataSet* wall, const ArrayView& wallVelocity, const WallFaceCache& cache, vtkIdType begin,
  vtkIdType end, ShearCounts& counts)
{
  const bool floatPoints = MakePointView(wall).IsFloat;
  DispatchFaces(wall, floatPoints, [&](auto id, auto pt) {
    ValueWorker<decltype(id), decltype(pt)> worker(settings, volume, wall, wallVelocity, cache);
    vtkSMPTools::For(begin, end, worker);
    counts.Add(worker.Total);
  });
}

void MarkWallFacesNotComputed(vtkDataSet* wall, vtkIdType begin, vtkIdType end)
{
  for (const char* name :
    { "Wall Shear Stress", names::WallNormal, "Wall Distance", "Friction Velocity", "y+" })
  {
    vtkDataArray* a = wall->GetCellData()->GetArray(name);
    const int nc = a->GetNumberOfComponents();
    double* v = DoubleArray(wall, name);
    std::fill(v + nc * begin, v + nc * end, NaN);
  }
  int* regime =
    vtkIntArray::SafeDownCast(wall->GetCellData()->GetArray("Near-Wall Regime"))->GetPointer(0);
  std::fill(regime + begin, regime + end, static_cast<int>(UnknownRegime));
}

} // namespace wallloads

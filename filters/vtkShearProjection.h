// SPDX-License-Identifier: BSD-3-Clause
/**
 * @class   vtkShearProjection
 * @brief   Wall shear stress, wall distance and y+ on wall faces, from a fluid volume.
 *
 * vtkShearProjection reconstructs the wall shear stress the way a
 * finite-volume solver sees it: from the velocity of the fluid cell adjacent
 * to each wall face. Input port 0 is the fluid volume (any vtkDataSet of 3D
 * cells, plain or composite; leaves without 3D cells are ignored), with the
 * velocity as cell data (cell-centred) or point data. Input port 1, optional,
 * holds the wall surfaces (plain or composite); without it every boundary
 * face of the volume is a wall face (one output block per volume block).
 *
 * Each wall face finds its adjacent cell exactly: the volume's boundary
 * faces are extracted once per mesh and wall faces are matched to them by
 * centroid, within 1e-4 of the face size, whether or not the walls share
 * point ids with the volume. The adjacency is cached and reused while the
 * volume's points and cells do not change (a time series on a fixed mesh
 * builds it once). Unmatched faces get NaN and are counted per block.
 *
 * Methods (Method):
 * - NEAR_WALL_DIFFERENCE: tau_w = mu_eff t(u_P - u_W)/d, d = (x_P - x_f).n
 *   (first order in d; exact for linear profiles such as Couette flow);
 * - GRADIENT_TENSOR: tangential part of mu_eff (G + G^T) n, G from the
 *   VelocityGradient array at the adjacent cell, or a least-squares gradient
 *   over the cell's face neighbours with the wall velocity as a constraint
 *   (second order in the interior; first order at the wall in general);
 * - WALL_FIT: least-squares fit of u_t(d) = a d + b d^2 (no slip built in)
 *   over the adjacent cell and the face neighbours stacked off the wall
 *   (further out, mostly along the normal); tau_w = mu_eff a; exact for
 *   profiles quadratic in the distance to the face. Without a stacked
 *   neighbour (typical of tetrahedra) it falls back to the near-wall
 *   difference and says how often;
 * - WALL_LAW: Spalding's law of the wall (Spalding 1961), inverted for the
 *   friction velocity from the adjacent cell's tangential speed;
 *   tau_w = rho u_tau^2 along that velocity. For wall-function meshes
 *   (y+ > 30); WallLawKappa (0.41) and WallLawB (5.0) are common practice.
 *
 * The near-wall difference and the wall fit take the wall-normal derivative
 * of the tangential velocity; the other part of tau n, mu times the
 * derivative of the normal velocity along the wall, is that of the wall
 * velocity at the wall. It vanishes on stationary and translating walls and
 * is half the shear on a spinning cylinder; it is added from the wall
 * velocity's gradient in each face (Green-Gauss over the corners) when the
 * WallVelocity array is point data. With a cell-data wall velocity on a
 * rotating curved wall use GRADIENT_TENSOR.
 *
 * Outputs, on the wall faces (cell data, double): `Wall Shear Stress` (Pa),
 * `Wall Normal` (into the fluid, decided by the adjacent cell), `Wall
 * Distance` (m), `Friction Velocity` (m/s), `y+` (-) with the molecular
 * viscosity, `Near-Wall Regime` (int: 0 y+ < 5, 1 buffer, 2 y+ > 30, -1
 * unknown). The wall's own arrays pass through, so Wall Traction takes the
 * output directly (ShearSource = wall shear stress, Orientation = Wall
 * Normal array).
 *
 * Viscosity and density as in vtkWallTraction: constant or arrays (on the
 * volume), dynamic or kinematic, plus a turbulent viscosity array.
 * Arrays to process: 0 velocity, 1 wall velocity (on the walls; zero when
 * unset), 2 velocity gradient, 3 viscosity, 4 turbulent viscosity, 5 density.
 *
 * MPI: each rank matches the walls it holds against the cells it holds (a
 * wall and its cell must sit on the same rank, as ghost-cell partitioners
 * arrange); faces it cannot match are counted and reported, summed over
 * ranks. Ghost wall faces are computed like the others; Wall Traction and
 * Load Integration leave them out. The inputs are never modified.
 */
#ifndef vtkShearProjection_h
#define vtkShearProjection_h

#include "WallLoadsFiltersModule.h" // for export macro
#include "vtkDataObjectAlgorithm.h"

#include <memory> // for the adjacency cache

class WALLLOADSFILTERS_EXPORT vtkShearProjection : public vtkDataObjectAlgorithm
{
public:
  static vtkShearProjection* New();
  vtkTypeMacro(vtkShearProjection, vtkDataObjectAlgorithm);
  void PrintSelf(ostream& os, vtkIndent indent) override;

  enum InputArrays
  {
    VELOCITY_ARRAY = 0,
    WALL_VELOCITY_ARRAY = 1,
    VELOCITY_GRADIENT_ARRAY = 2,
    VISCOSITY_ARRAY = 3,
    TURBULENT_VISCOSITY_ARRAY = 4,
    DENSITY_ARRAY = 5
  };
  enum Methods
  {
    NEAR_WALL_DIFFERENCE = 0,
    GRADIENT_TENSOR = 1,
    WALL_FIT = 2,
    WALL_LAW = 3
  };

  /// The optional wall surfaces (port 1).
  void SetWallsConnection(vtkAlgorithmOutput* walls) { this->SetInputConnection(1, walls); }

  ///@{
  /// Reconstruction method. Default NEAR_WALL_DIFFERENCE.
  vtkSetClampMacro(Method, int, NEAR_WALL_DIFFERENCE, WALL_LAW);
  vtkGetMacro(Method, int);
  ///@}

  ///@{
  /// Molecular viscosity when no viscosity array is selected (Pa s if
  /// dynamic, m^2/s if kinematic). Default 1.8e-5.
  vtkSetMacro(Viscosity, double);
  vtkGetMacro(Viscosity, double);
  ///@}

  ///@{
  /// 0 dynamic (default), 1 kinematic (times density), for the constant and the arrays.
  vtkSetClampMacro(ViscosityKind, int, 0, 1);
  vtkGetMacro(ViscosityKind, int);
  ///@}

  ///@{
  /// Density in kg/m^3 when no density array is selected. Default 1.
  vtkSetMacro(Density, double);
  vtkGetMacro(Density, double);
  ///@}

  ///@{
  /// Karman constant and log-law intercept of the wall law (0.41 and 5.0).
  vtkSetMacro(WallLawKappa, double);
  vtkGetMacro(WallLawKappa, double);
  vtkSetMacro(WallLawB, double);
  vtkGetMacro(WallLawB, double);
  ///@}

  /// How many times the face-to-cell adjacency was built (for tests).
  vtkGetMacro(NumberOfAdjacencyBuilds, int);

protected:
  vtkShearProjection();
  ~vtkShearProjection() override;

  int FillInputPortInformation(int port, vtkInformation* info) override;
  int RequestDataObject(vtkInformation*, vtkInformationVector**, vtkInformationVector*) override;
  int RequestData(vtkInformation*, vtkInformationVector**, vtkInformationVector*) override;

  int Method = NEAR_WALL_DIFFERENCE;
  double Viscosity = 1.8e-5;
  int ViscosityKind = 0;
  double Density = 1.0;
  double WallLawKappa = 0.41;
  double WallLawB = 5.0;
  int NumberOfAdjacencyBuilds = 0;

private:
  vtkShearProjection(const vtkShearProjection&) = delete;
  void operator=(const vtkShearProjection&) = delete;

  /// Boundary faces and their locator, per volume block, kept while the
  /// mesh is unchanged (a cache, not a parameter of the execution).
  struct AdjacencyCache;
  std::unique_ptr<AdjacencyCache> Cache;
};

#endif

// SPDX-License-Identifier: BSD-3-Clause
/**
 * @class   vtkShearProjection
 * @brief   Wall shear stress, wall distance and y+ on wall faces, from a fluid volume.
 *
 * vtkShearProjection reconstructs the wall shear stress the way a
 * finite-volume solver sees it: from the velocity of the fluid cells next to
 * each wall face. Input port 0 is the fluid volume (any vtkDataSet of 3-D
 * cells of any order, plain or composite), with the velocity as cell data
 * (cell-centred) or point data. Leaves without 3-D cells (the boundary
 * patches a solver reader puts beside the volume) are not volume.
 *
 * Which faces are walls, in this order:
 * 1. the optional Walls input (port 1, plain or composite; its own points or
 *    the volume's): every face of it;
 * 2. else the patch blocks of a composite Input chosen with
 *    AddWallBlockSelector (selectors of the "Hierarchy" data assembly, e.g.
 *    "/Root/wall_lower"; the panel shows them as a block tree);
 * 3. else, by default, every boundary face of the volume (outer boundary,
 *    inlets and outlets included), one output block per volume block, with a
 *    warning saying so and how many faces. A boundary face is a face of an
 *    owned cell (not a DUPLICATECELL or HIDDENCELL ghost) that no other
 *    3-D cell shares: partition faces and ghost layers are not walls.
 *    These faces carry the adjacent cell's cell data and the volume's point
 *    data, so Wall Traction can take its pressure from them.
 *
 * Each wall face finds its adjacent cell exactly (filters/WallAdjacency.h):
 * the volume's boundary faces are found once per mesh and wall faces are
 * matched to them by centroid, within 1e-4 of the face size (widened by the
 * rounding of float coordinates). The adjacency is cached while the volume's
 * geometry is unchanged (points, cells, ghosts; extent, origin, spacing,
 * direction and coordinate arrays for structured data). Unmatched faces get
 * NaN and are counted per block.
 *
 * Methods (Method):
 * - NEAR_WALL_DIFFERENCE: tau_w = mu_eff t(u_P - u_W)/d, d = (x_P - x_f).n
 *   (first order; exact for linear profiles such as Couette flow);
 * - GRADIENT_TENSOR: tangential part of mu_eff (G + G^T) n, G from the
 *   VelocityGradient array at the adjacent cell, or a least-squares gradient
 *   over the cell's face neighbours with the wall velocity as a row (first
 *   order at a wall). A VelocityGradient computed on the volume without the
 *   wall (e.g. ParaView's Gradient filter) is a cell-centre gradient, not a
 *   wall gradient: on coarse near-wall cells it underestimates the wall shear
 *   (half of it in the worst case; see README), and a warning says so once
 *   per filter and array;
 * - WALL_FIT: second-order wall fit (wallloads/WallFit.h): a quadratic
 *   least-squares reconstruction over the adjacent cell, its neighbours
 *   through faces and corners, and the wall face's corners with the wall
 *   velocity (no slip); tau_w from its gradient at the face centroid. Exact
 *   for quadratic velocity fields whatever the cell shapes (hexahedra,
 *   prisms, tetrahedra, the wedges of a triangulated 2-D mesh), second order
 *   otherwise, on flat and curved walls. Where the neighbours do not
 *   determine a quadratic it falls back to the near-wall difference and says
 *   how often and why;
 * - WALL_LAW: Spalding's law of the wall (Spalding 1961), inverted for the
 *   friction velocity from the adjacent cell's tangential speed;
 *   tau_w = rho u_tau^2 along that velocity. For wall-function meshes
 *   (y+ > 30); WallLawKappa (0.41) and WallLawB (5.0) are common practice.
 *
 * One-cell-thick meshes (2-D cases stored as a slab of wedges or hexahedra)
 * are found automatically: where a face's neighbours span only a plane the
 * least-squares gradient and the wall fit are taken in that plane, with
 * derivatives across it zero, and one warning gives the number of faces.
 *
 * The near-wall difference and the wall law take the wall-normal derivative
 * of the tangential velocity; the other part of tau n, mu times the
 * derivative of the normal velocity along the wall, is that of the wall
 * velocity: zero on stationary and translating walls, half the shear on a
 * spinning cylinder. It is added from the wall velocity's gradient in each
 * face when WallVelocity is point data; with a cell-data wall velocity on a
 * rotating curved wall use GRADIENT_TENSOR. The wall fit takes it from its
 * own gradient.
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
 * volume), dynamic or kinematic, plus a turbulent viscosity array. Density
 * must be positive (an error otherwise); faces whose density array value is
 * not positive get NaN and are counted.
 * Arrays to process: 0 velocity, 1 wall velocity (on the walls; zero when
 * unset), 2 velocity gradient, 3 viscosity, 4 turbulent viscosity, 5 density.
 *
 * Threads and ranks: the per-face loop runs under vtkSMPTools (results do not
 * depend on the backend or thread count). Every validity check, on every
 * volume and wall block, is agreed across MPI ranks with one collective
 * before any rank fails, so no rank can wait for another. Each rank matches
 * the walls it holds against the cells it holds (a wall and its cell must sit
 * on the same rank, as ghost-cell partitioners arrange); faces it cannot
 * match are counted and reported, summed over ranks. Ghost wall faces are
 * computed like the others; Wall Traction and Load Integration leave them
 * out. Progress is reported per chunk of faces and AbortExecute is honoured
 * (faces not computed carry NaN and are reported). Inputs are never modified.
 */
#ifndef vtkShearProjection_h
#define vtkShearProjection_h

#include "WallLoadsFiltersModule.h" // for export macro
#include "vtkDataObjectAlgorithm.h"

#include <memory> // for the adjacency cache
#include <string> // for selectors
#include <vector> // for selectors

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
  /// Wall patches chosen among the blocks of a composite Input, by selectors
  /// of the data assembly named by WallBlockAssembly (default "Hierarchy",
  /// the block tree: "/Root/<block name>"). Used when Walls is not connected.
  /// Empty by default: the whole boundary of the volume (with a warning).
  void AddWallBlockSelector(const char* selector);
  void ClearWallBlockSelectors();
  int GetNumberOfWallBlockSelectors() const;
  const char* GetWallBlockSelector(int i) const;
  vtkSetStringMacro(WallBlockAssembly);
  vtkGetStringMacro(WallBlockAssembly);
  ///@}

  ///@{
  /// Reconstruction method. Default NEAR_WALL_DIFFERENCE.
  vtkSetClampMacro(Method, int, NEAR_WALL_DIFFERENCE, WALL_LAW);
  vtkGetMacro(Method, int);
  ///@}

  ///@{
  /// Molecular viscosity when no viscosity array is selected (Pa s if
  /// dynamic, m^2/s if kinematic). Default 1.8e-5. Must not be negative.
  vtkSetMacro(Viscosity, double);
  vtkGetMacro(Viscosity, double);
  ///@}

  ///@{
  /// 0 dynamic (default), 1 kinematic (times density), for the constant and the arrays.
  vtkSetClampMacro(ViscosityKind, int, 0, 1);
  vtkGetMacro(ViscosityKind, int);
  ///@}

  ///@{
  /// Density in kg/m^3 when no density array is selected. Default 1. Must be positive.
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
  char* WallBlockAssembly = nullptr;
  int NumberOfAdjacencyBuilds = 0;

private:
  vtkShearProjection(const vtkShearProjection&) = delete;
  void operator=(const vtkShearProjection&) = delete;

  std::vector<std::string> WallBlockSelectors;

  /// Boundary faces and neighbours per volume block, kept while the mesh is
  /// unchanged (a cache, not a parameter of the execution).
  struct AdjacencyCache;
  std::unique_ptr<AdjacencyCache> Cache;
};

#endif

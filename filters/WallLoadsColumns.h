// SPDX-License-Identifier: BSD-3-Clause
#pragma once
/**
 * The one table of WallLoads output names: every per-face array, field-data
 * value and table column, its SI unit, its width and how it is computed.
 *
 * The filters attach the units to their arrays from here
 * (vtkDataArray::UNITS_LABEL(), read by the batch module's CSV writer), Load
 * Integration builds its tables from the column list (names, values and
 * units in one place), and the plugin's help pages are generated from this
 * file (plugin/help/make_help.py parses the WALLLOADS_* lists below: keep one
 * entry per line, strings in double quotes without commas inside quotes
 * escaped). Plain C++: no VTK here.
 */
#include "wallloads/LoadTotals.h"

#include <cstring>

namespace wallloads
{
namespace columns
{

/// Flags of a Load Integration column.
enum ColumnFlags : unsigned
{
  PLAIN = 0,
  COEFFICIENT = 1, ///< only when a dynamic pressure and reference area are known
};

/**
 * Load Integration's columns, in table order (port 1; the Total row is also
 * port 0's field data): X(member of RegionLoads, name, unit, components,
 * flags, summary name or nullptr, meaning). Columns with a summary name also
 * appear in the Load Summary (port 2) as "summary name [unit]".
 */
#define WALLLOADS_LOAD_COLUMNS(X)                                                                  \
  X(FaceCount, "Faces", "-", 1, PLAIN, nullptr, "number of wall faces counted (ghost faces excluded)") \
  X(SkippedCount, "Skipped Faces", "-", 1, PLAIN, nullptr, "faces without a finite force or area (skipped by Wall Traction), left out") \
  X(Area, "Area", "m^2", 1, PLAIN, "Wetted Area", "sum of the face areas") \
  X(PressureForce, "Pressure Force", "N", 3, PLAIN, nullptr, "sum of -(p - p_ref) n A over the faces") \
  X(ViscousForce, "Viscous Force", "N", 3, PLAIN, nullptr, "sum of the viscous (shear) traction times A") \
  X(Force, "Force", "N", 3, PLAIN, nullptr, "Pressure Force + Viscous Force") \
  X(PressureMoment, "Pressure Moment", "N m", 3, PLAIN, nullptr, "sum of (c - r0) x pressure force, c the face centroid, r0 the Moment Centre") \
  X(ViscousMoment, "Viscous Moment", "N m", 3, PLAIN, nullptr, "sum of (c - r0) x viscous force") \
  X(Moment, "Moment", "N m", 3, PLAIN, nullptr, "Pressure Moment + Viscous Moment") \
  X(Drag, "Drag", "N", 1, PLAIN, "Drag", "Force . e_D (drag direction)") \
  X(SideForce, "Side Force", "N", 1, PLAIN, "Side Force", "Force . e_S, e_S = e_L x e_D") \
  X(Lift, "Lift", "N", 1, PLAIN, "Lift", "Force . e_L (lift direction, orthogonal to e_D)") \
  X(RollingMoment, "Rolling Moment", "N m", 1, PLAIN, "Rolling Moment", "Moment . e_D") \
  X(PitchingMoment, "Pitching Moment", "N m", 1, PLAIN, "Pitching Moment", "Moment . e_S") \
  X(YawingMoment, "Yawing Moment", "N m", 1, PLAIN, "Yawing Moment", "Moment . e_L") \
  X(DragCoefficient, "Drag Coefficient", "-", 1, COEFFICIENT, "Drag Coefficient", "Drag / (q A_ref), q = 0.5 rho_ref U_ref^2") \
  X(SideForceCoefficient, "Side Force Coefficient", "-", 1, COEFFICIENT, "Side Force Coefficient", "Side Force / (q A_ref)") \
  X(LiftCoefficient, "Lift Coefficient", "-", 1, COEFFICIENT, "Lift Coefficient", "Lift / (q A_ref)") \
  X(RollingMomentCoefficient, "Rolling Moment Coefficient", "-", 1, COEFFICIENT, "Rolling Moment Coefficient", "Rolling Moment / (q A_ref b_ref), b_ref the Reference Span") \
  X(PitchingMomentCoefficient, "Pitching Moment Coefficient", "-", 1, COEFFICIENT, "Pitching Moment Coefficient", "Pitching Moment / (q A_ref L_ref), L_ref the Reference Length") \
  X(YawingMomentCoefficient, "Yawing Moment Coefficient", "-", 1, COEFFICIENT, "Yawing Moment Coefficient", "Yawing Moment / (q A_ref b_ref)") \
  X(LineOfActionPoint, "Line Of Action Point", "m", 3, PLAIN, nullptr, "point of the load's central axis nearest r0: r0 + F x M / |F|^2 (NaN for a pure couple)") \
  X(ResidualCouple, "Residual Couple", "N m", 1, PLAIN, nullptr, "moment along the force, (F . M) / |F| (NaN for a pure couple)")

/// The first columns of the Load Table: X(name, unit, components, meaning).
#define WALLLOADS_REGION_COLUMNS(X)                                                                \
  X("Region", "", 1, "region name: the block name, or the region array name and value; Total on the last row") \
  X("Region Id", "-", 1, "block index, or the region array value; NaN on the Total row (not a region)")

/**
 * The reference values Load Integration used, one column each in the Load
 * Table (constant over the rows) and field data on port 0:
 * X(name, unit, components, meaning).
 */
#define WALLLOADS_REFERENCE_COLUMNS(X)                                                             \
  X("Reference Density", "kg/m^3", 1, "rho_ref: Reference Density, or Wall Traction's Density") \
  X("Reference Speed", "m/s", 1, "U_ref: Reference Speed, or Wall Traction's (0: no coefficients)") \
  X("Dynamic Pressure", "Pa", 1, "q = 0.5 rho_ref U_ref^2") \
  X("Reference Area", "m^2", 1, "A_ref of the coefficients") \
  X("Reference Length", "m", 1, "L_ref of the pitching moment coefficient") \
  X("Reference Span", "m", 1, "b_ref of the rolling and yawing moment coefficients") \
  X("Moment Centre", "m", 3, "r0 of the moments") \
  X("Drag Direction", "-", 3, "e_D: Drag Direction, or Wall Traction's Load Direction") \
  X("Side Direction", "-", 3, "e_S = e_L x e_D") \
  X("Lift Direction", "-", 3, "e_L: Lift Direction made orthogonal to e_D")

/**
 * Wall Traction's outputs: per-face cell arrays, then field data:
 * X(name, unit, components, meaning).
 */
#define WALLLOADS_FACE_ARRAYS(X)                                                                   \
  X("Wall Normal", "-", 3, "unit normal out of the wall, into the fluid (Newell's method)") \
  X("Face Area", "m^2", 1, "face area A") \
  X("Pressure Traction", "Pa", 3, "-(p - p_ref) n") \
  X("Viscous Traction", "Pa", 3, "wall shear stress (plus (tau n).n n if Include Normal Viscous Stress)") \
  X("Traction", "Pa", 3, "Pressure Traction + Viscous Traction") \
  X("Pressure Force", "N", 3, "Pressure Traction times A") \
  X("Viscous Force", "N", 3, "Viscous Traction times A") \
  X("Force", "N", 3, "Traction times A") \
  X("Normal Viscous Stress", "Pa", 1, "(tau n).n, a diagnostic (near zero at a no-slip wall)") \
  X("Directional Traction", "Pa", 1, "Traction . e, e the unit Load Direction") \
  X("Pressure Coefficient", "-", 1, "(p - p_ref) / q, q = 0.5 Density U_ref^2 (with a Reference Speed)") \
  X("Skin Friction Coefficient", "-", 1, "|wall shear stress| / q (with a Reference Speed and a shear source)")

#define WALLLOADS_TRACTION_FIELDS(X)                                                               \
  X("Wetted Area", "m^2", 1, "sum of the counted face areas over all ranks") \
  X("Reference Density", "kg/m^3", 1, "Density, recorded for Load Integration") \
  X("Reference Speed", "m/s", 1, "Reference Speed, recorded for Load Integration") \
  X("Dynamic Pressure", "Pa", 1, "q = 0.5 Density U_ref^2 of the coefficients") \
  X("Load Direction", "-", 3, "unit Load Direction, Load Integration's default drag direction") \
  X("Skipped Non-Surface Cells", "-", 1, "vertices, lines, strips and 3D cells inside surface blocks") \
  X("Skipped Degenerate Faces", "-", 1, "faces with fewer than 3 corners or zero area") \
  X("Skipped Non-Finite Faces", "-", 1, "faces with NaN/Inf coordinates or values") \
  X("Inconsistently Oriented Faces", "-", 1, "faces oriented against their connected patch") \
  X("Open Boundary Edges", "-", 1, "edges used by one face only")

/**
 * Shear Projection's per-face cell arrays on the wall faces:
 * X(name, unit, components, meaning). Near-Wall Regime is an integer array.
 */
#define WALLLOADS_SHEAR_ARRAYS(X)                                                                  \
  X("Wall Shear Stress", "Pa", 3, "tau_w = mu_eff du_t/dn at the wall, tangential (NaN when not computed)") \
  X("Wall Normal", "-", 3, "unit normal of the wall face, into the fluid (towards the adjacent cell)") \
  X("Wall Distance", "m", 1, "distance from the face to its adjacent cell's centre along the normal") \
  X("Friction Velocity", "m/s", 1, "u_tau = sqrt(|tau_w| / density)") \
  X("y+", "-", 1, "u_tau times Wall Distance over the kinematic viscosity, at the adjacent cell's centre") \
  X("Near-Wall Regime", "-", 1, "0 viscous sublayer (y+ < 5), 1 buffer layer, 2 log layer (y+ > 30), -1 not computed")

/**
 * Load History's statistics table (port 1), one row per history column:
 * X(name, unit, components, meaning). "as quantity" columns carry the unit
 * of the quantity of their row. Its history table (port 0) is `Time` (s)
 * then one column per quantity with that quantity's unit.
 */
#define WALLLOADS_STATISTICS_COLUMNS(X)                                                            \
  X("Quantity", "", 1, "the history column: <Region>: <Column> (with X/Y/Z for vectors), or a field-data array") \
  X("Samples", "-", 1, "finite samples in the statistics window") \
  X("Statistics Start", "s", 1, "time of the window's first sample: Statistics Start, or the MSER-5 truncation point (White 1997)") \
  X("Mean", "as quantity", 1, "mean of the samples in the window") \
  X("Standard Deviation", "as quantity", 1, "sample standard deviation (divisor n - 1)") \
  X("Minimum", "as quantity", 1, "smallest sample in the window") \
  X("Maximum", "as quantity", 1, "largest sample in the window") \
  X("Standard Error Of Mean", "as quantity", 1, "sigma sqrt(tau / n), tau the autocorrelation time in samples (Sokal 1997)") \
  X("Integrated Autocorrelation Time", "s", 1, "1 + 2 sum rho(k) over Sokal's automatic window (c = 5), times the mean sampling interval") \
  X("Dominant Frequency", "Hz", 1, "peak of the Lomb-Scargle periodogram (Lomb 1976; Scargle 1982), refined off the 1/T grid") \
  X("Amplitude", "as quantity", 1, "semi-amplitude of the least-squares sinusoid at the dominant frequency") \
  X("Strouhal Number", "-", 1, "Dominant Frequency times Reference Length over Reference Speed (NaN when either is 0)")

/**
 * Load Distribution's table, one row per bin along the axis:
 * X(name, unit, components, meaning). Forces per length are the bin's force
 * over its width; the faces are split among the bins exactly by area.
 */
#define WALLLOADS_DISTRIBUTION_COLUMNS(X)                                                          \
  X("Bin", "-", 1, "bin index from 0, along the axis") \
  X("Start", "m", 1, "where the bin starts: distance from Axis Origin along the unit Axis Direction") \
  X("End", "m", 1, "where the bin ends (the next bin's Start)") \
  X("Centre", "m", 1, "middle of the bin: (Start + End) / 2") \
  X("Area", "m^2", 1, "wall area in the bin (faces cut exactly by the bin planes)") \
  X("Pressure Force Per Length", "N/m", 3, "pressure force of the bin's face parts over the bin width") \
  X("Viscous Force Per Length", "N/m", 3, "viscous force of the bin's face parts over the bin width") \
  X("Force Per Length", "N/m", 3, "Pressure Force Per Length + Viscous Force Per Length") \
  X("Drag Per Length", "N/m", 1, "Force Per Length . e_D (drag direction)") \
  X("Side Force Per Length", "N/m", 1, "Force Per Length . e_S, e_S = e_L x e_D") \
  X("Lift Per Length", "N/m", 1, "Force Per Length . e_L (lift direction, orthogonal to e_D)") \
  X("Cumulative Force", "N", 3, "force of this bin and all bins before it (from the first bin)") \
  X("Moment", "N m", 3, "the bin's own moment about the Moment Centre: each face part's force at the part's area centroid")

/// Load Distribution's table field data: X(name, unit, components, meaning).
#define WALLLOADS_DISTRIBUTION_FIELDS(X)                                                           \
  X("Axis Origin", "m", 3, "point from which Start, End and Centre are measured") \
  X("Axis Direction", "-", 3, "unit axis of the bins") \
  X("Bin Width", "m", 1, "(range end - range start) / Number Of Bins") \
  X("Moment Centre", "m", 3, "r0 of the moments") \
  X("Drag Direction", "-", 3, "e_D: Drag Direction, or Wall Traction's Load Direction") \
  X("Side Direction", "-", 3, "e_S = e_L x e_D") \
  X("Lift Direction", "-", 3, "e_L: Lift Direction made orthogonal to e_D") \
  X("Skipped Faces", "-", 1, "faces without a finite force, area or geometry (skipped by Wall Traction), left out") \
  X("Area Outside Range", "m^2", 1, "wall area outside the custom Range (in no bin)")

/// One named output and its unit.
struct NamedUnit
{
  const char* Name;
  const char* Unit;
  int Components;
  const char* Meaning;
};

/// One Load Integration column.
struct LoadColumn
{
  const char* Name;
  const char* Unit;
  int Components;
  unsigned Flags;
  const char* SummaryName; ///< nullptr: not in the Load Summary
  const char* Meaning;
  const double* (*Values)(const RegionLoads<double>&);
};

namespace detail
{
inline const double* Address(const double& v)
{
  return &v;
}
inline const double* Address(const double (&v)[3])
{
  return v;
}
} // namespace detail

#define WALLLOADS_MAKE_LOAD_COLUMN(member, name, unit, comps, flags, summary, meaning)             \
  LoadColumn{ name, unit, comps, flags, summary, meaning,                                          \
    [](const RegionLoads<double>& r) { return detail::Address(r.member); } },
#define WALLLOADS_MAKE_NAMED_UNIT(name, unit, comps, meaning) NamedUnit{ name, unit, comps, meaning },

inline const LoadColumn LoadColumns[] = { WALLLOADS_LOAD_COLUMNS(WALLLOADS_MAKE_LOAD_COLUMN) };
inline const NamedUnit RegionColumns[] = { WALLLOADS_REGION_COLUMNS(WALLLOADS_MAKE_NAMED_UNIT) };
inline const NamedUnit ReferenceColumns[] = { WALLLOADS_REFERENCE_COLUMNS(WALLLOADS_MAKE_NAMED_UNIT) };
inline const NamedUnit FaceArrays[] = { WALLLOADS_FACE_ARRAYS(WALLLOADS_MAKE_NAMED_UNIT) };
inline const NamedUnit TractionFields[] = { WALLLOADS_TRACTION_FIELDS(WALLLOADS_MAKE_NAMED_UNIT) };
inline const NamedUnit ShearArrays[] = { WALLLOADS_SHEAR_ARRAYS(WALLLOADS_MAKE_NAMED_UNIT) };
inline const NamedUnit StatisticsColumns[] = { WALLLOADS_STATISTICS_COLUMNS(WALLLOADS_MAKE_NAMED_UNIT) };
inline const NamedUnit DistributionColumns[] = { WALLLOADS_DISTRIBUTION_COLUMNS(
  WALLLOADS_MAKE_NAMED_UNIT) };
inline const NamedUnit DistributionFields[] = { WALLLOADS_DISTRIBUTION_FIELDS(
  WALLLOADS_MAKE_NAMED_UNIT) };

#undef WALLLOADS_MAKE_LOAD_COLUMN
#undef WALLLOADS_MAKE_NAMED_UNIT

/// Name of the Load Summary's region column. ParaView 5.11's spreadsheet
/// view shows a table's columns sorted by name, ignoring case (measured by
/// tests/gui/gui_user.py): "Boundary" sorts before every load column of the
/// summary, so the region comes first, then "Drag [N]", "Lift [N]".
constexpr const char* SummaryRegionColumn = "Boundary";

/// Unit of any WallLoads output name (array, field value or column), or
/// nullptr for a name that is not ours.
inline const char* UnitOf(const char* name)
{
  if (!name)
  {
    return nullptr;
  }
  for (const LoadColumn& c : LoadColumns)
  {
    if (std::strcmp(c.Name, name) == 0)
    {
      return c.Unit;
    }
  }
  for (const NamedUnit& u : ReferenceColumns)
  {
    if (std::strcmp(u.Name, name) == 0)
    {
      return u.Unit;
    }
  }
  for (const NamedUnit& u : FaceArrays)
  {
    if (std::strcmp(u.Name, name) == 0)
    {
      return u.Unit;
    }
  }
  for (const NamedUnit& u : TractionFields)
  {
    if (std::strcmp(u.Name, name) == 0)
    {
      return u.Unit;
    }
  }
  for (const NamedUnit& u : RegionColumns)
  {
    if (std::strcmp(u.Name, name) == 0)
    {
      return u.Unit;
    }
  }
  for (const NamedUnit& u : DistributionColumns)
  {
    if (std::strcmp(u.Name, name) == 0)
    {
      return u.Unit;
    }
  }
  for (const NamedUnit& u : DistributionFields)
  {
    if (std::strcmp(u.Name, name) == 0)
    {
      return u.Unit;
    }
  }
  return nullptr;
}

/// True for a name WallLoads writes (never taken as an input by the
/// automatic array choice).
inline bool IsOurOutput(const char* name)
{
  return UnitOf(name) != nullptr;
}

} // namespace columns
} // namespace wallloads

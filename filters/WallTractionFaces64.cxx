// SPDX-License-Identifier: BSD-3-Clause
// Wall Traction's face loops for 64-bit connectivity (WallTractionFaces.h).
#include "WallTractionFaces.h"

namespace wallloads
{
namespace traction
{
WALLLOADS_RUN_FACES(, vtkTypeInt64, float)
WALLLOADS_RUN_FACES(, vtkTypeInt64, double)
} // namespace traction
} // namespace wallloads

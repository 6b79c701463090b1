// SPDX-License-Identifier: BSD-3-Clause
// Wall Traction's face loops for 32-bit connectivity (WallTractionFaces.h).
#include "WallTractionFaces.h"

namespace wallloads
{
namespace traction
{
WALLLOADS_RUN_FACES(, vtkTypeInt32, float)
WALLLOADS_RUN_FACES(, vtkTypeInt32, double)
} // namespace traction
} // namespace wallloads

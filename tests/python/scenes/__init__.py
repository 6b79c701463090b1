"""Analytic test scenes for the WallLoads tests.

Small meshes built with numpy, closed-form flow fields whose surface loads are
known exactly, and the VTK objects and files made from them.  Used by the tests
in tests/python and by the demo generator (examples/generate_demo.py); meant
for tests and demo data only.  ``import scenes as S`` gives every public name:

* :mod:`scenes.meshes` -- pure numpy geometry: sphere, cylinder, box,
  tetrahedron, hexahedral grids and their boundary patches, pipes, spherical
  shells, prism splitting; Newell normals and areas, face centroids, enclosed
  volume and centroid.
* :mod:`scenes.flows` -- analytic flows and exact loads: Stokes flow past a
  sphere, a rotating sphere, potential flow past a cylinder with circulation.
* :mod:`scenes.files` -- vtkPolyData / vtkUnstructuredGrid from numpy,
  ``write_vtm`` / ``write_vtu`` (inline binary), ``volume_mesh_check``.
* :mod:`scenes.selfcheck` -- the library's own check (CTest
  ``python.test_scenes_selfcheck``).

Conventions (SI units throughout)
---------------------------------
* A wall face's unit normal ``n`` points OUT OF THE WALL INTO THE FLUID.  For
  a closed body immersed in fluid that is the outward normal of the body.
* ``ordering='into_fluid'`` builds faces whose right-hand-rule (Newell) normal
  is that ``n``; ``ordering='into_wall'`` reverses every face, which is how
  flow solvers usually store boundary faces.
* Velocity gradients are 9 components, row-major, ``G[i][j] = du_i/dx_j``
  (component order du/dx, du/dy, du/dz, dv/dx, ...).
* Wall shear stress = tangential traction the fluid exerts on the wall (Pa).
* Traction ``t = sigma . n`` with ``sigma = -(p - p_ref) I + mu (G + G^T)``
  is the force per unit area the fluid exerts on the wall.
"""

from . import files, flows, meshes
from .files import *  # noqa: F401,F403
from .flows import *  # noqa: F401,F403
from .meshes import *  # noqa: F401,F403

__all__ = meshes.__all__ + flows.__all__ + files.__all__

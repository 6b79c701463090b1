"""Analytic flows of the scenes and their exact wall fields and loads.

Creeping flow past a fixed sphere (Stokes) and around a rotating sphere, off
the wall (velocity, pressure, velocity gradient) and on it (pressure, wall
shear stress, velocity gradient, traction); potential flow past a circular
cylinder with circulation (surface pressure, closed-form forces on regions).

Conventions (SI units): ``n`` is the unit normal out of the wall into the
fluid; velocity gradients are 9 components, row-major,
``G[i][j] = du_i/dx_j`` (du/dx, du/dy, du/dz, dv/dx, ...); the wall shear
stress is the tangential traction the fluid exerts on the wall (Pa); the
traction ``t = sigma . n`` with ``sigma = -(p - p_ref) I + mu (G + G^T)`` is
the force per unit area the fluid exerts on the wall.
"""

import numpy as np

from .meshes import _as_points

__all__ = [
    "stokes_sphere", "stokes_sphere_velocity", "stokes_sphere_pressure",
    "stokes_sphere_velocity_gradient",
    "rotating_sphere", "rotating_sphere_velocity", "rotating_sphere_velocity_gradient",
    "cylinder_with_circulation", "cylinder_region_forces", "CYLINDER_REGIONS",
]



# ---------------------------------------------------------------------------
# Small helpers
# ---------------------------------------------------------------------------

def _cross_matrix(w):
    """Cross-product matrix [w x] so that ``[w x] @ v == np.cross(w, v)``."""
    wx, wy, wz = np.asarray(w, dtype=np.float64)
    return np.array([[0.0, -wz, wy],
                     [wz, 0.0, -wx],
                     [-wy, wx, 0.0]])


def _project_to_sphere(x, radius, center):
    """Radial projection of points onto a sphere: (unit normals, surface points)."""
    x = _as_points(x)
    c = np.asarray(center, dtype=np.float64)
    d = x - c
    r = np.linalg.norm(d, axis=1)
    if np.any(r == 0.0):
        raise ValueError("cannot project the sphere centre onto the sphere")
    n = d / r[:, None]
    return n, c + radius * n


# ---------------------------------------------------------------------------
# Sphere: wall fields
# ---------------------------------------------------------------------------

def stokes_sphere_velocity(x, radius, U, center=(0.0, 0.0, 0.0)):
    """Creeping-flow velocity past a fixed sphere in a uniform stream U.

    u = U - (3R/4r)(U + (U.y)y/r^2) - (R^3/4r^3)(U - 3(U.y)y/r^2),
    y = x - c  (Stokes 1851; Batchelor, An Introduction to Fluid Dynamics,
    1967, §4.9).  Returns (M, 3).
    """
    x = _as_points(x)
    U = np.asarray(U, dtype=np.float64)
    y = x - np.asarray(center, dtype=np.float64)
    r = np.linalg.norm(y, axis=1)[:, None]
    Uy = (y @ U)[:, None]
    R = float(radius)
    return (U - 0.75 * R / r * (U + Uy * y / r**2)
            - 0.25 * R**3 / r**3 * (U - 3.0 * Uy * y / r**2))


def stokes_sphere(x, radius, U, mu, center=(0.0, 0.0, 0.0)):
    """Wall fields of creeping flow past a fixed sphere in a uniform stream U.

    Evaluated on the sphere at the radial projection of ``x``, with
    n = (x - c)/|x - c| the unit normal into the fluid (Stokes 1851;
    Batchelor, An Introduction to Fluid Dynamics, 1967, §4.9):

    * ``p``        = p - p_inf = -(3/2) mu (U.n)/R
    * ``wss``      = (3 mu / 2R) (U - (U.n) n)            (tangential)
    * ``grad``     = (3 / 2R) (U - (U.n) n) n^T, row-major (M, 9)
    * ``traction`` = -(p - p_inf) n + wss = (3 mu / 2R) U  (uniform), so the
      force on the sphere is the Stokes drag 6 pi mu R U.

    Also returns ``normal`` (n) and ``x_wall`` (projected points).
    """
    R, mu = float(radius), float(mu)
    U = np.asarray(U, dtype=np.float64)
    n, xs = _project_to_sphere(x, R, center)
    Un = n @ U
    Ut = U - Un[:, None] * n
    wss = 1.5 * mu / R * Ut
    return {
        "p": -1.5 * mu * Un / R,
        "wss": wss,
        "grad": (1.5 / R * np.einsum("mi,mj->mij", Ut, n)).reshape(-1, 9),
        "traction": np.broadcast_to(1.5 * mu / R * U, n.shape).copy(),
        "normal": n,
        "x_wall": xs,
    }


def rotating_sphere_velocity(x, radius, Omega, center=(0.0, 0.0, 0.0)):
    """Creeping flow around a sphere rotating at Omega in fluid at rest.

    u = Omega x (x - c) R^3 / r^3 (Landau & Lifshitz, Fluid Mechanics, §20).
    Returns (M, 3).
    """
    x = _as_points(x)
    y = x - np.asarray(center, dtype=np.float64)
    r = np.linalg.norm(y, axis=1)[:, None]
    return np.cross(np.asarray(Omega, dtype=np.float64), y) * (float(radius) / r) ** 3


def rotating_sphere(x, radius, Omega, mu, center=(0.0, 0.0, 0.0)):
    """Wall fields of a sphere rotating at angular velocity Omega in fluid at rest.

    With y = x - c, u_i = eps_ikl Omega_k y_l R^3 r^-3, differentiating,
      du_i/dy_j = R^3 [eps_ikj Omega_k r^-3 - 3 (Omega x y)_i y_j r^-5],
    so at r = R:  G = [Omega x] (I - 3 n n^T)  (row-major, (M, 9)).
    The pressure is uniform (p - p_inf = 0).  The deformation rate is
    G + G^T = -3 ((Omega x n) n^T + n (Omega x n)^T) ([Omega x] is
    antisymmetric), hence the traction
      t = mu (G + G^T) n = -3 mu Omega x n,
    which is tangential, so ``wss`` = ``traction``.  The torque about c is
    integral of R n x t dA = -8 pi mu R^3 Omega (Landau & Lifshitz, Fluid
    Mechanics, §20).  Note that for this moving wall mu (du/dn) = -2 mu
    Omega x n differs from the traction: the full deformation-rate tensor is
    needed.

    Returns dict with ``p``, ``wss``, ``grad``, ``traction``, ``u_wall``
    (= Omega x (x_s - c)), ``normal`` and ``x_wall``.
    """
    R, mu = float(radius), float(mu)
    Omega = np.asarray(Omega, dtype=np.float64)
    n, xs = _project_to_sphere(x, R, center)
    W = _cross_matrix(Omega)
    Oxn = np.cross(Omega, n)
    G = W[None, :, :] - 3.0 * np.einsum("mi,mj->mij", Oxn, n)
    t = -3.0 * mu * Oxn
    return {
        "p": np.zeros(n.shape[0]),
        "wss": t.copy(),
        "grad": G.reshape(-1, 9),
        "traction": t,
        "u_wall": R * Oxn,
        "normal": n,
        "x_wall": xs,
    }


# ---------------------------------------------------------------------------
# Sphere: fields off the wall (volumes for Shear Projection)
# ---------------------------------------------------------------------------

def stokes_sphere_pressure(x, radius, U, mu, center=(0.0, 0.0, 0.0)):
    """Creeping-flow pressure p - p_inf at points x off a fixed sphere.

    p - p_inf = -(3/2) mu R (U . y) / r^3, y = x - c (Stokes 1851; Batchelor,
    An Introduction to Fluid Dynamics, 1967, §4.9).  At r = R it equals the
    ``p`` of :func:`stokes_sphere`.  Returns (M,).
    """
    x = _as_points(x)
    y = x - np.asarray(center, dtype=np.float64)
    r = np.linalg.norm(y, axis=1)
    return -1.5 * float(mu) * float(radius) * (y @ np.asarray(U, dtype=np.float64)) / r**3


def stokes_sphere_velocity_gradient(x, radius, U, center=(0.0, 0.0, 0.0)):
    """Gradient of :func:`stokes_sphere_velocity`, row-major G[i][j] = du_i/dx_j, (M, 9).

    Differentiating u = U - (3R/4)(U/r + (U.y) y/r^3) - (R^3/4)(U/r^3 - 3 (U.y) y/r^5)
    term by term (our own derivation, checked against central differences and
    against the Stokes equations div u = 0, grad p = mu lap u in
    scenes.selfcheck):
      d(U_i/r)/dy_j            = -U_i y_j / r^3
      d((U.y) y_i/r^3)/dy_j    = (U_j y_i + (U.y) delta_ij)/r^3 - 3 (U.y) y_i y_j/r^5
      d(U_i/r^3)/dy_j          = -3 U_i y_j / r^5
      d((U.y) y_i/r^5)/dy_j    = (U_j y_i + (U.y) delta_ij)/r^5 - 5 (U.y) y_i y_j/r^7.
    """
    x = _as_points(x)
    U = np.asarray(U, dtype=np.float64)
    y = x - np.asarray(center, dtype=np.float64)
    r = np.linalg.norm(y, axis=1)[:, None, None]
    Uy = (y @ U)[:, None, None]
    R = float(radius)
    I = np.eye(3)[None, :, :]
    Uiyj = np.einsum("i,mj->mij", U, y)
    yiUj = np.einsum("mi,j->mij", y, U)
    yy = np.einsum("mi,mj->mij", y, y)
    A = -Uiyj / r**3 + (yiUj + Uy * I) / r**3 - 3.0 * Uy * yy / r**5
    B = -3.0 * Uiyj / r**5 - 3.0 * ((yiUj + Uy * I) / r**5 - 5.0 * Uy * yy / r**7)
    return (-0.75 * R * A - 0.25 * R**3 * B).reshape(-1, 9)


def rotating_sphere_velocity_gradient(x, radius, Omega, center=(0.0, 0.0, 0.0)):
    """Gradient of :func:`rotating_sphere_velocity`, row-major (M, 9).

    du_i/dy_j = R^3 [eps_ikj Omega_k r^-3 - 3 (Omega x y)_i y_j r^-5]
    (as in :func:`rotating_sphere`, here off the wall).
    """
    x = _as_points(x)
    Om = np.asarray(Omega, dtype=np.float64)
    y = x - np.asarray(center, dtype=np.float64)
    r = np.linalg.norm(y, axis=1)[:, None, None]
    W = _cross_matrix(Om)[None, :, :]
    Oxy = np.cross(Om, y)
    G = float(radius) ** 3 * (W / r**3 - 3.0 * np.einsum("mi,mj->mij", Oxy, y) / r**5)
    return G.reshape(-1, 9)


# ---------------------------------------------------------------------------
# Circular cylinder with circulation (2-D potential flow)
# ---------------------------------------------------------------------------

#: Angular ranges (radians, theta from +x toward +y) of the cylinder regions.
CYLINDER_REGIONS = {
    "upper": (0.0, np.pi),
    "lower": (np.pi, 2.0 * np.pi),
    "front": (0.5 * np.pi, 1.5 * np.pi),   # x < 0, facing the oncoming stream
    "rear": (-0.5 * np.pi, 0.5 * np.pi),
    "all": (0.0, 2.0 * np.pi),
}


def cylinder_with_circulation(theta, U, Gamma, radius, rho):
    """Surface pressure p - p_inf of potential flow past a circular cylinder.

    Uniform stream U along +x plus a clockwise vortex of strength Gamma
    (Anderson, Fundamentals of Aerodynamics, §3.15).  Surface speed
    v_theta = -2 U sin(theta) - Gamma/(2 pi R); Bernoulli gives
    p - p_inf = 0.5 rho (U^2 - v_theta^2).  Lift per unit span rho U Gamma
    along +y (Kutta-Joukowski), drag zero (d'Alembert).
    """
    theta = np.asarray(theta, dtype=np.float64)
    v = -2.0 * U * np.sin(theta) - Gamma / (2.0 * np.pi * radius)
    return 0.5 * rho * (U**2 - v**2)


def cylinder_region_forces(U, Gamma, radius, rho, span):
    """Closed-form pressure force (p_ref = p_inf) on regions of the cylinder.

    Force from the fluid on the wall: F = -integral (p - p_inf) n dA with
    n = (cos t, sin t, 0) and dA = R span dt.  With q = 0.5 rho U^2 and
    a = Gamma/(2 pi R U):
      C_p = 1 - (2 sin t + a)^2 = (1 - a^2) - 4 a sin t - 4 sin^2 t,
      F_x = -q R span integral C_p cos t dt,  F_y = -q R span integral C_p sin t dt.
    Needed integrals (antiderivatives sin t, -cos t, sin^2/2, sin^3/3,
    t/2 - sin 2t/4, cos^3/3 - cos t):
      upper [0, pi]:      int sin = 2,  int sin^2 = pi/2, int sin^3 = 4/3,
                          int cos = int sin cos = int sin^2 cos = 0
        -> F = q R span (0, 10/3 + 2 a^2 + 2 pi a, 0)
      lower [pi, 2 pi]:   int sin = -2, int sin^2 = pi/2, int sin^3 = -4/3
        -> F = q R span (0, -(10/3 + 2 a^2 - 2 pi a), 0)
      front [pi/2, 3pi/2]: int cos = -2, int sin^2 cos = -2/3, int sin cos = 0,
                          int sin = int sin^3 = 0, int sin^2 = pi/2
        -> F = q R span (-(2/3 + 2 a^2), 2 pi a, 0)
      rear [-pi/2, pi/2]: int cos = 2, int sin^2 cos = 2/3, others as front
        -> F = q R span (2/3 + 2 a^2, 2 pi a, 0)
      all: F = q R span (0, 4 pi a, 0) = (0, rho U Gamma span, 0).
    Returns dict region name -> 3-vector (N).
    """
    U, Gamma, R, rho, span = map(float, (U, Gamma, radius, rho, span))
    qRs = 0.5 * rho * U**2 * R * span
    a = Gamma / (2.0 * np.pi * R * U)
    return {
        "upper": np.array([0.0, qRs * (10.0 / 3.0 + 2 * a**2 + 2 * np.pi * a), 0.0]),
        "lower": np.array([0.0, -qRs * (10.0 / 3.0 + 2 * a**2 - 2 * np.pi * a), 0.0]),
        "front": np.array([-qRs * (2.0 / 3.0 + 2 * a**2), qRs * 2 * np.pi * a, 0.0]),
        "rear": np.array([qRs * (2.0 / 3.0 + 2 * a**2), qRs * 2 * np.pi * a, 0.0]),
        "all": np.array([0.0, rho * U * Gamma * span, 0.0]),
    }

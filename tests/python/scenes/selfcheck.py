"""Self-check of the scene library: its meshes, flows and files against
independent computations (finite differences, Gauss quadrature, closed forms,
a VTK round trip).

Run by CTest as ``python.test_scenes_selfcheck``
(tests/python/test_scenes_selfcheck.py), or by hand:
``pvpython tests/python/test_scenes_selfcheck.py``.
"""

import numpy as np

from .files import mixed_unstructured_grid, polydata, unstructured_grid, volume_mesh_check, write_vtm
from .flows import (CYLINDER_REGIONS, cylinder_region_forces, cylinder_with_circulation,
                    rotating_sphere, rotating_sphere_velocity, rotating_sphere_velocity_gradient,
                    stokes_sphere, stokes_sphere_pressure, stokes_sphere_velocity,
                    stokes_sphere_velocity_gradient)
from .meshes import (VTK_HEXAHEDRON, box, cylinder_lateral, enclosed_volume, face_centroids,
                     grid_boundary_patch, hex_box, hex_grid, newell_normals, pipe_volume,
                     spherical_shell, tetrahedron, uv_sphere, volume_centroid)


def _sphere_gauss(radius, center, n_theta=24, n_phi=48):
    """Quadrature on the exact sphere: Gauss-Legendre in cos(theta), uniform in phi.

    Returns (points (M,3), weights (M,)); exact for low-order polynomial
    integrands in n.
    """
    mu_, w_ = np.polynomial.legendre.leggauss(n_theta)
    phi = 2.0 * np.pi * (np.arange(n_phi) + 0.5) / n_phi
    ct, ph = np.meshgrid(mu_, phi, indexing="ij")
    st = np.sqrt(1.0 - ct**2)
    n = np.stack([st * np.cos(ph), st * np.sin(ph), ct], axis=-1).reshape(-1, 3)
    w = (np.repeat(w_, n_phi) * (2.0 * np.pi / n_phi)) * radius**2
    return np.asarray(center, dtype=np.float64) + radius * n, w


def _fd_gradient(field, x, h):
    """Central-difference gradient of a vector field, row-major (M, 9)."""
    G = np.zeros((x.shape[0], 3, 3))
    for j in range(3):
        e = np.zeros(3)
        e[j] = h
        G[:, :, j] = (field(x + e) - field(x - e)) / (2.0 * h)
    return G.reshape(-1, 9)


def _traction_from(p, grad, n, mu):
    G = grad.reshape(-1, 3, 3)
    S = G + np.transpose(G, (0, 2, 1))
    return -p[:, None] * n + mu * np.einsum("mij,mj->mi", S, n)


def run():
    rng = np.random.default_rng(12345)
    close = np.testing.assert_allclose

    # --- uv_sphere: topology, orientation, closure, volume -----------------
    R, c = 0.7, np.array([0.3, -0.2, 1.1])
    P, F, rows = uv_sphere(R, 18, 24, center=c)
    assert P.shape == (2 + 17 * 24, 3) and len(F) == 18 * 24 == rows.size
    assert len(np.unique(np.round(P, 12), axis=0)) == P.shape[0], "duplicate points"
    close(np.linalg.norm(P - c, axis=1), R, rtol=1e-15)
    assert sum(len(f) == 3 for f in F) == 2 * 24
    n, A = newell_normals(P, F)
    C = face_centroids(P, F)
    assert np.all(np.einsum("ij,ij->i", n, C - c) > 0), "normals must point into fluid"
    closure = np.abs((n * A[:, None]).sum(axis=0)).max() / A.sum()
    assert closure < 1e-14, closure
    V = enclosed_volume(P, F)
    assert 0.98 * 4 / 3 * np.pi * R**3 < V < 4 / 3 * np.pi * R**3
    close(volume_centroid(P, F), c, atol=1e-12)
    Pw, Fw, _ = uv_sphere(R, 18, 24, center=c, ordering="into_wall")
    close(enclosed_volume(Pw, Fw), -V, rtol=1e-13)
    close(newell_normals(Pw, Fw)[0], -n, atol=1e-14)
    theta_c = np.arccos(np.clip((C - c)[:, 2] / np.linalg.norm(C - c, axis=1), -1, 1))
    assert np.all(np.floor(theta_c / (np.pi / 18)).astype(int) == rows)

    # --- cylinder_lateral ----------------------------------------------------
    P, F, th = cylinder_lateral(0.5, 2.0, 16, n_span=3)
    n, A = newell_normals(P, F)
    C = face_centroids(P, F)
    close(np.mod(np.arctan2(C[:, 1], C[:, 0]), 2 * np.pi), th, atol=1e-12)
    close(n[:, :2], np.stack([np.cos(th), np.sin(th)], axis=1), atol=1e-12)
    close(n[:, 2], 0.0, atol=1e-14)
    assert np.sum(th < np.pi) == np.sum(th > np.pi) == len(F) // 2

    # --- box and tetrahedron ----------------------------------------------
    q, _ = np.linalg.qr(rng.normal(size=(3, 3)))
    for rot in (None, q, -q):
        P, F = box((1.0, 2.0, 3.0), center=(1.0, 2.0, 3.0), rotation=rot)
        close(enclosed_volume(P, F), 6.0, rtol=1e-13)
        close(volume_centroid(P, F), [1.0, 2.0, 3.0], atol=1e-13)
        n, A = newell_normals(P, F)
        close(np.sort(A), [2, 2, 3, 3, 6, 6], rtol=1e-13)
        close((n * A[:, None]).sum(axis=0), 0.0, atol=1e-13)
        close(face_centroids(P, F).mean(axis=0), [1.0, 2.0, 3.0], atol=1e-13)
    T = np.array([[0, 0, 0], [1, 0, 0], [0, 1, 0], [0, 0, 1]], dtype=float)
    for perm in ([0, 1, 2, 3], [1, 0, 2, 3]):
        P, F = tetrahedron(T[perm])
        close(enclosed_volume(P, F), 1.0 / 6.0, rtol=1e-14)
        close(volume_centroid(P, F), [0.25, 0.25, 0.25], atol=1e-15)
        P, F = tetrahedron(T[perm], ordering="into_wall")
        close(enclosed_volume(P, F), -1.0 / 6.0, rtol=1e-14)
    # non-convex planar polygon (an L shape): centroid known exactly
    L = np.array([[0, 0, 0], [2, 0, 0], [2, 1, 0], [1, 1, 0], [1, 2, 0], [0, 2, 0]], float)
    close(face_centroids(L, [tuple(range(6))])[0], [5.0 / 6.0, 5.0 / 6.0, 0.0], atol=1e-15)
    close(newell_normals(L, [tuple(range(6))])[1], [3.0])

    # --- Stokes sphere: fields vs finite differences, drag ------------------
    R, mu, U, c = 1.3, 0.8, np.array([0.4, -1.1, 0.7]), np.array([0.2, 0.1, -0.3])
    d = rng.normal(size=(50, 3))
    x = c + R * d / np.linalg.norm(d, axis=1)[:, None]
    s = stokes_sphere(2.0 * x - c, R, U, mu, center=c)   # tests radial projection
    close(s["x_wall"], x, atol=1e-14)
    close(stokes_sphere_velocity(x, R, U, c), 0.0, atol=1e-14)
    h = 1e-5 * R
    Gfd = _fd_gradient(lambda y: stokes_sphere_velocity(y, R, U, c), x, h)
    close(s["grad"], Gfd, atol=1e-8 * np.abs(U).max() / R)
    close(_traction_from(s["p"], s["grad"], s["normal"], mu), s["traction"], atol=1e-14)
    wn = np.einsum("ij,ij->i", s["wss"], s["normal"])
    close(wn, 0.0, atol=1e-14)
    xq, wq = _sphere_gauss(R, c)
    sq = stokes_sphere(xq, R, U, mu, center=c)
    close((wq[:, None] * sq["traction"]).sum(0), 6 * np.pi * mu * R * U, rtol=1e-12)
    Fp = -(wq * sq["p"])[:, None] * sq["normal"]
    close(Fp.sum(0), 2 * np.pi * mu * R * U, rtol=1e-12)        # pressure drag 1/3
    close((wq[:, None] * sq["wss"]).sum(0), 4 * np.pi * mu * R * U, rtol=1e-12)

    # --- Rotating sphere: gradient vs finite differences, torque -----------
    Om = np.array([0.3, -0.5, 1.7])
    r_ = rotating_sphere(x, R, Om, mu, center=c)
    close(rotating_sphere_velocity(x, R, Om, c), r_["u_wall"], atol=1e-14)
    close(r_["u_wall"], np.cross(Om, x - c), atol=1e-14)
    Gfd = _fd_gradient(lambda y: rotating_sphere_velocity(y, R, Om, c), x, h)
    close(r_["grad"], Gfd, atol=1e-8 * np.abs(Om).max())
    close(_traction_from(r_["p"], r_["grad"], r_["normal"], mu), r_["traction"], atol=1e-14)
    close(np.einsum("ij,ij->i", r_["wss"], r_["normal"]), 0.0, atol=1e-14)
    rq = rotating_sphere(xq, R, Om, mu, center=c)
    close((wq[:, None] * rq["traction"]).sum(0), 0.0, atol=1e-12)
    torque = (wq[:, None] * np.cross(xq - c, rq["traction"])).sum(0)
    close(torque, -8 * np.pi * mu * R**3 * Om, rtol=1e-12)

    # --- Cylinder with circulation: closed forms vs quadrature -------------
    gx, gw = np.polynomial.legendre.leggauss(200)
    for (U_, Gam, Rc, rho, span) in [(3.0, 0.0, 0.5, 1.2, 2.0), (3.0, 7.5, 0.5, 1.2, 2.0),
                                     (1.0, -4.0, 2.0, 1000.0, 0.3)]:
        ref = cylinder_region_forces(U_, Gam, Rc, rho, span)
        for name, (t1, t2) in CYLINDER_REGIONS.items():
            t = 0.5 * (t2 - t1) * gx + 0.5 * (t1 + t2)
            w = 0.5 * (t2 - t1) * gw * Rc * span
            dp = cylinder_with_circulation(t, U_, Gam, Rc, rho)
            nrm = np.stack([np.cos(t), np.sin(t), np.zeros_like(t)], axis=1)
            Fq = -(w * dp) @ nrm
            scale = 0.5 * rho * U_**2 * Rc * span * (1 + abs(Gam / (2 * np.pi * Rc * U_)))**2
            close(Fq, ref[name], atol=1e-12 * scale, err_msg=name)
        close(ref["all"], [0.0, rho * U_ * Gam * span, 0.0], atol=1e-12 * scale)
        close(ref["upper"] + ref["lower"], ref["all"], atol=1e-12 * scale)
        close(ref["front"] + ref["rear"], ref["all"], atol=1e-12 * scale)

    # --- Off-wall sphere fields (the volumes of Shear Projection) ----------
    # Gradients against central differences (error O(h^2) ~ 1e-10 relative),
    # and the Stokes equations themselves: div u = 0 and grad p = mu lap u,
    # lap u_i = d(G_ij)/dx_j by central differences of the analytic gradient.
    d = rng.normal(size=(40, 3))
    xo = c + R * (1.05 + 2.0 * rng.random(40))[:, None] * d / np.linalg.norm(d, axis=1)[:, None]
    Gs = stokes_sphere_velocity_gradient(xo, R, U, c)
    close(Gs, _fd_gradient(lambda y: stokes_sphere_velocity(y, R, U, c), xo, h),
          atol=1e-8 * np.abs(U).max() / R)
    close(Gs.reshape(-1, 3, 3).trace(axis1=1, axis2=2), 0.0, atol=1e-14 * np.abs(U).max() / R)
    lap = np.zeros((xo.shape[0], 3))
    for j in range(3):
        e = np.zeros(3)
        e[j] = h
        dG = (stokes_sphere_velocity_gradient(xo + e, R, U, c)
              - stokes_sphere_velocity_gradient(xo - e, R, U, c)).reshape(-1, 3, 3) / (2.0 * h)
        lap += dG[:, :, j]
    gp = np.zeros((xo.shape[0], 3))
    for j in range(3):
        e = np.zeros(3)
        e[j] = h
        gp[:, j] = (stokes_sphere_pressure(xo + e, R, U, mu, c)
                    - stokes_sphere_pressure(xo - e, R, U, mu, c)) / (2.0 * h)
    close(gp, mu * lap, atol=1e-8 * mu * np.abs(U).max() / R**2)
    close(stokes_sphere_pressure(x, R, U, mu, c), s["p"], atol=1e-14 * mu * np.abs(U).max() / R)
    Gr = rotating_sphere_velocity_gradient(xo, R, Om, c)
    close(Gr, _fd_gradient(lambda y: rotating_sphere_velocity(y, R, Om, c), xo, h),
          atol=1e-8 * np.abs(Om).max())
    close(Gr.reshape(-1, 3, 3).trace(axis1=1, axis2=2), 0.0, atol=1e-14 * np.abs(Om).max())
    close(rotating_sphere_velocity_gradient(x, R, Om, c), r_["grad"], atol=1e-13 * np.abs(Om).max())

    # --- Volume meshes: positive cells, exact volumes, conforming ----------
    # (volume_mesh_check: signed vtkCellSizeFilter volumes; the boundary face
    # count of vtkDataSetSurfaceFilter exposes non-conforming internal faces.)
    xs, ys, zs = np.array([0.0, 0.3, 1.0]), np.array([0.0, 0.5, 0.7, 2.0]), np.array([0.0, 3.0])
    for rot in (None, q):
        P, hexes, _ = hex_grid(xs, ys, zs, rotation=rot, origin=(1.0, -2.0, 0.5))
        volume_mesh_check(mixed_unstructured_grid(P, [(VTK_HEXAHEDRON, hexes)]),
                          expected_volume=6.0, expected_boundary_faces=2 * (6 + 3 + 2))
        for axis in range(3):
            for side in (0, 1):
                Pb, Fb = grid_boundary_patch(xs, ys, zs, axis, side, rotation=rot,
                                             origin=(1.0, -2.0, 0.5))
                nb, _ = newell_normals(Pb, Fb)
                out = (np.eye(3) if rot is None else rot)[:, axis] * (1.0 if side else -1.0)
                close(nb, np.broadcast_to(out, nb.shape), atol=1e-14)   # into_wall: out of the grid
    P, hexes = hex_box(xs, ys, zs)
    volume_mesh_check(unstructured_grid(P, hexes, VTK_HEXAHEDRON), expected_volume=6.0,
                      expected_boundary_faces=2 * (6 + 3 + 2))
    Rp, Lp, nt = 0.4, 1.5, 12
    inscribed = 0.5 * nt * Rp**2 * np.sin(2.0 * np.pi / nt) * Lp   # the faceted pipe's volume
    for kind in ("hex", "wedge", "tet"):
        pv = pipe_volume(Rp, Lp, 3, nt, 4, kind=kind)
        volume_mesh_check(mixed_unstructured_grid(pv["points"], pv["cells"]),
                          expected_volume=inscribed,
                          expected_boundary_faces=len(pv["wall"]) + pv["caps"])
        nw, _ = newell_normals(pv["points"], [tuple(f) for f in pv["wall"]])
        radial = np.stack([np.cos(pv["wall_theta"]), np.sin(pv["wall_theta"])], axis=1)
        assert np.all(np.einsum("ij,ij->i", nw[:, :2], radial) > 0.9), kind   # into_wall: outward
    sh = spherical_shell(R, 3.0 * R, 8, 12, 3, stretch=2.0, center=c)
    Pi, Fi, _ = uv_sphere(R, 8, 12, center=c)
    Po, Fo, _ = uv_sphere(3.0 * R, 8, 12, center=c)
    close(sh["points"][:Pi.shape[0]], Pi, atol=0.0)
    # The lattice quads are planar and every side face lies in a plane through
    # the centre, so the shell is exactly the outer polyhedron minus the inner.
    volume_mesh_check(unstructured_grid(sh["points"], sh["cells"], sh["types"]),
                      expected_volume=enclosed_volume(Po, Fo) - enclosed_volume(Pi, Fi),
                      expected_boundary_faces=2 * len(Fi), rtol=1e-11)

    # --- polydata / write_vtm round trip ------------------------------------
    import os
    import tempfile
    from vtkmodules.vtkIOXML import vtkXMLMultiBlockDataReader
    from vtkmodules.util.numpy_support import vtk_to_numpy
    P, F, rows = uv_sphere(1.0, 6, 8)
    pd = polydata(P, F, cell_arrays={"row": rows.astype(np.int32), "v": np.ones((len(F), 3))},
                  point_arrays={"z": P[:, 2]})
    assert pd.GetNumberOfCells() == len(F) and pd.GetNumberOfPoints() == P.shape[0]
    assert pd.GetCellData().GetArray("row").GetDataTypeAsString() == "int"
    with tempfile.TemporaryDirectory() as tmp:
        path = os.path.join(tmp, "t.vtm")
        write_vtm([("A", pd), ("B", pd)], path)
        rd = vtkXMLMultiBlockDataReader()
        rd.SetFileName(path)
        rd.Update()
        out = rd.GetOutput()
        assert out.GetNumberOfBlocks() == 2
        from vtkmodules.vtkCommonDataModel import vtkCompositeDataSet
        assert out.GetMetaData(1).Get(vtkCompositeDataSet.NAME()) == "B"
        b = out.GetBlock(0)
        assert b.GetNumberOfCells() == len(F)
        close(vtk_to_numpy(b.GetCellData().GetArray("row")), rows)
    print("scenes self-check OK")


if __name__ == "__main__":
    run()

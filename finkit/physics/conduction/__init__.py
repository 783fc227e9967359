"""Finite-volume conduction in a plate-fin heat sink: the model-form check of the 1-D chain.

The heat-sink chain (:mod:`finkit.physics.sink`) treats the base and fins with one-dimensional
pieces:
spreading resistance of the base (:mod:`finkit.physics.spreading`), 1-D conduction through it, and
the
fin array as an overall surface efficiency (docs/methods.md a, c, i). Each piece assumes
something the real part does not do: the spreading models put a *uniform* ``h`` on the cooled
face of the base, where the real base is cooled through discrete fin roots; the fin model
assumes a uniform root temperature along and across each fin. This module solves the steady
heat-conduction equation in the solid itself, base and fins together, with the same ``h`` on
the same surfaces, so that the reviewer can see how far the chain is from the conduction
solution for one design.

Model
-----
* Solid: base plate ``W x L x t_b`` (x across the flow, y along it, z up through the base) with
  ``N`` plate fins of thickness ``t`` and height ``H`` running the full length; the edge fins are
  flush with the base edges, so the clear gap is ``b = (W - N t)/(N - 1)`` (as in
  :class:`finkit.physics.geometry.PlateFinSink`). ``fin_count = 0`` gives a bare plate.
* Source: uniform heat flux ``power / (l_s w_s)`` over a rectangle centred on the back face
  (z = 0), ``source_length`` along y, ``source_width`` along x.
* Convection to ``air_temperature``: ``heat_transfer_coefficient`` on both fin faces and the fin
  tips (including the outer faces of the two edge fins), ``base_heat_transfer_coefficient`` on
  the exposed base between fins (the whole top face of a bare plate).
* Adiabatic: the back face outside the source, the four side faces of the base, and the inlet
  and outlet end faces of the fins. These are the surfaces that ``PlateFinSink.total_area``
  leaves out, so the chain and the conduction solution see the same wetted area.
* Constant conductivities; the base may have its own (``base_thermal_conductivity``).

Discretisation
--------------
Cell-centred finite volumes on a structured, non-uniform 3-D mesh. Every fin face, gap edge,
source edge and the base/fin interface is a mesh line, so fin cells are solid columns of the
mesh and gap cells above the base are void (not solved). The conductance between neighbouring
solid cells is the series (harmonic) combination of the two half cells, ``A / (d_1/(2k_1) +
d_2/(2k_2))``; a convective face has ``A / (1/h + d/(2k))`` (film in series with the half cell).
This two-point flux scheme is second-order for smooth solutions. The observed order of the
source-mean resistance (:func:`refine_study`, checked in the tests) is about 1.9 for a bare plate
(the flux jumps at the source edge) and about 1.6 with fins: the fin roots are re-entrant (270°)
corners where the temperature gradient is singular, which lowers the rate of any mesh of this
kind. Richardson extrapolation with the observed order accounts for it.

Because the source is centred and the fin layout is symmetric about both mid-planes, only one
quarter (``0 ≤ x ≤ W/2``, ``0 ≤ y ≤ L/2``) is solved, with adiabatic symmetry planes; the returned
field is mirrored to the whole sink. The matrix (symmetric positive definite) is assembled in
COO form with numpy (no loop over cells) and converted to CSR. ``solver="direct"`` uses
SuperLU (``scipy.sparse.linalg.splu``) in its symmetric mode: minimum-degree ordering on
``A + A^T`` and diagonal pivots, which the symmetric positive definite matrix allows;
``solver="cg"`` uses conjugate gradients with a diagonal (Jacobi) preconditioner to a relative
residual of 1e-10; ``solver="auto"`` (default) takes the direct solver up to
``DIRECT_SOLVER_MAX_CELLS`` unknowns and CG above. On a 2-core machine the direct solver takes
about 1 s at 4e4 cells and 10 s at 1.4e5, and its fill grows faster than the cell count, so CG
(whose memory is proportional to the cell count) is used for larger meshes. scipy has no
algebraic multigrid or incomplete Cholesky; ILU-preconditioned GMRES and block (plane) Jacobi
preconditioners were tried here and were no faster. ``bench/bench_conduction.py`` prints times.

The functions take scalars (one design per call), not broadcast arrays: each call builds and
solves one mesh.

Modules: :mod:`~finkit.physics.conduction.mesh`, :mod:`~finkit.physics.conduction.assembly`,
:mod:`~finkit.physics.conduction.solve`. Their public names are re-exported here; code inside
finkit imports a name from the module that defines it.
"""

from finkit.physics.conduction import assembly, mesh, solve
from finkit.physics.conduction.assembly import *  # noqa: F403
from finkit.physics.conduction.mesh import *  # noqa: F403
from finkit.physics.conduction.solve import *  # noqa: F403

__all__ = [name for module in (mesh, assembly, solve) for name in getattr(module, "__all__", ())]

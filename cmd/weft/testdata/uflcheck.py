"""Evaluates an energy written by 'weft export --format ufl' with FEniCS.

Used by the Go test TestExportUFLAgainstFEniCS (cmd/weft/ufl_test.go): reads
a JSON job from standard input and writes JSON results to standard output.

Job: {"module": PATH, "jit_dir": DIR, "models": {NAME: [[F11, F12, F21, F22], ...]},
      "bulk_modulus": K or null}
Result: {NAME: {"membrane": [[W, P11, P12, P21, P22], ...],
                "nearly_incompressible": [[W, P11, P12, P21, P22, F33], ...]}}

"membrane": the module's psi(F) with F33 = 1/det F2 substituted, and the
nominal stress P_ij = d psi / d F_ij (i, j in-plane, in the order 11, 12, 21,
22) by UFL automatic differentiation (ufl.diff), compiled by FFCx and
evaluated by dolfinx (the plane-stress membrane: F33 is a function of F2,
which supplies the pressure that makes sigma33 = 0).

"nearly_incompressible": psi(F, bulk_modulus) with F33 solved for plane
stress, d psi / d F33 = 0 (the secant method on the automatic derivative),
and P2 = d psi / d F2 there.

Every model of the job, membrane and nearly incompressible, goes into one
dolfinx Expression, so FFCx and the C compiler run once per job; the rows
only set constants.
"""

import importlib.util
import json
import sys

import numpy as np
import ufl
from mpi4py import MPI
from petsc4py import PETSc
import dolfinx


def load(path):
    spec = importlib.util.spec_from_file_location("weft_energy", path)
    mod = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(mod)
    return mod


def main():
    job = json.load(sys.stdin)
    mod = load(job["module"])
    # The generated code is large and run a few hundred times: compiling it
    # without optimisation or debug information is what costs least.
    jit = {"cffi_extra_compile_args": ["-O0", "-g0"]}
    if job.get("jit_dir"):
        jit["cache_dir"] = job["jit_dir"]
    mesh = dolfinx.mesh.create_unit_cube(MPI.COMM_SELF, 1, 1, 1, dolfinx.mesh.CellType.tetrahedron)
    K = job.get("bulk_modulus")

    def const(v):
        return dolfinx.fem.Constant(mesh, PETSc.ScalarType(v))

    names = sorted(job["models"])
    comps, slots = [], {}
    for name in names:
        # The membrane: F33 = 1/det F2. The four in-plane components are
        # scalar variables, which FFCx compiles much faster than the
        # derivative with respect to a tensor variable (same values).
        c = [const(v) for v in (1.0, 0.0, 0.0, 1.0)]
        f = [ufl.variable(x) for x in c]
        F = ufl.as_matrix([[f[0], f[1], 0.0], [f[2], f[3], 0.0], [0.0, 0.0, 1.0 / (f[0] * f[3] - f[1] * f[2])]])
        W = mod.psi(F, model=name)
        start = len(comps)
        comps += [W] + [ufl.diff(W, x) for x in f]
        c5 = []
        if K is not None:
            c5 = [const(v) for v in (1.0, 0.0, 0.0, 1.0, 1.0)]
            g = [ufl.variable(x) for x in c5]
            Fk = ufl.as_matrix([[g[0], g[1], 0.0], [g[2], g[3], 0.0], [0.0, 0.0, g[4]]])
            Wk = mod.psi(Fk, bulk_modulus=K, model=name)
            comps += [Wk] + [ufl.diff(Wk, x) for x in g]
        slots[name] = (start, c, c5)
    expr = dolfinx.fem.Expression(ufl.as_vector(comps), np.array([[0.25, 0.25, 0.25]]), jit_params=jit)
    cells = np.array([0], dtype=np.int32)

    def evaluate(consts, values):
        for x, v in zip(consts, values):
            x.value = v
        return expr.eval(cells).ravel()

    out = {}
    for name in names:
        start, c, c5 = slots[name]
        res = {"membrane": [], "nearly_incompressible": []}
        for r in job["models"][name]:
            v = evaluate(c, r)
            res["membrane"].append([float(x) for x in v[start:start + 5]])
            if not c5:
                continue
            # Secant iterations on d psi / d F33 from the membrane's F33.
            ni = start + 5
            x0 = 1.0 / (r[0] * r[3] - r[1] * r[2])
            x1 = x0 * (1.0 + 1e-6)
            d0 = evaluate(c5, list(r) + [x0])[ni + 5]
            for _ in range(100):
                d1 = evaluate(c5, list(r) + [x1])[ni + 5]
                if d1 == d0 or d1 == 0.0:
                    break
                x0, x1, d0 = x1, x1 - d1 * (x1 - x0) / (d1 - d0), d1
                if abs(x1 - x0) <= 1e-15 * abs(x1):
                    break
            v = evaluate(c5, list(r) + [x1])
            res["nearly_incompressible"].append([float(x) for x in v[ni:ni + 5]] + [x1])
            evaluate(c5, (1.0, 0.0, 0.0, 1.0, 1.0))
        evaluate(c, (1.0, 0.0, 0.0, 1.0))
        out[name] = res
    json.dump(out, sys.stdout)


if __name__ == "__main__":
    main()

"""Evaluates an energy written by 'weft export --format ufl' with FEniCS.

Used by the Go test TestExportUFLAgainstFEniCS (cmd/weft/ufl_test.go): reads
a JSON job, or a list of jobs, from standard input and writes JSON results
(for a list, a list of results in the same order) to standard output. The
test sends every card's job in one list, so that Python and FEniCS start
once for them all.

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
dolfinx Expression, so FFCx and the C compiler run once per job. The
deformation gradients are piecewise-constant (DG0) coefficients on a mesh of
as many cells as the longest model has rows, one row a cell, so that one
evaluation gives every row of every model, and the secant iterations of all
rows run side by side (each row stops by its own test).
"""

import importlib.util
import json
import sys

import numpy as np
import ufl
from mpi4py import MPI
import dolfinx


def load(path):
    spec = importlib.util.spec_from_file_location("weft_energy", path)
    mod = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(mod)
    return mod


def main():
    jobs = json.load(sys.stdin)
    if isinstance(jobs, list):
        json.dump([run(job) for job in jobs], sys.stdout)
    else:
        json.dump(run(jobs), sys.stdout)


def run(job):
    """Evaluates one job and returns its results."""
    mod = load(job["module"])
    # The generated code is large: compiling it without optimisation or
    # debug information is what costs least.
    jit = {"cffi_extra_compile_args": ["-O0", "-g0"]}
    if job.get("jit_dir"):
        jit["cache_dir"] = job["jit_dir"]
    names = sorted(job["models"])
    rows = {name: np.array(job["models"][name], dtype=np.float64).reshape(-1, 4) for name in names}
    n = max([1] + [len(r) for r in rows.values()])
    mesh = dolfinx.mesh.create_unit_interval(MPI.COMM_SELF, n)
    V = dolfinx.fem.FunctionSpace(mesh, ("DG", 0))
    cells = np.arange(n, dtype=np.int32)
    dofs = np.array([V.dofmap.cell_dofs(c)[0] for c in cells])
    K = job.get("bulk_modulus")
    identity = (1.0, 0.0, 0.0, 1.0, 1.0)

    def coefficient(v):
        f = dolfinx.fem.Function(V)
        f.x.array[:] = v
        return f

    def assign(fs, cols):
        # Column k of cols goes to fs[k], row i to cell i; the cells past
        # a model's last row keep the identity.
        for k, f in enumerate(fs):
            f.x.array[:] = identity[k]
            f.x.array[dofs[:len(cols)]] = cols[:, k]

    comps, slots = [], {}
    for name in names:
        # The membrane: F33 = 1/det F2. The four in-plane components are
        # scalar variables, which FFCx compiles much faster than the
        # derivative with respect to a tensor variable (same values).
        c = [coefficient(v) for v in identity[:4]]
        f = [ufl.variable(x) for x in c]
        F = ufl.as_matrix([[f[0], f[1], 0.0], [f[2], f[3], 0.0], [0.0, 0.0, 1.0 / (f[0] * f[3] - f[1] * f[2])]])
        W = mod.psi(F, model=name)
        start = len(comps)
        comps += [W] + [ufl.diff(W, x) for x in f]
        c5 = []
        if K is not None:
            c5 = [coefficient(v) for v in identity]
            g = [ufl.variable(x) for x in c5]
            Fk = ufl.as_matrix([[g[0], g[1], 0.0], [g[2], g[3], 0.0], [0.0, 0.0, g[4]]])
            Wk = mod.psi(Fk, bulk_modulus=K, model=name)
            comps += [Wk] + [ufl.diff(Wk, x) for x in g]
        slots[name] = (start, c, c5)
    expr = dolfinx.fem.Expression(ufl.as_vector(comps), np.array([[0.5]]), jit_params=jit)

    def evaluate():
        return expr.eval(cells).reshape(n, len(comps))

    for name in names:
        assign(slots[name][1], rows[name])
    v = evaluate()
    out = {}
    for name in names:
        start = slots[name][0]
        out[name] = {"membrane": [[float(x) for x in v[i, start:start + 5]] for i in range(len(rows[name]))],
                     "nearly_incompressible": []}
    if K is not None:
        nearly_incompressible(names, rows, slots, assign, evaluate, out)
    return out


def nearly_incompressible(names, rows, slots, assign, evaluate, out):
    """Solves d psi / d F33 = 0 by the secant method from the membrane's F33,
    every row of every model side by side, and adds the results to out."""

    def set_f33(x):
        for name in names:
            assign(slots[name][2], np.column_stack([rows[name], x[name]]))

    def derivative(v, name):
        return v[:len(rows[name]), slots[name][0] + 10].copy()

    x0 = {name: 1.0 / (r[:, 0] * r[:, 3] - r[:, 1] * r[:, 2]) for name, r in rows.items()}
    x1 = {name: x * (1.0 + 1e-6) for name, x in x0.items()}
    set_f33(x0)
    v = evaluate()
    d0 = {name: derivative(v, name) for name in names}
    active = {name: np.ones(len(rows[name]), dtype=bool) for name in names}
    for _ in range(100):
        if not any(a.any() for a in active.values()):
            break
        set_f33(x1)
        v = evaluate()
        for name in names:
            a, d1 = active[name], derivative(v, name)
            a &= ~((d1 == d0[name]) | (d1 == 0.0))
            with np.errstate(divide="ignore", invalid="ignore"):
                step = x1[name] - d1 * (x1[name] - x0[name]) / (d1 - d0[name])
            x0[name] = np.where(a, x1[name], x0[name])
            d0[name] = np.where(a, d1, d0[name])
            x1[name] = np.where(a, step, x1[name])
            a &= ~(np.abs(x1[name] - x0[name]) <= 1e-15 * np.abs(x1[name]))
    set_f33(x1)
    v = evaluate()
    for name in names:
        ni = slots[name][0] + 5
        out[name]["nearly_incompressible"] = [[float(x) for x in v[i, ni:ni + 5]] + [float(x1[name][i])]
                                              for i in range(len(rows[name]))]


if __name__ == "__main__":
    main()

"""Least-squares STO-nG fits of Slater functions (zeta = 1), computed by us.

Why this exists: the published zeta = 1 tables (Hehre, Stewart and Pople,
J. Chem. Phys. 51, 2657 (1969); Stewart, J. Chem. Phys. 52, 431 (1970)) are
not available to us as text, so we recompute the fits with the published
criterion and check them against every published number we do have (the
basis-set-exchange copies of STO-2G ... STO-6G, see tools/import_bse.py).

Criterion (Hehre-Stewart-Pople 1969): minimise
    eps = integral (phi_STO - sum_k d_k g_k)^2 dV
over exponents and coefficients with the expansion normalised, which is the
same as maximising the overlap <phi_STO | g> / |g|. For a fixed set of
exponents the best coefficients are d = S^-1 b / sqrt(b^T S^-1 b), with
b_k = <phi_STO | g_k> and S the overlap of the normalised primitives, and the
best overlap is sqrt(b^T S^-1 b). 2s/2p and 3s/3p are fitted jointly with
shared exponents (maximise O_s + O_p, i.e. minimise eps_s + eps_p); 1s and 3d
on their own.

Radial functions (angular parts cancel, both normalised to 1):
    Slater  R(r) = (2 zeta)^(n + 1/2) / sqrt((2n)!) r^(n-1) exp(-zeta r)
    Gauss   G(r) = sqrt(2 (2 a)^(l + 3/2) / Gamma(l + 3/2)) r^l exp(-a r^2)
The radial overlap needs I_k = int_0^inf r^k exp(-r - a r^2) dr, computed with
mpmath at 50 digits by the recurrence
    I_0 = sqrt(pi / a) / 2 exp(x^2) erfc(x),   x = 1 / (2 sqrt a)
    I_1 = (1 - I_0) / (2 a),   I_(k+1) = (k I_(k-1) - I_k) / (2 a),
from integrating d/dr (r^k exp(-r - a r^2)) over (0, inf).

Optimisation: scipy Nelder-Mead and BFGS in log-exponents from several
even-tempered starts (double precision), then Newton on the analytic gradient
with mpmath (mp.findroot, gradient below 1e-30) so the exponents are converged
far beyond the 17 digits we store.
"""

import math

import mpmath as mp
import numpy as np
from scipy.optimize import minimize
from scipy.special import erfcx

mp.mp.dps = 50

# (name, n, l) of each Slater function we fit; n is the principal quantum number.
KINDS = {"1s": (1, 0), "2s": (2, 0), "2p": (2, 1), "3s": (3, 0), "3p": (3, 1), "3d": (3, 2)}
# Groups fitted together with shared exponents.
GROUPS = [("1s",), ("2s", "2p"), ("3s", "3p"), ("3d",)]


def radial_integrals(a, kmax):
    """I_0 ... I_kmax for zeta = 1 and Gaussian exponent a (mpmath)."""
    a = mp.mpf(a)
    x = 1 / (2 * mp.sqrt(a))
    i0 = mp.sqrt(mp.pi / a) / 2 * mp.exp(x * x) * mp.erfc(x)
    out = [i0, (1 - i0) / (2 * a)]
    for k in range(1, kmax):
        out.append((k * out[k - 1] - out[k]) / (2 * a))
    return out[: kmax + 1]


def sto_gauss_overlap(n, l, a):
    """<Slater nl (zeta = 1) | normalised Gaussian r^l exp(-a r^2)>."""
    k = n + 1 + l
    ik = radial_integrals(a, k)[k]
    ns = mp.mpf(2) ** (n + mp.mpf(1) / 2) / mp.sqrt(mp.factorial(2 * n))
    ng = mp.sqrt(2 * (2 * mp.mpf(a)) ** (l + mp.mpf(3) / 2) / mp.gamma(l + mp.mpf(3) / 2))
    return ns * ng * ik


def gauss_overlap_matrix(l, alphas):
    """Overlap of normalised Gaussians with the same l (closed form)."""
    m = len(alphas)
    s = mp.matrix(m, m)
    for i in range(m):
        for j in range(m):
            ai, aj = alphas[i], alphas[j]
            s[i, j] = (2 * mp.sqrt(ai * aj) / (ai + aj)) ** (l + mp.mpf(3) / 2)
    return s


def best_overlap(kind, alphas):
    """(overlap, coefficients) of the best normalised expansion on these exponents."""
    n, l = KINDS[kind]
    b = mp.matrix([sto_gauss_overlap(n, l, a) for a in alphas])
    c = mp.lu_solve(gauss_overlap_matrix(l, alphas), b)
    o2 = sum(b[i] * c[i] for i in range(len(alphas)))
    o = mp.sqrt(o2)
    return o, [c[i] / o for i in range(len(alphas))]


def objective(group, logs):
    """Sum of the group's best overlaps, in mpmath."""
    alphas = [mp.exp(mp.mpf(u)) for u in logs]
    return sum(best_overlap(kind, alphas)[0] for kind in group)


def float_objective(group, logs):
    """Sum of the group's best overlaps in double precision, for the global search.

    The float recurrence for I_k loses a few digits for small exponents; that is
    harmless here because mpmath takes over for the final convergence.
    """
    alphas = np.exp(np.asarray(logs, dtype=float))
    if not np.all(np.isfinite(alphas)) or alphas.max() > 1e6 or alphas.min() < 1e-6:
        return -1e3
    total = 0.0
    for kind in group:
        n, l = KINDS[kind]
        k = n + 1 + l
        b = np.empty(len(alphas))
        for i, a in enumerate(alphas):
            x = 1 / (2 * math.sqrt(a))
            ik = [math.sqrt(math.pi / a) / 2 * erfcx(x)]
            ik.append((1 - ik[0]) / (2 * a))
            for j in range(1, k):
                ik.append((j * ik[j - 1] - ik[j]) / (2 * a))
            ns = 2 ** (n + 0.5) / math.sqrt(math.factorial(2 * n))
            ng = math.sqrt(2 * (2 * a) ** (l + 1.5) / math.gamma(l + 1.5))
            b[i] = ns * ng * ik[k]
        s = (2 * np.sqrt(np.outer(alphas, alphas)) / np.add.outer(alphas, alphas)) ** (l + 1.5)
        try:
            o2 = b @ np.linalg.solve(s, b)
        except np.linalg.LinAlgError:
            return -1e3
        if not (np.isfinite(o2) and 0 < o2 <= 1 + 1e-9):
            return -1e3
        total += math.sqrt(o2)
    return total


def gradient(group, logs):
    """d(sum of overlaps)/d(log alpha_k), analytic, in mpmath.

    With c = S^-1 b and O = sqrt(b^T c):
    dO/da_k = c_k (db_k/da_k - sum_j c_j dS_kj/da_k) / O, where
    db_k/da_k = b_k (2l + 3) / (4 a_k) - Ns Ng I_(K+2) and
    dS_kj/da_k = S_kj (l + 3/2) (a_j - a_k) / (2 a_k (a_k + a_j)).
    """
    alphas = [mp.exp(mp.mpf(u)) for u in logs]
    m = len(alphas)
    g = [mp.mpf(0)] * m
    for kind in group:
        n, l = KINDS[kind]
        big_k = n + 1 + l
        p = l + mp.mpf(3) / 2
        ns = mp.mpf(2) ** (n + mp.mpf(1) / 2) / mp.sqrt(mp.factorial(2 * n))
        b, db = [], []
        for a in alphas:
            ik = radial_integrals(a, big_k + 2)
            ng = mp.sqrt(2 * (2 * a) ** p / mp.gamma(p))
            b.append(ns * ng * ik[big_k])
            db.append(b[-1] * (2 * l + 3) / (4 * a) - ns * ng * ik[big_k + 2])
        s = gauss_overlap_matrix(l, alphas)
        c = mp.lu_solve(s, mp.matrix(b))
        o = mp.sqrt(sum(b[i] * c[i] for i in range(m)))
        for k in range(m):
            ak = alphas[k]
            ds = sum(
                c[j] * s[k, j] * p * (alphas[j] - ak) / (2 * ak * (ak + alphas[j])) for j in range(m) if j != k
            )
            g[k] += ak * c[k] * (db[k] - ds) / o
    return g


def newton(group, u):
    """Converges the stationarity condition in mpmath; None when it does not converge."""
    m = len(u)
    try:
        if m == 1:
            u = [mp.findroot(lambda t: gradient(group, [t])[0], u[0], tol=mp.mpf(10) ** -70, maxsteps=50, verify=False)]
        else:
            fs = [(lambda i: lambda *v: gradient(group, list(v))[i])(i) for i in range(m)]
            r = mp.findroot(fs, u, tol=mp.mpf(10) ** -70, maxsteps=50, verify=False)
            u = [r[i] for i in range(m)]
    except (ZeroDivisionError, ValueError):
        return None
    if max(abs(x) for x in gradient(group, u)) < mp.mpf(10) ** -30:
        return u
    return None


def fit(group, m, previous=None):
    """Exponents (sorted, decreasing) and per-kind (overlap, coefficients).

    Starts: even-tempered sets, and the (m - 1)-term optimum `previous` with one
    exponent added at the tight end, the diffuse end or between each pair; the best
    double-precision optimum is then converged in mpmath.
    """
    centre = {1: 0.3, 2: 0.1, 3: 0.06}[KINDS[group[0]][0]]
    starts = [
        [math.log(centre) + ((m - 1) / 2 - i) * math.log(ratio) for i in range(m)] for ratio in (2.2, 3.0, 4.5)
    ]
    if previous:
        logs = sorted((math.log(float(a)) for a in previous), reverse=True)
        starts.append([logs[0] + math.log(3.0)] + logs)
        starts.append(logs + [logs[-1] - math.log(3.0)])
        for i in range(len(logs) - 1):
            starts.append(logs[: i + 1] + [(logs[i] + logs[i + 1]) / 2] + logs[i + 1 :])

    def f(u):
        return -float_objective(group, u)

    optima = []
    for start in starts:
        r = minimize(f, start, method="Nelder-Mead", options={"xatol": 1e-6, "fatol": 1e-13, "maxiter": 4000 * m})
        r = minimize(f, r.x, method="BFGS", options={"gtol": 1e-10})
        optima.append(r)
    # Refine each with exact (mpmath) values and analytic gradients rounded to double:
    # the double-precision objective is only good to about 1e-12 for 3d, which is
    # enough to find the valleys but not to rank or converge them.
    refined = [
        minimize(
            lambda v: -float(objective(group, list(v))),
            r.x,
            jac=lambda v: -np.array([float(x) for x in gradient(group, list(v))]),
            method="BFGS",
            options={"gtol": 1e-14, "maxiter": 2000},
        )
        for r in optima
    ]
    refined.sort(key=lambda r: r.fun)
    # Newton from the best; should it not converge, from the next best, and so on.
    for r in refined:
        u = newton(group, [mp.mpf(float(x)) for x in r.x])
        # Accept only a point at least as good as the best refined optimum, so that a
        # saddle or a worse local optimum is never taken.
        if u is not None and float(objective(group, u)) >= -refined[0].fun - 1e-13:
            break
    else:
        raise RuntimeError(f"no converged fit for {group} with {m} Gaussians")
    alphas = sorted((mp.exp(x) for x in u), reverse=True)
    return alphas, {kind: best_overlap(kind, alphas) for kind in group}


def all_fits(max_gaussians=6):
    """{(kind, m): (alphas, overlap, coefficients)} for every kind and m = 1..6."""
    out = {}
    for group in GROUPS:
        alphas = None
        for m in range(1, max_gaussians + 1):
            alphas, per_kind = fit(group, m, alphas)
            for kind, (o, d) in per_kind.items():
                out[(kind, m)] = (alphas, o, d)
    return out


if __name__ == "__main__":
    fits = all_fits()
    for (kind, m), (alphas, o, d) in sorted(fits.items()):
        print(kind, m, mp.nstr(o, 12), [mp.nstr(a, 12) for a in alphas], [mp.nstr(x, 12) for x in d])

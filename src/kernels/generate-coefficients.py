#!/usr/bin/python3
"""Generate the polynomial coefficients used by src/kernels/bessel.ts and src/kernels/gamma.ts.

Run from the repository root with the Debian interpreter:

    /usr/bin/python3 src/kernels/generate-coefficients.py

It writes src/kernels/bessel-coefficients.ts and src/kernels/gamma-coefficients.ts,
both stamped "generated: do not edit".

Method (all arithmetic in mpmath at 50 significant digits):
  * each target function is interpolated at the Chebyshev points of the first kind
    of a high degree on its interval;
  * the Chebyshev series is truncated where the dropped coefficients add up to less
    than TAIL (relative to the size of the function on the interval);
  * the truncated series is re-expanded as an ordinary polynomial in the local
    variable that the TypeScript kernel uses, and rounded to binary64;
  * the rounded polynomial is checked against mpmath on a dense grid, and the
    largest error found is written into the generated file.

Fitted pieces:
  J0, J1, J2 on 0 <= x <= 2, as polynomials in s = x^2 with the value at 0 pinned:
      J0 = 1 + s B0(s),  J1 / x = 1/2 + s B1(s),  J2 / x^2 = 1/8 + s B2(s)
  J0, J1, 2 J1 / x, 3 (sin x - x cos x) / x^3, 8 J2 / x^2, L_{5/2} and 48 J3 / x^3 on pieces of half a
  unit [2 + j/2, 2.5 + j/2] up to X0, as
  polynomials in t = x - (2.25 + j/2)
  J0, J1 on x >= X0 through the Hankel form
      J_n(x) = sqrt(2 / (pi x)) (P_n(x) cos w - Q_n(x) sin w),  w = x - (2 n + 1) pi / 4,
  with P_n and x Q_n as polynomials in t = X0^2 / x^2 on [0, 1]; P and Q are taken
  from mpmath's besselj and bessely.
  sin r and cos r on |r| <= pi/4, as polynomials in r^2 (from their Taylor series), and pi/2 split in two
  parts for the argument reduction of sin and cos in the Hankel form.
  1 / Gamma(z) on 1 <= z <= 2, as a polynomial in w = z - 3/2.
The polynomials are evaluated by Estrin's scheme (see estrin_lines).
"""

import os
import platform
import subprocess
import sys

import mpmath as mp

mp.mp.dps = 50
TAIL = mp.mpf('1e-19')
# Where the unit-width pieces end and Hankel's form takes over (bessel-j01.ts HANKEL_START). Pieces are
# cheaper to evaluate than the Hankel form with its argument reduction, so they reach to where most
# interferometric arguments lie (x = pi D q up to a few tens); beyond, t = X0^2 / x^2 is small and P, Q
# need few terms.
X0 = 48
# The unit pieces are cut where their dropped Chebyshev tail is below this, absolutely: every function there is
# bounded by 1 and its errors are stated absolutely, and 2e-18 is far below the ~1e-16 rounding of evaluating
# the polynomial in binary64 (a relative bound would ask for more terms near the zeros, for nothing).
PIECE_TAIL = mp.mpf('2e-18')
# Width of the pieces: half a unit, so that degree 10-11 suffices (a unit width needs 13).
WIDTH = mp.mpf(1) / 2
NPIECES = int((X0 - 2) / WIDTH)
HERE = os.path.dirname(os.path.abspath(__file__))


def cheb_coefficients(f, deg):
    """Chebyshev interpolation coefficients of f on u in [-1, 1] at deg + 1 points."""
    n = deg + 1
    nodes = [mp.cos(mp.pi * (k + mp.mpf(1) / 2) / n) for k in range(n)]
    vals = [f(u) for u in nodes]
    c = []
    for j in range(n):
        s = mp.fsum(vals[k] * mp.cos(mp.pi * j * (k + mp.mpf(1) / 2) / n) for k in range(n))
        c.append(2 * s / n)
    c[0] /= 2
    return c


def truncate(c, scale):
    """Smallest degree whose dropped tail is below TAIL * scale."""
    deg = len(c) - 1
    while deg > 0 and mp.fsum(abs(x) for x in c[deg:]) < TAIL * scale:
        deg -= 1
    return deg + 1 if deg + 1 < len(c) else deg


def poly_mul(a, b):
    out = [mp.mpf(0)] * (len(a) + len(b) - 1)
    for i, x in enumerate(a):
        for j, y in enumerate(b):
            out[i + j] += x * y
    return out


def poly_add(a, b):
    n = max(len(a), len(b))
    return [(a[i] if i < len(a) else 0) + (b[i] if i < len(b) else 0) for i in range(n)]


def cheb_to_monomial(c, alpha, beta):
    """Coefficients in w of sum c_j T_j(u) with u = alpha w + beta."""
    u = [mp.mpf(beta), mp.mpf(alpha)]
    t_prev, t_cur = [mp.mpf(1)], u
    out = [c[0]]
    if len(c) > 1:
        out = poly_add(out, [c[1] * x for x in t_cur])
    for j in range(2, len(c)):
        t_next = poly_add([2 * x for x in poly_mul(u, t_cur)], [-x for x in t_prev])
        out = poly_add(out, [c[j] * x for x in t_next])
        t_prev, t_cur = t_cur, t_next
    return out


def horner(coeffs, w):
    acc = mp.mpf(0)
    for a in reversed(coeffs):
        acc = acc * w + a
    return acc


def fit(f, lo, hi, deg_max, alpha_beta, deg=None, absolute=None):
    """Fit f(v) on v in [lo, hi]; return (monomial coefficients in the local variable, degree).

    The degree drops the Chebyshev tail below TAIL relative to the size of f on the interval, or, with
    absolute given, below that absolute bound."""
    lo, hi = mp.mpf(lo), mp.mpf(hi)
    c = cheb_coefficients(lambda u: f((hi - lo) / 2 * u + (hi + lo) / 2), deg_max)
    scale = max(abs(f(lo)), abs(f(hi)), abs(f((lo + hi) / 2)), mp.mpf('1e-300'))
    if absolute is not None:
        scale = absolute / TAIL
    if deg is None:
        deg = truncate(c, scale)
    alpha, beta = alpha_beta
    mono = cheb_to_monomial(c[: deg + 1], alpha, beta)
    return [float(x) for x in mono], deg


def check(coeffs, f, lo, hi, local, n=400):
    worst = mp.mpf(0)
    for k in range(n + 1):
        v = mp.mpf(lo) + (mp.mpf(hi) - lo) * k / n
        err = abs(horner([mp.mpf(a) for a in coeffs], local(v)) - f(v))
        worst = max(worst, err)
    return worst


def hankel_pq(n, x):
    """P_n(x) and Q_n(x) of the Hankel form, from the asymptotic series (A&S 9.2.5, 9.2.9, 9.2.10)
    where it reaches far below the working precision, else from mpmath's besselj and bessely."""
    x = mp.mpf(x)
    if x >= 150:
        mu = 4 * n * n
        term, p, q, k = mp.mpf(1), mp.mpf(1), mp.mpf(0), 0
        while abs(term) > mp.mpf('1e-60'):
            k += 1
            term *= (mu - (2 * k - 1) ** 2) / (k * 8 * x)
            sign = -1 if (k // 2) % 2 else 1
            if k % 2 == 0:
                p += sign * term
            else:
                q += sign * term
        return p, q
    w = x - (2 * n + 1) * mp.pi / 4
    j, y = mp.besselj(n, x), mp.bessely(n, x)
    s = mp.sqrt(mp.pi * x / 2)
    return s * (j * mp.cos(w) + y * mp.sin(w)), s * (y * mp.cos(w) - j * mp.sin(w))


def fmt(values):
    return ',\n  '.join(repr(v) for v in values)


def estrin_lines(coeffs, var):
    """TypeScript statements evaluating sum coeffs[k] var^k by Estrin's scheme (pairs, then pairs of pairs with
    var^2, var^4, ...): the same rounding as Horner's rule for decreasing coefficients, a much shorter chain of
    dependent operations. coeffs are TypeScript expressions. The value ends in the returned expression."""
    lines = []
    level = list(coeffs)
    power = var
    depth = 0
    while len(level) > 1:
        if depth > 0:
            lines.append(f'  const {var}{2 ** depth} = {power} * {power};')
            power = f'{var}{2 ** depth}'
        nxt = []
        for i in range(0, len(level), 2):
            if i + 1 < len(level):
                name = f'e{depth}_{i // 2}'
                lines.append(f'  const {name} = {level[i]} + {level[i + 1]} * {power};')
                nxt.append(name)
            else:
                nxt.append(level[i])
        level = nxt
        depth += 1
    return lines, level[0]


def poly_fn(name, doc, var, coeffs):
    """TypeScript function evaluating sum coeffs[k] var^k, literals inline."""
    body, result = estrin_lines([repr(a) for a in coeffs], var)
    lines = [f'/** {doc} */', f'export function {name}({var}: number): number {{'] + body
    lines.append(f'  return {result};')
    lines.append('}\n')
    return '\n'.join(lines)


def poly_table_fn(name, doc, table, stride):
    """TypeScript function evaluating piece k of a flat coefficient table at t."""
    body, result = estrin_lines([f'{table}[o + {j}]!' if j else f'{table}[o]!' for j in range(stride)], 't')
    lines = [f'/** {doc} */', f'export function {name}(k: number, t: number): number {{',
             f'  const o = k * {stride};'] + body
    lines.append(f'  return {result};')
    lines.append('}\n')
    return '\n'.join(lines)


def main():
    header = [
        '// generated: do not edit.',
        '// Written by src/kernels/generate-coefficients.py with',
        f'// Python {platform.python_version()}, mpmath {mp.__version__}, working precision {mp.mp.dps} digits.',
    ]
    report = []
    out = []

    # --- near zero: polynomials in s = x^2 on [0, 4], value at 0 pinned -----------------
    def near_zero(name, fn, order, lead):
        # B(s) = (J_n(x) / x^n - 1 / (2^n n!)) / s = 2^-n sum_{k >= 1} (-1/4)^k s^(k-1) / (k! (k+n)!),
        # summed from the power series (A&S 9.1.10) and checked against mpmath's besselj below.
        def h(s):
            s = mp.mpf(s)
            total, k = mp.mpf(0), 1
            while True:
                term = (mp.mpf(-1) / 4) ** k * s ** (k - 1) / (mp.factorial(k) * mp.factorial(k + order))
                total += term
                if abs(term) < mp.mpf('1e-55'):
                    return total / 2**order
                k += 1

        for s in (mp.mpf('0.3'), mp.mpf('3.9')):
            x = mp.sqrt(s)
            direct = (mp.besselj(order, x) / x**order - mp.mpf(1) / (2**order * mp.factorial(order))) / s
            assert abs(direct - h(s)) < mp.mpf('1e-40'), (name, s)

        coeffs, deg = fit(h, 0, 4, 30, (mp.mpf(1) / 2, -1))
        lo_err = check(coeffs, h, 0, 4, lambda s: s)
        report.append(f'// {name}: degree {deg} in s, largest error of s * B(s) on 0 <= s <= 4: '
                      f'{mp.nstr(lo_err * 4, 3)}')
        out.append(poly_fn(fn, f'{name}: B(s), s = x^2 <= 4, with J{order}(x) / x^{order} = {lead} + s B(s).', 's', coeffs))

    near_zero('J0_NEAR_ZERO', 'j0NearZeroB', 0, 1)
    near_zero('J1_NEAR_ZERO', 'j1NearZeroB', 1, '1/2')
    near_zero('J2_NEAR_ZERO', 'j2NearZeroB', 2, '1/8')

    # --- pieces of unit width on [2, X0) ----------------------------------------------------
    # J0, J1, and the basis of limb-darkened disks: D(x) = 2 J1(x) / x (uniform disk), L(x) =
    # 3 (sin x - x cos x) / x^3 (the profile sqrt(1 - r^2)) and W(x) = 8 J2(x) / x^2 (the profile 1 - r^2).
    # The three basis tables share one degree, so that a plan can add them into one table per law.
    pieces = (
        ('J0_PIECES', 'j0Piece', 'J0(x)', lambda x: mp.besselj(0, x), None),
        ('J1_PIECES', 'j1Piece', 'J1(x)', lambda x: mp.besselj(1, x), None),
        ('DISK_PIECES', 'diskPiece', '2 J1(x) / x', lambda x: 2 * mp.besselj(1, x) / x, 'basis'),
        ('L32_PIECES', 'l32Piece', '3 (sin x - x cos x) / x^3', lambda x: 3 * (mp.sin(x) - x * mp.cos(x)) / x**3,
         'basis'),
        ('W2_PIECES', 'w2Piece', '8 J2(x) / x^2', lambda x: 8 * mp.besselj(2, x) / x**2, 'basis'),
        # and the two that their derivatives in x bring in (d/dx L_nu = -x L_{nu+1} / (2 (nu + 1)), A&S 9.1.30)
        ('L52_PIECES', 'l52Piece', '15 ((3 - x^2) sin x - 3 x cos x) / x^5',
         lambda x: 15 * ((3 - x**2) * mp.sin(x) - 3 * x * mp.cos(x)) / x**5, 'basis'),
        ('L3_PIECES', 'l3Piece', '48 J3(x) / x^3', lambda x: 48 * mp.besselj(3, x) / x**3, 'basis'),
    )
    def bounds(j):
        lo = 2 + j * WIDTH
        return lo, lo + WIDTH, lo + WIDTH / 2

    degree_of = {}
    for name, fn, what, f, group in pieces:
        degree_of[name] = max(fit(f, bounds(j)[0], bounds(j)[1], 24, (2 / WIDTH, 0), absolute=PIECE_TAIL)[1]
                              for j in range(NPIECES))
    basis_degree = max(degree_of[name] for name, _, _, _, group in pieces if group == 'basis')
    where = f'piece j = 0 .. {NPIECES - 1} (x in [2 + j/2, 2.5 + j/2]), t = x - (2.25 + j/2)'
    for name, fn, what, f, group in pieces:
        deg = basis_degree if group == 'basis' else degree_of[name]
        table = []
        errs = []
        for j in range(NPIECES):
            lo, hi, mid = bounds(j)
            coeffs, _ = fit(f, lo, hi, 24, (2 / WIDTH, 0), deg)
            errs.append(check(coeffs, f, lo, hi, lambda x: x - mid, 60))
            table.extend(coeffs)
        report.append(f'// {name}: degree {deg} in t on {where}, largest error {mp.nstr(max(errs), 3)}')
        out.append(f'/** {name}: {deg + 1} coefficients per {where}. */')
        exported = 'export ' if group == 'basis' else ''
        out.append(f'{exported}const {name} = new Float64Array([\n  {fmt(table)},\n]);\n')
        out.append(poly_table_fn(fn, f'{what} on {where}.', name, deg + 1))
    out.append(f'/** Coefficients per piece of DISK_PIECES, L32_PIECES, W2_PIECES, L52_PIECES and L3_PIECES. */\n'
               f'export const BASIS_STRIDE = {basis_degree + 1};\n')
    body, result = estrin_lines([f'T[o + {j}]!' if j else 'T[o]!' for j in range(basis_degree + 1)], 't')
    out.append('\n'.join(['/**', ' * Piece k (x in [k + 2, k + 3]) of a table with BASIS_STRIDE coefficients per piece (a basis table',
                          ' * or a sum of them, limb-pieces.ts) at t = pieceLocal(x, k), by Estrin\'s scheme.', ' */',
                          'export function basisPiece(T: Float64Array, k: number, t: number): number {',
                          f'  const o = k * {basis_degree + 1};'] + body + [f'  return {result};', '}\n']))

    # --- Hankel form on x >= X0, polynomials in t = X0^2 / x^2 --------------------------------
    for n in (0, 1):
        def x_of(t):
            t = max(t, mp.mpf('1e-80'))
            return X0 / mp.sqrt(t)

        p = lambda t: hankel_pq(n, x_of(t))[0]  # noqa: E731
        q = lambda t: hankel_pq(n, x_of(t))[1] * x_of(t)  # noqa: E731
        for label, g in (('P', p), ('Q', q)):
            coeffs, deg = fit(g, 0, 1, 30, (2, -1))
            err = check(coeffs, g, 0, 1, lambda t: t, 200)
            name = f'{label}{n}_HANKEL'
            what = f'{label}_{n}(x)' if label == 'P' else f'x Q_{n}(x)'
            report.append(f'// {name}: {what}, degree {deg} in t = {X0 * X0} / x^2, largest error {mp.nstr(err, 3)}')
            fn = f'{label.lower()}{n}Hankel'
            out.append(poly_fn(fn, f'{name}: {what} for x >= {X0}, t = {X0 * X0} / x^2.', 't', coeffs))
    out.append(f'/** Where the pieces end and the Hankel form begins. */\nexport const HANKEL_START = {X0};\n')
    out.append('/** The piece of x for 2 <= x < HANKEL_START: pieces are half a unit wide from x = 2. */\n'
               'export function pieceIndex(x: number): number {\n  return ((2 * x) | 0) - 4; // floor(2 (x - 2)), 2 x < 2^31\n}\n')
    out.append('/** x on piece j as its polynomial takes it, t = x - (2.25 + j/2), in [-1/4, 1/4). */\n'
               'export function pieceLocal(x: number, j: number): number {\n  return x - (2.25 + 0.5 * j);\n}\n')

    # --- sin and cos on |r| <= pi/4, and pi/2 in two parts for the argument reduction ------------------
    # sin r = r + r^3 S(r^2), cos r = 1 - r^2/2 + r^4 C(r^2), S and C from their Taylor series.
    def sin_s(u):
        u = mp.mpf(u)
        return mp.fsum((-1) ** k * u ** (k - 1) / mp.factorial(2 * k + 1) for k in range(1, 40))

    def cos_c(u):
        u = mp.mpf(u)
        return mp.fsum((-1) ** k * u ** (k - 2) / mp.factorial(2 * k) for k in range(2, 40))

    umax = (mp.pi / 4) ** 2
    for label, g, fn, what in (('SIN', sin_s, 'sinReducedS', 'sin r = r + r^3 S(r^2)'),
                               ('COS', cos_c, 'cosReducedC', 'cos r = 1 - r^2/2 + r^4 C(r^2)')):
        coeffs, deg = fit(g, 0, umax, 20, (2 / umax, -1))
        err = check(coeffs, g, 0, umax, lambda u: u, 200)
        report.append(f'// {label}_REDUCED: {what} on |r| <= pi/4, degree {deg} in r^2, largest error of the '
                      f'polynomial {mp.nstr(err, 3)}')
        out.append(poly_fn(fn, f'{label}_REDUCED: {what}, |r| <= pi/4, u = r^2.', 'u', coeffs))
    half_pi = mp.pi / 2
    p1 = mp.floor(half_pi * 2**32) / 2**32  # 33 significant bits: n * p1 is exact for |n| < 2^20
    p2 = float(half_pi - p1)
    out.append('/** pi/2 to 33 significant bits, so that n * PIO2_HI is exact for |n| < 2^20. */')
    out.append(f'export const PIO2_HI = {float(p1)!r};')
    out.append('/** pi/2 - PIO2_HI, rounded to binary64. */')
    out.append(f'export const PIO2_LO = {p2!r};')
    out.append('/** 2/pi, rounded to binary64. */')
    out.append(f'export const TWO_OVER_PI = {float(2 / mp.pi)!r};\n')
    assert float(p1) == p1

    with open(os.path.join(HERE, 'bessel-coefficients.ts'), 'w') as fh:
        fh.write('\n'.join(header + report) + '\n\n' + '\n'.join(out))

    # --- 1 / Gamma on [1, 2] -------------------------------------------------------------------
    rg = lambda z: 1 / mp.gamma(z)  # noqa: E731
    coeffs, deg = fit(rg, 1, 2, 40, (2, 0))
    err = check(coeffs, rg, 1, 2, lambda z: z - mp.mpf(3) / 2)
    gamma_out = header + [
        f'// RECIPROCAL_GAMMA: degree {deg} in w = z - 3/2, largest error {mp.nstr(err, 3)}',
        '',
        poly_fn('reciprocalGammaOneTwo', 'RECIPROCAL_GAMMA: 1 / Gamma(z) on 1 <= z <= 2, w = z - 3/2.', 'w', coeffs),
    ]
    with open(os.path.join(HERE, 'gamma-coefficients.ts'), 'w') as fh:
        fh.write('\n'.join(gamma_out))
    # Lay the files out as the repository's formatter would, so a re-run leaves no diff.
    root = os.path.dirname(os.path.dirname(HERE))
    subprocess.run(['npx', 'biome', 'format', '--write', 'src/kernels/bessel-coefficients.ts',
                    'src/kernels/gamma-coefficients.ts'], cwd=root, check=True)
    print('\n'.join(report), file=sys.stderr)
    print(f'RECIPROCAL_GAMMA degree {deg} error {mp.nstr(err, 3)}', file=sys.stderr)


if __name__ == '__main__':
    main()

"""IAPWS-IF97 regions 1, 2 and 4 evaluated over whole arrays (batches of steam and water rows).

The Gibbs free-energy equations of region 1 (compressed liquid) and region 2 (steam), and the
saturation-pressure equation of region 4, are evaluated for many states at once with numpy:
each equation is a sum of terms ``n x**I y**J``, written here as a small coefficient matrix
(one row per distinct ``I``, one column per distinct ``J``), so a batch costs one matrix
product and a few array multiplications instead of one call per state.  The equations, their
coefficients and their region boundaries are those of the release; the values agree with the
property library's IF97 backend (and the ``iapws`` package) to rounding.

Pressure-entropy and pressure-enthalpy states follow the rules of the single-state API
(``Fluid.state_Ps`` / ``state_Ph`` for IF97): inside the saturation dome the lever rule between
the saturated states at the pressure, outside it a Newton iteration on temperature with the
forward equations (consistent with them to better than 1e-10 of the temperature), never the
backward equations.  Entries these functions cannot settle (region 3 near the critical point, region 5,
states on or very near a region boundary, iterations that do not converge) come back with
``ok`` False; the caller flashes them with the single-state API.

All inputs and outputs are SI: P [Pa], T [K], h [J/kg], s [J/(kg K)], rho [kg/m^3],
cp [J/(kg K)].

References
----------
IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation 1997 for the
Thermodynamic Properties of Water and Steam: equations 5 (boundary 2-3), 7 (region 1),
15-17 (region 2), 30 and 31 (region 4), tables 2, 10 and 11 (coefficients), tables 5, 15 and
35 (verification values).
"""

from __future__ import annotations

import numpy as np

from ..errors import InputError
from ..units import to_si_array

#: Specific gas constant of IAPWS-IF97 [J/(kg K)].
R = 461.526
#: Critical temperature [K] and pressure [Pa] of IAPWS-IF97.
T_CRITICAL, P_CRITICAL = 647.096, 22.064e6
#: Lowest and highest temperature of regions 1 and 2 [K]; highest pressure [Pa].
T_LOW, T_HIGH, P_HIGH = 273.15, 1073.15, 100e6
#: Region 1/3 and 2/3 boundary temperature [K]; region 2/3 boundary curve (B23) starts there.
T_13 = 623.15
#: Upper end of the B23 curve [K] (above it region 2 reaches 100 MPa).
T_B23_HIGH = 863.15

# Coefficients (I, J, n), IAPWS R7-97(2012) table 2 (region 1), tables 10 and 11 (region 2).
_R1 = (
    (0, -2, 0.14632971213167), (0, -1, -0.84548187169114),
    (0, 0, -3.756360367204), (0, 1, 3.3855169168385),
    (0, 2, -0.95791963387872), (0, 3, 0.15772038513228),
    (0, 4, -0.016616417199501), (0, 5, 0.00081214629983568),
    (1, -9, 0.00028319080123804), (1, -7, -0.00060706301565874),
    (1, -1, -0.018990068218419), (1, 0, -0.032529748770505),
    (1, 1, -0.021841717175414), (1, 3, -5.283835796993e-05),
    (2, -3, -0.00047184321073267), (2, 0, -0.00030001780793026),
    (2, 1, 4.7661393906987e-05), (2, 3, -4.4141845330846e-06),
    (2, 17, -7.2694996297594e-16), (3, -4, -3.1679644845054e-05),
    (3, 0, -2.8270797985312e-06), (3, 6, -8.5205128120103e-10),
    (4, -5, -2.2425281908e-06), (4, -2, -6.5171222895601e-07),
    (4, 10, -1.4341729937924e-13), (5, -8, -4.0516996860117e-07),
    (8, -11, -1.2734301741641e-09), (8, -6, -1.7424871230634e-10),
    (21, -29, -6.8762131295531e-19), (23, -31, 1.4478307828521e-20),
    (29, -38, 2.6335781662795e-23), (30, -39, -1.1947622640071e-23),
    (31, -40, 1.8228094581404e-24), (32, -41, -9.3537087292458e-26),
)
_R2_RES = (
    (1, 0, -0.0017731742473213), (1, 1, -0.017834862292358),
    (1, 2, -0.045996013696365), (1, 3, -0.057581259083432),
    (1, 6, -0.05032527872793), (2, 1, -3.3032641670203e-05),
    (2, 2, -0.00018948987516315), (2, 4, -0.0039392777243355),
    (2, 7, -0.043797295650573), (2, 36, -2.6674547914087e-05),
    (3, 0, 2.0481737692309e-08), (3, 1, 4.3870667284435e-07),
    (3, 3, -3.227767723857e-05), (3, 6, -0.0015033924542148),
    (3, 35, -0.040668253562649), (4, 1, -7.8847309559367e-10),
    (4, 2, 1.2790717852285e-08), (4, 3, 4.8225372718507e-07),
    (5, 7, 2.2922076337661e-06), (6, 3, -1.6714766451061e-11),
    (6, 16, -0.0021171472321355), (6, 35, -23.895741934104),
    (7, 0, -5.905956432427e-18), (7, 11, -1.2621808899101e-06),
    (7, 25, -0.038946842435739), (8, 8, 1.1256211360459e-11),
    (8, 36, -8.2311340897998), (9, 13, 1.9809712802088e-08),
    (10, 4, 1.0406965210174e-19), (10, 10, -1.0234747095929e-13),
    (10, 14, -1.0018179379511e-09), (16, 29, -8.0882908646985e-11),
    (16, 50, 0.10693031879409), (18, 57, -0.33662250574171),
    (20, 20, 8.9185845355421e-25), (20, 35, 3.0629316876232e-13),
    (20, 48, -4.2002467698208e-06), (21, 21, -5.9056029685639e-26),
    (22, 53, 3.7826947613457e-06), (23, 39, -1.2768608934681e-15),
    (24, 26, 7.3087610595061e-29), (24, 40, 5.5414715350778e-17),
    (24, 58, -9.436970724121e-07),
)
_R2_IDEAL = (
    (0, -9.6927686500217), (1, 10.086655968018), (-5, -0.005608791128302),
    (-4, 0.071452738081455), (-3, -0.40710498223928), (-2, 1.4240819171444),
    (-1, -4.383951131945), (2, -0.28408632460772), (3, 0.021268463753307),
)

# Region 4 (saturation line), table 34 of the release: n1 ... n10.
_N4 = (0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2, 0.12020824702470e5,
       -0.32325550322333e7, 0.14915108613530e2, -0.48232657361591e4, 0.40511340542057e6,
       -0.23855557567849e0, 0.65017534844798e3)
# Boundary between regions 2 and 3 (B23), table 1 of the release: n1 ... n3 [MPa, K].
_N23 = (0.34805185628969e3, -0.11671859879975e1, 0.10192970039326e-2)


class _Gibbs:
    """Sum of terms ``n x**I y**J`` and its derivatives over arrays (one IF97 equation).

    Each term is one row ``n_k x**I_k y**J_k`` of a (terms x entries) array built from the
    rows of distinct powers of x and y; the sums weighted by 1, I, J and J (J - 1) give the
    function and its derivatives.  ``numpy.einsum`` makes the sums without the threaded
    linear-algebra library (which slows small products on a busy machine).
    """

    def __init__(self, terms):
        i_exp, j_exp, n = (np.array(column) for column in zip(*terms))
        self.I, self.J = np.unique(i_exp), np.unique(j_exp)
        self.rows_x = np.searchsorted(self.I, i_exp)
        self.rows_y = np.searchsorted(self.J, j_exp)
        self.weights = np.vstack([n, n * i_exp, n * j_exp, n * j_exp * (j_exp - 1),
                                  n * j_exp * (j_exp - 1) * (j_exp - 2),
                                  n * i_exp * j_exp]).astype(float)

    def __call__(self, x, y):
        """g, x g_x, y g_y, y**2 g_yy, y**3 g_yyy and x y g_xy at arrays x, y."""
        X = _powers(x, self.I)
        Y = _powers(y, self.J)
        terms = X[self.rows_x] * Y[self.rows_y]
        return np.einsum("tk,kn->tn", self.weights, terms)


def _powers(x, exponents):
    """Rows ``x**e`` for sorted integer exponents (repeated multiplication, no pow calls)."""
    out = np.empty((len(exponents), len(x)))
    squares = {1: x}
    low = int(exponents[0])
    if low < 0:
        out[0] = _int_power(1.0 / x, -low, {1: 1.0 / x})
    elif low:
        out[0] = _int_power(x, low, squares)
    else:
        out[0] = 1.0
    for k in range(1, len(exponents)):
        gap = int(exponents[k] - exponents[k - 1])
        np.multiply(out[k - 1], x if gap == 1 else _int_power(x, gap, squares), out=out[k])
    return out


def _int_power(x, e, squares):
    """x**e for a positive integer e by binary powers kept in ``squares`` {2**k: x**2**k}."""
    result = None
    bit = 1
    while e:
        if bit not in squares:
            half = squares[bit // 2]
            squares[bit] = half * half
        if e & 1:
            result = squares[bit] if result is None else result * squares[bit]
        e >>= 1
        bit <<= 1
    return result


_G1 = _Gibbs(_R1)
_G2 = _Gibbs(_R2_RES)
_J0I = np.array(sorted(j for j, _ in _R2_IDEAL))  # distinct, sorted for _powers
_N0 = np.array([n for _, n in sorted(_R2_IDEAL)])
_J0 = _J0I.astype(float)
_W0 = np.vstack([_N0, _N0 * _J0, _N0 * _J0 * (_J0 - 1), _N0 * _J0 * (_J0 - 1) * (_J0 - 2)])


def region1(P, T):
    """Region 1 (liquid): h, s, rho, cp at arrays P [Pa], T [K] (IAPWS R7-97 eq. 7).

    No range check: the caller keeps the entries inside region 1.

    Examples
    --------
    >>> h, s, rho, cp = region1(np.array([3e6]), np.array([300.0]))
    >>> round(float(h[0]) / 1e3, 6)  # IAPWS R7-97 table 5: 0.115331273e3 kJ/kg
    115.331273
    """
    return _region1(*_checked(P, T, "temperature"))[:4]


def _region1(P, T):
    """h, s, rho, cp and (dcp/dT)_P of region 1."""
    P, T = np.asarray(P, dtype=float), np.asarray(T, dtype=float)
    pi = P / 16.53e6
    tau = 1386.0 / T
    y = tau - 1.222
    x = 7.1 - pi
    g, xg_x, yg_y, yyg_yy, yyyg_yyy, xyg_xy = _G1(x, y)
    inv = 1.0 / y
    g_y = yg_y * inv
    g_yy = yyg_yy * (inv * inv)
    g_pi = -xg_x / x  # x = 7.1 - pi, so d/dpi = -d/dx
    rt = R * T
    h = rt * tau * g_y
    s = R * (tau * g_y - g)
    rho = P / (rt * pi * g_pi)
    cp = -R * tau * tau * g_yy
    pg_pt = -pi * xyg_xy / (x * y)  # pi d2g/dpi dtau
    return (h, s, rho, cp, _cp_slope(tau, T, g_yy, yyyg_yyy * (inv * inv * inv)),
            _rho_slope(rho, T, tau, P, pg_pt))


def _rho_slope(rho, T, tau, P, pg_pt):
    """(d rho/dT)_P from v = (R T / P) pi g_pi: dv/dT = v/T - (R tau / P) pi g_pitau."""
    return -rho * rho * (1.0 / (rho * T) - R * tau / P * pg_pt)


def _cp_slope(tau, T, g_tt, g_ttt):
    """(dcp/dT)_P from cp = -R tau^2 g_tautau, dtau/dT = -tau/T."""
    return R * tau * (2.0 * tau * g_tt + tau * tau * g_ttt) / T


def region2(P, T):
    """Region 2 (steam): h, s, rho, cp at arrays P [Pa], T [K] (IAPWS R7-97 eq. 15-17).

    No range check: the caller keeps the entries inside region 2.

    Examples
    --------
    >>> h, s, rho, cp = region2(np.array([3.5e3]), np.array([700.0]))
    >>> round(float(s[0]) / 1e3, 7)  # IAPWS R7-97 table 15: 0.101749996e2 kJ/(kg K)
    10.1749996
    """
    return _region2(*_checked(P, T, "temperature"))[:4]


def _region2(P, T):
    """h, s, rho, cp and (dcp/dT)_P of region 2."""
    P, T = np.asarray(P, dtype=float), np.asarray(T, dtype=float)
    pi = P / 1e6
    tau = 540.0 / T
    y = tau - 0.5
    gr, pg_r, yg_y, yyg_yy, yyyg_yyy, pyg_py = _G2(pi, y)
    inv_y = 1.0 / y
    # ideal part: ln(pi) + sum n0 tau^J0
    g0, tg0_t, ttg0_tt, tttg0_ttt = np.einsum("tk,kn->tn", _W0, _powers(tau, _J0I))
    inv = 1.0 / tau
    g_t = tg0_t * inv + yg_y * inv_y
    g_tt = ttg0_tt * (inv * inv) + yyg_yy * (inv_y * inv_y)
    g_ttt = tttg0_ttt * (inv * inv * inv) + yyyg_yyy * (inv_y * inv_y * inv_y)
    rt = R * T
    h = rt * tau * g_t
    s = R * (tau * g_t - (g0 + np.log(pi) + gr))
    rho = P / (rt * (1.0 + pg_r))
    cp = -R * tau * tau * g_tt
    return (h, s, rho, cp, _cp_slope(tau, T, g_tt, g_ttt),
            _rho_slope(rho, T, tau, P, pyg_py * inv_y))


def _saturation_temperature(P):
    """Array form without the input boundary (see :func:`saturation_temperature`)."""
    n1, n2, n3, n4, n5, n6, n7, n8, n9, n10 = _N4
    P = np.asarray(P, dtype=float)
    with np.errstate(invalid="ignore"):
        beta = (P / 1e6) ** 0.25
        E = beta * beta + n3 * beta + n6
        F = n1 * beta * beta + n4 * beta + n7
        G = n2 * beta * beta + n5 * beta + n8
        D = 2.0 * G / (-F - np.sqrt(F * F - 4.0 * E * G))
        T = 0.5 * (n10 + D - np.sqrt((n10 + D) ** 2 - 4.0 * (n9 + n10 * D)))
        return np.where((P >= 611.212677) & (P <= P_CRITICAL), T, np.nan)


def _saturation_pressure(T):
    """Array form without the input boundary (see :func:`saturation_pressure`)."""
    n1, n2, n3, n4, n5, n6, n7, n8, n9, n10 = _N4
    T = np.asarray(T, dtype=float)
    with np.errstate(invalid="ignore"):
        theta = T + n9 / (T - n10)
        A = theta * theta + n1 * theta + n2
        B = n3 * theta * theta + n4 * theta + n5
        C = n6 * theta * theta + n7 * theta + n8
        P = (2.0 * C / (-B + np.sqrt(B * B - 4.0 * A * C))) ** 4 * 1e6
        return np.where((T >= T_LOW) & (T <= T_CRITICAL), P, np.nan)


def _boundary_23_pressure(T):
    """Array form without the input boundary (see :func:`boundary_23_pressure`)."""
    n1, n2, n3 = _N23
    T = np.asarray(T, dtype=float)
    return (n1 + n2 * T + n3 * T * T) * 1e6


#: Rows per block of the array evaluations (the work arrays of a block stay in the cache).
BLOCK = 2048
#: Triple-point pressure [Pa]; the fast path starts there.
P_TRIPLE = 611.657
#: Saturation pressure at T_13 [Pa]: below it both saturated states lie in regions 1 and 2.
P_SAT_13 = 16.529164253e6
#: Relative distance from a region boundary inside which a state is left to the single-state
#: API (which applies the property library's own choice of region there).
BOUNDARY_MARGIN = 1e-6
#: Relative distance in temperature from the saturation line inside which a P-T state is left
#: to the single-state API (the property library names the phase of states this close to
#: saturation by its own rule).
SATURATION_MARGIN = 1e-4


def _blocks(function, P, T):
    """``function(P, T)`` evaluated block by block; returns its outputs as whole arrays."""
    n = len(P)
    if n <= BLOCK:
        return function(P, T)
    parts = [function(P[k:k + BLOCK], T[k:k + BLOCK]) for k in range(0, n, BLOCK)]
    return tuple(np.concatenate(column) for column in zip(*parts))


class Flash:
    """States found by the vectorised equations, one entry per input (SI arrays).

    Attributes
    ----------
    T, h, s, rho, cp, x : numpy.ndarray
        Temperature [K], specific enthalpy [J/kg], entropy [J/(kg K)], density [kg/m^3],
        isobaric heat capacity [J/(kg K)] (NaN inside the dome), quality [-] (NaN outside it).
    phase : numpy.ndarray of str
        ``"liquid"``, ``"gas"``, ``"supercritical"`` or ``"two-phase"`` (``""`` where not ok).
    ok : numpy.ndarray of bool
        Entries settled here; the others are NaN and are left to the single-state API.
    """

    def __init__(self, n):
        self.T, self.h, self.s, self.rho, self.cp, self.x = (np.full(n, np.nan)
                                                            for _ in range(6))
        self.phase = np.full(n, "", dtype=object)
        self.ok = np.zeros(n, dtype=bool)

    def put(self, rows, T, h, s, rho, cp, phase):
        self.T[rows], self.h[rows], self.s[rows], self.rho[rows], self.cp[rows] = T, h, s, rho, cp
        self.phase[rows] = phase
        self.ok[rows] = True


def _phase_words(P, T, liquid):
    """The single-state API's phase words for states of regions 1 (liquid) and 2."""
    words = np.full(len(P), "liquid" if liquid else "gas", dtype=object)
    words[(P > P_CRITICAL) & (T > T_CRITICAL)] = "supercritical"
    return words


def _region_of(P, T):
    """Array form without the input boundary (see :func:`region_of`)."""
    P, T = np.asarray(P, dtype=float), np.asarray(T, dtype=float)
    m = BOUNDARY_MARGIN
    with np.errstate(invalid="ignore"):
        inside = ((P >= P_TRIPLE) & (P <= P_HIGH) & (T >= T_LOW) & (T <= T_HIGH)
                  & (np.abs(P - P_CRITICAL) > m * P_CRITICAL)
                  & (np.abs(T - T_CRITICAL) > m * T_CRITICAL))
        low = T < T_13 * (1 - m)
        p_sat = _saturation_pressure(np.where(low, T, T_LOW))
        t_sat = _saturation_temperature(np.clip(P, P_TRIPLE, P_CRITICAL))
        near_sat = low & (P <= P_CRITICAL) & (np.abs(T - t_sat) <= SATURATION_MARGIN * t_sat)
        one = inside & low & (P > p_sat) & ~near_sat
        two = inside & ~near_sat & (
            (low & (P < p_sat))
            | ((T > T_13 * (1 + m)) & (T < T_B23_HIGH) & (P < _boundary_23_pressure(T) * (1 - m)))
            | (T >= T_B23_HIGH))
    return np.where(one, 1, np.where(two, 2, 0))


def _flash_PT(P, T) -> Flash:
    """:func:`flash_PT` without the input boundary (arrays already checked)."""
    P, T = np.atleast_1d(np.asarray(P, dtype=float)), np.atleast_1d(np.asarray(T, dtype=float))
    out = Flash(len(P))
    region = _region_of(P, T)
    for number, equation in ((1, _region1), (2, _region2)):
        rows = np.flatnonzero(region == number)
        if len(rows):
            h, s, rho, cp = _blocks(equation, P[rows], T[rows])[:4]
            out.put(rows, T[rows], h, s, rho, cp, _phase_words(P[rows], T[rows], number == 1))
    return out


def _flash_from(P, target, prop):
    P = np.atleast_1d(np.asarray(P, dtype=float))
    target = np.atleast_1d(np.asarray(target, dtype=float))
    n = len(P)
    out = Flash(n)
    with np.errstate(invalid="ignore"):
        rows = np.flatnonzero((P >= P_TRIPLE) & (P < P_SAT_13) & np.isfinite(target))
    if not len(rows):
        return out
    p, value = P[rows], target[rows]
    sat = _Saturation.of(p)
    k = 0 if prop == "h" else 1
    hi = sat.vapour[k]
    m = 1e-9 * np.maximum(np.abs(hi), 1.0)
    gas = value > hi + m
    if gas.any():
        _newton(out, rows[gas], p[gas], value[gas], sat.T[gas],
                tuple(column[gas] for column in sat.vapour), prop, 2)
    rest = np.flatnonzero(~gas)
    if not len(rest):
        return out
    liq = sat.liquid(rest)
    vap = tuple(column[rest] for column in sat.vapour)
    lo, hi, value, t_sat = liq[k], hi[rest], value[rest], sat.T[rest]
    two = (value >= lo + m[rest]) & (value <= hi - m[rest])
    if two.any():
        x = (value[two] - lo[two]) / (hi[two] - lo[two])
        v = (1 - x) / liq[2][two] + x / vap[2][two]
        r = rows[rest[two]]
        out.put(r, t_sat[two], liq[0][two] + x * (vap[0][two] - liq[0][two]),
                liq[1][two] + x * (vap[1][two] - liq[1][two]), 1.0 / v, np.nan, "two-phase")
        out.x[r] = x
    liquid = value < lo - m[rest]
    if liquid.any():
        _newton(out, rows[rest[liquid]], p[rest[liquid]], value[liquid], t_sat[liquid],
                tuple(column[liquid] for column in liq), prop, 1)
    return out


class _Saturation:
    """Saturation temperature and saturated vapour (h, s, rho, cp) at an array of pressures;
    the saturated liquid on demand, for the entries that need it.

    The last pressure array is remembered: a batch asks for the isentropic and the actual
    outlet state at the same outlet pressures.
    """

    _last: list = [None]

    def __init__(self, P):
        self.P = P
        self.T = _saturation_temperature(P)
        self.vapour = _blocks(_region2, P, self.T)
        self._liquid = tuple(np.full(len(P), np.nan) for _ in range(6))
        self._known = np.zeros(len(P), dtype=bool)

    @classmethod
    def of(cls, P):
        key = P.tobytes()
        last = cls._last[0]
        if last is not None and last[0] == key:
            return last[1]
        found = cls(P)
        cls._last[0] = (key, found)
        return found

    def liquid(self, rows):
        missing = rows[~self._known[rows]]
        if len(missing):
            values = _blocks(_region1, self.P[missing], self.T[missing])
            for column, value in zip(self._liquid, values):
                column[missing] = value
            self._known[missing] = True
        return tuple(column[rows] for column in self._liquid)


def _newton(out, rows, P, target, t_sat, edge, prop, region):
    """Halley iteration on T for h(P, T) or s(P, T) = target on one side of the dome.

    Halley's method uses the first and second temperature derivatives (cp and dcp/dT from the
    equations) and converges cubically; the first step starts from the saturated state
    ``edge`` (h, s, rho, cp, dcp/dT, drho/dT at ``t_sat``); steps that leave the bracket are
    bisected.
    """
    T = t_sat + _halley_step(edge, t_sat, target, prop)[0]
    gas = region == 2
    equation = _region2 if gas else _region1
    lower = t_sat.copy() if gas else np.full(len(P), T_LOW)
    upper = np.full(len(P), T_HIGH) if gas else t_sat.copy()
    T = np.clip(T, lower, upper)
    active = np.arange(len(P))
    for _ in range(40):
        if not len(active):
            break
        Ta, Pa = T[active], P[active]
        h, s, rho, cp, dcp, drho = _blocks(equation, Pa, Ta)
        step, slope = _halley_step((h, s, rho, cp, dcp, drho), Ta, target[active], prop)
        f = (h if prop == "h" else s) - target[active]
        good = np.isfinite(step) & (slope > 0)
        done = good & (np.abs(step) < 1e-6 * Ta)
        if done.any():
            # The last step is below 1e-6 of the temperature: the root is T + step to the cube
            # of the step (Halley), and the state there follows by Taylor's series to the
            # cube of the step as well (relative 1e-18: below the single-state iteration's
            # 1e-10).
            d = active[done]
            idx = np.flatnonzero(done)
            dT, Td = step[idx], Ta[idx]
            T_end = Td + dT
            keep = _region_of(P[d], T_end) == region
            r, idx, dT, Td, T_end = d[keep], idx[keep], dT[keep], Td[keep], T_end[keep]
            c, dc = cp[idx], dcp[idx]
            h_end = h[idx] + dT * (c + 0.5 * dc * dT)
            s_end = s[idx] + dT * (c / Td + 0.5 * (dc - c / Td) / Td * dT)
            out.put(rows[r], T_end, h_end, s_end, rho[idx] + drho[idx] * dT, c + dc * dT,
                    _phase_words(P[r], T_end, region == 1))
        step_on = good & ~done
        a = active[step_on]
        above = f[step_on] > 0
        upper[a[above]] = np.minimum(upper[a[above]], Ta[step_on][above])
        lower[a[~above]] = np.maximum(lower[a[~above]], Ta[step_on][~above])
        T_new = Ta[step_on] + step[step_on]
        outside = ~((T_new > lower[a]) & (T_new < upper[a]))
        T_new[outside] = 0.5 * (lower[a][outside] + upper[a][outside])
        T[a] = T_new
        active = a


def _halley_step(state, T, target, prop):
    """Halley's step on T towards h or s = target from a state (h, s, rho, cp, dcp/dT, ...)
    at T, and the slope dh/dT or ds/dT there (a Newton step where Halley's factor is far
    from 1)."""
    h, s, _, cp, dcp = state[:5]
    if prop == "h":
        f, slope, curve = h - target, cp, dcp
    else:
        f, slope, curve = s - target, cp / T, (dcp - cp / T) / T
    with np.errstate(invalid="ignore", divide="ignore"):
        newton = -f / slope
        factor = 1.0 + 0.5 * newton * curve / slope  # 1 - f f'' / (2 f'^2)
        return np.where((factor > 0.5) & (factor < 2.0), newton / factor, newton), slope


def array_flash(pair: str, P, value) -> Flash:
    """The flash of ``pair`` ("PT", "Ph" or "Ps") for the fluid's array flashes.

    The arrays come as :meth:`workbench.properties.Fluid.states_PT` and its kin pass them
    (through their own input boundary): NaN or infinite entries are simply not ``ok`` here.
    """
    with np.errstate(invalid="ignore", over="ignore"):
        if pair == "PT":
            return _flash_PT(P, value)
        return _flash_from(P, value, pair[1])


# ---- public entry points: arrays through the input boundary (workbench.units) ----------------
def _checked(P, value, kind):
    """Pressures [Pa] and a second array of ``kind`` as equal-length SI float arrays (NaN
    allowed: an entry not settled); refuses text, infinities, huge magnitudes, unequal
    lengths by name."""
    P = to_si_array(P, "pressure", "pressure")
    value = to_si_array(value, kind, kind.replace("_", " "))
    if len(P) != len(value):
        raise InputError(f"pressure and {kind.replace('_', ' ')} arrays need equal lengths, "
                         f"not {len(P)} and {len(value)}")
    return P, value


def saturation_temperature(P):
    """Saturation temperature [K] at arrays P [Pa] (IAPWS R7-97 eq. 31; NaN outside
    611.213 Pa to the critical pressure).

    Examples
    --------
    >>> round(float(saturation_temperature(np.array([10e6]))[0]), 6)  # table 35: 584.149488 K
    584.149488
    """
    return _saturation_temperature(to_si_array(P, "pressure", "pressure"))


def saturation_pressure(T):
    """Saturation pressure [Pa] at arrays T [K] (IAPWS R7-97 eq. 30; NaN outside 273.15 K to
    the critical temperature).

    Examples
    --------
    >>> round(float(saturation_pressure(np.array([500.0]))[0]) / 1e6, 8)  # table 35
    2.63889776
    """
    return _saturation_pressure(to_si_array(T, "temperature", "temperature"))


def boundary_23_pressure(T):
    """Pressure [Pa] of the boundary between regions 2 and 3 at T [K] (IAPWS R7-97 eq. 5).

    Examples
    --------
    >>> round(float(boundary_23_pressure([623.15])[0]) / 1e6, 8)  # R7-97 section 4: 16.5291643
    16.52916425
    """
    return _boundary_23_pressure(to_si_array(T, "temperature", "temperature"))


def region_of(P, T):
    """1 or 2 where (P [Pa], T [K]) lies clearly inside IF97 region 1 or 2, else 0.

    Examples
    --------
    >>> region_of([3e6, 0.1e6, 25e6], [300.0, 500.0, 650.0]).tolist()
    [1, 2, 0]
    """
    return _region_of(*_checked(P, T, "temperature"))


def flash_PT(P, T) -> Flash:
    """States at arrays of pressure [Pa] and temperature [K] in regions 1 and 2.

    Entries outside them (or within :data:`BOUNDARY_MARGIN` of a boundary) are not ``ok``.

    Examples
    --------
    >>> st = flash_PT(np.array([40e5]), np.array([673.15]))
    >>> bool(st.ok[0]), st.phase[0], round(float(st.h[0]) / 1e3, 3)
    (True, 'gas', 3214.374)
    """
    return _flash_PT(*_checked(P, T, "temperature"))


def flash_Ph(P, h) -> Flash:
    """States at arrays of pressure [Pa] and specific enthalpy [J/kg] (see :func:`flash_Ps`).

    Examples
    --------
    >>> st = flash_Ph(np.array([5e5]), np.array([2.7e6]))
    >>> st.phase[0], round(float(st.x[0]), 4)
    ('two-phase', 0.9772)
    """
    return _flash_from(*_checked(P, h, "specific_enthalpy"), "h")


def flash_Ps(P, s) -> Flash:
    """States at arrays of pressure [Pa] and specific entropy [J/(kg K)].

    Inside the saturation dome: the lever rule between the saturated liquid (region 1) and
    vapour (region 2) at the saturation temperature of the pressure; outside it: Halley
    iteration on temperature with the forward equations of region 1 or 2 (to better than
    1e-10 of the temperature, as the single-state API).  Pressures from the triple point up
    to the saturation pressure at 623.15 K; other entries are not ``ok``.

    Examples
    --------
    >>> st = flash_Ps(np.array([5e5]), np.array([6500.0]))
    >>> st.phase[0], round(float(st.x[0]), 4)
    ('two-phase', 0.9354)
    """
    return _flash_from(*_checked(P, s, "specific_entropy"), "s")

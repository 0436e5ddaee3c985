"""Fan test after ISO 5801's definitions, against closed forms: the isentropic stagnation
pressure, the polytropic compression of a perfect gas, and a hand calculation on argon."""

import math

import pytest

import workbench as wb
from workbench.curves.fan import compressibility_coefficient, fan_test, mach_factor

ARGON = wb.Fluid("Argon")


@pytest.mark.parametrize("Ma", [0.05, 0.15, 0.3])
def test_mach_factor_is_the_isentropic_series(Ma):
    # (p0 - p) / (rho v^2 / 2) = [(1 + (k-1)/2 Ma^2)^(k/(k-1)) - 1] / (k/2 Ma^2), k = 1.4
    # (isentropic stagnation pressure of a perfect gas, closed form)
    k = 1.4
    exact = ((1 + (k - 1) / 2 * Ma ** 2) ** (k / (k - 1)) - 1) / (k / 2 * Ma ** 2)
    assert mach_factor(Ma) == pytest.approx(exact, rel=2e-6)


@pytest.mark.parametrize("n, x", [(1.5, 0.05), (1.3, 0.2), (1.8, 0.01)])
def test_compressibility_coefficient_of_a_polytropic_compression(n, x):
    # polytropic compression of a perfect gas (closed form): the impeller power raises the
    # stagnation temperature by T1 [(1 + x)^((n-1)/n) - 1], and the polytropic work per unit
    # volume is n/(n-1) p1 [(1 + x)^((n-1)/n) - 1], so k_p = n/(n-1) [(1+x)^((n-1)/n) - 1] / x
    kappa, p1, q = 1.4, 101325.0, 10.0
    t = (1 + x) ** ((n - 1) / n) - 1
    P_r = q * p1 * kappa / (kappa - 1) * t
    expected = n / (n - 1) * t / x
    assert compressibility_coefficient(x * p1, p1, q, P_r, kappa) == pytest.approx(expected,
                                                                                  rel=1e-10)


def test_compressibility_coefficient_tends_to_one():
    # incompressible limit (common practice): k_p -> 1 as the pressure ratio -> 1 (with the
    # impeller power of an efficiency of 0.8 at that pressure rise)
    dp = 1e-3
    assert compressibility_coefficient(dp, 101325.0, 1.0, dp / 0.8) == pytest.approx(
        1.0, abs=1e-8)


def test_fan_test_on_argon_by_hand():
    # argon at 1 bar: a perfect gas (cp = 5/2 R, kappa = 5/3); hand calculation of the ISO
    # 5801 definitions with the ideal-gas law and the energy balance of an adiabatic casing
    R = 8.314462618 / 0.039948  # molar gas constant (CODATA 2018) over argon's molar mass
    cp, kappa = 2.5 * R, 5.0 / 3.0
    p1, T1, q1, A1, A2, P_r, p2 = 100000.0, 293.15, 4.0, 0.8, 0.4, 9000.0, 101600.0
    rho1 = p1 / (R * T1)
    m = rho1 * q1
    v1 = q1 / A1
    T02 = T1 + v1 ** 2 / (2 * cp) + P_r / (m * cp)
    rho2 = rho1
    for _ in range(50):
        v2 = m / (rho2 * A2)
        rho2 = p2 / (R * (T02 - v2 ** 2 / (2 * cp)))

    def dyn(rho, v, T):
        Ma = v / math.sqrt(kappa * R * T)
        return rho * v ** 2 / 2 * (1 + Ma ** 2 / 4 + Ma ** 4 / 40 + Ma ** 6 / 1600)

    pd1 = dyn(rho1, v1, T1)
    pd2 = dyn(rho2, v2, p2 / (rho2 * R))
    p_sg1 = p1 + pd1
    p_F, p_sF = p2 + pd2 - p_sg1, p2 - p_sg1
    rho_sg1 = rho1 * (p_sg1 / p1) ** (1 / kappa)  # isentropic stagnation density
    q_sg1 = m / rho_sg1
    z = (kappa - 1) / kappa * P_r / (q_sg1 * p_sg1)
    k_p = math.log1p(p_F / p_sg1) / (p_F / p_sg1) * z / math.log1p(z)
    result = fan_test(ARGON.state(P=p1, T=T1), outlet_pressure=p2, volume_flow=q1,
                      inlet_area=A1, outlet_area=A2, power=P_r, isentropic_exponent=kappa)
    # the default exponent cp/(cp - R) of the property model: 5/3 to argon's real-gas
    # departure at 1 bar (compressibility factor about 0.999)
    default = fan_test(ARGON.state(P=p1, T=T1), outlet_pressure=p2, volume_flow=q1,
                       inlet_area=A1, outlet_area=A2, power=P_r)
    assert default.isentropic_exponent == pytest.approx(kappa, rel=3e-3)
    # tolerances: the property model's argon departs from the ideal-gas law by about 0.1 %
    # in density at 1 bar, which the dynamic pressures carry
    assert result.fan_dynamic_pressure == pytest.approx(pd2, rel=2e-3)
    assert result.fan_pressure == pytest.approx(p_F, rel=1e-4)
    assert result.fan_static_pressure == pytest.approx(p_sF, rel=1e-4)
    assert result.fan_static_pressure == pytest.approx(result.fan_pressure
                                                       - result.fan_dynamic_pressure)
    assert result.compressibility_coefficient == pytest.approx(k_p, rel=1e-5)
    assert result.fan_air_power == pytest.approx(q_sg1 * p_F * k_p, rel=1e-4)
    assert result.fan_efficiency == pytest.approx(q_sg1 * p_F * k_p / P_r, rel=1e-4)
    assert 0 < result.fan_static_efficiency < result.fan_efficiency
    assert result.to_dict()["fan_pressure"] == result.fan_pressure


def test_fan_refusals():
    air = wb.Fluid("Air").state(P=100000.0, T=293.15)
    base = dict(volume_flow=4.0, inlet_area=0.8, outlet_area=0.4, power=9000.0)
    with pytest.raises(wb.ReadingsError, match="fan pressure"):
        fan_test(air, outlet_pressure=90000.0, **base)
    with pytest.raises(wb.ReadingsError, match="exceeds 1"):
        fan_test(air, outlet_pressure=110000.0, **{**base, "power": 100.0})
    with pytest.raises(wb.InputError, match="a fan moves a gas"):
        fan_test(wb.Fluid("Water").state(P=1e5, T=300.0), outlet_pressure=1.1e5, **base)
    with pytest.raises(wb.InputError, match="outlet area"):
        fan_test(air, outlet_pressure=101000.0, **{**base, "outlet_area": -1.0})
    with pytest.raises(wb.InputError, match="isentropic exponent"):
        fan_test(air, outlet_pressure=101000.0, isentropic_exponent=0.9, **base)
    with pytest.raises(wb.InputError, match="Mach number"):
        mach_factor(1.2)

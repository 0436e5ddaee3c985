"""Speed of the calculation core against a naive high-level baseline, in one run.

Run:  python benchmarks/core_benchmark.py

The baseline is what one writes first: CoolProp's high-level ``PropsSI`` with a mixture string
(re-parsed and re-built on every call) and only the isentropic efficiency.  The workbench rates
the same readings with its reused low-level property objects and computes the isentropic
efficiency and both polytropic efficiencies (Schultz and direct path integration).  Ratios are
printed against the baseline timed in the same process, so machine load cancels out.
"""

from __future__ import annotations

import statistics
import time

import CoolProp.CoolProp as CP

import workbench as wb

GAS = {"Methane": 0.86, "Ethane": 0.07, "Propane": 0.04, "Nitrogen": 0.03}
GAS_STRING = "HEOS::" + "&".join(f"{k}[{v}]" for k, v in GAS.items())


def timed(function, repeats):
    """Median wall time of one call [s] over ``repeats`` calls."""
    times = []
    for i in range(repeats):
        t0 = time.perf_counter()
        function(i)
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


def naive_gas_rating(i):
    P1, T1, P2, T2 = 30e5, 300.0 + 0.01 * i, 90e5, 400.0
    h1 = CP.PropsSI("H", "P", P1, "T", T1, GAS_STRING)
    s1 = CP.PropsSI("S", "P", P1, "T", T1, GAS_STRING)
    h2 = CP.PropsSI("H", "P", P2, "T", T2, GAS_STRING)
    h2s = CP.PropsSI("H", "P", P2, "S", s1, GAS_STRING)
    return (h2s - h1) / (h2 - h1)


def main():
    gas = wb.Fluid(GAS)

    def workbench_gas_rating(i):
        inlet = gas.state(P=30e5, T=300.0 + 0.01 * i)
        outlet = gas.state(P=90e5, T=400.0)
        r = wb.compressor(inlet, outlet, mass_flow=10.0)
        return r.isentropic_efficiency, r.polytropic_efficiency_schultz, r.polytropic_efficiency

    workbench_gas_rating(0)  # warm up (dew-point checks are cached per pressure)
    before = gas.flash_count
    workbench_gas_rating(1)
    gas_flashes = gas.flash_count - before
    t_naive = timed(naive_gas_rating, 5)
    t_wb = timed(workbench_gas_rating, 20)
    print("Natural-gas compressor rating (4 components, 30 -> 90 bar)")
    print(f"  naive PropsSI, isentropic efficiency only : {t_naive * 1e3:9.2f} ms")
    print(f"  workbench, isentropic + Schultz + path     : {t_wb * 1e3:9.2f} ms")
    print(f"  ratio                                      : {t_naive / t_wb:9.1f} x   (aim >= 20 x)")
    print(f"  property flashes per rating                : {gas_flashes}")

    def naive_steam(i):
        P1, T1, P2, eta = 100e5, 773.15 + 0.01 * i, 0.1e5, 0.85
        h1 = CP.PropsSI("H", "P", P1, "T", T1, "Water")
        s1 = CP.PropsSI("S", "P", P1, "T", T1, "Water")
        h2s = CP.PropsSI("H", "P", P2, "S", s1, "Water")
        h2 = h1 - eta * (h1 - h2s)
        return CP.PropsSI("Q", "P", P2, "H", h2, "Water"), CP.PropsSI("T", "P", P2, "H", h2, "Water")

    results = {}
    for backend in ("IF97", "HEOS"):
        steam = wb.Fluid("Water", backend=backend)

        def workbench_steam(i, steam=steam):
            inlet = steam.state(P=100e5, T=773.15 + 0.01 * i)
            r = wb.turbine(inlet, P_out=0.1e5, isentropic_efficiency=0.85, mass_flow=50.0)
            return r.outlet.x, r.outlet.T, r.power

        workbench_steam(0)
        before = steam.flash_count
        workbench_steam(1)
        flashes = steam.flash_count - before
        results[backend] = (timed(workbench_steam, 200), flashes)
    t_naive = timed(naive_steam, 100)
    print("Steam turbine prediction (100 bar 500 degC -> 0.1 bar, wet exhaust, isentropic efficiency)")
    print(f"  naive PropsSI (IAPWS-95)                   : {t_naive * 1e3:9.3f} ms")
    for backend, (t, flashes) in results.items():
        label = "IAPWS-IF97" if backend == "IF97" else "IAPWS-95"
        print(f"  workbench, {label:10s}                     : {t * 1e3:9.3f} ms  ratio "
              f"{t_naive / t:6.1f} x  ({flashes} flashes)")
    print("  aim: >= 5 x (IF97 backend)")


if __name__ == "__main__":
    main()

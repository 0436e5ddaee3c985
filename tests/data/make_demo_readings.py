"""Write workbench/data/booster_compressor_readings.csv, the demo field-test file.

Invented scenario (demo only, not measured data): booster compressor K-2 at the invented
"Kestrel Flats" gas-gathering station, one scan a minute for 300 minutes, with a load change
(speed ramp) around minutes 120 to 140 and a few deliberately bad rows:

* row 37: discharge temperature cell empty;
* row 88: text "n/a" in the suction-pressure column;
* row 150: text "#COMM" in the flow column;
* row 201: suction pressure -1.50 bar(g), i.e. a negative absolute pressure;
* row 244: discharge pressure below suction pressure (reversed pressure ratio);
* row 270: discharge temperature below the isentropic one (efficiency above 1).

Units of the file: pressures bar(g) on a 1.013 bar barometer, temperatures degC, flow in
standard m3/h at 15 degC and 101.325 kPa, shaft power kW, speed rpm.

Run: ``python tests/data/make_demo_readings.py`` (uses the workbench core to make the good
rows self-consistent: outlet from an assumed isentropic efficiency of about 0.77).
"""

import pathlib

import numpy as np
import pandas as pd

import workbench as wb

GAS = {"Methane": 0.89, "Ethane": 0.06, "Propane": 0.02, "Nitrogen": 0.015,
       "CarbonDioxide": 0.015}
AMBIENT = 101300.0


def main():
    rng = np.random.default_rng(20261201)
    fluid = wb.Fluid(GAS)
    rho_std = fluid.state_PT(101325.0, 288.15).rho
    n = 300
    minute = np.arange(n)
    load = np.where(minute < 120, 0.0, np.where(minute > 140, 1.0, (minute - 120) / 20.0))
    speed = 9300 + 900 * load + rng.normal(0, 8, n)
    ratio = speed / 9300
    p1g = 18.0 + rng.normal(0, 0.03, n)
    t1 = 24.0 + rng.normal(0, 0.15, n)
    p2g = (p1g + 1.013) * (2.1 * ratio ** 2) - 1.013 + rng.normal(0, 0.05, n)
    flow_std = 42000 * ratio + rng.normal(0, 150, n)
    eta = 0.77 - 0.01 * load + rng.normal(0, 0.004, n)
    rows = []
    for i in range(n):
        inlet = fluid.state_PT((p1g[i] * 1e5 + AMBIENT), t1[i] + 273.15)
        m = flow_std[i] / 3600 * rho_std
        res = wb.compressor(inlet, P_out=p2g[i] * 1e5 + AMBIENT, isentropic_efficiency=eta[i],
                            mass_flow=m, mechanical_efficiency=0.985)
        rows.append({
            "timestamp": (pd.Timestamp("2026-03-14 06:00") + pd.Timedelta(minutes=i)).isoformat(),
            "PT-201 suction bar(g)": f"{p1g[i]:.3f}",
            "TT-201 suction degC": f"{t1[i]:.2f}",
            "PT-202 discharge bar(g)": f"{p2g[i]:.3f}",
            "TT-202 discharge degC": f"{res.outlet.T - 273.15:.2f}",
            "FT-200 flow Sm3/h": f"{flow_std[i]:.0f}",
            "JI-200 shaft kW": f"{res.shaft_power / 1e3:.1f}",
            "ST-200 speed rpm": f"{speed[i]:.0f}",
        })
    frame = pd.DataFrame(rows)
    frame.loc[37, "TT-202 discharge degC"] = ""
    frame.loc[88, "PT-201 suction bar(g)"] = "n/a"
    frame.loc[150, "FT-200 flow Sm3/h"] = "#COMM"
    frame.loc[201, "PT-201 suction bar(g)"] = "-1.500"
    frame.loc[244, "PT-202 discharge bar(g)"] = "15.200"
    frame.loc[270, "TT-202 discharge degC"] = "60.00"
    path = pathlib.Path(__file__).resolve().parents[2] / "workbench" / "data"
    frame.to_csv(path / "booster_compressor_readings.csv", index=False)


if __name__ == "__main__":
    main()

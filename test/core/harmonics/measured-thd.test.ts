import { describe, expect, it } from "vitest";
import { injectedCurrents, sixPulseSpectrum, TYPICAL_SIX_PULSE_THD_PCT } from "../../../src/core/harmonics/harmonics-api.js";
import { size } from "../../../src/core/pipeline/size.js";
import { expectClose, TOL } from "../../helpers/tolerance.js";

describe("a drive with a measured current THD and no spectrum", () => {
  it("the typical six-pulse spectrum to the 49th has THD √(Σ (100/h)²) = 30.015 %", () => {
    // hand: Σ 1/h² for h = 5, 7, 11, 13, …, 47, 49 = 0.040000 + 0.020408 + 0.008264 + 0.005917 + 0.003460 + 0.002770
    //   + 0.001890 + 0.001600 + 0.001189 + 0.001041 + 0.000816 + 0.000730 + 0.000595 + 0.000541 + 0.000453 + 0.000416
    //   = 0.090092 → √ = 0.300153
    expectClose(TYPICAL_SIX_PULSE_THD_PCT, 30.015, { abs: 1e-3 }, "THD of 1/h");
    expect(sixPulseSpectrum().map((l) => l.order)).toEqual([5, 7, 11, 13, 17, 19, 23, 25, 29, 31, 35, 37, 41, 43, 47, 49]);
  });

  it("scales the typical shape to the measured THD and takes the fundamental as I_rms/√(1 + THD²)", () => {
    // hand: 100 kVA rms at 480 V three-phase: I_rms = 100 000/(√3·480) = 120.281 A
    //   THD_i measured 40 %: I_1 = 120.281/√1.16 = 111.678 A
    //   I_5 = I_1·(20 %)·(40/30.015) = 111.678·0.2·1.33266 = 29.766 A; I_7 = 111.678·(1/7)·1.33266 = 21.261 A
    const c = injectedCurrents([{ label: "mixer drive", kVA: 100, phases: 3, isDrive: true, currentTHDPct: 40, kVABasis: "rms" }], 480);
    expectClose(c.fundamentalA, 111.678, { abs: 1e-3 }, "I_1");
    expectClose(c.byOrderA[5]!, 29.766, { abs: 1e-3 }, "I_5");
    expectClose(c.byOrderA[7]!, 21.261, { abs: 1e-3 }, "I_7");
    // the THD of what is injected is the measured one
    let sum = 0;
    for (const h of c.orders) sum += c.byOrderA[h]! ** 2;
    expectClose((Math.sqrt(sum) / c.fundamentalA) * 100, 40, TOL.pct, "THD injected");
    expect(c.sources[0]).toMatchObject({ label: "mixer drive", spectrumBasis: "typical_six_pulse_scaled_to_measured_thd", kVABasis: "rms" });
    expectClose(c.sources[0]!.currentTHDPct, 40, TOL.pct, "THD reported");
    expect(c.sources[0]!.note).toMatch(/scaled to the measured THD_i/);
  });

  it("a fundamental kVA is not reduced; a measured spectrum wins over a measured THD", () => {
    // hand: 100 kVA fundamental → I_1 = 120.281 A as is
    const c = injectedCurrents(
      [
        { label: "a", kVA: 100, phases: 3, isDrive: true, currentTHDPct: 40 },
        { label: "b", kVA: 100, phases: 3, isDrive: true, currentTHDPct: 40, spectrum: [{ order: 5, pct: 30 }], kVABasis: "rms" },
        { label: "c", kVA: 100, phases: 3, isDrive: true },
      ],
      480,
    );
    expectClose(c.sources[0]!.fundamentalA, 120.281, { abs: 1e-3 }, "fundamental basis");
    expect(c.sources.map((s) => s.spectrumBasis)).toEqual(["typical_six_pulse_scaled_to_measured_thd", "measured_spectrum", "typical_six_pulse"]);
    // b: its own spectrum's THD 30 %: I_1 = 120.281/√1.09 = 115.209 A
    expectClose(c.sources[1]!.fundamentalA, 115.209, { abs: 1e-3 }, "measured spectrum, rms reading");
    expectClose(c.sources[2]!.currentTHDPct, 30.015, { abs: 1e-3 }, "typical THD");
  });
});

describe("the sizing says which spectrum each source used", () => {
  it("drive read by V·I with THD 40 %: scaled typical spectrum, fundamental from the rms reading", () => {
    const outcome = size({
      system: { voltageV: 480, frequencyHz: 60, phases: 3 },
      transformer: { kVA: 1000, impedancePct: 5.75 },
      loads: [
        // V·I = √3·480·120.281/1000 = 100 kVA
        { label: "mixer drive", kind: "drive", measurement: { method: "v_i_kw", volts: 480, amps: 120.2813, kW: 90, currentTHDPct: 40 } },
        { label: "fan drive", kind: "drive", measurement: { method: "kw_pf", kW: 50, pf: 0.95, sense: "lagging" } },
        { label: "conveyor", kind: "motor", measurement: { method: "kw_pf", kW: 200, pf: 0.8, sense: "lagging" } },
      ],
    });
    if (!outcome.ok) throw new Error(JSON.stringify(outcome.issues));
    const sources = outcome.result.harmonics!.sources;
    expect(sources.map((s) => [s.label, s.spectrumBasis, s.kVABasis])).toEqual([
      ["mixer drive", "typical_six_pulse_scaled_to_measured_thd", "rms"],
      ["fan drive", "typical_six_pulse", "fundamental"],
    ]);
    expectClose(sources[0]!.fundamentalA, 111.678, { abs: 2e-3 }, "I_1 = 120.281/√1.16");
    // fan: 50/0.95 = 52.632 kVA fundamental → 52 632/(√3·480) = 63.305 A
    expectClose(sources[1]!.fundamentalA, 63.305, { abs: 1e-3 }, "fan I_1");
  });
});

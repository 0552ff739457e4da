import { Complex } from "complex.js";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  bankReactanceOhm,
  capacitancePerPhase,
  capacitiveReactanceOhm,
  capacitorVoltageWithReactorV,
  effectiveKvarWithReactor,
  inductiveReactanceOhm,
  seriesRlcImpedanceOhm,
} from "../../src/core/bank/capacitor.js";
import { correctionFor } from "../../src/core/correction/to-target.js";
import type { LoadInput, Measurement } from "../../src/core/inputs.js";
import { parallelResonanceOrder } from "../../src/core/harmonics/resonance.js";
import { shortCircuitAtBus } from "../../src/core/harmonics/short-circuit.js";
import { evaluateSite } from "../../src/core/readings/site-totals.js";
import { expectClose, TOL } from "../helpers/tolerance.js";

/**
 * Independent oracle: complex.js phasor arithmetic, with each reading turned into S = P + jQ from its own
 * definition (polar form |S|∠±φ, φ = acos PF), never through the engine's functions.
 */
/** Deterministic by default; FC_SEED / FC_RUNS explore further. */
const RUNS = { numRuns: Number(process.env.FC_RUNS ?? 300), seed: Number(process.env.FC_SEED ?? 0x5eed_2024) };
const j = (x: number) => new Complex(0, x);

const num = (min: number, max: number) => fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
const senseArb = fc.constantFrom("lagging" as const, "leading" as const);

interface GeneratedLoad {
  load: LoadInput;
  /** The oracle's complex power of the whole entry, kVA. */
  S: Complex;
}

const polar = (absKVA: number, pf: number, sense: "lagging" | "leading") =>
  new Complex({ abs: absKVA, arg: (sense === "lagging" ? 1 : -1) * Math.acos(pf) });
// Readings on the 480 V bus below are plausible between 0.4× and 2× its line voltage (farther is a 400, tested in
// test/core/readings/plausibility.test.ts); the oracle draws volts inside that range.
const PLAUSIBLE_MIN_V = 0.4 * 480;
const PLAUSIBLE_MAX_V = 2 * 480;
const viKVA = (volts: number, amps: number, phases: 1 | 3) => ((phases === 3 ? Math.sqrt(3) : 1) * volts * amps) / 1000;

const measurementArb: fc.Arbitrary<{ m: Measurement; phases: 1 | 3; S: Complex }> = fc.oneof(
  fc.record({ kW: num(0.1, 5000), kvar: num(-5000, 5000) }).map(({ kW, kvar }) => ({
    m: { method: "kw_kvar" as const, kW, kvar },
    phases: 3 as const,
    S: new Complex(kW, kvar),
  })),
  fc.record({ kW: num(0.1, 5000), pf: num(0.05, 1), sense: senseArb }).map(({ kW, pf, sense }) => ({
    m: { method: "kw_pf" as const, kW, pf, sense },
    phases: 3 as const,
    S: polar(kW / pf, pf, sense),
  })),
  fc.record({ kVA: num(0.1, 5000), ratio: num(0.05, 1), sense: senseArb }).map(({ kVA, ratio, sense }) => ({
    m: { method: "kw_kva" as const, kW: ratio * kVA, kVA, sense },
    phases: 3 as const,
    S: polar(kVA, ratio, sense),
  })),
  fc
    .record({
      volts: num(PLAUSIBLE_MIN_V, PLAUSIBLE_MAX_V),
      amps: num(0.1, 2000),
      pf: num(0.05, 1),
      sense: senseArb,
      phases: fc.constantFrom(1 as const, 3 as const),
    })
    .map(({ volts, amps, pf, sense, phases }) => ({
      m: { method: "v_i_pf" as const, volts, amps, pf, sense },
      phases,
      S: polar(viKVA(volts, amps, phases), pf, sense),
    })),
  fc
    .record({
      volts: num(PLAUSIBLE_MIN_V, PLAUSIBLE_MAX_V),
      amps: num(0.1, 2000),
      ratio: num(0.05, 1),
      sense: senseArb,
      phases: fc.constantFrom(1 as const, 3 as const),
    })
    .map(({ volts, amps, ratio, sense, phases }) => {
      const kVA = viKVA(volts, amps, phases);
      return { m: { method: "v_i_kw" as const, volts, amps, kW: ratio * kVA, sense }, phases, S: polar(kVA, ratio, sense) };
    }),
);

const loadArb: fc.Arbitrary<GeneratedLoad> = fc
  .record({ meas: measurementArb, quantity: fc.integer({ min: 1, max: 20 }) })
  .map(({ meas, quantity }) => ({
    load: { label: "load", phases: meas.phases, quantity, measurement: meas.m },
    S: meas.S.mul(quantity),
  }));

describe("oracle: site power = Σ complex S of the loads", () => {
  it("kW, kvar, kVA, PF and sense of random mixed sites match the phasor sum", () => {
    fc.assert(
      fc.property(fc.array(loadArb, { minLength: 1, maxLength: 25 }), (loads) => {
        const out = evaluateSite(
          { voltageV: 480, frequencyHz: 60, phases: 3 },
          loads.map((l) => l.load),
        );
        expect(out.issues).toEqual([]);
        const S = loads.reduce((acc, l) => acc.add(l.S), new Complex(0, 0));
        // cancellation between lagging and leading loads: tolerance scaled to Σ|S_i|
        const scale = loads.reduce((acc, l) => acc + l.S.abs(), 0);
        const tol = { abs: TOL.oracle.rel * scale, rel: TOL.oracle.rel };
        expectClose(out.site?.kW, S.re, tol, "site kW");
        expectClose(out.site?.kvar, S.im, { abs: TOL.oracleReactive.rel * scale }, "site kvar");
        // kVA and PF carry the kvar's conditioning near unity PF
        expectClose(out.site?.kVA, S.abs(), { abs: TOL.oracleReactive.rel * scale }, "site kVA");
        expectClose(out.site?.displacementPF, S.re / S.abs(), { abs: (TOL.oracleReactive.rel * scale) / S.abs() }, "site PF");
        if (Math.abs(S.im) > 1e-6 * scale) expect(out.site?.sense).toBe(S.im > 0 ? "lagging" : "leading");
        // each entry too
        loads.forEach((l, i) => {
          expectClose(out.loads[i]?.kW, l.S.re, TOL.oracle, `load ${i} kW`);
          expectClose(out.loads[i]?.kvar, l.S.im, { abs: TOL.oracleReactive.rel * l.S.abs() }, `load ${i} kvar`);
        });
      }),
      RUNS,
    );
  });

  it("correcting by kvarRequired lands on the target PF (S_after = S − jQ_bank)", () => {
    fc.assert(
      fc.property(num(1, 5000), num(0.3, 0.999), num(0.8, 1), (kW, pf, target) => {
        const S = polar(kW / pf, pf, "lagging");
        const site = { kW: S.re, kvar: S.im, kVA: S.abs(), displacementPF: S.re / S.abs(), sense: "lagging" as const };
        const { correction } = correctionFor(site, target, 400, 3);
        const after = S.sub(j(correction.kvarRequired));
        const expectedPF = Math.max(pf, target);
        expectClose(after.re / after.abs(), expectedPF, TOL.oracle, "PF after");
        expectClose(correction.kVAAfter, after.abs(), TOL.oracle, "kVA after");
      }),
      RUNS,
    );
  });
});

describe("oracle: impedances", () => {
  it("series RLC |Z| = |R + jωL + 1/(jωC)|", () => {
    fc.assert(
      fc.property(num(0, 1000), num(1e-6, 1), num(1e-7, 1e-2), num(1, 5000), (R, L, C, f) => {
        const w = 2 * Math.PI * f;
        const Z = new Complex(R, 0).add(j(w * L)).add(new Complex(1, 0).div(j(w * C)));
        const xL = inductiveReactanceOhm(L, f);
        const xC = capacitiveReactanceOhm(C, f);
        expectClose(xL, w * L, TOL.ohm, "X_L");
        expectClose(xC, 1 / (w * C), TOL.ohm, "X_C");
        expectClose(seriesRlcImpedanceOhm(R, xL, xC), Z.abs(), { abs: TOL.oracle.rel * (R + xL + xC) }, "|Z|");
      }),
      RUNS,
    );
  });

  it("capacitor steps in parallel: the bank's reactance is 1/Σ(1/X_i) of its steps", () => {
    fc.assert(
      fc.property(fc.array(num(1, 500), { minLength: 1, maxLength: 12 }), num(200, 15_000), (steps, V) => {
        // each step −jX_i; parallel combination via admittances
        const Y = steps.reduce((acc, q) => acc.add(new Complex(1, 0).div(j(-bankReactanceOhm(q, V)))), new Complex(0, 0));
        const Zpar = new Complex(1, 0).div(Y);
        const total = steps.reduce((a, b) => a + b, 0);
        expectClose(-Zpar.im, bankReactanceOhm(total, V), TOL.oracle, "parallel X");
        expectClose(Zpar.re, 0, { abs: TOL.oracle.rel * Zpar.abs() }, "no resistance");
        // and the complex power at V of that reactance: Q = −V²/X, i.e. the steps' kvar supplied
        const S = new Complex(V * V, 0).div(Zpar.conjugate());
        expectClose(-S.im / 1000, total, TOL.oracle, "kvar of the parallel bank");
      }),
      RUNS,
    );
  });

  it("short-circuit strength: utility and transformer reactances in series, S_sc = V²/|jX_u + jX_t|", () => {
    fc.assert(
      fc.property(num(10, 100_000), num(1, 25), num(1, 100_000), num(200, 35_000), (txKVA, zPct, faultMVA, V) => {
        const Xu = (V * V) / (faultMVA * 1e6);
        const Xt = ((zPct / 100) * V * V) / (txKVA * 1000);
        const Z = j(Xu).add(j(Xt));
        const sc = shortCircuitAtBus({ kVA: txKVA, impedancePct: zPct }, { faultMVA });
        expectClose(sc?.shortCircuitKVA, (V * V) / Z.abs() / 1000, TOL.oracle, "S_sc kVA");
      }),
      RUNS,
    );
  });

  it("parallel resonance: at the engine's h, source and capacitor branch cancel (Z_s + Z_branch = 0)", () => {
    fc.assert(
      fc.property(num(5, 5000), num(100, 200_000), num(0, 0.2), num(200, 15_000), (Q, Ssc, p, V) => {
        const h = parallelResonanceOrder(Q, Ssc, p);
        const Xs = (V * V) / (Ssc * 1000); // source reactance at the fundamental, Ω
        const Xc = (V * V) / (Q * 1000); // capacitor reactance at the fundamental, Ω
        const Zs = j(h * Xs);
        const Zb = j(h * p * Xc - Xc / h); // reactor p·X_C·h in series with the capacitor X_C/h
        const scale = Zs.abs() + Math.abs(h * p * Xc) + Xc / h;
        expect(Zs.add(Zb).abs()).toBeLessThanOrEqual(TOL.oracle.rel * scale);
        // below h the parallel impedance Z_s·Z_b/(Z_s + Z_b) rises towards the pole at h (above h the branch
        // turns inductive and passes its own series resonance 1/√p, so only the lower side is monotonic)
        const par = (k: number) => {
          const zs = j(k * Xs);
          const zb = j(k * p * Xc - Xc / k);
          return zs.mul(zb).div(zs.add(zb)).abs();
        };
        expect(par(h * 0.999)).toBeGreaterThan(par(h * 0.99));
        expect(par(h * 0.99)).toBeGreaterThan(par(h * 0.9));
      }),
      RUNS,
    );
  });

  it("detuned branch at the fundamental: Q_eff = Q_C/(1 − p) and U_C = U/(1 − p) from I = V/(jX_L − jX_C)", () => {
    fc.assert(
      fc.property(num(1, 2000), num(0, 0.2), num(200, 15_000), (Qc, p, V) => {
        const Xc = (V * V) / (Qc * 1000);
        const Zc = j(-Xc);
        const Z = j(p * Xc).add(Zc);
        const I = new Complex(V, 0).div(Z);
        const S = new Complex(V, 0).mul(I.conjugate());
        expectClose(effectiveKvarWithReactor(Qc, p), -S.im / 1000, TOL.oracle, "effective kvar");
        expectClose(capacitorVoltageWithReactorV(V, p), I.mul(Zc).abs(), TOL.oracle, "capacitor voltage");
      }),
      RUNS,
    );
  });

  it("capacitance per phase gives back the kvar: Q = 3·V_unit²·ωC for delta (V_LL) and wye (V_LL/√3)", () => {
    fc.assert(
      fc.property(num(1, 5000), num(200, 35_000), fc.constantFrom(50, 60), (kvar, V, f) => {
        const w = 2 * Math.PI * f;
        const c = capacitancePerPhase(kvar, V, f);
        const qOf = (uF: number, unitV: number) => {
          const I = new Complex(unitV, 0).div(j(-1 / (w * uF * 1e-6)));
          return (-3 * new Complex(unitV, 0).mul(I.conjugate()).im) / 1000;
        };
        expectClose(qOf(c.deltaUF, V), kvar, TOL.oracle, "delta kvar");
        expectClose(qOf(c.wyeUF, V / Math.sqrt(3)), kvar, TOL.oracle, "wye kvar");
      }),
      RUNS,
    );
  });
});

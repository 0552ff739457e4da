/** A bank designed from the reactive demand: fixed part, switched steps, controller C/k, protection and discharge. */
import { capacitorCurrentA, effectiveKvarWithReactor, kvarAtVoltage } from "./capacitor.js";
import { DEFAULT_TARGET_PF, TARGET_PF_MAX, TARGET_PF_MIN, type ProposedBankInput, type SystemInput } from "../inputs.js";
import { STANDARD_UNIT_KVAR } from "./standard-sizes.js";
import { warning, type InputIssue, type Warning } from "../warnings.js";
import { demandArrays, type ReactiveDemand } from "./demand.js";
import { dischargeDesign, type DischargeDesign, type DischargeOptions } from "./discharge.js";
import { circuitProtection, type CircuitProtection, type ProtectionOptions } from "./protection.js";
import { controllerResponseA, planSteps, type StepPlan, type StepSearchOptions } from "./step-plan.js";

export interface DesignBankInput {
  system: SystemInput;
  targetPF?: number;
  demand: ReactiveDemand;
  /** kvar already placed at motor terminals or group banks, subtracted from the demand (for a central bank). */
  localCorrectionKvar?: number;
  transformerKVA?: number;
  /** CT primary/secondary, e.g. 1000/5 = 200. */
  ctRatio?: number;
  /** Capacitor nameplate voltage; defaults to the system voltage. */
  ratedVoltageV?: number;
  reactorPct?: number;
  unitSizesKvar?: readonly number[];
  steps?: StepSearchOptions;
  protection?: ProtectionOptions;
  discharge?: DischargeOptions;
  /** Smallest C/k the controller resolves, A (default 0.05: common practice, no source — check the controller). */
  minResponseA?: number;
}

export interface DesignedStep {
  role: "fixed" | "switched";
  /** kvar delivered at the system voltage (what the design sized). */
  effectiveKvar: number;
  /** Nameplate kvar at the rated voltage, as the bank analysis takes it. */
  nameplateKvar: number;
}

export interface BankDesign {
  /** Physical steps, fixed first, nameplate kvar: feed to analyseBank (src/core/bank.ts). */
  bank: ProposedBankInput | null;
  /** One stage per reachable total (fixed, then the base step added one by one): screens every switchable combination. */
  screenBank: ProposedBankInput | null;
  steps: DesignedStep[];
  /** Delivered kvar at the system voltage and frequency. */
  fixedKvar: number;
  switchedKvar: number;
  totalKvar: number;
  /** The same parts at nameplate (standard sizes at ratedVoltageV). */
  fixedNameplateKvar: number;
  switchedNameplateKvar: number;
  stepPlan: StepPlan;
  controller: { ctRatio: number; smallestStepKvar: number; responseA: number } | null;
  protection: { steps: CircuitProtection[]; bank: CircuitProtection } | null;
  discharge: DischargeDesign[];
  reason: string;
  notes: string[];
  warnings: Warning[];
}

export type DesignOutcome = { ok: true; design: BankDesign } | { ok: false; issues: InputIssue[] };

export const DEFAULT_MIN_RESPONSE_A = 0.05;

function validate(input: DesignBankInput): InputIssue[] {
  const issues: InputIssue[] = [];
  const pf = input.targetPF ?? DEFAULT_TARGET_PF;
  if (!(pf >= TARGET_PF_MIN && pf <= TARGET_PF_MAX))
    issues.push({ path: ["targetPF"], message: `target PF must be between ${TARGET_PF_MIN} and ${TARGET_PF_MAX}` });
  if (!(input.system.voltageV > 0)) issues.push({ path: ["system", "voltageV"], message: "voltage must be positive" });
  if (input.ctRatio !== undefined && !(input.ctRatio > 0))
    issues.push({ path: ["ctRatio"], message: "CT ratio must be positive (primary/secondary, e.g. 200 for 1000/5)" });
  const p = input.reactorPct ?? 0;
  if (!(p >= 0 && p < 50)) issues.push({ path: ["reactorPct"], message: "reactor percent must be in [0, 50)" });
  if (input.ratedVoltageV !== undefined && !(input.ratedVoltageV > 0))
    issues.push({ path: ["ratedVoltageV"], message: "rated voltage must be positive" });
  return issues;
}

/** Design the bank: steps plan, C/k, protection per step and bank, discharge per step size. */
export function designBank(input: DesignBankInput): DesignOutcome {
  const issues = validate(input);
  const { arrays, issues: demandIssues } = demandArrays(input.demand, input.localCorrectionKvar ?? 0);
  issues.push(...demandIssues);
  if (issues.length > 0 || !arrays) return { ok: false, issues };

  const { system } = input;
  const targetPF = input.targetPF ?? DEFAULT_TARGET_PF;
  const units = input.unitSizesKvar ?? STANDARD_UNIT_KVAR;
  const ratedVoltageV = input.ratedVoltageV ?? system.voltageV;
  const p = (input.reactorPct ?? 0) / 100;
  // One nameplate kvar delivers Q_eff = (V/V_r)²/(1 − p) at the bus (the bank analysis's rule; rated at the system
  // frequency), so steps are chosen among standard nameplates at V_r and sized by what they deliver.
  const perNameplate = effectiveKvarWithReactor(kvarAtVoltage(1, system.voltageV, ratedVoltageV), p);
  // Nameplate for a delivered kvar, Q_eff/factor, rounded off the float noise: it is a standard size (or a multiple).
  const nameplate = (eff: number) => Math.round((eff / perNameplate) * 1e6) / 1e6;
  const plan = planSteps({
    demand: arrays,
    targetPF,
    unitSizesKvar: units,
    deliveredPerNameplate: perNameplate,
    transformerKVA: input.transformerKVA,
    ...(input.steps ? { options: input.steps } : {}),
  });
  const warnings: Warning[] = [...plan.warnings];
  const fixedText =
    plan.fixed.fixedKvar > 0 && perNameplate !== 1
      ? `${nameplate(plan.fixed.fixedKvar)} kvar ${ratedVoltageV} V nameplate, ${kv(plan.fixed.fixedKvar)} kvar delivered`
      : `${kv(plan.fixed.fixedKvar)} kvar`;
  const notes: string[] = [
    `fixed part: ${fixedText}, held under ${plan.fixed.capKvar.toFixed(1)} kvar (${plan.fixed.basis}) so the site does not lead at light load`,
    ...plan.notes,
  ];
  if (perNameplate !== 1) {
    notes.push(
      `steps are standard sizes at the ${ratedVoltageV} V rating${p > 0 ? ` behind a ${input.reactorPct} % reactor` : ""}; each delivers ${perNameplate.toFixed(4)} × its nameplate at ${system.voltageV} V: (${system.voltageV}/${ratedVoltageV})²${p > 0 ? `/(1 - ${p})` : ""} (IEEE Std 18 rating basis)`,
    );
  }
  if (p > 0 && ratedVoltageV < system.voltageV / (1 - p)) {
    warnings.push(
      warning(
        "detuned_rated_voltage_needed",
        `with a ${input.reactorPct} % reactor the capacitors see ${(system.voltageV / (1 - p)).toFixed(0)} V; give ratedVoltageV at or above it`,
        "ratedVoltageV",
      ),
    );
  }

  const steps: DesignedStep[] = [];
  if (plan.fixed.fixedKvar > 0) steps.push({ role: "fixed", effectiveKvar: plan.fixed.fixedKvar, nameplateKvar: nameplate(plan.fixed.fixedKvar) });
  for (const s of plan.switched?.stepsKvar ?? []) steps.push({ role: "switched", effectiveKvar: s, nameplateKvar: nameplate(s) });
  const fixedKvar = plan.fixed.fixedKvar;
  const switchedKvar = plan.switched?.totalKvar ?? 0;
  const totalKvar = fixedKvar + switchedKvar;
  const fixedNameplateKvar = nameplate(fixedKvar);
  const switchedNameplateKvar = steps.filter((s) => s.role === "switched").reduce((sum, s) => sum + s.nameplateKvar, 0);
  const base = { ratedVoltageV, ratedFrequencyHz: system.frequencyHz, reactorPct: input.reactorPct ?? 0 } as const;
  const bank: ProposedBankInput | null = steps.length === 0 ? null : { ...base, steps: steps.map((s) => ({ kvar: s.nameplateKvar })) };
  let screenBank: ProposedBankInput | null = null;
  if (bank && plan.switched) {
    const k = plan.switched.totalKvar / plan.switched.baseKvar;
    const head = fixedKvar > 0 ? [{ kvar: nameplate(fixedKvar) }] : [];
    screenBank = { ...base, steps: [...head, ...Array.from({ length: Math.round(k) }, () => ({ kvar: nameplate(plan.switched?.baseKvar ?? 0) }))] };
  } else if (bank) screenBank = { ...base, steps: bank.steps.map((s) => ({ ...s })) };

  let controller: BankDesign["controller"] = null;
  if (plan.switched) {
    const smallest = plan.switched.baseKvar;
    if (input.ctRatio !== undefined) {
      const responseA = controllerResponseA(smallest, system.voltageV, input.ctRatio, system.phases);
      controller = { ctRatio: input.ctRatio, smallestStepKvar: smallest, responseA };
      notes.push(
        `controller C/k = ${kv(smallest)}·1000/(${system.phases === 3 ? "sqrt(3)·" : ""}${system.voltageV}·${input.ctRatio}) = ${responseA.toFixed(3)} A; the CT must carry the loads' and the bank's current (on the supply side of both)`,
      );
      const minA = input.minResponseA ?? DEFAULT_MIN_RESPONSE_A;
      if (responseA < minA)
        warnings.push(
          warning(
            "controller_response_too_small",
            `C/k ${responseA.toFixed(3)} A is below ${minA} A, which many controllers cannot resolve (common practice, no source): use a smaller CT ratio or a larger smallest step`,
            "ctRatio",
          ),
        );
    } else {
      warnings.push(
        warning(
          "ct_ratio_needed",
          "give the controller CT's ratio (primary/secondary, e.g. 1000/5 = 200) to set its response threshold C/k",
          "ctRatio",
        ),
      );
    }
  }

  let protection: BankDesign["protection"] = null;
  const discharge: DischargeDesign[] = [];
  if (bank) {
    // Circuit current: the larger of the nameplate current and the current drawn at the bus (detuned steps draw more).
    const currentOf = (s: { effectiveKvar: number; nameplateKvar: number }) =>
      Math.max(
        capacitorCurrentA(s.nameplateKvar, ratedVoltageV, system.phases),
        capacitorCurrentA(
          effectiveKvarWithReactor(kvarAtVoltage(s.nameplateKvar, system.voltageV, ratedVoltageV), p),
          system.voltageV,
          system.phases,
        ),
      );
    const stepProt = steps.map((s, i) => {
      const r = circuitProtection(
        `${s.role} step ${i + 1} (${kvarText(s.nameplateKvar, s.effectiveKvar)})`,
        s.effectiveKvar,
        currentOf(s),
        input.protection,
        `steps.${i}`,
      );
      warnings.push(...r.warnings);
      return r.protection;
    });
    const wholeNameplate = fixedNameplateKvar + switchedNameplateKvar;
    const whole = circuitProtection(
      `whole bank (${kvarText(wholeNameplate, totalKvar)})`,
      totalKvar,
      currentOf({ effectiveKvar: totalKvar, nameplateKvar: wholeNameplate }),
      input.protection,
      "bank",
    );
    warnings.push(...whole.warnings);
    protection = { steps: stepProt, bank: whole.protection };
    notes.push(
      "conductors and disconnect at 135 % or more of rated current (NFPA 70 460.8(A), (C)); the conductor must also be protected by the chosen device (NFPA 70 240.4)",
    );
    for (const np of [...new Set(steps.map((s) => s.nameplateKvar))]) {
      const r = dischargeDesign(np, ratedVoltageV, system.frequencyHz, system.phases, input.discharge, "discharge");
      if (discharge.length === 0) warnings.push(...r.warnings);
      // No residual-voltage limit below the peak voltage (a capacitor of a few tens of volts): no resistor to size.
      if (Number.isFinite(r.discharge.maxResistanceOhm)) discharge.push(r.discharge);
    }
    if (discharge.length > 0) {
      const worst = Math.max(...discharge.map((d) => d.timeTo10PctS));
      notes.push(
        `set the controller's reclosing delay to at least ${worst.toFixed(0)} s (discharge to 10 % of rated voltage with the largest permitted resistors)`,
      );
    } else
      notes.push(`at ${ratedVoltageV} V the capacitors' peak voltage is within every residual-voltage limit: the discharge rules set no resistor`);
  }

  const reason = reasonText(plan, targetPF, fixedKvar);
  return {
    ok: true,
    design: {
      bank,
      screenBank,
      steps,
      fixedKvar,
      switchedKvar,
      totalKvar,
      fixedNameplateKvar,
      switchedNameplateKvar,
      stepPlan: plan,
      controller,
      protection,
      discharge,
      reason,
      notes,
      warnings,
    },
  };
}

/** A kvar figure as a reader wants it: whole standard sizes as they are, delivered figures to two decimals. */
function kv(kvar: number): string {
  return String(Math.round(kvar * 100) / 100);
}

function kvarText(nameplateKvar: number, effectiveKvar: number): string {
  return Math.abs(nameplateKvar - effectiveKvar) < 1e-6
    ? `${kv(effectiveKvar)} kvar`
    : `${kv(nameplateKvar)} kvar nameplate, ${kv(effectiveKvar)} kvar delivered`;
}

function reasonText(plan: StepPlan, targetPF: number, fixedKvar: number): string {
  const src =
    plan.source === "intervals"
      ? `${plan.samples} intervals`
      : plan.source === "survey_and_light_load"
        ? "the survey and light-load readings"
        : "the survey reading";
  if (plan.needAtCoverageKvar <= 1e-9) return `no correction needed: ${src} already meet PF ${targetPF}`;
  const cov =
    plan.source === "intervals"
      ? `the ${(plan.coverage * 100).toFixed(0)}th-percentile need of ${plan.needAtCoverageKvar.toFixed(1)} kvar`
      : `the need of ${plan.needAtCoverageKvar.toFixed(1)} kvar`;
  const fixed = fixedKvar > 0 ? `fixed ${kv(fixedKvar)} kvar (at most the ${plan.fixed.capKvar.toFixed(1)} kvar light-load limit)` : "no fixed part";
  const sw = plan.switched
    ? `automatic ${plan.switched.ratio} program of ${plan.switched.stepCount} steps (${plan.switched.stepsKvar.map(kv).join(", ")} kvar = ${kv(plan.switched.totalKvar)} kvar)`
    : "no switched steps";
  return `${fixed} + ${sw} for ${cov} from ${src}; meets PF ${targetPF} in ${(plan.metShare * 100).toFixed(1)} % of samples (${(plan.metCoveredShare * 100).toFixed(1)} % of those within coverage) with ${plan.switchingOperations} switching operations, chosen from ${plan.candidatesEvaluated} candidate programs`;
}

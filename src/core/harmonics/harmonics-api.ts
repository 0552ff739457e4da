/** Public API of the harmonic-study engine (pure: typed inputs in, new result objects out). */
export type { Complex } from "./complex.js";
export { complex, cAdd, cMul, cDiv, cAbs, cParallel } from "./complex.js";
export type { Issue, LimitCheck, SpectrumLine } from "./study-types.js";
export { MAX_HARMONIC_ORDER } from "./study-types.js";
export type { NetworkInput, SourceImpedance, BusModel, XOverRBasis } from "./network.js";
export {
  defaultXOverR,
  sourceImpedance,
  loadDampingResistanceOhm,
  buildBusModel,
  withBranches,
  sourceImpedanceAt,
  drivingPointImpedance,
  drivingPointImpedanceOhm,
  branchVoltageV,
  X_OVER_R_UNKNOWN,
} from "./network.js";
export type { CapacitorBranch } from "./branch.js";
export { capacitorBranch, capacitorKvarAtSystem, branchImpedance, effectiveKvar, DEFAULT_REACTOR_QUALITY_FACTOR } from "./branch.js";
export { transformerShortCircuitKVA, shortCircuitAtBus, type ShortCircuitResult } from "./short-circuit.js";
export { parallelResonanceOrder, ordersNearResonance, nearHarmonic, withinResonanceBand, RESONANCE_BAND_PCT } from "./resonance.js";
export type { ScanOptions, ScanGrid, ResonancePeak, ImpedanceDip, ImpedanceScan } from "./scan.js";
export { scanImpedance, validateScanOptions, resolveScanGrid, DEFAULT_SCAN, MAX_SCAN_POINTS } from "./scan.js";
export { sixPulseSpectrum, validateSpectrum, MAX_SPECTRUM_SUM_PCT } from "./spectrum.js";
export type { HarmonicSourceInput, CombinationMethod, InjectedCurrents, KVABasis, SpectrumBasis, SourceSpectrumUse } from "./injection.js";
export { fundamentalCurrentA, sourceSpectrum, injectedCurrents, TYPICAL_SIX_PULSE_THD_PCT } from "./injection.js";
export type { BusDistortion, BusHarmonicLine } from "./distortion.js";
export { busDistortion, thdPct } from "./distortion.js";
export type { VoltageDistortionLimits, Ieee519Check } from "./limits.js";
export { ieee519VoltageLimits, checkIeee519 } from "./limits.js";
export type { CapacitorRating, CapacitorDutyInput, CapacitorDutyCheck, DutyQuantity, CapacitorOrderDuty } from "./duty.js";
export { capacitorDuty, IEEE18_LIMITS_PCT } from "./duty.js";
export type { DetuningChoice, DetunedDesignInput, DetunedDesign, DetunedStep, KvarRounding } from "./detuned.js";
export {
  proposeDetunedDesign,
  chooseDetuning,
  isThirdHarmonicSignificant,
  nextLowerDetuning,
  DETUNING_CHOICES,
  DEFAULT_VOLTAGE_MARGIN_FACTOR,
} from "./detuned.js";
export { nearestStandardKvar, standardCapacitorVoltageV, STANDARD_CAPACITOR_VOLTAGES_V, STANDARD_STEP_KVAR } from "../bank/standard-sizes.js";
export type {
  CapacitorBankInput,
  CapacitorStepInput,
  BankStudy,
  StageStudy,
  BusStudy,
  ScanSeries,
  Finding,
  FindingCode,
  StudyContext,
} from "./stage.js";
export type { HarmonicStudyInput, HarmonicStudyOptions, HarmonicStudyResult, HarmonicStudyOutcome, DetunedProposal } from "./study.js";
export { runHarmonicStudy, runHarmonicStudyInContext, studyContextOf } from "./study.js";
export { validateHarmonicStudyInput } from "./validate.js";

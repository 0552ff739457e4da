import { z } from "zod";
import { intervalResultSchema } from "../interval/schema.js";
import * as buildings from "../schemas/buildings.js";
import { harmonicScanRequestSchema, scanOptionsSchema } from "../schemas/harmonics.js";
import { keySchema } from "../schemas/keys.js";
import * as results from "../schemas/results.js";
import * as sizing from "../schemas/sizing.js";
import * as surveys from "../schemas/surveys.js";

/**
 * The named schemas of the document (components.schemas): each is written once and referenced wherever a route's
 * schema uses it. A request-side schema appears as <Name>Input, a response-side one as <Name> (the transform's
 * convention: the two sides can differ, e.g. defaults and optional fields). Kept here, not in the schema files, so the
 * schemas stay plain zod.
 */
export const componentRegistry = z.registry<{ id: string }>();

const named: [z.ZodType, string][] = [
  // requests: a sizing and its parts
  [sizing.sizingRequestSchema, "SizingRequest"],
  [harmonicScanRequestSchema, "HarmonicScanRequest"],
  [scanOptionsSchema, "ScanOptions"],
  [sizing.measurementSchema, "Measurement"],
  [sizing.harmonicSpectrumSchema, "HarmonicSpectrum"],
  [sizing.loadSchema, "Load"],
  [sizing.systemSchema, "System"],
  [sizing.transformerSchema, "Transformer"],
  [sizing.utilitySchema, "Utility"],
  [sizing.bankSchema, "ProposedBank"],
  [sizing.installedBankSchema, "InstalledBank"],
  [sizing.bankReadingSchema, "BankReading"],
  [sizing.backgroundDistortionSchema, "BackgroundDistortion"],
  [sizing.serviceEntranceSchema, "ServiceEntrance"],
  [sizing.bankDesignSchema, "BankDesignOptions"],
  [sizing.tariffSchema, "Tariff"],
  [sizing.economicsSchema, "Economics"],
  [sizing.scopeSchema, "Scope"],
  // results
  [results.warningSchema, "Warning"],
  [results.cautionSchema, "Caution"],
  [results.loadResultSchema, "LoadResult"],
  [results.siteResultSchema, "SiteResult"],
  [results.correctionSchema, "Correction"],
  [results.installedStepResultSchema, "InstalledStepResult"],
  [results.installedBankResultSchema, "InstalledBankResult"],
  [results.bankStageSchema, "BankStage"],
  [results.bankAnalysisSchema, "BankAnalysis"],
  [results.recommendedBankSchema, "RecommendedBank"],
  [results.placementSchema, "Placement"],
  [results.resonanceSchema, "Resonance"],
  [results.economicsResultSchema, "EconomicsResult"],
  [results.sizingResultSchema, "SizingResult"],
  [results.sizingWithHarmonicsSchema, "SizingWithHarmonics"],
  [results.harmonicStudySchema, "HarmonicStudy"],
  [results.sizingHarmonicsSchema, "SizingHarmonics"],
  [results.harmonicScanResultSchema, "HarmonicScanResult"],
  [results.problemSchema, "Problem"],
  // parts of the two forms of the harmonic study (module-private in results.ts, reached through the shapes)
  [results.harmonicStudySchema.shape.banks.element, "StudiedBank"],
  [results.sizingHarmonicsSchema.shape.banks.element, "StudiedBankCompact"],
  [results.harmonicStudySchema.shape.findings.element, "HarmonicFinding"],
  [results.harmonicStudySchema.shape.withoutCapacitors.shape.ieee519, "Ieee519Check"],
  [results.harmonicStudySchema.shape.withoutCapacitors.shape.peaks.element, "ResonancePeak"],
  [results.harmonicStudySchema.shape.withoutCapacitors.shape.distortion.shape.lines.element, "HarmonicVoltageLine"],
  [results.harmonicStudySchema.shape.banks.element.shape.stages.element.shape.duty.shape.rmsVoltage, "CapacitorDutyCheck"],
  // stored resources
  [buildings.buildingCreateSchema, "NewBuilding"],
  [buildings.buildingPatchSchema, "BuildingChange"],
  [buildings.economicsSettingsViewSchema, "EconomicsSettings"],
  [buildings.installedBankViewSchema, "InstalledBankSettings"],
  [buildings.buildingSchema, "Building"],
  [surveys.surveyInputsSchema, "NewSurvey"],
  [surveys.revisionInputsSchema, "NewRevision"],
  [surveys.buildingSnapshotSchema, "BuildingSnapshot"],
  [surveys.surveyCreatedSchema, "SurveyCreated"],
  [surveys.revisionSchema, "Revision"],
  [surveys.surveySchema, "Survey"],
  [surveys.surveySummarySchema, "SurveySummary"],
  [intervalResultSchema, "IntervalAnalysis"],
  // its parts, which the stored analysis's answer repeats
  [intervalResultSchema.shape.input, "IntervalInputReport"],
  [intervalResultSchema.shape.quality, "IntervalDataQuality"],
  [intervalResultSchema.shape.interval, "IntervalLength"],
  [intervalResultSchema.shape.reactiveDemand, "ReactiveDemand"],
  [intervalResultSchema.shape.neededKvar, "NeededKvar"],
  [intervalResultSchema.shape.monthly.element, "MonthlyDemand"],
  [keySchema, "ApiKey"],
];
for (const [schema, id] of named) componentRegistry.add(schema, { id });

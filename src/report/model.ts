/** The report model of a sizing: pure, from the stored (or just computed) result and its inputs. */
import { dateTime } from "./format.js";
import { bankSection } from "./sections/bank.js";
import { buildingSection } from "./sections/building.js";
import { cautionsSection } from "./sections/cautions.js";
import { economicsSection } from "./sections/economics.js";
import { harmonicsSection } from "./sections/harmonics.js";
import { intervalSection } from "./sections/interval.js";
import { installedSection } from "./sections/installed.js";
import { methodsSection } from "./sections/methods.js";
import { readingsSection } from "./sections/readings.js";
import { siteSection } from "./sections/site.js";
import { verdictSection } from "./sections/verdict.js";
import { warningsSection } from "./sections/warnings.js";
import type { ReportInput, ReportModel } from "./types.js";

export type { ReportInput, ReportModel } from "./types.js";

/** Section headings in their fixed order (the interval section sits after the site's figures). */
export const SECTION_ORDER = [
  "building",
  "readings",
  "site",
  "interval",
  "installed",
  "bank",
  "harmonics",
  "economics",
  "warnings",
  "cautions",
  "methods",
] as const;

export function buildReportModel(input: ReportInput): ReportModel {
  const { result, building, survey } = input;
  const title = input.title ?? "Power-factor correction report";
  const subtitle = [building?.name, survey ? `survey ${survey.id}, revision ${survey.revision}` : "sizing request (not stored)"]
    .filter(Boolean)
    .join(" — ");
  const facts = [
    ...(building ? [{ key: "Site", value: building.address ? `${building.name}, ${building.address}` : building.name }] : []),
    ...(survey
      ? [
          { key: "Surveyed", value: `${dateTime(survey.surveyedAt)} by ${survey.surveyor}` },
          { key: "Revision", value: `${survey.revision} (recorded ${dateTime(survey.createdAt)})` },
        ]
      : []),
    { key: "Engine version", value: survey?.engineVersion ?? result.engineVersion },
  ];
  const sections = [
    buildingSection(input),
    readingsSection(input),
    siteSection(input),
    intervalSection(input),
    installedSection(input),
    bankSection(input),
    harmonicsSection(input),
    economicsSection(input),
    warningsSection(input),
    cautionsSection(input),
    methodsSection(input),
  ];
  return { title, subtitle, facts, verdict: verdictSection(input), sections };
}

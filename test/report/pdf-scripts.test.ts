import { describe, expect, it } from "vitest";
import { buildReportModel, renderReportPdf } from "../../src/report/index.js";
import { fullReportInput, sized } from "./fixtures.js";
import { readPdf } from "./pdfjs.js";

/** Invented mills and people, one pair per script or language the report must print as typed. */
const NAMES = {
  polish: { place: "Przędzalnia Łąkowa, hala Źrebięcin", person: "Grzegorz Bączyński-Ślęzak" },
  czech: { place: "Přádelna Květná, Žďárec", person: "Bořivoj Štěpánek" },
  romanian: { place: "Țesătoria Vâlcenilor, hala Știubei", person: "Măriuca Ioniță-Șerban" },
  turkish: { place: "Dokuma Atölyesi Işıkçayır", person: "Çağrı Güneşdoğdu İnceöz" },
  greek: { place: "Κλωστήριο Αγίας Ξανθίππης", person: "Σωτήρης Παπαγεωργόπουλος" },
  russian: { place: "Ткацкий цех «Щукино-Юг»", person: "Ёлкина Эльвира Шамилевна" },
};
/** The issue's own example: Romanian with the cedilla letters (Ţ, ş) as older keyboards type them. */
const CEDILLA = { place: "Zakład Łódź – Hală Ţesătorie", person: "Paweł Żółć" };

function reportWithNames() {
  const input = fullReportInput();
  const inputs = structuredClone(input.inputs);
  const labels = Object.values(NAMES).map((n) => n.person);
  // Each load renamed after a person: the names then sit in table cells too.
  inputs.loads = inputs.loads.map((l, i) => ({ ...l, label: labels[i % labels.length] as string }));
  const result = sized(inputs);
  return buildReportModel({
    ...input,
    inputs,
    result,
    building: { ...input.building, name: CEDILLA.place, address: `${NAMES.czech.place}; ${NAMES.romanian.place}` },
    survey: {
      ...(input.survey as NonNullable<typeof input.survey>),
      surveyor: CEDILLA.person,
      notes: `${NAMES.polish.place}. ${NAMES.turkish.place}. ${NAMES.greek.place}. ${NAMES.russian.place}.`,
      reason: NAMES.greek.person,
    },
  });
}

describe("report PDF in any script", () => {
  it("gives back Polish, Czech, Romanian, Turkish, Greek and Russian names exactly", async () => {
    const model = reportWithNames();
    const pdf = await renderReportPdf(model);
    const { pages, title } = await readPdf(pdf);
    const all = pages.join(" ");
    for (const [language, n] of Object.entries(NAMES)) {
      expect(all, `${language} place`).toContain(n.place);
      expect(all, `${language} person`).toContain(n.person);
    }
    expect(all).toContain(CEDILLA.place);
    expect(all).toContain(`by ${CEDILLA.person}`);
    // The running footer carries the building's name on every page.
    pages.forEach((p, i) => expect(p, `footer of page ${i + 1}`).toContain(`${CEDILLA.place} — survey`));
    expect(all).not.toContain("?");
    // The document title (metadata) keeps the script too.
    expect(title).toBe(`${model.title}: ${model.subtitle}`);
    expect(title).toContain(CEDILLA.place);
  });

  it("embeds subsets of DejaVu Sans, regular and bold, and stays small", async () => {
    const pdf = await renderReportPdf(reportWithNames());
    const raw = pdf.toString("latin1");
    // pdfkit names an embedded subset with a six-letter tag and "+": e.g. "/BaseFont /AZXYWV+DejaVuSans".
    const fonts = new Set(raw.match(/\/BaseFont \/[A-Z]{6}\+[\w-]+/g)?.map((f) => f.replace(/^.*\+/, "")));
    expect([...fonts].sort()).toEqual(["DejaVuSans", "DejaVuSans-Bold"]);
    expect(raw).not.toMatch(/\/BaseFont \/Helvetica/);
    // Font dictionaries are never compressed, so the names read as text. The two whole font files are 1.4 MB
    // (0.73 MB deflated); this 13-page report with its subsets measured 96 kB (58 kB with built-in Helvetica).
    expect(pdf.length).toBeLessThan(200_000);
  });
});

// The survey being filled in (the draft), kept in localStorage so it survives a reload. A draft carries the one
// Idempotency-Key it will be sent with: made when the draft starts, kept until the service has stored it, so a
// second tap, a reload or a resend can never store it twice; a new draft (or a stored one changed) gets a new key.

const DRAFT_STORE = "pfc-form.draft";

export function readJson(key, fallback) {
  try {
    const v = localStorage.getItem(key);
    return v === null ? fallback : JSON.parse(v);
  } catch {
    return fallback;
  }
}
export const writeJson = (key, v) => localStorage.setItem(key, JSON.stringify(v));

/**
 * A random (version 4) UUID from crypto.getRandomValues, which plain-HTTP pages have; crypto.randomUUID exists only
 * in secure contexts, and the page is usually opened over plain HTTP on a site LAN. Layout per RFC 9562 §5.4.
 */
export function newKey() {
  const b = crypto.getRandomValues(new Uint8Array(16));
  b[6] = (b[6] & 0x0f) | 0x40;
  b[8] = (b[8] & 0x3f) | 0x80;
  const h = [...b].map((x) => x.toString(16).padStart(2, "0")).join("");
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`;
}

export const today = () => {
  const d = new Date();
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, "0")}-${String(d.getDate()).padStart(2, "0")}`;
};
export const newLoad = () => ({ kind: "motor", quantity: "1", "measurement.method": "kw_pf", "measurement.sense": "lagging" });

/** A new draft; the building and surveyor carry over (the same electrician, usually the same site). */
export function freshDraft(from = {}) {
  return {
    idem: newKey(),
    startedAt: new Date().toISOString(),
    storedAs: null,
    buildingId: from.buildingId ?? "",
    values: { surveyor: from.values?.surveyor ?? "", surveyedAt: today(), targetPF: "0.95" },
    loads: [newLoad()],
  };
}

/** A draft saved by the first version of the page (no key, readings under `values`): keep its contents. */
function migrate(old) {
  const d = freshDraft({ buildingId: old.buildingId, values: { surveyor: old.surveyor } });
  d.values.surveyedAt = old.surveyedAt ?? d.values.surveyedAt;
  d.values.targetPF = old.targetPF ?? d.values.targetPF;
  d.loads = (old.loads ?? []).map((l) => ({
    label: l.label ?? "",
    kind: l.kind ?? "motor",
    quantity: l.quantity ?? "1",
    "measurement.method": l.method ?? "kw_pf",
    ...Object.fromEntries(Object.entries(l.values ?? {}).map(([k, v]) => [`measurement.${k}`, v])),
  }));
  if (!d.loads.length) d.loads = [newLoad()];
  return d;
}

export function loadDraft() {
  const d = readJson(DRAFT_STORE, null);
  if (!d) return freshDraft();
  return typeof d.idem === "string" && d.values ? d : migrate(d);
}
export const saveDraft = (d) => writeJson(DRAFT_STORE, d);

/** Any change to a stored draft makes it a new survey: it gets its own key. */
export function changed(d) {
  if (d.storedAs) {
    d.idem = newKey();
    d.storedAs = null;
    d.startedAt = new Date().toISOString();
  }
  saveDraft(d);
}

// Calls to the service, and what they tell about reaching it. "Reachable" is what the last request (or the
// periodic probe of /health) found: navigator.onLine only knows whether the tablet has a network, not whether
// the service answers on it.

const TIMEOUT_MS = 20_000;
const KEY_STORE = "pfc-form.key";

export const apiKey = () => localStorage.getItem(KEY_STORE) ?? "";
export const setApiKey = (k) => (k ? localStorage.setItem(KEY_STORE, k) : localStorage.removeItem(KEY_STORE));

let reach = { state: "unknown", at: null, detail: "" };
const listeners = new Set();
export const reachability = () => reach;
export const onReachability = (fn) => listeners.add(fn);
function note(state, detail) {
  reach = { state, at: new Date(), detail };
  for (const fn of listeners) fn(reach);
}

/** A gateway's 502/503/504 means the service behind it is not there, however the network looks. */
const GATEWAY = new Set([502, 503, 504]);

/**
 * One request. Never throws: a network failure or a time-out answers { status: 0, error }. `as: "blob"` reads the
 * body as a file (reports); otherwise JSON bodies are parsed.
 */
export async function call(method, url, { body, headers = {}, auth = true, as = "json", timeoutMs = TIMEOUT_MS } = {}) {
  const ctl = new AbortController();
  const timer = setTimeout(() => ctl.abort(), timeoutMs);
  const h = { ...(auth ? { authorization: `Bearer ${apiKey()}` } : {}), ...headers };
  if (body !== undefined) h["content-type"] = "application/json";
  try {
    const res = await fetch(url, {
      method,
      headers: h,
      cache: "no-store",
      signal: ctl.signal,
      ...(body !== undefined ? { body: typeof body === "string" ? body : JSON.stringify(body) } : {}),
    });
    note(GATEWAY.has(res.status) ? "down" : "up", GATEWAY.has(res.status) ? `the gateway answered ${res.status}` : "");
    let data = null;
    if (as === "blob" && res.ok) data = await res.blob();
    else if ((res.headers.get("content-type") ?? "").includes("json")) data = await res.json().catch(() => null);
    return { status: res.status, data, headers: res.headers };
  } catch {
    const error = ctl.signal.aborted ? `no answer within ${timeoutMs / 1000} s` : "the service could not be reached";
    note("down", error);
    return { status: 0, data: null, error };
  } finally {
    clearTimeout(timer);
  }
}

/** The cheapest request there is: /health, no key. */
export const probe = () => call("GET", "/health", { auth: false, timeoutMs: 5000 });

/** A problem+json in one line, the service's own words. */
export const problemText = (r) => r.error ?? r.data?.detail ?? r.data?.title ?? `the service answered ${r.status}`;

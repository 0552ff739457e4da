// What the header and the queue list say: whether the service answers (from the last request or probe), whether
// the page can open offline, and each survey waiting to be sent.

import { $, el } from "./dom.js";

const time = (iso) => new Date(iso).toLocaleTimeString([], { hour: "2-digit", minute: "2-digit" });

export function renderReach(reach) {
  const box = $("net");
  box.dataset.state = reach.state;
  box.textContent = reach.state === "up" ? "Service reachable" : reach.state === "down" ? "Service not reachable" : "Checking the service…";
  box.title = reach.at ? `${reach.state === "down" ? reach.detail : "answered"} at ${reach.at.toLocaleTimeString()}` : "";
}

/** Offline reload needs a service worker, and browsers allow those only on HTTPS (or on the server's own host). */
export function renderOfflineNote(kind) {
  const box = $("offline-note");
  const text = {
    insecure:
      "Opened over plain HTTP: this page needs the network to open again. Surveys you submit are still kept on this tablet until the service has them. To reload it with no network, open the service's HTTPS address.",
    failed: "This page could not be stored for offline use: it needs the network to open again. Surveys you submit are still kept on this tablet.",
  }[kind];
  box.hidden = !text;
  box.textContent = text ?? "";
}

export function renderQueue(entries) {
  $("pending-box").hidden = entries.length === 0;
  $("pending").replaceChildren(
    ...entries.map((e) =>
      el(
        "li",
        { "data-idem": e.idem },
        el("strong", {}, e.buildingName),
        ` · ${e.loadCount} load${e.loadCount === 1 ? "" : "s"} · queued ${time(e.queuedAt)}`,
        e.lastError ? el("span", { class: "last-error" }, `Last try ${time(e.lastTriedAt)}: ${e.lastError}`) : null,
      ),
    ),
  );
}

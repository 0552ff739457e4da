// Service worker: keeps the page's own files so the form opens with no network after one online visit.
// FILES (URL paths) and VERSION are put above this line by the service from files.json (src/form/plugin.ts); a new
// VERSION (any file changed) installs a new cache and drops the old. API calls are never cached: they go to the
// network as if there were no worker, so a failure is seen as one.

const CACHE = `pfc-form-${VERSION}`;
/** How long a page file may take from the network before the cached copy is used (a dead LAN hangs, not fails). */
const NETWORK_WAIT_MS = 4000;

self.addEventListener("install", (event) => {
  event.waitUntil(
    caches
      .open(CACHE)
      .then((cache) => cache.addAll(FILES.map((url) => new Request(url, { cache: "reload" }))))
      .then(() => self.skipWaiting()),
  );
});

self.addEventListener("activate", (event) => {
  event.waitUntil(
    caches
      .keys()
      .then((keys) => Promise.all(keys.filter((k) => k.startsWith("pfc-form-") && k !== CACHE).map((k) => caches.delete(k))))
      .then(() => self.clients.claim()),
  );
});

/** Network first (a new version shows at once), the cache when the network fails or dawdles. */
async function pageFile(request) {
  const cache = await caches.open(CACHE);
  const fromNetwork = fetch(request).then((res) => {
    if (res.ok) void cache.put(request, res.clone());
    return res;
  });
  fromNetwork.catch(() => undefined); // a late failure after the cache answered is nobody's business
  const late = new Promise((resolve) => setTimeout(resolve, NETWORK_WAIT_MS));
  try {
    const res = await Promise.race([fromNetwork, late]);
    if (res) return res;
  } catch {
    // no network: the cached copy below
  }
  const cached = await cache.match(request, { ignoreSearch: true });
  return cached ?? fromNetwork;
}

self.addEventListener("fetch", (event) => {
  const url = new URL(event.request.url);
  if (event.request.method !== "GET" || url.origin !== self.location.origin || !FILES.includes(url.pathname)) return;
  event.respondWith(pageFile(event.request));
});

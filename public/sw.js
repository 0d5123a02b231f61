// bandgauge offline worker: keeps the app's own files in the browser's cache so the page
// opens and computes without a network, and lets a new build take over on the next reload.
//
// `cargo xtask dist` fills in BUILD_ID and APP_FILES below (the content-hashed file names of
// that build). Left as written here (never served: every build fills it in) the worker does
// nothing: it caches nothing, answers no request and removes caches of earlier builds.
//
// It holds app files only, never user data: inputs stay in localStorage, lot files in memory.

const BUILD_ID = "unbuilt";
const APP_FILES = [];

const CACHE_PREFIX = "bandgauge-app-files-";
const CACHE_NAME = CACHE_PREFIX + BUILD_ID;
const BUILT = BUILD_ID !== "unbuilt";

self.addEventListener("install", (event) => {
  event.waitUntil(
    (async () => {
      if (BUILT) {
        const cache = await caches.open(CACHE_NAME);
        // Straight from the server, not from the HTTP cache, so the set matches this build.
        await cache.addAll(APP_FILES.map((url) => new Request(url, { cache: "reload" })));
      }
      // A new build takes over at once: its file names are new, so a page of the old build
      // still open has everything it loaded and asks for nothing it would now miss.
      await self.skipWaiting();
    })(),
  );
});

self.addEventListener("activate", (event) => {
  event.waitUntil(
    (async () => {
      const names = await caches.keys();
      await Promise.all(
        names
          .filter((name) => name.startsWith(CACHE_PREFIX) && name !== CACHE_NAME)
          .map((name) => caches.delete(name)),
      );
      await self.clients.claim();
    })(),
  );
});

/** Whether a navigation asks for the app's page itself (with any query: the inputs). */
function isAppPage(url) {
  const scope = new URL(self.registration.scope);
  return url.pathname === scope.pathname || url.pathname === scope.pathname + "index.html";
}

/** The page from the network when there is one (a new build shows at once), else the cache. */
async function pageNetworkFirst(request) {
  try {
    return await fetch(request);
  } catch (offline) {
    const cache = await caches.open(CACHE_NAME);
    const page = await cache.match(new URL("./", self.registration.scope).href);
    if (page) {
      return page;
    }
    throw offline;
  }
}

/** Content-hashed files never change under one name: the cache first, else the network. */
async function fileCacheFirst(request) {
  const cache = await caches.open(CACHE_NAME);
  const kept = await cache.match(request);
  return kept || fetch(request);
}

if (BUILT) {
  self.addEventListener("fetch", (event) => {
    const request = event.request;
    const url = new URL(request.url);
    if (request.method !== "GET" || url.origin !== self.location.origin) {
      return;
    }
    if (request.mode === "navigate") {
      if (isAppPage(url)) {
        event.respondWith(pageNetworkFirst(request));
      }
      return;
    }
    event.respondWith(fileCacheFirst(request));
  });
}

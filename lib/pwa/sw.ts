/**
 * The service worker (built by @serwist/turbopack's route, app/serwist/[path]/route.ts, and served as /serwist/sw.js).
 * Precaches the built static assets, Leaflet's files, the icons and the manifest; caches at runtime the pages a
 * person opened (network first, so a reload without signal shows the last copy), the project's reference lists
 * (stations, members, tile packages, structural measurements), the sample lists the map and register read, and map tiles (the bundled basemap under /tiles-offline and imported MBTiles).
 * Nothing that writes is cached: POST/PATCH/DELETE go to the network, and the outbox (lib/client/outbox.ts) keeps
 * what could not be sent.
 */
import { CacheFirst, ExpirationPlugin, NetworkFirst, Serwist, type PrecacheEntry, type RouteMatchCallbackOptions } from "serwist";
import { MAP_TILE_CACHE, OFFLINE_AREA_HEADER } from "../map/offline-area";

declare const self: { __SW_MANIFEST: (PrecacheEntry | string)[] | undefined; location: Location };

const sameOrigin = ({ url }: RouteMatchCallbackOptions) => url.origin === self.location.origin;

/** A page (HTML), not Next's RSC payloads (those carry an RSC header or ?_rsc=), not the API or static files. */
const isPage = (o: RouteMatchCallbackOptions) => {
  const { url, request } = o;
  if (!sameOrigin(o) || request.method !== "GET") return false;
  if (request.headers.get("rsc") || url.searchParams.has("_rsc")) return false;
  if (/^\/(api|_next|serwist|tiles-offline|leaflet)\//.test(url.pathname) || /\.[a-z0-9]+$/i.test(url.pathname)) return false;
  return request.mode === "navigate" || request.destination === "document" || request.destination === "";
};

/** Lists the field screens read to work: stations, members, tile packages of a project. */
const isReferenceList = (o: RouteMatchCallbackOptions) =>
  sameOrigin(o) && o.request.method === "GET" && /^\/api\/projects\/[^/]+\/(stations|members|tile-packages|structures)\/?$/.test(o.url.pathname);

/**
 * The project's samples as the map and the register read them (the map's GeoJSON layer, register pages): last copy
 * served without signal, so an offline map still shows where the samples are.
 */
const isSampleList = (o: RouteMatchCallbackOptions) =>
  sameOrigin(o) && o.request.method === "GET" && (/^\/api\/projects\/[^/]+\/samples\/?$/.test(o.url.pathname) || (/^\/api\/projects\/[^/]+\/samples\/export\/?$/.test(o.url.pathname) && o.url.searchParams.get("format") === "geojson"));

/**
 * Map tiles. A "make this area available offline" download (lib/client/offline-areas.ts) carries OFFLINE_AREA_HEADER and
 * is left to the network: the page stores those tiles itself, without a Date header, so the expiration below (which
 * only tracks what this worker cached, and treats a response without a Date as fresh) never drops a saved area.
 */
const isTile = (o: RouteMatchCallbackOptions) =>
  sameOrigin(o) && o.request.method === "GET" && !o.request.headers.has(OFFLINE_AREA_HEADER) && (o.url.pathname.startsWith("/tiles-offline/") || /^\/api\/projects\/[^/]+\/tile-packages\/[^/]+\/tiles\//.test(o.url.pathname));

const serwist = new Serwist({
  precacheEntries: self.__SW_MANIFEST,
  skipWaiting: true,
  clientsClaim: true,
  navigationPreload: false,
  runtimeCaching: [
    { matcher: isTile, handler: new CacheFirst({ cacheName: MAP_TILE_CACHE, plugins: [new ExpirationPlugin({ maxEntries: 20_000, maxAgeSeconds: 180 * 24 * 3600 })] }) },
    { matcher: isReferenceList, handler: new NetworkFirst({ cacheName: "reference-lists", networkTimeoutSeconds: 6 }) },
    { matcher: isSampleList, handler: new NetworkFirst({ cacheName: "sample-lists", networkTimeoutSeconds: 6, plugins: [new ExpirationPlugin({ maxEntries: 60 })] }) },
    { matcher: isPage, handler: new NetworkFirst({ cacheName: "pages", networkTimeoutSeconds: 6, plugins: [new ExpirationPlugin({ maxEntries: 200 })] }) },
  ],
});

serwist.addEventListeners();

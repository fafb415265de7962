/**
 * TanStack Query keys, one factory per resource (the "query key factory" pattern from the TanStack Query
 * docs, "Query Keys" and "Effective React Query Keys", Dorfmeister 2021). Every key starts with the
 * resource and the project, so invalidating a prefix reaches every view of it: `sampleKeys.all(p)` refreshes
 * the register, the map layer and the pickers; `scanKeys.detail(p, s)` refreshes one scan's runs and its
 * sign-off history. Components never write key arrays themselves (eslint: no-restricted-syntax).
 */

type PhotoOwner = { sampleId: string } | { stationId: string };

export const sampleKeys = {
  all: (projectId: string) => ["samples", projectId] as const,
  /** The register page: `query` is its URL search string (filters, sort, page). */
  register: (projectId: string, query: string) => [...sampleKeys.all(projectId), "register", query] as const,
  /** Located samples on the map, filtered like the register. */
  map: (projectId: string, filterQuery: string) => [...sampleKeys.all(projectId), "map", filterQuery] as const,
  /** Type-ahead search by code (scan upload). */
  search: (projectId: string, q: string) => [...sampleKeys.all(projectId), "search", q] as const,
  /** The lab-submission picker. */
  picker: (projectId: string, q: string) => [...sampleKeys.all(projectId), "picker", q] as const,
};

export const stationKeys = {
  all: (projectId: string) => ["stations", projectId] as const,
  map: (projectId: string) => [...stationKeys.all(projectId), "map"] as const,
};

/** Structural measurements (strike/dip, trend/plunge) of the project's stations. */
export const structureKeys = {
  all: (projectId: string) => ["structures", projectId] as const,
  map: (projectId: string) => [...structureKeys.all(projectId), "map"] as const,
};

export const photoKeys = {
  all: (projectId: string) => ["photos", projectId] as const,
  owner: (projectId: string, owner: PhotoOwner) =>
    "sampleId" in owner
      ? ([...photoKeys.all(projectId), "sample", owner.sampleId] as const)
      : ([...photoKeys.all(projectId), "station", owner.stationId] as const),
};

export const scanKeys = {
  all: (projectId: string) => ["scans", projectId] as const,
  list: (projectId: string, status: string, page: number) => [...scanKeys.all(projectId), "list", { status, page }] as const,
  /** Prefix of everything about one scan (its processing runs and sign-off history). */
  detail: (projectId: string, scanId: string) => [...scanKeys.all(projectId), "detail", scanId] as const,
  /** One processing run of the scan (`run` null = the current one). */
  run: (projectId: string, scanId: string, run: string | null) => [...scanKeys.detail(projectId, scanId), "run", run] as const,
  signOffs: (projectId: string, scanId: string) => [...scanKeys.detail(projectId, scanId), "sign-offs"] as const,
};

/** The reference-phase library is shared by all projects. */
export const referenceKeys = {
  all: () => ["reference-phases"] as const,
  list: (params: string) => [...referenceKeys.all(), "list", params] as const,
  search: (q: string) => [...referenceKeys.all(), "search", q] as const,
  /** A phase's computed stick pattern for an overlay on a scan. */
  pattern: (phaseId: string, wavelength: number | undefined, twoThetaMax: number) =>
    [...referenceKeys.all(), "pattern", phaseId, { wavelength, twoThetaMax }] as const,
  /** A phase's own page, pattern at a chosen anode or wavelength (`query`). */
  view: (phaseId: string, query: string) => [...referenceKeys.all(), "view", phaseId, query] as const,
};

export const phaseMapKeys = {
  all: (projectId: string) => ["phase-map", projectId] as const,
  map: (projectId: string, query: string) => [...phaseMapKeys.all(projectId), "map", query] as const,
  minerals: (projectId: string, query: string) => [...phaseMapKeys.all(projectId), "minerals", query] as const,
  station: (projectId: string, stationKey: string, query: string) => [...phaseMapKeys.all(projectId), "station", stationKey, query] as const,
};

export const shareLinkKeys = {
  all: (projectId: string) => ["share-links", projectId] as const,
};

export const tilePackageKeys = {
  all: (projectId: string) => ["tile-packages", projectId] as const,
};

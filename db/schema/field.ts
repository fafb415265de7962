import { sql } from "drizzle-orm";
import { check, index, integer, real, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import { user } from "./auth";
import { createdAt, id, updatedAt } from "./columns";
import { projects } from "./projects";
import { SAMPLE_TYPES, SAMPLE_STATUSES, LOCATION_SOURCES, ELEVATION_REFS, STRUCTURE_KINDS, STRUCTURE_FEATURES } from "../../lib/vocabulary";
export { SAMPLE_TYPES, type SampleType, SAMPLE_STATUSES, type SampleStatus, LOCATION_SOURCES, ELEVATION_REFS, STRUCTURE_KINDS, STRUCTURE_FEATURES } from "../../lib/vocabulary";





const inList = (values: readonly string[]) => sql.raw(values.map((v) => `'${v}'`).join(","));

export const stations = sqliteTable(
  "stations",
  {
    id: id(),
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    code: text("code").notNull(),
    name: text("name"),
    lat: real("lat").notNull(),
    lon: real("lon").notNull(),
    elevationM: real("elevation_m"),
    elevationRef: text("elevation_ref", { enum: ELEVATION_REFS }),
    horizontalAccuracyM: real("horizontal_accuracy_m"),
    locationSource: text("location_source", { enum: LOCATION_SOURCES }),
    /** Instant of the position fix, ISO 8601 UTC (GNSS or browser geolocation timestamp). */
    locationFixedAt: text("location_fixed_at"),
    description: text("description"),
    lithology: text("lithology"),
    observedAt: text("observed_at"),
    createdBy: text("created_by").references(() => user.id, { onDelete: "set null" }),
    version: integer("version").notNull().default(1),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex("stations_project_code_uq").on(t.projectId, t.code),
    index("stations_project_latlon_idx").on(t.projectId, t.lat, t.lon),
    check("stations_lat_ck", sql`${t.lat} BETWEEN -90 AND 90`),
    check("stations_lon_ck", sql`${t.lon} BETWEEN -180 AND 180`),
    check("stations_acc_ck", sql`${t.horizontalAccuracyM} IS NULL OR ${t.horizontalAccuracyM} >= 0`),
  ],
);


/**
 * A structural measurement at a station. Planes are stored as dip direction/dip (strike by the
 * right-hand rule is derived); lines as trend/plunge. `convention` records how it was entered.
 */
export const structures = sqliteTable(
  "structures",
  {
    id: id(),
    stationId: text("station_id")
      .notNull()
      .references(() => stations.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: STRUCTURE_KINDS }).notNull(),
    feature: text("feature", { enum: STRUCTURE_FEATURES }).notNull(),
    dipDirection: real("dip_direction"),
    dip: real("dip"),
    trend: real("trend"),
    plunge: real("plunge"),
    convention: text("convention", { enum: ["rhr", "dip_dipdir", "trend_plunge", "rake"] }).notNull(),
    /** Rake (pitch) in degrees from the plane's RHR strike, when a lineation was measured as a rake. */
    rake: real("rake"),
    /** The plane a lineation was measured on (the lineation must lie in it). */
    planeId: text("plane_id"),
    /** Fabric generation, e.g. S0, S1, L2. */
    generation: text("generation"),
    overturned: integer("overturned", { mode: "boolean" }).notNull().default(false),
    quality: text("quality", { enum: ["good", "fair", "poor"] }),
    /** Azimuth as read on the compass (dip direction, strike or trend), before any declination. */
    rawAzimuth: real("raw_azimuth"),
    /** Magnetic declination, degrees, east positive; true = magnetic + declination. */
    declinationDeg: real("declination_deg"),
    /** Whether the stored azimuths have the declination applied (true north). */
    declinationApplied: integer("declination_applied", { mode: "boolean" }).notNull().default(false),
    note: text("note"),
    createdBy: text("created_by").references(() => user.id, { onDelete: "set null" }),
    /** Optimistic concurrency for edits (a stale version gets 409). */
    version: integer("version").notNull().default(1),
    createdAt: createdAt(),
  },
  (t) => [
    index("structures_station_idx").on(t.stationId),
    check(
      "structures_planar_ck",
      sql`${t.kind} <> 'planar' OR (${t.dipDirection} >= 0 AND ${t.dipDirection} < 360 AND ${t.dip} BETWEEN 0 AND 90)`,
    ),
    check(
      "structures_linear_ck",
      sql`${t.kind} <> 'linear' OR (${t.trend} >= 0 AND ${t.trend} < 360 AND ${t.plunge} BETWEEN 0 AND 90)`,
    ),
  ],
);

export const samples = sqliteTable(
  "samples",
  {
    id: id(),
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    code: text("code").notNull(),
    igsn: text("igsn"),
    parentId: text("parent_id"),
    stationId: text("station_id").references(() => stations.id, { onDelete: "set null" }),
    sampleType: text("sample_type", { enum: SAMPLE_TYPES }).notNull(),
    lithology: text("lithology"),
    alteration: text("alteration"),
    alterationIntensity: text("alteration_intensity", {
      enum: ["none", "weak", "moderate", "strong", "intense"],
    }),
    description: text("description"),
    /** Instant of collection, ISO 8601 UTC. */
    collectedAt: text("collected_at"),
    /** IANA zone of the collection site, e.g. "America/Argentina/Catamarca". */
    collectedTz: text("collected_tz"),
    collectorName: text("collector_name"),
    collectorId: text("collector_id").references(() => user.id, { onDelete: "set null" }),
    lat: real("lat"),
    lon: real("lon"),
    elevationM: real("elevation_m"),
    /** What the elevation is measured from: mean sea level (maps) or the WGS84 ellipsoid (raw GNSS). */
    elevationRef: text("elevation_ref", { enum: ELEVATION_REFS }),
    horizontalAccuracyM: real("horizontal_accuracy_m"),
    locationSource: text("location_source", { enum: LOCATION_SOURCES }),
    /** Instant of the position fix, ISO 8601 UTC. */
    locationFixedAt: text("location_fixed_at"),
    /** Fields that depend on the sample type (hole ID and depths for core, horizon for soil, …); see lib/validation/sample-details.ts. */
    typeDetails: text("type_details", { mode: "json" }).$type<Record<string, unknown>>(),
    storageLocation: text("storage_location"),
    status: text("status", { enum: SAMPLE_STATUSES }).notNull().default("collected"),
    suspectedAsbestos: integer("suspected_asbestos", { mode: "boolean" }).notNull().default(false),
    weightKg: real("weight_kg"),
    /** Optimistic concurrency: every update must name the version it read. */
    version: integer("version").notNull().default(1),
    createdBy: text("created_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex("samples_project_code_uq").on(t.projectId, t.code),
    uniqueIndex("samples_igsn_uq").on(t.igsn),
    index("samples_project_station_idx").on(t.projectId, t.stationId),
    index("samples_project_status_idx").on(t.projectId, t.status),
    index("samples_project_collected_idx").on(t.projectId, t.collectedAt),
    index("samples_project_latlon_idx").on(t.projectId, t.lat, t.lon),
    index("samples_parent_idx").on(t.parentId),
    check("samples_lat_ck", sql`${t.lat} IS NULL OR ${t.lat} BETWEEN -90 AND 90`),
    check("samples_lon_ck", sql`${t.lon} IS NULL OR ${t.lon} BETWEEN -180 AND 180`),
    check("samples_type_ck", sql`${t.sampleType} IN (${inList(SAMPLE_TYPES)})`),
    check("samples_status_ck", sql`${t.status} IN (${inList(SAMPLE_STATUSES)})`),
    check("samples_version_ck", sql`${t.version} >= 1`),
  ],
);

export const photos = sqliteTable(
  "photos",
  {
    id: id(),
    projectId: text("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    sampleId: text("sample_id").references(() => samples.id, { onDelete: "cascade" }),
    stationId: text("station_id").references(() => stations.id, { onDelete: "cascade" }),
    storageKey: text("storage_key").notNull(),
    thumbKey: text("thumb_key"),
    displayKey: text("display_key"),
    originalName: text("original_name").notNull(),
    mime: text("mime").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    sha256: text("sha256").notNull(),
    width: integer("width"),
    height: integer("height"),
    takenAt: text("taken_at"),
    /** EXIF DateTimeOriginal as local wall time (no zone), and its OffsetTimeOriginal when present. */
    takenLocal: text("taken_local"),
    takenOffset: text("taken_offset"),
    gpsLat: real("gps_lat"),
    gpsLon: real("gps_lon"),
    gpsAltitudeM: real("gps_altitude_m"),
    gpsHErrorM: real("gps_h_error_m"),
    imgDirection: real("img_direction"),
    /** T (true north) or M (magnetic north) */
    imgDirectionRef: text("img_direction_ref"),
    orientation: integer("orientation"),
    caption: text("caption"),
    uploadedBy: text("uploaded_by").references(() => user.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [
    index("photos_sample_idx").on(t.sampleId),
    index("photos_station_idx").on(t.stationId),
    index("photos_project_idx").on(t.projectId),
    check("photos_owner_ck", sql`${t.sampleId} IS NOT NULL OR ${t.stationId} IS NOT NULL`),
  ],
);

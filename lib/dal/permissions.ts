import type { ProjectRole } from "@/lib/vocabulary";

/**
 * Who may do what in a project: the single source of truth. DEVELOPERS.md's role matrix and the
 * role-matrix integration test are generated from / checked against this table. Site admins may do everything.
 */
export const PERMISSIONS = {
  "project.read": { roles: ["lead", "field_geologist", "lab_analyst", "consultant"], description: "see the project, its stations, samples and results" },
  "project.manage": { roles: ["lead"], description: "edit project settings, invite and remove members" },
  "station.write": { roles: ["lead", "field_geologist"], description: "create, edit and move stations; add structural measurements" },
  "sample.write": { roles: ["lead", "field_geologist"], description: "create, edit and import samples; upload photos" },
  "submission.write": { roles: ["lead", "field_geologist"], description: "create and send lab submissions" },
  "custody.write": { roles: ["lead", "field_geologist", "lab_analyst"], description: "record field hand-overs (collector → camp or core shed → courier)" },
  "lab.intake": { roles: ["lead", "lab_analyst"], description: "record lab intake and lab handling steps (receive, prepare, scan, store, return, discard); the sender does not confirm its own receipt" },
  "scan.write": { roles: ["lab_analyst"], description: "upload and process scans" },
  "phase.review": { roles: ["lab_analyst"], description: "accept or reject candidates and sign off scans" },
  "reference.import": { roles: ["lab_analyst"], description: "import reference structures (CIF) into the library" },
  "tiles.manage": { roles: ["lead", "field_geologist"], description: "upload and delete map layers (MBTiles tile packages)" },
  "export.read": { roles: ["lead", "field_geologist", "lab_analyst", "consultant"], description: "export registers and reports" },
  "share.manage": { roles: ["lead"], description: "create and revoke read-only share links" },
  "audit.read": { roles: ["lead", "consultant"], description: "read the project's audit log" },
} as const satisfies Record<string, { roles: readonly ProjectRole[]; description: string }>;

export type Permission = keyof typeof PERMISSIONS;

export function roleAllows(role: ProjectRole, permission: Permission): boolean {
  return (PERMISSIONS[permission].roles as readonly ProjectRole[]).includes(role);
}

export const ROLE_LABELS: Record<ProjectRole, string> = {
  lead: "Project lead",
  field_geologist: "Field geologist",
  lab_analyst: "Lab analyst",
  consultant: "Consultant (read-only)",
};

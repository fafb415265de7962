import { roleAllows } from "@/lib/dal/permissions";
import type { ProjectRole } from "@/lib/vocabulary";

/** The project's tabs, in order. Add a section here when a feature adds a page. */
export function projectSections(projectId: string, role: ProjectRole): { href: string; label: string }[] {
  const base = `/projects/${projectId}`;
  const items = [
    { href: base, label: "Overview" },
    { href: `${base}/samples`, label: "Samples" },
    { href: `${base}/stations`, label: "Stations" },
    { href: `${base}/submissions`, label: "Submissions" },
    { href: `${base}/scans`, label: "Scans" },
    { href: `${base}/map`, label: "Map" },
    { href: `${base}/phase-map`, label: "Phase map" },
    { href: `${base}/members`, label: "Team" },
  ];
  if (roleAllows(role, "sample.write") || roleAllows(role, "station.write")) items.push({ href: `${base}/sync`, label: "Sync" });
  if (roleAllows(role, "audit.read")) items.push({ href: `${base}/audit`, label: "Audit log" });
  if (roleAllows(role, "project.manage")) items.push({ href: `${base}/settings`, label: "Settings" });
  items.push({ href: "/library", label: "Reference library" });
  return items;
}

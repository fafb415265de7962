import type { ProjectRole } from "@/lib/vocabulary";

/** The project's tabs, in order. Add a section here when a feature adds a page. */
export function projectSections(projectId: string, role: ProjectRole): { href: string; label: string }[] {
  const base = `/projects/${projectId}`;
  void role;
  return [
    { href: base, label: "Overview" },
    { href: `${base}/samples`, label: "Samples" },
    { href: `${base}/stations`, label: "Stations" },
    { href: `${base}/submissions`, label: "Submissions" },
    { href: `${base}/scans`, label: "Scans" },
    { href: `${base}/map`, label: "Map" },
    { href: `${base}/phase-map`, label: "Phase map" },
    { href: `${base}/members`, label: "Team" },
    { href: "/library", label: "Reference library" },
  ];
}

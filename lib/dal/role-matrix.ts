import { PROJECT_ROLES } from "@/lib/vocabulary";
import { PERMISSIONS, ROLE_LABELS, roleAllows, type Permission } from "./permissions";

/** The role matrix as a Markdown table, generated from PERMISSIONS (DEVELOPERS.md embeds it; a test keeps them equal). */
export function roleMatrixMarkdown(): string {
  const head = `| permission | what it allows | ${PROJECT_ROLES.map((r) => ROLE_LABELS[r]).join(" | ")} | Site admin |`;
  const sep = `|${" --- |".repeat(PROJECT_ROLES.length + 3)}`;
  const rows = (Object.keys(PERMISSIONS) as Permission[]).map(
    (p) => `| \`${p}\` | ${PERMISSIONS[p].description} | ${PROJECT_ROLES.map((r) => (roleAllows(r, p) ? "yes" : "—")).join(" | ")} | yes |`,
  );
  return [head, sep, ...rows].join("\n");
}

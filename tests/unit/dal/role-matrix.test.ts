import { readFileSync } from "node:fs";
import { expect, test } from "vitest";
import { roleMatrixMarkdown } from "@/lib/dal/role-matrix";

test("DEVELOPERS.md carries the role matrix generated from lib/dal/permissions.ts", () => {
  const doc = readFileSync("DEVELOPERS.md", "utf8");
  const table = doc.split("<!-- role-matrix:start -->\n")[1]?.split("\n<!-- role-matrix:end -->")[0];
  expect(table).toBe(roleMatrixMarkdown());
});

// Prints the role matrix table for DEVELOPERS.md: npx tsx scripts/role-matrix.ts
import { roleMatrixMarkdown } from "@/lib/dal/role-matrix";

console.log(roleMatrixMarkdown());

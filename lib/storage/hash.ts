import { createHash } from "node:crypto";

/** Lower-case hex SHA-256 of a buffer. */
export function sha256Hex(data: Uint8Array): string {
  return createHash("sha256").update(data).digest("hex");
}

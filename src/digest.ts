import { createHash } from "node:crypto";

/** Hex SHA-256 of a text (as UTF-8) or of bytes: the digest of every file and table in a study record. */
export function sha256(text: string | Buffer): string {
  return createHash("sha256").update(text).digest("hex");
}

import { fileURLToPath } from "node:url";

/** The reference data the tests check against, kept inside the repository (`test/reference/README.md` names their sources). */
export const REFERENCE_DIR = fileURLToPath(new URL("../reference/", import.meta.url));

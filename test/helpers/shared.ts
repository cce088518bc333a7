import { fileURLToPath } from "node:url";

/** The project's shared folder beside the repository (`../shared`), where the reference data live. */
export const SHARED_DIR = fileURLToPath(new URL("../../../shared/", import.meta.url));
export const REFERENCE_DIR = SHARED_DIR + "reference/";

import type { ColumnMap } from "../manifest/types.js";

/** The contract's column names (section 1): what `sojourn init` reads and what its manifest assumes. */
export const DEFAULT_COLUMNS: ColumnMap = { time: "time", series: "series", value: "value", entity: "entity" };

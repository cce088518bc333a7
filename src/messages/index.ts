/**
 * The catalogue of user-facing messages. Each phase keeps its messages in a file of its own;
 * tests compare against these functions, never against copied strings.
 */
export { UserError, located, formatPlace, type Place } from "./error.js";
export * as manifestMessages from "./manifest.js";
export * as ingestMessages from "./ingest.js";
export * as reportMessages from "./report.js";
export * as initMessages from "./init.js";

/**
 * The catalogue of user-facing messages. Each phase keeps its messages in a file of its own;
 * tests compare against these functions, never against copied strings.
 */
export { UserError, located, formatPlace, type Place } from "./error.js";

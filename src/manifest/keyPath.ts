/**
 * Key paths inside a manifest: the list form used to find a node (`["scenarios", 1, "runs"]`)
 * and the text form shown to users (`scenarios[1].runs`). List indexes count from 0.
 */

export type KeyPath = readonly (string | number)[];

const BARE_KEY = /^[A-Za-z0-9_-]+$/;

/** `["scenarios", 1, "runs"]` -> `scenarios[1].runs`; keys with other characters are quoted. */
export function formatKeyPath(path: KeyPath): string {
  let s = "";
  for (const key of path) {
    if (typeof key === "number") s += `[${key}]`;
    else if (BARE_KEY.test(key)) s += s === "" ? key : `.${key}`;
    else s += `[${JSON.stringify(key)}]`;
  }
  return s;
}

/**
 * A JSON Pointer (RFC 6901, as ajv reports `instancePath`) as a key path. A segment is taken as a
 * list index when the value it indexes is an array.
 */
export function pointerToKeyPath(pointer: string, data: unknown): (string | number)[] {
  if (pointer === "") return [];
  const path: (string | number)[] = [];
  let node: unknown = data;
  for (const raw of pointer.slice(1).split("/")) {
    const key = raw.replace(/~1/g, "/").replace(/~0/g, "~");
    if (Array.isArray(node)) {
      const index = Number(key);
      path.push(index);
      node = node[index];
    } else {
      path.push(key);
      node = node !== null && typeof node === "object" ? (node as Record<string, unknown>)[key] : undefined;
    }
  }
  return path;
}

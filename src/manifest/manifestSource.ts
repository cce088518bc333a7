/**
 * The manifest text parsed with its source positions, so that any key path can be pointed at by
 * line and column in a message.
 */
import { LineCounter, isAlias, isMap, isNode, isPair, isScalar, isSeq, parseDocument, type Document, type Node } from "yaml";
import { manifestMessages } from "../messages/index.js";
import type { Place } from "../messages/index.js";
import { formatKeyPath, type KeyPath } from "./keyPath.js";

export interface ManifestSource {
  /** The manifest path as the user gave it, for messages. */
  file: string;
  /** The parsed value (plain objects, arrays, strings, numbers, booleans, null). */
  data: unknown;
  /** Where the node at `path` is; with `key`, where its key is written (for a mapping entry). */
  place(path: KeyPath, options?: { key?: boolean }): Place;
  /** The source line of the node at `path`. */
  lineOf(path: KeyPath): number | undefined;
  /** True when the node at `path` is a scalar the user wrote without quotes. */
  isPlainScalar(path: KeyPath): boolean;
}

/**
 * Parses YAML (JSON is YAML) keeping positions. Syntax errors and duplicate keys stop here with a
 * message naming the file, line and column.
 */
export function parseManifest(text: string, file: string): ManifestSource {
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, { lineCounter, prettyErrors: false, uniqueKeys: true });
  const error = doc.errors[0];
  if (error !== undefined) {
    const { line, col } = lineCounter.linePos(error.pos[0]);
    const place = { file, line, column: col };
    if (error.code === "DUPLICATE_KEY") throw manifestMessages.duplicateKey(place, keyTextAt(doc, error.pos[0]));
    throw manifestMessages.yamlSyntax(place, error.code, error.message);
  }
  const data: unknown = doc.toJS({ maxAliasCount: 1000 });

  function find(path: KeyPath, wantKey: boolean): { node: Node | null; found: boolean } {
    let node: unknown = doc.contents;
    let keyNode: unknown = null;
    for (const segment of path) {
      if (isAlias(node)) node = node.resolve(doc);
      keyNode = null;
      if (isMap(node)) {
        const pair = node.items.find((p) => isPair(p) && keyOf(p.key) === String(segment));
        if (pair === undefined) return { node: node as Node, found: false };
        keyNode = pair.key;
        node = pair.value ?? pair.key;
      } else if (isSeq(node) && typeof segment === "number" && segment < node.items.length) {
        node = node.items[segment];
      } else {
        return { node: isNode(node) ? node : null, found: false };
      }
    }
    const target = wantKey && isNode(keyNode) ? keyNode : node;
    return { node: isNode(target) ? target : null, found: true };
  }

  function lineCol(path: KeyPath, wantKey: boolean): { line: number; column: number } {
    let { node } = find(path, wantKey);
    if (node === null || node.range == null) node = isNode(doc.contents) ? doc.contents : null;
    const offset = node?.range?.[0] ?? 0;
    const { line, col } = lineCounter.linePos(offset);
    return { line, column: col };
  }

  return {
    file,
    data,
    place(path, options = {}) {
      return { file, ...lineCol(path, options.key === true), path: formatKeyPath(path) };
    },
    lineOf(path) {
      return lineCol(path, false).line;
    },
    isPlainScalar(path) {
      const { node, found } = find(path, false);
      return found && isScalar(node) && node.type === "PLAIN";
    },
  };
}

function keyOf(key: unknown): string | null {
  if (isScalar(key)) return String(key.value);
  return null;
}

/** The text of the mapping key that starts at `offset`, for the duplicate-key message. */
function keyTextAt(doc: Document, offset: number): string {
  let text = "";
  const visit = (node: unknown): void => {
    if (text !== "") return;
    if (isMap(node)) {
      for (const pair of node.items) {
        if (isScalar(pair.key) && pair.key.range?.[0] === offset) text = String(pair.key.value);
        visit(pair.value);
      }
    } else if (isSeq(node)) node.items.forEach(visit);
  };
  visit(doc.contents);
  return text;
}

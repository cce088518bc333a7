/**
 * The manifest text parsed with its source positions, so that any key path can be pointed at by
 * line and column in a message.
 */
import type { CST, Document, Node } from "yaml";
import { manifestMessages } from "../messages/index.js";
import type { Place } from "../messages/index.js";
import { formatKeyPath, type KeyPath } from "./keyPath.js";
import { yaml } from "./libraries.js";

const { Composer, LineCounter, Parser, YAMLParseError, isAlias, isMap, isNode, isPair, isScalar, isSeq } = yaml;
type LineCounter = InstanceType<typeof LineCounter>;

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
  /** How many values (mappings, lists, keys, scalars) the data holds, each alias written out. */
  size: number;
}

/**
 * Parses YAML (JSON is YAML) keeping positions. Syntax errors and duplicate keys stop here with a
 * message naming the file, line and column.
 */
export function parseManifest(text: string, file: string): ManifestSource {
  const lineCounter = new LineCounter();
  // Parsed once into tokens (no recursion), checked for depth, then built into the document.
  const tokens = [...new Parser(lineCounter.addNewLine).parse(text)];
  checkNesting(tokens, lineCounter, file);
  checkVersion(tokens, lineCounter, file);
  const doc = compose(tokens, text);
  const error = doc.errors[0];
  if (error !== undefined) {
    const { line, col } = lineCounter.linePos(error.pos[0]);
    const place = { file, line, column: col };
    throw manifestMessages.yamlSyntax(place, error.code, error.message);
  }
  // yaml warns of a tag it cannot resolve (`!foo x`, `!!float 1`) and keeps the text: an error here.
  const warning = doc.warnings.find((w) => w.code === "TAG_RESOLVE_FAILED");
  if (warning !== undefined) {
    const { line, col } = lineCounter.linePos(warning.pos[0]);
    const tag = /Unresolved tag: (\S+)/.exec(warning.message)?.[1] ?? "";
    throw manifestMessages.tagNotAllowed({ file, line, column: col }, shortTag(tag));
  }
  const size = checkNodes(doc, (node, path) => {
    const { line, col } = lineCounter.linePos(node.range?.[0] ?? 0);
    return { file, line, column: col, path: formatKeyPath(path) };
  });
  // checkNodes has bounded what the aliases expand to, and toJS shares one value per anchor.
  const data: unknown = doc.toJS({ maxAliasCount: -1 });

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
    size,
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

/** Limits on the shape of a manifest, so that no text makes reading it hang or run out of memory. */
export const MANIFEST_LIMITS = {
  /** Mappings and lists inside each other. */
  depth: 64,
  /** Values (each mapping, list, key and scalar) once every alias is written out. */
  values: 1_000_000,
  /** Anchors and aliases together (yaml resolves each alias by a walk over all of them). */
  anchors: 1000,
};

/**
 * The manifest file's bytes as text. UTF-8 only: a byte-order mark of UTF-16 or UTF-32, or a
 * byte that is not part of a UTF-8 character, stops here with its line, column and byte offset.
 * A UTF-8 byte-order mark is kept (the record keeps the text exactly as read).
 */
export function decodeManifest(bytes: Uint8Array, file: string): string {
  const wide = wideEncoding(bytes);
  if (wide !== null) throw manifestMessages.manifestWideEncoding(file, wide);
  const bad = firstInvalidUtf8(bytes);
  if (bad >= 0) {
    let lineStart = 0;
    let line = 1;
    for (let i = 0; i < bad; i++) {
      if (bytes[i] === 0x0a) {
        line++;
        lineStart = i + 1;
      }
    }
    const column = [...new TextDecoder("utf-8", { ignoreBOM: true }).decode(bytes.subarray(lineStart, bad))].length + 1;
    throw manifestMessages.manifestNotUtf8({ file, line, column }, bytes[bad], bad);
  }
  return new TextDecoder("utf-8", { ignoreBOM: true }).decode(bytes);
}

function wideEncoding(b: Uint8Array): string | null {
  if (b[0] === 0x00 && b[1] === 0x00 && b[2] === 0xfe && b[3] === 0xff) return "UTF-32";
  if (b[0] === 0xff && b[1] === 0xfe && b[2] === 0x00 && b[3] === 0x00) return "UTF-32";
  if (b[0] === 0xff && b[1] === 0xfe) return "UTF-16";
  if (b[0] === 0xfe && b[1] === 0xff) return "UTF-16";
  return null;
}

/**
 * The offset of the first byte that is not part of a well-formed UTF-8 character (RFC 3629:
 * no overlong forms, no surrogates U+D800–U+DFFF, nothing above U+10FFFF), or -1.
 */
export function firstInvalidUtf8(b: Uint8Array): number {
  let i = 0;
  while (i < b.length) {
    const c = b[i];
    if (c < 0x80) {
      i++;
      continue;
    }
    let need: number;
    let lo = 0x80;
    let hi = 0xbf;
    if (c >= 0xc2 && c <= 0xdf) need = 1;
    else if (c >= 0xe0 && c <= 0xef) {
      need = 2;
      if (c === 0xe0) lo = 0xa0;
      if (c === 0xed) hi = 0x9f;
    } else if (c >= 0xf0 && c <= 0xf4) {
      need = 3;
      if (c === 0xf0) lo = 0x90;
      if (c === 0xf4) hi = 0x8f;
    } else return i;
    for (let k = 1; k <= need; k++) {
      const d = b[i + k];
      // the second byte has the narrower range; the later ones 0x80-0xBF
      if (d === undefined || d < (k === 1 ? lo : 0x80) || d > (k === 1 ? hi : 0xbf)) return i;
    }
    i += need + 1;
  }
  return -1;
}

/**
 * The tokens as one document, as yaml's parseDocument builds it (a second document is an
 * error of the first).
 */
function compose(tokens: CST.Token[], text: string): Document {
  let doc: Document | null = null;
  // Keys are checked for duplicates in checkNodes, in linear time (yaml's own check compares
  // each key with every earlier one: 20000 keys took 20 s).
  for (const next of new Composer({ uniqueKeys: false }).compose(tokens, true, text.length)) {
    if (doc === null) doc = next as Document;
    else {
      doc.errors.push(new YAMLParseError([next.range[0], next.range[1]], "MULTIPLE_DOCS", "Source contains multiple documents"));
      break;
    }
  }
  return doc!;
}

/** A `%YAML 1.1` directive would read `010` as 8 and `n` as false: YAML 1.2 only. */
function checkVersion(tokens: CST.Token[], lines: LineCounter, file: string): void {
  for (const t of tokens) {
    if (t.type !== "directive") continue;
    const version = /^%YAML[ \t]+(\S+)/.exec(t.source)?.[1];
    if (version !== undefined && version !== "1.2") {
      const { line, col } = lines.linePos(t.offset);
      throw manifestMessages.yamlVersion({ file, line, column: col }, version);
    }
  }
}

/**
 * Nesting deeper than `MANIFEST_LIMITS.depth` stops before the document is built (building it
 * recurses once per level). The token tree of yaml's parser is walked with a list, not recursion.
 */
function checkNesting(tokens: CST.Token[], lines: LineCounter, file: string): void {
  for (const token of tokens) {
    const stack: [CST.Token, number][] = [[token, 0]];
    while (stack.length > 0) {
      const [t, depth] = stack.pop()!;
      if (t.type === "document") {
        if (t.value !== undefined) stack.push([t.value, depth]);
        continue;
      }
      if (t.type !== "block-map" && t.type !== "block-seq" && t.type !== "flow-collection") continue;
      if (depth + 1 > MANIFEST_LIMITS.depth) {
        const { line, col } = lines.linePos(t.offset);
        throw manifestMessages.manifestTooDeep({ file, line, column: col }, MANIFEST_LIMITS.depth);
      }
      // pushed last first, so that the first collection too deep in the text is the one named
      for (let k = t.items.length - 1; k >= 0; k--) {
        const item = t.items[k];
        if (item.value) stack.push([item.value, depth + 1]);
        if (item.key) stack.push([item.key, depth + 1]);
      }
    }
  }
}

/** The explicit tags that give what JSON has: texts, numbers, booleans, null, lists, mappings. */
const PLAIN_TAGS = new Set(["str", "int", "float", "bool", "null", "map", "seq"].map((t) => `tag:yaml.org,2002:${t}`));

/** `tag:yaml.org,2002:binary` as it is written, `!!binary`. */
function shortTag(tag: string): string {
  return tag.startsWith("tag:yaml.org,2002:") ? `!!${tag.slice("tag:yaml.org,2002:".length)}` : tag;
}

/**
 * What toJS cannot be trusted with: keys that are not texts, aliases with no anchor before them
 * or inside their own anchor's value, and aliases that multiply (a "billion laughs" document of
 * a few lines expands to 10⁹ values). Walks the document in text order as the YAML rules resolve
 * aliases (the latest anchor of that name before the alias), counting each anchor's values once.
 */
function checkNodes(doc: Document, placeOf: (node: Node, path: KeyPath) => Place): number {
  const anchors = new Map<string, Node>();
  const sizes = new Map<Node, number>();
  const limit = MANIFEST_LIMITS.values;
  // The key path as a chain from the node up (one small object per node), made a list for a message only.
  type Link = { up: Link; key: string | number } | null;
  const at = (node: Node, link: Link): Place => {
    const path: (string | number)[] = [];
    for (let l = link; l !== null; l = l.up) path.push(l.key);
    return placeOf(node, path.reverse());
  };
  // The values so far, in text order, each alias counted as the values of its anchor.
  let total = 0;
  let marks = 0;
  const mark = (node: Node, link: Link) => {
    if (++marks > MANIFEST_LIMITS.anchors) throw manifestMessages.tooManyAnchors(at(node, link), MANIFEST_LIMITS.anchors);
  };
  const walk = (node: unknown, link: Link): void => {
    if (!isNode(node)) return;
    if (isAlias(node)) {
      mark(node, link);
      const target = anchors.get(node.source);
      if (target === undefined) throw manifestMessages.aliasWithoutAnchor(at(node, link), node.source);
      const size = sizes.get(target);
      if (size === undefined) throw manifestMessages.aliasInsideItself(at(node, link), node.source);
      total += size;
      if (total > limit) throw manifestMessages.manifestTooLarge(at(node, link), limit);
      return;
    }
    const before = total;
    total += 1;
    if (total > limit) throw manifestMessages.manifestTooLarge(at(node, link), limit);
    if (node.tag !== undefined && !PLAIN_TAGS.has(node.tag)) throw manifestMessages.tagNotAllowed(at(node, link), shortTag(node.tag));
    if (node.anchor !== undefined) {
      mark(node, link);
      anchors.set(node.anchor, node);
    }
    if (isMap(node)) {
      // Keys as the parsed data will hold them: `1` and `"1"` are one key there.
      const keys = new Set<string>();
      for (const pair of node.items) {
        const key = pair.key;
        if (key !== null && !isScalar(key)) {
          const found = isAlias(key) ? "an alias" : isSeq(key) ? "a list" : "a mapping";
          throw manifestMessages.keyNotText(at(key as Node, link), found);
        }
        const text = isScalar(key) ? String(key.value) : "";
        if (keys.has(text)) {
          const { line, column, file } = at(key ?? node, link);
          throw manifestMessages.duplicateKey({ file, line, column }, text);
        }
        keys.add(text);
        const keyLink = { up: link, key: text };
        walk(key, keyLink);
        walk(pair.value, keyLink);
      }
    } else if (isSeq(node)) {
      node.items.forEach((item, i) => walk(item, { up: link, key: i }));
    }
    if (node.anchor !== undefined) sizes.set(node, total - before);
  };
  walk(doc.contents, null);
  return total;
}

import { isMap, isPair, isScalar, isSeq, type Document, type LineCounter, type Node, type Pair } from 'yaml';

export type PathSegment = string | number;

export interface Position {
  line: number;
  column: number;
}

/** Finds where a path into the site sits in the YAML text. */
export type Locator = (segments: readonly PathSegment[], want?: 'value' | 'key') => Position;

/** `cts[0].ratedPrimaryA` for ['cts', 0, 'ratedPrimaryA']. */
export function formatPath(segments: readonly PathSegment[]): string {
  let out = '';
  for (const s of segments) {
    if (typeof s === 'number') out += `[${s}]`;
    else out += out === '' ? s : `.${s}`;
  }
  return out;
}

/** The reverse of formatPath; unknown shapes come back as one segment. */
export function parsePath(path: string): PathSegment[] {
  const out: PathSegment[] = [];
  for (const m of path.matchAll(/([^.[\]]+)|\[(\d+)\]/g)) {
    if (m[2] !== undefined) out.push(Number(m[2]));
    else out.push(m[1]);
  }
  return out;
}

interface Step {
  node: Node | null;
  /** The map pair that holds `node`, when it was reached through a key. */
  pair: Pair<unknown, unknown> | null;
}

function stepInto(node: Node | null, segment: PathSegment): Step | null {
  if (isMap(node)) {
    for (const item of node.items) {
      if (!isPair(item)) continue;
      const key = item.key;
      const keyValue = isScalar(key) ? key.value : key;
      if (keyValue === segment || String(keyValue) === String(segment)) {
        return { node: (item.value as Node | null) ?? null, pair: item as Pair<unknown, unknown> };
      }
    }
    return null;
  }
  if (isSeq(node) && typeof segment === 'number') {
    const item = node.items[segment] as Node | undefined;
    return item === undefined ? null : { node: item ?? null, pair: null };
  }
  return null;
}

export function createLocator(doc: Document, lineCounter: LineCounter): Locator {
  const at = (offset: number | undefined): Position => {
    if (offset === undefined) return { line: 1, column: 1 };
    const { line, col } = lineCounter.linePos(offset);
    return { line, column: col };
  };
  const rootOffset = (): number | undefined => (doc.contents as Node | null)?.range?.[0];

  return (segments, want = 'value') => {
    let current: Step = { node: (doc.contents as Node | null) ?? null, pair: null };
    for (const segment of segments) {
      const next = stepInto(current.node, segment);
      if (!next) break; // the path goes further than the file: point at the deepest part that exists
      current = next;
    }
    const keyNode = current.pair?.key as Node | undefined;
    const valueNode = current.node;
    if (want === 'key' && keyNode?.range) return at(keyNode.range[0]);
    // Collections written as blocks start on the line after their key: point at the key.
    if (valueNode && isScalar(valueNode) && valueNode.range) return at(valueNode.range[0]);
    if (keyNode?.range) return at(keyNode.range[0]);
    if (valueNode?.range) return at(valueNode.range[0]);
    return at(rootOffset());
  };
}

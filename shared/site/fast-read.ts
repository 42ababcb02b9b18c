// A fast first reading of a site file. The `yaml` package gives exact positions and careful
// errors but takes about a millisecond per file; js-yaml reads the same plain YAML ten times
// faster. So a file that uses only plain YAML (no anchors, aliases, tags, directives, tabs or
// explicit keys) is read by js-yaml, with the node positions kept through its `listener` hook.
// Anything else, and any file js-yaml refuses, goes to the careful reading in parse-site.ts,
// so the findings are the same either way (parse-site.test.ts compares the two).
import { load, CORE_SCHEMA, type State } from 'js-yaml';
import type { Locator, PathSegment, Position } from './locate.ts';

interface PositionNode {
  start: number;
  kind: 'mapping' | 'sequence' | 'scalar' | null;
  children: PositionNode[];
  result: unknown;
}

/** Characters and forms that js-yaml and the `yaml` package might read differently. */
const NOT_PLAIN = /[&*!\t]|^%|^\s*\?(?:\s|$)|\d_\d|^\s*(?:---|\.\.\.)\s*\S|[:,[{-]\s+[-+]?0[0-9bxo]/m;

export interface FastReading {
  data: unknown;
  /** Null when the positions could not be matched to the data: use the careful reading. */
  locate: Locator | null;
}

function skipToContent(text: string, at: number): number {
  let i = at;
  while (i < text.length) {
    const c = text.charCodeAt(i);
    if (c === 0x20 || c === 0x0a || c === 0x0d || c === 0x09) { i++; continue; }
    if (c === 0x23 /* # */ && (i === 0 || /\s/.test(text[i - 1]))) {
      while (i < text.length && text.charCodeAt(i) !== 0x0a) i++;
      continue;
    }
    break;
  }
  return i;
}

function lineStarts(text: string): number[] {
  const starts = [0];
  for (let i = text.indexOf('\n'); i !== -1; i = text.indexOf('\n', i + 1)) starts.push(i + 1);
  return starts;
}

/** Reads plain YAML quickly; null when the file is not plain or js-yaml refuses it. */
export function fastRead(text: string): FastReading | null {
  // Comments may say anything; only the YAML itself is looked at.
  if (NOT_PLAIN.test(text.replace(/(^|\s)#.*$/gm, '$1'))) return null;
  const stack: PositionNode[][] = [[]];
  let data: unknown;
  try {
    data = load(text, {
      schema: CORE_SCHEMA,
      json: false,
      listener(this: State, event: 'open' | 'close', state: State) {
        if (event === 'open') {
          stack.push([]);
          (stack[stack.length - 1] as PositionNode[] & { start?: number }).start = state.position;
        } else {
          const children = stack.pop() as PositionNode[] & { start?: number };
          const kind = (state as unknown as { kind: PositionNode['kind'] }).kind;
          // js-yaml tries a block mapping first, so a value can come back wrapped in a node of
          // its own (`- { id: a }`, `- 5`): keep the inner node, which is the value itself.
          if (children.length === 1 && Object.is(children[0].result, state.result)) stack[stack.length - 1].push(children[0]);
          else stack[stack.length - 1].push({ start: children.start ?? 0, kind, children, result: state.result });
        }
      },
    });
  } catch {
    return null;
  }
  const root = stack[0][0];
  if (!root) return { data, locate: null };

  let starts: number[] | null = null;
  const position = (offset: number): Position => {
    starts ??= lineStarts(text);
    let lo = 0;
    let hi = starts.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (starts[mid] <= offset) lo = mid; else hi = mid - 1;
    }
    return { line: lo + 1, column: offset - starts[lo] + 1 };
  };

  if (!consistent(root)) return { data, locate: null };
  const locate: Locator = (segments: readonly PathSegment[], want = 'value') => {
    let node: PositionNode = root;
    let key: PositionNode | null = null;
    for (const segment of segments) {
      let next: { node: PositionNode; key: PositionNode | null } | null = null;
      if (node.kind === 'mapping') {
        for (let i = 0; i < node.children.length; i += 2) {
          if (String(node.children[i].result) === String(segment)) { next = { node: node.children[i + 1], key: node.children[i] }; break; }
        }
      } else if (node.kind === 'sequence' && typeof segment === 'number') {
        const item = node.children[segment];
        if (item) next = { node: item, key: null };
      }
      if (!next) break; // the path goes further than the file: the deepest part that exists
      node = next.node;
      key = next.key;
    }
    const at = (n: PositionNode) => position(skipToContent(text, n.start));
    if (want === 'key' && key) return at(key);
    // Collections written as blocks start on the line after their key: point at the key.
    if (node.kind === 'scalar') return at(node);
    if (key) return at(key);
    return at(node);
  };
  return { data, locate };
}

/** Every mapping has a key and a value node per entry, every sequence a node per item. */
function consistent(node: PositionNode): boolean {
  const pending = [node];
  while (pending.length > 0) {
    const n = pending.pop() as PositionNode;
    if (n.kind === 'mapping') {
      if (n.result === null || typeof n.result !== 'object' || n.children.length !== 2 * Object.keys(n.result).length) return false;
    } else if (n.kind === 'sequence') {
      if (!Array.isArray(n.result) || n.children.length !== n.result.length) return false;
    } else {
      continue;
    }
    pending.push(...n.children);
  }
  return true;
}

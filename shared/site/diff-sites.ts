// Field-level, semantic difference of two site documents: what a reviewer needs to see.
// Lists whose entries carry an `id` (cts, generation) are matched by id, so a reordering
// is not reported as a change of every field.

export interface SiteChange {
  /** `export.limitKw`, `cts[ct-2].ratedPrimaryA` (an id in brackets), `gateway.bus.terminations[1]`. */
  path: string;
  kind: 'added' | 'removed' | 'changed';
  /** Absent (null) when added. */
  before: unknown;
  /** Absent (null) when removed. */
  after: unknown;
}

const isObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

function join(base: string, key: string): string {
  return base === '' ? key : `${base}.${key}`;
}

function idsOf(list: unknown[]): string[] | null {
  const ids: string[] = [];
  for (const item of list) {
    if (!isObject(item) || typeof item.id !== 'string') return null;
    ids.push(item.id);
  }
  return new Set(ids).size === ids.length ? ids : null;
}

function walk(before: unknown, after: unknown, path: string, out: SiteChange[]): void {
  if (Object.is(before, after)) return;
  if (isObject(before) && isObject(after)) {
    const keys = new Set([...Object.keys(before), ...Object.keys(after)]);
    for (const key of keys) {
      const inBefore = Object.prototype.hasOwnProperty.call(before, key);
      const inAfter = Object.prototype.hasOwnProperty.call(after, key);
      const p = join(path, key);
      if (inBefore && !inAfter) out.push({ path: p, kind: 'removed', before: before[key], after: null });
      else if (!inBefore && inAfter) out.push({ path: p, kind: 'added', before: null, after: after[key] });
      else walk(before[key], after[key], p, out);
    }
    return;
  }
  if (Array.isArray(before) && Array.isArray(after)) {
    const beforeIds = idsOf(before);
    const afterIds = idsOf(after);
    if (beforeIds && afterIds) {
      const byId = new Map(before.map((item, i) => [beforeIds[i], item]));
      for (let i = 0; i < after.length; i++) {
        const id = afterIds[i];
        const p = `${path}[${id}]`;
        if (byId.has(id)) walk(byId.get(id), after[i], p, out);
        else out.push({ path: p, kind: 'added', before: null, after: after[i] });
      }
      const kept = new Set(afterIds);
      before.forEach((item, i) => {
        if (!kept.has(beforeIds[i])) out.push({ path: `${path}[${beforeIds[i]}]`, kind: 'removed', before: item, after: null });
      });
      return;
    }
    const n = Math.max(before.length, after.length);
    for (let i = 0; i < n; i++) {
      const p = `${path}[${i}]`;
      if (i >= after.length) out.push({ path: p, kind: 'removed', before: before[i], after: null });
      else if (i >= before.length) out.push({ path: p, kind: 'added', before: null, after: after[i] });
      else walk(before[i], after[i], p, out);
    }
    return;
  }
  out.push({ path, kind: 'changed', before, after });
}

/** Every field that differs between two parsed site documents. `before` null: everything is added. */
export function diffSites(before: unknown, after: unknown): SiteChange[] {
  const out: SiteChange[] = [];
  walk(before ?? {}, after ?? {}, '', out);
  return out;
}

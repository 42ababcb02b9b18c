import { LineCounter, parseDocument, type Document, type YAMLError } from 'yaml';
import { createLocator, formatPath, type Locator, type PathSegment } from './locate.ts';
import type { Finding, Site } from './types.ts';
import { validateSite } from './site-validator.generated.js';
import { fastRead } from './fast-read.ts';

/** Site files are a few kilobytes; anything this big is not one. */
export const MAX_SITE_TEXT_CHARS = 1_000_000;
/** Aliases in a site file are rare; a few hundred is already an alias bomb (yaml's own guard). */
const MAX_ALIAS_COUNT = 100;
const MAX_SCHEMA_FINDINGS = 100;

export interface ParsedSite {
  /** The document as plain data, or null when the YAML could not be read. */
  data: unknown;
  /** The site, when the data passed the schema. */
  site: Site | null;
  /** YAML and schema findings, in file order. */
  findings: Finding[];
  /** Finds a path's line and column in the text. */
  locate: Locator;
}

interface AjvError {
  instancePath: string;
  keyword: string;
  params: Record<string, unknown>;
  message?: string;
  parentSchema?: { properties?: Record<string, unknown>; description?: string };
  schema?: unknown;
}

/** yaml's messages, with the stack overflow of absurd nesting said in words. */
function readable(message: string): string {
  if (/call stack/i.test(message)) return 'the YAML is nested too deeply to read';
  return message.split('\n')[0];
}

const noLocation: Locator = () => ({ line: 1, column: 1 });

function yamlFinding(error: YAMLError, lineCounter: LineCounter, severity: Finding['severity']): Finding {
  const { line, col } = lineCounter.linePos(error.pos[0]);
  const message = error.code === 'DUPLICATE_KEY'
    ? 'duplicate key: each key may appear only once in a mapping'
    : readable(error.message);
  return { ruleId: 'yaml-syntax', severity, message, path: '', line, column: col };
}

function segmentsOf(instancePath: string, data: unknown): PathSegment[] {
  if (instancePath === '') return [];
  const out: PathSegment[] = [];
  let cursor: unknown = data;
  for (const raw of instancePath.slice(1).split('/')) {
    const part = raw.replace(/~1/g, '/').replace(/~0/g, '~');
    if (Array.isArray(cursor) && /^\d+$/.test(part)) {
      out.push(Number(part));
      cursor = cursor[Number(part)];
    } else {
      out.push(part);
      cursor = cursor && typeof cursor === 'object' ? (cursor as Record<string, unknown>)[part] : undefined;
    }
  }
  return out;
}

function editDistance(a: string, b: string): number {
  const row = Array.from({ length: b.length + 1 }, (_, i) => i);
  for (let i = 1; i <= a.length; i++) {
    let diagonal = row[0];
    row[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const above = row[j];
      row[j] = Math.min(row[j] + 1, row[j - 1] + 1, diagonal + (a[i - 1].toLowerCase() === b[j - 1].toLowerCase() ? 0 : 1));
      diagonal = above;
    }
  }
  return row[b.length];
}

function closest(word: string, candidates: string[]): string | undefined {
  let best: string | undefined;
  let bestDistance = Infinity;
  for (const c of candidates) {
    const d = editDistance(word, c);
    if (d < bestDistance) { best = c; bestDistance = d; }
  }
  return bestDistance <= Math.max(2, Math.floor(word.length / 3)) ? best : undefined;
}

function valueAt(data: unknown, at: PathSegment[]): unknown {
  let cursor = data;
  for (const s of at) cursor = cursor && typeof cursor === 'object' ? (cursor as Record<string, unknown>)[s as string] : undefined;
  return cursor;
}

const show = (v: unknown) => (typeof v === 'string' ? v : JSON.stringify(v));

function schemaFinding(error: AjvError, data: unknown, locate: Locator): Finding | null {
  const at = segmentsOf(error.instancePath, data);
  const base = { ruleId: 'schema', severity: 'error' as const };
  switch (error.keyword) {
    case 'if':
      return null; // the failing `then` reports the real problem
    case 'required': {
      const key = String(error.params.missingProperty);
      const where = at.length ? formatPath(at) : 'the top level';
      return { ...base, message: `missing required key \`${key}\` in ${where}`, path: formatPath([...at, key]), ...locate(at, 'key') };
    }
    case 'additionalProperties': {
      const key = String(error.params.additionalProperty);
      const allowed = Object.keys(error.parentSchema?.properties ?? {});
      const suggestion = closest(key, allowed);
      return {
        ...base,
        message: `unknown key \`${key}\`${at.length ? ` in ${formatPath(at)}` : ''}`,
        path: formatPath([...at, key]),
        ...locate([...at, key], 'key'),
        hint: suggestion ? `did you mean \`${suggestion}\`?` : `allowed keys: ${allowed.join(', ')}`,
      };
    }
    case 'enum': {
      const values = error.params.allowedValues as unknown[];
      const allowed = values.map(show).join(', ');
      const given = valueAt(data, at);
      const finding: Finding = { ...base, message: `${formatPath(at)} must be one of: ${allowed}`, path: formatPath(at), ...locate(at) };
      // YAML reads 0.5 as a number; the class names are strings.
      if (typeof given === 'number' && values.includes(String(given))) finding.hint = `write it in quotes: "${given}"`;
      else if (typeof given === 'string') {
        const suggestion = closest(given, values.filter((v): v is string => typeof v === 'string'));
        if (suggestion) finding.hint = `did you mean \`${suggestion}\`?`;
      }
      return finding;
    }
    case 'const':
      return { ...base, message: `${formatPath(at) || 'value'} must be ${show(error.params.allowedValue)}`, path: formatPath(at), ...locate(at) };
    default: {
      const subject = at.length ? formatPath(at) : 'the file';
      return { ...base, message: `${subject} ${error.message ?? 'is not valid'}`, path: formatPath(at), ...locate(at) };
    }
  }
}

/**
 * Reads a site file: YAML text to data, then the schema. Never throws: every problem, however
 * strange the input, comes back as a finding with a 1-based line and column. Plain, valid files
 * take the fast reading (fast-read.ts); `careful: true` forces the `yaml` package's reading.
 */
export function parseSite(text: string, options: { careful?: boolean } = {}): ParsedSite {
  if (typeof text !== 'string') {
    return { data: null, site: null, findings: [{ ruleId: 'yaml-syntax', severity: 'error', message: 'the site file is not text', path: '', line: 1, column: 1 }], locate: noLocation };
  }
  if (text.length > MAX_SITE_TEXT_CHARS) {
    return {
      data: null, site: null, locate: noLocation,
      findings: [{ ruleId: 'yaml-syntax', severity: 'error', message: `the file is ${text.length} characters long; a site file may have at most ${MAX_SITE_TEXT_CHARS}`, path: '', line: 1, column: 1 }],
    };
  }
  if (options.careful !== true) {
    const fast = fastRead(text);
    if (fast?.locate) {
      let valid = false;
      try { valid = validateSite(fast.data) as boolean; } catch { valid = false; }
      // Only a clean reading is kept; any problem is reported by the careful reading below.
      if (valid) return { data: fast.data, site: fast.data as Site, findings: [], locate: fast.locate };
    }
  }
  const lineCounter = new LineCounter();
  let doc: Document;
  try {
    doc = parseDocument(text, { lineCounter, uniqueKeys: true, prettyErrors: false, strict: true, version: '1.2' });
  } catch (err) {
    return { data: null, site: null, locate: noLocation, findings: [{ ruleId: 'yaml-syntax', severity: 'error', message: `the YAML could not be read: ${readable((err as Error)?.message ?? String(err))}`, path: '', line: 1, column: 1 }] };
  }
  const locate = createLocator(doc, lineCounter);
  const findings: Finding[] = [
    ...doc.errors.map((e) => yamlFinding(e, lineCounter, 'error')),
    ...doc.warnings.map((e) => yamlFinding(e, lineCounter, 'warning')),
  ];
  if (doc.errors.length > 0) return { data: null, site: null, findings: sortFindings(findings), locate };

  let data: unknown;
  try {
    data = doc.toJS({ maxAliasCount: MAX_ALIAS_COUNT });
  } catch (err) {
    const message = (err as Error)?.message ?? String(err);
    findings.push({ ruleId: 'yaml-syntax', severity: 'error', message: `the YAML could not be expanded: ${readable(message)}`, path: '', line: 1, column: 1 });
    return { data: null, site: null, findings: sortFindings(findings), locate };
  }

  let valid = false;
  try {
    valid = validateSite(data) as boolean;
  } catch (err) {
    // Deeply nested input can exhaust the stack inside the validator.
    findings.push({ ruleId: 'schema', severity: 'error', message: `the file does not have the shape of a site file (${readable((err as Error)?.message ?? String(err))})`, path: '', line: 1, column: 1 });
    return { data, site: null, findings: sortFindings(findings), locate };
  }
  if (!valid) {
    const errors = ((validateSite as unknown as { errors?: AjvError[] }).errors ?? []);
    const seen = new Set<string>();
    for (const e of errors) {
      const f = schemaFinding(e, data, locate);
      if (!f) continue;
      const key = `${f.path}|${f.message}`;
      if (seen.has(key)) continue;
      seen.add(key);
      findings.push(f);
      if (seen.size >= MAX_SCHEMA_FINDINGS) break;
    }
  }
  return { data, site: valid ? (data as Site) : null, findings: sortFindings(findings), locate };
}

export function sortFindings(findings: Finding[]): Finding[] {
  const rank = { error: 0, warning: 1, info: 2 } as const;
  return findings
    .map((f, i) => ({ f, i }))
    .sort((a, b) => a.f.line - b.f.line || a.f.column - b.f.column || rank[a.f.severity] - rank[b.f.severity] || a.i - b.i)
    .map(({ f }) => f);
}

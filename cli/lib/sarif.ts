// SARIF 2.1.0 (OASIS Static Analysis Results Interchange Format), so CI systems can annotate
// the lines of a site file. Only the parts of the format that CI annotators read are written.
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { RULES, type Finding, type Severity } from '../../shared/index.ts';

const SARIF_SCHEMA = 'https://json.schemastore.org/sarif-2.1.0.json';

/** Findings that are not rules of rules.md but come from reading the file. */
const READING_RULES = [
  { id: 'yaml-syntax', severity: 'error' as Severity, title: 'The file is well-formed YAML', source: 'YAML 1.2' },
  { id: 'schema', severity: 'error' as Severity, title: 'The file has the shape of a site file, format 1', source: 'schemas/site.schema.json' },
];

const level = (s: Severity) => (s === 'info' ? 'note' : s);

export interface SarifFile {
  path: string;
  findings: readonly Finding[];
}

function artifactLocation(file: string, cwd: string) {
  if (path.isAbsolute(file)) return { uri: pathToFileURL(file).href };
  return { uri: file.split('/').map(encodeURIComponent).join('/'), uriBaseId: 'SRCROOT' };
}

export function toSarif(files: readonly SarifFile[], version: string, cwd: string = process.cwd()) {
  const rules = [...READING_RULES, ...RULES.map((r) => ({ id: r.id, severity: r.severity, title: r.title, source: r.source }))];
  const ruleIndex = new Map(rules.map((r, i) => [r.id, i]));
  const descriptors = rules.map((r) => ({
    id: r.id,
    shortDescription: { text: r.title },
    defaultConfiguration: { level: level(r.severity) },
    ...(r.source ? { properties: { source: r.source } } : {}),
  }));
  const results = files.flatMap((file, artifactIndex) => file.findings.map((f) => {
    const index = ruleIndex.get(f.ruleId);
    const properties: Record<string, string> = {};
    if (f.path) properties.path = f.path;
    if (f.hint) properties.hint = f.hint;
    if (f.source) properties.source = f.source;
    return {
      ruleId: f.ruleId,
      ...(index === undefined ? {} : { ruleIndex: index }),
      level: level(f.severity),
      message: { text: f.hint ? `${f.message} (hint: ${f.hint})` : f.message },
      locations: [{
        physicalLocation: {
          artifactLocation: { ...artifactLocation(file.path, cwd), index: artifactIndex },
          region: { startLine: f.line, startColumn: f.column },
        },
        ...(f.path ? { logicalLocations: [{ fullyQualifiedName: f.path, kind: 'member' }] } : {}),
      }],
      ...(Object.keys(properties).length ? { properties } : {}),
    };
  }));
  return {
    $schema: SARIF_SCHEMA,
    version: '2.1.0',
    runs: [{
      tool: { driver: { name: 'weir', version, semanticVersion: version, rules: descriptors } },
      originalUriBaseIds: { SRCROOT: { uri: pathToFileURL(cwd.endsWith(path.sep) ? cwd : cwd + path.sep).href } },
      // yaml's LineCounter counts columns in UTF-16 code units, as JavaScript strings do.
      columnKind: 'utf16CodeUnits',
      artifacts: files.map((f) => ({ location: artifactLocation(f.path, cwd) })),
      results,
    }],
  };
}

// Writes a site as a commented YAML site file, through the yaml package's Document API so that
// every value is quoted correctly whatever the installer typed.
import { Document, isMap, isPair, isScalar, type Node, type Pair, type YAMLMap } from 'yaml';
import type { Site } from '../../shared/index.ts';

export interface RenderOptions {
  /** The `$schema=` reference for editors (yaml-language-server). */
  schemaRef: string;
}

const TBC = 'to be confirmed';

const COMMISSIONING_TEMPLATE = `Add commissioning evidence from site when you have it, for example:
commissioning:
  date: 2026-01-31
  readings:                       # snapshots read off the meter, per conductor
    - label: loads-on-generation-off
      expect: import              # import | export | any
      L1: { v: 231, a: 12.1, kw: 2.62 }
  exportTest: { observedMaxKw: 4.9, settleS: 8 }
  failSafeTest: { observedS: 4 }`;

export function renderSiteYaml(site: Site, options: RenderOptions): string {
  const doc = new Document(site);
  const root = doc.contents as YAMLMap;

  const pairAt = (path: (string | number)[]): Pair<Node, Node> | undefined => {
    let node: unknown = root;
    let pair: Pair<Node, Node> | undefined;
    for (const segment of path) {
      if (typeof segment === 'number') {
        node = (node as { items?: unknown[] })?.items?.[segment];
        pair = undefined;
        continue;
      }
      if (!isMap(node)) return undefined;
      pair = node.items.find((p) => isPair(p) && isScalar(p.key) && p.key.value === segment) as Pair<Node, Node> | undefined;
      node = pair?.value;
    }
    return pair;
  };
  /** A comment on the line(s) above a key. */
  const above = (path: (string | number)[], comment: string, space = false) => {
    const pair = pairAt(path);
    if (!pair) return;
    pair.key.commentBefore = comment.split('\n').map((l) => ` ${l}`).join('\n');
    if (space) pair.key.spaceBefore = true;
  };
  /** A comment at the end of a value's line. */
  const after = (path: (string | number)[], comment: string) => {
    const pair = pairAt(path);
    if (pair?.value) pair.value.comment = ` ${comment}`;
  };
  const flow = (path: (string | number)[]) => {
    const pair = pairAt(path);
    if (pair && isMap(pair.value)) pair.value.flow = true;
  };

  doc.commentBefore = [
    ` yaml-language-server: $schema=${options.schemaRef}`,
    ' Site file written by `weir init`. Check it with `weir check`, send it for review with `weir push`.',
    ' Only qualified electricians work inside a switchboard; isolate and prove dead first. A passing',
    ' check is not a certificate: local wiring rules and the connection agreement come first.',
  ].join('\n');

  after(['weir'], 'format version, always 1');
  above(['site'], 'Who and where the site is', true);
  after(['site', 'id'], 'unique per server: lower-case letters, digits, hyphens');

  above(['agreement'], 'What the network operator allowed', true);
  after(['agreement', 'reference'], site.agreement.reference === TBC ? 'replace with the agreement reference' : 'from the connection agreement');
  after(['agreement', 'exportLimitKw'], 'kW; 0 = zero export');
  after(['agreement', 'profile'], 'gb-g100 | au-4777 | de-4105 | us-pcs | generic');

  above(['service'], 'The grid supply at the connection point', true);
  after(['service', 'arrangement'], 'single-phase | split-phase | three-phase-4w | three-phase-3w');
  after(['service', 'voltageLn'], 'V line-to-neutral');
  after(['service', 'voltageLl'], 'V line-to-line');
  after(['service', 'frequencyHz'], '50 | 60');
  after(['service', 'mainBreakerA'], 'A, rating of the main protective device');

  above(['meter'], 'The export meter, at the grid connection point: upstream of every load and generator', true);
  if (site.meter.serial === TBC) after(['meter', 'serial'], 'replace with the serial on the meter');
  after(['meter', 'position'], 'the meter sees the net flow of the whole site');
  flow(['meter', 'modbus']);
  after(['meter', 'modbus'], 'address 1-247 (Modbus over Serial Line V1.02 §2.2)');
  flow(['meter', 'voltageInputs']);
  after(['meter', 'voltageInputs'], 'meter terminal -> supply conductor; Vk pairs with Ik');
  above(['meter', 'currentInputs'], 'meter current input -> CT and the conductor it is clamped on');
  for (const terminal of Object.keys(site.meter.currentInputs)) flow(['meter', 'currentInputs', terminal]);

  above(['cts'], 'One CT per live conductor, all of one ratio', true);
  site.cts.forEach((ct, i) => {
    if (ct.lead) {
      flow(['cts', i, 'lead']);
      after(['cts', i, 'lead'], 'one-way length of the secondary leads');
    }
    after(['cts', i, 'arrow'], ct.arrow === 'toward-load' ? 'arrow from grid to load (common practice)' : 'the meter will read import as export');
  });

  above(['gateway'], 'The site gateway, which reads the meter and turns the inverters down', true);
  if (site.gateway.serial === TBC) after(['gateway', 'serial'], 'replace with the serial on the gateway');
  above(['gateway', 'bus'], 'the RS-485 trunk from the gateway to the meter');
  after(['gateway', 'bus', 'lengthM'], 'm; at most 1000 m at 9600 Bd (Modbus §3.4.3)');
  after(['gateway', 'bus', 'baud'], 'same as meter.modbus.baud');
  after(['gateway', 'bus', 'terminations'], 'a terminator at each end of the trunk (Modbus §3.4.5)');
  after(['gateway', 'bus', 'devices'], 'unit loads on the trunk, the gateway included');
  const terminations = pairAt(['gateway', 'bus', 'terminations'])?.value as { flow?: boolean } | undefined;
  if (terminations) terminations.flow = true;

  above(['generation'], 'Generation groups: identical inverters on one phase, or `all` for multi-phase units', true);
  const generation = pairAt(['generation'])?.value as { items?: { flow?: boolean }[] } | undefined;
  for (const item of generation?.items ?? []) item.flow = true;

  above(['export'], 'The export policy that the gateway enforces', true);
  after(['export', 'control'], 'enabled | disabled');
  after(['export', 'scope'], 'aggregate (one limit on the sum) | per-phase');
  after(['export', 'limitKw'], 'kW, at most agreement.exportLimitKw');
  if (site.export.perPhaseLimitKw) flow(['export', 'perPhaseLimitKw']);
  flow(['export', 'failSafe']);
  after(['export', 'failSafe'], 'on loss of the meter or the bus: action, and seconds until it acts');

  doc.comment = COMMISSIONING_TEMPLATE.split('\n').map((l) => (l === '' ? '' : ` ${l}`)).join('\n');
  return doc.toString({ lineWidth: 0 });
}

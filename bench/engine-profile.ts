// Child of bench/engine.ts: generates the sites, then profiles only the checking of them with
// the inspector's sampling profiler, and writes the profile (Chrome DevTools format) to argv[4].
import { writeFileSync } from 'node:fs';
import { Session } from 'node:inspector/promises';
import { checkSite } from '../shared/index.ts';
import { generateSites } from './generate-sites.ts';

const [count, seed, target] = [Number(process.argv[2]), Number(process.argv[3]), process.argv[4]];
const texts = generateSites(count, seed).map((s) => s.text);
for (const t of texts) checkSite(t); // warm-up: let the JIT settle before sampling

const session = new Session();
session.connect();
await session.post('Profiler.enable');
await session.post('Profiler.setSamplingInterval', { interval: 250 });
await session.post('Profiler.start');
const rounds = Math.max(3, Math.ceil(3000 / count));
for (let r = 0; r < rounds; r++) for (const t of texts) checkSite(t);
const { profile } = await session.post('Profiler.stop');
session.disconnect();
writeFileSync(target, JSON.stringify(profile));

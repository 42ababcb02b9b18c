// A worker thread of `weir check` (see lib/check-files.ts): checks its share of texts and posts the results.
import { parentPort, workerData } from 'node:worker_threads';
import { checkText } from './lib/check-files.ts';

const { texts } = workerData as { texts: string[] };
parentPort!.postMessage(texts.map(checkText));

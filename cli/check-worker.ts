// A worker thread of `weir check` (see lib/check-files.ts): checks its share and posts the results.
import { parentPort, workerData } from 'node:worker_threads';
import { checkShard } from './lib/check-files.ts';

const { files, offset } = workerData as { files: Parameters<typeof checkShard>[0]; offset: number };
parentPort!.postMessage(checkShard(files, offset));

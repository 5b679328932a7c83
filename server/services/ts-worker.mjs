// Entry of a worker thread that runs a TypeScript module: registers tsx's loader in this thread
// (Node 20 does not pass `--import tsx` on to a worker's entry), then imports the module named in
// workerData. Plain JavaScript, so it loads before any loader exists.
import { workerData } from 'node:worker_threads';
import { register } from 'tsx/esm/api';

register();
await import(workerData.entry);

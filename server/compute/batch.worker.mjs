// Worker threads do not inherit the main thread's tsx hooks: load them here, then the worker.
import { register } from 'tsx/esm/api';

register({ tsconfig: false });
const { default: runBatch } = await import('./batch.worker.ts');
export default runBatch;

// Piscina worker: unpacks a batch, calls the physics core, returns plain data.
import { computeBatch, type BatchOutput, type BatchTask } from './computeBatch.ts';

export default function runBatch(task: BatchTask): BatchOutput {
  return computeBatch(task);
}

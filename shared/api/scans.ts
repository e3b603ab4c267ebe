import { z } from 'zod';

/** API types of scans, shared by the server (responses), the CLI and the web app (parsing). */
export const SCAN_STATES = ['queued', 'running', 'completed', 'cancelled', 'failed'] as const;

export const scanViewSchema = z.object({
  id: z.number().int(),
  title: z.string(),
  notes: z.string(),
  state: z.enum(SCAN_STATES),
  pointCount: z.number().int(),
  pointsDone: z.number().int(),
  pointsFailed: z.number().int(),
  /** Points per second since the scan started computing; null before. */
  pointsPerSecond: z.number().nullable(),
  /** Seconds until done at the current rate; null when unknown or finished. */
  etaSeconds: z.number().nullable(),
  planHash: z.string(),
  physicsVersion: z.string(),
  basedOnScanId: z.number().int().nullable(),
  /** Who submitted it (null for scans stored before accounts) and the group it is shared with. */
  owner: z.object({ id: z.number().int(), name: z.string(), email: z.string() }).nullable(),
  group: z.object({ id: z.number().int(), name: z.string() }).nullable(),
  computeSeconds: z.number(),
  error: z.string().nullable(),
  createdAt: z.string(),
  startedAt: z.string().nullable(),
  finishedAt: z.string().nullable(),
});
export type ScanView = z.infer<typeof scanViewSchema>;

export const scanDetailSchema = scanViewSchema.extend({
  plan: z.record(z.string(), z.unknown()),
  planText: z.string(),
});
export type ScanDetail = z.infer<typeof scanDetailSchema>;

/** POST /api/v1/scans: the plan as text (YAML or JSON) or as a JSON object. */
/** `basedOn`: an earlier scan whose points with identical requests are copied, not recomputed. */
/** `groupId`: share the scan with this group (the submitter must belong to it). */
const basedOn = z.number().int().positive().optional();
const groupId = z.number().int().positive().optional();
export const submitScanSchema = z.union([
  z.strictObject({ planText: z.string().min(1).max(6_000_000), format: z.enum(['yaml', 'json']).optional(), basedOn, groupId }),
  z.strictObject({ plan: z.record(z.string(), z.unknown()), basedOn, groupId }),
]);
export type SubmitScan = z.infer<typeof submitScanSchema>;

export const TERMINAL_STATES: ReadonlySet<string> = new Set(['completed', 'cancelled', 'failed']);

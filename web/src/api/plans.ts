import { scanViewSchema } from '../../../shared/api/scans.ts';
import { request } from './http.ts';

/** Submitting a scan plan (POST /api/v1/scans, shared/api/scans.ts submitScanSchema); answers the new scan. */
export const plansApi = {
  /** The plan as text, exactly as the builder shows it under "Show as YAML". */
  submitText: (planText: string, format: 'yaml' | 'json', groupId?: number) =>
    request('POST', '/scans', { body: { planText, format, ...(groupId === undefined ? {} : { groupId }) }, schema: scanViewSchema }),
};

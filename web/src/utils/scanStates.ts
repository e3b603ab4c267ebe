import { mdiAlertOctagonOutline, mdiCheckCircleOutline, mdiClockOutline, mdiCloseCircleOutline, mdiProgressClock } from '@mdi/js';
import { SCAN_STATES } from '../../../shared/api/scans.ts';
import type { ScanState } from './scanFilters.ts';

/** Our names for the scan states, with colour and icon so a state reads without its colour too. */
export const STATE_LOOK: Record<ScanState, { label: string; color: string; icon: string }> = {
  queued: { label: 'Waiting', color: 'info', icon: mdiClockOutline },
  running: { label: 'Computing', color: 'secondary', icon: mdiProgressClock },
  completed: { label: 'Done', color: 'success', icon: mdiCheckCircleOutline },
  cancelled: { label: 'Stopped', color: 'warning', icon: mdiCloseCircleOutline },
  failed: { label: 'Failed', color: 'error', icon: mdiAlertOctagonOutline },
};
export const STATE_OPTIONS = SCAN_STATES.map((value) => ({ value, title: STATE_LOOK[value].label }));

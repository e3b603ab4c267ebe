import type { Role } from '../../shared/api/accounts.ts';
import { POINT_STATUSES } from '../../shared/api/results.ts';
import type { ScanView } from '../../shared/api/scans.ts';
import type { PointStatus } from '../../shared/physics/point/types.ts';
import type { OutgoingMail } from './mailer.ts';
import { formatDuration, formatUtc, oneLine, renderMail } from './render.ts';

/** The mails Rollway sends. Pure: the caller supplies links, times and counts. */

const ROLE_PHRASES: Record<Role, string> = {
  admin: 'an administrator, who manages accounts, groups and quotas',
  researcher: 'a researcher, who submits scans and reads the scans of their groups',
  collaborator: 'a collaborator, who reads and downloads the scans shared with their groups',
};

const count = new Intl.NumberFormat('en-US');

function scanName(scan: ScanView): string {
  const title = oneLine(scan.title);
  return title === '' ? `scan #${scan.id}` : `scan #${scan.id} "${title}"`;
}

export function invitationMail(args: { to: string; inviterName: string; link: string; expiresAt: Date; role: Role }): OutgoingMail {
  const inviter = oneLine(args.inviterName, 60) || 'A Rollway user';
  return renderMail({
    to: args.to,
    subject: `${inviter} invited you to Rollway`,
    heading: 'You are invited to Rollway',
    paragraphs: [
      `${inviter} has invited you to join Rollway as ${ROLE_PHRASES[args.role]}.`,
      'Rollway computes inflationary observables over parameter grids of single-field potentials and scores each point against CMB bounds.',
      'To accept, choose a password for your account with the link below.',
    ],
    action: { label: 'Choose a password', link: args.link },
    notes: [
      `The link works once and expires on ${formatUtc(args.expiresAt)}.`,
      'If you did not expect this invitation, ignore this mail: no account is opened until the link is used.',
    ],
  });
}

export function passwordResetMail(args: { to: string; link: string; expiresAt: Date }): OutgoingMail {
  return renderMail({
    to: args.to,
    subject: 'Reset your Rollway password',
    heading: 'Reset your password',
    paragraphs: [`Someone, hopefully you, asked to reset the password of the Rollway account ${args.to}.`],
    action: { label: 'Set a new password', link: args.link },
    notes: [
      `The link works once and expires on ${formatUtc(args.expiresAt)}.`,
      'If you did not ask for this, ignore this mail: your password stays as it is.',
    ],
  });
}

/** " (… from start to finish)" when both times are known. */
function wallTime(scan: ScanView): string {
  if (scan.startedAt === null || scan.finishedAt === null) return '';
  const seconds = (Date.parse(scan.finishedAt) - Date.parse(scan.startedAt)) / 1000;
  return Number.isFinite(seconds) && seconds >= 0 ? ` (${formatDuration(seconds)} from start to finish)` : '';
}

export function scanFinishedMail(args: { to: string; scan: ScanView; byStatus: Record<PointStatus, number>; link: string }): OutgoingMail {
  const { scan } = args;
  return renderMail({
    to: args.to,
    subject: `Rollway: ${scanName(scan)} finished`,
    heading: `Your ${scanName(scan)} has finished`,
    paragraphs: [
      `${count.format(scan.pointsDone)} of ${count.format(scan.pointCount)} points were computed in ${formatDuration(scan.computeSeconds)} of compute time${wallTime(scan)}.`,
      'Points by outcome:',
    ],
    facts: POINT_STATUSES.map((status) => [status, count.format(args.byStatus[status])]),
    action: { label: 'Open the results', link: args.link },
    notes: ['You get this mail because you submitted the scan.'],
  });
}

export function scanFailedMail(args: { to: string; scan: ScanView; error: string; link: string }): OutgoingMail {
  const { scan } = args;
  return renderMail({
    to: args.to,
    subject: `Rollway: ${scanName(scan)} failed`,
    heading: `Your ${scanName(scan)} stopped with an error`,
    paragraphs: [
      `It stopped after ${count.format(scan.pointsDone)} of ${count.format(scan.pointCount)} points. The server reported:`,
    ],
    quote: args.error,
    action: { label: 'Open the scan', link: args.link },
    notes: ['You get this mail because you submitted the scan.'],
  });
}

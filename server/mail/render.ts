import type { OutgoingMail } from './mailer.ts';

/**
 * One layout for every mail, as plain text and as HTML. Everything passed in is plain text and
 * is escaped here, so templates cannot forget it. The HTML uses inline styles only: no remote
 * images, fonts or style sheets (mail clients block them, and they would report when a mail is read).
 */
export interface MailContent {
  to: string;
  subject: string;
  heading: string;
  paragraphs: string[];
  action: { label: string; link: string };
  /** Label and value rows (counts, times), shown as a small table. */
  facts?: Array<[string, string]>;
  /** Verbatim text, such as an error message; monospace in HTML. */
  quote?: string;
  /** Small print under the action: expiry, why this mail came. */
  notes?: string[];
}

const HTML_ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => HTML_ESCAPES[c] ?? c);
}

/** User text for a subject line: one line, at most `max` characters. */
export function oneLine(text: string, max = 80): string {
  const flat = text.replace(/\s+/g, ' ').trim();
  return flat.length <= max ? flat : `${flat.slice(0, max - 1).trimEnd()}…`;
}

/** A fixed, unambiguous form: the server cannot know the reader's time zone or locale. */
export function formatUtc(date: Date): string {
  return `${date.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
}

export function formatDuration(seconds: number): string {
  const tenths = Math.round(seconds * 10) / 10;
  if (tenths < 60) return `${tenths.toFixed(1)} s`;
  const whole = Math.round(seconds);
  const minutes = Math.floor(whole / 60);
  if (minutes < 60) return `${minutes} min ${whole % 60} s`;
  return `${Math.floor(minutes / 60)} h ${minutes % 60} min`;
}

function checkLink(link: string): void {
  const protocol = URL.canParse(link) ? new URL(link).protocol : '';
  if (protocol !== 'http:' && protocol !== 'https:') throw new Error(`mail link must be an http(s) URL, got ${JSON.stringify(link)}`);
}

const FOOTER = 'Rollway: parameter scans of single-field inflation potentials.';

function renderText(c: MailContent): string {
  const width = Math.max(0, ...(c.facts ?? []).map(([label]) => label.length));
  const blocks = [
    c.heading,
    ...c.paragraphs,
    ...(c.facts?.length ? [c.facts.map(([label, value]) => `  ${label.padEnd(width)}  ${value}`).join('\n')] : []),
    ...(c.quote === undefined ? [] : [c.quote.split('\n').map((line) => `  | ${line}`).join('\n')]),
    `${c.action.label}:\n${c.action.link}`,
    ...(c.notes ?? []),
    `-- \n${FOOTER}\nThis mail was sent to ${c.to}.`,
  ];
  return `${blocks.join('\n\n')}\n`;
}

const INK = '#1f2933';
const ACCENT = '#3b5b8c';
const MUTED = '#616e7c';
const P = `margin:0 0 14px;font-size:15px;line-height:1.5;color:${INK};`;

function renderHtml(c: MailContent): string {
  const link = escapeHtml(c.action.link);
  const facts = c.facts?.length
    ? `<table role="presentation" cellpadding="0" cellspacing="0" style="margin:0 0 16px;border-collapse:collapse;font-size:14px;">${c.facts
        .map(([label, value]) => `<tr><td style="padding:3px 18px 3px 0;color:${MUTED};">${escapeHtml(label)}</td><td style="padding:3px 0;color:${INK};font-weight:bold;text-align:right;">${escapeHtml(value)}</td></tr>`)
        .join('')}</table>`
    : '';
  const quote = c.quote === undefined
    ? ''
    : `<pre style="margin:0 0 16px;padding:10px 12px;background:#f3f4f6;border-left:3px solid #b44d3c;white-space:pre-wrap;word-break:break-word;font-family:Menlo,Consolas,monospace;font-size:13px;color:${INK};">${escapeHtml(c.quote)}</pre>`;
  return [
    '<!DOCTYPE html>',
    `<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width"><title>${escapeHtml(c.subject)}</title></head>`,
    `<body style="margin:0;padding:24px 12px;background:#eef0f3;font-family:Helvetica,Arial,sans-serif;">`,
    `<table role="presentation" width="100%" cellpadding="0" cellspacing="0" style="max-width:560px;margin:0 auto;background:#ffffff;border-radius:6px;">`,
    `<tr><td style="padding:18px 28px;border-bottom:1px solid #e1e4e8;font-size:18px;font-weight:bold;letter-spacing:0.04em;color:${ACCENT};">Rollway</td></tr>`,
    `<tr><td style="padding:24px 28px;">`,
    `<h1 style="margin:0 0 16px;font-size:20px;color:${INK};">${escapeHtml(c.heading)}</h1>`,
    ...c.paragraphs.map((p) => `<p style="${P}">${escapeHtml(p)}</p>`),
    facts,
    quote,
    `<p style="margin:22px 0;"><a href="${link}" style="display:inline-block;padding:11px 20px;background:${ACCENT};color:#ffffff;text-decoration:none;border-radius:4px;font-size:15px;font-weight:bold;">${escapeHtml(c.action.label)}</a></p>`,
    `<p style="margin:0 0 14px;font-size:13px;color:${MUTED};">If the button does not work, paste this address into your browser:<br><a href="${link}" style="color:${ACCENT};word-break:break-all;">${link}</a></p>`,
    ...(c.notes ?? []).map((n) => `<p style="margin:0 0 10px;font-size:13px;line-height:1.5;color:${MUTED};">${escapeHtml(n)}</p>`),
    `</td></tr>`,
    `<tr><td style="padding:14px 28px;border-top:1px solid #e1e4e8;font-size:12px;color:${MUTED};">${escapeHtml(FOOTER)} This mail was sent to ${escapeHtml(c.to)}.</td></tr>`,
    '</table></body></html>',
  ].filter((line) => line !== '').join('\n');
}

export function renderMail(content: MailContent): OutgoingMail {
  checkLink(content.action.link);
  return { to: content.to, subject: content.subject, text: renderText(content), html: renderHtml(content) };
}

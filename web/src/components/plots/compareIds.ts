/** The `ids` of /compare?ids=1,2: distinct positive whole numbers, or the first bad item named. */
export function parseCompareIds(raw: unknown): { ids: number[]; error?: string } {
  const text = Array.isArray(raw) ? raw.join(',') : typeof raw === 'string' ? raw : '';
  const ids: number[] = [];
  for (const item of text.split(',').map((s) => s.trim()).filter((s) => s !== '')) {
    if (!/^\d{1,10}$/.test(item) || Number(item) < 1) return { ids, error: `ids: "${item}" is not a scan id (a positive whole number)` };
    if (!ids.includes(Number(item))) ids.push(Number(item));
  }
  return { ids };
}

import { describe, expect, it } from 'vitest';
import { readUploadedPlan } from '../../../web/src/components/plan/planUpload.ts';

const valid = `title: Upload
potential: { family: hilltop }
axes:
  - name: mu
    range: { from: 5, to: 10, count: 6 }
pivot: { efolds: 55 }
`;

describe('uploading a plan file', () => {
  it('fills the form from a valid YAML plan', () => {
    const outcome = readUploadedPlan(valid, 'hilltop.yaml');
    expect(outcome).toMatchObject({ ok: true, issues: [], form: { title: 'Upload', family: 'hilltop', efolds: '55' } });
    if (outcome.ok) expect(outcome.form.axes[0]).toMatchObject({ name: 'mu', kind: 'range', from: '5', to: '10', count: '6' });
  });

  it('reads JSON by the file name, as the server does', () => {
    const outcome = readUploadedPlan(JSON.stringify({ title: 'J', potential: { family: 'quadratic' }, axes: [{ name: 'pivotEfolds', values: [50, 60] }] }), 'plan.json');
    expect(outcome).toMatchObject({ ok: true, issues: [], form: { title: 'J' } });
  });

  it('names the line and column of a YAML syntax error and leaves the form alone', () => {
    const outcome = readUploadedPlan('title: x\naxes: [\n', 'broken.yml');
    expect(outcome.ok).toBe(false);
    expect(outcome.issues[0]?.message).toMatch(/YAML syntax error at line \d+, column \d+/);
  });

  it('names the position of a JSON syntax error', () => {
    const outcome = readUploadedPlan('{"title": "x",, }', 'plan.json');
    expect(outcome.ok).toBe(false);
    expect(outcome.issues[0]?.message).toMatch(/JSON syntax error at line 1, column \d+/);
  });

  it('shows a plan with mistakes in the form and lists each mistake with its field, unknown fields included', () => {
    const outcome = readUploadedPlan(`${valid}colour: blue\naxes2: []\n`.replace('count: 6', 'count: six'), 'typo.yaml');
    expect(outcome.ok).toBe(true);
    const paths = outcome.issues.map((i) => i.path);
    expect(paths).toContain('axes[0].range.count');
    const unknown = outcome.issues.find((i) => i.message.includes('unknown fields'));
    expect(unknown?.message).toMatch(/"colour", "axes2"; allowed: title, notes, potential/);
    if (outcome.ok) expect(outcome.form.axes[0]?.count).toBe('six');
  });

  it('refuses a document that is not a mapping', () => {
    const outcome = readUploadedPlan('- just\n- a list\n', 'list.yaml');
    expect(outcome).toMatchObject({ ok: false, issues: [{ path: '', message: expect.stringMatching(/must be a mapping/) }] });
  });
});

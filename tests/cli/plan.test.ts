import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Command } from 'commander';
import { describe, expect, it } from 'vitest';
import { program } from '../../cli/program.ts';
import { starterPlan } from '../../cli/planTemplate.ts';
import { FAMILIES } from '../../shared/physics/potential/families.ts';
import { planPointCount } from '../../shared/plan/expandPlan.ts';
import { parsePlanText } from '../../shared/plan/validatePlan.ts';
import { cliHome, rollway } from './runCli.ts';

describe('rollway plan: local checks, no server', () => {
  it('writes a starter plan for every built-in family that validates as it is', () => {
    for (const family of FAMILIES) {
      const text = starterPlan(family);
      const plan = parsePlanText(text);
      expect(plan.potential.family, family.id).toBe(family.id);
      const shape = family.parameters.filter((p) => p.name !== 'V0').map((p) => p.name);
      expect(plan.axes.map((a) => a.name), family.id).toEqual([...shape, 'pivotEfolds']);
      // The comment states the size the grid really has.
      expect(text, family.id).toContain(`= ${planPointCount(plan)} points`);
      expect(plan.endPhi !== undefined, family.id).toBe(family.needsEndPhi === true);
    }
  });

  it('plan new writes the file once (never over an existing one without --force), plan check counts its points', async () => {
    const home = cliHome();
    const out = join(home.HOME!, 't-model.yaml');
    const created = await rollway(['plan', 'new', '--family', 't-model', '--out', out]);
    expect(created.code, created.stderr).toBe(0);
    writeFileSync(out, `${readFileSync(out, 'utf8')}# my edit\n`);
    const [again, check, unknown] = await Promise.all([
      rollway(['plan', 'new', '--family', 't-model', '--out', out]),
      rollway(['plan', 'check', out]),
      rollway(['plan', 'new', '--family', 'nope']),
    ]);
    expect(again.code).toBe(2);
    expect(again.stderr).toMatch(/--out: ".*t-model.yaml" exists; choose another name or add --force/);
    expect(readFileSync(out, 'utf8')).toMatch(/# my edit\n$/);
    expect(check.code).toBe(0);
    expect(check.stdout).toBe(`${out}: valid, 30 points\n`);
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toMatch(/unknown family "nope"; built-in families: quadratic, .*exponential/);
  });

  it('plan check lists every problem with its field path and exits 2, also as JSON', async () => {
    const home = cliHome();
    const bad = join(home.HOME!, 'bad.json');
    writeFileSync(bad, JSON.stringify({ title: 'x', potential: { family: 'natural' }, axes: [{ name: 'f', logRange: { from: -1, to: 5, count: 3 } }], precision: { preset: 'slow' } }));
    const [text, json, syntax] = await Promise.all([
      rollway(['plan', 'check', bad]),
      rollway(['plan', 'check', bad, '--json']),
      rollway(['plan', 'check', (writeFileSync(join(home.HOME!, 'broken.yaml'), 'title: [unclosed\n'), join(home.HOME!, 'broken.yaml'))]),
    ]);
    expect(text.code).toBe(2);
    expect(text.stderr).toMatch(/bad\.json: 3 problems\n/);
    expect(text.stderr).toMatch(/\n {2}axes\[0\]\.logRange\.from: must be > 0/);
    expect(text.stderr).toMatch(/\n {2}precision\.preset: must be one of "fast", "exact"; got "slow"/);
    expect(text.stderr).toMatch(/\n {2}pivot: required/);
    expect(json.code).toBe(2);
    const result = JSON.parse(json.stdout);
    expect(result).toMatchObject({ valid: false, pointCount: null });
    expect(result.issues.map((i: { path: string }) => i.path).sort()).toEqual(['axes[0].logRange.from', 'pivot', 'precision.preset']);
    expect(syntax.code).toBe(2);
    expect(syntax.stderr).toMatch(/YAML syntax error at line \d+, column \d+/);
  });

  it('shows examples in the help of every command and subcommand', () => {
    const all = (c: Command): Command[] => [c, ...c.commands.flatMap(all)];
    const commands = all(program);
    expect(commands.length).toBeGreaterThan(25);
    for (const command of commands) {
      let help = '';
      command.configureOutput({ writeOut: (text) => (help += text) });
      command.outputHelp();
      expect(help, command.name()).toMatch(/\nExamples?:\n {2}(\S+=\S+ )?rollway /);
    }
  });
});

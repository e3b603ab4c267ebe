import { Command, Option } from 'commander';
import { InvalidInputError } from '../../shared/errors.ts';
import { pointRequestSchema, type PointRequestInput } from '../../shared/plan/pointRequest.ts';
import { parseRequest } from '../../shared/api/parse.ts';
import { printPoint } from '../output.ts';

interface PointOptions {
  family?: string;
  expr?: string;
  param: string[];
  pivotEfolds?: string;
  reheatW?: string;
  reheatTemp?: string;
  reheatDensity?: string;
  endPhi?: string;
  phi0?: string;
  phiRange?: string;
  exact?: boolean;
  targetAs?: string;
  rtol?: string;
  json?: boolean;
}

const collect = (value: string, previous: string[]): string[] => [...previous, value];

function number(value: string | undefined, option: string): number | undefined {
  if (value === undefined) return undefined;
  const parsed = Number(value);
  if (value.trim() === '' || !Number.isFinite(parsed)) throw new InvalidInputError(`${option}: "${value}" is not a finite number`, option);
  return parsed;
}

function parseParams(pairs: string[]): Record<string, number> {
  const params: Record<string, number> = {};
  for (const pair of pairs) {
    const match = /^([A-Za-z_][A-Za-z0-9_]*)=(.+)$/.exec(pair);
    if (!match) throw new InvalidInputError(`--param: "${pair}" is not of the form name=value`, '--param');
    params[match[1]!] = number(match[2], `--param ${match[1]}`)!;
  }
  return params;
}

/** Builds the request data from the options; validation is the shared schema's job. */
export function collectRequest(options: PointOptions): PointRequestInput {
  const reheatW = number(options.reheatW, '--reheat-w');
  if ((options.pivotEfolds === undefined) === (reheatW === undefined)) {
    throw new InvalidInputError('give the pivot as --pivot-efolds N or as a reheating history (--reheat-w with --reheat-temp or --reheat-density)', '--pivot-efolds');
  }
  const range = options.phiRange?.split(':').map((x) => number(x, '--phi-range')!);
  if (range && range.length !== 2) throw new InvalidInputError(`--phi-range: "${options.phiRange}" is not of the form min:max`, '--phi-range');
  return {
    potential: options.expr !== undefined ? { expression: options.expr } : { family: options.family ?? '' },
    params: parseParams(options.param),
    pivot: reheatW === undefined
      ? { efolds: number(options.pivotEfolds, '--pivot-efolds')! }
      : { reheating: { w: reheatW, tRehGeV: number(options.reheatTemp, '--reheat-temp'), rhoRehQuarterGeV: number(options.reheatDensity, '--reheat-density') } },
    endPhi: number(options.endPhi, '--end-phi'),
    phi0: number(options.phi0, '--phi0'),
    fieldRange: range as [number, number] | undefined,
    exact: options.exact === true,
    targetAs: number(options.targetAs, '--target-as'),
    precision: options.rtol === undefined ? undefined : { rtol: number(options.rtol, '--rtol')! },
  };
}

export const point = new Command('point')
  .description('compute one point: background beyond slow roll and the observables at the pivot')
  .addOption(new Option('--family <id>', 'built-in potential family (quadratic, monomial, starobinsky, natural, e-model, t-model, hilltop, exponential)').conflicts('expr'))
  .option('--expr <V>', 'custom potential V(phi) as an expression in phi and the --param names')
  .option('--param <name=value>', 'parameter value, repeatable (V0 is the overall scale)', collect, [])
  .option('--pivot-efolds <N>', 'e-folds N_* between the pivot scale leaving the horizon and the end of inflation')
  .option('--reheat-w <w>', 'solve N_* from reheating with this equation of state instead of --pivot-efolds')
  .option('--reheat-temp <GeV>', 'temperature at the end of reheating (with --reheat-w)')
  .option('--reheat-density <GeV>', 'rho^(1/4) at the end of reheating (with --reheat-w)')
  .option('--end-phi <x>', 'end inflation at this field value (for potentials that never end by themselves)')
  .option('--phi0 <x>', 'initial field value (default: found automatically)')
  .option('--phi-range <min:max>', 'field interval for the automatic search of phi0')
  .option('--exact', 'also compute exact spectra from the Mukhanov–Sasaki equations')
  .option('--target-as <A>', 'scalar amplitude the normalisation aims for (default 2.1e-9)')
  .option('--rtol <x>', 'relative tolerance of the integrations (default 1e-8)')
  .option('--json', 'print the result as one JSON object')
  .addHelpText('after', `
Examples:
  rollway point --family starobinsky --pivot-efolds 55 --json
  rollway point --family hilltop --param mu=15 --param q=4 --pivot-efolds 60 --exact
  rollway point --expr "V0*phi^2/(1+phi^2/M^2)" --param M=20 --pivot-efolds 55
  rollway point --family exponential --param lambda=0.2 --end-phi 10 --pivot-efolds 55 --exact`)
  .action(async (options: PointOptions) => {
    if (options.family === undefined && options.expr === undefined) {
      throw new InvalidInputError('give a potential with --family <id> or --expr "<V in phi>"', '--family');
    }
    const request = parseRequest(pointRequestSchema, collectRequest(options));
    // The physics core (mathjs) loads only when a point is computed, keeping --help instant.
    const [{ computePoint }, { preparePoint }] = await Promise.all([
      import('../../shared/physics/point/computePoint.ts'), import('../../shared/physics/point/preparePoint.ts'),
    ]);
    const result = computePoint(preparePoint(request));
    printPoint(result, options.json === true);
  });

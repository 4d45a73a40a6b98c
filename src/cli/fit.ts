// preheard fit: driver parameters from measured impedance tables.
import { writeFileSync } from 'node:fs';
import { airAt } from '../engine/air.ts';
import { fittedFields } from '../engine/fit/driver-fields.ts';
import { fitImpedance, type CoilModel, type ImpedanceFit } from '../engine/fit/impedance-fit.ts';
import { parseImpedanceTable } from '../engine/fit/impedance-table.ts';
import { mechanicalSet, type MechanicalResult, type SecondSweep } from '../engine/fit/mechanical.ts';
import { InputProblem } from '../engine/issues.ts';
import { EXIT_OK, InputError, parseCommandArgs, parseNumberOption, runGuarded, UsageError, type Command } from './command.ts';
import { readSmallText } from './design-file.ts';
import { planOutputs } from './output-files.ts';
import { printable, sig } from './user-text.ts';

const HELP = `usage: preheard fit <sweep.txt> [--added-mass-g M --with-mass <sweep2.txt> |
                     --test-box-l V --in-box <sweep2.txt> | --vas-l V] [--sd-cm2 S]
                     [--coil auto|le|semi] [--curve <out.csv>] [--json]

Fits a driver's Re, fs, Qms, Qes and voice-coil inductance (Le, and the semi-inductance L2, R2
when it fits clearly better) to an impedance sweep measured in free air, by nonlinear least
squares over the whole curve, and gives each with its standard error from the fit.

A sweep is a text table of frequency (Hz), impedance magnitude (ohm) and, optionally, phase
(degrees), in any column order, with header and comment lines (#, *, ;) and decimal points or
commas. It must start below the resonance and reach well above it.

  --added-mass-g M   a mass of M grams was fixed to the cone for the second sweep (--with-mass)
  --with-mass FILE   the second sweep, with the added mass: gives Mms, and Vas with --sd-cm2
  --test-box-l V     the driver was sealed on a closed box of V litres for the second sweep
  --in-box FILE      the second sweep, in the box: gives Vas
  --vas-l V          a Vas you know (litres), when there is no second sweep
  --sd-cm2 S         the cone's effective area (cm²): gives the mechanical set (Bl, Mms, Cms, Rms)
  --coil MODEL       auto (default), le (Le alone) or semi (Le with the semi-inductance)
  --curve FILE       write the measured and fitted curves and the residual as CSV
  --json             print one JSON object instead of the table
  --help             this text

Vas is for air at 20 °C and 101.325 kPa. The fit is as good as the sweep: measure at a small
drive (the small-signal model), with the driver held still and away from walls.

exit codes: 0 ok, 1 bad input (message on stderr), 2 usage
`;

const TABLE_KIND = { noun: 'impedance table', maxBytes: 8 << 20, sizeWords: '8 MiB', typical: 'a sweep is a few hundred kB at most' };

async function fitFile(path: string, coil: CoilModel | 'auto'): Promise<ImpedanceFit> {
  const parsed = parseImpedanceTable(await readSmallText(path, TABLE_KIND));
  if (!parsed.ok) throw new InputError(`${printable(path)}, line ${parsed.line}: ${parsed.message}`);
  try {
    return fitImpedance(parsed.table, coil);
  } catch (e) {
    if (e instanceof InputProblem) throw new InputError(`${printable(path)}: ${e.message}`);
    throw e;
  }
}

const withSigma = (value: number, sigma: number) =>
  Number.isFinite(sigma) ? `${sig(value)} ± ${sig(sigma, 2)}` : `${sig(value)} (no error estimate)`;

function reportJson(fit: ImpedanceFit, mech: MechanicalResult | null, second: SecondSweep | null, sdM2: number | null) {
  const p = fit.params;
  const s = fit.sigma;
  const semi = fit.coil === 'semi';
  const set = mech?.set ?? null;
  return {
    driver: fittedFields(fit, mech, sdM2),
    re_ohm: p.re,
    fs_hz: p.fs,
    qms: p.qms,
    qes: p.qes,
    qts: (p.qes * p.qms) / (p.qes + p.qms),
    le_mh: p.le * 1000,
    l2_mh: semi ? p.l2 * 1000 : null,
    r2_ohm: semi ? p.r2 : null,
    vas_l: mech?.vas != null ? mech.vas * 1000 : null,
    mms_g: mech?.mms != null ? mech.mms * 1000 : null,
    cms_mm_per_n: set ? set.cms * 1000 : null,
    bl_tm: set ? set.bl : null,
    rms_kg_s: set ? set.rms : null,
    sigma: {
      re_ohm: s.re,
      fs_hz: s.fs,
      qms: s.qms,
      qes: s.qes,
      le_mh: s.le * 1000,
      l2_mh: semi ? s.l2 * 1000 : null,
      r2_ohm: semi ? s.r2 : null,
      vas_l: mech?.vasSigma != null ? mech.vasSigma * 1000 : null,
      mms_g: mech?.mmsSigma != null ? mech.mmsSigma * 1000 : null,
    },
    coil_model: fit.coil,
    used_phase: fit.usedPhase,
    points: fit.curve.freq.length,
    residual_rms_pct: fit.residualRmsPct,
    vas_method: mech ? mech.method : null,
    second_sweep: second ? { fs_hz: second.fit.params.fs, qes: second.fit.params.qes, qms: second.fit.params.qms } : null,
  };
}

function reportText(path: string, fit: ImpedanceFit, mech: MechanicalResult | null, second: SecondSweep | null): string {
  const p = fit.params;
  const s = fit.sigma;
  const lines = [
    `fit of ${printable(path)}: ${fit.curve.freq.length} points, ${fit.usedPhase ? 'magnitude and phase' : 'magnitude only'}, ` +
      `coil ${fit.coil === 'semi' ? 'Le with semi-inductance' : 'Le alone'}`,
    `  Re     ${withSigma(p.re, s.re)} ohm`,
    `  fs     ${withSigma(p.fs, s.fs)} Hz`,
    `  Qms    ${withSigma(p.qms, s.qms)}`,
    `  Qes    ${withSigma(p.qes, s.qes)}`,
    `  Qts    ${sig((p.qes * p.qms) / (p.qes + p.qms))}`,
    `  Le     ${withSigma(p.le * 1000, s.le * 1000)} mH`,
  ];
  if (fit.coil === 'semi') lines.push(`  L2     ${withSigma(p.l2 * 1000, s.l2 * 1000)} mH`, `  R2     ${withSigma(p.r2, s.r2)} ohm`);
  lines.push(`  residual ${sig(fit.residualRmsPct)} % rms`);
  if (second) {
    const q = second.fit.params;
    lines.push(`second sweep: fs ${sig(q.fs)} Hz, Qes ${sig(q.qes)}, Qms ${sig(q.qms)}, residual ${sig(second.fit.residualRmsPct)} % rms`);
  }
  if (mech) {
    if (mech.vas !== null) lines.push(`  Vas    ${withSigma(mech.vas * 1000, (mech.vasSigma ?? Number.NaN) * 1000)} l (${mech.method})`);
    if (mech.mms !== null) lines.push(`  Mms    ${withSigma(mech.mms * 1000, (mech.mmsSigma ?? Number.NaN) * 1000)} g`);
    if (mech.set) {
      lines.push(`  Cms    ${sig(mech.set.cms * 1000)} mm/N`, `  Bl     ${sig(mech.set.bl)} T·m`, `  Rms    ${sig(mech.set.rms)} kg/s`);
    }
    if (mech.vas === null) lines.push('  Vas needs the cone area: give --sd-cm2');
  } else lines.push('  Vas: give a second sweep (--with-mass or --in-box) or --vas-l');
  lines.push('A fitted model is an estimate: check the residual and the errors before trusting it.');
  return `${lines.join('\n')}\n`;
}

function curveCsv(fit: ImpedanceFit): string {
  const c = fit.curve;
  const rows = c.freq.map((f, i) =>
    [f, c.measuredOhm[i], c.measuredPhaseDeg ? c.measuredPhaseDeg[i] : '', c.fittedOhm[i], c.fittedPhaseDeg[i], c.residualPct[i]]
      .map((x) => (typeof x === 'number' ? Number(x.toPrecision(6)) : x))
      .join(','),
  );
  return `freq_hz,measured_ohm,measured_phase_deg,fitted_ohm,fitted_phase_deg,residual_pct\n${rows.join('\n')}\n`;
}

export const fitCommand: Command = {
  run: (argv) =>
    runGuarded('fit', HELP, async () => {
      const { values, positionals } = parseCommandArgs(argv, {
        'added-mass-g': { type: 'string' },
        'with-mass': { type: 'string' },
        'test-box-l': { type: 'string' },
        'in-box': { type: 'string' },
        'vas-l': { type: 'string' },
        'sd-cm2': { type: 'string' },
        coil: { type: 'string' },
        curve: { type: 'string' },
        json: { type: 'boolean' },
        help: { type: 'boolean', short: 'h' },
      });
      if (values.help) {
        process.stdout.write(HELP);
        return EXIT_OK;
      }
      if (positionals.length !== 1) throw new UsageError(`expected one sweep file, got ${positionals.length}`);
      const coil = values.coil ?? 'auto';
      if (coil !== 'auto' && coil !== 'le' && coil !== 'semi')
        throw new UsageError(`--coil must be auto, le or semi, got "${printable(coil)}"`);
      const massG = parseNumberOption(values['added-mass-g'], '--added-mass-g', 0.01, 10000);
      const boxL = parseNumberOption(values['test-box-l'], '--test-box-l', 0.01, 10000);
      const vasL = parseNumberOption(values['vas-l'], '--vas-l', 0.0001, 20000);
      const sdCm2 = parseNumberOption(values['sd-cm2'], '--sd-cm2', 0.5, 20000);
      if ((massG === undefined) !== (values['with-mass'] === undefined))
        throw new UsageError('--added-mass-g and --with-mass go together: the mass and the sweep taken with it');
      if ((boxL === undefined) !== (values['in-box'] === undefined))
        throw new UsageError('--test-box-l and --in-box go together: the box volume and the sweep taken in it');
      const methods = [massG, boxL, vasL].filter((x) => x !== undefined).length;
      if (methods > 1) throw new UsageError('give one way to Vas: an added mass, a test box or --vas-l');
      const [path] = positionals;
      const secondPath = values['with-mass'] ?? values['in-box'];
      const plan = await planOutputs(secondPath ? [path, secondPath] : [path], [values.curve]);

      const free = await fitFile(path, coil);
      let second: SecondSweep | null = null;
      if (massG !== undefined && values['with-mass'])
        second = { kind: 'added-mass', massKg: massG / 1000, fit: await fitFile(values['with-mass'], coil) };
      if (boxL !== undefined && values['in-box'])
        second = { kind: 'closed-box', vbM3: boxL / 1000, fit: await fitFile(values['in-box'], coil) };
      const sdM2 = sdCm2 !== undefined ? sdCm2 * 1e-4 : null;
      let mech: MechanicalResult | null = null;
      if (second || vasL !== undefined) {
        try {
          mech = mechanicalSet(free, second, sdM2, vasL !== undefined ? vasL / 1000 : null, airAt());
        } catch (e) {
          if (e instanceof InputProblem) throw new InputError(e.message);
          throw e;
        }
      }
      if (values.curve) {
        writeFileSync(plan.staging(values.curve), curveCsv(free));
        plan.commit();
      }
      process.stdout.write(
        values.json ? `${JSON.stringify(reportJson(free, mech, second, sdM2))}\n` : reportText(path, free, mech, second),
      );
      return EXIT_OK;
    }),
};

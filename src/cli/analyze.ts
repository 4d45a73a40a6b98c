// preheard analyze: the small-signal figures and curves of one design.
import { analyze } from '../engine/response/analyze.ts';
import type { Analysis, WayAnalysis } from '../engine/response/types.ts';
import type { RoomAnalysis } from '../engine/room/analysis.ts';
import { EXIT_OK, parseCommandArgs, parseNumberOption, runGuarded, UsageError, type Command } from './command.ts';
import { formatIssue, loadDesignFile } from './design-file.ts';
import { db, printable, sig } from './user-text.ts';
import { distortionJson } from './distortion-report.ts';
import { checkTonePair } from '../engine/distortion/two-tone.ts';

const HELP = `usage: preheard analyze <design.json> [--json] [--volts V] [--distortion [--im-hz F1,F2]]

Small-signal analysis of a design: for each way with drivers its f3, box figures,
sensitivity and curves (SPL at the listening seat through the way's filter, excursion,
impedance, group delay, port air speed, max SPL), and for the whole system the summed
response at the seat with its f3 and sensitivity.

  --volts V   drive voltage for the curves, V rms at the amplifier (default 2.83)
  --json      print one JSON object instead of the table
  --distortion  with --json: add "distortion", stepped-sine THD, H2, H3 and compression of the
              large-signal model per way and for the sum, at the planned level (or --volts),
              and "intermodulation": two tones (F1 low, F2 high, 4:1) through the same model,
              the products F2 ± F1 and F2 ± 2·F1 relative to F2
  --im-hz F1,F2  the two tones in Hz (default 40,420); F2 at least 3·F1, not a whole multiple of it
  --help      this text

exit codes: 0 ok, 1 bad input (message on stderr), 2 usage
`;

const round = (x: number, digits = 4) => (Number.isFinite(x) ? Number(x.toPrecision(digits)) : null);
const list = (a: ArrayLike<number> | null) => (a ? Array.from(a, (x) => round(x, 5)) : null);

/** One driver way's figures and curves, with the first version's field names. */
function wayJson(a: Analysis, wa: WayAnalysis) {
  const { driver: d, box } = wa.way;
  const f = wa.figures;
  return {
    name: wa.way.name,
    count: wa.way.count,
    wiring: wa.way.wiring,
    box_type: box.type,
    driver: {
      fs_hz: round(d.fs),
      qes: round(d.qes),
      qms: round(d.qms),
      qts: round(d.qts),
      vas_l: round(d.vas * 1000),
      re_ohm: round(d.re),
      le_mh: round(d.le * 1000),
      bl_tm: round(d.bl),
      mms_g: round(d.mms * 1000),
      cms_mm_per_n: round(d.cms * 1000),
      rms_kg_s: round(d.rms),
      sd_cm2: round(d.sd * 1e4),
      xmax_mm: round(d.xmax * 1000),
      xlim_mm: round(d.xlim * 1000),
      eta0_pct: round(f.eta0Pct),
    },
    vb_l: round(box.vbNet * 1000),
    vb_effective_l: round(box.vb * 1000),
    ...(f.fcHz !== null ? { fc_hz: round(f.fcHz), qtc: round(f.qtc!) } : {}),
    ...(f.fbHz !== null ? { fb_hz: round(f.fbHz) } : {}),
    ...(f.fpHz !== null ? { fp_hz: round(f.fpHz) } : {}),
    ...(f.portLengthCm !== null ? { port_length_cm: round(f.portLengthCm), port_count: 'portCount' in box ? box.portCount : null } : {}),
    box_figures: f.box.map((b) => ({ id: b.id, label: b.label, value: round(b.value), unit: b.unit })),
    f3_hz: round(f.f3Hz),
    f6_hz: round(f.f6Hz),
    f10_hz: round(f.f10Hz),
    sensitivity_db: round(f.sensitivityDb),
    drive_v: a.driveV,
    passband_spl_db: round(f.passbandSplDb),
    peak_excursion_mm: round(f.peakExcursionMm),
    peak_port_speed_m_s: f.peakPortSpeed === null ? null : round(f.peakPortSpeed),
    z_min_ohm: round(f.zMinOhm),
    planned_volts_rms: round(f.plannedVoltsRms),
    spl_30_db: round(f.spl30Db),
    spl_40_db: round(f.spl40Db),
    spl_50_db: round(f.spl50Db),
    group_delay_40_ms: round(f.groupDelay40Ms),
    ...(wa.curves.network ? { network: networkJson(wa) } : {}),
    warnings: wa.warnings.map((w) => ({ path: w.path, message: w.message })),
    curves: {
      freq_hz: list(wa.curves.freqHz),
      spl_db: list(wa.curves.splDb),
      cone_spl_db: list(wa.curves.coneSplDb),
      port_spl_db: list(wa.curves.portSplDb),
      excursion_mm: list(wa.curves.excursionMm),
      impedance_ohm: list(wa.curves.impedanceOhm),
      phase_deg: list(wa.curves.phaseDeg),
      group_delay_ms: list(wa.curves.groupDelayMs),
      port_air_speed_m_s: list(wa.curves.portAirSpeed),
      radiator_excursion_mm: list(wa.curves.radiatorExcursionMm),
      max_spl_db: list(wa.curves.maxSplDb),
      max_spl_limit: wa.curves.maxSplLimit,
      ...(wa.curves.measuredSplDb ? { measured_spl_db: list(wa.curves.measuredSplDb) } : {}),
    },
  };
}

/** A passive way's network: each part at the planned level, the transfer and the drivers' own impedance. */
function networkJson(wa: WayAnalysis) {
  const n = wa.curves.network!;
  return {
    parts: (wa.figures.parts ?? []).map((p) => ({
      part: p.label,
      peak_power_w: round(p.peakPowerW),
      peak_power_hz: round(p.peakPowerHz),
      peak_current_a: round(p.peakCurrentA),
      peak_current_hz: round(p.peakCurrentHz),
      rated_w: p.ratedW,
    })),
    curves: { transfer_db: list(n.transferDb), transfer_deg: list(n.transferDeg), driver_impedance_ohm: list(n.driverImpedanceOhm) },
  };
}

/** The whole system at the seat: the summed response and its figures. */
function sumJson(a: Analysis) {
  const f = a.sum.figures;
  return {
    f3_hz: round(f.f3Hz),
    f6_hz: round(f.f6Hz),
    f10_hz: round(f.f10Hz),
    sensitivity_db: round(f.sensitivityDb),
    passband_spl_db: round(f.passbandSplDb),
    planned_volts_rms: round(f.plannedVoltsRms),
    planned_spl_db: round(f.plannedSplDb),
    group_delay_40_ms: round(f.groupDelay40Ms),
    passive_load_min_ohm: f.passiveLoadMinOhm === null ? null : round(f.passiveLoadMinOhm),
    passive_load_min_hz: f.passiveLoadMinHz === null ? null : round(f.passiveLoadMinHz),
    crossover: {
      ways: f.crossover.ways.map((w) => ({
        name: w.name,
        low_6db_hz: w.lowHz === null ? null : round(w.lowHz),
        high_6db_hz: w.highHz === null ? null : round(w.highHz),
      })),
      sum_deviation_db: round(f.crossover.deviationDb),
      sum_deviation_hz: round(f.crossover.deviationHz),
      from_hz: round(f.crossover.fromHz),
      to_hz: round(f.crossover.toHz),
    },
    curves: {
      freq_hz: list(a.sum.curves.freqHz),
      spl_db: list(a.sum.curves.splDb),
      phase_deg: list(a.sum.curves.phaseDeg),
      group_delay_ms: list(a.sum.curves.groupDelayMs),
      ways: a.sum.curves.ways.map((w) => ({ name: w.name, kind: w.kind, spl_db: list(w.splDb) })),
    },
  };
}

/** The listening room: its modes, its Schroeder frequency and the sum at the seat with and without it. */
function roomJson(r: RoomAnalysis) {
  return {
    schroeder_hz: round(r.schroederHz),
    t60_s: round(r.t60S),
    transition_hz: round(r.transitionHz),
    modes_summed: r.modeCount,
    modes: r.modes.map((m) => ({ nx: m.nx, ny: m.ny, nz: m.nz, hz: round(m.hz) })),
    peak_db: round(r.peakDb),
    peak_hz: round(r.peakHz),
    dip_db: round(r.dipDb),
    dip_hz: round(r.dipHz),
    curves: { freq_hz: list(r.curves.freqHz), spl_db: list(r.curves.splDb), free_spl_db: list(r.curves.freeSplDb) },
  };
}

/**
 * The first version's top-level fields (for the first driver way, the woofer of a first-version
 * design), every driver way under `ways` and the summed system under `system`.
 */
export function analysisJson(a: Analysis) {
  const { name: _wayName, count: _count, wiring: _wiring, warnings: _w, ...first } = wayJson(a, a);
  return {
    name: a.system.name,
    ...first,
    warnings: a.warnings.map((w) => ({ path: w.path, message: w.message })),
    // The planned level against the amplifier (its errors are also in `warnings`, marked there).
    errors: a.warnings.filter((w) => w.severity === 'error').map((w) => ({ path: w.path, message: w.message })),
    planned_programme: {
      volts_rms: round(a.programme.voltsRms),
      leq_c_per_volt_db: round(a.programme.leqCPerVoltDb),
      amplifier_shortfalls: a.programme.shortfalls.map((s) => ({
        way: s.way,
        need_v: round(s.needV),
        rail_v: round(s.railV),
        short_db: round(s.shortDb),
      })),
    },
    ways: a.ways.map((wa) => wayJson(a, wa)),
    system: sumJson(a),
    ...(a.room ? { room: roomJson(a.room) } : {}),
  };
}

function wayRows(j: ReturnType<typeof wayJson>, a: Analysis): [string, string][] {
  // The bass figures (30/40/50 Hz, group delay at 40 Hz) only for a way that plays bass.
  const bass = (j.f3_hz ?? Infinity) < 200;
  const rows: [string, string][] = [
    ['box', `${j.box_type}, ${sig(j.vb_l)} l net (${sig(j.vb_effective_l)} l acoustic)`],
    ['fs / Qts / Vas', `${sig(j.driver.fs_hz)} Hz / ${sig(j.driver.qts)} / ${sig(j.driver.vas_l)} l`],
    ['Bl / Mms / Cms', `${sig(j.driver.bl_tm)} T·m / ${sig(j.driver.mms_g)} g / ${sig(j.driver.cms_mm_per_n)} mm/N`],
  ];
  if (j.count > 1) rows.unshift(['drivers', `${j.count} in ${j.wiring} (figures for all of them together)`]);
  if (j.fc_hz !== undefined) rows.push(['fc / Qtc', `${sig(j.fc_hz)} Hz / ${sig(j.qtc)}`]);
  if (j.fb_hz !== undefined) rows.push(['fb', `${sig(j.fb_hz)} Hz`]);
  if (j.fp_hz !== undefined) rows.push(['fp (radiator)', `${sig(j.fp_hz)} Hz`]);
  if (j.port_length_cm !== undefined)
    rows.push([
      'port length',
      `${sig(j.port_length_cm)} cm each` + (j.port_count === null ? '' : ` (${j.port_count} port${j.port_count === 1 ? '' : 's'})`),
    ]);
  // The box kind's other figures (pipe resonance, chamber volumes...), in its own words.
  for (const b of j.box_figures) if (!['fb', 'fp', 'port-length'].includes(b.id)) rows.push([b.label, `${sig(b.value)} ${b.unit}`]);
  rows.push(
    ['f3 / f6 / f10', `${sig(j.f3_hz)} / ${sig(j.f6_hz)} / ${sig(j.f10_hz)} Hz`],
    ['eta0', `${sig(j.driver.eta0_pct)} %`],
    ['sensitivity', `${db(j.sensitivity_db)} dB SPL, 2.83 V at 1 m (${a.system.listening.space} space, without the baffle step)`],
    [
      `at ${sig(j.drive_v)} V, ${sig(a.system.listening.distance)} m`,
      `passband ${db(j.passband_spl_db)} dB` +
        (bass ? `; 30/40/50 Hz ${db(j.spl_30_db)} / ${db(j.spl_40_db)} / ${db(j.spl_50_db)} dB` : ''),
    ],
    ['peak excursion', `${sig(j.peak_excursion_mm)} mm at ${sig(j.drive_v)} V (Xmax ${sig(j.driver.xmax_mm)} mm)`],
  );
  if (j.peak_port_speed_m_s !== null) rows.push(['peak port air speed', `${sig(j.peak_port_speed_m_s)} m/s at ${sig(j.drive_v)} V`]);
  rows.push([j.network ? 'minimum impedance (network)' : 'minimum impedance', `${sig(j.z_min_ohm)} ohm`]);
  if (bass) rows.push(['group delay at 40 Hz', `${sig(j.group_delay_40_ms)} ms`]);
  for (const p of j.network?.parts ?? []) {
    const rated = p.rated_w === null ? '' : ` (rated ${sig(p.rated_w)} W)`;
    rows.push([
      `part ${p.part}`,
      `${sig(p.peak_current_a)} A rms at ${sig(p.peak_current_hz)} Hz, ` +
        (p.peak_power_w ? `${sig(p.peak_power_w)} W at ${sig(p.peak_power_hz)} Hz${rated}` : 'no heat (an ideal part)') +
        ' (sine at the planned level)',
    ]);
  }
  return rows;
}

function table(a: Analysis): string {
  const j = analysisJson(a);
  const sections: { title: string | null; rows: [string, string][] }[] = [{ title: null, rows: [['design', printable(a.system.name)]] }];
  if (j.ways.length === 1) {
    sections[0].rows.push(...wayRows(j.ways[0], a), ['planned level', `${sig(j.planned_volts_rms)} V rms`]);
  } else {
    for (const w of j.ways) sections.push({ title: `way "${printable(w.name)}"`, rows: wayRows(w, a) });
    const s = j.system;
    sections.push({
      title: 'system (all ways summed at the seat)',
      rows: [
        ['f3 / f6 / f10', `${sig(s.f3_hz)} / ${sig(s.f6_hz)} / ${sig(s.f10_hz)} Hz`],
        ['sensitivity', `${db(s.sensitivity_db)} dB SPL, 2.83 V at 1 m (${a.system.listening.space} space, without the baffle step)`],
        [`at ${sig(j.drive_v)} V, ${sig(a.system.listening.distance)} m`, `passband ${db(s.passband_spl_db)} dB`],
        ['group delay at 40 Hz', `${sig(s.group_delay_40_ms)} ms`],
        ['planned level', `${sig(s.planned_volts_rms)} V rms`],
      ],
    });
    const xo = s.crossover;
    for (const w of xo.ways)
      sections
        .at(-1)!
        .rows.push([
          `${w.name}: -6 dB points`,
          `${w.low_6db_hz === null ? 'below the grid' : `${sig(w.low_6db_hz)} Hz`} to ${w.high_6db_hz === null ? 'above the grid' : `${sig(w.high_6db_hz)} Hz`}`,
        ]);
    sections
      .at(-1)!
      .rows.push([
        'sum: largest deviation',
        `${db(xo.sum_deviation_db)} dB at ${sig(xo.sum_deviation_hz)} Hz (${sig(xo.from_hz)} Hz to ${sig(xo.to_hz)} Hz)`,
      ]);
    if (s.passive_load_min_ohm !== null)
      sections
        .at(-1)!
        .rows.push([
          'amplifier load minimum',
          `${sig(s.passive_load_min_ohm)} ohm at ${sig(s.passive_load_min_hz)} Hz (the passive ways together)`,
        ]);
  }
  if (j.room) {
    const r = j.room;
    sections.push({
      title: 'room (modal sum at the seat, first speaker)',
      rows: [
        ['Schroeder frequency', `${sig(r.schroeder_hz)} Hz (reverberation ${sig(r.t60_s)} s, Eyring)`],
        [
          'first modes',
          r.modes
            .slice(0, 6)
            .map((m) => `${sig(m.hz)} Hz (${m.nx},${m.ny},${m.nz})`)
            .join(', '),
        ],
        [
          'room against free, 20-200 Hz',
          `up to +${db(r.peak_db)} dB at ${sig(r.peak_hz)} Hz, down to ${db(r.dip_db)} dB at ${sig(r.dip_hz)} Hz`,
        ],
      ],
    });
  }
  const width = Math.max(...sections.flatMap((s) => s.rows.map(([k]) => k.length)));
  const lines = sections.flatMap((s) => [
    ...(s.title ? ['', s.title] : []),
    ...s.rows.map(([k, v]) => `${s.title ? '  ' : ''}${k.padEnd(width)}  ${v}`),
  ]);
  if (a.warnings.length) lines.push('', ...a.warnings.map(formatIssue));
  return lines.join('\n') + '\n';
}

/** --im-hz F1,F2: two numbers, a pair the two-tone measurement can take. */
function tonePair(value: string | undefined): [number, number] | null {
  if (value === undefined) return null;
  const parts = value.split(',');
  if (parts.length !== 2) throw new UsageError(`--im-hz takes two frequencies as F1,F2 (e.g. 40,420), got "${printable(value)}"`);
  const f1 = parseNumberOption(parts[0].trim(), '--im-hz F1', 10, 2000)!;
  const f2 = parseNumberOption(parts[1].trim(), '--im-hz F2', 30, 20000)!;
  const problem = checkTonePair(f1, f2);
  if (problem) throw new UsageError(`--im-hz: ${problem}`);
  return [f1, f2];
}

export const analyzeCommand: Command = {
  run: (argv) =>
    runGuarded('analyze', HELP, async () => {
      const { values, positionals } = parseCommandArgs(argv, {
        json: { type: 'boolean' },
        volts: { type: 'string' },
        distortion: { type: 'boolean' },
        'im-hz': { type: 'string' },
        help: { type: 'boolean', short: 'h' },
      });
      if (values.help) {
        process.stdout.write(HELP);
        return EXIT_OK;
      }
      if (positionals.length !== 1) throw new UsageError('expects exactly one design file');
      const driveV = parseNumberOption(values.volts, '--volts', 0.001, 2000);
      const pair = tonePair(values['im-hz'] as string | undefined);
      if (pair && !values.distortion) throw new UsageError('--im-hz goes with --distortion');
      const { system, warnings } = await loadDesignFile(positionals[0]);
      const a = analyze(system, { driveV });
      a.warnings.unshift(...warnings);
      if (values.distortion && !values.json) throw new UsageError('--distortion goes with --json');
      const json = values.json
        ? { ...analysisJson(a), ...(values.distortion ? { distortion: distortionJson(system, driveV, undefined, pair ?? undefined) } : {}) }
        : null;
      process.stdout.write(json ? JSON.stringify(json) + '\n' : table(a));
      return EXIT_OK;
    }),
};

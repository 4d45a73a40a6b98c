// preheard render / compare / headroom: the JSON contracts, exit codes, and bad WAV files
// (truncated, not RIFF, unsupported codec, zero length, absurd chunk sizes) that must exit 1 with a
// message and leave no output behind. WAV layout: the RIFF/WAVE format (Microsoft/IBM Multimedia
// Programming Interface 1.0, 1991).
import { describe, expect, it } from 'vitest';
import { runCli, spawnCli } from './helpers/cli.ts';
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import wavefile from 'wavefile';
import { parseDesign } from '../src/engine/design/validate.ts';
import { passbandPaPerV } from '../src/engine/level/calibration.ts';
import { renderBuffer } from '../src/engine/render/index.ts';
import { readWav, writeWav } from '../src/cli/wav.ts';

const dir = mkdtempSync(join(tmpdir(), 'preheard-render-'));
const VENTED = 'public/examples/living-room-vented.json';
const SEALED = 'public/examples/living-room-sealed.json';

function wavBytes(seconds: number, fs = 44100, channels = 2, bits: '16' | '24' | '32f' = '16', amp = 0.5): Uint8Array {
  const n = Math.round(seconds * fs);
  const data = Array.from({ length: channels }, (_, c) =>
    Array.from({ length: n }, (_, k) => {
      const t = k / fs;
      const v = amp * (Math.sin(2 * Math.PI * 45 * t) * Math.min(1, t * 10) + 0.2 * Math.sin(2 * Math.PI * (700 + 100 * c) * t));
      return bits === '32f' ? v : Math.round(v * (bits === '16' ? 32767 : 8388607));
    }),
  );
  const w = new wavefile.WaveFile();
  w.fromScratch(channels, fs, bits, data);
  return w.toBuffer();
}

const input = join(dir, 'in.wav');
writeFileSync(input, wavBytes(2));

describe('preheard render', () => {
  it('writes a WAV of the same length and rate and prints the summary contract', async () => {
    const out = join(dir, 'out.wav');
    const events = join(dir, 'events.json');
    const r = await runCli('render', VENTED, input, '-o', out, '--spl', '90', '--events', events, '--json');
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const s = JSON.parse(r.stdout);
    for (const k of [
      'duration_s',
      'sample_rate',
      'volts_fs',
      'peak_excursion_mm',
      'peak_coil_temp_c',
      'peak_port_speed_m_s',
      'amp_clip_s',
      'max_compression_db',
      'limiter_db',
      'realtime_factor',
    ]) {
      expect(typeof s[k], k).toBe('number');
    }
    expect(s.duration_s).toBe(2);
    expect(s.sample_rate).toBe(44100);
    expect(s.spl_db).toBeCloseTo(90, 1);
    expect(Array.isArray(s.events)).toBe(true);
    const w = new wavefile.WaveFile(new Uint8Array(readFileSync(out)));
    const ch = w.getSamples() as unknown as Float64Array[];
    expect(ch).toHaveLength(2);
    expect(ch[0].length).toBe(88200);
    expect(JSON.parse(readFileSync(events, 'utf8'))).toEqual(s.events);
  });
  it('writes during the render exactly the file the whole rendered buffer gives, in every mode and format', async () => {
    const parsed = parseDesign(JSON.parse(readFileSync(VENTED, 'utf8')));
    if (!parsed.ok) throw new Error('the example does not parse');
    const source = await readWav(input);
    for (const [mode, flag, format] of [
      ['nonlinear', [], '16'],
      ['residual', ['--residual'], '24'],
      ['linear', ['--linear'], 'f32'],
    ] as const) {
      const out = join(dir, `streamed-${mode}.wav`),
        whole = join(dir, `whole-${mode}.wav`);
      const r = await runCli('render', VENTED, input, '-o', out, '--volts', '8', '--format', format, '--threads', '1', ...flag);
      expect(r.status, r.stderr).toBe(0);
      const result = renderBuffer(parsed.system, source.channels, source.sampleRate, { voltsFs: 8, mode });
      await writeWav(whole, result.audio, source.sampleRate, format);
      expect(Buffer.from(readFileSync(out)).equals(readFileSync(whole)), mode).toBe(true);
    }
  });
  it('twice the volts gives 6 dB more drive and more excursion; --linear and --residual are accepted', async () => {
    const a = JSON.parse((await runCli('render', SEALED, input, '-o', join(dir, 'a.wav'), '--volts', '5', '--json')).stdout);
    const b = JSON.parse((await runCli('render', SEALED, input, '-o', join(dir, 'b.wav'), '--volts', '10', '--json', '--residual')).stdout);
    expect(b.spl_db - a.spl_db).toBeCloseTo(6.02, 1);
    expect(b.peak_excursion_mm).toBeGreaterThan(a.peak_excursion_mm * 1.8);
    expect((await runCli('render', SEALED, input, '-o', join(dir, 'c.wav'), '--linear')).status).toBe(0);
  });
  it('--threads 2 (the bundle and its worker) writes the same file and figures as --threads 1', () => {
    const one = join(dir, 'threads-1.wav'),
      two = join(dir, 'threads-2.wav');
    const a = spawnCli('render', VENTED, input, '-o', one, '--spl', '100', '--json', '--threads', '1');
    const b = spawnCli('render', VENTED, input, '-o', two, '--spl', '100', '--json', '--threads', '2');
    expect([a.status, b.status]).toEqual([0, 0]);
    const { realtime_factor: _a, ...sa } = JSON.parse(a.stdout);
    const { realtime_factor: _b, ...sb } = JSON.parse(b.stdout);
    expect(sb).toEqual(sa);
    expect(Buffer.compare(readFileSync(one), readFileSync(two))).toBe(0);
    const h1 = spawnCli('headroom', SEALED, input, '--json', '--threads', '1');
    const h2 = spawnCli('headroom', SEALED, input, '--json', '--threads', '2');
    expect(h2.stdout).toBe(h1.stdout);
  });
  it('exits 2 on usage errors', async () => {
    expect((await runCli('render', VENTED, input, '-o', join(dir, 'x.wav'), '--threads', '3')).status).toBe(2);
    expect((await runCli('headroom', VENTED, input, '--threads', 'two')).status).toBe(2);
    expect((await runCli('render', VENTED, input)).status).toBe(2);
    expect((await runCli('render', VENTED, input, '-o', join(dir, 'x.wav'), '--volts', '1', '--spl', '80')).status).toBe(2);
    expect((await runCli('render', VENTED, input, '-o', join(dir, 'x.wav'), '--linear', '--residual')).status).toBe(2);
    expect(spawnCli('render', VENTED, input).status).toBe(2);
    const bad = join(dir, 'bad-subprocess.wav');
    writeFileSync(bad, new Uint8Array(10));
    const r = spawnCli('render', VENTED, bad, '-o', join(dir, 'never.wav'));
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/not a WAV file/);
    expect(existsSync(join(dir, 'never.wav'))).toBe(false);
  });

  const good = wavBytes(0.2, 44100, 1);
  const truncated = good.slice(0, good.length - 1000);
  const notRiff = new TextEncoder().encode('PK\u0003\u0004this is a zip file, honestly......................');
  const fakeMp3 = new TextEncoder().encode('ID3\u0003\u0000\u0000\u0000\u0000\u0000\u0000this is not an mp3 file......................');
  const mulaw = good.slice();
  new DataView(mulaw.buffer).setUint16(20, 7, true); // format code 7: mu-law
  const pcm8 = wavBytes(0.1, 8000, 1);
  new DataView(pcm8.buffer).setUint16(34, 8, true); // claims 8-bit
  const zero = wavBytes(0.2, 44100, 1).slice(0, 44);
  new DataView(zero.buffer).setUint32(40, 0, true);
  const absurd = good.slice();
  new DataView(absurd.buffer).setUint32(40, 0xfffffff0, true); // data chunk of 4 GiB
  const absurdChunk = good.slice();
  new DataView(absurdChunk.buffer).setUint32(16, 0x7fffffff, true); // fmt chunk of 2 GiB
  const cases: [string, Uint8Array, RegExp][] = [
    ['truncated', truncated, /truncated/],
    ['not RIFF', notRiff, /not a WAV file/],
    ['an MP3 tag over no audio', fakeMp3, /not a valid MP3 file/],
    ['unsupported codec', mulaw, /format code 7 is not supported/],
    ['unsupported bit depth', pcm8, /8-bit PCM is not supported|block align/],
    ['zero length', zero, /zero length/],
    ['absurd data size', absurd, /truncated/],
    ['absurd chunk size', absurdChunk, /declares|at least 16/],
    ['empty file', new Uint8Array(0), /empty/],
  ];
  for (const [name, bytes, pattern] of cases) {
    it(`bad input (${name}) exits 1 with a message and leaves no output`, async () => {
      const sub = mkdtempSync(join(dir, 'bad-'));
      const inp = join(sub, 'in.wav');
      writeFileSync(inp, bytes);
      const out = join(sub, 'out.wav');
      const r = await runCli('render', VENTED, inp, '-o', out);
      expect(r.status).toBe(1);
      expect(r.stderr).toMatch(pattern);
      expect(existsSync(out)).toBe(false);
      expect(readdirSync(sub)).toEqual(['in.wav']);
    });
  }
});

describe('preheard headroom and compare', () => {
  it('headroom: rendering at clean_volts gives no event, 0.5 dB above gives one', async () => {
    const r = await runCli('headroom', SEALED, input, '--json');
    expect(r.status).toBe(0);
    const h = JSON.parse(r.stdout);
    expect(Object.keys(h).sort()).toEqual(['clean_spl_db', 'clean_volts', 'first_limit', 'first_limit_s', 'first_limit_way']);
    const at = JSON.parse(
      (await runCli('render', SEALED, input, '-o', join(dir, 'h0.wav'), '--volts', String(h.clean_volts), '--json')).stdout,
    );
    const above = JSON.parse(
      (await runCli('render', SEALED, input, '-o', join(dir, 'h1.wav'), '--volts', String(h.clean_volts * 10 ** (0.5 / 20)), '--json'))
        .stdout,
    );
    expect(at.events).toHaveLength(0);
    expect(above.events.length).toBeGreaterThan(0);
    expect(above.events.map((e: { kind: string }) => e.kind)).toContain(h.first_limit);
  });
  it('compare --json gives a and b summaries and writes both files', async () => {
    const prefix = join(dir, 'cmp');
    const r = await runCli('compare', SEALED, VENTED, input, '-o', prefix, '--spl', '85', '--json');
    expect(r.status).toBe(0);
    const j = JSON.parse(r.stdout);
    for (const side of [j.a, j.b]) {
      expect(side.spl_db).toBeCloseTo(85, 1);
      expect(typeof side.peak_excursion_mm).toBe('number');
      expect(typeof side.f3_hz).toBe('number');
    }
    expect(j.b.f3_hz).toBeLessThan(j.a.f3_hz);
    expect(existsSync(`${prefix}-a.wav`) && existsSync(`${prefix}-b.wav`)).toBe(true);
    // The bench's level policy (src/audio/levels.ts), worked out here from the two summaries: each
    // passband at full scale is passbandPaPerV·volts; the louder one sets -6 dBFS, matching brings
    // both to the quieter one's.
    const pass = (side: typeof j.a, design: string) => {
      const r = parseDesign(JSON.parse(readFileSync(design, 'utf8')));
      if (!r.ok) throw new Error('example invalid');
      return passbandPaPerV(r.system) * side.volts_fs;
    };
    const pa = pass(j.a, SEALED),
      pb = pass(j.b, VENTED);
    expect(pa / j.a.pa_per_fs).toBeCloseTo(Math.min(pa, pb) / (2 * Math.max(pa, pb)), 4);
    expect(pb / j.b.pa_per_fs).toBeCloseTo(Math.min(pa, pb) / (2 * Math.max(pa, pb)), 4);
    expect(j.match_db).toBeCloseTo(20 * Math.log10(j.a.pa_per_fs / j.b.pa_per_fs), 1);
  });
});

// The CLI never overwrites its inputs, never leaves partial files, never hangs on an endless
// source, and speaks to a person: one message, no stack frames, no names from inside the program.
import { describe, expect, it } from 'vitest';
import { spawn, spawnSync, type SpawnSyncOptions } from 'node:child_process';
import { chmodSync, linkSync, mkdtempSync, readdirSync, readFileSync, statSync, symlinkSync, writeFileSync, copyFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import wavefile from 'wavefile';
import { STAGING_PREFIX } from '../src/cli/output-files.ts';
import { wavHeader } from '../src/wav/encode.ts';
import { MAX_LISTED, printable } from '../src/cli/user-text.ts';

const CLI = ['src/cli/preheard.mjs'];
const cli = (args: string[], opt: SpawnSyncOptions = {}) =>
  spawnSync(process.execPath, [...CLI, ...args], { encoding: 'utf8', timeout: 120_000, ...opt }) as ReturnType<typeof spawnSync> & {
    stdout: string;
    stderr: string;
  };
const VENTED = 'public/examples/living-room-vented.json';
const SEALED = 'public/examples/living-room-sealed.json';
const root = mkdtempSync(join(tmpdir(), 'preheard-safety-'));
const dirnameOf = (f: string) => f.slice(0, f.lastIndexOf('/'));

function wav(seconds: number, channels = 2, fs = 44100): Uint8Array {
  const n = Math.round(seconds * fs);
  const data = Array.from({ length: channels }, (_, c) =>
    Array.from({ length: n }, (_, k) => Math.round(12000 * Math.sin((2 * Math.PI * (50 + 30 * c) * k) / fs))),
  );
  const w = new wavefile.WaveFile();
  w.fromScratch(channels, fs, '16', data);
  return w.toBuffer();
}

/** A fresh folder holding the two example designs and a short WAV. */
function folder() {
  const d = mkdtempSync(join(root, 'case-'));
  copyFileSync(VENTED, join(d, 'v.json'));
  copyFileSync(SEALED, join(d, 's.json'));
  writeFileSync(join(d, 'in.wav'), wav(0.3));
  const snapshot = () =>
    Object.fromEntries(
      readdirSync(d, { withFileTypes: true })
        .filter((f) => !f.isDirectory())
        .map((f) => [f.name, readFileSync(join(d, f.name)).toString('base64')]),
    );
  return { d, p: (f: string) => join(d, f), snapshot };
}

describe('outputs never overwrite inputs', () => {
  const cases: [string, (p: (f: string) => string) => string[], RegExp][] = [
    ['render -o onto the input audio', (p) => ['render', p('v.json'), p('in.wav'), '-o', p('in.wav')], /is the input/],
    ['render -o onto the design', (p) => ['render', p('v.json'), p('in.wav'), '-o', p('v.json')], /is the input/],
    [
      '--events onto the input audio',
      (p) => ['render', p('v.json'), p('in.wav'), '-o', p('o.wav'), '--events', p('in.wav')],
      /is the input/,
    ],
    ['--events onto the design', (p) => ['render', p('v.json'), p('in.wav'), '-o', p('o.wav'), '--events', p('v.json')], /is the input/],
    ['--events and -o the same file', (p) => ['render', p('v.json'), p('in.wav'), '-o', p('o.wav'), '--events', p('o.wav')], /same file/],
    ['compare writing onto its input x-a.wav', (p) => ['compare', p('s.json'), p('v.json'), p('x-a.wav'), '-o', p('x')], /is the input/],
    ['a symbolic link to the input', (p) => ['render', p('v.json'), p('in.wav'), '-o', p('link.wav')], /is the input/],
    ['a hard link to the input', (p) => ['render', p('v.json'), p('in.wav'), '-o', p('hard.wav')], /is the input/],
    [
      'the input through a relative path with ..',
      (p) => ['render', p('v.json'), p('in.wav'), '-o', join(p('sub'), '..', 'in.wav')],
      /is the input/,
    ],
  ];
  for (const [name, args, pattern] of cases) {
    it(`refuses ${name} (exit 1, every file unchanged)`, () => {
      const { d, p, snapshot } = folder();
      copyFileSync(p('in.wav'), p('x-a.wav'));
      symlinkSync(p('in.wav'), p('link.wav'));
      linkSync(p('in.wav'), p('hard.wav'));
      mkdtempSync(join(d, 'sub'));
      const before = snapshot();
      const r = cli(args(p).map((a) => a.replace(/sub$/, readdirSync(d).find((f) => f.startsWith('sub'))!)));
      expect(r.status).toBe(1);
      expect(r.stderr).toMatch(pattern);
      expect(snapshot()).toEqual(before);
    });
  }

  it('refuses a missing --events folder before any work: no out.wav appears', () => {
    const { p, snapshot } = folder();
    const before = snapshot();
    const r = cli(['render', p('v.json'), p('in.wav'), '-o', p('out.wav'), '--events', p('nodir/ev.json')]);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/folder does not exist/);
    expect(snapshot()).toEqual(before);
  });

  it('refuses a FIFO and a device node as -o and leaves them what they were', () => {
    const { p } = folder();
    expect(spawnSync('mkfifo', [p('pipe')]).status).toBe(0);
    const r = cli(['render', p('v.json'), p('in.wav'), '-o', p('pipe')]);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/named pipe/);
    expect(statSync(p('pipe')).isFIFO()).toBe(true);
    const dev = cli(['render', p('v.json'), p('in.wav'), '-o', '/dev/null']);
    expect(dev.status).toBe(1);
    expect(dev.stderr).toMatch(/a device/);
    expect(statSync('/dev/null').isCharacterDevice()).toBe(true);
  });

  it('replaces an existing regular output file, and writes through a link to one', () => {
    const { p } = folder();
    writeFileSync(p('old.wav'), 'previous content');
    symlinkSync(p('old.wav'), p('to-old.wav'));
    const r = cli(['render', p('v.json'), p('in.wav'), '-o', p('to-old.wav'), '--volts', '2']);
    expect(r.status).toBe(0);
    expect(readFileSync(p('old.wav')).subarray(0, 4).toString()).toBe('RIFF');
    expect(readdirSync(dirnameOf(p('x'))).filter((f) => f.startsWith('.'))).toEqual([]);
  });
});

describe('compare puts both outputs in place together', () => {
  it('a failure in design B leaves no output of A (before: -a.wav was written first)', () => {
    const { p, snapshot } = folder();
    const b = JSON.parse(readFileSync(p('v.json'), 'utf8'));
    b.listening.level = { mode: 'spl', spl_db: 140 };
    b.amplifier.power_w = 1;
    writeFileSync(p('loud.json'), JSON.stringify(b));
    const w = new wavefile.WaveFile();
    w.fromScratch(1, 44100, '16', [Array.from({ length: 13230 }, (_, k) => Math.round(40 * Math.sin(k / 20)))]);
    writeFileSync(p('quiet.wav'), w.toBuffer());
    const before = snapshot();
    const r = cli(['compare', p('s.json'), p('loud.json'), p('quiet.wav'), '-o', p('x')]);
    expect(r.status).toBe(1);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(snapshot()).toEqual(before);
  });
  it('both outputs appear only together, and no private folder is left', () => {
    const { d, p } = folder();
    const r = cli(['compare', p('s.json'), p('v.json'), p('in.wav'), '-o', p('x'), '--volts', '3']);
    expect(r.status).toBe(0);
    expect(readdirSync(d).sort()).toEqual(['in.wav', 's.json', 'v.json', 'x-a.wav', 'x-b.wav']);
  });
  it('an error after the first output was staged removes it (the plan, directly)', async () => {
    const { d, p } = folder();
    const { planOutputs, discardAllOutputs } = await import('../src/cli/output-files.ts');
    const plan = await planOutputs([p('in.wav')], [p('x-a.wav'), p('x-b.wav')]);
    writeFileSync(plan.staging(p('x-a.wav')), 'A');
    expect(readdirSync(d).some((f) => f.startsWith(STAGING_PREFIX))).toBe(true);
    discardAllOutputs();
    expect(readdirSync(d).sort()).toEqual(['in.wav', 's.json', 'v.json']);
  });
});

describe('signals during the write leave nothing behind', () => {
  const LONG_S = Number(process.env.SIGNAL_TRACK_S ?? 5);
  const TRIES = Number(process.env.SIGNAL_TRIES ?? 3);
  /** Starts a render and signals it the moment its private output folder appears. */
  async function interrupt(signal: NodeJS.Signals): Promise<{ hit: boolean; code: number | null; signal: string | null; left: string[] }> {
    const { d, p } = folder();
    writeFileSync(p('long.wav'), wav(LONG_S, 2, 48000));
    const child = spawn(process.execPath, [...CLI, 'render', p('v.json'), p('long.wav'), '-o', p('out.wav'), '--format', 'f32'], {
      stdio: 'ignore',
    });
    let hit = false;
    const exited = new Promise<[number | null, string | null]>((res) => child.on('exit', (c, s) => res([c, s])));
    let done = false;
    void exited.then(() => (done = true));
    while (!done) {
      if (readdirSync(d).some((f) => f.startsWith(STAGING_PREFIX))) {
        hit = true;
        child.kill(signal);
        break;
      }
      await new Promise((r) => setTimeout(r, 2));
    }
    const [code, sig] = await exited;
    return { hit, code, signal: sig, left: readdirSync(d).filter((f) => !['v.json', 's.json', 'in.wav', 'long.wav'].includes(f)) };
  }
  for (const signal of ['SIGINT', 'SIGTERM'] as const) {
    it(`${signal} while the output is being written: no out.wav, no temporary file (${TRIES} tries)`, async () => {
      let hits = 0;
      for (let k = 0; k < TRIES; k++) {
        const r = await interrupt(signal);
        if (r.hit) {
          hits++;
          // Either the signal arrived before the rename (nothing left) or just after it (a whole out.wav).
          expect(r.left.filter((f) => f !== 'out.wav')).toEqual([]);
          if (r.signal === signal) expect(r.left).toEqual([]);
        } else expect(r.left).toEqual(['out.wav']);
      }
      if (process.env.SIGNAL_TRIES) console.log(`${signal}: ${hits} of ${TRIES} signals landed while writing`);
      expect(hits).toBeGreaterThan(0);
    }, 300_000);
  }
});

describe('a signal during the render', () => {
  /** A 16-bit stereo 48 kHz WAV of a 50 Hz tone, written directly (a long file, built fast). */
  function longWav(seconds: number): Uint8Array {
    const frames = seconds * 48000;
    const bytes = new Uint8Array(44 + frames * 4);
    bytes.set(wavHeader(2, 48000, '16', frames), 0);
    const samples = new Int16Array(bytes.buffer, 44, frames * 2);
    for (let k = 0; k < frames; k++) samples[2 * k] = samples[2 * k + 1] = Math.round(12000 * Math.sin((2 * Math.PI * 50 * k) / 48000));
    return bytes;
  }

  // Rendering runs without a break, so a signal handler could only run once it ends: the output is
  // not staged (and no handler installed) until the render is done, and Ctrl-C stops it at once.
  it('SIGINT while the engine renders stops it at once and leaves nothing', async () => {
    const { d, p } = folder();
    writeFileSync(p('long.wav'), longWav(600));
    const child = spawn(process.execPath, [...CLI, 'render', p('v.json'), p('long.wav'), '-o', p('out.wav')], { stdio: 'ignore' });
    const exited = new Promise<[number | null, string | null]>((res) => child.on('exit', (c, s) => res([c, s])));
    // Well into the work: 10 minutes of stereo take several seconds to render here.
    await new Promise((r) => setTimeout(r, 3000));
    const t0 = Date.now();
    child.kill('SIGINT');
    const [code, signal] = await exited;
    expect(signal === 'SIGINT' || code === 130, `exit ${code} ${signal}`).toBe(true);
    expect(Date.now() - t0).toBeLessThan(1500);
    expect(readdirSync(d).filter((f) => !['v.json', 's.json', 'in.wav', 'long.wav'].includes(f))).toEqual([]);
  }, 60_000);
});

describe('design files that never end, or cannot be read', () => {
  for (const source of ['/dev/zero', '/dev/urandom']) {
    it(`${source}: one message, no reading without limit`, () => {
      const r = cli(['analyze', source], { timeout: 30_000 });
      expect(r.status).toBe(1);
      expect(r.stderr.trim().split('\n')).toEqual([
        `preheard analyze: ${source} is not a regular file (a device, pipe or socket): give a design file`,
      ]);
    });
  }
  it('a FIFO with no writer: one message instead of waiting for ever', () => {
    const { p } = folder();
    expect(spawnSync('mkfifo', [p('design.json')]).status).toBe(0);
    const r = cli(['analyze', p('design.json')], { timeout: 30_000 });
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/is not a regular file/);
  });
  it('a file over 1 MiB is refused having read at most 1 MiB + 1 byte', () => {
    const { p } = folder();
    writeFileSync(p('big.json'), `{"name": "${'x'.repeat(3 << 20)}"}`);
    const r = cli(['analyze', p('big.json')]);
    expect(r.status).toBe(1);
    expect(r.stderr.trim()).toBe(
      `preheard analyze: ${p('big.json')} is larger than 1 MiB, too large for a design file (real ones are a few kB)`,
    );
  });
  it('a UTF-8 byte-order mark is accepted, as the app accepts it', () => {
    const { p } = folder();
    writeFileSync(p('bom.json'), `\ufeff${readFileSync(VENTED, 'utf8')}`);
    const r = cli(['analyze', p('bom.json'), '--json']);
    expect(r.status).toBe(0);
    expect(JSON.parse(r.stdout).f3_hz).toBeGreaterThan(20);
  });
  it('a design nested 10,000 levels deep: one problem, no stack overflow', () => {
    const { p } = folder();
    const deep = `${'['.repeat(10_000)}1${']'.repeat(10_000)}`;
    writeFileSync(p('deep.json'), readFileSync(VENTED, 'utf8').replace('"re_ohm"', `"bl_rel_per_mm": ${deep}, "re_ohm"`));
    const r = cli(['analyze', p('deep.json')]);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/nests more than 16 levels deep/);
    expect(r.stderr).not.toMatch(/call stack|\n\s+at /);
  });
  it('an unreadable design file (EACCES) and a missing one (ENOENT) give a message in words', () => {
    const { p } = folder();
    chmodSync(p('v.json'), 0o000);
    // root reads anything: run the CLI as "nobody" then.
    const asUser = process.getuid?.() === 0 ? { uid: 65534, gid: 65534 } : {};
    chmodSync(dirnameOf(p('v.json')), 0o755);
    chmodSync(root, 0o755);
    const r = cli(['analyze', p('v.json')], asUser);
    expect(r.stderr.trim()).toBe(
      `preheard analyze: cannot read the design file ${p('v.json')}: permission denied (this user may not open it)`,
    );
    expect(r.status).toBe(1);
    const m = cli(['analyze', p('missing.json')]);
    expect(m.stderr.trim()).toBe(`preheard analyze: cannot read the design file ${p('missing.json')}: there is no such file`);
  });
});

describe('messages are for people', () => {
  it('150,000 problems print at most the first few and a count', () => {
    const { p } = folder();
    const d = JSON.parse(readFileSync(VENTED, 'utf8'));
    d.driver.bl_rel_per_mm = Array(150_000).fill('x');
    writeFileSync(p('many.json'), JSON.stringify(d));
    const r = cli(['analyze', p('many.json')]);
    expect(r.status).toBe(1);
    const lines = r.stderr.trim().split('\n');
    expect(lines).toHaveLength(MAX_LISTED + 2);
    expect(lines.at(-1)).toMatch(/and \d+ more problems \(\d+ in all\)/);
  });
  it('terminal control characters in a design name and in file names are shown escaped', () => {
    const { p } = folder();
    const d = JSON.parse(readFileSync(VENTED, 'utf8'));
    d.name = 'evil \u001b]0;owned\u0007 \u001b[2J \u009b31m name';
    writeFileSync(p('evil.json'), JSON.stringify(d));
    const r = cli(['analyze', p('evil.json')]);
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('evil \\x1b]0;owned\\x07 \\x1b[2J \\x9b31m name');
    // biome-ignore lint/suspicious/noControlCharactersInRegex: finding control characters is the point
    expect(r.stdout).not.toMatch(/[\u0000-\u0009\u000b-\u001f\u007f-\u009f]/);
    const bad = cli(['analyze', join(p(''), 'no\u001b[31mfile.json')]);
    expect(bad.stderr).not.toContain('\u001b');
    expect(bad.stderr).toContain('no\\x1b[31mfile.json');
    expect(printable('a\nb', true)).toBe('a\nb');
  });
  it('--volts takes decimal numbers only', () => {
    const { p } = folder();
    for (const v of ['0x10', '0b11', '0o7', 'Infinity', '', ' 5', '1_0']) {
      const r = cli(['render', p('v.json'), p('in.wav'), '-o', p('o.wav'), '--volts', v]);
      expect(r.status, v).toBe(2);
      expect(r.stderr.split('\n')[0]).toBe(`preheard render: --volts must be a decimal number, got "${v}"`);
    }
    expect(cli(['render', p('v.json'), p('in.wav'), '-o', p('o.wav'), '--volts', '1.5e1']).status).toBe(0);
  });
  it('a 1-LSB track: no internal names in render, headroom or compare', () => {
    const { p } = folder();
    const w = new wavefile.WaveFile();
    w.fromScratch(1, 44100, '16', [Array.from({ length: 22050 }, (_, k) => (k % 2 ? 1 : -1))]);
    writeFileSync(p('lsb.wav'), w.toBuffer());
    for (const args of [
      ['render', p('v.json'), p('lsb.wav'), '-o', p('o.wav')],
      ['headroom', p('v.json'), p('lsb.wav')],
      ['compare', p('s.json'), p('v.json'), p('lsb.wav'), '-o', p('x')],
    ]) {
      const r = cli(args);
      expect(r.stderr + r.stdout).not.toMatch(/voltsFs|sampleRate|RangeError/);
    }
    const h = cli(['headroom', p('v.json'), p('lsb.wav'), '--json']);
    expect(h.status).toBe(0);
    expect(JSON.parse(h.stdout).clean_volts).toBeLessThan(10_000);
  });
  it('sweep refuses more than 400 steps and more threads than cores, with a message', () => {
    const { p } = folder();
    const many = cli(['sweep', p('v.json'), p('in.wav'), '--vb', '10:209:1', '--fb', '20:219:1']);
    expect(many.status).toBe(2);
    expect(many.stderr.split('\n')[0]).toBe(
      'preheard sweep: 200 volumes × 200 tunings is 40000 steps, more than the 400 a sweep runs: use a larger STEP or a narrower range',
    );
    const t = cli(['sweep', p('v.json'), p('in.wav'), '--vb', '10:12:1', '--threads', '64']);
    expect(t.status).toBe(2);
    expect(t.stderr.split('\n')[0]).toMatch(/^preheard sweep: --threads must be from 1 to \d+ \(the cores of this machine\), got 64$/);
  });
});

describe('every CLI error path: one message, no stack frames, no internal names', () => {
  const { d, p } = folder();
  writeFileSync(p('notjson.json'), '{ this is not json');
  writeFileSync(p('empty.wav'), '');
  writeFileSync(p('text.wav'), 'just some text, not audio at all.......');
  const silent = new wavefile.WaveFile();
  silent.fromScratch(1, 44100, '16', [new Array(4410).fill(0)]);
  writeFileSync(p('silent.wav'), silent.toBuffer());
  const cases: [string[], number][] = [
    [['nosuchcommand'], 2],
    [['analyze'], 2],
    [['analyze', p('missing.json')], 1],
    [['analyze', d], 1],
    [['analyze', '/dev/zero'], 1],
    [['analyze', p('notjson.json')], 1],
    [['analyze', p('v.json'), '--volts', 'abc'], 2],
    [['analyze', p('v.json'), '--bogus'], 2],
    [['render', p('v.json'), p('in.wav')], 2],
    [['render', p('v.json'), p('in.wav'), '-o', p('o.wav'), '--format', '8'], 2],
    [['render', p('v.json'), p('in.wav'), '-o', p('o.wav'), '--spl', '300'], 2],
    [['render', p('v.json'), p('missing.wav'), '-o', p('o.wav')], 1],
    [['render', p('v.json'), p('empty.wav'), '-o', p('o.wav')], 1],
    [['render', p('v.json'), p('text.wav'), '-o', p('o.wav')], 1],
    [['render', p('v.json'), p('silent.wav'), '-o', p('o.wav')], 1],
    [['render', p('v.json'), d, '-o', p('o.wav')], 1],
    [['render', p('v.json'), p('in.wav'), '-o', p('in.wav')], 1],
    [['render', p('v.json'), p('in.wav'), '-o', join(p('nodir'), 'o.wav')], 1],
    [['render', p('v.json'), p('in.wav'), '-o', d], 1],
    [['headroom', p('v.json'), p('silent.wav')], 1],
    [['headroom', p('v.json')], 2],
    [['compare', p('s.json'), p('v.json'), p('in.wav')], 2],
    [['compare', p('s.json'), p('v.json'), p('silent.wav'), '-o', p('x')], 1],
    [['sweep', p('s.json'), p('in.wav'), '--fb', '30:40:5'], 1],
    [['sweep', p('s.json'), p('in.wav'), '--vb', 'a:b:c'], 2],
    [['sweep', p('s.json'), p('in.wav'), '--vb', '10:20:1', '--threads', '0x2'], 2],
  ];
  for (const [args, code] of cases) {
    it(`${args.map((a) => a.replace(d, '.')).join(' ')} -> exit ${code}`, () => {
      const r = cli(args);
      expect(r.status).toBe(code);
      const lines = r.stderr.split('\n');
      expect(lines[0]).toMatch(/^preheard( \w+)?: \S/);
      // Exit 1: exactly one line. Exit 2: one line, then a blank line and the help text.
      if (code === 1) expect(r.stderr.endsWith('\n') && lines.length).toBe(2);
      else expect(lines[1]).toBe('');
      expect(r.stderr).not.toMatch(/^\s+at /m);
      expect(r.stderr).not.toMatch(/voltsFs|sampleRate|TypeError|RangeError|ReferenceError|undefined|ENOENT|EACCES|EISDIR|node:internal/);
    });
  }
});

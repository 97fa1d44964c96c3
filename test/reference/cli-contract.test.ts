/**
 * Requirement 7: the command line's contract, run for real
 * (`npm run -s tuckline -- …` as a subprocess from the project root).
 * Fixtures are synthesised here: a kick stem with hits at known times, the
 * same part as a MIDI file (written with the midi-file package, GM kick 36 on
 * channel 10), a bass stem that is silent around one hit, and the shape file
 * from the issue.
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { writeMidi } from 'midi-file';
import ToneMidi from '@tonejs/midi';
import { beforeAll, describe, expect, it } from 'vitest';
import { encodeWav } from '../../shared/formats/wav-write';

const root = resolve(import.meta.dirname, '../..');
const dir = mkdtempSync(join(tmpdir(), 'tuckline-cli-'));
const SR = 48000;
const HITS = [0.5, 1.0, 1.5, 2.0, 2.5, 3.0];
const f = (name: string) => join(dir, name);

function run(...args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  return new Promise((done) => {
    const child = spawn('npm', ['run', '-s', 'tuckline', '--', ...args], { cwd: root });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d) => (stdout += d));
    child.stderr.on('data', (d) => (stderr += d));
    child.on('close', (code) => done({ code: code ?? -1, stdout, stderr }));
  });
}

/** One line on stderr, our prefix, no stack trace. */
function expectOneLineError(stderr: string) {
  const lines = stderr.trimEnd().split('\n');
  expect(lines).toHaveLength(1);
  expect(lines[0]).toMatch(/^tuckline: /);
  expect(stderr).not.toMatch(/\n\s+at /);
}

beforeAll(async () => {
  const n = SR * 4;
  const kick = new Float32Array(n);
  for (const h of HITS) {
    const s = Math.round(h * SR);
    for (let i = 0; i < SR * 0.2 && s + i < n; i++) {
      const t = i / SR;
      kick[s + i] += 0.9 * Math.exp(-t / 0.05) * Math.sin(2 * Math.PI * (50 + 100 * Math.exp(-t / 0.01)) * t);
    }
  }
  writeFileSync(f('kick.wav'), encodeWav([kick], { sampleRate: SR, bitDepth: 16, sampleFormat: 'int' }));
  const bass = new Float32Array(n);
  for (let i = 0; i < n; i++) {
    const t = i / SR;
    bass[i] = t > 2.2 && t < 2.8 ? 0 : 0.5 * Math.sin(2 * Math.PI * 55 * t);
  }
  writeFileSync(f('bass.wav'), encodeWav([bass, bass], { sampleRate: SR, bitDepth: 24, sampleFormat: 'int' }));
  // 120 BPM, 480 PPQ: a hit every 480 ticks from tick 480.
  const events: Parameters<typeof writeMidi>[0]['tracks'][number] = [{ deltaTime: 0, meta: true, type: 'setTempo', microsecondsPerBeat: 500000 }];
  let last = 0;
  for (const h of HITS) {
    const tick = h * 960;
    events.push({ deltaTime: tick - last, channel: 9, type: 'noteOn', noteNumber: 36, velocity: 100 });
    events.push({ deltaTime: 60, channel: 9, type: 'noteOff', noteNumber: 36, velocity: 0 });
    last = tick + 60;
  }
  events.push({ deltaTime: 0, meta: true, type: 'endOfTrack' });
  writeFileSync(f('kick.mid'), Buffer.from(writeMidi({ header: { format: 0, numTracks: 1, ticksPerBeat: 480 }, tracks: [events] })));
  writeFileSync(f('shape.json'), '{"points":[{"tMs":-3,"gainDb":0},{"tMs":0,"gainDb":-40},{"tMs":50,"gainDb":-40},{"tMs":150,"gainDb":0}],"slopeGuardMs":5}');
  writeFileSync(f('bad-shape.json'), '{"points":[{"tMs":5,"gainDb":0},{"tMs":0,"gainDb":-40}]}');
  writeFileSync(f('broken.json'), '{"points":');
  writeFileSync(f('notes.txt'), 'not audio at all');
});

describe('tuckline CLI', () => {
  it('--help on the tool and each subcommand', async () => {
    const [tool, detect, stamp] = await Promise.all([run('--help'), run('detect', '--help'), run('stamp', '--help')]);
    for (const r of [tool, detect, stamp]) {
      expect(r.code).toBe(0);
      expect(r.stdout).toMatch(/^Usage: tuckline/);
    }
    expect(stamp.stdout).toContain('--shape');
    expect(stamp.stdout).toContain('--format csv|midi|wav');
  });

  it('detect <kick.wav> prints {source, sampleRate, durationSec, hits:[{timeSec, strength}]}', async () => {
    const r = await run('detect', f('kick.wav'));
    expect(r.code).toBe(0);
    const json = JSON.parse(r.stdout);
    expect(Object.keys(json)).toEqual(['source', 'sampleRate', 'durationSec', 'hits']);
    expect(json).toMatchObject({ source: 'audio', sampleRate: 48000, durationSec: 4 });
    expect(json.hits).toHaveLength(HITS.length);
    json.hits.forEach((h: { timeSec: number; strength: number }, i: number) => {
      expect(Object.keys(h)).toEqual(['timeSec', 'strength']);
      expect(Math.abs(h.timeSec - HITS[i])).toBeLessThan(0.005); // Tuckline's ±5 ms (REFERENCES.md "Onsets")
      expect(h.strength).toBeGreaterThan(0);
      expect(h.strength).toBeLessThanOrEqual(1);
    });
  });

  it('detect --threads 1 and --threads 2 print the same hits (a 4 s file is too short to split: one thread either way)', async () => {
    const [one, two] = await Promise.all([run('detect', f('kick.wav'), '--threads', '1'), run('detect', f('kick.wav'), '--threads', '2')]);
    expect(one.code).toBe(0);
    expect(two.code).toBe(0);
    expect(JSON.parse(two.stdout)).toEqual(JSON.parse(one.stdout));
    expect(JSON.parse(one.stdout).hits).toHaveLength(HITS.length);
  });

  it('detect <kick.mid> gives source midi and sampleRate null', async () => {
    const r = await run('detect', f('kick.mid'));
    expect(r.code).toBe(0);
    const json = JSON.parse(r.stdout);
    expect(json.source).toBe('midi');
    expect(json.sampleRate).toBeNull();
    expect(json.hits.map((h: { timeSec: number }) => h.timeSec)).toEqual(HITS);
  });

  it('stamp --format csv|midi|wav writes the export; --bass gates the hit where the bass is silent', async () => {
    const [csv, midi, wav] = await Promise.all([
      run('stamp', f('kick.wav'), '--shape', f('shape.json'), '--bass', f('bass.wav'), '--bpm', '120', '--format', 'csv', '--out', f('out.csv')),
      run('stamp', f('kick.mid'), '--shape', f('shape.json'), '--bass', f('bass.wav'), '--bpm', '120', '--ppq', '480', '--cc', '7', '--channel', '2', '--format', 'midi', '--out', f('out.mid')),
      run('stamp', f('kick.wav'), '--shape', f('shape.json'), '--bass', f('bass.wav'), '--format', 'wav', '--out', f('out.wav')),
    ]);
    for (const r of [csv, midi, wav]) {
      expect(r.stderr).toBe('');
      expect(r.code).toBe(0);
      expect(JSON.parse(r.stdout)).toMatchObject({ hits: 6, stampedHits: 5, gatedHits: 1 });
    }
    const text = readFileSync(f('out.csv'), 'utf8');
    expect(text.startsWith('time_s,gain_db,sample,bar_beat_tick,gain_linear\r\n')).toBe(true);
    expect(text).toContain(',-40.000,');
    const tone = new ToneMidi.Midi(readFileSync(f('out.mid')));
    expect(tone.header.ppq).toBe(480);
    const lane = tone.tracks.find((t) => t.name === 'bass')!; // named after the bass file
    // @tonejs/midi takes a track's channel from its notes; a CC-only track needs the raw status byte: B1 = CC on channel 2.
    expect(readFileSync(f('out.mid')).includes(Buffer.from([0xb1, 0x07]))).toBe(true);
    expect(lane.controlChanges[7].length).toBeGreaterThan(10);
    const wavBytes = readFileSync(f('out.wav'));
    expect(wavBytes.length).toBe(readFileSync(f('bass.wav')).length);
  });

  it('usage errors exit 2 with one line on stderr', async () => {
    const cases = await Promise.all([
      run(),
      run('nonsense'),
      run('detect'),
      run('stamp', f('kick.wav'), '--shape', f('shape.json'), '--out', f('x.csv')),
      run('stamp', f('kick.wav'), '--shape', f('shape.json'), '--format', 'wav', '--out', f('x.wav')),
      run('stamp', f('kick.wav'), '--shape', f('shape.json'), '--format', 'midi', '--cc', '300', '--out', f('x.mid')),
      run('stamp', f('kick.wav'), '--frobnicate', '--format', 'csv'),
      run('detect', f('kick.wav'), '--threads', '3'),
      run('detect', f('kick.wav'), '--threads', 'auto'),
    ]);
    for (const r of cases) {
      expect(r.code).toBe(2);
      expectOneLineError(r.stderr);
    }
    expect(existsSync(f('x.wav'))).toBe(false);
  });

  it('input errors exit 1 with one line on stderr and no stack trace', async () => {
    const cases = await Promise.all([
      run('detect', f('missing.wav')),
      run('detect', f('notes.txt')),
      run('stamp', f('kick.wav'), '--shape', f('bad-shape.json'), '--format', 'csv', '--out', f('y.csv')),
      run('stamp', f('kick.wav'), '--shape', f('broken.json'), '--format', 'csv', '--out', f('y.csv')),
      run('stamp', f('kick.wav'), '--shape', f('shape.json'), '--bass', f('notes.txt'), '--format', 'wav', '--out', f('y.wav')),
    ]);
    for (const r of cases) {
      expect(r.code).toBe(1);
      expectOneLineError(r.stderr);
    }
    expect(cases[2].stderr).toMatch(/tMs/);
  });
});

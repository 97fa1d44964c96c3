import { existsSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import ToneMidi from '@tonejs/midi';
import { parseMidi } from 'midi-file';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoPassword } from '../../server/seed/demo-scenario';
import { renderDemoStems, SUB_LEVEL } from '../../server/seed/demo-stems';
import { seedDemo } from '../../server/seed/seed-demo';
import { createTestContext, expectErrorShape, signIn, signUp, type Agent, type TestContext } from '../helpers/test-app';

let ctx: TestContext;
let teamId: string;
let engineer: Agent;
let assistant: Agent;
let outsider: Agent;
let songId: string;
let base: string;
// 8 bars of the trap pattern at 140 BPM; the sub is silent in bars 2 and 3 (known by construction).
const stems = renderDemoStems({ bpm: 140, bars: 8, silentBassBars: [2, 3] });

beforeAll(async () => {
  ctx = await createTestContext();
  teamId = (await seedDemo(ctx.db)).teamId;
  engineer = (await signIn(ctx, 'engineer@tuckline.test', demoPassword)).agent;
  assistant = (await signIn(ctx, 'assistant@tuckline.test', demoPassword)).agent;
  outsider = (await signUp(ctx, { email: 'nell.orr@example.test' })).agent;
  const song = await engineer.post(`/api/teams/${teamId}/songs`).send({ title: 'Low Tide Parade', artistAlias: 'Moss Harbor', bpm: 140 });
  songId = song.body.id;
  base = `/api/teams/${teamId}/songs/${songId}`;
});
afterAll(async () => ctx.close());

const storedFiles = () => {
  const dir = join(ctx.config.storageDir, 'songs', songId, 'stems');
  return existsSync(dir) ? readdirSync(dir).length : 0;
};
const tempFiles = () => readdirSync(join(ctx.config.storageDir, 'tmp')).length;

describe('stem uploads', () => {
  it('stores a kick stem, hashes it, and detects its hits on upload', async () => {
    const res = await assistant.post(`${base}/stems`).field('role', 'kick').attach('file', Buffer.from(stems.kickWav), 'LTP_Kick_v1.wav');
    expect(res.status).toBe(201);
    expect(res.body.stem).toMatchObject({ role: 'kick', slot: 'kick', revision: 1, isCurrent: true, format: 'wav', sampleRate: 48000, bitDepth: 24, channels: 2, originalName: 'LTP_Kick_v1.wav' });
    expect(res.body.stem.durationSec).toBeCloseTo(stems.durationSec, 3);
    // sha256 of the bytes sent (FIPS 180-4), computed independently by node:crypto.
    const { createHash } = await import('node:crypto');
    expect(res.body.stem.sha256).toBe(createHash('sha256').update(stems.kickWav).digest('hex'));
    const times = res.body.hitMap.hits.map((h: { timeSec: number }) => h.timeSec);
    expect(times).toHaveLength(stems.kickTimesSec.length);
    // Every written onset found within ±5 ms (REFERENCES.md "Onsets": Tuckline's window).
    stems.kickTimesSec.forEach((t, i) => expect(Math.abs(times[i] - t)).toBeLessThan(0.005));
  });

  it('stores a bass stem and serves its waveform overview and activity', async () => {
    const res = await engineer.post(`${base}/stems`).field('role', 'bass').field('slot', '808').attach('file', Buffer.from(stems.bassWav), '808_main.wav');
    expect(res.status).toBe(201);
    expect(res.body.stem).toMatchObject({ role: 'bass', slot: '808', revision: 1, channels: 1 });
    const overview = await engineer.get(`${base}/stems/${res.body.stem.id}/overview`);
    expect(overview.status).toBe(200);
    expect(overview.body.levels.map((l: { samplesPerBucket: number }) => l.samplesPerBucket)).toEqual([256, 2048, 16384]);
    const coarse = overview.body.levels[2];
    expect(coarse.peaks.length).toBe(2 * Math.ceil(overview.body.frames / 16384));
    // The sub is written at SUB_LEVEL of full scale (known by construction); 24-bit rounding and the overview's 4 decimals stay within 1e-4.
    expect(Math.max(...coarse.peaks)).toBeGreaterThan(SUB_LEVEL - 0.1);
    expect(Math.max(...coarse.peaks)).toBeLessThanOrEqual(SUB_LEVEL + 1e-4);
    const activity = await engineer.get(`${base}/stems/${res.body.stem.id}/activity`);
    expect(activity.body.hopSec).toBeCloseTo(0.005, 6);
  });

  it('makes a new revision for the same slot and keeps the old one', async () => {
    const res = await engineer.post(`${base}/stems`).field('role', 'bass').field('slot', '808').attach('file', Buffer.from(stems.bassWav), '808_main_v2.wav');
    expect(res.body.stem.revision).toBe(2);
    const list = (await engineer.get(`${base}/stems`)).body as { slot: string; revision: number; isCurrent: boolean; id: string }[];
    const revs = list.filter((s) => s.slot === '808');
    expect(revs.map((s) => [s.revision, s.isCurrent])).toEqual([
      [2, true],
      [1, false],
    ]);
    const restored = await engineer.post(`${base}/stems/${revs[1].id}/restore`);
    expect(restored.status).toBe(200);
    const after = (await engineer.get(`${base}/stems`)).body as { slot: string; revision: number; isCurrent: boolean }[];
    expect(after.filter((s) => s.slot === '808').map((s) => [s.revision, s.isCurrent])).toEqual([
      [2, false],
      [1, true],
    ]);
  });

  it.each<[string, Buffer, number]>([
    ['not RIFF', Buffer.from('ID3\u0004this is an mp3, honest'), 415],
    ['empty', Buffer.alloc(0), 400],
    ['truncated header', Buffer.from(stems.kickWav.subarray(0, 30)), 400],
  ])('refuses a %s file with %s, the error shape, and stores nothing', async (_what, bytes, status) => {
    const before = storedFiles();
    const res = await engineer.post(`${base}/stems`).field('role', 'kick').attach('file', bytes, 'broken.wav');
    expect(res.status).toBe(status);
    expect(typeof res.body.error.code).toBe('string');
    expect(res.body.error.message).not.toMatch(/at .*\.ts:\d+/);
    expect(storedFiles()).toBe(before);
    expect(tempFiles()).toBe(0);
    const list = (await engineer.get(`${base}/stems`)).body as unknown[];
    expect(list).toHaveLength(3);
  });

  it('refuses an upload without a file, or with a bad role, and leaves no temporary file', async () => {
    const noFile = await engineer.post(`${base}/stems`).field('role', 'kick');
    expect(noFile.status).toBe(400);
    expectErrorShape(noFile.body, 'uploads.no_file');
    const badRole = await engineer.post(`${base}/stems`).field('role', 'snare').attach('file', Buffer.from(stems.bassWav), 'x.wav');
    expect(badRole.status).toBe(400);
    expectErrorShape(badRole.body, 'request.invalid');
    expect(tempFiles()).toBe(0);
  });

  it('answers 413 for an upload over the limit and keeps nothing', async () => {
    const small = await createTestContext({ config: { maxUploadBytes: 64 * 1024 } });
    try {
      const tid = (await seedDemo(small.db)).teamId;
      const agent = (await signIn(small, 'engineer@tuckline.test', demoPassword)).agent;
      const s = await agent.post(`/api/teams/${tid}/songs`).send({ title: 'Too Big', bpm: 100 });
      const res = await agent.post(`/api/teams/${tid}/songs/${s.body.id}/stems`).field('role', 'kick').attach('file', Buffer.from(stems.kickWav), 'big.wav');
      expect(res.status).toBe(413);
      expectErrorShape(res.body, 'uploads.too_large');
      expect(readdirSync(join(small.config.storageDir, 'tmp'))).toEqual([]);
      expect((await small.db.$client.query('select count(*)::int n from stems')).rows[0].n).toBe(0);
    } finally {
      await small.close();
    }
  });

  it('answers 404 to another team', async () => {
    const res = await outsider.post(`${base}/stems`).field('role', 'kick').attach('file', Buffer.from(stems.kickWav), 'k.wav');
    expect(res.status).toBe(404);
    expect((await outsider.get(`${base}/stems`)).status).toBe(404);
  });
});

describe('hit map edits', () => {
  it('turns a range off, adds a hit, sets a per-hit depth, in one batch', async () => {
    const map = (await engineer.get(`${base}/hits`)).body as { hits: { id: string; timeSec: number; enabled: boolean }[] };
    const barSec = (60 / 140) * 4;
    const bar7 = 0.5 + 6 * barSec; // after the 0.5 s pre-roll
    const res = await assistant.patch(`${base}/hits`).send({
      range: { fromSec: bar7 - 0.001, toSec: bar7 + barSec - 0.001, enabled: false },
      update: [{ id: map.hits[0].id, depthDb: -30 }],
      add: [{ timeSec: 0.2 }],
    });
    expect(res.status).toBe(200);
    const hits = res.body.hits as { timeSec: number; enabled: boolean; depthDb: number | null; origin: string }[];
    expect(hits).toHaveLength(stems.kickTimesSec.length + 1);
    expect(hits.filter((h) => !h.enabled)).toHaveLength(3);
    expect(hits.find((h) => Math.abs(h.timeSec - map.hits[0].timeSec) < 1e-9)?.depthDb).toBe(-30);
    expect(hits.find((h) => h.origin === 'added')?.timeSec).toBeCloseTo(0.2, 6);
  });

  it('serves the kick averaged over its hits, starting at its onset', async () => {
    const res = await engineer.get(`${base}/hits/average-kick`);
    expect(res.status).toBe(200);
    expect(res.body.hitCount).toBeGreaterThan(20);
    const peak = res.body.rms.indexOf(Math.max(...res.body.rms));
    const peakMs = res.body.startMs + peak * res.body.stepMs;
    // The generated kick's body peaks within its first 10 ms (known by construction: 0.5 ms attack, 30 ms sweep).
    expect(peakMs).toBeGreaterThanOrEqual(0);
    expect(peakMs).toBeLessThan(10);
  });

  it('refuses an unknown hit id with 404 and changes nothing', async () => {
    const before = (await engineer.get(`${base}/hits`)).body;
    const res = await engineer.patch(`${base}/hits`).send({ update: [{ id: '00000000-0000-4000-8000-000000000000', enabled: false }], add: [{ timeSec: 1 }] });
    expect(res.status).toBe(404);
    const after = (await engineer.get(`${base}/hits`)).body;
    expect(after.hits).toEqual(before.hits);
  });

  it('carries the edits over when the kick gets a new revision', async () => {
    const res = await engineer.post(`${base}/stems`).field('role', 'kick').attach('file', Buffer.from(stems.kickWav), 'LTP_Kick_v2.wav');
    expect(res.body.stem.revision).toBe(2);
    const hits = res.body.hitMap.hits as { enabled: boolean; depthDb: number | null; origin: string }[];
    expect(hits.filter((h) => !h.enabled)).toHaveLength(3);
    expect(hits.filter((h) => h.depthDb === -30)).toHaveLength(1);
    expect(hits.filter((h) => h.origin === 'added')).toHaveLength(1);
    expect(res.body.hitMap.revisionSummary).toMatchObject({ added: [], removed: [], editsCarried: 5 });
    const ack = await engineer.post(`${base}/hits/acknowledge`);
    expect(ack.body.revisionSummary).toBeNull();
  });
});

describe('lanes, curves and exports', () => {
  let laneId: string;

  it('creates a lane on the 808 with the default shape and stamps it, skipping hits where the sub is silent', async () => {
    const lane = await engineer.post(`${base}/lanes`).send({ name: '808', bassSlot: '808' });
    expect(lane.status).toBe(201);
    laneId = lane.body.id;
    expect(lane.body.shape.points.length).toBeGreaterThanOrEqual(2);
    const curve = await engineer.get(`${base}/lanes/${laneId}/curve`);
    expect(curve.status).toBe(200);
    // Bars 3 and 4 (0-based 2 and 3) have no sub (known by construction). Their first hit is not gated:
    // its lead-in overlaps the release of the previous bar's last 808 note. The hit added at 0.2 s sits in
    // the pre-roll, where the sub is silent too.
    const barSec = (60 / 140) * 4;
    const silentFrom = 0.5 + 2 * barSec + 0.01;
    const silentTo = 0.5 + 4 * barSec;
    const hits = (await engineer.get(`${base}/hits`)).body.hits as { id: string; timeSec: number; enabled: boolean }[];
    const expected = hits.filter((h) => h.enabled && ((h.timeSec > silentFrom && h.timeSec < silentTo) || h.timeSec < 0.3)).map((h) => h.id);
    expect(expected).toHaveLength(6);
    expect([...curve.body.gatedHitIds].sort()).toEqual([...expected].sort());
    expect(curve.body.stampedHitCount).toBe(hits.filter((h) => h.enabled).length - 6);
    const min = Math.min(...curve.body.points.map((p: { gainDb: number }) => p.gainDb));
    expect(min).toBeCloseTo(-30, 1); // the per-hit depth on hit 0
  });

  it('refuses a stale lane save with 409 and keeps the newer one', async () => {
    const lane = (await engineer.get(`${base}/lanes/${laneId}`)).body;
    const first = await engineer.patch(`${base}/lanes/${laneId}`).send({ baseGainDb: -2, revision: lane.revision });
    expect(first.status).toBe(200);
    const stale = await assistant.patch(`${base}/lanes/${laneId}`).send({ baseGainDb: -5, revision: lane.revision });
    expect(stale.status).toBe(409);
    expectErrorShape(stale.body, 'lanes.stale');
    expect((await engineer.get(`${base}/lanes/${laneId}`)).body.baseGainDb).toBe(-2);
  });

  it('exports a breakpoint CSV, records it and serves it again', async () => {
    const res = await assistant.post(`${base}/exports`).send({ format: 'csv', laneIds: [laneId] });
    expect(res.status).toBe(201);
    expect(res.body.fileName).toMatch(/^low-tide-parade_808_breakpoints_\d{4}-\d{2}-\d{2}\.csv$/);
    const file = await assistant.get(res.body.downloadUrl).buffer(true).parse((r, cb) => {
      let text = '';
      r.on('data', (c: Buffer) => (text += c.toString('utf8')));
      r.on('end', () => cb(null, text));
    });
    expect(file.status).toBe(200);
    expect(file.headers['content-disposition']).toContain(res.body.fileName);
    const lines = (file.body as string).trim().split(/\r\n/);
    expect(lines[0].startsWith('time_s,gain_db')).toBe(true);
    const rows = lines.slice(1).map((l) => l.split(',').map(Number));
    for (let i = 1; i < rows.length; i++) expect(rows[i][0]).toBeGreaterThanOrEqual(rows[i - 1][0]);
    // Outside tucks the lane sits at its base gain of −2 dB (GLOSSARY "Base gain").
    expect(rows[0][1]).toBeCloseTo(-2, 6);
    const history = (await engineer.get(`${base}/exports`)).body as { id: string; createdBy: { displayName: string } }[];
    expect(history[0]).toMatchObject({ id: res.body.id, createdBy: { displayName: 'Pia Lindqvist' } });
  });

  it('exports a MIDI CC file that an independent parser (@tonejs/midi) reads', async () => {
    const res = await engineer.post(`${base}/exports`).send({ format: 'midi', laneIds: [laneId], options: { cc: 11, channel: 3, markerTrack: true } });
    expect(res.status).toBe(201);
    const file = await engineer.get(res.body.downloadUrl).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    const midi = new ToneMidi.Midi(file.body as Buffer);
    // 140 BPM from the song (SMF tempo meta event; REFERENCES.md "Standard MIDI File 1.0").
    expect(midi.header.tempos[0].bpm).toBeCloseTo(140, 3);
    const lane = midi.tracks.find((t) => t.name === '808')!;
    const cc = lane.controlChanges[11];
    expect(cc.length).toBeGreaterThan(10);
    // Channel 3 is status nibble 2 (MIDI 1.0: channels 1–16 are 0–15 on the wire), read with midi-file's parser.
    const parsed = parseMidi(file.body as Buffer);
    const ccEvents = parsed.tracks.flat().filter((e) => e.type === 'controller');
    expect(new Set(ccEvents.map((e) => (e as { channel: number }).channel))).toEqual(new Set([2]));
    // Base gain −2 dB → round(127·10^(−2/40)) = 113 (REFERENCES.md "Volume / expression curve"); tonejs scales to 0..1.
    expect(Math.round(cc[0].value * 127)).toBe(113);
    const markers = midi.tracks.flatMap((t) => t.notes);
    const enabledHits = (await engineer.get(`${base}/hits`)).body.hits.filter((h: { enabled: boolean }) => h.enabled).length;
    expect(markers).toHaveLength(enabledHits);
  });

  it('renders the tucked 808 as a WAV of the same format and length', async () => {
    const res = await engineer.post(`${base}/exports`).send({ format: 'wav', laneIds: [laneId] });
    expect(res.status).toBe(201);
    const file = await engineer.get(res.body.downloadUrl).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    const bytes = file.body as Buffer;
    expect(bytes.length).toBe(stems.bassWav.length);
    expect(bytes.subarray(0, 4).toString('latin1')).toBe('RIFF');
  });

  it('refuses a CSV of two lanes, and an unknown lane, without recording anything', async () => {
    const second = await engineer.post(`${base}/lanes`).send({ name: 'Synth bass', bassSlot: '808' });
    const count = async () => (await engineer.get(`${base}/exports`)).body.length;
    const before = await count();
    const two = await engineer.post(`${base}/exports`).send({ format: 'csv', laneIds: [laneId, second.body.id] });
    expect(two.status).toBe(422);
    const unknown = await engineer.post(`${base}/exports`).send({ format: 'midi', laneIds: ['00000000-0000-4000-8000-000000000000'] });
    expect(unknown.status).toBe(404);
    expect(await count()).toBe(before);
  });
});

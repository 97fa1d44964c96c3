import { randomUUID } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import { waveformOverview } from '../../shared/dsp/waveform-overview';
import type { StemOverview, StemUploadFields } from '../../shared/schemas/stem';
import { AudioInputError } from '../audio/audio-errors';
import { bassActivityFromFile } from '../audio/bass-activity';
import { detectKickFile } from '../audio/kick-detection';
import { readWavMono } from '../audio/wav-file';
import type { Database } from '../db/client';
import type { HitsService } from '../hits/hits.service';
import { badRequest, unprocessable } from '../http/errors';
import type { HashedFile } from '../storage/hashing-storage';
import type { FileStore } from '../storage/file-store';
import { stemNotFound, toStemDto, type StemRow, type StemsRepository } from './stems.repository';

async function sniffKind(path: string): Promise<'wav' | 'midi'> {
  const handle = await import('node:fs/promises').then((fs) => fs.open(path, 'r'));
  try {
    const head = Buffer.alloc(4);
    await handle.read(head, 0, 4, 0);
    return head.toString('latin1') === 'MThd' ? 'midi' : 'wav';
  } finally {
    await handle.close();
  }
}

/** Bucket sizes of the stored waveform overview: ~5 ms, ~43 ms and ~340 ms per bucket at 48 kHz. */
const overviewBuckets = [256, 2048, 16384];

export function createStemsService(deps: { db: Database; stems: StemsRepository; store: FileStore; hits: HitsService }) {
  const { db, stems, store, hits } = deps;
  const activityCache = new Map<string, Promise<{ hopSec: number; peakDbfs: Float32Array }>>();

  /**
   * Validates an uploaded file, computes its overview, stores it under its key
   * and records the next revision of its slot. Any failure removes the file and
   * writes no row; a kick upload runs detection (edits carry over).
   */
  async function upload(songId: string, userId: string, file: HashedFile, fields: StemUploadFields) {
    const id = randomUUID();
    const slot = fields.slot ?? fields.role;
    const kind = await sniffKind(file.path);
    let meta: { sampleRate: number | null; bitDepth: number | null; channels: number | null; durationSec: number };
    let overview: StemOverview | undefined;
    if (kind === 'midi') {
      if (fields.role !== 'kick') throw unprocessable('stems.midi_not_kick', 'A MIDI file can only be the kick source. Set its role to kick.');
      const parsed = await detectKickFile(file.path, { kind: 'midi' });
      meta = { sampleRate: null, bitDepth: null, channels: null, durationSec: parsed.durationSec };
    } else {
      const { info, mono } = await readWavMono(file.path);
      if (info.frames === 0) throw new AudioInputError('audio.no_samples', 422, 'The WAV file has no audio in it (0 samples).');
      meta = { sampleRate: info.sampleRate, bitDepth: info.bitDepth, channels: info.channels, durationSec: info.durationSec };
      const o = waveformOverview(mono, info.sampleRate, overviewBuckets);
      overview = {
        stemId: id,
        sampleRateHz: info.sampleRate,
        frames: info.frames,
        durationSec: info.durationSec,
        levels: o.levels.map((l) => ({ samplesPerBucket: l.samplesPerBucket, peaks: Array.from(l.peaks, (v) => Math.round(v * 1e4) / 1e4) })),
      };
    }

    const ext = kind === 'midi' ? 'mid' : 'wav';
    const storageKey = `songs/${songId}/stems/${id}.${ext}`;
    const overviewKey = `songs/${songId}/overviews/${id}.json`;
    await store.adopt(file.path, storageKey);
    let row: StemRow;
    try {
      if (overview) await store.put(overviewKey, JSON.stringify(overview));
      row = await db.transaction((tx) =>
        stems.addRevision(
          {
            id,
            songId,
            role: fields.role,
            slot,
            originalName: file.originalname.slice(0, 255),
            format: kind,
            ...meta,
            bytes: file.size,
            sha256: file.sha256,
            storageKey,
            overview: overview ? { key: overviewKey } : null,
            uploadedBy: userId,
          },
          tx,
        ),
      );
    } catch (error) {
      await store.remove(storageKey);
      await store.remove(overviewKey);
      throw error;
    }
    const hitMap = fields.role === 'kick' ? await hits.detect(songId, {}, row) : undefined;
    return { stem: toStemDto(row), hitMap };
  }

  return {
    upload,
    list: stems.list,
    async overview(songId: string, stemId: string): Promise<StemOverview> {
      const row = await stems.get(songId, stemId);
      const key = (row.overview as { key?: string } | null)?.key;
      if (!key) throw unprocessable('stems.no_overview', 'This stem has no waveform (MIDI files have none).');
      return JSON.parse(await readFile(store.pathOf(key), 'utf8')) as StemOverview;
    },
    /** Per-5 ms peak levels of a bass stem, for the bass gate (cached: stems never change once stored). */
    async activity(songId: string, stemId: string) {
      const row = await stems.get(songId, stemId);
      if (row.format !== 'wav') throw unprocessable('stems.not_audio', 'That stem is MIDI, not audio.');
      let pending = activityCache.get(row.id);
      if (!pending) {
        pending = bassActivityFromFile(store.pathOf(row.storageKey));
        activityCache.set(row.id, pending);
        pending.catch(() => activityCache.delete(row.id));
        if (activityCache.size > 64) activityCache.delete(activityCache.keys().next().value!);
      }
      return pending;
    },
    /** Makes an earlier revision current again; restoring a kick revision runs detection on it. */
    async restore(songId: string, stemId: string) {
      const row = await stems.get(songId, stemId);
      await stems.makeCurrent(row);
      const hitMap = row.role === 'kick' ? await hits.detect(songId, {}, row) : undefined;
      return { stem: toStemDto({ ...row, isCurrent: true }), hitMap };
    },
    async file(songId: string, stemId: string) {
      const row = await stems.get(songId, stemId);
      return { row, path: store.pathOf(row.storageKey) };
    },
    requireFile(file: HashedFile | undefined): HashedFile {
      if (!file) throw badRequest('uploads.no_file', 'Attach the file in the form field "file".');
      return file;
    },
    stemNotFound,
  };
}
export type StemsService = ReturnType<typeof createStemsService>;

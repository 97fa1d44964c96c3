import { openWav } from './wav-file';

/** What an uploaded audio file holds, read from its header only. */
export interface AudioInfo {
  format: 'wav';
  sampleRate: number;
  /** Container bits per sample: 8, 16, 24, 32 (int or float) or 64 (float). */
  bitDepth: number;
  sampleFormat: 'int' | 'float';
  channels: number;
  frames: number;
  durationSec: number;
}

/** Validates a WAV file's chunk table and format and describes it; throws AudioInputError. */
export async function probeAudioFile(path: string): Promise<AudioInfo> {
  const wav = await openWav(path);
  await wav.close();
  return wav.info;
}

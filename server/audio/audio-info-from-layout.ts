import type { WavLayout } from '../../shared/formats/wav-header';
import type { AudioInfo } from './audio-info';

export type { AudioInfo };

/** The public description of a WAV file from its validated layout. */
export function audioInfoFromLayout(layout: WavLayout): AudioInfo {
  return {
    format: 'wav',
    sampleRate: layout.sampleRateHz,
    bitDepth: layout.bitsPerSample,
    sampleFormat: layout.sampleFormat,
    channels: layout.channels,
    frames: layout.frames,
    durationSec: layout.frames / layout.sampleRateHz,
  };
}

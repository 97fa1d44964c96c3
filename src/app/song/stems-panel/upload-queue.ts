import { StemRole, suggestRole } from '../../../../shared/schemas/stem';

export type UploadState = 'ready' | 'uploading' | 'done' | 'failed' | 'cancelled';

export interface UploadItem {
  key: number;
  file: File;
  role: StemRole;
  slot: string;
  state: UploadState;
  /** 0…1 */
  progress: number;
  error: string | null;
  /** Refused in the browser (not WAV or MIDI): trying again cannot help. */
  refused?: boolean;
}

let nextKey = 1;

/** A slot name from the file name when it says which bass it is ("808", "sub"); otherwise the role. */
export function suggestSlot(fileName: string, role: StemRole): string {
  const name = fileName.toLowerCase();
  if (role === 'bass') {
    if (name.includes('808')) return '808';
    if (/\bsub\b|sub[ _-]?bass/.test(name)) return 'sub';
    if (/synth/.test(name)) return 'synth bass';
  }
  return role;
}

export function queueItem(file: File): UploadItem {
  const role = suggestRole(file.name);
  return { key: nextKey++, file, role, slot: suggestSlot(file.name, role), state: 'ready', progress: 0, error: null };
}

/** Only WAV and MIDI are accepted by the server; say so before uploading anything else. */
export function precheck(file: File): string | null {
  if (!/\.(wav|wave|mid|midi)$/i.test(file.name)) return 'Tuckline reads WAV audio and MIDI files. Export this stem as WAV and drop it again.';
  if (file.size === 0) return 'This file is empty.';
  return null;
}

export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 ** 2) return `${(bytes / 1024).toFixed(1)} KB`;
  return `${(bytes / 1024 ** 2).toFixed(1)} MB`;
}

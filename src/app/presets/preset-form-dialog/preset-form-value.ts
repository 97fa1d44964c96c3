import type { PresetContentInput, PresetDto } from '../../../../shared/schemas/preset';
import { DEFAULT_FLOOR_DB, DEFAULT_SLOPE_GUARD_MS } from '../../../../shared/schemas/tuck-shape';

/** What the preset form holds; its paths match the API's (`shape.points.2.tMs`), so server issues land on fields. */
export interface PresetFormValue {
  name: string;
  genre: string;
  notes: string;
  gateThresholdDbfs: number | null;
  shape: {
    points: { tMs: number | null; gainDb: number | null; curve: 'linear' | 'smooth' }[];
    slopeGuardMs: number | null;
    floorDb: number | null;
    depthDb: number | null;
  };
}

/** The fields a person edits one by one; `points` counts as one field (the editor is one table). */
export const presetFormFields = ['name', 'genre', 'notes', 'gateThresholdDbfs', 'points', 'slopeGuardMs', 'floorDb'] as const;
export type PresetFormField = (typeof presetFormFields)[number];

export const fieldLabels: Record<PresetFormField, string> = {
  name: 'name',
  genre: 'genre',
  notes: 'notes',
  gateThresholdDbfs: 'gate threshold',
  points: 'breakpoints',
  slopeGuardMs: 'slope guard',
  floorDb: 'floor',
};

/** A new preset starts from a simple tuck: 3 ms lead-in, −12 dB held 30 ms, 100 ms recovery. */
export function blankPresetForm(): PresetFormValue {
  return {
    name: '',
    genre: '',
    notes: '',
    gateThresholdDbfs: -50,
    shape: {
      points: [
        { tMs: -3, gainDb: 0, curve: 'smooth' },
        { tMs: 0, gainDb: -12, curve: 'linear' },
        { tMs: 30, gainDb: -12, curve: 'smooth' },
        { tMs: 130, gainDb: 0, curve: 'linear' },
      ],
      slopeGuardMs: DEFAULT_SLOPE_GUARD_MS,
      floorDb: DEFAULT_FLOOR_DB,
      depthDb: null,
    },
  };
}

export function presetToForm(p: Pick<PresetDto, 'name' | 'genre' | 'notes' | 'gateThresholdDbfs' | 'shape'>): PresetFormValue {
  return {
    name: p.name,
    genre: p.genre,
    notes: p.notes,
    gateThresholdDbfs: p.gateThresholdDbfs,
    shape: {
      points: p.shape.points.map((pt) => ({ tMs: pt.tMs, gainDb: pt.gainDb, curve: pt.curve ?? 'linear' })),
      slopeGuardMs: p.shape.slopeGuardMs,
      floorDb: p.shape.floorDb,
      depthDb: p.shape.depthDb,
    },
  };
}

/** The request body the schema checks (empty number fields stay empty so the schema names them). */
export function formToContent(v: PresetFormValue): PresetContentInput {
  return {
    name: v.name,
    genre: v.genre,
    notes: v.notes,
    gateThresholdDbfs: v.gateThresholdDbfs as number,
    shape: {
      points: v.shape.points.map((p) => ({ tMs: p.tMs as number, gainDb: p.gainDb as number, curve: p.curve })),
      slopeGuardMs: v.shape.slopeGuardMs as number,
      floorDb: v.shape.floorDb as number,
      depthDb: v.shape.depthDb,
    },
  };
}

function read(v: PresetFormValue, field: PresetFormField): unknown {
  switch (field) {
    case 'points':
      return v.shape.points;
    case 'slopeGuardMs':
      return v.shape.slopeGuardMs;
    case 'floorDb':
      return v.shape.floorDb;
    default:
      return v[field];
  }
}

/** Which fields differ between what was loaded and what is in the form now. */
export function editedFields(loaded: PresetFormValue, current: PresetFormValue): PresetFormField[] {
  return presetFormFields.filter((f) => JSON.stringify(read(loaded, f)) !== JSON.stringify(read(current, f)));
}

/**
 * After a 409: the freshly loaded preset with the person's own edits laid on
 * top, field by field; fields they did not touch take the other person's values.
 */
export function reapplyEdits(fresh: PresetFormValue, mine: PresetFormValue, fields: readonly PresetFormField[]): PresetFormValue {
  const out: PresetFormValue = structuredClone(fresh);
  for (const f of fields) {
    switch (f) {
      case 'points':
        out.shape.points = structuredClone(mine.shape.points);
        break;
      case 'slopeGuardMs':
        out.shape.slopeGuardMs = mine.shape.slopeGuardMs;
        break;
      case 'floorDb':
        out.shape.floorDb = mine.shape.floorDb;
        break;
      case 'gateThresholdDbfs':
        out.gateThresholdDbfs = mine.gateThresholdDbfs;
        break;
      default:
        out[f] = mine[f];
    }
  }
  return out;
}

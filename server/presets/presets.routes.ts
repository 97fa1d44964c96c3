import { Router, type RequestHandler } from 'express';
import {
  presetContentSchema,
  presetFileFormat,
  presetFileSchema,
  presetFileVersion,
  presetFromLaneSchema,
  presetListQuerySchema,
  presetSaveSchema,
} from '../../shared/schemas/preset';
import type { Audit } from '../audit/audit.service';
import { requirePermission, teamOf } from '../http/auth.middleware';
import { can } from '../../shared/schemas/team';
import { body, parse, query } from '../http/validate';
import type { LanesService } from '../lanes/lanes.service';
import type { SongsRepository } from '../songs/songs.repository';
import { slug } from '../exports/export-file-name';
import { presetNotFound, type PresetsRepository } from './presets.repository';
import { notFound } from '../http/errors';

/** `/api/teams/:teamId/presets`: the team library. Assistants read published presets only. */
export function presetsRoutes(deps: { presets: PresetsRepository; lanes: LanesService; songs: SongsRepository; audit: Audit }): Router {
  const router = Router({ mergeParams: true });
  const { presets, audit } = deps;
  const edit = requirePermission('editPresets');
  const presetId = (req: Parameters<RequestHandler>[0]) => String(req.params['presetId']);
  const record = (req: Parameters<RequestHandler>[0], action: string, id: string, details: Record<string, unknown> = {}) => {
    const { teamId, userId } = teamOf(req);
    return audit.record({ teamId, actorId: userId, action, subjectType: 'preset', subjectId: id, details });
  };
  /** What an assistant may not see answers 404, like another team's preset. */
  const readable = async (req: Parameters<RequestHandler>[0]) => {
    const { teamId, role } = teamOf(req);
    const preset = await presets.get(teamId, presetId(req));
    if (!can(role, 'editPresets') && preset.status !== 'published') throw presetNotFound();
    return preset;
  };

  router.get('/', async (req, res) => {
    const { teamId, role } = teamOf(req);
    res.json(await presets.list(teamId, query(req, presetListQuerySchema), !can(role, 'editPresets')));
  });

  router.post('/', edit, async (req, res) => {
    const { teamId, userId } = teamOf(req);
    const created = await presets.create(teamId, userId, body(req, presetContentSchema));
    await record(req, 'preset.created', created.id, { name: created.name, genre: created.genre });
    res.status(201).json(created);
  });

  router.post('/import', edit, async (req, res) => {
    const { teamId, userId } = teamOf(req);
    const file = parse(presetFileSchema, req.body, 'preset file');
    const imported = await presets.importMany(teamId, userId, file.presets.map((p) => presetContentSchema.parse(p)));
    for (const p of imported) await record(req, 'preset.imported', p.id, { name: p.name, genre: p.genre });
    res.status(201).json(imported);
  });

  router.post('/from-lane', edit, async (req, res) => {
    const { teamId, userId } = teamOf(req);
    const input = body(req, presetFromLaneSchema);
    await deps.songs.get(teamId, input.songId);
    const lane = await deps.lanes.get(input.songId, input.laneId);
    const created = await presets.create(teamId, userId, presetContentSchema.parse({ name: input.name, genre: input.genre, notes: input.notes, shape: lane.shape, gateThresholdDbfs: lane.gateThresholdDbfs }));
    await record(req, 'preset.created', created.id, { name: created.name, genre: created.genre, fromLane: lane.id });
    res.status(201).json(created);
  });

  router.get('/:presetId', async (req, res) => {
    res.json(await readable(req));
  });

  router.patch('/:presetId', edit, async (req, res) => {
    const { teamId, userId } = teamOf(req);
    const { version, ...patch } = body(req, presetSaveSchema);
    const current = await presets.get(teamId, presetId(req));
    const content = presetContentSchema.parse({
      name: current.name,
      genre: current.genre,
      notes: current.notes,
      shape: current.shape,
      gateThresholdDbfs: current.gateThresholdDbfs,
      ...Object.fromEntries(Object.entries(patch).filter(([, v]) => v !== undefined)),
    });
    const saved = await presets.saveVersion(teamId, presetId(req), version, content, userId);
    await record(req, 'preset.saved', saved.id, { version: saved.version });
    res.json(saved);
  });

  for (const [path, status, action] of [
    ['publish', 'published', 'preset.published'],
    ['retire', 'retired', 'preset.retired'],
    ['unpublish', 'draft', 'preset.unpublished'],
  ] as const) {
    router.post(`/:presetId/${path}`, edit, async (req, res) => {
      const { teamId } = teamOf(req);
      const saved = await presets.setStatus(teamId, presetId(req), status);
      await record(req, action, saved.id);
      res.json(saved);
    });
  }

  router.post('/:presetId/duplicate', edit, async (req, res) => {
    const { teamId, userId } = teamOf(req);
    const source = await presets.get(teamId, presetId(req));
    const existing = new Set((await presets.list(teamId, { sort: 'name', order: 'asc', genre: source.genre }, false)).map((p) => p.name));
    let name = `${source.name} (copy)`;
    for (let n = 2; existing.has(name); n++) name = `${source.name} (copy ${n})`;
    const copy = await presets.create(teamId, userId, presetContentSchema.parse({ name, genre: source.genre, notes: source.notes, shape: source.shape, gateThresholdDbfs: source.gateThresholdDbfs }));
    await record(req, 'preset.duplicated', copy.id, { from: source.id });
    res.status(201).json(copy);
  });

  router.get('/:presetId/versions', async (req, res) => {
    await readable(req);
    res.json(await presets.versions(teamOf(req).teamId, presetId(req)));
  });

  router.post('/:presetId/versions/:version/restore', edit, async (req, res) => {
    const { teamId, userId } = teamOf(req);
    const { version } = body(req, presetSaveSchema.pick({ version: true }));
    const wanted = Number(req.params['version']);
    const old = (await presets.versions(teamId, presetId(req))).find((v) => v.version === wanted);
    if (!old) throw notFound('presets.version_not_found', `This preset has no version ${req.params['version']}.`);
    const saved = await presets.saveVersion(teamId, presetId(req), version, old.content, userId);
    await record(req, 'preset.restored', saved.id, { from: wanted, version: saved.version });
    res.json(saved);
  });

  router.get('/:presetId/export', async (req, res) => {
    const p = await readable(req);
    const file = {
      format: presetFileFormat,
      formatVersion: presetFileVersion,
      exportedAt: new Date().toISOString(),
      presets: [{ name: p.name, genre: p.genre, notes: p.notes, shape: p.shape, gateThresholdDbfs: p.gateThresholdDbfs }],
    };
    res.attachment(`${slug(p.genre)}_${slug(p.name)}.tuckline-presets.json`);
    res.json(file);
  });

  return router;
}

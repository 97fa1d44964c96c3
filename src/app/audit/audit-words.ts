import type { AuditEvent } from '../core/api/audit-api';

/** The prefixes the filter offers, with the words the owner reads. */
export const auditActionGroups = [
  { prefix: 'auth.', label: 'Sign-ins and accounts' },
  { prefix: 'member.', label: 'Members and roles' },
  { prefix: 'invitation.', label: 'Invitations' },
  { prefix: 'preset.', label: 'Presets' },
  { prefix: 'export.', label: 'Exports' },
  { prefix: 'team.', label: 'Team and settings' },
  { prefix: 'stem.', label: 'Stems' },
] as const;

const actionWords: Record<string, string> = {
  'auth.sign_in': 'signed in',
  'auth.sign_up': 'created an account',
  'auth.password_reset': 'reset their password',
  'member.role_changed': 'changed the role of a member',
  'member.removed': 'removed a member',
  'invitation.sent': 'sent an invitation',
  'invitation.resent': 'sent an invitation again',
  'invitation.revoked': 'revoked an invitation',
  'invitation.accepted': 'accepted an invitation',
  'preset.created': 'created preset',
  'preset.saved': 'saved preset',
  'preset.published': 'published preset',
  'preset.unpublished': 'unpublished preset',
  'preset.retired': 'retired preset',
  'preset.duplicated': 'duplicated preset',
  'preset.restored': 'restored preset',
  'preset.imported': 'imported preset',
  'export.created': 'exported',
  'stem.uploaded': 'uploaded a stem',
  'team.created': 'created the team',
  'team.renamed': 'renamed the team',
  'team.settings_changed': 'changed the team settings',
};

/** `preset.saved` → "saved preset"; a code we have no words for yet is spelled out ("lane.moved" → "lane moved"). */
export function actionInWords(action: string): string {
  return actionWords[action] ?? action.replace(/[._]/g, ' ');
}

const str = (v: unknown) => (typeof v === 'string' || typeof v === 'number' ? String(v) : null);

/** A one-line summary of what the event's details say, in the owner's words. */
export function detailsSummary(e: Pick<AuditEvent, 'action' | 'details'>): string {
  const d = e.details ?? {};
  const parts: string[] = [];
  const name = str(d['name']);
  switch (e.action.split('.')[0]) {
    case 'preset':
      if (name) parts.push(`“${name}”`);
      if (str(d['genre'])) parts.push(String(d['genre']));
      if (e.action === 'preset.restored' && str(d['from'])) parts.push(`version ${d['from']} as version ${d['version']}`);
      else if (str(d['version'])) parts.push(`version ${d['version']}`);
      if (d['fromLane']) parts.push('from a lane');
      break;
    case 'member':
      if (str(d['from']) && str(d['to'])) parts.push(`${d['from']} → ${d['to']}`);
      else if (str(d['role'])) parts.push(`was ${d['role']}`);
      break;
    case 'invitation':
      if (str(d['email'])) parts.push(String(d['email']));
      if (str(d['role'])) parts.push(`as ${d['role']}`);
      break;
    case 'export':
      if (str(d['fileName'])) parts.push(String(d['fileName']));
      else if (str(d['format'])) parts.push(String(d['format']).toUpperCase());
      break;
    case 'stem':
      if (str(d['slot'])) parts.push(`${d['slot']} stem`);
      if (str(d['revision'])) parts.push(`revision ${d['revision']}`);
      break;
    case 'team':
      if (name) parts.push(`“${name}”`);
      if (d['defaultExport']) parts.push('export defaults');
      if (d['defaultPresetByGenre']) parts.push('default presets');
      break;
  }
  return parts.join(' · ');
}

/** The start of a local calendar day (`YYYY-MM-DD`), or its end, as ISO 8601 for the API. */
export function dayBoundary(day: string, edge: 'start' | 'end'): string | undefined {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(day);
  if (!m) return undefined;
  const date = edge === 'start' ? new Date(+m[1], +m[2] - 1, +m[3], 0, 0, 0, 0) : new Date(+m[1], +m[2] - 1, +m[3], 23, 59, 59, 999);
  return date.toISOString();
}

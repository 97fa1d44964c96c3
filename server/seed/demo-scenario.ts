import type { Role } from '../../shared/schemas/team';

/**
 * The demo scenario: an invented studio team and invented songs. Any likeness
 * to a real studio, person or record is unintended.
 */
export const demoPassword = 'tuckline-demo';

export const demoTeamName = 'Saltmarsh Sound Room';

export const demoPeople: { email: string; displayName: string; role: Role }[] = [
  { email: 'owner@tuckline.test', displayName: 'Odile Marsh', role: 'owner' },
  { email: 'engineer@tuckline.test', displayName: 'Kofi Brandt', role: 'engineer' },
  { email: 'assistant@tuckline.test', displayName: 'Pia Lindqvist', role: 'assistant' },
];

export const demoSongs = [
  { title: 'Night Ferry', artistAlias: 'Velvet Tolls', bpm: 140, timeSignature: { beats: 4, beatUnit: 4 as const }, notes: 'Trap. 808 glides into the chorus; kick and 808 land together on every downbeat.' },
  { title: 'Copper Rain', artistAlias: 'Marrow Lane', bpm: 92, timeSignature: { beats: 4, beatUnit: 4 as const }, notes: 'Boom bap with a sine sub under the sampled bass. Revision 2 of the stems due Friday.' },
  { title: 'Sundial Riddim', artistAlias: 'Kaya Verse', bpm: 98, timeSignature: { beats: 4, beatUnit: 4 as const }, notes: 'Reggaeton dembow; the sub doubles the kick pattern.' },
];

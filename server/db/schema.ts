// Every table of the product, for Drizzle's client and drizzle-kit.
export * from '../users/users.table';
export * from '../teams/teams.table';
export * from '../songs/songs.table';
export * from '../stems/stems.table';
export * from '../hits/hits.table';
export * from '../presets/presets.table';
export * from '../lanes/lanes.table';
export * from '../exports/exports.table';
export * from '../invitations/invitations.table';
export * from '../audit/audit.table';

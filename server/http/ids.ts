/** Row ids are UUIDs; anything else cannot name a row, so lookups answer 404 without asking the database (which would refuse the cast). */
export const isUuid = (id: string) => /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(id);

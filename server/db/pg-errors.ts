/** PostgreSQL error codes (Appendix A of the PostgreSQL manual). */
const uniqueViolation = '23505';
const foreignKeyViolation = '23503';

function codeOf(error: unknown): string | undefined {
  const e = error as { code?: unknown; cause?: { code?: unknown } };
  if (typeof e?.code === 'string') return e.code;
  if (typeof e?.cause?.code === 'string') return e.cause.code;
  return undefined;
}

export const isUniqueViolation = (error: unknown) => codeOf(error) === uniqueViolation;
export const isForeignKeyViolation = (error: unknown) => codeOf(error) === foreignKeyViolation;

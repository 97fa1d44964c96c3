import type { Request } from 'express';
import type { z } from 'zod';
import { badRequest } from './errors';

function issuesOf(error: z.ZodError) {
  return error.issues.map((issue) => ({ path: issue.path.join('.'), message: issue.message }));
}

/** Validates one part of a request with a shared zod schema; a failure is a 400 with the issues in `details`. */
export function parse<S extends z.ZodType>(schema: S, value: unknown, what = 'request'): z.output<S> {
  const result = schema.safeParse(value);
  if (!result.success) {
    const issues = issuesOf(result.error);
    const first = issues[0];
    const message = first ? `${first.path ? first.path + ': ' : ''}${first.message}` : `Invalid ${what}.`;
    throw badRequest('request.invalid', message, issues);
  }
  return result.data;
}

export const body = <S extends z.ZodType>(req: Request, schema: S) => parse(schema, req.body, 'body');
export const query = <S extends z.ZodType>(req: Request, schema: S) => parse(schema, req.query, 'query');

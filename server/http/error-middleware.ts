import type { ErrorRequestHandler, RequestHandler } from 'express';
import multer from 'multer';
import { AppError } from './errors';

interface HttpishError {
  status?: number;
  statusCode?: number;
  type?: string;
  code?: string;
  expose?: boolean;
  message?: string;
}

/** Turns any error into the one JSON error shape. A 500 never carries a stack trace. */
export const errorMiddleware: ErrorRequestHandler = (error, req, res, _next) => {
  const app = toAppError(error);
  if (app.status >= 500) req.log?.error({ err: error }, 'request failed');
  if (res.headersSent) {
    res.end();
    return;
  }
  res.status(app.status).json({ error: { code: app.code, message: app.message, ...(app.details === undefined ? {} : { details: app.details }) } });
};

export const notFoundMiddleware: RequestHandler = (req, _res, next) => {
  next(new AppError(404, 'request.no_route', `No API route for ${req.method} ${req.path}.`));
};

function toAppError(error: unknown): AppError {
  if (error instanceof AppError) return error;
  if (error instanceof multer.MulterError) {
    if (error.code === 'LIMIT_FILE_SIZE') return new AppError(413, 'uploads.too_large', 'That file is larger than this server accepts.');
    return new AppError(400, 'uploads.invalid', `The upload could not be read: ${error.message}.`);
  }
  const e = (error ?? {}) as HttpishError;
  const status = e.status ?? e.statusCode;
  if (e.type === 'entity.too.large') return new AppError(413, 'request.too_large', 'The request body is too large.');
  if (e.type === 'entity.parse.failed') return new AppError(400, 'request.malformed_json', 'The request body is not valid JSON.');
  if (typeof status === 'number' && status >= 400 && status < 500) {
    return new AppError(status, 'request.invalid', e.expose && e.message ? e.message : 'The request could not be processed.');
  }
  // Domain errors from the engine carry a code and a 4xx status of their own.
  if (typeof e.code === 'string' && typeof status === 'number') return new AppError(status, e.code, e.message ?? 'Request failed.');
  return new AppError(500, 'internal', 'Something went wrong on our side. The error was logged; try again.');
}

/** A failure the API reports to the client, with a stable dotted code and its HTTP status. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const badRequest = (code: string, message: string, details?: unknown) => new AppError(400, code, message, details);
export const unauthorized = (code = 'auth.required', message = 'Sign in to continue.') => new AppError(401, code, message);
export const forbidden = (message = 'Your role in this team does not allow that.') => new AppError(403, 'auth.forbidden', message);
export const notFound = (code: string, message: string) => new AppError(404, code, message);
export const conflict = (code: string, message: string, details?: unknown) => new AppError(409, code, message, details);
export const tooLarge = (code: string, message: string) => new AppError(413, code, message);
export const unsupported = (code: string, message: string) => new AppError(415, code, message);
export const unprocessable = (code: string, message: string, details?: unknown) => new AppError(422, code, message, details);
export const tooManyRequests = (message = 'Too many attempts. Wait a few minutes and try again.') =>
  new AppError(429, 'request.rate_limited', message);

import type { CookieOptions, Response } from 'express';
import jwt from 'jsonwebtoken';

export const sessionCookie = 'tuckline_session';

export interface TokenSettings {
  secret: string;
  hours: number;
  secureCookie: boolean;
}

export function issueToken(userId: string, settings: TokenSettings): string {
  return jwt.sign({}, settings.secret, { algorithm: 'HS256', subject: userId, expiresIn: `${settings.hours}h` });
}

/** Returns the user id, or undefined for a missing, expired, forged or wrongly signed token. */
export function verifyToken(token: string, secret: string): string | undefined {
  try {
    const payload = jwt.verify(token, secret, { algorithms: ['HS256'] });
    return typeof payload === 'object' && typeof payload.sub === 'string' ? payload.sub : undefined;
  } catch {
    return undefined;
  }
}

function cookieOptions(settings: TokenSettings): CookieOptions {
  return { httpOnly: true, sameSite: 'lax', secure: settings.secureCookie, path: '/' };
}

export function setSessionCookie(res: Response, token: string, settings: TokenSettings): void {
  res.cookie(sessionCookie, token, { ...cookieOptions(settings), maxAge: settings.hours * 3600_000 });
}

export function clearSessionCookie(res: Response, settings: TokenSettings): void {
  res.clearCookie(sessionCookie, cookieOptions(settings));
}

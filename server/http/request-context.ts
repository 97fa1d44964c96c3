import type { Role } from '../../shared/schemas/team';

export interface SessionUser {
  id: string;
  email: string;
  displayName: string;
}

export interface TeamContext {
  teamId: string;
  role: Role;
}

declare module 'express-serve-static-core' {
  interface Request {
    user?: SessionUser;
    team?: TeamContext;
  }
}

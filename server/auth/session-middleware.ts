import type { RequestHandler, Response } from 'express';
import type { Session, User } from 'lucia';
import type { SiteRole } from '@shared/api/auth';
import { forbidden, unauthenticated } from './auth.errors';
import type { AuthLucia } from './lucia';

declare global {
  // Express's own extension point for typed res.locals.
  namespace Express {
    interface Locals {
      user?: User;
      session?: Session;
    }
  }
}

/** Reads the session cookie on every request; renews it when lucia says so, clears a dead one. */
export function loadSession(lucia: AuthLucia): RequestHandler {
  return async (req, res, next) => {
    const sessionId = lucia.readSessionCookie(req.headers.cookie ?? '');
    if (!sessionId) {
      next();
      return;
    }
    const { session, user } = await lucia.validateSession(sessionId);
    if (!session) {
      res.appendHeader('Set-Cookie', lucia.createBlankSessionCookie().serialize());
    } else {
      if (session.fresh) res.appendHeader('Set-Cookie', lucia.createSessionCookie(session.id).serialize());
      res.locals.user = user;
      res.locals.session = session;
    }
    next();
  };
}

/** The signed-in user, or a 401. */
export function currentUser(res: Response): User {
  const user = res.locals.user;
  if (!user) throw unauthenticated();
  return user;
}

export function currentSession(res: Response): Session {
  const session = res.locals.session;
  if (!session) throw unauthenticated();
  return session;
}

export function requireSignedIn(): RequestHandler {
  return (_req, res, next) => {
    currentUser(res);
    next();
  };
}

export function requireSiteRole(role: SiteRole): RequestHandler {
  return (_req, res, next) => {
    const user = currentUser(res);
    if (role === 'admin' && user.role !== 'admin') throw forbidden();
    next();
  };
}

import { type Request, Router } from 'express';
import {
  changePasswordRequestSchema,
  passwordResetConfirmSchema,
  passwordResetRequestSchema,
  signInRequestSchema,
  type SignUpAccepted,
  signUpConfirmSchema,
  signUpRequestSchema,
  updateAccountRequestSchema,
} from '@shared/api/auth';
import { parseOr400 } from '../http/validate';
import type { AuthUsecases } from './auth.usecases';
import type { SignUpUsecases } from './sign-up.usecases';
import { toCurrentUser } from './auth.usecases';
import { currentSession, currentUser, requireSignedIn } from './session-middleware';

export interface AuthRoutesDeps {
  auth: AuthUsecases;
  signUp: SignUpUsecases;
  /** Where reset links point: configuration only, never the request's Host. */
  appOrigin: string;
}

/** The client's address: the socket's peer, or X-Forwarded-For only from proxies TRUST_PROXY names. */
function clientAddress(req: Request): string {
  return req.ip ?? req.socket.remoteAddress ?? 'unknown';
}

/** /api/auth/*: sign-up, sign-in, sign-out, the current user, password reset. */
export function authRoutes({ auth, signUp, appOrigin }: AuthRoutesDeps): Router {
  const router = Router();

  router.post('/sign-up', async (req, res) => {
    const input = parseOr400(signUpRequestSchema, req.body);
    const body: SignUpAccepted = { message: await signUp.request(input, clientAddress(req), appOrigin) };
    res.status(202).json(body);
  });

  router.post('/sign-up/confirm', async (req, res) => {
    const input = parseOr400(signUpConfirmSchema, req.body);
    const { user, cookie } = await signUp.confirm(input);
    res.appendHeader('Set-Cookie', cookie).status(201).json(user);
  });

  router.post('/sign-in', async (req, res) => {
    const input = parseOr400(signInRequestSchema, req.body);
    const { user, cookie } = await auth.signIn(input, clientAddress(req));
    res.appendHeader('Set-Cookie', cookie).json(user);
  });

  router.post('/sign-out', async (_req, res) => {
    const session = res.locals.session;
    if (session) res.appendHeader('Set-Cookie', await auth.signOut(session.id));
    res.status(204).end();
  });

  router.get('/me', (_req, res) => {
    res.json(toCurrentUser(currentUser(res)));
  });

  router.post('/password-reset', async (req, res) => {
    const { email } = parseOr400(passwordResetRequestSchema, req.body);
    await auth.requestPasswordReset(email, clientAddress(req), appOrigin);
    res.status(202).json({ message: 'If an account uses this address, a reset link is on its way.' });
  });

  router.post('/password-reset/confirm', async (req, res) => {
    const input = parseOr400(passwordResetConfirmSchema, req.body);
    await auth.confirmPasswordReset(input);
    res.status(204).end();
  });

  return router;
}

/** /api/account/*: the signed-in user's own settings. */
export function accountRoutes({ auth }: { auth: AuthUsecases }): Router {
  const router = Router();
  router.use(requireSignedIn());

  router.patch('/', async (req, res) => {
    const input = parseOr400(updateAccountRequestSchema, req.body);
    res.json(await auth.updateAccount(currentUser(res).id, input));
  });

  router.post('/password', async (req, res) => {
    const input = parseOr400(changePasswordRequestSchema, req.body);
    currentSession(res);
    const { cookie } = await auth.changePassword(currentUser(res).id, input);
    res.appendHeader('Set-Cookie', cookie).status(204).end();
  });

  return router;
}

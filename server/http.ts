import type { Request, Response, NextFunction, RequestHandler } from 'express';
import type { z } from 'zod';
import { type Action, can, isAction } from '../shared/permissions';
import { forbiddenFor, type Actor } from './services/auth/actor';
import { AppError, forbidden, notSignedIn } from './errors';
import { zodIssues } from './middleware/errors';
import { findNulField } from '../shared/schemas/common';
import { hasBody, STATE_CHANGING, unsupportedMediaType } from './middleware/csrf';

/**
 * Who may call an endpoint. Every endpoint must say it (deny by default):
 * 'public' (anyone), 'signed-in' (a read every role may do), or an action of the one
 * permission map (`shared/permissions.ts`), which says the roles. There is no role-list form:
 * roles are written only in the map.
 */
export type Access = 'public' | 'signed-in' | Action;

export interface EndpointContext<B, Q, P> {
  actor: Actor;
  body: B;
  query: Q;
  params: P;
  req: Request;
  res: Response;
}

type Schema = z.ZodTypeAny;
type Out<S> = S extends z.ZodTypeAny ? z.output<S> : undefined;

interface EndpointOptions<BS, QS, PS> {
  access: Access;
  body?: BS;
  query?: QS;
  params?: PS;
  /** Status on success (default 200). */
  status?: number;
  /**
   * Answers someone who must still replace a temporary password (their own account and password
   * routes); every other signed-in route refuses them with 403 PASSWORD_CHANGE_REQUIRED.
   */
  beforePasswordChange?: boolean;
}

function parsePart<S extends Schema>(schema: S | undefined, value: unknown, where: string): z.output<S> | undefined {
  if (!schema) return undefined;
  // PostgreSQL cannot store a NUL character in text: refuse it here, for every route at once.
  const nulAt = findNulField(value);
  if (nulAt !== null) {
    const field = where === 'body' ? nulAt : `${where}.${nulAt}`.replace(/\.$/, '');
    throw new AppError('VALIDATION_FAILED', `Check the ${where}: ${field || where} must not contain a NUL character.`, 400, [
      { field: field || where, message: 'must not contain a NUL character' },
    ]);
  }
  const result = schema.safeParse(value ?? {});
  if (!result.success) {
    const details = zodIssues(result.error, where === 'body' ? '' : `${where}.`);
    const first = details[0];
    const msg = first ? `${first.field ? `${first.field} ` : ''}${first.message}` : 'Invalid input.';
    throw new AppError('VALIDATION_FAILED', `Check the ${where}: ${msg}`, 400, details);
  }
  return result.data;
}

/** The access each endpoint (and upload middleware) was made with, for the route table. */
const accessByHandler = new WeakMap<RequestHandler, Access>();

/** The access a handler was made with by `endpoint()` or `withAccess()`; undefined for other handlers. */
export function accessOf(handler: unknown): Access | undefined {
  return typeof handler === 'function' ? accessByHandler.get(handler as RequestHandler) : undefined;
}

/** Marks a handler that checks `access` itself (e.g. an upload parser), so the route table knows it. */
export function withAccess(access: Access, handler: RequestHandler): RequestHandler {
  accessByHandler.set(handler, access);
  return handler;
}

export function checkAccess(access: Access, actor: Actor | undefined): void {
  if (access === 'public') return;
  if (!actor) throw notSignedIn();
  if (access === 'signed-in') return;
  // An action the map does not know is refused to everyone (and fails the route-table test).
  if (!isAction(access)) throw forbidden();
  if (!can(actor.roles, access)) throw forbiddenFor(access);
}

/**
 * Route handler: check access, parse body/query/params with zod, call the handler,
 * send its result as JSON. Handlers that stream or send files return `undefined`
 * after writing the response themselves.
 */
export function endpoint<
  BS extends Schema | undefined = undefined,
  QS extends Schema | undefined = undefined,
  PS extends Schema | undefined = undefined,
>(
  options: EndpointOptions<BS, QS, PS>,
  handler: (ctx: EndpointContext<Out<BS>, Out<QS>, Out<PS>>) => Promise<unknown> | unknown,
): RequestHandler {
  return withAccess(options.access, async (req: Request, res: Response, next: NextFunction) => {
    try {
      // Multipart reaches only the routes that read an upload (acceptUpload marks the request).
      if (STATE_CHANGING.has(req.method) && hasBody(req) && req.is('multipart/form-data') && !req.uploadRead) {
        throw unsupportedMediaType(req.get('content-type'));
      }
      checkAccess(options.access, req.actor);
      if (req.actor?.mustChangePassword && options.access !== 'public' && !options.beforePasswordChange) {
        throw new AppError(
          'PASSWORD_CHANGE_REQUIRED',
          'Choose your own password on your account page first; the temporary one works only for that.',
        );
      }
      const params = parsePart(options.params as Schema | undefined, req.params, 'params');
      const query = parsePart(options.query as Schema | undefined, req.query, 'query');
      const body = parsePart(options.body as Schema | undefined, req.body, 'body');
      const result = await handler({
        actor: req.actor as Actor,
        body: body as Out<BS>,
        query: query as Out<QS>,
        params: params as Out<PS>,
        req,
        res,
      });
      if (result === undefined) {
        if (!res.headersSent) res.status(options.status ?? 204).end();
        return;
      }
      res.status(options.status ?? 200).json(result);
    } catch (err) {
      next(err);
    }
  });
}

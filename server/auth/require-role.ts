import type { RequestHandler } from 'express';
import { hasRole, type Role } from '../../shared/roles.js';
import { ForbiddenError, UnauthorizedError } from '../lib/errors.js';

export const requireSignIn: RequestHandler = (req, _res, next) => {
  if (!req.user) throw new UnauthorizedError();
  next();
};

/** Passes when the user holds any of the roles (directly or through a role that implies it). */
export function requireRole(...roles: Role[]): RequestHandler {
  return (req, _res, next) => {
    if (!req.user) throw new UnauthorizedError();
    if (!roles.some((r) => hasRole(req.user!.roles, r))) {
      throw new ForbiddenError(`This needs the ${roles.join(' or ')} role.`);
    }
    next();
  };
}

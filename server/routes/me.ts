import { Router } from 'express';
import { effectiveRoles } from '../../shared/roles.js';
import type { Me } from '../../shared/schemas/users.js';
import { requireSignIn } from '../auth/require-role.js';
import type { AppContext } from '../context.js';

export function meRouter(_ctx: AppContext) {
  const router = Router();
  router.get('/me', requireSignIn, (req, res) => {
    const u = req.user!;
    const user: Me = { id: u.id, login: u.login, name: u.name, email: u.email, roles: u.roles, effectiveRoles: effectiveRoles(u.roles) };
    res.json({ user });
  });
  return router;
}

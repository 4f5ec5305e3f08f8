import { inviteInputSchema, updateUserInputSchema } from '@shared/users';
import type { AppContext } from '../context';
import { currentUser } from '../auth/guards';
import { defineRoute, type RouteDefinition } from '../http/routes';
import { idParams } from '../http/validate';
import { presentUser } from './present';
import { inviteUser, listUsers, updateUser } from './service';

export function userRoutes(ctx: AppContext): RouteDefinition[] {
  return [
    defineRoute({
      method: 'get',
      path: '/users',
      access: ['admin'],
      summary: 'Everyone with an account → { users }',
      handler: async () => ({ users: (await listUsers(ctx.dataSource)).map(presentUser) }),
    }),
    defineRoute({
      method: 'post',
      path: '/users/invitations',
      access: ['admin'],
      summary: 'Invite a person by e-mail with roles → 201 { user } (inactive until the link is used)',
      validate: { body: inviteInputSchema },
      handler: async (req, res) => {
        const user = await inviteUser(ctx, currentUser(req), req.body);
        res.status(201);
        return { user: presentUser(user) };
      },
    }),
    defineRoute({
      method: 'patch',
      path: '/users/:id',
      access: ['admin'],
      summary: 'Rename, change roles, deactivate or reactivate → { user }',
      validate: { params: idParams, body: updateUserInputSchema },
      handler: async (req) => ({ user: presentUser(await updateUser(ctx, currentUser(req), req.params.id, req.body)) }),
    }),
  ];
}

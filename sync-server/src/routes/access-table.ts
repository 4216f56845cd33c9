import type { Role } from '@/shared/protocol';
import * as h from './handlers';

export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';
export type Access = 'public' | readonly Role[];

export interface RouteSpec {
  method: Method;
  path: string;
  access: Access;
  handler: h.HandlerFactory;
  /** Extra guard before the handler; the sign-in limiter is the only one so far. */
  limit?: 'sign-in';
}

const anyRole: readonly Role[] = ['operator', 'practitioner', 'admin'];

/**
 * Every API route and who may call it. The router is built from this table and nothing else,
 * and the role tests are generated from it, so a route cannot exist without a line here.
 */
export const accessTable: readonly RouteSpec[] = [
  { method: 'get', path: '/api/health', access: 'public', handler: h.health },
  { method: 'post', path: '/api/auth/sign-in', access: 'public', handler: h.signInHandler, limit: 'sign-in' },
  { method: 'post', path: '/api/auth/refresh', access: 'public', handler: h.refreshHandler },
  { method: 'post', path: '/api/auth/sign-out', access: 'public', handler: h.signOutHandler },
  { method: 'get', path: '/api/me', access: anyRole, handler: h.me },
  { method: 'get', path: '/api/clients', access: ['operator', 'practitioner', 'admin'], handler: h.clients },
  { method: 'get', path: '/api/sessions', access: ['practitioner', 'admin'], handler: h.sessions },
  { method: 'get', path: '/api/users', access: ['admin'], handler: h.users },
];

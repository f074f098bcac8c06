import { createHash } from 'node:crypto';
import type { FastifyRequest } from 'fastify';
import type { Scope } from '../jobs/store.ts';
import { presentedKey } from './auth.ts';

/**
 * The caller's identity as stored with what it creates: the SHA-256 digest (hex) of the API key it
 * presented, never the key itself; undefined when no key was sent.
 */
export function tenantOf(request: FastifyRequest): string | undefined {
  const key = presentedKey(request);
  return key === undefined ? undefined : createHash('sha256').update(key).digest('hex');
}

/** Who owns what a request creates, and which stored rows it may see and delete. */
export interface Tenancy {
  owner: string | null;
  scope: Scope;
}

/**
 * With isolation every key sees only its own rows (a request without a key sees nothing, though the
 * key check refuses it before); without it every row is visible. The owner is stored either way.
 */
export function tenancyOf(request: FastifyRequest, isolation: boolean): Tenancy {
  const owner = tenantOf(request) ?? null;
  return { owner, scope: isolation ? { owner: owner ?? '' } : 'all' };
}

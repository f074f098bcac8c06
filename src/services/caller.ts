import type { Scope } from '../jobs/store.ts';

/**
 * Who asks (src/http/tenant.ts derives it from the request): the owner digest stored with what the
 * call creates, and the scope every read and delete is filtered by.
 */
export interface Caller {
  owner: string | null;
  scope: Scope;
}

/** A stored input the call names does not exist for this caller, or was deleted while the call ran. */
export interface MissingImage {
  missingImage: string;
}

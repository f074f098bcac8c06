import { ValidationError } from '../core/errors.ts';
import type { RealVolume } from '../core/real-volume.ts';
import type { Store } from '../jobs/store.ts';
import type { Caller } from './caller.ts';

/**
 * The volume a volume request (matrix.nz > 1) names: the upload must have kept its slices
 * (POST /v1/images with slices=all). The caller checked the upload exists.
 */
export function uploadedVolume(store: Store, id: string, caller: Caller): RealVolume {
  const volume = store.getImageVolume(id, caller.scope);
  if (!volume) {
    throw new ValidationError({
      field: 'source.imageId',
      message: `upload ${id} holds one slice; matrix.nz needs a volume`,
      allowed: 'an image uploaded with slices=all (a NIfTI volume), or no matrix.nz',
    });
  }
  return volume;
}

import { ValidationError } from '../core/errors.ts';
import { contrastDetail } from './contrast-detail.ts';
import type { Phantom, PhantomInfo } from './phantom.ts';
import { resolutionContrast } from './resolution-contrast.ts';
import { sheppLogan, sheppLoganModified } from './shepp-logan.ts';

/** Every phantom the service offers, built once (they are immutable). */
const PHANTOMS: ReadonlyMap<string, Phantom> = new Map(
  [sheppLogan(), sheppLoganModified(), resolutionContrast(), contrastDetail()].map((p) => [p.name, p]),
);

export function listPhantoms(): PhantomInfo[] {
  return [...PHANTOMS.values()].map(({ name, description }) => ({ name, description }));
}

/** The phantom called `name`; a ValidationError on field source.phantom lists the known names otherwise. */
export function getPhantom(name: string): Phantom {
  const phantom = PHANTOMS.get(name);
  if (!phantom) {
    const names = [...PHANTOMS.keys()];
    throw new ValidationError({
      field: 'source.phantom',
      message: `unknown phantom ${JSON.stringify(name)}`,
      allowed: names.join(', '),
    });
  }
  return phantom;
}

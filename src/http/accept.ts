import type { FastifyRequest } from 'fastify';

/**
 * Picks the offered media type the client prefers (RFC 9110 12.5.1: q-values, then specificity,
 * then the server's order). No Accept header, or one matching nothing offered, picks the first offer.
 */
export function preferredType<T extends string>(request: FastifyRequest, offers: readonly [T, ...T[]]): T {
  const header = request.headers.accept;
  if (!header) return offers[0];
  const ranges = header.split(',').map((part) => {
    const [range, ...params] = part.trim().toLowerCase().split(';');
    const q = params.map((p) => p.trim()).find((p) => p.startsWith('q='));
    const quality = q ? Number(q.slice(2)) : 1;
    return { range: range.trim(), q: Number.isFinite(quality) ? quality : 0 };
  });
  let best: { offer: T; q: number; specificity: number } | null = null;
  for (const offer of offers) {
    const [type] = offer.split('/');
    for (const { range, q } of ranges) {
      const specificity = range === offer ? 2 : range === `${type}/*` ? 1 : range === '*/*' ? 0 : -1;
      if (specificity < 0 || q <= 0) continue;
      if (!best || q > best.q || (q === best.q && specificity > best.specificity))
        best = { offer, q, specificity };
    }
  }
  return best?.offer ?? offers[0];
}

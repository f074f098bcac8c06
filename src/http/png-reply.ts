import type { FastifyReply } from 'fastify';

/**
 * Sends PNG bytes as they are: a Buffer bypasses the serializer. The route's schema documents the
 * body as a (binary) string, which a Buffer is not to TypeScript, hence the plain reply type here.
 */
export function sendPng(reply: FastifyReply, png: Buffer): FastifyReply {
  return reply.type('image/png').send(png);
}

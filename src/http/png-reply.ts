import type { FastifyReply } from 'fastify';

/**
 * Sends PNG bytes as they are: a Buffer bypasses the serializer. The route's schema documents the
 * body as a (binary) string, which a Buffer is not to TypeScript, hence the plain reply type here.
 */
export function sendPng(reply: FastifyReply, png: Buffer): FastifyReply {
  return sendBytes(reply, 'image/png', png);
}

/** Sends any binary body (a NIfTI file) as it is, with its media type; see sendPng. */
export function sendBytes(reply: FastifyReply, type: string, bytes: Buffer): FastifyReply {
  return reply.type(type).send(bytes);
}

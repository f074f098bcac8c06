import type { FastifyReply, FastifyRequest } from 'fastify';

/**
 * An AbortSignal that fires when the client goes away before its response is sent, so a long
 * computation for nobody (a 512² cs-tv of 2000 iterations kept a core busy for a minute) is stopped.
 * The response's 'close' also fires after a normal end; only a close before the end aborts.
 */
export function disconnectSignal(request: FastifyRequest, reply: FastifyReply): AbortSignal {
  const controller = new AbortController();
  const abortIfUnsent = () => {
    if (reply.raw.writableEnded) return;
    request.log.info('the client closed the connection before the answer; its computation is stopped');
    controller.abort(new Error('the client closed the connection'));
  };
  if (request.raw.socket?.destroyed) abortIfUnsent();
  else reply.raw.once('close', abortIfUnsent);
  return controller.signal;
}

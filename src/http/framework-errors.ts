import { STATUS_CODES } from 'node:http';
import type { Socket } from 'node:net';
import type { FastifyError, FastifyReply, FastifyRequest } from 'fastify';
import { makeProblem, type ProblemStatus, problemMediaType, sendProblem } from './problem.ts';

/**
 * Errors raised before a route runs, answered as RFC 9457 problem+json like every other error
 * (fastify's own answers to these are plain JSON, and Node's HTTP parser writes them itself).
 */

/** Router errors (fastify `frameworkErrors`): bad percent-encoding, a path parameter too long. */
export function frameworkErrorHandler(
  error: FastifyError,
  request: FastifyRequest,
  reply: FastifyReply,
): void {
  if (error.code === 'FST_ERR_MAX_PARAM_LENGTH') {
    // RFC 9110 §15.5.15: 414 URI Too Long.
    sendProblem(
      reply,
      makeProblem(414, 'a path segment is longer than the server accepts', [
        { field: 'url', message: 'path parameter too long', allowed: 'at most 200 characters' },
      ]),
    );
    return;
  }
  if (error.code === 'FST_ERR_BAD_URL') {
    sendProblem(
      reply,
      makeProblem(400, 'the URL is not valid percent-encoding (RFC 3986 §2.1)', [
        { field: 'url', message: 'invalid percent-encoding' },
      ]),
    );
    return;
  }
  request.log.error({ err: error }, 'router error');
  sendProblem(reply, makeProblem(500, 'an internal error occurred; the request id is in the logs'));
}

/** A request line this long is what filled the parser's header space: a URI too long, not headers. */
const LONG_REQUEST_LINE = 8192;

/**
 * True when the refused bytes begin with the request line and that line alone is very long. Node
 * hands the bytes it was parsing as `rawPacket`; when they are a later piece, the answer stays 431.
 */
function requestLineTooLong(rawPacket: unknown): boolean {
  if (!Buffer.isBuffer(rawPacket) || !/^[A-Z]+ \//.test(rawPacket.subarray(0, 16).toString('latin1')))
    return false;
  const end = rawPacket.indexOf('\r\n');
  return end < 0 ? rawPacket.length > LONG_REQUEST_LINE : end > LONG_REQUEST_LINE;
}

/** Node's HTTP parser codes → status (RFC 9110 §15.5: 400, 408, 414; RFC 6585 §5: 431). */
function statusForParserError(error: ParserError): ProblemStatus {
  if (error.code === 'HPE_HEADER_OVERFLOW') return requestLineTooLong(error.rawPacket) ? 414 : 431;
  if (error.code === 'ERR_HTTP_REQUEST_TIMEOUT') return 408;
  return 400;
}

type ParserError = Error & { code?: string; rawPacket?: unknown };

function parserProblemDetail(status: ProblemStatus, code: string | undefined): string {
  if (status === 431) return 'the request line and headers are larger than the server accepts';
  if (status === 414) return 'the URL is longer than the server accepts';
  if (status === 408) return 'the request was not received in time';
  if (code === 'HPE_INVALID_CONTENT_LENGTH' || code === 'HPE_UNEXPECTED_CONTENT_LENGTH')
    return 'the Content-Length header is not valid';
  return 'the request is not valid HTTP/1.1';
}

/**
 * fastify `clientErrorHandler`: the request never reached fastify (Node's parser refused it), so the
 * problem+json response is written to the socket by hand, then the connection is closed.
 */
export function clientErrorHandler(error: ParserError, socket: Socket): void {
  if (error.code === 'ECONNRESET' || socket.destroyed) return;
  const status = statusForParserError(error);
  const field = { 431: 'headers', 414: 'url', 408: 'body' }[status as number] ?? 'request';
  const detail = parserProblemDetail(status, error.code);
  const body = JSON.stringify(makeProblem(status, detail, [{ field, message: detail }]));
  if (socket.writable) {
    socket.write(
      `HTTP/1.1 ${status} ${STATUS_CODES[status]}\r\n` +
        `Content-Type: ${problemMediaType}\r\n` +
        `Content-Length: ${Buffer.byteLength(body)}\r\n` +
        'Connection: close\r\n\r\n' +
        body,
    );
  }
  socket.destroy(error);
}

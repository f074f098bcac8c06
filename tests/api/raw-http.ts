import { connect } from 'node:net';
import type { FastifyInstance } from 'fastify';

export interface RawResponse {
  status: number;
  headers: Record<string, string>;
  body: string;
  /** The same body as `text`, for expectProblem. */
  text: string;
}

/**
 * Sends bytes as they are over a TCP socket (node:net) and reads the answer until the server closes
 * the connection or the response is complete: HTTP-parser errors never reach an HTTP client library.
 */
export async function rawRequest(app: FastifyInstance, bytes: string): Promise<RawResponse> {
  if (!app.server.listening) await app.listen({ port: 0, host: '127.0.0.1' });
  const address = app.server.address();
  if (address === null || typeof address === 'string') throw new Error('no TCP address');
  const received = await new Promise<string>((resolve, reject) => {
    const socket = connect(address.port, '127.0.0.1');
    const chunks: Buffer[] = [];
    const text = () => Buffer.concat(chunks).toString('utf8');
    socket.on('data', (chunk: Buffer) => {
      chunks.push(chunk);
      if (complete(text())) socket.end();
    });
    socket.on('close', () => resolve(text()));
    socket.on('error', (error: NodeJS.ErrnoException) => {
      // The server may reset the connection after writing its answer; keep what arrived.
      if (chunks.length > 0) resolve(text());
      else reject(error);
    });
    socket.write(bytes);
  });
  return parse(received);
}

function complete(text: string): boolean {
  const end = text.indexOf('\r\n\r\n');
  if (end < 0) return false;
  const length = /\r\ncontent-length:\s*(\d+)/i.exec(text.slice(0, end));
  return length !== null && Buffer.byteLength(text.slice(end + 4)) >= Number(length[1]);
}

function parse(text: string): RawResponse {
  const end = text.indexOf('\r\n\r\n');
  if (end < 0) throw new Error(`no HTTP response: ${JSON.stringify(text.slice(0, 200))}`);
  const [statusLine, ...lines] = text.slice(0, end).split('\r\n');
  const status = Number(/^HTTP\/1\.1 (\d{3})/.exec(statusLine)?.[1]);
  const headers: Record<string, string> = {};
  for (const line of lines) {
    const colon = line.indexOf(':');
    headers[line.slice(0, colon).trim().toLowerCase()] = line.slice(colon + 1).trim();
  }
  const body = text.slice(end + 4);
  return { status, headers, body, text: body };
}

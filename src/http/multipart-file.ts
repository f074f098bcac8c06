import type { MultipartFile } from '@fastify/multipart';
import type { FastifyRequest } from 'fastify';
import { HttpProblem } from './problem.ts';

/**
 * The one file part of a multipart upload, named `file`, with the form fields that came before it.
 * No part, or a first part with another name, is a 400 naming `file`; `what` says what to send.
 */
export async function readFilePart(
  request: FastifyRequest,
  what: string,
): Promise<{ bytes: Buffer; fields: Record<string, unknown> }> {
  const part = await request.file().catch(malformedMultipart('body'));
  if (part?.fieldname !== 'file') {
    throw new HttpProblem(400, `send ${what} as a multipart part named "file"`, [
      { field: 'file', message: 'missing' },
    ]);
  }
  return { bytes: await partBytes(part), fields: part.fields };
}

/**
 * The file parts of a multipart upload by name among `names` (a repeated part is a 400 naming it);
 * plain form fields and file parts of other names are passed over, so that the caller's rule of
 * which parts must be present names what is missing.
 */
export async function readFileParts<Name extends string>(
  request: FastifyRequest,
  names: readonly Name[],
): Promise<Partial<Record<Name, Buffer>>> {
  const found: Partial<Record<Name, Buffer>> = {};
  const parts = request.parts();
  while (true) {
    const next = await parts.next().catch(malformedMultipart('body'));
    if (next.done) return found;
    const part = next.value;
    if (part.type !== 'file') continue;
    const bytes = await partBytes(part);
    const name = part.fieldname as Name;
    if (!names.includes(name)) continue;
    if (found[name] !== undefined) {
      throw new HttpProblem(400, `multipart part "${name}" was sent twice`, [
        { field: name, message: 'sent twice', allowed: 'each part once' },
      ]);
    }
    found[name] = bytes;
  }
}

async function partBytes(part: MultipartFile): Promise<Buffer> {
  const bytes = await part.toBuffer().catch(malformedMultipart('file'));
  // busboy marks the stream truncated at the size limit; when the limit falls on the last chunk
  // the plugin's toBuffer returns the cut bytes without its 413, so a cut file is refused here.
  if (part.file.truncated) {
    throw new HttpProblem(413, 'the file is larger than the upload limit', [
      { field: part.fieldname, message: 'larger than the upload limit (MAX_UPLOAD_BYTES)' },
    ]);
  }
  return bytes;
}

/**
 * The multipart parser (busboy) reports a body that breaks RFC 2046 §5.1.1 — no boundary parameter,
 * a boundary that never occurs, a body cut off before the closing delimiter — as a bare Error with a
 * fixed message; the plugin's own limits come as fastify errors with a code and pass through as they are.
 */
function malformedMultipart(field: 'body' | 'file'): (error: unknown) => never {
  return (error) => {
    if (error instanceof Error && (error as { code?: unknown }).code === undefined) {
      const message = `malformed multipart/form-data: ${error.message}`;
      throw new HttpProblem(400, message, [
        {
          field,
          message,
          allowed: 'a boundary parameter, parts between its delimiters, a closing delimiter',
        },
      ]);
    }
    throw error;
  };
}

/** The OpenAPI body of an upload whose only part is `file` (route `config.openapi.multipartBody`). */
export function fileOnlyMultipartBody(description: string) {
  return {
    type: 'object',
    required: ['file'],
    properties: { file: { type: 'string', format: 'binary', description } },
  };
}

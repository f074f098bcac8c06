/**
 * A file we cannot turn into an image: unsupported format or encoding (415) or a damaged file.
 * Messages never quote header contents, so they are safe to return and to log.
 */
export class DecodeError extends Error {
  override readonly name = 'DecodeError';
  readonly status: 415;
  readonly field: string;
  constructor(message: string, field = 'file') {
    super(message);
    this.status = 415;
    this.field = field;
  }
}

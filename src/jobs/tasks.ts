import type { FieldProblem } from '../core/errors.ts';
import type { Limits } from '../core/limits.ts';
import type { RealImage } from '../core/real-image.ts';
import type { DecodeOptions } from '../io/decoded-image.ts';

/** Work sent to a worker thread: plain, structured-clonable data only. */
export type WorkerTask =
  | { kind: 'decode'; bytes: Uint8Array; options: DecodeOptions }
  | { kind: 'phantom-kspace'; name: string; kx: Float64Array; ky: Float64Array }
  | { kind: 'phantom-raster'; name: string; nx: number; ny: number; supersample?: number }
  | {
      kind: 'mask';
      matrix: { nx: number; ny: number };
      sampling: unknown;
      limits: Limits;
      diagnostics: boolean;
    }
  | { kind: 'reconstruction'; request: unknown; seed?: number; image?: UploadedPixels; limits: Limits }
  | { kind: 'validate-plan'; body: unknown; limits: Limits }
  | { kind: 'cell'; plan: unknown; cell: unknown; image?: UploadedPixels; limits: Limits };

/** An uploaded image the task needs, sent along so workers never open the database. */
export interface UploadedPixels {
  id: string;
  image: RealImage;
}

/** Typed engine errors cannot cross a thread boundary as classes, so they travel as data. */
export interface WorkerFailure {
  ok: false;
  error: {
    kind: 'validation' | 'limit' | 'cancelled' | 'decode' | 'internal';
    message: string;
    problems: FieldProblem[];
  };
}

export interface WorkerSuccess<T> {
  ok: true;
  value: T;
}

export type WorkerReply<T> = WorkerSuccess<T> | WorkerFailure;

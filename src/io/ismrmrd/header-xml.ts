import { XMLParser } from 'fast-xml-parser';
import { ValidationError } from '../../core/errors.ts';

/** Three sides, as the ISMRMRD header gives a matrix or a field of view (x = readout, y, z). */
export interface Sides {
  x: number;
  y: number;
  z: number;
}

/** An ISMRMRD encoding counter's limits (`encodingLimits`): smallest, largest and centre index. */
export interface CounterLimits {
  minimum: number;
  maximum: number;
  center: number;
}

/**
 * The numbers we keep from the ISMRMRD XML header. Everything else — subject, study, measurement
 * and system information, sequence parameters, user parameters and any free text — is never read,
 * so identifiers cannot leak into what the service stores.
 */
export interface RawHeaderNumbers {
  /** `acquisitionSystemInformation.receiverChannels`, when the header states it. */
  receiverChannels: number | null;
  encodedMatrix: Sides;
  encodedFieldOfViewMm: Sides;
  reconMatrix: Sides;
  reconFieldOfViewMm: Sides;
  /** `encodingLimits.kspace_encoding_step_1` / `_2`, when stated. */
  step1Limits: CounterLimits | null;
  step2Limits: CounterLimits | null;
}

const FIELD = 'file.header';

// Entities and attributes are never needed for the numbers we read; leaving entity expansion off
// also rules out entity-expansion bombs in an uploaded header.
const parser = new XMLParser({
  ignoreAttributes: true,
  removeNSPrefix: true,
  processEntities: false,
  parseTagValue: true,
  isArray: (name) => name === 'encoding',
});

function refuse(field: string, message: string, allowed?: string): never {
  throw new ValidationError({ field: `${FIELD}.${field}`, message, ...(allowed ? { allowed } : {}) });
}

function child(node: unknown, key: string): unknown {
  return typeof node === 'object' && node !== null ? (node as Record<string, unknown>)[key] : undefined;
}

function numberAt(node: unknown, path: string, label: string, options: { positive?: boolean } = {}): number {
  const value = path.split('.').reduce(child, node);
  if (typeof value !== 'number' || !Number.isFinite(value)) refuse(label, 'missing or not a number');
  if (options.positive && !(value > 0)) refuse(label, `must be positive, got ${value}`, '> 0');
  return value;
}

function sides(node: unknown, path: string, integer: boolean): Sides {
  const read = (axis: 'x' | 'y' | 'z'): number => {
    const label = `encoding.${path}.${axis}`;
    const value = numberAt(node, `${path}.${axis}`, label, { positive: true });
    if (integer && !Number.isInteger(value)) refuse(label, `must be an integer, got ${value}`);
    return value;
  };
  return { x: read('x'), y: read('y'), z: read('z') };
}

function limits(encoding: unknown, counter: string): CounterLimits | null {
  const node = child(child(encoding, 'encodingLimits'), counter);
  if (node === undefined) return null;
  const path = `encoding.encodingLimits.${counter}`;
  const read = (key: string): number => {
    const value = numberAt(node, key, `${path}.${key}`);
    if (!Number.isInteger(value) || value < 0) refuse(`${path}.${key}`, `must be a non-negative integer`);
    return value;
  };
  return { minimum: read('minimum'), maximum: read('maximum'), center: read('center') };
}

/**
 * Reads the numbers of an ISMRMRD XML header (schema: Debian ismrmrd-schema, ismrmrd.xsd) and
 * refuses what the importer cannot use: no or several encodings, a trajectory other than Cartesian.
 */
export function parseHeaderXml(xml: string): RawHeaderNumbers {
  let document: unknown;
  try {
    document = parser.parse(xml);
  } catch {
    refuse('xml', 'the XML header is not well-formed XML');
  }
  const root = child(document, 'ismrmrdHeader');
  if (root === undefined) refuse('xml', 'the XML header has no ismrmrdHeader element');
  const encodings = child(root, 'encoding');
  if (!Array.isArray(encodings) || encodings.length === 0) refuse('encoding', 'the header has no encoding');
  if (encodings.length > 1) {
    refuse('encoding', `${encodings.length} encodings; only one encoding space is supported`, 'one encoding');
  }
  const encoding = encodings[0];
  const trajectory = child(encoding, 'trajectory');
  if (trajectory !== 'cartesian') {
    // Not echoed: only the fixed words of the schema's trajectoryType are safe to name.
    const known = ['epi', 'radial', 'goldenangle', 'spiral', 'other'];
    const named = typeof trajectory === 'string' && known.includes(trajectory) ? ` (${trajectory})` : '';
    refuse(
      'encoding.trajectory',
      `non-Cartesian trajectory${named}; only cartesian is supported`,
      'cartesian',
    );
  }
  const channels = child(child(root, 'acquisitionSystemInformation'), 'receiverChannels');
  let receiverChannels: number | null = null;
  if (channels !== undefined) {
    if (typeof channels !== 'number' || !Number.isInteger(channels) || channels < 1) {
      refuse('acquisitionSystemInformation.receiverChannels', 'must be a positive integer');
    }
    receiverChannels = channels;
  }
  return {
    receiverChannels,
    encodedMatrix: sides(encoding, 'encodedSpace.matrixSize', true),
    encodedFieldOfViewMm: sides(encoding, 'encodedSpace.fieldOfView_mm', false),
    reconMatrix: sides(encoding, 'reconSpace.matrixSize', true),
    reconFieldOfViewMm: sides(encoding, 'reconSpace.fieldOfView_mm', false),
    step1Limits: limits(encoding, 'kspace_encoding_step_1'),
    step2Limits: limits(encoding, 'kspace_encoding_step_2'),
  };
}

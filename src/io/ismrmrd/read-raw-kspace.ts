import { LimitError, ValidationError } from '../../core/errors.ts';
import { defaultLimits, type Limits } from '../../core/limits.ts';
import { MAX_VOLUME_VOXELS } from '../../core/matrix.ts';
import type { MultiCoilKspace } from '../../encoding/multi-coil.ts';
import { acquisitionFlagBits, hasFlag, nonImagingFlagBits } from './acquisition-flags.ts';
import { type AcquisitionRecords, readIsmrmrdContents } from './acquisition-records.ts';
import { type CounterLimits, parseHeaderXml, type Sides } from './header-xml.ts';
import { noiseCovariance } from './noise-covariance.ts';
import { cropReadoutLine } from './readout-oversampling.ts';

/**
 * What an ISMRMRD raw-data file gives the planner: numbers only (no names, dates, free text).
 * `kspace` is the fully sampled Cartesian k-space, coil-major (DEVELOPERS.md "Encoding operator and
 * coil arrays"): row = phase-encode line (kspace_encode_step_1 − centre + ⌊ny/2⌋, so the header's
 * centre line is the DC row), column = readout sample after oversampling removal. A 3D acquisition
 * (nz > 1) holds nz partitions per coil, coil-major then partition (kspace_encode_step_2 − centre +
 * ⌊nz/2⌋), row, column: element (c, z, y, x) at 2·(((c·nz + z)·ny + y)·nx + x).
 */
export interface RawKspaceImport {
  coils: number;
  /** Samples per readout as acquired (readout oversampling included). */
  readoutSamples: number;
  /** encodedSpace / reconSpace field of view along the readout (2 for the usual 2× oversampling). */
  readoutOversampling: number;
  encodedMatrix: Sides;
  reconMatrix: Sides;
  encodedFieldOfViewMm: Sides;
  reconFieldOfViewMm: Sides;
  /** Partitions (kspace_encode_step_2) of a 3D acquisition; 1 for a 2D slice. */
  nz: number;
  step1Limits: CounterLimits | null;
  step2Limits: CounterLimits | null;
  /** kspace_encode_step_1 and _2 of each imaging record, in file order. */
  encodeCounters: { step1: Uint16Array; step2: Uint16Array };
  records: { total: number; imaging: number; noise: number; skipped: number };
  /** Imaging records per line (3D: per ky–kz point) beyond the first, averaged into the line. */
  repeatedLines: number;
  kspace: MultiCoilKspace;
  /** Noise covariance across coils from the noise-scan records (numpy.cov estimator), or null. */
  noise: { samples: number; covariance: Float64Array } | null;
}

/** ISMRMRD's channel mask has 16 × 64 bits, so at most 1024 channels (ismrmrd.h). */
const MAX_CHANNELS = 1024;

function refuse(field: string, message: string, allowed?: string): never {
  throw new ValidationError({ field, message, ...(allowed ? { allowed } : {}) });
}

function distinctValues(column: Uint16Array, rows: number[]): number {
  return new Set(rows.map((r) => column[r])).size;
}

/**
 * Reads an uploaded ISMRMRD file (Inati et al. 2017) into a fully sampled multi-coil Cartesian
 * k-space: one 2D slice, or one 3D acquisition (encodedSpace.matrixSize.z > 1, lines indexed by
 * kspace_encode_step_1 and kspace_encode_step_2); one contrast, phase, repetition and set; Cartesian
 * only; every phase-encode line (3D: every ky–kz point) of the encoded matrix present. Readout
 * oversampling is removed (src/io/ismrmrd/readout-oversampling.ts). Anything else is a
 * ValidationError naming the field; matrix sides beyond the limits a LimitError.
 */
export async function readRawKspace(
  bytes: Uint8Array,
  limits: Limits = defaultLimits,
): Promise<RawKspaceImport> {
  const contents = await readIsmrmrdContents(bytes);
  const header = parseHeaderXml(contents.xml);
  const records = contents.records;

  const imaging: number[] = [];
  const noise: number[] = [];
  let skipped = 0;
  for (let r = 0; r < records.count; r++) {
    const flags = records.flags[r];
    if (hasFlag(flags, acquisitionFlagBits.isNoiseMeasurement)) noise.push(r);
    else if (nonImagingFlagBits.some((bit) => hasFlag(flags, bit))) skipped += 1;
    else imaging.push(r);
  }
  if (imaging.length === 0) refuse('file.data', 'the file holds no imaging acquisitions');

  const coils = checkUniform(records.activeChannels, imaging, 'file.data.head.active_channels');
  if (coils < 1 || coils > MAX_CHANNELS) {
    refuse('file.data.head.active_channels', `${coils} channels`, `1 to ${MAX_CHANNELS}`);
  }
  if (header.receiverChannels !== null && header.receiverChannels !== coils) {
    refuse(
      'file.header.acquisitionSystemInformation.receiverChannels',
      `the header states ${header.receiverChannels} receiver channels but the acquisitions have ${coils}`,
    );
  }
  const samples = checkUniform(records.numberOfSamples, imaging, 'file.data.head.number_of_samples');
  checkCartesianLines(records, imaging, header.encodedMatrix, samples);

  const ratio = header.encodedFieldOfViewMm.x / header.reconFieldOfViewMm.x;
  const nx = Math.round(samples / ratio);
  if (!(ratio >= 1) || nx < 1) {
    refuse(
      'file.header.encoding.reconSpace.fieldOfView_mm.x',
      'the reconstructed field of view exceeds the encoded one',
    );
  }
  const ny = header.encodedMatrix.y;
  const nz = header.encodedMatrix.z;
  const tooLarge = [
    { side: 'nx', value: nx, field: 'file.header.encoding.reconSpace.matrixSize.x' },
    { side: 'ny', value: ny, field: 'file.header.encoding.encodedSpace.matrixSize.y' },
    { side: 'nz', value: nz, field: 'file.header.encoding.encodedSpace.matrixSize.z' },
  ].filter((s) => s.value > limits.maxMatrixSide);
  if (tooLarge.length > 0) {
    throw new LimitError(
      tooLarge.map((s) => ({
        field: s.field,
        message: `${s.side} = ${s.value} exceeds the configured limit ${limits.maxMatrixSide}`,
        allowed: `≤ ${limits.maxMatrixSide}`,
      })),
    );
  }
  if (nz > 1 && nx * ny * nz > MAX_VOLUME_VOXELS) {
    throw new LimitError({
      field: 'file.header.encoding.encodedSpace.matrixSize.z',
      message: `${nx}×${ny}×${nz} voxels is larger than the configured limit`,
      allowed: `nx·ny·nz ≤ ${MAX_VOLUME_VOXELS}`,
    });
  }

  // Line positions and completeness, checked before the k-space is allocated.
  const lineOf = lineIndex(records, imaging, header, ny, nz);
  const lines = ny * nz;
  const perLine = new Uint32Array(lines);
  for (let i = 0; i < imaging.length; i++) perLine[lineOf[i]] += 1;
  const missing = perLine.reduce((n, count) => n + (count === 0 ? 1 : 0), 0);
  if (missing > 0 && nz === 1) {
    refuse(
      'file.data.head.idx.kspace_encode_step_1',
      `partially sampled: ${missing} of ${ny} phase-encode lines (kspace_encode_step_1) are missing; only fully sampled Cartesian data can be imported`,
      'every line of the encoded matrix',
    );
  }
  if (missing > 0) {
    const first = perLine.indexOf(0);
    refuse(
      'file.data.head.idx.kspace_encode_step_2',
      `partially sampled: ${lines - missing} of ${lines} ky–kz points (kspace_encode_step_1 × kspace_encode_step_2, ` +
        `${ny} × ${nz}) acquired, ${missing} missing (the first at row ${first % ny}, partition ${Math.floor(first / ny)} ` +
        'of the encoded matrix); only fully sampled Cartesian data can be imported',
      'every ky–kz point of the encoded matrix',
    );
  }

  // Coil-major, then partition, row, column; lines = nz·ny per coil.
  const data = new Float64Array(2 * coils * lines * nx);
  const line = new Float64Array(2 * samples);
  const cropped = new Float64Array(2 * nx);
  imaging.forEach((r, i) => {
    const source = records.data[r];
    for (let c = 0; c < coils; c++) {
      for (let k = 0; k < 2 * samples; k++) line[k] = source[2 * c * samples + k];
      cropReadoutLine(line, cropped, nx);
      const offset = 2 * (c * lines + lineOf[i]) * nx;
      for (let k = 0; k < 2 * nx; k++) data[offset + k] += cropped[k];
    }
  });
  for (let at = 0; at < lines; at++) {
    if (perLine[at] === 1) continue;
    for (let c = 0; c < coils; c++) {
      const offset = 2 * (c * lines + at) * nx;
      for (let k = 0; k < 2 * nx; k++) data[offset + k] /= perLine[at];
    }
  }

  const noiseRecords = noise.map((r) => {
    const expected = 2 * coils * records.numberOfSamples[r];
    if (records.activeChannels[r] !== coils || records.data[r].length !== expected) {
      refuse(
        'file.data.head.active_channels',
        `noise record ${r} has ${records.activeChannels[r]} channels, not ${coils}`,
      );
    }
    return records.data[r];
  });

  return {
    coils,
    readoutSamples: samples,
    readoutOversampling: ratio,
    encodedMatrix: header.encodedMatrix,
    reconMatrix: header.reconMatrix,
    encodedFieldOfViewMm: header.encodedFieldOfViewMm,
    reconFieldOfViewMm: header.reconFieldOfViewMm,
    nz,
    step1Limits: header.step1Limits,
    step2Limits: header.step2Limits,
    encodeCounters: {
      step1: Uint16Array.from(imaging, (r) => records.step1[r]),
      step2: Uint16Array.from(imaging, (r) => records.step2[r]),
    },
    records: { total: records.count, imaging: imaging.length, noise: noise.length, skipped },
    repeatedLines: imaging.length - lines,
    kspace: { coils, nx, ny, data },
    noise: noiseRecords.length > 0 ? noiseCovariance(noiseRecords, coils) : null,
  };
}

function checkUniform(column: Uint16Array, rows: number[], field: string): number {
  const first = column[rows[0]];
  const other = rows.find((r) => column[r] !== first);
  if (other !== undefined) {
    refuse(
      field,
      `differs between acquisitions (${first} in record ${rows[0]}, ${column[other]} in record ${other})`,
    );
  }
  return first;
}

/**
 * Each imaging record's line in the k-space, partition · ny + row: row = kspace_encode_step_1 −
 * centre + ⌊ny/2⌋ and partition = kspace_encode_step_2 − centre + ⌊nz/2⌋ (centres from
 * encodingLimits, else the middle), so the header's centre point is the DC line. Refuses counters
 * outside the encoded matrix.
 */
function lineIndex(
  records: AcquisitionRecords,
  imaging: number[],
  header: { step1Limits: CounterLimits | null; step2Limits: CounterLimits | null },
  ny: number,
  nz: number,
): Uint32Array {
  const centre1 = header.step1Limits?.center ?? Math.floor(ny / 2);
  const centre2 = nz > 1 ? (header.step2Limits?.center ?? Math.floor(nz / 2)) : 0;
  const index = new Uint32Array(imaging.length);
  imaging.forEach((r, i) => {
    const row = records.step1[r] - centre1 + Math.floor(ny / 2);
    if (row < 0 || row >= ny) {
      refuse(
        'file.data.head.idx.kspace_encode_step_1',
        `line ${records.step1[r]} lies outside the encoded matrix of ${ny} lines (centre ${centre1})`,
      );
    }
    const partition = nz > 1 ? records.step2[r] - centre2 + Math.floor(nz / 2) : 0;
    if (partition < 0 || partition >= nz) {
      refuse(
        'file.data.head.idx.kspace_encode_step_2',
        `partition ${records.step2[r]} lies outside the encoded matrix of ${nz} partitions (centre ${centre2})`,
      );
    }
    index[i] = partition * ny + row;
  });
  return index;
}

/** Refuses what a single fully sampled Cartesian k-space (2D slice or 3D volume) cannot hold. */
function checkCartesianLines(
  records: AcquisitionRecords,
  imaging: number[],
  encoded: Sides,
  samples: number,
): void {
  const bent = imaging.find((r) => records.trajectoryDimensions[r] > 0);
  if (bent !== undefined) {
    refuse(
      'file.data.head.trajectory_dimensions',
      `non-Cartesian: record ${bent} carries a ${records.trajectoryDimensions[bent]}-dimensional trajectory`,
      '0 (Cartesian)',
    );
  }
  const reversed = imaging.find((r) => hasFlag(records.flags[r], acquisitionFlagBits.isReverse));
  if (reversed !== undefined) {
    refuse(
      'file.data.head.flags',
      `record ${reversed} is a reversed readout (ACQ_IS_REVERSE), which is not supported`,
    );
  }
  // A 2D slice has one kspace_encode_step_2; a 3D acquisition (z > 1) is indexed by it.
  const counters = [
    ['slice', records.slice],
    ['contrast', records.contrast],
    ['phase', records.phase],
    ['repetition', records.repetition],
    ['set', records.set],
    ...(encoded.z > 1 ? [] : ([['kspace_encode_step_2', records.step2]] as const)),
  ] as const;
  for (const [name, column] of counters) {
    const count = distinctValues(column, imaging);
    if (count > 1)
      refuse(`file.data.head.idx.${name}`, `${count} different values; only one is supported`, 'one');
  }
  const otherSpace = imaging.find((r) => records.encodingSpaceRef[r] !== 0);
  if (otherSpace !== undefined) {
    refuse(
      'file.data.head.encoding_space_ref',
      `record ${otherSpace} refers to encoding ${records.encodingSpaceRef[otherSpace]}`,
      '0',
    );
  }
  if (samples !== encoded.x) {
    refuse(
      'file.data.head.number_of_samples',
      `${samples} samples per readout but the encoded matrix has x = ${encoded.x} (partial echo is not supported)`,
    );
  }
  const trimmed = imaging.find((r) => records.discardPre[r] > 0 || records.discardPost[r] > 0);
  if (trimmed !== undefined)
    refuse('file.data.head.discard_pre', `record ${trimmed} asks to discard samples`, '0');
  const offCentre = imaging.find((r) => records.centerSample[r] !== Math.floor(samples / 2));
  if (offCentre !== undefined) {
    refuse(
      'file.data.head.center_sample',
      `record ${offCentre} has its echo at sample ${records.centerSample[offCentre]}, not ${Math.floor(samples / 2)} (asymmetric echo is not supported)`,
    );
  }
  const shortRecord = imaging.find((r) => records.data[r].length !== 2 * records.activeChannels[r] * samples);
  if (shortRecord !== undefined) {
    refuse(
      'file.data.data',
      `record ${shortRecord} holds ${records.data[shortRecord].length / 2} complex samples, not channels × samples`,
    );
  }
}

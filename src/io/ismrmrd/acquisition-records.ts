import h5wasm, { type Dataset, type File as Hdf5File, type OutputData } from 'h5wasm';
import { ValidationError } from '../../core/errors.ts';
import { hasHdf5Signature } from './hdf5-signature.ts';

/**
 * The acquisitions of an ISMRMRD file as columns (one entry per record), with the fields of the
 * fixed acquisition header that the importer uses, and each record's samples: `data[r]` holds
 * active_channels × number_of_samples complex float32 values, channel-major, re/im interleaved.
 */
export interface AcquisitionRecords {
  count: number;
  flags: BigUint64Array;
  numberOfSamples: Uint16Array;
  activeChannels: Uint16Array;
  discardPre: Uint16Array;
  discardPost: Uint16Array;
  centerSample: Uint16Array;
  encodingSpaceRef: Uint16Array;
  trajectoryDimensions: Uint16Array;
  step1: Uint16Array;
  step2: Uint16Array;
  average: Uint16Array;
  slice: Uint16Array;
  contrast: Uint16Array;
  phase: Uint16Array;
  repetition: Uint16Array;
  set: Uint16Array;
  data: Float32Array[];
}

export interface IsmrmrdContents {
  /** The XML header text (read for its numbers only, then dropped). */
  xml: string;
  records: AcquisitionRecords;
}

const headerFields = [
  'numberOfSamples:number_of_samples',
  'activeChannels:active_channels',
  'discardPre:discard_pre',
  'discardPost:discard_post',
  'centerSample:center_sample',
  'encodingSpaceRef:encoding_space_ref',
  'trajectoryDimensions:trajectory_dimensions',
] as const;
const counterFields = [
  'step1:kspace_encode_step_1',
  'step2:kspace_encode_step_2',
  'average:average',
  'slice:slice',
  'contrast:contrast',
  'phase:phase',
  'repetition:repetition',
  'set:set',
] as const;

type Member = { name: string; compound_type?: { members: Member[] } };

function refuse(field: string, message: string): never {
  throw new ValidationError({ field, message });
}

function memberIndex(members: Member[], name: string, path: string): number {
  const index = members.findIndex((m) => m.name === name);
  if (index < 0) refuse('file', `not an ISMRMRD file: ${path} has no member ${name}`);
  return index;
}

let uploads = 0;

/**
 * Opens HDF5 bytes with h5wasm (the HDF5 C library compiled to WebAssembly; the file lives in its
 * in-memory file system only while it is read) and returns the ISMRMRD XML header and acquisition
 * records. Refuses bytes that are not HDF5 and HDF5 files without `/dataset/xml` and `/dataset/data`.
 */
export async function readIsmrmrdContents(bytes: Uint8Array, group = 'dataset'): Promise<IsmrmrdContents> {
  if (!hasHdf5Signature(bytes)) {
    refuse('file', 'not an HDF5 file (no HDF5 signature 0x89 "HDF" 0x0D 0x0A 0x1A 0x0A at the start)');
  }
  const { FS } = await h5wasm.ready;
  uploads += 1;
  const path = `/ismrmrd-upload-${process.pid}-${uploads}.h5`;
  FS.writeFile(path, bytes);
  let file: Hdf5File | undefined;
  try {
    try {
      file = new h5wasm.File(path, 'r');
    } catch {
      file = undefined;
    }
    // h5wasm returns a File with a negative id (after HDF5 prints its error stack) when opening fails.
    if (file === undefined || file.file_id < 0n) {
      file = undefined;
      refuse('file', 'the HDF5 file is damaged and cannot be opened');
    }
    const xmlNode = file.get(`${group}/xml`);
    const dataNode = file.get(`${group}/data`);
    if (!(xmlNode instanceof h5wasm.Dataset)) refuse('file', `not an ISMRMRD file: no /${group}/xml dataset`);
    if (!(dataNode instanceof h5wasm.Dataset))
      refuse('file', `not an ISMRMRD file: no /${group}/data dataset`);
    return { xml: readXml(xmlNode, group), records: readRecords(dataNode, group, bytes.length) };
  } catch (error) {
    if (error instanceof ValidationError) throw error;
    throw new ValidationError({
      field: 'file',
      message: 'the HDF5 file is damaged: its ISMRMRD datasets cannot be read',
    });
  } finally {
    file?.close();
    FS.unlink(path);
  }
}

function readXml(dataset: Dataset, group: string): string {
  const value = dataset.value as unknown;
  const text = Array.isArray(value) ? value[0] : value;
  if (typeof text !== 'string') refuse('file', `not an ISMRMRD file: /${group}/xml is not a string`);
  return text;
}

/** Records `from`…`to` − 1 of a compound dataset, each as the list of its member values. */
function recordRows(dataset: Dataset, from: number, to: number, where: string): OutputData[][] {
  const rows = dataset.slice([[from, to]]);
  if (!Array.isArray(rows) || !rows.every((row): row is OutputData[] => Array.isArray(row))) {
    refuse('file', `not an ISMRMRD file: ${where} records are not compound values`);
  }
  return rows;
}

/** Records read per call: keeps h5wasm's heap bounded while the running total is checked. */
const RECORDS_PER_READ = 16;

function readRecords(dataset: Dataset, group: string, fileBytes: number): AcquisitionRecords {
  const where = `/${group}/data`;
  const members = (dataset.metadata.compound_type?.members ?? []) as Member[];
  if (members.length === 0) refuse('file', `not an ISMRMRD file: ${where} is not a compound dataset`);
  const headIndex = memberIndex(members, 'head', where);
  const trajIndex = memberIndex(members, 'traj', where);
  const dataIndex = memberIndex(members, 'data', where);
  const headMembers = members[headIndex].compound_type?.members ?? [];
  const flagsIndex = memberIndex(headMembers, 'flags', `${where}.head`);
  const idxIndex = memberIndex(headMembers, 'idx', `${where}.head`);
  const idxMembers = headMembers[idxIndex].compound_type?.members ?? [];
  const shape = dataset.shape ?? [];
  if (shape.length !== 1) refuse('file', `not an ISMRMRD file: ${where} is not one-dimensional`);
  const count = shape[0];
  // Every record's samples need a global-heap object of at least 16 bytes in the file, so a
  // larger count can only come from fill values or shared references: refused before reading.
  if (count > fileBytes / 16) {
    refuse('file', `${where} declares ${count} records, more than a file of ${fileBytes} bytes can hold`);
  }
  // Samples are stored uncompressed in the global heap, so their total cannot honestly exceed the
  // file; records that share heap objects to inflate past it are refused as they are read.
  const sampleBudget = 2 * fileBytes + 1_048_576;
  let sampleBytes = 0;
  const records: AcquisitionRecords = {
    count,
    flags: new BigUint64Array(count),
    numberOfSamples: new Uint16Array(count),
    activeChannels: new Uint16Array(count),
    discardPre: new Uint16Array(count),
    discardPost: new Uint16Array(count),
    centerSample: new Uint16Array(count),
    encodingSpaceRef: new Uint16Array(count),
    trajectoryDimensions: new Uint16Array(count),
    step1: new Uint16Array(count),
    step2: new Uint16Array(count),
    average: new Uint16Array(count),
    slice: new Uint16Array(count),
    contrast: new Uint16Array(count),
    phase: new Uint16Array(count),
    repetition: new Uint16Array(count),
    set: new Uint16Array(count),
    data: new Array<Float32Array>(count),
  };
  const headColumns = headerFields.map((spec) => {
    const [key, name] = spec.split(':') as [
      (typeof headerFields)[number] extends `${infer K}:${string}` ? K : never,
      string,
    ];
    return { column: records[key], at: memberIndex(headMembers, name, `${where}.head`) };
  });
  const counterColumns = counterFields.map((spec) => {
    const [key, name] = spec.split(':') as [
      (typeof counterFields)[number] extends `${infer K}:${string}` ? K : never,
      string,
    ];
    return { column: records[key], at: memberIndex(idxMembers, name, `${where}.head.idx`) };
  });
  let rows: OutputData[][] = [];
  for (let r = 0; r < count; r++) {
    if (r % RECORDS_PER_READ === 0) {
      rows = recordRows(dataset, r, Math.min(count, r + RECORDS_PER_READ), where);
    }
    const row = rows[r % RECORDS_PER_READ];
    const head = row[headIndex] as unknown[];
    const idx = head[idxIndex] as number[];
    records.flags[r] = BigInt(head[flagsIndex] as bigint | number);
    for (const { column, at } of headColumns) column[r] = head[at] as number;
    for (const { column, at } of counterColumns) column[r] = idx[at];
    const traj = row[trajIndex];
    const samples = row[dataIndex];
    if (!(samples instanceof Float32Array) || !(traj instanceof Float32Array)) {
      refuse('file', `not an ISMRMRD file: ${where} record ${r} does not hold float32 traj and data arrays`);
    }
    sampleBytes += samples.byteLength + traj.byteLength;
    if (sampleBytes > sampleBudget) {
      refuse('file', `${where} holds more samples than a file of ${fileBytes} bytes can store`);
    }
    records.data[r] = samples;
  }
  return records;
}

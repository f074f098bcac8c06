// What h5wasm can write of ISMRMRD's acquisition record type (docs/design.md §4.11): a compound
// with a fixed-size array member (the header's position[3]) and one with a variable-length float32
// member (the record's data and traj), through the JavaScript writer and through its C binding.
// Run: node scripts/h5wasm-write-check.mjs — prints one line per attempt with the library's answer.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import h5wasm from 'h5wasm/node';

const Module = await h5wasm.ready;
const { H5T_class_t } = Module;
const folder = mkdtempSync(join(tmpdir(), 'h5wasm-check-'));
const file = new h5wasm.File(join(folder, 'check.h5'), 'w');

function attempt(label, write) {
  try {
    write();
    console.log(`${label}: written`);
  } catch (error) {
    console.log(`${label}: ${error instanceof Error ? error.message : String(error)}`);
  }
}

const float32 = { type: H5T_class_t.H5T_FLOAT.value, size: 4, littleEndian: true, signed: false, vlen: false };
const version = {
  type: H5T_class_t.H5T_INTEGER.value,
  size: 2,
  littleEndian: true,
  signed: false,
  vlen: false,
  name: 'version',
  offset: 0,
};
const vlenData = {
  type: H5T_class_t.H5T_VLEN.value,
  size: 8,
  littleEndian: true,
  signed: false,
  vlen: false,
  vlen_type: float32,
  name: 'data',
  offset: 2,
};

attempt('compound with a float32[3] member (JavaScript writer)', () => {
  file.create_dataset({
    name: 'fixed',
    data: new Map([
      ['version', new Uint16Array([1, 1])],
      ['position', [new Float32Array([1, 2, 3]), new Float32Array([4, 5, 6])]],
    ]),
    shape: [2],
    dtype: [
      ['version', '<H'],
      ['position', '<f', [3]],
    ],
  });
});

attempt('compound with a variable-length float32 member (JavaScript writer)', () => {
  file.create_dataset({
    name: 'vlen',
    data: new Map([
      ['version', new Uint16Array([1])],
      ['data', [new Float32Array([1, 2, 3, 4])]],
    ]),
    shape: [1],
    dtype: { compound_type: { members: [version, vlenData], nmembers: 2 } },
  });
});

attempt('compound with a variable-length float32 member (C binding, zeroed record)', () => {
  const pointer = Module._malloc(10);
  Module.HEAPU8.fill(0, pointer, pointer + 10);
  try {
    Module.create_dataset(file.file_id, '/direct', BigInt(pointer), {
      type: H5T_class_t.H5T_COMPOUND.value,
      size: 10,
      littleEndian: true,
      signed: false,
      vlen: false,
      compound_type: { members: [version, vlenData], nmembers: 2 },
      shape: [1n],
      maxshape: [1n],
      chunks: null,
      compression: 0,
      compression_opts: [],
      track_order: false,
    });
  } finally {
    Module._free(pointer);
  }
});

file.close();
rmSync(folder, { recursive: true });

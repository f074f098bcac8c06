/** The 8-byte HDF5 format signature, 0x89 'H' 'D' 'F' '\r' '\n' 0x1A '\n' (HDF5 File Format Specification, superblock). */
export const HDF5_SIGNATURE = Uint8Array.of(0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a);

/**
 * True when the bytes start with the HDF5 signature. (The format also allows the superblock at
 * offsets 512, 1024, … after a user block; ISMRMRD writers put it at 0, and so do we.)
 */
export function hasHdf5Signature(bytes: Uint8Array): boolean {
  if (bytes.length < HDF5_SIGNATURE.length) return false;
  return HDF5_SIGNATURE.every((value, i) => bytes[i] === value);
}

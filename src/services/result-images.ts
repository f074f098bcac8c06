/** Result images served as /v1/results/{id}/{name}.png, and the response keys that point at them. */
export const resultImageNames = {
  reconstruction: 'reconstruction',
  zeroFilled: 'zero-filled',
  reference: 'reference',
  errorMap: 'error-map',
  mask: 'mask',
  psf: 'psf',
  coilMaps: 'coil-maps',
  gFactor: 'g-factor',
  /** |recon(with lesions)|, stored only for a request with lesions. */
  lesions: 'lesions',
} as const;

export type ResultImageKey = keyof typeof resultImageNames;

export function resultImageUrl(id: string, key: ResultImageKey): string {
  return `/v1/results/${id}/${resultImageNames[key]}.png`;
}

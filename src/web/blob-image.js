// Showing a fetched PNG in an <img> through a blob URL (a plain src could not carry the API key),
// releasing the blob URL it showed before.

import { byId } from './dom.js';

/** Shows a PNG blob in the <img> with this id, once decoded. */
export async function showBlob(id, blob) {
  const img = byId(id);
  const previous = img.src;
  img.src = URL.createObjectURL(blob);
  if (previous.startsWith('blob:')) URL.revokeObjectURL(previous);
  await img.decode();
  img.hidden = false;
}

/** Empties and hides the <img> with this id. */
export function hideImage(id) {
  const img = byId(id);
  if (img.src.startsWith('blob:')) URL.revokeObjectURL(img.src);
  img.removeAttribute('src');
  img.hidden = true;
}

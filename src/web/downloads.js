// Download links. Without an API key a link points at the service's own URL, so the browser saves
// what the service answers (its content type included); with a key, which a plain link cannot send,
// the file is fetched with the key and the link holds it as a blob.

import { apiKey, getBlob, pageRelative } from './api.js';

function setHref(link, href) {
  if (link.href.startsWith('blob:')) URL.revokeObjectURL(link.href);
  link.href = href;
}

/** Points `link` at a resource of the service (a path from a response) and names the file saved. */
export async function offerResource(link, url, accept, filename) {
  const path = pageRelative(url);
  if (apiKey()) return offerBlob(link, await getBlob(path, accept), filename);
  setHref(link, path);
  link.removeAttribute('type');
  link.download = filename;
  link.hidden = false;
}

/** Points `link` at bytes the page already holds (e.g. the mask a POST answered as PNG). */
export function offerBlob(link, blob, filename) {
  setHref(link, URL.createObjectURL(blob));
  // The media type the service answered (a blob keeps it), as the link's type hint (HTML `type`).
  link.type = blob.type;
  link.download = filename;
  link.hidden = false;
}

/** Takes a link out of use (and releases the blob it held). */
export function withdraw(link) {
  setHref(link, '#');
  link.hidden = true;
}

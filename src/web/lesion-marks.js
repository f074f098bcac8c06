// Marks drawn into a result image: red circles at the true lesion positions, white squares at the
// false lesions. Drawn into the picture itself (enlarged with nearest-neighbour pixels so thin
// lines stay sharp), so zoom, pan and the enlarged view carry the marks with the image.

export const trueLesionColour = '#ff2020';
export const falseLesionColour = '#ffffff';

/** Pixels per image pixel of the marked picture: at least 512 px on its longer side. */
export function markScale(nx, ny) {
  return Math.max(1, Math.ceil(512 / Math.max(nx, ny)));
}

/**
 * `marks`: { lesions: [{ row, col }], diameter (px), falseLesions: [{ row, col }] }. Returns a PNG
 * blob of the image enlarged by markScale with the marks drawn, and where each circle was drawn
 * (centre and radius in the marked picture's pixels) for the page's own record.
 */
export async function markedPng(blob, marks) {
  const bitmap = await createImageBitmap(blob);
  const scale = markScale(bitmap.width, bitmap.height);
  const canvas = document.createElement('canvas');
  canvas.width = bitmap.width * scale;
  canvas.height = bitmap.height * scale;
  const context = canvas.getContext('2d');
  context.imageSmoothingEnabled = false;
  context.drawImage(bitmap, 0, 0, canvas.width, canvas.height);
  bitmap.close();
  context.lineWidth = Math.max(2, 0.5 * scale);
  const radius = (marks.diameter / 2 + 1.5) * scale;
  // False lesions first: a true lesion's circle stays whole where the two meet.
  context.strokeStyle = falseLesionColour;
  for (const { row, col } of marks.falseLesions ?? []) {
    const x = (col + 0.5) * scale;
    const y = (row + 0.5) * scale;
    context.strokeRect(x - radius, y - radius, 2 * radius, 2 * radius);
  }
  const drawn = [];
  context.strokeStyle = trueLesionColour;
  for (const { row, col } of marks.lesions) {
    const x = (col + 0.5) * scale;
    const y = (row + 0.5) * scale;
    context.beginPath();
    context.arc(x, y, radius, 0, 2 * Math.PI);
    context.stroke();
    drawn.push({ x, y, radius });
  }
  const png = await new Promise((resolve) => canvas.toBlob(resolve, 'image/png'));
  return { png, drawn, scale };
}

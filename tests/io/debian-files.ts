import { existsSync, readFileSync } from 'node:fs';

/**
 * Open test files shipped by Debian packages (docs/references.md §12), read in place:
 * - python3-pydicom: /usr/lib/python3/dist-packages/pydicom/data/test_files/ — Expat (MIT),
 *   © 2008-2018 Darcy Mason and pydicom contributors (/usr/share/doc/python3-pydicom/copyright).
 * - python3-nibabel: /usr/lib/python3/dist-packages/nibabel/tests/data/ and nicom/tests/data/ —
 *   Expat (MIT), © 2006-2012 Michael Hanke, Matthew Brett and others (/usr/share/doc/python3-nibabel/copyright).
 * A missing file fails the test with the install command (.ci/run installs both packages); never a skip.
 */
const roots = {
  pydicom: { dir: '/usr/lib/python3/dist-packages/pydicom/data/test_files/', pkg: 'python3-pydicom' },
  nibabel: { dir: '/usr/lib/python3/dist-packages/nibabel/tests/data/', pkg: 'python3-nibabel' },
  nicom: { dir: '/usr/lib/python3/dist-packages/nibabel/nicom/tests/data/', pkg: 'python3-nibabel' },
} as const;

export function debianPath(root: keyof typeof roots, name: string): string {
  const { dir, pkg } = roots[root];
  const path = dir + name;
  if (!existsSync(path)) {
    throw new Error(
      `test file ${path} is missing: install it with \`apt-get install -y ${pkg}\` (see .ci/run)`,
    );
  }
  return path;
}

export function debianFile(root: keyof typeof roots, name: string): Buffer {
  return readFileSync(debianPath(root, name));
}

/** Pixel (row, col) of a row-major image. */
export function at(image: { nx: number; data: Float64Array }, row: number, col: number): number {
  return image.data[row * image.nx + col];
}

export function sum(data: Float64Array): number {
  let s = 0;
  for (const v of data) s += v;
  return s;
}

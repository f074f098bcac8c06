import { describe, expect, it } from 'vitest';
import { getPhantom, listPhantoms, phantomGridKspace } from '../../src/phantoms/index.ts';
import { caughtValidationError } from '../core/caught-validation-error.ts';

const caught = caughtValidationError;

describe('phantom catalogue', () => {
  it('lists the four phantoms with descriptions', () => {
    const list = listPhantoms();
    expect(list.map((p) => p.name)).toEqual([
      'shepp-logan',
      'shepp-logan-modified',
      'resolution-contrast',
      'contrast-detail',
    ]);
    for (const p of list) expect(p.description.length).toBeGreaterThan(20);
  });

  it('returns each listed phantom by name, ready to rasterise and transform', () => {
    for (const { name } of listPhantoms()) {
      const phantom = getPhantom(name);
      expect(phantom.name).toBe(name);
      expect(phantom.rasterize(8, 6).data.length).toBe(48);
      expect(phantomGridKspace(phantom, 8, 6).data.length).toBe(96);
    }
  });

  it('answers an unknown name with a ValidationError on source.phantom listing the known names', () => {
    const error = caught(() => getPhantom('shepp_logan'));
    expect(error.problems).toHaveLength(1);
    expect(error.problems[0].field).toBe('source.phantom');
    expect(error.problems[0].allowed).toBe(
      'shepp-logan, shepp-logan-modified, resolution-contrast, contrast-detail',
    );
  });

  it('rejects mismatched or non-finite frequency lists with ValidationErrors on points', () => {
    const phantom = getPhantom('shepp-logan-modified');
    expect(caught(() => phantom.kspaceAt([0, 1], [0])).problems[0].field).toBe('points');
    expect(caught(() => phantom.kspaceAt([0, Number.NaN], [0, 0])).problems[0].field).toBe('points.1');
    expect(caught(() => phantom.kspaceAt([0], [Number.POSITIVE_INFINITY])).problems[0].field).toBe(
      'points.0',
    );
  });

  it('evaluates an empty point list to an empty result', () => {
    expect(getPhantom('resolution-contrast').kspaceAt([], []).length).toBe(0);
  });
});

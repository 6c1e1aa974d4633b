// inManifestTerms: a batch run's settings come from manifest columns, so its messages name columns, not options.
import { describe, expect, it } from 'vitest';
import { inManifestTerms } from '../../src/batch/inManifestTerms.js';

describe('inManifestTerms', () => {
  it('turns each option a manifest column sets into that column', () => {
    expect(inManifestTerms('the marker swept only 40° of its circle; give --center x,y (and the tilt in degrees with --tilt if the camera is not square to the axis)'))
      .toBe('the marker swept only 40° of its circle; give column center x,y (and the tilt in degrees with column tilt if the camera is not square to the axis)');
    expect(inManifestTerms('--markers 3 needs marker spots; --marker texture follows the surface')).toBe('column markers 3 needs marker spots; column marker texture follows the surface');
    expect(inManifestTerms('check --from and --to')).toBe('check column from and column to');
  });

  it('spells the centre column the way the manifest header does (center) and leaves other options and text alone', () => {
    expect(inManifestTerms('a path away from --centre')).toBe('a path away from column center');
    expect(inManifestTerms('raise --tolerance or pick the colour again')).toBe('raise --tolerance or pick the colour again');
    expect(inManifestTerms('no marker was found in the whole 320×240 frame')).toBe('no marker was found in the whole 320×240 frame');
  });
});

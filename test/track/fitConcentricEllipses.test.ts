import { describe, expect, it } from 'vitest';
import { fitConcentricEllipses } from '../../src/track/fitConcentricEllipses.js';
import { expectAgreesWithOpenCvEllipse } from './openCvReference.js';
import { ellipsePoints } from './ellipsePoints.js';

const deg = Math.PI / 180;

describe('fitConcentricEllipses (shared centre and shape, one size per marker)', () => {
  // Truth: the parametric form of concentric ellipses of one axis ratio and orientation (analytic geometry)
  it('recovers exact concentric ellipses from two opposite 120° arcs at different radii', () => {
    const ratio = 0.8;
    const a = ellipsePoints(320.4, 239.7, 150, 150 * ratio, 20, 10 * deg, 130 * deg, 60);
    const b = ellipsePoints(320.4, 239.7, 100, 100 * ratio, 20, 190 * deg, 310 * deg, 60);
    const fit = fitConcentricEllipses([a, b], { resamples: 20 });
    for (const [k, size] of [[0, 150], [1, 100]] as const) {
      const e = fit.ellipses[k];
      expect(e.cx_px).toBeCloseTo(320.4, 5);
      expect(e.cy_px).toBeCloseTo(239.7, 5);
      expect(e.semi_major_px).toBeCloseTo(size, 4);
      expect(e.semi_minor_px).toBeCloseTo(size * ratio, 4);
      expect(e.major_axis_deg).toBeCloseTo(20, 3);
    }
    expect(fit.axis_ratio).toBeCloseTo(ratio, 6);
    expect(fit.rms_px).toBeLessThan(1e-6);
  });

  it('with noise (0.2 px), two 120° arcs place the centre within 0.2 px and reject a stray point', () => {
    const a = ellipsePoints(300, 200, 140, 140, 0, 40 * deg, 160 * deg, 120, 0.2, 3);
    const b = ellipsePoints(300, 200, 140, 140, 0, 220 * deg, 340 * deg, 120, 0.2, 4);
    a.x_px[17] += 8;
    const fit = fitConcentricEllipses([a, b]);
    expect(Math.hypot(fit.ellipses[0].cx_px - 300, fit.ellipses[0].cy_px - 200)).toBeLessThan(0.2);
    expect(fit.inlier[0][17]).toBe(0);
    expect(fit.se.cx_px).toBeGreaterThan(0);
    expect(fit.se.cx_px).toBeLessThan(0.2);
    expect(fit.ci95.cx_px[0]).toBeLessThan(fit.ci95.cx_px[1]);
  });

  it('about a given centre, fits only the shared shape and the sizes', () => {
    const a = ellipsePoints(500, 300, 150, 100, 0, 0.2, 1.4, 50);
    const b = ellipsePoints(500, 300, 90, 60, 0, 3.3, 4.5, 50);
    const fit = fitConcentricEllipses([a, b], { centre: { x_px: 500, y_px: 300 }, resamples: 10 });
    expect(fit.ellipses[0].semi_major_px).toBeCloseTo(150, 4);
    expect(fit.ellipses[1].semi_minor_px).toBeCloseTo(60, 4);
    expect(fit.axis_ratio).toBeCloseTo(100 / 150, 6);
    expect(fit.se.cx_px).toBe(0);
  });

  // Reference: OpenCV 4.5 cv.fitEllipse (npm @techstark/opencv-js), a different least-squares ellipse fit, on
  // one whole noisy path; OpenCV reports full axes and the width axis angle clockwise as displayed.
  it('with one path agrees with OpenCV fitEllipse', async () => {
    const p = ellipsePoints(300, 200, 120, 80, -40, 0.3, 0.3 + 2 * Math.PI, 400, 0.3, 7);
    await expectAgreesWithOpenCvEllipse(fitConcentricEllipses([p], { resamples: 10 }).ellipses[0], p.x_px, p.y_px);
  });
});

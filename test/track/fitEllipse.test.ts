import { describe, expect, it } from 'vitest';
import { conicToEllipse, fitCentredEllipse, fitEllipse } from '../../src/track/fitEllipse.js';
import { fitEllipseRobust, fitPathEllipse, sampsonDistance } from '../../src/track/fitEllipseRobust.js';
import { expectAgreesWithOpenCvEllipse } from './openCvReference.js';
import { ellipsePoints } from './ellipsePoints.js';

describe('fitEllipse (Halíř–Flusser direct least squares)', () => {
  // Truth: the parametric form of an ellipse (analytic geometry)
  it('recovers an exact ellipse from points on it', () => {
    const { x_px: x, y_px: y } = ellipsePoints(640.5, 360.25, 150, 122.9, 25, 0, 2 * Math.PI, 60);
    const e = fitEllipse(x, y);
    expect(e.cx_px).toBeCloseTo(640.5, 6);
    expect(e.cy_px).toBeCloseTo(360.25, 6);
    expect(e.semi_major_px).toBeCloseTo(150, 6);
    expect(e.semi_minor_px).toBeCloseTo(122.9, 6);
    expect(e.major_axis_deg).toBeCloseTo(25, 6);
  });

  // Reference: OpenCV 4.5 cv.fitEllipse (npm @techstark/opencv-js), a different least-squares ellipse fit;
  // OpenCV reports full axes and the width axis angle clockwise as displayed.
  it('agrees with OpenCV fitEllipse on noisy points', async () => {
    const { x_px: x, y_px: y } = ellipsePoints(300, 200, 120, 80, -40, 0.3, 0.3 + 2 * Math.PI, 400, 0.3, 7);
    await expectAgreesWithOpenCvEllipse(fitEllipse(x, y), x, y);
  });

  it('fits a centred ellipse from a short arc when the centre is known', () => {
    const { x_px: x, y_px: y } = ellipsePoints(500, 300, 150, 100, 0, 0.2, 1.4, 50);
    const e = fitCentredEllipse(x, y, 500, 300);
    expect(e.semi_major_px).toBeCloseTo(150, 6);
    expect(e.semi_minor_px).toBeCloseTo(100, 6);
    expect(e.major_axis_deg).toBeCloseTo(0, 6);
  });

  it('turns a circle conic into equal axes', () => {
    // (x−3)² + (y−4)² = 25  →  x² + y² − 6x − 8y + 0 = 0
    const e = conicToEllipse(1, 0, 1, -6, -8, 0);
    expect(e.cx_px).toBeCloseTo(3, 12);
    expect(e.cy_px).toBeCloseTo(4, 12);
    expect(e.semi_major_px).toBeCloseTo(5, 12);
    expect(e.semi_minor_px).toBeCloseTo(5, 12);
  });

  it('rejects collinear points', () => {
    const x = Float64Array.from([0, 1, 2, 3, 4, 5]);
    expect(() => fitEllipse(x, x)).toThrow();
  });
});

describe('fitEllipseRobust', () => {
  it('ignores gross outliers and reports a standard error that covers the truth', () => {
    const { x_px: x, y_px: y } = ellipsePoints(640, 360, 150, 123, 10, 0, 4 * Math.PI, 800, 0.1, 3);
    for (let i = 0; i < 800; i += 20) x[i] += 15; // 5 % of points thrown 15 px off
    const fit = fitEllipseRobust(x, y);
    let rejected = 0;
    for (let i = 0; i < 800; i++) rejected += fit.inlier[i] ? 0 : 1;
    expect(rejected).toBeGreaterThanOrEqual(40);
    expect(Math.abs(fit.ellipse.cx_px - 640)).toBeLessThan(4 * fit.se.cx_px + 0.02);
    expect(Math.abs(fit.ellipse.cy_px - 360)).toBeLessThan(4 * fit.se.cy_px + 0.02);
    expect(fit.se.cx_px).toBeGreaterThan(0);
    expect(fit.se.cx_px).toBeLessThan(0.05);
    expect(fit.ellipse.semi_minor_px / fit.ellipse.semi_major_px).toBeCloseTo(123 / 150, 3);
    expect(fit.rms_px).toBeLessThan(0.2);
  });

  // a circle of radius 100: points 3 px outside and inside lie ±3 px from the curve (geometry, common practice, no source)
  it('measures distance from the curve in pixels', () => {
    const e = { cx_px: 0, cy_px: 0, semi_major_px: 100, semi_minor_px: 100, major_axis_deg: 0 };
    expect(sampsonDistance(e, 103, 0)).toBeCloseTo(3, 1);
    expect(sampsonDistance(e, 0, -97)).toBeCloseTo(-3, 1);
  });
});

describe('fitPathEllipse', () => {
  it('returns null instead of throwing when points about a given centre lie on no ellipse (a hyperbola)', () => {
    // points with u·v = 100 about the centre (100, 100), u = x − 100, v = −(y − 100): A u² + B uv + C v² = 1 is met
    // exactly by B = 1/100, A = C = 0, a hyperbola (4AC − B² < 0), not an ellipse (analytic geometry)
    const u = Array.from({ length: 40 }, (_, i) => 10 + i);
    const x = Float64Array.from(u, (v) => 100 + v);
    const y = Float64Array.from(u, (v) => 100 - 100 / v);
    expect(() => fitEllipseRobust(x, y, { centre: { x_px: 100, y_px: 100 } })).toThrow();
    expect(fitPathEllipse(x, y, { x_px: 100, y_px: 100 })).toBeNull();
  });

  it('gives the robust fit when the points lie on an ellipse', () => {
    const { x_px: x, y_px: y } = ellipsePoints(200, 150, 90, 60, 15, 0, 2 * Math.PI, 80);
    const fit = fitPathEllipse(x, y, null);
    expect(fit?.ellipse.cx_px).toBeCloseTo(200, 6);
    expect(fit?.ellipse.semi_minor_px).toBeCloseTo(60, 6);
  });
});

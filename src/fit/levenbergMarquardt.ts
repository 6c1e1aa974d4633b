/**
 * Nonlinear least squares by Levenberg–Marquardt.
 *
 * Method: the damped Gauss–Newton step δ minimises ‖r − Jδ‖² + λ‖Dδ‖² (Levenberg 1944; Marquardt 1963),
 * with the diagonal scaling D_j = the largest Euclidean norm column j of J has had so far (Moré 1978,
 * "The Levenberg–Marquardt algorithm: implementation and theory"), solved through a Householder QR of J
 * followed by a small QR of [R; √λ·D] (as MINPACK's lmpar/qrsolv do, so JᵀJ is never formed).
 * λ is updated from the gain ratio ρ = actual / predicted reduction (Nielsen 1999, "Damping parameter
 * in Marquardt's method", IMM-REP-1999-05): accepted steps shrink λ by max(1/3, 1 − (2ρ − 1)³),
 * rejected steps grow it by ν = 2, 4, 8, …
 * The covariance at the solution is s²(JᵀJ)⁻¹ = s²·R⁻¹R⁻ᵀ with s² = RSS / (n − k).
 */

/**
 * A least-squares problem: n observations y_i and a model f_i(p) with k parameters.
 * `residuals` fills r_i = y_i − f_i(p); `jacobian` fills ∂f_i/∂p_j column-major (jac[j·n + i]).
 */
export interface LeastSquaresProblem {
  n: number;
  residuals: (p: Float64Array, r: Float64Array) => void;
  jacobian: (p: Float64Array, jac: Float64Array) => void;
}

export interface LevenbergMarquardtOptions {
  /** Most iterations (Jacobian evaluations). Default 500. */
  maxIterations?: number;
  /** Stop when both the actual and the predicted relative reductions of the RSS are below this. Default 1e-15. */
  ftol?: number;
  /** Stop when an accepted scaled step is below xtol·‖D·p‖. Default 1e-13. */
  xtol?: number;
  /** Stop when the largest cosine between r and a column of J is below this. Default 1e-15. */
  gtol?: number;
  /** Starting damping, relative to the scaling D (dimensionless). Default 1e-3. */
  initialLambda?: number;
  /** Compute the covariance s²(JᵀJ)⁻¹ at the solution. Default true. */
  covariance?: boolean;
}

export interface LevenbergMarquardtResult {
  /** Parameters at the solution. */
  params: Float64Array;
  /** Residuals y − f(p) at the solution. */
  residuals: Float64Array;
  /** Residual sum of squares at the solution. */
  rss: number;
  /** Residual degrees of freedom n − k. */
  dof: number;
  /** s²(JᵀJ)⁻¹, row-major k×k (NaN when J is rank-deficient or not requested). */
  covariance: Float64Array;
  /** Standard errors, √diag(covariance). */
  se: Float64Array;
  /** (JᵀJ)⁻¹ without s², row-major k×k, for callers that build their own covariance. */
  inverseNormal: Float64Array;
  /** Jacobian ∂f/∂p, column-major (jac[j·n + i]): at the solution when the covariance was requested, else at the last accepted step. */
  jacobian: Float64Array;
  iterations: number;
  converged: boolean;
  /** Why it stopped, in words. */
  reason: string;
}

const DEFAULTS: Required<LevenbergMarquardtOptions> = {
  maxIterations: 500,
  ftol: 1e-15,
  xtol: 1e-13,
  gtol: 1e-15,
  initialLambda: 1e-3,
  covariance: true,
};

/** Sum of squares of a vector, scaled to avoid overflow/underflow. */
function sumSquares(v: Float64Array): number {
  let scale = 0;
  for (let i = 0; i < v.length; i++) scale = Math.max(scale, Math.abs(v[i]!));
  if (scale === 0 || !Number.isFinite(scale)) return scale === 0 ? 0 : NaN;
  let s = 0;
  for (let i = 0; i < v.length; i++) {
    const x = v[i]! / scale;
    s += x * x;
  }
  return s * scale * scale;
}

/**
 * Householder QR of an m×k column-major matrix A (overwritten). Returns R (k×k row-major, upper)
 * and applies Qᵀ to the vector b (overwritten; its first k entries become Qᵀb).
 */
export function householderQr(a: Float64Array, m: number, k: number, b: Float64Array): Float64Array {
  const rMat = new Float64Array(k * k);
  for (let j = 0; j < k; j++) {
    const col = j * m;
    let norm = 0;
    let scale = 0;
    for (let i = j; i < m; i++) scale = Math.max(scale, Math.abs(a[col + i]!));
    if (scale > 0) {
      for (let i = j; i < m; i++) {
        const x = a[col + i]! / scale;
        norm += x * x;
      }
      norm = Math.sqrt(norm) * scale;
    }
    if (norm === 0) {
      rMat[j * k + j] = 0;
      for (let c = j + 1; c < k; c++) rMat[j * k + c] = a[c * m + j]!;
      continue;
    }
    const alpha = a[col + j]! > 0 ? -norm : norm;
    // v = x − alpha·e1, stored in place; beta = 2 / vᵀv
    a[col + j] = a[col + j]! - alpha;
    let vtv = 0;
    for (let i = j; i < m; i++) vtv += a[col + i]! * a[col + i]!;
    const beta = 2 / vtv;
    for (let c = j + 1; c < k; c++) {
      const cc = c * m;
      let dot = 0;
      for (let i = j; i < m; i++) dot += a[col + i]! * a[cc + i]!;
      const f = beta * dot;
      for (let i = j; i < m; i++) a[cc + i] = a[cc + i]! - f * a[col + i]!;
    }
    let dotb = 0;
    for (let i = j; i < m; i++) dotb += a[col + i]! * b[i]!;
    const fb = beta * dotb;
    for (let i = j; i < m; i++) b[i] = b[i]! - fb * a[col + i]!;
    rMat[j * k + j] = alpha;
    for (let c = j + 1; c < k; c++) rMat[j * k + c] = a[c * m + j]!;
  }
  return rMat;
}

/** Inverse of a k×k upper-triangular row-major matrix (NaN entries when singular). */
function invertUpper(rMat: Float64Array, k: number): Float64Array {
  const inv = new Float64Array(k * k);
  for (let j = 0; j < k; j++) {
    inv[j * k + j] = 1 / rMat[j * k + j]!;
    for (let i = j - 1; i >= 0; i--) {
      let s = 0;
      for (let l = i + 1; l <= j; l++) s += rMat[i * k + l]! * inv[l * k + j]!;
      inv[i * k + j] = -s / rMat[i * k + i]!;
    }
  }
  return inv;
}

/** (JᵀJ)⁻¹ = R⁻¹R⁻ᵀ from the R factor of J (row-major k×k). NaN when J is numerically rank-deficient. */
export function inverseNormalFromR(rMat: Float64Array, k: number): Float64Array {
  let maxDiag = 0;
  for (let j = 0; j < k; j++) maxDiag = Math.max(maxDiag, Math.abs(rMat[j * k + j]!));
  const out = new Float64Array(k * k);
  for (let j = 0; j < k; j++) {
    if (!(Math.abs(rMat[j * k + j]!) > maxDiag * 1e-14)) return out.fill(NaN);
  }
  const inv = invertUpper(rMat, k);
  for (let i = 0; i < k; i++) {
    for (let j = 0; j < k; j++) {
      let s = 0;
      for (let l = Math.max(i, j); l < k; l++) s += inv[i * k + l]! * inv[j * k + l]!;
      out[i * k + j] = s;
    }
  }
  return out;
}

/** (JᵀJ)⁻¹ for a column-major n×k Jacobian, via Householder QR. */
export function inverseNormal(jac: Float64Array, n: number, k: number): Float64Array {
  const rMat = householderQr(jac.slice(), n, k, new Float64Array(n));
  return inverseNormalFromR(rMat, k);
}

/**
 * Solves min ‖[R; √λ·D]δ − [qtr; 0]‖ for δ (R upper k×k row-major) with a small Householder QR.
 * Returns δ, or null if the system is singular.
 */
function dampedStep(rMat: Float64Array, qtr: Float64Array, diag: Float64Array, lambda: number, k: number): Float64Array | null {
  const m = 2 * k;
  const a = new Float64Array(m * k);
  const b = new Float64Array(m);
  const sl = Math.sqrt(lambda);
  for (let j = 0; j < k; j++) {
    for (let i = 0; i <= j; i++) a[j * m + i] = rMat[i * k + j]!;
    a[j * m + k + j] = sl * diag[j]!;
  }
  for (let i = 0; i < k; i++) b[i] = qtr[i]!;
  const r2 = householderQr(a, m, k, b);
  const delta = new Float64Array(k);
  for (let i = k - 1; i >= 0; i--) {
    let s = b[i]!;
    for (let l = i + 1; l < k; l++) s -= r2[i * k + l]! * delta[l]!;
    const d = r2[i * k + i]!;
    if (d === 0 || !Number.isFinite(d)) return null;
    delta[i] = s / d;
  }
  return delta;
}

/**
 * Minimises Σ r_i(p)² from the start p0 by Levenberg–Marquardt (see the file comment for the method).
 * Returns the solution, the residuals, the RSS, the covariance s²(JᵀJ)⁻¹ at the solution and whether it converged.
 */
export function levenbergMarquardt(
  problem: LeastSquaresProblem,
  p0: ArrayLike<number>,
  options: LevenbergMarquardtOptions = {},
): LevenbergMarquardtResult {
  const opt = { ...DEFAULTS, ...options };
  const { n } = problem;
  const k = p0.length;
  let p = Float64Array.from(p0);
  let r = new Float64Array(n);
  let rTrial = new Float64Array(n);
  const jac = new Float64Array(n * k);
  const work = new Float64Array(n * k);
  const qtb = new Float64Array(n);
  const diag = new Float64Array(k);
  const columnNorm = new Float64Array(k);
  const jacTrial = new Float64Array(n * k);
  let jacobianReady = false;
  let rejected = 0;

  problem.residuals(p, r);
  let rss = sumSquares(r);
  if (!Number.isFinite(rss)) throw new RangeError('The model is not finite at the starting parameters; give other starting values.');
  let lambda = opt.initialLambda;
  let nu = 2;
  let iterations = 0;
  let converged = false;
  let reason = 'reached the iteration limit';
  let needJacobian = true;
  let rMat: Float64Array = new Float64Array(k * k);
  const qtr = new Float64Array(k);
  let qtrSq = 0;

  outer: while (iterations < opt.maxIterations) {
    if (needJacobian) {
      iterations++;
      if (!jacobianReady) problem.jacobian(p, jac);
      jacobianReady = false;
      // Moré (1978) scaling: D_j = max over iterations of the column norms of J.
      let gradCos = 0;
      const rNorm = Math.sqrt(rss);
      for (let j = 0; j < k; j++) {
        let cn = 0;
        let g = 0;
        for (let i = 0; i < n; i++) {
          const v = jac[j * n + i]!;
          cn += v * v;
          g += v * r[i]!;
        }
        cn = Math.sqrt(cn);
        columnNorm[j] = cn;
        diag[j] = Math.max(diag[j]!, cn);
        if (cn > 0 && rNorm > 0) gradCos = Math.max(gradCos, Math.abs(g) / (cn * rNorm));
      }
      for (let j = 0; j < k; j++) if (diag[j] === 0) diag[j] = 1;
      if (rss === 0 || gradCos <= opt.gtol) {
        converged = true;
        reason = 'the residuals are orthogonal to the Jacobian';
        break;
      }
      work.set(jac);
      qtb.set(r);
      rMat = householderQr(work, n, k, qtb);
      for (let j = 0; j < k; j++) qtr[j] = qtb[j]!;
      qtrSq = 0;
      for (let j = 0; j < k; j++) qtrSq += qtr[j]! * qtr[j]!;
      needJacobian = false;
      // ‖Qᵀr‖² is the reduction the undamped Gauss–Newton step predicts: if even that is negligible, stop.
      if (qtrSq <= opt.ftol * rss) {
        converged = true;
        reason = 'the Gauss–Newton step predicts a relative reduction below ftol';
        break;
      }
    }

    const delta = dampedStep(rMat, qtr, diag, lambda, k);
    if (delta === null) {
      lambda *= nu;
      nu *= 2;
      if (lambda > 1e30) {
        reason = 'the damped step is singular';
        break;
      }
      continue;
    }
    // Predicted reduction ‖qtr‖² − ‖qtr − Rδ‖².
    let resid = 0;
    for (let i = 0; i < k; i++) {
      let s = 0;
      for (let l = i; l < k; l++) s += rMat[i * k + l]! * delta[l]!;
      const e = qtr[i]! - s;
      resid += e * e;
    }
    const predicted = qtrSq - resid;
    const pTrial = new Float64Array(k);
    let stepNorm = 0;
    let pNorm = 0;
    for (let j = 0; j < k; j++) {
      pTrial[j] = p[j]! + delta[j]!;
      stepNorm += (diag[j]! * delta[j]!) ** 2;
      pNorm += (diag[j]! * p[j]!) ** 2;
    }
    stepNorm = Math.sqrt(stepNorm);
    pNorm = Math.sqrt(pNorm);
    let rssTrial = NaN;
    try {
      problem.residuals(pTrial, rTrial);
      rssTrial = sumSquares(rTrial);
    } catch {
      rssTrial = NaN;
    }
    const actual = rss - rssTrial;
    const rho = predicted > 0 ? actual / predicted : -1;
    let accept = Number.isFinite(rssTrial) && rho > 1e-4;
    if (accept) {
      // Our own safeguard (no source): refuse a step into a plateau where a parameter stops influencing
      // the model (its Jacobian column collapses to rounding level, e.g. an exponential rate → ∞), which
      // would stall the method at a false stationary point; the damping then grows and the step shortens.
      problem.jacobian(pTrial, jacTrial);
      for (let j = 0; j < k; j++) {
        let cn = 0;
        for (let i = 0; i < n; i++) cn += jacTrial[j * n + i]! ** 2;
        if (Math.sqrt(cn) < 1e-9 * diag[j]! && columnNorm[j]! >= 1e-9 * diag[j]!) accept = false;
      }
    }
    if (accept) {
      jac.set(jacTrial);
      jacobianReady = true;
      p = pTrial;
      const swap = r;
      r = rTrial;
      rTrial = swap;
      const rssOld = rss;
      rss = rssTrial;
      lambda *= Math.max(1 / 3, 1 - (2 * rho - 1) ** 3);
      nu = 2;
      rejected = 0;
      needJacobian = true;
      if (actual <= opt.ftol * rssOld && predicted <= opt.ftol * rssOld) {
        converged = true;
        reason = 'the relative reduction of the residual sum of squares is below ftol';
        break outer;
      }
      if (stepNorm <= opt.xtol * pNorm) {
        converged = true;
        reason = 'the relative step is below xtol';
        break outer;
      }
    } else {
      // Rejected: if even the predicted reduction is at rounding level, we are at the minimum.
      if (predicted <= 4 * Number.EPSILON * rss && lambda <= opt.initialLambda) {
        converged = true;
        reason = 'no further reduction is possible at rounding level';
        break;
      }
      lambda *= nu;
      nu *= 2;
      rejected++;
      if (lambda > 1e20 || stepNorm <= Number.EPSILON * pNorm || rejected > 40) {
        // The step has shrunk to rounding level without reducing the RSS: stationary to working precision.
        converged = predicted <= 1e-10 * rss;
        reason = converged ? 'no further reduction is possible at rounding level' : 'the damping grew without reducing the residuals';
        break;
      }
    }
  }

  // Covariance at the solution.
  if (opt.covariance) problem.jacobian(p, jac);
  const dof = n - k;
  let invN: Float64Array = new Float64Array(k * k).fill(NaN);
  if (opt.covariance) {
    work.set(jac);
    qtb.fill(0);
    invN = inverseNormalFromR(householderQr(work, n, k, qtb), k);
  }
  const s2 = dof > 0 ? rss / dof : NaN;
  const covariance = invN.map((v) => v * s2);
  const se = new Float64Array(k);
  for (let j = 0; j < k; j++) se[j] = Math.sqrt(covariance[j * k + j]!);
  return { params: p, residuals: r, rss, dof, covariance, se, inverseNormal: invN, jacobian: jac, iterations, converged, reason };
}

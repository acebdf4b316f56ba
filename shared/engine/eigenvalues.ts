/**
 * Eigenvalues of a small real n × n matrix (row-major), for the stability check of a drift's
 * Jacobian (n ≤ 16, once per run): Householder reduction to upper Hessenberg form, then the
 * single-shift QR iteration in complex arithmetic with Wilkinson shifts and deflation at
 * negligible subdiagonal entries (Golub & Van Loan 2013, Matrix Computations, §7.4–7.5; the
 * complex single shift instead of the real double shift, which is simpler and equally good at
 * this size). Returns NaN entries if the iteration does not converge.
 */
export interface Eigenvalues {
  re: Float64Array;
  im: Float64Array;
}

const EPSILON = 2.220446049250313e-16;
const MAX_SWEEPS_PER_EIGENVALUE = 60;

/** In place: A ← H = Qᵀ A Q upper Hessenberg (Golub & Van Loan 2013, Algorithm 7.4.2). */
function toHessenberg(a: Float64Array, n: number): void {
  const v = new Float64Array(n);
  for (let k = 0; k < n - 2; k++) {
    let norm = 0;
    for (let i = k + 1; i < n; i++) norm += a[i * n + k]! ** 2;
    norm = Math.sqrt(norm);
    if (norm === 0) continue;
    const alpha = a[(k + 1) * n + k]! > 0 ? -norm : norm;
    let vNorm = 0;
    for (let i = k + 1; i < n; i++) {
      v[i] = a[i * n + k]! - (i === k + 1 ? alpha : 0);
      vNorm += v[i]! ** 2;
    }
    if (vNorm === 0) continue;
    // A ← P A P with P = I − 2vvᵀ/(vᵀv).
    for (let j = 0; j < n; j++) {
      let dot = 0;
      for (let i = k + 1; i < n; i++) dot += v[i]! * a[i * n + j]!;
      const f = (2 * dot) / vNorm;
      for (let i = k + 1; i < n; i++) a[i * n + j] = a[i * n + j]! - f * v[i]!;
    }
    for (let i = 0; i < n; i++) {
      let dot = 0;
      for (let j = k + 1; j < n; j++) dot += a[i * n + j]! * v[j]!;
      const f = (2 * dot) / vNorm;
      for (let j = k + 1; j < n; j++) a[i * n + j] = a[i * n + j]! - f * v[j]!;
    }
  }
}

export function eigenvalues(matrix: ArrayLike<number>, n: number): Eigenvalues {
  if (matrix.length !== n * n) throw new RangeError(`expected ${n * n} entries, got ${matrix.length}`);
  const re = Float64Array.from(matrix);
  const im = new Float64Array(n * n);
  const out: Eigenvalues = { re: new Float64Array(n), im: new Float64Array(n) };
  if (!re.every(Number.isFinite)) {
    out.re.fill(NaN);
    out.im.fill(NaN);
    return out;
  }
  toHessenberg(re, n);
  const at = (i: number, j: number) => i * n + j;
  const magnitude = (i: number, j: number) => Math.hypot(re[at(i, j)]!, im[at(i, j)]!);
  // Rotations of one sweep: c (real), s (complex).
  const cs = new Float64Array(n);
  const sRe = new Float64Array(n);
  const sIm = new Float64Array(n);

  let hi = n - 1;
  let sweeps = 0;
  while (hi >= 0) {
    let lo = hi;
    while (lo > 0) {
      const sub = magnitude(lo, lo - 1);
      if (sub <= EPSILON * (magnitude(lo, lo) + magnitude(lo - 1, lo - 1)) || sub < Number.MIN_VALUE) break;
      lo--;
    }
    if (lo === hi) {
      out.re[hi] = re[at(hi, hi)]!;
      out.im[hi] = im[at(hi, hi)]!;
      hi--;
      sweeps = 0;
      continue;
    }
    if (++sweeps > MAX_SWEEPS_PER_EIGENVALUE) {
      for (let i = 0; i <= hi; i++) {
        out.re[i] = NaN;
        out.im[i] = NaN;
      }
      break;
    }
    // Wilkinson shift: the eigenvalue of the trailing 2 × 2 block [[a, b], [c, d]] nearer d;
    // every tenth sweep an exceptional shift breaks a cycle.
    const aR = re[at(hi - 1, hi - 1)]!,
      aI = im[at(hi - 1, hi - 1)]!;
    const bR = re[at(hi - 1, hi)]!,
      bI = im[at(hi - 1, hi)]!;
    const cR = re[at(hi, hi - 1)]!,
      cI = im[at(hi, hi - 1)]!;
    const dR = re[at(hi, hi)]!,
      dI = im[at(hi, hi)]!;
    let muR = dR;
    let muI = dI;
    if (sweeps % 10 === 0) {
      muR = dR + 0.75 * magnitude(hi, hi - 1);
    } else {
      const hR = 0.5 * (aR - dR),
        hI = 0.5 * (aI - dI);
      // disc = h² + bc, root = √disc (principal branch).
      const discR = hR * hR - hI * hI + (bR * cR - bI * cI);
      const discI = 2 * hR * hI + (bR * cI + bI * cR);
      const modulus = Math.hypot(discR, discI);
      let rootR = Math.sqrt(0.5 * (modulus + discR));
      let rootI = Math.sign(discI) * Math.sqrt(Math.max(0, 0.5 * (modulus - discR)));
      if (discI === 0 && discR < 0) rootI = Math.sqrt(-discR);
      // μ = d − bc / (h ± root), the sign making the denominator larger.
      if (hR * rootR + hI * rootI < 0) {
        rootR = -rootR;
        rootI = -rootI;
      }
      const denR = hR + rootR,
        denI = hI + rootI;
      const den2 = denR * denR + denI * denI;
      if (den2 > 0) {
        const bcR = bR * cR - bI * cI,
          bcI = bR * cI + bI * cR;
        muR = dR - (bcR * denR + bcI * denI) / den2;
        muI = dI - (bcI * denR - bcR * denI) / den2;
      }
    }
    for (let i = lo; i <= hi; i++) {
      re[at(i, i)] = re[at(i, i)]! - muR;
      im[at(i, i)] = im[at(i, i)]! - muI;
    }
    // H − μI = QR by Givens rotations G_k acting on rows k, k + 1 ...
    for (let k = lo; k < hi; k++) {
      const xR = re[at(k, k)]!,
        xI = im[at(k, k)]!;
      const yR = re[at(k + 1, k)]!,
        yI = im[at(k + 1, k)]!;
      const xAbs = Math.hypot(xR, xI);
      const norm = Math.hypot(xAbs, Math.hypot(yR, yI));
      let c = 1,
        sr = 0,
        si = 0;
      if (norm > 0) {
        if (xAbs === 0) {
          c = 0;
          sr = yR / norm;
          si = -yI / norm;
        } else {
          // G = [[c, s], [−s̄, c]], c = |x|/ν, s = (x/|x|)·ȳ/ν, so that G·(x, y) = ((x/|x|)ν, 0).
          c = xAbs / norm;
          const uR = xR / xAbs,
            uI = xI / xAbs;
          sr = (uR * yR + uI * yI) / norm;
          si = (uI * yR - uR * yI) / norm;
        }
      }
      cs[k] = c;
      sRe[k] = sr;
      sIm[k] = si;
      for (let j = k; j <= hi; j++) {
        const pR = re[at(k, j)]!,
          pI = im[at(k, j)]!;
        const qR = re[at(k + 1, j)]!,
          qI = im[at(k + 1, j)]!;
        re[at(k, j)] = c * pR + (sr * qR - si * qI);
        im[at(k, j)] = c * pI + (sr * qI + si * qR);
        // −s̄·p + c·q
        re[at(k + 1, j)] = -(sr * pR + si * pI) + c * qR;
        im[at(k + 1, j)] = -(sr * pI - si * pR) + c * qI;
      }
    }
    // ... then RQ = R·G_loᴴ·…·G_{hi−1}ᴴ on columns k, k + 1, and the shift back.
    for (let k = lo; k < hi; k++) {
      const c = cs[k]!,
        sr = sRe[k]!,
        si = sIm[k]!;
      for (let i = lo; i <= Math.min(k + 2, hi); i++) {
        const pR = re[at(i, k)]!,
          pI = im[at(i, k)]!;
        const qR = re[at(i, k + 1)]!,
          qI = im[at(i, k + 1)]!;
        // new col k = c·p + s̄·q; new col k+1 = −s·p + c·q
        re[at(i, k)] = c * pR + (sr * qR + si * qI);
        im[at(i, k)] = c * pI + (sr * qI - si * qR);
        re[at(i, k + 1)] = -(sr * pR - si * pI) + c * qR;
        im[at(i, k + 1)] = -(sr * pI + si * pR) + c * qI;
      }
    }
    for (let i = lo; i <= hi; i++) {
      re[at(i, i)] = re[at(i, i)]! + muR;
      im[at(i, i)] = im[at(i, i)]! + muI;
    }
  }
  return out;
}

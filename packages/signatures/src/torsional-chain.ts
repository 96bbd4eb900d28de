/*
 * ml-matrix for the eigenproblem: pure JavaScript (no native build, so `npm ci` works anywhere and there is
 * nothing to compile for a GPU-less, offline box), maintained, typed, and its EigenvalueDecomposition has a
 * symmetric path (Householder tridiagonalisation + QL, the JAMA/EISPACK tred2/tql2 pair) that returns
 * orthonormal eigenvectors, which modal superposition relies on.
 */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import type { Complex } from './complex.js';
import { SignatureInputError } from './errors.js';

/** A spring between two nodes of the chain, or from a node to ground (`to: null`). */
export interface ChainSpring {
  id?: string;
  from: number;
  to: number | null;
  stiffnessNmPerRad: number;
}

/** A lumped torsional chain on plain inputs: inertias by node index and the springs between them. */
export interface TorsionalChain {
  inertiasKgM2: readonly number[];
  springs: readonly ChainSpring[];
}

export interface TorsionalMode {
  /** 0 for the lowest. */
  index: number;
  angularFrequencyRadPerS: number;
  naturalFrequencyHz: number;
  /** Modal damping ratio (0 for a rigid-body mode). */
  dampingRatio: number;
  /** A free chain turning as one body: ω = 0. */
  rigidBody: boolean;
  /** Mass-normalised shape: φᵀ·J·φ = 1. */
  shape: number[];
}

export interface ChainModes {
  modes: TorsionalMode[];
  /** Natural frequencies of the flexible modes, lowest first (rigid-body modes left out). */
  naturalFrequenciesHz: number[];
  rigidBodyModes: number;
}

export interface ModalDamping {
  /** ζ of every flexible mode unless `modalDampingRatios` gives it. */
  dampingRatio: number;
  /** ζ of the flexible modes, lowest first; modes beyond the list use `dampingRatio`. */
  modalDampingRatios?: readonly number[];
}

function invalid(message: string): never {
  throw new SignatureInputError('invalid_chain', message);
}

function validateChain(chain: TorsionalChain): void {
  const n = chain.inertiasKgM2.length;
  if (n === 0) invalid('inertiasKgM2 must list at least one inertia');
  chain.inertiasKgM2.forEach((j, i) => {
    if (!(j > 0) || !Number.isFinite(j)) invalid(`inertiasKgM2[${i}] (${j}) must be a finite number > 0`);
  });
  chain.springs.forEach((s, i) => {
    const node = (v: number | null, name: string) => {
      if (v !== null && (!Number.isInteger(v) || v < 0 || v >= n)) invalid(`springs[${i}].${name} (${v}) must be a node index from 0 to ${n - 1}`);
    };
    node(s.from, 'from');
    node(s.to, 'to');
    if (s.from === s.to) invalid(`springs[${i}] joins node ${s.from} to itself`);
    if (!(s.stiffnessNmPerRad > 0) || !Number.isFinite(s.stiffnessNmPerRad)) {
      invalid(`springs[${i}].stiffnessNmPerRad (${s.stiffnessNmPerRad}) must be a finite number > 0`);
    }
  });
}

/** The stiffness matrix K (N·m/rad) of the chain. */
export function stiffnessMatrix(chain: TorsionalChain): number[][] {
  validateChain(chain);
  const n = chain.inertiasKgM2.length;
  const K = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (const s of chain.springs) {
    const k = s.stiffnessNmPerRad;
    K[s.from]![s.from]! += k;
    if (s.to !== null) {
      K[s.to]![s.to]! += k;
      K[s.from]![s.to]! -= k;
      K[s.to]![s.from]! -= k;
    }
  }
  return K;
}

/** How many parts of the chain float free (joined to nothing grounded): each adds one rigid-body mode. */
function freeComponents(chain: TorsionalChain): number {
  const n = chain.inertiasKgM2.length;
  const parent = Array.from({ length: n }, (_, i) => i);
  const find = (i: number): number => (parent[i] === i ? i : (parent[i] = find(parent[i]!)));
  const grounded = new Set<number>();
  for (const s of chain.springs) {
    if (s.to === null) grounded.add(s.from);
    else parent[find(s.from)] = find(s.to);
  }
  const groundedRoots = new Set([...grounded].map(find));
  const roots = new Set(Array.from({ length: n }, (_, i) => find(i)));
  return [...roots].filter((r) => !groundedRoots.has(r)).length;
}

function checkDamping(damping: ModalDamping): void {
  const ok = (z: number) => Number.isFinite(z) && z >= 0 && z < 1;
  if (!ok(damping.dampingRatio)) {
    throw new SignatureInputError('invalid_parameter', `dampingRatio (${damping.dampingRatio}) must be a number >= 0 and < 1`);
  }
  damping.modalDampingRatios?.forEach((z, i) => {
    if (!ok(z)) throw new SignatureInputError('invalid_parameter', `modalDampingRatios[${i}] (${z}) must be a number >= 0 and < 1`);
  });
}

/**
 * Natural frequencies and mass-normalised mode shapes of K·φ = ω²·J·φ.
 * J is diagonal, so A = J^−½·K·J^−½ is symmetric with the same eigenvalues; its orthonormal
 * eigenvectors ψ give φ = J^−½·ψ with φᵀJφ = 1 (Meirovitch, Elements of Vibration Analysis, §4 (from memory);
 * common practice). The rigid-body modes of a free chain are counted from its connectivity, not guessed
 * from tiny eigenvalues, and get ω = 0 exactly.
 */
export function torsionalModes(chain: TorsionalChain, damping: ModalDamping): ChainModes {
  checkDamping(damping);
  const K = stiffnessMatrix(chain);
  const J = chain.inertiasKgM2;
  const n = J.length;
  const s = J.map((j) => 1 / Math.sqrt(j));
  const A = new Matrix(n, n);
  for (let i = 0; i < n; i++) for (let k = 0; k < n; k++) A.set(i, k, K[i]![k]! * s[i]! * s[k]!);
  // symmetrise against round-off so the symmetric path applies exactly
  for (let i = 0; i < n; i++) for (let k = i + 1; k < n; k++) { const v = (A.get(i, k) + A.get(k, i)) / 2; A.set(i, k, v); A.set(k, i, v); }
  const evd = new EigenvalueDecomposition(A, { assumeSymmetric: true });
  const values = evd.realEigenvalues;
  const vectors = evd.eigenvectorMatrix;
  const order = values.map((_, i) => i).sort((a, b) => values[a]! - values[b]!);
  const rigid = freeComponents(chain);
  let flexibleIndex = 0;
  const modes = order.map((col, index): TorsionalMode => {
    const rigidBody = index < rigid;
    const omega = rigidBody ? 0 : Math.sqrt(Math.max(values[col]!, 0));
    const shape = Array.from({ length: n }, (_, i) => vectors.get(i, col) * s[i]!);
    // sign convention: the largest entry is positive, so shapes read the same from run to run
    let big = 0;
    for (const v of shape) if (Math.abs(v) > Math.abs(big) + 1e-12) big = v;
    if (big < 0) for (let i = 0; i < n; i++) shape[i] = -shape[i]!;
    const zeta = rigidBody ? 0 : (damping.modalDampingRatios?.[flexibleIndex] ?? damping.dampingRatio);
    if (!rigidBody) flexibleIndex++;
    return { index, angularFrequencyRadPerS: omega, naturalFrequencyHz: omega / (2 * Math.PI), dampingRatio: zeta, rigidBody, shape };
  });
  return { modes, naturalFrequenciesHz: modes.filter((m) => !m.rigidBody).map((m) => m.naturalFrequencyHz), rigidBodyModes: rigid };
}

function checkNode(modes: ChainModes, node: number, name: string): void {
  const n = modes.modes[0]?.shape.length ?? 0;
  if (!Number.isInteger(node) || node < 0 || node >= n) invalid(`${name} (${node}) must be a node index from 0 to ${n - 1}`);
}

function modalSum(modes: ChainModes, responseNode: number, forceNode: number, frequencyHz: number, which: 'all' | 'rigid' | 'flexible'): Complex {
  checkNode(modes, responseNode, 'responseNode');
  checkNode(modes, forceNode, 'forceNode');
  if (!(frequencyHz >= 0) || !Number.isFinite(frequencyHz)) {
    throw new SignatureInputError('invalid_parameter', `frequencyHz (${frequencyHz}) must be a finite number >= 0`);
  }
  const w = 2 * Math.PI * frequencyHz;
  let re = 0, im = 0;
  for (const m of modes.modes) {
    if ((which === 'rigid' && !m.rigidBody) || (which === 'flexible' && m.rigidBody)) continue;
    const num = m.shape[responseNode]! * m.shape[forceNode]!;
    if (num === 0) continue;
    const dRe = m.angularFrequencyRadPerS ** 2 - w * w;
    const dIm = 2 * m.dampingRatio * m.angularFrequencyRadPerS * w;
    const d = dRe * dRe + dIm * dIm;
    if (d === 0) return { re: Infinity, im: 0 };
    re += (num * dRe) / d;
    im -= (num * dIm) / d;
  }
  return { re, im };
}

/**
 * Receptance H_rf(ω) in rad per N·m: the angle at `responseNode` per unit harmonic torque at `forceNode`.
 * Modal superposition H(ω) = Σ φ_i φ_iᵀ / (ω_i² − ω² + 2jζ_iω_iω); exact for proportional damping.
 * A rigid-body mode contributes −φφᵀ/ω² (the mass line), infinite at ω = 0: a free chain has no static
 * response to a steady torque, so callers leave the mean (0 Hz) term out.
 */
// Ewins, Modal Testing: Theory, Practice and Application, 2nd ed., §2.3 (from memory); common practice.
export function receptance(modes: ChainModes, responseNode: number, forceNode: number, frequencyHz: number): Complex {
  return modalSum(modes, responseNode, forceNode, frequencyHz, 'all');
}

/** The rigid-body part of the receptance alone (−Σ_rigid φφᵀ/ω²); zero for a grounded chain. */
export function rigidBodyReceptance(modes: ChainModes, responseNode: number, forceNode: number, frequencyHz: number): Complex {
  return modalSum(modes, responseNode, forceNode, frequencyHz, 'rigid');
}

/**
 * Dynamic magnification of the chain between two nodes: |H(ω)| over the response the same torque would give
 * without flexibility: the static receptance |H(0)| of a grounded chain, or the rigid-body (mass-line)
 * receptance of a free one. 1 well below the first mode, the peaks at the modes.
 */
export function chainMagnification(modes: ChainModes, responseNode: number, forceNode: number, frequencyHz: number): number {
  const h = receptance(modes, responseNode, forceNode, frequencyHz);
  const rigid = modes.rigidBodyModes > 0 ? rigidBodyReceptance(modes, responseNode, forceNode, frequencyHz) : { re: 0, im: 0 };
  const ref = Math.hypot(rigid.re, rigid.im) > 0 ? rigid : modalSum(modes, responseNode, forceNode, 0, 'flexible');
  const refAbs = Math.hypot(ref.re, ref.im);
  return refAbs > 0 && Number.isFinite(refAbs) ? Math.hypot(h.re, h.im) / refAbs : NaN;
}

/** A shape scaled so that its largest entry is ±1 (for plotting and reports). */
export function unitPeakShape(shape: readonly number[]): number[] {
  const peak = Math.max(...shape.map(Math.abs));
  return peak > 0 ? shape.map((v) => v / peak) : [...shape];
}

import { resolveTorsionalCouplings, shaftRatios, type MachineModel } from '@kinespec/kinematics';
import { inverse, Matrix } from 'ml-matrix';
import type { Complex } from './complex.js';
import { SignatureInputError } from './errors.js';
import { shaftTorsionalStiffnessNmPerRad } from './shaft-stiffness.js';
import {
  chainMagnification, receptance, torsionalModes, unitPeakShape, type ChainModes, type ChainSpring, type TorsionalChain,
} from './torsional-chain.js';

/*
 * The machine model's `torsional` section as a lumped chain referred to one shaft.
 *
 * Referral (common practice; e.g. Den Hartog, Mechanical Vibrations, 4th ed., on geared torsional systems, from memory):
 * a shaft turning at n times the reference speed stores ½·J·(nω)² and ½·k·(nθ)², so its inertias and
 * stiffnesses count as J·n² and k·n² on the reference shaft; natural frequencies do not change.
 *
 * Rigid bodies. Inertias joined by no flexible element move as one and are lumped:
 *   - inertias on one shaft with no link between them (machine-model.md). Where a shaft's links leave it in
 *     several parts, each part is joined rigidly to the shaft's first-listed inertia at its own first-listed
 *     inertia (the one rule that never short-circuits a link);
 *   - the two inertias a belt or gear mesh couples, unless `torsional.couplings` gives it a stiffness
 *     (attachment inertias as @kinespec/kinematics resolveTorsionalCouplings picks them).
 * A shaft that carries no inertia is a massless node; where flexible couplings leave such a node without
 * mass of its own, it is removed by static (Kron/Guyan) condensation (springs in series).
 */

export interface ReferredNode {
  /** Inertia ids lumped into this body (physical ids from the model). */
  members: string[];
  /** Σ J·n² on the reference shaft, kg·m². */
  inertiaKgM2: number;
}

export interface ReferredSpring extends ChainSpring {
  /** Link or coupling id(s); several after condensation. */
  id: string;
  /** Stiffness as given or computed from geometry, on its own shaft (a coupling: referred to its driven shaft). */
  physicalStiffnessNmPerRad: number | null;
}

export interface InertiaPlace {
  node: number;
  shaft: string;
  /** Speed of the inertia's shaft over the speed of the shaft the chain is referred to. */
  ratio: number;
}

export interface TorsionalModel {
  /** The shaft the chain is referred to. */
  referredTo: string;
  nodes: ReferredNode[];
  springs: ReferredSpring[];
  chain: TorsionalChain;
  /** Where each physical inertia sits in the chain. */
  inertias: Record<string, InertiaPlace>;
  modes: ChainModes;
  /** Mode shapes as physical angles of each inertia, largest ±1 (for reports and plots). */
  modeShapes: Array<{ naturalFrequencyHz: number; dampingRatio: number; rigidBody: boolean; shape: Record<string, number> }>;
  warnings: string[];
}

class UnionFind {
  private readonly parent: number[];
  constructor(n: number) { this.parent = Array.from({ length: n }, (_, i) => i); }
  find(i: number): number { return this.parent[i] === i ? i : (this.parent[i] = this.find(this.parent[i]!)); }
  union(a: number, b: number): void { this.parent[this.find(a)] = this.find(b); }
}

/**
 * The torsional chain of a machine referred to `referredTo` (default the reference shaft), with its modes.
 * Returns null for a model without a `torsional` section.
 */
export function torsionalModel(model: MachineModel, options: { referredTo?: string } = {}): TorsionalModel | null {
  const t = model.torsional;
  if (!t) return null;
  const warnings: string[] = [];
  const speedRatio = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));
  const base = options.referredTo ?? model.speed.shaft;
  const baseRatio = speedRatio.get(base);
  if (baseRatio === undefined) throw new SignatureInputError('unknown_component', `referredTo ('${base}') is not a shaft of machine '${model.id}'`);
  const ratioOf = (shaft: string) => speedRatio.get(shaft)! / baseRatio;

  // places 0..I−1 are the inertias, then one massless place per shaft that carries none but is coupled
  const ids = t.inertias.map((i) => i.id);
  const shaftOfPlace = t.inertias.map((i) => i.shaft);
  const jOfPlace = t.inertias.map((i) => i.kgM2);
  const index = new Map(ids.map((id, i) => [id, i]));
  const virtual = new Map<string, number>();
  const placeOnShaft = (inertia: string | null, shaft: string): number => {
    if (inertia !== null) {
      const i = index.get(inertia);
      if (i === undefined) throw new SignatureInputError('unknown_component', `torsional coupling names inertia '${inertia}', which is not in torsional.inertias`);
      return i;
    }
    let v = virtual.get(shaft);
    if (v === undefined) {
      v = ids.length + virtual.size;
      virtual.set(shaft, v);
      shaftOfPlace.push(shaft);
      jOfPlace.push(0);
      warnings.push(`shaft '${shaft}' carries no torsional inertia; it is treated as massless`);
    }
    return v;
  };
  const couplings = resolveTorsionalCouplings(model).map((c) => ({
    ...c,
    a: placeOnShaft(c.driverInertia, c.driverShaft),
    b: placeOnShaft(c.drivenInertia, c.drivenShaft),
  }));
  const P = shaftOfPlace.length;
  const uf = new UnionFind(P);

  // rule 1: inertias on one shaft that no chain of links joins move as one
  const linkUf = new UnionFind(ids.length);
  for (const l of t.links) {
    const a = index.get(l.from), b = index.get(l.to);
    if (a === undefined || b === undefined) {
      throw new SignatureInputError('unknown_component', `torsional link '${l.id}' names an inertia that is not in torsional.inertias`);
    }
    linkUf.union(a, b);
  }
  const shafts = [...new Set(t.inertias.map((i) => i.shaft))];
  for (const shaft of shafts) {
    const here = ids.map((_, i) => i).filter((i) => t.inertias[i]!.shaft === shaft);
    const anchor = here[0]!;
    const seen = new Set<number>([linkUf.find(anchor)]);
    for (const i of here) {
      const root = linkUf.find(i);
      if (seen.has(root)) continue;
      seen.add(root);
      uf.union(anchor, i);
    }
  }
  // rule 2: belts and meshes without a stiffness couple their inertias rigidly
  for (const c of couplings) if (c.stiffnessNmPerRad === null) uf.union(c.a, c.b);

  // springs between places, referred
  const rawSprings: Array<{ id: string; a: number; b: number; k: number; physical: number }> = [];
  for (const l of t.links) {
    const a = index.get(l.from)!, b = index.get(l.to)!;
    const physical = l.stiffnessNmPerRad ?? shaftTorsionalStiffnessNmPerRad({
      diameterMm: l.diameterMm!, lengthMm: l.lengthMm!, shearModulusGPa: l.shearModulusGPa,
    });
    const n = ratioOf(t.inertias[a]!.shaft);
    rawSprings.push({ id: l.id, a, b, k: physical * n * n, physical });
  }
  for (const c of couplings) {
    if (c.stiffnessNmPerRad === null) continue;
    const n = ratioOf(c.drivenShaft);
    rawSprings.push({ id: c.element, a: c.a, b: c.b, k: c.stiffnessNmPerRad * n * n, physical: c.stiffnessNmPerRad });
  }

  // bodies
  const rootToBody = new Map<number, number>();
  const bodyOfPlace = new Array<number>(P);
  for (let p = 0; p < P; p++) {
    const r = uf.find(p);
    if (!rootToBody.has(r)) rootToBody.set(r, rootToBody.size);
    bodyOfPlace[p] = rootToBody.get(r)!;
  }
  const B = rootToBody.size;
  const bodyJ = new Array<number>(B).fill(0);
  const members: string[][] = Array.from({ length: B }, () => []);
  for (let p = 0; p < P; p++) {
    const n = ratioOf(shaftOfPlace[p]!);
    bodyJ[bodyOfPlace[p]!] += jOfPlace[p]! * n * n;
    if (p < ids.length) members[bodyOfPlace[p]!]!.push(ids[p]!);
  }
  const bodySprings: Array<{ id: string; a: number; b: number; k: number; physical: number | null }> = [];
  for (const s of rawSprings) {
    const a = bodyOfPlace[s.a]!, b = bodyOfPlace[s.b]!;
    if (a === b) {
      warnings.push(`'${s.id}' joins inertias that move as one body (a rigid coupling or shaft closes a loop around it); it is left out`);
      continue;
    }
    bodySprings.push({ id: s.id, a, b, k: s.k, physical: s.physical });
  }

  // condense massless bodies (flexible couplings on both sides of a shaft with no inertia)
  const massive = bodyJ.map((j, i) => (j > 0 ? i : -1)).filter((i) => i >= 0);
  const massless = bodyJ.map((j, i) => (j > 0 ? -1 : i)).filter((i) => i >= 0);
  let nodes: ReferredNode[];
  let springs: ReferredSpring[];
  if (massless.length === 0) {
    nodes = massive.map((b) => ({ members: members[b]!, inertiaKgM2: bodyJ[b]! }));
    springs = bodySprings.map((s) => ({ id: s.id, from: s.a, to: s.b, stiffnessNmPerRad: s.k, physicalStiffnessNmPerRad: s.physical }));
  } else {
    ({ nodes, springs } = condense(bodyJ, members, bodySprings, massive, massless, warnings));
  }
  const newIndex = new Map(massive.map((b, i) => [b, i]));
  const inertias: Record<string, InertiaPlace> = {};
  t.inertias.forEach((inertia, p) => {
    const node = newIndex.get(bodyOfPlace[p]!);
    if (node !== undefined) inertias[inertia.id] = { node, shaft: inertia.shaft, ratio: ratioOf(inertia.shaft) };
  });

  const chain: TorsionalChain = { inertiasKgM2: nodes.map((n) => n.inertiaKgM2), springs };
  const modes = torsionalModes(chain, { dampingRatio: t.dampingRatio, modalDampingRatios: t.modalDampingRatios });
  const modeShapes = modes.modes.map((m) => {
    const physical = ids.map((id) => (inertias[id] ? m.shape[inertias[id]!.node]! * inertias[id]!.ratio : 0));
    const unit = unitPeakShape(physical);
    return {
      naturalFrequencyHz: m.naturalFrequencyHz, dampingRatio: m.dampingRatio, rigidBody: m.rigidBody,
      shape: Object.fromEntries(ids.map((id, i) => [id, unit[i]!])),
    };
  });
  return { referredTo: base, nodes, springs, chain, inertias, modes, modeShapes, warnings };
}

function condense(
  bodyJ: number[], members: string[][], springs: Array<{ id: string; a: number; b: number; k: number }>,
  massive: number[], massless: number[], warnings: string[],
): { nodes: ReferredNode[]; springs: ReferredSpring[] } {
  const B = bodyJ.length;
  const K = Array.from({ length: B }, () => new Array<number>(B).fill(0));
  for (const s of springs) {
    K[s.a]![s.a]! += s.k; K[s.b]![s.b]! += s.k; K[s.a]![s.b]! -= s.k; K[s.b]![s.a]! -= s.k;
  }
  // a massless body joined to nothing flexible carries no state at all
  const free = massless.filter((i) => K[i]![i]! > 0);
  const pick = (rows: number[], cols: number[]) => new Matrix(rows.map((r) => cols.map((c) => K[r]![c]!)));
  let Kr = pick(massive, massive);
  if (free.length > 0) {
    // Kron reduction: K_mm − K_m0·K_00⁻¹·K_0m (Guyan, AIAA J. 3:380, 1965, static condensation; from memory)
    Kr = Kr.sub(pick(massive, free).mmul(inverse(pick(free, free))).mmul(pick(free, massive)));
    warnings.push(`massless shaft nodes condensed out (springs in series): ${free.length}`);
  }
  const scale = Math.max(1e-300, ...massive.map((_, i) => Math.abs(Kr.get(i, i))));
  const out: ReferredSpring[] = [];
  for (let i = 0; i < massive.length; i++) {
    let rowSum = 0;
    for (let j = 0; j < massive.length; j++) rowSum += Kr.get(i, j);
    for (let j = i + 1; j < massive.length; j++) {
      const k = -Kr.get(i, j);
      if (k > 1e-12 * scale) out.push({ id: `condensed ${i}-${j}`, from: i, to: j, stiffnessNmPerRad: k, physicalStiffnessNmPerRad: null });
    }
    if (rowSum > 1e-12 * scale) out.push({ id: `condensed ${i}-ground`, from: i, to: null, stiffnessNmPerRad: rowSum, physicalStiffnessNmPerRad: null });
  }
  // ids of the original springs stay readable when the condensation leaves them one-to-one
  for (const s of out) {
    const original = springs.find((o) => (massive.indexOf(o.a) === s.from && massive.indexOf(o.b) === s.to) || (massive.indexOf(o.b) === s.from && massive.indexOf(o.a) === s.to));
    if (original) s.id = original.id;
  }
  return { nodes: massive.map((b) => ({ members: members[b]!, inertiaKgM2: bodyJ[b]! })), springs: out };
}

/**
 * Physical receptance between two inertias of the model: angle of `responseInertia` (rad, on its own shaft)
 * per N·m applied at `forceInertia` (on its own shaft): n_r·n_f·H_referred (a torque T on a shaft at n times
 * the reference speed does work T·nθ_ref; its angle is n·θ_ref). Infinite at 0 Hz for a free chain.
 */
export function inertiaReceptance(tm: TorsionalModel, responseInertia: string, forceInertia: string, frequencyHz: number): Complex {
  const [r, f] = places(tm, responseInertia, forceInertia);
  const h = receptance(tm.modes, r.node, f.node, frequencyHz);
  const s = r.ratio * f.ratio;
  return { re: h.re * s, im: h.im * s };
}

/** Dynamic magnification of the chain between two inertias (see chainMagnification; the ratios cancel). */
export function inertiaMagnification(tm: TorsionalModel, responseInertia: string, forceInertia: string, frequencyHz: number): number {
  const [r, f] = places(tm, responseInertia, forceInertia);
  return chainMagnification(tm.modes, r.node, f.node, frequencyHz);
}

function places(tm: TorsionalModel, responseInertia: string, forceInertia: string): [InertiaPlace, InertiaPlace] {
  const r = tm.inertias[responseInertia];
  const f = tm.inertias[forceInertia];
  if (!r) throw new SignatureInputError('unknown_component', `inertia '${responseInertia}' is not in the torsional chain`);
  if (!f) throw new SignatureInputError('unknown_component', `inertia '${forceInertia}' is not in the torsional chain`);
  return [r, f];
}

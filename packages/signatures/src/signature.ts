import {
  bearingFaultOrders, motorComponentId, pointUnit, shaftRatios, type MachineModel, type Point, type Resonance,
} from '@kinespec/kinematics';
import { abs, arg, fromPolar, mul, type Complex } from './complex.js';
import { cageExcitation, innerRaceExcitation, outerRaceExcitation, rollingElementExcitation, type BearingExcitationOptions } from './bearing-excitation.js';
import { electricalExcitation } from './electrical-excitation.js';
import { SignatureInputError } from './errors.js';
import { fmt, type Excitation, type ExcitationCoefficient, type ExcitationLine, type ExcitationPath, type SpectrumDomain } from './excitation.js';
import { modelGears } from './fault-candidates.js';
import { faultComponentKinds, faultKinds, isFaultKind, type FaultComponentKind, type FaultKind } from './fault-kinds.js';
import { gearEccentricityExcitation, gearWearExcitation, toothDropExcitation, type ToothDropShape } from './gear-tooth-excitation.js';
import { derivativeOrder, fromDisplacement, unitsPerSi, type MeasuredQuantity } from './measured-quantity.js';
import { transmissibility } from './sdof.js';
import { loosenessExcitation, misalignmentExcitation, unbalanceExcitation } from './shaft-excitation.js';
import { inertiaMagnification, inertiaReceptance, torsionalModel, type TorsionalModel } from './torsional-model.js';

export interface SignatureOptions {
  fault: FaultKind;
  /** Id of the shaft, rotor, gear, gear mesh, bearing or motor the fault sits in. */
  component: string;
  /** Speed of the reference shaft (default: the model's nominal speed). */
  speedRpm?: number;
  /** Measurement point id (default: a vibration point near the component's shaft, else the first one). */
  point?: string;
  /**
   * Highest harmonic of the excitation's fundamental. Tooth faults: shaft orders of the gear (default 3·Z);
   * bearings: harmonics of the defect rate (default 5); looseness: harmonics of ½× (default 20);
   * electrical: multiples of 2×LF (default 1). Unbalance, misalignment, wear and eccentricity have fixed lines.
   */
  harmonics?: number;
  /** Sidebands each side for the inner race and rolling element (default 3). */
  sidebands?: number;
  /** Mean torque carried by the faulty gear's mesh, N·m (default 1, so amplitudes are per N·m). */
  meanTorqueNm?: number;
  /** Radius at which a gear's angular vibration is read as a linear one at a casing point, mm (default 100). */
  transferRadiusMm?: number;
  /** Tooth faults: depth of the torque drop (default 1 for a missing tooth, 0.5 for a broken one). */
  depthFraction?: number;
  /** Tooth faults: shape of the drop (default 'rectangular'). */
  dropShape?: ToothDropShape;
  /** Tooth faults: the optional mesh ripple as a fraction of the mean torque (default 0). */
  rippleFraction?: number;
}

export interface SignatureLine {
  frequencyHz: number;
  /** Order of the reference shaft. */
  order: number;
  /** Peak amplitude in `unit` (see `amplitudeBasis`). */
  amplitude: number;
  phaseRad: number;
  /** Harmonic of the excitation's fundamental. */
  harmonic: number;
  /** Sideband index of a modulated excitation, 0 on carriers. */
  sideband: number;
  /** The template's one-sided coefficient (fraction of its `reference`). */
  excitationCoefficient: ExcitationCoefficient;
  /** Total dynamic magnification: torsional × structural (1 where a path is absent). */
  magnification: number;
  /** |H(ω)| of the torsional chain over its rigid-body/static value; null off the torsional path. */
  torsionalMagnification: number | null;
  /** Product of the point's resonance transmissibilities at this frequency (1 in the envelope domain). */
  structuralMagnification: number;
  label: string;
  formula: string;
}

export interface ResonanceWarningLine {
  frequencyHz: number;
  harmonic: number;
  sideband: number;
  label: string;
}

export interface SignatureWarning {
  kind: 'resonance' | 'model';
  message: string;
  /** For resonance warnings: which natural frequency. */
  source?: 'torsional' | 'structural';
  naturalFrequencyHz?: number;
  dampingRatio?: number;
  /** Flexible torsional mode number, 1 for the lowest. */
  mode?: number;
  lines?: ResonanceWarningLine[];
}

export type SignatureQuantity = MeasuredQuantity | 'excitation';

export interface Signature {
  fault: FaultKind;
  component: string;
  componentKind: FaultComponentKind;
  /** The shaft whose orders the excitation is written in. */
  shaft: string;
  shaftSpeedHz: number;
  referenceShaft: string;
  speedRpm: number;
  point: string | null;
  /** 'envelope' for bearing defects: the lines are those of the envelope spectrum. */
  domain: SpectrumDomain;
  path: ExcitationPath;
  quantity: SignatureQuantity;
  unit: string;
  amplitudeKind: 'peak';
  /**
   * 'model': amplitudes follow from the torsional model under `assumptions` (mean torque, transfer radius);
   * 'relative': the template's relative sizes carried to the point (the fundamental of a stiffness-controlled
   * path = 1 unit), for comparing lines with each other; the absolute level is not predicted.
   */
  amplitudeBasis: 'model' | 'relative';
  lines: SignatureLine[];
  /** Flexible torsional natural frequencies, lowest first ([] without a torsional section). */
  naturalFrequenciesHz: number[];
  modeShapes: TorsionalModel['modeShapes'] | null;
  structuralResonances: Resonance[];
  warnings: SignatureWarning[];
  assumptions: string[];
  excitation: Pick<Excitation, 'template' | 'formula' | 'reference' | 'mean' | 'segments'> & {
    /** Fundamental and modulation as orders of the reference shaft (null for fixed-frequency lines). */
    fundamentalOrder: number | null;
    modulationOrder: number | null;
  };
}

/** The fraction of the 10 % margin: an excitation within ±10 % of a natural frequency is flagged (common practice). */
export const RESONANCE_MARGIN_FRACTION = 0.1;
/** Lines weaker than this fraction of the strongest excitation line raise no resonance warning. */
const WARN_FLOOR_FRACTION = 1e-3;

interface FaultSource {
  excitation: Excitation;
  componentKind: FaultComponentKind;
  baseShaft: string;
  /** Torsional faults: the inertia (gear body) the torque acts on, if the chain has one. */
  gear?: string;
  label: (line: ExcitationLine) => string;
}

function unknownComponent(fault: FaultKind, component: string, model: MachineModel): never {
  const kinds = faultComponentKinds[fault].join(' or ');
  throw new SignatureInputError('unknown_component', `component ('${component}') must be a ${kinds} of machine '${model.id}' for fault '${fault}'`);
}

const times = (x: number) => `${fmt(x)}×`;

/** The excitation template of a fault in its component, with the shaft it is written on (no response applied). */
export function faultExcitation(model: MachineModel, options: Omit<SignatureOptions, 'point' | 'meanTorqueNm' | 'transferRadiusMm'> & {
  /** Ringing resonance for bearing impacts (default: none, rectangular pulses). */
  impactResonance?: Resonance;
}): Excitation {
  return resolveSource(model, options, options.impactResonance ?? null, options.speedRpm ?? model.speed.nominalRpm).excitation;
}

function resolveSource(model: MachineModel, o: SignatureOptions, ringing: Resonance | null, speedRpm: number): FaultSource {
  const { fault, component } = o;
  const ratio = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));
  switch (fault) {
    case 'unbalance':
    case 'misalignment':
    case 'looseness': {
      const rotor = fault === 'unbalance' ? model.rotors.find((r) => r.id === component) : undefined;
      const shaft = rotor?.shaft ?? (model.shafts.some((s) => s.id === component) ? component : undefined);
      if (!shaft) unknownComponent(fault, component, model);
      const excitation = fault === 'unbalance' ? unbalanceExcitation()
        : fault === 'misalignment' ? misalignmentExcitation()
          : loosenessExcitation({ harmonics: o.harmonics });
      return { excitation, componentKind: rotor ? 'rotor' : 'shaft', baseShaft: shaft, label: (l) => `${times(l.order!)} ${shaft}` };
    }
    case 'gear-missing-tooth':
    case 'gear-broken-tooth':
    case 'gear-eccentricity': {
      const g = modelGears(model).find((x) => x.gear === component);
      if (!g) unknownComponent(fault, component, model);
      const Z = g.teeth;
      const excitation = fault === 'gear-eccentricity'
        ? gearEccentricityExcitation({ teeth: Z })
        : toothDropExcitation({
          teeth: Z,
          depthFraction: o.depthFraction ?? (fault === 'gear-missing-tooth' ? 1 : 0.5),
          shape: o.dropShape,
          rippleFraction: o.rippleFraction,
          harmonics: o.harmonics,
        });
      const label = (l: ExcitationLine) => {
        const n = Math.round(l.order!);
        const k = Math.round(n / Z);
        const m = n - k * Z;
        if (k >= 1 && m === 0) return `${k === 1 ? '' : `${k}×`}GMF ${g.mesh}`;
        if (k >= 1 && Math.abs(m) <= 5) return `${k === 1 ? '' : `${k}×`}GMF ${g.mesh} ${m > 0 ? '+' : '−'} ${Math.abs(m)}× ${g.shaft}`;
        return `${n}× ${g.shaft}`;
      };
      return { excitation, componentKind: 'gear', baseShaft: g.shaft, gear: g.gear, label };
    }
    case 'gear-wear': {
      const mesh = model.gearMeshes.find((m) => m.id === component);
      if (!mesh) unknownComponent(fault, component, model);
      const excitation = gearWearExcitation({ teeth: mesh.driver.teeth });
      return {
        excitation, componentKind: 'gear-mesh', baseShaft: mesh.driver.shaft, gear: mesh.driver.gear,
        label: (l) => `${l.harmonic === mesh.driver.teeth ? '' : `${Math.round(l.harmonic / mesh.driver.teeth)}×`}GMF ${mesh.id}`,
      };
    }
    case 'bearing-outer-race':
    case 'bearing-inner-race':
    case 'bearing-rolling-element':
    case 'bearing-cage': {
      const b = model.bearings.find((x) => x.id === component);
      if (!b) unknownComponent(fault, component, model);
      const shaftHz = (ratio.get(b.shaft)! * speedRpm) / 60;
      const opts: BearingExcitationOptions = {
        orders: bearingFaultOrders(b),
        harmonics: o.harmonics,
        sidebands: o.sidebands,
        shaftSpeedHz: shaftHz,
        impact: ringing ? { resonance: ringing } : undefined,
      };
      const side = (m: number, what: string) => (m === 0 ? '' : ` ${m > 0 ? '+' : '−'} ${Math.abs(m)}×${what}`);
      if (fault === 'bearing-outer-race') {
        return { excitation: outerRaceExcitation(opts), componentKind: 'bearing', baseShaft: b.shaft, label: (l) => `${l.harmonic}×BPFO ${b.id}` };
      }
      if (fault === 'bearing-inner-race') {
        return {
          excitation: innerRaceExcitation(opts), componentKind: 'bearing', baseShaft: b.shaft,
          label: (l) => (l.harmonic === 0 ? `${l.sideband}× ${b.shaft} (load zone, ${b.id})` : `${l.harmonic}×BPFI ${b.id}${side(l.sideband, ` ${b.shaft}`)}`),
        };
      }
      if (fault === 'bearing-rolling-element') {
        return {
          excitation: rollingElementExcitation(opts), componentKind: 'bearing', baseShaft: b.shaft,
          label: (l) => (l.harmonic === 0 ? `${l.sideband}×FTF ${b.id} (load zone)` : `${2 * l.harmonic}×BSF ${b.id}${side(l.sideband, 'FTF')}`),
        };
      }
      return { excitation: cageExcitation(opts), componentKind: 'bearing', baseShaft: b.shaft, label: (l) => `${l.harmonic}×FTF ${b.id}` };
    }
    case 'electrical': {
      if (!model.motor || motorComponentId(model.motor) !== component) unknownComponent(fault, component, model);
      const excitation = electricalExcitation({ lineFrequencyHz: model.motor.lineFrequencyHz, harmonics: o.harmonics });
      return { excitation, componentKind: 'motor', baseShaft: model.motor.shaft, label: (l) => `${2 * l.harmonic}×LF ${component}` };
    }
  }
}

const VIBRATION = new Set(['acceleration', 'velocity', 'displacement']);

function pointShaft(model: MachineModel, p: Point): string | undefined {
  if (p.near) return model.bearings.find((b) => b.id === p.near)?.shaft ?? p.shaft;
  return p.shaft;
}

function selectPoint(model: MachineModel, requested: string | undefined, fault: FaultKind, component: string, shaft: string): Point | null {
  if (requested !== undefined) {
    const p = model.points.find((x) => x.id === requested);
    if (!p) {
      const known = model.points.map((x) => `'${x.id}'`).join(', ') || 'none';
      throw new SignatureInputError('unknown_point', `point ('${requested}') is not a measurement point of machine '${model.id}' (points: ${known})`);
    }
    return p;
  }
  const vib = model.points.filter((p) => VIBRATION.has(p.quantity));
  if (fault.startsWith('bearing-')) {
    const onBearing = vib.find((p) => p.near === component);
    if (onBearing) return onBearing;
  }
  return vib.find((p) => pointShaft(model, p) === shaft) ?? vib[0] ?? null;
}

/** The inertia a point reads: `at`, else the first gear body on its shaft, else the shaft's first inertia. */
function pointInertia(model: MachineModel, tm: TorsionalModel, p: Point | null, fallback: string): { id: string; fellBack: boolean } {
  if (p?.at && tm.inertias[p.at]) return { id: p.at, fellBack: false };
  const shaft = p ? pointShaft(model, p) : undefined;
  if (shaft) {
    const gearIds = new Set(modelGears(model).map((g) => g.gear));
    const here = (model.torsional?.inertias ?? []).filter((i) => i.shaft === shaft && tm.inertias[i.id]);
    const pick = here.find((i) => gearIds.has(i.id)) ?? here[0];
    if (pick) return { id: pick.id, fellBack: false };
  }
  return { id: fallback, fellBack: p !== null };
}

function structural(resonances: readonly Resonance[], frequencyHz: number): Complex {
  let t: Complex = { re: 1, im: 0 };
  // base-excitation (absolute) transmissibility of each resonance on the path (Thomson & Dahleh §3.5, from memory)
  for (const r of resonances) t = mul(t, transmissibility(frequencyHz / r.frequencyHz, r.dampingRatio));
  return t;
}

function checkPositiveOption(name: string, v: number | undefined): void {
  if (v !== undefined && (!(v > 0) || !Number.isFinite(v))) {
    throw new SignatureInputError('invalid_parameter', `${name} (${v}) must be a finite number > 0`);
  }
}

/**
 * The predicted lines of one fault in one component at one speed: the fault's excitation template as a
 * line spectrum, each line passed through the machine's response (the torsional chain for tooth-mesh
 * excitations, the point's structural resonances, the conversion to the point's quantity and unit), and
 * superposed. Bearing defects predict the envelope spectrum (`domain: 'envelope'`).
 */
export function predictSignature(model: MachineModel, options: SignatureOptions): Signature {
  if (!isFaultKind(options?.fault)) {
    throw new SignatureInputError('unknown_fault', `fault (${JSON.stringify(options?.fault)}) must be one of ${faultKinds.join(', ')}`);
  }
  const speedRpm = options.speedRpm ?? model.speed.nominalRpm;
  checkPositiveOption('speedRpm', speedRpm);
  checkPositiveOption('meanTorqueNm', options.meanTorqueNm);
  checkPositiveOption('transferRadiusMm', options.transferRadiusMm);
  const { fault, component } = options;
  const refHz = speedRpm / 60;
  const ratio = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));

  // the point first: its resonance sets how bearing impacts ring
  const pre = resolveSource(model, options, null, speedRpm);
  const point = selectPoint(model, options.point, fault, component, pre.baseShaft);
  const resonances = point?.resonances ?? [];
  const ringing = pre.excitation.domain === 'envelope' && resonances.length > 0
    ? resonances.reduce((a, b) => (b.frequencyHz > a.frequencyHz ? b : a)) : null;
  const source = ringing ? resolveSource(model, options, ringing, speedRpm) : pre;
  const ex = source.excitation;
  const shaftHz = ratio.get(source.baseShaft)! * refHz;

  const warnings: SignatureWarning[] = [];
  const assumptions: string[] = [];
  const tm = torsionalModel(model);
  for (const w of tm?.warnings ?? []) warnings.push({ kind: 'model', message: `torsional model: ${w}` });

  // quantity and unit at the point
  const linear = point !== null && VIBRATION.has(point.quantity);
  let quantity: SignatureQuantity;
  let unit: string;
  if (linear) {
    quantity = point!.quantity as MeasuredQuantity;
    unit = pointUnit(point!)!;
    unitsPerSi(quantity, unit);
  } else if (point) {
    quantity = 'angle';
    unit = 'rad';
  } else {
    quantity = 'excitation';
    unit = '1';
  }

  // the torsional path applies when the fault is a torque at a gear body that the chain holds
  let forceInertia: string | null = null;
  if (ex.path === 'torsional') {
    if (!tm) {
      warnings.push({ kind: 'model', message: 'the model has no torsional section: the lines carry the excitation and the point\'s resonances only (relative amplitudes)' });
    } else if (source.gear && tm.inertias[source.gear]) {
      forceInertia = source.gear;
    } else {
      const onShaft = (model.torsional?.inertias ?? []).find((i) => i.shaft === source.baseShaft && tm.inertias[i.id]);
      if (onShaft) {
        forceInertia = onShaft.id;
        warnings.push({ kind: 'model', message: `no torsional inertia has the id of gear '${source.gear}': its torque is applied at '${onShaft.id}' on the same shaft` });
      } else {
        warnings.push({ kind: 'model', message: `shaft '${source.baseShaft}' carries no torsional inertia: the lines carry the excitation and the point's resonances only (relative amplitudes)` });
      }
    }
  }
  const torsional = forceInertia !== null && tm !== null;
  if (!torsional && quantity === 'angle') {
    warnings.push({ kind: 'model', message: `point '${point!.id}' reads shaft angle; this fault's ${ex.path === 'lateral' ? 'lateral force' : 'excitation'} is shown as relative excitation there` });
    quantity = 'excitation';
    unit = '1';
  }
  const T0 = options.meanTorqueNm ?? 1;
  const radiusM = (options.transferRadiusMm ?? 100) / 1000;
  let responseInertia: string | null = null;
  if (torsional) {
    const pick = pointInertia(model, tm!, point, forceInertia!);
    responseInertia = pick.id;
    if (pick.fellBack) warnings.push({ kind: 'model', message: `point '${point!.id}' is on a shaft without a torsional inertia: it reads '${forceInertia}'` });
    if (quantity === 'excitation') {
      quantity = 'angle';
      unit = 'rad';
    }
    assumptions.push(`torque: the fault's coefficients times a mean mesh torque of ${fmt(T0)} N·m at '${forceInertia}' (amplitudes scale in proportion)`);
    assumptions.push(`response: angle of '${responseInertia}' from the torsional chain (modal superposition, ζ = ${fmt(model.torsional!.dampingRatio)})`);
    if (linear) {
      assumptions.push(`transfer: the angle read as tangential motion at ${fmt(radiusM * 1000)} mm radius (transferRadiusMm), then ×jω per derivative, then the point's resonances as base-excitation transmissibility`);
    }
  } else if (ex.domain === 'envelope') {
    assumptions.push('envelope lines: the template\'s relative envelope coefficients; the point\'s resonance is the carrier band the envelope demodulates, so it scales every line alike and is not applied per line');
  } else {
    assumptions.push(`relative: the template's line sizes through a stiffness-controlled path (1 unit of ${quantity} for the fundamental), ×(f/f1) per derivative, times the point's resonances as base-excitation transmissibility`);
  }

  // the fundamental line of a relative lateral path
  const lineHz = (l: ExcitationLine) => (l.frequencyHz ?? l.order! * shaftHz);
  const first = ex.lines.find((l) => l.harmonic === 1 && l.sideband === 0) ?? ex.lines[0];
  const f1 = first ? lineHz(first) : 1;
  const p = quantity === 'excitation' || quantity === 'angle' ? 0 : derivativeOrder(quantity as MeasuredQuantity);
  const perSi = quantity === 'excitation' ? 1 : unitsPerSi(quantity, unit);

  const lines: SignatureLine[] = [];
  for (const l of ex.lines) {
    const f = lineHz(l);
    if (!(f > 0)) continue;
    const c: Complex = { re: l.coefficient.re, im: l.coefficient.im };
    let value: Complex;
    let torsionalMagnification: number | null = null;
    let structuralMagnification = 1;
    if (torsional) {
      const h = inertiaReceptance(tm!, responseInertia!, forceInertia!, f);
      const theta = mul(h, { re: c.re * T0, im: c.im * T0 });
      torsionalMagnification = inertiaMagnification(tm!, responseInertia!, forceInertia!, f);
      if (linear) {
        const ts = structural(resonances, f);
        structuralMagnification = abs(ts);
        value = mul(fromDisplacement({ re: theta.re * radiusM, im: theta.im * radiusM }, f, quantity as MeasuredQuantity), ts);
      } else {
        value = theta;
      }
    } else if (ex.domain === 'envelope') {
      value = c;
    } else {
      const ts = linear ? structural(resonances, f) : { re: 1, im: 0 };
      structuralMagnification = abs(ts);
      value = mul(mul(c, ts), fromPolar((f / f1) ** p, (p * Math.PI) / 2));
    }
    const magnification = (torsionalMagnification ?? 1) * structuralMagnification;
    lines.push({
      frequencyHz: f,
      order: f / refHz,
      amplitude: abs(value) * (torsional ? perSi : 1),
      phaseRad: arg(value),
      harmonic: l.harmonic,
      sideband: l.sideband,
      excitationCoefficient: l.coefficient,
      magnification,
      torsionalMagnification,
      structuralMagnification,
      label: source.label(l),
      formula: l.formula,
    });
  }
  lines.sort((a, b) => a.frequencyHz - b.frequencyHz);

  // resonance warnings (±10 %, common practice)
  const peak = Math.max(0, ...lines.map((l) => l.excitationCoefficient.amplitude));
  const strong = lines.filter((l) => l.excitationCoefficient.amplitude >= WARN_FLOOR_FRACTION * peak);
  const near = (fn: number) => strong.filter((l) => Math.abs(l.frequencyHz - fn) <= RESONANCE_MARGIN_FRACTION * fn);
  const describe = (ls: SignatureLine[]) => ls.slice(0, 4).map((l) => `${l.label} (${fmt(l.frequencyHz)} Hz)`).join(', ') + (ls.length > 4 ? `, and ${ls.length - 4} more` : '');
  if (torsional) {
    tm!.modes.modes.filter((m) => !m.rigidBody).forEach((m, i) => {
      const hit = near(m.naturalFrequencyHz);
      if (hit.length === 0) return;
      warnings.push({
        kind: 'resonance', source: 'torsional', naturalFrequencyHz: m.naturalFrequencyHz, dampingRatio: m.dampingRatio, mode: i + 1,
        lines: hit.map((l) => ({ frequencyHz: l.frequencyHz, harmonic: l.harmonic, sideband: l.sideband, label: l.label })),
        message: `torsional mode ${i + 1} at ${fmt(m.naturalFrequencyHz)} Hz has ${hit.length} excitation line${hit.length === 1 ? '' : 's'} within 10 %: ${describe(hit)}`,
      });
    });
  }
  if (linear && ex.domain === 'spectrum') {
    for (const r of resonances) {
      const hit = near(r.frequencyHz);
      if (hit.length === 0) continue;
      warnings.push({
        kind: 'resonance', source: 'structural', naturalFrequencyHz: r.frequencyHz, dampingRatio: r.dampingRatio,
        lines: hit.map((l) => ({ frequencyHz: l.frequencyHz, harmonic: l.harmonic, sideband: l.sideband, label: l.label })),
        message: `structural resonance at ${fmt(r.frequencyHz)} Hz (point '${point!.id}') has ${hit.length} excitation line${hit.length === 1 ? '' : 's'} within 10 %: ${describe(hit)}`,
      });
    }
  }

  const refOrder = (o: number | null) => (o === null ? null : (o * shaftHz) / refHz);
  return {
    fault,
    component,
    componentKind: source.componentKind,
    shaft: source.baseShaft,
    shaftSpeedHz: shaftHz,
    referenceShaft: model.speed.shaft,
    speedRpm,
    point: point?.id ?? null,
    domain: ex.domain,
    path: ex.path,
    quantity,
    unit,
    amplitudeKind: 'peak',
    amplitudeBasis: torsional ? 'model' : 'relative',
    lines,
    naturalFrequenciesHz: tm?.modes.naturalFrequenciesHz ?? [],
    modeShapes: tm?.modeShapes ?? null,
    structuralResonances: [...resonances],
    warnings,
    assumptions,
    excitation: {
      template: ex.template, formula: ex.formula, reference: ex.reference, mean: ex.mean, segments: ex.segments,
      fundamentalOrder: refOrder(ex.fundamentalOrder), modulationOrder: refOrder(ex.modulationOrder),
    },
  };
}

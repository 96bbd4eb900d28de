import type { z } from 'zod';
import {
  beltSchema,
  bearingGeometry,
  bearingSchema,
  gearMeshSchema,
  inertiaSchema,
  machineModelSchema,
  motorSchema,
  pointSchema,
  pointUnits,
  rotorSchema,
  shaftSchema,
  speedSchema,
  torsionalCouplingSchema,
  torsionalLinkSchema,
  type Belt,
  type Bearing,
  type GearMesh,
  type Inertia,
  type MachineModel,
  type Motor,
  type Point,
  type Rotor,
  type Shaft,
  type Speed,
  type TorsionalCoupling,
  type TorsionalLink,
} from './machine-model.js';
import { formatPath, type Problem, type ProblemCode } from './problem.js';
import { propagateRatios, speedEdges } from './shaft-speeds.js';

export type ValidationResult = { ok: true; model: MachineModel } | { ok: false; problems: Problem[] };

/**
 * Validates a parsed JSON/YAML value as a machine model. Never throws: every problem is returned at once,
 * schema problems first (in document order), then the semantic ones (references, connectivity, ratios).
 */
export function validateMachineModel(input: unknown): ValidationResult {
  const parsed = machineModelSchema.safeParse(input);
  const problems = parsed.success ? [] : schemaProblems(parsed.error.issues);
  if (isRecord(input)) problems.push(...semanticProblems(lenientView(input)));
  if (problems.length > 0 || !parsed.success) return { ok: false, problems: dedupe(problems) };
  return { ok: true, model: parsed.data };
}

// ---------------------------------------------------------------------------------------------
// Schema problems: zod issues turned into { path, code, message }.

function schemaProblems(issues: readonly z.core.$ZodIssue[]): Problem[] {
  const out: Problem[] = [];
  for (const issue of issues) {
    const path = formatPath(issue.path);
    if (issue.code === 'unrecognized_keys') {
      for (const key of issue.keys) {
        out.push({ path: formatPath([...issue.path, key]), code: 'unknown_field', message: 'is not a field of the machine model (misspelt?)' });
      }
      continue;
    }
    out.push({ path, code: issueCode(issue), message: issue.message });
  }
  return out;
}

function issueCode(issue: z.core.$ZodIssue): ProblemCode {
  switch (issue.code) {
    case 'invalid_type':
      // zod does not keep the input on reported issues; `rule` wrote "is required" for an absent field.
      if (issue.message === 'is required') return 'required';
      return issue.expected === 'int' ? 'not_whole_number' : 'invalid_type';
    case 'too_small':
    case 'too_big':
      return 'out_of_range';
    case 'not_multiple_of':
      return 'invalid_value';
    case 'invalid_value':
      return 'invalid_value';
    case 'invalid_format':
      return 'invalid_format';
    default:
      return 'invalid_type';
  }
}

function dedupe(problems: Problem[]): Problem[] {
  const seen = new Set<string>();
  return problems.filter((p) => {
    const key = `${p.path}\u0000${p.code}\u0000${p.message}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

// ---------------------------------------------------------------------------------------------
// A lenient view: every list item that passes its own schema, at its own index, and every id the raw
// file spells, so that one broken entry does not cascade into "unknown shaft" problems elsewhere.

interface Entry<T> {
  index: number;
  item: T;
}

interface LenientView {
  speed: Speed | undefined;
  shafts: Entry<Shaft>[];
  belts: Entry<Belt>[];
  gearMeshes: Entry<GearMesh>[];
  bearings: Entry<Bearing>[];
  rotors: Entry<Rotor>[];
  motor: Motor | undefined;
  torsional:
    | { inertias: Entry<Inertia>[]; links: Entry<TorsionalLink>[]; couplings: Entry<TorsionalCoupling>[]; rawInertiaIds: Set<string> }
    | undefined;
  points: Entry<Point>[];
  /** Ids spelled in the raw file, valid entries or not. */
  rawShaftIds: Set<string>;
  rawBearingIds: Set<string>;
  rawElementIds: Set<string>;
  /** Shaft pairs named by every belt and gear-mesh entry of the raw file, valid or not (for connectivity). */
  rawLinks: Array<[string, string]>;
}

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function entries<T>(raw: unknown, schema: z.ZodType<T>): Entry<T>[] {
  if (!Array.isArray(raw)) return [];
  const out: Entry<T>[] = [];
  raw.forEach((value, index) => {
    const r = schema.safeParse(value);
    if (r.success) out.push({ index, item: r.data });
  });
  return out;
}

function rawIds(raw: unknown, key = 'id'): Set<string> {
  const ids = new Set<string>();
  if (Array.isArray(raw)) for (const v of raw) if (isRecord(v) && typeof v[key] === 'string') ids.add(v[key] as string);
  return ids;
}

function lenientView(input: Record<string, unknown>): LenientView {
  const speed = speedSchema.safeParse(input.speed);
  const motor = motorSchema.safeParse(input.motor);
  const t = input.torsional;
  return {
    speed: speed.success ? speed.data : undefined,
    shafts: entries(input.shafts, shaftSchema),
    belts: entries(input.belts, beltSchema),
    gearMeshes: entries(input.gearMeshes, gearMeshSchema),
    bearings: entries(input.bearings, bearingSchema),
    rotors: entries(input.rotors, rotorSchema),
    motor: motor.success ? motor.data : undefined,
    torsional: isRecord(t)
      ? {
          inertias: entries(t.inertias, inertiaSchema),
          links: entries(t.links, torsionalLinkSchema),
          couplings: entries(t.couplings, torsionalCouplingSchema),
          rawInertiaIds: rawIds(t.inertias),
        }
      : undefined,
    points: entries(input.points, pointSchema),
    rawShaftIds: rawIds(input.shafts),
    rawBearingIds: rawIds(input.bearings),
    rawElementIds: new Set([...rawIds(input.belts), ...rawIds(input.gearMeshes)]),
    rawLinks: [input.belts, input.gearMeshes].flatMap((raw) => (Array.isArray(raw) ? raw : [])).flatMap((e) => {
      const a = isRecord(e) && isRecord(e.driver) ? e.driver.shaft : undefined;
      const b = isRecord(e) && isRecord(e.driven) ? e.driven.shaft : undefined;
      return typeof a === 'string' && typeof b === 'string' ? [[a, b] as [string, string]] : [];
    }),
  };
}

// ---------------------------------------------------------------------------------------------
// Semantic checks.

function semanticProblems(v: LenientView): Problem[] {
  const problems: Problem[] = [];
  const report = (path: string, code: ProblemCode, message: string) => problems.push({ path, code, message });
  const shaftIds = new Set(v.shafts.map((e) => e.item.id));
  const checkShaft = (path: string, shaft: string) => {
    if (!shaftIds.has(shaft) && !v.rawShaftIds.has(shaft)) report(path, 'unknown_shaft', `names shaft '${shaft}', which is not in shafts`);
  };

  // Component ids share one namespace: a diagnosis names its component by id alone.
  const componentOwners = new Map<string, string>();
  const claim = (path: string, id: string) => {
    const owner = componentOwners.get(id);
    if (owner !== undefined) report(path, 'duplicate_id', `'${id}' is already the id of ${owner}`);
    else componentOwners.set(id, path.replace(/\.id$|\.gear$/, ''));
  };
  for (const { index, item } of v.shafts) claim(`shafts[${index}].id`, item.id);
  for (const { index, item } of v.belts) claim(`belts[${index}].id`, item.id);
  for (const { index, item } of v.gearMeshes) claim(`gearMeshes[${index}].id`, item.id);

  // A gear may mesh with several others (an idler, a bull gear driven by two pinions): same shaft, same teeth.
  const gears = new Map<string, { shaft: string; teeth: number; path: string }>();
  for (const { index, item } of v.gearMeshes) {
    for (const side of ['driver', 'driven'] as const) {
      const g = item[side];
      const path = `gearMeshes[${index}].${side}`;
      checkShaft(`${path}.shaft`, g.shaft);
      const seen = gears.get(g.gear);
      if (!seen) {
        gears.set(g.gear, { shaft: g.shaft, teeth: g.teeth, path });
        claim(`${path}.gear`, g.gear);
      } else if (seen.shaft !== g.shaft || seen.teeth !== g.teeth) {
        report(`${path}.gear`, 'gear_conflict', `gear '${g.gear}' is on shaft '${seen.shaft}' with ${seen.teeth} teeth at ${seen.path}; here on '${g.shaft}' with ${g.teeth}`);
      } else if (seen.path.startsWith(`gearMeshes[${index}].`)) {
        report(`${path}.gear`, 'gear_conflict', `gear '${g.gear}' cannot mesh with itself`);
      }
    }
    if (item.driver.shaft === item.driven.shaft) report(`gearMeshes[${index}]`, 'self_coupling', `driver and driven gears are both on shaft '${item.driver.shaft}'`);
  }
  for (const { index, item } of v.belts) {
    checkShaft(`belts[${index}].driver.shaft`, item.driver.shaft);
    checkShaft(`belts[${index}].driven.shaft`, item.driven.shaft);
    if (item.driver.shaft === item.driven.shaft) report(`belts[${index}]`, 'self_coupling', `driver and driven sheaves are both on shaft '${item.driver.shaft}'`);
  }
  for (const { index, item } of v.bearings) {
    claim(`bearings[${index}].id`, item.id);
    checkShaft(`bearings[${index}].shaft`, item.shaft);
    bearingProblems(`bearings[${index}]`, item, report);
  }
  for (const { index, item } of v.rotors) {
    claim(`rotors[${index}].id`, item.id);
    checkShaft(`rotors[${index}].shaft`, item.shaft);
  }
  if (v.motor) checkShaft('motor.shaft', v.motor.shaft);

  // Speed: the reference shaft exists, the range holds the nominal speed, every shaft is reached consistently.
  if (v.speed) {
    checkShaft('speed.shaft', v.speed.shaft);
    const { minRpm, nominalRpm, maxRpm } = v.speed;
    if (minRpm !== undefined && minRpm > nominalRpm) report('speed.minRpm', 'speed_range', `(${minRpm}) must be <= nominalRpm (${nominalRpm})`);
    if (maxRpm !== undefined && maxRpm < nominalRpm) report('speed.maxRpm', 'speed_range', `(${maxRpm}) must be >= nominalRpm (${nominalRpm})`);
    if (shaftIds.has(v.speed.shaft)) {
      const edges = speedEdges({ belts: v.belts.map((e) => e.item), gearMeshes: v.gearMeshes.map((e) => e.item) });
      // speedEdges numbers edges by position in the filtered lists; map back to the file's indices.
      edges.forEach((edge) => {
        edge.index = (edge.element === 'belt' ? v.belts : v.gearMeshes)[edge.index]!.index;
      });
      const { inconsistent } = propagateRatios(v.speed.shaft, [...shaftIds], edges);
      // Connectivity over every belt and mesh the file spells, valid or not: a broken entry still connects its shafts.
      const reached = reachable(v.speed.shaft, v.rawLinks);
      for (const shaft of [...shaftIds].filter((id) => !reached.has(id))) {
        const at = v.shafts.find((e) => e.item.id === shaft)!.index;
        report(`shafts[${at}]`, 'disconnected_shaft', `shaft '${shaft}' is not connected to the reference shaft '${v.speed.shaft}' by any belt or gear mesh`);
      }
      for (const { edge, shaft, ratioAlongEdge, ratioFound } of inconsistent) {
        report(
          `${edge.element === 'belt' ? 'belts' : 'gearMeshes'}[${edge.index}]`,
          'inconsistent_ratio',
          `closes a loop that gives shaft '${shaft}' ${fmt(ratioAlongEdge)} × reference speed, but another path gives ${fmt(ratioFound)} ×`,
        );
      }
    }
  }

  if (v.torsional) torsionalProblems(v, shaftIds, gears, report);
  pointProblems(v, shaftIds, report);
  return problems;
}

function reachable(from: string, links: ReadonlyArray<[string, string]>): Set<string> {
  const seen = new Set([from]);
  for (let grew = true; grew; ) {
    grew = false;
    for (const [a, b] of links) {
      if (seen.has(a) !== seen.has(b)) {
        seen.add(a);
        seen.add(b);
        grew = true;
      }
    }
  }
  return seen;
}

type Report = (path: string, code: ProblemCode, message: string) => void;

function bearingProblems(path: string, b: Bearing, report: Report): void {
  const geometryFields = ['rollingElements', 'rollingElementDiameterMm', 'pitchDiameterMm'] as const;
  const given = geometryFields.filter((f) => b[f] !== undefined);
  const hasOrders = b.faultOrders !== undefined;
  if (hasOrders && (given.length > 0 || b.contactAngleDeg !== undefined)) {
    report(path, 'bearing_definition', 'give either the geometry (rollingElements, rollingElementDiameterMm, pitchDiameterMm, contactAngleDeg) or faultOrders, not both');
    return;
  }
  if (!hasOrders && given.length === 0) {
    report(path, 'bearing_definition', 'needs its geometry (rollingElements, rollingElementDiameterMm, pitchDiameterMm, contactAngleDeg) or faultOrders');
    return;
  }
  if (!hasOrders) {
    for (const f of geometryFields) if (b[f] === undefined) report(`${path}.${f}`, 'bearing_definition', 'is required with the bearing geometry');
  }
  const g = bearingGeometry(b);
  if (g && g.rollingElementDiameterMm >= g.pitchDiameterMm) {
    report(`${path}.rollingElementDiameterMm`, 'bearing_geometry', `(${g.rollingElementDiameterMm}) must be smaller than pitchDiameterMm (${g.pitchDiameterMm})`);
  }
}

function torsionalProblems(
  v: LenientView,
  shaftIds: Set<string>,
  gears: Map<string, { shaft: string }>,
  report: Report,
): void {
  const t = v.torsional!;
  const checkShaft = (path: string, shaft: string) => {
    if (!shaftIds.has(shaft) && !v.rawShaftIds.has(shaft)) report(path, 'unknown_shaft', `names shaft '${shaft}', which is not in shafts`);
  };
  const inertias = new Map<string, Inertia>();
  for (const { index, item } of t.inertias) {
    if (inertias.has(item.id)) report(`torsional.inertias[${index}].id`, 'duplicate_id', `'${item.id}' is already the id of another inertia`);
    else inertias.set(item.id, item);
    checkShaft(`torsional.inertias[${index}].shaft`, item.shaft);
    const gear = gears.get(item.id);
    if (gear && gear.shaft !== item.shaft) {
      report(`torsional.inertias[${index}].shaft`, 'link_across_shafts', `inertia '${item.id}' is the body of gear '${item.id}', which is on shaft '${gear.shaft}'`);
    }
  }
  const inertiaKnown = (id: string) => inertias.has(id) || t.rawInertiaIds.has(id);
  const linkIds = new Set<string>();
  for (const { index, item } of t.links) {
    const path = `torsional.links[${index}]`;
    if (linkIds.has(item.id)) report(`${path}.id`, 'duplicate_id', `'${item.id}' is already the id of another link`);
    linkIds.add(item.id);
    for (const end of ['from', 'to'] as const) {
      if (!inertiaKnown(item[end])) report(`${path}.${end}`, 'unknown_inertia', `names inertia '${item[end]}', which is not in torsional.inertias`);
    }
    if (item.from === item.to) report(path, 'link_definition', `joins inertia '${item.from}' to itself`);
    const a = inertias.get(item.from);
    const b = inertias.get(item.to);
    if (a && b && a.shaft !== b.shaft) {
      report(path, 'link_across_shafts', `joins '${a.id}' on shaft '${a.shaft}' to '${b.id}' on shaft '${b.shaft}'; a link joins inertias on one shaft (belts and gear meshes join shafts)`);
    }
    const geometry = (['diameterMm', 'lengthMm', 'shearModulusGPa'] as const).filter((f) => item[f] !== undefined);
    if (item.stiffnessNmPerRad !== undefined && geometry.length > 0) {
      report(path, 'link_definition', 'give either stiffnessNmPerRad or the shaft geometry (diameterMm, lengthMm, shearModulusGPa), not both');
    } else if (item.stiffnessNmPerRad === undefined && geometry.length === 0) {
      report(path, 'link_definition', 'needs stiffnessNmPerRad or the shaft geometry (diameterMm, lengthMm, shearModulusGPa)');
    } else if (item.stiffnessNmPerRad === undefined) {
      for (const f of ['diameterMm', 'lengthMm', 'shearModulusGPa'] as const) {
        if (item[f] === undefined) report(`${path}.${f}`, 'link_definition', 'is required with the shaft geometry');
      }
    }
  }
  const elements = new Map<string, { driver: string; driven: string }>();
  for (const { item } of v.belts) elements.set(item.id, { driver: item.driver.shaft, driven: item.driven.shaft });
  for (const { item } of v.gearMeshes) elements.set(item.id, { driver: item.driver.shaft, driven: item.driven.shaft });
  const coupled = new Set<string>();
  for (const { index, item } of t.couplings) {
    const path = `torsional.couplings[${index}]`;
    const element = elements.get(item.element);
    if (!element && !v.rawElementIds.has(item.element)) {
      report(`${path}.element`, 'unknown_element', `names '${item.element}', which is neither a belt nor a gear mesh`);
    }
    if (coupled.has(item.element)) report(`${path}.element`, 'coupling_definition', `'${item.element}' is already coupled by another entry`);
    coupled.add(item.element);
    for (const [key, side] of [['driverInertia', 'driver'], ['drivenInertia', 'driven']] as const) {
      const id = item[key];
      if (id === undefined) continue;
      if (!inertiaKnown(id)) {
        report(`${path}.${key}`, 'unknown_inertia', `names inertia '${id}', which is not in torsional.inertias`);
        continue;
      }
      const inertia = inertias.get(id);
      if (element && inertia && inertia.shaft !== element[side]) {
        report(`${path}.${key}`, 'coupling_definition', `inertia '${id}' is on shaft '${inertia.shaft}', but the ${side} of '${item.element}' is shaft '${element[side]}'`);
      }
    }
  }
}

function pointProblems(v: LenientView, shaftIds: Set<string>, report: Report): void {
  const bearings = new Map(v.bearings.map((e) => [e.item.id, e.item]));
  const inertias = new Map((v.torsional?.inertias ?? []).map((e) => [e.item.id, e.item]));
  const pointIds = new Set<string>();
  for (const { index, item: p } of v.points) {
    const path = `points[${index}]`;
    if (pointIds.has(p.id)) report(`${path}.id`, 'duplicate_id', `'${p.id}' is already the id of another point`);
    pointIds.add(p.id);
    let shaft = p.shaft;
    if (p.shaft !== undefined && !shaftIds.has(p.shaft) && !v.rawShaftIds.has(p.shaft)) {
      report(`${path}.shaft`, 'unknown_shaft', `names shaft '${p.shaft}', which is not in shafts`);
    }
    if (p.near !== undefined) {
      const bearing = bearings.get(p.near);
      if (!bearing && !v.rawBearingIds.has(p.near)) report(`${path}.near`, 'unknown_bearing', `names bearing '${p.near}', which is not in bearings`);
      if (bearing && p.shaft !== undefined && bearing.shaft !== p.shaft) {
        report(`${path}.shaft`, 'point_location', `is '${p.shaft}', but bearing '${p.near}' is on shaft '${bearing.shaft}'`);
      }
      shaft ??= bearing?.shaft;
    }
    if (p.at !== undefined) {
      const inertia = inertias.get(p.at);
      if (!inertia && !v.torsional?.rawInertiaIds.has(p.at)) report(`${path}.at`, 'unknown_inertia', `names inertia '${p.at}', which is not in torsional.inertias`);
      if (inertia && shaft !== undefined && inertia.shaft !== shaft) {
        report(`${path}.at`, 'point_location', `inertia '${p.at}' is on shaft '${inertia.shaft}', not on '${shaft}'`);
      }
    }
    if (p.quantity === 'tach' || p.quantity === 'encoder') {
      if (p.shaft === undefined && p.at === undefined) report(path, 'point_location', `a ${p.quantity} point needs the shaft it reads (shaft, or at an inertia)`);
      if (p.unit !== undefined) report(`${path}.unit`, 'invalid_unit', `a ${p.quantity} point counts pulses and takes no unit`);
    } else {
      if (p.near === undefined && p.shaft === undefined) report(path, 'point_location', 'a vibration point needs near (a bearing) or shaft');
      const allowed: readonly string[] = pointUnits[p.quantity];
      if (p.unit !== undefined && !allowed.includes(p.unit)) {
        report(`${path}.unit`, 'invalid_unit', `'${p.unit}' is not a unit of ${p.quantity}; use one of ${allowed.map((u) => `'${u}'`).join(', ')}`);
      }
      if (p.pulsesPerRev !== undefined) report(`${path}.pulsesPerRev`, 'point_location', 'applies to tach and encoder points only');
    }
    if (p.alarmVelocityRmsMmPerS !== undefined && p.tripVelocityRmsMmPerS !== undefined && p.tripVelocityRmsMmPerS <= p.alarmVelocityRmsMmPerS) {
      report(`${path}.tripVelocityRmsMmPerS`, 'alarm_levels', `(${p.tripVelocityRmsMmPerS}) must be above alarmVelocityRmsMmPerS (${p.alarmVelocityRmsMmPerS})`);
    }
  }
}

function fmt(x: number): string {
  return Number(x.toPrecision(6)).toString();
}

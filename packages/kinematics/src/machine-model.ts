import { z } from 'zod';

/*
 * The machine model file: the schema behind docs/machine-model.md (the contract).
 * Lengths in millimetres, speeds in rpm, inertias in kg·m², stiffnesses in N·m/rad.
 * Objects are strict so that a misspelt field ("pitchDiamterMm") is reported instead of ignored.
 * Later work may add optional fields here; it never renames these.
 *
 * Messages are written to follow the JSON path, e.g. "gearMeshes[1].driven.teeth: must be a whole number >= 1".
 * A missing required field reads "is required" (see `rule`).
 */

/** Error text for a field: "is required" when absent, else the rule the value breaks. */
function rule(text: string) {
  return (issue: { input?: unknown }) => (issue.input === undefined ? 'is required' : text);
}

const ID_PATTERN = /^[A-Za-z0-9][A-Za-z0-9._:-]{0,63}$/;
const ID_RULE = "must be an id: 1 to 64 letters, digits, '.', '_', ':' or '-', starting with a letter or digit";

export const idSchema = z.string({ error: rule(ID_RULE) }).regex(ID_PATTERN, { error: ID_RULE });

function wholeNumber(min: number) {
  const text = `must be a whole number >= ${min}`;
  return z.number({ error: rule(text) }).int({ error: text }).min(min, { error: text });
}

function positiveNumber() {
  const text = 'must be a number > 0';
  return z.number({ error: rule(text) }).positive({ error: text });
}

function nonNegativeNumber() {
  const text = 'must be a number >= 0';
  return z.number({ error: rule(text) }).min(0, { error: text });
}

/** A fraction of critical damping: 0 < ζ < 1 (underdamped, as modal damping of a machine is). */
function dampingRatio() {
  const text = 'must be a number > 0 and < 1 (fraction of critical damping)';
  return z.number({ error: rule(text) }).gt(0, { error: text }).lt(1, { error: text });
}

function text(maxLength: number) {
  const t = `must be a text of at most ${maxLength} characters`;
  return z.string({ error: rule(t) }).max(maxLength, { error: t });
}

function list<T extends z.ZodType>(item: T) {
  return z.array(item, { error: rule('must be a list') });
}

// ---------------------------------------------------------------------------------------------

export const speedSchema = z.strictObject(
  {
    /** The reference shaft: every speed, order and ratio is relative to it. */
    shaft: idSchema,
    nominalRpm: positiveNumber(),
    minRpm: positiveNumber().optional(),
    maxRpm: positiveNumber().optional(),
  },
  { error: rule('must be an object { shaft, nominalRpm, minRpm, maxRpm }') },
);

export const shaftSchema = z.strictObject(
  {
    id: idSchema,
    name: text(200).optional(),
  },
  { error: rule('must be an object { id }') },
);

export const sheaveSchema = z.strictObject(
  {
    shaft: idSchema,
    pitchDiameterMm: positiveNumber(),
  },
  { error: rule('must be an object { shaft, pitchDiameterMm }') },
);

export const beltSchema = z.strictObject(
  {
    id: idSchema,
    driver: sheaveSchema,
    driven: sheaveSchema,
    /** Pitch length of the belt, for the belt pass frequency. */
    beltLengthMm: positiveNumber().optional(),
    /** Creep of the driven sheave behind the belt, in percent of its kinematic speed. */
    slipPercent: z
      .number({ error: rule('must be a number >= 0 and < 100') })
      .min(0, { error: 'must be a number >= 0 and < 100' })
      .lt(100, { error: 'must be a number >= 0 and < 100' })
      .optional(),
  },
  { error: rule('must be an object { id, driver, driven, beltLengthMm, slipPercent }') },
);

export const gearSchema = z.strictObject(
  {
    /** Id of the gear body: a fault component, and the torsional inertia of the same id if there is one. */
    gear: idSchema,
    shaft: idSchema,
    teeth: wholeNumber(1),
  },
  { error: rule('must be an object { gear, shaft, teeth }') },
);

export const gearMeshSchema = z.strictObject(
  {
    id: idSchema,
    driver: gearSchema,
    driven: gearSchema,
  },
  { error: rule('must be an object { id, driver, driven }') },
);

export const bearingFaultOrdersSchema = z.strictObject(
  {
    bpfo: positiveNumber(),
    bpfi: positiveNumber(),
    /** Ball spin frequency once per element revolution (BSF, not 2×BSF), as an order of the shaft. */
    bsf: positiveNumber(),
    ftf: positiveNumber(),
  },
  { error: rule('must be an object { bpfo, bpfi, bsf, ftf } of orders of the shaft speed') },
);

/**
 * A rolling-element bearing: either its geometry or its fault orders from a maker's catalogue.
 * Both shapes share one object so that each missing or wrong field gets its own path in the problems;
 * the "exactly one of" rule is a semantic check in the validator (code `bearing_definition`).
 */
export const bearingSchema = z.strictObject(
  {
    id: idSchema,
    shaft: idSchema,
    /** Maker's designation, e.g. "6205-2RS"; for people only. */
    designation: text(100).optional(),
    rollingElements: wholeNumber(1).optional(),
    rollingElementDiameterMm: positiveNumber().optional(),
    pitchDiameterMm: positiveNumber().optional(),
    contactAngleDeg: z
      .number({ error: rule('must be a number >= 0 and < 90 (degrees)') })
      .min(0, { error: 'must be a number >= 0 and < 90 (degrees)' })
      .lt(90, { error: 'must be a number >= 0 and < 90 (degrees)' })
      .optional(),
    faultOrders: bearingFaultOrdersSchema.optional(),
  },
  { error: rule('must be an object { id, shaft, and geometry or faultOrders }') },
);

export const rotorSchema = z.strictObject(
  {
    id: idSchema,
    shaft: idSchema,
    /** Blade or vane count. */
    blades: wholeNumber(1),
    kind: z.enum(['fan', 'impeller', 'propeller', 'mixer', 'compressor', 'turbine', 'other'], {
      error: rule("must be one of 'fan', 'impeller', 'propeller', 'mixer', 'compressor', 'turbine', 'other'"),
    }).optional(),
  },
  { error: rule('must be an object { id, shaft, blades }') },
);

export const motorSchema = z.strictObject(
  {
    /** Component id for electrical faults; 'motor' when absent. */
    id: idSchema.optional(),
    shaft: idSchema,
    lineFrequencyHz: positiveNumber(),
    poles: z
      .number({ error: rule('must be an even whole number >= 2') })
      .int({ error: 'must be an even whole number >= 2' })
      .min(2, { error: 'must be an even whole number >= 2' })
      .multipleOf(2, { error: 'must be an even whole number >= 2' }),
  },
  { error: rule('must be an object { shaft, lineFrequencyHz, poles }') },
);

export const inertiaSchema = z.strictObject(
  {
    id: idSchema,
    shaft: idSchema,
    /** Mass moment of inertia about the shaft axis. */
    kgM2: positiveNumber(),
  },
  { error: rule('must be an object { id, shaft, kgM2 }') },
);

/**
 * A flexible link between two inertias on the same shaft: either a stiffness, or the geometry of a
 * solid round shaft (k = G·π·d⁴/(32·L)); "exactly one of" is checked by the validator (code `link_definition`).
 */
export const torsionalLinkSchema = z.strictObject(
  {
    id: idSchema,
    from: idSchema,
    to: idSchema,
    stiffnessNmPerRad: positiveNumber().optional(),
    diameterMm: positiveNumber().optional(),
    lengthMm: positiveNumber().optional(),
    shearModulusGPa: positiveNumber().optional(),
  },
  { error: rule('must be an object { id, from, to, and stiffnessNmPerRad or diameterMm, lengthMm, shearModulusGPa }') },
);

/**
 * How a belt or gear mesh joins the torsional chain. Without an entry the element couples its shafts
 * rigidly by its ratio, at the default inertias (see `resolveTorsionalCouplings`).
 */
export const torsionalCouplingSchema = z.strictObject(
  {
    /** Id of a belt or gear mesh. */
    element: idSchema,
    /** Inertia on the driver shaft where the element attaches. */
    driverInertia: idSchema.optional(),
    /** Inertia on the driven shaft where the element attaches. */
    drivenInertia: idSchema.optional(),
    /** Torsional stiffness of the belt span or of the tooth mesh, referred to the driven shaft; rigid when absent. */
    stiffnessNmPerRad: positiveNumber().optional(),
  },
  { error: rule('must be an object { element, driverInertia, drivenInertia, stiffnessNmPerRad }') },
);

export const torsionalSchema = z.strictObject(
  {
    /** Modal damping ratio used for every mode unless `modalDampingRatios` gives a value for it. */
    dampingRatio: dampingRatio(),
    /** Per-mode damping ratios, lowest flexible mode first; modes beyond the list use `dampingRatio`. */
    modalDampingRatios: list(dampingRatio()).optional(),
    inertias: list(inertiaSchema).min(1, { error: 'must list at least one inertia' }),
    links: list(torsionalLinkSchema).default([]),
    couplings: list(torsionalCouplingSchema).optional(),
  },
  { error: rule('must be an object { dampingRatio, inertias, links }') },
);

export const resonanceSchema = z.strictObject(
  {
    frequencyHz: positiveNumber(),
    dampingRatio: dampingRatio(),
  },
  { error: rule('must be an object { frequencyHz, dampingRatio }') },
);

export const isoGroupSchema = z.literal([1, 2], { error: rule('must be 1 or 2 (ISO 10816-3 machine group)') });
export const isoFoundationSchema = z.enum(['rigid', 'flexible'], { error: rule("must be 'rigid' or 'flexible'") });

export const isoClassSchema = z.strictObject(
  {
    group: isoGroupSchema,
    foundation: isoFoundationSchema,
  },
  { error: rule("must be an object { group: 1|2, foundation: 'rigid'|'flexible' }") },
);

export const pointQuantities = ['acceleration', 'velocity', 'displacement', 'tach', 'encoder'] as const;
export const pointDirections = ['horizontal', 'vertical', 'axial', 'radial', 'tangential'] as const;

/** Units a point may be in, per quantity; the first is the default. Spelled as packages/signal spells them. */
export const pointUnits = {
  acceleration: ['g', 'm/s^2', 'mm/s^2'],
  velocity: ['mm/s', 'm/s', 'in/s'],
  displacement: ['um', 'mm', 'm', 'mil'],
} as const;

export const pointBaselineSchema = z.strictObject(
  {
    /** Broadband r.m.s. velocity of the healthy machine at this point (ISO 10816-3 criterion II reference). */
    velocityRmsMmPerS: positiveNumber().optional(),
    /** When the baseline was taken, ISO 8601 date or date-time. */
    takenAt: text(40).optional(),
    /** Healthy amplitudes of chosen orders of the reference shaft, in the point's unit. */
    orders: list(
      z.strictObject(
        { order: positiveNumber(), amplitude: nonNegativeNumber() },
        { error: rule('must be an object { order, amplitude }') },
      ),
    ).optional(),
  },
  { error: rule('must be an object { velocityRmsMmPerS, takenAt, orders }') },
);

export const pointSchema = z.strictObject(
  {
    id: idSchema,
    name: text(200).optional(),
    /** A bearing the sensor sits on (its housing). */
    near: idSchema.optional(),
    /** The shaft the point reads (tach, encoder, torsional), or the shaft a casing point is nearest to. */
    shaft: idSchema.optional(),
    /** The torsional inertia the point reads, on a shaft that carries several. */
    at: idSchema.optional(),
    direction: z.enum(pointDirections, {
      error: rule("must be one of 'horizontal', 'vertical', 'axial', 'radial', 'tangential'"),
    }).optional(),
    quantity: z.enum(pointQuantities, {
      error: rule("must be one of 'acceleration', 'velocity', 'displacement', 'tach', 'encoder'"),
    }),
    /** Unit of a vibration point's samples; the default is the first of `pointUnits[quantity]`. */
    unit: text(20).optional(),
    /** Pulses per revolution of a tach (default 1) or encoder. */
    pulsesPerRev: wholeNumber(1).optional(),
    /** Structural resonances on the path from the source to this sensor. */
    resonances: list(resonanceSchema).optional(),
    /** Overrides the machine's `iso` class for this point (e.g. a motor on its own flexible base). */
    iso: isoClassSchema.optional(),
    /** Local alarm and trip levels of the overall r.m.s. velocity at this point. */
    alarmVelocityRmsMmPerS: positiveNumber().optional(),
    tripVelocityRmsMmPerS: positiveNumber().optional(),
    baseline: pointBaselineSchema.optional(),
  },
  { error: rule('must be an object { id, near or shaft, quantity, ... }') },
);

export const machineModelSchema = z.strictObject(
  {
    id: idSchema,
    name: text(200).optional(),
    notes: text(4000).optional(),
    speed: speedSchema,
    shafts: list(shaftSchema).min(1, { error: 'must list at least one shaft' }),
    belts: list(beltSchema).default([]),
    gearMeshes: list(gearMeshSchema).default([]),
    bearings: list(bearingSchema).default([]),
    rotors: list(rotorSchema).default([]),
    motor: motorSchema.optional(),
    torsional: torsionalSchema.optional(),
    points: list(pointSchema).default([]),
    iso: isoClassSchema.optional(),
  },
  { error: rule('must be a machine model object') },
);

/** A validated machine model (list fields are always present, empty when the file leaves them out). */
export type MachineModel = z.output<typeof machineModelSchema>;
/** What a file may contain before defaults are applied. */
export type MachineModelInput = z.input<typeof machineModelSchema>;
export type Speed = z.output<typeof speedSchema>;
export type Shaft = z.output<typeof shaftSchema>;
export type Sheave = z.output<typeof sheaveSchema>;
export type Belt = z.output<typeof beltSchema>;
export type Gear = z.output<typeof gearSchema>;
export type GearMesh = z.output<typeof gearMeshSchema>;
export type Bearing = z.output<typeof bearingSchema>;
export type BearingFaultOrders = z.output<typeof bearingFaultOrdersSchema>;
export type Rotor = z.output<typeof rotorSchema>;
export type Motor = z.output<typeof motorSchema>;
export type Inertia = z.output<typeof inertiaSchema>;
export type TorsionalLink = z.output<typeof torsionalLinkSchema>;
export type TorsionalCoupling = z.output<typeof torsionalCouplingSchema>;
export type Torsional = z.output<typeof torsionalSchema>;
export type Resonance = z.output<typeof resonanceSchema>;
export type IsoClass = z.output<typeof isoClassSchema>;
export type Point = z.output<typeof pointSchema>;
export type PointBaseline = z.output<typeof pointBaselineSchema>;
export type PointQuantity = (typeof pointQuantities)[number];
export type PointDirection = (typeof pointDirections)[number];

/** A bearing described by its geometry (the validator guarantees all three geometry fields). */
export interface BearingGeometry {
  rollingElements: number;
  rollingElementDiameterMm: number;
  pitchDiameterMm: number;
  contactAngleDeg: number;
}

/** The geometry of a bearing, or null when it is given by `faultOrders`. */
export function bearingGeometry(bearing: Bearing): BearingGeometry | null {
  const { rollingElements, rollingElementDiameterMm, pitchDiameterMm } = bearing;
  if (rollingElements === undefined || rollingElementDiameterMm === undefined || pitchDiameterMm === undefined) return null;
  return { rollingElements, rollingElementDiameterMm, pitchDiameterMm, contactAngleDeg: bearing.contactAngleDeg ?? 0 };
}

/** The speed range of the reference shaft; a missing bound is the nominal speed. */
export function speedRangeRpm(model: MachineModel): { minRpm: number; nominalRpm: number; maxRpm: number } {
  const { nominalRpm, minRpm, maxRpm } = model.speed;
  return { minRpm: minRpm ?? nominalRpm, nominalRpm, maxRpm: maxRpm ?? nominalRpm };
}

/** The unit a point's samples are in (its own, or the quantity's default); null for tach and encoder. */
export function pointUnit(point: Point): string | null {
  if (point.quantity === 'tach' || point.quantity === 'encoder') return null;
  return point.unit ?? pointUnits[point.quantity][0];
}

/** The component id of the motor's electrical lines. */
export function motorComponentId(motor: Motor): string {
  return motor.id ?? 'motor';
}

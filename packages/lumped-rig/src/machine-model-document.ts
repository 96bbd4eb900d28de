/**
 * The machine-model JSON as this package writes it: the fields of Kinespec's machine model file
 * (../shared/design/machine-model.md) that the rig's machines use, every list present. The package keeps its own
 * copy of the shape so that it imports nothing at run time; a test checks each machine against the real validator
 * of @kinespec/kinematics and that the validated model equals the document.
 */
export interface ModelSpeed {
  shaft: string;
  nominalRpm: number;
  minRpm?: number;
  maxRpm?: number;
}

export interface ModelGear {
  gear: string;
  shaft: string;
  teeth: number;
}

export interface ModelGearMesh {
  id: string;
  driver: ModelGear;
  driven: ModelGear;
}

export interface ModelBelt {
  id: string;
  driver: { shaft: string; pitchDiameterMm: number };
  driven: { shaft: string; pitchDiameterMm: number };
  beltLengthMm?: number;
  slipPercent?: number;
}

export interface ModelBearing {
  id: string;
  shaft: string;
  designation?: string;
  rollingElements: number;
  rollingElementDiameterMm: number;
  pitchDiameterMm: number;
  contactAngleDeg: number;
}

export interface ModelRotor {
  id: string;
  shaft: string;
  blades: number;
  kind?: 'fan' | 'impeller' | 'propeller' | 'mixer' | 'compressor' | 'turbine' | 'other';
}

export interface ModelInertia {
  id: string;
  shaft: string;
  kgM2: number;
}

export interface ModelTorsionalLink {
  id: string;
  from: string;
  to: string;
  stiffnessNmPerRad?: number;
  diameterMm?: number;
  lengthMm?: number;
  shearModulusGPa?: number;
}

export interface ModelTorsionalCoupling {
  element: string;
  driverInertia?: string;
  drivenInertia?: string;
  stiffnessNmPerRad?: number;
}

export interface ModelTorsional {
  dampingRatio: number;
  inertias: ModelInertia[];
  links: ModelTorsionalLink[];
  couplings?: ModelTorsionalCoupling[];
}

export interface ModelPoint {
  id: string;
  name?: string;
  near?: string;
  shaft?: string;
  direction?: 'horizontal' | 'vertical' | 'axial' | 'radial' | 'tangential';
  quantity: 'acceleration' | 'velocity' | 'displacement' | 'tach' | 'encoder';
  unit?: string;
  alarmVelocityRmsMmPerS?: number;
  tripVelocityRmsMmPerS?: number;
}

export interface MachineModelDocument {
  id: string;
  name?: string;
  notes?: string;
  speed: ModelSpeed;
  shafts: Array<{ id: string; name?: string }>;
  belts: ModelBelt[];
  gearMeshes: ModelGearMesh[];
  bearings: ModelBearing[];
  rotors: ModelRotor[];
  motor?: { id?: string; shaft: string; lineFrequencyHz: number; poles: number };
  torsional?: ModelTorsional;
  points: ModelPoint[];
  iso?: { group: 1 | 2; foundation: 'rigid' | 'flexible' };
}

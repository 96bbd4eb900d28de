/**
 * One thing wrong with a machine model, as data: where (a JSON path such as "gearMeshes[1].driven.teeth"),
 * a stable snake_case code, and a message that reads after the path.
 */
export interface Problem {
  path: string;
  code: ProblemCode;
  message: string;
}

/** Every code a machine-model problem can carry; stable, so that services can map them. */
export const problemCodes = [
  // syntax and schema
  'parse_error', // the text is not JSON / YAML
  'required', // a required field is absent
  'invalid_type', // wrong JSON type
  'not_whole_number', // a count (teeth, elements, blades) with a fraction
  'invalid_value', // not one of the allowed words
  'invalid_format', // an id or text that breaks its pattern
  'out_of_range', // a number or a list length outside its bounds
  'unknown_field', // a field the model does not define (often a misspelling)
  // semantics
  'duplicate_id',
  'unknown_shaft',
  'unknown_bearing',
  'unknown_inertia',
  'unknown_element', // a torsional coupling naming no belt or gear mesh
  'gear_conflict', // one gear id with two different shafts or tooth counts
  'self_coupling', // a belt or gear mesh with both sides on one shaft
  'disconnected_shaft',
  'inconsistent_ratio', // two paths give a shaft different speeds
  'speed_range', // minRpm <= nominalRpm <= maxRpm broken
  'bearing_definition', // neither or both of geometry and faultOrders, or incomplete geometry
  'bearing_geometry', // element diameter not smaller than pitch diameter
  'link_definition', // neither or both of stiffness and shaft geometry
  'link_across_shafts', // a torsional link joining inertias on different shafts
  'coupling_definition', // coupling inertias on the wrong shaft, or an element coupled twice
  'point_location', // a point with no place, or a place that does not fit its quantity
  'invalid_unit', // a unit that does not fit the point's quantity
  'alarm_levels', // trip not above alarm
] as const;

export type ProblemCode = (typeof problemCodes)[number];

/** Thrown by callers that prefer an exception; carries every problem. */
export class MachineModelError extends Error {
  override readonly name = 'MachineModelError';
  readonly code = 'invalid_machine_model';
  constructor(readonly problems: Problem[]) {
    super(
      problems.length === 0
        ? 'invalid machine model'
        : `invalid machine model (${problems.length} problem${problems.length === 1 ? '' : 's'}): ${formatProblem(problems[0]!)}`,
    );
  }
}

/** "gearMeshes[1].driven.teeth: must be a whole number >= 1" (the root reads "(model)"). */
export function formatProblem(problem: Problem): string {
  return `${problem.path === '' ? '(model)' : problem.path}: ${problem.message}`;
}

/** Joins path segments the way JavaScript reads them: a.b[2].c */
export function formatPath(segments: ReadonlyArray<PropertyKey>): string {
  let out = '';
  for (const s of segments) {
    if (typeof s === 'number') out += `[${s}]`;
    else {
      const key = String(s);
      out += /^[A-Za-z_$][A-Za-z0-9_$]*$/.test(key) ? (out === '' ? key : `.${key}`) : `[${JSON.stringify(key)}]`;
    }
  }
  return out;
}

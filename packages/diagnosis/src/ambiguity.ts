/** A catalogue line: a frequency and the component it belongs to. */
export interface CatalogueLine {
  frequencyHz: number;
  component: string;
  label: string;
  /** Kind of the component (shaft, rotor, gear-mesh, bearing, belt, motor). */
  kind?: string;
  /** Speed of the line's shaft over the reference shaft's, when it has one. */
  shaftRatio?: number;
}

/**
 * Looks up the catalogue lines near a frequency, for the "ambiguous" flag of a matched line: a line that
 * another component also puts there (within the matching tolerance) cannot by itself prove this component.
 */
export class LineCatalogue {
  private readonly lines: CatalogueLine[];
  constructor(lines: readonly CatalogueLine[]) {
    this.lines = [...lines].sort((a, b) => a.frequencyHz - b.frequencyHz);
  }

  /** Labels of lines within ±toleranceHz of frequencyHz whose component is not one of `own`. */
  foreignNear(frequencyHz: number, toleranceHz: number, own: ReadonlySet<string>): string[] {
    return this.linesNear(frequencyHz, toleranceHz, own).map((l) => l.label);
  }

  /** Lines within ±toleranceHz of frequencyHz whose component is not one of `own`. */
  linesNear(frequencyHz: number, toleranceHz: number, own: ReadonlySet<string>): CatalogueLine[] {
    const lines = this.lines;
    let lo = 0;
    let hi = lines.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (lines[mid]!.frequencyHz < frequencyHz - toleranceHz) lo = mid + 1;
      else hi = mid;
    }
    const out: CatalogueLine[] = [];
    for (let i = lo; i < lines.length && lines[i]!.frequencyHz <= frequencyHz + toleranceHz; i++) {
      if (!own.has(lines[i]!.component)) out.push(lines[i]!);
    }
    return out;
  }
}

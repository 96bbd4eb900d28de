import { bearingGeometry, type Bearing, type BearingFaultOrders, type BearingGeometry } from './machine-model.js';

/**
 * Kinematic defect frequencies of a rolling-element bearing as orders of its shaft (inner ring turning,
 * outer ring fixed, no slip). `bsf` is the ball spin frequency once per element revolution; a spall on an
 * element strikes both races per spin, so the line usually seen is 2 × BSF (the value some catalogues and
 * the CWRU bearing data centre list as "rolling element").
 */
export function bearingFaultOrdersFromGeometry(g: BearingGeometry): BearingFaultOrders {
  const n = g.rollingElements;
  const ratio = (g.rollingElementDiameterMm / g.pitchDiameterMm) * Math.cos((g.contactAngleDeg * Math.PI) / 180);
  return {
    // Randall & Antoni (2011), MSSP 25(2):485-520: BPFO = (n fr / 2)(1 - d/D cos φ)
    bpfo: (n / 2) * (1 - ratio),
    // Randall & Antoni (2011): BPFI = (n fr / 2)(1 + d/D cos φ)
    bpfi: (n / 2) * (1 + ratio),
    // Randall & Antoni (2011): BSF = (D / 2d) fr (1 - (d/D cos φ)²)
    bsf: (g.pitchDiameterMm / (2 * g.rollingElementDiameterMm)) * (1 - ratio * ratio),
    // Randall & Antoni (2011): FTF = (fr / 2)(1 - d/D cos φ)
    ftf: (1 - ratio) / 2,
  };
}

/** A bearing's defect orders: from its geometry, or as given by the maker in `faultOrders`. */
export function bearingFaultOrders(bearing: Bearing): BearingFaultOrders {
  if (bearing.faultOrders) return { ...bearing.faultOrders };
  const g = bearingGeometry(bearing);
  if (!g) throw new RangeError(`bearing '${bearing.id}' needs its geometry or faultOrders`);
  return bearingFaultOrdersFromGeometry(g);
}

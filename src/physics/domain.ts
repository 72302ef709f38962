/**
 * Cell counts of a Yee domain with absorbing faces (physics.md §5).
 *
 * Along axis a the grid has N_a⁻ + g_a⁻ + n_a + g_a⁺ + N_a⁺ cells: the
 * structure region n_a, a gap g between structure and absorber, and an
 * absorber of N cells on each absorbing face (N = g = 0 on a periodic or
 * symmetric face). Total cells = Π_a (that sum).
 *
 * The CPML keeps its auxiliary ψ only for derivatives along a stretched axis
 * (Roden & Gedney, Microwave Opt. Technol. Lett. 27, 334 (2000)): per stretched
 * axis, two E and two H ψ in 3-D, one E and one H ψ for one polarisation in
 * 2-D and in 1-D. A cell inside the absorber slabs of k axes therefore holds
 * k × (ψ per axis) values: 4, 8, 12 in a 3-D face, edge, corner (derived).
 */
import { HushInputError } from './errors';
import { MAX_LAYERS } from './constants';
import { wholeInRange } from './validate';

/** What a face of the domain is. Only absorbing faces carry an absorber. */
export type FaceKind = 'absorbing' | 'periodic' | 'symmetric';

/** Face names in the order used everywhere: x-, x+, y-, y+, z-, z+. */
export const FACE_NAMES = ['x-', 'x+', 'y-', 'y+', 'z-', 'z+'] as const;
export type FaceName = (typeof FACE_NAMES)[number];

/** ψ values per cell per stretched axis (derived from the Roden & Gedney update; see the module comment). */
export function psiPerStretchedAxis(dimensions: number): number {
  return dimensions === 3 ? 4 : 2;
}

/** Largest interior extent accepted along one axis, in cells (10⁶; larger is a unit mistake). */
export const MAX_AXIS_CELLS = 1_000_000;

export interface DomainSpec {
  /** 1, 2 or 3. */
  dimensions: number;
  /** Structure region in cells per axis (length = dimensions). */
  interior: number[];
  /** Absorber layers: one number for every absorbing face, or one per face in FACE_NAMES order (length 2·dimensions). */
  layers: number | number[];
  /** Kind of each face in FACE_NAMES order (length 2·dimensions); default all absorbing. */
  faces?: FaceKind[];
  /** Gap in cells between structure and absorber, on absorbing faces only; default 0. */
  gap?: number;
  /** ψ per cell per stretched axis; default `psiPerStretchedAxis(dimensions)`. */
  psiPerAxis?: number;
}

export interface DomainCounts {
  dimensions: number;
  /** Cells per axis including gap and absorber. */
  axisCells: number[];
  /** Absorber layers per face, FACE_NAMES order (0 where not absorbing). */
  faceLayers: number[];
  /** Gap cells per face, FACE_NAMES order. */
  faceGap: number[];
  cellsTotal: number;
  /** Cells outside every absorber slab (structure region plus gaps). */
  cellsInterior: number;
  cellsAbsorber: number;
  /** Absorber cells in the slabs of exactly 1, 2, 3 axes (face, edge, corner cells). */
  cellsByStretchedAxes: [number, number, number];
  psiPerAxis: number;
  psiTotal: number;
  /** 100·absorber/interior. */
  overheadPercent: number;
}

function checkFaces(faces: FaceKind[] | undefined, dims: number): FaceKind[] {
  const n = 2 * dims;
  if (faces === undefined) return new Array<FaceKind>(n).fill('absorbing');
  if (!Array.isArray(faces) || faces.length !== n) {
    throw new HushInputError('faces', `faces must list ${n} face kinds for a ${dims}-D domain (${FACE_NAMES.slice(0, n).join(', ')})`, 'value');
  }
  for (let a = 0; a < dims; a++) {
    for (const s of [0, 1]) {
      const k = faces[2 * a + s];
      if (k !== 'absorbing' && k !== 'periodic' && k !== 'symmetric') {
        throw new HushInputError('faces', `face ${FACE_NAMES[2 * a + s]} must be absorbing, periodic or symmetric (got ${JSON.stringify(k)})`, 'value');
      }
    }
    const lo = faces[2 * a];
    const hi = faces[2 * a + 1];
    if ((lo === 'periodic') !== (hi === 'periodic')) {
      throw new HushInputError('faces', `axis ${'xyz'[a]} is periodic on one face only: a periodic axis needs both faces periodic`, 'value');
    }
  }
  return faces;
}

/**
 * Counts cells and ψ of a domain.
 * Example: domainCounts({ dimensions: 3, interior: [10, 10, 10], layers: 2 })
 * → cellsTotal 2744, cellsInterior 1000, cellsAbsorber 1744, psiTotal 9408.
 */
export function domainCounts(spec: DomainSpec): DomainCounts {
  if (spec === null || typeof spec !== 'object') throw new HushInputError('domain', 'domain must be an object', 'value');
  const dims = wholeInRange('dimensions', spec.dimensions, 1, 3);
  if (!Array.isArray(spec.interior) || spec.interior.length !== dims) {
    throw new HushInputError('interior', `interior must give ${dims} cell count${dims > 1 ? 's' : ''} for a ${dims}-D domain`, 'value');
  }
  const interior = spec.interior.map((v, a) => wholeInRange(`cells along ${'xyz'[a]}`, v, 1, MAX_AXIS_CELLS));
  const faces = checkFaces(spec.faces, dims);
  const gap = wholeInRange('gap (cells)', spec.gap ?? 0, 0, MAX_AXIS_CELLS);
  const n = 2 * dims;
  let perFace: number[];
  if (Array.isArray(spec.layers)) {
    if (spec.layers.length !== n) throw new HushInputError('layers', `layers must be one number or ${n} (one per face)`, 'value');
    perFace = spec.layers.map((v, i) => wholeInRange(`layers on ${FACE_NAMES[i]}`, v, 0, MAX_LAYERS));
  } else {
    const L = wholeInRange('layers', spec.layers, 0, MAX_LAYERS);
    perFace = new Array<number>(n).fill(L);
  }
  const psiPerAxis = wholeInRange('ψ per stretched axis', spec.psiPerAxis ?? psiPerStretchedAxis(dims), 0, 12);
  const faceLayers = perFace.map((L, i) => (faces[i] === 'absorbing' ? L : 0));
  const faceGap = faces.map((k) => (k === 'absorbing' ? gap : 0));
  const inner: number[] = [];
  const axisCells: number[] = [];
  for (let a = 0; a < dims; a++) {
    inner.push(interior[a] + faceGap[2 * a] + faceGap[2 * a + 1]);
    axisCells.push(inner[a] + faceLayers[2 * a] + faceLayers[2 * a + 1]);
  }
  const cellsTotal = axisCells.reduce((p, v) => p * v, 1);
  const cellsInterior = inner.reduce((p, v) => p * v, 1);
  // Inclusion–exclusion over the axes: along a, a cell is either in the slabs (s_a = N⁻ + N⁺) or not (inner_a).
  // Cells in the slabs of exactly k axes = Σ over k-subsets of Π_{a∈S} s_a · Π_{a∉S} inner_a.
  const byK: [number, number, number] = [0, 0, 0];
  for (let mask = 1; mask < 1 << dims; mask++) {
    let prod = 1;
    let k = 0;
    for (let a = 0; a < dims; a++) {
      if (mask & (1 << a)) {
        prod *= faceLayers[2 * a] + faceLayers[2 * a + 1];
        k++;
      } else prod *= inner[a];
    }
    byK[k - 1] += prod;
  }
  const cellsAbsorber = cellsTotal - cellsInterior;
  const psiTotal = psiPerAxis * (byK[0] + 2 * byK[1] + 3 * byK[2]);
  return {
    dimensions: dims,
    axisCells,
    faceLayers,
    faceGap,
    cellsTotal,
    cellsInterior,
    cellsAbsorber,
    cellsByStretchedAxes: byK,
    psiPerAxis,
    psiTotal,
    overheadPercent: (100 * cellsAbsorber) / cellsInterior,
  };
}

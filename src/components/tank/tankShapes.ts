import { HORIZONTAL_ENDS, TANK_SHAPES, type HorizontalEnds, type TankShape } from '@shared/calibration';

/** The size fields a shape can have (mm in the API), in the order forms and diagrams use them. */
export type SizeField = 'diameterMm' | 'heightMm' | 'straightHeightMm' | 'coneHeightMm' | 'lengthMm' | 'widthMm' | 'bottomDiameterMm' | 'topDiameterMm';

export const SIZE_FIELDS: readonly SizeField[] = ['diameterMm', 'heightMm', 'straightHeightMm', 'coneHeightMm', 'lengthMm', 'widthMm', 'bottomDiameterMm', 'topDiameterMm'];

/** One size of a shape: the form label (also written on the diagram's arrow) and a measuring hint. */
export interface SizeSpec {
  field: SizeField;
  label: string;
  hint: string;
}

/** How the editor names and describes each shape. */
export interface ShapeSpec {
  shape: TankShape;
  label: string;
  description: string;
  sizes: readonly SizeSpec[];
}

const OUTSIDE = 'Measured outside: take off twice the wall thickness.';

export const SHAPE_SPECS: Readonly<Record<TankShape, ShapeSpec>> = {
  'vertical-cylinder': {
    shape: 'vertical-cylinder',
    label: 'Vertical cylinder',
    description: 'Upright round tank with a flat floor.',
    sizes: [
      { field: 'diameterMm', label: 'Diameter', hint: OUTSIDE },
      { field: 'heightMm', label: 'Height', hint: 'Floor to the top of the straight wall.' },
    ],
  },
  'cone-bottom': {
    shape: 'cone-bottom',
    label: 'Cone bottom',
    description: 'Upright round tank standing on a downward cone.',
    sizes: [
      { field: 'diameterMm', label: 'Diameter', hint: OUTSIDE },
      { field: 'straightHeightMm', label: 'Straight height', hint: 'The round wall, from where the cone ends to the top.' },
      { field: 'coneHeightMm', label: 'Cone height', hint: 'From the cone’s lowest point up to where the wall turns straight. Levels count from that lowest point.' },
    ],
  },
  'horizontal-cylinder': {
    shape: 'horizontal-cylinder',
    label: 'Horizontal cylinder',
    description: 'Round tank lying on its side, with flat, hemispherical or 2:1 ellipsoidal ends.',
    sizes: [
      { field: 'diameterMm', label: 'Diameter', hint: OUTSIDE },
      { field: 'lengthMm', label: 'Shell length', hint: 'The straight shell only; rounded ends are added from their shape.' },
    ],
  },
  box: {
    shape: 'box',
    label: 'Box or IBC tote',
    description: 'Rectangular tank, cistern or caged tote.',
    sizes: [
      { field: 'lengthMm', label: 'Length', hint: 'Inside length of the bottle, not the cage.' },
      { field: 'widthMm', label: 'Width', hint: 'Inside width of the bottle, not the cage.' },
      { field: 'heightMm', label: 'Height', hint: 'Floor to the top of the straight wall.' },
    ],
  },
  frustum: {
    shape: 'frustum',
    label: 'Tapered (frustum)',
    description: 'Round tank wider at the top or at the bottom, like a drum or tub.',
    sizes: [
      { field: 'bottomDiameterMm', label: 'Bottom diameter', hint: OUTSIDE },
      { field: 'topDiameterMm', label: 'Top diameter', hint: OUTSIDE },
      { field: 'heightMm', label: 'Height', hint: 'Floor to the top of the tapered wall.' },
    ],
  },
  sphere: {
    shape: 'sphere',
    label: 'Sphere',
    description: 'Ball-shaped tank; levels count from its lowest point.',
    sizes: [{ field: 'diameterMm', label: 'Diameter', hint: OUTSIDE }],
  },
  points: {
    shape: 'points',
    label: 'Fill and mark',
    description: 'Any shape: pour known volumes, mark the level each one reaches.',
    sizes: [],
  },
};

/** Shapes in the order the picker shows them. */
export const SHAPE_LIST: readonly ShapeSpec[] = TANK_SHAPES.map((shape) => SHAPE_SPECS[shape]);

export const ENDS_LABELS: Readonly<Record<HorizontalEnds, string>> = {
  flat: 'Flat ends',
  hemispherical: 'Hemispherical ends',
  'ellipsoidal-2to1': '2:1 ellipsoidal ends',
};

export const ENDS_OPTIONS = HORIZONTAL_ENDS.map((ends) => ({ value: ends, label: ENDS_LABELS[ends] }));

/** Column labels of the fill-and-mark table, also written on its diagram. */
export const POINT_LABELS = { level: 'Level', volume: 'Volume' } as const;

/** "Horizontal cylinder, 2:1 ellipsoidal ends". */
export function shapeName(shape: TankShape, ends?: HorizontalEnds): string {
  const base = SHAPE_SPECS[shape].label;
  return shape === 'horizontal-cylinder' && ends ? `${base}, ${ENDS_LABELS[ends].toLowerCase()}` : base;
}

import { HORIZONTAL_ENDS, TANK_SHAPES, type HorizontalEnds, type TankShape } from '@shared/calibration';
import { tankText } from './tankWords';

/** The size fields a shape can have (mm in the API), in the order forms and diagrams use them. */
export type SizeField = 'diameterMm' | 'heightMm' | 'straightHeightMm' | 'coneHeightMm' | 'lengthMm' | 'widthMm' | 'bottomDiameterMm' | 'topDiameterMm';

export const SIZE_FIELDS: readonly SizeField[] = ['diameterMm', 'heightMm', 'straightHeightMm', 'coneHeightMm', 'lengthMm', 'widthMm', 'bottomDiameterMm', 'topDiameterMm'];

/** One size of a shape: the form label (also written on the diagram's arrow) and a measuring hint. */
export interface SizeSpec {
  readonly field: SizeField;
  readonly label: string;
  readonly hint: string;
}

/** How the editor names and describes each shape. */
export interface ShapeSpec {
  readonly shape: TankShape;
  readonly label: string;
  readonly description: string;
  readonly sizes: readonly SizeSpec[];
}

/** One size of a shape, its words read in the current language when shown. */
function size(field: SizeField, labelKey: string, hintKey: string): SizeSpec {
  return {
    field,
    get label() {
      return tankText(`shapes.sizes.${labelKey}`);
    },
    get hint() {
      return tankText(`shapes.hints.${hintKey}`);
    },
  };
}

function shapeSpec(shape: TankShape, key: string, sizes: readonly SizeSpec[]): ShapeSpec {
  return {
    shape,
    get label() {
      return tankText(`shapes.${key}.label`);
    },
    get description() {
      return tankText(`shapes.${key}.description`);
    },
    sizes,
  };
}

export const SHAPE_SPECS: Readonly<Record<TankShape, ShapeSpec>> = {
  'vertical-cylinder': shapeSpec('vertical-cylinder', 'verticalCylinder', [size('diameterMm', 'diameter', 'outside'), size('heightMm', 'height', 'floorToTop')]),
  'cone-bottom': shapeSpec('cone-bottom', 'coneBottom', [
    size('diameterMm', 'diameter', 'outside'),
    size('straightHeightMm', 'straightHeight', 'straightHeight'),
    size('coneHeightMm', 'coneHeight', 'coneHeight'),
  ]),
  'horizontal-cylinder': shapeSpec('horizontal-cylinder', 'horizontalCylinder', [size('diameterMm', 'diameter', 'outside'), size('lengthMm', 'shellLength', 'shellLength')]),
  box: shapeSpec('box', 'box', [size('lengthMm', 'length', 'boxLength'), size('widthMm', 'width', 'boxWidth'), size('heightMm', 'height', 'floorToTop')]),
  frustum: shapeSpec('frustum', 'frustum', [
    size('bottomDiameterMm', 'bottomDiameter', 'outside'),
    size('topDiameterMm', 'topDiameter', 'outside'),
    size('heightMm', 'height', 'taperedHeight'),
  ]),
  sphere: shapeSpec('sphere', 'sphere', [size('diameterMm', 'diameter', 'outside')]),
  points: shapeSpec('points', 'points', []),
};

/** Shapes in the order the picker shows them. */
export const SHAPE_LIST: readonly ShapeSpec[] = TANK_SHAPES.map((shape) => SHAPE_SPECS[shape]);

const ENDS_KEYS: Readonly<Record<HorizontalEnds, string>> = { flat: 'flat', hemispherical: 'hemispherical', 'ellipsoidal-2to1': 'ellipsoidal' };

/** Each kind of end as a label of its own ("Flat ends"), in the current language. */
export const ENDS_LABELS: Readonly<Record<HorizontalEnds, string>> = Object.defineProperties(
  {} as Record<HorizontalEnds, string>,
  Object.fromEntries(HORIZONTAL_ENDS.map((ends) => [ends, { enumerable: true, get: () => tankText(`shapes.ends.${ENDS_KEYS[ends]}`) }])),
);

/** The ends choices of the editor; read their labels when shown (they follow the language). */
export const ENDS_OPTIONS: { value: HorizontalEnds; readonly label: string }[] = HORIZONTAL_ENDS.map((ends) => ({
  value: ends,
  get label() {
    return ENDS_LABELS[ends];
  },
}));

/** Column labels of the fill-and-mark table, also written on its diagram. */
export const POINT_LABELS: { readonly level: string; readonly volume: string } = {
  get level() {
    return tankText('shapes.point.level');
  },
  get volume() {
    return tankText('shapes.point.volume');
  },
};

/** "Horizontal cylinder, 2:1 ellipsoidal ends". */
export function shapeName(shape: TankShape, ends?: HorizontalEnds): string {
  const base = SHAPE_SPECS[shape].label;
  return shape === 'horizontal-cylinder' && ends ? tankText('shapes.withEnds', { shape: base, ends: tankText(`shapes.endsInName.${ENDS_KEYS[ends]}`) }) : base;
}

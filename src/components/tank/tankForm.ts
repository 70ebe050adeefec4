// The tank editor's form state, in the user's units, and its conversion to the API's mm and litres.
import type { HorizontalEnds, TankShape } from '@shared/calibration';
import { defaultExposedToFrost } from '@shared/flags';
import type { Tank, TankContents, TankUpdateInput } from '@shared/schemas';
import { convert, displayUnits, type UnitSystem } from '@shared/units';
import { SHAPE_SPECS, SIZE_FIELDS, type SizeField } from './tankShapes';

/** One fill-and-mark row as typed: level in the user's length unit, volume in their volume unit. */
export interface PointRow {
  key: number;
  level: number | null;
  volume: number | null;
}

/** What the editor holds; lengths in mm or in, volumes in L or US gal, as the user's unit system says. */
export interface TankForm {
  name: string;
  code: string;
  contents: TankContents;
  contentsNote: string;
  shape: TankShape;
  ends: HorizontalEnds;
  /** Sizes are kept across shape changes, so a diameter typed once stays when the shape is switched. */
  sizes: Record<SizeField, number | null>;
  points: PointRow[];
  datumOffset: number | null;
  outletHeight: number | null;
  /** Empty means the top of the tank. */
  safeFillLevel: number | null;
  lowStock: number | null;
  specificGravity: number | null;
  sensorHeight: number | null;
  /** A frost forecast flags the tank (its lines stand outdoors). */
  exposedToFrost: boolean;
}

/** Decimals the editor shows and keeps: about a hundredth of a millimetre in inches, a tenth in mm. */
export function lengthDigits(system: UnitSystem): number {
  return system === 'us' ? 3 : 1;
}

/** Decimals for volumes: tenths of a litre, hundredths of a gallon. */
export function volumeDigits(system: UnitSystem): number {
  return system === 'us' ? 2 : 1;
}

// Values come back from mm rounded to what the inputs show, so focusing and leaving an input
// (which rounds to its display) never turns an untouched size into a "change".
function rounded(value: number, digits: number): number {
  const scale = 10 ** digits;
  return Math.round(value * scale) / scale;
}

let nextKey = 1;

/** A fresh fill-and-mark row. */
export function pointRow(level: number | null = null, volume: number | null = null): PointRow {
  return { key: nextKey++, level, volume };
}

function emptySizes(): Record<SizeField, number | null> {
  return Object.fromEntries(SIZE_FIELDS.map((f) => [f, null])) as Record<SizeField, number | null>;
}

/** The form of a new tank: a vertical cylinder of water, tube zero at the floor, nothing measured yet. */
export function emptyForm(): TankForm {
  return {
    name: '',
    code: '',
    contents: 'water',
    contentsNote: '',
    shape: 'vertical-cylinder',
    ends: 'flat',
    sizes: emptySizes(),
    points: [pointRow(0, 0), pointRow(), pointRow()],
    datumOffset: 0,
    outletHeight: 0,
    safeFillLevel: null,
    lowStock: 0,
    specificGravity: 1,
    sensorHeight: null,
    exposedToFrost: defaultExposedToFrost('water'),
  };
}

/** A stored tank as form values in the user's units. */
export function formFromTank(tank: Tank, system: UnitSystem): TankForm {
  const { length, volume } = displayUnits(system);
  const len = (mm: number) => rounded(convert(mm, 'mm', length), lengthDigits(system));
  const vol = (litres: number) => rounded(convert(litres, 'L', volume), volumeDigits(system));
  const form = emptyForm();
  const g = tank.geometry;
  form.name = tank.name;
  form.code = tank.code;
  form.contents = tank.contents;
  form.contentsNote = tank.contentsNote;
  form.shape = g.shape;
  if (g.shape === 'horizontal-cylinder') form.ends = g.ends;
  if (g.shape === 'points') {
    form.points = g.points.map((p) => pointRow(len(p.levelMm), vol(p.volumeL)));
  } else {
    const sizes = g as unknown as Record<string, unknown>;
    for (const field of SIZE_FIELDS) {
      const mm = sizes[field];
      if (typeof mm === 'number') form.sizes[field] = len(mm);
    }
  }
  form.datumOffset = len(tank.datumOffsetMm);
  form.outletHeight = len(tank.outletHeightMm);
  form.safeFillLevel = len(tank.safeFillLevelMm);
  form.lowStock = vol(tank.lowStockL);
  form.specificGravity = tank.specificGravity;
  form.sensorHeight = tank.sensorHeightMm === null ? null : len(tank.sensorHeightMm);
  form.exposedToFrost = tank.exposedToFrost;
  return form;
}

/** Missing numbers stay undefined so the shared schema names them "is required". */
function toMm(value: number | null, system: UnitSystem): number | undefined {
  return value === null ? undefined : convert(value, displayUnits(system).length, 'mm');
}

function toLitres(value: number | null, system: UnitSystem): number | undefined {
  return value === null ? undefined : convert(value, displayUnits(system).volume, 'L');
}

/** The form's geometry in mm and litres, unchecked (validateGeometry or the schema checks it). */
export function geometryFromForm(form: TankForm, system: UnitSystem): Record<string, unknown> {
  if (form.shape === 'points') {
    return {
      shape: 'points',
      points: form.points.map((p) => ({ levelMm: toMm(p.level, system), volumeL: toLitres(p.volume, system) })),
    };
  }
  const geometry: Record<string, unknown> = { shape: form.shape };
  for (const size of SHAPE_SPECS[form.shape].sizes) geometry[size.field] = toMm(form.sizes[size.field], system);
  if (form.shape === 'horizontal-cylinder') geometry.ends = form.ends;
  return geometry;
}

/** The whole create body in mm and litres, unchecked: parse it with tankCreateSchema. */
export function inputFromForm(form: TankForm, system: UnitSystem, extra: { farmId: number; walkOrder: number }): Record<string, unknown> {
  return {
    farmId: extra.farmId,
    walkOrder: extra.walkOrder,
    name: form.name,
    code: form.code,
    contents: form.contents,
    contentsNote: form.contentsNote,
    geometry: geometryFromForm(form, system),
    datumOffsetMm: toMm(form.datumOffset, system),
    outletHeightMm: toMm(form.outletHeight, system),
    safeFillLevelMm: toMm(form.safeFillLevel, system),
    lowStockL: toLitres(form.lowStock, system),
    specificGravity: form.specificGravity ?? undefined,
    sensorHeightMm: form.sensorHeight === null ? null : toMm(form.sensorHeight, system),
    exposedToFrost: form.exposedToFrost,
  };
}

const SAME_GEOMETRY = (a: TankForm, b: TankForm): boolean => {
  if (a.shape !== b.shape) return false;
  if (a.shape === 'points') {
    return a.points.length === b.points.length && a.points.every((p, i) => p.level === b.points[i].level && p.volume === b.points[i].volume);
  }
  if (a.shape === 'horizontal-cylinder' && a.ends !== b.ends) return false;
  return SHAPE_SPECS[a.shape].sizes.every((s) => a.sizes[s.field] === b.sizes[s.field]);
};

/** The API fields whose form values differ from `initial`: an edit sends only these. */
export function changedFields(initial: TankForm, current: TankForm): Set<keyof TankUpdateInput> {
  const changed = new Set<keyof TankUpdateInput>();
  const simple: [keyof TankForm, keyof TankUpdateInput][] = [
    ['name', 'name'],
    ['code', 'code'],
    ['contents', 'contents'],
    ['contentsNote', 'contentsNote'],
    ['datumOffset', 'datumOffsetMm'],
    ['outletHeight', 'outletHeightMm'],
    ['safeFillLevel', 'safeFillLevelMm'],
    ['lowStock', 'lowStockL'],
    ['specificGravity', 'specificGravity'],
    ['sensorHeight', 'sensorHeightMm'],
    ['exposedToFrost', 'exposedToFrost'],
  ];
  for (const [formKey, apiKey] of simple) {
    const a = initial[formKey];
    const b = current[formKey];
    if ((typeof a === 'string' && typeof b === 'string' ? a.trim() !== b.trim() : a !== b)) changed.add(apiKey);
  }
  if (!SAME_GEOMETRY(initial, current)) changed.add('geometry');
  return changed;
}

/** PrimeVue pass-through that puts aria-describedby on an InputNumber's own <input> (plain attributes land on its wrapper). */
export function describedBy(id: string | undefined): { pcInputText: { root: { 'aria-describedby'?: string } } } {
  return { pcInputText: { root: id ? { 'aria-describedby': id } : {} } };
}

// A round entry as typed and what it gives: the typed numbers parsed, the live reading and temperature, and the tank card's row (pure; a piece of src/stores/round.ts).
import { readingToVolumes, tankSetupOf, type TankSetup } from '@shared/readings';
import { firstIssue, roundEntrySchema, type RoundEntry, type RoundEntryResult, type Tank, type TankTile } from '@shared/schemas';
import { convert, displayUnits, type UnitSystem } from '@shared/units';

/** What the server did with one entry of a submitted round. */
export type EntryOutcome = RoundEntryResult['status'];

/** The server's answer for one entry, kept with the entry (and on the device) until a new round starts. */
export interface EntryResult {
  status: EntryOutcome;
  reason?: string;
  takenAt?: string;
  grossL?: number;
  usableL?: number;
}

/** One tank's line of a round as typed, in the units it was typed in. */
export interface RoundEntryDraft {
  tankId: number;
  reading: string;
  readingUnit: 'mm' | 'in';
  temperature: string;
  temperatureUnit: 'C' | 'F';
  /** The person asked for the temperature field (culture tanks show it without asking). */
  temperatureOpen: boolean;
  note: string;
  /** Made when a reading is first typed and kept for every retry, so the server stores it once. */
  idempotencyKey: string | null;
  editedAt: string | null;
  result: EntryResult | null;
}

/** A farm's round in progress. */
export interface RoundDraft {
  farmId: number;
  /** Fixed at the first send and reused by every retry, so a retried entry is the same reading. */
  takenAt: string | null;
  entries: Record<string, RoundEntryDraft>;
}

/** The live reading under the input: nothing typed, refused with the shared function's reason, or its volumes. */
export type ReadingPreview =
  | { state: 'empty' }
  | { state: 'invalid'; reason: string }
  | { state: 'ok'; readingMm: number; levelMm: number; grossL: number; usableL: number; percentFull: number };

/** The optional temperature: nothing typed, refused with a reason, or in °C. */
export type TemperaturePreview = { state: 'empty' } | { state: 'invalid'; reason: string } | { state: 'ok'; temperatureC: number };

/** Everything a tank's card shows. */
export interface RoundRow {
  tank: Tank;
  entry: RoundEntryDraft;
  reading: ReadingPreview;
  temperature: TemperaturePreview;
  showTemperature: boolean;
  /** The tank's latest stored reading: this round's when stored, else the board's. */
  last: { takenAt: string; grossL: number | null; usableL: number | null } | null;
  /** Stored (or stored by an earlier try): the entry can no longer change. */
  locked: boolean;
  /** The entry as it would be sent now; null when there is nothing to send or it is refused here. */
  payload: RoundEntry | null;
  /** Why the entry cannot be sent as it stands (reading or temperature), or null. */
  problem: string | null;
  /** Worth telling the person on the spot, though the entry can be sent (a cold culture). */
  warning: string | null;
}

/** Below this a culture goes inactive (common practice, no published source; see PRODUCT.md). */
export const CULTURE_INACTIVE_BELOW_C = 18;
/** The schema's own rule for temperature, so the phone refuses what the server would. */
const temperatureSchema = roundEntrySchema.shape.temperatureC;

/** A fresh idempotency key: 32 hex digits (a v4 UUID without dashes). */
export function newEntryKey(): string {
  const c = globalThis.crypto;
  if (typeof c?.randomUUID === 'function') return c.randomUUID().replace(/-/g, '');
  // randomUUID exists only in secure contexts; a farm LAN address over plain http still has getRandomValues.
  const bytes = c.getRandomValues(new Uint8Array(16));
  return Array.from(bytes, (b) => b.toString(16).padStart(2, '0')).join('');
}

/** Parsed decimal text; null when empty. Accepts a comma as the decimal mark (phone keyboards in many locales). */
export function parseDecimal(text: string, field: string, example: string): { ok: true; value: number } | { ok: false; reason: string } | null {
  const t = text.trim();
  if (!t) return null;
  if (!/^[+-]?(\d+([.,]\d*)?|[.,]\d+)$/.test(t)) return { ok: false, reason: `${field}: type a number, e.g. ${example}` };
  // "1,250" may mean 1250 or 1.25: refuse rather than guess a reading a thousand times off.
  if (/^[+-]?\d+,\d{3}$/.test(t)) return { ok: false, reason: `${field}: "${t}" is unclear; type ${t.replace(',', '')} or ${t.replace(',', '.')} without a thousands separator` };
  return { ok: true, value: Number(t.replace(',', '.')) };
}

/** The parts of a tank the shared reading function needs (the one mapping in shared/readings). */
export const setupOf: (tank: Tank) => TankSetup = tankSetupOf;

export function readingPreview(tank: Tank, entry: RoundEntryDraft): ReadingPreview {
  const parsed = parseDecimal(entry.reading, 'Sight-tube reading', entry.readingUnit === 'in' ? '48.5' : '1250');
  if (parsed === null) return { state: 'empty' };
  if (!parsed.ok) return { state: 'invalid', reason: parsed.reason };
  const readingMm = convert(parsed.value, entry.readingUnit, 'mm');
  const v = readingToVolumes(setupOf(tank), { kind: 'sight-tube', readingMm });
  if (!v.ok) return { state: 'invalid', reason: v.reason };
  return { state: 'ok', readingMm, levelMm: v.levelMm, grossL: v.grossL, usableL: v.usableL, percentFull: v.percentFull };
}

export function temperaturePreview(entry: RoundEntryDraft): TemperaturePreview {
  const parsed = parseDecimal(entry.temperature, 'Temperature', entry.temperatureUnit === 'F' ? '68' : '21.5');
  if (parsed === null) return { state: 'empty' };
  if (!parsed.ok) return { state: 'invalid', reason: parsed.reason };
  const temperatureC = convert(parsed.value, entry.temperatureUnit, 'C');
  const checked = temperatureSchema.safeParse(temperatureC);
  if (!checked.success) return { state: 'invalid', reason: `Temperature ${checked.error.issues[0]?.message ?? 'is out of range'}` };
  return { state: 'ok', temperatureC };
}

export function blankEntry(tankId: number, system: UnitSystem): RoundEntryDraft {
  const units = displayUnits(system);
  return {
    tankId,
    reading: '',
    readingUnit: units.length,
    temperature: '',
    temperatureUnit: units.temperature,
    temperatureOpen: false,
    note: '',
    idempotencyKey: null,
    editedAt: null,
    result: null,
  };
}

export const LOCKED: ReadonlySet<EntryOutcome> = new Set(['stored', 'duplicate']);

/** Everything a tank's card shows: its entry (as typed), the litres it gives, and what the board last had. */
export function roundRow(tank: Tank, entry: RoundEntryDraft, tile: TankTile | undefined): RoundRow {
  const reading = readingPreview(tank, entry);
  const temperature = temperaturePreview(entry);
  const locked = entry.result !== null && LOCKED.has(entry.result.status);
  const fromRound = entry.result?.takenAt ? { takenAt: entry.result.takenAt, grossL: entry.result.grossL ?? null, usableL: entry.result.usableL ?? null } : null;
  const fromBoard = tile?.takenAt ? { takenAt: tile.takenAt, grossL: tile.grossL, usableL: tile.usableL } : null;
  const last = fromRound && (!fromBoard || fromRound.takenAt >= fromBoard.takenAt) ? fromRound : fromBoard;

  let problem: string | null = null;
  let payload: RoundEntry | null = null;
  if (reading.state === 'invalid') problem = reading.reason;
  else if (temperature.state === 'invalid') problem = temperature.reason;
  else if (reading.state === 'ok' && entry.idempotencyKey && (!entry.result || entry.result.status === 'conflict')) {
    const checked = roundEntrySchema.safeParse({
      tankId: tank.id,
      readingMm: reading.readingMm,
      temperatureC: temperature.state === 'ok' ? temperature.temperatureC : undefined,
      note: entry.note,
      idempotencyKey: entry.idempotencyKey,
    });
    if (checked.success) payload = checked.data;
    else problem = firstIssue(checked.error).message;
  }
  const cold = tank.contents === 'culture' && temperature.state === 'ok' && temperature.temperatureC < CULTURE_INACTIVE_BELOW_C;
  return {
    tank,
    entry,
    reading,
    temperature,
    warning: cold ? `Below about ${CULTURE_INACTIVE_BELOW_C} °C a culture goes inactive: check its heater.` : null,
    // A stored entry keeps the field only when it holds a value; an empty locked field says nothing.
    showTemperature: entry.temperature.trim() !== '' || (!locked && (tank.contents === 'culture' || entry.temperatureOpen)),
    last,
    locked,
    payload,
    problem,
  };
}

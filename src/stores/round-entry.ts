// A round entry as typed and what it gives: the typed numbers parsed, the live reading and temperature, and the tank card's row (pure; a piece of src/stores/round.ts).
import { heightMm } from '@shared/calibration';
import { levelFromSightTube, readingToVolumes, tankSetupOf, type TankSetup } from '@shared/readings';
import { firstIssue, roundEntrySchema, type RoundEntry, type RoundEntryResult, type Tank, type TankTile } from '@shared/schemas';
import { convert, displayUnits, formatNumberTrimmed, parseDecimal, type DecimalMark, type DecimalProblem, type UnitSystem } from '@shared/units';
import { COLD_CULTURE_C } from '@shared/flags';
import { i18n } from '@/i18n';
import { checkMessage } from '@/i18n/checkMessage';
import type { CheckProblem } from '@shared/check-problems';
import { entryChecks } from './round-checks';

/** What the server did with one entry of a submitted round. */
export type EntryOutcome = RoundEntryResult['status'];

/** The server's answer for one entry, kept with the entry (and on the device) until a new round starts. */
export interface EntryResult {
  status: EntryOutcome;
  reason?: string;
  /** The server's reason as a code of area `checks` (a reading outside the tank), said in the screens' language. */
  problem?: CheckProblem;
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
  /** The person answered "Yes, this is right" to the questions the reading and temperature as typed raise (absent in rounds saved before). */
  confirmed?: boolean;
  editedAt: string | null;
  result: EntryResult | null;
  /** The outbox round this entry waits in (sent as it stands, so it cannot change meanwhile); absent when not queued. */
  outboxSeq?: number | null;
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
  | {
      state: 'ok';
      readingMm: number;
      levelMm: number;
      grossL: number;
      usableL: number;
      percentFull: number;
      /** How text the other decimal mark reads differently was taken ("Read as 1250 mm"), or null. */
      readAs: string | null;
    };

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
  /** In the outbox waiting for the network: it cannot change until the server answers. */
  waiting: boolean;
  /** The entry as it would be sent now; null when there is nothing to send or it is refused here. */
  payload: RoundEntry | null;
  /** Why the entry cannot be sent as it stands (reading or temperature), or null. */
  problem: string | null;
  /** Worth telling the person on the spot, though the entry can be sent (a culture too cold or too warm). */
  warning: string | null;
  /** What the reading or temperature makes the round ask (a big change of stock, a culture outside its safe range). */
  questions: string[];
  /** Questions not yet answered "Yes, this is right": the round does not send until they are, or the entry is corrected. */
  awaitingAnswer: boolean;
}

/** What a row needs besides the tank and its entry: the person's decimal mark, the farm's cold-culture limit, the units shown. */
export interface RowContext {
  decimalMark: DecimalMark;
  coldCultureC: number;
  unitSystem: UnitSystem;
}

/** Below this a culture goes inactive (common practice, no published source; see PRODUCT.md): the shared flag limit. */
export const CULTURE_INACTIVE_BELOW_C = COLD_CULTURE_C;
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

/** An example of a number as the field expects it, with the person's decimal mark ("48,5"). */
export function exampleNumber(example: string, decimalMark: DecimalMark): string {
  return decimalMark === ',' ? example.replace('.', ',') : example;
}

const EXAMPLES = { mm: '1250', in: '48.5', C: '21.5', F: '68' } as const;

type Field = 'readingField' | 'temperatureField';

/** Why typed text is not a number, naming the field, in the screens' language (the shared parser's reasons are English). */
function decimalReason(problem: DecimalProblem, typed: string, field: Field, decimalMark: DecimalMark, example: string): string {
  const { t } = i18n.global;
  const shown = typed.trim();
  const params = { field: t(`round.entry.${field}`), text: shown.length > 40 ? `${shown.slice(0, 40)}…` : shown, example };
  if (problem === 'empty') return t('round.entry.empty', params);
  if (problem === 'too-large') return t('round.entry.tooLarge', params);
  if (problem === 'other-mark') return t(decimalMark === '.' ? 'round.entry.commaNotPoint' : 'round.entry.pointNotComma', params);
  return t('round.entry.notANumber', params);
}

/** The typed text read with the person's decimal mark; null when nothing is typed. */
function parseTyped(text: string, field: Field, example: string, decimalMark: DecimalMark) {
  if (!text.trim()) return null;
  const shownExample = exampleNumber(example, decimalMark);
  const parsed = parseDecimal(text, { decimalMark, example: shownExample });
  return parsed.ok ? parsed : { ...parsed, reason: decimalReason(parsed.problem, text, field, decimalMark, shownExample) };
}

const mm = (value: number) => formatNumberTrimmed(value, 1);

/**
 * Why a sight-tube reading is refused, in the screens' language: below the tube's zero, or a level
 * outside the tank, with the same figures as the shared function's reason; the shared refusal otherwise
 * (a tank set up wrongly, which a manager mends), said from its code.
 */
function sightTubeReason(tank: Tank, readingMm: number, problem: CheckProblem): string {
  const sharedReason = checkMessage(problem);
  const { t } = i18n.global;
  const setup = setupOf(tank);
  const setupOk = readingToVolumes(setup, { kind: 'level', levelMm: 0 }).ok;
  if (!setupOk || !Number.isFinite(readingMm)) return sharedReason;
  const reading = mm(readingMm);
  if (readingMm < 0) return t('round.entry.belowZero', { reading });
  const levelMm = levelFromSightTube(readingMm, setup.datumOffsetMm);
  const top = heightMm(setup.geometry);
  const at = setup.datumOffsetMm === 0 ? '' : 'At';
  if (levelMm < 0) return t(`round.entry.belowFloor${at}`, { reading, level: mm(levelMm), below: mm(-levelMm) });
  if (levelMm > top) return t(`round.entry.aboveTop${at}`, { reading, level: mm(levelMm), over: mm(levelMm - top), top: mm(top) });
  return sharedReason;
}

/** The parts of a tank the shared reading function needs (the one mapping in shared/readings). */
export const setupOf: (tank: Tank) => TankSetup = tankSetupOf;

/** The live reading of an entry read with the person's decimal mark: its volumes, or why it is refused. */
export function readingPreview(tank: Tank, entry: RoundEntryDraft, decimalMark: DecimalMark): ReadingPreview {
  const parsed = parseTyped(entry.reading, 'readingField', EXAMPLES[entry.readingUnit], decimalMark);
  if (parsed === null) return { state: 'empty' };
  if (!parsed.ok) return { state: 'invalid', reason: parsed.reason };
  const readingMm = convert(parsed.value, entry.readingUnit, 'mm');
  const v = readingToVolumes(setupOf(tank), { kind: 'sight-tube', readingMm });
  if (!v.ok) return { state: 'invalid', reason: sightTubeReason(tank, readingMm, v.problem) };
  // Only the reading meant in the person's own convention is offered, without grouping, so it cannot be misread again.
  const readAs = parsed.ambiguous ? i18n.global.t('round.entry.readAs', { value: exampleNumber(String(parsed.value), decimalMark), unit: entry.readingUnit }) : null;
  return { state: 'ok', readingMm, levelMm: v.levelMm, grossL: v.grossL, usableL: v.usableL, percentFull: v.percentFull, readAs };
}

/** The entry's temperature read with the person's decimal mark, in °C, or why it is refused. */
export function temperaturePreview(entry: RoundEntryDraft, decimalMark: DecimalMark): TemperaturePreview {
  const parsed = parseTyped(entry.temperature, 'temperatureField', EXAMPLES[entry.temperatureUnit], decimalMark);
  if (parsed === null) return { state: 'empty' };
  if (!parsed.ok) return { state: 'invalid', reason: parsed.reason };
  const temperatureC = convert(parsed.value, entry.temperatureUnit, 'C');
  const checked = temperatureSchema.safeParse(temperatureC);
  if (!checked.success) return { state: 'invalid', reason: temperatureReason(checked.error.issues[0]) };
  return { state: 'ok', temperatureC };
}

/** Why a temperature is outside the schema's range, in the screens' language, with the schema's own limits. */
function temperatureReason(issue: { code: string; minimum?: unknown; maximum?: unknown } | undefined): string {
  const { t } = i18n.global;
  if (issue?.code === 'too_small' && typeof issue.minimum === 'number') return t('round.entry.temperatureTooLow', { min: formatNumberTrimmed(issue.minimum) });
  if (issue?.code === 'too_big' && typeof issue.maximum === 'number') return t('round.entry.temperatureTooHigh', { max: formatNumberTrimmed(issue.maximum) });
  return t('round.entry.temperatureOutOfRange');
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
    confirmed: false,
    editedAt: null,
    result: null,
  };
}

export const LOCKED: ReadonlySet<EntryOutcome> = new Set(['stored', 'duplicate']);

/** Everything a tank's card shows: its entry (as typed), the litres it gives, and what the board last had. */
export function roundRow(tank: Tank, entry: RoundEntryDraft, tile: TankTile | undefined, context: RowContext): RoundRow {
  const reading = readingPreview(tank, entry, context.decimalMark);
  const temperature = temperaturePreview(entry, context.decimalMark);
  const locked = entry.result !== null && LOCKED.has(entry.result.status);
  const waiting = !locked && entry.outboxSeq !== undefined && entry.outboxSeq !== null;
  const fromRound = entry.result?.takenAt ? { takenAt: entry.result.takenAt, grossL: entry.result.grossL ?? null, usableL: entry.result.usableL ?? null } : null;
  const fromBoard = tile?.takenAt ? { takenAt: tile.takenAt, grossL: tile.grossL, usableL: tile.usableL } : null;
  const last = fromRound && (!fromBoard || fromRound.takenAt >= fromBoard.takenAt) ? fromRound : fromBoard;

  let problem: string | null = null;
  let payload: RoundEntry | null = null;
  if (reading.state === 'invalid') problem = reading.reason;
  else if (temperature.state === 'invalid') problem = temperature.reason;
  else if (reading.state === 'ok' && !waiting && entry.idempotencyKey && (!entry.result || entry.result.status === 'conflict')) {
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
  const checks = entryChecks(tank, reading, temperature, last?.grossL ?? null, context.coldCultureC, context.unitSystem);
  return {
    tank,
    entry,
    reading,
    temperature,
    warning: checks.warning,
    // A stored entry has nothing left to answer.
    questions: locked || waiting ? [] : checks.questions,
    awaitingAnswer: !locked && !waiting && problem === null && checks.questions.length > 0 && entry.confirmed !== true,
    // A stored entry keeps the field only when it holds a value; an empty locked field says nothing.
    showTemperature: entry.temperature.trim() !== '' || (!locked && (tank.contents === 'culture' || entry.temperatureOpen)),
    last,
    locked,
    waiting,
    payload,
    problem,
  };
}

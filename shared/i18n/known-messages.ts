// Messages the server and the shared schemas write in English, read back as catalogue entries so
// they can be said in another language: each English message of a catalogue area is a pattern
// ("{what} not found" matches "Tank not found"), and a text that matches one is that key with
// those values. A "field: message" text keeps its field path in front.

/** A catalogue key and the values its placeholders took in the English text. */
export interface KnownMessage {
  key: string;
  named: Record<string, string>;
}

interface Pattern {
  key: string;
  names: string[];
  regex: RegExp;
  /** Fixed characters in the pattern: the more, the more specific ("Tank not found" before "{what} not found"). */
  fixed: number;
}

const escapeRegex = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

/** Every message of a (nested) catalogue area as dotted key → English text. */
function flatten(tree: Record<string, unknown>, prefix: string): [string, string][] {
  return Object.entries(tree).flatMap(([k, v]) => {
    const key = `${prefix}.${k}`;
    if (typeof v === 'string') return [[key, v] as [string, string]];
    return v && typeof v === 'object' ? flatten(v as Record<string, unknown>, key) : [];
  });
}

/**
 * A reader of the English messages of catalogue `area` (its messages object): `match(text)` gives
 * the key and values of the most specific message the text is, or null when it is none of them.
 */
export function knownMessages(area: string, english: Record<string, unknown>): { match(text: string): KnownMessage | null } {
  const patterns: Pattern[] = flatten(english, area)
    .filter(([, text]) => !text.includes('|'))
    .map(([key, text]) => {
      const names: string[] = [];
      let regex = '';
      let fixed = 0;
      for (const part of text.split(/(\{\s*[A-Za-z_]\w*\s*\})/)) {
        const name = /^\{\s*([A-Za-z_]\w*)\s*\}$/.exec(part)?.[1];
        if (name) {
          names.push(name);
          regex += '(.+?)';
        } else {
          regex += escapeRegex(part);
          fixed += part.length;
        }
      }
      return { key, names, regex: new RegExp(`^${regex}$`), fixed };
    })
    .sort((a, b) => b.fixed - a.fixed);
  return {
    match(text: string): KnownMessage | null {
      for (const p of patterns) {
        const m = p.regex.exec(text);
        if (m) return { key: p.key, named: Object.fromEntries(p.names.map((n, i) => [n, m[i + 1]])) };
      }
      return null;
    },
  };
}

/**
 * `text` said through `translate` when it is a known message (or "field: known message"); as it was otherwise.
 * `translate` gets the key and the values found, e.g. ("errors.notFound.generic", { what: "Sensor" }).
 */
export function sayKnown(text: string, known: { match(text: string): KnownMessage | null }, translate: (key: string, named: Record<string, string>) => string): string {
  const whole = known.match(text);
  if (whole) return translate(whole.key, whole.named);
  const field = /^([A-Za-z_][\w.]*): (.+)$/s.exec(text);
  if (field) {
    const rest = known.match(field[2]);
    if (rest) return `${field[1]}: ${translate(rest.key, rest.named)}`;
  }
  return text;
}

const EN_FIGURE = /^-?(?:\d{1,3}(?:,\d{3})+|\d+)(?:\.(\d+))?$/;

/** The values found in an English text with their figures ("1,234.5") rewritten as `locale` writes them ("1234,5" in es-ES). */
export function localiseFigures(named: Record<string, string>, locale: string): Record<string, string> {
  return Object.fromEntries(
    Object.entries(named).map(([name, value]) => {
      const m = EN_FIGURE.exec(value);
      if (!m) return [name, value];
      const decimals = m[1]?.length ?? 0;
      return [name, new Intl.NumberFormat(locale, { minimumFractionDigits: decimals, maximumFractionDigits: decimals }).format(Number(value.replace(/,/g, '')))];
    }),
  );
}

const WEEKDAYS = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat'];
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
const EN_DAY_TIME = /^(Sun|Mon|Tue|Wed|Thu|Fri|Sat) (\d{1,2}) (Jan|Feb|Mar|Apr|May|Jun|Jul|Aug|Sep|Oct|Nov|Dec),? (\d{2}):(\d{2})$/;

/**
 * A day and time as the flag rules write it in English ("Thu 4 Dec, 03:00", the farm's local time) as
 * `locale` writes it ("jue, 4 dic, 3:00"); any other text as given. The year is the first from 2024 on
 * whose calendar puts that date on that weekday, so the weekday and date stay as written.
 */
export function localiseDayTime(value: string, locale: string): string {
  const m = EN_DAY_TIME.exec(value);
  if (!m) return value;
  const [, weekday, day, month, hour, minute] = m;
  for (let year = 2024; year < 2040; year++) {
    const at = new Date(Date.UTC(year, MONTHS.indexOf(month), Number(day), Number(hour), Number(minute)));
    if (at.getUTCDay() !== WEEKDAYS.indexOf(weekday) || at.getUTCDate() !== Number(day)) continue;
    return new Intl.DateTimeFormat(locale, { timeZone: 'UTC', weekday: 'short', day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(at);
  }
  return value;
}

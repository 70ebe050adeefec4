// utcOffsetMinutes keeps each zone's offset per UTC day (shared/time/zone.ts) instead of asking the zone
// database for every instant. Checked against the reference library it wraps, @date-fns/tz (which reads
// the runtime's copy of the IANA Time Zone Database), at every quarter hour around each clock change of
// 2026 in zones that change at 01:00 UTC (Europe/Dublin), at local 02:00 (America/St_Johns, a
// 3.5 h offset), by half an hour (Australia/Lord_Howe), at local midnight (America/Santiago), at an
// offset of 12:45 (Pacific/Chatham), never (Asia/Kathmandu, 5:45), and at random instants from 1900 to 2100.
import { tzOffset, tzScan } from '@date-fns/tz';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { utcOffsetMinutes } from '@shared/time';

const ZONES = ['Europe/Dublin', 'America/St_Johns', 'Australia/Lord_Howe', 'America/Santiago', 'Pacific/Chatham', 'Asia/Kathmandu', 'UTC'];
const QUARTER = 15 * 60_000;
const reference = (zone: string, at: number) => tzOffset(zone, new Date(at));

describe('utcOffsetMinutes kept per day', () => {
  it.each(ZONES)('gives %s the reference offset at every quarter hour of 2026 and each minute around its clock changes', (zone) => {
    const from = Date.UTC(2026, 0, 1);
    const to = Date.UTC(2027, 0, 1);
    for (let at = from; at < to; at += QUARTER) expect(utcOffsetMinutes(zone, at)).toBe(reference(zone, at));
    const changes = tzScan(zone, { start: new Date(from), end: new Date(to) });
    if (zone !== 'Asia/Kathmandu' && zone !== 'UTC') expect(changes.length).toBeGreaterThan(0);
    for (const change of changes) {
      const at = change.date.getTime();
      // tzScan places a change to within its scan step: within 90 minutes either side the offset changes once.
      const seen = new Set<number>();
      for (let m = -90; m <= 90; m++) {
        const minute = at + m * 60_000;
        expect(utcOffsetMinutes(zone, minute)).toBe(reference(zone, minute));
        expect(utcOffsetMinutes(zone, minute - 1)).toBe(reference(zone, minute - 1));
        seen.add(utcOffsetMinutes(zone, minute));
      }
      expect(seen.size).toBe(2);
    }
  });

  it('agrees with the reference at random instants from 1900 to 2100, asked in any order, Dates or numbers', () => {
    fc.assert(
      fc.property(fc.constantFrom(...ZONES), fc.integer({ min: Date.UTC(1900, 0, 1), max: Date.UTC(2100, 0, 1) }), fc.boolean(), (zone, at, asDate) => {
        expect(utcOffsetMinutes(zone, asDate ? new Date(at) : at)).toBe(reference(zone, at));
      }),
      { numRuns: 20_000 },
    );
  });

  it('still refuses an unknown zone, asked twice', () => {
    expect(() => utcOffsetMinutes('Mars/Olympus_Mons', 0)).toThrow(RangeError);
    expect(() => utcOffsetMinutes('Mars/Olympus_Mons', 0)).toThrow(RangeError);
  });
});

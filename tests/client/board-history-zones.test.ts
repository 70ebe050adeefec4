import { describe, expect, it } from 'vitest';
import { historyZoneNote } from '@/components/board/boardHistoryZones';

const farm = (name: string, timeZone: string, today: string) => ({ farmId: name.length, name, timeZone, today });

describe('historyZoneNote', () => {
  it('names the one zone when every farm keeps the same clock', () => {
    expect(historyZoneNote([farm('Hill block', 'Europe/Madrid', '2026-12-03'), farm('River flat', 'Europe/Madrid', '2026-12-03')], '2026-12-03')).toBe(
      'Days run from midnight to midnight in Europe/Madrid.',
    );
  });

  it('names each farm with its zone when they differ, and says what a farm behind the last day shows', () => {
    const note = historyZoneNote([farm('Kauri gully', 'Pacific/Auckland', '2026-12-04'), farm('Canyon rows', 'America/Los_Angeles', '2026-12-03')], '2026-12-04');
    expect(note).toBe(
      "Each farm's days run from its own midnight: Kauri gully (Pacific/Auckland), Canyon rows (America/Los_Angeles). A farm whose clock has not reached the last day yet counts its latest reading there.",
    );
  });

  it('leaves out the second sentence when every farm has reached the last day', () => {
    expect(historyZoneNote([farm('A', 'Europe/Dublin', '2026-12-03'), farm('B', 'Europe/Lisbon', '2026-12-03')], '2026-12-03')).not.toMatch(/not reached/);
  });

  it('says nothing without farms', () => {
    expect(historyZoneNote([], '2026-12-03')).toBeNull();
    expect(historyZoneNote(undefined, undefined)).toBeNull();
  });
});

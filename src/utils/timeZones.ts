/** IANA time zones this browser knows, plus `extra` (a farm's stored zone) when the list lacks it. */
export function timeZoneOptions(extra?: string): string[] {
  let zones: string[] = [];
  try {
    zones = Intl.supportedValuesOf('timeZone');
  } catch {
    zones = [];
  }
  // Some engines leave UTC out of the list although every one accepts it.
  const wanted = ['UTC', browserTimeZone(), extra].filter((z): z is string => !!z);
  const out = [...zones];
  for (const zone of wanted) if (!out.includes(zone)) out.push(zone);
  return out;
}

/** The device's own time zone, e.g. "Europe/Lisbon"; "UTC" when unknown. */
export function browserTimeZone(): string {
  try {
    return Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC';
  } catch {
    return 'UTC';
  }
}

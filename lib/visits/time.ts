/**
 * Converts a wall-clock time in an IANA zone (from a datetime-local input) to a UTC instant. Strings that carry their
 * own offset or `Z` are taken as they are.
 */
export function zonedToUtc(local: string, timeZone: string): Date {
  if (/(Z|[+-]\d{2}:\d{2})$/.test(local)) return new Date(local);
  const asUtc = new Date(`${local.length === 16 ? `${local}:00` : local}Z`);
  // The zone's offset at that moment; a second pass settles times near a daylight-saving change.
  let guess = asUtc.getTime() - offsetMs(asUtc, timeZone);
  guess = asUtc.getTime() - offsetMs(new Date(guess), timeZone);
  return new Date(guess);
}

function offsetMs(instant: Date, timeZone: string): number {
  const parts = Object.fromEntries(
    new Intl.DateTimeFormat("en-US", { timeZone, hourCycle: "h23", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit" })
      .formatToParts(instant)
      .map((p) => [p.type, p.value]),
  );
  const wall = Date.UTC(+parts.year, +parts.month - 1, +parts.day, +parts.hour, +parts.minute, +parts.second);
  return wall - Math.floor(instant.getTime() / 1000) * 1000;
}

/** "Thursday 3 December 2026, 14:00 (Europe/London)" */
export function formatInZone(instant: Date, timeZone: string): string {
  const text = new Intl.DateTimeFormat("en-GB", { timeZone, weekday: "long", day: "numeric", month: "long", year: "numeric", hour: "2-digit", minute: "2-digit" }).format(instant);
  return `${text} (${timeZone})`;
}

/** The value a datetime-local input shows for an instant in a zone: "2026-12-03T14:00". */
export function toLocalInput(instant: Date, timeZone: string): string {
  const p = Object.fromEntries(
    new Intl.DateTimeFormat("en-CA", { timeZone, hourCycle: "h23", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit" })
      .formatToParts(instant)
      .map((x) => [x.type, x.value]),
  );
  return `${p.year}-${p.month}-${p.day}T${p.hour}:${p.minute}`;
}

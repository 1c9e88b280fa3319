// Where a permit's set-up stands, for the live sheet (/live): the application names one place in free
// text ("Room 1.05, Faraday Building"); the part after the last comma is read as the building and the
// rest as the room, so the sheet can be walked building by building. Text without a comma has no
// building. Pure: the page, the PDF and the tests use it.

export const NO_BUILDING = "Building not given";

export type Place = { building: string; room: string };

export function splitPlace(text: string): Place {
  const trimmed = text.trim();
  const comma = trimmed.lastIndexOf(",");
  if (comma <= 0 || comma === trimmed.length - 1) return { building: NO_BUILDING, room: trimmed || "Room not given" };
  return { building: trimmed.slice(comma + 1).trim(), room: trimmed.slice(0, comma).trim() };
}

// Numbers inside names sort by value ("Room 2" before "Room 10"), letters without regard to case, as
// a person reads door plates walking down a corridor.
const collator = new Intl.Collator("en", { numeric: true, sensitivity: "base" });

/**
 * The walking order: building by building (named buildings first, "Building not given" last), room by
 * room within a building, then the permit number so two set-ups in one room keep a stable order.
 */
export function walkOrder<T extends Place & { number: string }>(a: T, b: T): number {
  const aNone = a.building === NO_BUILDING;
  const bNone = b.building === NO_BUILDING;
  if (aNone !== bNone) return aNone ? 1 : -1;
  return (
    collator.compare(a.building, b.building) || collator.compare(a.room, b.room) || collator.compare(a.number, b.number)
  );
}

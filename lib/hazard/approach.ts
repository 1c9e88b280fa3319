// Shock approach boundaries from the NFPA 70E tables (hazard-references §6b), looked up for the
// highest voltage. The limited boundary is read from the "fixed part" column: bench apparatus has no
// movable overhead conductors. Nothing is extrapolated beyond the tables.

import { formatQuantity } from "./units";

export type ApproachSystem = "dc" | "ac";

type ApproachRow = {
  /** Highest nominal voltage of the row, V (inclusive). */
  upTo_V: number;
  label: string;
  limitedMovable_m: number;
  limitedFixed_m: number;
  /** null where the table says "avoid contact". */
  restricted_m: number | null;
  /** Whether the row was read in a retrieved text or is from memory (hazard-references §6b). */
  status: "found" | "memory";
};

type ApproachTable = { name: string; floor_V: number; rows: readonly ApproachRow[] };

/** NFPA 70E-2018 Table 130.4(E)(b), DC; metres. */
export const DC_APPROACH_TABLE: ApproachTable = {
  name: "NFPA 70E-2018 Table 130.4(E)(b) (DC)",
  floor_V: 100,
  rows: [
    {
      upTo_V: 300,
      label: "100–300 V",
      limitedMovable_m: 3.0,
      limitedFixed_m: 1.0,
      restricted_m: null,
      status: "memory",
    },
    {
      upTo_V: 1000,
      label: "301 V–1 kV",
      limitedMovable_m: 3.0,
      limitedFixed_m: 1.0,
      restricted_m: 0.3,
      status: "found",
    },
    {
      upTo_V: 5000,
      label: "1.1–5 kV",
      limitedMovable_m: 3.0,
      limitedFixed_m: 1.5,
      restricted_m: 0.5,
      status: "memory",
    },
    {
      upTo_V: 15_000,
      label: "5–15 kV",
      limitedMovable_m: 3.0,
      limitedFixed_m: 1.5,
      restricted_m: 0.7,
      status: "memory",
    },
    {
      upTo_V: 45_000,
      label: "15.1–45 kV",
      limitedMovable_m: 3.0,
      limitedFixed_m: 2.5,
      restricted_m: 0.8,
      status: "memory",
    },
    {
      upTo_V: 75_000,
      label: "45.1–75 kV",
      limitedMovable_m: 3.0,
      limitedFixed_m: 2.5,
      restricted_m: 1.0,
      status: "memory",
    },
    {
      upTo_V: 150_000,
      label: "75.1–150 kV",
      limitedMovable_m: 3.3,
      limitedFixed_m: 3.0,
      restricted_m: 1.2,
      status: "memory",
    },
  ],
};

/** NFPA 70E-2018 Table 130.4(E)(a), AC phase to phase; metres. */
export const AC_APPROACH_TABLE: ApproachTable = {
  name: "NFPA 70E-2018 Table 130.4(E)(a) (AC)",
  floor_V: 50,
  rows: [
    {
      upTo_V: 150,
      label: "50–150 V",
      limitedMovable_m: 3.0,
      limitedFixed_m: 1.0,
      restricted_m: null,
      status: "memory",
    },
    { upTo_V: 750, label: "151–750 V", limitedMovable_m: 3.0, limitedFixed_m: 1.0, restricted_m: 0.3, status: "found" },
    {
      upTo_V: 15_000,
      label: "751 V–15 kV",
      limitedMovable_m: 3.0,
      limitedFixed_m: 1.5,
      restricted_m: 0.7,
      status: "found",
    },
    {
      upTo_V: 36_000,
      label: "15.1–36 kV",
      limitedMovable_m: 3.0,
      limitedFixed_m: 1.8,
      restricted_m: 0.8,
      status: "found",
    },
  ],
};

export type ApproachLookup = {
  limited_m: number | null;
  restricted_m: number | null;
  /** The row used; null below the table. */
  row: string | null;
  /** Upper voltage of the row used, V; null below the table. */
  rowUpTo_V: number | null;
  avoidContact: boolean;
  beyondTable: boolean;
  note: string;
  source: string;
};

/** A voltage exactly at a row's upper end belongs to that row; the margin absorbs rounding. */
const ROUNDING = 1e-9;

/** Limited (fixed-part column) and restricted approach distances for a voltage; DC volts or AC rms. */
export function approachDistances(voltage_V: number, system: ApproachSystem): ApproachLookup {
  const table = system === "dc" ? DC_APPROACH_TABLE : AC_APPROACH_TABLE;
  const shown = `${formatQuantity(voltage_V, "V")}${system === "ac" ? " rms" : " DC"}`;
  if (!(voltage_V >= table.floor_V * (1 - ROUNDING))) {
    return {
      limited_m: null,
      restricted_m: null,
      row: null,
      rowUpTo_V: null,
      avoidContact: false,
      beyondTable: false,
      note: `${shown} is below ${formatQuantity(table.floor_V, "V")}: ${table.name} specifies no approach boundary.`,
      source: `${table.name} (hazard-references §6b)`,
    };
  }
  const last = table.rows[table.rows.length - 1];
  const match = table.rows.find((row) => voltage_V <= row.upTo_V * (1 + ROUNDING));
  const row = match ?? last;
  const beyondTable = match === undefined;
  const avoidContact = row.restricted_m === null;
  const parts = [
    `${table.name}, row ${row.label}: limited approach ${formatQuantity(row.limitedFixed_m, "m")} ` +
      `(fixed-part column; ${formatQuantity(row.limitedMovable_m, "m")} for a movable conductor)`,
    avoidContact
      ? "restricted approach: the table says avoid contact (given as 0 m)"
      : `restricted approach ${formatQuantity(row.restricted_m ?? 0, "m")}`,
  ];
  if (beyondTable) {
    parts.push(
      `${shown} is above the table's last row (${formatQuantity(last.upTo_V, "V")}); that row is shown and nothing is ` +
        "extrapolated: a qualified person must set the distances",
    );
  }
  return {
    limited_m: row.limitedFixed_m,
    restricted_m: row.restricted_m ?? 0,
    row: row.label,
    rowUpTo_V: row.upTo_V,
    avoidContact,
    beyondTable,
    note: `${parts.join("; ")}.`,
    source: `${table.name}, this row ${row.status === "found" ? "found in a retrieved text" : "from memory"} (hazard-references §6b)`,
  };
}

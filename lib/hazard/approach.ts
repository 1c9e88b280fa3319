// Shock approach boundaries from the NFPA 70E tables, looked up for the highest voltage. The limited
// boundary is read from the "fixed part" column: bench apparatus has no movable overhead conductors.
// Nothing is extrapolated beyond the tables: above the last row the distances are null.

import { citation } from "./references";
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
  /** Whether the row was read in a reproduction of the table or is from memory. */
  status: "found" | "memory";
};

type ApproachTable = { name: string; ref: string; floor_V: number; rows: readonly ApproachRow[] };

const row = (
  upTo_V: number,
  label: string,
  limitedMovable_m: number,
  limitedFixed_m: number,
  restricted_m: number | null,
  status: "found" | "memory",
): ApproachRow => ({ upTo_V, label, limitedMovable_m, limitedFixed_m, restricted_m, status });

/** NFPA 70E-2018 Table 130.4(E)(b), DC, to its last published row (800 kV); metres. */
export const DC_APPROACH_TABLE: ApproachTable = {
  name: "NFPA 70E-2018 Table 130.4(E)(b) (DC)",
  ref: "nfpa-70e-130-4-e-b",
  floor_V: 100,
  rows: [
    row(300, "100–300 V", 3.0, 1.0, null, "memory"),
    row(1000, "301 V–1 kV", 3.0, 1.0, 0.3, "found"),
    row(5000, "1.1–5 kV", 3.0, 1.5, 0.5, "memory"),
    row(15000, "5–15 kV", 3.0, 1.5, 0.7, "memory"),
    row(45000, "15.1–45 kV", 3.0, 2.5, 0.8, "memory"),
    row(75000, "45.1–75 kV", 3.0, 2.5, 1.0, "memory"),
    row(150000, "75.1–150 kV", 3.3, 3.0, 1.2, "memory"),
    row(250000, "150.1–250 kV", 3.6, 3.6, 1.6, "memory"),
    row(500000, "250.1–500 kV", 6.0, 6.0, 3.5, "memory"),
    row(800000, "500.1–800 kV", 8.0, 8.0, 5.0, "memory"),
  ],
};

/**
 * NFPA 70E-2018 Table 130.4(E)(a), AC phase to phase, to its last published row (800 kV); metres.
 * The table skips voltages between its rows (e.g. 121–138 kV); such a voltage takes the next row up.
 */
export const AC_APPROACH_TABLE: ApproachTable = {
  name: "NFPA 70E-2018 Table 130.4(E)(a) (AC)",
  ref: "nfpa-70e-130-4-e-a",
  floor_V: 50,
  rows: [
    row(150, "50–150 V", 3.0, 1.0, null, "memory"),
    row(750, "151–750 V", 3.0, 1.0, 0.3, "found"),
    row(15000, "751 V–15 kV", 3.0, 1.5, 0.7, "found"),
    row(36000, "15.1–36 kV", 3.0, 1.8, 0.8, "found"),
    row(46000, "36.1–46 kV", 3.0, 2.5, 0.8, "found"),
    row(72500, "46.1–72.5 kV", 3.0, 2.5, 1.0, "found"),
    row(121000, "72.6–121 kV", 3.3, 2.5, 1.0, "found"),
    row(145000, "138–145 kV", 3.4, 3.0, 1.2, "found"),
    row(169000, "161–169 kV", 3.6, 3.6, 1.3, "found"),
    row(242000, "230–242 kV", 4.0, 4.0, 1.7, "found"),
    row(362000, "345–362 kV", 4.7, 4.7, 2.8, "found"),
    row(550000, "500–550 kV", 5.8, 5.8, 3.6, "found"),
    row(800000, "765–800 kV", 7.2, 7.2, 4.9, "memory"),
  ],
};

export type ApproachLookup = {
  limited_m: number | null;
  restricted_m: number | null;
  /** The row used; null below the table. */
  row: string | null;
  /** Upper voltage of the row used (beyond the table: of its last row), V; null below the table. */
  rowUpTo_V: number | null;
  avoidContact: boolean;
  beyondTable: boolean;
  note: string;
  source: string;
  ref: string;
};

/** A voltage exactly at a row's upper end belongs to that row; the margin absorbs rounding. */
const ROUNDING = 1e-9;

const rowStatus = (status: "found" | "memory") =>
  status === "found" ? "this row read in a reproduction of the table" : "this row from memory";

/** Limited (fixed-part column) and restricted approach distances for a voltage; DC volts or AC rms. */
export function approachDistances(voltage_V: number, system: ApproachSystem): ApproachLookup {
  const table = system === "dc" ? DC_APPROACH_TABLE : AC_APPROACH_TABLE;
  const shown = `${formatQuantity(voltage_V, "V")}${system === "ac" ? " rms" : " DC"}`;
  const source = `${citation(table.ref)}`;
  if (!(voltage_V >= table.floor_V * (1 - ROUNDING))) {
    return {
      limited_m: null,
      restricted_m: null,
      row: null,
      rowUpTo_V: null,
      avoidContact: false,
      beyondTable: false,
      note: `${shown} is below ${formatQuantity(table.floor_V, "V")}: ${table.name} specifies no approach boundary.`,
      source,
      ref: table.ref,
    };
  }
  const last = table.rows[table.rows.length - 1];
  const row = table.rows.find((candidate) => voltage_V <= candidate.upTo_V * (1 + ROUNDING));
  if (!row) {
    // v1 returned the last row's smaller distances here, which understates: nothing is extrapolated.
    return {
      limited_m: null,
      restricted_m: null,
      row: null,
      rowUpTo_V: last.upTo_V,
      avoidContact: false,
      beyondTable: true,
      note:
        `${shown} is above ${table.name}'s last row (${last.label}): beyond the published table: a qualified person ` +
        "sets the distance.",
      source,
      ref: table.ref,
    };
  }
  const avoidContact = row.restricted_m === null;
  const parts = [
    `${table.name}, row ${row.label}: limited approach ${formatQuantity(row.limitedFixed_m, "m")} ` +
      `(fixed-part column; ${formatQuantity(row.limitedMovable_m, "m")} for a movable conductor)`,
    avoidContact
      ? "restricted approach: the table says avoid contact (given as 0 m)"
      : `restricted approach ${formatQuantity(row.restricted_m ?? 0, "m")}`,
    rowStatus(row.status),
  ];
  return {
    limited_m: row.limitedFixed_m,
    restricted_m: row.restricted_m ?? 0,
    row: row.label,
    rowUpTo_V: row.upTo_V,
    avoidContact,
    beyondTable: false,
    note: `${parts.join("; ")}.`,
    source,
    ref: table.ref,
  };
}

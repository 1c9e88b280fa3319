// Reading and writing quantities the way people type them on a bench sheet ("4.7 nF", "30 kV",
// "2 MΩ") and the way Benchclear shows them (three significant digits, SI prefixes). Hand-written so
// the browser bundle stays small; the tests check every prefix and conversion against a units library.

export type Dimension =
  | "capacitance"
  | "voltage"
  | "resistance"
  | "length"
  | "temperature"
  | "pressure"
  | "current"
  | "frequency"
  | "energy"
  | "charge"
  | "time"
  | "power"
  | "specific energy";

/** The unit a bare number means, and the unit parseQuantity returns. Temperature is in °C because
 * the engine's fields are (`temperature_C`). */
export const BASE_UNIT: Readonly<Record<Dimension, string>> = {
  capacitance: "F",
  voltage: "V",
  resistance: "Ω",
  length: "m",
  temperature: "°C",
  pressure: "Pa",
  current: "A",
  frequency: "Hz",
  energy: "J",
  charge: "C",
  time: "s",
  power: "W",
  // The action integral ∫i²dt of IEC 60479-2; a prefix on it would be misread, so it takes none.
  "specific energy": "A\u00b2s",
};

const EXAMPLE: Readonly<Record<Dimension, string>> = {
  capacitance: "4.7 nF",
  voltage: "30 kV",
  resistance: "2 MΩ",
  length: "15 mm",
  temperature: "20 °C",
  pressure: "101.3 kPa",
  current: "5 mA",
  frequency: "50 Hz",
  energy: "3 J",
  charge: "45 µC",
  time: "5 s",
  power: "1 kW",
  "specific energy": "0.0025 A²s",
};

/** SI prefixes as powers of ten. "u" stands in for µ where the keyboard has none; the micro sign
 * (U+00B5) and the Greek mu (U+03BC) look alike and both occur. */
const PREFIX_POWER: Readonly<Record<string, number>> = {
  f: -15,
  p: -12,
  n: -9,
  u: -6,
  "\u00b5": -6,
  "\u03bc": -6,
  m: -3,
  k: 3,
  M: 6,
  G: 9,
  T: 12,
};

type UnitDef = {
  dimension: Dimension;
  /** Power of ten to the base unit, kept apart from `scale` so decimal input stays exactly rounded. */
  pow10: number;
  scale: number;
  offset: number;
};

const unit = (dimension: Dimension, pow10 = 0, scale = 1, offset = 0): UnitDef => ({
  dimension,
  pow10,
  scale,
  offset,
});

/** Units that take an SI prefix. "C" here is the coulomb; as a temperature it is listed below. */
const PREFIXABLE: Readonly<Record<string, UnitDef>> = {
  F: unit("capacitance"),
  V: unit("voltage"),
  "\u03a9": unit("resistance"), // Greek capital omega
  "\u2126": unit("resistance"), // ohm sign
  ohm: unit("resistance"),
  ohms: unit("resistance"),
  Ohm: unit("resistance"),
  Ohms: unit("resistance"),
  m: unit("length"),
  Pa: unit("pressure"),
  A: unit("current"),
  Hz: unit("frequency"),
  J: unit("energy"),
  C: unit("charge"),
  s: unit("time"),
  W: unit("power"),
};

// One standard atmosphere is 101325 Pa exactly and the torr is 1/760 of it; the conventional
// millimetre of mercury is 133.322387415 Pa; the pound-force per square inch is 6894.757293168 Pa.
const STANDARD_ATMOSPHERE_PA = 101325;

/** Whole units that take no prefix (or whose prefix is irregular, like cm and hPa). */
const PLAIN: Readonly<Record<string, UnitDef[]>> = {
  cm: [unit("length", -2)],
  in: [unit("length", 0, 0.0254)],
  inch: [unit("length", 0, 0.0254)],
  ft: [unit("length", 0, 0.3048)],
  hPa: [unit("pressure", 2)],
  mbar: [unit("pressure", 2)],
  bar: [unit("pressure", 5)],
  atm: [unit("pressure", 0, STANDARD_ATMOSPHERE_PA)],
  Torr: [unit("pressure", 0, STANDARD_ATMOSPHERE_PA / 760)],
  torr: [unit("pressure", 0, STANDARD_ATMOSPHERE_PA / 760)],
  mmHg: [unit("pressure", 0, 133.322387415)],
  psi: [unit("pressure", 0, 6894.757293168)],
  min: [unit("time", 0, 60)],
  h: [unit("time", 0, 3600)],
  "A\u00b2s": [unit("specific energy")],
  A2s: [unit("specific energy")],
  "A^2s": [unit("specific energy")],
  "A^2 s": [unit("specific energy")],
  megohm: [unit("resistance", 6)],
  megohms: [unit("resistance", 6)],
  "\u00b0C": [unit("temperature")],
  "\u00baC": [unit("temperature")], // masculine ordinal, often typed for the degree sign
  "\u2103": [unit("temperature")], // degree Celsius sign
  degC: [unit("temperature")],
  C: [unit("temperature")],
  K: [unit("temperature", 0, 1, -273.15)],
};

/** Spellings refused because people mean two different things by them. */
const AMBIGUOUS: Readonly<Record<string, string>> = {
  mohm: "write mΩ for milliohm or MΩ (or Mohm) for megaohm",
  mohms: "write mΩ for milliohm or MΩ (or Mohm) for megaohm",
  mOhm: "write mΩ for milliohm or MΩ (or MOhm) for megaohm",
  mOhms: "write mΩ for milliohm or MΩ (or MOhm) for megaohm",
  MF: "old capacitor labels use MF for microfarad; write µF or uF",
  MFD: "old capacitor labels use MFD for microfarad; write µF or uF",
  mfd: "old capacitor labels use mfd for microfarad; write µF or uF",
  Mfd: "old capacitor labels use Mfd for microfarad; write µF or uF",
};

/** Lower-case spellings with two readings: never read leniently. */
const LOWER_AMBIGUOUS: ReadonlyMap<string, string> = new Map([
  ["mf", "millifarad (mF) or, on old labels, microfarad (µF)"],
  ["mfd", "microfarad on old labels"],
  ["mohm", "milliohm (mΩ) or megaohm (MΩ)"],
  ["mohms", "milliohm (mΩ) or megaohm (MΩ)"],
  ["mv", "millivolt (mV) or megavolt (MV)"],
  ["ma", "milliampere (mA) or megaampere (MA)"],
]);

/** Spellings offered when a unit is not recognised but matches one of these ignoring case. */
const COMMON_SPELLINGS: Readonly<Record<Dimension, readonly string[]>> = {
  capacitance: ["pF", "nF", "µF", "uF", "mF", "F"],
  voltage: ["mV", "V", "kV", "MV"],
  resistance: ["mΩ", "Ω", "kΩ", "MΩ", "GΩ", "ohm", "kohm", "Mohm", "Gohm"],
  length: ["µm", "mm", "cm", "m", "km", "in", "ft"],
  temperature: ["°C", "C", "K"],
  pressure: ["Pa", "hPa", "kPa", "MPa", "mbar", "bar", "Torr", "mmHg", "atm", "psi"],
  current: ["nA", "µA", "uA", "mA", "A", "kA"],
  frequency: ["Hz", "kHz", "MHz", "GHz"],
  energy: ["µJ", "mJ", "J", "kJ", "MJ"],
  charge: ["pC", "nC", "µC", "uC", "mC", "C"],
  time: ["ns", "µs", "us", "ms", "s", "min", "h"],
  power: ["mW", "W", "kW", "MW"],
  "specific energy": ["A²s", "A2s"],
};

export type QuantityErrorCode =
  "empty" | "not-a-number" | "unknown-unit" | "ambiguous-unit" | "wrong-dimension" | "out-of-range";

export type QuantityParseError = {
  code: QuantityErrorCode;
  message: string;
  dimension: Dimension;
  /** The base unit the field expects, e.g. "F". */
  expectedUnit: string;
};

export type ParseQuantityResult = { ok: true; value: number } | { ok: false; error: QuantityParseError };

// Sign (ASCII or the typographic minus U+2212), digits with an optional point, optional exponent,
// then whatever is left is the unit.
const NUMBER_AND_UNIT = /^([+\-\u2212]?)(\d+(?:\.\d*)?|\.\d+)(?:[eE]([+\-\u2212]?\d+))?\s*(.*)$/s;

function interpretations(symbol: string): UnitDef[] {
  const found: UnitDef[] = [...(PLAIN[symbol] ?? [])];
  const whole = PREFIXABLE[symbol];
  if (whole) found.push(whole);
  // Prefixes are one character; the micro sign and the Greek mu are single UTF-16 units too.
  const prefix = symbol.charAt(0);
  const rest = symbol.slice(1);
  const base = PREFIXABLE[rest];
  if (rest && base && PREFIX_POWER[prefix] !== undefined) {
    found.push({ ...base, pow10: base.pow10 + PREFIX_POWER[prefix] });
  }
  return found;
}

function fail(code: QuantityErrorCode, dimension: Dimension, message: string): ParseQuantityResult {
  return { ok: false, error: { code, message, dimension, expectedUnit: BASE_UNIT[dimension] } };
}

/**
 * Reads "4.7 nF", "4.7nF", "30 kV", "2 MΩ", "2 Mohm", "0.5 µF", "1.5e-9 F", "20 °C", "760 Torr" into a
 * number in the SI base unit of `expected` (°C for temperature). A bare number means that base unit.
 * Refuses a unit of another dimension ("30 kV" for a capacitance), unknown or ambiguous spellings
 * ("MF", "mohm"), decimal commas (1,000 could be a thousand or one) and non-finite numbers.
 */
export function parseQuantity(text: string, expected: Dimension): ParseQuantityResult {
  // Digits grouped by three with spaces ("1 000 pF", also thin and no-break spaces) have one meaning.
  const trimmed = text
    .trim()
    .replace(
      /^([+\-\u2212]?\d{1,3})((?:[ \u00a0\u2009\u202f]\d{3})+)(?=\D|$)/,
      (_m, head: string, groups: string) => head + groups.replace(/[ \u00a0\u2009\u202f]/g, ""),
    );
  const unitName = BASE_UNIT[expected];
  if (!trimmed) return fail("empty", expected, `Enter a ${expected}, e.g. ${EXAMPLE[expected]}.`);
  if (trimmed.includes(",")) {
    return fail(
      "not-a-number",
      expected,
      `Use a point for decimals and no thousands separator, e.g. ${EXAMPLE[expected]}.`,
    );
  }
  const match = NUMBER_AND_UNIT.exec(trimmed);
  if (!match) {
    return fail(
      "not-a-number",
      expected,
      `"${trimmed}" does not start with a number; write e.g. ${EXAMPLE[expected]}.`,
    );
  }
  const [, signText, digits, exponentText, rawSymbol] = match;
  const sign = signText === "-" || signText === "\u2212" ? "-" : "";
  const exponent = exponentText ? Number(exponentText.replace("\u2212", "-")) : 0;
  const symbol = rawSymbol.trim();

  let def: UnitDef;
  if (symbol === "") {
    def = unit(expected);
  } else {
    const ambiguity = AMBIGUOUS[symbol];
    if (ambiguity) return fail("ambiguous-unit", expected, `"${symbol}" is ambiguous: ${ambiguity}.`);
    const options = interpretations(symbol);
    const fitting = options.find((option) => option.dimension === expected);
    if (!fitting) {
      if (options.length > 0) {
        return fail(
          "wrong-dimension",
          expected,
          `"${symbol}" is a unit of ${options[0].dimension}; this field needs a ${expected} in ${unitName} (e.g. ${EXAMPLE[expected]}).`,
        );
      }
      const lower = symbol.toLowerCase();
      const close = COMMON_SPELLINGS[expected].filter((s) => s.toLowerCase() === lower);
      // Typed in the wrong case ("4.7nf", "40kv", "40 KV"): read it when only one spelling of this
      // field's units matches; "mf", "mohm" and the like mean two things and are refused.
      const lenient = close.length === 1 && !LOWER_AMBIGUOUS.has(lower) ? interpretations(close[0]) : [];
      const read = lenient.find((option) => option.dimension === expected);
      if (read) {
        def = read;
      } else {
        const hint = close.length > 0 ? ` Did you mean ${close.join(" or ")}?` : "";
        const why = LOWER_AMBIGUOUS.has(lower) ? ` "${symbol}" could mean ${LOWER_AMBIGUOUS.get(lower)}.` : "";
        return fail(
          "unknown-unit",
          expected,
          `Unknown unit "${symbol}"; this field needs a ${expected} in ${unitName} (e.g. ${EXAMPLE[expected]}).${why}${hint}`,
        );
      }
    } else {
      def = fitting;
    }
  }

  // Building the decimal string with the combined exponent lets the runtime round once, so "4.7 nF"
  // is exactly the double nearest 4.7e-9 rather than 4.7 × 1e-9 with two roundings.
  const scaled = Number(`${sign}${digits}e${exponent + def.pow10}`);
  const value = def.scale === 1 && def.offset === 0 ? scaled : scaled * def.scale + def.offset;
  if (!Number.isFinite(value)) {
    return fail("out-of-range", expected, `"${trimmed}" is too large to be a ${expected}.`);
  }
  // Absolute zero is −273.15 °C; no reading below it is a temperature.
  if (expected === "temperature" && value < -273.15) {
    return fail("out-of-range", expected, `"${trimmed}" is below absolute zero (−273.15 °C).`);
  }
  return { ok: true, value };
}

const FORMAT_PREFIXES: ReadonlyArray<{ symbol: string; power: number }> = [
  { symbol: "f", power: -15 },
  { symbol: "p", power: -12 },
  { symbol: "n", power: -9 },
  { symbol: "\u00b5", power: -6 },
  { symbol: "m", power: -3 },
  { symbol: "", power: 0 },
  { symbol: "k", power: 3 },
  { symbol: "M", power: 6 },
  { symbol: "G", power: 9 },
  { symbol: "T", power: 12 },
];

/** Units shown without a prefix (a prefix on °C or A²s would be misread). */
const NO_PREFIX_UNITS = new Set(["\u00b0C", "%", "A\u00b2s", "1", ""]);

/** Significant digits as text without exponent notation (toPrecision switches to it for large
 * mantissas when fewer digits than the integer part are asked for). */
function significant(value: number, sigDigits: number): string {
  const text = value.toPrecision(sigDigits);
  return text.includes("e") ? String(Number(text)) : text;
}

export type SIParts = { mantissa: string; prefix: string; power: number };

/**
 * Splits a value into a mantissa in [1, 1000) with `sigDigits` significant digits and an SI prefix
 * (femto to tera; outside that range the mantissa grows or shrinks instead).
 */
export function siParts(value: number, sigDigits = 3): SIParts {
  if (!Number.isFinite(value)) return { mantissa: String(value), prefix: "", power: 0 };
  if (value === 0) return { mantissa: "0", prefix: "", power: 0 };
  const sign = value < 0 ? "-" : "";
  const magnitude = Math.abs(value);
  const first = FORMAT_PREFIXES[0].power;
  const last = FORMAT_PREFIXES[FORMAT_PREFIXES.length - 1].power;
  let power = Math.floor(Math.log10(magnitude) / 3) * 3;
  power = Math.min(last, Math.max(first, power));
  let mantissa = magnitude / 10 ** power;
  // log10 can land a hair below an exact power of ten; step down when the mantissa fell under 1.
  if (mantissa < 1 && power > first) {
    power -= 3;
    mantissa = magnitude / 10 ** power;
  }
  let text = significant(mantissa, sigDigits);
  // Rounding 999.7 to three digits gives 1000: move to the next prefix.
  if (Number(text) >= 1000 && power < last) {
    power += 3;
    text = significant(magnitude / 10 ** power, sigDigits);
  }
  const prefix = FORMAT_PREFIXES.find((p) => p.power === power)?.symbol ?? "";
  return { mantissa: sign + text, prefix, power };
}

/** A number with `sigDigits` significant digits and no prefix; exponent notation outside
 * 0.001 to 999 999 so the text stays short. */
export function formatPlain(value: number, sigDigits = 3): string {
  if (!Number.isFinite(value)) return String(value);
  if (value === 0) return "0";
  const magnitude = Math.abs(value);
  if (magnitude >= 1e-3 && magnitude < 1e6) return significant(value, sigDigits);
  return value.toExponential(Math.max(0, sigDigits - 1));
}

function canonicalUnit(unitName: string): string {
  if (unitName === "ohm" || unitName === "\u2126") return "\u03a9";
  if (unitName === "A2s" || unitName === "A^2s" || unitName === "A^2 s") return "A\u00b2s";
  return unitName;
}

/**
 * Formats with SI prefixes and `sigDigits` significant digits: formatSI(4.7e-9, "F") → "4.70 nF".
 * Seconds of 1000 or more are shown in minutes, then hours, which people read more easily than ks.
 */
export function formatSI(value: number, unitName: string, sigDigits = 3): string {
  const shown = canonicalUnit(unitName);
  if (!Number.isFinite(value)) return "—";
  if (NO_PREFIX_UNITS.has(shown))
    return shown ? `${formatPlain(value, sigDigits)} ${shown}` : formatPlain(value, sigDigits);
  if (shown === "s" && Math.abs(value) >= 1000) {
    // 60 s per minute up to the hour (3600 s), then hours.
    if (Math.abs(value) < 3600) return `${significant(value / 60, sigDigits)} min`;
    return `${formatPlain(value / 3600, sigDigits)} h`;
  }
  const parts = siParts(value, sigDigits);
  return `${parts.mantissa} ${parts.prefix}${shown}`;
}

/** The product's figure format: three significant digits with an SI prefix ("25.0 kV", "500 Ω"). */
export function formatQuantity(value: number, unitName: string): string {
  return formatSI(value, unitName, 3);
}

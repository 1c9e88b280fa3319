import { z } from "zod";
import { HazardInputError, INPUT_LIMITS, MAX_GAP_SPACING_M, validateSetupInput, type SetupInput } from "@/lib/hazard";

// The set-up an instructor describes (energy sources and spark gaps), as the API and the forms
// receive it. Mirrors SetupInput of lib/hazard field for field; unknown fields are refused so a
// mistyped optional field (a bleeder, a rating) is never silently ignored. After the shape passes,
// the engine's own input check runs, so POST /api/assess refuses with 422 exactly what the engine
// would refuse, each issue naming its field path (e.g. sources[0].capacitance_F).

const L = INPUT_LIMITS;

/** A bench set-up with more than 200 sources or 50 gaps is a data error, not apparatus. */
export const MAX_SOURCES = 200;
export const MAX_GAPS = 50;

const positive = (what: string, max: number) =>
  z
    .number({ error: `Enter ${what} as a number.` })
    .positive({ error: `The ${what} must be above zero.` })
    .max(max, { error: `The ${what} must be at most ${max}.` });

const nonNegative = (what: string, max: number) =>
  z
    .number({ error: `Enter ${what} as a number.` })
    .min(0, { error: `The ${what} must not be negative.` })
    .max(max, { error: `The ${what} must be at most ${max}.` });

const id = z.string().max(200, { error: "Use at most 200 characters." }).optional();

export const capacitorSourceSchema = z.strictObject({
  id,
  kind: z.literal("capacitor"),
  capacitance_F: positive("capacitance in farads", L.capacitance_F),
  voltage_V: positive("voltage in volts", L.voltage_V),
  count: z
    .number({ error: "Enter the number of capacitors." })
    .int({ error: "The number of capacitors must be a whole number." })
    .min(1, { error: "A bank has at least one capacitor." })
    .max(L.count, { error: `A bank has at most ${L.count} capacitors.` })
    .optional(),
  arrangement: z.enum(["parallel", "series"], { error: 'Choose "parallel" or "series".' }).optional(),
  ratedVoltage_V: positive("rated voltage in volts", L.voltage_V).optional(),
  bleeder_ohm: positive("bleeder resistance in ohms", L.resistance_ohm).optional(),
  seriesResistance_ohm: nonNegative("series resistance in ohms", L.resistance_ohm).optional(),
});

export const customCapacitanceSourceSchema = z.strictObject({
  id,
  kind: z.literal("custom-capacitance"),
  capacitance_F: positive("capacitance in farads", L.capacitance_F),
  voltage_V: positive("voltage in volts", L.voltage_V),
  bleeder_ohm: positive("bleeder resistance in ohms", L.resistance_ohm).optional(),
});

export const sphereTerminalSourceSchema = z.strictObject({
  id,
  kind: z.literal("sphere-terminal"),
  radius_m: positive("radius in metres", L.radius_m),
  voltage_V: positive("voltage in volts", L.voltage_V).optional(),
});

export const dcSupplySourceSchema = z.strictObject({
  id,
  kind: z.literal("dc-supply"),
  voltage_V: positive("voltage in volts", L.voltage_V),
  currentLimit_A: positive("current limit in amperes", L.current_A),
  seriesResistance_ohm: nonNegative("series resistance in ohms", L.resistance_ohm).optional(),
  outputCapacitance_F: positive("output capacitance in farads", L.capacitance_F).optional(),
});

export const acSupplySourceSchema = z.strictObject({
  id,
  kind: z.literal("ac-supply"),
  voltageRms_V: positive("rms voltage in volts", L.voltage_V),
  frequency_Hz: positive("frequency in hertz", L.frequency_Hz),
  currentLimit_A: positive("current limit in amperes", L.current_A),
});

export const energySourceSchema = z.discriminatedUnion(
  "kind",
  [
    capacitorSourceSchema,
    customCapacitanceSourceSchema,
    sphereTerminalSourceSchema,
    dcSupplySourceSchema,
    acSupplySourceSchema,
  ],
  { error: "Choose a source kind: capacitor, custom-capacitance, sphere-terminal, dc-supply or ac-supply." },
);

const across = z
  .array(z.string({ error: "Name a source by its id." }).max(200, { error: "Use at most 200 characters." }), {
    error: "List the ids of the sources it is connected across.",
  })
  .max(MAX_SOURCES, { error: `Name at most ${MAX_SOURCES} sources.` });

export const sparkGapSchema = z.strictObject({
  id,
  // Which sources the gap is connected across (v2); checked against the source ids by the engine.
  across: across.optional(),
  // Spheres above 10 m across are not apparatus.
  sphereDiameter_m: positive("sphere diameter in metres", 10),
  spacing_m: positive("gap spacing in metres", MAX_GAP_SPACING_M),
  // 10 MPa is about 100 atmospheres, beyond any pressurised bench gap.
  pressure_Pa: positive("air pressure in pascals", 1e7).optional(),
  // Absolute zero is −273.15 °C; air above 1000 °C is not the air the breakdown data describe.
  temperature_C: z
    .number({ error: "Enter the air temperature in °C as a number." })
    .gt(-273.15, { error: "The temperature must be above −273.15 °C." })
    .max(1000, { error: "The temperature must be at most 1000 °C." })
    .optional(),
});

const setupShape = z.strictObject({
  sources: z
    .array(energySourceSchema, { error: "List the energy sources." })
    .min(1, { error: "Add at least one energy source." })
    .max(MAX_SOURCES, { error: `Use at most ${MAX_SOURCES} energy sources.` }),
  gaps: z
    .array(sparkGapSchema)
    .max(MAX_GAPS, { error: `Use at most ${MAX_GAPS} spark gaps.` })
    .optional(),
  bleeders: z
    .array(
      z.strictObject({
        id,
        resistance_ohm: positive("bleeder resistance in ohms", L.resistance_ohm),
        across,
      }),
    )
    .max(MAX_GAPS, { error: `Use at most ${MAX_GAPS} bleeders.` })
    .optional(),
  bodyResistance_ohm: z
    .number({ error: "Enter the body resistance in ohms as a number." })
    .min(L.bodyResistanceMin_ohm, { error: `The body resistance must be at least ${L.bodyResistanceMin_ohm} Ω.` })
    .max(L.bodyResistanceMax_ohm, { error: `The body resistance must be at most ${L.bodyResistanceMax_ohm} Ω.` })
    .optional(),
  vacuumDevice: z.boolean({ error: "Answer yes or no." }).optional(),
});

type SetupShape = z.output<typeof setupShape>;

/**
 * The set-up schema. The engine's check runs only once the shape is right (a piped stage), so each
 * problem is reported once: rules that span fields, such as a series bank needing two capacitors, a
 * sphere terminal needing a voltage or a gap, or a gap too small for either breakdown method.
 */
export const setupInputSchema = setupShape.pipe(
  z.custom<SetupShape>().superRefine((value, ctx) => {
    try {
      validateSetupInput(value);
    } catch (error) {
      if (!(error instanceof HazardInputError)) throw error;
      const message = `${error.problem.charAt(0).toUpperCase()}${error.problem.slice(1)}.`;
      ctx.addIssue({ code: "custom", path: error.path, message });
    }
  }),
);

export type SetupInputData = z.output<typeof setupInputSchema>;

/** Parsed data is a SetupInput; this conversion is checked by the compiler, not at run time. */
export function toSetupInput(data: SetupInputData): SetupInput {
  return data;
}

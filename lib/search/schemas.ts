import { z } from "zod";

// The search box's one field (GET /search and GET /api/search: ?q=…). Two characters at least: one
// character matches nearly everything and no index helps it; 100 at most: nothing searched is longer
// (a title is at most 160 characters, and a search for most of a title finds it by its start).

export const SEARCH_MIN_CHARS = 2;
export const SEARCH_MAX_CHARS = 100;

export const searchQuerySchema = z.object({
  q: z
    .string({ error: "Type something to search for." })
    .transform((text) => text.replace(/\s+/g, " ").trim())
    .pipe(
      z
        .string()
        .min(SEARCH_MIN_CHARS, `Type at least ${SEARCH_MIN_CHARS} characters.`)
        .max(SEARCH_MAX_CHARS, `Use at most ${SEARCH_MAX_CHARS} characters.`)
        // Control characters never occur in a name, number or room; refusing them keeps logs and pages clean.
        .refine(
          (text) => ![...text].some((c) => c.charCodeAt(0) < 0x20 || c.charCodeAt(0) === 0x7f),
          "Use letters, digits and punctuation only.",
        ),
    ),
});

export type SearchQuery = z.infer<typeof searchQuerySchema>;

import "server-only";
import { and, desc, eq } from "drizzle-orm";
import { cache } from "react";
import { db } from "@/db";
import { ruleSets, users } from "@/db/schema";
import type { DbOrTx } from "@/lib/audit";
import { DEFAULT_RULES, validateRules, type TierRules } from "@/lib/hazard";
import {
  BUILT_IN_CHAIN_VERSION,
  chainRulesSchema,
  DEFAULT_CHAIN_RULES,
  DEFAULT_REMINDER_RULES,
  reminderRulesSchema,
  type ChainRules,
  type ReminderRules,
  type RuleKind,
} from "./chain";

// Reads of the versioned rule sets. Version 0 of each kind is the built-in default, in force until
// an admin adopts version 1. A stored row was validated when it was adopted; one that no longer
// parses (a schema change) is logged and the default is used rather than trusting it.

export type VersionedRules<T> = { version: number; rules: T; adoptedAt: Date | null };

// Rule set rows never change after insert, so a version once read can be kept for the process's life.
const chainCache = new Map<number, ChainRules>();

function parseChain(version: number, raw: unknown): ChainRules {
  const parsed = chainRulesSchema.safeParse(raw);
  if (parsed.success) return parsed.data;
  console.error(`[rules] chain rule set v${version} is invalid; using the built-in defaults`);
  return DEFAULT_CHAIN_RULES;
}

async function newest(kind: RuleKind, tx: DbOrTx) {
  const [row] = await tx
    .select({ version: ruleSets.version, rules: ruleSets.rules, createdAt: ruleSets.createdAt })
    .from(ruleSets)
    .where(eq(ruleSets.kind, kind))
    .orderBy(desc(ruleSets.version))
    .limit(1);
  return row ?? null;
}

/** The chain rules new submissions follow. */
export async function currentChainRules(tx: DbOrTx = db): Promise<VersionedRules<ChainRules>> {
  const row = await newest("chain", tx);
  if (!row) return { version: BUILT_IN_CHAIN_VERSION, rules: DEFAULT_CHAIN_RULES, adoptedAt: null };
  const rules = chainCache.get(row.version) ?? parseChain(row.version, row.rules);
  chainCache.set(row.version, rules);
  return { version: row.version, rules, adoptedAt: row.createdAt };
}

/** The chain rules of the version an application was submitted under (null: the built-in ones). */
export async function chainRulesFor(version: number | null | undefined, tx: DbOrTx = db): Promise<ChainRules> {
  if (version === null || version === undefined || version === BUILT_IN_CHAIN_VERSION) return DEFAULT_CHAIN_RULES;
  const cached = chainCache.get(version);
  if (cached) return cached;
  const [row] = await tx
    .select({ rules: ruleSets.rules })
    .from(ruleSets)
    .where(and(eq(ruleSets.kind, "chain"), eq(ruleSets.version, version)))
    .limit(1);
  if (!row) {
    console.error(`[rules] chain rule set v${version} is missing; using the built-in defaults`);
    return DEFAULT_CHAIN_RULES;
  }
  const rules = parseChain(version, row.rules);
  chainCache.set(version, rules);
  return rules;
}

const allChainRulesOncePerRender = cache(() => readAllChainRules(db));

/**
 * Every chain rules version in use (the built-in one included), read once per page render (React's
 * cache(): the dashboard's queue card and oldest-wait line each asked); a read in a transaction, a
 * route handler or a job reads the table.
 */
export async function allChainRules(tx: DbOrTx = db): Promise<Map<number, ChainRules>> {
  return tx === db ? allChainRulesOncePerRender() : readAllChainRules(tx);
}

async function readAllChainRules(tx: DbOrTx): Promise<Map<number, ChainRules>> {
  const rows = await tx
    .select({ version: ruleSets.version, rules: ruleSets.rules })
    .from(ruleSets)
    .where(eq(ruleSets.kind, "chain"));
  const out = new Map<number, ChainRules>([[BUILT_IN_CHAIN_VERSION, DEFAULT_CHAIN_RULES]]);
  for (const row of rows) {
    const rules = chainCache.get(row.version) ?? parseChain(row.version, row.rules);
    chainCache.set(row.version, rules);
    out.set(row.version, rules);
  }
  return out;
}

/** The reminder schedule the reminder job follows: days before a permit expires (1 = its last valid day, 0 = the day after). */
export async function currentReminderRules(tx: DbOrTx = db): Promise<VersionedRules<ReminderRules>> {
  const row = await newest("reminders", tx);
  if (!row) return { version: 0, rules: DEFAULT_REMINDER_RULES, adoptedAt: null };
  const parsed = reminderRulesSchema.safeParse(row.rules);
  if (!parsed.success) {
    console.error(`[rules] reminder rule set v${row.version} is invalid; using the default schedule`);
    return { version: row.version, rules: DEFAULT_REMINDER_RULES, adoptedAt: row.createdAt };
  }
  return { version: row.version, rules: parsed.data, adoptedAt: row.createdAt };
}

/** The engine's tier thresholds in force (the same answer as lib/hazard-rules.ts, with the version). */
export async function currentTierRuleSet(tx: DbOrTx = db): Promise<VersionedRules<TierRules>> {
  const row = await newest("tier", tx);
  if (!row) return { version: 0, rules: DEFAULT_RULES, adoptedAt: null };
  try {
    validateRules(row.rules);
    return { version: row.version, rules: row.rules, adoptedAt: row.createdAt };
  } catch (error) {
    console.error(`[rules] tier rule set v${row.version} is invalid; using the defaults:`, error);
    return { version: row.version, rules: DEFAULT_RULES, adoptedAt: row.createdAt };
  }
}

export type RuleSetHistoryRow = {
  id: string;
  version: number;
  note: string;
  createdAt: Date;
  createdByName: string | null;
};

/** The adopted versions of one kind, newest first (the admin page's history). */
export async function listRuleSets(kind: RuleKind, limit = 20): Promise<RuleSetHistoryRow[]> {
  return db
    .select({
      id: ruleSets.id,
      version: ruleSets.version,
      note: ruleSets.note,
      createdAt: ruleSets.createdAt,
      createdByName: users.name,
    })
    .from(ruleSets)
    .leftJoin(users, eq(users.id, ruleSets.createdById))
    .where(eq(ruleSets.kind, kind))
    .orderBy(desc(ruleSets.version))
    .limit(limit);
}

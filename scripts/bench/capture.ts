// Reading the SQL a request ran back from PostgreSQL's statement log (log_statement = 'all', set on the
// benchmark database only while capturing). Each log entry starts with the default prefix
// "2026-12-02 02:50:00.123 UTC [1234] "; a statement may span lines; its parameters follow in a
// DETAIL entry of the same process.

export type Statement = { pid: number; text: string; params: (string | null)[] };

const ENTRY = /^\d{4}-\d\d-\d\d \d\d:\d\d:\d\d(?:\.\d+)? \S+ \[(\d+)\] (\w+):  ([\s\S]*)$/;

function splitEntries(log: string): { pid: number; level: string; message: string }[] {
  const out: { pid: number; level: string; message: string }[] = [];
  for (const line of log.split("\n")) {
    const m = ENTRY.exec(line);
    if (m) out.push({ pid: Number(m[1]), level: m[2], message: m[3] });
    else if (out.length) out[out.length - 1].message += "\n" + line;
  }
  for (const e of out) e.message = e.message.replace(/\n$/, "");
  return out;
}

/** Parses "$1 = 'a''b', $2 = NULL" (PostgreSQL's DETAIL line) into values. */
export function parseParameters(detail: string): (string | null)[] {
  const values: (string | null)[] = [];
  let i = 0;
  while (i < detail.length) {
    const m = /^\s*\$(\d+) = /.exec(detail.slice(i));
    if (!m) break;
    i += m[0].length;
    const index = Number(m[1]) - 1;
    if (detail.startsWith("NULL", i)) {
      values[index] = null;
      i += 4;
    } else if (detail[i] === "'") {
      let value = "";
      i++;
      for (;;) {
        const q = detail.indexOf("'", i);
        if (q < 0) throw new Error("unterminated parameter in the statement log");
        value += detail.slice(i, q);
        if (detail[q + 1] === "'") {
          value += "'";
          i = q + 2;
        } else {
          i = q + 1;
          break;
        }
      }
      values[index] = value;
    } else {
      throw new Error(`unexpected parameter text: ${detail.slice(i, i + 40)}`);
    }
    if (detail[i] === ",") i++;
  }
  return values;
}

/** The statements of the given server processes, in log order, with their parameters. */
export function statementsFromLog(log: string, pids?: Set<number>): Statement[] {
  const statements: Statement[] = [];
  const lastByPid = new Map<number, Statement>();
  for (const entry of splitEntries(log)) {
    if (pids && !pids.has(entry.pid)) continue;
    if (entry.level === "LOG") {
      const m = /^(?:statement|execute [^:]+): ([\s\S]*)$/.exec(entry.message);
      if (!m) continue;
      const statement: Statement = { pid: entry.pid, text: m[1], params: [] };
      statements.push(statement);
      lastByPid.set(entry.pid, statement);
    } else if (entry.level === "DETAIL") {
      const m = /^parameters: ([\s\S]*)$/.exec(entry.message);
      const last = lastByPid.get(entry.pid);
      if (m && last) last.params = parseParameters(m[1]);
    }
  }
  return statements;
}

// Lets a plain Node.js process (the worker and clock scripts, test child processes) load modules
// marked `import "server-only"`. That package throws unless the "react-server" export condition is
// set, which Next.js sets for its server bundles; running Node with that condition instead would
// also switch React to its server-components build, which cannot render e-mail bodies. So we
// resolve just "server-only" to an empty module. Import this first, then import the rest
// dynamically: static imports are resolved before any module code runs.
import { register } from "node:module";

const hook = `
export async function resolve(specifier, context, next) {
  if (specifier === "server-only") return { url: "data:text/javascript,", shortCircuit: true };
  return next(specifier, context);
}`;

register(`data:text/javascript,${encodeURIComponent(hook)}`);

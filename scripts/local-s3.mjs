// A local S3-compatible server (the s3rver package) standing in for a hosted object store in
// `npm run cluster` and the cluster tests: real S3 HTTP on 127.0.0.1, objects kept as files under a
// folder. The app reaches it through the real AWS SDK with path-style addressing.
// Environment: S3_LOCAL_PORT (default 4569), S3_LOCAL_DIR (default .data/s3), S3_BUCKET (default benchclear).
import fs from "node:fs";
import S3rver from "s3rver";

const port = Number(process.env.S3_LOCAL_PORT ?? 4569);
const directory = process.env.S3_LOCAL_DIR ?? ".data/s3";
const bucket = process.env.S3_BUCKET ?? "benchclear";
fs.mkdirSync(directory, { recursive: true });

const server = new S3rver({
  port,
  address: "127.0.0.1",
  silent: true,
  directory,
  configureBuckets: [{ name: bucket }],
});
await server.run();
console.log(`  local S3 store listening on 127.0.0.1:${port} (bucket ${bucket}) → ${directory}`);

const stop = async () => {
  await server.close().catch(() => undefined);
  process.exit(0);
};
process.on("SIGINT", stop);
process.on("SIGTERM", stop);

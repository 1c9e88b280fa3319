// Types for scripts/lib/cluster.mjs, for the TypeScript tests that start the local cluster.
import type { ChildProcess } from "node:child_process";

export type ClusterPorts = { lb: number; a: number; b: number; s3: number };
export type ServerName = "a" | "b";

export type Cluster = {
  url: string;
  appEnv: Record<string, string | undefined>;
  serverUrl(name: ServerName): string;
  server(name: ServerName): ChildProcess | undefined;
  startServer(name: ServerName): Promise<ChildProcess>;
  signalServer(name: ServerName, signal: NodeJS.Signals): Promise<void>;
  stop(): Promise<void>;
};

export const HAPROXY: string;
export function ensureHaproxy(): void;
export function haproxyConfig(options: { lbPort: number; servers: { name: string; port: number }[] }): string;
export function startCluster(options: {
  env: Record<string, string | undefined>;
  distDir?: string;
  dir: string;
  ports: ClusterPorts;
  bucket?: string;
  quiet?: boolean;
}): Promise<Cluster>;

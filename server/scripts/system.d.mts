// Types for system.mjs, which stays plain JavaScript because it runs before node_modules exists.
export const repoRoot: string;
export function log(msg: string): void;
export interface Cluster {
  dir: string;
  port: number;
  bin: string;
  stop(): void;
  url(db: string): string;
}
export function startCluster(opts: { dataDir: string; port: number; fresh?: boolean }): Promise<Cluster>;
export function ensureDatabase(cluster: Cluster, name: string): void;
export function stopClusterNow(cluster: Cluster): void;

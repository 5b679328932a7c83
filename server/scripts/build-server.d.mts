// Types for build-server.mjs (a plain script, run by npm run build:server).
export const serverBuildDir: string;
/** Bundles the server into `outdir` (dist-server/ by default); resolves to its main.mjs. */
export function buildServer(outdir?: string): Promise<string>;

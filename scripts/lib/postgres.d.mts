export function findPgBin(): string | null;
export function resolveDataDir(projectDir: string, name: string): string;
export function ensureCluster(pgBin: string, dataDir: string): boolean;
export function isRunning(pgBin: string, dataDir: string): boolean;
export function startCluster(pgBin: string, dataDir: string, port: number, opts?: { durable?: boolean }): boolean;
export function stopCluster(pgBin: string, dataDir: string): boolean;
export function ensureDatabase(port: number, name: string, opts?: { fresh?: boolean; password?: string }): boolean;
export function runPg(pgBin: string, tool: string, args: string[], opts?: { allowFail?: boolean; input?: string }): { status: number | null; stdout: string; stderr: string };
export function clusterPassword(file: string): { password: string; created: boolean };
export function secureCluster(
  pgBin: string,
  dataDir: string,
  passwordFile: string,
  opts?: { fresh?: boolean },
): "created" | "upgraded" | "password-set" | "unchanged";

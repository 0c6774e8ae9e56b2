export function findPgBin(): string | null;
export function resolveDataDir(projectDir: string, name: string): string;
export function ensureCluster(pgBin: string, dataDir: string): boolean;
export function isRunning(pgBin: string, dataDir: string): boolean;
export function startCluster(pgBin: string, dataDir: string, port: number): boolean;
export function stopCluster(pgBin: string, dataDir: string): boolean;
export function ensureDatabase(port: number, name: string, opts?: { fresh?: boolean }): boolean;
export function runPg(pgBin: string, tool: string, args: string[], opts?: { allowFail?: boolean }): { status: number | null };

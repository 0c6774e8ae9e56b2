export function aptInstall(packages: string[], log: (line: string) => void): void;

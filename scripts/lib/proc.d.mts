export const ROOT: string;
export function freePort(): Promise<number>;
export function buildServer(o?: { force?: boolean }): Promise<void>;

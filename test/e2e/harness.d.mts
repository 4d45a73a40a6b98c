import type { BrowserContext } from 'playwright-core';
export const ROOT: string;
export const CHROMIUM: string;
export function ensureChromium(): void;
export function buildApp(outDir?: string, buildId?: string): void;
export function freePort(): Promise<number>;
export function startPreview(opts?: { outDir?: string; port?: number }): Promise<{ origin: string; port: number; stop(): Promise<void> }>;
export function launchBrowser(
  origin: string,
  extraArgs?: string[],
): Promise<{ context: BrowserContext; offHost: string[]; close(): Promise<void> }>;

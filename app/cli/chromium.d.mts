/** Types of app/cli/chromium.mjs. */
export declare const CHROMIUM_CANDIDATES: Record<string, string[]>;
export declare function locateChromium(env?: NodeJS.ProcessEnv, platform?: string): { path: string; missing?: undefined } | { missing: string; path?: undefined };

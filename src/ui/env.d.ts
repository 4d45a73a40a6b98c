/** The package version, set by vite.config.ts. */
declare const __APP_VERSION__: string;

interface ImportMetaEnv {
  /** Marks a distinct build (the browser tests use it to publish a "new version"). */
  readonly VITE_BUILD_ID?: string;
}

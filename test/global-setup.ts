// Builds the CLI bundle once before the unit tests, so subprocess tests run the current source.
import { execFileSync } from 'node:child_process';

export default function setup(): void {
  execFileSync(process.execPath, ['scripts/build-cli.mjs'], { stdio: 'inherit' });
}

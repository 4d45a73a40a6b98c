// Designs announced by another tab (which may still run an earlier version of the app) are brought
// up to the current document version by the engine's own migration. A design being edited there may
// have errors, so it is migrated, not validated: nothing the user typed is dropped. (Stored state is
// read through parseDesign in persist.ts, which migrates too.)
import { DESIGN_VERSION, type DesignDoc } from '../engine/design/document.ts';
import { migrate } from '../engine/design/validate.ts';
import type { Designs } from './store.ts';

/** One stored design in the current version, or null when it cannot be read as any version. */
export function upgradeDesign(raw: unknown): DesignDoc | null {
  if (raw === null || typeof raw !== 'object' || Array.isArray(raw)) return null;
  const m = migrate(raw as Record<string, unknown>);
  if ('issue' in m) return null;
  const doc = m.doc as Partial<DesignDoc>;
  return doc.version === DESIGN_VERSION && Array.isArray(doc.ways) ? (doc as DesignDoc) : null;
}

export function upgradeDesigns(raw: { a: unknown; b: unknown }): Designs | null {
  const a = upgradeDesign(raw.a);
  const b = upgradeDesign(raw.b);
  return a && b ? { a, b } : null;
}

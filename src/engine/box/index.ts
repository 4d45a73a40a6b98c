// The registry of box types: one line per type.
import type { BoxDoc } from '../design/document.ts';
import type { BoxKind } from './types.ts';
import { sealed } from './sealed.ts';
import { vented } from './vented.ts';
import { passiveRadiator } from './passive-radiator.ts';

export const BOX_KINDS: Record<BoxDoc['type'], BoxKind<any, any>> = {
  sealed,
  vented,
  'passive-radiator': passiveRadiator,
};

export type { BoxKind, BoxContext } from './types.ts';

// The built-in demo pair, embedded in the bundle so the app opens on it without any request.
import sealed from '../../public/examples/living-room-sealed.json';
import vented from '../../public/examples/living-room-vented.json';
import passive2 from '../../public/examples/bookshelf-two-way-passive.json';
import passive3 from '../../public/examples/bookshelf-two-way-passive-3rd.json';
import type { DesignDoc } from '../engine/design/document.ts';
import { validate } from './engine.ts';
import type { Designs } from './store.ts';

function checked(json: unknown, which: string): DesignDoc {
  const r = validate(json);
  if (!r.ok) throw new Error(`the built-in ${which} example is invalid: ${r.errors.map((e) => `${e.path}: ${e.message}`).join('; ')}`);
  return r.design;
}

/** A fresh copy every time, so edits never reach the embedded originals. */
export function demoPair(): Designs {
  return { a: checked(structuredClone(sealed), 'sealed'), b: checked(structuredClone(vented), 'vented') };
}

/** A passive two-way pair: the same bookshelf speaker with a second- (A) and a third-order (B) tweeter network. */
export function passivePair(): Designs {
  return { a: checked(structuredClone(passive2), 'passive two-way'), b: checked(structuredClone(passive3), 'passive third-order') };
}

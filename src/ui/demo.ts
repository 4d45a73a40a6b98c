// The built-in demo pair, embedded in the bundle so the app opens on it without any request.
import sealed from '../../public/examples/living-room-sealed.json';
import vented from '../../public/examples/living-room-vented.json';
import passive2 from '../../public/examples/bookshelf-two-way-passive.json';
import passive3 from '../../public/examples/bookshelf-two-way-passive-3rd.json';
import inRoom from '../../public/examples/living-room-vented-in-room.json';
import type { DesignDoc, ListeningDoc } from '../engine/design/document.ts';
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

/** The client's invented living room of the examples, a fresh copy. */
export function clientRoom(): NonNullable<ListeningDoc['room']> {
  return structuredClone(checked(structuredClone(inRoom), 'in-room').listening.room!);
}

/** A design placed in a room (or taken out of it when room is undefined); a room gain corner gives way to the room. */
export function withRoom(design: DesignDoc, room: ListeningDoc['room']): DesignDoc {
  const { room: _old, room_gain_hz: gain, ...listening } = design.listening;
  return { ...design, listening: room ? { ...listening, room } : { ...listening, ...(gain !== undefined ? { room_gain_hz: gain } : {}) } };
}

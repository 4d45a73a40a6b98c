// V8 gives each class's objects a hidden shape (a "map") that compiled code is specialised to. A
// shape lives only as long as some object has it: once every object of a render has been collected,
// the next render's objects get new shapes, and every compiled loop that expected the old ones is
// thrown away ("weak objects" in node --trace-deopt) and compiled again, a render's warm-up paid
// again (measured: renders after the first ran 1.4x slower once the first render's objects were
// collected before the next began). Keeping the newest object of each class keeps its shape: the
// next objects are built into the same shape and the compiled code stays valid. Output is unchanged.

const newest = new Map<unknown, object>();

/** Keeps `obj` (the newest object of its class) so its class keeps its shape between renders. */
export function keepShape(obj: object): void {
  newest.set(obj.constructor, obj);
}

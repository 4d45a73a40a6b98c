// Switching a cabinet's type or port shape: a new box document of the chosen kind that keeps what
// carries over (volume, losses, port count). Starting values are placeholders the user then edits;
// an alignment suggestion of that kind is preferred when the engine offers one.
import type { BoxDoc, PortDoc } from '../engine/design/document.ts';
import type { Suggestion } from './engine.ts';

export type BoxType = BoxDoc['type'];

/** How each box kind is named on screen and on paper. */
export const BOX_LABEL: Record<BoxType, string> = {
  sealed: 'Sealed',
  vented: 'Vented (port)',
  'passive-radiator': 'Passive radiator',
};

/** A box kind's name; a kind this table does not know yet shows its type. */
export const boxLabel = (type: string): string => (BOX_LABEL as Record<string, string>)[type] ?? type;

export function boxOfType(current: BoxDoc, type: BoxType, suggestions: Suggestion[], driverSdCm2: number, driverXmaxMm: number): BoxDoc {
  if (current.type === type) return current;
  const offered = suggestions.find((s) => s.box.type === type);
  if (offered) return structuredClone(offered.box);
  const ql = current.ql;
  switch (type) {
    case 'sealed':
      return { type: 'sealed', vb_l: current.vb_l, ...(ql !== undefined ? { ql } : {}) };
    case 'vented':
      return { type: 'vented', vb_l: current.vb_l, fb_hz: 40, ports: [{ diameter_cm: 5, count: 1 }] };
    case 'passive-radiator':
      return {
        type: 'passive-radiator',
        vb_l: current.vb_l,
        radiator: { sd_cm2: driverSdCm2, mmp_g: 60, cmp_mm_per_n: 0.5, xmax_mm: Math.max(1, 2 * driverXmaxMm), count: 1 },
      };
  }
}

export type PortShape = 'round' | 'slot';

export const portShape = (p: PortDoc | undefined): PortShape =>
  p && p.diameter_cm === undefined && (p.width_cm !== undefined || p.height_cm !== undefined) ? 'slot' : 'round';

export function portOfShape(p: PortDoc, shape: PortShape): PortDoc {
  if (portShape(p) === shape) return p;
  const { diameter_cm, width_cm, height_cm, ...rest } = p;
  if (shape === 'slot') {
    const d = diameter_cm ?? 5;
    return { ...rest, width_cm: Number((d * 2).toFixed(1)), height_cm: Number((d / 2).toFixed(1)) };
  }
  return {
    ...rest,
    diameter_cm: width_cm !== undefined && height_cm !== undefined ? Number(Math.sqrt(width_cm * height_cm).toFixed(1)) : 5,
  };
}
